package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"time"

	"github.com/spf13/cobra"

	"pasval/internal/assess"
	"pasval/internal/fileout"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/present"
	"pasval/internal/record"
	"pasval/internal/units"
	"pasval/regen"
	"pasval/report"
)

type matrixOptions struct {
	outputFlags
	line     string
	products []string
	record   string
	date     string
	force    bool
}

func newMatrixCmd(stdout io.Writer) *cobra.Command {
	var opts matrixOptions
	cmd := &cobra.Command{
		Use:   "matrix LINE.yaml PRODUCT.yaml…",
		Short: "Judge every product of a line side by side, with each product's envelope",
		Long: `matrix reads a line file and the product files that name it (line_file) and
computes each product whole, as check does: one row per product with its
setpoint and judged temperature, seal flow, fastest particle against its legal
row, log reductions against the required ones, the heating medium needed
against the hottest available, the product outlet, the regeneration ratio, the
verdict and the limiting check (the smallest margin relative to its scale,
among the failing checks when any fails).

Then each product's envelope, found by bisection on the whole model (every
check): the highest seal flow that passes at its setpoint, the normal rate
moving with the seal in the entered proportion, and the lowest setpoint that
passes at its rates (or "none in range"). docs/METHOD.md §16 gives the ranges
and tolerances.

Every product file must name LINE.yaml as its line file. Values print in the
units of the first product file's setpoint unless --units says otherwise; JSON
is SI. --record writes a record with a summary page and a page per product,
the line file and every product file attached.`,
		Example: `  pasval matrix testdata/demo/dairy-line-si/line.yaml testdata/demo/dairy-line-si/*milk.yaml
  pasval matrix line.yaml whole-milk.yaml cream.yaml --json
  pasval matrix line.yaml *.yaml --record line3-matrix.pdf --date 2026-12-01`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) < 2 {
				return usagef("matrix needs a line file and at least one product file, got %d arguments (see 'pasval matrix --help')", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.line, opts.products = args[0], args[1:]
			return runMatrix(opts, stdout, cmd.ErrOrStderr())
		},
	}
	cmd.Long += "\n" + exitStatusHelp
	opts.register(cmd)
	cmd.Flags().StringVar(&opts.record, "record", "", "also write the matrix record (PDF) to this file")
	cmd.Flags().StringVar(&opts.date, "date", "", "record date YYYY-MM-DD for --record (default: today)")
	cmd.Flags().BoolVar(&opts.force, "force", false, "overwrite the --record file if it exists")
	return cmd
}

// matrixReport is the JSON of the matrix command (SI; every key names its unit).
type matrixReport struct {
	Tool     string           `json:"tool"`
	Version  string           `json:"version"`
	LineFile assess.SourceRef `json:"line_file"`
	// LineWarnings are the line file's own (a product block it gives).
	LineWarnings []assess.Warning `json:"line_warnings"`
	Products     []matrixProduct  `json:"products"`
	Search       matrixSearch     `json:"envelope_search"`
	Pass         bool             `json:"pass"`
	Caution      string           `json:"caution"`
}

type matrixProduct struct {
	File                    string              `json:"file"`
	SHA256                  string              `json:"sha256"`
	Name                    string              `json:"name"`
	LegalTable              string              `json:"legal_table,omitempty"`
	SetpointC               float64             `json:"setpoint_C"`
	JudgedTemperatureC      *float64            `json:"judged_temperature_C"`
	SealFlowM3s             float64             `json:"seal_flow_m3_s"`
	FastestTimeS            *float64            `json:"fastest_time_s"` // at the worst flow
	LegalRow                *assess.LegalOut    `json:"legal_row"`
	LogReductions           []matrixLogRed      `json:"log_reductions"`
	HeatingMediumNeededC    *float64            `json:"heating_medium_needed_C"`
	HeatingMediumAvailableC *float64            `json:"heating_medium_available_C"`
	OutletC                 *float64            `json:"outlet_C"`
	RegenerationRatio       *float64            `json:"regeneration_ratio"`
	Pass                    bool                `json:"pass"`
	Judged                  bool                `json:"judged"`         // false when no check applies to the product
	LimitingCheck           string              `json:"limiting_check"` // a check id; "" when none applies
	LimitingDetail          *matrixLimiting     `json:"limiting_check_detail"`
	Checks                  []assess.Check      `json:"checks"`
	Warnings                []assess.Warning    `json:"warnings"`
	MaxSealFlowM3s          *float64            `json:"max_seal_flow_m3_s"` // null: none in range
	MaxSealFlowAtSearchEnd  bool                `json:"max_seal_flow_at_search_end"`
	MaxSealFlowLimitedBy    []matrixLimitedBy   `json:"max_seal_flow_limited_by"`
	MinSetpointC            *float64            `json:"min_setpoint_C"` // null: none in range
	MinSetpointLimitedBy    []matrixLimitedBy   `json:"min_setpoint_limited_by"`
	Refusals                *matrixEdgeRefusals `json:"refused_beyond,omitempty"`
}

type matrixLogRed struct {
	Organism string   `json:"organism"`
	Log      float64  `json:"log_reduction"`
	Required *float64 `json:"required_log_reduction"` // null: reported, not judged
}

type matrixLimiting struct {
	Organism       string   `json:"organism,omitempty"`
	Section        string   `json:"section,omitempty"`
	RelativeMargin *float64 `json:"relative_margin"` // null when infinite (a scale of zero)
}

type matrixLimitedBy struct {
	ID       assess.CheckID `json:"id"`
	Organism string         `json:"organism,omitempty"`
	Section  string         `json:"section,omitempty"`
}

// matrixEdgeRefusals are the messages of a plant file refused just beyond an
// envelope's edge (a rule of the file or the model's own refusal).
type matrixEdgeRefusals struct {
	MaxSealFlow string `json:"max_seal_flow,omitempty"`
	MinSetpoint string `json:"min_setpoint,omitempty"`
}

type matrixSearch struct {
	FlowStep           float64 `json:"flow_step"`
	FlowCap            float64 `json:"flow_cap"`
	FlowFloor          float64 `json:"flow_floor"`
	FlowTolerance      float64 `json:"flow_tolerance"`
	SetpointFromC      float64 `json:"setpoint_from_C"`
	SetpointToC        float64 `json:"setpoint_to_C"`
	SetpointStepK      float64 `json:"setpoint_step_K"`
	SetpointToleranceK float64 `json:"setpoint_tolerance_K"`
}

// loadMatrix reads the line file and each product file, and checks that
// every product names that line file.
func loadMatrix(opts matrixOptions) (*plantfile.Plant, []*plantfile.Plant, present.Display, error) {
	d := present.Display{}
	if opts.units != "" && opts.units != "si" && opts.units != "us" {
		return nil, nil, d, usagef("--units must be si or us, not %q", opts.units)
	}
	line, err := plantfile.LoadLine(opts.line)
	if err != nil {
		return nil, nil, d, err
	}
	lineStat, err := os.Stat(opts.line)
	if err != nil {
		return nil, nil, d, inputerr.List{inputerr.At(inputerr.Pos{File: opts.line}, "", "cannot read %s: %v", opts.line, err)}
	}
	var errs inputerr.List
	var products []*plantfile.Plant
	for _, f := range opts.products {
		p, err := plantfile.Load(f)
		if err != nil {
			if l, ok := err.(inputerr.List); ok {
				errs = append(errs, l...)
				continue
			}
			return nil, nil, d, err
		}
		if p.Line == nil {
			errs = append(errs, inputerr.At(inputerr.Pos{File: f, Line: 1, Column: 1}, "line_file",
				"missing; matrix judges the products of %s, and this file names no line file: start it with line_file: %s", opts.line, relTo(f, opts.line)))
			continue
		}
		st, err := os.Stat(p.Line.File)
		if err != nil || !os.SameFile(st, lineStat) {
			errs = append(errs, inputerr.At(p.LineFilePos, "line_file", "names the line file %s, not %s: matrix judges the products of one line", p.Line.File, opts.line))
			continue
		}
		if p.Line.SHA256 != line.SHA256 {
			errs = append(errs, inputerr.At(inputerr.Pos{File: opts.line}, "", "changed while it was read (run matrix again)"))
			continue
		}
		products = append(products, p)
	}
	if len(errs) > 0 {
		return nil, nil, d, errs
	}
	d.Sys = products[0].System
	switch opts.units {
	case "si":
		d.Sys = units.SI
	case "us":
		d.Sys = units.US
	}
	return line, products, d, nil
}

// relTo is target's path relative to the folder of from, for a hint.
func relTo(from, target string) string {
	if r, err := filepath.Rel(filepath.Dir(from), target); err == nil {
		return r
	}
	return target
}

func runMatrix(opts matrixOptions, out, diag io.Writer) error {
	date, err := recordDate(opts.date)
	if err != nil {
		return err
	}
	line, products, d, err := loadMatrix(opts)
	if err != nil {
		return err
	}
	rows := make([]assess.OnLine, 0, len(products))
	for _, p := range products {
		o, err := assess.RunOnLine(p)
		if err != nil {
			return err
		}
		rows = append(rows, o)
	}
	pass := true
	for _, o := range rows {
		pass = pass && o.Result.Pass
	}
	if opts.record != "" {
		if err := writeMatrixRecord(line, rows, opts.record, date, opts.force, diag); err != nil {
			return err
		}
	}
	if opts.json {
		if err := writeJSON(out, matrixJSON(line, rows, pass)); err != nil {
			return err
		}
	} else {
		writeMatrix(out, line, rows, d, useColour(out))
	}
	if !pass {
		return errChecksFailed
	}
	return nil
}

func writeMatrix(w io.Writer, line *plantfile.Plant, rows []assess.OnLine, d present.Display, colour bool) {
	first := rows[0].Result
	fmt.Fprintf(w, "pasval %s · matrix of %s, %d product files\n", first.Version, line.File, len(rows))
	var ids []string
	for _, k := range []string{"site", "line"} {
		if v := line.RecordValue(k); v != "" {
			ids = append(ids, v)
		}
	}
	if len(ids) > 0 {
		fmt.Fprintln(w, joinDot(ids))
	}
	fmt.Fprintf(w, "line file sha256 %s\n", line.SHA256)

	fmt.Fprintln(w, "\nProducts (each computed whole, as 'pasval check' computes it; fastest particle at the worst flow up to the seal)")
	tableOf(present.MatrixHolding(rows, d)).write(w)
	if g := present.MatrixLethality(rows); len(g.Rows) > 0 {
		fmt.Fprintln(w)
		tableOf(g).write(w)
	}
	fmt.Fprintln(w)
	tableOf(present.MatrixLine(rows, d)).write(w)
	fmt.Fprintln(w)
	t := tableOf(present.MatrixVerdicts(rows, d))
	t.colour = colour
	t.write(w)
	fmt.Fprintln(w, "\n  limiting check: the smallest margin relative to its scale (its required value; for heating-medium and")
	fmt.Fprintln(w, "  cooling-outlet, the temperature change of the section), among the failing checks when any fails")

	fmt.Fprintln(w, "\nEnvelopes (bisection on the whole model, every check)")
	tableOf(present.MatrixEnvelope(rows, d)).write(w)
	fmt.Fprint(w, "\n"+wrap(present.EnvelopeMethod(d), "  ", 88))

	if g := present.MatrixFailing(rows, d); len(g.Rows) > 0 {
		fmt.Fprintln(w, "\nFailing checks")
		ft := tableOf(g)
		ft.colour = colour
		ft.write(w)
	}
	if lw := present.MatrixLineWarnings(line, rows, d); len(lw) > 0 {
		fmt.Fprintln(w, "\nWarnings on the line file")
		for _, m := range lw {
			fmt.Fprint(w, wrap(m, "  !", 88))
		}
	}
	var warned []string
	for _, o := range rows {
		if n := len(o.Result.Warnings); n > 0 {
			warned = append(warned, fmt.Sprintf("%s: %d", filepath.Base(o.Result.Plant.File), n))
		}
	}
	if len(warned) > 0 {
		fmt.Fprintf(w, "\nWarnings (shown by 'pasval check PRODUCT.yaml')  %s\n", joinComma(warned))
	}
	fmt.Fprintf(w, "\nResult: %s\n", present.MatrixOverall(rows))
	fmt.Fprint(w, "\n"+wrap(first.Caution, "Caution:", 88))
}

func joinDot(s []string) string   { return joinWith(s, " · ") }
func joinComma(s []string) string { return joinWith(s, ", ") }

func joinWith(s []string, sep string) string {
	out := ""
	for i, x := range s {
		if i > 0 {
			out += sep
		}
		out += x
	}
	return out
}

func finite(v float64) *float64 {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return nil
	}
	return &v
}

func limitedByJSON(cs []assess.Check) []matrixLimitedBy {
	out := []matrixLimitedBy{}
	for _, c := range cs {
		out = append(out, matrixLimitedBy{ID: c.ID, Organism: c.Organism, Section: c.Section})
	}
	return out
}

func matrixJSON(line *plantfile.Plant, rows []assess.OnLine, pass bool) matrixReport {
	rep := matrixReport{Tool: "pasval", LineFile: assess.SourceRef{File: line.File, SHA256: line.SHA256}, Products: []matrixProduct{},
		Search: matrixSearch{FlowStep: assess.EnvelopeFlowStep, FlowCap: assess.EnvelopeFlowCap, FlowFloor: assess.EnvelopeFlowFloor,
			FlowTolerance: assess.EnvelopeFlowTol, SetpointFromC: assess.EnvelopeSetpointFrom, SetpointToC: assess.EnvelopeSetpointTo,
			SetpointStepK: assess.EnvelopeSetpointStep, SetpointToleranceK: assess.EnvelopeSetpointTol},
		Pass: pass, LineWarnings: []assess.Warning{}}
	var plants []*plantfile.Plant
	for _, o := range rows {
		plants = append(plants, o.Result.Plant)
	}
	for _, w := range assess.LineWarnings(line, plants) {
		w.Message = present.WarningText(w, line, present.Display{Sys: units.SI})
		rep.LineWarnings = append(rep.LineWarnings, w)
	}
	for _, o := range rows {
		res := o.Result
		p := res.Plant
		rep.Version, rep.Caution = res.Version, res.Caution
		worded := present.ForJSON(res)
		mp := matrixProduct{File: p.File, SHA256: p.SHA256, Name: p.Product.Name, LegalTable: p.LegalTable,
			SetpointC: p.Process.HoldSetpoint.SI, SealFlowM3s: res.Product.MaxMassFlow / res.Product.Density,
			LogReductions: []matrixLogRed{}, RegenerationRatio: res.RegenerationRatio, Pass: res.Pass, Judged: res.Judged,
			Checks: worded.Checks, Warnings: worded.Warnings,
			MaxSealFlowLimitedBy: limitedByJSON(o.Envelope.MaxSeal.LimitedBy), MinSetpointLimitedBy: limitedByJSON(o.Envelope.MinSetpoint.LimitedBy)}
		if h := res.HoldingTube; h != nil {
			judged, fastest := h.JudgedTemperatureC, h.WorstMinResidenceS
			mp.JudgedTemperatureC, mp.FastestTimeS, mp.LegalRow, mp.SealFlowM3s = &judged, &fastest, h.Legal, h.MaxFlowM3s
		}
		for _, l := range res.Lethality {
			mp.LogReductions = append(mp.LogReductions, matrixLogRed{Organism: l.Organism, Log: l.LogReduction, Required: l.RequiredLogReduction})
		}
		for _, s := range res.Sections {
			switch s.Kind {
			case regen.HeatingSection:
				needed := s.OtherInC
				mp.HeatingMediumNeededC, mp.HeatingMediumAvailableC = &needed, s.MediumAvailableC
			case regen.CoolingSection:
				outlet := s.ProductOutC
				mp.OutletC = &outlet
			}
		}
		if o.LimitingOK {
			mp.LimitingCheck = string(o.Limiting.ID)
			mp.LimitingDetail = &matrixLimiting{Organism: o.Limiting.Organism, Section: o.Limiting.Section, RelativeMargin: finite(o.LimitingRelative)}
		}
		e := o.Envelope
		if e.MaxSeal.Found {
			v := e.MaxSeal.Value
			mp.MaxSealFlowM3s, mp.MaxSealFlowAtSearchEnd = &v, e.MaxSeal.AtRangeEnd
		}
		if e.MinSetpoint.Found {
			v := e.MinSetpoint.Value
			mp.MinSetpointC = &v
		}
		if e.MaxSeal.Refused != "" || e.MinSetpoint.Refused != "" {
			mp.Refusals = &matrixEdgeRefusals{MaxSealFlow: e.MaxSeal.Refused, MinSetpoint: e.MinSetpoint.Refused}
		}
		rep.Products = append(rep.Products, mp)
	}
	return rep
}

// writeMatrixRecord renders the matrix record and writes it atomically.
func writeMatrixRecord(line *plantfile.Plant, rows []assess.OnLine, path string, date time.Time, force bool, out io.Writer) error {
	inputs := []string{line.File}
	for _, o := range rows {
		inputs = append(inputs, o.Result.Plant.File)
	}
	for _, in := range inputs {
		if sameFile(path, in) {
			return usagef("the record %s would overwrite the input file %s", path, in)
		}
	}
	doc := record.BuildMatrix(line, rows, record.Options{Date: date})
	pdf, pages, err := report.Render(doc)
	if err != nil {
		return err
	}
	if err := fileout.Write(path, pdf, force); err != nil {
		return usagef("%v", err)
	}
	verdict := "PASS"
	switch {
	case doc.Cover.NotJudged:
		verdict = present.NotJudged
	case !doc.Cover.Pass:
		verdict = "FAIL"
	}
	fmt.Fprintf(out, "wrote %s: %d pages, %s, line file sha256 %s and %d product files\n", path, pages, verdict, line.SHA256, len(rows))
	return nil
}
