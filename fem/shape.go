package fem

import "math"

// Mu0 is the magnetic constant, H/m. We use the classical defined value 4π·10⁻⁷ exactly (the pre-2019 SI
// definition; the 2019 SI value differs by about 1e-10 relative, far below any tolerance here).
const Mu0 = 4 * math.Pi * 1e-7

// QuadRule is a quadrature rule on the reference triangle with vertices (0,0), (1,0), (0,1), written in
// barycentric coordinates. Weights sum to 1: multiply by the element's area to integrate.
type QuadRule struct {
	L [][3]float64 // barycentric coordinates of each point
	W []float64    // weights, summing to 1
}

// radon7 is the 7-point degree-5 rule of Radon (1948), tabulated by Dunavant (1985, Int. J. Numer. Meth. Eng.
// 21, 1129, degree 5). All points lie strictly inside the triangle, so none lies on r = 0.
//
// Why degree 5: with quadratic elements the stiffness integrand ν ∇φ·∇φ 2πr has degree 3, the mass term σφφ·2πr
// degree 5, and the 1/r terms (φ_i/r)(φ_j/r)·r = φ_iφ_j/r are polynomial of degree ≤ 3 on elements whose axis edge
// is prescribed (free basis functions vanish on that edge, so φ/r is a polynomial). Elsewhere 1/r is smooth on
// the element. Elements that touch the axis get radon7 on each of the four midpoint sub-triangles (axisRule):
// same exactness, finer sampling where 1/r varies fast.
func radon7() QuadRule {
	s := math.Sqrt(15)
	a1, b1 := (9-2*s)/21, (6+s)/21
	a2, b2 := (9+2*s)/21, (6-s)/21
	w1, w2 := (155+s)/1200, (155-s)/1200
	return QuadRule{
		L: [][3]float64{
			{1.0 / 3, 1.0 / 3, 1.0 / 3},
			{a1, b1, b1}, {b1, a1, b1}, {b1, b1, a1},
			{a2, b2, b2}, {b2, a2, b2}, {b2, b2, a2},
		},
		W: []float64{9.0 / 40, w1, w1, w1, w2, w2, w2},
	}
}

// subdivided applies q on each of the four triangles made by joining the edge midpoints.
func subdivided(q QuadRule) QuadRule {
	corners := [3][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	mid := func(a, b int) [3]float64 {
		var m [3]float64
		for k := range 3 {
			m[k] = (corners[a][k] + corners[b][k]) / 2
		}
		return m
	}
	m01, m12, m20 := mid(0, 1), mid(1, 2), mid(2, 0)
	subs := [4][3][3]float64{
		{corners[0], m01, m20},
		{m01, corners[1], m12},
		{m20, m12, corners[2]},
		{m12, m20, m01},
	}
	var out QuadRule
	for _, st := range subs {
		for p, lp := range q.L {
			var l [3]float64
			for v := range 3 {
				for k := range 3 {
					l[k] += lp[v] * st[v][k]
				}
			}
			out.L = append(out.L, l)
			out.W = append(out.W, q.W[p]/4)
		}
	}
	return out
}

// Rules holds the two quadrature rules the solver uses: Interior for elements away from the axis and Axis for
// elements with at least one node on r = 0.
type Rules struct {
	Interior, Axis QuadRule
}

// DefaultRules returns radon7 for interior elements and radon7 on the four midpoint sub-triangles (28 points)
// for elements touching the axis.
func DefaultRules() Rules {
	q := radon7()
	return Rules{Interior: q, Axis: subdivided(q)}
}

// Order is the polynomial order of the elements: 1 (3-node) or 2 (6-node).
type Order int

// NumNodes is the number of nodes of a triangle of this order.
func (o Order) NumNodes() int {
	switch o {
	case 1:
		return 3
	case 2:
		return 6
	}
	panic("fem: element order must be 1 or 2")
}

// Shape evaluates the basis functions of order o at barycentric point l into n (length o.NumNodes()).
// Node order: corners 0, 1, 2, then midpoints of edges (0,1), (1,2), (2,0).
func (o Order) Shape(l [3]float64, n []float64) {
	if o == 1 {
		n[0], n[1], n[2] = l[0], l[1], l[2]
		return
	}
	for k := range 3 {
		n[k] = l[k] * (2*l[k] - 1)
	}
	n[3] = 4 * l[0] * l[1]
	n[4] = 4 * l[1] * l[2]
	n[5] = 4 * l[2] * l[0]
}

// ShapeGrad evaluates the basis functions' gradients in (r, z) at barycentric point l, given the constant
// barycentric gradients gl of the element (gl[k] = ∇L_k, 1/m). Writes dr[i], dz[i].
func (o Order) ShapeGrad(l [3]float64, gl [3][2]float64, dr, dz []float64) {
	if o == 1 {
		for k := range 3 {
			dr[k], dz[k] = gl[k][0], gl[k][1]
		}
		return
	}
	for k := range 3 {
		c := 4*l[k] - 1
		dr[k], dz[k] = c*gl[k][0], c*gl[k][1]
	}
	for e := range 3 {
		a, b := e, (e+1)%3
		dr[3+e] = 4 * (l[a]*gl[b][0] + l[b]*gl[a][0])
		dz[3+e] = 4 * (l[a]*gl[b][1] + l[b]*gl[a][1])
	}
}

// triGeom returns the area (positive for counter-clockwise corners) and the barycentric gradients of the
// triangle with corners p.
func triGeom(p [3][2]float64) (area float64, gl [3][2]float64) {
	d := (p[1][0]-p[0][0])*(p[2][1]-p[0][1]) - (p[2][0]-p[0][0])*(p[1][1]-p[0][1])
	area = d / 2
	for k := range 3 {
		i, j := (k+1)%3, (k+2)%3
		// ∇L_k is perpendicular to the opposite edge (i→j), scaled by 1/(2·area).
		gl[k][0] = (p[i][1] - p[j][1]) / d
		gl[k][1] = (p[j][0] - p[i][0]) / d
	}
	return area, gl
}

// gauss5 is the 5-point Gauss–Legendre rule on [0, 1] (weights sum to 1); exact to degree 9.
var gauss5 = struct{ X, W [5]float64 }{
	X: [5]float64{
		0.5 - 0.9061798459386640/2, 0.5 - 0.5384693101056831/2, 0.5,
		0.5 + 0.5384693101056831/2, 0.5 + 0.9061798459386640/2,
	},
	W: [5]float64{
		0.2369268850561891 / 2, 0.4786286704993665 / 2, 0.5688888888888889 / 2,
		0.4786286704993665 / 2, 0.2369268850561891 / 2,
	},
}

// edgeShape evaluates the 1-D basis on a boundary edge at t ∈ [0,1], node order (A, B, M) as in mesh.Edge.
func edgeShape(o Order, t float64, n []float64) {
	if o == 1 {
		n[0], n[1] = 1-t, t
		return
	}
	n[0] = (1 - t) * (1 - 2*t)
	n[1] = t * (2*t - 1)
	n[2] = 4 * t * (1 - t)
}
