package heating

import (
	"math"
	"math/cmplx"
	"testing"

	"eddyrz/fem"
	"eddyrz/post/study"
)

// The part-only Joule integration must agree, triangle by triangle, with the field solution's own quadrature
// points (fem.Solution.EachPoint: |J|²/σ with J the solution's current density, weights of the assembly's
// rules), on a linear-element job (zinc slug) and a quadratic one with triangles on the axis (coarse billet), at
// a cold and at a non-uniform hot state (element σ and μr then differ from triangle to triangle). (On the axis
// the finer rule gives the same Joule power: |A|²·r is a polynomial of degree 5 there, integrated exactly by
// the 7-point rule too; it matters for B, which has A/r.)
func TestJouleMatchesSolutionPoints(t *testing.T) {
	for _, name := range []string{"zinc-slug.toml", "billet-coarse.toml"} {
		t.Run(name, func(t *testing.T) {
			md, err := study.Build(readJob(t, name))
			if err != nil {
				t.Fatal(err)
			}
			cp, err := newCoupler(md, false)
			if err != nil {
				t.Fatal(err)
			}
			m := md.Mesh
			T := make([]float64, len(m.Nodes))
			for i := range T {
				T[i] = 293.15
			}
			for state := range 2 {
				if state == 1 { // hot outside, cold inside: the Curie transition runs through a steel part
					for i, p := range m.Nodes {
						T[i] = 300 + 1000*p.X/0.03 + 100*math.Sin(p.Y*200)
					}
				}
				for _, e := range cp.elems { // as coupler.solve sets them
					tri := m.Tris[e]
					cp.sigma[e], cp.mur[e] = electrical(cp.state[e].mat, (T[tri[0]]+T[tri[1]]+T[tri[2]])/3)
				}
				if err := cp.solver.SetElementMaterials(cp.sigma, cp.mur); err != nil {
					t.Fatal(err)
				}
				sol, err := cp.solver.SolveAt(cp.freq)
				if err != nil {
					t.Fatal(err)
				}
				want := make([]float64, len(m.Tris))
				vol := make([]float64, len(m.Tris))
				sol.EachPoint(func(p fem.QuadPoint) {
					if cp.state[p.Elem].mat != nil && p.Sigma > 0 {
						want[p.Elem] += p.Weight * math.Pow(cmplx.Abs(p.J), 2) / p.Sigma
						vol[p.Elem] += p.Weight
					}
				})
				got := cp.joule(sol)
				total, checked := 0.0, 0
				for _, e := range cp.elems {
					total += want[e]
				}
				for _, e := range cp.elems {
					if d := math.Abs(got[e] - want[e]); d > 1e-9*want[e]+1e-15*total {
						t.Fatalf("state %d, triangle %d: %.15g W, points give %.15g W", state, e, got[e], want[e])
					}
					if math.Abs(cp.vol[e]-vol[e]) > 1e-12*vol[e] {
						t.Fatalf("triangle %d: volume %.15g m³, points give %.15g", e, cp.vol[e], vol[e])
					}
					checked++
				}
				if !(total > 0) || checked == 0 {
					t.Fatalf("state %d: no part power to compare (%g W over %d triangles)", state, total, checked)
				}
			}
		})
	}
}
