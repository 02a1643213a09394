package report

// No external source applies: the invariants are the verifier's own contract.

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"os"
	"regexp"
	"testing"
	"time"
)

var hex64 = regexp.MustCompile(`^[0-9a-f]{64}$`)

// FuzzVerify feeds mutated records to Verify. Invariants: no panic, no
// unbounded memory; either an error wrapping ErrUnreadable or hashes of 64
// hex digits, and Match only when they agree.
func FuzzVerify(f *testing.F) {
	plant, err := os.ReadFile("../testdata/demo/frozen-dessert-si.yaml")
	if err != nil {
		f.Fatal(err)
	}
	sum := sha256.Sum256(plant)
	hash := hex.EncodeToString(sum[:])
	var blocks []Block
	for _, k := range BlockKinds {
		blocks = append(blocks, sampleBlock(k))
	}
	doc := &Document{Title: "record", PageSize: "A4", Date: time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC), SHA256: hash,
		ShortHash: hash[:12], Attachments: []Attachment{{Name: "demo.yaml", Content: plant}}, Sections: []Section{{Heading: "All", Blocks: blocks}}}
	pdf, _, err := Render(doc)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(pdf)
	f.Add(pdf[:len(pdf)/2])
	// A run review: kind, runs not carried and reading options in the metadata.
	doc.Kind, doc.Options = KindRunReview, "columns=time%3DZeit&decimal-comma=true"
	doc.Inputs = []InputRef{{Name: "shift.csv", SHA256: hash}}
	review, _, err := Render(doc)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(review)
	f.Add([]byte("%PDF-1.3\n/Keywords (" + KeywordPrefix + hash + ")\n"))
	f.Add([]byte("%PDF-1.3\n/Type /EmbeddedFile /Length 5 /Filter /FlateDecode /Params << /CheckSum <> /Size 999999999 >> >>\nstream\nxxxxx"))
	f.Fuzz(func(t *testing.T, data []byte) {
		v, err := Verify(data, nil)
		if err != nil {
			if !errors.Is(err, ErrUnreadable) {
				t.Fatalf("error not marked unreadable: %v", err)
			}
			return
		}
		if !hex64.MatchString(v.RecordedSHA256) || !hex64.MatchString(v.AttachmentSHA256) {
			t.Fatalf("bad hashes %+v", v)
		}
		if v.Match != (v.RecordedSHA256 == v.AttachmentSHA256) {
			t.Fatalf("match %v for %+v", v.Match, v)
		}
	})
}
