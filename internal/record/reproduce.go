package record

import (
	"fmt"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/report"
)

// Reproduced is a record made again from the files another record carries.
type Reproduced struct {
	Doc *report.Document
	PDF []byte // nil when the stored record has no date to re-render with
}

// Reproduce computes and re-renders a record from the input files st
// carries, with the record date st stores. A plant file's record carries the
// plant file first and, when it names one, its line file; a matrix record
// (Kind report.KindMatrix) the line file first, then each product file. The
// error is an input file's own error (an inputerr.List) when it no longer
// computes.
func Reproduce(st *report.Stored) (*Reproduced, error) {
	if len(st.Attachments) == 0 {
		return nil, fmt.Errorf("the record carries no plant file")
	}
	var doc *report.Document
	var err error
	switch st.Kind {
	case "":
		doc, err = reproducePlant(st)
	case report.KindMatrix:
		doc, err = reproduceMatrix(st)
	default:
		return nil, fmt.Errorf("the record is of a kind this version does not make (%q)", st.Kind)
	}
	if err != nil {
		return nil, err
	}
	out := &Reproduced{Doc: doc}
	if !st.Date.IsZero() {
		if out.PDF, _, err = report.Render(doc); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// lineReader serves a line file from a record's attachment, whatever path
// the product file names it by.
func lineReader(st *report.Stored, i int) plantfile.ReadFunc {
	return func(string) ([]byte, error) {
		if i >= len(st.Attachments) {
			return nil, fmt.Errorf("the record carries no line file")
		}
		return st.Attachments[i].Content, nil
	}
}

func reproducePlant(st *report.Stored) (*report.Document, error) {
	plant := st.Attachments[0]
	p, err := plantfile.ParseWith(plant.Name, plant.Content, lineReader(st, 1))
	if err != nil {
		return nil, err
	}
	if err := plantfile.Validate(p); err != nil {
		return nil, err
	}
	res, err := assess.RunWith(p, assess.Options{On: st.Date})
	if err != nil {
		return nil, err
	}
	opts := Options{Date: st.Date, PlantName: plant.Name}
	if p.Line != nil {
		opts.LineName = st.Attachments[1].Name
	}
	return Build(res, opts)
}

func reproduceMatrix(st *report.Stored) (*report.Document, error) {
	if len(st.Attachments) < 2 {
		return nil, fmt.Errorf("the matrix record carries no product file")
	}
	la := st.Attachments[0]
	line, err := plantfile.ParseLine(la.Name, la.Content)
	if err != nil {
		return nil, err
	}
	var rows []assess.OnLine
	for _, a := range st.Attachments[1:] {
		p, err := plantfile.ParseWith(a.Name, a.Content, lineReader(st, 0))
		if err != nil {
			return nil, err
		}
		if err := plantfile.Validate(p); err != nil {
			return nil, err
		}
		o, err := assess.RunOnLine(p)
		if err != nil {
			return nil, err
		}
		rows = append(rows, o)
	}
	return BuildMatrix(line, rows, Options{Date: st.Date}), nil
}
