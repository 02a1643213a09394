package report

// Source of the expected values: the project's size caps (MaxRecordSize,
// MaxPlantFileSize); no outside reference applies.

import (
	"bytes"
	"errors"
	"io"
	"strings"
	"testing"
)

// endless is a reader that never ends, like /dev/zero or a file that keeps
// growing; it counts what was taken from it.
type endless struct{ n int64 }

func (e *endless) Read(p []byte) (int, error) {
	clear(p)
	e.n += int64(len(p))
	return len(p), nil
}

func TestReadCaps(t *testing.T) {
	for _, c := range []struct {
		name  string
		read  func(io.Reader) ([]byte, error)
		limit int64
		words string
	}{
		{"record", ReadRecord, MaxRecordSize, "not a pasval record: larger than 16 MiB (16777216 bytes)"},
		{"plant file", ReadPlantFile, MaxPlantFileSize, "not a plant file: larger than 1 MiB (1048576 bytes)"},
	} {
		t.Run(c.name, func(t *testing.T) {
			// Exactly at the cap: read whole.
			data, err := c.read(bytes.NewReader(make([]byte, c.limit)))
			if err != nil || int64(len(data)) != c.limit {
				t.Errorf("%d bytes: %d read, %v", c.limit, len(data), err)
			}
			// One byte over, and a stream that never ends: refused, having
			// taken no more than the cap and the buffer of the last read.
			for _, r := range []io.Reader{bytes.NewReader(make([]byte, c.limit+1)), &endless{}} {
				data, err := c.read(r)
				var se *SizeError
				if data != nil || !errors.As(err, &se) || se.Limit != c.limit || !errors.Is(err, ErrUnreadable) || !strings.Contains(err.Error(), c.words) {
					t.Errorf("%T: %d bytes, %v; want a SizeError %q", r, len(data), err, c.words)
				}
				if e, ok := r.(*endless); ok && e.n > c.limit+1 {
					t.Errorf("took %d bytes from an endless stream", e.n)
				}
			}
		})
	}
	// Verify refuses bytes over the cap however they were read.
	big := append([]byte("%PDF-1.4\n"), make([]byte, MaxRecordSize)...)
	if _, err := Verify(big, nil); !errors.Is(err, ErrUnreadable) || !strings.Contains(err.Error(), "larger than 16 MiB") {
		t.Errorf("Verify of %d bytes: %v", len(big), err)
	}
}
