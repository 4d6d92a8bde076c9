package post

import (
	"math"
	"math/rand/v2"
	"testing"

	"eddyrz/fem"
	"eddyrz/mesh"
)

// Property: the bucketed distance queries agree with a brute-force minimum over the outline's segments, for
// random points inside, near and far from a meshed part; distWithin is that distance when within the cap, +Inf
// beyond it.
func TestOutlineDistance(t *testing.T) {
	sc := levitator(0.003, -0.006, 0, 0.006)
	p := sc.problem(t)
	mi := newMeshInfo(&fem.Solution{Mesh: p.Mesh, Regions: p.Regions})
	o := mi.newOutline(0)
	if len(o.segs) == 0 {
		t.Fatal("sphere has no outline")
	}
	for _, s := range o.segs {
		if s.a.X <= 0 && s.b.X <= 0 {
			t.Fatal("axis edge in the outline")
		}
		// Every boundary edge lies on the sphere's polygon, whose chords stay within 0.1 % of the radius.
		if d := math.Hypot(s.a.X, s.a.Y-sc.zs); d > sc.a*(1+1e-12) || d < sc.a*(1-1e-3) {
			t.Fatalf("outline vertex (%g, %g) off the sphere", s.a.X, s.a.Y)
		}
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for range 2000 {
		q := mesh.Point{X: rng.Float64() * 0.05, Y: sc.zs + (rng.Float64()-0.5)*0.1}
		want := math.Inf(1)
		for _, s := range o.segs {
			want = min(want, math.Sqrt(s.dist2(q)))
		}
		if got := o.dist(q); math.Abs(got-want) > 1e-15 {
			t.Fatalf("dist(%v) = %g, brute force %g", q, got, want)
		}
		c := rng.Float64() * 0.01
		got := o.distWithin(q, c)
		if (want <= c && math.Abs(got-want) > 1e-15) || (want > c && !math.IsInf(got, 1)) {
			t.Fatalf("distWithin(%v, %g) = %g, distance %g", q, c, got, want)
		}
	}
}
