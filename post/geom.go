package post

import (
	"math"
	"slices"

	"eddyrz/fem"
	"eddyrz/mesh"
)

// meshInfo is what Analyze needs to know about the mesh beyond the solution's fields: the region of every
// triangle (the solver's rule: the last Region with the triangle's tag, -1 for none) and its neighbours.
type meshInfo struct {
	m      *mesh.Mesh
	regs   []fem.Region
	elemRg []int
	nb     [][3]int32
	axisR  float64 // nodes with r ≤ axisR lie on the axis, m
}

func newMeshInfo(sol *fem.Solution) *meshInfo {
	m := sol.Mesh
	byTag := map[int32]int{}
	for i, r := range sol.Regions {
		byTag[r.Tag] = i
	}
	mi := &meshInfo{m: m, regs: sol.Regions, elemRg: make([]int, len(m.Tris)), nb: m.Neighbors()}
	var span float64
	for _, p := range m.Nodes[:m.NumVertices] {
		span = max(span, math.Abs(p.X), math.Abs(p.Y))
	}
	mi.axisR = 1e-12 * span
	for t := range m.Tris {
		ri, ok := byTag[m.Tags[t]]
		if !ok {
			ri = -1
		}
		mi.elemRg[t] = ri
	}
	return mi
}

// isFreeAir reports whether triangle t is non-magnetic, non-conducting air (the only medium the stress shell may
// cross).
func (mi *meshInfo) isFreeAir(t int) bool {
	ri := mi.elemRg[t]
	if ri < 0 {
		return true
	}
	r := mi.regs[ri]
	return r.Kind == fem.Air && r.Sigma == 0 && (r.MuR == 0 || r.MuR == 1)
}

// seg is a straight boundary edge in the r-z plane, m.
type seg struct{ a, b mesh.Point }

// dist2 is the squared distance from p to the segment, m².
func (s seg) dist2(p mesh.Point) float64 {
	dx, dy := s.b.X-s.a.X, s.b.Y-s.a.Y
	px, py := p.X-s.a.X, p.Y-s.a.Y
	l2 := dx*dx + dy*dy
	t := 0.0
	if l2 > 0 {
		t = min(1, max(0, (px*dx+py*dy)/l2))
	}
	ex, ey := px-t*dx, py-t*dy
	return ex*ex + ey*ey
}

// outline is the boundary of one part region: its edges off the axis, its triangles' corner nodes and its extent.
type outline struct {
	segs     []seg
	elems    []int   // triangles of the part
	verts    []int32 // corner nodes of those triangles, sorted, unique
	lo, hi   mesh.Point
	boxCells [][]int32 // segment indices bucketed by a uniform grid over [lo, hi] (see near)
	nx, ny   int
	cw, ch   float64
}

// newOutline collects the boundary of region ri: the edges between a triangle of ri and a triangle of another
// region or the mesh's edge, except edges on the axis (r = 0), where the part is not bounded physically.
func (mi *meshInfo) newOutline(ri int) *outline {
	m := mi.m
	o := &outline{lo: mesh.Point{X: math.Inf(1), Y: math.Inf(1)}, hi: mesh.Point{X: math.Inf(-1), Y: math.Inf(-1)}}
	for t, tri := range m.Tris {
		if mi.elemRg[t] != ri {
			continue
		}
		o.elems = append(o.elems, t)
		for k := range 3 {
			v := tri[k]
			o.verts = append(o.verts, v)
			p := m.Nodes[v]
			o.lo.X, o.lo.Y = min(o.lo.X, p.X), min(o.lo.Y, p.Y)
			o.hi.X, o.hi.Y = max(o.hi.X, p.X), max(o.hi.Y, p.Y)
			n := mi.nb[t][k]
			if n >= 0 && mi.elemRg[n] == ri {
				continue
			}
			a, b := m.Nodes[v], m.Nodes[tri[(k+1)%3]]
			if a.X <= mi.axisR && b.X <= mi.axisR {
				continue
			}
			o.segs = append(o.segs, seg{a, b})
		}
	}
	slices.Sort(o.verts)
	o.verts = slices.Compact(o.verts)
	o.bucket()
	return o
}

// bucket sorts the segments into a grid of about one segment per cell so that distance queries near the part
// visit few of them.
func (o *outline) bucket() {
	if len(o.segs) == 0 {
		return
	}
	w, h := o.hi.X-o.lo.X, o.hi.Y-o.lo.Y
	n := max(1, int(math.Sqrt(float64(len(o.segs)))))
	o.nx, o.ny = n, n
	o.cw, o.ch = max(w, 1e-300)/float64(n), max(h, 1e-300)/float64(n)
	o.boxCells = make([][]int32, n*n)
	for i, s := range o.segs {
		i0, j0 := o.cell(mesh.Point{X: min(s.a.X, s.b.X), Y: min(s.a.Y, s.b.Y)})
		i1, j1 := o.cell(mesh.Point{X: max(s.a.X, s.b.X), Y: max(s.a.Y, s.b.Y)})
		for j := j0; j <= j1; j++ {
			for ii := i0; ii <= i1; ii++ {
				o.boxCells[j*n+ii] = append(o.boxCells[j*n+ii], int32(i))
			}
		}
	}
}

func (o *outline) cell(p mesh.Point) (int, int) {
	i := int((p.X - o.lo.X) / o.cw)
	j := int((p.Y - o.lo.Y) / o.ch)
	return min(max(i, 0), o.nx-1), min(max(j, 0), o.ny-1)
}

// dist is the distance from p to the outline's segments, m (+Inf when the part has no off-axis boundary). It
// searches rings of grid cells outward from p's (clamped) cell and stops once no unvisited cell can be nearer.
func (o *outline) dist(p mesh.Point) float64 {
	if len(o.segs) == 0 {
		return math.Inf(1)
	}
	// Distance from p to the grid's box: every segment is at least that far away.
	ox := max(o.lo.X-p.X, 0, p.X-o.hi.X)
	oy := max(o.lo.Y-p.Y, 0, p.Y-o.hi.Y)
	out := math.Hypot(ox, oy)
	ci, cj := o.cell(p)
	best := math.Inf(1)
	cmin := min(o.cw, o.ch)
	for k := 0; k < max(o.nx, o.ny); k++ {
		// Cells in ring k are at least √(out² + ((k−1)·cmin)²) away from p, which lies in, or beyond the box
		// next to, cell (ci, cj).
		if k > 0 {
			g := float64(k-1) * cmin
			if out*out+g*g > best {
				break
			}
		}
		for j := cj - k; j <= cj+k; j++ {
			if j < 0 || j >= o.ny {
				continue
			}
			for i := ci - k; i <= ci+k; i++ {
				if i < 0 || i >= o.nx || (j != cj-k && j != cj+k && i != ci-k && i != ci+k) {
					continue
				}
				for _, s := range o.boxCells[j*o.nx+i] {
					best = min(best, o.segs[s].dist2(p))
				}
			}
		}
	}
	return math.Sqrt(best)
}

func pointRZ(r, z float64) mesh.Point { return mesh.Point{X: r, Y: z} }

// distWithin is the distance from p to the outline's segments when it is at most maxD (m), and +Inf otherwise.
// It visits only the grid cells that overlap the square of half-side maxD around p, so it is cheap for points
// deep inside or far from a large part.
func (o *outline) distWithin(p mesh.Point, maxD float64) float64 {
	if len(o.segs) == 0 || o.boxDist(p) > maxD {
		return math.Inf(1)
	}
	i0, j0 := o.cell(mesh.Point{X: p.X - maxD, Y: p.Y - maxD})
	i1, j1 := o.cell(mesh.Point{X: p.X + maxD, Y: p.Y + maxD})
	best := maxD * maxD
	found := false
	for j := j0; j <= j1; j++ {
		for i := i0; i <= i1; i++ {
			for _, s := range o.boxCells[j*o.nx+i] {
				if d := o.segs[s].dist2(p); d <= best {
					best, found = d, true
				}
			}
		}
	}
	if !found {
		return math.Inf(1)
	}
	return math.Sqrt(best)
}
