package post

import (
	"fmt"
	"testing"
)

// BenchmarkAnalyze times Analyze alone on solutions of growing size (the sphere-inside-coil scene, finer
// surface meshes); the largest has about 50 000 nodes.
func BenchmarkAnalyze(b *testing.B) {
	for _, hf := range []float64{5e-4, 2.5e-4, 9e-5} {
		sc := levitator(0.003, -0.006, 0, 0.006)
		sc.hf = hf
		sol, _ := sc.solve(b)
		b.Run(fmt.Sprintf("nodes=%d", len(sol.Mesh.Nodes)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Analyze(sol, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(fmt.Sprintf("nodes=%d/no-stress", len(sol.Mesh.Nodes)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Analyze(sol, Options{SkipStress: true}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
