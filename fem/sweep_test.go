package fem

import (
	"errors"
	"math"
	"math/cmplx"
	"slices"
	"testing"
)

// Sweep must give every point a direct solve's answer (the coil impedance to 1e-8, the field to 1e-7 of its
// peak) while factorising far fewer points than it returns, on two decades of frequency given out of order, for
// a current-driven and a voltage-driven coil (whose current row has no diagonal entry).
func TestSweepMatchesDirect(t *testing.T) {
	for name, drive := range map[string]DriveKind{"current": CurrentDrive, "voltage": VoltageDrive} {
		t.Run(name, func(t *testing.T) {
			p := benchProblem(6000, true)
			p.Coils[0].Drive = drive
			testSweepMatchesDirect(t, p)
		})
	}
}

func testSweepMatchesDirect(t *testing.T, p *Problem) {
	sw, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	direct, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	const n = 40
	freqs := make([]float64, n)
	for i := range freqs {
		freqs[(i*7)%n] = 1e3 * math.Pow(100, float64(i)/(n-1)) // a permutation of 1 kHz .. 100 kHz
	}
	seen := make([]int, n)
	factorised := 0
	var worstZ, worstA, worstInd float64
	err = sw.Sweep(freqs, func(i int, s *Solution) error {
		seen[i]++
		if s.Frequency != freqs[i] {
			t.Errorf("point %d: solved at %g Hz, asked %g Hz", i, s.Frequency, freqs[i])
		}
		if s.Stats.Basis == 0 {
			factorised++
		}
		d, err := direct.SolveAt(freqs[i])
		if err != nil {
			return err
		}
		ez := cmplx.Abs(s.CoilZ[0]-d.CoilZ[0]) / cmplx.Abs(d.CoilZ[0])
		var da, ma float64
		for k := range d.A {
			da = math.Max(da, cmplx.Abs(s.A[k]-d.A[k]))
			ma = math.Max(ma, cmplx.Abs(d.A[k]))
		}
		worstZ, worstA, worstInd = max(worstZ, ez), max(worstA, da/ma), max(worstInd, s.Stats.Indicator)
		if !(ez <= 1e-8) || !(da <= 1e-7*ma) {
			t.Errorf("%g Hz (basis %d, indicator %.2g): Z differs by %.2g, field by %.2g of its peak", freqs[i], s.Stats.Basis, s.Stats.Indicator, ez, da/ma)
		}
		if s.Stats.Basis > 0 && !(s.Stats.Indicator <= SweepTolerance) {
			t.Errorf("%g Hz: accepted with indicator %.2g above the tolerance", freqs[i], s.Stats.Indicator)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range seen {
		if c != 1 {
			t.Errorf("point %d emitted %d times", i, c)
		}
	}
	t.Logf("%d of %d points factorised; worst Z difference %.2g, field %.2g, indicator %.2g", factorised, n, worstZ, worstA, worstInd)
	// Measured: 20 of 40 (16 of them while the basis grows to cover the two decades).
	if factorised > 24 {
		t.Errorf("%d of %d points factorised: the reduced basis should carry the rest", factorised, n)
	}

	// An error from emit stops the sweep and comes back unchanged.
	stop := errors.New("stop")
	calls := 0
	if err := sw.Sweep(freqs, func(int, *Solution) error { calls++; return stop }); !errors.Is(err, stop) || calls != 1 {
		t.Errorf("emit error: got %v after %d calls", err, calls)
	}
	if err := sw.Sweep([]float64{1e3, -5}, func(int, *Solution) error { return nil }); err == nil {
		t.Error("a negative frequency must fail before solving")
	}
}

// The same frequencies give bit-identical answers run after run.
func TestSweepDeterministic(t *testing.T) {
	p := benchProblem(3000, true)
	freqs := []float64{5e3, 20e3, 8e3, 11e3, 14e3, 17e3}
	run := func() []complex128 {
		s, err := NewSolver(p)
		if err != nil {
			t.Fatal(err)
		}
		z := make([]complex128, len(freqs))
		if err := s.Sweep(freqs, func(i int, sol *Solution) error { z[i] = sol.CoilZ[0]; return nil }); err != nil {
			t.Fatal(err)
		}
		return z
	}
	if a, b := run(), run(); !slices.Equal(a, b) {
		t.Errorf("two runs differ: %v and %v", a, b)
	}
}

func TestBisectionOrder(t *testing.T) {
	for _, c := range []struct {
		freqs []float64
		want  []int
	}{
		{nil, []int{}},
		{[]float64{3}, []int{0}},
		{[]float64{2, 1}, []int{1, 0}},
		{[]float64{1, 2, 3, 4, 5, 6, 7, 8, 9}, []int{0, 8, 4, 2, 6, 1, 3, 5, 7}},
		{[]float64{50, 10, 30, 20, 40}, []int{1, 0, 2, 3, 4}},
	} {
		got := bisectionOrder(c.freqs)
		if !slices.Equal(got, c.want) && !(len(got) == 0 && len(c.want) == 0) {
			t.Errorf("%v: %v, want %v", c.freqs, got, c.want)
		}
	}
}

// SolveReduced answers a search's scattered calls as a direct solve would (Z to 1e-8), factorising only a few
// of them, and a material override starts afresh under the new materials.
func TestSolveReduced(t *testing.T) {
	p := benchProblem(6000, true)
	red, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	direct, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	check := func(f float64, ov ...Override) *Solution {
		t.Helper()
		s, err := red.SolveReduced(f, ov...)
		if err != nil {
			t.Fatal(err)
		}
		d, err := direct.SolveAt(f, ov...)
		if err != nil {
			t.Fatal(err)
		}
		if e := cmplx.Abs(s.CoilZ[0]-d.CoilZ[0]) / cmplx.Abs(d.CoilZ[0]); !(e <= 1e-8) {
			t.Errorf("%g Hz (basis %d): Z %v, direct %v (relative difference %.2g)", f, s.Stats.Basis, s.CoilZ[0], d.CoilZ[0], e)
		}
		return s
	}
	// The calls of a bracketing search and its refinement, in the order such a search makes them.
	calls := []float64{10e3, 20e3, 15e3, 17.5e3, 16.2e3, 16.9e3, 16.55e3, 16.7e3, 16.62e3, 16.64e3, 16.63e3, 40e3, 30e3}
	factorised := 0
	for _, f := range calls {
		if check(f).Stats.Basis == 0 {
			factorised++
		}
	}
	t.Logf("%d of %d calls factorised", factorised, len(calls))
	if factorised > 5 {
		t.Errorf("%d of %d calls factorised; the basis should carry most", factorised, len(calls))
	}
	// New materials: the first call factorises under them.
	if s := check(16.63e3, Override{Tag: 1, Sigma: 2e6, MuR: 1}); s.Stats.Basis != 0 {
		t.Errorf("the first solve after an override came from the old basis (size %d)", s.Stats.Basis)
	}
	check(17e3)
	if _, err := red.SolveReduced(0); err == nil {
		t.Error("a zero frequency must fail")
	}
}

// SolveNear and SolveReduced keep different bases on the same solver: switching between them starts afresh and
// both still give the direct answer.
func TestSolveReducedAfterSolveNear(t *testing.T) {
	p := benchProblem(3000, true)
	s, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	direct, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		f       float64
		reduced bool
	}{{10e3, false}, {10.5e3, false}, {10.2e3, true}, {10.4e3, true}, {10.3e3, false}, {10.1e3, true}} {
		var sol *Solution
		if c.reduced {
			sol, err = s.SolveReduced(c.f)
		} else {
			sol, err = s.SolveNear(c.f)
		}
		if err != nil {
			t.Fatal(err)
		}
		d, err := direct.SolveAt(c.f)
		if err != nil {
			t.Fatal(err)
		}
		if e := cmplx.Abs(sol.CoilZ[0]-d.CoilZ[0]) / cmplx.Abs(d.CoilZ[0]); !(e <= 1e-8) {
			t.Errorf("%g Hz (reduced %v): Z differs from the direct solve by %.2g", c.f, c.reduced, e)
		}
	}
}
