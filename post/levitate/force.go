package levitate

import (
	"math/cmplx"

	"eddyrz/fem"
)

// RegionForceZ is the time-averaged axial Lorentz force on the triangles tagged tag, F_z = −∫Re{J B_r*} dV, N
// (positive up; rms phasors, physics.md "Derived quantities"). It serves conductors that post does not report
// forces for, such as a coil's stranded block; the field of the solution includes the region's own, whose net
// axial self-force on a ring vanishes.
func RegionForceZ(sol *fem.Solution, tag int32) float64 {
	var f float64
	sol.EachPoint(func(q fem.QuadPoint) {
		if q.Tag == tag {
			f -= real(q.J*cmplx.Conj(q.Br)) * q.Weight
		}
	})
	return f
}
