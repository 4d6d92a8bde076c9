package geometry

import (
	"fmt"
	"math"
	"sort"

	"eddyrz/geometry/material"
	"eddyrz/mesh"
)

// Segment tags of the planar graph that the solver gives meaning to (the same numbers as fem's).
const (
	// AxisTag marks segments on the axis r = 0.
	AxisTag int32 = 1
	// OuterTag marks segments of the far boundary.
	OuterTag int32 = 2
)

// AirTag is the region tag of the air (bores of hollow turns included).
const AirTag int32 = 1

// RegionKind says what a region is made of electrically.
type RegionKind int

const (
	AirRegion      RegionKind = iota // no current
	TurnRegion                       // a solid coil turn (tube or bar): eddy currents and a loop voltage
	StrandedRegion                   // a stranded winding block: uniform current density, no eddy currents
	PartRegion                       // a workpiece: eddy currents only, no net current
)

// Region is one tagged area of the layout. Regions[i] has Tag i+1; Regions[0] is the air.
type Region struct {
	Tag  int32
	Name string
	Kind RegionKind
	// Coil and Turn index the coil and its turn (TurnRegion, StrandedRegion), −1 otherwise.
	Coil, Turn int
	// Part indexes the part (PartRegion), −1 otherwise.
	Part int
	// Sense is the winding sense ±1 of a turn (0 otherwise); Strands the series turns of a stranded block
	// (1 for a solid turn); Fill a stranded block's fill factor.
	Sense, Strands int
	Fill           float64
	// Material is nil for air.
	Material *material.Material
	// Temperature, K.
	Temperature float64
	// Area is the exact cross-section area, m² (the planar graph's polygons approximate it within the curve
	// tolerance); 0 for air.
	Area float64
	// SkinDepth at the job's frequency and the region's temperature, m (0 for air and stranded blocks).
	SkinDepth float64
	// Seed is the point that carries the region's tag in the planar graph.
	Seed mesh.Point
}

// OuterCircle is the far boundary: the semicircle r ≥ 0 centred on the axis at height CenterZ, metres.
type OuterCircle struct {
	CenterZ, Radius float64
}

// Layout is the mesher's input for a job: the half disc r ≥ 0 bounded by the axis and the far semicircle, with
// every conductor's boundary as segments, in metres (X = r, Y = z).
type Layout struct {
	PSLG mesh.PSLG
	// Size is the wanted edge length near a point, m. It is safe for concurrent use.
	Size     mesh.SizeFunc
	MinAngle float64 // degrees
	Order    int     // 1 or 2
	Regions  []Region
	Outer    OuterCircle
	// CurveTol is the largest distance between a curved boundary and its segments, m.
	CurveTol float64
}

// sizeSource is one conductor's contribution to the size field: hs at its surface, growing by g−1 per metre of
// distance on either side, capped at hin inside it.
type sizeSource struct {
	s       shape
	lo, hi  mesh.Point
	hs, hin float64
}

// SizeField is the wanted element size of a job: h(p) = min over conductors of (h_surface + (growth−1)·distance),
// with a conductor's interior capped at a share of its thinnest dimension, and the whole capped at Max.
type SizeField struct {
	src []sizeSource
	g1  float64
	Max float64
}

// At returns the wanted edge length at p, m. It does not allocate.
func (f *SizeField) At(p mesh.Point) float64 {
	h := f.Max
	for i := range f.src {
		s := &f.src[i]
		// A lower bound of the distance from the bounding box prunes far conductors.
		dx := math.Max(0, math.Max(s.lo.X-p.X, p.X-s.hi.X))
		dy := math.Max(0, math.Max(s.lo.Y-p.Y, p.Y-s.hi.Y))
		if s.hs+f.g1*math.Hypot(dx, dy) >= h {
			continue
		}
		d := s.s.sdf(p)
		hc := s.hs + f.g1*math.Abs(d)
		if d < 0 && hc > s.hin {
			hc = s.hin
		}
		if hc < h {
			h = hc
		}
	}
	return h
}

// regionsAndShapes lists the regions (air first) with the shape of each (nil for air).
func (j *Job) regionsAndShapes() ([]Region, []shape) {
	regs := []Region{{Tag: AirTag, Name: "air", Kind: AirRegion, Coil: -1, Turn: -1, Part: -1, Temperature: roomTemperature}}
	shapes := []shape{nil}
	for ci := range j.Coils {
		c := &j.Coils[ci]
		for ti := range c.Turns {
			t := &c.Turns[ti]
			r := Region{Name: fmt.Sprintf("%s/%d", c.Name, ti+1), Kind: TurnRegion, Coil: ci, Turn: ti, Part: -1,
				Sense: t.Sense, Strands: 1, Fill: 1, Material: c.Material, Temperature: c.Temperature}
			if t.Kind == StrandedSection {
				r.Kind, r.Strands, r.Fill = StrandedRegion, t.Strands, t.Fill
			} else {
				r.SkinDepth = c.Material.SkinDepth(j.Frequency, c.Temperature)
			}
			regs = append(regs, r)
			shapes = append(shapes, t.shape())
		}
	}
	for pi := range j.Parts {
		p := &j.Parts[pi]
		regs = append(regs, Region{Name: p.Name, Kind: PartRegion, Coil: -1, Turn: -1, Part: pi, Material: p.Material,
			Temperature: p.Temperature, SkinDepth: p.Material.SkinDepth(j.Frequency, p.Temperature)})
		shapes = append(shapes, p.shape())
	}
	for i := range regs {
		regs[i].Tag = int32(i + 1)
		if shapes[i] != nil {
			regs[i].Area = shapes[i].area()
			regs[i].Seed = shapes[i].seed()
		}
	}
	return regs, shapes
}

// Layout builds the mesher's input for the job. See Layout for the conventions.
func (j *Job) Layout() (*Layout, error) {
	regs, shapes := j.regionsAndShapes()
	tol := j.curveTol()
	m := j.Mesh

	// Extent: the radius about (0, zc) that holds every conductor.
	zlo, zhi, rhi := math.Inf(1), math.Inf(-1), 0.0
	for _, s := range shapes[1:] {
		lo, hi := s.bbox()
		zlo, zhi, rhi = math.Min(zlo, lo.Y), math.Max(zhi, hi.Y), math.Max(rhi, hi.X)
	}
	if len(shapes) == 1 {
		return nil, fmt.Errorf("layout of %s: no conductors to lay out", j.File)
	}
	zc := (zlo + zhi) / 2
	extent := math.Hypot(rhi, (zhi-zlo)/2)
	R := m.OuterSize * extent
	outer := OuterCircle{CenterZ: zc, Radius: R}

	field := &SizeField{g1: m.Growth - 1, Max: R / 10}
	if m.MaxSize > 0 {
		field.Max = math.Min(field.Max, m.MaxSize)
	}
	for i, s := range shapes[1:] {
		r := &regs[i+1]
		feat := s.feature()
		hs := feat / 4
		if r.Kind == StrandedRegion {
			// Uniform current density and no eddy currents: the field varies smoothly through the block, so one
			// quadratic element across its thinnest side is enough.
			hs = feat
		}
		if r.SkinDepth > 0 {
			hs = math.Min(hs, r.SkinDepth/m.PerSkinDepth)
		}
		lo, hi := s.bbox()
		field.src = append(field.src, sizeSource{s: s, lo: lo, hi: hi, hs: hs, hin: math.Max(hs, feat/4)})
	}

	b := newGraphBuilder(1e-9 * R)
	for _, s := range shapes[1:] {
		for _, l := range s.loops() {
			b.addLoop(l, tol, field, 0)
		}
	}
	b.addLoop([]piece{
		{arc: true, start: mesh.Point{Y: zc - R}, c: mesh.Point{Y: zc}, rad: R, a0: -math.Pi / 2, a1: math.Pi / 2},
		{start: mesh.Point{Y: zc + R}},
	}, tol, field, OuterTag)
	g := b.finish()

	for i := range regs[1:] {
		g.Regions = append(g.Regions, mesh.RegionSeed{P: regs[i+1].Seed, Tag: regs[i+1].Tag})
	}
	// Air: one seed just inside the far boundary, one in each bore.
	a := math.Pi / 4
	g.Regions = append(g.Regions, mesh.RegionSeed{P: mesh.Point{X: 0.98 * R * math.Cos(a), Y: zc + 0.98*R*math.Sin(a)}, Tag: AirTag})
	for _, s := range shapes[1:] {
		for _, p := range s.airSeeds() {
			g.Regions = append(g.Regions, mesh.RegionSeed{P: p, Tag: AirTag})
		}
	}
	regs[0].Seed = g.Regions[len(regs)-1].P
	return &Layout{PSLG: g, Size: field.At, MinAngle: m.MinAngle, Order: m.Order, Regions: regs, Outer: outer, CurveTol: tol}, nil
}

// arcSegments is the number of chords for an arc: sagitta ≤ tol and chord ≤ the smallest wanted size along it.
func arcSegments(pc piece, tol float64, size *SizeField) int {
	span := pc.a1 - pc.a0
	n := 1
	if tol < pc.rad {
		n = int(math.Ceil(span / (2 * math.Acos(1-tol/pc.rad))))
	}
	n = max(n, int(math.Ceil(span/(math.Pi/2))))
	const samples = 64
	h := math.Inf(1)
	for i := 0; i <= samples; i++ {
		a := pc.a0 + span*float64(i)/samples
		h = math.Min(h, size.At(mesh.Point{X: pc.c.X + pc.rad*math.Cos(a), Y: pc.c.Y + pc.rad*math.Sin(a)}))
	}
	n = max(n, int(math.Ceil(span*pc.rad/h)))
	// Quarter points on the chord ends keep extreme points (tangencies, the axis) exact.
	return (n + 3) / 4 * 4
}

// graphBuilder collects segments, merging coincident points and splitting segments at points lying on them.
type graphBuilder struct {
	eps  float64
	pts  []mesh.Point
	grid map[[2]int64][]int32
	segs []mesh.Segment
}

func newGraphBuilder(eps float64) *graphBuilder {
	return &graphBuilder{eps: eps, grid: map[[2]int64][]int32{}}
}

// point returns the index of p, merging it with a point already within eps.
func (b *graphBuilder) point(p mesh.Point) int32 {
	if math.Abs(p.X) <= b.eps {
		p.X = 0
	}
	cx, cy := int64(math.Floor(p.X/b.eps)), int64(math.Floor(p.Y/b.eps))
	for dx := int64(-1); dx <= 1; dx++ {
		for dy := int64(-1); dy <= 1; dy++ {
			for _, i := range b.grid[[2]int64{cx + dx, cy + dy}] {
				if math.Abs(b.pts[i].X-p.X) <= b.eps && math.Abs(b.pts[i].Y-p.Y) <= b.eps {
					return i
				}
			}
		}
	}
	i := int32(len(b.pts))
	b.pts = append(b.pts, p)
	b.grid[[2]int64{cx, cy}] = append(b.grid[[2]int64{cx, cy}], i)
	return i
}

func (b *graphBuilder) addLoop(l []piece, tol float64, size *SizeField, tag int32) {
	var ids []int32
	for _, pc := range l {
		if !pc.arc {
			ids = append(ids, b.point(pc.start))
			continue
		}
		n := arcSegments(pc, tol, size)
		for i := 0; i < n; i++ {
			a := pc.a0 + (pc.a1-pc.a0)*float64(i)/float64(n)
			// Exact endpoints for the first chord; sin/cos of the other angles.
			p := mesh.Point{X: pc.c.X + pc.rad*math.Cos(a), Y: pc.c.Y + pc.rad*math.Sin(a)}
			if i == 0 {
				p = pc.start
			}
			ids = append(ids, b.point(p))
		}
	}
	for i := range ids {
		k := (i + 1) % len(ids)
		if tag == OuterTag && i == len(ids)-1 {
			// The closing edge of the outer boundary runs along the axis.
			b.segs = append(b.segs, mesh.Segment{A: ids[i], B: ids[k], Tag: AxisTag})
			continue
		}
		b.segs = append(b.segs, mesh.Segment{A: ids[i], B: ids[k], Tag: tag})
	}
}

// finish splits every segment at the points lying on it, drops duplicates and tags segments on the axis.
func (b *graphBuilder) finish() mesh.PSLG {
	order := make([]int32, len(b.pts))
	for i := range order {
		order[i] = int32(i)
	}
	sort.Slice(order, func(x, y int) bool { return b.pts[order[x]].X < b.pts[order[y]].X })
	xs := make([]float64, len(order))
	for i, o := range order {
		xs[i] = b.pts[o].X
	}
	type key struct{ a, b int32 }
	seen := map[key]int{}
	var out []mesh.Segment
	var on []int32
	add := func(a, c int32, tag int32) {
		if a == c {
			return
		}
		if b.pts[a].X == 0 && b.pts[c].X == 0 {
			tag = AxisTag
		}
		k := key{min(a, c), max(a, c)}
		if i, ok := seen[k]; ok {
			out[i].Tag = max(out[i].Tag, tag)
			return
		}
		seen[k] = len(out)
		out = append(out, mesh.Segment{A: a, B: c, Tag: tag})
	}
	for _, s := range b.segs {
		pa, pb := b.pts[s.A], b.pts[s.B]
		x0, x1 := math.Min(pa.X, pb.X)-b.eps, math.Max(pa.X, pb.X)+b.eps
		y0, y1 := math.Min(pa.Y, pb.Y)-b.eps, math.Max(pa.Y, pb.Y)+b.eps
		dx, dy := pb.X-pa.X, pb.Y-pa.Y
		l2 := dx*dx + dy*dy
		on = on[:0]
		for i := sort.SearchFloat64s(xs, x0); i < len(xs) && xs[i] <= x1; i++ {
			v := order[i]
			q := b.pts[v]
			if v == s.A || v == s.B || q.Y < y0 || q.Y > y1 {
				continue
			}
			if segDist(q, pa, pb) <= b.eps {
				on = append(on, v)
			}
		}
		if len(on) == 0 {
			add(s.A, s.B, s.Tag)
			continue
		}
		t := func(v int32) float64 { q := b.pts[v]; return ((q.X-pa.X)*dx + (q.Y-pa.Y)*dy) / l2 }
		sort.Slice(on, func(x, y int) bool { return t(on[x]) < t(on[y]) })
		prev := s.A
		for _, v := range on {
			add(prev, v, s.Tag)
			prev = v
		}
		add(prev, s.B, s.Tag)
	}
	return mesh.PSLG{Points: b.pts, Segments: out}
}
