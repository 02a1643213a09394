package runlog

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// readAll reads a whole file from text, clock times as Unix seconds (Origin
// added); it fails the test on error.
func readAll(t *testing.T, text string, opt Options) ([]Record, *Reader) {
	t.Helper()
	r, err := NewReader(strings.NewReader(text), "run.csv", opt)
	if err != nil {
		t.Fatal(err)
	}
	var recs []Record
	for r.Next() {
		rec := *r.Record()
		rec.Optional = append([]float64(nil), rec.Optional...)
		rec.Time += float64(r.Origin())
		recs = append(recs, rec)
	}
	if err := r.Err(); err != nil {
		t.Fatal(err)
	}
	return recs, r
}

const base = "time,hold_outlet_temperature [°C],flow_rate [L/h],forward\n" +
	"2026-03-14T06:00:00Z,72.80,10000.0,1\n" +
	"2026-03-14T06:00:01Z,72.40,10012.5,1\n" +
	"2026-03-14T06:00:02.5Z,71.90,9990.0,0\n"

// baseWant is base in SI: Unix seconds of 2026-03-14T06:00:00Z (computed
// with the standard library's time.Date), °C, m³/s.
func baseWant() []Record {
	t0 := float64(time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC).Unix())
	return []Record{
		{Line: 2, Time: t0, Temperature: 72.80, Flow: 10000.0 / 3.6e6, Forward: true},
		{Line: 3, Time: t0 + 1, Temperature: 72.40, Flow: 10012.5 / 3.6e6, Forward: true},
		{Line: 4, Time: t0 + 2.5, Temperature: 71.90, Flow: 9990.0 / 3.6e6, Forward: false},
	}
}

func sameRecords(t *testing.T, got, want []Record, tol float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%d records, want %d", len(got), len(want))
	}
	for i := range want {
		g, w := got[i], want[i]
		if g.Line != w.Line || g.Forward != w.Forward ||
			math.Abs(g.Time-w.Time) > 1e-6 ||
			math.Abs(g.Temperature-w.Temperature) > tol*math.Abs(w.Temperature) ||
			math.Abs(g.Flow-w.Flow) > tol*math.Abs(w.Flow) {
			t.Errorf("record %d: %+v, want %+v", i, g, w)
		}
	}
}

// TestDialects reads the same three samples written in the ways recorder
// exports differ; every one must give base's SI values.
func TestDialects(t *testing.T) {
	// °F and gpm: 72.80 °C = 163.04 °F, 72.40 °C = 162.32 °F, 71.90 °C = 161.42 °F
	// (T·9/5 + 32, exact in decimal); 1 gpm = 3.785411784 L/min (NIST SP 811), so
	// 10000 L/h = 44.0287433… gpm: written with 12 digits, read back to 1e-11.
	gpm := func(lh float64) string { return strconv.FormatFloat(lh/60/3.785411784, 'f', 12, 64) }
	us := "time;hold_outlet_temperature [°F];flow_rate [gpm];forward\n" +
		"2026-03-14T06:00:00Z;163,04;" + strings.ReplaceAll(gpm(10000), ".", ",") + ";TRUE\n" +
		"2026-03-14T06:00:01Z;162,32;" + strings.ReplaceAll(gpm(10012.5), ".", ",") + ";Forward\n" +
		"2026-03-14T06:00:02,5Z;161,42;" + strings.ReplaceAll(gpm(9990), ".", ",") + ";divert\n"
	renamed := "Zeit\tT_hold [degC]\tQ [m3/h]\tFDD\n" +
		"2026-03-14 07:00:00+01:00\t72.8\t10\t1\n" +
		"2026-03-14 07:00:01+01:00\t72.4\t10.0125\t1\n" +
		"2026-03-14 07:00:02.500+01:00\t71.9\t9.99\t0\n"
	quoted := "\xef\xbb\xbf\"time\",\"hold_outlet_temperature [°C]\",\"flow_rate [L/h]\",\"forward\",\"note\"\r\n" +
		"\r\n" +
		"\"2026-03-14T06:00:00Z\",\"72.80\",\"10000.0\",\"1\",\"start, \"\"A\"\"\"\r\n" +
		" 2026-03-14T06:00:01Z , 72.40 ,10012.5, 1 ,\r\n" +
		"2026-03-14T06:00:02.5Z,71.90,9990.0,0,"
	cases := []struct {
		name string
		text string
		opt  Options
		line []int // line numbers of the records, when not 2, 3, 4
	}{
		{"plain", base, Options{}, nil},
		{"°F, gpm, ';' and decimal commas", us, Options{DecimalComma: true}, nil},
		{"renamed columns, tabs, local offset, m3/h", renamed, Options{Columns: map[string]string{
			KeyTime: "zeit", KeyTemperature: "T_hold", KeyFlow: "Q", KeyForward: "FDD"}}, nil},
		{"BOM, quotes, CRLF, blank line, spaces, extra column", quoted, Options{}, []int{3, 4, 5}},
		{"units from the options", strings.Replace(strings.Replace(base, " [°C]", "", 1), " [L/h]", "", 1),
			Options{TemperatureUnit: "°C", FlowUnit: "L/h"}, nil},
		{"header unit and the same option", base, Options{TemperatureUnit: "degC"}, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			want := baseWant()
			for i, l := range c.line {
				want[i].Line = l
			}
			got, _ := readAll(t, c.text, c.opt)
			sameRecords(t, got, want, 1e-11)
		})
	}
}

// TestGzipByContent reads compressed files by their magic bytes, whatever
// the name, and hashes the bytes as stored.
func TestGzipByContent(t *testing.T) {
	var z bytes.Buffer
	w := gzip.NewWriter(&z)
	w.Write([]byte(base))
	w.Close()
	dir := t.TempDir()
	for _, name := range []string{"run.csv", "run.csv.gz", "run"} {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, z.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		r, err := Open(p, Options{Hash: true})
		if err != nil {
			t.Fatal(err)
		}
		var got []Record
		for r.Next() {
			rec := *r.Record()
			rec.Time += float64(r.Origin())
			got = append(got, rec)
		}
		if err := r.Err(); err != nil {
			t.Fatal(err)
		}
		sameRecords(t, got, baseWant(), 1e-12)
		sum := sha256.Sum256(z.Bytes())
		if !bytes.Equal(r.SHA256(), sum[:]) {
			t.Errorf("%s: SHA-256 %x, want the stored bytes' %x", name, r.SHA256(), sum)
		}
		if read, total := r.Progress(); read != int64(z.Len()) || total != int64(z.Len()) {
			t.Errorf("%s: progress %d of %d, want %d of %d", name, read, total, z.Len(), z.Len())
		}
		r.Close()
	}
	// A plain file named .gz is read as text.
	p := filepath.Join(dir, "plain.csv.gz")
	os.WriteFile(p, []byte(base), 0o644)
	r, err := Open(p, Options{})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for r.Next() {
		n++
	}
	if r.Err() != nil || n != 3 {
		t.Errorf("plain file named .gz: %d rows, %v", n, r.Err())
	}
	r.Close()
}

// TestTimes covers the time forms: seconds with and without a unit, local
// times in a zone, and the mass-flow report.
func TestTimes(t *testing.T) {
	t.Run("seconds", func(t *testing.T) {
		got, r := readAll(t, "time,hold_outlet_temperature [°C],flow_rate [kg/h],forward\n0,72.8,10310,1\n1.5,72.8,10310,1\n", Options{})
		if r.ClockTimes() || !r.FlowIsMass() {
			t.Errorf("clock %v mass %v, want false true", r.ClockTimes(), r.FlowIsMass())
		}
		// 10 310 kg/h = 10310/3600 kg/s.
		if math.Abs(got[1].Time-1.5) > 1e-12 || math.Abs(got[0].Flow-10310.0/3600) > 1e-15 {
			t.Errorf("got %+v", got)
		}
	})
	t.Run("minutes", func(t *testing.T) {
		got, _ := readAll(t, "time [min],hold_outlet_temperature [°C],flow_rate [L/h],forward\n0,72.8,10000,1\n0.5,72.8,10000,1\n", Options{})
		if math.Abs(got[1].Time-30) > 1e-12 {
			t.Errorf("0.5 min read as %g s", got[1].Time)
		}
	})
	t.Run("zone-less in a location", func(t *testing.T) {
		loc := time.FixedZone("plant", 2*3600)
		got, r := readAll(t, "time,hold_outlet_temperature [°C],flow_rate [L/h],forward\n2026-03-14T08:00:00,72.8,10000,1\n", Options{Location: loc})
		want := float64(time.Date(2026, 3, 14, 6, 0, 0, 0, time.UTC).Unix())
		if !r.ZoneLess() || math.Abs(got[0].Time-want) > 1e-9 {
			t.Errorf("08:00 at +02:00 read as %g, want %g (zone-less %v)", got[0].Time, want, r.ZoneLess())
		}
	})
}

// TestClockTimesKeepTheirFraction: clock times count from the start of the
// first row's date (Origin), so a fraction of a second is kept to the
// nanosecond; as Unix seconds in a float64 (2^31 s < 1.77e9 s < 2^31, a
// step of 2^-22 s = 0.24 µs) it would be rounded. The values are exact
// decimal arithmetic on the text.
func TestClockTimesKeepTheirFraction(t *testing.T) {
	text := "time,hold_outlet_temperature [°C],flow_rate [L/h],forward\n" +
		"2026-03-14T06:00:00.000000001Z,72.8,10000,1\n" +
		"2026-03-14T06:00:15.000000002Z,72.8,10000,1\n" +
		"2026-03-15T00:00:00.25+00:00,72.8,10000,1\n"
	r, err := NewReader(strings.NewReader(text), "run.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	var got []float64
	for r.Next() {
		got = append(got, r.Record().Time)
	}
	if err := r.Err(); err != nil {
		t.Fatal(err)
	}
	// 2026-03-14T00:00:00Z, by the standard library.
	if want := time.Date(2026, 3, 14, 0, 0, 0, 0, time.UTC).Unix(); r.Origin() != want {
		t.Errorf("origin %d, want %d", r.Origin(), want)
	}
	// 6 h = 21 600 s; the next day's midnight is 86 400 s.
	want := []float64{21600.000000001, 21615.000000002, 86400.25}
	for i, w := range want {
		if i >= len(got) || math.Abs(got[i]-w) > 1e-12*w {
			t.Fatalf("times %v, want %v", got, want)
		}
	}
	// The interval of 15.000000001 s survives; in Unix seconds it would not.
	if d := got[1] - got[0]; math.Abs(d-15.000000001) > 1e-11 {
		t.Errorf("interval %.12f s, want 15.000000001 s", d)
	}
	// Seconds from a start count from 0.
	_, sr := readAll(t, "time [s],hold_outlet_temperature [°C],flow_rate [L/h],forward\n5,72.8,10000,1\n", Options{})
	if sr.Origin() != 0 {
		t.Errorf("seconds from a start: origin %d, want 0", sr.Origin())
	}
}

// TestOptionalColumns reads a further numeric column by a Column entry.
func TestOptionalColumns(t *testing.T) {
	opt := Options{Optional: []Column{
		{Key: "heating_medium_in", Role: RoleNumber, Kinds: []units.Kind{units.Temperature}},
		{Key: "heating_medium_flow", Role: RoleNumber, Kinds: []units.Kind{units.VolumeFlow, units.MassFlow}},
	}}
	text := "time,hold_outlet_temperature [°C],flow_rate [L/h],forward,heating_medium_in [°F]\n" +
		"0,72.8,10000,1,170.6\n1,72.8,10000,1,\n"
	got, r := readAll(t, text, opt)
	if !r.HasOptional(0) || r.HasOptional(1) {
		t.Errorf("has optional: %v %v, want true false", r.HasOptional(0), r.HasOptional(1))
	}
	// 170.6 °F = (170.6 − 32)·5/9 = 77 °C.
	if math.Abs(got[0].Optional[0]-77) > 1e-9 || !math.IsNaN(got[1].Optional[0]) || !math.IsNaN(got[0].Optional[1]) {
		t.Errorf("optional values %v %v", got[0].Optional, got[1].Optional)
	}
}

const hdr = "time,hold_outlet_temperature [°C],flow_rate [L/h],forward\n"

// TestBadFiles checks that every kind of bad file is refused with its
// position: file, line, column (1-based byte offset of the field), field.
func TestBadFiles(t *testing.T) {
	row := "2026-03-14T06:00:00Z,72.8,10000,1\n"
	var gz bytes.Buffer
	w := gzip.NewWriter(&gz)
	w.Write([]byte(hdr + strings.Repeat(row, 2000)))
	w.Close()
	cut := string(gz.Bytes()[:gz.Len()/2])
	cases := []struct {
		name      string
		text      string
		opt       Options
		line, col int
		field     string
		msg       string
	}{
		{"empty", "", Options{}, 1, 1, "", "the file is empty"},
		{"blank lines only", "\n\n", Options{}, 3, 1, "", "the file is empty"},
		{"header only", hdr, Options{}, 2, 1, "", "no data rows"},
		{"unknown unit", "time,hold_outlet_temperature [°X],flow_rate [L/h],forward\n" + row, Options{}, 1, 6, KeyTemperature, "not a unit of temperature"},
		{"flow unit of the wrong kind", "time,hold_outlet_temperature [°C],flow_rate [kPa],forward\n" + row, Options{}, 1, 36, KeyFlow, "not a unit of volumetric flow or mass flow"},
		// Messages that say what to change name the command line's flags.
		{"no unit", "time,hold_outlet_temperature,flow_rate [L/h],forward\n" + row, Options{}, 1, 6, KeyTemperature, "no unit for temperature: write it in the header, as \"hold_outlet_temperature [°C]\", or give --temperature-unit"},
		{"no flow unit", "time,hold_outlet_temperature [°C],flow_rate,forward\n" + row, Options{}, 1, 36, KeyFlow, "or give --flow-unit"},
		{"unit conflict", hdr + row, Options{TemperatureUnit: "°F"}, 1, 6, KeyTemperature, `the header says [°C] but --temperature-unit says "°F"`},
		{"missing column", "time,hold_outlet_temperature [°C],flow_rate [L/h]\n2026-03-14T06:00:00Z,72.8,10000\n", Options{}, 1, 1, KeyForward, `no column "forward" (it has "time", "hold_outlet_temperature [°C]", "flow_rate [L/h]"); name the file's column for it with --columns forward=NAME`},
		{"two columns for one key", "time,hold_outlet_temperature [°C],flow_rate [L/h],forward,Forward\n", Options{}, 1, 60, KeyForward, "a second column"},
		{"decimal comma with a ',' header", hdr + row, Options{DecimalComma: true}, 1, 1, "", "cannot go with decimal commas: export with ';' or tabs between columns, or read without --decimal-comma"},
		{"separator unknown", "time hold_outlet_temperature flow_rate forward\n", Options{}, 1, 1, "", "give --separator if the header uses several"},
		{"text in a number", hdr + row + "2026-03-14T06:00:01Z,72.8,ten,1\n", Options{}, 3, 27, KeyFlow, `expected a number, found "ten"`},
		{"decimal comma unannounced", "time;hold_outlet_temperature [°C];flow_rate [L/h];forward\n2026-03-14T06:00:00Z;72,8;10000;1\n", Options{}, 2, 22, KeyTemperature,
			`found "72,8": if the file is written with decimal commas, read it with --decimal-comma`},
		{"decimal comma in quotes, ',' separator", hdr + "2026-03-14T06:00:00Z,\"72,8\",10000,1\n", Options{}, 2, 22, KeyTemperature,
			"export it with ';' or tabs between columns and read it with --decimal-comma"},
		{"point with decimal comma", "time;hold_outlet_temperature [°C];flow_rate [L/h];forward\n2026-03-14T06:00:00Z;72,8;10.000;1\n", Options{DecimalComma: true}, 2, 27, KeyFlow, "thousands separator"},
		{"time backwards", hdr + row + "2026-03-14T06:00:02Z,72.8,10000,1\n2026-03-14T06:00:01Z,72.8,10000,1\n", Options{}, 4, 1, KeyTime, "time goes backwards"},
		{"bad time", hdr + row + "2026-03-14T06:00:61Z,72.8,10000,1\n", Options{}, 3, 1, KeyTime, "expected an RFC 3339 date and time"},
		{"seconds after clock times", hdr + row + "12,72.8,10000,1\n", Options{}, 3, 1, KeyTime, "expected an RFC 3339"},
		{"clock time under a unit", "time [s],hold_outlet_temperature [°C],flow_rate [L/h],forward\n" + row, Options{}, 2, 1, KeyTime, "remove the unit"},
		{"bad flag", hdr + "2026-03-14T06:00:00Z,72.8,10000,yes\n", Options{}, 2, 33, KeyForward, "expected 1/0, true/false or forward/divert"},
		{"below absolute zero", "time,hold_outlet_temperature [K],flow_rate [L/h],forward\n2026-03-14T06:00:00Z,-1,10000,1\n", Options{}, 2, 22, KeyTemperature, "below absolute zero"},
		// At the first ';' (byte 21).
		{"mixed separators", hdr + row + "2026-03-14T06:00:01Z;72.8;10000;1\n", Options{}, 3, 21, "", "mixed separators"},
		// Just past the end of the 31-byte line, where the fourth field was expected.
		{"missing field", hdr + "2026-03-14T06:00:00Z,72.8,10000\n", Options{}, 2, 32, "", "3 fields where the header has 4"},
		// At the fifth field (byte 35).
		{"extra field", hdr + "2026-03-14T06:00:00Z,72.8,10000,1,5\n", Options{}, 2, 35, "", "5 fields where the header has 4"},
		{"quote runs past the line", hdr + "2026-03-14T06:00:00Z,\"72.8,10000,1\n", Options{}, 2, 22, "", "past the end of the line"},
		{"bare quote", hdr + "2026-03-14T06:00:00Z,72\"8,10000,1\n", Options{}, 2, 24, "", "a quote inside a field"},
		{"empty number", hdr + "2026-03-14T06:00:00Z,,10000,1\n", Options{}, 2, 22, KeyTemperature, "empty"},
		{"damaged compressed data", cut, Options{}, 0, 0, "", "damaged or cut short"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			e := firstError(t, c.text, c.opt)
			if e.Pos.File != "run.csv" || e.Pos.Line != c.line && c.line != 0 || e.Pos.Column != c.col || e.Field != c.field || !strings.Contains(e.Msg, c.msg) {
				t.Errorf("got %v\nwant run.csv:%d:%d: %s: …%s…", e, c.line, c.col, c.field, c.msg)
			}
		})
	}
}

// firstError reads text to its end and returns the error's last entry (the
// one that stopped the reading).
func firstError(t *testing.T, text string, opt Options) *inputerr.Error {
	t.Helper()
	r, err := NewReader(strings.NewReader(text), "run.csv", opt)
	if err == nil {
		for r.Next() {
		}
		err = r.Err()
	}
	var l inputerr.List
	if !errors.As(err, &l) || len(l) == 0 {
		t.Fatalf("error %v (%T), want an inputerr.List", err, err)
	}
	return l[len(l)-1]
}

// TestSkipBadRows tolerates up to N malformed rows, counts them and keeps
// the first MaxListed; one more stops the reading and lists them all.
func TestSkipBadRows(t *testing.T) {
	var b strings.Builder
	b.WriteString(hdr)
	for i := range 30 {
		if i%2 == 1 {
			b.WriteString("2026-03-14T06:00:00Z,bad,10000,1\n")
		} else {
			b.WriteString("2026-03-14T06:00:00Z,72.8,10000,1\n")
		}
	}
	text := b.String()
	t.Run("within the limit", func(t *testing.T) {
		recs, r := readAll(t, text, Options{SkipBadRows: 15})
		n, listed := r.Skipped()
		if len(recs) != 15 || n != 15 || len(listed) != MaxListed || listed[0].Pos.Line != 3 {
			t.Errorf("%d rows, %d skipped, %d listed (first %v)", len(recs), n, len(listed), listed[0])
		}
	})
	t.Run("over the limit", func(t *testing.T) {
		r, err := NewReader(strings.NewReader(text), "run.csv", Options{SkipBadRows: 3})
		if err != nil {
			t.Fatal(err)
		}
		for r.Next() {
		}
		var l inputerr.List
		if !errors.As(r.Err(), &l) || len(l) != 4 || l[3].Pos.Line != 9 || !strings.Contains(l[3].Msg, "one more than --skip-bad-rows 3 allows") {
			t.Errorf("error %v", r.Err())
		}
	})
	t.Run("time backwards is never skipped", func(t *testing.T) {
		e := firstError(t, hdr+"2026-03-14T06:00:01Z,72.8,10000,1\n2026-03-14T06:00:00Z,72.8,10000,1\n", Options{SkipBadRows: 5})
		if e.Pos.Line != 3 || e.Field != KeyTime {
			t.Errorf("got %v", e)
		}
	})
}

// TestOptionErrors refuses bad options before reading.
func TestOptionErrors(t *testing.T) {
	cases := []struct {
		name, option string
		opt          Options
	}{
		{"decimal comma with comma separator", "DecimalComma", Options{Separator: ',', DecimalComma: true}},
		{"unknown key", "Columns", Options{Columns: map[string]string{"temp": "T"}}},
		{"bad separator", "Separator", Options{Separator: '|'}},
		{"bad temperature unit", "TemperatureUnit", Options{TemperatureUnit: "L/h"}},
		{"negative skip", "SkipBadRows", Options{SkipBadRows: -1}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := NewReader(strings.NewReader(base), "run.csv", c.opt)
			var oe *OptionError
			if !errors.As(err, &oe) || oe.Option != c.option {
				t.Errorf("error %v, want an OptionError on %s", err, c.option)
			}
		})
	}
}

// TestEach reads several files concurrently and keeps their order.
func TestEach(t *testing.T) {
	dir := t.TempDir()
	var paths []string
	for i := range 5 {
		p := filepath.Join(dir, string(rune('a'+i))+".csv")
		text := hdr + strings.Repeat("2026-03-14T06:00:00Z,72.8,10000,1\n", i+1)
		if i == 3 {
			text = hdr + "2026-03-14T06:00:00Z,x,10000,1\n"
		}
		os.WriteFile(p, []byte(text), 0o644)
		paths = append(paths, p)
	}
	paths = append(paths, filepath.Join(dir, "missing.csv"))
	rows, errs := Each(paths, Options{}, 2, func(r *Reader) (int, error) {
		for r.Next() {
		}
		return r.Rows(), nil
	})
	for i := range 5 {
		if i == 3 {
			if errs[i] == nil {
				t.Errorf("file %d: no error", i)
			}
			continue
		}
		if errs[i] != nil || rows[i] != i+1 {
			t.Errorf("file %d: %d rows, %v; want %d", i, rows[i], errs[i], i+1)
		}
	}
	if errs[5] == nil || !strings.Contains(errs[5].Error(), "missing.csv: cannot read the file") {
		t.Errorf("missing file: %v", errs[5])
	}
}

// TestManyBlocks reads a file of many blocks on several goroutines: records
// in order with their own line numbers, skipped rows counted across
// blocks, time going backwards caught at a block boundary.
func TestManyBlocks(t *testing.T) {
	const rows = 60000 // about 2 MB: several blocks
	var b strings.Builder
	b.WriteString(hdr)
	t0 := time.Date(2026, 3, 14, 0, 0, 0, 0, time.UTC)
	lineOf := map[int]int{} // record index → line
	line, bad := 1, 0
	for i := range rows {
		if i%7919 == 5 {
			b.WriteString("\n") // a blank line
			line++
		}
		if i%10007 == 3 {
			b.WriteString("2026-03-14T00:00:00Z,not a number,10000,1\n")
			line++
			bad++
		}
		line++
		lineOf[i] = line
		b.WriteString(t0.Add(time.Duration(i)*time.Second).Format(time.RFC3339) + ",72.8," + strconv.Itoa(10000+i%100) + ",1\n")
	}
	text := b.String()
	for _, workers := range []int{1, 3} {
		t.Run(fmt.Sprintf("%d workers", workers), func(t *testing.T) {
			recs, r := readAll(t, text, Options{SkipBadRows: bad, Workers: workers})
			if len(recs) != rows {
				t.Fatalf("%d records, want %d", len(recs), rows)
			}
			for i, rec := range recs {
				want := float64(t0.Unix() + int64(i))
				if rec.Line != lineOf[i] || math.Abs(rec.Time-want) > 1e-9 || math.Abs(rec.Flow-float64(10000+i%100)/3.6e6) > 1e-15 {
					t.Fatalf("record %d: line %d time %.0f flow %g; want line %d time %.0f", i, rec.Line, rec.Time, rec.Flow, lineOf[i], want)
				}
			}
			if n, listed := r.Skipped(); n != bad || listed[0].Pos.Line != lineOf[3]-1 {
				t.Errorf("skipped %d (first %v), want %d at line %d", n, listed[0], bad, lineOf[3]-1)
			}
		})
	}
	// Swap two rows so that the one going back in time is inside a block,
	// or opens the second block (rows are of one length, so the blocks do
	// not move: the first holds the k lines after the header that fit in
	// blockSize bytes): the error names its line either way.
	lines := strings.Split(text, "\n")
	k := strings.Count(text[len(hdr):len(hdr)+blockSize], "\n")
	for _, at := range []int{rows / 2, k} {
		swapped := append([]string(nil), lines...)
		swapped[at], swapped[at+1] = swapped[at+1], swapped[at]
		e := firstError(t, strings.Join(swapped, "\n"), Options{SkipBadRows: bad, Workers: 3})
		if e.Pos.Line != at+2 || e.Field != KeyTime || !strings.Contains(e.Msg, "time goes backwards") {
			t.Errorf("swap at line %d: %v", at+1, e)
		}
	}
}

// TestOptionalManyRows checks optional values across a batch's storage
// growing and across blocks.
func TestOptionalManyRows(t *testing.T) {
	var b strings.Builder
	b.WriteString("time,hold_outlet_temperature [°C],flow_rate [L/h],forward,heating_medium_in [°C]\n")
	for i := range 30000 {
		fmt.Fprintf(&b, "%d,72.8,10000,1,%d\n", i, i%1000)
	}
	opt := Options{Optional: []Column{{Key: "heating_medium_in", Role: RoleNumber, Kinds: []units.Kind{units.Temperature}}}, Workers: 2}
	recs, _ := readAll(t, b.String(), opt)
	for i, rec := range recs {
		if math.Abs(rec.Optional[0]-float64(i%1000)) > 1e-12 {
			t.Fatalf("record %d: heating_medium_in %g, want %d", i, rec.Optional[0], i%1000)
		}
	}
}

// TestCloseEarly stops reading part way: Close releases the reading
// goroutines.
func TestCloseEarly(t *testing.T) {
	var b strings.Builder
	b.WriteString(hdr)
	for i := range 100000 {
		fmt.Fprintf(&b, "%d,72.8,10000,1\n", i)
	}
	before := runtime.NumGoroutine()
	for range 5 {
		r, err := NewReader(strings.NewReader(b.String()), "run.csv", Options{Workers: 3})
		if err != nil {
			t.Fatal(err)
		}
		for i := 0; i < 10 && r.Next(); i++ {
		}
		r.Close()
	}
	if after := runtime.NumGoroutine(); after > before {
		t.Errorf("%d goroutines after closing, %d before", after, before)
	}
}
