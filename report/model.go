// Package report is the validation record of a pasteurizer as a document:
// a model of plain data (Document: a cover, numbered sections of blocks),
// its PDF, which carries the plant file as an attachment (Render), and the
// verification of a PDF against that file later (Verify).
//
//	pdf, pages, err := report.Render(doc)
//	st, err := report.Read(pdf)          // metadata and attached files, for verify
//
// The model knows nothing of pasteurizers' results: pasval fills it from its
// results in internal/record, so this package exposes no internal type and
// its model can be checked (every check listed, the cautions present)
// without reading a PDF. Nothing here reads or writes files.
package report

import "time"

// Document is the record's content, in reading order.
type Document struct {
	Title     string
	Header    string // site · line, on every page
	ShortHash string // first 12 hex digits of the plant file's SHA-256, in every footer
	SHA256    string
	Date      time.Time
	Version   string
	PageSize  string // "A4" (SI plants) or "Letter" (US plants)
	// Attachments are the input files the record carries, the plant file
	// first; verify re-renders the record from all of them.
	Attachments []Attachment
	// Kind is what the record documents: "" a plant file (with its line file
	// when it names one), KindMatrix the products of a line (the line file
	// first), KindRunReview recorded runs judged against a plant file. It is
	// kept in the metadata, so verify knows how to re-render.
	Kind string
	// Inputs are further files a run review was made from but does not carry
	// (recorded runs, too large to attach): their names and SHA-256, in
	// order. verify can re-render the record only when they are given.
	Inputs []InputRef
	// Options is how the inputs were read, as text for the maker to read
	// back (kept in the metadata).
	Options  string
	Cover    Cover
	Sections []Section
}

// KindRunReview is the Kind of a review of recorded runs (pasval report --log).
const KindRunReview = "run-review"

// InputRef names an input file a record does not carry.
type InputRef struct {
	Name   string
	SHA256 string // hex
}

// KindMatrix is the Kind of a record of a line's products (pasval matrix).
const KindMatrix = "matrix"

// Cover is the first page's identification and verdict box.
type Cover struct {
	Fields   [][2]string // label, value
	Verdicts []Verdict
	Overall  string
	Pass     bool
	// NotJudged is true when nothing was judged (no check applies): Pass is
	// then true, and the record says NOT JUDGED, never PASS.
	NotJudged bool
	// Margins is a line under the verdicts (the margins under uncertainty),
	// when there is one.
	Margins   string
	Statement string // what the record is and is not
}

// Verdict is one line of the verdict box; NotJudged: nothing was judged
// (a product no check applies to).
type Verdict struct {
	Check     string
	Pass      bool
	NotJudged bool
}

// Section is a numbered part of the record.
type Section struct {
	Heading string
	Blocks  []Block
	NewPage bool // start on a page of its own
}

// Block is one element of a section.
type Block interface{ Kind() BlockKind }

// BlockKind names the kinds of block a record is made of.
type BlockKind int

const (
	ParagraphBlock BlockKind = iota + 1
	BulletsBlock
	KeyValuesBlock
	TableBlock
	DiagramBlock
	PlotBlock
	SignOffBlock
	BarChartBlock
	TrendBlock
)

// BlockKinds lists every kind (the renderer has a case for each; a test
// renders one of each).
var BlockKinds = []BlockKind{ParagraphBlock, BulletsBlock, KeyValuesBlock, TableBlock, DiagramBlock, PlotBlock, SignOffBlock,
	BarChartBlock, TrendBlock}

// Paragraph is running text.
type Paragraph struct {
	Text     string
	Emphasis bool // set apart (cautions)
}

// Bullets is a list.
type Bullets struct{ Items []string }

// KeyValues is a two-column list of labelled values.
type KeyValues struct{ Pairs [][2]string }

// Table is a grid with a header row.
type Table struct {
	Caption string
	Columns []Column
	Rows    [][]string
}

// Column is a table column; Right aligns numbers.
type Column struct {
	Title string
	Right bool
}

// Diagram is the temperature diagram of the whole pasteurizer.
type Diagram struct {
	Caption  string
	Unit     string // display temperature unit
	Segments []Segment
	Setpoint float64 // display units
}

// Segment is one stretch of the product path in process order.
type Segment struct {
	Label          string
	ProductIn      float64 // display units
	ProductOut     float64
	Other          string // name of the other stream, "" for the holding tube
	OtherAtLeft    float64
	OtherAtRight   float64
	OtherLeftward  bool // the other stream flows right to left (counterflow)
	OtherIsHot     bool // heating medium or pasteurized product giving heat
	OtherIsProduct bool // the regenerator's other side
}

// Plot is an x–y line plot.
type Plot struct {
	Caption        string
	XLabel, YLabel string
	Series         []Series
}

// Series is one line of a plot.
type Series struct {
	Name string
	X, Y []float64
	// Markers draws each point as a dot and no line between them (measured
	// values beside a fitted curve).
	Markers bool
}

// BarChart is a horizontal bar chart: one bar per label, in the order given,
// its length the value (not negative) in Unit.
type BarChart struct {
	Caption string
	Unit    string
	Bars    []Bar
}

// Bar is one bar of a BarChart.
type Bar struct {
	Label string
	Value float64
}

// SignOff is the block of signature lines.
type SignOff struct{ Roles []string }

func (Paragraph) Kind() BlockKind { return ParagraphBlock }
func (Bullets) Kind() BlockKind   { return BulletsBlock }
func (KeyValues) Kind() BlockKind { return KeyValuesBlock }
func (Table) Kind() BlockKind     { return TableBlock }
func (Diagram) Kind() BlockKind   { return DiagramBlock }
func (Plot) Kind() BlockKind      { return PlotBlock }
func (SignOff) Kind() BlockKind   { return SignOffBlock }
func (BarChart) Kind() BlockKind  { return BarChartBlock }
