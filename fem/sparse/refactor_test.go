package sparse

import (
	"errors"
	"runtime"
	"sync"
	"testing"
)

// TestRefactorInPlace: Refactor on a Factor made at another frequency gives bitwise the factor a fresh Factor
// gives, solves to the dense reference, leaves a failed Factor unusable (Solve panics) and recovers on the next
// good matrix; concurrent factorisations sharing one Symbolic (and its kept scratch) agree bitwise.
func TestRefactorInPlace(t *testing.T) {
	p := newAxi(30, 2)
	a1, xy, _ := p.build()
	p.freq = 50e3
	a2, _, b2 := p.build()
	s, err := Analyze(a1, Options{Coords: xy})
	if err != nil {
		t.Fatal(err)
	}
	f, err := s.Factor(a1)
	if err != nil {
		t.Fatal(err)
	}
	fresh, err := s.Factor(a2)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.Refactor(a2); err != nil {
		t.Fatal(err)
	}
	for i := range f.lx {
		if f.lx[i] != fresh.lx[i] {
			t.Fatalf("L entry %d: in place %v, fresh %v", i, f.lx[i], fresh.lx[i])
		}
	}
	x := make([]complex128, a2.N)
	if _, err := f.Solve(x, b2); err != nil {
		t.Fatal(err)
	}
	if d := maxRelDiff(x, denseSolve(toDense(a2), b2)); d > 1e-9 {
		t.Errorf("refactored solve differs from dense by %.3g", d)
	}

	// A zero row and column: a SingularError, and Solve refuses the half-made factor.
	bad := *a2
	bad.Val = append([]complex128(nil), a2.Val...)
	for j := 0; j < bad.N; j++ {
		for q := bad.ColPtr[j]; q < bad.ColPtr[j+1]; q++ {
			if j == 7 || int(bad.RowIdx[q]) == 7 {
				bad.Val[q] = 0
			}
		}
	}
	var se *SingularError
	if err := f.Refactor(&bad); !errors.As(err, &se) {
		t.Fatalf("Refactor of a singular matrix: %v, want a *SingularError", err)
	}
	func() {
		defer func() {
			if recover() == nil {
				t.Error("Solve after a failed Refactor did not panic")
			}
		}()
		_, _ = f.Solve(x, b2)
	}()
	if err := f.Refactor(a2); err != nil {
		t.Fatal(err)
	}
	if _, err := f.Solve(x, b2); err != nil {
		t.Fatal(err)
	}

	var wg sync.WaitGroup
	got := make([]*Factor, 4)
	errs := make([]error, len(got))
	for g := range got {
		wg.Add(1)
		go func() {
			defer wg.Done()
			got[g], errs[g] = s.factor(a2, 1+g%2)
		}()
	}
	wg.Wait()
	for g, h := range got {
		if errs[g] != nil {
			t.Fatal(errs[g])
		}
		for i := range h.lx {
			if h.lx[i] != fresh.lx[i] {
				t.Fatalf("concurrent factor %d: L entry %d is %v, want %v", g, i, h.lx[i], fresh.lx[i])
			}
		}
	}
}

// The substitutions give bitwise the same solution whether the factor's subtrees run side by side or one after
// another (a system above parallelSolveMin, solved with GOMAXPROCS 2 and then 1), and it solves the system.
// Not parallel: it changes GOMAXPROCS.
func TestSolveSubtreesParallelBitwise(t *testing.T) {
	a, s, f, rhs := factoredAxi(t, 2*parallelSolveMin)
	if a.N < parallelSolveMin || len(s.tasks) < 2 {
		t.Fatalf("test system has %d unknowns (want at least %d) and %d subtree tasks (want 2)", a.N, parallelSolveMin, len(s.tasks))
	}
	old := runtime.GOMAXPROCS(2)
	defer runtime.GOMAXPROCS(old)
	par := make([]complex128, a.N)
	f.Apply(par, rhs)
	runtime.GOMAXPROCS(1)
	seq := make([]complex128, a.N)
	f.Apply(seq, rhs)
	for i := range par {
		if par[i] != seq[i] {
			t.Fatalf("x[%d]: side by side %v, one after another %v", i, par[i], seq[i])
		}
	}
	r := make([]complex128, a.N)
	if res := f.residual(r, par, rhs, normInfVec(rhs)); !(res < 1e-12) {
		t.Errorf("scaled residual %.2g", res)
	}
}

func normInfVec(v []complex128) float64 {
	var m float64
	for _, x := range v {
		m = max(m, cabs(x))
	}
	return m
}
