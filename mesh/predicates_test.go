package mesh

import (
	"math"
	"math/big"
	"math/rand"
	"testing"
)

// Reference: exact rational arithmetic (math/big) on the same float64 inputs; the predicates must agree in sign.
func ratOrient(a, b, c Point) int {
	r := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	acx := new(big.Rat).Sub(r(a.X), r(c.X))
	bcy := new(big.Rat).Sub(r(b.Y), r(c.Y))
	acy := new(big.Rat).Sub(r(a.Y), r(c.Y))
	bcx := new(big.Rat).Sub(r(b.X), r(c.X))
	return new(big.Rat).Sub(new(big.Rat).Mul(acx, bcy), new(big.Rat).Mul(acy, bcx)).Sign()
}

func ratInCircle(a, b, c, d Point) int {
	r := func(x float64) *big.Rat { return new(big.Rat).SetFloat64(x) }
	sub := func(x, y float64) *big.Rat { return new(big.Rat).Sub(r(x), r(y)) }
	mul := func(x, y *big.Rat) *big.Rat { return new(big.Rat).Mul(x, y) }
	add := func(x, y *big.Rat) *big.Rat { return new(big.Rat).Add(x, y) }
	adx, ady := sub(a.X, d.X), sub(a.Y, d.Y)
	bdx, bdy := sub(b.X, d.X), sub(b.Y, d.Y)
	cdx, cdy := sub(c.X, d.X), sub(c.Y, d.Y)
	al := add(mul(adx, adx), mul(ady, ady))
	bl := add(mul(bdx, bdx), mul(bdy, bdy))
	cl := add(mul(cdx, cdx), mul(cdy, cdy))
	det := add(add(mul(al, new(big.Rat).Sub(mul(bdx, cdy), mul(cdx, bdy))),
		mul(bl, new(big.Rat).Sub(mul(cdx, ady), mul(adx, cdy)))),
		mul(cl, new(big.Rat).Sub(mul(adx, bdy), mul(bdx, ady))))
	return det.Sign()
}

func sign(x float64) int {
	switch {
	case x > 0:
		return 1
	case x < 0:
		return -1
	}
	return 0
}

func TestPredicatesTable(t *testing.T) {
	tests := []struct {
		name    string
		a, b, c Point
		d       Point
		orient  int
		incirc  int
	}{
		{"ccw unit", Point{0, 0}, Point{1, 0}, Point{0, 1}, Point{0.5, 0.5}, 1, 1},
		{"cw unit", Point{0, 0}, Point{0, 1}, Point{1, 0}, Point{0.5, 0.5}, -1, -1},
		{"collinear", Point{0, 0}, Point{1, 1}, Point{2, 2}, Point{3, 3}, 0, 0},
		{"cocircular", Point{1, 0}, Point{0, 1}, Point{-1, 0}, Point{0, -1}, 1, 0},
		{"outside", Point{1, 0}, Point{0, 1}, Point{-1, 0}, Point{0, -1.0000000000000002}, 1, -1},
		{"inside by an ulp", Point{1, 0}, Point{0, 1}, Point{-1, 0}, Point{0, -0.9999999999999999}, 1, 1},
		// 0.1, 0.2, 0.3 are not collinear once rounded to binary: the exact reference decides.
		{"decimal line", Point{0.1, 0.1}, Point{0.2, 0.2}, Point{0.3, 0.3}, Point{0.4, 0.4},
			ratOrient(Point{0.1, 0.1}, Point{0.2, 0.2}, Point{0.3, 0.3}),
			ratInCircle(Point{0.1, 0.1}, Point{0.2, 0.2}, Point{0.3, 0.3}, Point{0.4, 0.4})},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := sign(Orient2D(tc.a, tc.b, tc.c)); got != tc.orient {
				t.Errorf("Orient2D sign = %d, want %d", got, tc.orient)
			}
			if got := sign(InCircle(tc.a, tc.b, tc.c, tc.d)); got != tc.incirc {
				t.Errorf("InCircle sign = %d, want %d", got, tc.incirc)
			}
		})
	}
}

// TestPredicatesNearDegenerate compares against exact rationals on inputs built to defeat the float filter:
// points within a few ulps of a line, and of a circle (the classic failure cases of naive predicates).
func TestPredicatesNearDegenerate(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	exact := 0
	for i := 0; i < 5000; i++ {
		// Near-collinear: c on the line a→b, nudged by a few ulps.
		a := Point{rng.Float64(), rng.Float64()}
		b := Point{a.X + rng.Float64()*1e3, a.Y + rng.Float64()*1e3}
		s := rng.Float64()
		c := Point{a.X + s*(b.X-a.X), a.Y + s*(b.Y-a.Y)}
		c.X = math.Nextafter(c.X, c.X+float64(rng.Intn(3)-1))
		if got, want := sign(Orient2D(a, b, c)), ratOrient(a, b, c); got != want {
			t.Fatalf("Orient2D(%v,%v,%v) sign %d, exact %d", a, b, c, got, want)
		}
		if math.Abs(Orient2D(a, b, c)) < 1e-10 {
			exact++
		}
		// Near-cocircular: four points on a circle of radius ~1 around a far centre, rounded.
		cx, cy := rng.Float64()*100, rng.Float64()*100
		pt := func(th float64) Point { return Point{cx + math.Cos(th), cy + math.Sin(th)} }
		th := rng.Float64() * 2 * math.Pi
		p := [4]Point{pt(th), pt(th + 1), pt(th + 2.5), pt(th + 4)}
		if got, want := sign(InCircle(p[0], p[1], p[2], p[3])), ratInCircle(p[0], p[1], p[2], p[3]); got != want {
			t.Fatalf("InCircle%v sign %d, exact %d", p, got, want)
		}
	}
	if exact == 0 {
		t.Fatal("the test never produced a near-degenerate orientation; it cannot exercise the exact stage")
	}
}

func TestPredicateAntisymmetry(t *testing.T) {
	rng := rand.New(rand.NewSource(2))
	for i := 0; i < 5000; i++ {
		// Snap to a coarse grid so exact zeros occur often.
		g := func() float64 { return float64(rng.Intn(5)) * 0.1 }
		a, b, c, d := Point{g(), g()}, Point{g(), g()}, Point{g(), g()}, Point{g(), g()}
		if sign(Orient2D(a, b, c)) != -sign(Orient2D(b, a, c)) || sign(Orient2D(a, b, c)) != sign(Orient2D(b, c, a)) {
			t.Fatalf("orientation not antisymmetric/cyclic for %v %v %v", a, b, c)
		}
		if sign(InCircle(a, b, c, d)) != -sign(InCircle(b, a, c, d)) {
			t.Fatalf("in-circle not antisymmetric for %v %v %v %v", a, b, c, d)
		}
		if got, want := sign(InCircle(a, b, c, d)), ratInCircle(a, b, c, d); got != want {
			t.Fatalf("InCircle%v sign %d, exact %d", [4]Point{a, b, c, d}, got, want)
		}
	}
}

func BenchmarkPredicates(b *testing.B) {
	rng := rand.New(rand.NewSource(3))
	pts := make([]Point, 1024)
	for i := range pts {
		pts[i] = Point{rng.Float64(), rng.Float64()}
	}
	b.Run("Orient2D", func(b *testing.B) {
		b.ReportAllocs()
		s := 0.0
		for i := 0; b.Loop(); i++ {
			s += Orient2D(pts[i&1023], pts[(i+1)&1023], pts[(i+2)&1023])
		}
		_ = s
	})
	b.Run("InCircle", func(b *testing.B) {
		b.ReportAllocs()
		s := 0.0
		for i := 0; b.Loop(); i++ {
			s += InCircle(pts[i&1023], pts[(i+1)&1023], pts[(i+2)&1023], pts[(i+3)&1023])
		}
		_ = s
	})
}

// TestPredicateStages drives the adaptive stages B, C and D of both predicates on inputs chosen to need each of
// them, compares every sign with exact rational arithmetic, and requires each stage to have decided at least
// once, so a broken stage cannot hide behind another. Inputs: points on a fine dyadic grid (exact differences,
// many exact ties: stage B), the same grid offset far from the origin by a non-dyadic amount (inexact
// differences: stages C and D), points nudged by an ulp off a line or circle, and exactly collinear points of
// mixed magnitudes.
func TestPredicateStages(t *testing.T) {
	rng := rand.New(rand.NewSource(4))
	seenO, seenI := map[int]int{}, map[int]int{}
	for i := 0; i < 20000; i++ {
		off := 0.0
		switch i % 3 {
		case 1:
			off = 1000.1
		case 2:
			off = 0.3 + rng.Float64()
		}
		g := func() float64 { return off + float64(rng.Intn(9))/1024 }
		p := [4]Point{{g(), g()}, {g(), g()}, {g(), g()}, {g(), g()}}
		if k := rng.Intn(4); i%5 == 4 && p[k].X != 0 { // (an ulp of 0 would underflow, outside the predicates' domain)
			p[k].X = math.Nextafter(p[k].X, math.Inf(2*rng.Intn(2)-1))
		}
		if i%7 == 6 { // exactly collinear on y = x, with coordinate differences that round: needs stage D
			for k := range 3 {
				v := rng.Float64() * math.Pow(10, float64(rng.Intn(7)-3))
				p[k] = Point{v, v}
			}
		}
		a, b, c, d := p[0], p[1], p[2], p[3]
		{
			o := Orient2D(a, b, c)
			detsum := math.Abs((a.X-c.X)*(b.Y-c.Y)) + math.Abs((a.Y-c.Y)*(b.X-c.X))
			got, st := orient2DAdapt(a, b, c, detsum)
			if sign(got) != ratOrient(a, b, c) || sign(o) != sign(got) {
				t.Fatalf("orient stage %c: %v sign %d, exact %d", st, p[:3], sign(got), ratOrient(a, b, c))
			}
			seenO[st]++
		}
		adx, ady, bdx, bdy, cdx, cdy := a.X-d.X, a.Y-d.Y, b.X-d.X, b.Y-d.Y, c.X-d.X, c.Y-d.Y
		perm := (math.Abs(bdx*cdy)+math.Abs(cdx*bdy))*(adx*adx+ady*ady) +
			(math.Abs(cdx*ady)+math.Abs(adx*cdy))*(bdx*bdx+bdy*bdy) +
			(math.Abs(adx*bdy)+math.Abs(bdx*ady))*(cdx*cdx+cdy*cdy)
		got, st := inCircleAdapt(a, b, c, d, perm)
		want := ratInCircle(a, b, c, d)
		if sign(got) != want || sign(InCircle(a, b, c, d)) != want {
			t.Fatalf("in-circle stage %c: %v sign %d, exact %d", st, p, sign(got), want)
		}
		seenI[st]++
	}
	for _, st := range []int{'B', 'C', 'D'} {
		if seenO[st] == 0 || seenI[st] == 0 {
			t.Errorf("stage %c never decided (orient %v, in-circle %v)", st, seenO, seenI)
		}
	}
}
