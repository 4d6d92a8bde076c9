package hardware

import (
	"fmt"
	"testing"

	"eddyrz/geometry"
)

// BenchmarkFrequencySweep is a 40-point log sweep of the billet example from 1 to 10 kHz, meshing included
// (once, at 10 kHz), on a ladder of mesh densities (elements per skin depth and growth) with one solver (the
// sparse factorisation itself uses both cores) and with two. The job's default mesh (3 per δ, growth 1.3) at
// 10 kHz has about 420k unknowns and takes minutes per solve on a loaded machine: it is left out of the ladder.
// The mesh study (meshstudy_test.go) puts 1 per δ with growth 1.6 within 0.03 % of the default mesh in R and L.
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
		per, growth float64
	}{{0.5, 2}, {0.7, 1.6}, {1, 1.6}} {
		j := job.Copy()
		j.Mesh.PerSkinDepth, j.Mesh.Growth = m.per, m.growth
		for _, workers := range []int{1, 2} {
			b.Run(fmt.Sprintf("perdelta=%g,growth=%g,workers=%d", m.per, m.growth, workers), func(b *testing.B) {
				b.ReportAllocs()
				var unknowns int
				for i := 0; i < b.N; i++ {
					res, err := SweepJob(j, freqs, workers)
					if err != nil {
						b.Fatal(err)
					}
					unknowns = res.Unknowns
				}
				b.ReportMetric(float64(unknowns), "unknowns")
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
