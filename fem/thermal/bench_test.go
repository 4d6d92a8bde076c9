package thermal

import (
	"fmt"
	"testing"
)

// BenchmarkHundredSteps runs 100 backward-Euler steps of 0.5 s on a square part (r, z ∈ [0, 40 mm]) heated in a
// 3 mm surface layer, with convection and radiation on its outer faces, for meshes of (n+1)² nodes.
func BenchmarkHundredSteps(b *testing.B) {
	for _, n := range []int{25, 50, 100} {
		m := rectMesh(0, 0.04, 0, 0.04, n, n, 1)
		bnd := edgesWhere(m, allEdges, func(i, j int32) BoundaryEdge {
			return BoundaryEdge{A: i, B: j, HeatTransfer: 20, Ambient: 300, Emissivity: 0.7}
		})
		src := make([]float64, len(m.Tris))
		for i, tri := range m.Tris {
			if m.Nodes[tri[0]].X >= 0.037 {
				src[i] = 2e8
			}
		}
		mat := Funcs{
			K:   func(T float64) float64 { return 50 - 0.02*(T-300) },
			Rho: func(float64) float64 { return 7850 },
			Cp:  func(T float64) float64 { return 460 + 0.2*(T-300) },
		}
		model := Model{Mesh: m, Materials: map[int32]Material{1: mat}, Boundary: bnd}
		b.Run(fmt.Sprintf("nodes=%d", len(m.Nodes)), func(b *testing.B) {
			b.ReportAllocs()
			newton, cg := 0, 0
			for b.Loop() {
				s, err := NewSolver(model, []float64{300})
				if err != nil {
					b.Fatal(err)
				}
				for k := 0; k < 100; k++ {
					info, err := s.Step(0.5, src)
					if err != nil {
						b.Fatal(err)
					}
					newton += info.Iterations
					cg += info.CGIter
				}
			}
			b.ReportMetric(float64(newton)/float64(b.N)/100, "newton/step")
			b.ReportMetric(float64(cg)/float64(newton), "cg/newton")
		})
	}
}
