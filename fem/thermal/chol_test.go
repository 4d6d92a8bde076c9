package thermal

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// TestCholeskySolves checks the sparse Cholesky factor on Newton-like matrices (a weighted graph Laplacian of a
// triangle mesh plus a positive diagonal, rows shuffled so the ordering matters): A·(factor⁻¹ r) must give r back
// to round-off, and a matrix with a non-positive pivot must be refused.
func TestCholeskySolves(t *testing.T) {
	for _, c := range []struct{ nr, nz int }{{1, 1}, {3, 2}, {20, 30}, {60, 40}} {
		t.Run(fmt.Sprintf("%dx%d", c.nr, c.nz), func(t *testing.T) {
			rng := rand.New(rand.NewPCG(uint64(c.nr), uint64(c.nz)))
			m := rectMesh(0, 1, 0, 2, c.nr, c.nz, 1)
			n := len(m.Nodes)
			shuffle := rng.Perm(n)
			tris := make([][3]int32, len(m.Tris))
			coords := make([][2]float64, n)
			for v, p := range m.Nodes {
				coords[shuffle[v]] = [2]float64{p.X, p.Y}
			}
			for i, tri := range m.Tris {
				for k, v := range tri {
					tris[i][k] = int32(shuffle[v])
				}
			}
			a := newCSR(n, tris)
			for _, tri := range tris {
				w := 0.5 + rng.Float64()
				for x := 0; x < 3; x++ {
					for y := 0; y < 3; y++ {
						v := -w
						if x == y {
							v = 2 * w
						}
						a.val[a.pos(tri[x], tri[y])] += v
					}
				}
			}
			for i := 0; i < n; i++ {
				a.val[a.diag[i]] += 1e-3 * (1 + rng.Float64())
			}
			ch, err := newCholesky(a, coords)
			if err != nil {
				t.Fatal(err)
			}
			if !ch.factor(a) {
				t.Fatal("factor refused an SPD matrix")
			}
			r, z, back := make([]float64, n), make([]float64, n), make([]float64, n)
			for i := range r {
				r[i] = rng.NormFloat64()
			}
			ch.apply(z, r)
			a.mulVec(back, z)
			worst := 0.0
			for i := range r {
				worst = math.Max(worst, math.Abs(back[i]-r[i]))
			}
			if worst > 1e-9*norm2(r) {
				t.Errorf("max |A z − r| = %.3g", worst)
			}
			// The fill of a nested-dissection ordering on a k×k grid is O(n log k) (George 1973, from memory: about
			// 31/4·n·log₂k); even the best banded order fills n·k, and the shuffled numbering nearly n²/2.
			if nnz := len(ch.lx); n > 1000 && nnz > n*int(math.Sqrt(float64(n))) {
				t.Errorf("L holds %d entries for %d rows", nnz, n)
			}
			a.val[a.diag[n/2]] = -1
			if ch.factor(a) {
				t.Error("factor accepted a matrix with a negative diagonal entry")
			}
		})
	}
}

// BenchmarkCholesky times the numeric factorisation and one preconditioner application (forward and back
// substitution) on Newton-like matrices of square meshes of (n+1)² nodes, rows shuffled.
func BenchmarkCholesky(b *testing.B) {
	for _, n := range []int{50, 100, 200} {
		rng := rand.New(rand.NewPCG(1, uint64(n)))
		m := rectMesh(0, 0.04, 0, 0.04, n, n, 1)
		nn := len(m.Nodes)
		shuffle := rng.Perm(nn)
		tris := make([][3]int32, len(m.Tris))
		coords := make([][2]float64, nn)
		for v, p := range m.Nodes {
			coords[shuffle[v]] = [2]float64{p.X, p.Y}
		}
		for i, tri := range m.Tris {
			for k, v := range tri {
				tris[i][k] = int32(shuffle[v])
			}
		}
		a := newCSR(nn, tris)
		for _, tri := range tris {
			for x := 0; x < 3; x++ {
				for y := 0; y < 3; y++ {
					v := -1.0
					if x == y {
						v = 2
					}
					a.val[a.pos(tri[x], tri[y])] += v
				}
			}
		}
		for i := 0; i < nn; i++ {
			a.val[a.diag[i]] += 1e-2
		}
		ch, err := newCholesky(a, coords)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("factor/nodes=%d", nn), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				ch.factor(a)
			}
			b.ReportMetric(float64(len(ch.lx))/float64(nn), "L/row")
		})
		r, z := make([]float64, nn), make([]float64, nn)
		for i := range r {
			r[i] = rng.NormFloat64()
		}
		b.Run(fmt.Sprintf("apply/nodes=%d", nn), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				ch.apply(z, r)
			}
		})
	}
}

// Both preconditioners must give the same transient (the Newton iterations stop on the residual, not on the
// linear solver): a square part heated in a surface layer, 20 steps with the Cholesky factor and with IC(0).
func TestPreconditionersAgree(t *testing.T) {
	m := rectMesh(0, 0.04, 0, 0.04, 30, 30, 1)
	bnd := edgesWhere(m, allEdges, func(i, j int32) BoundaryEdge {
		return BoundaryEdge{A: i, B: j, HeatTransfer: 20, Ambient: 300, Emissivity: 0.7}
	})
	src := make([]float64, len(m.Tris))
	for i, tri := range m.Tris {
		if m.Nodes[tri[0]].X >= 0.037 {
			src[i] = 2e8
		}
	}
	mat := Funcs{
		K:   func(T float64) float64 { return 50 - 0.02*(T-300) },
		Rho: func(float64) float64 { return 7850 },
		Cp:  func(T float64) float64 { return 460 + 0.2*(T-300) },
	}
	model := Model{Mesh: m, Materials: map[int32]Material{1: mat}, Boundary: bnd}
	var temps [2][]float64
	for k := range 2 {
		s, err := NewSolver(model, []float64{300})
		if err != nil {
			t.Fatal(err)
		}
		if s.chol == nil {
			t.Fatal("no Cholesky analysis")
		}
		if k == 1 {
			s.chol = nil
		}
		cg := 0
		for range 20 {
			info, err := s.Step(0.5, src)
			if err != nil {
				t.Fatal(err)
			}
			cg += info.CGIter
		}
		t.Logf("preconditioner %d: %d CG iterations", k, cg)
		temps[k] = s.Temperature()
	}
	for i := range temps[0] {
		if d := math.Abs(temps[0][i] - temps[1][i]); d > 1e-6 {
			t.Fatalf("node %d: %.9f K with Cholesky, %.9f K with IC(0)", i, temps[0][i], temps[1][i])
		}
	}
}

// conductivitySlopeTerm must be the derivative of the conduction term F(T) = Σ_e k(T̄_e)·G_e·T minus its lagged
// part: N·y ≈ (F(T+εy) − F(T−εy))/(2ε) − K(T)·y, checked on a mesh with a strongly temperature-dependent k and
// a non-uniform temperature field.
func TestConductivitySlopeTerm(t *testing.T) {
	m := rectMesh(0, 0.04, 0, 0.04, 12, 9, 1)
	mat := Funcs{
		K:   func(T float64) float64 { return 50 - 0.04*(T-300) + 1e-5*(T-300)*(T-300) },
		Rho: func(float64) float64 { return 7850 },
		Cp:  func(float64) float64 { return 460 },
	}
	s, err := NewSolver(Model{Mesh: m, Materials: map[int32]Material{1: mat}}, []float64{300})
	if err != nil {
		t.Fatal(err)
	}
	n := len(s.t)
	rng := rand.New(rand.NewPCG(3, 4))
	T, y := make([]float64, n), make([]float64, n)
	for i := range T {
		T[i] = 400 + 600*rng.Float64()
		y[i] = rng.NormFloat64()
	}
	conduction := func(T []float64) []float64 {
		out := make([]float64, n)
		for ei := range s.elems {
			el := &s.elems[ei]
			k := mat.Conductivity((T[el.n[0]] + T[el.n[1]] + T[el.n[2]]) / 3)
			for a := 0; a < 3; a++ {
				for b := 0; b < 3; b++ {
					out[el.n[a]] += k * el.g[a][b] * T[el.n[b]]
				}
			}
		}
		return out
	}
	const eps = 1e-3
	tp, tm := make([]float64, n), make([]float64, n)
	for i := range T {
		tp[i], tm[i] = T[i]+eps*y[i], T[i]-eps*y[i]
	}
	fp, fm := conduction(tp), conduction(tm)
	if err := s.assemble(T, make([]float64, n), 1); err != nil {
		t.Fatal(err)
	}
	ky := make([]float64, n)
	s.a.mulVec(ky, y)
	got := make([]float64, n)
	if !s.conductivitySlopeTerm(got, T, y) {
		t.Fatal("conductivity refused")
	}
	scale, worst := 0.0, 0.0
	for i := range got {
		want := (fp[i]-fm[i])/(2*eps) - ky[i]
		scale = math.Max(scale, math.Abs(want))
		worst = math.Max(worst, math.Abs(got[i]-want))
	}
	if !(scale > 0) || worst > 1e-5*scale {
		t.Errorf("largest difference %.3g W/K·K of %.3g", worst, scale)
	}
}
