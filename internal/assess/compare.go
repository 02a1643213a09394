package assess

import (
	"errors"
	"math"

	"pasval/regen"
)

// ArrangementComparison is the area a section would need in the other
// arrangement for the same duty between the same temperatures.
type ArrangementComparison struct {
	Section     string   `json:"section"`
	Stage       string   `json:"stage,omitempty"`
	Arrangement string   `json:"arrangement"`
	AreaM2      float64  `json:"area_m2"`
	Other       string   `json:"other_arrangement"`
	OtherAreaM2 *float64 `json:"other_area_m2"` // null when impossible
	AreaRatio   *float64 `json:"area_ratio"`    // other / this
	Note        string   `json:"note"`
}

// CompareArrangements fills res.ArrangementComparison for every section.
func CompareArrangements(res *Result) {
	res.ArrangementComparison = []ArrangementComparison{}
	for _, s := range res.Sections {
		raw := s.Raw()
		other := regen.OtherArrangement(raw.Arrangement)
		c := ArrangementComparison{Section: s.Name, Stage: s.Stage, Arrangement: s.Arrangement, AreaM2: raw.RequiredArea, Other: other.String()}
		area, err := regen.AreaInArrangement(raw, other)
		if err != nil {
			c.Note = "impossible: " + err.Error()
			if errors.Is(err, regen.ErrInfeasible) {
				c.Note = "impossible: " + trimInfeasible(err.Error())
			}
		} else if ratio := area / raw.RequiredArea; math.IsInf(area, 0) || math.IsNaN(area) || math.IsInf(ratio, 0) || math.IsNaN(ratio) {
			c.Note = "not comparable: the area in the other arrangement is not a finite number"
		} else {
			c.OtherAreaM2, c.AreaRatio = &area, &ratio
			c.Note = "same duty between the same temperatures"
		}
		res.ArrangementComparison = append(res.ArrangementComparison, c)
	}
}

// trimInfeasible drops the sentinel's own words from the end of a message.
func trimInfeasible(s string) string {
	suffix := ": " + regen.ErrInfeasible.Error()
	if len(s) > len(suffix) && s[len(s)-len(suffix):] == suffix {
		return s[:len(s)-len(suffix)]
	}
	return s
}
