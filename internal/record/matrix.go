package record

import (
	"fmt"
	"path/filepath"
	"strings"

	"pasval/internal/assess"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/units"
	"pasval/report"
)

// MatrixStatement is printed on a matrix record's cover.
const MatrixStatement = "This record documents an engineering calculation made with pasval for the products of one line, " +
	"from the line file and the product files attached to it. It is not a regulatory approval, an inspection or a " +
	"process-authority letter; each product still needs its own record and acceptance tests."

// BuildMatrix makes the record of a line's products (pasval matrix): a cover
// with a verdict per product, a summary of the matrix and the envelopes, a
// page per product with its checks, the method, the cautions and the
// sign-off. The line file and every product file are attached, in that
// order, the product files under names made unique.
func BuildMatrix(line *plantfile.Plant, rows []assess.OnLine, opts Options) *report.Document {
	first := rows[0].Result
	d := present.Display{Sys: first.Plant.System}
	doc := &report.Document{
		Title:     "Line products validation matrix",
		Kind:      report.KindMatrix,
		SHA256:    line.SHA256,
		ShortHash: line.SHA256[:12],
		Date:      opts.Date,
		Version:   first.Version,
		PageSize:  "A4",
	}
	if d.Sys == units.US {
		doc.PageSize = "Letter"
	}
	used := map[string]bool{}
	attach := func(file string, content []byte, desc string) string {
		name := filepath.Base(file)
		for i := 2; used[name]; i++ {
			name = fmt.Sprintf("%d-%s", i, filepath.Base(file))
		}
		used[name] = true
		doc.Attachments = append(doc.Attachments, report.Attachment{Name: name, Content: content, Description: desc})
		return name
	}
	lineName := attach(line.File, line.Source, "line file, SHA-256 "+line.SHA256)
	names := make([]string, len(rows))
	for i, o := range rows {
		p := o.Result.Plant
		names[i] = attach(p.File, p.Source, "product file naming the line file, SHA-256 "+p.SHA256)
	}
	var hdr []string
	for _, k := range []string{"site", "line"} {
		if v := line.RecordValue(k); v != "" {
			hdr = append(hdr, v)
		}
	}
	doc.Header = strings.Join(hdr, " · ")
	if doc.Header == "" {
		doc.Header = lineName
	}

	// Cover.
	c := report.Cover{Statement: MatrixStatement, Pass: true}
	for _, k := range []struct{ key, label string }{{"site", "Site"}, {"line", "Line"}, {"prepared_by", "Prepared by"}, {"notes", "Notes"}} {
		if v := line.RecordValue(k.key); v != "" {
			c.Fields = append(c.Fields, [2]string{k.label, v})
		}
	}
	c.Fields = append(c.Fields,
		[2]string{"Record date", doc.Date.Format("2006-01-02")},
		[2]string{"Line file", lineName},
		[2]string{"Line file SHA-256", line.SHA256},
		[2]string{"Product files", fmt.Sprintf("%d, each attached and listed with its SHA-256 in section 1", len(rows))},
		[2]string{"Tool", "pasval " + doc.Version})
	c.NotJudged = true
	for _, o := range rows {
		c.Verdicts = append(c.Verdicts, report.Verdict{Check: present.ProductName(o), Pass: o.Result.Pass, NotJudged: !o.Result.Judged})
		c.Pass = c.Pass && o.Result.Pass
		c.NotJudged = c.NotJudged && !o.Result.Judged
	}
	c.Overall = "Result: " + present.MatrixOverall(rows) + "."
	doc.Cover = c

	// Summary.
	files := report.Table{Caption: "The files this record was computed from (all attached).",
		Columns: []report.Column{{Title: "file"}, {Title: "role"}, {Title: "SHA-256"}}}
	files.Rows = append(files.Rows, []string{lineName, "line file", line.SHA256})
	for i, o := range rows {
		files.Rows = append(files.Rows, []string{names[i], "product: " + present.ProductName(o), o.Result.Plant.SHA256})
	}
	holding := tableFrom("Each product computed whole, as pasval check computes it: the fastest particle at the worst flow up to the seal, "+
		"at the judged temperature (setpoint less the sensor accuracy), against its legal row.", present.MatrixHolding(rows, d))
	for i := range holding.Rows {
		holding.Rows[i][1] = names[i]
	}
	summary := []report.Block{files, holding}
	if g := present.MatrixLethality(rows); len(g.Rows) > 0 {
		summary = append(summary, tableFrom("Judged log reductions against the required ones.", g))
	}
	summary = append(summary,
		tableFrom("Through the heat-exchange sections at the normal rate: the heating medium each product needs against the hottest available, the product outlet and the regeneration ratio.",
			present.MatrixLine(rows, d)),
		tableFrom("Verdicts and the limiting check: the smallest margin relative to its scale (its required value; for heating-medium and cooling-outlet "+
			"the temperature change of the section), among the failing checks when any fails.", present.MatrixVerdicts(rows, d)),
		tableFrom("Envelopes, by bisection on the whole model (every check): the highest seal flow that passes at the entered setpoint "+
			"and the lowest setpoint that passes at the entered rates, with the checks that fail just beyond.", present.MatrixEnvelope(rows, d)),
		report.Paragraph{Text: present.EnvelopeMethod(d)})
	if g := present.MatrixFailing(rows, d); len(g.Rows) > 0 {
		summary = append(summary, tableFrom("Failing checks.", g))
	}
	if lw := present.MatrixLineWarnings(line, rows, d); len(lw) > 0 {
		summary = append(summary, report.Paragraph{Text: "Warnings on the line file:", Emphasis: true}, report.Bullets{Items: lw})
	}
	summary = append(summary, report.Paragraph{Text: "Result: " + present.MatrixOverall(rows) + ".", Emphasis: true})
	doc.Sections = append(doc.Sections, report.Section{Heading: "Products on the line", Blocks: summary})

	for i, o := range rows {
		doc.Sections = append(doc.Sections, productPage(o, names[i], d))
	}
	doc.Sections = append(doc.Sections, matrixMethod(), cautionSection(first), signOffSection())
	return doc
}

// productPage is one product's page of a matrix record.
func productPage(o assess.OnLine, file string, d present.Display) report.Section {
	res := o.Result
	p := res.Plant
	kv := [][2]string{{"product file", file}, {"SHA-256", p.SHA256}}
	if p.LegalTable != "" {
		kv = append(kv, [2]string{"legal table", p.LegalTable})
	}
	kv = append(kv,
		[2]string{"setpoint", d.With(p.Process.HoldSetpoint.SI, units.Temperature, 2)},
		[2]string{"flows", fmt.Sprintf("%s normal, %s sealed maximum", d.With(res.Product.MassFlow/res.Product.Density, units.VolumeFlow, 0),
			d.With(res.Product.MaxMassFlow/res.Product.Density, units.VolumeFlow, 0))})
	if h := res.HoldingTube; h != nil {
		kv = append(kv, [2]string{"holding tube", present.HoldingHeading(res, d)})
	}
	if o.LimitingOK {
		kv = append(kv, [2]string{"limiting check", fmt.Sprintf("%s, margin %s (%s relative)", present.CheckLabel(o.Limiting),
			present.CheckMargin(o.Limiting, d), present.RelativeMarginText(o.Limiting, o.LimitingRelative))})
	}
	env := present.MatrixEnvelope([]assess.OnLine{o}, d).Rows[0]
	kv = append(kv,
		[2]string{"highest seal flow", env[1] + " " + d.Unit(units.VolumeFlow) + "; beyond it: " + env[2]},
		[2]string{"lowest setpoint", env[3] + " " + d.Unit(units.Temperature) + "; below it: " + env[4]})
	blocks := []report.Block{report.KeyValues{Pairs: kv}, tableFrom("Checks of the product as entered.", present.Checks(res, d)),
		report.Paragraph{Text: "Result: " + present.Overall(res) + ".", Emphasis: true}}
	if w := present.Warnings(res, d); len(w) > 0 {
		blocks = append(blocks, report.Paragraph{Text: "Warnings:", Emphasis: true}, report.Bullets{Items: w})
	}
	return report.Section{Heading: "Product: " + present.ProductName(o), Blocks: blocks, NewPage: true}
}

func matrixMethod() report.Section {
	return report.Section{Heading: "Method", Blocks: []report.Block{report.Bullets{Items: []string{
		"Each product file names the line file (line_file). The line file supplies every top-level block the product file does not give; " +
			"a block the product file gives replaces the line's block of the same name whole, with no merging inside it (docs/METHOD.md §16.1).",
		"Legal rows by product class: the line's legal_tables, of which each product picks one with legal_table (docs/METHOD.md §16.2).",
		"Each product is computed whole, exactly as pasval check computes it; its own validation record gives every quantity and the method in full.",
		"Limiting check: among the failing checks when any fails, else among all, the smallest margin over its scale — the required value, " +
			"or for heating-medium the required medium inlet less the product entering the heating section, and for cooling-outlet the product " +
			"entering the first cooling stage less the target (a temperature point has no natural zero) (docs/METHOD.md §16.3).",
		"Envelope: every trial is the whole plant computed again with the seal flow (the normal rate scaled with it) or the setpoint changed; " +
			"a trial passes when every check passes and the plant file's rules hold (docs/METHOD.md §16.3).",
	}}}}
}
