package mesh

import "math"

// Robust geometric predicates after J. R. Shewchuk, "Adaptive Precision Floating-Point Arithmetic and Fast
// Robust Geometric Predicates", Discrete & Computational Geometry 18:305–363 (1997). Each predicate first
// evaluates the determinant in floating point and accepts its sign when the magnitude exceeds the paper's
// forward error bound (errboundA); otherwise it recomputes the determinant exactly with floating-point
// expansions (sums of non-overlapping doubles). Only the final exact stage of the paper's four-stage scheme is
// kept: the filter decides almost every call, and the exact stage is simple enough to trust.

const (
	epsilon      = 1.1102230246251565e-16 // 2^-53, half an ulp of 1
	ccwErrBoundA = (3 + 16*epsilon) * epsilon
	iccErrBoundA = (10 + 96*epsilon) * epsilon
)

// Orient2D returns a positive value when a, b, c occur in counter-clockwise order, a negative value when they
// are clockwise, and zero when they are collinear. The sign is exact; the magnitude approximates twice the
// signed area of triangle abc.
func Orient2D(a, b, c Point) float64 {
	detleft := (a.X - c.X) * (b.Y - c.Y)
	detright := (a.Y - c.Y) * (b.X - c.X)
	det := detleft - detright
	var detsum float64
	switch {
	case detleft > 0:
		if detright <= 0 {
			return det
		}
		detsum = detleft + detright
	case detleft < 0:
		if detright >= 0 {
			return det
		}
		detsum = -detleft - detright
	default:
		return det
	}
	if det >= ccwErrBoundA*detsum || -det >= ccwErrBoundA*detsum {
		return det
	}
	return orient2DExact(a, b, c)
}

// InCircle returns a positive value when d lies strictly inside the circle through a, b, c, a negative value
// when it lies strictly outside, and zero when the four points are co-circular. a, b, c must be in
// counter-clockwise order for this sign convention (the sign flips for clockwise order). The sign is exact.
func InCircle(a, b, c, d Point) float64 {
	adx, ady := a.X-d.X, a.Y-d.Y
	bdx, bdy := b.X-d.X, b.Y-d.Y
	cdx, cdy := c.X-d.X, c.Y-d.Y
	bdxcdy, cdxbdy := bdx*cdy, cdx*bdy
	alift := adx*adx + ady*ady
	cdxady, adxcdy := cdx*ady, adx*cdy
	blift := bdx*bdx + bdy*bdy
	adxbdy, bdxady := adx*bdy, bdx*ady
	clift := cdx*cdx + cdy*cdy
	det := alift*(bdxcdy-cdxbdy) + blift*(cdxady-adxcdy) + clift*(adxbdy-bdxady)
	permanent := (math.Abs(bdxcdy)+math.Abs(cdxbdy))*alift +
		(math.Abs(cdxady)+math.Abs(adxcdy))*blift +
		(math.Abs(adxbdy)+math.Abs(bdxady))*clift
	errbound := iccErrBoundA * permanent
	if det > errbound || -det > errbound {
		return det
	}
	return inCircleExact(a, b, c, d)
}

// orient2DExact evaluates (ax-cx)(by-cy) - (ay-cy)(bx-cx) exactly and returns its most significant component.
func orient2DExact(a, b, c Point) float64 {
	var buf [4][2]float64
	acx := twoDiff(a.X, c.X, buf[0][:0])
	bcy := twoDiff(b.Y, c.Y, buf[1][:0])
	acy := twoDiff(a.Y, c.Y, buf[2][:0])
	bcx := twoDiff(b.X, c.X, buf[3][:0])
	l := expMul(acx, bcy)
	r := expMul(acy, bcx)
	return expEstimate(expSum(l, expNeg(r)))
}

// inCircleExact evaluates the in-circle determinant with d translated to the origin, exactly.
func inCircleExact(a, b, c, d Point) float64 {
	var buf [6][2]float64
	adx := twoDiff(a.X, d.X, buf[0][:0])
	ady := twoDiff(a.Y, d.Y, buf[1][:0])
	bdx := twoDiff(b.X, d.X, buf[2][:0])
	bdy := twoDiff(b.Y, d.Y, buf[3][:0])
	cdx := twoDiff(c.X, d.X, buf[4][:0])
	cdy := twoDiff(c.Y, d.Y, buf[5][:0])
	alift := expSum(expMul(adx, adx), expMul(ady, ady))
	blift := expSum(expMul(bdx, bdx), expMul(bdy, bdy))
	clift := expSum(expMul(cdx, cdx), expMul(cdy, cdy))
	bc := expSum(expMul(bdx, cdy), expNeg(expMul(cdx, bdy)))
	ca := expSum(expMul(cdx, ady), expNeg(expMul(adx, cdy)))
	ab := expSum(expMul(adx, bdy), expNeg(expMul(bdx, ady)))
	det := expSum(expSum(expMul(alift, bc), expMul(blift, ca)), expMul(clift, ab))
	return expEstimate(det)
}

// twoSum returns x = fl(a+b) and the exact rounding error y, so that a+b = x+y (Knuth).
func twoSum(a, b float64) (x, y float64) {
	x = a + b
	bv := x - a
	av := x - bv
	y = (a - av) + (b - bv)
	return
}

// twoProduct returns x = fl(a·b) and the exact error y = a·b - x, using a fused multiply-add.
func twoProduct(a, b float64) (x, y float64) {
	x = a * b
	y = math.FMA(a, b, -x)
	return
}

// twoDiff appends the exact expansion of a-b (zero components removed, increasing magnitude) to dst.
func twoDiff(a, b float64, dst []float64) []float64 {
	x, y := twoSum(a, -b)
	if y != 0 {
		dst = append(dst, y)
	}
	if x != 0 {
		dst = append(dst, x)
	}
	return dst
}

// growExpansion returns e + b as a new non-overlapping expansion without zero components (Shewchuk's
// Grow-Expansion with zero elimination).
func growExpansion(e []float64, b float64, dst []float64) []float64 {
	q := b
	for _, ei := range e {
		var h float64
		q, h = twoSum(q, ei)
		if h != 0 {
			dst = append(dst, h)
		}
	}
	if q != 0 {
		dst = append(dst, q)
	}
	return dst
}

// expSum returns e + f exactly.
func expSum(e, f []float64) []float64 {
	h := append(make([]float64, 0, len(e)+len(f)), e...)
	for _, fi := range f {
		h = growExpansion(h, fi, make([]float64, 0, len(h)+1))
	}
	return h
}

// expNeg returns -e.
func expNeg(e []float64) []float64 {
	h := make([]float64, len(e))
	for i, v := range e {
		h[i] = -v
	}
	return h
}

// scaleExpansion returns e·b exactly (Shewchuk's Scale-Expansion with zero elimination).
func scaleExpansion(e []float64, b float64) []float64 {
	h := make([]float64, 0, 2*len(e))
	if len(e) == 0 || b == 0 {
		return h
	}
	q, hh := twoProduct(e[0], b)
	if hh != 0 {
		h = append(h, hh)
	}
	for _, ei := range e[1:] {
		p1, p0 := twoProduct(ei, b)
		var sum float64
		sum, hh = twoSum(q, p0)
		if hh != 0 {
			h = append(h, hh)
		}
		q, hh = twoSum(p1, sum)
		if hh != 0 {
			h = append(h, hh)
		}
	}
	if q != 0 {
		h = append(h, q)
	}
	return h
}

// expMul returns e·f exactly.
func expMul(e, f []float64) []float64 {
	var h []float64
	for _, fi := range f {
		h = expSum(h, scaleExpansion(e, fi))
	}
	return h
}

// expEstimate returns the most significant component of a zero-eliminated expansion, which carries its sign.
func expEstimate(e []float64) float64 {
	if len(e) == 0 {
		return 0
	}
	return e[len(e)-1]
}
