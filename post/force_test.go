package post

import (
	"testing"
)

// The Maxwell-stress force in the air around the part equals the volume Lorentz force within 1 %: both are
// the same physical force (the stress tensor's divergence is the Lorentz force density, so its flux through a
// closed surface in air equals the volume integral inside; physics.md, Derived quantities).
func TestStressMatchesVolumeForce(t *testing.T) {
	for _, c := range []struct {
		name string
		sc   scene
	}{
		{"sphere above coil", levitator(0, -0.012, -0.006)},
		{"sphere inside coil", levitator(0.003, -0.006, 0, 0.006)},
	} {
		t.Run(c.name, func(t *testing.T) {
			sol, res := c.sc.solve(t)
			p := res.Parts[0]
			t.Logf("%d nodes; P = %.6g W, Fz = %.6g N, stress %.6g N (diff %.2e), shell [%.3g, %.3g] m, balance %.2e, timing %v",
				len(sol.Mesh.Nodes), p.Power, p.ForceZ, p.ForceZStress, p.StressDiff, p.ShellInner, p.ShellOuter, res.BalanceError, res.Timing)
			if !(p.StressDiff < 0.01) {
				t.Errorf("stress force %.6g N vs volume force %.6g N: relative difference %.3g, want < 1 %%", p.ForceZStress, p.ForceZ, p.StressDiff)
			}
			if p.ForceZ <= 0 {
				t.Errorf("a conductor above the coil's centre plane is pushed up; got F_z = %g N", p.ForceZ)
			}
		})
	}
}
