package plot

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"eddyrz/mesh"
)

// Isoline is the set of curves where a piecewise-linear nodal field equals Level.
type Isoline struct {
	Level float64
	// Lines are polylines in mesh coordinates. A polyline that ends where it starts is a closed loop (its last
	// point repeats the first); an open one ends on the mesh boundary (or where the field is exactly Level on
	// a vertex).
	Lines [][]mesh.Point
}

// linearTris returns the linear triangles the mesh is drawn with: the triangles themselves for a linear mesh,
// and for a quadratic mesh each 6-node triangle split at its edge midpoints into four counter-clockwise ones.
func linearTris(m *mesh.Mesh) [][3]int32 {
	if m.Mid == nil {
		return m.Tris
	}
	out := make([][3]int32, 0, 4*len(m.Tris))
	for t, v := range m.Tris {
		md := m.Mid[t] // md[k] is the midpoint of edge v[k] -> v[k+1]
		out = append(out,
			[3]int32{v[0], md[0], md[2]},
			[3]int32{md[0], v[1], md[1]},
			[3]int32{md[2], md[1], v[2]},
			[3]int32{md[0], md[1], md[2]})
	}
	return out
}

// EvenLevels returns n levels evenly spaced inside (lo, hi), at the centres of n equal bins, so that the
// flux between neighbouring flux lines is the same and no line sits on the extreme values. n <= 0 gives none.
func EvenLevels(lo, hi float64, n int) []float64 {
	if n <= 0 {
		return nil
	}
	out := make([]float64, n)
	for k := range out {
		out[k] = lo + (float64(k)+0.5)*(hi-lo)/float64(n)
	}
	return out
}

// Isolines extracts the level curves of the nodal field (one value per mesh node, midpoint nodes included for
// quadratic meshes) by marching triangles on the linear (sub)triangles: on each, the field is the linear
// interpolant of its three node values, so the curves are exact for that interpolant. A crossing point on an
// edge is computed from the edge's two nodes in a fixed order, so the triangles on either side of an edge
// produce bit-identical points and the polylines join without gaps.
func Isolines(m *mesh.Mesh, nodal []float64, levels []float64) ([]Isoline, error) {
	if len(nodal) != len(m.Nodes) {
		return nil, fmt.Errorf("plot: isolines: %d nodal values for %d nodes", len(nodal), len(m.Nodes))
	}
	for i, v := range nodal {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("plot: isolines: nodal value %d is %g", i, v)
		}
	}
	tris := linearTris(m)
	out := make([]Isoline, 0, len(levels))
	var ct contourTracer
	for _, c := range levels {
		out = append(out, Isoline{Level: c, Lines: ct.trace(m.Nodes, nodal, tris, c)})
	}
	return out, nil
}

// edgeKey names a crossing point by the edge it lies on (node ids, A < B).
type edgeKey struct{ A, B int32 }

func keyOf(a, b int32) edgeKey {
	if a > b {
		a, b = b, a
	}
	return edgeKey{a, b}
}

// contourTracer holds the scratch maps of one level's tracing, reused between levels.
type contourTracer struct {
	adj  map[edgeKey][2]edgeKey // neighbours of a crossing along the curve
	deg  map[edgeKey]int8
	seen map[edgeKey]bool
}

func (ct *contourTracer) trace(nodes []mesh.Point, f []float64, tris [][3]int32, c float64) [][]mesh.Point {
	if ct.adj == nil {
		ct.adj, ct.deg, ct.seen = map[edgeKey][2]edgeKey{}, map[edgeKey]int8{}, map[edgeKey]bool{}
	}
	clear(ct.adj)
	clear(ct.deg)
	clear(ct.seen)
	link := func(p, q edgeKey) {
		d := ct.deg[p]
		if d >= 2 { // only possible on a non-conforming mesh; keep the first two links
			return
		}
		a := ct.adj[p]
		a[d] = q
		ct.adj[p] = a
		ct.deg[p] = d + 1
	}
	for _, t := range tris {
		// A node counts as "above" when f >= c: every edge then has exactly one classification per side, and
		// a triangle with mixed classes is crossed on exactly two of its edges.
		var up [3]bool
		n := 0
		for k, v := range t {
			if f[v] >= c {
				up[k] = true
				n++
			}
		}
		if n == 0 || n == 3 {
			continue
		}
		var ks [2]edgeKey
		j := 0
		for k := range 3 {
			if up[k] != up[(k+1)%3] {
				ks[j] = keyOf(t[k], t[(k+1)%3])
				j++
			}
		}
		link(ks[0], ks[1])
		link(ks[1], ks[0])
	}
	point := func(k edgeKey) mesh.Point {
		fa, fb := f[k.A], f[k.B]
		s := (c - fa) / (fb - fa)
		pa, pb := nodes[k.A], nodes[k.B]
		return mesh.Point{X: pa.X + s*(pb.X-pa.X), Y: pa.Y + s*(pb.Y-pa.Y)}
	}
	walk := func(start edgeKey) []mesh.Point {
		line := []mesh.Point{point(start)}
		ct.seen[start] = true
		prev, cur := start, start
		for {
			a, d := ct.adj[cur], ct.deg[cur]
			next, ok := edgeKey{}, false
			for i := range d {
				if a[i] != prev && !ct.seen[a[i]] {
					next, ok = a[i], true
					break
				}
			}
			if !ok {
				// Closed loop: the start is a neighbour of the last point.
				if cur != start && d == 2 && (a[0] == start || a[1] == start) && len(line) > 2 {
					line = append(line, line[0])
				}
				return line
			}
			ct.seen[next] = true
			line = append(line, point(next))
			prev, cur = cur, next
		}
	}
	var lines [][]mesh.Point
	// Open curves first, from one of their ends, then the remaining closed loops. Map order is random, so
	// the ends are collected and sorted for a deterministic result.
	var ends, rest []edgeKey
	for k, d := range ct.deg {
		if d == 1 {
			ends = append(ends, k)
		} else {
			rest = append(rest, k)
		}
	}
	sortKeys(ends)
	sortKeys(rest)
	for _, k := range ends {
		if !ct.seen[k] {
			lines = append(lines, walk(k))
		}
	}
	for _, k := range rest {
		if !ct.seen[k] {
			lines = append(lines, walk(k))
		}
	}
	return lines
}

func sortKeys(ks []edgeKey) {
	slices.SortFunc(ks, func(p, q edgeKey) int {
		if c := cmp.Compare(p.A, q.A); c != 0 {
			return c
		}
		return cmp.Compare(p.B, q.B)
	})
}
