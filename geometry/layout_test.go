package geometry

import (
	"math"
	"sort"
	"strconv"
	"testing"

	"eddyrz/mesh"
)

// faces traces the bounded faces of a planar straight-line graph: for each face, its outer cycle plus its hole
// cycles, with the enclosed area (outer minus holes).
type face struct {
	outer []int32
	area  float64
}

func traceFaces(g mesh.PSLG) (pos, neg [][]int32) {
	type he struct{ from, to int32 }
	out := map[int32][]int32{}
	for _, s := range g.Segments {
		out[s.A] = append(out[s.A], s.B)
		out[s.B] = append(out[s.B], s.A)
	}
	ang := func(a, b int32) float64 {
		return math.Atan2(g.Points[b].Y-g.Points[a].Y, g.Points[b].X-g.Points[a].X)
	}
	for v, nb := range out {
		sort.Slice(nb, func(i, k int) bool { return ang(v, nb[i]) < ang(v, nb[k]) })
	}
	used := map[he]bool{}
	for _, s := range g.Segments {
		for _, start := range []he{{s.A, s.B}, {s.B, s.A}} {
			if used[start] {
				continue
			}
			var cyc []int32
			e := start
			for !used[e] {
				used[e] = true
				cyc = append(cyc, e.from)
				// Next half-edge: at e.to, the neighbour just clockwise of the way back (face on the left).
				nb := out[e.to]
				i := 0
				for nb[i] != e.from {
					i++
				}
				e = he{e.to, nb[(i-1+len(nb))%len(nb)]}
			}
			if cycArea(g, cyc) > 0 {
				pos = append(pos, cyc)
			} else {
				neg = append(neg, cyc)
			}
		}
	}
	return pos, neg
}

func cycArea(g mesh.PSLG, c []int32) float64 {
	p := make([]mesh.Point, len(c))
	for i, v := range c {
		p[i] = g.Points[v]
	}
	return polyArea(p)
}

func cycContains(g mesh.PSLG, c []int32, q mesh.Point) bool {
	in := false
	for i, k := 0, len(c)-1; i < len(c); k, i = i, i+1 {
		a, b := g.Points[c[k]], g.Points[c[i]]
		if (a.Y > q.Y) != (b.Y > q.Y) && q.X < a.X+(q.Y-a.Y)*(b.X-a.X)/(b.Y-a.Y) {
			in = !in
		}
	}
	return in
}

// regionArea is the area of the face of the graph holding point q: its smallest enclosing counter-clockwise
// cycle, less the holes (clockwise cycles) whose own enclosing face is that one.
func regionArea(g mesh.PSLG, pos, neg [][]int32, q mesh.Point) float64 {
	smallest := func(p mesh.Point) int {
		best, ba := -1, math.Inf(1)
		for i, c := range pos {
			if a := cycArea(g, c); a < ba && cycContains(g, c, p) {
				best, ba = i, a
			}
		}
		return best
	}
	f := smallest(q)
	if f < 0 {
		return 0
	}
	area := cycArea(g, pos[f])
	for _, h := range neg {
		// A point just to the left of the hole's first half-edge lies in the face that surrounds the hole.
		a, b := g.Points[h[0]], g.Points[h[1]]
		l := math.Hypot(b.X-a.X, b.Y-a.Y)
		p := mesh.Point{X: (a.X+b.X)/2 - 1e-7*(b.Y-a.Y)/l, Y: (a.Y+b.Y)/2 + 1e-7*(b.X-a.X)/l}
		if smallest(p) == f {
			area += cycArea(g, h)
		}
	}
	return area
}

func TestRegionAreasFromGraph(t *testing.T) {
	for _, name := range exampleNames {
		j := readExample(t, name)
		l, err := j.Layout()
		if err != nil {
			t.Fatal(err)
		}
		pos, neg := traceFaces(l.PSLG)
		_, shapes := j.regionsAndShapes()
		total := 0.0
		for i, r := range l.Regions[1:] {
			s := shapes[i+1]
			got := regionArea(l.PSLG, pos, neg, r.Seed)
			// Chords lose at most 2/3·sagitta per unit of curved boundary (circular segment area ≈ 2/3·c·s);
			// the boundary length is at most the bounding-box perimeter times π/2 for our convex-ish shapes.
			lo, hi := s.bbox()
			perim := 2 * (hi.X - lo.X + hi.Y - lo.Y) * math.Pi / 2
			if s, ok := s.(*roundShape); ok && s.ri > 0 {
				perim += 2 * math.Pi * s.ri
			}
			if d := math.Abs(got - r.Area); d > perim*l.CurveTol || got <= 0 {
				t.Errorf("%s region %s: graph area %.9g, exact %.9g, difference %.3g > %.3g", name, r.Name, got, r.Area, d, perim*l.CurveTol)
			}
			total += got
		}
		// Everything together fills the half disc of the far boundary (bores and air included).
		air := regionArea(l.PSLG, pos, neg, l.Regions[0].Seed)
		for _, s := range shapes[1:] {
			for _, p := range s.airSeeds() {
				air += regionArea(l.PSLG, pos, neg, p)
			}
		}
		R := l.Outer.Radius
		if half := math.Pi * R * R / 2; math.Abs(total+air-half) > 2*math.Pi*R*l.CurveTol {
			t.Errorf("%s: regions add up to %.9g, half disc %.9g", name, total+air, half)
		}
	}
}

func TestGraphWellFormed(t *testing.T) {
	for _, name := range exampleNames {
		j := readExample(t, name)
		l, err := j.Layout()
		if err != nil {
			t.Fatal(err)
		}
		g := l.PSLG
		R, zc := l.Outer.Radius, l.Outer.CenterZ
		var nAxis, nOuter int
		seen := map[[2]int32]bool{}
		for _, s := range g.Segments {
			a, b := g.Points[s.A], g.Points[s.B]
			if s.A == s.B || seen[[2]int32{min(s.A, s.B), max(s.A, s.B)}] {
				t.Fatalf("%s: degenerate or repeated segment %v", name, s)
			}
			seen[[2]int32{min(s.A, s.B), max(s.A, s.B)}] = true
			onAxis := a.X == 0 && b.X == 0
			if onAxis != (s.Tag == AxisTag) {
				t.Errorf("%s: segment %v→%v tag %d", name, a, b, s.Tag)
			}
			if s.Tag == OuterTag {
				nOuter++
				for _, p := range []mesh.Point{a, b} {
					if math.Abs(math.Hypot(p.X, p.Y-zc)-R) > 1e-9*R {
						t.Errorf("%s: outer point %v off the circle", name, p)
					}
				}
			}
			if s.Tag == AxisTag {
				nAxis++
			}
		}
		for _, p := range g.Points {
			if p.X < 0 || math.Hypot(p.X, p.Y-zc) > R*(1+1e-9) {
				t.Errorf("%s: point %v outside the half disc", name, p)
			}
		}
		if nAxis < 2 || nOuter < 8 {
			t.Errorf("%s: %d axis and %d outer segments", name, nAxis, nOuter)
		}
		if len(l.Regions) != len(g.Regions)-countAirSeeds(g) {
			t.Errorf("%s: %d regions, %d seeds", name, len(l.Regions), len(g.Regions))
		}
		for i, r := range l.Regions {
			if r.Tag != int32(i+1) {
				t.Errorf("%s: region %d has tag %d", name, i, r.Tag)
			}
		}
		// No two segments cross (they may only share end points).
		segs := g.Segments
		for i := range segs {
			a, b := g.Points[segs[i].A], g.Points[segs[i].B]
			for k := i + 1; k < len(segs); k++ {
				c, d := g.Points[segs[k].A], g.Points[segs[k].B]
				if math.Max(a.X, b.X) < math.Min(c.X, d.X) || math.Max(c.X, d.X) < math.Min(a.X, b.X) ||
					math.Max(a.Y, b.Y) < math.Min(c.Y, d.Y) || math.Max(c.Y, d.Y) < math.Min(a.Y, b.Y) {
					continue
				}
				if properCross(a, b, c, d, 0) {
					t.Fatalf("%s: segments %v-%v and %v-%v cross", name, a, b, c, d)
				}
			}
		}
		// Curved boundaries come pre-split: no chord of the far arc is longer than the size field wants there.
		for _, s := range segs {
			a, b := g.Points[s.A], g.Points[s.B]
			if s.Tag == AxisTag {
				continue
			}
			mid := mesh.Point{X: (a.X + b.X) / 2, Y: (a.Y + b.Y) / 2}
			if s.Tag == OuterTag && math.Hypot(b.X-a.X, b.Y-a.Y) > l.Size(mid)*(1+1e-9) {
				t.Errorf("%s: outer chord %.3g longer than size %.3g", name, math.Hypot(b.X-a.X, b.Y-a.Y), l.Size(mid))
			}
		}
	}
}

func countAirSeeds(g mesh.PSLG) int {
	n := 0
	for _, r := range g.Regions {
		if r.Tag == AirTag {
			n++
		}
	}
	return n - 1 // one air seed stands for the air region itself
}

func TestSizeField(t *testing.T) {
	for _, name := range exampleNames {
		j := readExample(t, name)
		l, err := j.Layout()
		if err != nil {
			t.Fatal(err)
		}
		// Monotone away from the conductors: along rays from the device centre outward, beyond the last
		// conductor, the size never falls.
		R, zc := l.Outer.Radius, l.Outer.CenterZ
		for _, ang := range []float64{-1.4, -0.7, 0, 0.7, 1.4} {
			prev := 0.0
			for s := R / j.Mesh.OuterSize * 1.01; s < R; s += R / 500 {
				h := l.Size(mesh.Point{X: s * math.Cos(ang), Y: zc + s*math.Sin(ang)})
				if h < prev*(1-1e-12) {
					t.Fatalf("%s: size falls from %g to %g at distance %g", name, prev, h, s)
				}
				prev = h
			}
			if prev <= 0 || prev > R/10*(1+1e-12) {
				t.Errorf("%s: size %g at the far boundary", name, prev)
			}
		}
	}
	// A lone sphere: on its surface h = min(δ/n, a/4) with n the default elements per skin depth; a distance d
	// outside h = that + (growth − 1)·d.
	src := `frequency = "10 kHz"
applied_field = "1 mT"
[[part]]
name = "s"
shape = "sphere"
radius = "10 mm"
z = 0
material = "copper"
`
	j, err := Parse("s.toml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	l, err := j.Layout()
	if err != nil {
		t.Fatal(err)
	}
	d := l.Regions[1].SkinDepth
	// Copper at 293.15 K ≈ 1.678e-8 Ω·m (Matula 1979 via reference §4): δ ≈ 0.652 mm at 10 kHz.
	if math.Abs(d-0.652e-3) > 0.005e-3 {
		t.Errorf("copper skin depth at 10 kHz %g", d)
	}
	hs := d / DefaultMeshControls().PerSkinDepth
	g1 := DefaultMeshControls().Growth - 1
	for _, c := range []struct {
		p    mesh.Point
		want float64
	}{
		{mesh.Point{X: 0.01, Y: 0}, hs},
		{mesh.Point{X: 0.02, Y: 0}, hs + g1*0.01},
		{mesh.Point{X: 0.009, Y: 0}, hs + g1*0.001},
		{mesh.Point{X: 0.0, Y: 0}, 0.01 / 4}, // the interior cap, a/4
	} {
		if got := l.Size(c.p); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("size at %v = %g, want %g", c.p, got, c.want)
		}
	}
}

func BenchmarkSizeField(b *testing.B) {
	for _, name := range exampleNames {
		j := readExample(b, name)
		l, err := j.Layout()
		if err != nil {
			b.Fatal(err)
		}
		b.Run(name+"/regions="+strconv.Itoa(len(l.Regions)), func(b *testing.B) {
			b.ReportAllocs()
			R, zc := l.Outer.Radius, l.Outer.CenterZ
			s := 0.0
			for i := 0; b.Loop(); i++ {
				a := float64(i%1000) / 1000
				s += l.Size(mesh.Point{X: R * a * a, Y: zc + R*(a-0.5)*0.3})
			}
			_ = s
		})
	}
}

func BenchmarkLayout(b *testing.B) {
	for _, name := range exampleNames {
		j := readExample(b, name)
		b.Run(name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := j.Layout(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
	// A ladder of helix groups: n tube turns with a billet.
	for _, n := range []int{4, 16, 64} {
		src := `frequency = "10 kHz"
[[coil]]
current = "100 A"
  [[coil.turn]]
  shape = "tube"
  diameter = "6 mm"
  wall = "1 mm"
  r = "30 mm"
  z = 0
  pitch = "7 mm"
  count = ` + strconv.Itoa(n) + `
[[part]]
name = "b"
shape = "cylinder"
radius = "20 mm"
height = "100 mm"
z = 0
material = "steel"
`
		j, err := Parse("ladder.toml", []byte(src))
		if err != nil {
			b.Fatal(err)
		}
		b.Run("turns="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := j.Layout(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
