package hardware

import (
	"math"
	"testing"

	"eddyrz/geometry"
	"eddyrz/post/cooling"
)

// helixJob is a job whose only coil is n round tube turns of outer diameter dOut and wall w at radius r, with
// the given cooling section.
func helixJob(n int, r, dOut, w float64, c geometry.Cooling) *geometry.Job {
	coil := geometry.Coil{Name: "helix"}
	for i := 0; i < n; i++ {
		coil.Turns = append(coil.Turns, geometry.Turn{Kind: geometry.TubeSection, R: r, Z: float64(i) * 2 * dOut,
			Diameter: dOut, Wall: w, Sense: 1, Strands: 1, Fill: 1})
	}
	return &geometry.Job{File: "helix.toml", Name: "helix", Coils: []geometry.Coil{coil}, Cooling: &c}
}

// The friction factor and pressure drop through StudyCooling against the worked example that post/cooling's
// TestColebrookWorkedExample also uses: White, Fluid Mechanics (section on the Moody chart; from memory), water
// (ρ = 1.94 slug/ft³, μ = 2.09e-5 slug/(ft·s), i.e. about 20 °C) at 6 ft/s through 200 ft of 6-in asphalted
// cast-iron pipe, ε = 0.0004 ft; published Re ≈ 2.78e5, f ≈ 0.0198, Δp ≈ 277 lbf/ft² (13.26 kPa). Here the
// "coil" is ten 6-in-bore turns of 200 ft total, and the loss is chosen to give 6 ft/s at a 2 K rise about 20 °C.
func TestCoolingWhiteExample(t *testing.T) {
	const ft = 0.3048
	d := 0.5 * ft
	length := 200 * ft
	r := length / (10 * 2 * math.Pi)
	job := helixJob(10, r, d+0.01, 0.005, geometry.Cooling{Inlet: 19 + zeroCelsius, Rise: 2, Pressure: 1e5,
		Roughness: 0.0004 * ft, Circuits: 1})
	wat, err := cooling.WaterAt(20+zeroCelsius, cooling.StandardAtmosphere)
	if err != nil {
		t.Fatal(err)
	}
	v := 6 * ft
	loss := wat.Density * v * math.Pi * d * d / 4 * wat.SpecificHeat * 2
	cs, err := StudyCooling(job, loss, "test")
	if err != nil {
		t.Fatal(err)
	}
	if rel(cs.Circuit.BoreDiameter, d) > 1e-12 || rel(cs.Circuit.PathLength, length) > 1e-12 {
		t.Fatalf("bore %g m, path %g m; want %g m, %g m", cs.Circuit.BoreDiameter, cs.Circuit.PathLength, d, length)
	}
	res := cs.Result
	if rel(res.Velocity, v) > 2e-3 {
		t.Errorf("velocity %g m/s, want %g", res.Velocity, v)
	}
	if rel(res.Reynolds, 2.78e5) > 0.01 {
		t.Errorf("Re %.4g, published 2.78e5", res.Reynolds)
	}
	if rel(res.FrictionFactor, 0.0198) > 0.01 {
		t.Errorf("f %.4f, published 0.0198", res.FrictionFactor)
	}
	const lbfPerFt2 = 4.4482216152605 / (ft * ft)
	if rel(res.PressureDrop, 277*lbfPerFt2) > 0.015 {
		t.Errorf("pressure drop %.0f Pa, published 277 lbf/ft² = %.0f Pa", res.PressureDrop, 277*lbfPerFt2)
	}
}

// Heat transfer through StudyCooling against the worked example post/cooling's TestSolveWorkedExample uses:
// Çengel & Ghajar, Heat and Mass Transfer, "Heating of water by resistance heaters" (from memory): water from
// 15 to 65 °C at 10 L/min in a 3 cm bore 5 m long under uniform flux; published Re ≈ 10 760 and an outlet wall
// of about 115 °C (water properties from the book's saturated-water table, Table A-9). The "coil" is five turns
// of 5 m in all.
func TestCoolingCengelExample(t *testing.T) {
	job := helixJob(5, 1/(2*math.Pi), 0.034, 0.002, geometry.Cooling{Inlet: 15 + zeroCelsius, Rise: 50, Pressure: 2e5, Circuits: 1})
	cs, err := StudyCooling(job, 34.56e3, "test")
	if err != nil {
		t.Fatal(err)
	}
	res := cs.Result
	if rel(res.FlowLPerMin, 10) > 5e-3 {
		t.Errorf("flow %.3f L/min, want 10", res.FlowLPerMin)
	}
	if rel(res.Reynolds, 10760) > 0.01 {
		t.Errorf("Re %.0f, published about 10760", res.Reynolds)
	}
	if tw := res.WallTemperature - zeroCelsius; math.Abs(tw-115) > 2 {
		t.Errorf("outlet wall %.1f °C, published about 115 °C", tw)
	}
	if !res.Has(cooling.WarnWallBoiling) {
		t.Error("a 115 °C wall at 1 atm must warn of boiling")
	}
}

// Bore and path of the coil shapes the job file knows.
func TestCoilWaterPath(t *testing.T) {
	tube := geometry.Turn{Kind: geometry.TubeSection, R: 0.05, Diameter: 0.01, Wall: 0.001}
	bar := geometry.Turn{Kind: geometry.BarSection, R: 0.04, Width: 0.012, Height: 0.008, Wall: 0.001}
	cases := []struct {
		name    string
		turns   []geometry.Turn
		bore    float64
		length  float64
		wantErr bool
	}{
		{"tube", []geometry.Turn{tube, tube}, 0.008, 2 * 2 * math.Pi * 0.05, false},
		// 10 × 6 mm bore: 2·10·6/16 = 7.5 mm.
		{"bar", []geometry.Turn{bar}, 0.0075, 2 * math.Pi * 0.04, false},
		{"mixed: smallest bore", []geometry.Turn{tube, bar}, 0.0075, 2 * math.Pi * 0.09, false},
		{"solid", []geometry.Turn{{Kind: geometry.TubeSection, R: 0.05, Diameter: 0.01}}, 0, 0, true},
		{"stranded", []geometry.Turn{{Kind: geometry.StrandedSection, R: 0.05, Width: 0.01, Height: 0.01}}, 0, 0, true},
		{"none", nil, 0, 0, true},
	}
	for _, c := range cases {
		b, l, _, err := CoilWaterPath(geometry.Coil{Name: c.name, Turns: c.turns})
		if (err != nil) != c.wantErr {
			t.Errorf("%s: error %v, want error %v", c.name, err, c.wantErr)
			continue
		}
		if !c.wantErr && (rel(b, c.bore) > 1e-12 || rel(l, c.length) > 1e-12) {
			t.Errorf("%s: bore %g m, path %g m; want %g m, %g m", c.name, b, l, c.bore, c.length)
		}
	}
}
