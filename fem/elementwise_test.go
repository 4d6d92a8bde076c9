package fem

import (
	"math"
	"math/cmplx"
	"testing"
)

// layeredCoil is twoTurnCoil with the part split at r = 12 mm into an inner (tag 3) and an outer (tag 5) layer,
// each its own region: the inner σ = 1e6 S/m, μr = 20; the outer σ = 3e6 S/m, μr = 1 (a part whose surface has
// passed the Curie point).
func layeredCoil() *Problem {
	boxes := []box{{0.030, 0.034, -0.006, 0.000}, {0.030, 0.034, 0.002, 0.008}, {0.005, 0.012, -0.010, 0.010},
		{0.040, 0.046, -0.004, 0.004}, {0.012, 0.020, -0.010, 0.010}}
	p, _ := boxesMesh(boxes, 0.3, 0, 1e-3, 1.35, true, false)
	p.Frequency = 5000
	p.Coils = []Coil{{Name: "work coil", Value: 100}, {Name: "pickup", Value: 3}}
	p.Regions = []Region{
		{Tag: 1, Name: "turn 1", Kind: SolidTurn, Sigma: 5.8e7, Coil: 0, Sense: 1, Strands: 1},
		{Tag: 2, Name: "turn 2", Kind: SolidTurn, Sigma: 5.8e7, Coil: 0, Sense: -1, Strands: 1},
		{Tag: 3, Name: "core", Kind: Part, Sigma: 1e6, MuR: 20, Coil: -1},
		{Tag: 4, Name: "pickup", Kind: Stranded, Coil: 1, Sense: 1, Strands: 12, Rdc: 0.05},
		{Tag: 5, Name: "skin", Kind: Part, Sigma: 3e6, MuR: 1, Coil: -1},
	}
	return p
}

func relDiff(a, b complex128) float64 { return cmplx.Abs(a-b) / cmplx.Abs(b) }

func maxRelDiffA(a, b []complex128) float64 {
	var d, n float64
	for i := range a {
		d = math.Max(d, cmplx.Abs(a[i]-b[i]))
		n = math.Max(n, cmplx.Abs(b[i]))
	}
	return d / n
}

// Element values equal to the region values must give the region solution (up to rounding), and nil, nil must
// return to it after other element values.
func TestElementMaterialsEqualToRegions(t *testing.T) {
	p := twoTurnCoil(CurrentDrive, 80)
	want, err := Solve(p)
	if err != nil {
		t.Fatal(err)
	}
	s, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	nt := len(p.Mesh.Tris)
	sigma, mur := make([]float64, nt), make([]float64, nt)
	byTag := map[int32]Region{}
	for _, r := range p.Regions {
		byTag[r.Tag] = r
	}
	for i, tag := range p.Mesh.Tags {
		sigma[i], mur[i] = math.NaN(), math.NaN()
		if r, ok := byTag[tag]; ok && (r.Kind == Part || r.Kind == SolidTurn) {
			sigma[i], mur[i] = r.Sigma, r.MuR
			if mur[i] == 0 {
				mur[i] = 1
			}
		}
	}
	if err := s.SetElementMaterials(sigma, mur); err != nil {
		t.Fatal(err)
	}
	got, err := s.SolveAt(p.Frequency)
	if err != nil {
		t.Fatal(err)
	}
	if d := relDiff(got.CoilZ[0], want.CoilZ[0]); d > 1e-12 {
		t.Errorf("Z with element values equal to regions: %v, region solve %v (rel diff %.2g)", got.CoilZ[0], want.CoilZ[0], d)
	}
	if d := maxRelDiffA(got.A, want.A); d > 1e-12 {
		t.Errorf("A differs by %.2g relative", d)
	}
	// Other values, then back to the regions.
	for i := range sigma {
		if !math.IsNaN(sigma[i]) {
			sigma[i] *= 2
		}
	}
	if err := s.SetElementMaterials(sigma, nil); err != nil {
		t.Fatal(err)
	}
	other, err := s.SolveAt(p.Frequency)
	if err != nil {
		t.Fatal(err)
	}
	if d := relDiff(other.CoilZ[0], want.CoilZ[0]); d < 1e-3 {
		t.Errorf("doubling every conductivity moved Z by only %.2g: element values not used", d)
	}
	if err := s.SetElementMaterials(nil, nil); err != nil {
		t.Fatal(err)
	}
	back, err := s.SolveAt(p.Frequency)
	if err != nil {
		t.Fatal(err)
	}
	if d := relDiff(back.CoilZ[0], want.CoilZ[0]); d > 1e-12 {
		t.Errorf("after SetElementMaterials(nil, nil): Z %v, want %v", back.CoilZ[0], want.CoilZ[0])
	}
}

// A part of one region whose outer layer's triangles get other element values (σ and μr) must equal the same
// part modelled as two regions: impedance, potential, Joule power (through QuadPoint.Sigma) and magnetic energy
// (through QuadPoint.MuR); and its complex power must balance.
func TestElementMaterialsTwoLayersEqualTwoRegions(t *testing.T) {
	two := layeredCoil()
	want, err := Solve(two)
	if err != nil {
		t.Fatal(err)
	}
	one := layeredCoil()
	m := *one.Mesh
	m.Tags = append([]int32(nil), m.Tags...)
	nt := len(m.Tris)
	sigma, mur := make([]float64, nt), make([]float64, nt)
	for i := range m.Tags {
		sigma[i], mur[i] = math.NaN(), math.NaN()
		if m.Tags[i] == 5 {
			m.Tags[i] = 3
			sigma[i], mur[i] = 3e6, 1
		}
	}
	one.Mesh = &m
	one.Regions = one.Regions[:4] // "core" (tag 3) now covers both layers
	s, err := NewSolver(one)
	if err != nil {
		t.Fatal(err)
	}
	uniform, err := s.SolveAt(one.Frequency)
	if err != nil {
		t.Fatal(err)
	}
	if err := s.SetElementMaterials(sigma, mur); err != nil {
		t.Fatal(err)
	}
	got, err := s.SolveAt(one.Frequency)
	if err != nil {
		t.Fatal(err)
	}
	if d := relDiff(uniform.CoilZ[0], want.CoilZ[0]); d < 1e-3 {
		t.Fatalf("uniform and layered parts differ by only %.2g: the case does not test anything", d)
	}
	if d := relDiff(got.CoilZ[0], want.CoilZ[0]); d > 1e-10 {
		t.Errorf("Z: element layers %v, two regions %v (rel diff %.2g)", got.CoilZ[0], want.CoilZ[0], d)
	}
	if d := maxRelDiffA(got.A, want.A); d > 1e-10 {
		t.Errorf("A differs by %.2g relative", d)
	}
	pGot, pWant := got.RegionPower(3), want.RegionPower(3)+want.RegionPower(5)
	if d := math.Abs(pGot-pWant) / pWant; d > 1e-10 {
		t.Errorf("part power: element layers %.8g W, two regions %.8g W", pGot, pWant)
	}
	if eGot, eWant := got.MagneticEnergy(), want.MagneticEnergy(); math.Abs(eGot-eWant)/eWant > 1e-10 {
		t.Errorf("magnetic energy: element layers %.8g J, two regions %.8g J", eGot, eWant)
	}
	if e := got.BalanceError(); !(e < 1e-8) {
		t.Errorf("balance error with element values %.3g", e)
	}
}

func TestElementMaterialsErrors(t *testing.T) {
	p := twoTurnCoil(CurrentDrive, 80)
	s, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	nt := len(p.Mesh.Tris)
	part := -1
	for i, tag := range p.Mesh.Tags {
		if tag == 3 {
			part = i
			break
		}
	}
	bad := func(v float64) []float64 {
		x := make([]float64, nt)
		for i := range x {
			x[i] = math.NaN()
		}
		x[part] = v
		return x
	}
	for name, c := range map[string][2][]float64{
		"short sigma":    {make([]float64, nt-1), nil},
		"short mur":      {nil, make([]float64, 3)},
		"negative sigma": {bad(-1), nil},
		"infinite sigma": {bad(math.Inf(1)), nil},
		"zero mur":       {nil, bad(0)},
	} {
		if err := s.SetElementMaterials(c[0], c[1]); err == nil {
			t.Errorf("%s: accepted", name)
		}
	}
}
