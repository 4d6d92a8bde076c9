package mesh

import (
	"math"
	"testing"
)

// layers returns a rectangle [0, w] × [0, y[last]] cut by horizontal segments at each y (thin layers, as in
// a coil's insulation or a skin-depth band), each band tagged by its index.
func layers(w float64, ys ...float64) PSLG {
	var g PSLG
	for i, y := range ys {
		g.Points = append(g.Points, Point{0, y}, Point{w, y})
		a := int32(2 * i)
		g.Segments = append(g.Segments, Segment{A: a, B: a + 1, Tag: int32(i + 1)})
		if i > 0 {
			g.Segments = append(g.Segments, Segment{A: a - 2, B: a, Tag: 100}, Segment{A: a - 1, B: a + 1, Tag: 100})
			g.Regions = append(g.Regions, RegionSeed{Point{w / 2, (ys[i-1] + y) / 2}, int32(i)})
		}
	}
	return g
}

// TestSizeBoundHolds checks the promised size and area bounds on inputs where many circumcentres of too-large
// triangles fall beyond a segment (thin layers, a zig-zag boundary, a size field that jumps across a
// segment): refinement must then split the blocking segment rather than give up on the triangle.
func TestSizeBoundHolds(t *testing.T) {
	zig := PSLG{}
	var pts []Point
	for i := 0; i <= 10; i++ {
		pts = append(pts, Point{float64(i) * 0.1, 0.02 * float64(i%2)})
	}
	pts = append(pts, Point{1, 0.3}, Point{0, 0.3})
	zig = polygon(zig, 1, pts...)
	tests := []struct {
		name string
		g    PSLG
		opt  Options
	}{
		{"thin layers, jump", layers(1, 0, 0.02, 0.021, 0.03, 0.2),
			Options{Size: func(p Point) float64 { return map[bool]float64{true: 0.004, false: 0.3}[p.Y < 0.02] }}},
		{"thin layers, graded", layers(2, 0, 0.001, 0.0015, 0.1),
			Options{Size: func(p Point) float64 { return 0.002 + 0.2*p.X }}},
		{"zig-zag, area", zig, Options{MaxArea: 2e-4}},
		{"zig-zag, size", zig, Options{Size: func(p Point) float64 { return 0.01 + 0.1*p.Y }}},
		{"thin layers, no angle", layers(1, 0, 0.01, 0.0101, 0.5),
			Options{MinAngle: -1, Size: func(p Point) float64 { return 0.05 }}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := mustMesh(t, tc.g, tc.opt)
			for i, tr := range m.Tris {
				a, b, c := m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]
				if tc.opt.Size != nil {
					longest := math.Sqrt(max(dist2(a, b), dist2(b, c), dist2(c, a)))
					if h := tc.opt.Size(Point{(a.X + b.X + c.X) / 3, (a.Y + b.Y + c.Y) / 3}); longest > h {
						t.Fatalf("triangle %d: longest edge %.4g > size %.4g", i, longest, h)
					}
				}
				if tc.opt.MaxArea > 0 && m.Area(i) > tc.opt.MaxArea {
					t.Fatalf("triangle %d: area %.4g > %.4g", i, m.Area(i), tc.opt.MaxArea)
				}
			}
			t.Logf("%d triangles, min angle %.2f°", len(m.Tris), m.Quality().MinAngleDeg)
		})
	}
}

// TestPinchedDomain meshes a domain that touches itself at one vertex (two squares sharing only a corner),
// where turning around that vertex reaches only one of its two fans of triangles (the fuzz seed
// testdata/fuzz/FuzzTriangulate/2a7199688a7e179f is such an input that once made refinement loop forever).
func TestPinchedDomain(t *testing.T) {
	g := polygon(PSLG{}, 1, square(0, 0, 1)...)
	g = polygon(g, 2, square(1, 1, 1)...)
	m := mustMesh(t, g, Options{MaxArea: 0.01})
	if a := totalArea(m); math.Abs(a-2) > 1e-12 {
		t.Fatalf("area %g, want 2", a)
	}
	b, err := newBuilder(g)
	if err != nil {
		t.Fatal(err)
	}
	pinched := 0
	for v := range int32(b.nIn) {
		if b.pinched(v) {
			pinched++
			if b.pts[v] != (Point{1, 1}) {
				t.Errorf("vertex %v marked as a pinch", b.pts[v])
			}
		}
	}
	if pinched != 1 {
		t.Fatalf("%d pinch vertices, want 1 (the shared corner)", pinched)
	}
	// Every edge at the pinch vertex must be found, from either end.
	for tr := int32(0); tr < int32(len(b.tag)); tr++ {
		for k := range int32(3) {
			if !b.alive(tr) {
				continue
			}
			u, v := b.tv[3*tr+k], b.tv[3*tr+int32(nxt[k])]
			if tt, _ := b.findEdge(u, v); tt < 0 {
				t.Fatalf("edge %d-%d not found", u, v)
			}
			if tt, _ := b.findEdge(v, u); tt < 0 {
				t.Fatalf("edge %d-%d not found", v, u)
			}
		}
	}
}

// TestCheckSegmentsGaps: a segment that leaves the domain and comes back (here from one square to another
// through their corners) has a gap where it is outside, which is fine; an Edges entry missing inside the
// domain must still be reported.
func TestCheckSegmentsGaps(t *testing.T) {
	g := polygon(PSLG{}, 1, square(0, 0, 1)...)
	g = polygon(g, 2, square(2, 2, 1)...)
	g.Points = append(g.Points, Point{0.5, 0.5}, Point{2.5, 2.5})
	g.Segments = append(g.Segments, Segment{A: 8, B: 9, Tag: 7}) // through the corners (1,1) and (2,2)
	m := mustMesh(t, g, Options{MaxArea: 0.05})
	for i, e := range m.Edges {
		if e.Tag == 7 {
			m.Edges = append(m.Edges[:i:i], m.Edges[i+1:]...)
			if err := m.CheckSegments(g); err == nil {
				t.Fatal("CheckSegments accepted a segment with an inner edge missing from Edges")
			}
			return
		}
	}
	t.Fatal("no edge with tag 7")
}
