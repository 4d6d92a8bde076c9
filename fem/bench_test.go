package fem

import (
	"fmt"
	"math"
	"testing"
)

// benchProblem is a conducting block in a coil-driven box meshed on a uniform grid with about `nodes` nodes.
func benchProblem(nodes int, quad bool) *Problem {
	side := int(math.Sqrt(float64(nodes)))
	if quad {
		side /= 2
	}
	g := linspace(0, 0.1, side)
	m := rectMesh(g, g, func(r, z float64) int32 {
		switch {
		case r > 0.02 && r < 0.05 && z > 0.02 && z < 0.08:
			return 1
		case r > 0.06 && r < 0.07 && z > 0.03 && z < 0.07:
			return 2
		}
		return 0
	}, quad, "right", "top", "bottom")
	return &Problem{Mesh: m, Frequency: 10e3,
		Coils: []Coil{{Name: "c", Value: 100}},
		Regions: []Region{
			{Tag: 1, Name: "load", Kind: Part, Sigma: 1e6, Coil: -1},
			{Tag: 2, Name: "coil", Kind: SolidTurn, Sigma: 5.8e7, Coil: 0, Sense: 1, Strands: 1},
		}}
}

// BenchmarkAssemble measures a full NewAssembler (numbering, pattern, values) and a value-only re-assembly
// (SetMaterials) for linear and quadratic meshes.
func BenchmarkAssemble(b *testing.B) {
	for _, quad := range []bool{false, true} {
		for _, n := range []int{20000, 100000} {
			p := benchProblem(n, quad)
			name := fmt.Sprintf("P%d/nodes=%d", map[bool]int{false: 1, true: 2}[quad], len(p.Mesh.Nodes))
			b.Run(name+"/new", func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := NewAssembler(p); err != nil {
						b.Fatal(err)
					}
				}
			})
			b.Run(name+"/reassemble", func(b *testing.B) {
				a, err := NewAssembler(p)
				if err != nil {
					b.Fatal(err)
				}
				b.ReportAllocs()
				for b.Loop() {
					if err := a.SetMaterials(Override{Tag: 1, Sigma: 2e6}); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

// BenchmarkSolve measures a full solve of a small job (two solid turns, a magnetic billet, a stranded pickup)
// and a sweep step re-using the pattern and the symbolic analysis.
func BenchmarkSolve(b *testing.B) {
	p := twoTurnCoil(CurrentDrive, 100)
	b.Run(fmt.Sprintf("full/nodes=%d", len(p.Mesh.Nodes)), func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := Solve(p); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run(fmt.Sprintf("sweep-step/nodes=%d", len(p.Mesh.Nodes)), func(b *testing.B) {
		s, err := NewSolver(p)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportAllocs()
		f := 1000.0
		for b.Loop() {
			f *= 1.01
			if _, err := s.SolveAt(f); err != nil {
				b.Fatal(err)
			}
		}
	})
}
