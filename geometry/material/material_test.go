package material

import (
	"math"
	"testing"
)

func TestEveryBuiltinHasAllFields(t *testing.T) {
	if len(Names()) < 9 {
		t.Fatalf("library has %d materials, want at least 9", len(Names()))
	}
	for _, name := range Names() {
		m, _ := Builtin(name)
		if err := m.Check(); err != nil {
			t.Errorf("%s: %v", name, err)
		}
		if m.Description == "" {
			t.Errorf("%s: no description", name)
		}
		if !m.HasThermal() {
			t.Errorf("%s: incomplete thermal data", name)
		}
		if m.MuRel < 1 {
			t.Errorf("%s: MuRel %g < 1", name, m.MuRel)
		}
		if !(m.Melting > 300) {
			t.Errorf("%s: melting point %g K", name, m.Melting)
		}
		if !math.IsInf(m.Melting, 1) && (m.Latent <= 0 || m.ResistivityLiquid <= 0) {
			t.Errorf("%s: melts but has no latent heat or liquid resistivity", name)
		}
		for _, T := range []float64{250, 293.15, 600, 1000, 1500, 2500} {
			for what, v := range map[string]float64{
				"resistivity": m.Resistivity(T), "density": m.Density(T), "specific heat": m.SpecificHeat(T),
				"thermal conductivity": m.ThermalConductivity(T), "emissivity": m.Emissivity(T), "mu_r": m.MuR(T),
			} {
				if !(v > 0) || math.IsInf(v, 0) {
					t.Errorf("%s: %s(%g K) = %g", name, what, T, v)
				}
			}
		}
	}
}

func TestBuiltinIsACopy(t *testing.T) {
	a, _ := Builtin("copper")
	a.MuRel = 7
	b, _ := Builtin("copper")
	if b.MuRel != 1 {
		t.Fatal("Builtin returned shared state")
	}
}

func TestTableInterpolation(t *testing.T) {
	tb := Table{T: []float64{300, 400, 600}, V: []float64{1, 3, 4}}
	cases := []struct{ t, want float64 }{
		{100, 1}, {300, 1}, {350, 2}, {400, 3}, {500, 3.5}, {600, 4}, {900, 4},
	}
	for _, c := range cases {
		if got := tb.At(c.t); math.Abs(got-c.want) > 1e-15 {
			t.Errorf("At(%g) = %g, want %g", c.t, got, c.want)
		}
	}
	if err := (Table{T: []float64{1, 1}, V: []float64{1, 2}}).Check(true); err == nil {
		t.Error("non-increasing table accepted")
	}
}

func TestReferenceValues(t *testing.T) {
	cu, _ := Builtin("copper")
	al, _ := Builtin("aluminium")
	alloy, _ := Builtin("aluminium-alloy")
	st, _ := Builtin("steel")
	cases := []struct {
		name      string
		got, want float64
		rel       float64
	}{
		// Matula 1979 via /work/shared/reference/README.md §4: 2.063e-8 at 350 K, 2.402e-8 at 400 K.
		{"copper 350 K", cu.Resistivity(350), 2.063e-8, 1e-12},
		{"copper 375 K (midpoint)", cu.Resistivity(375), (2.063e-8 + 2.402e-8) / 2, 1e-12},
		// Desai 1984 via reference §4 [memory]: 2.650e-8 at 293 K.
		{"aluminium 293 K", al.Resistivity(293), 2.650e-8, 1e-12},
		// Alloy: 3.5e7 S/m at 20 °C [common practice].
		{"alloy conductivity 293 K", alloy.Conductivity(293), 3.5e7, 1e-12},
		// ASM ~1045 via reference §4 [memory]: 0.16 μΩ·m at 20 °C, 1.11 at 800 °C.
		{"steel 20 C", st.Resistivity(CToK(20)), 0.16e-6, 1e-12},
		{"steel 800 C", st.Resistivity(CToK(800)), 1.11e-6, 1e-12},
	}
	for _, c := range cases {
		if math.Abs(c.got-c.want) > c.rel*c.want {
			t.Errorf("%s: got %g want %g", c.name, c.got, c.want)
		}
	}
}

func TestPhasesAndCurie(t *testing.T) {
	st, _ := Builtin("steel")
	if st.MuR(CToK(700)) <= 1 || st.MuR(CToK(800)) != 1 {
		t.Errorf("steel mu_r: %g at 700 C, %g at 800 C", st.MuR(CToK(700)), st.MuR(CToK(800)))
	}
	al, _ := Builtin("aluminium")
	below, above := al.Melting-1e-9, al.Melting
	if al.Liquid(below) || !al.Liquid(above) {
		t.Error("phase change not at the melting point")
	}
	if al.Resistivity(above) <= 2*al.Resistivity(below) {
		t.Errorf("liquid aluminium resistivity should jump about 2.2x: %g -> %g", al.Resistivity(below), al.Resistivity(above))
	}
	if al.Density(above) >= al.Density(below) {
		t.Error("liquid aluminium should be less dense")
	}
	g, _ := Builtin("graphite")
	if g.Liquid(5000) {
		t.Error("graphite melted")
	}
}

func TestSkinDepth(t *testing.T) {
	// δ = sqrt(2ρ/(ωμ0)): reference README §2, copper ρ = 1.72e-8 at 1 kHz: δ = 2.08730 mm.
	m := &Material{Name: "x", ResistivitySolid: Const(1.72e-8), MuRel: 1, Melting: math.Inf(1)}
	if d := m.SkinDepth(1e3, 293); math.Abs(d-2.08730e-3) > 1e-8 {
		t.Errorf("skin depth %g, want 2.08730e-3", d)
	}
}
