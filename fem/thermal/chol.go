package thermal

import (
	"fmt"
	"math"

	"eddyrz/fem/sparse"
)

// cholesky is a sparse Cholesky factor P A Pᵀ = L Lᵀ of a real symmetric positive definite csr matrix, on a
// fill-reducing permutation P (nested dissection on the node coordinates, from fem/sparse's analysis). The
// pattern work (ordering, elimination tree, column counts) is done once per csr pattern; factor then costs only
// the numeric elimination, so a Newton matrix can be refactored whenever it has moved far enough that the old
// factor no longer preconditions it well.
type cholesky struct {
	n      int
	perm   []int32 // perm[k] = csr row of pivot k
	iperm  []int32 // iperm[perm[k]] = k
	parent []int32 // elimination tree of P A Pᵀ, −1 at roots
	// Upper part of each permuted column k of P A Pᵀ (pivots j < k), as pivot numbers and csr value positions;
	// adiag[k] is the csr position of the diagonal.
	uPtr  []int32
	uRow  []int32
	uPos  []int32
	adiag []int32
	// L by columns: column j holds L_jj at lPtr[j] and the entries below it in increasing row order.
	lPtr []int32
	lRow []int32
	lx   []float64
	ok   bool // the numeric factor is valid
	// scratch
	x     []float64
	next  []int32 // next free slot of each column during factor
	mark  []int32
	stack []int32
	path  []int32
	y     []float64
}

// newCholesky analyses the pattern of a; coords are the positions of its rows (m), for the ordering.
func newCholesky(a *csr, coords [][2]float64) (*cholesky, error) {
	n := a.n
	// The lower triangle in compressed columns: by symmetry, row j's entries at or right of the diagonal.
	lower := &sparse.Matrix{N: n, ColPtr: make([]int, n+1)}
	for j := 0; j < n; j++ {
		for p := a.diag[j]; p < a.rowPtr[j+1]; p++ {
			lower.RowIdx = append(lower.RowIdx, a.col[p])
		}
		lower.ColPtr[j+1] = len(lower.RowIdx)
	}
	lower.Val = make([]complex128, len(lower.RowIdx))
	sym, err := sparse.Analyze(lower, sparse.Options{Coords: coords})
	if err != nil {
		return nil, fmt.Errorf("thermal: ordering the heat-conduction matrix: %w", err)
	}
	c := &cholesky{n: n, perm: make([]int32, n), iperm: make([]int32, n)}
	for k, v := range sym.Perm() {
		c.perm[k], c.iperm[v] = int32(v), int32(k)
	}
	// Upper pattern of each permuted column.
	c.uPtr = make([]int32, n+1)
	c.adiag = make([]int32, n)
	for k := 0; k < n; k++ {
		i := c.perm[k]
		c.adiag[k] = a.diag[i]
		for p := a.rowPtr[i]; p < a.rowPtr[i+1]; p++ {
			if j := c.iperm[a.col[p]]; j < int32(k) {
				c.uRow = append(c.uRow, j)
				c.uPos = append(c.uPos, p)
			}
		}
		c.uPtr[k+1] = int32(len(c.uRow))
	}
	// Elimination tree (Liu's algorithm with path compression).
	c.parent = make([]int32, n)
	anc := make([]int32, n)
	for k := 0; k < n; k++ {
		c.parent[k], anc[k] = -1, -1
		for p := c.uPtr[k]; p < c.uPtr[k+1]; p++ {
			for i := c.uRow[p]; i != -1 && i < int32(k); {
				nxt := anc[i]
				anc[i] = int32(k)
				if nxt == -1 {
					c.parent[i] = int32(k)
					break
				}
				i = nxt
			}
		}
	}
	c.mark = make([]int32, n)
	c.stack = make([]int32, n)
	c.path = make([]int32, n)
	c.next = make([]int32, n)
	c.x = make([]float64, n)
	c.y = make([]float64, n)
	// Column counts: one symbolic pass over the row patterns of L.
	count := make([]int32, n)
	for i := range c.mark {
		c.mark[i] = -1
	}
	for k := 0; k < n; k++ {
		top := c.reach(k)
		for _, j := range c.stack[top:] {
			count[j]++
		}
	}
	c.lPtr = make([]int32, n+1)
	for j := 0; j < n; j++ {
		c.lPtr[j+1] = c.lPtr[j] + 1 + count[j]
	}
	c.lRow = make([]int32, c.lPtr[n])
	c.lx = make([]float64, c.lPtr[n])
	return c, nil
}

// reach puts the pattern of row k of L (columns < k) on c.stack[top:] in topological order, and returns top. It
// marks the visited columns with k in c.mark.
func (c *cholesky) reach(k int) int {
	top := c.n
	c.mark[k] = int32(k)
	for p := c.uPtr[k]; p < c.uPtr[k+1]; p++ {
		i := c.uRow[p]
		ln := 0
		for ; c.mark[i] != int32(k); i = c.parent[i] {
			c.path[ln] = i // the path from i up to a marked column
			ln++
			c.mark[i] = int32(k)
		}
		for ln > 0 {
			ln--
			top--
			c.stack[top] = c.path[ln]
		}
	}
	return top
}

// factor computes L from the values of a (which must have the analysed pattern). It returns false, leaving the
// factor invalid, when a pivot is not positive.
func (c *cholesky) factor(a *csr) bool {
	c.ok = false
	for i := range c.mark {
		c.mark[i] = -1
	}
	for j := 0; j < c.n; j++ {
		c.next[j] = c.lPtr[j] + 1
	}
	x, lx, lRow := c.x, c.lx, c.lRow
	for k := 0; k < c.n; k++ {
		top := c.reach(k)
		for p := c.uPtr[k]; p < c.uPtr[k+1]; p++ {
			x[c.uRow[p]] = a.val[c.uPos[p]]
		}
		d := a.val[c.adiag[k]]
		for _, j := range c.stack[top:] {
			lkj := x[j] / lx[c.lPtr[j]]
			x[j] = 0
			lo, hi := c.lPtr[j]+1, c.next[j]
			rows, vals := lRow[lo:hi], lx[lo:hi]
			vals = vals[:len(rows)]
			for q, i := range rows {
				x[i] -= vals[q] * lkj
			}
			d -= lkj * lkj
			q := c.next[j]
			lRow[q], lx[q] = int32(k), lkj
			c.next[j]++
		}
		if !(d > 0) || math.IsInf(d, 0) {
			return false
		}
		lRow[c.lPtr[k]], lx[c.lPtr[k]] = int32(k), math.Sqrt(d)
	}
	c.ok = true
	return true
}

// apply sets z = (P A Pᵀ)⁻¹ r with the factor: z = Pᵀ L⁻ᵀ L⁻¹ P r.
func (c *cholesky) apply(z, r []float64) {
	y, lx, lRow := c.y, c.lx, c.lRow
	for k, i := range c.perm {
		y[k] = r[i]
	}
	for j := 0; j < c.n; j++ { // L y = P r, by columns
		p0 := c.lPtr[j]
		yj := y[j] / lx[p0]
		y[j] = yj
		rows, vals := lRow[p0+1:c.lPtr[j+1]], lx[p0+1:c.lPtr[j+1]]
		vals = vals[:len(rows)]
		for q, i := range rows {
			y[i] -= vals[q] * yj
		}
	}
	for j := c.n - 1; j >= 0; j-- { // Lᵀ w = y, by columns of L (rows of Lᵀ)
		p0 := c.lPtr[j]
		s := y[j]
		rows, vals := lRow[p0+1:c.lPtr[j+1]], lx[p0+1:c.lPtr[j+1]]
		vals = vals[:len(rows)]
		for q, i := range rows {
			s -= vals[q] * y[i]
		}
		y[j] = s / lx[p0]
	}
	for k, i := range c.perm {
		z[i] = y[k]
	}
}
