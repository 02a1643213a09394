package runlog

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"runtime"

	"pasval/internal/inputerr"
)

// After the header, a file is read in blocks of whole lines. One goroutine
// reads (and decompresses) the blocks; up to Options.Workers goroutines
// parse them into batches of records; Next hands the batches' records out
// in file order, applying what needs the order: the skipped-row count,
// time order across blocks, the end of the reading at a fatal error. At
// most a few blocks are in flight, so memory does not grow with the file,
// and the caller's own work on the records (the analysis) runs while the
// next blocks are parsed.

// blockSize is the size of a block of lines; a longer line is refused.
const blockSize = 256 << 10

// block is a run of whole lines of the file.
type block struct {
	data   []byte
	line   int  // the number of its first line
	quotes bool // some line holds a quote character
	// general says to read every line by the general path: the block came
	// before the time format was fixed (all its lines are malformed, and
	// the general path finds that before it reads rowConfig.clock, which a
	// later block may still set).
	general bool
}

// batch is a block's parsed records and errors.
type batch struct {
	recs  []Record
	opt   []float64 // storage for the records' Optional values
	errs  []rowErr
	first struct { // the first record, for the time-order check across batches
		col  int
		text string
	}
	zoneLess bool
	buf      []byte // the block's buffer, for reuse
}

// rowErr is a row error that comes before recs[at].
type rowErr struct {
	at    int
	err   *inputerr.Error
	fatal bool
}

// job is a block to parse and where its batch goes.
type job struct {
	blk block
	out chan *batch
}

// start launches the reading and parsing goroutines.
func (r *Reader) start() {
	workers := r.opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	r.futures = make(chan chan *batch, 2*workers+2)
	inFlight := cap(r.futures) + 2*workers + 2
	r.freeBufs, r.freeBatches = make(chan []byte, inFlight), make(chan *batch, inFlight)
	r.quit = make(chan struct{})
	jobs := make(chan job, workers)
	r.wg.Add(1 + workers)
	go r.produce(jobs)
	for range workers {
		go r.work(jobs)
	}
}

// stop ends the goroutines and waits for them (the hashing one too: after
// the producer's finish it has nothing left to do).
func (r *Reader) stop() {
	if r.hash != nil {
		defer r.hash.abort()
	}
	if r.quit == nil {
		return
	}
	select {
	case <-r.quit:
	default:
		close(r.quit)
	}
	r.wg.Wait()
}

// produce reads the blocks in order and queues them for parsing.
func (r *Reader) produce(jobs chan<- job) {
	defer r.wg.Done()
	defer close(r.futures)
	defer close(jobs)
	line := r.line + 1
	var carry []byte
	for {
		buf, err := fill(r.src, append(r.getBuf(), carry...))
		eof := err == io.EOF
		if err != nil && !eof {
			r.sendFatal(inputerr.At(inputerr.Pos{File: r.cfg.name, Line: line + bytes.Count(buf, []byte{'\n'})}, "", "cannot read on: %v", describeReadError(err)))
			return
		}
		data := buf
		carry = carry[:0]
		if !eof {
			i := bytes.LastIndexByte(buf, '\n')
			if i < 0 {
				r.sendFatal(inputerr.At(inputerr.Pos{File: r.cfg.name, Line: line}, "", "the line is longer than %d bytes: this is not a recorder export (or its line breaks are lost)", blockSize))
				return
			}
			data, carry = buf[:i+1], append(carry, buf[i+1:]...)
		}
		if len(data) > 0 {
			blk := block{data: data, line: line, quotes: bytes.IndexByte(data, '"') >= 0}
			if !r.decided {
				r.decide(blk)
				blk.general = !r.decided
			}
			line += bytes.Count(data, []byte{'\n'})
			out := make(chan *batch, 1)
			select {
			case r.futures <- out:
			case <-r.quit:
				return
			}
			jobs <- job{blk: blk, out: out}
		} else {
			r.putBuf(buf)
		}
		if eof {
			if r.hash != nil {
				// Hash the whole file as stored, trailing bytes included.
				if _, err := io.Copy(io.Discard, r.raw); err != nil {
					r.sendFatal(inputerr.At(inputerr.Pos{File: r.cfg.name}, "", "cannot read to the end: %v", err))
					return
				}
				r.hash.finish()
			}
			return
		}
	}
}

// fill reads into buf's spare capacity until it is full or the reader
// fails; the error is the reader's own (io.EOF at the end).
func fill(rd io.Reader, buf []byte) ([]byte, error) {
	for len(buf) < cap(buf) {
		n, err := rd.Read(buf[len(buf):cap(buf)])
		buf = buf[:len(buf)+n]
		if err != nil {
			return buf, err
		}
	}
	return buf, nil
}

// decide fixes the time format from the first row with the header's
// number of fields, before any block is parsed, and with clock times the
// origin they count from (the start of that row's date: any whole second
// near the run keeps a time's fraction exact enough).
func (r *Reader) decide(blk block) {
	sp := splitter{sep: r.cfg.sep}
	data := blk.data
	for len(data) > 0 {
		l := data
		if i := bytes.IndexByte(data, '\n'); i >= 0 {
			l, data = data[:i], data[i+1:]
		} else {
			data = nil
		}
		l = bytes.TrimSuffix(l, []byte{'\r'})
		if len(l) == 0 || sp.split(l, blk.quotes) != nil || sp.n != r.cfg.nfields {
			continue
		}
		tb := trim(sp.field(r.cfg.timeField), r.cfg.sep)
		r.cfg.clock = looksLikeClock(tb)
		var cl clock
		if _, ok := scanClock(tb, &cl); r.cfg.clock && ok {
			r.cfg.origin = daysFromCivil(cl.year, cl.month, cl.day) * 86400
		}
		r.decided = true
		return
	}
}

// sendFatal queues a batch holding only a fatal error.
func (r *Reader) sendFatal(e *inputerr.Error) {
	out := make(chan *batch, 1)
	out <- &batch{errs: []rowErr{{err: e, fatal: true}}}
	select {
	case r.futures <- out:
	case <-r.quit:
	}
}

// work parses blocks.
func (r *Reader) work(jobs <-chan job) {
	defer r.wg.Done()
	p := newParser(&r.cfg)
	for j := range jobs {
		b := r.getBatch()
		p.parseBlock(j.blk, b)
		j.out <- b
	}
}

// parseBlock parses a block's lines into b.
func (p *parser) parseBlock(blk block, b *batch) {
	b.buf = blk.data
	data := blk.data
	// Room for every line at once, from the line length seen so far:
	// growing by appending would copy the records over and over.
	if n := len(data)/p.lineLen + 64; cap(b.recs) < n {
		b.recs = make([]Record, 0, n)
		if k := p.cfg.nOptional; k > 0 && p.cfg.noOptional == nil {
			b.opt = make([]float64, 0, n*k)
		}
	}
	lineNo := blk.line - 1
	have, prevTime, prevLine := false, 0.0, 0
	var res rowResult
	fast := !blk.quotes && !blk.general
	for len(data) > 0 {
		lineNo++
		var rec *Record
		if p.cfg.noOptional != nil {
			rec = b.grow(0)
			if rec.Optional == nil { // a reused record has it already
				rec.Optional = p.cfg.noOptional
			}
		} else {
			rec = b.grow(p.cfg.nOptional)
		}
		n, ok := 0, false
		if fast {
			n, ok = p.fastRow(data, lineNo, rec, &res)
		}
		if ok {
			data = data[n:]
		} else {
			l := data
			if i := bytes.IndexByte(data, '\n'); i >= 0 {
				l, data = data[:i], data[i+1:]
			} else {
				data = nil
			}
			if n := len(l); n > 0 && l[n-1] == '\r' {
				l = l[:n-1]
			}
			if len(l) == 0 {
				b.recs = b.recs[:len(b.recs)-1]
				continue
			}
			p.parseRow(l, lineNo, rec, blk.quotes, &res)
		}
		if res.err == nil && have && rec.Time < prevTime {
			res.err = inputerr.At(p.cfg.pos(lineNo, res.timeCol), KeyTime, "time goes backwards: %q is before the time on line %d; a recorded run must be in time order (a clock set back, or files joined out of order?)", clip(res.timeText), prevLine)
			res.fatal = true
		}
		if res.err != nil {
			b.recs = b.recs[:len(b.recs)-1]
			b.errs = append(b.errs, rowErr{at: len(b.recs), err: res.err, fatal: res.fatal})
			if res.fatal {
				return
			}
			continue
		}
		if !have {
			b.first.col, b.first.text = res.timeCol, string(res.timeText)
		}
		b.zoneLess = b.zoneLess || res.zoneLess
		have, prevTime, prevLine = true, rec.Time, lineNo
	}
	if lineNo >= blk.line {
		p.lineLen = max(8, len(blk.data)/(lineNo-blk.line+1))
	}
}

// grow appends a record to the batch, reusing its storage.
func (b *batch) grow(nOptional int) *Record {
	if len(b.recs) < cap(b.recs) {
		b.recs = b.recs[:len(b.recs)+1]
	} else {
		b.recs = append(b.recs, Record{})
	}
	rec := &b.recs[len(b.recs)-1]
	if nOptional > 0 {
		// Optional values live in b.opt; when it moves, earlier records
		// are pointed at the new storage.
		need := len(b.recs) * nOptional
		if need > cap(b.opt) {
			opt := make([]float64, need, 2*need)
			copy(opt, b.opt)
			b.opt = opt
			for i := range b.recs[:len(b.recs)-1] {
				b.recs[i].Optional = b.opt[i*nOptional : (i+1)*nOptional : (i+1)*nOptional]
			}
		}
		b.opt = b.opt[:need]
		rec.Optional = b.opt[need-nOptional : need : need]
		for i := range rec.Optional {
			rec.Optional[i] = math.NaN() // for columns the file lacks
		}
	}
	return rec
}

// getBuf, putBuf, getBatch and putBatch recycle the blocks' buffers and
// batches through the Reader's free lists, so a long file allocates them
// once.
func (r *Reader) getBuf() []byte {
	select {
	case b := <-r.freeBufs:
		return b[:0]
	default:
		return make([]byte, 0, blockSize)
	}
}

func (r *Reader) putBuf(b []byte) {
	select {
	case r.freeBufs <- b[:0]:
	default:
	}
}

func (r *Reader) getBatch() *batch {
	select {
	case b := <-r.freeBatches:
		b.recs, b.opt, b.errs, b.zoneLess = b.recs[:0], b.opt[:0], b.errs[:0], false
		return b
	default:
		return new(batch)
	}
}

func (r *Reader) putBatch(b *batch) {
	if b.buf != nil && cap(b.buf) == blockSize {
		r.putBuf(b.buf)
	}
	b.buf = nil
	clear(b.errs)
	select {
	case r.freeBatches <- b:
	default:
	}
}

// Next reads the next sample; false at the end of the file or on an error
// (see Err).
func (r *Reader) Next() bool {
	if r.done {
		return false
	}
	if r.futures == nil {
		r.start()
	}
	for {
		if r.cur == nil {
			out, ok := <-r.futures
			if !ok {
				r.finish()
				return false
			}
			r.cur, r.ri, r.ei = <-out, 0, 0
			r.zoneNo = r.zoneNo || r.cur.zoneLess
		}
		b := r.cur
		for r.ei < len(b.errs) && b.errs[r.ei].at == r.ri {
			e := b.errs[r.ei]
			r.ei++
			if e.fatal || r.bad >= r.opt.SkipBadRows {
				if r.bad > 0 && !e.fatal {
					e.err.Msg += fmt.Sprintf(" (one more than %s %d allows)", FlagSkipBadRows, r.opt.SkipBadRows)
				}
				r.fail(e.err)
				return false
			}
			r.bad++
			if len(r.listed) < MaxListed {
				r.listed = append(r.listed, e.err)
			}
		}
		if r.ri < len(b.recs) {
			rec := &b.recs[r.ri]
			r.ri++
			if r.ri == 1 && r.rows > 0 && rec.Time < r.prevTime {
				r.fail(inputerr.At(r.cfg.pos(rec.Line, b.first.col), KeyTime, "time goes backwards: %q is before the time on line %d; a recorded run must be in time order (a clock set back, or files joined out of order?)", b.first.text, r.prevLine))
				return false
			}
			r.prevTime, r.prevLine = rec.Time, rec.Line
			r.rows++
			r.rec = rec
			return true
		}
		r.putBatch(b)
		r.cur = nil
	}
}

// fail ends the reading with e after the skipped rows' errors.
func (r *Reader) fail(e *inputerr.Error) {
	r.err = append(append(inputerr.List(nil), r.listed...), e)
	r.done = true
	r.stop()
}

// finish runs at the end of the text.
func (r *Reader) finish() {
	r.done = true
	r.stop()
	if r.rows == 0 {
		msg := "no data rows after the header"
		if r.bad > 0 {
			msg = fmt.Sprintf("no readable data rows: all %d were malformed", r.bad)
		}
		r.err = append(append(inputerr.List(nil), r.listed...), inputerr.At(inputerr.Pos{File: r.cfg.name, Line: r.header + 1, Column: 1}, "", "%s", msg))
	}
}
