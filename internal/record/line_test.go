package record

// Source of the expectations: the record's specification for product files
// on a line (docs/METHOD.md §16.1: records list, attach and hash both files)
// and for the matrix record (a summary page and a page per product, the line
// file and every product file attached); a record is reproduced byte for byte
// from its attachments alone.

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"path/filepath"
	"strings"
	"testing"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/report"
)

const lineDir = "../../testdata/demo/dairy-line-si"

func onLine(t *testing.T, name string) *plantfile.Plant {
	t.Helper()
	p, err := plantfile.Load(filepath.Join(lineDir, name+".yaml"))
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func hexSum(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

func TestRecordAttachesTheLineFile(t *testing.T) {
	p := onLine(t, "whole-milk")
	res, err := assess.Run(p)
	if err != nil {
		t.Fatal(err)
	}
	doc, err := Build(res, Options{Date: day, PlantName: "whole-milk.yaml"})
	if err != nil {
		t.Fatal(err)
	}
	if len(doc.Attachments) != 2 || doc.Attachments[0].Name != "whole-milk.yaml" || doc.Attachments[1].Name != "line.yaml" ||
		!bytes.Equal(doc.Attachments[1].Content, p.Line.Source) {
		t.Fatalf("attachments %+v", doc.Attachments)
	}
	cover := map[string]string{}
	for _, f := range doc.Cover.Fields {
		cover[f[0]] = f[1]
	}
	if cover["Plant file SHA-256"] != p.SHA256 || cover["Line file SHA-256"] != p.Line.SHA256 || !strings.HasPrefix(cover["Line file"], "line.yaml") {
		t.Errorf("cover %v", cover)
	}
	// The inputs table names the file each value was written in.
	inputs := doc.Sections[0].Blocks[0].(report.Table)
	fileCol := -1
	for i, c := range inputs.Columns {
		if c.Title == "file" {
			fileCol = i
		}
	}
	seen := map[string]bool{}
	for _, r := range inputs.Rows {
		if fileCol < 0 {
			break
		}
		seen[r[fileCol]] = true
		if strings.HasPrefix(r[0], "heating.") && r[fileCol] != "line.yaml" || strings.HasPrefix(r[0], "process.") && r[fileCol] != "whole-milk.yaml" {
			t.Errorf("input %s from %s", r[0], r[fileCol])
		}
	}
	if fileCol < 0 || !seen["line.yaml"] || !seen["whole-milk.yaml"] {
		t.Errorf("inputs table without its file column: %v", inputs.Columns)
	}
	// Rendered: both files in the PDF with their hashes, and the record
	// re-rendered from its attachments alone is the same bytes.
	pdf, _, err := report.Render(doc)
	if err != nil {
		t.Fatal(err)
	}
	st, err := report.Read(pdf)
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Attachments) != 2 || st.FileHashes["whole-milk.yaml"] != p.SHA256 || st.FileHashes["line.yaml"] != p.Line.SHA256 ||
		hexSum(st.Attachments[1].Content) != p.Line.SHA256 || st.Kind != "" {
		t.Fatalf("stored %+v", st)
	}
	rep, err := Reproduce(st)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(rep.PDF, pdf) {
		t.Error("the record re-rendered from its attachments differs")
	}
	// Without its line file the plant file cannot be computed again.
	st.Attachments = st.Attachments[:1]
	if _, err := Reproduce(st); err == nil || !strings.Contains(err.Error(), "carries no line file") {
		t.Errorf("reproduced without the line file: %v", err)
	}
}

func TestMatrixRecord(t *testing.T) {
	line, err := plantfile.LoadLine(filepath.Join(lineDir, "line.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	var rows []assess.OnLine
	for _, n := range []string{"whole-milk", "chocolate-milk", "cream"} {
		o, err := assess.RunOnLine(onLine(t, n))
		if err != nil {
			t.Fatal(err)
		}
		rows = append(rows, o)
	}
	doc := BuildMatrix(line, rows, Options{Date: day})
	var names []string
	for _, a := range doc.Attachments {
		names = append(names, a.Name)
	}
	if strings.Join(names, " ") != "line.yaml whole-milk.yaml chocolate-milk.yaml cream.yaml" || doc.Kind != report.KindMatrix || doc.SHA256 != line.SHA256 {
		t.Fatalf("attachments %v kind %q", names, doc.Kind)
	}
	// A verdict per product, the cream failing; a summary, then a page per product.
	if len(doc.Cover.Verdicts) != 3 || doc.Cover.Pass || !doc.Cover.Verdicts[0].Pass || doc.Cover.Verdicts[2].Pass {
		t.Errorf("verdicts %+v", doc.Cover.Verdicts)
	}
	var pages []string
	for _, s := range doc.Sections {
		if s.NewPage {
			pages = append(pages, s.Heading)
		}
	}
	if doc.Sections[0].Heading != "Products on the line" || strings.Join(pages, "; ") != "Product: whole milk 3.5 %; Product: chocolate milk 1 %; Product: whipping cream 36 %" {
		t.Errorf("sections: first %q, own pages %v", doc.Sections[0].Heading, pages)
	}
	if cautionIn(doc) == "" {
		t.Error("no caution in the matrix record")
	}
	pdf, n, err := report.Render(doc)
	if err != nil {
		t.Fatal(err)
	}
	if n < 5 {
		t.Errorf("%d pages, want a cover, a summary and a page per product", n)
	}
	st, err := report.Read(pdf)
	if err != nil {
		t.Fatal(err)
	}
	if st.Kind != report.KindMatrix || len(st.Attachments) != 4 || st.FileHashes["cream.yaml"] != rows[2].Result.Plant.SHA256 {
		t.Fatalf("stored kind %q, %d attachments", st.Kind, len(st.Attachments))
	}
	rep, err := Reproduce(st)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(rep.PDF, pdf) {
		t.Error("the matrix record re-rendered from its attachments differs")
	}
}

func cautionIn(doc *report.Document) string {
	for _, s := range doc.Sections {
		if s.Heading == "Cautions" {
			for _, b := range s.Blocks {
				if p, ok := b.(report.Paragraph); ok && strings.Contains(p.Text, "never replaces") {
					return p.Text
				}
			}
		}
	}
	return ""
}
