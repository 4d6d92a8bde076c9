package sparse

import (
	"fmt"
	"sort"
)

// Matrix is an n×n complex symmetric matrix (A = Aᵀ; nothing is ever conjugated) holding its lower triangle
// (row ≥ col) in compressed sparse column form: the entries of column j are RowIdx[ColPtr[j]:ColPtr[j+1]] with
// values Val[ColPtr[j]:ColPtr[j+1]], rows ascending within each column.
type Matrix struct {
	N      int
	ColPtr []int   // len N+1
	RowIdx []int32 // len nnz, ascending in each column, each ≥ its column
	Val    []complex128
}

// Nnz is the number of stored (lower-triangle) entries.
func (a *Matrix) Nnz() int { return a.ColPtr[a.N] }

// MulVec sets dst = A x using the full symmetric matrix. dst and x must have length N and must not overlap.
func (a *Matrix) MulVec(dst, x []complex128) {
	if len(dst) != a.N || len(x) != a.N {
		panic(fmt.Sprintf("sparse: MulVec lengths %d, %d for N=%d", len(dst), len(x), a.N))
	}
	clear(dst)
	for j := 0; j < a.N; j++ {
		xj := x[j]
		var sj complex128
		rows := a.RowIdx[a.ColPtr[j]:a.ColPtr[j+1]]
		vals := a.Val[a.ColPtr[j]:a.ColPtr[j+1]]
		vals = vals[:len(rows)]
		for p, i := range rows {
			v := vals[p]
			dst[i] += v * xj
			if int(i) != j {
				sj += v * x[i]
			}
		}
		dst[j] += sj
	}
}

// Index returns the position in Val of entry (i, j) or, equivalently, (j, i); -1 if it is not stored.
func (a *Matrix) Index(i, j int) int {
	if i < j {
		i, j = j, i
	}
	if j < 0 || i >= a.N {
		return -1
	}
	lo, hi := a.ColPtr[j], a.ColPtr[j+1]
	k := lo + sort.Search(hi-lo, func(k int) bool { return int(a.RowIdx[lo+k]) >= i })
	if k < hi && int(a.RowIdx[k]) == i {
		return k
	}
	return -1
}

// normInf is ‖A‖∞ of the full symmetric matrix (maximum absolute row sum).
func (a *Matrix) normInf() float64 {
	rs := make([]float64, a.N)
	for j := 0; j < a.N; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			i := int(a.RowIdx[p])
			v := cabs(a.Val[p])
			rs[i] += v
			if i != j {
				rs[j] += v
			}
		}
	}
	m := 0.0
	for _, v := range rs {
		m = max(m, v)
	}
	return m
}

// check reports malformed storage as an error (bad data, not a programming error).
func (a *Matrix) check() error {
	if a == nil {
		return fmt.Errorf("sparse: nil matrix")
	}
	if a.N < 0 || len(a.ColPtr) != a.N+1 || a.ColPtr[0] != 0 {
		return fmt.Errorf("sparse: malformed matrix: N=%d, len(ColPtr)=%d", a.N, len(a.ColPtr))
	}
	nz := a.ColPtr[a.N]
	if len(a.RowIdx) < nz || len(a.Val) < nz {
		return fmt.Errorf("sparse: malformed matrix: nnz %d but %d row indices, %d values", nz, len(a.RowIdx), len(a.Val))
	}
	for j := 0; j < a.N; j++ {
		lo, hi := a.ColPtr[j], a.ColPtr[j+1]
		if hi < lo {
			return fmt.Errorf("sparse: malformed matrix: ColPtr decreases at column %d", j)
		}
		prev := int32(j) - 1
		for p := lo; p < hi; p++ {
			i := a.RowIdx[p]
			if i <= prev || int(i) >= a.N {
				return fmt.Errorf("sparse: malformed matrix: column %d row %d is not in the lower triangle or not ascending", j, i)
			}
			prev = i
		}
	}
	return nil
}

// Triplet is an assembly list of (row, col, value) entries of a complex symmetric matrix. Entries may be given in
// either triangle; they are stored as lower-triangle entries and duplicates are summed by Compile.
type Triplet struct {
	n   int
	row []int32
	col []int32
	val []complex128
}

// NewTriplet returns an empty n×n assembly list with room for capacity entries.
func NewTriplet(n, capacity int) *Triplet {
	if n < 0 || n > 1<<31-1 {
		panic(fmt.Sprintf("sparse: NewTriplet size %d", n))
	}
	return &Triplet{n: n, row: make([]int32, 0, capacity), col: make([]int32, 0, capacity), val: make([]complex128, 0, capacity)}
}

// Add appends entry (i, j) = v (the same as (j, i) = v). It panics if i or j is out of range.
func (t *Triplet) Add(i, j int, v complex128) {
	if uint(i) >= uint(t.n) || uint(j) >= uint(t.n) {
		panic(fmt.Sprintf("sparse: Triplet.Add(%d, %d) out of range for n=%d", i, j, t.n))
	}
	if i < j {
		i, j = j, i
	}
	t.row = append(t.row, int32(i))
	t.col = append(t.col, int32(j))
	t.val = append(t.val, v)
}

// Len is the number of Add calls so far.
func (t *Triplet) Len() int { return len(t.val) }

// Compile returns the lower-triangle CSC matrix with duplicates summed, and a map with map[k] = position in Val
// of the k-th Add, so that re-assembling with the same Add sequence is a scatter: Val[map[k]] += v_k.
func (t *Triplet) Compile() (*Matrix, []int) {
	n, nz := t.n, len(t.val)
	// Two stable counting sorts (by row, then by column) give (col, row) order.
	next := make([]int, n+1)
	for _, r := range t.row {
		next[r+1]++
	}
	for i := 0; i < n; i++ {
		next[i+1] += next[i]
	}
	byRow := make([]int32, nz)
	for k, r := range t.row {
		byRow[next[r]] = int32(k)
		next[r]++
	}
	clear(next)
	for _, c := range t.col {
		next[c+1]++
	}
	for i := 0; i < n; i++ {
		next[i+1] += next[i]
	}
	byCol := make([]int32, nz)
	for _, k := range byRow {
		c := t.col[k]
		byCol[next[c]] = k
		next[c]++
	}
	byRow = nil
	// Count the distinct entries first so that RowIdx and Val are allocated once at their final size.
	distinct := 0
	lr, lc := int32(-1), int32(-1)
	for _, k := range byCol {
		if r, c := t.row[k], t.col[k]; r != lr || c != lc {
			distinct++
			lr, lc = r, c
		}
	}
	a := &Matrix{N: n, ColPtr: make([]int, n+1), RowIdx: make([]int32, 0, distinct), Val: make([]complex128, 0, distinct)}
	pos := make([]int, nz)
	last := -1
	lr, lc = -1, -1
	for _, k := range byCol {
		r, c := t.row[k], t.col[k]
		if r != lr || c != lc {
			last++
			a.RowIdx = append(a.RowIdx, r)
			a.Val = append(a.Val, 0)
			a.ColPtr[c+1]++
			lr, lc = r, c
		}
		a.Val[last] += t.val[k]
		pos[k] = last
	}
	for j := 0; j < n; j++ {
		a.ColPtr[j+1] += a.ColPtr[j]
	}
	return a, pos
}
