package plantfile

import "math"

// SanitaryTube is a sanitary (3-A / ASTM A270) tube size: the outer diameter
// equals the nominal size.
type SanitaryTube struct {
	Nominal, Outer, Wall float64 // m
}

// Inner is the inner diameter, OD − 2·wall.
func (s SanitaryTube) Inner() float64 { return s.Outer - 2*s.Wall }

// SanitaryTubes lists the sizes the reader resolves `sanitary_tube` to.
// Walls: 0.065 in for 1.5–3 in, 0.083 in for 4 in, 0.109 in for 6 in (ASTM
// A270 / 3-A practice, from memory; docs/METHOD.md (holding tube)). This is
// the one copy of the table: the engine receives diameters, never sizes.
var SanitaryTubes = []SanitaryTube{
	{1.5 * 0.0254, 1.5 * 0.0254, 0.065 * 0.0254},
	{2 * 0.0254, 2 * 0.0254, 0.065 * 0.0254},
	{2.5 * 0.0254, 2.5 * 0.0254, 0.065 * 0.0254},
	{3 * 0.0254, 3 * 0.0254, 0.065 * 0.0254},
	{4 * 0.0254, 4 * 0.0254, 0.083 * 0.0254},
	{6 * 0.0254, 6 * 0.0254, 0.109 * 0.0254},
}

// LookupSanitaryTube finds a nominal size (m) within 0.1 mm.
func LookupSanitaryTube(nominal float64) (SanitaryTube, bool) {
	for _, s := range SanitaryTubes {
		if math.Abs(s.Nominal-nominal) < 1e-4 {
			return s, true
		}
	}
	return SanitaryTube{}, false
}

// resolveDiameters sets Inner and Outer from what was entered: the inner
// diameter, or the sanitary size's; the outer diameter, or the sanitary OD.
// An unknown sanitary size resolves to nothing (Validate refuses it).
func (h *HoldingTube) resolveDiameters() {
	h.Inner, h.Outer = h.InnerDiameter.SI, 0
	if s, ok := LookupSanitaryTube(h.SanitaryTube.SI); h.SanitaryTube.Set && ok {
		h.Inner, h.Outer = s.Inner(), s.Outer
	}
	if h.OuterDiameter.Set {
		h.Outer = h.OuterDiameter.SI
	}
}
