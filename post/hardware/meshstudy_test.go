//go:build meshstudy

package hardware

// The mesh study behind the sweep's mesh advice: how coarse may the mesh of the billet example be for R and L
// within 0.5 % of the default mesh's? The mesh is sized per skin depth, so one frequency (the job's 3 kHz, mesh
// built there) answers for the top of any sweep; lower sweep frequencies are over-resolved on the same mesh.
// Not a check (it takes many minutes on a loaded machine); run with
//
//	go test -tags meshstudy -run TestMeshStudy -v -timeout 3h ./post/hardware/

import (
	"math"
	"testing"
	"time"

	"eddyrz/geometry"
	"eddyrz/post/study"
)

func TestMeshStudy(t *testing.T) {
	job, err := geometry.ReadFile("../../examples/billet-heater.toml")
	if err != nil {
		t.Fatal(err)
	}
	freqs := []float64{3e3}
	type setting struct {
		per, growth float64
		order       int
		minAngle    float64 // 0: the job's
		outer       float64 // 0: the job's
	}
	settings := []setting{{3, 1.3, 2, 0, 0}, {2, 1.3, 2, 0, 0}, {1.5, 1.3, 2, 0, 0}, {1, 1.3, 2, 0, 0}, {1, 1.6, 2, 0, 0}, {0.7, 1.6, 2, 0, 0}, {0.5, 2, 2, 0, 0}, {2, 1.6, 1, 0, 0}, {1, 1.6, 1, 0, 0},
		{1, 2, 2, 0, 0}, {1, 1.6, 2, 20, 0}, {1, 1.6, 2, 0, 3}, {1, 2, 2, 20, 3}}
	var refR, refL []float64
	for k, s := range settings {
		j := job.WithFrequency(freqs[len(freqs)-1])
		j.Mesh.PerSkinDepth, j.Mesh.Growth, j.Mesh.Order = s.per, s.growth, s.order
		if s.minAngle > 0 {
			j.Mesh.MinAngle = s.minAngle
		}
		if s.outer > 0 {
			j.Mesh.OuterSize = s.outer
		}
		t0 := time.Now()
		md, err := study.Build(j)
		if err != nil {
			t.Fatal(err)
		}
		sw, err := md.NewSweeper()
		if err != nil {
			t.Fatal(err)
		}
		var worst float64
		for i, f := range freqs {
			t1 := time.Now()
			sol, err := sw.SolveAt(f)
			if err != nil {
				t.Fatal(err)
			}
			c := sol.Result.Coils[0]
			if k == 0 {
				refR, refL = append(refR, c.Resistance), append(refL, c.Inductance)
			}
			dr, dl := c.Resistance/refR[i]-1, c.Inductance/refL[i]-1
			worst = math.Max(worst, math.Max(math.Abs(dr), math.Abs(dl)))
			t.Logf("per δ %.1f growth %.1f order %d min angle %g outer %g: f %6.0f Hz  %7d unknowns  R %.6g (%+.3f %%)  L %.6g (%+.3f %%)  solve %.2f s",
				s.per, s.growth, s.order, s.minAngle, s.outer, f, sol.Result.Unknowns, c.Resistance, 100*dr, c.Inductance, 100*dl, time.Since(t1).Seconds())
		}
		t.Logf("per δ %.1f growth %.1f order %d: worst %.3f %%, total %.1f s", s.per, s.growth, s.order, 100*worst, time.Since(t0).Seconds())
	}
}
