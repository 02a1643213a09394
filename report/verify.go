package report

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"net/url"
	"regexp"
	"sort"
	"strings"
	"time"

	"github.com/pdfcpu/pdfcpu/pkg/api"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/model"
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

// Attachment is an input file a record carries (the plant file first).
type Attachment struct {
	Name        string // file name
	Description string
	Content     []byte
}

// Keyword tokens of the record's metadata (the PDF Info Keywords entry),
// separated by spaces; names and verdict labels are query-escaped.
const (
	versionToken = "pasval-version:"
	dateToken    = "pasval-date:"
	resultToken  = "pasval-result:"
	verdictToken = "pasval-verdict:" // label=pass|fail, in the cover's order
	fileToken    = "pasval-file:"    // name=sha256, in attachment order
	kindToken    = "pasval-record:"  // the Document's Kind, when not a plant file's record
	inputToken   = "pasval-input:"   // name=sha256 of a file not carried, in order
	optionsToken = "pasval-options:" // the Document's Options, query-escaped
)

// keywords is the Keywords entry of a document: the plant file's hash (the
// token verify has always read), the tool version, the record date, the
// overall result, each verdict and each attached file's hash.
func keywords(doc *Document) string {
	kw := []string{KeywordPrefix + doc.SHA256, versionToken + url.QueryEscape(doc.Version), dateToken + doc.Date.Format("2006-01-02"),
		resultToken + resultWord(doc.Cover.Pass, doc.Cover.NotJudged)}
	for _, v := range doc.Cover.Verdicts {
		kw = append(kw, verdictToken+url.QueryEscape(v.Check)+"="+resultWord(v.Pass, v.NotJudged))
	}
	for _, a := range doc.Attachments {
		sum := sha256.Sum256(a.Content)
		kw = append(kw, fileToken+url.QueryEscape(a.Name)+"="+hex.EncodeToString(sum[:]))
	}
	if doc.Kind != "" {
		kw = append(kw, kindToken+url.QueryEscape(doc.Kind))
	}
	for _, in := range doc.Inputs {
		kw = append(kw, inputToken+url.QueryEscape(in.Name)+"="+in.SHA256)
	}
	if doc.Options != "" {
		kw = append(kw, optionsToken+url.QueryEscape(doc.Options))
	}
	return strings.Join(kw, " ")
}

// notJudgedWord is the metadata's result of a record, or a verdict, where
// nothing was judged.
const notJudgedWord = "not-judged"

func resultWord(pass, notJudged bool) string {
	switch {
	case notJudged:
		return notJudgedWord
	case pass:
		return "pass"
	}
	return "fail"
}

// Stored is what a record says about itself: its metadata and its attached
// files, as read by a PDF library (so a record re-saved by another program is
// read too).
type Stored struct {
	RecordedSHA256 string // the plant file's hash in the metadata
	// Version, Date, Pass and Verdicts are empty (HasVerdicts false) in a
	// record that does not carry them.
	Version string
	Date    time.Time
	Pass    bool
	// NotJudged is a record of which nothing was judged (Pass is then true).
	NotJudged   bool
	Verdicts    []Verdict
	HasVerdicts bool
	Attachments []Attachment // in the order the record lists them; the plant file first
	// FileHashes are the SHA-256 the metadata records for each attached
	// file, by name (empty in a record that does not carry them).
	FileHashes map[string]string
	Kind       string // Document.Kind
	Pages      int
	// Inputs and Options are a run review's (Document.Inputs, Options).
	Inputs  []InputRef
	Options string
}

var (
	errNoHash   = fmt.Errorf("no plant-file hash in the document metadata: %w", ErrUnreadable)
	errNoAttach = fmt.Errorf("no attached plant file: %w", ErrUnreadable)
	hashRe      = regexp.MustCompile(`^[0-9a-f]{64}$`)
)

// readContext parses a PDF with pdfcpu, turning its failures (and any panic
// on hostile bytes) into errors wrapping ErrUnreadable. pdfcpu's
// configuration folder is disabled: nothing is read or written on disk.
func readContext(pdf []byte) (ctx *model.Context, err error) {
	if len(pdf) > MaxRecordSize {
		return nil, &SizeError{What: "pasval record", Limit: MaxRecordSize}
	}
	if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
		return nil, fmt.Errorf("not a PDF file: %w", ErrUnreadable)
	}
	defer func() {
		if r := recover(); r != nil {
			ctx, err = nil, fmt.Errorf("the PDF cannot be parsed (%v): %w", r, ErrUnreadable)
		}
	}()
	api.DisableConfigDir()
	conf := model.NewDefaultConfiguration()
	conf.ValidationMode = model.ValidationRelaxed
	ctx, err = api.ReadAndValidate(bytes.NewReader(pdf), conf)
	if err != nil {
		return nil, fmt.Errorf("the PDF cannot be parsed (%v): %w", err, ErrUnreadable)
	}
	return ctx, nil
}

// Read reads a record's metadata and attached files.
func Read(pdf []byte) (st *Stored, err error) {
	ctx, err := readContext(pdf)
	if err != nil {
		return nil, err
	}
	defer func() {
		if r := recover(); r != nil {
			st, err = nil, fmt.Errorf("the PDF cannot be parsed (%v): %w", r, ErrUnreadable)
		}
	}()
	st = &Stored{Pages: ctx.PageCount, FileHashes: map[string]string{}}
	var order []string
	for _, tok := range strings.Fields(ctx.XRefTable.Keywords) {
		switch {
		case strings.HasPrefix(tok, KeywordPrefix):
			if h := strings.TrimPrefix(tok, KeywordPrefix); hashRe.MatchString(h) {
				st.RecordedSHA256 = h
			}
		case strings.HasPrefix(tok, versionToken):
			if v, err := url.QueryUnescape(strings.TrimPrefix(tok, versionToken)); err == nil {
				st.Version = v // a malformed token leaves it empty: no byte comparison is claimed
			}
		case strings.HasPrefix(tok, dateToken):
			if d, err := time.Parse("2006-01-02", strings.TrimPrefix(tok, dateToken)); err == nil {
				st.Date = d // a malformed date leaves the zero date, which no record carries
			}
		case strings.HasPrefix(tok, resultToken):
			word := strings.TrimPrefix(tok, resultToken)
			st.Pass, st.NotJudged = word == "pass" || word == notJudgedWord, word == notJudgedWord
			st.HasVerdicts = true
		case strings.HasPrefix(tok, verdictToken):
			label, word, _ := strings.Cut(strings.TrimPrefix(tok, verdictToken), "=")
			if l, err := url.QueryUnescape(label); err == nil {
				label = l // else kept as written: it then matches no recomputed check
			}
			st.Verdicts = append(st.Verdicts, Verdict{Check: label, Pass: word == "pass" || word == notJudgedWord, NotJudged: word == notJudgedWord})
		case strings.HasPrefix(tok, inputToken):
			name, sum, _ := strings.Cut(strings.TrimPrefix(tok, inputToken), "=")
			if n, err := url.QueryUnescape(name); err == nil {
				name = n // else kept as written: shown, and matched by its hash alone
			}
			st.Inputs = append(st.Inputs, InputRef{Name: name, SHA256: sum})
		case strings.HasPrefix(tok, optionsToken):
			o := strings.TrimPrefix(tok, optionsToken)
			if u, err := url.QueryUnescape(o); err == nil {
				o = u // else kept as written: unreadable options, which verify reports
			}
			st.Options = o
		case strings.HasPrefix(tok, fileToken):
			name, sum, _ := strings.Cut(strings.TrimPrefix(tok, fileToken), "=")
			if n, err := url.QueryUnescape(name); err == nil {
				name = n // else kept as written: it then names no attachment
			}
			order = append(order, name)
			if hashRe.MatchString(sum) {
				st.FileHashes[name] = sum
			}
		case strings.HasPrefix(tok, kindToken):
			if k, err := url.QueryUnescape(strings.TrimPrefix(tok, kindToken)); err == nil {
				st.Kind = k // else left empty: the record is then re-rendered as a plant file's, and differs
			}
		}
	}
	if st.RecordedSHA256 == "" {
		return nil, errNoHash
	}
	aa, err := ctx.ExtractAttachments(nil)
	if err != nil {
		return nil, fmt.Errorf("the attached files cannot be read (%v): %w", err, ErrUnreadable)
	}
	for _, a := range aa {
		if a.Reader == nil {
			continue
		}
		content, err := io.ReadAll(io.LimitReader(a.Reader, maxAttachment+1))
		if err != nil || len(content) > maxAttachment {
			return nil, fmt.Errorf("the attached file %q is damaged or too large: %w", a.FileName, ErrUnreadable)
		}
		st.Attachments = append(st.Attachments, Attachment{Name: a.FileName, Description: a.Desc, Content: content})
	}
	if len(st.Attachments) == 0 {
		return nil, errNoAttach
	}
	rank := func(name string) int {
		for i, n := range order {
			if n == name {
				return i
			}
		}
		return len(order)
	}
	sort.SliceStable(st.Attachments, func(i, j int) bool { return rank(st.Attachments[i].Name) < rank(st.Attachments[j].Name) })
	return st, nil
}

// PageContents are the decoded content streams of each page of a PDF.
func PageContents(pdf []byte) (pages [][]byte, err error) {
	ctx, err := readContext(pdf)
	if err != nil {
		return nil, err
	}
	defer func() {
		if r := recover(); r != nil {
			pages, err = nil, fmt.Errorf("the pages cannot be read (%v): %w", r, ErrUnreadable)
		}
	}()
	for p := 1; p <= ctx.PageCount; p++ {
		d, _, _, err := ctx.PageDict(p, false)
		if err != nil || d == nil {
			return nil, fmt.Errorf("page %d cannot be read: %w", p, ErrUnreadable)
		}
		c, err := ctx.PageContent(d, p)
		if err != nil && !errors.Is(err, model.ErrNoContent) {
			return nil, fmt.Errorf("page %d cannot be read (%v): %w", p, err, ErrUnreadable)
		}
		pages = append(pages, c)
	}
	return pages, nil
}

// FirstDifferentPage compares two PDFs page by page: the first page (from 1)
// whose content differs, or whose presence differs; 0 when every page's
// content is the same.
func FirstDifferentPage(a, b []byte) (int, error) {
	pa, err := PageContents(a)
	if err != nil {
		return 0, err
	}
	pb, err := PageContents(b)
	if err != nil {
		return 0, err
	}
	for i := range max(len(pa), len(pb)) {
		if i >= len(pa) || i >= len(pb) || !bytes.Equal(pa[i], pb[i]) {
			return i + 1, nil
		}
	}
	return 0, nil
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

// Verify checks a record's hashes: that its attached plant file matches the
// SHA-256 recorded in its metadata and, when plant is not nil, that plant
// matches too. A record that cannot be read returns an error wrapping
// ErrUnreadable. (pasval verify also re-renders the record: cmd/pasval.)
func Verify(pdf []byte, plant []byte) (Verification, error) {
	var v Verification
	st, err := Read(pdf)
	if err != nil {
		return v, err
	}
	v.RecordedSHA256 = st.RecordedSHA256
	sum := sha256.Sum256(st.Attachments[0].Content)
	v.AttachmentSHA256 = hex.EncodeToString(sum[:])
	v.Match = v.AttachmentSHA256 == v.RecordedSHA256
	if plant != nil {
		fs := sha256.Sum256(plant)
		v.FileSHA256 = hex.EncodeToString(fs[:])
		v.Match = v.Match && v.FileSHA256 == v.RecordedSHA256
	}
	return v, nil
}
