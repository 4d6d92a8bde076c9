package mesh

import (
	"fmt"
	"sort"
)

// Constrained Delaunay triangulation: segments are recovered one at a time by deleting the triangles the
// segment crosses and retriangulating the two pseudo-polygons on either side of it (Anglada, "An improved
// incremental algorithm for constructing restricted Delaunay triangulations", Computers & Graphics 21, 1997;
// also Shewchuk's lecture notes on constrained Delaunay triangulations).

// recoverSegment makes the segment with index s, from vertex a to vertex c, a union of constrained edges.
// Vertices lying exactly on the segment split it. Crossing an already constrained edge is an error.
func (b *builder) recoverSegment(a, c, s int32) error {
	for a != c {
		t, k, hit, err := b.segmentStart(a, c)
		if err != nil {
			return fmt.Errorf("segment %d: %w", s, err)
		}
		if hit >= 0 {
			b.constrain(a, hit, s)
			a = hit
			continue
		}
		w, err := b.cutAndFill(a, c, t, k, s)
		if err != nil {
			return err
		}
		b.constrain(a, w, s)
		a = w
	}
	return nil
}

// constrain marks the existing edge a–c as lying on segment s, unless an earlier segment already claimed it
// (collinear overlapping segments merge; the earlier tag wins).
func (b *builder) constrain(a, c, s int32) {
	t, k := b.findEdge(a, c)
	if t < 0 {
		panic("mesh: constrain on a missing edge")
	}
	if b.tc[3*t+k] >= 0 {
		return
	}
	b.tc[3*t+k] = s
	if n := b.tn[3*t+k]; n >= 0 {
		u, v := b.tv[3*t+k], b.tv[3*t+int32(nxt[k])]
		for j := range int32(3) {
			if b.tv[3*n+j] == v && b.tv[3*n+int32(nxt[j])] == u {
				b.tc[3*n+j] = s
			}
		}
	}
}

// segmentStart looks around vertex a for the direction of c. It returns hit >= 0 when the edge a–hit exists
// and lies along a→c; otherwise the triangle t and its edge k that the open segment crosses first.
func (b *builder) segmentStart(a, c int32) (t, k, hit int32, err error) {
	pa, pc := b.pts[a], b.pts[c]
	t0 := b.vt[a]
	t = t0
	for range 1 << 22 {
		base := 3 * t
		i := int32(0)
		for b.tv[base+i] != a {
			i++
		}
		v1, v2 := b.tv[base+int32(nxt[i])], b.tv[base+int32(prv[i])]
		o1 := Orient2D(pa, pc, b.pts[v1])
		o2 := Orient2D(pa, pc, b.pts[v2])
		if v1 == c || (o1 == 0 && dot(pa, pc, b.pts[v1]) > 0) {
			return t, -1, v1, nil
		}
		if v2 == c || (o2 == 0 && dot(pa, pc, b.pts[v2]) > 0) {
			return t, -1, v2, nil
		}
		if o1 < 0 && o2 > 0 {
			return t, int32(nxt[i]), -1, nil
		}
		// Rotate counter-clockwise around a: across the edge v2→a.
		t = b.tn[base+int32(prv[i])]
		if t < 0 || t == t0 {
			break
		}
	}
	return -1, -1, -1, fmt.Errorf("cannot find the direction of its far end (inconsistent triangulation)")
}

func dot(a, c, v Point) float64 { return (c.X-a.X)*(v.X-a.X) + (c.Y-a.Y)*(v.Y-a.Y) }

// cutAndFill deletes the triangles crossed by segment a→c, starting with edge k of triangle t, up to c or to
// the first vertex w lying exactly on the segment, and retriangulates both sides. It returns w (or c).
func (b *builder) cutAndFill(a, c, t, k, s int32) (int32, error) {
	pa, pc := b.pts[a], b.pts[c]
	dead := append(b.cav[:0], t)
	right := []int32{b.tv[3*t+k]}
	left := []int32{b.tv[3*t+int32(nxt[k])]}
	var w int32
	for {
		if cs := b.tc[3*t+k]; cs >= 0 {
			return -1, fmt.Errorf("segments %d and %d intersect", s, cs)
		}
		v := b.tv[3*t+int32(nxt[k])] // left of a→c; corner k is right of it
		n := b.tn[3*t+k]
		if n < 0 {
			return -1, fmt.Errorf("segment %d leaves the triangulation", s)
		}
		dead = append(dead, n)
		var j int32
		for j = 0; j < 3; j++ {
			if b.tv[3*n+j] == v {
				break
			}
		}
		// In n the edge v→u is edge j; its apex is corner prv[j].
		x := b.tv[3*n+int32(prv[j])]
		ox := Orient2D(pa, pc, b.pts[x])
		if x == c || ox == 0 {
			w = x
			break
		}
		t = n
		if ox < 0 {
			right = append(right, x)
			k = int32(prv[j]) // in n the corners are v (j), u (nxt j), x (prv j): next crossing is x→v
		} else {
			left = append(left, x)
			k = int32(nxt[j]) // edge u→x
		}
	}
	b.cav = dead
	// Collect the cavity boundary with what lies beyond each edge.
	st := b.nextStamp()
	for _, d := range dead {
		b.mark[d] = st
	}
	b.bnd = b.bnd[:0]
	for _, d := range dead {
		for j := range int32(3) {
			n := b.tn[3*d+j]
			if n >= 0 && b.mark[n] == st {
				continue
			}
			b.bnd = append(b.bnd, bedge{b.tv[3*d+j], b.tv[3*d+int32(nxt[j])], n, b.tc[3*d+j], d, 0})
		}
	}
	tg := b.tag[dead[0]]
	var tris [][3]int32
	tris = b.fillPseudo(a, w, left, tris)
	for i, j := 0, len(right)-1; i < j; i, j = i+1, j-1 {
		right[i], right[j] = right[j], right[i]
	}
	tris = b.fillPseudo(w, a, right, tris)
	if len(tris) != len(dead) {
		panic("mesh: segment cavity retriangulation changed the triangle count")
	}
	for i, tr := range tris {
		nt := dead[i]
		b.setTri(nt, tr[0], tr[1], tr[2])
		b.tag[nt] = tg
	}
	// Link new triangles to each other and to the outside.
	type half struct{ u, v int32 }
	open := make(map[half]int32, 3*len(dead))
	for _, nt := range dead {
		for j := range int32(3) {
			u, v := b.tv[3*nt+j], b.tv[3*nt+int32(nxt[j])]
			found := false
			for _, e := range b.bnd {
				if e.u == u && e.v == v {
					b.tn[3*nt+j] = e.out
					b.tc[3*nt+j] = e.cons
					b.linkBack(e.out, u, v, nt)
					found = true
					break
				}
			}
			if found {
				continue
			}
			if m, ok := open[half{v, u}]; ok {
				b.tn[3*nt+j] = m
				for q := range int32(3) {
					if b.tv[3*m+q] == v && b.tv[3*m+int32(nxt[q])] == u {
						b.tn[3*m+q] = nt
					}
				}
				delete(open, half{v, u})
			} else {
				open[half{u, v}] = nt
			}
		}
		for j := range int32(3) {
			b.vt[b.tv[3*nt+j]] = nt
		}
	}
	if len(open) != 0 {
		panic("mesh: segment cavity left unmatched edges")
	}
	return w, nil
}

// fillPseudo triangulates the pseudo-polygon with base edge a→c and the chain of vertices ch (all left of a→c,
// ordered from a to c) so that it is constrained Delaunay, appending counter-clockwise triangles.
func (b *builder) fillPseudo(a, c int32, ch []int32, out [][3]int32) [][3]int32 {
	if len(ch) == 0 {
		return out
	}
	pa, pc := b.pts[a], b.pts[c]
	m := 0
	for i := 1; i < len(ch); i++ {
		if InCircle(pa, pc, b.pts[ch[m]], b.pts[ch[i]]) > 0 {
			m = i
		}
	}
	out = append(out, [3]int32{a, c, ch[m]})
	out = b.fillPseudo(a, ch[m], ch[:m], out)
	out = b.fillPseudo(ch[m], c, ch[m+1:], out)
	return out
}

// hilbertOrder returns the indices idx sorted in BRIO order (Amenta, Choi, Rote, "Incremental constructions
// con BRIO", 2003): a seeded shuffle split into rounds of doubling size, each round sorted along a Hilbert
// curve, which keeps point-location walks short while avoiding worst cases of a purely spatial order.
func hilbertOrder(pts []Point, idx []int32, rng *uint64) {
	if len(idx) == 0 {
		return
	}
	minX, minY, maxX, maxY := pts[idx[0]].X, pts[idx[0]].Y, pts[idx[0]].X, pts[idx[0]].Y
	for _, i := range idx {
		p := pts[i]
		minX, maxX = min(minX, p.X), max(maxX, p.X)
		minY, maxY = min(minY, p.Y), max(maxY, p.Y)
	}
	span := max(maxX-minX, maxY-minY)
	if span == 0 {
		span = 1
	}
	keys := make([]uint32, len(pts))
	for _, i := range idx {
		x := uint32((pts[i].X - minX) / span * 65535)
		y := uint32((pts[i].Y - minY) / span * 65535)
		keys[i] = hilbertD(x, y)
	}
	// Seeded Fisher–Yates shuffle.
	r := *rng
	for i := len(idx) - 1; i > 0; i-- {
		r ^= r >> 12
		r ^= r << 25
		r ^= r >> 27
		j := int((r * 2685821657736338717) % uint64(i+1))
		idx[i], idx[j] = idx[j], idx[i]
	}
	*rng = r
	// Rounds: the last half, the quarter before it, ... each sorted along the curve.
	end := len(idx)
	for end > 0 {
		start := end / 2
		if end <= 64 {
			start = 0
		}
		round := idx[start:end]
		sort.Slice(round, func(p, q int) bool { return keys[round[p]] < keys[round[q]] })
		end = start
	}
}

// hilbertD maps (x, y) in [0, 2^16) to its distance along a Hilbert curve of order 16.
func hilbertD(x, y uint32) uint32 {
	var d uint32
	for s := uint32(1 << 15); s > 0; s /= 2 {
		var rx, ry uint32
		if x&s != 0 {
			rx = 1
		}
		if y&s != 0 {
			ry = 1
		}
		d += s * s * ((3 * rx) ^ ry)
		if ry == 0 {
			if rx == 1 {
				x = 65535 - x
				y = 65535 - y
			}
			x, y = y, x
		}
	}
	return d
}
