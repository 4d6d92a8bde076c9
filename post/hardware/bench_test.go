package hardware

import (
	"fmt"
	"testing"

	"eddyrz/geometry"
)

// BenchmarkFrequencySweep is a 40-point log sweep of the billet example from 1 to 10 kHz, meshing included
// (once, at 10 kHz), as `eddyrz sweep examples/billet-heater.toml --from 1kHz --to 10kHz` runs it: on the job's
// own mesh controls ("job": 1.5 quadratic elements per skin depth, growth 1.6, about 144k unknowns) and on a
// coarser mesh (1 per skin depth; the mesh study in meshstudy_test.go puts it within 0.03 % of the default in R
// and L), with the per-point analysis on one goroutine and on two. It reports the points that were factorised
// (the others came from the reduced basis).
func BenchmarkFrequencySweep(b *testing.B) {
	job, err := geometry.ReadFile("../../examples/billet-heater.toml")
	if err != nil {
		b.Fatal(err)
	}
	freqs, err := Frequencies(1e3, 10e3, 40, LogSpacing)
	if err != nil {
		b.Fatal(err)
	}
	for _, m := range []struct {
		name        string
		per, growth float64
	}{{"job", 0, 0}, {"perdelta=1,growth=1.6", 1, 1.6}} {
		j := job.Copy()
		if m.per > 0 {
			j.Mesh.PerSkinDepth, j.Mesh.Growth = m.per, m.growth
		}
		for _, workers := range []int{1, 2} {
			b.Run(fmt.Sprintf("%s,workers=%d", m.name, workers), func(b *testing.B) {
				b.ReportAllocs()
				var res *SweepResult
				for i := 0; i < b.N; i++ {
					if res, err = SweepJob(j, freqs, workers); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(res.Unknowns), "unknowns")
				b.ReportMetric(float64(res.Factorised()), "factorised")
			})
		}
	}
}

// BenchmarkTankResonance is the field-coupled resonance search of the small ring-heater test job (cold and hot
// loads in parallel), with its own sweepers each time.
func BenchmarkTankResonance(b *testing.B) {
	md, sol := load(b, "testdata/ring-heater.toml", nil)
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := StudyTank(md, sol); err != nil {
			b.Fatal(err)
		}
	}
}
