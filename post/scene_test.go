package post

import (
	"math"
	"testing"

	"eddyrz/fem"
	"eddyrz/mesh"
)

// Test scenes: a conducting sphere on the axis and a coil of rectangular solid turns, inside a semicircular
// far boundary where A = 0, meshed by the project's mesher from a hand-built PSLG.

type rect struct{ r0, r1, z0, z1 float64 }

// dist is the distance from (r, z) to the rectangle's boundary, m.
func (b rect) dist(r, z float64) float64 {
	dr := max(b.r0-r, 0, r-b.r1)
	dz := max(b.z0-z, 0, z-b.z1)
	if dr == 0 && dz == 0 {
		return min(r-b.r0, b.r1-r, z-b.z0, b.z1-z)
	}
	return math.Hypot(dr, dz)
}

type scene struct {
	a, zs     float64 // sphere radius and centre height, m (a = 0: no sphere)
	sigmaPart float64 // S/m
	turns     []rect
	senses    []int
	current   complex128 // coil current, A rms
	freq      float64    // Hz
	rOut      float64    // far boundary radius, m
	hf        float64    // element size at conductor surfaces, m
	grow      float64    // size growth per metre of distance from the nearest surface
	applied   complex128 // applied uniform Bz, T rms
	strands   int        // > 0: the turns are stranded blocks of this many turns with Rdc = rdc
	rdc       float64    // Ω per block
}

const (
	tagSphere = 10
	tagTurn0  = 20
)

// levitator is a 10 mm aluminium sphere (σ = 3.5e7 S/m, common practice for commercial alloys, reference §4)
// over or in a three-turn copper coil at 5 kHz.
func levitator(zs float64, turnZ ...float64) scene {
	s := scene{a: 0.01, zs: zs, sigmaPart: 3.5e7, current: 500, freq: 5e3, rOut: 0.25, hf: 5e-4, grow: 0.35}
	for _, z := range turnZ {
		s.turns = append(s.turns, rect{0.014, 0.018, z - 0.002, z + 0.002})
		s.senses = append(s.senses, 1)
	}
	return s
}

func (s scene) pslg() mesh.PSLG {
	var g mesh.PSLG
	add := func(r, z float64) int32 {
		g.Points = append(g.Points, mesh.Point{X: r, Y: z})
		return int32(len(g.Points) - 1)
	}
	// Far boundary: semicircle from (0, −R) to (0, R).
	const nOut = 64
	var outer []int32
	for i := range nOut + 1 {
		th := -math.Pi/2 + math.Pi*float64(i)/nOut
		r := s.rOut * math.Cos(th)
		if i == 0 || i == nOut {
			r = 0
		}
		outer = append(outer, add(r, s.rOut*math.Sin(th)))
	}
	for i := range nOut {
		g.Segments = append(g.Segments, mesh.Segment{A: outer[i], B: outer[i+1], Tag: fem.OuterTag})
	}
	axis := []int32{outer[0]}
	if s.a > 0 {
		nArc := max(16, int(math.Pi*s.a/s.hf))
		var arc []int32
		for i := range nArc + 1 {
			ph := -math.Pi/2 + math.Pi*float64(i)/float64(nArc)
			r := s.a * math.Cos(ph)
			if i == 0 || i == nArc {
				r = 0
			}
			arc = append(arc, add(r, s.zs+s.a*math.Sin(ph)))
		}
		for i := range nArc {
			g.Segments = append(g.Segments, mesh.Segment{A: arc[i], B: arc[i+1]})
		}
		axis = append(axis, arc[0], arc[nArc])
		g.Regions = append(g.Regions, mesh.RegionSeed{P: mesh.Point{X: s.a / 2, Y: s.zs}, Tag: tagSphere})
	}
	axis = append(axis, outer[nOut])
	for i := range len(axis) - 1 {
		g.Segments = append(g.Segments, mesh.Segment{A: axis[i], B: axis[i+1], Tag: fem.AxisTag})
	}
	for k, b := range s.turns {
		c := []int32{add(b.r0, b.z0), add(b.r1, b.z0), add(b.r1, b.z1), add(b.r0, b.z1)}
		for i := range 4 {
			g.Segments = append(g.Segments, mesh.Segment{A: c[i], B: c[(i+1)%4]})
		}
		g.Regions = append(g.Regions, mesh.RegionSeed{P: mesh.Point{X: b.r0 + 0.37*(b.r1-b.r0), Y: b.z0 + 0.41*(b.z1-b.z0)}, Tag: int32(tagTurn0 + k)})
	}
	return g
}

// size is the wanted element size at p: hf at every conductor surface, growing with the distance from it.
func (s scene) size(p mesh.Point) float64 {
	d := math.Inf(1)
	if s.a > 0 {
		d = math.Abs(math.Hypot(p.X, p.Y-s.zs) - s.a)
	}
	for _, b := range s.turns {
		d = min(d, b.dist(p.X, p.Y))
	}
	return min(s.hf+s.grow*d, s.rOut/10)
}

func (s scene) problem(tb testing.TB) *fem.Problem {
	tb.Helper()
	m, err := mesh.Triangulate(s.pslg(), mesh.Options{Size: s.size})
	if err != nil {
		tb.Fatal(err)
	}
	m.MakeQuadratic()
	p := &fem.Problem{Mesh: m, Frequency: s.freq, AppliedBz: s.applied}
	if s.a > 0 {
		p.Regions = append(p.Regions, fem.Region{Tag: tagSphere, Name: "slug", Kind: fem.Part, Sigma: s.sigmaPart, Coil: -1})
	}
	if len(s.turns) > 0 {
		p.Coils = []fem.Coil{{Name: "work coil", Drive: fem.CurrentDrive, Value: s.current}}
	}
	for k := range s.turns {
		// Copper 5.8e7 S/m (annealed-copper standard 1.72e-8 Ω·m, reference §4, common practice).
		p.Regions = append(p.Regions, fem.Region{Tag: int32(tagTurn0 + k), Name: "turn " + string(rune('A'+k)),
			Kind: fem.SolidTurn, Sigma: 1 / 1.72e-8, Coil: 0, Sense: s.senses[k], Strands: 1})
		if s.strands > 0 {
			r := &p.Regions[len(p.Regions)-1]
			r.Kind, r.Sigma, r.Strands, r.Rdc = fem.Stranded, 0, s.strands, s.rdc
		}
	}
	return p
}

// solve meshes, solves and analyzes the scene.
func (s scene) solve(tb testing.TB) (*fem.Solution, *Result) {
	tb.Helper()
	sol, err := fem.Solve(s.problem(tb))
	if err != nil {
		tb.Fatal(err)
	}
	res, err := Analyze(sol, Options{})
	if err != nil {
		tb.Fatal(err)
	}
	return sol, res
}

// relDiff is |a − b|/|b|.
func relDiff(a, b float64) float64 { return math.Abs(a-b) / math.Abs(b) }
