package sparse

import (
	"fmt"
	"math"
)

// Ordering selects the fill-reducing ordering applied before factorisation.
type Ordering int

const (
	// OrderAuto uses nested dissection on the node coordinates when Options.Coords is given and graph nested
	// dissection otherwise.
	OrderAuto Ordering = iota
	// OrderNestedDissection is nested dissection: recursive coordinate bisection with vertex separators taken
	// from the graph when coordinates are given, breadth-first level-structure separators otherwise.
	OrderNestedDissection
	// OrderMinimumDegree is an exact-degree minimum degree ordering on the explicit elimination graph. It needs
	// no coordinates; it is slower to compute than nested dissection on large 2D meshes.
	OrderMinimumDegree
	// OrderNatural keeps the given numbering.
	OrderNatural
)

func (o Ordering) String() string {
	switch o {
	case OrderAuto:
		return "auto"
	case OrderNestedDissection:
		return "nested-dissection"
	case OrderMinimumDegree:
		return "minimum-degree"
	case OrderNatural:
		return "natural"
	}
	return fmt.Sprintf("Ordering(%d)", int(o))
}

// graph is the adjacency structure of the full symmetric matrix without the diagonal (CSR).
type graph struct {
	xadj []int
	adj  []int32
}

func (g *graph) n() int               { return len(g.xadj) - 1 }
func (g *graph) nbrs(v int32) []int32 { return g.adj[g.xadj[v]:g.xadj[v+1]] }

func newGraph(a *Matrix) *graph {
	n := a.N
	xadj := make([]int, n+1)
	for j := 0; j < n; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			if i := int(a.RowIdx[p]); i != j {
				xadj[i+1]++
				xadj[j+1]++
			}
		}
	}
	for i := 0; i < n; i++ {
		xadj[i+1] += xadj[i]
	}
	adj := make([]int32, xadj[n])
	next := make([]int, n)
	copy(next, xadj[:n])
	for j := 0; j < n; j++ {
		for p := a.ColPtr[j]; p < a.ColPtr[j+1]; p++ {
			if i := a.RowIdx[p]; int(i) != j {
				adj[next[i]] = int32(j)
				next[i]++
				adj[next[j]] = i
				next[j]++
			}
		}
	}
	return &graph{xadj: xadj, adj: adj}
}

// denseThreshold is the degree above which a row counts as dense for ordering purposes (as in minimum degree
// codes, a multiple of √n, never below a typical mesh degree).
func denseThreshold(n int) int { return max(64, int(10*math.Sqrt(float64(n)))) }

// leafSize is the subgraph size below which nested dissection stops splitting.
const leafSize = 16

// order returns perm with perm[k] = the original index of the k-th pivot.
func order(g *graph, opt Options) ([]int32, Ordering, error) {
	n := g.n()
	o := opt.Ordering
	hasCoords := len(opt.Coords) == n && n > 0
	if opt.Coords != nil && len(opt.Coords) != n {
		return nil, o, fmt.Errorf("sparse: %d coordinates given for %d unknowns", len(opt.Coords), n)
	}
	if o == OrderAuto {
		o = OrderNestedDissection
	}
	switch o {
	case OrderNatural:
		p := make([]int32, n)
		for i := range p {
			p[i] = int32(i)
		}
		return p, o, nil
	case OrderMinimumDegree:
		return minimumDegree(g, opt.Coords), o, nil
	case OrderNestedDissection:
		d := &dissector{g: g, mark: make([]int32, n), level: make([]int32, n), out: make([]int32, 0, n)}
		// Unknowns without coordinates and dense rows (circuit unknowns coupling to a whole conductor) are left
		// out of the dissection and numbered last; they would otherwise short-circuit the separators.
		dense := denseThreshold(n)
		var tail []int32
		set := make([]int32, 0, n)
		for v := 0; v < n; v++ {
			if (hasCoords && (math.IsNaN(opt.Coords[v][0]) || math.IsNaN(opt.Coords[v][1]))) ||
				len(g.nbrs(int32(v))) > dense {
				tail = append(tail, int32(v))
			} else {
				set = append(set, int32(v))
			}
		}
		if hasCoords {
			d.xy = opt.Coords
			d.coordND(set)
		} else {
			d.graphND(set)
		}
		d.out = append(d.out, tail...)
		return d.out, o, nil
	}
	return nil, o, fmt.Errorf("sparse: unknown ordering %d", int(o))
}

// dissector carries the work arrays of one nested-dissection ordering.
type dissector struct {
	g     *graph
	xy    [][2]float64
	mark  []int32 // per-node stamp or side label; zero outside the set being split
	level []int32
	stamp int32
	out   []int32
}

// coordND orders set by recursive coordinate bisection: split at the median along the longer extent (or, when
// that cut is long for the set's size, at the best of several ranks along either axis), take as separator the
// smaller of the two sets of boundary vertices (those with a neighbour across the cut), order the
// two remaining halves recursively and the separator last.
func (d *dissector) coordND(set []int32) {
	if len(set) <= leafSize {
		d.out = append(d.out, set...)
		return
	}
	xy := d.xy
	x0, x1, y0, y1 := math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
	for _, v := range set {
		p := xy[v]
		x0, x1 = min(x0, p[0]), max(x1, p[0])
		y0, y1 = min(y0, p[1]), max(y1, p[1])
	}
	// Candidate cuts: both axes, at several ranks about the median. A graded mesh is dense near conductor
	// surfaces, so a straight cut at the median often runs along a fine region; a cut a little off the median can
	// cross far fewer vertices. Pick the cut with the smallest separator per vertex of the smaller side.
	const sideL, sideR = 1, 2
	type cut struct {
		axis, rank int
		score      float64
	}
	longer := 0
	if y1-y0 > x1-x0 {
		longer = 1
	}
	half := len(set) / 2
	selectByCoord(set, half, xy, longer)
	best := cut{longer, half, float64(d.boundaryCount(set[:half], set[half:])) / float64(min(half, len(set)-half))}
	// A median cut through a uniform 2D mesh leaves a separator of about √n vertices (score·√n near 2 to 4 for
	// linear and quadratic elements); only a cut well above that is worth the search.
	if len(set) >= ndTrialMin && best.score*math.Sqrt(float64(len(set))) > ndSearchAbove {
		for _, axis := range []int{0, 1} {
			for _, fr := range [...]float64{0.25, 0.33, 0.42, 0.5, 0.58, 0.67, 0.75} {
				k := int(fr * float64(len(set)))
				if k <= 0 || k >= len(set) || (axis == longer && k == half) {
					continue
				}
				selectByCoord(set, k, xy, axis)
				score := float64(d.boundaryCount(set[:k], set[k:])) / float64(min(k, len(set)-k))
				if score < best.score {
					best = cut{axis, k, score}
				}
			}
		}
	}
	mid := best.rank
	selectByCoord(set, mid, xy, best.axis)
	left, right := set[:mid], set[mid:]
	nl, nr := d.markSides(left, right)
	// Partition into [part A | part B | separator] in a fresh slice so the recursion can reuse set's storage.
	sepSide, cross := int32(sideL), int32(sideR)
	if nr < nl {
		sepSide, cross = sideR, sideL
	}
	tmp := make([]int32, 0, len(set))
	var sep []int32
	for _, v := range set {
		if d.mark[v] == sepSide && d.touches(v, cross) {
			sep = append(sep, v)
		}
	}
	for _, v := range left {
		if !(sepSide == sideL && d.touches(v, cross)) {
			tmp = append(tmp, v)
		}
	}
	na := len(tmp)
	for _, v := range right {
		if !(sepSide == sideR && d.touches(v, cross)) {
			tmp = append(tmp, v)
		}
	}
	for _, v := range set {
		d.mark[v] = 0
	}
	if len(sep) == 0 && (na == 0 || na == len(tmp)) {
		d.out = append(d.out, set...)
		return
	}
	nb := len(tmp) - na
	copy(set, tmp)
	d.coordND(set[:na])
	d.coordND(set[na : na+nb])
	d.out = append(d.out, sep...)
}

// ndTrialMin is the set size from which coordND may try cuts other than the median.
const ndTrialMin = 500

// ndSearchAbove is the normalised separator size (separator over the smaller side, times √n) of a median cut
// above which coordND searches other cuts.
const ndSearchAbove = 3.0

// markSides labels left and right (sides 1 and 2) and counts the vertices of each that have a neighbour on the
// other side.
func (d *dissector) markSides(left, right []int32) (nl, nr int) {
	const sideL, sideR = 1, 2
	for _, v := range left {
		d.mark[v] = sideL
	}
	for _, v := range right {
		d.mark[v] = sideR
	}
	for _, v := range left {
		if d.touches(v, sideR) {
			nl++
		}
	}
	for _, v := range right {
		if d.touches(v, sideL) {
			nr++
		}
	}
	return nl, nr
}

// boundaryCount is the size of the smaller boundary of a trial cut (see markSides); it leaves no marks.
func (d *dissector) boundaryCount(left, right []int32) int {
	nl, nr := d.markSides(left, right)
	for _, v := range left {
		d.mark[v] = 0
	}
	for _, v := range right {
		d.mark[v] = 0
	}
	return min(nl, nr)
}

func (d *dissector) touches(v int32, side int32) bool {
	for _, u := range d.g.nbrs(v) {
		if d.mark[u] == side {
			return true
		}
	}
	return false
}

// selectByCoord reorders s so that s[k] is the element of rank k in (coordinate axis, other coordinate, index)
// order, smaller ones before it and larger after (Hoare's selection).
func selectByCoord(s []int32, k int, xy [][2]float64, axis int) {
	less := func(a, b int32) bool {
		pa, pb := xy[a], xy[b]
		if pa[axis] != pb[axis] {
			return pa[axis] < pb[axis]
		}
		if pa[1-axis] != pb[1-axis] {
			return pa[1-axis] < pb[1-axis]
		}
		return a < b
	}
	lo, hi := 0, len(s)-1
	for hi > lo {
		m := lo + (hi-lo)/2
		// median of three to s[m]
		if less(s[m], s[lo]) {
			s[m], s[lo] = s[lo], s[m]
		}
		if less(s[hi], s[lo]) {
			s[hi], s[lo] = s[lo], s[hi]
		}
		if less(s[hi], s[m]) {
			s[hi], s[m] = s[m], s[hi]
		}
		pivot := s[m]
		i, j := lo, hi
		for i <= j {
			for less(s[i], pivot) {
				i++
			}
			for less(pivot, s[j]) {
				j--
			}
			if i <= j {
				s[i], s[j] = s[j], s[i]
				i++
				j--
			}
		}
		if k <= j {
			hi = j
		} else if k >= i {
			lo = i
		} else {
			return
		}
	}
}

// graphND orders set by nested dissection with breadth-first level structures rooted at a pseudo-peripheral
// vertex: the level where the cumulative count passes half is the separator, thinned by moving vertices with no
// neighbour in the far part to the near part. Disconnected pieces are ordered one after the other.
func (d *dissector) graphND(set []int32) {
	if len(set) <= leafSize {
		d.out = append(d.out, set...)
		return
	}
	d.stamp++
	in := d.stamp
	for _, v := range set {
		d.mark[v] = in
	}
	// Pseudo-peripheral start: repeat BFS from a minimum-degree vertex of the last level while the depth grows.
	start := set[0]
	order, nlev := d.bfs(start, in)
	for it := 0; it < 4; it++ {
		last := order[len(order)-1]
		lastLev := d.level[last]
		best := last
		for i := len(order) - 1; i >= 0 && d.level[order[i]] == lastLev; i-- {
			if len(d.g.nbrs(order[i])) < len(d.g.nbrs(best)) {
				best = order[i]
			}
		}
		o2, n2 := d.bfs(best, in)
		if n2 <= nlev {
			break
		}
		order, nlev = o2, n2
	}
	if len(order) < len(set) {
		// Disconnected: order the reached component, then the rest.
		for _, v := range order {
			d.mark[v] = -in
		}
		rest := make([]int32, 0, len(set)-len(order))
		for _, v := range set {
			if d.mark[v] == in {
				rest = append(rest, v)
			}
		}
		comp := append([]int32(nil), order...)
		for _, v := range set {
			d.mark[v] = 0
		}
		d.graphND(comp)
		d.graphND(rest)
		return
	}
	// order is sorted by level; find the separator level.
	half := len(order) / 2
	sepLev := d.level[order[half]]
	if sepLev == 0 {
		sepLev = 1
	}
	var a, b, sep []int32
	for _, v := range order {
		switch l := d.level[v]; {
		case l < sepLev:
			a = append(a, v)
		case l > sepLev:
			b = append(b, v)
		default:
			// keep in the separator only if it touches the far part
			far := false
			for _, u := range d.g.nbrs(v) {
				if d.mark[u] == in && d.level[u] > sepLev {
					far = true
					break
				}
			}
			if far {
				sep = append(sep, v)
			} else {
				a = append(a, v)
			}
		}
	}
	for _, v := range set {
		d.mark[v] = 0
		d.level[v] = 0
	}
	if len(b) == 0 {
		// No useful split (e.g. a clique-like piece): stop here.
		d.out = append(d.out, set...)
		return
	}
	d.graphND(a)
	d.graphND(b)
	d.out = append(d.out, sep...)
}

// bfs runs a breadth-first search from s within the vertices stamped in, setting level for the reached ones and
// returning the visit order (sorted by level) and the number of levels. Marks are left as they were.
func (d *dissector) bfs(s int32, in int32) ([]int32, int32) {
	order := make([]int32, 0, 64)
	order = append(order, s)
	d.level[s] = 0
	d.mark[s] = -in // visited
	var nlev int32 = 1
	for h := 0; h < len(order); h++ {
		v := order[h]
		lv := d.level[v]
		for _, u := range d.g.nbrs(v) {
			if d.mark[u] == in {
				d.mark[u] = -in
				d.level[u] = lv + 1
				nlev = max(nlev, lv+2)
				order = append(order, u)
			}
		}
	}
	for _, v := range order {
		d.mark[v] = in
	}
	return order, nlev
}
