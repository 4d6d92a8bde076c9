package mesh

import (
	"fmt"
	"math"
)

// Check verifies the mesh with exact predicates and returns the first defect found:
//   - index ranges and slice lengths (Tags, Mid);
//   - every triangle counter-clockwise with positive area;
//   - conformity: no directed edge used twice (overlap), every vertex used, and every edge used by only one
//     triangle (a boundary edge) listed in Edges — so no hanging node or gap hides inside the domain;
//   - every Edges entry is a mesh edge;
//   - the constrained Delaunay property: across every interior edge that is not in Edges, the opposite
//     vertex lies on or outside the triangle's circumcircle;
//   - for a quadratic mesh, midpoint nodes at edge midpoints and shared by both triangles of an edge.
func (m *Mesh) Check() error {
	nv := int32(m.NumVertices)
	if m.NumVertices > len(m.Nodes) {
		return fmt.Errorf("mesh check: NumVertices %d > %d nodes", m.NumVertices, len(m.Nodes))
	}
	if len(m.Tags) != len(m.Tris) {
		return fmt.Errorf("mesh check: %d tags for %d triangles", len(m.Tags), len(m.Tris))
	}
	used := make([]bool, nv)
	for t, tr := range m.Tris {
		for _, v := range tr {
			if v < 0 || v >= nv {
				return fmt.Errorf("mesh check: triangle %d corner %d out of range", t, v)
			}
			used[v] = true
		}
		if Orient2D(m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]) <= 0 {
			return fmt.Errorf("mesh check: triangle %d %v is not counter-clockwise", t, tr)
		}
	}
	for v, u := range used {
		if !u {
			return fmt.Errorf("mesh check: vertex %d is in no triangle", v)
		}
	}
	type loc struct{ t, k int32 }
	half := make(map[uint64]loc, 3*len(m.Tris))
	for t, tr := range m.Tris {
		for k := range 3 {
			key := uint64(uint32(tr[k]))<<32 | uint64(uint32(tr[(k+1)%3]))
			if _, dup := half[key]; dup {
				return fmt.Errorf("mesh check: edge (%d, %d) is used twice in the same direction (overlap)", tr[k], tr[(k+1)%3])
			}
			half[key] = loc{int32(t), int32(k)}
		}
	}
	seg := make(map[uint64]bool, len(m.Edges))
	for i, e := range m.Edges {
		if e.A < 0 || e.A >= nv || e.B < 0 || e.B >= nv {
			return fmt.Errorf("mesh check: Edges[%d] out of range", i)
		}
		_, f := half[uint64(uint32(e.A))<<32|uint64(uint32(e.B))]
		_, r := half[uint64(uint32(e.B))<<32|uint64(uint32(e.A))]
		if !f && !r {
			return fmt.Errorf("mesh check: Edges[%d] (%d, %d) is not a mesh edge", i, e.A, e.B)
		}
		seg[edgeKey(e.A, e.B)] = true
	}
	for t, tr := range m.Tris {
		for k := range 3 {
			a, b := tr[k], tr[(k+1)%3]
			o, ok := half[uint64(uint32(b))<<32|uint64(uint32(a))]
			if !ok {
				if !seg[edgeKey(a, b)] {
					return fmt.Errorf("mesh check: boundary edge (%d, %d) of triangle %d is not in Edges (gap or hanging node)", a, b, t)
				}
				continue
			}
			if seg[edgeKey(a, b)] || int(o.t) < t {
				continue
			}
			apex := m.Tris[o.t][(o.k+2)%3]
			if InCircle(m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]], m.Nodes[apex]) > 0 {
				return fmt.Errorf("mesh check: edge (%d, %d) between triangles %d and %d is not locally Delaunay", a, b, t, o.t)
			}
		}
	}
	if m.Mid == nil {
		return nil
	}
	if len(m.Mid) != len(m.Tris) {
		return fmt.Errorf("mesh check: %d Mid entries for %d triangles", len(m.Mid), len(m.Tris))
	}
	for t, tr := range m.Tris {
		for k := range 3 {
			x := m.Mid[t][k]
			if x < nv || int(x) >= len(m.Nodes) {
				return fmt.Errorf("mesh check: triangle %d midpoint node %d out of range", t, x)
			}
			a, b := m.Nodes[tr[k]], m.Nodes[tr[(k+1)%3]]
			p := m.Nodes[x]
			if math.Hypot(p.X-(a.X+b.X)/2, p.Y-(a.Y+b.Y)/2) > 1e-12*math.Hypot(a.X-b.X, a.Y-b.Y) {
				return fmt.Errorf("mesh check: triangle %d midpoint node %d is off its edge's midpoint", t, x)
			}
			if o, ok := half[uint64(uint32(tr[(k+1)%3]))<<32|uint64(uint32(tr[k]))]; ok && m.Mid[o.t][o.k] != x {
				return fmt.Errorf("mesh check: triangles %d and %d have different midpoint nodes on a shared edge", t, o.t)
			}
		}
	}
	return nil
}

// CheckSegments verifies that every segment of g whose end points are mesh vertices is the union of mesh
// edges listed in Edges with the segment's Tag (where segments overlap, any of their tags is accepted). Split
// points count as on a segment within 1e-12 of its length (they are rounded interpolations).
// Segments with an end point missing from the mesh (for instance inside a hole) are skipped, and so are the
// pieces of a segment that lie outside every triangle (dangling parts outside the domain).
func (m *Mesh) CheckSegments(g PSLG) error {
	at := make(map[Point]int32, m.NumVertices)
	for v := 0; v < m.NumVertices; v++ {
		at[m.Nodes[v]] = int32(v)
	}
	adj := make(map[int32][]Edge)
	for _, e := range m.Edges {
		adj[e.A] = append(adj[e.A], e)
		adj[e.B] = append(adj[e.B], Edge{A: e.B, B: e.A, M: e.M, Tag: e.Tag})
	}
	for i, s := range g.Segments {
		pa, pb := g.Points[s.A], g.Points[s.B]
		a, okA := at[pa]
		b, okB := at[pb]
		if !okA || !okB {
			continue
		}
		// Follow Edges from a towards b along the segment.
		cur := a
		for steps := 0; cur != b; steps++ {
			if steps > m.NumVertices {
				return fmt.Errorf("mesh check: segment %d does not close", i)
			}
			best, bestT, bestTag := int32(-1), math.Inf(-1), int32(0)
			pc := m.Nodes[cur]
			for _, e := range adj[cur] {
				q := m.Nodes[e.B]
				// Split points on a segment are rounded: accept a distance from its line of 1e-12 of its length.
				if math.Abs(Orient2D(pa, pb, q)) > 1e-12*dist2(pa, pb) {
					continue
				}
				// Progress along a→b, the furthest collinear step wins only if it does not overshoot.
				tq := dot(pa, pb, q) / dist2(pa, pb)
				tc := dot(pa, pb, pc) / dist2(pa, pb)
				if tq > tc && tq <= 1 && (best < 0 || tq < bestT) {
					best, bestT, bestTag = e.B, tq, e.Tag
				}
			}
			if best < 0 {
				// A gap is allowed only where the segment leaves the domain (a dangling piece, removed with
				// the triangles outside): skip to the next vertex on the segment if the piece between lies
				// outside every triangle.
				next, _ := m.nextOnSegment(pa, pb, dot(pa, pb, pc)/dist2(pa, pb))
				mid := Point{(pc.X + m.Nodes[max(next, 0)].X) / 2, (pc.Y + m.Nodes[max(next, 0)].Y) / 2}
				if next < 0 || m.insideAny(mid) {
					return fmt.Errorf("mesh check: segment %d (%d, %d) is not covered by Edges beyond node %d", i, s.A, s.B, cur)
				}
				cur = next
				continue
			}
			if bestTag != s.Tag && !overlapTagged(g, pa, pb, bestTag) {
				return fmt.Errorf("mesh check: segment %d edge at node %d has tag %d, want %d", i, cur, bestTag, s.Tag)
			}
			cur = best
		}
	}
	return nil
}

// overlapTagged reports whether some segment of g with the given tag lies on the line through pa and pb.
func overlapTagged(g PSLG, pa, pb Point, tag int32) bool {
	for _, s := range g.Segments {
		if s.Tag == tag && math.Abs(Orient2D(pa, pb, g.Points[s.A])) <= 1e-12*dist2(pa, pb) && math.Abs(Orient2D(pa, pb, g.Points[s.B])) <= 1e-12*dist2(pa, pb) {
			return true
		}
	}
	return false
}

// nextOnSegment returns the mesh vertex on segment pa→pb (within the same rounding tolerance as CheckSegments)
// with the smallest parameter beyond tc, or -1.
func (m *Mesh) nextOnSegment(pa, pb Point, tc float64) (int32, float64) {
	best, bestT := int32(-1), math.Inf(1)
	for v := 0; v < m.NumVertices; v++ {
		q := m.Nodes[v]
		if math.Abs(Orient2D(pa, pb, q)) > 1e-12*dist2(pa, pb) {
			continue
		}
		if tq := dot(pa, pb, q) / dist2(pa, pb); tq > tc && tq <= 1 && tq < bestT {
			best, bestT = int32(v), tq
		}
	}
	return best, bestT
}

// insideAny reports whether p lies in some closed triangle (exact orientation tests).
func (m *Mesh) insideAny(p Point) bool {
	for _, tr := range m.Tris {
		a, b, c := m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]
		if Orient2D(a, b, p) >= 0 && Orient2D(b, c, p) >= 0 && Orient2D(c, a, p) >= 0 {
			return true
		}
	}
	return false
}
