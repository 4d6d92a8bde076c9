package sparse

import (
	"testing"
)

// TestParallelFactorMatchesSerial: the factor must not depend on the number of goroutines (bitwise), and the
// subtree split must be a valid one: disjoint contiguous ranges closed under descendants, roots feeding the top
// part, and more than one task on a system big enough to split.
func TestParallelFactorMatchesSerial(t *testing.T) {
	for _, side := range []int{12, 60, 140} {
		a, xy, b := newAxi(side, 2).build()
		s, err := Analyze(a, Options{Coords: xy})
		if err != nil {
			t.Fatal(err)
		}
		ns := len(s.first) - 1
		seen := make([]bool, ns)
		for ti, tk := range s.tasks {
			lo, hi := int(tk[0]), int(tk[1])
			for sn := lo; sn <= hi; sn++ {
				if seen[sn] || s.taskOf[sn] != int32(ti) {
					t.Fatalf("side %d: supernode %d in two tasks or mislabelled", side, sn)
				}
				seen[sn] = true
				if p := int(s.parent[sn]); sn < hi && (p < lo || p > hi) {
					t.Fatalf("side %d: task %d [%d,%d] not closed: parent of %d is %d", side, ti, lo, hi, sn, p)
				}
			}
			if p := s.parent[hi]; p >= 0 && s.taskOf[p] >= 0 {
				t.Fatalf("side %d: task root %d feeds another task", side, hi)
			}
		}
		for sn := 0; sn < ns; sn++ {
			if !seen[sn] && s.taskOf[sn] != -1 {
				t.Fatalf("side %d: supernode %d labelled with a task it is not in", side, sn)
			}
		}
		if side == 140 && len(s.tasks) < 4 {
			t.Errorf("side %d: only %d tasks", side, len(s.tasks))
		}
		ref, err := s.factor(a, 1)
		if err != nil {
			t.Fatal(err)
		}
		for _, procs := range []int{2, 3, 8} {
			f, err := s.factor(a, procs)
			if err != nil {
				t.Fatal(err)
			}
			for i := range f.lx {
				if f.lx[i] != ref.lx[i] {
					t.Fatalf("side %d procs %d: L entry %d is %v, serial %v", side, procs, i, f.lx[i], ref.lx[i])
				}
			}
			x := make([]complex128, a.N)
			info, err := f.Solve(x, b)
			if err != nil || info.Residual > 1e-13 {
				t.Errorf("side %d procs %d: residual %.3g, %v", side, procs, info.Residual, err)
			}
		}
	}
}

// TestRankUpdateSplit: the column split of a large dense update gives the same result as one goroutine.
func TestRankUpdateSplit(t *testing.T) {
	const m, k = 700, 40
	L := make([]complex128, m*k)
	for i := range L {
		L[i] = complex(float64(i%13)-6, float64(i%7)*0.5)
	}
	m2 := m - k
	cb1 := make([]complex128, m2*(m2+1)/2)
	W := make([]complex128, panelWidth*(m-panelWidth))
	for i := range W {
		W[i] = complex(float64(i%5)*0.25, -float64(i%3))
	}
	L2 := append([]complex128(nil), L...)
	cb2 := append([]complex128(nil), cb1...)
	rankUpdate(L, m, k, 0, panelWidth, W, cb1, 1)
	rankUpdate(L2, m, k, 0, panelWidth, W, cb2, 3)
	for i := range L {
		if L[i] != L2[i] {
			t.Fatalf("panel entry %d differs", i)
		}
	}
	nonzero := 0
	for i := range cb1 {
		if cb1[i] != cb2[i] {
			t.Fatalf("update entry %d differs", i)
		}
		if cb1[i] != 0 {
			nonzero++
		}
	}
	if nonzero != len(cb1) {
		t.Errorf("%d of %d update entries untouched", len(cb1)-nonzero, len(cb1))
	}
}
