package cooling

import (
	"errors"
	"math"
	"testing"
)

func rel(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// IAPWS R7-97(2012) Table 5: verification values of region 1 (v in m³/kg, c_p in kJ/(kg·K)). Values recalled
// and confirmed against published transcriptions of the table.
func TestRegion1Verification(t *testing.T) {
	cases := []struct{ T, p, v, cp float64 }{
		{300, 3e6, 0.100215168e-2, 0.417301218e1},
		{300, 80e6, 0.971180894e-3, 0.401008987e1},
		{500, 3e6, 0.120241800e-2, 0.465580682e1},
	}
	for _, c := range cases {
		v, cp := region1(c.T, c.p)
		if rel(v, c.v) > 1e-8 {
			t.Errorf("v(%g K, %g Pa) = %.9e, want %.9e", c.T, c.p, v, c.v)
		}
		if rel(cp, c.cp*1e3) > 1e-8 {
			t.Errorf("cp(%g K, %g Pa) = %.9e, want %.9e", c.T, c.p, cp, c.cp*1e3)
		}
	}
}

// IAPWS R7-97(2012) Tables 35 and 36: saturation pressure (MPa) and temperature (K) of region 4.
func TestSaturationVerification(t *testing.T) {
	for _, c := range []struct{ T, p float64 }{{300, 0.353658941e-2}, {500, 0.263889776e1}, {600, 0.123443146e2}} {
		p, err := SaturationPressure(c.T)
		if err != nil || rel(p, c.p*1e6) > 1e-8 {
			t.Errorf("psat(%g K) = %.9e Pa (%v), want %.9e", c.T, p, err, c.p*1e6)
		}
	}
	for _, c := range []struct{ p, T float64 }{{0.1, 0.372755919e3}, {1, 0.453035632e3}, {10, 0.584149488e3}} {
		T, err := SaturationTemperature(c.p * 1e6)
		if err != nil || rel(T, c.T) > 1e-8 {
			t.Errorf("Tsat(%g MPa) = %.9e K (%v), want %.9e", c.p, T, err, c.T)
		}
	}
	// Round trip over the range, a property check.
	for T := 275.0; T < 640; T += 7.3 {
		p, _ := SaturationPressure(T)
		T2, err := SaturationTemperature(p)
		if err != nil || math.Abs(T2-T) > 1e-7 {
			t.Errorf("round trip %g K -> %g Pa -> %g K (%v)", T, p, T2, err)
		}
	}
}

// IAPWS R12-08 Table 4: viscosity in µPa·s at (T, ρ), all with μ̄2 = 1.
func TestViscosityVerification(t *testing.T) {
	cases := []struct{ T, rho, mu float64 }{
		{298.15, 998, 889.735100}, {298.15, 1200, 1437.649467}, {373.15, 1000, 307.883622},
		{433.15, 1, 14.538324}, {433.15, 1000, 217.685358}, {873.15, 1, 32.619287},
		{873.15, 100, 35.802262}, {873.15, 600, 77.430195}, {1173.15, 1, 44.217245},
		{1173.15, 100, 47.640433}, {1173.15, 400, 64.154608},
	}
	for _, c := range cases {
		// The table prints 6 decimals: allow half a unit in the last place.
		if mu := Viscosity(c.T, c.rho) * 1e6; math.Abs(mu-c.mu) > 5.01e-7 {
			t.Errorf("mu(%g K, %g kg/m³) = %.6f µPa·s, want %.6f", c.T, c.rho, mu, c.mu)
		}
	}
}

// IAPWS R15-11 Table 4: thermal conductivity in mW/(m·K) at (T, ρ), points where λ̄2 = 0.
func TestConductivityVerification(t *testing.T) {
	cases := []struct{ T, rho, k float64 }{
		{298.15, 0, 18.4341883}, {298.15, 998, 607.712868}, {298.15, 1200, 799.038144}, {873.15, 0, 79.1034659},
	}
	for _, c := range cases {
		if k := Conductivity(c.T, c.rho) * 1e3; rel(k, c.k) > 1e-8 {
			t.Errorf("k(%g K, %g kg/m³) = %.7f mW/(m·K), want %.7f", c.T, c.rho, k, c.k)
		}
	}
}

// Saturated-water table of Çengel & Ghajar, Heat and Mass Transfer: Fundamentals and Applications, Table A-9
// (from memory; the table is at the saturation pressure, we evaluate at 1 atm, a difference far below these
// tolerances for the liquid). Tolerances reflect the table's 3-4 printed digits and its older data sources.
func TestWaterAgainstHandbookTable(t *testing.T) {
	cases := []struct {
		celsius, rho, cp, k, mu, pr, psat float64
	}{
		{20, 998.0, 4182, 0.598, 1.002e-3, 7.01, 2.339e3},
		{40, 992.1, 4179, 0.631, 0.653e-3, 4.32, 7.384e3},
		{60, 983.3, 4185, 0.654, 0.467e-3, 2.99, 19.94e3},
		{80, 971.8, 4197, 0.670, 0.355e-3, 2.22, 47.39e3},
	}
	for _, c := range cases {
		w, err := WaterAt(c.celsius+ZeroCelsius, StandardAtmosphere)
		if err != nil {
			t.Fatal(err)
		}
		checks := []struct {
			name      string
			got, want float64
			tol       float64
		}{
			{"density", w.Density, c.rho, 1e-3},
			{"c_p", w.SpecificHeat, c.cp, 3e-3},
			{"conductivity", w.Conductivity, c.k, 1e-2},
			{"viscosity", w.Viscosity, c.mu, 1e-2},
			{"Prandtl", w.Prandtl, c.pr, 2e-2},
		}
		ps, _ := SaturationPressure(c.celsius + ZeroCelsius)
		checks = append(checks, struct {
			name      string
			got, want float64
			tol       float64
		}{"saturation pressure", ps, c.psat, 2e-3})
		for _, k := range checks {
			if rel(k.got, k.want) > k.tol {
				t.Errorf("%g °C %s = %.5g, table %.5g (tol %g)", c.celsius, k.name, k.got, k.want, k.tol)
			}
		}
	}
}

func TestWaterRanges(t *testing.T) {
	bad := []struct{ T, p float64 }{
		{260, StandardAtmosphere}, // ice
		{700, 30e6},               // beyond region 1
		{380, StandardAtmosphere}, // 107 °C at 1 atm: steam
		{300, 200e6},              // above 100 MPa
		{math.NaN(), StandardAtmosphere},
	}
	for _, b := range bad {
		if _, err := WaterAt(b.T, b.p); !errors.Is(err, ErrOutOfRange) {
			t.Errorf("WaterAt(%g, %g): err = %v, want ErrOutOfRange", b.T, b.p, err)
		}
	}
	if _, err := SaturationTemperature(100); !errors.Is(err, ErrOutOfRange) {
		t.Error("Tsat below the triple point accepted")
	}
	if _, err := SaturationPressure(700); !errors.Is(err, ErrOutOfRange) {
		t.Error("psat above the critical point accepted")
	}
}

func BenchmarkWaterAt(b *testing.B) {
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := WaterAt(313.15, 2e5); err != nil {
			b.Fatal(err)
		}
	}
}
