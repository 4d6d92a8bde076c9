package fem

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"slices"
)

// lowerCSC is the lower triangle (diagonal included) of a complex symmetric matrix in compressed sparse column
// form: column j holds rows rowIdx[colPtr[j]:colPtr[j+1]], increasing, the first being j itself.
type lowerCSC struct {
	n      int
	colPtr []int
	rowIdx []int
	val    []complex128
}

// patternBuilder collects the (row, col) positions an assembly will touch, in the order it touches them, and
// compiles them into a lowerCSC pattern plus the map from each recorded position to its value slot, so that
// re-assembly is a scatter.
type patternBuilder struct {
	n    int
	rows []int32
	cols []int32
}

// add records position (i, j); it is stored at (max, min).
func (pb *patternBuilder) add(i, j int) {
	if i < j {
		i, j = j, i
	}
	pb.rows = append(pb.rows, int32(i))
	pb.cols = append(pb.cols, int32(j))
}

// compile returns the pattern and slot[k] = value index of the k-th add.
func (pb *patternBuilder) compile() (*lowerCSC, []int) {
	n := pb.n
	count := make([]int, n+1)
	for _, c := range pb.cols {
		count[c+1]++
	}
	for j := range n {
		count[j+1] += count[j]
	}
	// Bucket the adds by column, keeping their ids, then sort and deduplicate each column.
	ids := make([]int32, len(pb.cols))
	next := slices.Clone(count[:n])
	for k, c := range pb.cols {
		ids[next[c]] = int32(k)
		next[c]++
	}
	m := &lowerCSC{n: n, colPtr: make([]int, n+1)}
	slot := make([]int, len(pb.cols))
	for j := range n {
		seg := ids[count[j]:count[j+1]]
		slices.SortFunc(seg, func(a, b int32) int { return int(pb.rows[a]) - int(pb.rows[b]) })
		if len(seg) == 0 || pb.rows[seg[0]] != int32(j) {
			// Every column gets its diagonal, so the pattern is structurally non-singular.
			m.rowIdx = append(m.rowIdx, j)
		}
		last := int32(-1)
		for _, k := range seg {
			r := pb.rows[k]
			if r != last {
				m.rowIdx = append(m.rowIdx, int(r))
				last = r
			}
			slot[k] = len(m.rowIdx) - 1
		}
		m.colPtr[j+1] = len(m.rowIdx)
	}
	m.val = make([]complex128, len(m.rowIdx))
	return m, slot
}

// mulVec computes y = A x for the full symmetric matrix stored as its lower triangle.
func (m *lowerCSC) mulVec(y, x []complex128) {
	clear(y)
	for j := range m.n {
		xj := x[j]
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			i, v := m.rowIdx[p], m.val[p]
			y[i] += v * xj
			if i != j {
				y[j] += v * x[i]
			}
		}
	}
}

// envelopeFactor is an LDLᵀ factorisation (complex symmetric, no pivoting, no conjugation) in envelope
// (skyline) storage after a reverse Cuthill–McKee ordering of the first nOrder unknowns; the rest (circuit
// unknowns) are kept last. It is the solver fem uses on its own; fem/sparse will replace it.
type envelopeFactor struct {
	n     int
	perm  []int // perm[new] = old
	iperm []int // iperm[old] = new
	first []int // first column of row i's envelope (new numbering)
	start []int // row i's envelope values are env[start[i] : start[i]+i-first[i]]
	env   []complex128
	d     []complex128
}

// analyzeEnvelope computes the ordering and envelope of m; the first nOrder unknowns are reordered.
func analyzeEnvelope(m *lowerCSC, nOrder int) *envelopeFactor {
	n := m.n
	adj := make([][]int, nOrder)
	for j := range nOrder {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			if i := m.rowIdx[p]; i != j && i < nOrder {
				adj[i] = append(adj[i], j)
				adj[j] = append(adj[j], i)
			}
		}
	}
	perm := rcm(adj)
	for k := nOrder; k < n; k++ {
		perm = append(perm, k)
	}
	f := &envelopeFactor{n: n, perm: perm, iperm: make([]int, n), first: make([]int, n), start: make([]int, n+1)}
	for nw, old := range perm {
		f.iperm[old] = nw
	}
	for i := range n {
		f.first[i] = i
	}
	for j := range n {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			a, b := f.iperm[m.rowIdx[p]], f.iperm[j]
			if a < b {
				a, b = b, a
			}
			f.first[a] = min(f.first[a], b)
		}
	}
	for i := range n {
		f.start[i+1] = f.start[i] + i - f.first[i]
	}
	f.env = make([]complex128, f.start[n])
	f.d = make([]complex128, n)
	return f
}

// rcm returns a reverse Cuthill–McKee order (perm[new] = old) of the graph adj, one component at a time, each
// started from a pseudo-peripheral vertex.
func rcm(adj [][]int) []int {
	n := len(adj)
	seen := make([]bool, n)
	order := make([]int, 0, n)
	level := make([]int, n)
	bfs := func(s int, mark []bool) (last []int) {
		// Plain BFS returning the vertices of the last level.
		q := []int{s}
		mark[s] = true
		level[s] = 0
		for h := 0; h < len(q); h++ {
			v := q[h]
			for _, w := range adj[v] {
				if !mark[w] {
					mark[w] = true
					level[w] = level[v] + 1
					q = append(q, w)
				}
			}
		}
		lv := level[q[len(q)-1]]
		for k := len(q) - 1; k >= 0 && level[q[k]] == lv; k-- {
			last = append(last, q[k])
		}
		for _, v := range q {
			mark[v] = false
		}
		return last
	}
	scratch := make([]bool, n)
	for s0 := range n {
		if seen[s0] {
			continue
		}
		// Pseudo-peripheral start: a couple of BFS sweeps to a low-degree vertex of the last level.
		s := s0
		for range 3 {
			last := bfs(s, scratch)
			best := last[0]
			for _, v := range last {
				if len(adj[v]) < len(adj[best]) {
					best = v
				}
			}
			if best == s {
				break
			}
			s = best
		}
		base := len(order)
		order = append(order, s)
		seen[s] = true
		for h := base; h < len(order); h++ {
			v := order[h]
			nb := make([]int, 0, len(adj[v]))
			for _, w := range adj[v] {
				if !seen[w] {
					seen[w] = true
					nb = append(nb, w)
				}
			}
			slices.SortFunc(nb, func(a, b int) int { return len(adj[a]) - len(adj[b]) })
			order = append(order, nb...)
		}
	}
	slices.Reverse(order)
	return order
}

var errZeroPivot = errors.New("zero pivot in LDLᵀ factorisation")

// factor computes L and D of m (which must have the pattern analyzeEnvelope saw).
func (f *envelopeFactor) factor(m *lowerCSC) error {
	clear(f.env)
	clear(f.d)
	for j := range m.n {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			a, b := f.iperm[m.rowIdx[p]], f.iperm[j]
			if a < b {
				a, b = b, a
			}
			if a == b {
				f.d[a] += m.val[p]
			} else {
				f.env[f.start[a]+b-f.first[a]] += m.val[p]
			}
		}
	}
	var scale float64
	for _, v := range f.d {
		scale = max(scale, cmplx.Abs(v))
	}
	for i := range f.n {
		fi := f.first[i]
		row := f.env[f.start[i] : f.start[i]+i-fi] // row[j-fi] = a_ij, becoming w_j = L_ij D_j
		for j := fi; j < i; j++ {
			fj := f.first[j]
			k0 := max(fi, fj)
			lj := f.env[f.start[j]+k0-fj : f.start[j]+j-fj]
			wi := row[k0-fi : j-fi]
			var s complex128
			for k, v := range wi {
				s += v * lj[k]
			}
			row[j-fi] -= s
		}
		di := f.d[i]
		for j := fi; j < i; j++ {
			w := row[j-fi]
			l := w / f.d[j]
			di -= w * l
			row[j-fi] = l
		}
		if di == 0 || cmplx.IsNaN(di) || cmplx.Abs(di) < 1e-300*scale {
			return fmt.Errorf("%w at unknown %d", errZeroPivot, f.perm[i])
		}
		f.d[i] = di
	}
	return nil
}

// solve overwrites x with A⁻¹ b.
func (f *envelopeFactor) solve(x, b []complex128) {
	y := make([]complex128, f.n)
	for i := range f.n {
		y[i] = b[f.perm[i]]
	}
	for i := range f.n {
		fi := f.first[i]
		row := f.env[f.start[i] : f.start[i]+i-fi]
		s := y[i]
		for k, l := range row {
			s -= l * y[fi+k]
		}
		y[i] = s
	}
	for i := range f.n {
		y[i] /= f.d[i]
	}
	for i := f.n - 1; i >= 0; i-- {
		fi := f.first[i]
		row := f.env[f.start[i] : f.start[i]+i-fi]
		yi := y[i]
		for k, l := range row {
			y[fi+k] -= l * yi
		}
	}
	for i := range f.n {
		x[f.perm[i]] = y[i]
	}
}

// solveRefined solves m x = b with up to two steps of iterative refinement and returns the scaled residual
// ‖b − A x‖∞ / (‖A‖∞‖x‖∞ + ‖b‖∞).
func (f *envelopeFactor) solveRefined(m *lowerCSC, x, b []complex128) float64 {
	f.solve(x, b)
	r := make([]complex128, m.n)
	dx := make([]complex128, m.n)
	res := func() float64 {
		m.mulVec(r, x)
		var rn, xn, bn float64
		for i := range r {
			r[i] = b[i] - r[i]
			rn = max(rn, cmplx.Abs(r[i]))
			xn = max(xn, cmplx.Abs(x[i]))
			bn = max(bn, cmplx.Abs(b[i]))
		}
		return rn / (m.normInf()*xn + bn)
	}
	rel := res()
	for range 2 {
		if rel < 1e-15 || math.IsNaN(rel) {
			break
		}
		f.solve(dx, r)
		for i := range x {
			x[i] += dx[i]
		}
		rel = res()
	}
	return rel
}

// normInf is the largest absolute row sum of the full symmetric matrix.
func (m *lowerCSC) normInf() float64 {
	s := make([]float64, m.n)
	for j := range m.n {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			i, a := m.rowIdx[p], cmplx.Abs(m.val[p])
			s[i] += a
			if i != j {
				s[j] += a
			}
		}
	}
	return slices.Max(append(s, 0))
}
