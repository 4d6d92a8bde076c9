package mesh

import (
	"errors"
	"maps"
	"math"
	"math/rand"
	"reflect"
	"strings"
	"testing"
)

// polygon appends a closed polygon to g with the given tag and returns g.
func polygon(g PSLG, tag int32, pts ...Point) PSLG {
	base := int32(len(g.Points))
	g.Points = append(g.Points, pts...)
	n := int32(len(pts))
	for i := range n {
		g.Segments = append(g.Segments, Segment{A: base + i, B: base + (i+1)%n, Tag: tag})
	}
	return g
}

func square(x0, y0, s float64) []Point {
	return []Point{{x0, y0}, {x0 + s, y0}, {x0 + s, y0 + s}, {x0, y0 + s}}
}

// halfDisc returns the polygon of a half disc of radius r on the axis x = 0 (n arc segments plus the axis).
func halfDisc(r float64, n int) []Point {
	pts := make([]Point, 0, n+1)
	for i := 0; i <= n; i++ {
		th := -math.Pi/2 + math.Pi*float64(i)/float64(n)
		pts = append(pts, Point{r * math.Cos(th), r * math.Sin(th)})
	}
	pts[0].X, pts[n].X = 0, 0
	return pts
}

func mustMesh(t *testing.T, g PSLG, opt Options) *Mesh {
	t.Helper()
	m, err := Triangulate(g, opt)
	if err != nil {
		t.Fatalf("Triangulate: %v", err)
	}
	if err := m.Check(); err != nil {
		t.Fatalf("Check: %v", err)
	}
	if err := m.CheckSegments(g); err != nil {
		t.Fatalf("CheckSegments: %v", err)
	}
	return m
}

// emptyCircles checks by brute force that no mesh vertex lies strictly inside any triangle's circumcircle:
// the (unconstrained) Delaunay property for meshes of point sets.
func emptyCircles(t *testing.T, m *Mesh) {
	t.Helper()
	for i, tr := range m.Tris {
		a, b, c := m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]
		for v := 0; v < m.NumVertices; v++ {
			if InCircle(a, b, c, m.Nodes[v]) > 0 {
				t.Fatalf("vertex %d inside circumcircle of triangle %d", v, i)
			}
		}
	}
}

func totalArea(m *Mesh) float64 {
	s := 0.0
	for t := range m.Tris {
		s += m.Area(t)
	}
	return s
}

// hullArea is the area of the convex hull of pts (shoelace formula on the hull polygon).
func hullArea(pts []Point) float64 {
	canon := make([]int32, len(pts))
	for i := range canon {
		canon[i] = int32(i)
	}
	segs := convexHull(pts, canon)
	s := 0.0
	for _, e := range segs {
		a, b := pts[e.A], pts[e.B]
		s += a.X*b.Y - b.X*a.Y
	}
	return s / 2
}

func TestDelaunayPointSets(t *testing.T) {
	rng := rand.New(rand.NewSource(7))
	random := func(n int) []Point {
		p := make([]Point, n)
		for i := range p {
			p[i] = Point{rng.Float64(), rng.Float64()}
		}
		return p
	}
	grid := func(n int) []Point { // many exactly co-circular quadruples
		var p []Point
		for i := range n {
			for j := range n {
				p = append(p, Point{float64(i) * 0.1, float64(j) * 0.1})
			}
		}
		return p
	}
	tinyCircle := func(n int) []Point { // co-circular up to rounding, radius 1e-9
		p := []Point{{-1, -1}, {1, -1}, {0, 1}}
		for i := range n {
			th := 2 * math.Pi * float64(i) / float64(n)
			p = append(p, Point{1e-9 * math.Cos(th), 1e-9 * math.Sin(th)})
		}
		return p
	}
	nearLine := func(n int) []Point { // near-collinear: a line with ulp-scale jitter
		p := []Point{{0, 1}, {1, -1}}
		for i := range n {
			x := float64(i) / float64(n)
			y := 0.3 * x
			for range rng.Intn(3) {
				y = math.Nextafter(y, 1)
			}
			p = append(p, Point{x, y})
		}
		return p
	}
	tests := []struct {
		name string
		pts  []Point
	}{
		{"random 300", random(300)},
		{"random 2000", random(2000)},
		{"grid 20x20", grid(20)},
		{"tiny circle 64", tinyCircle(64)},
		{"near-collinear 200", nearLine(200)},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := mustMesh(t, PSLG{Points: tc.pts}, Options{MinAngle: -1})
			emptyCircles(t, m)
			if m.NumVertices != len(tc.pts) {
				t.Errorf("%d vertices, want %d", m.NumVertices, len(tc.pts))
			}
			// The triangulation of a point set covers its convex hull exactly.
			if got, want := totalArea(m), hullArea(tc.pts); math.Abs(got-want) > 1e-12*math.Abs(want) {
				t.Errorf("area %.16g, hull area %.16g", got, want)
			}
		})
	}
}

func TestDuplicatePointsMerged(t *testing.T) {
	g := polygon(PSLG{}, 1, square(0, 0, 1)...)
	g.Points = append(g.Points, Point{0.5, 0.5}, Point{0.5, 0.5}, Point{1, 1})
	g.Segments = append(g.Segments, Segment{A: 4, B: 6, Tag: 2}) // ends on a duplicate of corner 2
	m := mustMesh(t, g, Options{MinAngle: -1})
	if m.NumVertices != 5 {
		t.Errorf("%d vertices, want 5 after merging duplicates", m.NumVertices)
	}
}

func TestRegionsAndAreas(t *testing.T) {
	const n = 64
	g := polygon(PSLG{}, 1, halfDisc(1, n)...)
	g = polygon(g, 2, square(0.1, -0.4, 0.8)...)
	g = polygon(g, 3, square(0.3, -0.2, 0.4)...)
	g.Regions = []RegionSeed{{Point{0.05, 0.9}, 10}, {Point{0.2, -0.3}, 20}, {Point{0.5, 0}, 30}}
	// Polygonal half disc: n isosceles triangles of apex angle π/n, area n/2·r²·sin(π/n) (elementary geometry).
	halfDiscArea := float64(n) / 2 * math.Sin(math.Pi/n)
	want := map[int32]float64{10: halfDiscArea - 0.64, 20: 0.64 - 0.16, 30: 0.16}
	for _, opt := range []Options{{MinAngle: -1}, {}, {MaxArea: 1e-3}} {
		m := mustMesh(t, g, opt)
		q := m.Quality()
		if len(q.Regions) != 3 {
			t.Fatalf("regions %+v, want tags 10, 20, 30", q.Regions)
		}
		for _, r := range q.Regions {
			if math.Abs(r.Area-want[r.Tag]) > 1e-12 {
				t.Errorf("opt %+v: tag %d area %.15g, want %.15g", opt, r.Tag, r.Area, want[r.Tag])
			}
		}
		// Tags must not leak across segments: every triangle's centroid lies in its region.
		for i, tr := range m.Tris {
			c := Point{(m.Nodes[tr[0]].X + m.Nodes[tr[1]].X + m.Nodes[tr[2]].X) / 3,
				(m.Nodes[tr[0]].Y + m.Nodes[tr[1]].Y + m.Nodes[tr[2]].Y) / 3}
			in2 := c.X > 0.1 && c.X < 0.9 && c.Y > -0.4 && c.Y < 0.4
			in3 := c.X > 0.3 && c.X < 0.7 && c.Y > -0.2 && c.Y < 0.2
			want := int32(10)
			if in3 {
				want = 30
			} else if in2 {
				want = 20
			}
			if m.Tags[i] != want {
				t.Fatalf("triangle %d at %v has tag %d, want %d", i, c, m.Tags[i], want)
			}
		}
	}
}

func TestHoles(t *testing.T) {
	g := polygon(PSLG{}, 1, square(0, 0, 1)...)
	g = polygon(g, 2, square(0.25, 0.25, 0.5)...)
	g.Holes = []Point{{0.5, 0.5}}
	m := mustMesh(t, g, Options{})
	if got := totalArea(m); math.Abs(got-0.75) > 1e-12 { // 1 - 0.5² (square minus square hole)
		t.Errorf("area %.15g, want 0.75", got)
	}
	if tri, _ := m.Locate(Point{0.5, 0.5}); tri != -1 {
		t.Errorf("hole point located in triangle %d", tri)
	}
}

func TestCircleManySegments(t *testing.T) {
	for _, n := range []int{3, 17, 500} {
		pts := make([]Point, n)
		for i := range pts {
			th := 2 * math.Pi * float64(i) / float64(n)
			pts[i] = Point{math.Cos(th), math.Sin(th)}
		}
		g := polygon(PSLG{}, 5, pts...)
		m := mustMesh(t, g, Options{})
		want := float64(n) / 2 * math.Sin(2*math.Pi/float64(n)) // regular n-gon, circumradius 1
		if got := totalArea(m); math.Abs(got-want) > 1e-12 {
			t.Errorf("n=%d: area %.15g, want %.15g", n, got, want)
		}
		if q := m.Quality(); q.MinAngleDeg < 28 {
			// The n-gon's interior angles are ≥ 60°, so no input angle excuses a small angle.
			t.Errorf("n=%d: min angle %.2f° < 28°", n, q.MinAngleDeg)
		}
	}
}

func TestQualityAndSmallAngles(t *testing.T) {
	tests := []struct {
		name     string
		g        PSLG
		minAngle float64 // required minimum over the mesh
	}{
		{"square", polygon(PSLG{}, 1, square(0, 0, 1)...), 28},
		{"L-shape", polygon(PSLG{}, 1, Point{0, 0}, Point{2, 0}, Point{2, 1}, Point{1, 1}, Point{1, 2}, Point{0, 2}), 28},
		{"thin slab 1:50", polygon(PSLG{}, 1, Point{0, 0}, Point{1, 0}, Point{1, 0.02}, Point{0, 0.02}), 28},
		// A 5° input angle: angles near that corner may be as small as the input angle, nowhere smaller
		// than about arctan((sin 5°)/(2 − cos 5°)) ≈ 4.99°, but everywhere else ≥ 28°.
		{"5 degree wedge", polygon(PSLG{}, 1, Point{0, 0}, Point{1, 0}, Point{math.Cos(5 * math.Pi / 180), math.Sin(5 * math.Pi / 180)}), 2},
		{"1 degree fan", fan(1, 6), 0.4},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := mustMesh(t, tc.g, Options{MaxPoints: 200000})
			q := m.Quality()
			if q.MinAngleDeg < tc.minAngle {
				t.Errorf("min angle %.3f°, want ≥ %g°", q.MinAngleDeg, tc.minAngle)
			}
			// Away from the small input angles (corner at origin for the wedges) all angles must be ≥ 28°.
			for i, tr := range m.Tris {
				far := true
				for _, v := range tr {
					if math.Hypot(m.Nodes[v].X, m.Nodes[v].Y) < 0.5 {
						far = false
					}
				}
				if far && minAngleOf(m, i) < 28-1e-9 {
					t.Fatalf("triangle %d away from the small angle has min angle %.3f°", i, minAngleOf(m, i))
				}
			}
		})
	}
}

// fan is n segments from the origin at deg-degree steps, closed by an arc of chords, tag 1.
func fan(deg float64, n int) PSLG {
	pts := []Point{{0, 0}}
	for i := 0; i <= n; i++ {
		th := deg * float64(i) * math.Pi / 180
		pts = append(pts, Point{math.Cos(th), math.Sin(th)})
	}
	g := polygon(PSLG{}, 1, pts...)
	for i := 2; i < n+1; i++ {
		g.Segments = append(g.Segments, Segment{A: 0, B: int32(i), Tag: 2})
	}
	return g
}

func minAngleOf(m *Mesh, t int) float64 {
	tr := m.Tris[t]
	best := 180.0
	for k := range 3 {
		a, b, c := m.Nodes[tr[k]], m.Nodes[tr[(k+1)%3]], m.Nodes[tr[(k+2)%3]]
		u, v := Point{b.X - a.X, b.Y - a.Y}, Point{c.X - a.X, c.Y - a.Y}
		ang := math.Atan2(math.Abs(u.X*v.Y-u.Y*v.X), u.X*v.X+u.Y*v.Y) * 180 / math.Pi
		best = min(best, ang)
	}
	return best
}

func TestSizeField(t *testing.T) {
	g := polygon(PSLG{}, 1, halfDisc(1, 40)...)
	g = polygon(g, 2, square(0.2, -0.1, 0.2)...)
	tests := []struct {
		name string
		size SizeFunc
	}{
		{"uniform", func(Point) float64 { return 0.05 }},
		{"graded", func(p Point) float64 { return 0.005 + 0.1*math.Hypot(p.X-0.3, p.Y) }},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := mustMesh(t, g, Options{Size: tc.size})
			for i, tr := range m.Tris {
				a, b, c := m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]
				longest := math.Sqrt(max(dist2(a, b), dist2(b, c), dist2(c, a)))
				h := tc.size(Point{(a.X + b.X + c.X) / 3, (a.Y + b.Y + c.Y) / 3})
				if longest > h { // tolerance factor 1: the criterion is enforced exactly
					t.Fatalf("triangle %d: longest edge %.4g > size %.4g", i, longest, h)
				}
			}
			if q := m.Quality(); q.MinAngleDeg < 28 {
				t.Errorf("min angle %.3f°", q.MinAngleDeg)
			}
		})
	}
}

func TestDeterminism(t *testing.T) {
	g := polygon(PSLG{}, 1, halfDisc(1, 30)...)
	g = polygon(g, 2, square(0.1, -0.2, 0.3)...)
	g.Regions = []RegionSeed{{Point{0.2, -0.1}, 7}}
	opt := Options{Size: func(p Point) float64 { return 0.02 + 0.1*p.X }}
	m1 := mustMesh(t, g, opt)
	m2 := mustMesh(t, g, opt)
	if !reflect.DeepEqual(m1.Nodes, m2.Nodes) || !reflect.DeepEqual(m1.Tris, m2.Tris) ||
		!reflect.DeepEqual(m1.Tags, m2.Tags) || !reflect.DeepEqual(m1.Edges, m2.Edges) {
		t.Fatal("two runs on the same input differ")
	}
}

func TestErrors(t *testing.T) {
	sq := polygon(PSLG{}, 1, square(0, 0, 1)...)
	with := func(f func(g *PSLG)) PSLG {
		g := PSLG{Points: append([]Point(nil), sq.Points...), Segments: append([]Segment(nil), sq.Segments...)}
		f(&g)
		return g
	}
	tests := []struct {
		name string
		g    PSLG
		opt  Options
		want string
	}{
		{"index out of range", with(func(g *PSLG) { g.Segments = append(g.Segments, Segment{A: 0, B: 9}) }), Options{}, "segment 4"},
		{"negative index", with(func(g *PSLG) { g.Segments = append(g.Segments, Segment{A: -1, B: 2}) }), Options{}, "out of range"},
		{"zero length", with(func(g *PSLG) {
			g.Points = append(g.Points, Point{0, 0})
			g.Segments = append(g.Segments, Segment{A: 0, B: 4})
		}), Options{}, "zero length"},
		{"crossing", with(func(g *PSLG) { g.Segments = append(g.Segments, Segment{A: 0, B: 2}, Segment{A: 1, B: 3}) }), Options{}, "segments 5 and 4 intersect"},
		{"NaN", with(func(g *PSLG) { g.Points[2].X = math.NaN() }), Options{}, "point 2"},
		{"seed outside", with(func(g *PSLG) { g.Regions = []RegionSeed{{Point{2, 2}, 3}} }), Options{}, "region seed 0"},
		{"open segments", PSLG{Points: sq.Points, Segments: sq.Segments[:3]}, Options{}, "no triangles"},
		{"point limit", sq, Options{Size: func(Point) float64 { return 1e-3 }, MaxPoints: 1000}, "point limit"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Triangulate(tc.g, tc.opt)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want one mentioning %q", err, tc.want)
			}
		})
	}
	if _, err := Triangulate(sq, Options{Size: func(Point) float64 { return 1e-3 }, MaxPoints: 1000}); !errors.Is(err, ErrTooManyPoints) {
		t.Errorf("point limit error %v is not ErrTooManyPoints", err)
	}
}

func TestMakeQuadratic(t *testing.T) {
	g := polygon(PSLG{}, 1, halfDisc(1, 20)...)
	g = polygon(g, 2, square(0.2, -0.2, 0.4)...)
	m := mustMesh(t, g, Options{MaxArea: 0.01})
	nv, nt := m.NumVertices, len(m.Tris)
	// Count distinct edges independently from half-edges: E = (3T + B)/2 with B boundary edges.
	nb := m.Neighbors()
	bcount := 0
	for _, n := range nb {
		for _, x := range n {
			if x < 0 {
				bcount++
			}
		}
	}
	edges := (3*nt + bcount) / 2
	m.MakeQuadratic()
	if got := len(m.Nodes) - nv; got != edges {
		t.Fatalf("%d midpoint nodes, want %d edges", got, edges)
	}
	if err := m.Check(); err != nil { // checks midpoints positions and sharing
		t.Fatal(err)
	}
	for i, e := range m.Edges {
		if e.M < int32(nv) {
			t.Fatalf("Edges[%d].M = %d not set", i, e.M)
		}
		p, a, b := m.Nodes[e.M], m.Nodes[e.A], m.Nodes[e.B]
		if p.X != (a.X+b.X)/2 || p.Y != (a.Y+b.Y)/2 {
			t.Fatalf("Edges[%d].M is not the edge midpoint", i)
		}
	}
	before := append([]Point(nil), m.Nodes...)
	m.MakeQuadratic()
	if !reflect.DeepEqual(before, m.Nodes) {
		t.Fatal("MakeQuadratic is not idempotent")
	}
}

func TestLocate(t *testing.T) {
	g := polygon(PSLG{}, 1, halfDisc(1, 24)...)
	g = polygon(g, 2, square(0.2, -0.2, 0.3)...)
	g.Holes = []Point{{0.35, -0.05}}
	m := mustMesh(t, g, Options{MaxArea: 0.002})
	rng := rand.New(rand.NewSource(11))
	idx := m.Index()
	for i := 0; i < 3000; i++ {
		p := Point{rng.Float64()*1.4 - 0.2, rng.Float64()*2.4 - 1.2}
		// Brute force: first triangle whose closed region contains p (exact orientation).
		want := -1
		for k, tr := range m.Tris {
			a, b, c := m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]
			if Orient2D(a, b, p) >= 0 && Orient2D(b, c, p) >= 0 && Orient2D(c, a, p) >= 0 {
				want = k
				break
			}
		}
		for _, loc := range []func(Point) (int, [3]float64){idx.Locate, m.Locate} {
			got, bary := loc(p)
			if (got < 0) != (want < 0) {
				t.Fatalf("point %v: located %d, brute force %d", p, got, want)
			}
			if got < 0 {
				continue
			}
			tr := m.Tris[got]
			var q Point
			for k := range 3 {
				q.X += bary[k] * m.Nodes[tr[k]].X
				q.Y += bary[k] * m.Nodes[tr[k]].Y
			}
			if math.Hypot(q.X-p.X, q.Y-p.Y) > 1e-12 || math.Abs(bary[0]+bary[1]+bary[2]-1) > 1e-12 {
				t.Fatalf("point %v: barycentrics %v reproduce %v", p, bary, q)
			}
		}
	}
}

func TestExtract(t *testing.T) {
	g := polygon(PSLG{}, 1, square(0, 0, 2)...)
	g = polygon(g, 2, square(0.5, 0.5, 1)...)
	g.Regions = []RegionSeed{{Point{0.1, 0.1}, 1}, {Point{1, 1}, 2}}
	m := mustMesh(t, g, Options{MaxArea: 0.01})
	m.MakeQuadratic()
	for _, tag := range []int32{1, 2} {
		sub, nodeMap := m.Extract(func(x int32) bool { return x == tag })
		if err := sub.Check(); err != nil {
			t.Fatalf("tag %d: %v", tag, err)
		}
		if len(nodeMap) != len(sub.Nodes) {
			t.Fatalf("nodeMap has %d entries for %d nodes", len(nodeMap), len(sub.Nodes))
		}
		for i, p := range sub.Nodes {
			if m.Nodes[nodeMap[i]] != p {
				t.Fatalf("nodeMap[%d] points at a different node", i)
			}
		}
		want := map[int32]float64{1: 3, 2: 1}[tag] // 2² − 1² and 1²
		if got := totalArea(sub); math.Abs(got-want) > 1e-12 {
			t.Errorf("tag %d area %.15g, want %g", tag, got, want)
		}
		// The inner square's boundary is an input segment (tag 2) in both parts; no edge should get -1 here.
		for _, e := range sub.Edges {
			if e.Tag < 1 {
				t.Errorf("tag %d: boundary edge with tag %d", tag, e.Tag)
			}
		}
	}
}

func TestNeighbors(t *testing.T) {
	m := mustMesh(t, polygon(PSLG{}, 1, square(0, 0, 1)...), Options{MaxArea: 0.01})
	nb := m.Neighbors()
	for i, n := range nb {
		for k, x := range n {
			a, b := m.Tris[i][k], m.Tris[i][(k+1)%3]
			if x < 0 {
				continue
			}
			found := false
			for j := range 3 {
				if m.Tris[x][j] == b && m.Tris[x][(j+1)%3] == a && nb[x][j] == int32(i) {
					found = true
				}
			}
			if !found {
				t.Fatalf("neighbour %d of triangle %d edge %d is not reciprocal", x, i, k)
			}
		}
	}
}

// FuzzTriangulate turns bytes into a small PSLG on a 16×16 grid (points, then segments between them, a
// region seed and a hole) and requires Triangulate never to panic and its successes to pass Check.
func FuzzTriangulate(f *testing.F) {
	f.Add([]byte{4, 0, 0, 15, 0, 15, 15, 0, 15, 0, 1, 1, 2, 2, 3, 3, 0})
	f.Add([]byte{5, 0, 0, 8, 8, 15, 0, 15, 15, 0, 15, 0, 2, 2, 3, 3, 4, 4, 0, 0, 1})
	f.Add([]byte{3, 0, 0, 1, 0, 0, 1})
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) < 1 {
			return
		}
		n := int(data[0]%12) + 3
		data = data[1:]
		var g PSLG
		for i := 0; i < n && len(data) >= 2; i++ {
			g.Points = append(g.Points, Point{float64(data[0] % 16), float64(data[1] % 16)})
			data = data[2:]
		}
		for len(data) >= 2 && len(g.Segments) < 16 {
			g.Segments = append(g.Segments, Segment{A: int32(data[0]) % int32(n+1), B: int32(data[1]) % int32(n+1), Tag: int32(len(g.Segments))})
			data = data[2:]
		}
		if len(data) >= 2 {
			g.Regions = []RegionSeed{{Point{float64(data[0]%64) / 4, float64(data[1]%64) / 4}, 9}}
		}
		m, err := Triangulate(g, Options{MaxPoints: 3000, MaxArea: 4})
		if err != nil {
			return
		}
		if err := m.Check(); err != nil {
			t.Fatalf("Check: %v\n%+v", err, g)
		}
		if err := m.CheckSegments(g); err != nil {
			t.Fatalf("CheckSegments: %v\n%+v", err, g)
		}
	})
}

// The Hilbert index visits every cell of a small grid once, each step to a side neighbour.
func TestHilbert(t *testing.T) {
	const bits = 3
	n := 1 << bits
	at := make([][2]int, n*n)
	seen := make([]bool, n*n)
	for x := range n {
		for y := range n {
			d := hilbert(bits, uint32(x), uint32(y))
			if d >= uint64(n*n) || seen[d] {
				t.Fatalf("(%d, %d) -> %d: out of range or repeated", x, y, d)
			}
			seen[d] = true
			at[d] = [2]int{x, y}
		}
	}
	for d := 1; d < n*n; d++ {
		dx, dy := at[d][0]-at[d-1][0], at[d][1]-at[d-1][1]
		if dx*dx+dy*dy != 1 {
			t.Fatalf("step %d: (%v) to (%v) is not to a side neighbour", d, at[d-1], at[d])
		}
	}
}

// SortLocal keeps the mesh (same triangles with the same tags and orientation, same boundary edges, still
// valid) and makes consecutive triangles near each other.
func TestSortLocal(t *testing.T) {
	g := polygon(PSLG{}, 1, halfDisc(1, 64)...)
	g = polygon(g, 2, square(0.1, -0.4, 0.8)...)
	g.Regions = []RegionSeed{{Point{0.05, 0.9}, 10}, {Point{0.2, -0.3}, 20}}
	m := mustMesh(t, g, Options{MaxArea: 1e-3})
	canon := func(m *Mesh) map[[3]Point]int32 {
		out := map[[3]Point]int32{}
		for i, tr := range m.Tris {
			p := [3]Point{m.Nodes[tr[0]], m.Nodes[tr[1]], m.Nodes[tr[2]]}
			// rotate so that the smallest point leads (orientation kept)
			for k := 0; k < 3; k++ {
				if p[0].X < p[1].X || p[0].X == p[1].X && p[0].Y < p[1].Y {
					if p[0].X < p[2].X || p[0].X == p[2].X && p[0].Y < p[2].Y {
						break
					}
				}
				p = [3]Point{p[1], p[2], p[0]}
			}
			out[p] = m.Tags[i]
		}
		return out
	}
	edges := func(m *Mesh) map[[2]Point]int32 {
		out := map[[2]Point]int32{}
		for _, e := range m.Edges {
			a, b := m.Nodes[e.A], m.Nodes[e.B]
			if b.X < a.X || b.X == a.X && b.Y < a.Y {
				a, b = b, a
			}
			out[[2]Point{a, b}] = e.Tag
		}
		return out
	}
	before, beforeEdges := canon(m), edges(m)
	jump := func(m *Mesh) float64 {
		var s float64
		for i := 1; i < len(m.Tris); i++ {
			a, b := m.Nodes[m.Tris[i-1][0]], m.Nodes[m.Tris[i][0]]
			s += math.Hypot(a.X-b.X, a.Y-b.Y)
		}
		return s
	}
	j0 := jump(m)
	m.SortLocal()
	if err := m.Check(); err != nil {
		t.Fatal(err)
	}
	after, afterEdges := canon(m), edges(m)
	if !maps.Equal(before, after) || !maps.Equal(beforeEdges, afterEdges) {
		t.Fatal("SortLocal changed the triangles, their tags or the boundary edges")
	}
	if j1 := jump(m); !(j1 < j0/2) {
		t.Errorf("path through consecutive triangles %g before, %g after: not local", j0, j1)
	}
}
