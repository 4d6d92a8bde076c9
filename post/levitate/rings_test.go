package levitate

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/mathext"

	"eddyrz/fem"
	"eddyrz/geometry"
	"eddyrz/post"
	"eddyrz/post/study"
)

// maxwellM is the mutual inductance of coaxial circular filaments of radii a and b, d apart, H:
// M = μ0 √(ab) [(2/k − k) K(k) − (2/k) E(k)], k² = 4ab/((a+b)² + d²) (Maxwell, Treatise vol. 2 art. 701; Rosa &
// Grover, NBS Sci. Paper 169, formula 1; /work/shared/reference/README.md §3). gonum's CompleteK and CompleteE
// take the parameter m = k².
func maxwellM(a, b, d float64) float64 {
	m := 4 * a * b / ((a+b)*(a+b) + d*d)
	k := math.Sqrt(m)
	return fem.Mu0 * math.Sqrt(a*b) * ((2/k-k)*mathext.CompleteK(m) - 2/k*mathext.CompleteE(m))
}

// The closed form itself against the tabulated values of reference/README.md §3 [derived there, checked by a
// Neumann integral].
func TestMaxwellMutualTable(t *testing.T) {
	for _, c := range []struct{ a, b, d, nH float64 }{
		{50, 50, 20, 67.536944}, {50, 50, 50, 24.703923}, {50, 25, 20, 20.088400}, {30, 60, 10, 30.931976},
	} {
		got := maxwellM(c.a*1e-3, c.b*1e-3, c.d*1e-3) * 1e9
		if math.Abs(got-c.nH) > 2e-6*c.nH {
			t.Errorf("M(%g, %g, %g mm) = %.6f nH, want %.6f", c.a, c.b, c.d, got, c.nH)
		}
	}
}

// Two coaxial stranded rings of small square section (1 mm, N = 1), each its own coil, at 50 Hz: the axial
// force on the upper ring from the volume integral −∫Re{J B_r*} dV must equal F = I1 I2 ∂M/∂d (time average,
// rms currents; reference/README.md §3), with ∂M/∂d by a central difference of Maxwell's closed form. The
// finite section changes M by O((c/d)²/24) ≈ 10⁻⁴ (Lyle's correction, from memory), so 0.5 % is a fair bar.
// The ring's force on itself is zero in the continuum but not on the mesh (a stranded block gets one element
// across): it is removed by a second solve with the lower ring off, F = F(I1, I2) − F(0, I2), exact by
// linearity, so what is compared is the interaction.
func TestRingForceAgainstMaxwell(t *testing.T) {
	cases := []struct {
		a, b, d, i1, i2 float64 // m, m, m, A, A
	}{
		{50e-3, 50e-3, 20e-3, 100, 60},
		{30e-3, 60e-3, 10e-3, 100, -40}, // opposite currents repel
	}
	for _, c := range cases {
		t.Run(fmt.Sprintf("a%g_b%g_d%g", c.a*1e3, c.b*1e3, c.d*1e3), func(t *testing.T) {
			src := fmt.Sprintf(`
name = "two rings"
frequency = "50 Hz"
[[coil]]
name = "lower"
current = "%g A"
  [[coil.turn]]
  shape = "stranded"
  width = "1 mm"
  height = "1 mm"
  turns = 1
  r = "%g mm"
  z = "0 mm"
[[coil]]
name = "upper"
current = "%g A"
  [[coil.turn]]
  shape = "stranded"
  width = "1 mm"
  height = "1 mm"
  turns = 1
  r = "%g mm"
  z = "%g mm"
`, c.i1, c.a*1e3, math.Abs(c.i2), c.b*1e3, c.d*1e3)
			job, err := geometry.Parse("rings.toml", []byte(src))
			if err != nil {
				t.Fatal(err)
			}
			if c.i2 < 0 {
				job.Coils[1].Turns[0].Sense = -1
			}
			md, err := study.Build(job)
			if err != nil {
				t.Fatal(err)
			}
			var tag int32 = -1
			for _, r := range md.Layout.Regions {
				if r.Kind == geometry.StrandedRegion && r.Coil == 1 {
					tag = r.Tag
				}
			}
			both, err := fem.Solve(md.Problem)
			if err != nil {
				t.Fatal(err)
			}
			alone := *md.Problem
			alone.Coils = append([]fem.Coil(nil), md.Problem.Coils...)
			alone.Coils[0].Value = 0
			self, err := fem.Solve(&alone)
			if err != nil {
				t.Fatal(err)
			}
			fs := post.RegionForceZ(self, tag)
			got := post.RegionForceZ(both, tag) - fs
			const h = 1e-6
			dM := (maxwellM(c.a, c.b, c.d+h) - maxwellM(c.a, c.b, c.d-h)) / (2 * h)
			want := c.i1 * c.i2 * dM
			t.Logf("F_z = %.6g N (numerical self-force %.3g N removed), I1 I2 dM/dd = %.6g N (dM/dd = %.6g H/m)", got, fs, want, dM)
			if math.Abs(got-want) > 0.005*math.Abs(want) {
				t.Errorf("force on the upper ring %.6g N, want %.6g N within 0.5 %%", got, want)
			}
		})
	}
}
