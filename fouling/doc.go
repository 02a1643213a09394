// Package fouling follows the heating section of a pasteurizer over a
// recorded run: its overall heat-transfer coefficient U window by window,
// the fouling resistance R_f that grows as deposits build on the plates, two
// fits of R_f against time, and the forecast of when the section can no
// longer bring the product to the temperature the plant needs — with the
// hottest heating medium available, or without exceeding a burn-on limit on
// the medium-to-product difference: the time to clean
// (docs/METHOD.md §17, fouling and the cleaning forecast).
//
//	w := fouling.NewWindower(60, false) // 60 s windows; a volumetric medium flow
//	for _, s := range samples {         // in time order, SI
//		w.Add(s)
//	}
//	res := fouling.Analyse(section, fouling.Run{Windows: w.Windows(), First: t0, Last: t1})
//	for _, fc := range res.Forecasts {
//		_ = fc.CleanBefore // s, when fc.State == fouling.Ahead
//	}
//
// The section is rated as the design check rates it (package regen: the
// heating rating, and with a plate pack its coupled iteration), at the
// normal rate, so that the forecast answers the question of the plant model
// rather than of the outlet the run happened to hold. All quantities are SI
// (temperatures in °C, differences in K, times in s; the fits take hours);
// nothing here prints or reads files.
//
// References: F. P. Incropera, D. P. DeWitt, T. L. Bergman and A. S. Lavine
// (2007), Fundamentals of Heat and Mass Transfer, 6th ed., §11.2 (Eq. 11.5,
// fouling resistance) and §11.3 (Eqs. 11.14–11.15, LMTD); B. Bansal and
// X. D. Chen (2006), "A critical review of milk fouling in heat
// exchangers", Compr. Rev. Food Sci. Food Saf. 5:27–33 (from memory); H.
// Akaike (1974), "A new look at the statistical model identification", IEEE
// Trans. Autom. Control 19:716–723.
package fouling

const panicPrefix = "fouling: "
