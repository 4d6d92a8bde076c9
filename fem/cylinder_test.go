package fem

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// cylinderCase is a long solid cylinder (radius a) with an air gap out to R, the applied field imposed as
// Dirichlet A = B0 r/2 on r = R (which fixes the total flux πR²B0), top and bottom natural (B_r = 0), so the
// solution is the infinitely long one.
type cylinderCase struct {
	a, gap, sigma, f float64
	b0               complex128 // applied rms flux density, T
	quad             bool
	refineBy         int
}

func (c cylinderCase) delta() float64 { return math.Sqrt(2 / (2 * math.Pi * c.f * Mu0 * c.sigma)) }

func (c cylinderCase) problem() *Problem {
	d := c.delta()
	R := c.a * (1 + c.gap)
	h0 := min(d/4, c.a/8)
	if !c.quad {
		h0 /= 3
	}
	rs := join(gradedTo(0, c.a, h0, 1.2, c.a/8), linspace(c.a, R, 3))
	if c.refineBy > 1 {
		rs = refine(rs, c.refineBy)
	}
	zs := linspace(0, c.a/10, 1)
	m := rectMesh(rs, zs, func(r, z float64) int32 {
		if r < c.a {
			return 1
		}
		return 0
	}, c.quad, "right")
	return &Problem{
		Mesh: m, Frequency: c.f, AppliedBz: c.b0,
		Regions: []Region{{Tag: 1, Name: "bar", Kind: Part, Sigma: c.sigma, Coil: -1}},
	}
}

// exact returns the surface field Hs (rms) under the fixed-flux boundary and J(r).
// Flux inside r = a: Φ(a) = 2πa Hs h′(a)/(jωσ), h′ = γ I1(γa)/I0(γa) (Faraday's law with J = −dH/dr);
// gap: μ0 Hs π(R² − a²); total πR²B0.
func (c cylinderCase) exact() (hs complex128, j func(r float64) complex128) {
	g := cylGamma(c.sigma, 1, c.f)
	i0a, i1a := besselI(g * complex(c.a, 0))
	hp := g * i1a / i0a
	w := 2 * math.Pi * c.f
	R := c.a * (1 + c.gap)
	coef := complex(2*math.Pi*c.a, 0)*hp/complex(0, w*c.sigma) + complex(Mu0*math.Pi*(R*R-c.a*c.a), 0)
	hs = complex(math.Pi*R*R, 0) * c.b0 / coef
	return hs, func(r float64) complex128 {
		_, i1 := besselI(g * complex(r, 0))
		return -hs * g * i1 / i0a
	}
}

// Power per unit length and the J(r) profile against the Kelvin-function solution (reference/README.md §2),
// a/δ from 0.5 to 20, within 0.2 %.
func TestCylinderKelvin(t *testing.T) {
	const a, sigma = 0.01, 1 / 1.72e-8
	for _, q := range []float64{0.5, 1, 2, 5, 10, 20} {
		// f such that a/δ = q.
		d := a / q
		f := 2 / (d * d * Mu0 * sigma) / (2 * math.Pi)
		c := cylinderCase{a: a, gap: 0.3, sigma: sigma, f: f, b0: 0.01, quad: true}
		t.Run(fmt.Sprintf("a/δ=%g", q), func(t *testing.T) {
			p := c.problem()
			sol, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			h := c.a / 10 // slice height
			hs, jx := c.exact()
			want := cylinderSurfacePower(a, sigma, 1, f, cmplx.Abs(hs))
			got := sol.RegionPower(1) / h
			if math.Abs(got/want-1) > 2e-3 {
				t.Errorf("P′ = %.7g W/m, Kelvin %.7g (rel %.2e)", got, want, got/want-1)
			}
			if e := sol.BalanceError(); !(e < 1e-8) {
				t.Errorf("energy balance error %.3g (power through the boundary vs Joule and field energy)", e)
			}
			js := cmplx.Abs(jx(a))
			var worst float64
			sol.EachPoint(func(qp QuadPoint) {
				if qp.Region == 0 {
					worst = max(worst, cmplx.Abs(qp.J-jx(qp.R))/js)
				}
			})
			if worst > 2e-3 {
				t.Errorf("J(r) differs from Kelvin by up to %.2e of |J(a)|", worst)
			}
			t.Logf("a/δ=%g: P′ rel err %.2e, J max err %.2e, %d unknowns", q, got/want-1, worst, sol.Stats.Unknowns)
		})
	}
}

// Uniform refinement of the a/δ = 2 cylinder: the relative error of P′ falls as h^(2p) for elements of order p
// (power is an energy-like quantity, so it converges at twice the order of the field error in the energy
// norm). Measured on this mesh family (copper, a = 10 mm, gap 30 %, one layer of height a/10; run
// `go test -run Convergence -v ./fem/` to reproduce):
//
//	order  refinement   rel. error of P′ (base: 4 cells in the bar, 1 in the gap, 1 layer)
//	1      1, 2, 4      2.058e-02  5.119e-03  1.276e-03   slope 2.00
//	2      1, 2, 4      2.452e-05  1.824e-06  1.192e-07   slope 3.94
//
// The check is on the fitted log-log slope of the last two refinements.
func TestCylinderConvergence(t *testing.T) {
	const a, sigma, q = 0.01, 1 / 1.72e-8, 2.0
	d := a / q
	f := 2 / (d * d * Mu0 * sigma) / (2 * math.Pi)
	for _, c := range []struct {
		quad     bool
		minSlope float64
	}{{false, 1.8}, {true, 3.6}} {
		var errs []float64
		for _, k := range []int{1, 2, 4} {
			cc := cylinderCase{a: a, gap: 0.3, sigma: sigma, f: f, b0: 0.01, quad: c.quad}
			rs := refine(join(linspace(0, a, 4), linspace(a, a*1.3, 1)), k)
			m := rectMesh(rs, refine(linspace(0, a/10, 1), k), func(r, z float64) int32 {
				if r < a {
					return 1
				}
				return 0
			}, c.quad, "right")
			p := cc.problem()
			p.Mesh = m
			sol, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			hs, _ := cc.exact()
			want := cylinderSurfacePower(a, sigma, 1, f, cmplx.Abs(hs))
			errs = append(errs, math.Abs(sol.RegionPower(1)/(a/10)/want-1))
		}
		slope := math.Log2(errs[1] / errs[2])
		t.Logf("quadratic=%v: errors %.3e %.3e %.3e, slope %.2f", c.quad, errs[0], errs[1], errs[2], slope)
		if !(slope > c.minSlope) {
			t.Errorf("quadratic=%v: convergence slope %.2f, want > %.1f (errors %v)", c.quad, slope, c.minSlope, errs)
		}
	}
}

// Point evaluation: B_z from At against μ0 Hs I0(γr)/I0(γa) inside the bar (axis included) and μ0 Hs in the
// gap; J against the Kelvin profile; outside the mesh ok is false.
func TestSolutionAt(t *testing.T) {
	const a, sigma = 0.01, 1 / 1.72e-8
	d := a / 3
	f := 2 / (d * d * Mu0 * sigma) / (2 * math.Pi)
	c := cylinderCase{a: a, gap: 0.3, sigma: sigma, f: f, b0: 0.02, quad: true, refineBy: 2} // B is a derivative: O(h²) pointwise
	sol, err := Solve(c.problem())
	if err != nil {
		t.Fatal(err)
	}
	hs, jx := c.exact()
	g := cylGamma(sigma, 1, f)
	i0a, _ := besselI(g * complex(a, 0))
	scale := cmplx.Abs(hs) * Mu0
	for _, r := range []float64{0, 0.002, 0.005, 0.0087, 0.0099, 0.011, 0.0125} {
		v, ok := sol.At(r, a/20)
		if !ok {
			t.Fatalf("r=%g: not located", r)
		}
		want := complex(Mu0, 0) * hs
		if r < a {
			i0, _ := besselI(g * complex(r, 0))
			want *= i0 / i0a
			if e := cmplx.Abs(v.J-jx(r)) / cmplx.Abs(jx(a)); e > 2e-3 {
				t.Errorf("r=%g: J = %v, Kelvin %v", r, v.J, jx(r))
			}
		}
		if e := cmplx.Abs(v.Bz-want) / scale; e > 2e-3 {
			t.Errorf("r=%g: Bz = %v, exact %v (rel %.1e)", r, v.Bz, want, e)
		}
	}
	if _, ok := sol.At(2*a, 0); ok {
		t.Errorf("a point outside the mesh was located")
	}
}
