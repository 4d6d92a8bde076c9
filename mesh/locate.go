package mesh

import "math"

// Locator answers point-location queries on a mesh with a uniform bucket grid over the bounding box, each
// bucket listing the triangles whose bounding boxes overlap it (about one bucket per triangle). It is read-only
// after construction and safe for concurrent use. It copies the slice headers of the mesh it indexes, so the
// mesh's triangles and corner vertices must not change afterwards (MakeQuadratic is fine).
type Locator struct {
	nodes          []Point
	tris           [][3]int32
	x0, y0, ix, iy float64 // grid origin and inverse cell sizes
	nx, ny         int
	start, list    []int32 // CSR: triangles of cell c are list[start[c]:start[c+1]]
}

// Index builds a new Locator for m; O(triangles) time and memory.
func (m *Mesh) Index() *Locator {
	l := &Locator{nodes: m.Nodes, tris: m.Tris}
	if len(m.Tris) == 0 {
		return l
	}
	minX, minY := math.Inf(1), math.Inf(1)
	maxX, maxY := math.Inf(-1), math.Inf(-1)
	for _, tr := range m.Tris {
		for _, v := range tr {
			p := m.Nodes[v]
			minX, maxX = min(minX, p.X), max(maxX, p.X)
			minY, maxY = min(minY, p.Y), max(maxY, p.Y)
		}
	}
	w, h := max(maxX-minX, 1e-300), max(maxY-minY, 1e-300)
	cells := float64(len(m.Tris))
	l.nx = max(1, min(1<<15, int(math.Sqrt(cells*w/h))))
	l.ny = max(1, min(1<<15, int(cells/float64(l.nx))))
	l.x0, l.y0 = minX, minY
	l.ix, l.iy = float64(l.nx)/w, float64(l.ny)/h
	l.start = make([]int32, l.nx*l.ny+1)
	span := func(tr [3]int32) (i0, i1, j0, j1 int) {
		a, b, c := m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]
		i0, j0 = l.cell(min(a.X, b.X, c.X), min(a.Y, b.Y, c.Y))
		i1, j1 = l.cell(max(a.X, b.X, c.X), max(a.Y, b.Y, c.Y))
		return
	}
	for _, tr := range m.Tris {
		i0, i1, j0, j1 := span(tr)
		for j := j0; j <= j1; j++ {
			for i := i0; i <= i1; i++ {
				l.start[j*l.nx+i+1]++
			}
		}
	}
	for c := 1; c < len(l.start); c++ {
		l.start[c] += l.start[c-1]
	}
	l.list = make([]int32, l.start[len(l.start)-1])
	fill := append([]int32(nil), l.start[:len(l.start)-1]...)
	for t, tr := range m.Tris {
		i0, i1, j0, j1 := span(tr)
		for j := j0; j <= j1; j++ {
			for i := i0; i <= i1; i++ {
				c := j*l.nx + i
				l.list[fill[c]] = int32(t)
				fill[c]++
			}
		}
	}
	return l
}

func (l *Locator) cell(x, y float64) (int, int) {
	i := int((x - l.x0) * l.ix)
	j := int((y - l.y0) * l.iy)
	return max(0, min(l.nx-1, i)), max(0, min(l.ny-1, j))
}

// Locate returns the triangle containing p and p's barycentric coordinates in it (bary[k] weights corner k;
// they sum to 1), or tri = -1 when p is outside the mesh. A point on an edge shared by two triangles is
// reported in one of them. Points within a relative 1e-12 of the boundary count as inside.
func (l *Locator) Locate(p Point) (tri int, bary [3]float64) {
	if len(l.tris) == 0 || math.IsNaN(p.X) || math.IsNaN(p.Y) {
		return -1, bary
	}
	fx, fy := (p.X-l.x0)*l.ix, (p.Y-l.y0)*l.iy
	if fx < -1e-9 || fy < -1e-9 || fx > float64(l.nx)+1e-9 || fy > float64(l.ny)+1e-9 {
		return -1, bary
	}
	i, j := l.cell(p.X, p.Y)
	c := j*l.nx + i
	for _, t := range l.list[l.start[c]:l.start[c+1]] {
		tr := l.tris[t]
		a, b, cc := l.nodes[tr[0]], l.nodes[tr[1]], l.nodes[tr[2]]
		d := (b.X-a.X)*(cc.Y-a.Y) - (b.Y-a.Y)*(cc.X-a.X)
		l1 := ((cc.X-b.X)*(p.Y-b.Y) - (cc.Y-b.Y)*(p.X-b.X)) / d
		l2 := ((a.X-cc.X)*(p.Y-cc.Y) - (a.Y-cc.Y)*(p.X-cc.X)) / d
		l3 := 1 - l1 - l2
		const tol = -1e-12
		if l1 >= tol && l2 >= tol && l3 >= tol {
			return int(t), [3]float64{l1, l2, l3}
		}
	}
	return -1, bary
}

// Locate returns the triangle containing p and its barycentric coordinates, or tri = -1 outside the mesh (see
// Locator.Locate). Meshes made by Triangulate or Extract build their index once, on the first call, safely
// under concurrent callers; the mesh's triangles and corner vertices must not be changed after that. A Mesh
// assembled by hand has no cache: each call then builds an index, so use Index for repeated queries.
func (m *Mesh) Locate(p Point) (tri int, bary [3]float64) {
	if m.cache == nil {
		return m.Index().Locate(p)
	}
	m.cache.once.Do(func() { m.cache.loc = m.Index() })
	return m.cache.loc.Locate(p)
}
