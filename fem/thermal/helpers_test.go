package thermal

import (
	"math"
	"testing"

	"eddyrz/mesh"
)

// rectMesh builds a structured mesh of [r0, r1] × [z0, z1] with nr × nz cells, each cut into two right triangles
// (non-obtuse, so lumped capacity keeps the maximum principle). Every triangle gets tag.
func rectMesh(r0, r1, z0, z1 float64, nr, nz int, tag int32) *mesh.Mesh {
	m := &mesh.Mesh{}
	for j := 0; j <= nz; j++ {
		for i := 0; i <= nr; i++ {
			m.Nodes = append(m.Nodes, mesh.Point{
				X: r0 + (r1-r0)*float64(i)/float64(nr),
				Y: z0 + (z1-z0)*float64(j)/float64(nz),
			})
		}
	}
	m.NumVertices = len(m.Nodes)
	id := func(i, j int) int32 { return int32(j*(nr+1) + i) }
	for j := 0; j < nz; j++ {
		for i := 0; i < nr; i++ {
			a, b, c, d := id(i, j), id(i+1, j), id(i+1, j+1), id(i, j+1)
			m.Tris = append(m.Tris, [3]int32{a, b, c}, [3]int32{a, c, d})
			m.Tags = append(m.Tags, tag, tag)
		}
	}
	return m
}

// edgesWhere turns the outer edges of the whole mesh (axis excluded) that satisfy sel into boundary edges made by mk.
func edgesWhere(m *mesh.Mesh, sel func(a, b mesh.Point) bool, mk func(a, b int32) BoundaryEdge) []BoundaryEdge {
	var out []BoundaryEdge
	for _, e := range OuterEdges(m, func(int32) bool { return true }, 1e-12) {
		if sel(m.Nodes[e[0]], m.Nodes[e[1]]) {
			out = append(out, mk(e[0], e[1]))
		}
	}
	return out
}

func allEdges(a, b mesh.Point) bool { return true }

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

func mustSolver(t testing.TB, m Model, T0 ...float64) *Solver {
	t.Helper()
	s, err := NewSolver(m, T0)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func mustStep(t testing.TB, s *Solver, dt float64, src []float64) StepInfo {
	t.Helper()
	info, err := s.Step(dt, src)
	if err != nil {
		t.Fatal(err)
	}
	return info
}

func uniformSource(m *mesh.Mesh, q float64) []float64 {
	src := make([]float64, len(m.Tris))
	for i := range src {
		src[i] = q
	}
	return src
}
