package sparse

import (
	"errors"
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
