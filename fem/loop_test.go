package fem

import (
	"fmt"
	"math"
	"testing"

	"eddyrz/mesh"
)

// wireLoopProblem meshes (with mesh.Triangulate) a circular loop of round wire, loop radius R, wire radius a,
// in a Robin-bounded half disc of radius 10R. The wire polygon has n sides and the area of the true circle.
// hs is the wanted edge length at the wire surface.
func wireLoopProblem(t testing.TB, R, a float64, n int, hs float64) *Problem {
	return tubeLoopProblem(t, R, a, 0, n, hs)
}

// tubeLoopProblem is wireLoopProblem with an air bore of radius ai (0 for a solid wire).
func tubeLoopProblem(t testing.TB, R, a, ai float64, n int, hs float64) *Problem {
	var g mesh.PSLG
	R0 := 10 * R
	nArc := 48
	// Axis from the bottom of the arc to the top, then the arc back down.
	g.Points = append(g.Points, mesh.Point{X: 0, Y: -R0})
	g.Points = append(g.Points, mesh.Point{X: 0, Y: R0})
	g.Segments = append(g.Segments, mesh.Segment{A: 0, B: 1, Tag: AxisTag})
	prev := int32(1)
	for k := 1; k <= nArc; k++ {
		th := math.Pi * float64(k) / float64(nArc)
		var id int32
		if k == nArc {
			id = 0
		} else {
			g.Points = append(g.Points, mesh.Point{X: R0 * math.Sin(th), Y: R0 * math.Cos(th)})
			id = int32(len(g.Points) - 1)
		}
		g.Segments = append(g.Segments, mesh.Segment{A: prev, B: id, Tag: OuterTag})
		prev = id
	}
	ap := a * math.Sqrt(2*math.Pi/(float64(n)*math.Sin(2*math.Pi/float64(n))))
	first := int32(len(g.Points))
	for k := range n {
		th := 2 * math.Pi * float64(k) / float64(n)
		g.Points = append(g.Points, mesh.Point{X: R + ap*math.Cos(th), Y: ap * math.Sin(th)})
		g.Segments = append(g.Segments, mesh.Segment{A: first + int32(k), B: first + int32((k+1)%n)})
	}
	g.Regions = []mesh.RegionSeed{{P: mesh.Point{X: R + (a+ai)/2, Y: 0}, Tag: 2}, {P: mesh.Point{X: R / 2, Y: R}, Tag: 1}}
	if ai > 0 {
		api := ai * math.Sqrt(2*math.Pi/(float64(n)*math.Sin(2*math.Pi/float64(n))))
		first := int32(len(g.Points))
		for k := range n {
			th := 2 * math.Pi * float64(k) / float64(n)
			g.Points = append(g.Points, mesh.Point{X: R + api*math.Cos(th), Y: api * math.Sin(th)})
			g.Segments = append(g.Segments, mesh.Segment{A: first + int32(k), B: first + int32((k+1)%n)})
		}
		g.Regions = append(g.Regions, mesh.RegionSeed{P: mesh.Point{X: R, Y: 0}, Tag: 1})
	}
	size := func(p mesh.Point) float64 {
		d := math.Abs(math.Hypot(p.X-R, p.Y) - a)
		return min(R0/8, hs+0.25*d)
	}
	m, err := mesh.Triangulate(g, mesh.Options{Size: size})
	if err != nil {
		t.Fatal(err)
	}
	m.MakeQuadratic()
	return &Problem{Mesh: m, Outer: OuterBoundary{Robin: true, Radius: R0}, Coils: []Coil{{Name: "loop", Value: 1}}}
}

// Self-inductance of a circular loop of round wire against the thin-ring formulas of reference/README.md §3:
// uniform current (a stranded cross-section) L = μ0R[ln(8R/a) − 7/4] within 0.2 %; skin-effect limit
// L = μ0R[ln(8R/a) − 2] within 0.3 %, reached by Richardson extrapolation in δ from two solid-conductor solves
// with δ = a/10 and a/20 (the internal-inductance excess falls as δ). For R/a = 50 the thin-ring formulas' own
// error is of order (a/R)² ln(8R/a) ≈ 1e-4.
func TestWireLoopInductance(t *testing.T) {
	for _, c := range []struct{ R, a, ldc, lhf float64 }{
		{0.050, 0.001, 266.4991, 250.7911}, // nH, reference/README.md §3
	} {
		t.Run(fmt.Sprintf("R=%g,a=%g", c.R, c.a), func(t *testing.T) {
			p := wireLoopProblem(t, c.R, c.a, 96, c.a/8)
			p.Frequency = 50
			p.Regions = []Region{{Tag: 2, Name: "wire", Kind: Stranded, Coil: 0, Sense: 1, Strands: 1}}
			sol, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			ldc := imag(sol.CoilZ[0]) / (2 * math.Pi * p.Frequency) * 1e9
			if math.Abs(ldc/c.ldc-1) > 2e-3 {
				t.Errorf("L_DC = %.4f nH, Kirchhoff %.4f", ldc, c.ldc)
			}
			if e := sol.BalanceError(); !(e < 1e-8) {
				t.Errorf("balance error %.2e", e)
			}
			const sigma = 5.8e7
			var l [2]float64
			for k, q := range []float64{10, 20} {
				d := c.a / q
				pk := wireLoopProblem(t, c.R, c.a, 192, d/2)
				pk.Frequency = 2 / (d * d * Mu0 * sigma) / (2 * math.Pi)
				pk.Regions = []Region{{Tag: 2, Name: "wire", Kind: SolidTurn, Sigma: sigma, Coil: 0, Sense: 1, Strands: 1}}
				s, err := Solve(pk)
				if err != nil {
					t.Fatal(err)
				}
				l[k] = imag(s.CoilZ[0]) / (2 * math.Pi * pk.Frequency) * 1e9
				if e := s.BalanceError(); !(e < 1e-8) {
					t.Errorf("a/δ=%g: balance error %.2e", q, e)
				}
			}
			lhf := 2*l[1] - l[0]
			if math.Abs(lhf/c.lhf-1) > 3e-3 {
				t.Errorf("L_HF (extrapolated from %.4f, %.4f) = %.4f nH, formula %.4f", l[0], l[1], lhf, c.lhf)
			}
			t.Logf("L_DC %.4f nH (ref %.4f), L(δ=a/10) %.4f, L(δ=a/20) %.4f, L_HF %.4f (ref %.4f); %d unknowns DC",
				ldc, c.ldc, l[0], l[1], lhf, c.lhf, sol.Stats.Unknowns)
		})
	}
}

// A single round-tube turn at 1 Hz: R = Re Z equals the ring's DC resistance 1/G within 0.5 %, where
// G = ∫σ/(2πr) dA = σ[√(R² − ai²) − √(R² − a²)] over the annulus (∫ dA/r over a disc of radius c centred at
// radius R is 2π(R − √(R² − c²)), an elementary integral).
func TestRoundTubeTurnDCResistance(t *testing.T) {
	const R, a, ai, sigma = 0.04, 0.004, 0.003, 5.8e7
	p := tubeLoopProblem(t, R, a, ai, 128, 3e-4)
	p.Frequency = 1
	p.Regions = []Region{{Tag: 2, Name: "tube turn", Kind: SolidTurn, Sigma: sigma, Coil: 0, Sense: 1, Strands: 1}}
	sol, err := Solve(p)
	if err != nil {
		t.Fatal(err)
	}
	want := 1 / (sigma * (math.Sqrt(R*R-ai*ai) - math.Sqrt(R*R-a*a)))
	if got := real(sol.CoilZ[0]); math.Abs(got/want-1) > 5e-3 {
		t.Errorf("R = %.6e Ω, 1/G = %.6e Ω (rel %.1e)", got, want, got/want-1)
	}
	t.Logf("R = %.6e Ω, DC %.6e Ω", real(sol.CoilZ[0]), want)
}
