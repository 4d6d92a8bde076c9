package post

import (
	"math"
	"math/cmplx"
	"testing"

	"eddyrz/fem"
)

// sphereAlpha is the induced-moment factor α = −2πa³[1 − 3/x² + 3 cot(x)/x], x = (1 − j)q, q = a/δ, of a
// sphere in a uniform field, m = αH (reference/README.md §1; Re α = −(8πa³/3)G(q)). Linear, so it holds for
// rms phasors.
func sphereAlpha(a, q float64) complex128 {
	x := complex(q, -q)
	return complex(-2*math.Pi*a*a*a, 0) * (1 - 3/(x*x) + 3*cmplx.Cot(x)/x)
}

// A small sphere on the axis in the coil's field gradient feels the force on its induced dipole,
// F_z = μ0 Re{α H ∂H*/∂z} (rms phasors; reference/README.md §1 with H along z on the axis), where H is the
// field without the sphere. The unperturbed field comes from the same mesh with the sphere's conductivity set
// to zero. a = 2 mm sits 12 mm above a coil of 16 mm radius, so the field varies over ~15 mm and the dipole
// picture is good to a few per cent ((a/L)² corrections); we ask for 3 %.
func TestSmallSphereDipoleForce(t *testing.T) {
	const a, q, sigma = 0.002, 3.0, 3.5e7
	delta := a / q
	f := 2 / (delta * delta * fem.Mu0 * sigma) / (2 * math.Pi)
	sc := scene{a: a, zs: 0.012, sigmaPart: sigma, current: 500, freq: f, rOut: 0.25, hf: delta / 3, grow: 0.3}
	for _, z := range []float64{-0.006, 0} {
		sc.turns = append(sc.turns, rect{0.014, 0.018, z - 0.002, z + 0.002})
		sc.senses = append(sc.senses, 1)
	}
	_, res := sc.solve(t)
	bare := sc
	bare.sigmaPart = 0
	solBare, _ := bare.solve(t)
	bz := func(z float64) complex128 {
		v, ok := solBare.At(0, z)
		if !ok {
			t.Fatalf("(0, %g) outside the mesh", z)
		}
		return v.Bz
	}
	const h = 5e-4
	hz := bz(sc.zs) / fem.Mu0
	dhz := (bz(sc.zs+h) - bz(sc.zs-h)) / (2 * h * fem.Mu0)
	want := fem.Mu0 * real(sphereAlpha(a, q)*hz*cmplx.Conj(dhz))
	p := res.Parts[0]
	near(t, "dipole force", p.ForceZ, want, 0.03)
	near(t, "dipole force (stress)", p.ForceZStress, want, 0.03)
	t.Logf("F_z = %.6g N, stress %.6g N, dipole %.6g N (H = %.4g A/m rms, dH/dz = %.4g A/m²)", p.ForceZ, p.ForceZStress, want, cmplx.Abs(hz), cmplx.Abs(dhz))
}
