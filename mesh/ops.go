package mesh

import (
	"cmp"
	"math"
	"slices"
	"sort"
)

// Area returns the (positive, for a counter-clockwise triangle) area of triangle t, in square length units.
func (m *Mesh) Area(t int) float64 {
	v := m.Tris[t]
	return 0.5 * Orient2D(m.Nodes[v[0]], m.Nodes[v[1]], m.Nodes[v[2]])
}

// vertexTris returns, in CSR form, the triangles around each corner vertex.
func (m *Mesh) vertexTris() (start, list []int32) {
	start = make([]int32, m.NumVertices+1)
	for _, tr := range m.Tris {
		for _, v := range tr {
			start[v+1]++
		}
	}
	for i := 1; i < len(start); i++ {
		start[i] += start[i-1]
	}
	list = make([]int32, start[len(start)-1])
	fill := append([]int32(nil), start[:m.NumVertices]...)
	for t, tr := range m.Tris {
		for _, v := range tr {
			list[fill[v]] = int32(t)
			fill[v]++
		}
	}
	return start, list
}

// Neighbors returns, for each triangle t and edge k (from corner k to corner k+1), the triangle across that
// edge, or -1 on the boundary. It costs O(triangles · vertex degree) and allocates the result.
func (m *Mesh) Neighbors() [][3]int32 {
	start, list := m.vertexTris()
	nb := make([][3]int32, len(m.Tris))
	for t, tr := range m.Tris {
		for k := range 3 {
			a, b := tr[k], tr[(k+1)%3]
			nb[t][k] = -1
			for _, s := range list[start[b]:start[b+1]] {
				q := m.Tris[s]
				if (q[0] == b && q[1] == a) || (q[1] == b && q[2] == a) || (q[2] == b && q[0] == a) {
					nb[t][k] = s
					break
				}
			}
		}
	}
	return nb
}

func edgeKey(a, b int32) uint64 {
	if a > b {
		a, b = b, a
	}
	return uint64(uint32(a))<<32 | uint64(uint32(b))
}

// MakeQuadratic turns a linear mesh into a quadratic (6-node) one: it appends one node at the midpoint of
// every edge after the corner vertices (shared by the two triangles on an interior edge), fills Mid and sets
// Edges[i].M. The number of added nodes equals the number of mesh edges. It does nothing on a mesh that is
// already quadratic.
func (m *Mesh) MakeQuadratic() {
	if m.Mid != nil {
		return
	}
	nb := m.Neighbors()
	m.Nodes = m.Nodes[:m.NumVertices:m.NumVertices]
	mid := make([][3]int32, len(m.Tris))
	for t := range mid {
		mid[t] = [3]int32{-1, -1, -1}
	}
	for t, tr := range m.Tris {
		for k := range 3 {
			n := nb[t][k]
			if n >= 0 && int(n) < t {
				for j := range 3 {
					if nb[n][j] == int32(t) {
						mid[t][k] = mid[n][j]
					}
				}
				continue
			}
			a, b := m.Nodes[tr[k]], m.Nodes[tr[(k+1)%3]]
			mid[t][k] = int32(len(m.Nodes))
			m.Nodes = append(m.Nodes, Point{(a.X + b.X) / 2, (a.Y + b.Y) / 2})
		}
	}
	m.Mid = mid
	if len(m.Edges) == 0 {
		return
	}
	byKey := make(map[uint64]int32, len(m.Edges))
	for t, tr := range m.Tris {
		for k := range 3 {
			byKey[edgeKey(tr[k], tr[(k+1)%3])] = mid[t][k]
		}
	}
	for i, e := range m.Edges {
		if x, ok := byKey[edgeKey(e.A, e.B)]; ok {
			m.Edges[i].M = x
		}
	}
}

// Quality summarises a mesh.
type Quality struct {
	// MinAngleDeg is the smallest triangle angle, in degrees.
	MinAngleDeg float64
	// MaxAspectRatio is the largest aspect ratio, defined per triangle as longest edge / (2·√3·inradius):
	// 1 for an equilateral triangle, growing without bound as a triangle degenerates.
	MaxAspectRatio float64
	// Regions holds the triangle count and total area (square length units) of each tag, by increasing tag.
	Regions []RegionStat
}

// RegionStat is the triangle count and area of one region tag.
type RegionStat struct {
	Tag   int32
	Count int
	Area  float64
}

// Quality computes the mesh's angle and aspect-ratio extremes and per-tag statistics.
func (m *Mesh) Quality() Quality {
	q := Quality{MinAngleDeg: 180}
	stats := map[int32]*RegionStat{}
	for t, tr := range m.Tris {
		p := [3]Point{m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]}
		var l [3]float64 // l[k]: length of the edge opposite corner k
		for k := range 3 {
			l[k] = math.Sqrt(dist2(p[(k+1)%3], p[(k+2)%3]))
		}
		area := m.Area(t)
		for k := range 3 {
			// Angle at corner k from the law of cosines, clamped against rounding.
			c := (l[(k+1)%3]*l[(k+1)%3] + l[(k+2)%3]*l[(k+2)%3] - l[k]*l[k]) / (2 * l[(k+1)%3] * l[(k+2)%3])
			a := math.Acos(max(-1, min(1, c))) * 180 / math.Pi
			q.MinAngleDeg = min(q.MinAngleDeg, a)
		}
		s := (l[0] + l[1] + l[2]) / 2
		inr := area / s
		ar := max(l[0], l[1], l[2]) / (2 * math.Sqrt(3) * inr)
		if area <= 0 {
			ar = math.Inf(1)
		}
		q.MaxAspectRatio = max(q.MaxAspectRatio, ar)
		tag := int32(0)
		if t < len(m.Tags) {
			tag = m.Tags[t]
		}
		st := stats[tag]
		if st == nil {
			st = &RegionStat{Tag: tag}
			stats[tag] = st
		}
		st.Count++
		st.Area += area
	}
	if len(m.Tris) == 0 {
		q.MinAngleDeg = 0
	}
	for _, st := range stats {
		q.Regions = append(q.Regions, *st)
	}
	sort.Slice(q.Regions, func(i, j int) bool { return q.Regions[i].Tag < q.Regions[j].Tag })
	return q
}

// Extract returns the sub-mesh of the triangles whose tag satisfies keep, and nodeMap[subNode] = parent node.
// Sub-mesh vertices come first (in parent order), then, for a quadratic parent, its midpoint nodes. sub.Edges
// holds every sub-mesh edge that is a parent Edge (with its Tag and mapped M) plus every other edge on the
// sub-mesh boundary with Tag -1, so a solver on the part sees its whole boundary.
func (m *Mesh) Extract(keep func(tag int32) bool) (sub *Mesh, nodeMap []int32) {
	nb := m.Neighbors()
	kept := make([]bool, len(m.Tris))
	newNode := make([]int32, len(m.Nodes))
	for i := range newNode {
		newNode[i] = -1
	}
	for t, tr := range m.Tris {
		if keep(m.Tags[t]) {
			kept[t] = true
			for _, v := range tr {
				newNode[v] = 0
			}
		}
	}
	sub = &Mesh{cache: &meshCache{}}
	for v := 0; v < m.NumVertices; v++ {
		if newNode[v] == 0 {
			newNode[v] = int32(len(sub.Nodes))
			sub.Nodes = append(sub.Nodes, m.Nodes[v])
			nodeMap = append(nodeMap, int32(v))
		}
	}
	sub.NumVertices = len(sub.Nodes)
	if m.Mid != nil {
		for t := range m.Tris {
			if kept[t] {
				for _, v := range m.Mid[t] {
					newNode[v] = 0
				}
			}
		}
		for v := m.NumVertices; v < len(m.Nodes); v++ {
			if newNode[v] == 0 {
				newNode[v] = int32(len(sub.Nodes))
				sub.Nodes = append(sub.Nodes, m.Nodes[v])
				nodeMap = append(nodeMap, int32(v))
			}
		}
	}
	parentEdge := make(map[uint64]Edge, len(m.Edges))
	for _, e := range m.Edges {
		parentEdge[edgeKey(e.A, e.B)] = e
	}
	for t, tr := range m.Tris {
		if !kept[t] {
			continue
		}
		sub.Tris = append(sub.Tris, [3]int32{newNode[tr[0]], newNode[tr[1]], newNode[tr[2]]})
		sub.Tags = append(sub.Tags, m.Tags[t])
		if m.Mid != nil {
			md := m.Mid[t]
			sub.Mid = append(sub.Mid, [3]int32{newNode[md[0]], newNode[md[1]], newNode[md[2]]})
		}
		for k := range 3 {
			n := nb[t][k]
			onBoundary := n < 0 || !kept[n]
			if !onBoundary && int(n) < t {
				continue
			}
			a, b := tr[k], tr[(k+1)%3]
			pe, isSeg := parentEdge[edgeKey(a, b)]
			if !isSeg && !onBoundary {
				continue
			}
			e := Edge{A: newNode[a], B: newNode[b], M: -1, Tag: -1}
			if isSeg {
				e.Tag = pe.Tag
			}
			if m.Mid != nil {
				e.M = newNode[m.Mid[t][k]]
			}
			sub.Edges = append(sub.Edges, e)
		}
	}
	return sub, nodeMap
}

// SortLocal renumbers the triangles along a Hilbert curve through their centroids, and the vertices in the order
// the triangles first use them, so that what is near in the plane is near in memory: passes over the triangles
// then gather their nodes' values from few cache lines, and the sparse matrices of a finite-element model built
// on the mesh have their entries close to the diagonal. The triangles, their tags and orientation, and the edges
// are unchanged but for the numbering. It must run before MakeQuadratic (it panics on a quadratic mesh) and
// drops any point-location index.
func (m *Mesh) SortLocal() {
	if m.Mid != nil {
		panic("mesh: SortLocal on a quadratic mesh")
	}
	nt := len(m.Tris)
	if nt == 0 {
		return
	}
	lo, hi := Point{math.Inf(1), math.Inf(1)}, Point{math.Inf(-1), math.Inf(-1)}
	for _, p := range m.Nodes[:m.NumVertices] {
		lo.X, lo.Y = math.Min(lo.X, p.X), math.Min(lo.Y, p.Y)
		hi.X, hi.Y = math.Max(hi.X, p.X), math.Max(hi.Y, p.Y)
	}
	span := math.Max(hi.X-lo.X, hi.Y-lo.Y)
	if !(span > 0) {
		return
	}
	const bits = 16
	scale := float64(int(1)<<bits-1) / span
	key := make([]uint64, nt)
	for t, tr := range m.Tris {
		a, b, c := m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]
		x := uint32(((a.X+b.X+c.X)/3 - lo.X) * scale)
		y := uint32(((a.Y+b.Y+c.Y)/3 - lo.Y) * scale)
		key[t] = hilbert(bits, x, y)
	}
	order := make([]int32, nt)
	for t := range order {
		order[t] = int32(t)
	}
	slices.SortFunc(order, func(a, b int32) int {
		if c := cmp.Compare(key[a], key[b]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	newID := make([]int32, m.NumVertices)
	for i := range newID {
		newID[i] = -1
	}
	next := int32(0)
	tris := make([][3]int32, nt)
	tags := make([]int32, nt)
	for i, t := range order {
		for k, v := range m.Tris[t] {
			if newID[v] < 0 {
				newID[v] = next
				next++
			}
			tris[i][k] = newID[v]
		}
		tags[i] = m.Tags[t]
	}
	for v := range newID { // vertices no triangle uses keep their relative order, last
		if newID[v] < 0 {
			newID[v] = next
			next++
		}
	}
	nodes := make([]Point, len(m.Nodes))
	copy(nodes[m.NumVertices:], m.Nodes[m.NumVertices:])
	for v, id := range newID {
		nodes[id] = m.Nodes[v]
	}
	for i, e := range m.Edges {
		m.Edges[i].A, m.Edges[i].B = newID[e.A], newID[e.B]
	}
	m.Nodes, m.Tris, m.Tags = nodes, tris, tags
	m.cache = nil
}

// hilbert returns the position of cell (x, y) along the Hilbert curve through a 2^bits × 2^bits grid, by the
// usual rotate-and-flip walk from the largest quadrant down (as in Warren, Hacker's Delight, on the Hilbert
// curve; cited from memory).
func hilbert(bits int, x, y uint32) uint64 {
	n := uint32(1) << bits
	var d uint64
	for s := n >> 1; s > 0; s >>= 1 {
		var rx, ry uint32
		if x&s != 0 {
			rx = 1
		}
		if y&s != 0 {
			ry = 1
		}
		d += uint64(s) * uint64(s) * uint64((3*rx)^ry)
		if ry == 0 {
			if rx == 1 {
				x, y = n-1-x, n-1-y
			}
			x, y = y, x
		}
	}
	return d
}
