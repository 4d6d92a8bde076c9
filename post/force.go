package post

import (
	"math/cmplx"

	"eddyrz/fem"
)

// lorentzFz is the time-averaged axial Lorentz force density at a quadrature point times its weight,
// −Re{J B_r*} dV, N (rms phasors: the time average of j×b is Re{J × B*}).
func lorentzFz(q fem.QuadPoint) float64 { return -real(q.J*cmplx.Conj(q.Br)) * q.Weight }

// lorentzFr is the radial counterpart, Re{J B_z*} dV, N.
func lorentzFr(q fem.QuadPoint) float64 { return real(q.J*cmplx.Conj(q.Bz)) * q.Weight }

// RegionForceZ is the time-averaged axial Lorentz force on the triangles tagged tag (a part, a coil turn or a
// stranded block), F_z = −∫Re{J B_r*} 2πr dr dz, N, positive along +z.
func RegionForceZ(sol *fem.Solution, tag int32) float64 {
	var f float64
	sol.EachPoint(func(q fem.QuadPoint) {
		if q.Tag == tag {
			f += lorentzFz(q)
		}
	})
	return f
}
