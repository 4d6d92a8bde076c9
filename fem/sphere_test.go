package fem

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// Sphere in a uniform field (reference/README.md §1, exp(+jωt), peak H0): P = (3πaH0²/σ)·Hp(q),
// Hp = q S(q) − 1, S = (sinh 2q + sin 2q)/(cosh 2q − cos 2q); m = αH0, α = −2πa³[1 − 3/x² + 3 cot(x)/x],
// x = (1 − j)q. Both are linear in H0, so they hold for rms phasors as well.
func sphereHp(q float64) float64 {
	s := (math.Sinh(2*q) + math.Sin(2*q)) / (math.Cosh(2*q) - math.Cos(2*q))
	return q*s - 1
}

func sphereAlpha(a, q float64) complex128 {
	x := complex(q, -q)
	return complex(-2*math.Pi*a*a*a, 0) * (1 - 3/(x*x) + 3*cmplx.Cot(x)/x)
}

func TestSphereClosedFormTable(t *testing.T) {
	// Aluminium sphere a = 10 mm, σ = 3.5e7 S/m, H0 = 1e4 A/m peak (reference/README.md §1).
	const a, sigma, h0 = 0.01, 3.5e7, 1e4
	for _, c := range []struct {
		f, hp, p float64
		m        complex128
	}{
		{1e3, 2.722981, 0.733243, complex(-3.74924e-2, -1.85733e-2)},
		{1e4, 10.754763, 2.896036, complex(-5.48140e-2, -7.33575e-3)},
		{5e4, 25.284450, 6.808581, complex(-5.92462e-2, -3.44927e-3)},
	} {
		q := a / math.Sqrt(2/(2*math.Pi*c.f*Mu0*sigma))
		if hp := sphereHp(q); math.Abs(hp/c.hp-1) > 1e-6 {
			t.Errorf("f=%g: Hp = %.7g, reference %.7g", c.f, hp, c.hp)
		}
		if p := 3 * math.Pi * a * h0 * h0 / sigma * sphereHp(q); math.Abs(p/c.p-1) > 1e-6 {
			t.Errorf("f=%g: P = %.7g W, reference %.7g", c.f, p, c.p)
		}
		if m := sphereAlpha(a, q) * h0; cmplx.Abs(m-c.m) > 1e-5*cmplx.Abs(c.m) {
			t.Errorf("f=%g: m = %.6g, reference %.6g", c.f, m, c.m)
		}
	}
	for _, c := range []struct{ q, hp float64 }{{1, 8.563570e-2}, {5, 3.999372}, {20, 19.00000}} {
		if hp := sphereHp(c.q); math.Abs(hp/c.hp-1) > 1e-6 {
			t.Errorf("q=%g: Hp = %.7g, reference %.7g", c.q, hp, c.hp)
		}
	}
}

// sphereMesh is a polar mesh about the sphere's centre: fine radial lines at the surface (spacing hf), nθ
// sectors, outer Robin circle at radius R0.
func sphereMesh(a, hf, R0 float64, nθ int, quad bool) *Problem {
	rhos := join(gradedTo(0, a, hf, 1.2, a/6), graded(a, R0, hf, 1.3, R0/8))
	m := polarMesh(rhos, linspace(0, math.Pi, nθ), 0, func(r, z float64) int32 {
		if math.Hypot(r, z) < a {
			return 1
		}
		return 0
	}, quad)
	return &Problem{Mesh: m, Outer: OuterBoundary{Robin: true, Radius: R0}}
}

// Absorbed power and induced dipole moment of a sphere in a uniform field, a/δ from 1 to 20, within 0.5 %.
// The reaction field of a sphere is a pure dipole, so the Robin boundary is exact even close in (R0 = 2a).
func TestSphereInUniformField(t *testing.T) {
	const a, sigma, h0 = 0.01, 3.5e7, 1e4 / math.Sqrt2 // rms
	for _, q := range []float64{1, 2, 5, 10, 20} {
		t.Run(fmt.Sprintf("a/δ=%g", q), func(t *testing.T) {
			d := a / q
			f := 2 / (d * d * Mu0 * sigma) / (2 * math.Pi)
			p := sphereMesh(a, min(d/4, a/10), 2*a, 64, true)
			p.Frequency = f
			p.AppliedBz = complex(Mu0*h0, 0)
			p.Regions = []Region{{Tag: 1, Name: "sphere", Kind: Part, Sigma: sigma, Coil: -1}}
			sol, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			pw := sol.RegionPower(1)
			want := 3 * math.Pi * a * 2 * h0 * h0 / sigma * sphereHp(q) // H0 peak² = 2 h0²
			if math.Abs(pw/want-1) > 5e-3 {
				t.Errorf("P = %.6g W, closed form %.6g (rel %.2e)", pw, want, pw/want-1)
			}
			if e := sol.BalanceError(); !(e < 1e-8) {
				t.Errorf("energy balance error %.3g (power through the boundary vs Joule and field energy)", e)
			}
			// m = ½∫ r × J dV, z component: ½∫ r J_φ 2πr dr dz.
			var m complex128
			sol.EachPoint(func(qp QuadPoint) { m += complex(qp.R*qp.Weight/2, 0) * qp.J })
			mw := sphereAlpha(a, q) * complex(h0, 0)
			if e := cmplx.Abs(m-mw) / cmplx.Abs(mw); e > 5e-3 {
				t.Errorf("m = %.6g A·m², closed form %.6g (rel %.2e)", m, mw, e)
			}
			t.Logf("P rel %.1e, m rel %.1e, %d unknowns", pw/want-1, cmplx.Abs(m-mw)/cmplx.Abs(mw), sol.Stats.Unknowns)
		})
	}
}

// levitator is a sphere above a stranded ring in a Robin-bounded air region of radius R0.
func levitator(R0 float64) *Problem {
	const a = 0.01
	rc, zc, s := 0.015, -0.008, 0.0015 // ring centre and half-size
	rhoC := math.Hypot(rc, zc)
	thC := math.Atan2(rc, zc)
	dth := s / rhoC
	rhos := join(gradedTo(0, a, 2e-4, 1.2, a/6), graded(a, rhoC-s, 2e-4, 1.2, 1.5e-3),
		linspace(rhoC-s, rhoC+s, 4), graded(rhoC+s, 0.1, 4e-4, 1.25, 0.01))
	if R0 > 0.1 {
		rhos = join(rhos, graded(0.1, R0, 0.01, 1.25, R0/8))
	}
	ths := join(linspace(0, thC-dth, 48), linspace(thC-dth, thC+dth, 4), linspace(thC+dth, math.Pi, 24))
	m := polarMesh(rhos, ths, 0, func(r, z float64) int32 {
		rho, th := math.Hypot(r, z), math.Atan2(r, z)
		switch {
		case rho < a:
			return 1
		case rho > rhoC-s && rho < rhoC+s && th > thC-dth && th < thC+dth:
			return 2
		}
		return 0
	}, true)
	return &Problem{Mesh: m, Frequency: 20e3, Outer: OuterBoundary{Robin: true, Radius: R0},
		Coils: []Coil{{Name: "lifter", Value: 200}},
		Regions: []Region{
			{Tag: 1, Name: "slug", Kind: Part, Sigma: 3.5e7, Coil: -1},
			{Tag: 2, Name: "ring", Kind: Stranded, Coil: 0, Sense: 1, Strands: 5},
		}}
}

// axialForce is F_z = −∫ Re{J B_r*} 2πr dr dz over region tag (physics.md).
func axialForce(s *Solution, tag int32) float64 {
	var f float64
	s.EachPoint(func(q QuadPoint) {
		if q.Tag == tag {
			f -= real(q.J*cmplx.Conj(q.Br)) * q.Weight
		}
	})
	return f
}

// Open boundary: moving the Robin circle from 0.1 m to 0.25 m changes the coil impedance and the axial force on
// the slug by less than 0.1 % (physics.md, Open boundary).
func TestRobinBoundaryIndependence(t *testing.T) {
	var zs []complex128
	var fs []float64
	for _, R0 := range []float64{0.1, 0.25} {
		sol, err := Solve(levitator(R0))
		if err != nil {
			t.Fatal(err)
		}
		zs = append(zs, sol.CoilZ[0])
		fs = append(fs, axialForce(sol, 1))
		if e := sol.BalanceError(); !(e < 1e-8) {
			t.Errorf("R0 = %g: energy balance error %.3g", R0, e)
		}
	}
	dz := cmplx.Abs(zs[1]-zs[0]) / cmplx.Abs(zs[0])
	df := math.Abs(fs[1]-fs[0]) / math.Abs(fs[0])
	if dz > 1e-3 || df > 1e-3 {
		t.Errorf("moving the boundary changed Z by %.2e and F_z by %.2e (Z %v → %v, F %g → %g N)", dz, df, zs[0], zs[1], fs[0], fs[1])
	}
	if fs[0] <= 0 {
		t.Errorf("a slug above a ring must be pushed up, F_z = %g N", fs[0])
	}
	t.Logf("Z = %.6g Ω, F_z = %.6g N; changes %.1e, %.1e", zs[0], fs[0], dz, df)
}
