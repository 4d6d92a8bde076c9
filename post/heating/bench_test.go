package heating

import (
	"path/filepath"
	"testing"

	"eddyrz/geometry"
	"eddyrz/post/study"
)

// BenchmarkHeatBillet runs 100 time steps of the bar-end heater (coarse test mesh and the example itself) from
// cold, through the Curie transition, with the coil current held; the re-solve tolerance is raised to 0.3 so
// that only a handful of field re-solves happen (reported as field_solves). Meshing is outside the timing; the
// field re-solves reuse the pattern and symbolic analysis of the first.
func BenchmarkHeatBillet(b *testing.B) {
	for _, c := range []struct{ name, file string }{
		{"coarse", filepath.Join("testdata", "billet-coarse.toml")},
		{"example", filepath.Join("..", "..", "examples", "billet-heater.toml")},
	} {
		b.Run(c.name, func(b *testing.B) {
			job, err := geometry.ReadFile(c.file)
			if err != nil {
				b.Fatal(err)
			}
			md, err := study.Build(job)
			if err != nil {
				b.Fatal(err)
			}
			b.ReportAllocs()
			var res *Result
			for b.Loop() {
				res, err = Run(md, Options{Duration: 100 * job.Heating.TimeStep, HoldCurrent: true, Tolerance: 0.3})
				if err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(res.Solves), "field_solves")
			b.ReportMetric(float64(res.Steps), "steps")
			b.ReportMetric(float64(len(md.Mesh.Nodes)), "nodes")
			b.ReportMetric(res.FieldTime.Seconds(), "field_s")
			b.ReportMetric(res.HeatTime.Seconds(), "heat_s")
		})
	}
}
