package fem

import (
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"

	"gonum.org/v1/gonum/mathext"
)

// keyGrid returns grid lines from lo to hi with spacing hfine at every key point, growing by q (up to hmax)
// away from them.
func keyGrid(lo, hi float64, keys []float64, hfine, q, hmax float64) []float64 {
	pts := append([]float64{lo}, keys...)
	pts = append(pts, hi)
	var out []float64
	for i := 1; i < len(pts); i++ {
		x0, x1 := pts[i-1], pts[i]
		if x1-x0 < 1e-15 {
			continue
		}
		h0, h1 := hfine, hfine
		if i == 1 && x0 == lo && !contains(keys, lo) {
			h0 = hmax
		}
		if i == len(pts)-1 && !contains(keys, hi) {
			h1 = hmax
		}
		mid := (x0 + x1) / 2
		out = join(out, graded(x0, mid, h0, q, hmax), gradedTo(mid, x1, h1, q, hmax))
	}
	return out
}

func contains(x []float64, v float64) bool {
	for _, w := range x {
		if w == v {
			return true
		}
	}
	return false
}

// box is a rectangle in the r-z plane.
type box struct{ r0, r1, z0, z1 float64 }

func (b box) has(r, z float64) bool { return r > b.r0 && r < b.r1 && z > b.z0 && z < b.z1 }

// boxesMesh meshes [0, L] × [−L+zc, L+zc] with fine lines around the boxes; box k gets tag k+1. Right, top and
// bottom are OuterTag (Dirichlet A = AppliedBz r/2) unless natural is set.
func boxesMesh(boxes []box, L, zc, hfine, q float64, quad, natural bool) (*Problem, []float64) {
	var rk, zk []float64
	for _, b := range boxes {
		rk = append(rk, b.r0, b.r1)
		zk = append(zk, b.z0, b.z1)
	}
	sortUniq := func(x []float64) []float64 {
		for i := range x {
			for j := i + 1; j < len(x); j++ {
				if x[j] < x[i] {
					x[i], x[j] = x[j], x[i]
				}
			}
		}
		var o []float64
		for _, v := range x {
			if len(o) == 0 || v-o[len(o)-1] > 1e-12 {
				o = append(o, v)
			}
		}
		return o
	}
	rs := keyGrid(0, L, sortUniq(rk), hfine, q, L/10)
	zs := keyGrid(zc-L, zc+L, sortUniq(zk), hfine, q, L/10)
	var outer []string
	if !natural {
		outer = []string{"right", "top", "bottom"}
	}
	m := rectMesh(rs, zs, func(r, z float64) int32 {
		for k, b := range boxes {
			if b.has(r, z) {
				return int32(k + 1)
			}
		}
		return 0
	}, quad, outer...)
	return &Problem{Mesh: m}, rs
}

// maxwellM is the mutual inductance of coaxial filaments of radii a, b at axial distance d, H
// (Maxwell, Treatise vol. 2 art. 701; reference/README.md §3). gonum's CompleteK/E take m = k².
func maxwellM(a, b, d float64) float64 {
	k2 := 4 * a * b / ((a+b)*(a+b) + d*d)
	k := math.Sqrt(k2)
	return Mu0 * math.Sqrt(a*b) * ((2/k-k)*mathext.CompleteK(k2) - 2/k*mathext.CompleteE(k2))
}

// boxAverageM is Maxwell's formula averaged over two rectangular cross-sections carrying uniform current
// density (exact for stranded blocks), by 8×8 Gauss–Legendre per box (gauss5 twice is not enough near contact,
// so the boxes in the tests are far apart relative to their size).
func boxAverageM(b1, b2 box) float64 {
	pts := func(b box) (r, z, w []float64) {
		for i, x := range gauss5.X {
			for j, y := range gauss5.X {
				r = append(r, b.r0+x*(b.r1-b.r0))
				z = append(z, b.z0+y*(b.z1-b.z0))
				w = append(w, gauss5.W[i]*gauss5.W[j])
			}
		}
		return
	}
	r1, z1, w1 := pts(b1)
	r2, z2, w2 := pts(b2)
	var s float64
	for i := range r1 {
		for j := range r2 {
			s += w1[i] * w2[j] * maxwellM(r1[i], r2[j], z2[j]-z1[i])
		}
	}
	return s
}

func TestMaxwellFormulaTable(t *testing.T) {
	// Check values: reference/README.md §3 (derived, checked there by a Neumann integral).
	for _, c := range []struct{ a, b, d, m float64 }{
		{50, 50, 20, 67.536944}, {50, 50, 50, 24.703923}, {50, 25, 20, 20.088400}, {30, 60, 10, 30.931976},
	} {
		got := maxwellM(c.a/1e3, c.b/1e3, c.d/1e3) * 1e9
		if math.Abs(got/c.m-1) > 1e-7 {
			t.Errorf("M(%g, %g, %g) = %.6f nH, reference %.6f", c.a, c.b, c.d, got, c.m)
		}
	}
}

// Two coaxial thin stranded rings: the mutual inductance from the open-circuit voltage of the undriven ring
// against Maxwell's formula (reference/README.md §3) within 0.2 %, both ways round (reciprocity), and the
// energy balance of the driven solve.
func TestRingsMutualInductance(t *testing.T) {
	const s = 1e-3 // ring cross-section side, m
	for _, c := range []struct{ a, b, d, m float64 }{
		{50, 50, 20, 67.536944}, {50, 25, 20, 20.088400}, {30, 60, 10, 30.931976},
	} {
		t.Run(fmt.Sprintf("%g-%g-%g", c.a, c.b, c.d), func(t *testing.T) {
			a, b, d := c.a/1e3, c.b/1e3, c.d/1e3
			b1 := box{a - s/2, a + s/2, -s / 2, s / 2}
			b2 := box{b - s/2, b + s/2, d - s/2, d + s/2}
			p, _ := boxesMesh([]box{b1, b2}, 1.5, d/2, s/2, 1.3, true, false)
			p.Frequency = 50
			p.Coils = []Coil{{Name: "one", Value: 1}, {Name: "two", Value: 0}}
			p.Regions = []Region{
				{Tag: 1, Name: "ring one", Kind: Stranded, Coil: 0, Sense: 1, Strands: 1},
				{Tag: 2, Name: "ring two", Kind: Stranded, Coil: 1, Sense: 1, Strands: 1},
			}
			w := 2 * math.Pi * p.Frequency
			sol, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			m12 := real(sol.CoilV[1] / complex(0, w))
			p.Coils = []Coil{{Name: "one", Value: 0}, {Name: "two", Value: 1}}
			sol2, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			m21 := real(sol2.CoilV[0] / complex(0, w))
			want := boxAverageM(b1, b2)
			if math.Abs(want*1e9/c.m-1) > 1e-3 {
				t.Errorf("box-averaged M %.6f nH strays from the filament value %.6f by more than 0.1 %%", want*1e9, c.m)
			}
			for _, got := range []float64{m12, m21} {
				if math.Abs(got/want-1) > 2e-3 {
					t.Errorf("M = %.6f nH, Maxwell (box-averaged) %.6f nH", got*1e9, want*1e9)
				}
			}
			if math.Abs(m12/m21-1) > 1e-9 {
				t.Errorf("reciprocity: M12 = %.9g, M21 = %.9g", m12, m21)
			}
			if e := sol.BalanceError(); !(e < 1e-8) {
				t.Errorf("energy balance error %.3g", e)
			}
			t.Logf("M = %.5f nH (Maxwell box-averaged %.5f, filament %.5f), %d unknowns", m12*1e9, want*1e9, c.m, sol.Stats.Unknowns)
		})
	}
}

// A long tube (and bars) heated by a current sheet: the sheet (a thin stranded block of one turn carrying
// I = H0·h) makes the surface field H0 exactly, with a natural outer boundary (H = 0 outside the sheet).
// P′ against reference/README.md §2 (H0 = 10⁴ A/m peak), within 0.2 %.
func TestTubeAndBarByCurrentSheet(t *testing.T) {
	const h = 1e-3
	cases := []struct {
		name         string
		a, b, rho, f float64
		want         float64 // W/m
	}{
		{"copper bar", 0.010, 0, 1.72e-8, 1000, 23.116059},
		{"steel above Curie", 0.025, 0, 1.2e-6, 3000, 755.111538},
		{"copper tube b=5mm", 0.010, 0.005, 1.72e-8, 1000, 22.846058},
		{"copper tube b=8mm", 0.010, 0.008, 1.72e-8, 1000, 28.126523},
		{"copper tube b=9mm", 0.010, 0.009, 1.72e-8, 1000, 45.211078},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sigma := 1 / c.rho
			d := math.Sqrt(2 / (2 * math.Pi * c.f * Mu0 * sigma))
			hf := d / 4
			var rs []float64
			if c.b > 0 {
				rs = join(linspace(0, c.b, 4), graded(c.b, (c.a+c.b)/2, hf, 1.2, c.a/10), gradedTo((c.a+c.b)/2, c.a, hf, 1.2, c.a/10))
			} else {
				rs = gradedTo(0, c.a, hf, 1.2, c.a/10)
			}
			g, th := c.a/10, c.a/50
			rs = join(rs, linspace(c.a, c.a+g, 2), linspace(c.a+g, c.a+g+th, 1))
			m := rectMesh(rs, linspace(0, h, 1), func(r, z float64) int32 {
				switch {
				case r > c.b && r < c.a:
					return 1
				case r > c.a+g:
					return 2
				}
				return 0
			}, true)
			p := &Problem{Mesh: m, Frequency: c.f,
				Coils: []Coil{{Name: "sheet", Value: complex(1e4/math.Sqrt2*h, 0)}},
				Regions: []Region{
					{Tag: 1, Name: "work", Kind: Part, Sigma: sigma, Coil: -1},
					{Tag: 2, Name: "sheet", Kind: Stranded, Coil: 0, Sense: 1, Strands: 1},
				}}
			sol, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			got := sol.RegionPower(1) / h
			if math.Abs(got/c.want-1) > 2e-3 {
				t.Errorf("P′ = %.6f W/m, reference %.6f", got, c.want)
			}
			if e := sol.BalanceError(); !(e < 1e-8) {
				t.Errorf("energy balance error %.3g", e)
			}
			t.Logf("P′ = %.6f W/m (reference %.6f, rel %.1e), balance %.1e", got, c.want, got/c.want-1, sol.BalanceError())
		})
	}
}

// twoTurnCoil is a coil of two rectangular solid copper turns (the second wound in the opposite sense) near a
// steel-like part, plus a stranded coil, in a box with A = 0 on the far sides.
func twoTurnCoil(drive DriveKind, v complex128) *Problem {
	turn1 := box{0.030, 0.034, -0.006, 0.000}
	turn2 := box{0.030, 0.034, 0.002, 0.008}
	part := box{0.005, 0.020, -0.010, 0.010}
	block := box{0.040, 0.046, -0.004, 0.004}
	p, _ := boxesMesh([]box{turn1, turn2, part, block}, 0.3, 0, 1e-3, 1.35, true, false)
	p.Frequency = 5000
	p.Coils = []Coil{{Name: "work coil", Drive: drive, Value: v}, {Name: "pickup", Value: 3}}
	p.Regions = []Region{
		{Tag: 1, Name: "turn 1", Kind: SolidTurn, Sigma: 5.8e7, Coil: 0, Sense: 1, Strands: 1},
		{Tag: 2, Name: "turn 2", Kind: SolidTurn, Sigma: 5.8e7, Coil: 0, Sense: -1, Strands: 1},
		{Tag: 3, Name: "billet", Kind: Part, Sigma: 1e6, MuR: 20, Coil: -1},
		{Tag: 4, Name: "pickup", Kind: Stranded, Coil: 1, Sense: 1, Strands: 12, Rdc: 0.05},
	}
	return p
}

// Voltage drive must give back the current of the current-driven solve whose voltage it is given: this checks
// the extra symmetric voltage row against the turn rows. Both solves must balance their energy.
func TestVoltageDriveMatchesCurrentDrive(t *testing.T) {
	ps := twoTurnCoil(CurrentDrive, complex(100, 20))
	s1, err := Solve(ps)
	if err != nil {
		t.Fatal(err)
	}
	pv := twoTurnCoil(VoltageDrive, s1.CoilV[0])
	s2, err := Solve(pv)
	if err != nil {
		t.Fatal(err)
	}
	if d := cmplx.Abs(s2.CoilI[0]-s1.CoilI[0]) / cmplx.Abs(s1.CoilI[0]); d > 1e-9 {
		t.Errorf("voltage drive current %v, current drive %v (rel %.2e)", s2.CoilI[0], s1.CoilI[0], d)
	}
	if d := cmplx.Abs(s2.CoilZ[0]-s1.CoilZ[0]) / cmplx.Abs(s1.CoilZ[0]); d > 1e-9 {
		t.Errorf("Z differs: %v vs %v", s2.CoilZ[0], s1.CoilZ[0])
	}
	for _, s := range []*Solution{s1, s2} {
		if e := s.BalanceError(); !(e < 1e-8) {
			t.Errorf("energy balance error %.3g", e)
		}
		// Series turns carry ±I: check I_k = ∫ J dr dz of each turn from the field.
		for ri, r := range s.Regions {
			if r.Kind != SolidTurn {
				continue
			}
			var ik complex128
			s.EachPoint(func(q QuadPoint) {
				if q.Region == ri {
					ik += q.J * complex(q.Weight/(2*math.Pi*q.R), 0)
				}
			})
			if d := cmplx.Abs(ik-s.TurnI[ri]) / cmplx.Abs(s.TurnI[ri]); d > 1e-9 {
				t.Errorf("%s: ∫J = %v, series current %v", r.Name, ik, s.TurnI[ri])
			}
		}
	}
	if s1.CoilZ[0] == 0 || real(s1.CoilZ[0]) <= 0 || imag(s1.CoilZ[0]) <= 0 {
		t.Errorf("coil impedance %v should have positive R and X", s1.CoilZ[0])
	}
	t.Logf("Z = %.6g Ω, balance %.1e", s1.CoilZ[0], s1.BalanceError())
}

// A rectangular solid ring at 1 Hz: R = Re Z equals its DC resistance 2π/(σ h ln(r2/r1)) (the closed form of
// ∫σ/(2πr) dr dz, i.e. 1/G) within 0.5 %; also the sign of the winding sense must not change Z.
func TestSolidTurnDCResistance(t *testing.T) {
	const sigma = 5.8e7
	turn := box{0.040, 0.046, -0.003, 0.003}
	want := 2 * math.Pi / (sigma * (turn.z1 - turn.z0) * math.Log(turn.r1/turn.r0))
	var zs []complex128
	for _, sense := range []int{1, -1} {
		p, _ := boxesMesh([]box{turn}, 0.5, 0, 1e-3, 1.35, true, false)
		p.Frequency = 1
		p.Coils = []Coil{{Name: "loop", Value: 10}}
		p.Regions = []Region{{Tag: 1, Name: "turn", Kind: SolidTurn, Sigma: sigma, Coil: 0, Sense: sense, Strands: 1}}
		sol, err := Solve(p)
		if err != nil {
			t.Fatal(err)
		}
		z := sol.CoilZ[0]
		if math.Abs(real(z)/want-1) > 5e-3 {
			t.Errorf("sense %d: R = %.6e Ω, DC %.6e Ω", sense, real(z), want)
		}
		zs = append(zs, z)
	}
	if cmplx.Abs(zs[0]-zs[1]) > 1e-9*cmplx.Abs(zs[0]) {
		t.Errorf("Z depends on the winding sense of a lone turn: %v vs %v", zs[0], zs[1])
	}
}

func TestProblemErrors(t *testing.T) {
	base := func() *Problem { return twoTurnCoil(CurrentDrive, 1) }
	cases := []struct {
		name string
		edit func(p *Problem)
		want string
	}{
		{"zero frequency", func(p *Problem) { p.Frequency = 0 }, "frequency must be positive"},
		{"negative frequency", func(p *Problem) { p.Frequency = -5 }, "1 Hz"},
		{"insulating turn", func(p *Problem) { p.Regions[1].Sigma = 0 }, `"turn 2"`},
		{"bad sense", func(p *Problem) { p.Regions[0].Sense = 0 }, "winding sense"},
		{"bad coil index", func(p *Problem) { p.Regions[0].Coil = 7 }, "coil index"},
		{"coil without turns", func(p *Problem) { p.Coils = append(p.Coils, Coil{Name: "spare"}) }, `"spare"`},
		{"robin without radius", func(p *Problem) { p.Outer.Robin = true }, "radius"},
		{"robin circle mismatch", func(p *Problem) { p.Outer = OuterBoundary{Robin: true, Radius: 0.3} }, "not on the Robin circle"},
		{"no mesh", func(p *Problem) { p.Mesh = nil }, "no mesh"},
	}
	for _, c := range cases {
		p := base()
		c.edit(p)
		_, err := Solve(p)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.want)
		}
	}
}

func TestExportSystem(t *testing.T) {
	sol, err := Solve(twoTurnCoil(VoltageDrive, 10))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if err := sol.ExportSystem(dir); err != nil {
		t.Fatal(err)
	}
	a, err := os.ReadFile(filepath.Join(dir, "A.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(a)), "\n")
	if lines[0] != "%%MatrixMarket matrix coordinate complex symmetric" {
		t.Errorf("A.mtx header %q", lines[0])
	}
	var n, m, nnz int
	fmt.Sscan(lines[1], &n, &m, &nnz)
	if n != sol.Stats.Unknowns || m != n || nnz != sol.Stats.NonZeros || len(lines) != nnz+2 {
		t.Errorf("A.mtx size line %q, %d lines; want %d unknowns, %d entries", lines[1], len(lines), sol.Stats.Unknowns, sol.Stats.NonZeros)
	}
	b, err := os.ReadFile(filepath.Join(dir, "b.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	bl := strings.Split(strings.TrimSpace(string(b)), "\n")
	if bl[0] != "%%MatrixMarket matrix array complex general" || len(bl) != n+2 {
		t.Errorf("b.mtx header %q, %d lines", bl[0], len(bl))
	}
}

// A sweep through one Solver (pattern, symbolic analysis and element values re-used; overrides re-scattered)
// must match fresh solves of the changed problems.
func TestSolverSweepMatchesFreshSolves(t *testing.T) {
	p := twoTurnCoil(CurrentDrive, 50)
	s, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		f  float64
		ov []Override
	}{{1000, nil}, {30e3, nil}, {30e3, []Override{{Tag: 3, Sigma: 4e6, MuR: 1}}}, {200, nil}} {
		got, err := s.SolveAt(c.f, c.ov...)
		if err != nil {
			t.Fatal(err)
		}
		q := twoTurnCoil(CurrentDrive, 50)
		q.Frequency = c.f
		if len(s.asm.prob.Regions) > 0 {
			q.Regions[2].Sigma, q.Regions[2].MuR = s.asm.prob.Regions[2].Sigma, s.asm.prob.Regions[2].MuR
		}
		want, err := Solve(q)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmplx.Abs(got.CoilZ[0]-want.CoilZ[0]) / cmplx.Abs(want.CoilZ[0]); d > 1e-10 {
			t.Errorf("f=%g %v: sweep Z %v, fresh %v", c.f, c.ov, got.CoilZ[0], want.CoilZ[0])
		}
		if e := got.BalanceError(); !(e < 1e-8) {
			t.Errorf("f=%g: balance error %.3g", c.f, e)
		}
	}
	if p.Regions[2].Sigma != 1e6 {
		t.Errorf("overrides leaked into the caller's Problem")
	}
	if _, err := s.SolveAt(100, Override{Tag: 99, Sigma: 1}); err == nil {
		t.Errorf("override of a missing tag accepted")
	}
}

// Parallel assembly (each worker its own arrays, summed) equals serial assembly up to rounding.
func TestParallelAssemblyMatchesSerial(t *testing.T) {
	a, err := NewAssembler(twoTurnCoil(VoltageDrive, 3))
	if err != nil {
		t.Fatal(err)
	}
	a.assembleWith(1)
	k1, m1, q1, r1 := slices.Clone(a.kv), slices.Clone(a.mv), slices.Clone(a.qv), slices.Clone(a.r0)
	a.assembleWith(3)
	for p := range k1 {
		for _, c := range [][2]float64{{k1[p], a.kv[p]}, {m1[p], a.mv[p]}, {q1[p], a.qv[p]}} {
			if math.Abs(c[0]-c[1]) > 1e-12*math.Max(1, math.Abs(c[0])) {
				t.Fatalf("slot %d: serial %g, parallel %g", p, c[0], c[1])
			}
		}
	}
	for i := range r1 {
		if cmplx.Abs(r1[i]-a.r0[i]) > 1e-12*math.Max(1, cmplx.Abs(r1[i])) {
			t.Fatalf("rhs %d: serial %g, parallel %g", i, r1[i], a.r0[i])
		}
	}
}

// Solving the same Problem from several goroutines gives identical answers (a solve is a value).
func TestConcurrentSolves(t *testing.T) {
	p := twoTurnCoil(VoltageDrive, 7)
	p.Frequency = 2000
	want, err := Solve(p)
	if err != nil {
		t.Fatal(err)
	}
	got := make([]*Solution, 3)
	var wg sync.WaitGroup
	for k := range got {
		wg.Go(func() {
			s, err := Solve(p)
			if err != nil {
				t.Error(err)
				return
			}
			s.At(0.032, 0.001)
			got[k] = s
		})
	}
	wg.Wait()
	for _, s := range got {
		if s != nil && s.CoilZ[0] != want.CoilZ[0] {
			t.Errorf("concurrent solve Z %v, serial %v", s.CoilZ[0], want.CoilZ[0])
		}
	}
}
