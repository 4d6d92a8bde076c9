package fem

import (
	"math"
	"math/cmplx"
	"os"
	"testing"

	"eddyrz/geometry"
)

func layoutProblem(t *testing.T, job *geometry.Job) *Problem {
	t.Helper()
	lay, err := job.Layout()
	if err != nil {
		t.Fatal(err)
	}
	m, err := Mesh(job, lay)
	if err != nil {
		t.Fatal(err)
	}
	p, err := FromLayout(job, lay, m)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// The aluminium sphere of reference/README.md §1 (a = 10 mm, σ = 3.5e7 S/m, H0 = 10⁴ A/m peak) run through a
// job file, the geometry layout and the mesher at the default mesh settings: power and dipole moment within
// 0.5 % of the closed form at 1, 10 and 50 kHz.
func TestSphereJobDefaultMesh(t *testing.T) {
	for _, c := range []struct {
		f   string
		fHz float64
		p   float64
		m   complex128
	}{
		{"1 kHz", 1e3, 0.733243, complex(-3.74924e-2, -1.85733e-2)},
		{"10 kHz", 1e4, 2.896036, complex(-5.48140e-2, -7.33575e-3)},
		{"50 kHz", 5e4, 6.808581, complex(-5.92462e-2, -3.44927e-3)},
	} {
		src := `name = "sphere check"
frequency = "` + c.f + `"
applied_field = "7.0710678 kA/m"

[[material]]
name = "test-aluminium"
resistivity = "` + "2.857142857e-8 ohm m" + `"

[[part]]
name = "ball"
shape = "sphere"
radius = "10 mm"
z = "0 mm"
material = "test-aluminium"
`
		job, err := geometry.Parse("sphere.toml", []byte(src))
		if err != nil {
			t.Fatal(err)
		}
		p := layoutProblem(t, job)
		sol, err := Solve(p)
		if err != nil {
			t.Fatal(err)
		}
		var tag int32
		for _, r := range p.Regions {
			if r.Kind == Part {
				tag = r.Tag
			}
		}
		pw := sol.RegionPower(tag)
		var m complex128
		sol.EachPoint(func(q QuadPoint) {
			if q.Tag == tag {
				m += complex(q.R*q.Weight/2, 0) * q.J
			}
		})
		m *= math.Sqrt2 // rms → peak, to compare with the table
		if math.Abs(pw/c.p-1) > 5e-3 {
			t.Errorf("%s: P = %.6g W, closed form %.6g", c.f, pw, c.p)
		}
		if e := cmplx.Abs(m-c.m) / cmplx.Abs(c.m); e > 5e-3 {
			t.Errorf("%s: m = %.6g A·m² peak, closed form %.6g", c.f, m, c.m)
		}
		t.Logf("%s: P rel %.1e, m rel %.1e, %d unknowns", c.f, pw/c.p-1, cmplx.Abs(m-c.m)/cmplx.Abs(c.m), sol.Stats.Unknowns)
	}
}

// The levitation example (on a coarser mesh than its default, one element per skin depth, to keep the test
// short: the default mesh has about 74k unknowns): the energy balance holds, and moving the far boundary from 5
// to 8 device extents changes the coil impedance and the lift on the slug by less than 0.1 %.
func TestLevitationExampleBoundary(t *testing.T) {
	src, err := os.ReadFile("../examples/levitation-slug.toml")
	if err != nil {
		t.Fatal(err)
	}
	var zs []complex128
	var fs []float64
	for _, size := range []float64{5, 8} {
		job, err := geometry.Parse("levitation-slug.toml", src)
		if err != nil {
			t.Fatal(err)
		}
		job.Mesh.OuterSize = size
		job.Mesh.PerSkinDepth = 1
		p := layoutProblem(t, job)
		sol, err := Solve(p)
		if err != nil {
			t.Fatal(err)
		}
		if e := sol.BalanceError(); !(e < 1e-8) {
			t.Errorf("outer size %g: balance error %.2e", size, e)
		}
		var tag int32
		for _, r := range p.Regions {
			if r.Kind == Part {
				tag = r.Tag
			}
		}
		zs = append(zs, sol.CoilZ[0])
		fs = append(fs, axialForce(sol, tag))
		t.Logf("outer %g: Z = %.6g Ω, F_z = %.6g N, %d unknowns", size, sol.CoilZ[0], fs[len(fs)-1], sol.Stats.Unknowns)
	}
	dz := cmplx.Abs(zs[1]-zs[0]) / cmplx.Abs(zs[0])
	df := math.Abs(fs[1]-fs[0]) / math.Abs(fs[0])
	if dz > 1e-3 || df > 1e-3 {
		t.Errorf("far boundary 5 → 8 extents changed Z by %.2e and F_z by %.2e", dz, df)
	}
}
