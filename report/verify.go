package report

import (
	"bytes"
	"compress/zlib"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"regexp"
	"strconv"
)

// ErrUnreadable is wrapped by Verify's errors when the bytes are not a
// record pasval wrote (no recorded hash, no attached plant file, a damaged stream).
var ErrUnreadable = errors.New("not a readable pasval record")

// maxAttachment bounds the inflated plant file, so a damaged or hostile
// stream cannot exhaust memory (a plant file is a few kilobytes).
const maxAttachment = 1 << 20

// MaxRecordSize is the most bytes ReadRecord and Verify take as a record. A
// record is about 70 KB (64 to 76 KB for the demos); 16 MiB leaves room for
// any plant file a record can carry (maxAttachment) and long tables, while a
// device or a file that keeps growing cannot exhaust memory.
const MaxRecordSize = 16 << 20

// MaxPlantFileSize is the most bytes ReadPlantFile takes: the largest plant
// file a record can carry, so a longer one could never match.
const MaxPlantFileSize = maxAttachment

// SizeError reports an input longer than the most that is read of it. It
// wraps ErrUnreadable.
type SizeError struct {
	What  string // "pasval record", "plant file"
	Limit int64  // bytes
}

func (e *SizeError) Error() string {
	return fmt.Sprintf("not a %s: larger than %d MiB (%d bytes)", e.What, e.Limit>>20, e.Limit)
}

func (e *SizeError) Unwrap() error { return ErrUnreadable }

// ReadRecord reads a record from r, at most MaxRecordSize bytes: a longer
// stream returns a *SizeError after reading MaxRecordSize+1 bytes, however
// long r is or keeps growing.
func ReadRecord(r io.Reader) ([]byte, error) {
	return readAtMost(r, MaxRecordSize, "pasval record")
}

// ReadPlantFile reads a plant file to compare with a record, at most
// MaxPlantFileSize bytes (a *SizeError beyond).
func ReadPlantFile(r io.Reader) ([]byte, error) {
	return readAtMost(r, MaxPlantFileSize, "plant file")
}

func readAtMost(r io.Reader, limit int64, what string) ([]byte, error) {
	data, err := io.ReadAll(io.LimitReader(r, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(data)) > limit {
		return nil, &SizeError{What: what, Limit: limit}
	}
	return data, nil
}

// Verification is what Verify found.
type Verification struct {
	RecordedSHA256   string // from the document metadata
	AttachmentSHA256 string // of the attached plant file
	FileSHA256       string // of the plant file given to compare, "" if none
	// Match is true when the attachment matches the recorded hash and, when a
	// plant file was given, the file matches it too.
	Match bool
}

var (
	keywordsRe   = regexp.MustCompile(`/Keywords \(` + regexp.QuoteMeta(KeywordPrefix) + `([0-9a-f]{64})\)`)
	embeddedRe   = regexp.MustCompile(`/Type /EmbeddedFile /Length (\d{1,9}) /Filter /FlateDecode /Params << /CheckSum <[0-9a-f]*> /Size (\d{1,9}) >> >>\n{1,2}stream\n`)
	errNoHash    = fmt.Errorf("no plant-file hash in the document metadata: %w", ErrUnreadable)
	errNoAttach  = fmt.Errorf("no attached plant file: %w", ErrUnreadable)
	errBadStream = fmt.Errorf("the attached plant file is damaged: %w", ErrUnreadable)
)

// Verify checks a record: that its attached plant file matches the SHA-256
// recorded in its metadata and, when plant is not nil, that plant matches too.
// A record that cannot be read returns an error wrapping ErrUnreadable.
func Verify(pdf []byte, plant []byte) (Verification, error) {
	var v Verification
	if len(pdf) > MaxRecordSize {
		return v, &SizeError{What: "pasval record", Limit: MaxRecordSize}
	}
	if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
		return v, fmt.Errorf("not a PDF file: %w", ErrUnreadable)
	}
	m := keywordsRe.FindSubmatch(pdf)
	if m == nil {
		return v, errNoHash
	}
	v.RecordedSHA256 = string(m[1])
	content, err := attachment(pdf)
	if err != nil {
		return v, err
	}
	sum := sha256.Sum256(content)
	v.AttachmentSHA256 = hex.EncodeToString(sum[:])
	v.Match = v.AttachmentSHA256 == v.RecordedSHA256
	if plant != nil {
		fs := sha256.Sum256(plant)
		v.FileSHA256 = hex.EncodeToString(fs[:])
		v.Match = v.Match && v.FileSHA256 == v.RecordedSHA256
	}
	return v, nil
}

// Attachment returns the plant file attached to a record.
func Attachment(pdf []byte) ([]byte, error) { return attachment(pdf) }

func attachment(pdf []byte) ([]byte, error) {
	loc := embeddedRe.FindSubmatchIndex(pdf)
	if loc == nil {
		return nil, errNoAttach
	}
	n, err1 := strconv.Atoi(string(pdf[loc[2]:loc[3]]))
	size, err2 := strconv.Atoi(string(pdf[loc[4]:loc[5]]))
	start := loc[1]
	if err1 != nil || err2 != nil || n < 0 || start+n > len(pdf) || size > maxAttachment {
		return nil, errBadStream
	}
	zr, err := zlib.NewReader(bytes.NewReader(pdf[start : start+n]))
	if err != nil {
		return nil, errBadStream
	}
	content, err := io.ReadAll(io.LimitReader(zr, maxAttachment+1))
	if cerr := zr.Close(); err == nil {
		err = cerr
	}
	if err != nil || len(content) > maxAttachment || len(content) != size {
		return nil, errBadStream
	}
	return content, nil
}
