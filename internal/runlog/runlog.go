// Package runlog reads recorded runs of a continuous pasteurizer — the
// holding-tube outlet temperature, the flow and the flow-diversion position
// against time, as a recorder or historian exports them — one row per sample,
// streaming, so memory stays flat however long the file
// (docs/METHOD.md §13 (recorded runs)).
//
//	r, err := runlog.Open("shift.csv.gz", runlog.Options{})
//	if err != nil {
//		return err // an inputerr.List: file, line, column, field, what was expected
//	}
//	defer r.Close()
//	for r.Next() {
//		rec := r.Record() // SI: s, °C, m³/s (kg/s when r.FlowIsMass())
//		_ = rec
//	}
//	return r.Err()
//
// The file is CSV with a header row. Compressed files are recognised by the
// gzip magic bytes, whatever their name. The separator is ',', ';' or tab,
// the one the header uses most unless Options.Separator says; numbers use '.'
// as the decimal mark, or ',' with Options.DecimalComma (then a '.' in a
// number is an error: it could be a thousands separator).
//
// Columns are found by header name, ignoring case and surrounding spaces:
// time, hold_outlet_temperature, flow_rate and forward, or the names that
// Options.Columns maps these keys to. A numeric column's unit is written in
// the header in brackets, "hold_outlet_temperature [°F]", "flow_rate [gpm]",
// and read by pasval/internal/units; a column without one takes
// Options.TemperatureUnit or Options.FlowUnit, and with neither the file is
// refused: a unit is never assumed. A flow may be volumetric (L/h, gpm, m3/h)
// or by mass (kg/h, lb/h); FlowIsMass says which, and the caller converts a
// mass flow with the product density.
//
// Time is an RFC 3339 date and time, "2026-03-14T06:00:00Z", with or without
// an offset (without, it is read in Options.Location, UTC by default; a space
// may replace the T), or a number of seconds from any origin ("time [min]"
// in the header scales it); the first row fixes which, for the whole file. Time may stand still between rows (a
// duplicated sample) but never go back. forward is 1/0, true/false or
// forward/divert, in any case.
//
// Positions in errors: the line is the file's line (the header is the first
// non-blank line; blank lines are skipped and counted); the column is the
// 1-based byte offset of the field's first byte in its line (an editor's
// "go to column" lands on it; after the UTF-8 byte-order mark on the first
// line, if any); the field is the column's key. A malformed row stops the
// reading unless Options.SkipBadRows allows it; time going backwards always
// stops it. A quoted field may hold the separator or a doubled quote but not
// a line break.
//
// Speed: after the header, one goroutine reads (and decompresses) blocks of
// whole lines while Options.Workers goroutines parse them, and Next hands
// out the records in file order; the field, number and time parsers are
// hand-written (FuzzRunReader holds them to encoding/csv, strconv and
// time.Parse). The caller's own work on the records runs meanwhile.
package runlog

import (
	"bufio"
	"compress/gzip"
	"errors"
	"io"
	"os"
	"sync"
	"sync/atomic"
	"time"

	"pasval/internal/inputerr"
	"pasval/internal/units"
)

// Options say how to read a file; the zero value reads a standard file.
type Options struct {
	// Separator is ',', ';' or '\t'; 0 takes the one the header line uses.
	Separator byte
	// DecimalComma reads "72,5" as 72.5; not with the ',' separator.
	DecimalComma bool
	// Columns maps a column key (time, hold_outlet_temperature, flow_rate,
	// forward, or an Optional key) to the name the file's header uses;
	// the unit in brackets is not part of the name.
	Columns map[string]string
	// Optional lists further numeric columns, read when the header has them.
	Optional []Column
	// TemperatureUnit and FlowUnit are the units of temperature and flow
	// columns whose header gives none ("°F", "gpm", "kg/h"). A header unit
	// that says otherwise is an error.
	TemperatureUnit, FlowUnit string
	// Location is the time zone of clock times written without an offset;
	// nil is UTC.
	Location *time.Location
	// SkipBadRows is how many malformed rows may be skipped (counted, the
	// first MaxListed kept for listing); 0 stops at the first.
	SkipBadRows int
	// Hash computes the SHA-256 of the file's bytes as stored while reading.
	Hash bool
	// Workers is the number of goroutines parsing the file; 0 is one per
	// core.
	Workers int
}

// MaxListed is how many skipped rows' errors a Reader keeps.
const MaxListed = 10

const panicPrefix = "runlog: "

// headerBuffer bounds the header line's length.
const headerBuffer = 64 << 10

// Record is one sample, in SI. The Reader reuses it: copy what you keep.
type Record struct {
	Line int // the file's line
	// Time is in s: for clock times since the Reader's Origin (a whole
	// second near the run, so that the fraction of a time keeps its
	// nanoseconds), else as written.
	Time        float64
	Temperature float64 // °C, hold_outlet_temperature
	Flow        float64 // m³/s, or kg/s when the Reader's FlowIsMass
	Forward     bool
	// Optional holds Options.Optional's columns in SI, in that order; NaN
	// where the column is absent or the cell empty. Read it only: a file
	// with none of the columns shares one slice of NaNs between records.
	Optional []float64
}

// Reader reads one recorded-run file. Its methods are for one goroutine;
// Close releases the goroutines it reads with (reading to the end or to an
// error releases them too).
type Reader struct {
	name   string
	opt    Options
	closer io.Closer
	raw    *bufio.Reader // the bytes as stored
	src    *bufio.Reader // the text (raw itself, or decompressed)
	hash   *asyncHash
	count  *countingReader

	line   int // the last line of the header phase
	header int // the header's line
	found  []Found
	cfg    rowConfig

	// The parsing pipeline (pipeline.go).
	futures     chan chan *batch
	freeBufs    chan []byte
	freeBatches chan *batch
	quit        chan struct{}
	wg          sync.WaitGroup
	decided     bool // the time format is fixed (producer only)
	cur         *batch
	ri, ei      int

	rec      *Record
	rows     int
	prevTime float64
	prevLine int
	zoneNo   bool
	bad      int
	listed   inputerr.List
	err      inputerr.List
	done     bool
}

// Open opens path and reads its header. The caller closes the Reader.
func Open(path string, opt Options) (*Reader, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, inputerr.List{inputerr.At(inputerr.Pos{File: path}, "", "cannot read the file: %v", unwrapPath(err))}
	}
	r, err := newReader(f, path, opt)
	if err != nil {
		if cerr := f.Close(); cerr != nil {
			err = errors.Join(err, cerr) // the reader's error stays first (errors.As still finds it)
		}
		return nil, err
	}
	r.closer = f
	if st, err := f.Stat(); err == nil {
		r.count.total = st.Size()
	}
	return r, nil
}

// NewReader reads a recorded run from rd; name is the file name used in
// errors.
func NewReader(rd io.Reader, name string, opt Options) (*Reader, error) {
	if err := opt.check(); err != nil {
		return nil, err
	}
	return newReader(rd, name, opt)
}

func newReader(rd io.Reader, name string, opt Options) (_ *Reader, err error) {
	r := &Reader{name: name, opt: opt}
	r.cfg.name, r.cfg.decimalComma, r.cfg.loc, r.cfg.nOptional = name, opt.DecimalComma, opt.Location, len(opt.Optional)
	if r.cfg.loc == nil {
		r.cfg.loc = time.UTC
	}
	r.count = &countingReader{r: rd}
	var in io.Reader = r.count
	if opt.Hash {
		r.hash = newAsyncHash(in)
		in = r.hash
	}
	// Small buffers: the blocks (pipeline.go) are larger, so once the
	// header is read bufio hands their reads straight to the file or the
	// decompressor instead of copying.
	defer func() {
		if err != nil && r.hash != nil {
			r.hash.abort()
		}
	}()
	r.raw = bufio.NewReaderSize(in, headerBuffer)
	r.src = r.raw
	// A file shorter than two bytes cannot be gzip; Peek's error then only says so.
	if magic, err := r.raw.Peek(2); err == nil && len(magic) == 2 && magic[0] == 0x1f && magic[1] == 0x8b {
		gz, err := gzip.NewReader(r.raw)
		if err != nil {
			return nil, r.listAt(inputerr.Pos{File: name}, "", "the file starts like gzip-compressed data but cannot be decompressed: %v", err)
		}
		r.src = bufio.NewReaderSize(gz, headerBuffer)
	}
	if err := r.readHeader(); err != nil {
		return nil, err
	}
	return r, nil
}

func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

func (r *Reader) listAt(pos inputerr.Pos, field, format string, args ...any) inputerr.List {
	return inputerr.List{inputerr.At(pos, field, format, args...)}
}

// readLine returns the next non-blank line of the header phase without its
// line break; the slice is valid until the next call. ok is false at the end
// or on error (then r.err is set).
func (r *Reader) readLine() (line []byte, ok bool) {
	for {
		b, err := r.src.ReadSlice('\n')
		if err == bufio.ErrBufferFull {
			r.line++
			r.err = r.listAt(inputerr.Pos{File: r.name, Line: r.line}, "", "the line is longer than %d bytes: this is not a recorder export (or its line breaks are lost)", r.src.Size())
			return nil, false
		}
		if err != nil && err != io.EOF {
			r.err = r.listAt(inputerr.Pos{File: r.name, Line: r.line + 1}, "", "cannot read on: %v", describeReadError(err))
			return nil, false
		}
		if len(b) == 0 && err == io.EOF {
			return nil, false
		}
		r.line++
		if n := len(b); n > 0 && b[n-1] == '\n' {
			b = b[:n-1]
		}
		if n := len(b); n > 0 && b[n-1] == '\r' {
			b = b[:n-1]
		}
		if len(b) == 0 {
			if err == io.EOF {
				return nil, false
			}
			continue
		}
		return b, true
	}
}

func describeReadError(err error) string {
	if err == io.ErrUnexpectedEOF || errors.Is(err, gzip.ErrChecksum) || errors.Is(err, gzip.ErrHeader) {
		return "the compressed data is damaged or cut short (" + err.Error() + ")"
	}
	return err.Error()
}

// Record is the sample Next read; it is overwritten by the next call.
func (r *Reader) Record() *Record { return r.rec }

// Err is the error that stopped the reading, nil at a clean end. It is an
// inputerr.List: the skipped rows' errors kept so far, then the one that
// stopped it.
func (r *Reader) Err() error {
	if len(r.err) == 0 {
		return nil
	}
	return r.err
}

// Rows is the number of samples read so far.
func (r *Reader) Rows() int { return r.rows }

// Skipped is the number of malformed rows skipped and the first MaxListed
// of their errors.
func (r *Reader) Skipped() (int, inputerr.List) { return r.bad, r.listed }

// Name is the file name used in errors.
func (r *Reader) Name() string { return r.name }

// Separator is the separator in use.
func (r *Reader) Separator() byte { return r.cfg.sep }

// Columns lists the known columns and where the header has them (Index −1
// for an optional column it lacks), standard ones first.
func (r *Reader) Columns() []Found { return append([]Found(nil), r.found...) }

// HeaderLine is the header's line in the file.
func (r *Reader) HeaderLine() int { return r.header }

// HasOptional says whether the header has Options.Optional[i].
func (r *Reader) HasOptional(i int) bool { return r.found[len(Standard)+i].Index >= 0 }

// FlowIsMass says whether flow_rate is a mass flow (kg/s) rather than a
// volumetric one (m³/s).
func (r *Reader) FlowIsMass() bool { return r.found[2].Kind == units.MassFlow }

// ClockTimes says whether times are clock times (seconds since Origin)
// rather than seconds from an origin of the file's own; known after the
// first row.
func (r *Reader) ClockTimes() bool { return r.cfg.clock }

// Origin is the Unix second (since 1970-01-01 UTC) that clock times count
// from: a clock time is Origin + Record.Time. It is the start of the first
// row's date as written; 0 for seconds from a start. Known after the first
// row, like ClockTimes.
func (r *Reader) Origin() int64 { return r.cfg.origin }

// ZoneLess says whether some clock time was written without an offset (and
// so read in Options.Location).
func (r *Reader) ZoneLess() bool { return r.zoneNo }

// SHA256 is the digest of the file's bytes as stored, when Options.Hash was
// set and the file was read to its end; nil otherwise.
func (r *Reader) SHA256() []byte {
	if r.hash == nil || !r.done || r.err != nil {
		return nil
	}
	return r.hash.Sum()
}

// Progress is how many bytes of the file as stored have been read, and its
// size (0 when unknown). Safe to call from another goroutine.
func (r *Reader) Progress() (read, total int64) { return r.count.n.Load(), r.count.total }

// Close stops the reading and closes the file Open opened.
func (r *Reader) Close() error {
	r.stop()
	if r.closer == nil {
		return nil
	}
	err := r.closer.Close()
	r.closer = nil
	return err
}

type countingReader struct {
	r     io.Reader
	n     atomic.Int64
	total int64
}

func (c *countingReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.n.Add(int64(n))
	return n, err
}
