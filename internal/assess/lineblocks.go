package assess

import (
	"pasval/internal/inputerr"
	"pasval/internal/plantfile"
)

type inputPos = inputerr.Pos

// ProductBlocks are the top-level blocks that describe one product, not the
// equipment of a line: a line file that gives one lends it, whole, to every
// product file that leaves it out (docs/METHOD.md §16.1).
var ProductBlocks = []string{"product", "flow", "process", "organisms", "legal_table"}

// LineWarnings are the warnings of a line file whose products are judged
// together (pasval matrix): WarnLineProductBlock when it gives product
// blocks (LineBlocks names them; Values inheriting: how many of products
// take one).
func LineWarnings(line *plantfile.Plant, products []*plantfile.Plant) []Warning {
	if len(LineBlocks(line)) == 0 {
		return nil
	}
	n := 0
	for _, p := range products {
		if len(Inherited(p)) > 0 {
			n++
		}
	}
	return []Warning{{Code: WarnLineProductBlock, Values: map[string]float64{"inheriting": float64(n)}}}
}

// LineBlocks are the product blocks a line file gives, in ProductBlocks order.
func LineBlocks(line *plantfile.Plant) []string {
	var out []string
	for _, b := range ProductBlocks {
		if Gives(line, b) {
			out = append(out, b)
		}
	}
	return out
}

// Inherited are the product blocks a product file takes from its line file.
func Inherited(p *plantfile.Plant) []string {
	var out []string
	for _, b := range ProductBlocks {
		if InheritsFromLine(p, b) {
			out = append(out, b)
		}
	}
	return out
}

// Gives reports whether a plant file (or a line file read alone) gives a
// product block itself.
func Gives(p *plantfile.Plant, block string) bool { return blockPos(p, block).Line > 0 }

// InheritsFromLine reports whether a product file takes a product block
// from its line file.
func InheritsFromLine(p *plantfile.Plant, block string) bool {
	pos := blockPos(p, block)
	return p.Line != nil && pos.Line > 0 && pos.File == p.Line.File
}

// blockPos is where a product block was written (Line 0 when absent).
func blockPos(p *plantfile.Plant, block string) (pos inputPos) {
	switch block {
	case "product":
		return p.Product.Pos
	case "flow":
		return p.Flow.Pos
	case "process":
		return p.Process.Pos
	case "organisms":
		if len(p.Organisms) > 0 {
			return p.Organisms[0].Pos
		}
		return inputPos{}
	case "legal_table":
		return p.LegalPos.Table
	}
	panic(panicPrefix + "no product block " + block)
}
