package fem

import (
	"math"
	"slices"

	"eddyrz/mesh"
)

// Structured test meshes, built here so the solver's tests do not depend on the mesher.

// gridBuilder accumulates a linear triangle mesh with tagged boundary edges.
type gridBuilder struct {
	m     mesh.Mesh
	edges map[[2]int32]int32 // boundary edge (sorted corners) → tag
}

func newGridBuilder() *gridBuilder { return &gridBuilder{edges: map[[2]int32]int32{}} }

func (g *gridBuilder) node(r, z float64) int32 {
	g.m.Nodes = append(g.m.Nodes, mesh.Point{X: r, Y: z})
	return int32(len(g.m.Nodes) - 1)
}

// tri adds a triangle, fixing its orientation to counter-clockwise; tag by centroid.
func (g *gridBuilder) tri(a, b, c int32, tag func(r, z float64) int32) {
	p := g.m.Nodes
	d := (p[b].X-p[a].X)*(p[c].Y-p[a].Y) - (p[c].X-p[a].X)*(p[b].Y-p[a].Y)
	if d < 0 {
		b, c = c, b
	}
	g.m.Tris = append(g.m.Tris, [3]int32{a, b, c})
	g.m.Tags = append(g.m.Tags, tag((p[a].X+p[b].X+p[c].X)/3, (p[a].Y+p[b].Y+p[c].Y)/3))
}

func (g *gridBuilder) edge(a, b, tag int32) {
	if a > b {
		a, b = b, a
	}
	g.edges[[2]int32{a, b}] = tag
}

// finish returns the mesh, quadratic (midpoints on straight edges) when quad is true.
func (g *gridBuilder) finish(quad bool) *mesh.Mesh {
	m := g.m
	m.NumVertices = len(m.Nodes)
	mid := map[[2]int32]int32{}
	if quad {
		m.Mid = make([][3]int32, len(m.Tris))
		for t, tri := range m.Tris {
			for k := range 3 {
				a, b := tri[k], tri[(k+1)%3]
				key := [2]int32{min(a, b), max(a, b)}
				v, ok := mid[key]
				if !ok {
					v = int32(len(m.Nodes))
					m.Nodes = append(m.Nodes, mesh.Point{X: (m.Nodes[a].X + m.Nodes[b].X) / 2, Y: (m.Nodes[a].Y + m.Nodes[b].Y) / 2})
					mid[key] = v
				}
				m.Mid[t][k] = v
			}
		}
	}
	keys := make([][2]int32, 0, len(g.edges))
	for k := range g.edges {
		keys = append(keys, k)
	}
	slices.SortFunc(keys, func(a, b [2]int32) int {
		if a[0] != b[0] {
			return int(a[0] - b[0])
		}
		return int(a[1] - b[1])
	})
	for _, k := range keys {
		e := mesh.Edge{A: k[0], B: k[1], M: -1, Tag: g.edges[k]}
		if quad {
			e.M = mid[k]
		}
		m.Edges = append(m.Edges, e)
	}
	return &m
}

// rectMesh meshes [rs[0], rs[last]] × [zs[0], zs[last]] on the grid lines rs × zs, each cell split along a
// diagonal (alternating, to avoid a directional bias). Edges on r = 0 get AxisTag; the sides listed in outer
// ("right", "top", "bottom") get OuterTag.
func rectMesh(rs, zs []float64, tag func(r, z float64) int32, quad bool, outer ...string) *mesh.Mesh {
	g := newGridBuilder()
	nr, nz := len(rs), len(zs)
	id := func(i, j int) int32 { return int32(j*nr + i) }
	for _, z := range zs {
		for _, r := range rs {
			g.node(r, z)
		}
	}
	for j := range nz - 1 {
		for i := range nr - 1 {
			a, b, c, d := id(i, j), id(i+1, j), id(i+1, j+1), id(i, j+1)
			if (i+j)%2 == 0 {
				g.tri(a, b, c, tag)
				g.tri(a, c, d, tag)
			} else {
				g.tri(a, b, d, tag)
				g.tri(b, c, d, tag)
			}
		}
	}
	if rs[0] == 0 {
		for j := range nz - 1 {
			g.edge(id(0, j), id(0, j+1), AxisTag)
		}
	}
	for _, side := range outer {
		switch side {
		case "right":
			for j := range nz - 1 {
				g.edge(id(nr-1, j), id(nr-1, j+1), OuterTag)
			}
		case "top":
			for i := range nr - 1 {
				g.edge(id(i, nz-1), id(i+1, nz-1), OuterTag)
			}
		case "bottom":
			for i := range nr - 1 {
				g.edge(id(i, 0), id(i+1, 0), OuterTag)
			}
		default:
			panic("rectMesh: unknown side " + side)
		}
	}
	return g.finish(quad)
}

// polarMesh meshes the half disc r ≥ 0, |(r, z − zc)| ≤ rhos[last] on polar grid lines: radii rhos (rhos[0] = 0)
// and polar angles thetas from 0 (+z) to π (−z). The outer arc gets OuterTag, the axis AxisTag.
func polarMesh(rhos, thetas []float64, zc float64, tag func(r, z float64) int32, quad bool) *mesh.Mesh {
	g := newGridBuilder()
	c := g.node(0, zc)
	nt := len(thetas)
	ids := make([][]int32, len(rhos))
	for i, rho := range rhos[1:] {
		ids[i+1] = make([]int32, nt)
		for j, th := range thetas {
			r := rho * math.Sin(th)
			if j == 0 || j == nt-1 {
				r = 0
			}
			ids[i+1][j] = g.node(r, zc+rho*math.Cos(th))
		}
	}
	for j := range nt - 1 {
		g.tri(c, ids[1][j], ids[1][j+1], tag)
	}
	for i := 1; i < len(rhos)-1; i++ {
		for j := range nt - 1 {
			a, b, cc, d := ids[i][j], ids[i+1][j], ids[i+1][j+1], ids[i][j+1]
			if (i+j)%2 == 0 {
				g.tri(a, b, cc, tag)
				g.tri(a, cc, d, tag)
			} else {
				g.tri(a, b, d, tag)
				g.tri(b, cc, d, tag)
			}
		}
	}
	for i := range len(rhos) - 1 {
		lo0, lo1 := c, c
		if i > 0 {
			lo0, lo1 = ids[i][0], ids[i][nt-1]
		}
		g.edge(lo0, ids[i+1][0], AxisTag)
		g.edge(lo1, ids[i+1][nt-1], AxisTag)
	}
	last := ids[len(rhos)-1]
	for j := range nt - 1 {
		g.edge(last[j], last[j+1], OuterTag)
	}
	return g.finish(quad)
}

// linspace returns n+1 points from a to b.
func linspace(a, b float64, n int) []float64 {
	x := make([]float64, n+1)
	for i := range x {
		x[i] = a + (b-a)*float64(i)/float64(n)
	}
	x[n] = b
	return x
}

// graded returns points from a to b whose spacing is h0 at a and grows by factor q (≥ 1) up to hmax.
func graded(a, b, h0, q, hmax float64) []float64 {
	x := []float64{a}
	h := h0
	for x[len(x)-1]+h < b-h/4 {
		x = append(x, x[len(x)-1]+h)
		h = min(h*q, hmax)
	}
	return append(x, b)
}

// join concatenates point lists, dropping repeated end points.
func join(parts ...[]float64) []float64 {
	var out []float64
	for _, p := range parts {
		for _, v := range p {
			if len(out) > 0 && math.Abs(v-out[len(out)-1]) < 1e-15 {
				continue
			}
			out = append(out, v)
		}
	}
	return out
}

// reversed returns points from b down to a mirrored: spacing h0 at b, growing towards a.
func gradedTo(a, b, h0, q, hmax float64) []float64 {
	x := graded(0, b-a, h0, q, hmax)
	out := make([]float64, len(x))
	for i, v := range x {
		out[len(x)-1-i] = b - v
	}
	out[0] = a
	return out
}

// refine inserts k−1 equally spaced points in every interval.
func refine(x []float64, k int) []float64 {
	out := []float64{x[0]}
	for i := 1; i < len(x); i++ {
		for s := 1; s <= k; s++ {
			out = append(out, x[i-1]+(x[i]-x[i-1])*float64(s)/float64(k))
		}
	}
	return out
}
