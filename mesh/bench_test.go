package mesh

import (
	"fmt"
	"math"
	"slices"
	"testing"
)

// BenchmarkTriangulate meshes a unit square with a uniform size field (h chosen for about 100k and 1M
// triangles) and a graded case (size growing linearly away from one corner), reporting triangles per second.
func BenchmarkTriangulate(b *testing.B) {
	g := polygon(PSLG{}, 1, square(0, 0, 1)...)
	cases := []struct {
		name string
		size SizeFunc
	}{
		{"uniform/100k", func(Point) float64 { return 0.0077 }},
		{"uniform/1M", func(Point) float64 { return 0.0024 }},
		{"graded/100k", func(p Point) float64 { return 0.0005 + 0.02*math.Hypot(p.X, p.Y) }},
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			tris := 0
			for b.Loop() {
				m, err := Triangulate(g, Options{Size: c.size})
				if err != nil {
					b.Fatal(err)
				}
				tris = len(m.Tris)
			}
			b.ReportMetric(float64(tris), "tris")
			b.ReportMetric(float64(tris)*float64(b.N)/b.Elapsed().Seconds(), "tris/s")
		})
	}
}

func BenchmarkLocate(b *testing.B) {
	for _, h := range []float64{0.02, 0.005} {
		m, err := Triangulate(polygon(PSLG{}, 1, square(0, 0, 1)...), Options{Size: func(Point) float64 { return h }})
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprintf("tris=%d", len(m.Tris)), func(b *testing.B) {
			b.ReportAllocs()
			m.Locate(Point{0.5, 0.5})
			i := 0
			for b.Loop() {
				i++
				m.Locate(Point{float64(i%997) / 997, float64(i%991) / 991})
			}
		})
	}
}

// BenchmarkSortLocal renumbers a graded mesh of about 100k triangles along the Hilbert curve (a fresh copy each
// time, outside the timing).
func BenchmarkSortLocal(b *testing.B) {
	m0, err := Triangulate(polygon(PSLG{}, 1, square(0, 0, 1)...),
		Options{Size: func(p Point) float64 { return 0.0005 + 0.02*math.Hypot(p.X, p.Y) }})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		b.StopTimer()
		m := *m0
		m.Nodes, m.Tris, m.Tags = slices.Clone(m0.Nodes), slices.Clone(m0.Tris), slices.Clone(m0.Tags)
		m.Edges = slices.Clone(m0.Edges)
		b.StartTimer()
		m.SortLocal()
	}
	b.ReportMetric(float64(len(m0.Tris)), "tris")
}
