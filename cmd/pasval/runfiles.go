package main

import (
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"net/url"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"
	_ "time/tzdata" // --timezone works on systems without a zone database

	"github.com/spf13/cobra"

	"pasval/fouling"
	"pasval/internal/assess"
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
	"pasval/internal/runlog"
	"pasval/internal/units"
	"pasval/runs"
)

// runFlags are the options of the commands that read recorded runs (logs,
// and report with --log): how to read the files and how to judge them.
type runFlags struct {
	columns         map[string]string // key → the file's header name
	separator       string
	decimalComma    bool
	temperatureUnit string
	flowUnit        string
	timezone        string
	skipBadRows     int
	gap             float64 // s; 0: 5 × the median interval
	window          float64 // s, the heating section's windows; 0: defaultWindow
	quiet           bool
}

// defaultWindow is the width of the heating section's windows unless
// --window says, s (docs/METHOD.md §17.1).
const defaultWindow = 60.0

// windowWidth is the heating section's window width, s.
func (f runFlags) windowWidth() float64 {
	if f.window == 0 {
		return defaultWindow
	}
	return f.window
}

// The heating section's optional columns (docs/METHOD.md §17.1), in the
// order of their values in runlog.Record.Optional: the four temperatures
// first, then the medium flow.
const (
	keyHeatingProductIn  = "heating_product_in"
	keyHeatingProductOut = "heating_product_out"
	keyHeatingMediumIn   = "heating_medium_in"
	keyHeatingMediumOut  = "heating_medium_out"
	keyHeatingMediumFlow = "heating_medium_flow"
)

var heatingColumns = []runlog.Column{
	{Key: keyHeatingProductIn, Role: runlog.RoleNumber, Kinds: []units.Kind{units.Temperature}},
	{Key: keyHeatingProductOut, Role: runlog.RoleNumber, Kinds: []units.Kind{units.Temperature}},
	{Key: keyHeatingMediumIn, Role: runlog.RoleNumber, Kinds: []units.Kind{units.Temperature}},
	{Key: keyHeatingMediumOut, Role: runlog.RoleNumber, Kinds: []units.Kind{units.Temperature}},
	{Key: keyHeatingMediumFlow, Role: runlog.RoleNumber, Kinds: []units.Kind{units.VolumeFlow, units.MassFlow}},
}

// heatingTemperatures is how many of heatingColumns are temperatures.
const heatingTemperatures = 4

func (f *runFlags) register(cmd *cobra.Command) {
	fl := cmd.Flags()
	// The names are runlog's, which its messages use.
	name := func(flag string) string { return strings.TrimPrefix(flag, "--") }
	fl.StringToStringVar(&f.columns, name(runlog.FlagColumns), nil, "the file's header names for the columns, key=Header,… (keys: time, hold_outlet_temperature, flow_rate, forward; "+
		"optional: heating_product_in, heating_product_out, heating_medium_in, heating_medium_out, heating_medium_flow)")
	fl.StringVar(&f.separator, name(runlog.FlagSeparator), "", "the separator between columns: ',', ';' or tab (default: the one the header uses)")
	fl.BoolVar(&f.decimalComma, name(runlog.FlagDecimalComma), false, "numbers are written with a decimal comma (72,5); not with the ',' separator")
	fl.StringVar(&f.temperatureUnit, name(runlog.FlagTemperatureUnit), "", "unit of a temperature column whose header gives none (°C, °F, K)")
	fl.StringVar(&f.flowUnit, name(runlog.FlagFlowUnit), "", "unit of a flow column whose header gives none (L/h, gpm, m3/h, kg/h, lb/h, …)")
	fl.StringVar(&f.timezone, name(runlog.FlagTimezone), "", "time zone of clock times written without an offset, and of the times shown (IANA name such as Europe/Berlin; default UTC)")
	fl.IntVar(&f.skipBadRows, name(runlog.FlagSkipBadRows), 0, "skip up to N malformed rows (counted, the first listed) instead of stopping at the first")
	fl.Float64Var(&f.gap, name(runlog.FlagGap), 0, "longest interval between samples, s, that is not a recording gap (default: 5 × the median interval)")
	fl.Float64Var(&f.window, name(runlog.FlagWindow), defaultWindow, "width of the clock-aligned windows over which the heating section's U is computed, s (with the heating columns)")
	fl.BoolVar(&f.quiet, "quiet", false, "no progress bar")
}

// encode writes the flags that decide how the runs are read and judged as
// one line of query text (sorted keys, defaults left out), kept in a
// run-review record so that verify reads the runs the same way.
func (f runFlags) encode() string {
	v := url.Values{}
	if len(f.columns) > 0 {
		keys := make([]string, 0, len(f.columns))
		for k := range f.columns {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		var pairs []string
		for _, k := range keys {
			pairs = append(pairs, k+"="+f.columns[k])
		}
		v["columns"] = pairs
	}
	set := func(key, val string) {
		if val != "" {
			v.Set(key, val)
		}
	}
	set("separator", f.separator)
	if f.decimalComma {
		v.Set("decimal-comma", "true")
	}
	set("temperature-unit", f.temperatureUnit)
	set("flow-unit", f.flowUnit)
	set("timezone", f.timezone)
	if f.skipBadRows != 0 {
		v.Set("skip-bad-rows", strconv.Itoa(f.skipBadRows))
	}
	if f.gap != 0 {
		v.Set("gap", strconv.FormatFloat(f.gap, 'g', -1, 64))
	}
	if w := f.windowWidth(); w != defaultWindow {
		v.Set("window", strconv.FormatFloat(w, 'g', -1, 64))
	}
	return v.Encode()
}

// decodeRunFlags reads what encode wrote.
func decodeRunFlags(s string) (runFlags, error) {
	v, err := url.ParseQuery(s)
	if err != nil {
		return runFlags{}, err
	}
	f := runFlags{separator: v.Get("separator"), temperatureUnit: v.Get("temperature-unit"), flowUnit: v.Get("flow-unit"),
		timezone: v.Get("timezone"), decimalComma: v.Get("decimal-comma") == "true"}
	for _, pair := range v["columns"] {
		k, h, ok := strings.Cut(pair, "=")
		if !ok {
			return runFlags{}, fmt.Errorf("column mapping %q", pair)
		}
		if f.columns == nil {
			f.columns = map[string]string{}
		}
		f.columns[k] = h
	}
	if s := v.Get("skip-bad-rows"); s != "" {
		if f.skipBadRows, err = strconv.Atoi(s); err != nil {
			return runFlags{}, err
		}
	}
	if s := v.Get("gap"); s != "" {
		if f.gap, err = strconv.ParseFloat(s, 64); err != nil {
			return runFlags{}, err
		}
	}
	if s := v.Get("window"); s != "" {
		if f.window, err = strconv.ParseFloat(s, 64); err != nil {
			return runFlags{}, err
		}
	}
	return f, nil
}

// reading says in words how the runs were read, for the record.
func (f runFlags) reading() [][2]string {
	sep := "as the header uses"
	switch f.separator {
	case ",", ";":
		sep = "'" + f.separator + "'"
	case "tab", "\t", `\t`:
		sep = "tab"
	}
	kv := [][2]string{{"separator", sep}}
	if f.decimalComma {
		kv = append(kv, [2]string{"decimal mark", "comma"})
	}
	if len(f.columns) > 0 {
		keys := make([]string, 0, len(f.columns))
		for k := range f.columns {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		var m []string
		for _, k := range keys {
			m = append(m, k+" = "+strconv.Quote(f.columns[k]))
		}
		kv = append(kv, [2]string{"columns", strings.Join(m, ", ")})
	}
	if f.temperatureUnit != "" {
		kv = append(kv, [2]string{"temperature unit", f.temperatureUnit + " where the header gives none"})
	}
	if f.flowUnit != "" {
		kv = append(kv, [2]string{"flow unit", f.flowUnit + " where the header gives none"})
	}
	if f.skipBadRows > 0 {
		kv = append(kv, [2]string{"malformed rows", fmt.Sprintf("up to %d skipped", f.skipBadRows)})
	}
	gap := "5 × the median interval"
	if f.gap > 0 {
		gap = strconv.FormatFloat(f.gap, 'g', -1, 64) + " s, as given"
	}
	kv = append(kv, [2]string{"gap limit", gap})
	if w := f.windowWidth(); w != defaultWindow {
		kv = append(kv, [2]string{"heating windows", strconv.FormatFloat(w, 'g', -1, 64) + " s, as given"})
	}
	return kv
}

// readerOptions checks the flags and turns them into the reader's options
// and the time zone; every refusal names its flag (exit 2).
func (f runFlags) readerOptions() (runlog.Options, *time.Location, error) {
	opt := runlog.Options{Columns: f.columns, DecimalComma: f.decimalComma, TemperatureUnit: f.temperatureUnit,
		FlowUnit: f.flowUnit, SkipBadRows: f.skipBadRows, Hash: true, Optional: heatingColumns}
	switch f.separator {
	case "":
	case ",", ";":
		opt.Separator = f.separator[0]
	case "tab", "\t", `\t`:
		opt.Separator = '\t'
	default:
		return opt, nil, usagef("%s must be ',', ';' or tab, not %q", runlog.FlagSeparator, f.separator)
	}
	if !(f.gap >= 0) || f.gap > 1e9 {
		return opt, nil, usagef("%s must be a number of seconds above 0 (0 or absent: 5 × the median interval), not %g", runlog.FlagGap, f.gap)
	}
	if !(f.window >= 0) || f.window > 86400 {
		return opt, nil, usagef("%s must be a number of seconds above 0 and at most 86400 (a day), not %g", runlog.FlagWindow, f.window)
	}
	loc := time.UTC
	if f.timezone != "" {
		l, err := time.LoadLocation(f.timezone)
		if err != nil || strings.EqualFold(f.timezone, "local") {
			return opt, nil, usagef("%s %q is not a time zone name: give an IANA name such as Europe/Berlin or America/Chicago, or UTC", runlog.FlagTimezone, f.timezone)
		}
		loc = l
	}
	opt.Location = loc
	if err := opt.Validate(); err != nil {
		return opt, nil, flagError(err)
	}
	return opt, loc, nil
}

// flagError turns a reader's option error into a usage error naming the flag.
func flagError(err error) error {
	var oe *runlog.OptionError
	if !errors.As(err, &oe) {
		return err
	}
	if name := runlog.OptionFlag(oe.Option); name != "" {
		return usagef("%s: %s", name, oe.Msg)
	}
	return usagef("%s", oe.Msg)
}

// runExtensions are the file names a folder's recorded runs are found by.
var runExtensions = []string{".csv", ".csv.gz", ".tsv", ".tsv.gz", ".txt", ".txt.gz"}

// runPaths expands the arguments: a folder stands for its recorded-run
// files (by name, not descending into sub-folders), in name order.
func runPaths(args []string) ([]string, error) {
	var paths []string
	for _, a := range args {
		st, err := os.Stat(a)
		if err != nil || !st.IsDir() {
			paths = append(paths, a) // the reader names what is wrong with it
			continue
		}
		entries, err := os.ReadDir(a)
		if err != nil {
			return nil, inputerr.List{inputerr.At(inputerr.Pos{File: a}, "", "cannot read the folder: %v", unwrapPath(err))}
		}
		var found []string
		for _, e := range entries {
			name := strings.ToLower(e.Name())
			for _, ext := range runExtensions {
				if strings.HasSuffix(name, ext) && !strings.HasPrefix(name, ".") && e.Type().IsRegular() {
					found = append(found, filepath.Join(a, e.Name()))
					break
				}
			}
		}
		if len(found) == 0 {
			return nil, inputerr.List{inputerr.At(inputerr.Pos{File: a}, "", "the folder holds no recorded run (a file named *%s)", strings.Join(runExtensions, ", *"))}
		}
		sort.Strings(found)
		paths = append(paths, found...)
	}
	return paths, nil
}

func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// reviewRuns reads every file (each on its own core) and judges it against
// the plant, then merges them into one review. Progress goes to diag when
// it is a terminal and the files are large (see showProgress).
func reviewRuns(p *plantfile.Plant, args []string, f runFlags, diag io.Writer) (*assess.RunReview, error) {
	return reviewRunsTraced(p, args, f, diag, 0)
}

// reviewRunsTraced is reviewRuns keeping each file's trace of trace buckets
// (runs.Options.Trace; 0 none), for the record's figures.
func reviewRunsTraced(p *plantfile.Plant, args []string, f runFlags, diag io.Writer, trace int) (*assess.RunReview, error) {
	opt, loc, err := f.readerOptions()
	if err != nil {
		return nil, err
	}
	rm, err := assess.NewRunModel(p)
	if err != nil {
		return nil, err
	}
	paths, err := runPaths(args)
	if err != nil {
		return nil, err
	}
	prog := newProgress(paths, f.quiet, diag)
	files, errs := runlog.Each(paths, opt, 0, func(r *runlog.Reader) (assess.RunFile, error) {
		prog.add(r)
		return judgeRun(r, rm, runs.Options{GapThreshold: f.gap, Trace: trace}, f.windowWidth())
	})
	prog.done()
	var all inputerr.List
	for _, err := range errs {
		if err == nil {
			continue
		}
		var list inputerr.List
		if !errors.As(err, &list) {
			return nil, flagError(err)
		}
		all = append(all, list...)
	}
	if len(all) > 0 {
		return nil, all
	}
	rev, err := assess.NewRunReview(p, rm, files, loc)
	if err != nil {
		return nil, reviewError(err)
	}
	return rev, nil
}

// reviewError is NewRunReview's error for the command line: a positioned
// one as it is, files that mix time formats a usage error.
func reviewError(err error) error {
	var list inputerr.List
	if errors.As(err, &list) {
		return err
	}
	return usagef("%v", err)
}

// judgeRun feeds one file's samples to the engine, and with the heating
// section's columns gathers them into windows of width s.
//
// The engine starts at the first record, when the reader knows the origin
// its clock times count from: the engine computes in those times (exact to
// the nanosecond) and gives its results in Unix seconds.
func judgeRun(r *runlog.Reader, rm assess.RunModel, opt runs.Options, width float64) (assess.RunFile, error) {
	heat, err := heatingWindower(r, width)
	if err != nil {
		return assess.RunFile{}, err
	}
	var e *runs.Engine
	origin := 0.0
	mass := r.FlowIsMass()
	for r.Next() {
		if e == nil {
			origin = float64(r.Origin())
			opt.Origin = origin
			if e, err = runs.NewEngine(rm.Model, opt); err != nil {
				return assess.RunFile{}, err // NewRunModel has checked the criteria
			}
		}
		rec := r.Record()
		if heat != nil {
			o := rec.Optional
			heat.Add(fouling.Sample{Time: origin + rec.Time, ProductMassFlow: rm.ProductMassFlow(rec.Flow, mass), Forward: rec.Forward,
				ProductIn: o[0], ProductOut: o[1], MediumIn: o[2], MediumOut: o[3], MediumFlow: o[4]})
		}
		s := runs.Sample{Time: rec.Time, Temperature: rec.Temperature, Flow: rm.TubeFlow(rec.Flow, mass), Forward: rec.Forward}
		if err := e.Add(s); err != nil {
			var se *runs.SampleError
			field := ""
			if errors.As(err, &se) {
				field = map[string]string{"time": runlog.KeyTime, "temperature": runlog.KeyTemperature, "flow": runlog.KeyFlow}[se.Field]
			}
			return assess.RunFile{}, inputerr.List{inputerr.At(inputerr.Pos{File: r.Name(), Line: rec.Line}, field, "%v", err)}
		}
	}
	if err := r.Err(); err != nil {
		return assess.RunFile{}, err
	}
	if e == nil { // not reached: the reader refuses a file without rows
		return assess.RunFile{}, inputerr.List{inputerr.At(inputerr.Pos{File: r.Name(), Line: r.HeaderLine() + 1, Column: 1}, "", "no data rows after the header")}
	}
	bad, listed := r.Skipped()
	f := assess.RunFile{Path: r.Name(), SHA256: hex.EncodeToString(r.SHA256()), Rows: r.Rows(), BadRows: bad, Listed: listed,
		Clock: r.ClockTimes(), Result: e.Finish()}
	if heat != nil {
		f.Heating = &assess.HeatingWindows{Windows: heat.Windows(), Width: heat.Width(), MediumMass: heat.MediumMass()}
	}
	return f, nil
}

// heatingWindower is the windower of a file that has the heating section's
// four temperature columns, nil for a file that has none of them (nothing
// about the heating section runs); a file with some but not all is refused
// at its header.
func heatingWindower(r *runlog.Reader, width float64) (*fouling.Windower, error) {
	var have, missing []string
	for i, c := range heatingColumns[:heatingTemperatures] {
		if r.HasOptional(i) {
			have = append(have, c.Key)
		} else {
			missing = append(missing, c.Key)
		}
	}
	switch {
	case len(have) == 0:
		return nil, nil
	case len(missing) > 0:
		return nil, inputerr.List{inputerr.At(inputerr.Pos{File: r.Name(), Line: r.HeaderLine(), Column: 1}, missing[0],
			"the header has %s but no %s: the heating section's U needs all four of its temperatures "+
				"(name the file's columns for them with %s %s=NAME, or leave the heating columns out)",
			strings.Join(have, ", "), strings.Join(missing, ", "), runlog.FlagColumns, missing[0])}
	}
	flow := r.Columns()[len(runlog.Standard)+heatingTemperatures]
	return fouling.NewWindower(width, flow.Index >= 0 && flow.Kind == units.MassFlow), nil
}
