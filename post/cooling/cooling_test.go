package cooling

import (
	"fmt"
	"math"
	"testing"
)

// US customary to SI (exact definitions: 1 ft = 0.3048 m, 1 lbf = 4.4482216152605 N, g = 9.80665 m/s²).
const (
	ft         = 0.3048
	lbfPerFt2  = 4.4482216152605 / (ft * ft)    // Pa
	slugPerFt3 = 4.4482216152605 / 0.3048 / ft3 // kg/m³ (1 slug = 1 lbf·s²/ft)
	ft3        = ft * ft * ft
)

// Worked example in White, Fluid Mechanics (section on the Moody chart; from memory, example number not
// recalled): water, ρ = 1.94 slug/ft³, μ = 2.09e-5 slug/(ft·s), at 6 ft/s through 200 ft of 6-in asphalted
// cast-iron pipe, ε = 0.0004 ft. Published: Re ≈ 2.78e5, f ≈ 0.0198 (Colebrook), h_f ≈ 4.43 ft,
// Δp ≈ 277 lbf/ft².
func TestColebrookWorkedExample(t *testing.T) {
	rho := 1.94 * slugPerFt3
	mu := 2.09e-5 * slugPerFt3 * ft * ft // slug/(ft·s) = (slug/ft³)·ft²
	d, l, v, eps := 0.5*ft, 200*ft, 6*ft, 0.0004*ft
	re := rho * v * d / mu
	if math.Abs(re-2.78e5) > 0.01e5 {
		t.Errorf("Re = %g, want about 2.78e5", re)
	}
	f, err := Colebrook(re, eps/d)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(f-0.0198) > 0.00005 {
		t.Errorf("f = %.5f, want 0.0198", f)
	}
	dp := DarcyWeisbach(f, l, d, rho, v)
	if rel(dp, 277*lbfPerFt2) > 3e-3 {
		t.Errorf("Δp = %.1f Pa, want 277 lbf/ft² = %.1f Pa", dp, 277*lbfPerFt2)
	}
	hf := dp / (rho * 9.80665) / ft
	if math.Abs(hf-4.43) > 0.01 {
		t.Errorf("h_f = %.3f ft, want 4.43 ft", hf)
	}
}

// Colebrook properties: the root satisfies the equation; it tends to the fully rough law
// 1/√f = −2 log10(ε/(3.7D)) at large Re (von Kármán) ; the explicit forms agree within their stated accuracy;
// the smooth-pipe value at Re = 1e5 reads 0.018 on the Moody chart (from memory).
func TestColebrookProperties(t *testing.T) {
	for _, re := range []float64{4000, 1e4, 3e4, 1e5, 1e6, 1e7, 1e8} {
		for _, rr := range []float64{0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05} {
			f, err := Colebrook(re, rr)
			if err != nil {
				t.Fatal(err)
			}
			x := 1 / math.Sqrt(f)
			if r := x + 2*math.Log10(rr/3.7+2.51*x/re); math.Abs(r) > 1e-12*x {
				t.Errorf("Re %g ε/D %g: residual %g", re, rr, r)
			}
			if e := rel(Haaland(re, rr), f); e > 0.02 {
				t.Errorf("Re %g ε/D %g: Haaland off by %.2g", re, rr, e)
			}
			if re >= 5000 && rr >= 1e-6 && rr <= 1e-2 {
				if e := rel(SwameeJain(re, rr), f); e > 0.025 {
					t.Errorf("Re %g ε/D %g: Swamee-Jain off by %.2g", re, rr, e)
				}
			}
		}
	}
	f, _ := Colebrook(1e9, 0.01)
	rough := 1 / math.Pow(2*math.Log10(0.01/3.7), 2)
	if rel(f, rough) > 1e-4 {
		t.Errorf("fully rough limit: %g vs %g", f, rough)
	}
	if f, _ := Colebrook(1e5, 0); math.Abs(f-0.018) > 0.0002 {
		t.Errorf("smooth pipe Re = 1e5: f = %.5f, want about 0.018", f)
	}
	if _, err := Colebrook(0, 0.001); err == nil {
		t.Error("Re = 0 accepted")
	}
	if _, err := Colebrook(1e5, -1); err == nil {
		t.Error("negative roughness accepted")
	}
}

func TestDarcyFrictionRegimes(t *testing.T) {
	cases := []struct{ re, rr, want float64 }{
		{1000, 0.001, 0.064}, // Hagen-Poiseuille 64/Re
		{2299, 0.001, 64 / 2299.0},
	}
	for _, c := range cases {
		f, err := DarcyFriction(c.re, c.rr)
		if err != nil || rel(f, c.want) > 1e-12 {
			t.Errorf("DarcyFriction(%g) = %g (%v), want %g", c.re, f, err, c.want)
		}
	}
	f, _ := DarcyFriction(2300, 0)
	fc, _ := Colebrook(2300, 0)
	if f != fc {
		t.Errorf("at Re = 2300 the turbulent law must be used")
	}
}

// Gnielinski at Re = 10750, Pr = 4.32, evaluated by hand: f = (0.790 ln 10750 − 1.64)⁻² = 5.6934⁻² = 0.030850,
// f/8 = 0.0038563; numerator 0.0038563·9750·4.32 = 162.43; denominator 1 + 12.7·0.062099·(4.32^(2/3) − 1)
// = 1 + 12.7·0.062099·1.6537 = 2.3042; Nu = 70.49. The same point by Dittus-Boelter 0.023·10750^0.8·4.32^0.4
// = 69.3. (Formula: Incropera & DeWitt Eq. 8.62; no published worked example with Gnielinski was at hand.)
func TestGnielinski(t *testing.T) {
	nu, ok := Gnielinski(10750, 4.32)
	if !ok || math.Abs(nu-70.49) > 0.07 {
		t.Errorf("Gnielinski = %.3f (in range %v), want 70.49", nu, ok)
	}
	if db := DittusBoelter(10750, 4.32); math.Abs(db-69.3) > 0.1 {
		t.Errorf("Dittus-Boelter = %.3f, want 69.3", db)
	}
	// Cross-check over the common range: the two correlations agree within 25 % (Dittus-Boelter is quoted
	// with errors up to 25 %, Gnielinski about 10 %: Incropera & DeWitt §8.5, from memory).
	for _, re := range []float64{1e4, 3e4, 1e5, 3e5} {
		for _, pr := range []float64{2, 4, 7} {
			g, _ := Gnielinski(re, pr)
			if e := rel(DittusBoelter(re, pr), g); e > 0.25 {
				t.Errorf("Re %g Pr %g: DB and Gnielinski differ by %.2g", re, pr, e)
			}
		}
	}
	for _, c := range []struct{ re, pr float64 }{{2999, 5}, {6e6, 5}, {1e4, 0.4}, {1e4, 2500}} {
		if _, ok := Gnielinski(c.re, c.pr); ok {
			t.Errorf("Re %g Pr %g reported in range", c.re, c.pr)
		}
	}
}

// Worked example in Çengel & Ghajar, Heat and Mass Transfer, "Heating of water by resistance heaters" (from
// memory): water heated from 15 to 65 °C at 10 L/min in a 3 cm bore, 5 m long, uniform flux; published
// Re ≈ 10 760, Dittus-Boelter h ≈ 1.45 kW/(m²·K) (from memory, ±1 %), outlet wall ≈ 115 °C. The heater power
// follows from the energy balance, ṁ c_p ΔT = 0.1654 kg/s · 4179 J/(kg·K) · 50 K = 34.6 kW.
func TestSolveWorkedExample(t *testing.T) {
	c := Circuit{Loss: 34.56e3, BoreDiameter: 0.03, PathLength: 5, InletTemperature: 15 + ZeroCelsius, TemperatureRise: 50}
	r, err := c.Solve()
	if err != nil {
		t.Fatal(err)
	}
	if rel(r.FlowLPerMin, 10) > 5e-3 {
		t.Errorf("flow %.3f L/min, want 10", r.FlowLPerMin)
	}
	if rel(r.Reynolds, 10760) > 0.01 {
		t.Errorf("Re = %.0f, want about 10760", r.Reynolds)
	}
	if rel(r.HeatTransferCoeffDB, 1450) > 0.015 {
		t.Errorf("Dittus-Boelter h = %.0f, want about 1450", r.HeatTransferCoeffDB)
	}
	twDB := r.OutletTemperature + r.PeakHeatFlux/r.HeatTransferCoeffDB - ZeroCelsius
	if math.Abs(twDB-115) > 1.5 {
		t.Errorf("Dittus-Boelter outlet wall %.1f °C, want about 115 °C", twDB)
	}
	// Our estimate uses Gnielinski, a few per cent higher h: the wall comes out within 2 K of the example's.
	if math.Abs(r.WallTemperature-ZeroCelsius-115) > 2 {
		t.Errorf("outlet wall %.1f °C, want within 2 K of 115 °C", r.WallTemperature-ZeroCelsius)
	}
	if !r.Has(WarnWallBoiling) {
		t.Error("a 115 °C wall at 1 atm must raise the wall boiling warning")
	}
}

// Energy balance and internal consistency over a range of duties.
func TestSolveConsistency(t *testing.T) {
	for _, loss := range []float64{500, 5e3, 30e3} {
		for _, n := range []int{1, 2, 3} {
			c := Circuit{Loss: loss, BoreDiameter: 6e-3, PathLength: 4, Circuits: n, InletTemperature: 293.15,
				TemperatureRise: 20, Roughness: 1.5e-6, MinorLossK: 3, OutletPressure: 2e5}
			r, err := c.Solve()
			if err != nil {
				t.Fatal(err)
			}
			name := fmt.Sprintf("P=%g n=%d", loss, n)
			if e := rel(r.MassFlow*r.Water.SpecificHeat*20, loss); e > 1e-12 {
				t.Errorf("%s: energy balance off by %g", name, e)
			}
			if e := rel(r.FlowLPerMin, r.MassFlow/r.Water.Density*60e3); e > 1e-12 {
				t.Errorf("%s: L/min conversion", name)
			}
			q := r.CircuitFlowLPerMin / 60e3
			if e := rel(r.Velocity, q/(math.Pi*36e-6/4)); e > 1e-12 {
				t.Errorf("%s: velocity", name)
			}
			dyn := r.Water.Density * r.Velocity * r.Velocity / 2
			if e := rel(r.FrictionPressureDrop, r.FrictionFactor*(4/float64(n))/6e-3*dyn); e > 1e-12 {
				t.Errorf("%s: friction Δp", name)
			}
			if e := rel(r.MinorPressureDrop, 3*dyn); e > 1e-12 {
				t.Errorf("%s: minor Δp", name)
			}
			if e := rel(r.WallTemperature-r.OutletTemperature, r.MeanHeatFlux/r.HeatTransferCoeff); e > 1e-12 {
				t.Errorf("%s: wall superheat", name)
			}
		}
	}
}

// Flux peaking scales the wall superheat linearly and nothing else.
func TestFluxPeaking(t *testing.T) {
	c := Circuit{Loss: 8e3, BoreDiameter: 8e-3, PathLength: 3, InletTemperature: 295, TemperatureRise: 15}
	r1, _ := c.Solve()
	c.FluxPeaking = 2.5
	r2, _ := c.Solve()
	if e := rel(r2.WallTemperature-r2.OutletTemperature, 2.5*(r1.WallTemperature-r1.OutletTemperature)); e > 1e-12 {
		t.Errorf("peaking 2.5 gives superheat ratio off by %g", e)
	}
	if r1.PressureDrop != r2.PressureDrop || r1.FlowLPerMin != r2.FlowLPerMin {
		t.Error("peaking changed the hydraulics")
	}
}

func TestSolveWarnings(t *testing.T) {
	base := Circuit{Loss: 6e3, BoreDiameter: 8e-3, PathLength: 4, InletTemperature: 293.15, TemperatureRise: 20,
		SupplyPressure: 4e5, Roughness: 1.5e-6}
	cases := []struct {
		name   string
		modify func(*Circuit)
		want   []WarningKind
	}{
		{"nominal", func(c *Circuit) {}, nil},
		{"laminar", func(c *Circuit) { c.Loss = 150 }, []WarningKind{WarnLaminar}},
		{"transitional", func(c *Circuit) { c.Loss = 1400 }, []WarningKind{WarnTransitional}},
		{"transitional below Gnielinski's range", func(c *Circuit) { c.Loss = 1200 }, []WarningKind{WarnTransitional, WarnCorrelation}},
		{"fast and short of pressure", func(c *Circuit) { c.Loss = 40e3 }, []WarningKind{WarnVelocity, WarnPressure}},
		{"wall boiling", func(c *Circuit) { c.Loss = 15e3; c.FluxPeaking = 4; c.TemperatureRise = 45 }, []WarningKind{WarnWallBoiling}},
		{"bulk boiling", func(c *Circuit) { c.InletTemperature = 353.15; c.TemperatureRise = 25 }, []WarningKind{WarnBulkBoiling, WarnWallBoiling}},
		{"pressurised outlet suppresses boiling", func(c *Circuit) {
			c.InletTemperature = 353.15
			c.TemperatureRise = 25
			c.OutletPressure = 5e5
		}, nil},
	}
	all := []WarningKind{WarnLaminar, WarnTransitional, WarnCorrelation, WarnWallBoiling, WarnBulkBoiling, WarnPressure, WarnVelocity}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			c := base
			tc.modify(&c)
			r, err := c.Solve()
			if err != nil {
				t.Fatal(err)
			}
			for _, k := range all {
				want := false
				for _, w := range tc.want {
					want = want || w == k
				}
				if r.Has(k) != want {
					t.Errorf("warning %d: got %v, want %v (Re %.0f, v %.2f m/s, Δp %.3g Pa, wall %.1f K, Tsat %.1f K; %v)",
						k, r.Has(k), want, r.Reynolds, r.Velocity, r.PressureDrop, r.WallTemperature, r.SaturationTemperature, r.Warnings)
				}
			}
		})
	}
}

// The pressure warning is strict: a supply exactly equal to the need passes.
func TestPressureBoundary(t *testing.T) {
	c := Circuit{Loss: 6e3, BoreDiameter: 8e-3, PathLength: 4, InletTemperature: 293.15, TemperatureRise: 20}
	r, _ := c.Solve()
	c.SupplyPressure = r.PressureDrop
	if r2, _ := c.Solve(); r2.Has(WarnPressure) {
		t.Error("supply equal to the need warned")
	}
	c.SupplyPressure = r.PressureDrop * (1 - 1e-9)
	if r3, _ := c.Solve(); !r3.Has(WarnPressure) {
		t.Error("supply just below the need did not warn")
	}
}

func TestSolveErrors(t *testing.T) {
	good := Circuit{Loss: 6e3, BoreDiameter: 8e-3, PathLength: 4, InletTemperature: 293.15, TemperatureRise: 20}
	mods := map[string]func(*Circuit){
		"zero loss":        func(c *Circuit) { c.Loss = 0 },
		"zero bore":        func(c *Circuit) { c.BoreDiameter = 0 },
		"zero length":      func(c *Circuit) { c.PathLength = 0 },
		"zero rise":        func(c *Circuit) { c.TemperatureRise = 0 },
		"negative n":       func(c *Circuit) { c.Circuits = -1 },
		"frozen inlet":     func(c *Circuit) { c.InletTemperature = 260 },
		"peaking below 1":  func(c *Circuit) { c.FluxPeaking = 0.5 },
		"huge roughness":   func(c *Circuit) { c.Roughness = 5e-3 },
		"negative K":       func(c *Circuit) { c.MinorLossK = -1 },
		"NaN supply":       func(c *Circuit) { c.SupplyPressure = math.NaN() },
		"vacuum outlet":    func(c *Circuit) { c.OutletPressure = 10 },
		"superheated mean": func(c *Circuit) { c.InletTemperature = 600; c.TemperatureRise = 100 },
	}
	for name, m := range mods {
		c := good
		m(&c)
		if _, err := c.Solve(); err == nil {
			t.Errorf("%s: no error", name)
		}
	}
	if _, err := good.Solve(); err != nil {
		t.Errorf("good circuit: %v", err)
	}
}

func ExampleCircuit_Solve() {
	// A 10 mm copper tube with an 8 mm bore, 6 m of helix, carrying 9 kW of coil loss, fed at 20 °C from a
	// 3 bar (gauge) supply, allowed to warm by 20 K, in two parallel circuits.
	c := Circuit{Loss: 9e3, BoreDiameter: 8e-3, PathLength: 6, Circuits: 2, InletTemperature: 20 + ZeroCelsius,
		TemperatureRise: 20, SupplyPressure: 3e5, Roughness: 1.5e-6, MinorLossK: 4}
	r, err := c.Solve()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.2f L/min, %.2f m/s, Re %.0f, Δp %.2f bar, h %.0f W/(m²·K), wall %.1f °C, %d warnings\n",
		r.FlowLPerMin, r.Velocity, r.Reynolds, r.PressureDrop/1e5, r.HeatTransferCoeff,
		r.WallTemperature-ZeroCelsius, len(r.Warnings))
	// Output: 6.49 L/min, 1.08 m/s, Re 10746, Δp 0.09 bar, h 5917 W/(m²·K), wall 50.1 °C, 0 warnings
}

func BenchmarkSolve(b *testing.B) {
	for _, n := range []int{1, 4} {
		b.Run(fmt.Sprintf("circuits=%d", n), func(b *testing.B) {
			c := Circuit{Loss: 9e3, BoreDiameter: 8e-3, PathLength: 6, Circuits: n, InletTemperature: 293.15,
				TemperatureRise: 20, Roughness: 1.5e-6}
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				if _, err := c.Solve(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
