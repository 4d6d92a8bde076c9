package plot

import (
	"math"
	"math/rand"
	"testing"

	"eddyrz/mesh"
)

func polyLength(l []mesh.Point) float64 {
	s := 0.0
	for i := 1; i < len(l); i++ {
		s += math.Hypot(l[i].X-l[i-1].X, l[i].Y-l[i-1].Y)
	}
	return s
}

func onUnitBoundary(p mesh.Point) bool {
	const eps = 1e-12
	return math.Abs(p.X) < eps || math.Abs(p.Y) < eps || math.Abs(p.X-1) < eps || math.Abs(p.Y-1) < eps
}

// A linear field is reproduced exactly by the piecewise-linear interpolant, so its level sets are straight
// segments across the unit square: every point lies on the line, the curve is one polyline from boundary to
// boundary, and its length is the chord length of the line in the square (exact geometry).
func TestIsolinesLinearFieldExact(t *testing.T) {
	tests := []struct {
		name    string
		a, b, d float64 // f = a x + b y + d
		level   float64
		length  float64
	}{
		{"vertical", 1, 0, 0, 0.35, 1},
		{"horizontal", 0, 2, 0, 0.9, 1},
		{"diagonal", 1, 1, 0, 1, math.Sqrt2},               // x + y = 1: the full diagonal
		{"corner", 1, 1, 0, 0.5, 0.5 * math.Sqrt2},         // x + y = 0.5: cuts the corner
		{"sloped", 1, -0.5, 0.25, 0.6, math.Hypot(0.5, 1)}, // x = 0.35 + 0.5 y: from (0.35, 0) to (0.85, 1)
	}
	for _, quad := range []bool{false, true} {
		m := gridMesh(7, 5, 1, 1, quad)
		for _, tc := range tests {
			f := nodal(m, func(x, y float64) float64 { return tc.a*x + tc.b*y + tc.d })
			iso, err := Isolines(m, f, []float64{tc.level})
			if err != nil {
				t.Fatal(err)
			}
			if len(iso) != 1 || len(iso[0].Lines) != 1 {
				t.Fatalf("%s quad=%v: want one polyline, got %+v", tc.name, quad, iso)
			}
			l := iso[0].Lines[0]
			for _, p := range l {
				if v := tc.a*p.X + tc.b*p.Y + tc.d; math.Abs(v-tc.level) > 1e-12 {
					t.Errorf("%s quad=%v: point %v has f = %.17g, want %g", tc.name, quad, p, v, tc.level)
				}
			}
			if !onUnitBoundary(l[0]) || !onUnitBoundary(l[len(l)-1]) {
				t.Errorf("%s quad=%v: ends %v %v not on the boundary", tc.name, quad, l[0], l[len(l)-1])
			}
			if got := polyLength(l); math.Abs(got-tc.length) > 1e-12 {
				t.Errorf("%s quad=%v: length %.15g, want %.15g", tc.name, quad, got, tc.length)
			}
		}
	}
}

// On a quadratic mesh a curved field is traced on the 4 sub-triangles of each element; the curves must be
// continuous: open polylines end only on the boundary, closed ones return to their start, and the pieces
// add up to the whole curve.
func TestIsolinesQuadraticContinuous(t *testing.T) {
	m := gridMesh(12, 12, 1, 1, true)
	h := 1.0 / 24 // sub-triangle leg
	t.Run("quarter circle", func(t *testing.T) {
		f := nodal(m, func(x, y float64) float64 { return x*x + y*y })
		iso, err := Isolines(m, f, []float64{0.5})
		if err != nil {
			t.Fatal(err)
		}
		if len(iso[0].Lines) != 1 {
			t.Fatalf("want one polyline, got %d", len(iso[0].Lines))
		}
		l := iso[0].Lines[0]
		checkSteps(t, l, 1.5*h)
		if !onUnitBoundary(l[0]) || !onUnitBoundary(l[len(l)-1]) {
			t.Errorf("ends %v %v not on the boundary", l[0], l[len(l)-1])
		}
		// Interpolating x²+y² linearly over a sub-triangle errs by at most h² (the Hessian is 2I, the
		// interpolation error of a quadratic on a triangle of diameter d is at most d²/4 · 2 = d²/2, d = √2 h).
		for _, p := range l {
			if v := p.X*p.X + p.Y*p.Y; math.Abs(v-0.5) > h*h {
				t.Errorf("point %v: f = %g, off the level by more than h²", p, v)
			}
		}
		// Quarter circle of radius √0.5. The linear interpolant of a convex function lies above it, so the
		// traced curve lies just inside the circle, and a chord polygon is shorter still: a little short.
		want := math.Pi / 2 * math.Sqrt(0.5)
		if got := polyLength(l); got > want || got < want*(1-1e-3) {
			t.Errorf("length %g, want just under %g", got, want)
		}
	})
	t.Run("closed loop", func(t *testing.T) {
		f := nodal(m, func(x, y float64) float64 { return (x-0.5)*(x-0.5) + (y-0.45)*(y-0.45) })
		iso, err := Isolines(m, f, []float64{0.09})
		if err != nil {
			t.Fatal(err)
		}
		if len(iso[0].Lines) != 1 {
			t.Fatalf("want one loop, got %d polylines", len(iso[0].Lines))
		}
		l := iso[0].Lines[0]
		if l[0] != l[len(l)-1] {
			t.Errorf("loop not closed: %v ... %v", l[0], l[len(l)-1])
		}
		checkSteps(t, l, 1.5*h)
		want := 2 * math.Pi * 0.3 // circle of radius 0.3, traced slightly inside as above
		if got := polyLength(l); got > want || got < want*(1-1e-2) {
			t.Errorf("length %g, want just under %g", got, want)
		}
	})
}

// checkSteps fails when consecutive points are farther apart than one (sub)triangle allows: a gap.
func checkSteps(t *testing.T, l []mesh.Point, maxStep float64) {
	t.Helper()
	for i := 1; i < len(l); i++ {
		if d := math.Hypot(l[i].X-l[i-1].X, l[i].Y-l[i-1].Y); d > maxStep {
			t.Errorf("gap of %g between %v and %v", d, l[i-1], l[i])
		}
	}
}

// Property: for random nodal values, every curve is either closed or has both ends on the domain boundary,
// no crossing point is used twice, and every crossing of a level on a mesh edge appears in some curve.
func TestIsolinesRandomFieldProperty(t *testing.T) {
	rng := rand.New(rand.NewSource(7))
	for trial := range 20 {
		quad := trial%2 == 1
		m := gridMesh(1+rng.Intn(9), 1+rng.Intn(9), 1, 1, quad)
		f := make([]float64, len(m.Nodes))
		for i := range f {
			f[i] = rng.NormFloat64()
		}
		levels := EvenLevels(-1.5, 1.5, 7)
		iso, err := Isolines(m, f, levels)
		if err != nil {
			t.Fatal(err)
		}
		for li, c := range levels {
			// Count the mesh (sub)edges crossed by the level: each must be one point of a curve.
			crossed := map[edgeKey]bool{}
			for _, tr := range linearTris(m) {
				for k := range 3 {
					a, b := tr[k], tr[(k+1)%3]
					if (f[a] >= c) != (f[b] >= c) {
						crossed[keyOf(a, b)] = true
					}
				}
			}
			points := 0
			seen := map[mesh.Point]bool{}
			for _, l := range iso[li].Lines {
				closed := len(l) > 2 && l[0] == l[len(l)-1]
				n := len(l)
				if closed {
					n--
				} else if !onUnitBoundary(l[0]) || !onUnitBoundary(l[len(l)-1]) {
					t.Fatalf("trial %d level %g: open curve ends inside: %v %v", trial, c, l[0], l[len(l)-1])
				}
				for _, p := range l[:n] {
					if seen[p] {
						t.Fatalf("trial %d level %g: point %v used twice", trial, c, p)
					}
					seen[p] = true
				}
				points += n
			}
			if points != len(crossed) {
				t.Fatalf("trial %d level %g: %d curve points for %d crossed edges", trial, c, points, len(crossed))
			}
		}
	}
}

func TestIsolinesErrors(t *testing.T) {
	m := gridMesh(2, 2, 1, 1, false)
	if _, err := Isolines(m, make([]float64, 3), []float64{0}); err == nil {
		t.Error("short nodal slice accepted")
	}
	f := make([]float64, len(m.Nodes))
	f[2] = math.NaN()
	if _, err := Isolines(m, f, []float64{0}); err == nil {
		t.Error("NaN accepted")
	}
}

func TestEvenLevels(t *testing.T) {
	got := EvenLevels(0, 1, 4)
	want := []float64{0.125, 0.375, 0.625, 0.875}
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-15 {
			t.Errorf("EvenLevels = %v, want %v", got, want)
		}
	}
	if EvenLevels(0, 1, 0) != nil {
		t.Error("n = 0 should give no levels")
	}
}

func BenchmarkIsolines(b *testing.B) {
	for _, n := range []int{20, 70, 220} { // ≈ 800, 10k, 100k triangles
		m := gridMesh(n, n, 0.1, 0.1, false)
		f := nodal(m, func(x, y float64) float64 { return x * math.Exp(-30*(x*x+(y-0.05)*(y-0.05))) })
		levels := EvenLevels(0, 0.03, 20)
		b.Run(itoa(len(m.Tris)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Isolines(m, f, levels); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
