package mesh

import (
	"math"
	"sync"
)

// Robust geometric predicates after J. R. Shewchuk, "Adaptive Precision Floating-Point Arithmetic and Fast
// Robust Geometric Predicates", Discrete & Computational Geometry 18:305–363 (1997). Each predicate first
// evaluates the determinant in floating point and accepts its sign when the magnitude exceeds the paper's
// forward error bound (errboundA); otherwise it recomputes the determinant exactly with floating-point
// expansions (sums of non-overlapping doubles), in the paper's stages: B evaluates the determinant exactly from
// the rounded coordinate differences (exact outright when those differences are exact, as on the regular,
// grid-like point sets that refinement produces, where co-circular quadruples are common); C adds a first-order
// correction for the differences' rounding errors; only if both are inconclusive does the full exact
// evaluation (stage D, done here from scratch) run. The error bounds are the paper's.

const (
	epsilon        = 1.1102230246251565e-16 // 2^-53, half an ulp of 1
	resultErrBound = (3 + 8*epsilon) * epsilon
	ccwErrBoundA   = (3 + 16*epsilon) * epsilon
	ccwErrBoundB   = (2 + 12*epsilon) * epsilon
	ccwErrBoundC   = (9 + 64*epsilon) * epsilon * epsilon
	iccErrBoundA   = (10 + 96*epsilon) * epsilon
	iccErrBoundB   = (4 + 48*epsilon) * epsilon
	iccErrBoundC   = (44 + 576*epsilon) * epsilon * epsilon
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
	det, _ = orient2DAdapt(a, b, c, detsum)
	return det
}

// orient2DAdapt runs stages B, C and D of the orientation test and reports which stage decided (for tests).
func orient2DAdapt(a, b, c Point, detsum float64) (float64, int) {
	acx, bcx := a.X-c.X, b.X-c.X
	acy, bcy := a.Y-c.Y, b.Y-c.Y
	l1, l0 := twoProduct(acx, bcy)
	r1, r0 := twoProduct(acy, bcx)
	var bb [4]float64
	B := sumInto(bb[:0], []float64{l0, l1}, []float64{-r0, -r1})
	det := expSumEstimate(B)
	if eb := ccwErrBoundB * detsum; det >= eb || -det >= eb {
		return det, 'B'
	}
	acxt, bcxt := diffTail(a.X, c.X, acx), diffTail(b.X, c.X, bcx)
	acyt, bcyt := diffTail(a.Y, c.Y, acy), diffTail(b.Y, c.Y, bcy)
	if acxt == 0 && acyt == 0 && bcxt == 0 && bcyt == 0 {
		return det, 'B' // the differences were exact, so B was the exact determinant
	}
	eb := ccwErrBoundC*detsum + resultErrBound*math.Abs(det)
	det += (acx*bcyt + bcy*acxt) - (acy*bcxt + bcx*acyt)
	if det >= eb || -det >= eb {
		return det, 'C'
	}
	return orient2DExact(a, b, c), 'D'
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
	det, _ = inCircleAdapt(a, b, c, d, permanent)
	return det
}

// inCircleAdapt runs stages B, C and D of the in-circle test and reports which stage decided (for tests).
// Stage B works in fixed-size stack buffers, so it allocates nothing.
func inCircleAdapt(a, b, c, d Point, permanent float64) (float64, int) {
	adx, bdx, cdx := a.X-d.X, b.X-d.X, c.X-d.X
	ady, bdy, cdy := a.Y-d.Y, b.Y-d.Y, c.Y-d.Y
	var (
		s1, s2, s3 [4]float64
		t1, t2     [8]float64
		u1, u2     [16]float64
		det3       [3][32]float64
		ab         [64]float64
		fin        [96]float64
	)
	// lifted returns (x² + y²)·(p·q' − p'·q) exactly, for rounded differences.
	lifted := func(x, y, p, q, pp, qq float64, dst []float64) []float64 {
		h1, h0 := twoProduct(p, qq)
		g1, g0 := twoProduct(pp, q)
		cr := sumInto(s1[:0], append(s2[:0], h0, h1), append(s3[:0], -g0, -g1))
		xx := scaleInto(u1[:0], scaleInto(t1[:0], cr, x), x)
		yy := scaleInto(u2[:0], scaleInto(t2[:0], cr, y), y)
		return sumInto(dst, xx, yy)
	}
	ad := lifted(adx, ady, bdx, bdy, cdx, cdy, det3[0][:0])
	bd := lifted(bdx, bdy, cdx, cdy, adx, ady, det3[1][:0])
	cd := lifted(cdx, cdy, adx, ady, bdx, bdy, det3[2][:0])
	det := expSumEstimate(sumInto(fin[:0], sumInto(ab[:0], ad, bd), cd))
	if eb := iccErrBoundB * permanent; det >= eb || -det >= eb {
		return det, 'B'
	}
	adxt, bdxt, cdxt := diffTail(a.X, d.X, adx), diffTail(b.X, d.X, bdx), diffTail(c.X, d.X, cdx)
	adyt, bdyt, cdyt := diffTail(a.Y, d.Y, ady), diffTail(b.Y, d.Y, bdy), diffTail(c.Y, d.Y, cdy)
	if adxt == 0 && bdxt == 0 && cdxt == 0 && adyt == 0 && bdyt == 0 && cdyt == 0 {
		return det, 'B' // the differences were exact, so B was the exact determinant
	}
	eb := iccErrBoundC*permanent + resultErrBound*math.Abs(det)
	det += ((adx*adx+ady*ady)*((bdx*cdyt+cdy*bdxt)-(bdy*cdxt+cdx*bdyt)) +
		2*(adx*adxt+ady*adyt)*(bdx*cdy-bdy*cdx)) +
		((bdx*bdx+bdy*bdy)*((cdx*adyt+ady*cdxt)-(cdy*adxt+adx*cdyt)) +
			2*(bdx*bdxt+bdy*bdyt)*(cdx*ady-cdy*adx)) +
		((cdx*cdx+cdy*cdy)*((adx*bdyt+bdy*adxt)-(ady*bdxt+bdx*adyt)) +
			2*(cdx*cdxt+cdy*cdyt)*(adx*bdy-ady*bdx))
	if det >= eb || -det >= eb {
		return det, 'C'
	}
	return inCircleExact(a, b, c, d), 'D'
}

// diffTail returns the rounding error of x = fl(a-b), so that a-b = x + tail exactly.
func diffTail(a, b, x float64) float64 {
	bv := a - x
	av := x + bv
	return (a - av) + (bv - b)
}

// expSumEstimate approximates the value of an expansion by the floating-point sum of its components.
func expSumEstimate(e []float64) float64 {
	q := 0.0
	for _, x := range e {
		q += x
	}
	return q
}

// arena hands out slices of one fixed buffer, so the exact stages allocate nothing on the heap.
type arena struct {
	buf [8192]float64
	n   int
}

// arenas recycles scratch buffers between exact evaluations (a concurrency-safe cache, not shared state:
// every call takes a buffer of its own).
var arenas = sync.Pool{New: func() any { return new(arena) }}

func (a *arena) get(n int) []float64 {
	s := a.buf[a.n : a.n : a.n+n]
	a.n += n
	return s
}

// orient2DExact evaluates (ax-cx)(by-cy) - (ay-cy)(bx-cx) exactly and returns its most significant component.
func orient2DExact(a, b, c Point) float64 {
	ar := arenas.Get().(*arena)
	ar.n = 0
	defer arenas.Put(ar)
	acx := twoDiff(a.X, c.X, ar.get(2))
	bcy := twoDiff(b.Y, c.Y, ar.get(2))
	acy := twoDiff(a.Y, c.Y, ar.get(2))
	bcx := twoDiff(b.X, c.X, ar.get(2))
	l := expMul(ar, acx, bcy)
	r := expMul(ar, acy, bcx)
	neg(r)
	return expEstimate(expSum(ar, l, r))
}

// inCircleExact evaluates the in-circle determinant with d translated to the origin, exactly.
func inCircleExact(a, b, c, d Point) float64 {
	ar := arenas.Get().(*arena)
	ar.n = 0
	defer arenas.Put(ar)
	adx := twoDiff(a.X, d.X, ar.get(2))
	ady := twoDiff(a.Y, d.Y, ar.get(2))
	bdx := twoDiff(b.X, d.X, ar.get(2))
	bdy := twoDiff(b.Y, d.Y, ar.get(2))
	cdx := twoDiff(c.X, d.X, ar.get(2))
	cdy := twoDiff(c.Y, d.Y, ar.get(2))
	lift := func(x, y []float64) []float64 { return expSum(ar, expMul(ar, x, x), expMul(ar, y, y)) }
	cross := func(x1, y1, x2, y2 []float64) []float64 {
		r := expMul(ar, x2, y1)
		neg(r)
		return expSum(ar, expMul(ar, x1, y2), r)
	}
	alift, blift, clift := lift(adx, ady), lift(bdx, bdy), lift(cdx, cdy)
	bc := cross(bdx, bdy, cdx, cdy)
	ca := cross(cdx, cdy, adx, ady)
	ab := cross(adx, ady, bdx, bdy)
	det := expSum(ar, expSum(ar, expMul(ar, alift, bc), expMul(ar, blift, ca)), expMul(ar, clift, ab))
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

// expSum returns e + f exactly as a zero-free non-overlapping expansion: merge the components by magnitude,
// then sweep with exact two-sums (Shewchuk's Fast-Expansion-Sum with zero elimination, using Two-Sum).
func expSum(ar *arena, e, f []float64) []float64 {
	g := ar.get(len(e) + len(f))
	i, j := 0, 0
	for i < len(e) || j < len(f) {
		if j == len(f) || (i < len(e) && math.Abs(e[i]) < math.Abs(f[j])) {
			g = append(g, e[i])
			i++
		} else {
			g = append(g, f[j])
			j++
		}
	}
	if len(g) < 2 {
		return g
	}
	q := g[0]
	h := g[:0]
	for _, x := range g[1:] {
		var hh float64
		q, hh = twoSum(q, x)
		if hh != 0 {
			h = append(h, hh)
		}
	}
	if q != 0 || len(h) == 0 {
		h = append(h, q)
	}
	return h
}

func neg(e []float64) {
	for i := range e {
		e[i] = -e[i]
	}
}

// expMul returns e·f exactly, as the sum of e scaled by each component of f.
func expMul(ar *arena, e, f []float64) []float64 {
	if len(e) == 0 || len(f) == 0 {
		return nil
	}
	mark := ar.n
	var acc []float64
	var tmp [2][]float64
	tmp[0], tmp[1] = ar.get(2*len(e)*len(f)), ar.get(2*len(e)*len(f))
	sc := ar.get(2 * len(e))
	for k, fi := range f {
		s := scaleInto(sc, e, fi)
		acc = sumInto(tmp[k%2], acc, s)
	}
	// Move the result to the front of this call's scratch so the rest can be reused.
	out := ar.buf[mark : mark : mark+len(acc)]
	out = append(out, acc...)
	ar.n = mark + len(out)
	return out
}

func scaleInto(dst, e []float64, b float64) []float64 {
	h := dst[:0]
	if b == 0 || len(e) == 0 {
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

// sumInto is expSum writing into dst (capacity len(e)+len(f), not aliasing e or f).
func sumInto(dst, e, f []float64) []float64 {
	g := dst[:0]
	i, j := 0, 0
	for i < len(e) || j < len(f) {
		if j == len(f) || (i < len(e) && math.Abs(e[i]) < math.Abs(f[j])) {
			g = append(g, e[i])
			i++
		} else {
			g = append(g, f[j])
			j++
		}
	}
	if len(g) < 2 {
		return g
	}
	q := g[0]
	h := g[:0]
	for _, x := range g[1:] {
		var hh float64
		q, hh = twoSum(q, x)
		if hh != 0 {
			h = append(h, hh)
		}
	}
	if q != 0 || len(h) == 0 {
		h = append(h, q)
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
