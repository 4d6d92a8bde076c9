package sparse

import (
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
)

// PivotTolerance: a pivot d_j with |d_j| ≤ PivotTolerance·max_i |A_ij| (over the full symmetric column j of the
// original matrix) is reported as a *SingularError. It catches rows with no coupling and exact cancellation while
// leaving legitimate FEM pivots (condition numbers up to ~1e13) alone.
const PivotTolerance = 1e-14

// Factor is a numeric LDLᵀ factorisation P A Pᵀ = L D Lᵀ (transpose, no conjugation; L unit lower triangular,
// D diagonal) of a complex symmetric matrix, computed without pivoting. It keeps a copy of A's values for
// iterative refinement. A Factor is read-only after creation and Solve may be called concurrently.
type Factor struct {
	s     *Symbolic
	lx    []complex128 // supernodal blocks; D on the diagonal of each block
	aval  []complex128 // copy of A.Val
	a     Matrix       // A with the copied values (pattern shared with the Symbolic)
	normA float64      // ‖A‖∞
	ok    bool         // the values are a valid factorisation (false after a failed Refactor)
}

// panelWidth is the number of pivot columns factored before a blocked rank update; rowTile is the row tile of
// the rank update (panelWidth×rowTile complex values stay cache-resident while all target columns stream by).
const (
	panelWidth = 32
	rowTile    = 256
)

// Factor computes the numeric factorisation of a, which must have exactly the pattern that was analysed. It
// spreads independent subtrees and large dense updates over runtime.GOMAXPROCS(0) goroutines; the result does
// not depend on the number of goroutines (every entry is computed by the same operations in the same order).
func (s *Symbolic) Factor(a *Matrix) (*Factor, error) {
	return s.factor(a, runtime.GOMAXPROCS(0))
}

// Refactor recomputes f in place for a, which must have exactly the pattern that was analysed, reusing f's
// storage (no new allocation of L; the frequency sweeps call this hundreds of times). f must not be in use by
// Solve meanwhile. On error f holds no valid factorisation and Solve panics until a later Refactor succeeds.
func (f *Factor) Refactor(a *Matrix) error {
	return f.refactor(a, runtime.GOMAXPROCS(0))
}

// factor is Factor with an explicit number of goroutines (≥ 1).
func (s *Symbolic) factor(a *Matrix, procs int) (*Factor, error) {
	if err := s.checkPattern(a); err != nil {
		return nil, err
	}
	nz := len(s.rowIdx)
	f := &Factor{s: s, aval: make([]complex128, nz)}
	f.a = Matrix{N: s.n, ColPtr: s.colPtr, RowIdx: s.rowIdx, Val: f.aval}
	f.lx = make([]complex128, s.lOff[len(s.lOff)-1])
	adviseHuge(f.lx)
	if err := f.refactor(a, procs); err != nil {
		return nil, err
	}
	return f, nil
}

// checkPattern reports whether a has the analysed pattern.
func (s *Symbolic) checkPattern(a *Matrix) error {
	if a == nil || a.N != s.n || len(a.ColPtr) != s.n+1 || !slices.Equal(a.ColPtr, s.colPtr) ||
		len(a.RowIdx) < len(s.rowIdx) || !slices.Equal(a.RowIdx[:len(s.rowIdx)], s.rowIdx) || len(a.Val) < len(s.rowIdx) {
		return fmt.Errorf("sparse: Factor: matrix pattern differs from the analysed one")
	}
	return nil
}

// refactor computes the factorisation of a into f's storage with procs goroutines.
func (f *Factor) refactor(a *Matrix, procs int) error {
	s := f.s
	f.ok = false
	if err := s.checkPattern(a); err != nil {
		return err
	}
	n := s.n
	scale := make([]float64, n)
	for j := 0; j < n; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			v := a.Val[p]
			i := a.RowIdx[p]
			if !finite(v) {
				return &NonFiniteError{Row: int(i), Column: j, Value: v}
			}
			av := cabs(v)
			scale[i] = max(scale[i], av)
			scale[j] = max(scale[j], av)
		}
	}
	copy(f.aval, a.Val)
	f.normA = f.a.normInf()
	ctx := &factorCtx{s: s, f: f, scale: scale}
	if err := ctx.run(procs); err != nil {
		return err
	}
	f.ok = true
	return nil
}

// run factors every supernode of ctx.s into ctx.f.lx.
func (ctx *factorCtx) run(procs int) error {
	s := ctx.s
	// Independent subtrees first, pulled by up to procs goroutines; each keeps its root's update matrix.
	roots := s.spare.takeRoots(len(s.tasks))
	defer s.spare.putRoots(roots)
	failed := make([]error, len(s.tasks))
	nw := max(1, min(procs, len(s.tasks)))
	var next atomic.Int32
	var wg sync.WaitGroup
	for w := 0; w < nw; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			fw := ctx.newWorker(s.taskPeak, 1)
			defer s.spare.put(fw)
			for {
				t := int(next.Add(1)) - 1
				if t >= len(s.tasks) {
					return
				}
				lo, hi := int(s.tasks[t][0]), int(s.tasks[t][1])
				fw.reset()
				for sn := lo; sn <= hi; sn++ {
					if err := fw.front(sn); err != nil {
						failed[t] = err
						break
					}
				}
				if failed[t] == nil && len(fw.blocks) == 1 {
					roots[t] = append(roots[t][:0], fw.blocks[0].cb...)
				}
			}
		}()
	}
	wg.Wait()
	bad := -1 // report the failure of the earliest subtree, as a serial factorisation would
	for t, err := range failed {
		if err != nil && (bad < 0 || s.tasks[t][0] < s.tasks[bad][0]) {
			bad = t
		}
	}
	if bad >= 0 {
		return failed[bad]
	}
	// The top part, in postorder, with the task roots' update matrices slotted in where their subtrees end.
	fw := ctx.newWorker(s.topPeak, procs)
	defer s.spare.put(fw)
	ns := len(s.first) - 1
	for sn := 0; sn < ns; sn++ {
		if t := s.taskOf[sn]; t >= 0 {
			if int(s.tasks[t][1]) == sn && s.parent[sn] >= 0 {
				fw.blocks = append(fw.blocks, block{sn: sn, cb: roots[t], off: -1})
			}
			continue
		}
		if err := fw.front(sn); err != nil {
			return err
		}
	}
	return nil
}

// factorCtx is what the workers of one factorisation share.
type factorCtx struct {
	s     *Symbolic
	f     *Factor
	scale []float64 // max |A_ij| over each original column
}

// block is a pending update matrix: cb holds it (packed lower, order m−k of supernode sn); off is its start in
// the worker's stack, or −1 when it lives elsewhere.
type block struct {
	sn, off int
	cb      []complex128
}

// frontWorker factors supernodes one after another in postorder with its own update-matrix stack.
type frontWorker struct {
	*factorCtx
	stack   []complex128
	top     int
	blocks  []block
	pos     []int32
	work    []complex128
	scratch []complex128 // panelScratch(MaxFront) entries for panelBelow
	rel     []int32      // MaxFront entries for extendAdd
	procs   int          // goroutines for large dense updates
}

// newWorker returns a worker with a stack of at least stackSize entries, reusing a spare one of the Symbolic's.
func (c *factorCtx) newWorker(stackSize int64, procs int) *frontWorker {
	if w := c.s.spare.get(stackSize); w != nil {
		w.factorCtx, w.procs = c, procs
		w.reset()
		return w
	}
	stack := make([]complex128, stackSize)
	adviseHuge(stack)
	return &frontWorker{factorCtx: c, stack: stack, pos: make([]int32, c.s.n), work: make([]complex128, c.s.maxWork),
		scratch: make([]complex128, panelScratch(c.s.stats.MaxFront)), rel: make([]int32, c.s.stats.MaxFront), procs: procs}
}

// workerPool keeps the workers (update-matrix stacks and scratch) of finished factorisations for the next
// Factor or Refactor on the same Symbolic, so that repeated factorisations neither allocate nor first-touch them
// again. It holds at most as many workers as one factorisation uses at once.
type workerPool struct {
	mu    sync.Mutex
	free  []*frontWorker
	roots [][]complex128 // the task roots' update matrices
}

// takeRoots returns the kept buffers for the n task roots' update matrices (entries may be nil), leaving none in
// the pool until putRoots.
func (p *workerPool) takeRoots(n int) [][]complex128 {
	p.mu.Lock()
	defer p.mu.Unlock()
	r := p.roots
	p.roots = nil
	if len(r) != n {
		r = make([][]complex128, n)
	}
	return r
}

// putRoots keeps the root buffers for the next factorisation.
func (p *workerPool) putRoots(r [][]complex128) {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.roots = r
}

// get removes and returns the spare worker with the smallest stack of at least stackSize entries, or nil.
func (p *workerPool) get(stackSize int64) *frontWorker {
	p.mu.Lock()
	defer p.mu.Unlock()
	best := -1
	for i, w := range p.free {
		if int64(len(w.stack)) >= stackSize && (best < 0 || len(w.stack) < len(p.free[best].stack)) {
			best = i
		}
	}
	if best < 0 {
		return nil
	}
	w := p.free[best]
	p.free = slices.Delete(p.free, best, best+1)
	return w
}

// put returns w to the pool, dropping its references to the finished factorisation.
func (p *workerPool) put(w *frontWorker) {
	w.factorCtx = nil
	clear(w.blocks[:cap(w.blocks)])
	w.reset()
	p.mu.Lock()
	defer p.mu.Unlock()
	if len(p.free) < runtime.GOMAXPROCS(0)+1 {
		p.free = append(p.free, w)
	}
}

func (w *frontWorker) reset() { w.top, w.blocks = 0, w.blocks[:0] }

// front assembles supernode sn from A and its children's update matrices, factors its pivot block, and pushes
// its own update matrix.
func (w *frontWorker) front(sn int) error {
	s := w.s
	k := int(s.first[sn+1] - s.first[sn])
	L := w.f.lx[s.lOff[sn]:s.lOff[sn+1]]
	rows := s.rows[s.rowPtr[sn]:s.rowPtr[sn+1]]
	m := len(rows)
	m2 := m - k
	for j := 0; j < k; j++ {
		clear(L[j*m+j : j*m+m]) // only the lower part is ever read (solves) or added into (A, children)
	}
	aval := w.f.aval
	aOff := s.aOff[s.aPtr[sn]:s.aPtr[sn+1]]
	for t, q := range s.aq[s.aPtr[sn]:s.aPtr[sn+1]] {
		L[aOff[t]] += aval[q]
	}
	cbSize := m2 * (m2 + 1) / 2
	cb := w.stack[w.top : w.top+cbSize]
	clear(cb)
	pos := w.pos
	for t, i := range rows {
		pos[i] = int32(t)
	}
	// Extend-add the children's update matrices (the topmost blocks).
	base := w.top
	for len(w.blocks) > 0 && s.parent[w.blocks[len(w.blocks)-1].sn] == int32(sn) {
		ch := w.blocks[len(w.blocks)-1]
		w.blocks = w.blocks[:len(w.blocks)-1]
		if ch.off >= 0 {
			base = ch.off
		}
		crow := s.rows[s.rowPtr[ch.sn]:s.rowPtr[ch.sn+1]]
		ck := int(s.first[ch.sn+1] - s.first[ch.sn])
		extendAdd(ch.cb, crow[ck:], pos, L, m, k, cb, w.rel)
	}
	if bad, piv := factorFront(L, m, k, cb, w.work, w.scratch, w.procs); bad >= 0 {
		col := int(s.first[sn]) + bad
		return &SingularError{Column: int(s.perm[col]), Pivot: piv}
	}
	for j := 0; j < k; j++ {
		d := L[j*m+j]
		col := int(s.first[sn]) + j
		if !finite(d) || cabs(d) <= PivotTolerance*w.scale[s.perm[col]] {
			return &SingularError{Column: int(s.perm[col]), Pivot: d}
		}
	}
	// Move this update matrix down over the consumed children.
	if base != w.top {
		copy(w.stack[base:base+cbSize], cb)
	}
	w.top = base
	if s.parent[sn] >= 0 {
		w.blocks = append(w.blocks, block{sn: sn, off: w.top, cb: w.stack[w.top : w.top+cbSize]})
		w.top += cbSize
	}
	return nil
}

// extendAdd adds a child's packed lower update matrix (rows crow, all present in the parent pattern) into the
// parent front: pivot columns go to the panel L (m×k, column-major), the rest to the packed update matrix cb.
// rel (at least len(crow) entries) is scratch for the rows' positions in the front.
func extendAdd(child []complex128, crow []int32, pos []int32, L []complex128, m, k int, cb []complex128, rel []int32) {
	mc := len(crow)
	m2 := m - k
	rel = rel[:mc]
	for a, r := range crow {
		rel[a] = pos[r]
	}
	o := 0
	for a := 0; a < mc; a++ {
		la := int(rel[a])
		src := child[o : o+mc-a]
		o += mc - a
		ra := rel[a : a+len(src)]
		if la < k {
			dst := L[la*m : la*m+m]
			for b, v := range src {
				dst[ra[b]] += v
			}
		} else {
			t := la - k
			base := t*m2 - t*(t-1)/2 - la // cb[base+i] is front entry (i, la)
			dst := cb[base+la : base+m]
			for b, v := range src {
				dst[int(ra[b])-la] += v
			}
		}
	}
}

// factorFront factors the k pivot columns of a front of order m held as the m×k column-major panel L (rows ≥
// column meaningful) and subtracts their contribution from the packed lower update matrix cb of order m−k. On
// return L holds D on its diagonal and the unit-lower L below. It returns the local column of a zero or
// non-finite pivot, or −1.
func factorFront(L []complex128, m, k int, cb, work, scratch []complex128, procs int) (int, complex128) {
	for jb := 0; jb < k; jb += panelWidth {
		je := min(jb+panelWidth, k)
		// The panel's diagonal block, column by column.
		for j := jb; j < je; j++ {
			col := L[j*m+j : j*m+je]
			for p := jb; p < j; p++ {
				w := L[p*m+p] * L[p*m+j]
				axpyNeg(col, L[p*m+j:p*m+je], w)
			}
			d := col[0]
			if d == 0 || !finite(d) {
				return j, d
			}
			inv := 1 / d
			tail := col[1:]
			for i := range tail {
				tail[i] *= inv
			}
		}
		if je == m {
			break
		}
		panelBelow(L, m, jb, je, scratch)
		// W[t*bw + p−jb] = d_p L(je+t, p)
		bw := je - jb
		nt := m - je
		W := work[:nt*bw]
		for p := jb; p < je; p++ {
			d := L[p*m+p]
			lc := L[p*m+je : p*m+m]
			for t, v := range lc {
				W[t*bw+p-jb] = d * v
			}
		}
		rankUpdate(L, m, k, jb, je, W, cb, procs)
	}
	return -1, 0
}

// parallelUpdate is the work (complex multiply-adds) of a rank update above which it is split over goroutines.
const parallelUpdate = 1 << 18

// rankUpdate subtracts L(:, jb:je) D(jb:je) L(c, jb:je)ᵀ from every target column c ≥ je of the front (panel
// columns c < k in L, the rest in the packed cb), rows ≥ c only. Large updates are split by target columns over
// procs goroutines in slices of equal work; each entry is still computed by one goroutine the same way.
func rankUpdate(L []complex128, m, k, jb, je int, W []complex128, cb []complex128, procs int) {
	h := float64(m - je)
	if procs <= 1 || h*h/2*float64(je-jb) < parallelUpdate {
		rankUpdateCols(L, m, k, jb, je, je, m, W, cb)
		return
	}
	var wg sync.WaitGroup
	c0 := je
	for p := 1; p <= procs; p++ {
		c1 := m
		if p < procs {
			c1 = m - int(h*math.Sqrt(1-float64(p)/float64(procs)))
			c1 = je + (c1-je)/tileCols*tileCols // whole column groups
		}
		if c1 > c0 {
			wg.Add(1)
			go func(c0, c1 int) {
				defer wg.Done()
				rankUpdateCols(L, m, k, jb, je, c0, c1, W, cb)
			}(c0, c1)
		}
		c0 = max(c0, c1)
	}
	wg.Wait()
}

// axpyNeg sets d −= w·a over len(d) entries.
func axpyNeg(d, a []complex128, w complex128) {
	a = a[:len(d)]
	for i := range d {
		d[i] -= w * a[i]
	}
}

// Solve-related constants.
const (
	// MaxResidual is the acceptance threshold of Solve: the scaled residual ‖b − A x‖∞ / (‖A‖∞‖x‖∞ + ‖b‖∞)
	// must end at or below it, else Solve returns an *AccuracyError (with the best x it found).
	MaxResidual = 1e-10
	// maxRefine bounds the iterative refinement steps; refinement stops early at targetResidual or when a step
	// fails to halve the residual.
	maxRefine      = 4
	targetResidual = 1e-15
)

// SolveInfo reports a solve's accuracy.
type SolveInfo struct {
	Residual    float64 // ‖A x − b‖∞ / (‖A‖∞ ‖x‖∞ + ‖b‖∞), dimensionless
	Refinements int     // iterative-refinement steps taken
}

// Solve sets x = A⁻¹ b, refining iteratively against the original A. x and b have length N and may be the same
// slice. It returns an *AccuracyError when the scaled residual stays above MaxResidual, and a *NonFiniteError
// for a NaN or Inf in b.
func (f *Factor) Solve(x, b []complex128) (SolveInfo, error) {
	n := f.s.n
	if !f.ok {
		panic("sparse: Solve on a Factor whose Refactor failed")
	}
	if len(x) != n || len(b) != n {
		panic(fmt.Sprintf("sparse: Solve lengths %d, %d for N=%d", len(x), len(b), n))
	}
	var normB float64
	for i, v := range b {
		if !finite(v) {
			return SolveInfo{}, &NonFiniteError{Row: i, Column: -1, Value: v}
		}
		normB = max(normB, cabs(v))
	}
	rhs := b
	if n > 0 && &x[0] == &b[0] {
		rhs = slices.Clone(b) // x overwrites b: keep the right-hand side for the residual
	}
	r := make([]complex128, n)
	f.solveOnce(x, rhs)
	info := SolveInfo{Residual: f.residual(r, x, rhs, normB)}
	var y, best []complex128 // refinement work space, only when a refinement step is taken
	for info.Refinements < maxRefine && info.Residual > targetResidual {
		if y == nil {
			y, best = make([]complex128, n), slices.Clone(x)
		}
		f.solveOnce(y, r) // correction y = A⁻¹ r
		for i := range x {
			x[i] += y[i]
		}
		info.Refinements++
		res := f.residual(r, x, rhs, normB)
		if !(res < info.Residual) {
			copy(x, best)
			f.residual(r, x, rhs, normB)
			break
		}
		improved := res < 0.5*info.Residual
		info.Residual = res
		copy(best, x)
		if !improved {
			break
		}
	}
	if !(info.Residual <= MaxResidual) {
		return info, &AccuracyError{Residual: info.Residual, Threshold: MaxResidual}
	}
	return info, nil
}

// residual sets r = b − A x and returns the scaled residual.
func (f *Factor) residual(r, x, b []complex128, normB float64) float64 {
	f.a.MulVec(r, x)
	var nr, nx float64
	for i := range r {
		r[i] = b[i] - r[i]
		nr = max(nr, cabs(r[i]))
		nx = max(nx, cabs(x[i]))
	}
	den := f.normA*nx + normB
	if den == 0 {
		return 0
	}
	res := nr / den
	if math.IsNaN(res) {
		return math.Inf(1)
	}
	return res
}

// Apply sets x = (L D Lᵀ)⁻¹ b with the factorisation as it stands: one forward, diagonal and back substitution,
// no refinement and no residual check. It is the cheap step for using a factorisation as a preconditioner
// (of a nearby matrix, say); Solve is the checked solve of the factored matrix itself. x and b may alias.
func (f *Factor) Apply(x, b []complex128) {
	if !f.ok {
		panic("sparse: Apply on a Factor whose Refactor failed")
	}
	if len(x) != f.s.n || len(b) != f.s.n {
		panic(fmt.Sprintf("sparse: Apply lengths %d, %d for N=%d", len(x), len(b), f.s.n))
	}
	f.solveOnce(x, b)
}

func (s *Symbolic) block(lx []complex128, sn int) []complex128 { return lx[s.lOff[sn]:s.lOff[sn+1]] }

// Solve is a one-shot Analyze, Factor and Factor.Solve of A x = b.
func Solve(a *Matrix, b []complex128, opt Options) ([]complex128, SolveInfo, error) {
	s, err := Analyze(a, opt)
	if err != nil {
		return nil, SolveInfo{}, fmt.Errorf("sparse: analyse: %w", err)
	}
	f, err := s.Factor(a)
	if err != nil {
		return nil, SolveInfo{}, fmt.Errorf("sparse: factor: %w", err)
	}
	x := make([]complex128, a.N)
	info, err := f.Solve(x, b)
	return x, info, err
}
