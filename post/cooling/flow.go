package cooling

import (
	"fmt"
	"math"
)

// Flow-regime limits on the Reynolds number of pipe flow (common textbook values, e.g. Çengel & Cimbala, Fluid
// Mechanics, §8-2: laminar below about 2300, fully turbulent above about 4000; from memory).
const (
	ReLaminar   = 2300.0 // below: laminar
	ReTurbulent = 4000.0 // above: fully turbulent; between the two: transitional
)

// LaminarNusselt is the Nusselt number of fully developed laminar flow in a round tube with uniform wall heat
// flux, 48/11 ≈ 4.36 (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Eq. 8.53; from memory).
const LaminarNusselt = 48.0 / 11.0

// Colebrook returns the Darcy friction factor of turbulent flow at Reynolds number re in a pipe of relative
// roughness rr = ε/D, the root of the Colebrook-White equation (Colebrook, J. Inst. Civ. Eng. 11 (1939) 133)
//
//	1/√f = −2 log10( rr/3.7 + 2.51/(re √f) ),
//
// solved by fixed-point iteration on 1/√f from the Haaland estimate to a relative change below 1e-13 (the map is
// a strong contraction: its derivative is below 2·2.51/(ln10·re·(rr/3.7 + ...)·√f) ≪ 1).
func Colebrook(re, rr float64) (float64, error) {
	if !(re > 0) || !(rr >= 0) || math.IsInf(re, 0) {
		return 0, fmt.Errorf("cooling: Colebrook needs Re > 0 and ε/D ≥ 0, got Re = %g, ε/D = %g", re, rr)
	}
	x := 1 / math.Sqrt(Haaland(re, rr))
	for k := 0; k < 100; k++ {
		nx := -2 * math.Log10(rr/3.7+2.51*x/re)
		if math.Abs(nx-x) <= 1e-13*nx {
			return 1 / (nx * nx), nil
		}
		x = nx
	}
	return 0, fmt.Errorf("cooling: Colebrook iteration did not converge at Re = %g, ε/D = %g", re, rr)
}

// Haaland returns the explicit Haaland approximation of the Colebrook friction factor
// (Haaland, J. Fluids Eng. 105 (1983) 89): 1/√f = −1.8 log10((rr/3.7)^1.11 + 6.9/re); within about 2 % of
// Colebrook for 4000 ≤ Re ≤ 1e8 (White, Fluid Mechanics, §6.7; from memory).
func Haaland(re, rr float64) float64 {
	x := -1.8 * math.Log10(math.Pow(rr/3.7, 1.11)+6.9/re)
	return 1 / (x * x)
}

// SwameeJain returns the explicit Swamee-Jain approximation of the Colebrook friction factor
// (Swamee & Jain, J. Hydraul. Div. ASCE 102 (1976) 657): f = 0.25/[log10(rr/3.7 + 5.74/re^0.9)]²; its stated
// range is 1e-6 ≤ ε/D ≤ 1e-2 and 5000 ≤ Re ≤ 1e8, where the tests measure it within 2.5 % of Colebrook.
func SwameeJain(re, rr float64) float64 {
	l := math.Log10(rr/3.7 + 5.74/math.Pow(re, 0.9))
	return 0.25 / (l * l)
}

// DarcyFriction returns the Darcy friction factor for any regime: 64/Re below ReLaminar (Hagen-Poiseuille),
// Colebrook above it (conservative in the transitional band, where the flow may still be partly laminar).
func DarcyFriction(re, rr float64) (float64, error) {
	if !(re > 0) {
		return 0, fmt.Errorf("cooling: Reynolds number %g must be positive", re)
	}
	if re < ReLaminar {
		return 64 / re, nil
	}
	return Colebrook(re, rr)
}

// DarcyWeisbach returns the pressure drop (Pa) over a straight tube of length l (m) and inner diameter d (m)
// with friction factor f, fluid density rho (kg/m³) and mean velocity v (m/s): Δp = f (l/d) ρ v²/2.
func DarcyWeisbach(f, l, d, rho, v float64) float64 {
	return f * l / d * rho * v * v / 2
}

// Gnielinski returns the Nusselt number of fully developed turbulent flow in a smooth round tube
// (Gnielinski, Int. Chem. Eng. 16 (1976) 359; Incropera & DeWitt, Eq. 8.62):
//
//	Nu = (f/8)(Re − 1000) Pr / (1 + 12.7 √(f/8) (Pr^(2/3) − 1)),  f = (0.790 ln Re − 1.64)⁻² (Petukhov),
//
// stated valid for 3000 ≤ Re ≤ 5e6 and 0.5 ≤ Pr ≤ 2000; inRange reports whether (re, pr) is inside that range.
// The property-variation factor (Pr/Pr_wall)^0.11 is not applied.
func Gnielinski(re, pr float64) (nu float64, inRange bool) {
	l := 0.790*math.Log(re) - 1.64
	f8 := 1 / (l * l) / 8
	nu = f8 * (re - 1000) * pr / (1 + 12.7*math.Sqrt(f8)*(math.Pow(pr, 2.0/3.0)-1))
	inRange = re >= 3000 && re <= 5e6 && pr >= 0.5 && pr <= 2000
	return nu, inRange
}

// DittusBoelter returns the Dittus-Boelter Nusselt number for a fluid being heated, Nu = 0.023 Re^0.8 Pr^0.4
// (Incropera & DeWitt, Eq. 8.60; stated for Re ≥ 10000, 0.6 ≤ Pr ≤ 160, L/D ≥ 10; errors up to about 25 %).
func DittusBoelter(re, pr float64) float64 {
	return 0.023 * math.Pow(re, 0.8) * math.Pow(pr, 0.4)
}
