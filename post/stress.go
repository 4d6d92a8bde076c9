package post

import (
	"cmp"
	"math"
	"slices"

	"eddyrz/fem"
	"eddyrz/mesh"
)

// Shell placement, as fractions of L = min(gap to the nearest obstacle, part size): the weight g falls from 1 to
// 0 between distances shellInner·L and shellOuter·L from the part. Starting a little off the surface keeps the
// ramp out of the first layer of air triangles, whose corners touch the part; ending well short of the gap keeps
// it off the fields' rough spots at neighbouring conductors' corners.
const (
	shellInner = 0.1
	shellOuter = 0.7
)

// shell is the weight function of the smeared Maxwell-stress cross-check for one part: g = 1 within Inner of
// the part, 0 beyond Outer, linear in the distance between, interpolated linearly over triangle corners. Its
// gradient is non-zero only on free-air triangles, by construction (see newShell).
type shell struct {
	inner, outer float64 // m
	grad         map[int][2]float64
}

// newShell builds the stress shell of part region ri with outline o. Obstacles are the corner nodes of every
// triangle that is not free air or the part itself, and the nodes on the mesh's boundary off the axis; the gap
// is the smallest distance from the part's boundary to an obstacle. It returns nil and a reason when there is no
// room for a shell (the part touches another body or the domain's edge).
func (mi *meshInfo) newShell(ri int, o *outline) (*shell, string) {
	m := mi.m
	if len(o.segs) == 0 {
		return nil, "part has no boundary off the axis"
	}
	obstacle := make([]bool, m.NumVertices)
	for t, tri := range m.Tris {
		freeAir := mi.isFreeAir(t)
		for k := range 3 {
			if !freeAir && mi.elemRg[t] != ri {
				obstacle[tri[k]] = true
			}
			if mi.nb[t][k] < 0 {
				a, b := tri[k], tri[(k+1)%3]
				if m.Nodes[a].X > mi.axisR || m.Nodes[b].X > mi.axisR {
					obstacle[a], obstacle[b] = true, true
				}
			}
		}
	}
	type cand struct {
		v  int32
		lb float64 // distance to the part's box: a lower bound on the distance to the part
	}
	var cands []cand
	for v, ob := range obstacle {
		if ob {
			cands = append(cands, cand{int32(v), o.boxDist(m.Nodes[v])})
		}
	}
	slices.SortFunc(cands, func(a, b cand) int { return cmp.Compare(a.lb, b.lb) })
	gap := math.Inf(1)
	inPart := make(map[int32]bool, len(o.verts))
	for _, v := range o.verts {
		inPart[v] = true
	}
	for _, c := range cands {
		if c.lb >= gap {
			break
		}
		d := o.dist(m.Nodes[c.v])
		if inPart[c.v] {
			d = 0
		}
		gap = min(gap, d)
	}
	if !(gap > 0) {
		return nil, "no free air around the part for the stress shell"
	}
	size := max(o.hi.X-o.lo.X, o.hi.Y-o.lo.Y)
	l := min(gap, size)
	sh := &shell{inner: shellInner * l, outer: shellOuter * l, grad: map[int][2]float64{}}
	g := map[int32]float64{}
	for _, v := range o.verts {
		g[v] = 1
	}
	for v := range int32(m.NumVertices) {
		p := m.Nodes[v]
		if inPart[v] {
			continue
		}
		if d := o.distWithin(p, sh.outer); d < sh.outer {
			g[v] = min(1, (sh.outer-d)/(sh.outer-sh.inner))
		}
	}
	for t, tri := range m.Tris {
		if !mi.isFreeAir(t) {
			continue
		}
		g0, g1, g2 := g[tri[0]], g[tri[1]], g[tri[2]]
		if g0 == g1 && g1 == g2 {
			continue
		}
		sh.grad[t] = linearGrad([3]mesh.Point{m.Nodes[tri[0]], m.Nodes[tri[1]], m.Nodes[tri[2]]}, [3]float64{g0, g1, g2})
	}
	return sh, ""
}

// linearGrad is the gradient (∂/∂r, ∂/∂z) of the linear interpolant of values v at the triangle's corners p.
func linearGrad(p [3]mesh.Point, v [3]float64) [2]float64 {
	d := (p[1].X-p[0].X)*(p[2].Y-p[0].Y) - (p[2].X-p[0].X)*(p[1].Y-p[0].Y) // twice the signed area
	var gr, gz float64
	for k := range 3 {
		a, b := p[(k+1)%3], p[(k+2)%3]
		gr += v[k] * (a.Y - b.Y) / d
		gz += v[k] * (b.X - a.X) / d
	}
	return [2]float64{gr, gz}
}

// boxDist is the distance from p to the outline's bounding box (0 inside it), m.
func (o *outline) boxDist(p mesh.Point) float64 {
	return math.Hypot(max(o.lo.X-p.X, 0, p.X-o.hi.X), max(o.lo.Y-p.Y, 0, p.Y-o.hi.Y))
}

// stressDensity is the integrand of the smeared-shell force, −(T_zr ∂g/∂r + T_zz ∂g/∂z), N/m³, at a point of
// free air with flux density (Br, Bz) (rms phasors, T) and shell gradient grad (1/m). T is the time-averaged
// Maxwell stress in vacuum, T_ij = ν0 Re{B_i B_j*} − ½ν0|B|² δ_ij: T_zr = ν0 Re{Bz Br*},
// T_zz = ½ν0(|Bz|² − |Br|²). With g = 1 on the part and 0 away from it, ∫ this dV equals the surface integral
// ∮ T_zj n_j dS over any surface inside the shell, which is the axial force on what it encloses.
func stressDensity(br, bz complex128, grad [2]float64) float64 {
	const nu0 = 1 / fem.Mu0
	tzr := nu0 * (real(bz)*real(br) + imag(bz)*imag(br))
	tzz := nu0 / 2 * (sqAbs(bz) - sqAbs(br))
	return -(tzr*grad[0] + tzz*grad[1])
}

func sqAbs(c complex128) float64 { return real(c)*real(c) + imag(c)*imag(c) }
