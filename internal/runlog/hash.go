package runlog

import (
	"crypto/sha256"
	"hash"
	"io"
	"sync"
)

// hashChunk is the size of the pieces the hashing goroutine takes.
const hashChunk = 256 << 10

// hashChunks bounds the pieces in flight (2 MB): a reader that outruns the
// hashing waits for it.
const hashChunks = 8

// asyncHash is a reader that passes its bytes on and takes their SHA-256 on
// a goroutine of its own, so that hashing (about 50 ms for 70 MB with the
// CPU's SHA instructions) overlaps reading and parsing instead of delaying
// every block. The bytes are copied into chunks for the hashing goroutine
// (a copy costs a tenth of the hash), so the caller may reuse its buffers at
// once. Read is for one goroutine at a time; finish and abort end it.
type asyncHash struct {
	r    io.Reader
	h    hash.Hash
	buf  []byte        // the chunk being filled
	work chan []byte   // chunks to hash, in order
	free chan []byte   // hashed chunks, for reuse
	done chan struct{} // closed when the goroutine has hashed the last chunk
	once sync.Once
	sum  []byte
}

func newAsyncHash(r io.Reader) *asyncHash {
	a := &asyncHash{r: r, h: sha256.New(), work: make(chan []byte, hashChunks), free: make(chan []byte, hashChunks+1),
		done: make(chan struct{})}
	go a.run()
	return a
}

func (a *asyncHash) run() {
	defer close(a.done)
	for c := range a.work {
		a.h.Write(c) // a hash.Hash never fails
		select {
		case a.free <- c[:0]:
		default:
		}
	}
}

func (a *asyncHash) Read(p []byte) (int, error) {
	n, err := a.r.Read(p)
	for b := p[:n]; len(b) > 0; {
		if a.buf == nil {
			select {
			case a.buf = <-a.free:
			default:
				a.buf = make([]byte, 0, hashChunk)
			}
		}
		k := copy(a.buf[len(a.buf):cap(a.buf)], b)
		a.buf, b = a.buf[:len(a.buf)+k], b[k:]
		if len(a.buf) == cap(a.buf) {
			a.work <- a.buf
			a.buf = nil
		}
	}
	return n, err
}

// finish hands over the last bytes, waits for the goroutine and keeps the
// digest (Sum). Once all bytes are read; finish and abort may be called
// again, and after each other, to no effect.
func (a *asyncHash) finish() {
	a.once.Do(func() {
		if len(a.buf) > 0 {
			a.work <- a.buf
		}
		close(a.work)
		<-a.done
		a.sum = a.h.Sum(nil)
	})
}

// abort ends the goroutine without a digest.
func (a *asyncHash) abort() {
	a.once.Do(func() {
		close(a.work)
		<-a.done
	})
}

// Sum is the digest after finish; nil after abort or before.
func (a *asyncHash) Sum() []byte { return a.sum }
