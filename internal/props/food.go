package props

// Composition is a food's make-up by mass fraction (each 0–1, summing to 1).
type Composition struct {
	Water, Protein, Fat, Carbohydrate, Fiber, Ash float64
}

// Sum is the total of the mass fractions.
func (c Composition) Sum() float64 {
	return c.Water + c.Protein + c.Fat + c.Carbohydrate + c.Fiber + c.Ash
}

// component property polynomials of the Choi–Okos correlations, T in °C:
// cp in kJ/(kg·K), k in W/(m·K), rho in kg/m³, each a + bT + cT².
type choiOkos struct {
	cp, k, rho [3]float64
}

// Choi, Y. and Okos, M.R. (1986), "Effects of temperature and composition on
// the thermal properties of foods", in Food Engineering and Process
// Applications, Vol. 1, Elsevier, pp. 93–101; as tabulated in food-engineering
// handbooks. Water's cp constant is 4.1762 (some copies print 4.1289; 4.1762
// reproduces water's 4.18 kJ/(kg·K) at 20 °C).
var (
	coWater   = choiOkos{[3]float64{4.1762, -9.0864e-5, 5.4731e-6}, [3]float64{0.57109, 1.7625e-3, -6.7036e-6}, [3]float64{997.18, 3.1439e-3, -3.7574e-3}}
	coProtein = choiOkos{[3]float64{2.0082, 1.2089e-3, -1.3129e-6}, [3]float64{0.17881, 1.1958e-3, -2.7178e-6}, [3]float64{1329.9, -0.5184, 0}}
	coFat     = choiOkos{[3]float64{1.9842, 1.4733e-3, -4.8008e-6}, [3]float64{0.18071, -2.7604e-4, -1.7749e-7}, [3]float64{925.59, -0.41757, 0}}
	coCarb    = choiOkos{[3]float64{1.5488, 1.9625e-3, -5.9399e-6}, [3]float64{0.20141, 1.3874e-3, -4.3312e-6}, [3]float64{1599.1, -0.31046, 0}}
	coFiber   = choiOkos{[3]float64{1.8459, 1.8306e-3, -4.6509e-6}, [3]float64{0.18331, 1.2497e-3, -3.1683e-6}, [3]float64{1311.5, -0.36589, 0}}
	coAsh     = choiOkos{[3]float64{1.0926, 1.8896e-3, -3.6817e-6}, [3]float64{0.32962, 1.4011e-3, -2.9069e-6}, [3]float64{2423.8, -0.28063, 0}}
)

func poly(c [3]float64, t float64) float64 { return c[0] + c[1]*t + c[2]*t*t }

func (c Composition) parts() ([6]float64, [6]choiOkos) {
	return [6]float64{c.Water, c.Protein, c.Fat, c.Carbohydrate, c.Fiber, c.Ash},
		[6]choiOkos{coWater, coProtein, coFat, coCarb, coFiber, coAsh}
}

// CompositionRange is the temperature range of the Choi–Okos fits, °C.
const (
	CompositionTmin = -40.0
	CompositionTmax = 150.0
)

// SpecificHeat is the mass-weighted specific heat, J/(kg·K):
//
//	cp = Σ xᵢ cpᵢ(T)
//
// T in °C (−40 to 150). References: Choi and Okos (1986).
func (c Composition) SpecificHeat(tempC float64) float64 {
	x, co := c.parts()
	var cp float64
	for i := range x {
		cp += x[i] * poly(co[i].cp, tempC)
	}
	return cp * 1e3
}

// Density is the density of the mixture, kg/m³:
//
//	ρ = 1 / Σ (xᵢ/ρᵢ(T))
//
// References: Choi and Okos (1986).
func (c Composition) Density(tempC float64) float64 {
	x, co := c.parts()
	var s float64
	for i := range x {
		s += x[i] / poly(co[i].rho, tempC)
	}
	return 1 / s
}

// Conductivity is the parallel (volume-fraction weighted) conductivity, W/(m·K):
//
//	k = Σ εᵢ kᵢ(T),  εᵢ = (xᵢ/ρᵢ) / Σ (xⱼ/ρⱼ)
//
// References: Choi and Okos (1986).
func (c Composition) Conductivity(tempC float64) float64 {
	x, co := c.parts()
	var s, k float64
	for i := range x {
		s += x[i] / poly(co[i].rho, tempC)
	}
	for i := range x {
		k += x[i] / poly(co[i].rho, tempC) / s * poly(co[i].k, tempC)
	}
	return k
}
