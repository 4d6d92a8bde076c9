package levitate

import (
	"math"
	"math/rand/v2"
	"testing"

	"eddyrz/geometry"
	"eddyrz/mesh"
)

// G(q) against the table of reference/README.md §1 [derived there from the sphere's closed form].
func TestForceFunctionG(t *testing.T) {
	for _, c := range []struct{ q, g float64 }{
		{0.5, 1.187478e-3}, {1, 1.830835e-2}, {2, 0.1857932}, {3, 0.3726892}, {5, 0.5250060}, {10, 0.6375000}, {20, 0.6937500},
	} {
		if got := ForceFunctionG(c.q); math.Abs(got-c.g) > 2e-6*c.g {
			t.Errorf("G(%g) = %.7g, want %.7g", c.q, got, c.g)
		}
	}
	// The series branch joins the closed form continuously.
	if a, b := ForceFunctionG(0.0999999), ForceFunctionG(0.1000001); math.Abs(a-b) > 2e-5*b {
		t.Errorf("G jumps at q = 0.1: %g, %g", a, b)
	}
}

// Volumes of revolution by hand: sphere 4/3πa³, cylinder πR²H, tube π(R²−r²)H, cup outer cylinder less its bore,
// and a polygon (a rectangle given as points) equal to the same tube by Pappus.
func TestVolume(t *testing.T) {
	cases := []struct {
		p    geometry.Part
		want float64
	}{
		{geometry.Part{Shape: geometry.Sphere, Radius: 0.01}, 4.0 / 3 * math.Pi * 1e-6},
		{geometry.Part{Shape: geometry.Cylinder, Radius: 0.02, Height: 0.05}, math.Pi * 4e-4 * 0.05},
		{geometry.Part{Shape: geometry.TubePart, Radius: 0.02, Inner: 0.01, Height: 0.05}, math.Pi * 3e-4 * 0.05},
		{geometry.Part{Shape: geometry.Cup, Radius: 0.03, Wall: 0.005, Base: 0.01, Height: 0.06}, math.Pi * (9e-4*0.06 - 6.25e-4*0.05)},
		{geometry.Part{Shape: geometry.Polygon, Points: []mesh.Point{{X: 0.01, Y: 0.1}, {X: 0.02, Y: 0.1}, {X: 0.02, Y: 0.15}, {X: 0.01, Y: 0.15}}}, math.Pi * 3e-4 * 0.05},
	}
	for _, c := range cases {
		if got := Volume(c.p); math.Abs(got-c.want) > 1e-12*c.want {
			t.Errorf("%v: volume %g, want %g", c.p.Shape, got, c.want)
		}
	}
	// Centre of volume of the polygon tube: mid-height, 0.025 above its lowest point.
	if got := centreOffset(cases[4].p); math.Abs(got-0.025) > 1e-12 {
		t.Errorf("polygon centre offset %g, want 0.025", got)
	}
}

// Property: a cubic is reproduced exactly by the ripple fit (ripple 0 up to rounding) on any grid; one
// perturbed sample shows up at that sample with the size of the perturbation.
func TestRippleProperty(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 50; trial++ {
		n := 5 + rng.IntN(30)
		z := make([]float64, n)
		for i := range z {
			z[i] = float64(i) + 0.3*rng.Float64()
		}
		c := [4]float64{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		f := make([]float64, n)
		for i, x := range z {
			f[i] = 10 + c[0] + c[1]*x + c[2]*x*x/n2(n) + c[3]*x*x*x/n2(n)/float64(n)
		}
		for i, r := range Ripple(z, f, 1) {
			if r > 1e-9 {
				t.Fatalf("trial %d: ripple %g at %d on a cubic", trial, r, i)
			}
		}
		k := 1 + rng.IntN(n-2)
		f[k] += 0.01 * math.Abs(f[k])
		r := Ripple(z, f, 1)
		if r[k] < 0.005 {
			t.Fatalf("trial %d: a 1 %% bump at %d shows as ripple %g", trial, k, r[k])
		}
	}
}

func n2(n int) float64 { return float64(n * n) }

// Equilibria on a grid: F = 3 − z² crosses w = 2 at z = ±1: stable at +1 (F falls going up), unstable at −1.
func TestGridEquilibria(t *testing.T) {
	var z, f, p []float64
	for i := 0; i <= 40; i++ {
		x := -2 + 0.1*float64(i)
		z, f, p = append(z, x), append(f, 3-x*x), append(p, 1)
	}
	eqs := gridEquilibria(z, f, p, 2)
	if len(eqs) != 2 {
		t.Fatalf("%d equilibria, want 2", len(eqs))
	}
	for i, want := range []struct {
		z, k   float64
		stable bool
	}{{-1, -2, false}, {1, 2, true}} {
		e := eqs[i]
		if math.Abs(e.Z-want.z) > 1e-3 || math.Abs(e.Stiffness-want.k) > 1e-2 || e.Stable != want.stable {
			t.Errorf("equilibrium %d: z %g k %g stable %v; want %g %g %v", i, e.Z, e.Stiffness, e.Stable, want.z, want.k, want.stable)
		}
	}
}

// Options resolve: defaults from the [levitation] section, the coil's extent without one, and bad input.
func TestResolve(t *testing.T) {
	job := readExample(t)
	s, err := resolve(job, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.z) != 15 || s.z[0] != -4e-3 || math.Abs(s.z[14]-10e-3) > 1e-15 || len(s.temps) != 3 || s.part != "slug" {
		t.Errorf("from [levitation]: %d heights %g…%g, %d temperatures, part %q", len(s.z), s.z[0], s.z[len(s.z)-1], len(s.temps), s.part)
	}
	bare := job.Copy()
	bare.Levitation = nil
	s, err = resolve(bare, Options{})
	if err != nil {
		t.Fatal(err)
	}
	// Main turns from z = −12 mm (tube 5 mm) to the top counter-wound turn at 22 mm: −14.5…24.5 mm.
	if math.Abs(s.z[0]+14.5e-3) > 1e-12 || math.Abs(s.z[len(s.z)-1]-24.5e-3) > 1e-12 {
		t.Errorf("coil extent: %g…%g m, want −0.0145…0.0245", s.z[0], s.z[len(s.z)-1])
	}
	if n := len(s.temps); n != 7 || !job.Parts[0].Material.Liquid(s.temps[n-1]) || job.Parts[0].Material.Liquid(s.temps[n-2]) {
		t.Errorf("default temperatures %v: want six solid then one liquid", s.temps)
	}
	for _, o := range []Options{{Part: "nothing"}, {ZFrom: 1, ZTo: 0.5}, {Positions: 2}, {Force: "guess"}} {
		if _, err := resolve(job, o); err == nil {
			t.Errorf("%+v: no error", o)
		}
	}
}
