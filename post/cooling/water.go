// Package cooling sizes the water cooling of a hollow work coil: from the coil's own Joule loss it finds the
// water flow for an allowed temperature rise, the flow regime, the friction pressure drop, the heat transfer
// coefficient and the inner wall temperature at the outlet, and warns about boiling at the wall, laminar or
// transitional flow, insufficient supply pressure and erosive velocity.
//
// Units are SI throughout: temperatures in kelvin, pressures in pascal (absolute unless a field says gauge),
// flows in kg/s or m³/s; the only exceptions are output fields named for their unit (FlowLPerMin).
// The package depends on no other eddyrz package.
package cooling

import (
	"errors"
	"fmt"
	"math"
)

// ZeroCelsius is 0 °C in kelvin.
const ZeroCelsius = 273.15

// StandardAtmosphere is 1 atm in Pa.
const StandardAtmosphere = 101325.0

// ErrOutOfRange is returned (wrapped) when a state lies outside the validity range of a formulation.
var ErrOutOfRange = errors.New("cooling: outside the validity range")

// Water holds the properties of liquid water at one state.
type Water struct {
	T            float64 // K, temperature
	P            float64 // Pa, absolute pressure
	Density      float64 // kg/m³
	Viscosity    float64 // Pa·s, dynamic viscosity
	SpecificHeat float64 // J/(kg·K), isobaric
	Conductivity float64 // W/(m·K)
	Prandtl      float64 // μ c_p / k, dimensionless
}

// Sources of the water formulations (all published by IAPWS, www.iapws.org):
//   - density and c_p: IAPWS-IF97 region 1 (IAPWS R7-97(2012), "Revised Release on the IAPWS Industrial
//     Formulation 1997 for the Thermodynamic Properties of Water and Steam"), Eq. 7 and Table 2;
//   - saturation pressure and temperature: the same release, region 4, Eqs. 30-31 and Table 34;
//   - viscosity: IAPWS R12-08, "Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water
//     Substance", Eqs. 10-12 and Tables 1-2, with the critical enhancement μ̄2 = 1 (the release allows this
//     outside a small region around the critical point);
//   - thermal conductivity: IAPWS R15-11, "Release on the IAPWS Formulation 2011 for the Thermal Conductivity of
//     Ordinary Water Substance", Eqs. 16-17 and Tables 1-2, without the critical enhancement λ̄2 (a term that
//     matters near the critical point, not in cooling water).
// Coefficients were written from memory and checked digit by digit against published transcriptions of these
// tables; the tests reproduce the releases' own verification values.

const (
	if97R     = 461.526  // J/(kg·K), specific gas constant of water in IF97
	if97PStar = 16.53e6  // Pa, region 1 reducing pressure
	if97TStar = 1386.0   // K, region 1 reducing temperature
	tCrit     = 647.096  // K, critical temperature
	rhoCrit   = 322.0    // kg/m³, critical density
	pCrit     = 22.064e6 // Pa, critical pressure
	pTriple   = 611.213  // Pa, saturation pressure at 273.15 K per IF97 region 4 (lower end of its range)
)

// if97Region1 holds (I, J, n) of IF97 Table 2.
var if97Region1 = [34]struct {
	i, j int
	n    float64
}{
	{0, -2, 0.14632971213167}, {0, -1, -0.84548187169114}, {0, 0, -0.37563603672040e1},
	{0, 1, 0.33855169168385e1}, {0, 2, -0.95791963387872}, {0, 3, 0.15772038513228},
	{0, 4, -0.16616417199501e-1}, {0, 5, 0.81214629983568e-3}, {1, -9, 0.28319080123804e-3},
	{1, -7, -0.60706301565874e-3}, {1, -1, -0.18990068218419e-1}, {1, 0, -0.32529748770505e-1},
	{1, 1, -0.21841717175414e-1}, {1, 3, -0.52838357969930e-4}, {2, -3, -0.47184321073267e-3},
	{2, 0, -0.30001780793026e-3}, {2, 1, 0.47661393906987e-4}, {2, 3, -0.44141845330846e-5},
	{2, 17, -0.72694996297594e-15}, {3, -4, -0.31679644845054e-4}, {3, 0, -0.28270797985312e-5},
	{3, 6, -0.85205128120103e-9}, {4, -5, -0.22425281908000e-5}, {4, -2, -0.65171222895601e-6},
	{4, 10, -0.14341729937924e-12}, {5, -8, -0.40516996860117e-6}, {8, -11, -0.12734301741641e-8},
	{8, -6, -0.17424871230634e-9}, {21, -29, -0.68762131295531e-18}, {23, -31, 0.14478307828521e-19},
	{29, -38, 0.26335781662795e-22}, {30, -39, -0.11947622640071e-22}, {31, -40, 0.18228094581404e-23},
	{32, -41, -0.93537087292458e-25},
}

// if97Region4 holds n1..n10 of IF97 Table 34 (index 0 is n1).
var if97Region4 = [10]float64{
	0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
	-0.32325550322333e7, 0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6,
	-0.23855557567849, 0.65017534844798e3,
}

// viscH0 and viscH1 are Tables 1 and 2 of IAPWS R12-08; viscH1[i][j] multiplies (1/T̄ − 1)^i (ρ̄ − 1)^j.
var viscH0 = [4]float64{1.67752, 2.20462, 0.6366564, -0.241605}

var viscH1 = [6][7]float64{
	{5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0, 0},
	{8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0, 0, 0},
	{-1.08374, 1.88797, -7.72479e-1, 0, 0, 0, 0},
	{-2.89555e-1, 1.26613, -4.89837e-1, 0, 6.98452e-2, 0, -4.35673e-3},
	{0, 0, -2.57040e-1, 0, 0, 8.72102e-3, 0},
	{0, 1.20573e-1, 0, 0, 0, 0, -5.93264e-4},
}

// condL0 and condL1 are Tables 1 and 2 of IAPWS R15-11; condL1[i][j] multiplies (1/T̄ − 1)^i (ρ̄ − 1)^j.
var condL0 = [5]float64{2.443221e-3, 1.323095e-2, 6.770357e-3, -3.454586e-3, 4.096266e-4}

var condL1 = [5][6]float64{
	{1.60397357, -0.646013523, 0.111443906, 0.102997357, -0.0504123634, 0.00609859258},
	{2.33771842, -2.78843778, 1.53616167, -0.463045512, 0.0832827019, -0.00719201245},
	{2.19650529, -4.54580785, 3.55777244, -1.40944978, 0.275418278, -0.0205938816},
	{-1.21051378, 1.60812989, -0.621178141, 0.0716373224, 0, 0},
	{-2.7203370, 4.57586331, -3.18369245, 1.1168348, -0.19268305, 0.012913842},
}

// SaturationPressure returns the vapour pressure (Pa) of water at temperature T (K), IF97 region 4 (Eq. 30),
// valid from 273.15 K to the critical temperature 647.096 K.
func SaturationPressure(T float64) (float64, error) {
	if !(T >= ZeroCelsius && T <= tCrit) {
		return 0, fmt.Errorf("%w: saturation pressure at %g K (valid 273.15-647.096 K)", ErrOutOfRange, T)
	}
	n := &if97Region4
	th := T + n[8]/(T-n[9])
	a := th*th + n[0]*th + n[1]
	b := n[2]*th*th + n[3]*th + n[4]
	c := n[5]*th*th + n[6]*th + n[7]
	x := 2 * c / (-b + math.Sqrt(b*b-4*a*c))
	return x * x * x * x * 1e6, nil
}

// SaturationTemperature returns the boiling temperature (K) of water at absolute pressure p (Pa), IF97 region 4
// (Eq. 31), valid from 611.213 Pa to the critical pressure 22.064 MPa.
func SaturationTemperature(p float64) (float64, error) {
	if !(p >= pTriple && p <= pCrit) {
		return 0, fmt.Errorf("%w: saturation temperature at %g Pa (valid 611.213 Pa-22.064 MPa)", ErrOutOfRange, p)
	}
	n := &if97Region4
	beta := math.Pow(p/1e6, 0.25)
	e := beta*beta + n[2]*beta + n[5]
	f := n[0]*beta*beta + n[3]*beta + n[6]
	g := n[1]*beta*beta + n[4]*beta + n[7]
	d := 2 * g / (-f - math.Sqrt(f*f-4*e*g))
	s := n[9] + d
	return (s - math.Sqrt(s*s-4*(n[8]+n[9]*d))) / 2, nil
}

// region1 returns specific volume (m³/kg) and c_p (J/(kg·K)) from the IF97 region 1 Gibbs function.
func region1(T, p float64) (v, cp float64) {
	pi := p / if97PStar
	tau := if97TStar / T
	a := 7.1 - pi
	b := tau - 1.222
	var gp, gtt float64
	for _, c := range if97Region1 {
		ai := math.Pow(a, float64(c.i-1))
		bj := math.Pow(b, float64(c.j-2))
		gp -= c.n * float64(c.i) * ai * bj * b * b
		gtt += c.n * ai * a * float64(c.j*(c.j-1)) * bj
	}
	v = if97R * T * pi * gp / p
	cp = -if97R * tau * tau * gtt
	return v, cp
}

// Viscosity returns the dynamic viscosity (Pa·s) of water at temperature T (K) and density rho (kg/m³),
// IAPWS R12-08 without the critical enhancement.
func Viscosity(T, rho float64) float64 {
	tb := T / tCrit
	rb := rho / rhoCrit
	var s0 float64
	for i, h := range viscH0 {
		s0 += h / math.Pow(tb, float64(i))
	}
	mu0 := 100 * math.Sqrt(tb) / s0
	x := 1/tb - 1
	y := rb - 1
	var s1, xi float64 = 0, 1
	for i := range viscH1 {
		var row, yj float64 = 0, 1
		for j := range viscH1[i] {
			row += viscH1[i][j] * yj
			yj *= y
		}
		s1 += xi * row
		xi *= x
	}
	return mu0 * math.Exp(rb*s1) * 1e-6
}

// Conductivity returns the thermal conductivity (W/(m·K)) of water at temperature T (K) and density rho
// (kg/m³), IAPWS R15-11 without the critical enhancement.
func Conductivity(T, rho float64) float64 {
	tb := T / tCrit
	rb := rho / rhoCrit
	var s0 float64
	for k, l := range condL0 {
		s0 += l / math.Pow(tb, float64(k))
	}
	l0 := math.Sqrt(tb) / s0
	x := 1/tb - 1
	y := rb - 1
	var s1, xi float64 = 0, 1
	for i := range condL1 {
		var row, yj float64 = 0, 1
		for j := range condL1[i] {
			row += condL1[i][j] * yj
			yj *= y
		}
		s1 += xi * row
		xi *= x
	}
	return l0 * math.Exp(rb*s1) * 1e-3
}

// WaterAt returns the properties of liquid water at temperature T (K) and absolute pressure p (Pa). It is valid
// where IF97 region 1 is: 273.15 K ≤ T ≤ 623.15 K and p_sat(T) ≤ p ≤ 100 MPa; a pressure below the vapour
// pressure (the water would boil) is an ErrOutOfRange error.
func WaterAt(T, p float64) (Water, error) {
	if !(T >= ZeroCelsius && T <= 623.15) {
		return Water{}, fmt.Errorf("%w: liquid water at %g K (valid 273.15-623.15 K)", ErrOutOfRange, T)
	}
	ps, err := SaturationPressure(T)
	if err != nil {
		return Water{}, err
	}
	if !(p >= ps && p <= 100e6) {
		return Water{}, fmt.Errorf("%w: liquid water at %g K needs %g Pa ≤ p ≤ 100 MPa, got %g Pa",
			ErrOutOfRange, T, ps, p)
	}
	v, cp := region1(T, p)
	rho := 1 / v
	w := Water{T: T, P: p, Density: rho, SpecificHeat: cp, Viscosity: Viscosity(T, rho), Conductivity: Conductivity(T, rho)}
	w.Prandtl = w.Viscosity * w.SpecificHeat / w.Conductivity
	return w, nil
}
