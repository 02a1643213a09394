package report

import (
	"errors"
	"regexp"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
)

var hex64 = regexp.MustCompile(`^[0-9a-f]{64}$`)

// FuzzVerify feeds mutated records to Verify. Invariants: no panic, no
// unbounded memory; either an error wrapping ErrUnreadable or hashes of 64
// hex digits, and Match only when they agree.
func FuzzVerify(f *testing.F) {
	p, err := plantfile.Load("../testdata/demo/frozen-dessert-si.yaml")
	if err != nil {
		f.Fatal(err)
	}
	res, err := assess.Run(p)
	if err != nil {
		f.Fatal(err)
	}
	pdf, _, err := Render(Build(res, Options{Date: day, PlantBytes: p.Source, PlantName: "demo.yaml"}))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(pdf)
	f.Add(pdf[:len(pdf)/2])
	f.Add([]byte("%PDF-1.3\n/Keywords (" + KeywordPrefix + res.InputSHA256 + ")\n"))
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
