package thermal

import (
	"math"
	"math/rand/v2"
	"testing"

	"eddyrz/mesh"
)

// Aluminium-like properties, handbook level [memory] (shared/reference/README.md §4): ρ = 2700 kg/m³,
// c = 897 J/(kg·K), melting point 933.47 K, latent heat 397 kJ/kg. The tests below do not depend on their accuracy.
var alu = Constant{K: 237, Rho: 2700, Cp: 897, Melt: Melting{Point: 933.47, Latent: 397e3, Mushy: 2}}

// Test 3b, closed form: an insulated body with a uniform source q stays uniform, and energy conservation
// ρc dT/dt + ρL df/dt = q gives T(t) exactly: a sensible ramp, a plateau across the melting interval that lasts
// (ρc·w + ρL)/q, and a ramp again.
func TestMeltingPlateau(t *testing.T) {
	const q, T0 = 5e8, 900.0 // W/m³, K
	m := rectMesh(0, 0.01, 0, 0.01, 5, 5, 1)
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: alu}}, T0)
	rc := alu.Rho * alu.Cp
	Tsol, Tliq := alu.Melt.Point-alu.Melt.Mushy/2, alu.Melt.Point+alu.Melt.Mushy/2
	t1 := rc * (Tsol - T0) / q                            // melting starts
	t2 := t1 + (rc*(Tliq-Tsol)+alu.Rho*alu.Melt.Latent)/q // melting ends
	exact := func(tt float64) (T, f float64) {
		switch {
		case tt <= t1:
			return T0 + q*tt/rc, 0
		case tt >= t2:
			return Tliq + q*(tt-t2)/rc, 1
		}
		f = (tt - t1) / (t2 - t1)
		return Tsol + f*(Tliq-Tsol), f
	}
	src := uniformSource(m, q)
	dt := 0.1
	for tt := dt; tt < 1.3*t2; tt += dt {
		mustStep(t, s, dt, src)
		want, wantF := exact(s.Time())
		hot, cold := s.Hottest().T, s.Coldest().T
		if math.Abs(hot-want) > 1e-6 || math.Abs(cold-want) > 1e-6 {
			t.Fatalf("t = %.2f s: T in [%.6f, %.6f] K, want %.6f K", s.Time(), cold, hot, want)
		}
		if f := s.LiquidVolume() / s.Volume(); math.Abs(f-wantF) > 1e-6 {
			t.Fatalf("t = %.2f s: liquid fraction %.6f, want %.6f", s.Time(), f, wantF)
		}
	}
	e := s.Energy()
	if relErr(e.Stored, q*s.Volume()*s.Time()) > 1e-9 || s.EnergyBalanceError() > 1e-9 {
		t.Errorf("stored %g J, input %g J, balance error %g", e.Stored, q*s.Volume()*s.Time(), s.EnergyBalanceError())
	}
}

// Test 3b, every run balances: a melting core inside a non-melting shell (nodes shared by two materials),
// a non-uniform source near the surface, convection and radiation, large steps straight through the melting
// interval. The balance must close within 0.5 % (it closes to the Newton tolerance), and the core must have melted.
func TestEnergyBalanceWithMelting(t *testing.T) {
	const a, hgt, rCore = 0.012, 0.02, 0.008
	m := rectMesh(0, a, 0, hgt, 12, 20, 2)
	for i, tri := range m.Tris {
		c := (m.Nodes[tri[0]].X + m.Nodes[tri[1]].X + m.Nodes[tri[2]].X) / 3
		if c < rCore {
			m.Tags[i] = 1
		}
	}
	shell := Funcs{ // invented steel-like shell with temperature-dependent properties
		K:   func(T float64) float64 { return 45 - 0.01*(T-300) },
		Rho: func(float64) float64 { return 7800 },
		Cp:  func(T float64) float64 { return 450 + 0.2*(T-300) },
	}
	bnd := edgesWhere(m, allEdges, func(i, j int32) BoundaryEdge {
		return BoundaryEdge{A: i, B: j, HeatTransfer: 20, Ambient: 300, Emissivity: 0.5, Surroundings: 320}
	})
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: alu, 2: shell}, Boundary: bnd}, 300)
	src := make([]float64, len(m.Tris))
	for i, tri := range m.Tris {
		if m.Nodes[tri[0]].X >= 0.01 {
			src[i] = 6e8
		}
	}
	for k := 0; k < 60; k++ {
		info := mustStep(t, s, 1, src)
		if k%5 == 0 {
			t.Logf("t = %3.0f s: %d Newton, %d CG, T %.1f..%.1f K, liquid %.3f", info.Time, info.Iterations, info.CGIter,
				s.Coldest().T, s.Hottest().T, s.LiquidVolume()/(math.Pi*rCore*rCore*hgt))
		}
		if e := s.EnergyBalanceError(); e > 0.005 {
			t.Fatalf("step %d: energy balance error %g", k, e)
		}
	}
	e := s.Energy()
	t.Logf("energy: %+v, balance error %.2g", e, s.EnergyBalanceError())
	if e.Convection <= 0 || e.Radiation <= 0 || e.Source <= 0 {
		t.Errorf("energy flows %+v: expected positive source and losses", e)
	}
	if lf := s.LiquidVolume(); lf < 0.5*math.Pi*rCore*rCore*hgt {
		t.Errorf("liquid volume %g m³: the core should be mostly molten", lf)
	}
	if s.EnergyBalanceError() > 1e-7 {
		t.Errorf("energy balance error %g", s.EnergyBalanceError())
	}
}

// Latent heat is conserved exactly by the enthalpy table: H(T_l) − H(T_s) = ρ c w + ρ L, and T(H(T)) = T.
func TestEnthalpyTable(t *testing.T) {
	for _, mat := range []Material{alu, Constant{K: 1, Rho: 1000, Cp: 4000},
		Funcs{K: func(float64) float64 { return 1 }, Rho: func(T float64) float64 { return 7000 + 0.1*T },
			Cp: func(T float64) float64 { return 400 + 0.25*T }, Melt: Melting{Point: 1800, Latent: 2.6e5}}} {
		tab, err := newEnthalpy(mat)
		if err != nil {
			t.Fatal(err)
		}
		for _, T := range []float64{20, 150, 300, 933.47, 932.7, 934.2, 1799.9, 1800, 2500, 4500, 7000} {
			h, _ := tab.at(T)
			if back := tab.temperature(h); math.Abs(back-T) > 1e-9*T {
				t.Errorf("%T: T(H(%g)) = %.12g", mat, T, back)
			}
		}
		if pc, ok := mat.(PhaseChanger); ok {
			mt := pc.Melting()
			w := mt.Mushy
			if w == 0 {
				w = DefaultMushy
			}
			lo, hi := mt.Point-w/2, mt.Point+w/2
			hLo, _ := tab.at(lo)
			hHi, _ := tab.at(hi)
			sensible := 0.0 // ∫ρc dT across the interval, fine trapezoid
			for i := 0; i < 1000; i++ {
				T := lo + (float64(i)+0.5)*w/1000
				sensible += mat.Density(T) * mat.SpecificHeat(T) * w / 1000
			}
			latent := mat.Density(mt.Point) * mt.Latent
			if relErr(hHi-hLo, sensible+latent) > 1e-6 {
				t.Errorf("%T: ΔH across melting %g J/m³, want %g", mat, hHi-hLo, sensible+latent)
			}
		}
	}
	if _, err := newEnthalpy(Constant{K: 1, Rho: 1000, Cp: 0}); err == nil {
		t.Error("zero heat capacity accepted")
	}
}

// Without sources or flux, a body exchanging heat with one ambient temperature stays between its initial extremes
// and the ambient (discrete maximum principle of the lumped scheme on a non-obtuse mesh).
func TestMaximumPrinciple(t *testing.T) {
	m := rectMesh(0, 0.02, 0, 0.02, 10, 10, 1)
	T0 := make([]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		T0[i] = 400
		if p.X < 0.01 && p.Y < 0.01 {
			T0[i] = 1000
		}
	}
	bnd := edgesWhere(m, allEdges, func(i, j int32) BoundaryEdge {
		return BoundaryEdge{A: i, B: j, HeatTransfer: 1e4, Ambient: 350, Emissivity: 0.9}
	})
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: Constant{K: 20, Rho: 7800, Cp: 500}}, Boundary: bnd}, T0...)
	for _, dt := range []float64{1e-4, 1e-2, 1, 100} {
		for k := 0; k < 5; k++ {
			mustStep(t, s, dt, nil)
			if hot, cold := s.Hottest().T, s.Coldest().T; hot > 1000+1e-9 || cold < 350-1e-9 {
				t.Fatalf("dt = %g: T in [%g, %g] K, outside [350, 1000]", dt, cold, hot)
			}
		}
	}
}

func TestProbeReproducesLinearField(t *testing.T) {
	m := rectMesh(0.001, 0.02, -0.01, 0.01, 7, 9, 1)
	lin := func(r, z float64) float64 { return 500 + 3000*r - 2000*z }
	T0 := make([]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		T0[i] = lin(p.X, p.Y)
	}
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: Constant{K: 1, Rho: 1, Cp: 1}}}, T0...)
	for _, p := range []mesh.Point{{X: 0.001, Y: -0.01}, {X: 0.0123, Y: 0.0031}, {X: 0.02, Y: 0.01}, {X: 0.0077, Y: -0.0099}} {
		got, ok := s.Probe(p.X, p.Y)
		if !ok || math.Abs(got-lin(p.X, p.Y)) > 1e-9 {
			t.Errorf("probe %v = %g (%v), want %g", p, got, ok, lin(p.X, p.Y))
		}
	}
	if _, ok := s.Probe(0.0005, 0); ok {
		t.Error("probe outside the part found a triangle")
	}
}

func TestOuterEdgesAndAreas(t *testing.T) {
	const a, hgt = 0.015, 0.03
	m := rectMesh(0, a, 0, hgt, 5, 7, 1)
	edges := OuterEdges(m, func(int32) bool { return true }, 1e-12)
	if len(edges) != 5+5+7 {
		t.Fatalf("%d outer edges, want %d (top, bottom, side; axis excluded)", len(edges), 17)
	}
	// A uniform flux over all of them enters through the surface area 2πa·h + 2πa² (ring areas are exact).
	var bnd []BoundaryEdge
	for _, e := range edges {
		bnd = append(bnd, BoundaryEdge{A: e[0], B: e[1], Flux: 1})
	}
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: Constant{K: 1, Rho: 1, Cp: 1}}, Boundary: bnd}, 300)
	mustStep(t, s, 1, nil)
	if want := 2*math.Pi*a*hgt + 2*math.Pi*a*a; relErr(s.Energy().FluxIn, want) > 1e-12 {
		t.Errorf("flux in %g J, want %g", s.Energy().FluxIn, want)
	}
}

func TestBadInput(t *testing.T) {
	m := rectMesh(0, 0.01, 0, 0.01, 2, 2, 1)
	mats := map[int32]Material{1: Constant{K: 1, Rho: 1, Cp: 1}}
	cases := []struct {
		name string
		m    Model
		T0   []float64
	}{
		{"no mesh", Model{Materials: mats}, []float64{300}},
		{"no materials", Model{Mesh: m}, []float64{300}},
		{"no part triangles", Model{Mesh: m, Materials: map[int32]Material{7: Constant{K: 1, Rho: 1, Cp: 1}}}, []float64{300}},
		{"wrong T0 length", Model{Mesh: m, Materials: mats}, []float64{300, 300}},
		{"negative kelvin", Model{Mesh: m, Materials: mats}, []float64{-3}},
		{"edge off the part", Model{Mesh: m, Materials: mats, Boundary: []BoundaryEdge{{A: 0, B: 99}}}, []float64{300}},
		{"emissivity > 1", Model{Mesh: m, Materials: mats, Boundary: []BoundaryEdge{{A: 2, B: 5, Emissivity: 2, Ambient: 300}}}, []float64{300}},
		{"no ambient", Model{Mesh: m, Materials: mats, Boundary: []BoundaryEdge{{A: 2, B: 5, HeatTransfer: 10}}}, []float64{300}},
	}
	for _, c := range cases {
		if _, err := NewSolver(c.m, c.T0); err == nil {
			t.Errorf("%s: accepted", c.name)
		}
	}
	s := mustSolver(t, Model{Mesh: m, Materials: mats}, 300)
	if _, err := s.Step(0, nil); err == nil {
		t.Error("dt = 0 accepted")
	}
	if _, err := s.Step(1, []float64{1}); err == nil {
		t.Error("short source accepted")
	}
	neg := Funcs{K: func(T float64) float64 { return 1 - T/200 }, Rho: func(float64) float64 { return 1 },
		Cp: func(float64) float64 { return 1 }}
	s = mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: neg}}, 300)
	if _, err := s.Step(1, nil); err == nil {
		t.Error("negative conductivity accepted")
	}
}

// A quadratic mesh is solved on its corners; midpoint nodes report the mean of their edge's ends, and nodes of
// triangles outside the parts report NaN.
func TestQuadraticMeshAndForeignRegions(t *testing.T) {
	m := rectMesh(0, 0.02, 0, 0.01, 4, 2, 1)
	for i, tri := range m.Tris { // the outer half is "air"
		if m.Nodes[tri[0]].X >= 0.01 && m.Nodes[tri[1]].X >= 0.01 && m.Nodes[tri[2]].X >= 0.01 {
			m.Tags[i] = 9
		}
	}
	// Add midpoint nodes, shared between neighbouring triangles.
	mids := map[[2]int32]int32{}
	for _, tri := range m.Tris {
		var mid [3]int32
		for k := 0; k < 3; k++ {
			a, b := tri[k], tri[(k+1)%3]
			key := [2]int32{min(a, b), max(a, b)}
			v, ok := mids[key]
			if !ok {
				v = int32(len(m.Nodes))
				m.Nodes = append(m.Nodes, mesh.Point{X: (m.Nodes[a].X + m.Nodes[b].X) / 2, Y: (m.Nodes[a].Y + m.Nodes[b].Y) / 2})
				mids[key] = v
			}
			mid[k] = v
		}
		m.Mid = append(m.Mid, mid)
	}
	T0 := make([]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		T0[i] = 300 + 1e4*p.X
	}
	s := mustSolver(t, Model{Mesh: m, Materials: map[int32]Material{1: Constant{K: 10, Rho: 1000, Cp: 1000}}}, T0...)
	mustStep(t, s, 0.1, uniformSource(m, 1e6))
	T := s.Temperature()
	if len(T) != len(m.Nodes) {
		t.Fatalf("%d temperatures for %d nodes", len(T), len(m.Nodes))
	}
	for key, v := range mids {
		a, b := m.Nodes[key[0]], m.Nodes[key[1]]
		inPart := math.Max(a.X, b.X) <= 0.01
		switch {
		case inPart && math.Abs(T[v]-(T[key[0]]+T[key[1]])/2) > 1e-12:
			t.Errorf("midpoint %d: %g K, ends %g and %g K", v, T[v], T[key[0]], T[key[1]])
		case !inPart && math.Min(a.X, b.X) > 0.01 && !math.IsNaN(T[v]):
			t.Errorf("midpoint %d outside the part: %g K, want NaN", v, T[v])
		}
	}
	if want := math.Pi * 0.01 * 0.01 * 0.01; relErr(s.Volume(), want) > 1e-12 {
		t.Errorf("part volume %g m³, want %g (air triangles must not count)", s.Volume(), want)
	}
	if relErr(s.Energy().Source, 1e6*s.Volume()*0.1) > 1e-12 {
		t.Errorf("source energy %g J, want %g", s.Energy().Source, 1e6*s.Volume()*0.1)
	}
}

// Property: whatever the sources, coefficients and step sizes, every step balances to the Newton tolerance and a
// failed step leaves the state untouched.
func TestEnergyBalanceProperty(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	steps, split, newton := 0, 0, 0
	defer func() {
		t.Logf("%d steps, %d split, %.1f Newton iterations per step", steps, split, float64(newton)/float64(steps))
	}()
	for trial := 0; trial < 40; trial++ {
		nr, nz := 3+rng.IntN(8), 3+rng.IntN(8)
		m := rectMesh(0, 0.005+0.02*rng.Float64(), 0, 0.005+0.02*rng.Float64(), nr, nz, 1)
		for i := range m.Tags {
			if rng.Float64() < 0.3 {
				m.Tags[i] = 2
			}
		}
		bnd := edgesWhere(m, func(a, b mesh.Point) bool { return rng.Float64() < 0.8 }, func(i, j int32) BoundaryEdge {
			return BoundaryEdge{A: i, B: j, HeatTransfer: 100 * rng.Float64(), Ambient: 280 + 40*rng.Float64(),
				Emissivity: rng.Float64(), Flux: 1e4 * (rng.Float64() - 0.5)}
		})
		mats := map[int32]Material{1: alu, 2: Constant{K: 5 + 50*rng.Float64(), Rho: 8000, Cp: 500,
			Melt: Melting{Point: 1000 + 500*rng.Float64(), Latent: 2e5, Mushy: 5 * rng.Float64()}}}
		s := mustSolver(t, Model{Mesh: m, Materials: mats, Boundary: bnd}, 300+600*rng.Float64())
		src := make([]float64, len(m.Tris))
		for step := 0; step < 15; step++ {
			for i := range src {
				src[i] = 2e9 * rng.Float64() * rng.Float64()
			}
			dt := math.Pow(10, -2+3*rng.Float64())
			info, err := s.Step(dt, src)
			if err != nil {
				t.Fatalf("trial %d step %d (dt %g s): %v", trial, step, dt, err)
			}
			steps++
			newton += info.Iterations
			if info.Substeps > 1 {
				split++
			}
			if e := s.EnergyBalanceError(); e > 1e-8 {
				t.Fatalf("trial %d step %d: balance error %g", trial, step, e)
			}
		}
		before := append([]float64(nil), s.Temperature()...)
		bad := make([]float64, len(m.Tris))
		bad[len(bad)/2] = math.NaN()
		if _, err := s.Step(1, bad); err == nil {
			t.Fatal("bad source accepted")
		}
		for i, v := range s.Temperature() {
			if v != before[i] && !(math.IsNaN(v) && math.IsNaN(before[i])) {
				t.Fatalf("failed step changed node %d: %g → %g K", i, before[i], v)
			}
		}
	}
}
