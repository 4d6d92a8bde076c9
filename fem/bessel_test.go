package fem

import (
	"math"
	"math/cmplx"
	"testing"
)

// besselI returns the modified Bessel functions I0(z), I1(z) of complex argument by their power series
// (A&S 9.6.10). For |z| ≤ 40 and arg z = π/4 (our use) the terms' cancellation costs under four digits.
func besselI(z complex128) (i0, i1 complex128) {
	q := z * z / 4
	t0, t1 := complex(1, 0), z/2
	i0, i1 = t0, t1
	for k := 1; k < 400; k++ {
		t0 *= q / complex(float64(k*k), 0)
		t1 *= q / complex(float64(k*(k+1)), 0)
		i0 += t0
		i1 += t1
		if cmplx.Abs(t0) < 1e-18*cmplx.Abs(i0) && cmplx.Abs(t1) < 1e-18*cmplx.Abs(i1) {
			break
		}
	}
	return i0, i1
}

// Kelvin functions: ber x + j bei x = I0(x e^{jπ/4}), ber′ + j bei′ = e^{jπ/4} I1(x e^{jπ/4}) (A&S 9.9.1).
// Values: A&S Table 9.12 as transcribed in reference/README.md §2.
func TestBesselAgainstKelvinTable(t *testing.T) {
	cases := []struct{ x, ber, bei, dber, dbei float64 }{
		{1, 0.9843817812, 0.2495660400, -0.0624457522, 0.4973965115},
		{2, 0.7517341827, 0.9722916273, -0.4930671247, 0.9170136134},
		{5, -6.2300824787, 0.1160343816, -3.8453394733, -4.3541405148},
	}
	e := cmplx.Exp(complex(0, math.Pi/4))
	for _, c := range cases {
		i0, i1 := besselI(complex(c.x, 0) * e)
		d := e * i1
		got := []float64{real(i0), imag(i0), real(d), imag(d)}
		want := []float64{c.ber, c.bei, c.dber, c.dbei}
		for k := range got {
			if math.Abs(got[k]-want[k]) > 2e-10 {
				t.Errorf("x=%g: kelvin[%d] = %.10f, table %.10f", c.x, k, got[k], want[k])
			}
		}
	}
}

// cylinderSurfacePower is P′ (W/m) of a long cylinder of radius a with surface field hs (rms, A/m):
// P′ = 2πa|Hs|² Re{γ I1(γa)/I0(γa)}/σ, γ = (1+j)/δ (reference/README.md §2, written for rms fields).
func cylinderSurfacePower(a, sigma, mur, f, hs float64) float64 {
	g := cylGamma(sigma, mur, f)
	i0, i1 := besselI(g * complex(a, 0))
	return 2 * math.Pi * a * hs * hs * real(g*i1/i0) / sigma
}

func cylGamma(sigma, mur, f float64) complex128 {
	delta := math.Sqrt(2 / (2 * math.Pi * f * Mu0 * mur * sigma))
	return complex(1, 1) / complex(delta, 0)
}

// The closed form reproduces the check values of reference/README.md §2 (H0 = 10⁴ A/m peak).
func TestCylinderClosedFormTable(t *testing.T) {
	h := 1e4 / math.Sqrt2
	cases := []struct {
		name             string
		a, rho, f, p, jA float64
	}{
		{"copper bar", 0.010, 1.72e-8, 1000, 23.116059, 6.435456e6},
		{"steel above Curie", 0.025, 1.2e-6, 3000, 755.111538, 1.295775e6},
	}
	for _, c := range cases {
		p := cylinderSurfacePower(c.a, 1/c.rho, 1, c.f, h)
		if math.Abs(p/c.p-1) > 1e-6 {
			t.Errorf("%s: P′ = %.6f W/m, reference %.6f", c.name, p, c.p)
		}
		g := cylGamma(1/c.rho, 1, c.f)
		i0, i1 := besselI(g * complex(c.a, 0))
		if j := cmplx.Abs(g*i1/i0) * 1e4; math.Abs(j/c.jA-1) > 1e-6 {
			t.Errorf("%s: |J(a)| = %.6e A/m² peak, reference %.6e", c.name, j, c.jA)
		}
	}
}
