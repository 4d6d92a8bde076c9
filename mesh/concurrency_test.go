package mesh

import (
	"math"
	"reflect"
	"sync"
	"testing"
)

// TestParallelTriangulate runs the same triangulation in several goroutines at once: each must equal the
// serial result exactly (no shared mutable state, deterministic refinement order). Under -race it also checks
// that the runs share nothing they write.
func TestParallelTriangulate(t *testing.T) {
	g := polygon(PSLG{}, 1, halfDisc(1, 40)...)
	g = polygon(g, 2, square(0.2, -0.3, 0.3)...)
	g.Regions = []RegionSeed{{Point{0.3, -0.2}, 5}}
	opt := Options{Size: func(p Point) float64 { return 0.01 + 0.05*math.Hypot(p.X-0.3, p.Y+0.1) }}
	want := mustMesh(t, g, opt)
	const n = 4
	got := make([]*Mesh, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	for i := range n {
		wg.Go(func() { got[i], errs[i] = Triangulate(g, opt) })
	}
	wg.Wait()
	for i, m := range got {
		if errs[i] != nil {
			t.Fatalf("run %d: %v", i, errs[i])
		}
		if !reflect.DeepEqual(m.Nodes, want.Nodes) || !reflect.DeepEqual(m.Tris, want.Tris) ||
			!reflect.DeepEqual(m.Tags, want.Tags) || !reflect.DeepEqual(m.Edges, want.Edges) {
			t.Fatalf("parallel run %d differs from the serial one (%d vs %d triangles)", i, len(m.Tris), len(want.Tris))
		}
	}
}

// TestConcurrentLocate queries one mesh from several goroutines, starting together so the lazily built index
// is raced for, and compares every answer with a serial Index built separately.
func TestConcurrentLocate(t *testing.T) {
	m := mustMesh(t, polygon(PSLG{}, 1, square(0, 0, 1)...), Options{MaxArea: 1e-3})
	ref := m.Index()
	const workers, queries = 4, 2000
	start := make(chan struct{})
	bad := make([]int, workers)
	var wg sync.WaitGroup
	for w := range workers {
		wg.Go(func() {
			<-start
			for i := range queries {
				p := Point{float64((i*7919+w*31)%1009) / 1008, float64((i*104729+w*17)%997) / 996}
				tri, bary := m.Locate(p)
				wt, wb := ref.Locate(p)
				if tri != wt || bary != wb || tri < 0 {
					bad[w]++
				}
			}
		})
	}
	close(start)
	wg.Wait()
	for w, b := range bad {
		if b > 0 {
			t.Errorf("worker %d: %d answers differ from the serial index or fall outside", w, b)
		}
	}
}
