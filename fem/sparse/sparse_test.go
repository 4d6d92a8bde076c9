package sparse

import (
	"bytes"
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

// denseSolve solves M x = b by Gaussian elimination with partial pivoting: the independent reference.
func denseSolve(m [][]complex128, b []complex128) []complex128 {
	n := len(b)
	a := make([][]complex128, n)
	for i := range a {
		a[i] = append(append([]complex128(nil), m[i]...), b[i])
	}
	for k := 0; k < n; k++ {
		p := k
		for i := k + 1; i < n; i++ {
			if cmplx.Abs(a[i][k]) > cmplx.Abs(a[p][k]) {
				p = i
			}
		}
		a[k], a[p] = a[p], a[k]
		for i := k + 1; i < n; i++ {
			f := a[i][k] / a[k][k]
			for j := k; j <= n; j++ {
				a[i][j] -= f * a[k][j]
			}
		}
	}
	x := make([]complex128, n)
	for i := n - 1; i >= 0; i-- {
		s := a[i][n]
		for j := i + 1; j < n; j++ {
			s -= a[i][j] * x[j]
		}
		x[i] = s / a[i][i]
	}
	return x
}

func toDense(a *Matrix) [][]complex128 {
	d := make([][]complex128, a.N)
	for i := range d {
		d[i] = make([]complex128, a.N)
	}
	for j := 0; j < a.N; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			i := a.RowIdx[p]
			d[i][j] = a.Val[p]
			d[j][i] = a.Val[p]
		}
	}
	return d
}

// randomSym returns a random sparse complex symmetric matrix whose real part is diagonally dominant (as in
// K + jωM with K positive definite), with optional dense border rows at the end.
func randomSym(rng *rand.Rand, n, perRow, border int) *Matrix {
	t := NewTriplet(n, n*(perRow+1))
	diag := make([]float64, n)
	for i := 0; i < n-border; i++ {
		for k := 0; k < perRow; k++ {
			j := rng.IntN(n - border)
			if j == i {
				continue
			}
			v := complex(rng.Float64()-0.5, rng.Float64()-0.5)
			t.Add(i, j, v)
			diag[i] += cmplx.Abs(v)
			diag[j] += cmplx.Abs(v)
		}
	}
	for b := n - border; b < n; b++ {
		for i := 0; i < n-border; i += 1 + rng.IntN(3) {
			v := complex(rng.Float64()-0.5, 0)
			t.Add(b, i, v)
			diag[i] += math.Abs(real(v))
		}
		diag[b] = 1
		t.Add(b, b, complex(0, -float64(n))) // like G/(jω): imaginary, so no cancellation with the Schur term
	}
	for i := 0; i < n-border; i++ {
		t.Add(i, i, complex(diag[i]+0.1, rng.Float64()))
	}
	a, _ := t.Compile()
	return a
}

func randVec(rng *rand.Rand, n int) []complex128 {
	b := make([]complex128, n)
	for i := range b {
		b[i] = complex(rng.NormFloat64(), rng.NormFloat64())
	}
	return b
}

func maxRelDiff(x, y []complex128) float64 {
	var d, s float64
	for i := range x {
		d = max(d, cmplx.Abs(x[i]-y[i]))
		s = max(s, cmplx.Abs(y[i]))
	}
	return d / s
}

var allOrderings = []Ordering{OrderAuto, OrderNestedDissection, OrderMinimumDegree, OrderNatural}

func TestRandomAgainstDense(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	cases := []struct{ n, perRow, border int }{
		{1, 0, 0}, {2, 1, 0}, {7, 2, 0}, {40, 3, 0}, {120, 4, 0}, {300, 3, 0}, {150, 3, 2}, {400, 5, 3},
	}
	for _, c := range cases {
		a := randomSym(rng, c.n, c.perRow, c.border)
		b := randVec(rng, c.n)
		ref := denseSolve(toDense(a), b)
		for _, o := range allOrderings {
			x, info, err := Solve(a, b, Options{Ordering: o})
			if err != nil {
				t.Fatalf("n=%d %v: %v", c.n, o, err)
			}
			if d := maxRelDiff(x, ref); d > 1e-10 {
				t.Errorf("n=%d border=%d %v: differs from dense reference by %.3g", c.n, c.border, o, d)
			}
			if info.Residual > 1e-13 {
				t.Errorf("n=%d %v: residual %.3g", c.n, o, info.Residual)
			}
		}
	}
}

// TestReconstruction checks P A Pᵀ = L D Lᵀ entry by entry from the supernodal storage.
func TestReconstruction(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{5, 60, 250} {
		a := randomSym(rng, n, 4, 1)
		for _, o := range allOrderings {
			s, err := Analyze(a, Options{Ordering: o})
			if err != nil {
				t.Fatal(err)
			}
			f, err := s.Factor(a)
			if err != nil {
				t.Fatal(err)
			}
			L := make([][]complex128, n)
			for i := range L {
				L[i] = make([]complex128, n)
			}
			d := make([]complex128, n)
			for sn := 0; sn+1 < len(s.first); sn++ {
				rows := s.rows[s.rowPtr[sn]:s.rowPtr[sn+1]]
				m := len(rows)
				blk := s.block(f.lx, sn)
				for j := 0; j < int(s.first[sn+1]-s.first[sn]); j++ {
					col := int(s.first[sn]) + j
					d[col] = blk[j*m+j]
					L[col][col] = 1
					for i := j + 1; i < m; i++ {
						L[rows[i]][col] = blk[j*m+i]
					}
				}
			}
			ad := toDense(a)
			var worst, scale float64
			for i := 0; i < n; i++ {
				for j := 0; j <= i; j++ {
					var sum complex128
					for k := 0; k <= j; k++ {
						sum += L[i][k] * d[k] * L[j][k]
					}
					want := ad[s.perm[i]][s.perm[j]]
					worst = max(worst, cmplx.Abs(sum-want))
					scale = max(scale, cmplx.Abs(want))
				}
			}
			if worst > 1e-12*scale {
				t.Errorf("n=%d %v: |PAPᵀ − LDLᵀ| = %.3g (scale %.3g)", n, o, worst, scale)
			}
		}
	}
}

func TestTripletCompile(t *testing.T) {
	tr := NewTriplet(4, 0)
	adds := []struct {
		i, j int
		v    complex128
	}{{0, 0, 1}, {2, 0, 2i}, {0, 2, 3}, {3, 3, 4}, {1, 1, 5}, {3, 1, 6}, {2, 0, 1}}
	for _, e := range adds {
		tr.Add(e.i, e.j, e.v)
	}
	if tr.Len() != len(adds) {
		t.Fatalf("Len = %d", tr.Len())
	}
	a, pos := tr.Compile()
	if a.Nnz() != 5 {
		t.Fatalf("nnz = %d, want 5", a.Nnz())
	}
	if q := a.Index(0, 2); q < 0 || a.Val[q] != 4+2i {
		t.Errorf("(2,0) summed = %v", a.Val[q])
	}
	for k, e := range adds {
		if pos[k] != a.Index(e.i, e.j) {
			t.Errorf("map[%d] = %d, want %d", k, pos[k], a.Index(e.i, e.j))
		}
	}
	if a.Index(1, 0) != -1 || a.Index(3, 2) != -1 {
		t.Error("absent entries found")
	}
	// MulVec against the dense product
	x := []complex128{1, 2i, -1, 3}
	y := make([]complex128, 4)
	a.MulVec(y, x)
	d := toDense(a)
	for i := range y {
		var s complex128
		for j := range x {
			s += d[i][j] * x[j]
		}
		if cmplx.Abs(s-y[i]) > 1e-14 {
			t.Errorf("MulVec row %d: %v want %v", i, y[i], s)
		}
	}
}

func TestAxisymmetricGrid(t *testing.T) {
	p := newAxi(32, 2)
	a, xy, b := p.build()
	ref := denseSolve(toDense(a), b)
	for _, o := range allOrderings {
		opt := Options{Ordering: o, Coords: xy}
		x, info, err := Solve(a, b, opt)
		if err != nil {
			t.Fatalf("%v: %v", o, err)
		}
		if d := maxRelDiff(x, ref); d > 1e-9 {
			t.Errorf("%v: differs from dense reference by %.3g", o, d)
		}
		if info.Residual > 1e-13 {
			t.Errorf("%v: residual %.3g", o, info.Residual)
		}
		// graph-only ordering on the same matrix
		if o == OrderNestedDissection {
			x2, _, err := Solve(a, b, Options{Ordering: o})
			if err != nil {
				t.Fatal(err)
			}
			if d := maxRelDiff(x2, ref); d > 1e-9 {
				t.Errorf("graph ND: differs by %.3g", d)
			}
		}
	}
}

// TestFillQuality checks that the orderings reduce fill on a 2D grid: nested dissection on an m×m 5-point-like
// grid has O(m² log m) fill while the natural (banded) order has about m³.
func TestFillQuality(t *testing.T) {
	a, xy, _ := newAxi(82, 0).build() // 80×80 unknowns
	nat, _ := Analyze(a, Options{Ordering: OrderNatural})
	for _, c := range []struct {
		name string
		opt  Options
	}{
		{"coordND", Options{Coords: xy}},
		{"graphND", Options{}},
		{"mindeg", Options{Ordering: OrderMinimumDegree}},
	} {
		s, err := Analyze(a, c.opt)
		if err != nil {
			t.Fatal(err)
		}
		ratio := float64(s.Stats().NnzL) / float64(nat.Stats().NnzL)
		t.Logf("%s: nnz(L) %d vs natural %d (%.2f), flops %.3g", c.name, s.Stats().NnzL, nat.Stats().NnzL, ratio, s.Stats().Flops)
		if ratio > 0.6 {
			t.Errorf("%s: nnz(L) is %.2f of the banded natural order; expected a clear reduction", c.name, ratio)
		}
	}
}

func TestSingular(t *testing.T) {
	// A zero row/column in the middle: no coupling, zero diagonal.
	tr := NewTriplet(4, 0)
	tr.Add(0, 0, 2)
	tr.Add(1, 0, 1)
	tr.Add(1, 1, 3)
	tr.Add(3, 3, 1)
	a, _ := tr.Compile()
	for _, o := range allOrderings {
		_, _, err := Solve(a, []complex128{1, 1, 1, 1}, Options{Ordering: o})
		var se *SingularError
		if !errors.As(err, &se) {
			t.Fatalf("%v: want SingularError, got %v", o, err)
		}
		if se.Column != 2 {
			t.Errorf("%v: singular column %d, want 2", o, se.Column)
		}
		if !strings.Contains(err.Error(), "floating region") {
			t.Errorf("message lacks the likely cause: %v", err)
		}
	}
	// Exactly singular 2×2 with coupling: [[1,1],[1,1]].
	tr = NewTriplet(2, 0)
	tr.Add(0, 0, 1)
	tr.Add(1, 0, 1)
	tr.Add(1, 1, 1)
	a, _ = tr.Compile()
	if _, _, err := Solve(a, []complex128{1, 2}, Options{}); !errors.As(err, new(*SingularError)) {
		t.Errorf("rank-deficient: want SingularError, got %v", err)
	}
	// NaN in the matrix names its row.
	tr = NewTriplet(3, 0)
	tr.Add(0, 0, 1)
	tr.Add(1, 1, 1)
	tr.Add(2, 1, complex(math.NaN(), 0))
	tr.Add(2, 2, 1)
	a, _ = tr.Compile()
	_, _, err := Solve(a, []complex128{1, 1, 1}, Options{})
	var ne *NonFiniteError
	if !errors.As(err, &ne) || ne.Row != 2 || ne.Column != 1 {
		t.Errorf("NaN entry: got %v", err)
	}
	// Inf in the right-hand side.
	tr = NewTriplet(1, 0)
	tr.Add(0, 0, 1)
	a, _ = tr.Compile()
	_, _, err = Solve(a, []complex128{complex(math.Inf(1), 0)}, Options{})
	if !errors.As(err, &ne) || ne.Row != 0 || ne.Column != -1 {
		t.Errorf("Inf rhs: got %v", err)
	}
}

func TestMatrixMarketRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	a := randomSym(rng, 50, 3, 1)
	var buf bytes.Buffer
	if err := WriteMatrixMarket(&buf, a); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(buf.String(), "%%MatrixMarket matrix coordinate complex symmetric\n") {
		t.Fatalf("banner: %q", buf.String()[:60])
	}
	b, err := ReadMatrixMarket(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if b.N != a.N || b.Nnz() != a.Nnz() {
		t.Fatalf("size %d/%d vs %d/%d", b.N, b.Nnz(), a.N, a.Nnz())
	}
	for k := range a.Val {
		if a.Val[k] != b.Val[k] || a.RowIdx[k] != b.RowIdx[k] {
			t.Fatalf("entry %d differs", k)
		}
	}
	v := randVec(rng, 17)
	buf.Reset()
	if err := WriteVector(&buf, v); err != nil {
		t.Fatal(err)
	}
	w, err := ReadVector(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if maxRelDiff(w, v) != 0 {
		t.Error("vector round trip not exact")
	}
}

func TestMatrixMarketGeneral(t *testing.T) {
	sym := "%%MatrixMarket matrix coordinate real general\n% comment\n3 3 5\n1 1 4\n2 1 -1\n1 2 -1\n2 2 4\n3 3 2\n"
	a, err := ReadMatrixMarket(strings.NewReader(sym))
	if err != nil {
		t.Fatal(err)
	}
	if a.Nnz() != 4 || a.Val[a.Index(0, 1)] != -1 {
		t.Errorf("general symmetric read: nnz %d", a.Nnz())
	}
	bad := "%%MatrixMarket matrix coordinate complex general\n2 2 3\n1 1 1 0\n2 1 1 1\n1 2 1 -1\n"
	if _, err := ReadMatrixMarket(strings.NewReader(bad)); err == nil {
		t.Error("Hermitian-not-symmetric general matrix accepted")
	}
	for _, s := range []string{
		"%%MatrixMarket matrix coordinate complex hermitian\n1 1 1\n1 1 1 0\n",
		"%%MatrixMarket matrix coordinate real symmetric\n2 2 2\n1 1 1\n",
		"%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n3 1 1\n",
		"garbage\n",
	} {
		if _, err := ReadMatrixMarket(strings.NewReader(s)); err == nil {
			t.Errorf("accepted %q", s)
		}
	}
}

func FuzzReadMatrixMarket(f *testing.F) {
	f.Add("%%MatrixMarket matrix coordinate complex symmetric\n2 2 2\n1 1 1 0\n2 1 0.5 1\n")
	f.Add("%%MatrixMarket matrix coordinate real general\n2 2 2\n1 2 1\n2 1 1\n")
	f.Fuzz(func(t *testing.T, s string) {
		a, err := ReadMatrixMarket(strings.NewReader(s))
		if err != nil {
			return
		}
		if err := a.check(); err != nil {
			t.Fatalf("accepted malformed matrix: %v", err)
		}
	})
}

// TestRefinement: on a badly scaled system the plain solve leaves a residual that refinement reduces.
func TestRefinement(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	n := 300
	a := randomSym(rng, n, 4, 0)
	// Weak diagonals make the unpivoted LDLᵀ grow its entries, so one solve leaves a residual above roundoff.
	for j := 0; j < n; j++ {
		a.Val[a.ColPtr[j]] = complex(0.02*rng.NormFloat64(), 0.02*rng.NormFloat64())
	}
	b := randVec(rng, n)
	s, err := Analyze(a, Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, err := s.Factor(a)
	if err != nil {
		t.Fatal(err)
	}
	x0 := make([]complex128, n)
	f.solveOnce(x0, b)
	r := make([]complex128, n)
	var nb float64
	for _, v := range b {
		nb = max(nb, cmplx.Abs(v))
	}
	res0 := f.residual(r, x0, b, nb)
	x := make([]complex128, n)
	info, err := f.Solve(x, b)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("unrefined %.3g, refined %.3g after %d steps", res0, info.Residual, info.Refinements)
	if res0 <= targetResidual {
		t.Fatalf("test setup: unrefined residual %.3g already at target", res0)
	}
	if info.Refinements == 0 || !(info.Residual < res0) {
		t.Errorf("refinement did not reduce the residual: %.3g → %.3g", res0, info.Residual)
	}
}

// TestSymbolicReuse re-factors at a new frequency with the same analysis and compares with a fresh solve.
func TestSymbolicReuse(t *testing.T) {
	p := newAxi(30, 1)
	a1, xy, b1 := p.build()
	p.freq = 50e3
	a2, _, b2 := p.build()
	s, err := Analyze(a1, Options{Coords: xy})
	if err != nil {
		t.Fatal(err)
	}
	f1, err := s.Factor(a1)
	if err != nil {
		t.Fatal(err)
	}
	f2, err := s.Factor(a2)
	if err != nil {
		t.Fatal(err)
	}
	x1 := make([]complex128, a1.N)
	x2 := make([]complex128, a1.N)
	if _, err := f1.Solve(x1, b1); err != nil {
		t.Fatal(err)
	}
	if _, err := f2.Solve(x2, b2); err != nil {
		t.Fatal(err)
	}
	ref2 := denseSolve(toDense(a2), b2)
	if d := maxRelDiff(x2, ref2); d > 1e-9 {
		t.Errorf("reused symbolic: differs from dense by %.3g", d)
	}
	if maxRelDiff(x1, x2) < 1e-3 {
		t.Error("solutions at 10 kHz and 50 kHz coincide: values were not refreshed")
	}
	// a different pattern is refused
	a3 := randomSym(rand.New(rand.NewPCG(1, 1)), a1.N, 3, 0)
	if _, err := s.Factor(a3); err == nil {
		t.Error("Factor accepted a different pattern")
	}
}

// TestDenseRowsLast: graph-only orderings must hold dense border rows (here coupled to every other grid node)
// back to the end, or the separators short-circuit and fill explodes; allowed growth is the dense columns
// themselves (≤ 2N entries) plus 10 % of the bare grid's factor.
func TestDenseRowsLast(t *testing.T) {
	a0, _, _ := newAxi(82, 0).build()
	n0 := a0.N
	tr := NewTriplet(n0+2, a0.Nnz()+n0+2)
	for j := 0; j < n0; j++ {
		for p := a0.ColPtr[j]; p < a0.ColPtr[j+1]; p++ {
			tr.Add(int(a0.RowIdx[p]), j, a0.Val[p])
		}
	}
	for k := 0; k < 2; k++ {
		for i := k; i < n0; i += 2 {
			tr.Add(n0+k, i, 1e-3)
		}
		tr.Add(n0+k, n0+k, -1e6i)
	}
	a, _ := tr.Compile()
	for _, o := range []Ordering{OrderNestedDissection, OrderMinimumDegree} {
		s, err := Analyze(a, Options{Ordering: o})
		if err != nil {
			t.Fatal(err)
		}
		s0, err := Analyze(a0, Options{Ordering: o})
		if err != nil {
			t.Fatal(err)
		}
		grow := s.Stats().NnzL - s0.Stats().NnzL
		t.Logf("%v: nnz(L) %d with border, %d without", o, s.Stats().NnzL, s0.Stats().NnzL)
		if grow > 2*int64(a.N)+s0.Stats().NnzL/10 {
			t.Errorf("%v: border rows added %d entries to L", o, grow)
		}
	}
}

// Apply is one unrefined substitution: on well-conditioned systems it matches the dense solution closely, and
// aliasing x and b gives the same answer.
func TestApply(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 9))
	for _, c := range []struct{ n, perRow, border int }{{50, 3, 0}, {300, 4, 2}} {
		a := randomSym(rng, c.n, c.perRow, c.border)
		b := randVec(rng, c.n)
		ref := denseSolve(toDense(a), b)
		s, err := Analyze(a, Options{})
		if err != nil {
			t.Fatal(err)
		}
		f, err := s.Factor(a)
		if err != nil {
			t.Fatal(err)
		}
		x := make([]complex128, c.n)
		f.Apply(x, b)
		if d := maxRelDiff(x, ref); d > 1e-9 {
			t.Errorf("n=%d: Apply differs from the dense solution by %.3g", c.n, d)
		}
		y := slices.Clone(b)
		f.Apply(y, y)
		if !slices.Equal(x, y) {
			t.Errorf("n=%d: Apply in place differs from Apply into a new vector", c.n)
		}
	}
}

// Solve may overwrite its right-hand side with the solution (x aliasing b) and still refines against the
// original right-hand side.
func TestSolveInPlace(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	a := randomSym(rng, 200, 4, 2)
	b := randVec(rng, 200)
	ref := denseSolve(toDense(a), b)
	s, err := Analyze(a, Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, err := s.Factor(a)
	if err != nil {
		t.Fatal(err)
	}
	x := slices.Clone(b)
	info, err := f.Solve(x, x)
	if err != nil {
		t.Fatal(err)
	}
	if d := maxRelDiff(x, ref); d > 1e-10 || info.Residual > 1e-13 {
		t.Errorf("in-place solve: differs from the dense solution by %.3g, residual %.3g", d, info.Residual)
	}
}
