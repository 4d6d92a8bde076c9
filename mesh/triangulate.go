package mesh

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"sync"
)

// Options controls Triangulate. The zero value asks for a quality mesh with a 28° minimum angle and no size or
// area limit.
type Options struct {
	// MinAngle is the smallest wanted angle, in degrees: 0 means 28; a negative value turns angle refinement
	// off (a plain constrained Delaunay triangulation, still refined for Size and MaxArea). Angles above about
	// 33.8° may make refinement run until MaxPoints.
	MinAngle float64
	// Size, when set, bounds every triangle's longest edge by Size(centroid).
	Size SizeFunc
	// MaxArea, when positive, bounds every triangle's area (square length units).
	MaxArea float64
	// MaxPoints caps the number of vertices; exceeding it is an error. 0 means DefaultMaxPoints.
	MaxPoints int
}

// DefaultMaxPoints is the vertex cap used when Options.MaxPoints is 0.
const DefaultMaxPoints = 1 << 24

// DefaultMinAngle is the minimum angle, in degrees, used when Options.MinAngle is 0.
const DefaultMinAngle = 28.0

// ErrTooManyPoints is returned (wrapped) when refinement would exceed Options.MaxPoints.
var ErrTooManyPoints = errors.New("mesh: refinement exceeded the point limit")

// Triangulate builds a constrained Delaunay triangulation of g and refines it for quality (Chew/Ruppert
// Delaunay refinement with concentric-shell segment splitting and the Miller–Pav–Walkington exemption at small
// input angles).
//
// Guarantees on success: triangles are counter-clockwise; every input segment, where it lies in the domain, is a union of mesh edges, listed
// in Edges with the segment's Tag (M = -1); triangles outside the outermost closed boundary or reachable from a
// hole are removed; Tags come from the region seeds (0 where none reached). Every triangle's smallest angle is
// at least MinAngle except where a smaller input angle forces it; every triangle's longest edge is at most
// Size(centroid) and its area at most MaxArea.
//
// Input handling: points with identical coordinates are merged; a vertex lying exactly on a segment splits it;
// collinear overlapping segments are merged (the earlier segment's tag wins where they overlap). With no
// segments at all, the convex hull of the points becomes the boundary (Tag 0). Errors: non-finite points,
// segment indices out of range, zero-length segments, segments that cross, region seeds outside the domain,
// an empty domain, and ErrTooManyPoints.
func Triangulate(g PSLG, opt Options) (*Mesh, error) {
	b, err := newBuilder(g)
	if err != nil {
		return nil, err
	}
	if err := b.refine(opt); err != nil {
		return nil, err
	}
	return b.output(), nil
}

// newBuilder validates g and builds its constrained Delaunay triangulation with the domain carved out and
// regions tagged.
func newBuilder(g PSLG) (*builder, error) {
	n := len(g.Points)
	if n < 3 {
		return nil, fmt.Errorf("mesh: need at least 3 points, got %d", n)
	}
	if n > math.MaxInt32/4 {
		return nil, fmt.Errorf("mesh: too many points (%d)", n)
	}
	for i, p := range g.Points {
		if math.IsNaN(p.X) || math.IsNaN(p.Y) || math.IsInf(p.X, 0) || math.IsInf(p.Y, 0) {
			return nil, fmt.Errorf("mesh: point %d (%v, %v) is not finite", i, p.X, p.Y)
		}
	}
	for i, s := range g.Segments {
		if s.A < 0 || int(s.A) >= n || s.B < 0 || int(s.B) >= n {
			return nil, fmt.Errorf("mesh: segment %d (%d, %d): point index out of range [0, %d)", i, s.A, s.B, n)
		}
	}
	for i, p := range append(append([]Point(nil), g.Holes...), seedPoints(g.Regions)...) {
		if math.IsNaN(p.X) || math.IsNaN(p.Y) || math.IsInf(p.X, 0) || math.IsInf(p.Y, 0) {
			return nil, fmt.Errorf("mesh: hole or region point %d is not finite", i)
		}
	}
	b := &builder{nIn: n, rng: 0x9E3779B97F4A7C15}
	b.pts = make([]Point, 0, 2*n+16)
	for _, p := range g.Points {
		b.addVertex(p, -1)
	}
	// Enclosing triangle, far enough out that its vertices never matter inside the domain.
	minX, minY, maxX, maxY := g.Points[0].X, g.Points[0].Y, g.Points[0].X, g.Points[0].Y
	for _, p := range g.Points {
		minX, maxX = min(minX, p.X), max(maxX, p.X)
		minY, maxY = min(minY, p.Y), max(maxY, p.Y)
	}
	cx, cy := (minX+maxX)/2, (minY+maxY)/2
	r := max(maxX-minX, maxY-minY)
	if r == 0 {
		return nil, fmt.Errorf("mesh: all points coincide")
	}
	r *= 16
	s0 := b.addVertex(Point{cx - 2*r, cy - r}, -1)
	s1 := b.addVertex(Point{cx + 2*r, cy - r}, -1)
	s2 := b.addVertex(Point{cx, cy + 2*r}, -1)
	t := b.allocTri()
	b.setTri(t, s0, s1, s2)
	b.vt[s0], b.vt[s1], b.vt[s2] = t, t, t

	// Insert the points in BRIO/Hilbert order, walking from the previous one.
	order := make([]int32, n)
	for i := range order {
		order[i] = int32(i)
	}
	hilbertOrder(b.pts, order, &b.rng)
	canon := make([]int32, n)
	last := t
	for _, i := range order {
		p := b.pts[i]
		tt, loc, k := b.walk(p, last, false)
		switch loc {
		case locVertex:
			canon[i] = k
			b.vt[i] = -1
			continue
		case locInside:
			k = -1
		case locBlocked:
			return nil, fmt.Errorf("mesh: point %d could not be located", i)
		}
		if b.insert(p, i, tt, k, false, -1) < 0 {
			return nil, fmt.Errorf("mesh: point %d could not be inserted", i)
		}
		canon[i] = i
		last = b.vt[i]
	}

	// Segments, with merged endpoints.
	b.segs = make([]Segment, 0, len(g.Segments))
	for i, s := range g.Segments {
		a, c := canon[s.A], canon[s.B]
		if a == c {
			return nil, fmt.Errorf("mesh: segment %d (%d, %d) has zero length", i, s.A, s.B)
		}
		b.segs = append(b.segs, Segment{A: a, B: c, Tag: s.Tag})
	}
	if len(b.segs) == 0 {
		b.segs = convexHull(b.pts[:n], canon)
	}
	for i, s := range b.segs {
		if err := b.recoverSegment(s.A, s.B, int32(i)); err != nil {
			return nil, fmt.Errorf("mesh: %w", err)
		}
	}
	if err := b.carve(g); err != nil {
		return nil, err
	}
	b.markPinches()
	return b, nil
}

func seedPoints(rs []RegionSeed) []Point {
	out := make([]Point, len(rs))
	for i, r := range rs {
		out[i] = r.P
	}
	return out
}

// convexHull returns the hull of the canonical points as counter-clockwise segments (Andrew's monotone chain
// with exact orientation tests; collinear boundary points are left out and later split the hull edges).
func convexHull(pts []Point, canon []int32) []Segment {
	var idx []int32
	for i := range pts {
		if canon[i] == int32(i) {
			idx = append(idx, int32(i))
		}
	}
	sort.Slice(idx, func(a, c int) bool {
		p, q := pts[idx[a]], pts[idx[c]]
		return p.X < q.X || (p.X == q.X && p.Y < q.Y)
	})
	var h []int32
	for pass := range 2 {
		base := len(h)
		for _, i := range idx {
			for len(h) >= base+2 && Orient2D(pts[h[len(h)-2]], pts[h[len(h)-1]], pts[i]) <= 0 {
				h = h[:len(h)-1]
			}
			h = append(h, i)
		}
		h = h[:len(h)-1]
		if pass == 0 {
			for a, c := 0, len(idx)-1; a < c; a, c = a+1, c-1 {
				idx[a], idx[c] = idx[c], idx[a]
			}
		}
	}
	segs := make([]Segment, len(h))
	for i := range h {
		segs[i] = Segment{A: h[i], B: h[(i+1)%len(h)]}
	}
	return segs
}

// carve removes the triangles outside the outermost boundary and those reachable from hole points, then
// spreads region tags from the seeds; no flood crosses a constrained edge.
func (b *builder) carve(g PSLG) error {
	st := b.nextStamp()
	stack := b.stack[:0]
	nt := int32(len(b.tag))
	for t := range nt {
		if !b.alive(t) {
			continue
		}
		for k := range int32(3) {
			if v := b.tv[3*t+k]; v >= int32(b.nIn) && v < int32(b.nIn)+3 {
				b.mark[t] = st
				stack = append(stack, t)
				break
			}
		}
	}
	for _, h := range g.Holes {
		if t := b.findTri(h); t >= 0 && b.mark[t] != st {
			b.mark[t] = st
			stack = append(stack, t)
		}
	}
	stack = b.flood(stack, st)
	for t := range nt {
		if b.alive(t) && b.mark[t] == st {
			for k := range int32(3) {
				if n := b.tn[3*t+k]; n >= 0 && b.mark[n] != st {
					u, v := b.tv[3*t+k], b.tv[3*t+int32(nxt[k])]
					b.linkBack(n, u, v, -1)
				}
			}
			b.killTri(t)
		}
	}
	any := false
	for t := range nt {
		if b.alive(t) {
			any = true
			for k := range int32(3) {
				b.vt[b.tv[3*t+k]] = t
			}
		}
	}
	if !any {
		return fmt.Errorf("mesh: no triangles remain: the segments enclose no region outside the holes")
	}
	for i, r := range g.Regions {
		t := b.findTri(r.P)
		if t < 0 {
			return fmt.Errorf("mesh: region seed %d (tag %d) at (%g, %g) lies outside the domain", i, r.Tag, r.P.X, r.P.Y)
		}
		st := b.nextStamp()
		b.mark[t] = st
		stack = b.flood(append(stack[:0], t), st)
		for q := range nt {
			if b.alive(q) && b.mark[q] == st {
				b.tag[q] = r.Tag
			}
		}
	}
	b.stack = stack[:0]
	return nil
}

// flood marks with st every triangle reachable from the stack without crossing a constrained edge.
func (b *builder) flood(stack []int32, st uint32) []int32 {
	for len(stack) > 0 {
		t := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for k := range int32(3) {
			n := b.tn[3*t+k]
			if n < 0 || b.tc[3*t+k] >= 0 || b.mark[n] == st {
				continue
			}
			b.mark[n] = st
			stack = append(stack, n)
		}
	}
	return stack
}

// findTri returns a live triangle containing p (closed), or -1.
func (b *builder) findTri(p Point) int32 {
	for t := int32(0); t < int32(len(b.tag)); t++ {
		if !b.alive(t) {
			continue
		}
		in := true
		for k := range int32(3) {
			if Orient2D(b.pts[b.tv[3*t+k]], b.pts[b.tv[3*t+int32(nxt[k])]], p) < 0 {
				in = false
				break
			}
		}
		if in {
			return t
		}
	}
	return -1
}

// output renumbers the vertices used by live triangles, in creation order, and assembles the Mesh.
func (b *builder) output() *Mesh {
	id := make([]int32, len(b.pts))
	for i := range id {
		id[i] = -1
	}
	nt := 0
	for t := int32(0); t < int32(len(b.tag)); t++ {
		if b.alive(t) {
			nt++
			for k := range int32(3) {
				id[b.tv[3*t+k]] = 0
			}
		}
	}
	m := &Mesh{cache: &meshCache{}}
	for v, x := range id {
		if x == 0 {
			id[v] = int32(len(m.Nodes))
			m.Nodes = append(m.Nodes, b.pts[v])
		}
	}
	m.NumVertices = len(m.Nodes)
	m.Tris = make([][3]int32, 0, nt)
	m.Tags = make([]int32, 0, nt)
	for t := int32(0); t < int32(len(b.tag)); t++ {
		if !b.alive(t) {
			continue
		}
		m.Tris = append(m.Tris, [3]int32{id[b.tv[3*t]], id[b.tv[3*t+1]], id[b.tv[3*t+2]]})
		m.Tags = append(m.Tags, b.tag[t])
		for k := range int32(3) {
			s := b.tc[3*t+k]
			n := b.tn[3*t+k]
			if s >= 0 && (n < 0 || t < n) {
				m.Edges = append(m.Edges, Edge{A: id[b.tv[3*t+k]], B: id[b.tv[3*t+int32(nxt[k])]], M: -1, Tag: b.segs[s].Tag})
			}
		}
	}
	return m
}

// meshCache holds lazily built derived data of a Mesh; shared by copies of the Mesh value.
type meshCache struct {
	once sync.Once
	loc  *Locator
}
