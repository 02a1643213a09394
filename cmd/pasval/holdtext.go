package main

import (
	"fmt"
	"io"

	"pasval/internal/assess"
	"pasval/internal/present"
)

// writeHolding prints the holding tube and lethality blocks shared by check and hold.
func writeHolding(w io.Writer, res *assess.Result, d present.Display) {
	h := res.HoldingTube
	fmt.Fprintf(w, "\nHolding tube (%s)\n", present.HoldingHeading(res, d))
	kv := newTable("", "")
	for _, p := range present.HoldingFacts(res, d) {
		kv.add(p[0], p[1])
	}
	kv.writeBare(w)
	if len(h.Rows) > 0 {
		fmt.Fprintln(w, "\n  Legal minimums (as entered; rows are never interpolated)")
		tableOf(present.LegalRows(res, d)).write(w)
	}
	if len(res.Lethality) > 0 {
		fmt.Fprintln(w, "\n  Lethality (fastest particle)")
		tableOf(present.Lethality(res, d)).write(w)
	}
}
