package sparse

import (
	"slices"
	"time"
)

// Options controls Analyze.
type Options struct {
	Ordering Ordering
	// Coords optionally gives each unknown's position (len N). Nested dissection then bisects geometrically.
	// Unknowns whose coordinates are NaN (e.g. circuit unknowns) are numbered last by the nested-dissection
	// and minimum-degree orderings; OrderNatural ignores Coords.
	Coords [][2]float64
}

// SymbolicStats describes an analysis. Counts of L include the diagonal (which holds D).
type SymbolicStats struct {
	N           int
	NnzA        int     // stored lower-triangle entries of A
	NnzL        int64   // exact entries of L for the chosen ordering
	NnzLStored  int64   // entries held by the supernodal storage (includes zeros added by amalgamation)
	Flops       float64 // complex multiply-adds of the numeric factorisation
	Supernodes  int
	MaxFront    int   // largest frontal matrix order
	StackPeak   int64 // complex entries of the update-matrix stacks at their peak (one task plus the top part)
	FactorBytes int64 // bytes of numeric storage a Factor holds (L, D, a copy of A's values)
	Ordering    Ordering
	OrderTime   time.Duration
	AnalyzeTime time.Duration // whole Analyze, ordering included
}

// Symbolic is the pattern-only analysis of a matrix: fill-reducing permutation, elimination tree and supernodes.
// It is immutable after Analyze (apart from the scratch it keeps for the next factorisation: the update-matrix
// stacks, about StackPeak·16 bytes, and the subtree roots' update matrices) and may be shared by concurrent
// Factor calls.
type Symbolic struct {
	n       int
	colPtr  []int   // A's pattern, to check that Factor gets the analysed pattern
	rowIdx  []int32 //
	perm    []int32 // perm[k] = original index of pivot k
	iperm   []int32
	first   []int32 // len ns+1: supernode s owns pivots first[s] .. first[s+1]−1
	rowPtr  []int   // len ns+1: rows[rowPtr[s]:rowPtr[s+1]] is the row pattern of s, its own pivots first
	rows    []int32 // pivot indices, ascending within each supernode
	lOff    []int   // len ns+1: supernode s's m×k column-major block starts at lOff[s] in the L values
	parent  []int32 // supernodal elimination tree, −1 at roots
	aPtr    []int   // len ns+1: A entries landing in supernode s are aq[aPtr[s]:aPtr[s+1]]
	aq      []int32 // positions in A.Val, grouped by supernode
	aOff    []int32 // aOff[t] = offset of A.Val[aq[t]] within its supernode's block
	stats   SymbolicStats
	maxWork int // size of the rank-update coefficient buffer
	// tasks are independent subtrees [lo, hi] (supernode ranges, hi the root), heaviest first, that Factor
	// spreads over goroutines; taskOf[s] is the task holding supernode s or −1 for the top part, which is
	// factored after them. taskPeak and topPeak are the stack sizes (complex entries) a task and the top part need.
	tasks             [][2]int32
	taskOf            []int32
	taskPeak, topPeak int64
	// topPiv lists the pivots of the top part in order and topIdx maps a pivot to its place in topPiv (−1 inside
	// a task): the substitutions keep each task's updates of the top part apart while the tasks run side by side.
	topPiv []int32
	topIdx []int32
	spare  *workerPool // scratch kept between factorisations (internally locked)
}

// Stats returns the analysis statistics.
func (s *Symbolic) Stats() SymbolicStats { return s.stats }

// Perm returns a copy of the fill-reducing permutation: Perm()[k] is the original index of the k-th pivot.
func (s *Symbolic) Perm() []int {
	p := make([]int, s.n)
	for k, v := range s.perm {
		p[k] = int(v)
	}
	return p
}

// Amalgamation limits (column counts) and the tolerated fraction of explicit zeros at each: a merge is taken
// when the merged supernode has at most relaxCols[i] columns and at most relaxZero[i] of its entries are zeros.
var (
	relaxCols = [...]int{4, 16, 48, 1 << 30}
	relaxZero = [...]float64{1, 0.8, 0.1, 0.05}
)

// Analyze computes the fill-reducing ordering, elimination tree, supernodes and the pattern of L for a. Only the
// pattern of a is used.
func Analyze(a *Matrix, opt Options) (*Symbolic, error) {
	t0 := time.Now()
	if err := a.check(); err != nil {
		return nil, err
	}
	n := a.N
	g := newGraph(a)
	perm0, used, err := order(g, opt)
	if err != nil {
		return nil, err
	}
	if len(perm0) != n {
		panic("sparse: ordering lost unknowns")
	}
	tOrder := time.Since(t0)
	iperm0 := invert(perm0)

	// Elimination tree (Liu's algorithm with path compression) of the permuted matrix.
	parent := make([]int32, n)
	anc := make([]int32, n)
	for k := 0; k < n; k++ {
		parent[k], anc[k] = -1, -1
		for _, u := range g.nbrs(perm0[k]) {
			for i := iperm0[u]; i != -1 && int(i) < k; {
				next := anc[i]
				anc[i] = int32(k)
				if next == -1 {
					parent[i] = int32(k)
				}
				i = next
			}
		}
	}
	// Postorder the tree so that every subtree is a contiguous range of pivots.
	post := postorder(parent)
	ipost := invert(post)
	perm1 := make([]int32, n)
	par1 := make([]int32, n)
	for k, old := range post {
		perm1[k] = perm0[old]
		if p := parent[old]; p >= 0 {
			par1[k] = ipost[p]
		} else {
			par1[k] = -1
		}
	}
	iperm1 := invert(perm1)
	parent = par1

	// Column counts of L by row-subtree traversal: row k of L is the union of tree paths from the entries of
	// row k of A up to k.
	cnt := make([]int32, n)
	mark := anc
	var nnzL int64
	for k := 0; k < n; k++ {
		mark[k] = int32(k)
		cnt[k]++
		for _, u := range g.nbrs(perm1[k]) {
			for j := iperm1[u]; int(j) < k && mark[j] != int32(k); j = parent[j] {
				mark[j] = int32(k)
				cnt[j]++
			}
		}
	}
	for _, c := range cnt {
		nnzL += int64(c)
	}

	// Fundamental supernodes: j joins j−1's supernode when j−1 is its only child and their patterns nest.
	nchild := make([]int32, n)
	for _, p := range parent {
		if p >= 0 {
			nchild[p]++
		}
	}
	snOf := make([]int32, n)
	var fFirst []int32
	for j := 0; j < n; j++ {
		if j > 0 && parent[j-1] == int32(j) && nchild[j] == 1 && cnt[j-1] == cnt[j]+1 {
			snOf[j] = snOf[j-1]
			continue
		}
		snOf[j] = int32(len(fFirst))
		fFirst = append(fFirst, int32(j))
	}
	nf := len(fFirst)
	fFirst = append(fFirst, int32(n))

	// Relaxed amalgamation: merge a child supernode into its parent when the explicit zeros it adds are few.
	fk := make([]int, nf)      // columns
	fm := make([]int, nf)      // height of the first column (diagonal included)
	fTrue := make([]int64, nf) // true nonzeros held
	fPar := make([]int32, nf)
	rep := make([]int32, nf)
	chHead := make([]int32, nf)
	chNext := make([]int32, nf)
	for s := 0; s < nf; s++ {
		f, l := int(fFirst[s]), int(fFirst[s+1])
		fk[s], fm[s] = l-f, int(cnt[f])
		fTrue[s] = entries(fk[s], fm[s])
		rep[s] = int32(s)
		chHead[s] = -1
		fPar[s] = -1
		if p := parent[l-1]; p >= 0 {
			fPar[s] = snOf[p]
		}
	}
	for s := nf - 1; s >= 0; s-- { // children lists in ascending order
		if p := fPar[s]; p >= 0 {
			chNext[s] = chHead[p]
			chHead[p] = int32(s)
		}
	}
	fZero := make([]int64, nf)
	for p := 0; p < nf; p++ {
		for c := chHead[p]; c >= 0; c = chNext[c] {
			nk, nm := fk[c]+fk[p], fk[c]+fm[p]
			tot := entries(nk, nm)
			zeros := tot - fTrue[c] - fTrue[p]
			frac := float64(zeros) / float64(tot)
			ok := false
			for i := range relaxCols {
				if nk <= relaxCols[i] {
					ok = frac <= relaxZero[i]
					break
				}
			}
			if ok || zeros == fZero[c]+fZero[p] {
				fk[p], fm[p] = nk, nm
				fTrue[p] += fTrue[c]
				fZero[p] = zeros
				rep[c] = int32(p)
			}
		}
	}
	find := func(s int32) int32 {
		r := s
		for rep[r] != r {
			r = rep[r]
		}
		for rep[s] != r {
			s, rep[s] = rep[s], r
		}
		return r
	}
	// Final supernodes are the representatives; renumber them in a postorder of the merged tree and list
	// their pivots (ascending old positions, so descendants stay first).
	finalPar := make([]int32, nf)
	isRep := make([]bool, nf)
	for s := 0; s < nf; s++ {
		r := find(int32(s))
		isRep[r] = true
		finalPar[s] = -1
	}
	for s := 0; s < nf; s++ {
		if isRep[s] && fPar[s] >= 0 {
			finalPar[s] = find(fPar[s])
		} else if isRep[s] {
			finalPar[s] = -1
		} else {
			finalPar[s] = -2 // not a supernode
		}
	}
	fpost := postorderSubset(finalPar)
	members := make([][]int32, nf) // fundamental supernodes of each representative, ascending
	for s := 0; s < nf; s++ {
		r := find(int32(s))
		members[r] = append(members[r], int32(s))
	}
	perm := make([]int32, 0, n)
	first := make([]int32, 0, len(fpost)+1)
	for _, r := range fpost {
		first = append(first, int32(len(perm)))
		for _, f := range members[r] {
			for j := fFirst[f]; j < fFirst[f+1]; j++ {
				perm = append(perm, perm1[j])
			}
		}
	}
	ns := len(first)
	first = append(first, int32(n))
	iperm := invert(perm)

	// Symbolic factorisation on the supernodal tree: the pattern of s is its own pivots, the entries of A in its
	// columns below them, and the patterns of its children below them.
	sn := make([]int32, n)
	for s := 0; s < ns; s++ {
		for j := first[s]; j < first[s+1]; j++ {
			sn[j] = int32(s)
		}
	}
	rowPtr := make([]int, ns+1)
	rows := make([]int32, 0, nnzL/4+int64(n))
	spar := make([]int32, ns)
	cHead := make([]int32, ns)
	cNext := make([]int32, ns)
	for i := range cHead {
		cHead[i] = -1
	}
	for i := range mark {
		mark[i] = -1
	}
	for s := 0; s < ns; s++ {
		f, l := first[s], first[s+1]
		start := len(rows)
		for j := f; j < l; j++ {
			rows = append(rows, j)
		}
		for j := f; j < l; j++ {
			for _, u := range g.nbrs(perm[j]) {
				if i := iperm[u]; i >= l && mark[i] != int32(s) {
					mark[i] = int32(s)
					rows = append(rows, i)
				}
			}
		}
		for c := cHead[s]; c >= 0; c = cNext[c] {
			kc := int(first[c+1] - first[c])
			for _, i := range rows[rowPtr[c]+kc : rowPtr[c+1]] {
				if i >= l && mark[i] != int32(s) {
					mark[i] = int32(s)
					rows = append(rows, i)
				}
			}
		}
		below := rows[start+int(l-f):]
		slices.Sort(below)
		rowPtr[s+1] = len(rows)
		spar[s] = -1
		if len(below) > 0 {
			p := sn[below[0]]
			spar[s] = p
			cNext[s] = cHead[p]
			cHead[p] = int32(s)
		}
	}

	// Storage offsets, statistics, the split into independent subtrees and the simulated update-matrix stacks.
	lOff := make([]int, ns+1)
	work := make([]float64, ns) // flops of each supernode, then of its whole subtree
	var flops float64
	var stored int64
	maxFront, maxWork := 0, 0
	for s := 0; s < ns; s++ {
		k, m := int(first[s+1]-first[s]), rowPtr[s+1]-rowPtr[s]
		lOff[s+1] = lOff[s] + m*k
		stored += entries(k, m)
		for j := 0; j < k; j++ {
			h := float64(m - j)
			work[s] += (h-1)*h/2 + (h - 1)
		}
		flops += work[s]
		maxFront = max(maxFront, m)
		maxWork = max(maxWork, panelWidth*(m-min(k, panelWidth)))
	}
	for s := 0; s < ns; s++ {
		if p := spar[s]; p >= 0 {
			work[p] += work[s]
		}
	}
	tasks, taskOf := splitTree(spar, cHead, cNext, work)
	var taskPeak, topPeak int64
	for _, t := range tasks {
		taskPeak = max(taskPeak, simulateStack(int(t[0]), int(t[1])+1, first, rowPtr, spar, cHead, cNext, nil))
	}
	topPeak = simulateStack(0, ns, first, rowPtr, spar, cHead, cNext, taskOf)

	// Destination of every entry of A in the L storage, grouped by supernode.
	aq := make([]int32, 0, a.ColPtr[n])
	aOff := make([]int32, 0, a.ColPtr[n])
	aPtr := make([]int, ns+1)
	pos := make([]int32, n)
	// bucket A's entries by the permuted column they land in
	bptr := make([]int, n+1)
	for j := 0; j < n; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			c := min(iperm[j], iperm[a.RowIdx[p]])
			bptr[c+1]++
		}
	}
	for j := 0; j < n; j++ {
		bptr[j+1] += bptr[j]
	}
	bq := make([]int32, a.ColPtr[n])
	bnext := slices.Clone(bptr[:n])
	for j := 0; j < n; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			c := min(iperm[j], iperm[a.RowIdx[p]])
			bq[bnext[c]] = int32(p)
			bnext[c]++
		}
	}
	colOf := make([]int32, a.ColPtr[n])
	for j := 0; j < n; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			colOf[p] = int32(j)
		}
	}
	for s := 0; s < ns; s++ {
		r := rows[rowPtr[s]:rowPtr[s+1]]
		m := len(r)
		for t, i := range r {
			pos[i] = int32(t)
		}
		for j := first[s]; j < first[s+1]; j++ {
			for _, q := range bq[bptr[j]:bptr[j+1]] {
				i := max(iperm[colOf[q]], iperm[a.RowIdx[q]])
				aq = append(aq, q)
				aOff = append(aOff, int32(int(j-first[s])*m+int(pos[i])))
			}
		}
		aPtr[s+1] = len(aq)
	}

	topIdx := make([]int32, n)
	var topPiv []int32
	for sn := 0; sn < ns; sn++ {
		for p := first[sn]; p < first[sn+1]; p++ {
			topIdx[p] = -1
			if taskOf[sn] < 0 {
				topIdx[p] = int32(len(topPiv))
				topPiv = append(topPiv, p)
			}
		}
	}
	st := &Symbolic{
		topPiv: topPiv, topIdx: topIdx,
		n: n, colPtr: slices.Clone(a.ColPtr), rowIdx: slices.Clone(a.RowIdx[:a.ColPtr[n]]),
		perm: perm, iperm: iperm, first: first, rowPtr: rowPtr, rows: rows, lOff: lOff, parent: spar, aPtr: aPtr, aq: aq, aOff: aOff,
		maxWork: maxWork, tasks: tasks, taskOf: taskOf, taskPeak: taskPeak, topPeak: topPeak,
		spare: &workerPool{},
	}
	st.stats = SymbolicStats{
		N: n, NnzA: a.ColPtr[n], NnzL: nnzL, NnzLStored: stored, Flops: flops, Supernodes: ns, MaxFront: maxFront,
		StackPeak: topPeak + taskPeak, FactorBytes: int64(lOff[ns])*16 + int64(a.ColPtr[n])*16,
		Ordering: used, OrderTime: tOrder, AnalyzeTime: time.Since(t0),
	}
	return st, nil
}

// entries is the number of entries of a lower-trapezoidal block with k columns whose first column has m rows.
func entries(k, m int) int64 { return int64(k)*int64(m) - int64(k)*int64(k-1)/2 }

func invert(p []int32) []int32 {
	q := make([]int32, len(p))
	for k, v := range p {
		q[v] = int32(k)
	}
	return q
}

// postorder returns a depth-first postorder of the forest given by parent (−1 at roots): post[k] is the node
// visited k-th. Children are visited in ascending order.
func postorder(parent []int32) []int32 {
	return postorderSubset(parent)
}

// postorderSubset is postorder for a forest in which nodes with parent −2 are absent.
func postorderSubset(parent []int32) []int32 {
	n := len(parent)
	head := make([]int32, n)
	next := make([]int32, n)
	for i := range head {
		head[i] = -1
	}
	for v := n - 1; v >= 0; v-- {
		if p := parent[v]; p >= 0 {
			next[v] = head[p]
			head[p] = int32(v)
		}
	}
	post := make([]int32, 0, n)
	stack := make([]int32, 0, 64)
	for r := 0; r < n; r++ {
		if parent[r] != -1 {
			continue
		}
		stack = append(stack, int32(r))
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			if c := head[v]; c >= 0 {
				head[v] = next[c]
				stack = append(stack, c)
			} else {
				stack = stack[:len(stack)-1]
				post = append(post, v)
			}
		}
	}
	return post
}

// maxTaskShare: splitTree splits subtrees until none holds more than this share of the total work, so that
// dynamic scheduling over a few goroutines balances well.
const maxTaskShare = 1.0 / 24

// minTaskWork is the work (complex multiply-adds) below which a whole factorisation is one task: goroutines do
// not pay off on tiny systems.
const minTaskWork = 2e5

// splitTree chooses independent subtrees of the supernodal forest (parent spar, child lists cHead/cNext, subtree
// work) by repeatedly replacing the heaviest one with its children while it holds more than maxTaskShare of the
// total. Supernodes left above the chosen subtrees form the top part.
func splitTree(spar, cHead, cNext []int32, work []float64) ([][2]int32, []int32) {
	ns := len(spar)
	taskOf := make([]int32, ns)
	for i := range taskOf {
		taskOf[i] = -1
	}
	var total float64
	var cand []int32
	for s := 0; s < ns; s++ {
		if spar[s] < 0 {
			total += work[s]
			cand = append(cand, int32(s))
		}
	}
	if total < minTaskWork {
		cand = cand[:0]
		for s := 0; s < ns; s++ {
			if spar[s] < 0 {
				cand = append(cand, int32(s))
			}
		}
	} else {
		for {
			h := -1
			for i, c := range cand {
				if cHead[c] >= 0 && work[c] > maxTaskShare*total && (h < 0 || work[c] > work[cand[h]]) {
					h = i
				}
			}
			if h < 0 {
				break
			}
			c := cand[h]
			cand = append(cand[:h], cand[h+1:]...)
			for ch := cHead[c]; ch >= 0; ch = cNext[ch] {
				cand = append(cand, ch)
			}
		}
	}
	// A subtree in postorder is the contiguous range ending at its root; its size comes from descendant counts.
	size := make([]int32, ns)
	for s := 0; s < ns; s++ {
		size[s]++
		if p := spar[s]; p >= 0 {
			size[p] += size[s]
		}
	}
	slices.SortFunc(cand, func(a, b int32) int {
		if work[a] != work[b] {
			if work[a] > work[b] {
				return -1
			}
			return 1
		}
		return int(a - b)
	})
	tasks := make([][2]int32, len(cand))
	for i, r := range cand {
		tasks[i] = [2]int32{r - size[r] + 1, r}
		for s := r - size[r] + 1; s <= r; s++ {
			taskOf[s] = int32(i)
		}
	}
	return tasks, taskOf
}

// simulateStack returns the peak size (complex entries) of the update-matrix stack when supernodes lo..hi−1
// are factored in order. With taskOf given, supernodes inside tasks are skipped and task roots' update matrices
// live outside the stack (they are computed by the task workers).
func simulateStack(lo, hi int, first []int32, rowPtr []int, spar, cHead, cNext []int32, taskOf []int32) int64 {
	var top, peak int64
	var stk []int64
	for s := lo; s < hi; s++ {
		if taskOf != nil && taskOf[s] >= 0 {
			continue
		}
		k, m := int64(first[s+1]-first[s]), int64(rowPtr[s+1]-rowPtr[s])
		cb := (m - k) * (m - k + 1) / 2
		peak = max(peak, top+cb)
		var popped int64
		for c := cHead[s]; c >= 0; c = cNext[c] {
			if taskOf != nil && taskOf[c] >= 0 {
				continue
			}
			popped += stk[len(stk)-1]
			stk = stk[:len(stk)-1]
		}
		top += cb - popped
		if spar[s] >= 0 && int(spar[s]) < hi {
			stk = append(stk, cb)
		} else if spar[s] < 0 {
			top -= cb
		}
	}
	return max(peak, top)
}
