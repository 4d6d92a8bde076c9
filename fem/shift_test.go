package fem

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// SolveNear must give a direct solve's answer: the coil impedance to 1e-9 and the field to 1e-8 of its peak, at
// points next to the anchor (iterative), farther off (iterative with more steps, or a fresh anchor) and far away
// (where it must fall back to a factorisation rather than return a poor answer).
func TestSolveNearMatchesDirect(t *testing.T) {
	p := benchProblem(6000, true)
	near, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	direct, err := NewSolver(p)
	if err != nil {
		t.Fatal(err)
	}
	iterative := 0
	for _, c := range []struct {
		f    float64
		name string
	}{
		{10e3, "anchor"}, {10.6e3, "next"}, {11.3e3, "two up"}, {9.4e3, "below"}, {8.9e3, "two below"},
		{13e3, "30 % up"}, {12e3, "between"}, {400e3, "far"}, {390e3, "next to the new anchor"}, {1e3, "far below"},
	} {
		s, err := near.SolveNear(c.f)
		if err != nil {
			t.Fatalf("%s (%g Hz): %v", c.name, c.f, err)
		}
		d, err := direct.SolveAt(c.f)
		if err != nil {
			t.Fatal(err)
		}
		if s.Stats.Iterations > 0 {
			iterative++
		}
		if e := cmplx.Abs(s.CoilZ[0]-d.CoilZ[0]) / cmplx.Abs(d.CoilZ[0]); !(e <= 1e-9) {
			t.Errorf("%s (%g Hz, %d iterations): Z %v, direct %v (relative difference %.2g)", c.name, c.f, s.Stats.Iterations, s.CoilZ[0], d.CoilZ[0], e)
		}
		var da, ma float64
		for i := range d.A {
			da = math.Max(da, cmplx.Abs(s.A[i]-d.A[i]))
			ma = math.Max(ma, cmplx.Abs(d.A[i]))
		}
		if !(da <= 1e-8*ma) {
			t.Errorf("%s (%g Hz, %d iterations): field differs by %.2g of its peak", c.name, c.f, s.Stats.Iterations, da/ma)
		}
		if s.Stats.Iterations == 0 && near.AnchorFrequency() != c.f {
			t.Errorf("%s (%g Hz): a direct solve must become the anchor, anchor at %g Hz", c.name, c.f, near.AnchorFrequency())
		}
		t.Logf("%-22s %8g Hz: %2d iterations, anchor %g Hz", c.name, c.f, s.Stats.Iterations, near.AnchorFrequency())
	}
	if iterative < 4 {
		t.Errorf("only %d points were solved iteratively; the neighbours of an anchor should be", iterative)
	}
	// After ResetNear the next solve is a direct one at its own frequency.
	near.ResetNear()
	if near.AnchorFrequency() != 0 {
		t.Error("ResetNear must drop the anchor")
	}
	s, err := near.SolveNear(10.6e3)
	if err != nil {
		t.Fatal(err)
	}
	if s.Stats.Iterations != 0 || near.AnchorFrequency() != 10.6e3 {
		t.Errorf("after ResetNear: %d iterations, anchor %g Hz", s.Stats.Iterations, near.AnchorFrequency())
	}
	// New materials invalidate the anchor.
	if _, err := near.SolveAt(10e3, Override{Tag: 1, Sigma: 2e6}); err != nil {
		t.Fatal(err)
	}
	if near.AnchorFrequency() != 0 {
		t.Error("a material override must drop SolveNear's anchor")
	}
	if _, err := near.SolveNear(-1); err == nil {
		t.Error("a negative frequency must fail")
	}
}

// The same sequence of calls gives bit-identical answers (the sweep's results must not depend on scheduling).
func TestSolveNearDeterministic(t *testing.T) {
	p := benchProblem(3000, true)
	var first []complex128
	for range 2 {
		s, err := NewSolver(p)
		if err != nil {
			t.Fatal(err)
		}
		var got []complex128
		for _, f := range []float64{20e3, 21e3, 22e3, 19e3} {
			sol, err := s.SolveNear(f)
			if err != nil {
				t.Fatal(err)
			}
			got = append(got, sol.CoilZ[0])
		}
		if first == nil {
			first = got
			continue
		}
		for i := range got {
			if got[i] != first[i] {
				t.Errorf("call %d: %v then %v", i, first[i], got[i])
			}
		}
	}
}

// BenchmarkSolveNear compares a direct solve (factorisation each time) with an iterative one next to an anchor.
func BenchmarkSolveNear(b *testing.B) {
	for _, n := range []int{5000, 20000} {
		p := benchProblem(n, true)
		b.Run(fmt.Sprintf("nodes=%d/direct", n), func(b *testing.B) {
			s, err := NewSolver(p)
			if err != nil {
				b.Fatal(err)
			}
			b.ReportAllocs()
			for b.Loop() {
				if _, err := s.SolveAt(10.6e3); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(fmt.Sprintf("nodes=%d/near", n), func(b *testing.B) {
			s, err := NewSolver(p)
			if err != nil {
				b.Fatal(err)
			}
			b.ReportAllocs()
			its := 0
			for i := 0; i < b.N; i++ {
				// a fresh anchor each time, so that the timed solve starts from the anchor's solution alone
				b.StopTimer()
				s.ResetNear()
				if _, err := s.SolveNear(10e3); err != nil {
					b.Fatal(err)
				}
				b.StartTimer()
				sol, err := s.SolveNear(10.6e3)
				if err != nil {
					b.Fatal(err)
				}
				its = sol.Stats.Iterations
			}
			b.ReportMetric(float64(its), "iterations")
		})
	}
}
