package fouling

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// FitKind names a form of the fouling resistance against time.
type FitKind string

const (
	// Linear is R_f = a + b·t: a deposit that grows at a steady rate.
	Linear FitKind = "linear"
	// Asymptotic is R_f = a + R∞·(1 − e^(−t/τ)): a deposit whose growth
	// slows as removal catches up with deposition (Kern and Seaton).
	Asymptotic FitKind = "asymptotic"
)

// FitKinds lists every kind, in the order they are reported.
var FitKinds = []FitKind{Linear, Asymptotic}

// Fit is a least-squares fit of the fouling resistance R_f (m²·K/W)
// against the time t (h) since the first window.
type Fit struct {
	Kind FitKind
	A    float64 // m²·K/W: the offset, R_f at t = 0
	B    float64 // m²·K/W per h: the slope (Linear)
	RInf float64 // m²·K/W: the asymptote above the offset (Asymptotic)
	Tau  float64 // h: the time constant (Asymptotic)
	// Cov is the covariance of the parameters, s²(JᵀJ)⁻¹, in the order
	// (A, B) or (A, RInf, Tau), h for Tau; nil when JᵀJ is singular.
	Cov [][]float64
	N   int     // points fitted
	RSS float64 // residual sum of squares, (m²·K/W)²
	// AIC is Akaike's information criterion for least squares,
	// n ln(RSS/n) + 2k (−Inf when RSS is 0).
	AIC       float64
	Residuals []float64 // y − fit, in the points' order
	// Determined is false for an asymptotic fit whose τ lies at an end of
	// the range searched (TauRange): the data do not pin it down, and the
	// fit is reported but never chosen.
	Determined bool
}

// Params is the number of fitted parameters k.
func (f Fit) Params() int {
	if f.Kind == Asymptotic {
		return 3
	}
	return 2
}

// At is the fitted R_f at t hours, m²·K/W:
//
//	linear:      a + b·t
//	asymptotic:  a + R∞ (1 − e^(−t/τ))
func (f Fit) At(t float64) float64 {
	switch f.Kind {
	case Linear:
		return f.A + f.B*t
	case Asymptotic:
		return f.A - f.RInf*math.Expm1(-t/f.Tau)
	}
	panic(fmt.Sprintf("%sno form for fit kind %q", panicPrefix, f.Kind))
}

// RMS is the root-mean-square residual, √(RSS/n), m²·K/W.
func (f Fit) RMS() float64 { return math.Sqrt(f.RSS / float64(f.N)) }

// Reaches returns the time t (h) at which the fit reaches the fouling r
// rising, and the gradient g = ∂t/∂θ in the order of Cov:
//
//	linear (b > 0):        t = (r − a)/b
//	                       g = (−1/b, −(r − a)/b²)
//	asymptotic (R∞ > 0):   u = (r − a)/R∞ < 1,  t = −τ ln(1 − u)
//	                       g = (−τ/(R∞(1 − u)), −τu/(R∞(1 − u)), −ln(1 − u))
//
// ok is false when the fit never reaches r: a slope or an asymptote that is
// not positive, or an asymptote a + R∞ at or below r. t may be negative
// (reached before the first window).
func (f Fit) Reaches(r float64) (t float64, g []float64, ok bool) {
	switch f.Kind {
	case Linear:
		if !(f.B > 0) {
			return 0, nil, false
		}
		d := r - f.A
		return d / f.B, []float64{-1 / f.B, -d / (f.B * f.B)}, true
	case Asymptotic:
		if !(f.RInf > 0) {
			return 0, nil, false
		}
		u := (r - f.A) / f.RInf
		if !(u < 1) {
			return 0, nil, false
		}
		l := math.Log1p(-u)
		return -f.Tau * l, []float64{-f.Tau / (f.RInf * (1 - u)), -f.Tau * u / (f.RInf * (1 - u)), -l}, true
	}
	panic(fmt.Sprintf("%sno form for fit kind %q", panicPrefix, f.Kind))
}

// Variance is the delta-method variance gᵀ C g of a quantity whose gradient
// with respect to the parameters is g; NaN without a covariance.
//
// References: D. M. Bates and D. G. Watts (1988), Nonlinear Regression
// Analysis and Its Applications, Wiley, §2.3 (from memory).
func (f Fit) Variance(g []float64) float64 {
	if f.Cov == nil || len(g) != len(f.Cov) {
		return math.NaN()
	}
	v := 0.0
	for i := range g {
		for j := range g {
			v += g[i] * f.Cov[i][j] * g[j]
		}
	}
	return v
}

// shift moves the fit by −c: the fit of y − c (only the offset moves).
func (f *Fit) shift(c float64) { f.A -= c }

// ErrTooFew is returned by a fit given fewer points than it needs.
var ErrTooFew = errors.New("too few points for the fit")

// MinPoints is the least number of points each fit takes: one more than its
// parameters, so that the residual variance is defined, and five for the
// asymptotic fit, whose curvature needs more.
var MinPoints = map[FitKind]int{Linear: 3, Asymptotic: 5}

// FitLinear fits y = a + b·t by least squares (QR, through gonum/mat) and
// returns its residuals, AIC and covariance
//
//	C = s² (XᵀX)⁻¹,  s² = RSS/(n − 2),  X = [1 t]
//
// t in h, y in m²·K/W. It returns ErrTooFew for fewer than
// MinPoints[Linear] points.
func FitLinear(t, y []float64) (Fit, error) {
	checkLengths(t, y)
	if len(t) < MinPoints[Linear] {
		return Fit{}, ErrTooFew
	}
	x := mat.NewDense(len(t), 2, nil)
	for i, ti := range t {
		x.Set(i, 0, 1)
		x.Set(i, 1, ti)
	}
	beta, err := solve(x, y)
	if err != nil {
		return Fit{}, err
	}
	f := Fit{Kind: Linear, A: beta[0], B: beta[1], Determined: true}
	f.finish(t, y, x)
	return f, nil
}

// TauRange is the range of τ the asymptotic fit searches, h: from twice the
// median spacing of the points to the span of the data. A time constant
// outside the data span cannot be told from a straight line (τ much longer)
// or a step at the first point (τ much shorter).
func TauRange(t []float64) (lo, hi float64) {
	if len(t) < 2 {
		return math.NaN(), math.NaN()
	}
	gaps := make([]float64, len(t)-1)
	for i := 1; i < len(t); i++ {
		gaps[i-1] = t[i] - t[i-1]
	}
	return 2 * median(gaps), t[len(t)-1] - t[0]
}

// tauGrid is the number of τ values scanned, evenly in ln τ, before the
// golden-section refinement.
const tauGrid = 64

// asymptoticDesign fills x with the columns of a + R_f∞·(1 − e^(−t/τ)):
// 1 and 1 − e^(−t/τ), written −expm1(−t/τ) to keep small t exact.
func asymptoticDesign(x *mat.Dense, t []float64, tau float64) {
	for i, ti := range t {
		x.Set(i, 0, 1)
		x.Set(i, 1, -math.Expm1(-ti/tau))
	}
}

// FitAsymptotic fits y = a + R∞ (1 − e^(−t/τ)) by separable least squares:
// for a fixed τ the model is linear in (a, R∞) and solved as FitLinear
// solves its own; τ minimises that residual sum of squares over [lo, hi]:
//
//	RSS(τ) = min over (a, R∞) of Σ (y_i − a − R∞ (1 − e^(−t_i/τ)))²
//	τ̂ = argmin RSS(τ): ln τ scanned at 64 points, then golden-section search
//	    between the neighbours of the best one (to 10⁻¹⁰ in ln τ)
//
// The covariance is s² (JᵀJ)⁻¹ with s² = RSS/(n − 3) and the Jacobian at the
// optimum J = [1, 1 − e^(−t/τ), −R∞ (t/τ²) e^(−t/τ)]. Determined is false
// when τ̂ lies at an end of the range. t in h, y in m²·K/W. ErrTooFew for
// fewer than MinPoints[Asymptotic] points or an empty range (hi ≤ lo).
//
// References: G. H. Golub and V. Pereyra (1973), "The differentiation of
// pseudo-inverses and nonlinear least squares problems whose variables
// separate", SIAM J. Numer. Anal. 10:413–432 (from memory); J. Kiefer (1953),
// "Sequential minimax search for a maximum", Proc. Amer. Math. Soc. 4:502–506
// (golden section, from memory); D. Q. Kern and R. E. Seaton (1959), "A
// theoretical analysis of thermal surface fouling", Brit. Chem. Eng.
// 4:258–262 (the asymptotic form, from memory).
func FitAsymptotic(t, y []float64, lo, hi float64) (Fit, error) {
	checkLengths(t, y)
	if len(t) < MinPoints[Asymptotic] || !(hi > lo) || !(lo > 0) {
		return Fit{}, ErrTooFew
	}
	x := mat.NewDense(len(t), 2, nil)
	rss := func(lnTau float64) float64 {
		tau := math.Exp(lnTau)
		asymptoticDesign(x, t, tau)
		beta, err := solve(x, y)
		if err != nil {
			return math.Inf(1)
		}
		s := 0.0
		for i, ti := range t {
			r := y[i] - beta[0] + beta[1]*math.Expm1(-ti/tau)
			s += r * r
		}
		return s
	}
	a, b := math.Log(lo), math.Log(hi)
	step := (b - a) / (tauGrid - 1)
	best, bestRSS := 0, math.Inf(1)
	for i := range tauGrid {
		if v := rss(a + float64(i)*step); v < bestRSS {
			best, bestRSS = i, v
		}
	}
	left, right := a+float64(max(best-1, 0))*step, a+float64(min(best+1, tauGrid-1))*step
	lnTau := goldenSection(rss, left, right, 1e-10)
	if rss(lnTau) > bestRSS {
		lnTau = a + float64(best)*step
	}
	tau := math.Exp(lnTau)
	asymptoticDesign(x, t, tau)
	beta, err := solve(x, y)
	if err != nil {
		return Fit{}, err
	}
	f := Fit{Kind: Asymptotic, A: beta[0], RInf: beta[1], Tau: tau,
		Determined: lnTau-a > 1e-6 && b-lnTau > 1e-6}
	j := mat.NewDense(len(t), 3, nil)
	for i, ti := range t {
		e := math.Exp(-ti / tau)
		j.Set(i, 0, 1)
		j.Set(i, 1, 1-e)
		j.Set(i, 2, -f.RInf*ti/(tau*tau)*e)
	}
	f.finish(t, y, j)
	return f, nil
}

// goldenSection minimises f on [a, b] to an interval shorter than tol.
//
// References: J. Kiefer (1953) (from memory); W. H. Press et al. (2007),
// Numerical Recipes, 3rd ed., §10.2 (from memory).
func goldenSection(f func(float64) float64, a, b, tol float64) float64 {
	invPhi := (math.Sqrt(5) - 1) / 2
	c, d := b-invPhi*(b-a), a+invPhi*(b-a)
	fc, fd := f(c), f(d)
	for b-a > tol {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - invPhi*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + invPhi*(b-a)
			fd = f(d)
		}
	}
	return (a + b) / 2
}

// finish fills the residuals, RSS, AIC and covariance from the model's
// Jacobian j (n × k) at the fitted parameters.
func (f *Fit) finish(t, y []float64, j *mat.Dense) {
	n, k := len(t), f.Params()
	f.N = n
	f.Residuals = make([]float64, n)
	for i, ti := range t {
		r := y[i] - f.At(ti)
		f.Residuals[i] = r
		f.RSS += r * r
	}
	f.AIC = float64(n)*math.Log(f.RSS/float64(n)) + 2*float64(k)
	var jtj mat.SymDense
	jtj.SymOuterK(1, j.T())
	var chol mat.Cholesky
	if !chol.Factorize(&jtj) {
		return
	}
	var inv mat.SymDense
	if err := chol.InverseTo(&inv); err != nil {
		return
	}
	s2 := f.RSS / float64(n-k)
	f.Cov = make([][]float64, k)
	for r := range k {
		f.Cov[r] = make([]float64, k)
		for c := range k {
			f.Cov[r][c] = s2 * inv.At(r, c)
		}
	}
}

// solve is the least-squares solution of x·β ≈ y (QR).
func solve(x *mat.Dense, y []float64) ([]float64, error) {
	var beta mat.VecDense
	if err := beta.SolveVec(x, mat.NewVecDense(len(y), append([]float64(nil), y...))); err != nil {
		return nil, err
	}
	return []float64{beta.AtVec(0), beta.AtVec(1)}, nil
}

func checkLengths(t, y []float64) {
	if len(t) != len(y) {
		panic(fmt.Sprintf("%sfit: %d times and %d values", panicPrefix, len(t), len(y)))
	}
}

// median of a copy of x (the mean of the middle two for an even count).
func median(x []float64) float64 {
	s := slices.Clone(x)
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}
