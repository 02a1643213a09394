package record

import (
	"fmt"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/report"
)

// Reproduced is a record made again from the files another record carries.
type Reproduced struct {
	Result *assess.Result
	Doc    *report.Document
	PDF    []byte // nil when the stored record has no date to re-render with
}

// Reproduce computes and re-renders a record from the input files st
// carries, with the record date st stores: the first attachment is the plant
// file (a record that carries further input files, such as a line file, will
// pass them here too, in the order the record lists them). The error is the
// plant file's own error (an inputerr.List) when it no longer computes.
func Reproduce(st *report.Stored) (*Reproduced, error) {
	if len(st.Attachments) == 0 {
		return nil, fmt.Errorf("the record carries no plant file")
	}
	plant := st.Attachments[0]
	p, err := plantfile.Parse(plant.Name, plant.Content)
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
	doc, err := Build(res, Options{Date: st.Date, PlantName: plant.Name})
	if err != nil {
		return nil, err
	}
	out := &Reproduced{Result: res, Doc: doc}
	if !st.Date.IsZero() {
		if out.PDF, _, err = report.Render(doc); err != nil {
			return nil, err
		}
	}
	return out, nil
}
