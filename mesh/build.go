package mesh

// builder holds one triangulation under construction. Triangles live in flat arrays indexed by 3t+k:
//
//	tv[3t+k]  corner k of triangle t, counter-clockwise; tv[3t] = -1 marks a free (deleted) slot
//	tn[3t+k]  triangle across edge k, the edge from corner k to corner k+1; -1 on the domain boundary
//	tc[3t+k]  input segment that edge k lies on, -1 for an unconstrained edge
//
// Nothing here is shared between builders, so independent triangulations can run in parallel.
type builder struct {
	pts   []Point
	nIn   int     // vertices [0, nIn) are input points; [nIn, nIn+3) the enclosing triangle; Steiner points after
	pinch []bool  // per input vertex: the domain pinches there (nil when none does)
	vseg  []int32 // for a Steiner vertex inserted on a segment, that segment; -1 otherwise
	vt    []int32 // one live triangle incident to each vertex

	tv, tn, tc []int32
	tag        []int32
	mark       []uint32 // per-triangle visit stamp
	stamp      uint32
	free       []int32

	segs []Segment
	rng  uint64

	// scratch, reused between calls
	cav    []int32
	bnd    []bedge
	newT   []int32
	stack  []int32
	enc    [][2]int32
	vlink  []int32
	vstamp []uint32
	vcur   uint32
}

// bedge is an edge u→v on the boundary of an insertion cavity, with the triangle beyond it and its segment.
type bedge struct{ u, v, out, cons, owner, tag int32 }

var (
	nxt = [3]int{1, 2, 0}
	prv = [3]int{2, 0, 1}
)

// rand returns a pseudo-random number (xorshift64*); seeded per builder so results are reproducible.
func (b *builder) rand() uint64 {
	b.rng ^= b.rng >> 12
	b.rng ^= b.rng << 25
	b.rng ^= b.rng >> 27
	return b.rng * 2685821657736338717
}

func (b *builder) alive(t int32) bool { return b.tv[3*t] >= 0 }

func (b *builder) allocTri() int32 {
	if n := len(b.free); n > 0 {
		t := b.free[n-1]
		b.free = b.free[:n-1]
		return t
	}
	t := int32(len(b.tag))
	if len(b.tag) == cap(b.tag) {
		// Double explicitly: append grows large slices by only 1.25×, which copies (and page-faults)
		// the triangle arrays several times over in a million-triangle mesh.
		n := 2*len(b.tag) + 64
		b.tv, b.tn, b.tc = reserve(b.tv, 3*n), reserve(b.tn, 3*n), reserve(b.tc, 3*n)
		b.tag, b.mark = reserve(b.tag, n), reserve(b.mark, n)
	}
	b.tv = append(b.tv, -1, -1, -1)
	b.tn = append(b.tn, -1, -1, -1)
	b.tc = append(b.tc, -1, -1, -1)
	b.tag = append(b.tag, 0)
	b.mark = append(b.mark, 0)
	return t
}

func (b *builder) killTri(t int32) {
	b.tv[3*t] = -1
	b.free = append(b.free, t)
}

func (b *builder) setTri(t, v0, v1, v2 int32) {
	b.tv[3*t], b.tv[3*t+1], b.tv[3*t+2] = v0, v1, v2
	b.tn[3*t], b.tn[3*t+1], b.tn[3*t+2] = -1, -1, -1
	b.tc[3*t], b.tc[3*t+1], b.tc[3*t+2] = -1, -1, -1
}

func (b *builder) nextStamp() uint32 {
	b.stamp++
	if b.stamp == 0 {
		clear(b.mark)
		b.stamp = 1
	}
	return b.stamp
}

// reserve returns s with capacity at least n (same length and contents).
func reserve[T any](s []T, n int) []T {
	if cap(s) >= n {
		return s
	}
	ns := make([]T, len(s), n)
	copy(ns, s)
	return ns
}

// addVertex appends p and returns its index.
func (b *builder) addVertex(p Point, seg int32) int32 {
	if len(b.pts) == cap(b.pts) {
		n := 2*len(b.pts) + 64
		b.pts, b.vseg, b.vt = reserve(b.pts, n), reserve(b.vseg, n), reserve(b.vt, n)
		b.vlink, b.vstamp = reserve(b.vlink, n), reserve(b.vstamp, n)
	}
	b.pts = append(b.pts, p)
	b.vseg = append(b.vseg, seg)
	b.vt = append(b.vt, -1)
	b.vlink = append(b.vlink, -1)
	b.vstamp = append(b.vstamp, 0)
	return int32(len(b.pts) - 1)
}

// linkBack makes out's edge v→u point at t.
func (b *builder) linkBack(out, u, v, t int32) {
	if out < 0 {
		return
	}
	o := 3 * out
	for j := range 3 {
		if b.tv[o+int32(j)] == v && b.tv[o+int32(nxt[j])] == u {
			b.tn[o+int32(j)] = t
			return
		}
	}
	panic("mesh: inconsistent adjacency")
}

// Location kinds returned by walk.
const (
	locInside  = iota // strictly inside triangle t
	locEdge           // on edge k of t
	locVertex         // coincides with vertex k (a vertex index) of t
	locBlocked        // beyond edge k of t, which is a constraint or the boundary
)

// walk finds the triangle containing p by a randomised visibility walk from t (Devillers, Pion, Teillaud,
// "Walking in a triangulation", 2002). With stopCons it never crosses a constrained edge. On locVertex the
// returned k is the vertex index.
func (b *builder) walk(p Point, t int32, stopCons bool) (int32, int, int32) {
	limit := 4*len(b.tag) + 64
	for range limit {
		base := 3 * t
		r := int(b.rand() % 3)
		blocked := int32(-1)
		moved := false
		zeros, zk := 0, 0
		for i := range 3 {
			k := (r + i) % 3
			o := Orient2D(b.pts[b.tv[base+int32(k)]], b.pts[b.tv[base+int32(nxt[k])]], p)
			if o < 0 {
				n := b.tn[base+int32(k)]
				if n < 0 || (stopCons && b.tc[base+int32(k)] >= 0) {
					blocked = int32(k)
					continue
				}
				t = n
				moved = true
				break
			}
			if o == 0 {
				zeros++
				zk = k
			}
		}
		if moved {
			continue
		}
		if blocked >= 0 {
			return t, locBlocked, blocked
		}
		switch zeros {
		case 0:
			return t, locInside, -1
		case 1:
			return t, locEdge, int32(zk)
		default:
			// p lies on two edge lines: it is the corner shared by them, the one opposite the third edge.
			for k := range 3 {
				if Orient2D(b.pts[b.tv[base+int32(k)]], b.pts[b.tv[base+int32(nxt[k])]], p) != 0 {
					return t, locVertex, b.tv[base+int32(prv[k])]
				}
			}
			return t, locVertex, b.tv[base]
		}
	}
	return b.locateBrute(p)
}

// locateBrute scans every live triangle; the fallback should a walk ever cycle.
func (b *builder) locateBrute(p Point) (int32, int, int32) {
	for t := int32(0); t < int32(len(b.tag)); t++ {
		if !b.alive(t) {
			continue
		}
		base := 3 * t
		zeros, zk, neg := 0, 0, false
		for k := range 3 {
			o := Orient2D(b.pts[b.tv[base+int32(k)]], b.pts[b.tv[base+int32(nxt[k])]], p)
			if o < 0 {
				neg = true
				break
			}
			if o == 0 {
				zeros++
				zk = k
			}
		}
		if neg {
			continue
		}
		switch zeros {
		case 0:
			return t, locInside, -1
		case 1:
			return t, locEdge, int32(zk)
		default:
			for k := range 3 {
				if Orient2D(b.pts[b.tv[base+int32(k)]], b.pts[b.tv[base+int32(nxt[k])]], p) != 0 {
					return t, locVertex, b.tv[base+int32(prv[k])]
				}
			}
		}
	}
	return -1, locBlocked, -1
}

// insert adds p (as vertex pv when pv >= 0, else as a new vertex on segment seg or none), which lies inside triangle t (k < 0) or on its edge k, by the Bowyer–Watson method: it
// deletes the triangles whose circumcircles contain p and that are reachable from t without crossing a
// constrained edge, and joins p to the boundary of that cavity. The cavity is shrunk, if rounding of p
// demands it, until p sees every boundary edge, so the new triangles are always counter-clockwise.
// When p lies on a constrained edge, the two halves stay constrained by the same segment.
//
// With checkEnc, an insertion that would make p a neighbour of a subsegment whose diametral circle contains p
// is abandoned: those subsegments are appended to b.enc and -1 is returned. -1 is also returned if p cannot be
// placed (a degenerate cavity). On success the new triangles are left in b.newT.
func (b *builder) insert(p Point, pv, t, k int32, checkEnc bool, seg int32) int32 {
	st := b.nextStamp()
	b.cav = append(b.cav[:0], t)
	b.mark[t] = st
	splitA, splitB, splitCons := int32(-1), int32(-1), int32(-1)
	seeds := 1
	if k >= 0 {
		splitA, splitB = b.tv[3*t+k], b.tv[3*t+int32(nxt[k])]
		splitCons = b.tc[3*t+k]
		if n := b.tn[3*t+k]; n >= 0 {
			b.cav = append(b.cav, n)
			b.mark[n] = st
			seeds = 2
		}
	}
	for i := 0; i < len(b.cav); i++ {
		c := b.cav[i]
		for j := range int32(3) {
			n := b.tn[3*c+j]
			if n < 0 || b.mark[n] == st || b.tc[3*c+j] >= 0 {
				continue
			}
			if InCircle(b.pts[b.tv[3*n]], b.pts[b.tv[3*n+1]], b.pts[b.tv[3*n+2]], p) > 0 {
				b.mark[n] = st
				b.cav = append(b.cav, n)
			}
		}
	}
	for {
		b.bnd = b.bnd[:0]
		for _, c := range b.cav {
			if b.mark[c] != st {
				continue
			}
			for j := range int32(3) {
				n := b.tn[3*c+j]
				if n >= 0 && b.mark[n] == st {
					continue
				}
				u, v := b.tv[3*c+j], b.tv[3*c+int32(nxt[j])]
				if (u == splitA && v == splitB) || (u == splitB && v == splitA) {
					continue
				}
				b.bnd = append(b.bnd, bedge{u, v, n, b.tc[3*c+j], c, b.tag[c]})
			}
		}
		shrunk := false
		for _, e := range b.bnd {
			if Orient2D(b.pts[e.u], b.pts[e.v], p) > 0 {
				continue
			}
			for s := range seeds {
				if e.owner == b.cav[s] {
					return -1
				}
			}
			b.mark[e.owner] = 0
			shrunk = true
		}
		if !shrunk {
			break
		}
	}
	if checkEnc {
		n0 := len(b.enc)
		for _, e := range b.bnd {
			if e.cons >= 0 && encroaches(b.pts[e.u], b.pts[e.v], p) {
				b.enc = append(b.enc, [2]int32{e.u, e.v})
			}
		}
		if len(b.enc) > n0 {
			return -1
		}
	}
	if pv < 0 {
		pv = b.addVertex(p, seg)
	}
	// Reuse the cavity's slots for the fan around p.
	slots := b.stack[:0]
	for _, c := range b.cav {
		if b.mark[c] == st {
			slots = append(slots, c)
		}
	}
	b.vcur++
	if b.vcur == 0 {
		clear(b.vstamp)
		b.vcur = 1
	}
	b.newT = b.newT[:0]
	for i, e := range b.bnd {
		var nt int32
		if i < len(slots) {
			nt = slots[i]
		} else {
			nt = b.allocTri()
		}
		b.setTri(nt, e.u, e.v, pv)
		b.tn[3*nt] = e.out
		b.tc[3*nt] = e.cons
		b.tag[nt] = e.tag // the cavity never crosses a segment, so each new triangle stays in its region
		b.linkBack(e.out, e.u, e.v, nt)
		b.vlink[e.u] = nt
		b.vstamp[e.u] = b.vcur
		b.newT = append(b.newT, nt)
	}
	for i := len(b.bnd); i < len(slots); i++ {
		b.killTri(slots[i])
	}
	b.stack = slots[:0]
	for _, nt := range b.newT {
		u, v := b.tv[3*nt], b.tv[3*nt+1]
		if b.vstamp[v] == b.vcur {
			w := b.vlink[v]
			b.tn[3*nt+1] = w
			b.tn[3*w+2] = nt
		}
		if splitCons >= 0 {
			if v == splitA || v == splitB {
				b.tc[3*nt+1] = splitCons
			}
			if u == splitA || u == splitB {
				b.tc[3*nt+2] = splitCons
			}
		}
		b.vt[u], b.vt[v] = nt, nt
	}
	b.vt[pv] = b.newT[0]
	return pv
}

// encroaches reports whether p lies strictly inside the diametral circle of segment ab.
func encroaches(a, b, p Point) bool {
	return (a.X-p.X)*(b.X-p.X)+(a.Y-p.Y)*(b.Y-p.Y) < 0
}

// findEdge returns a live triangle and edge index holding the edge between vertices a and c (in either
// direction), or (-1, -1). It turns around a, then around c; a vertex where the domain pinches (two separate
// fans) may hide the edge from both, and then every triangle is scanned.
func (b *builder) findEdge(a, c int32) (int32, int32) {
	if t, k := b.findEdgeAround(a, c); t >= 0 {
		return t, k
	}
	if t, k := b.findEdgeAround(c, a); t >= 0 {
		return t, k
	}
	if !b.pinched(a) && !b.pinched(c) {
		return -1, -1
	}
	for t := int32(0); t < int32(len(b.tag)); t++ {
		if !b.alive(t) {
			continue
		}
		for k := range int32(3) {
			u, v := b.tv[3*t+k], b.tv[3*t+int32(nxt[k])]
			if (u == a && v == c) || (u == c && v == a) {
				return t, k
			}
		}
	}
	return -1, -1
}

// pinched reports whether v is an input vertex where the domain pinches (see markPinches).
func (b *builder) pinched(v int32) bool { return int(v) < len(b.pinch) && b.pinch[v] }

// markPinches records the input vertices whose triangles form more than one fan (the domain touches itself
// there), where turning around the vertex cannot reach every edge. Vertices inserted later never pinch.
func (b *builder) markPinches() {
	count := make([]int32, b.nIn)
	for t := int32(0); t < int32(len(b.tag)); t++ {
		if b.alive(t) {
			for k := range int32(3) {
				if v := b.tv[3*t+k]; v < int32(b.nIn) {
					count[v]++
				}
			}
		}
	}
	b.pinch = nil
	for v := range int32(b.nIn) {
		if count[v] > 0 && b.fanSize(v) != count[v] {
			if b.pinch == nil {
				b.pinch = make([]bool, b.nIn)
			}
			b.pinch[v] = true
		}
	}
}

// fanSize counts the triangles reachable by turning around v from b.vt[v].
func (b *builder) fanSize(v int32) int32 {
	t0 := b.vt[v]
	if t0 < 0 {
		return 0
	}
	n := int32(0)
	for dir := range 2 {
		t := t0
		for {
			base := 3 * t
			i := int32(0)
			for b.tv[base+i] != v {
				i++
			}
			if dir == 0 {
				n++
				t = b.tn[base+int32(prv[i])]
			} else {
				t = b.tn[base+i]
				if t >= 0 {
					n++
				}
			}
			if t < 0 || t == t0 {
				break
			}
		}
		if t == t0 {
			break
		}
	}
	return n
}

// findEdgeAround looks for the edge a–c in the fan of triangles around a that contains b.vt[a].
func (b *builder) findEdgeAround(a, c int32) (int32, int32) {
	t0 := b.vt[a]
	if t0 < 0 || !b.alive(t0) {
		return -1, -1
	}
	// Rotate one way around a, then the other if the fan is open (a on the boundary).
	for dir := range 2 {
		t := t0
		for steps := 0; steps < 1<<20; steps++ {
			base := 3 * t
			i := int32(0)
			for b.tv[base+i] != a {
				i++
			}
			if b.tv[base+int32(nxt[i])] == c {
				return t, i
			}
			if b.tv[base+int32(prv[i])] == c {
				return t, int32(prv[i])
			}
			var n int32
			if dir == 0 {
				n = b.tn[base+int32(prv[i])]
			} else {
				n = b.tn[base+i]
			}
			if n < 0 {
				break
			}
			t = n
			if t == t0 {
				return -1, -1
			}
		}
	}
	return -1, -1
}
