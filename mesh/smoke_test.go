package mesh

import "testing"

func TestSmoke(t *testing.T) {
	g := PSLG{Points: []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {0.3, 0.4}},
		Segments: []Segment{{0, 1, 1}, {1, 2, 2}, {2, 3, 3}, {3, 0, 4}}}
	for _, opt := range []Options{{MinAngle: -1}, {}, {Size: func(Point) float64 { return 0.05 }}} {
		m, err := Triangulate(g, opt)
		if err != nil {
			t.Fatal(err)
		}
		t.Log(len(m.Tris), m.NumVertices, len(m.Edges), m.Quality())
		if err := m.Check(); err != nil {
			t.Fatal(err)
		}
		if err := m.CheckSegments(g); err != nil {
			t.Fatal(err)
		}
	}
}
