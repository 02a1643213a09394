package regen

import "math"

// OtherArrangement is the arrangement a section does not use.
func OtherArrangement(a Arrangement) Arrangement {
	if a == Cocurrent {
		return Counterflow
	}
	return Cocurrent
}

// AreaInArrangement is the area a section would need in arrangement a for the
// same duty between the same stream temperatures and capacity rates:
//
//	NTU_a = NTU(a, ε, C_r),  A_a = NTU_a · C_min / U
//
// It returns an error wrapping ErrInfeasible when arrangement a cannot reach
// the section's effectiveness (co-current above 1/(1 + C_r)).
func AreaInArrangement(s Section, a Arrangement) (float64, error) {
	ntu, err := NTU(a, s.Effectiveness, s.CapacityRatio)
	if err != nil {
		return 0, err
	}
	return ntu * math.Min(s.ProductCapacity, s.OtherCapacity) / s.U, nil
}
