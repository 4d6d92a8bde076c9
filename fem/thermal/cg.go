package thermal

import (
	"math"
	"sort"
)

// csr is a real symmetric sparse matrix in compressed-row storage with both triangles stored and the columns of
// each row sorted; diag[i] is the position of the diagonal entry of row i.
type csr struct {
	n      int
	rowPtr []int32
	col    []int32
	val    []float64
	diag   []int32
}

// newCSR builds the pattern of the node graph of linear triangles (each triangle couples its three nodes).
func newCSR(n int, tris [][3]int32) *csr {
	adj := make([][]int32, n)
	for i := range adj {
		adj[i] = append(adj[i], int32(i))
	}
	for _, t := range tris {
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				if a != b {
					adj[t[a]] = append(adj[t[a]], t[b])
				}
			}
		}
	}
	m := &csr{n: n, rowPtr: make([]int32, n+1), diag: make([]int32, n)}
	for i, row := range adj {
		sort.Slice(row, func(a, b int) bool { return row[a] < row[b] })
		k := 0
		for j, c := range row {
			if j == 0 || c != row[k-1] {
				row[k] = c
				k++
			}
		}
		row = row[:k]
		for _, c := range row {
			if c == int32(i) {
				m.diag[i] = int32(len(m.col))
			}
			m.col = append(m.col, c)
		}
		m.rowPtr[i+1] = int32(len(m.col))
	}
	m.val = make([]float64, len(m.col))
	return m
}

// pos returns the storage position of entry (i, j), which must be in the pattern.
func (m *csr) pos(i, j int32) int32 {
	lo, hi := m.rowPtr[i], m.rowPtr[i+1]
	cols := m.col[lo:hi]
	k := sort.Search(len(cols), func(k int) bool { return cols[k] >= j })
	if k == len(cols) || cols[k] != j {
		panic("thermal: entry outside the sparsity pattern")
	}
	return lo + int32(k)
}

// mulVec sets y = A x.
func (m *csr) mulVec(y, x []float64) {
	for i := 0; i < m.n; i++ {
		s := 0.0
		for p := m.rowPtr[i]; p < m.rowPtr[i+1]; p++ {
			s += m.val[p] * x[m.col[p]]
		}
		y[i] = s
	}
}

// ic0 is an incomplete Cholesky factor L (zero fill) on the lower triangle of a csr pattern, or, when a pivot
// breaks down, a Jacobi (diagonal) preconditioner.
type ic0 struct {
	a      *csr
	l      []float64 // values on a's pattern; only the lower triangle and the diagonal are used
	jacobi bool
}

func (p *ic0) factor(a *csr) {
	p.a, p.jacobi = a, false
	if len(p.l) != len(a.val) {
		p.l = make([]float64, len(a.val))
	}
	l := p.l
	for i := 0; i < a.n; i++ {
		lo, d := a.rowPtr[i], a.diag[i]
		for q := lo; q < d; q++ { // L_ij for j < i, in increasing j
			j := a.col[q]
			s := a.val[q]
			// subtract Σ_{k<j} L_ik L_jk over the common lower pattern of rows i and j
			pi, pj := lo, a.rowPtr[j]
			for pi < q && pj < a.diag[j] {
				ci, cj := a.col[pi], a.col[pj]
				switch {
				case ci == cj:
					s -= l[pi] * l[pj]
					pi++
					pj++
				case ci < cj:
					pi++
				default:
					pj++
				}
			}
			l[q] = s / l[a.diag[j]]
		}
		s := a.val[d]
		for q := lo; q < d; q++ {
			s -= l[q] * l[q]
		}
		if !(s > 0) {
			p.jacobi = true
			return
		}
		l[d] = math.Sqrt(s)
	}
}

// apply sets z = M⁻¹ r.
func (p *ic0) apply(z, r []float64) {
	a := p.a
	if p.jacobi {
		for i := range z {
			z[i] = r[i] / a.val[a.diag[i]]
		}
		return
	}
	l := p.l
	for i := 0; i < a.n; i++ { // L y = r
		s := r[i]
		for q := a.rowPtr[i]; q < a.diag[i]; q++ {
			s -= l[q] * z[a.col[q]]
		}
		z[i] = s / l[a.diag[i]]
	}
	for i := a.n - 1; i >= 0; i-- { // Lᵀ z = y, column-oriented on the rows of L
		z[i] /= l[a.diag[i]]
		zi := z[i]
		for q := a.rowPtr[i]; q < a.diag[i]; q++ {
			z[a.col[q]] -= l[q] * zi
		}
	}
}

// preconditioner applies z = M⁻¹ r for an approximation M of the matrix.
type preconditioner interface{ apply(z, r []float64) }

// cgWork holds the vectors of a preconditioned conjugate-gradient solve.
type cgWork struct {
	r, z, p, q []float64
}

// pcg solves A x = b for symmetric positive definite A, starting from x, until ‖r‖₂ ≤ tol·‖b‖₂ or maxIter
// iterations. It returns the iteration count and the final relative residual.
func pcg(a *csr, pre preconditioner, x, b []float64, tol float64, maxIter int, w *cgWork) (int, float64) {
	n := a.n
	if len(w.r) != n {
		w.r, w.z, w.p, w.q = make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	}
	r, z, p, q := w.r, w.z, w.p, w.q
	bn := norm2(b)
	if bn == 0 {
		for i := range x {
			x[i] = 0
		}
		return 0, 0
	}
	a.mulVec(r, x)
	for i := range r {
		r[i] = b[i] - r[i]
	}
	pre.apply(z, r)
	copy(p, z)
	rz := dot(r, z)
	rel := norm2(r) / bn
	it := 0
	for ; it < maxIter && rel > tol; it++ {
		a.mulVec(q, p)
		alpha := rz / dot(p, q)
		for i := range x {
			x[i] += alpha * p[i]
			r[i] -= alpha * q[i]
		}
		rel = norm2(r) / bn
		if rel <= tol {
			it++
			break
		}
		pre.apply(z, r)
		rzNew := dot(r, z)
		beta := rzNew / rz
		rz = rzNew
		for i := range p {
			p[i] = z[i] + beta*p[i]
		}
	}
	return it, rel
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

func norm2(a []float64) float64 { return math.Sqrt(dot(a, a)) }
