package plot

import (
	"strconv"

	"eddyrz/mesh"
)

// gridMesh returns a structured mesh of [0, w] × [0, h] with nx × ny squares, each split into two
// counter-clockwise triangles along alternating diagonals; triangles in the left half get tag 1, the rest tag 2.
// With quadratic set, edge-midpoint nodes are added after the corners and Mid is filled.
func gridMesh(nx, ny int, w, h float64, quadratic bool) *mesh.Mesh {
	m := &mesh.Mesh{}
	id := func(i, j int) int32 { return int32(j*(nx+1) + i) }
	for j := 0; j <= ny; j++ {
		for i := 0; i <= nx; i++ {
			m.Nodes = append(m.Nodes, mesh.Point{X: w * float64(i) / float64(nx), Y: h * float64(j) / float64(ny)})
		}
	}
	m.NumVertices = len(m.Nodes)
	for j := range ny {
		for i := range nx {
			a, b, c, d := id(i, j), id(i+1, j), id(i+1, j+1), id(i, j+1)
			tag := int32(1)
			if 2*i >= nx {
				tag = 2
			}
			if (i+j)%2 == 0 {
				m.Tris = append(m.Tris, [3]int32{a, b, c}, [3]int32{a, c, d})
			} else {
				m.Tris = append(m.Tris, [3]int32{a, b, d}, [3]int32{b, c, d})
			}
			m.Tags = append(m.Tags, tag, tag)
		}
	}
	if quadratic {
		mids := map[[2]int32]int32{}
		m.Mid = make([][3]int32, len(m.Tris))
		for t, v := range m.Tris {
			for k := range 3 {
				a, b := v[k], v[(k+1)%3]
				key := [2]int32{min(a, b), max(a, b)}
				n, ok := mids[key]
				if !ok {
					n = int32(len(m.Nodes))
					pa, pb := m.Nodes[a], m.Nodes[b]
					m.Nodes = append(m.Nodes, mesh.Point{X: (pa.X + pb.X) / 2, Y: (pa.Y + pb.Y) / 2})
					mids[key] = n
				}
				m.Mid[t][k] = n
			}
		}
	}
	return m
}

// nodal evaluates f at every node of m.
func nodal(m *mesh.Mesh, f func(x, y float64) float64) []float64 {
	v := make([]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		v[i] = f(p.X, p.Y)
	}
	return v
}

func itoa(n int) string { return strconv.Itoa(n) + "tris" }
