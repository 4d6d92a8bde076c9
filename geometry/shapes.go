package geometry

import (
	"fmt"
	"math"

	"eddyrz/mesh"
)

// A piece is one stretch of a closed boundary: a straight edge from its start to the next piece's start, or
// an arc about C of radius Rad from angle A0 to A1 (radians; A1 > A0 runs counter-clockwise).
type piece struct {
	arc    bool
	start  mesh.Point
	c      mesh.Point
	rad    float64
	a0, a1 float64
}

// shape is a conductor's cross-section in the r-z half plane (metres, X = r, Y = z).
type shape interface {
	// sdf is the signed distance to the conductor, negative inside it; an air bore counts as outside.
	sdf(p mesh.Point) float64
	// loops are the closed boundaries (outer first, then bores).
	loops() [][]piece
	// seed is a point strictly inside the conductor; airSeeds are points inside its bores.
	seed() mesh.Point
	airSeeds() []mesh.Point
	// area is the exact cross-section area, m².
	area() float64
	// feature is the thinnest dimension (wall, diameter, ...), m.
	feature() float64
	// minRadius is the smallest radius of curvature of its boundary (+Inf without curves).
	minRadius() float64
	// bbox is the bounding box.
	bbox() (lo, hi mesh.Point)
}

func circlePiece(c mesh.Point, r float64) piece {
	return piece{arc: true, start: mesh.Point{X: c.X + r, Y: c.Y}, c: c, rad: r, a0: 0, a1: 2 * math.Pi}
}

func linePieces(pts ...mesh.Point) []piece {
	out := make([]piece, len(pts))
	for i, p := range pts {
		out[i] = piece{start: p}
	}
	return out
}

// roundShape is a round tube (ri > 0) or rod (ri = 0) centred at c.
type roundShape struct {
	c      mesh.Point
	ro, ri float64
}

func (s *roundShape) sdf(p mesh.Point) float64 {
	d := math.Hypot(p.X-s.c.X, p.Y-s.c.Y)
	if s.ri == 0 {
		return d - s.ro
	}
	return math.Abs(d-(s.ro+s.ri)/2) - (s.ro-s.ri)/2
}
func (s *roundShape) loops() [][]piece {
	l := [][]piece{{circlePiece(s.c, s.ro)}}
	if s.ri > 0 {
		l = append(l, []piece{circlePiece(s.c, s.ri)})
	}
	return l
}
func (s *roundShape) seed() mesh.Point {
	if s.ri == 0 {
		return s.c
	}
	return mesh.Point{X: s.c.X + (s.ro+s.ri)/2, Y: s.c.Y}
}
func (s *roundShape) airSeeds() []mesh.Point {
	if s.ri == 0 {
		return nil
	}
	return []mesh.Point{s.c}
}
func (s *roundShape) area() float64 { return math.Pi * (s.ro*s.ro - s.ri*s.ri) }
func (s *roundShape) feature() float64 {
	if s.ri == 0 {
		return 2 * s.ro
	}
	return s.ro - s.ri
}
func (s *roundShape) minRadius() float64 {
	if s.ri > 0 {
		return s.ri
	}
	return s.ro
}
func (s *roundShape) bbox() (mesh.Point, mesh.Point) {
	return mesh.Point{X: s.c.X - s.ro, Y: s.c.Y - s.ro}, mesh.Point{X: s.c.X + s.ro, Y: s.c.Y + s.ro}
}

// boxSDF is the signed distance to the rectangle [lo, hi].
func boxSDF(p, lo, hi mesh.Point) float64 {
	dx := math.Max(lo.X-p.X, p.X-hi.X)
	dy := math.Max(lo.Y-p.Y, p.Y-hi.Y)
	if dx > 0 || dy > 0 {
		return math.Hypot(math.Max(dx, 0), math.Max(dy, 0))
	}
	return math.Max(dx, dy)
}

func rectPieces(lo, hi mesh.Point) []piece {
	return linePieces(lo, mesh.Point{X: hi.X, Y: lo.Y}, hi, mesh.Point{X: lo.X, Y: hi.Y})
}

// rectShape is a rectangle [lo, hi], hollow with an air bore when wall > 0.
type rectShape struct {
	lo, hi mesh.Point
	wall   float64
}

func (s *rectShape) inner() (mesh.Point, mesh.Point) {
	return mesh.Point{X: s.lo.X + s.wall, Y: s.lo.Y + s.wall}, mesh.Point{X: s.hi.X - s.wall, Y: s.hi.Y - s.wall}
}
func (s *rectShape) sdf(p mesh.Point) float64 {
	d := boxSDF(p, s.lo, s.hi)
	if s.wall > 0 {
		ilo, ihi := s.inner()
		d = math.Max(d, -boxSDF(p, ilo, ihi))
	}
	return d
}
func (s *rectShape) loops() [][]piece {
	l := [][]piece{rectPieces(s.lo, s.hi)}
	if s.wall > 0 {
		l = append(l, rectPieces(s.inner()))
	}
	return l
}
func (s *rectShape) seed() mesh.Point {
	if s.wall > 0 {
		return mesh.Point{X: s.lo.X + s.wall/2, Y: (s.lo.Y + s.hi.Y) / 2}
	}
	return mesh.Point{X: (s.lo.X + s.hi.X) / 2, Y: (s.lo.Y + s.hi.Y) / 2}
}
func (s *rectShape) airSeeds() []mesh.Point {
	if s.wall == 0 {
		return nil
	}
	return []mesh.Point{{X: (s.lo.X + s.hi.X) / 2, Y: (s.lo.Y + s.hi.Y) / 2}}
}
func (s *rectShape) area() float64 {
	a := (s.hi.X - s.lo.X) * (s.hi.Y - s.lo.Y)
	if s.wall > 0 {
		ilo, ihi := s.inner()
		a -= (ihi.X - ilo.X) * (ihi.Y - ilo.Y)
	}
	return a
}
func (s *rectShape) feature() float64 {
	if s.wall > 0 {
		return s.wall
	}
	return math.Min(s.hi.X-s.lo.X, s.hi.Y-s.lo.Y)
}
func (s *rectShape) minRadius() float64             { return math.Inf(1) }
func (s *rectShape) bbox() (mesh.Point, mesh.Point) { return s.lo, s.hi }

// halfDisc is a sphere's cross-section: the half disc r ≥ 0 of radius a centred on the axis at height zc.
type halfDisc struct{ zc, a float64 }

func (s *halfDisc) sdf(p mesh.Point) float64 { return math.Hypot(p.X, p.Y-s.zc) - s.a }
func (s *halfDisc) loops() [][]piece {
	c := mesh.Point{Y: s.zc}
	return [][]piece{{
		{arc: true, start: mesh.Point{Y: s.zc - s.a}, c: c, rad: s.a, a0: -math.Pi / 2, a1: math.Pi / 2},
		{start: mesh.Point{Y: s.zc + s.a}},
	}}
}
func (s *halfDisc) seed() mesh.Point       { return mesh.Point{X: s.a / 2, Y: s.zc} }
func (s *halfDisc) airSeeds() []mesh.Point { return nil }
func (s *halfDisc) area() float64          { return math.Pi * s.a * s.a / 2 }
func (s *halfDisc) feature() float64       { return s.a }
func (s *halfDisc) minRadius() float64     { return s.a }
func (s *halfDisc) bbox() (mesh.Point, mesh.Point) {
	return mesh.Point{Y: s.zc - s.a}, mesh.Point{X: s.a, Y: s.zc + s.a}
}

// polyShape is a simple polygon, counter-clockwise (cups are polygons too).
type polyShape struct {
	p      []mesh.Point
	lo, hi mesh.Point
	feat   float64
	in     mesh.Point
}

func newPolyShape(p []mesh.Point, feat float64) *polyShape {
	s := &polyShape{p: p, feat: feat}
	s.lo, s.hi = p[0], p[0]
	for _, q := range p {
		s.lo.X, s.lo.Y = math.Min(s.lo.X, q.X), math.Min(s.lo.Y, q.Y)
		s.hi.X, s.hi.Y = math.Max(s.hi.X, q.X), math.Max(s.hi.Y, q.Y)
	}
	if s.feat == 0 {
		s.feat = math.Min(s.hi.X-s.lo.X, s.hi.Y-s.lo.Y)
	}
	s.in = interiorPoint(p)
	return s
}

func (s *polyShape) sdf(q mesh.Point) float64 {
	d := math.Inf(1)
	inside := false
	n := len(s.p)
	for i, k := 0, n-1; i < n; k, i = i, i+1 {
		a, b := s.p[k], s.p[i]
		d = math.Min(d, segDist(q, a, b))
		if (a.Y > q.Y) != (b.Y > q.Y) && q.X < a.X+(q.Y-a.Y)*(b.X-a.X)/(b.Y-a.Y) {
			inside = !inside
		}
	}
	if inside {
		return -d
	}
	return d
}
func (s *polyShape) loops() [][]piece               { return [][]piece{linePieces(s.p...)} }
func (s *polyShape) seed() mesh.Point               { return s.in }
func (s *polyShape) airSeeds() []mesh.Point         { return nil }
func (s *polyShape) area() float64                  { return polyArea(s.p) }
func (s *polyShape) feature() float64               { return s.feat }
func (s *polyShape) minRadius() float64             { return math.Inf(1) }
func (s *polyShape) bbox() (mesh.Point, mesh.Point) { return s.lo, s.hi }

// segDist is the distance from q to the segment ab.
func segDist(q, a, b mesh.Point) float64 {
	dx, dy := b.X-a.X, b.Y-a.Y
	l2 := dx*dx + dy*dy
	t := 0.0
	if l2 > 0 {
		t = math.Max(0, math.Min(1, ((q.X-a.X)*dx+(q.Y-a.Y)*dy)/l2))
	}
	return math.Hypot(q.X-a.X-t*dx, q.Y-a.Y-t*dy)
}

// polyArea is the signed (shoelace) area, positive for counter-clockwise polygons.
func polyArea(p []mesh.Point) float64 {
	s := 0.0
	for i, k := 0, len(p)-1; i < len(p); k, i = i, i+1 {
		s += p[k].X*p[i].Y - p[i].X*p[k].Y
	}
	return s / 2
}

// interiorPoint finds a point strictly inside a simple polygon: the midpoint of the widest interior stretch of
// a horizontal line through the middle of the vertex heights.
func interiorPoint(p []mesh.Point) mesh.Point {
	best, bestW := p[0], -1.0
	n := len(p)
	for k := range p {
		// Lines half-way between consecutive distinct vertex heights avoid passing through vertices.
		y := (p[k].Y + p[(k+1)%n].Y) / 2
		if p[k].Y == p[(k+1)%n].Y {
			continue
		}
		var xs []float64
		for i, j := 0, n-1; i < n; j, i = i, i+1 {
			a, b := p[j], p[i]
			if (a.Y > y) != (b.Y > y) {
				xs = append(xs, a.X+(y-a.Y)*(b.X-a.X)/(b.Y-a.Y))
			}
		}
		sortFloats(xs)
		for i := 0; i+1 < len(xs); i += 2 {
			if w := xs[i+1] - xs[i]; w > bestW {
				bestW, best = w, mesh.Point{X: (xs[i] + xs[i+1]) / 2, Y: y}
			}
		}
	}
	return best
}

func sortFloats(x []float64) {
	for i := 1; i < len(x); i++ {
		for k := i; k > 0 && x[k] < x[k-1]; k-- {
			x[k], x[k-1] = x[k-1], x[k]
		}
	}
}

// cross is the z component of (b−a)×(c−a): positive when a, b, c turn counter-clockwise.
func cross(a, b, c mesh.Point) float64 { return (b.X-a.X)*(c.Y-a.Y) - (b.Y-a.Y)*(c.X-a.X) }

// properCross reports whether segments ab and cd cross at a point interior to both, each end lying more than
// tol from the other segment's line (so nearly collinear, touching edges do not count).
func properCross(a, b, c, d mesh.Point, tol float64) bool {
	lab, lcd := math.Hypot(b.X-a.X, b.Y-a.Y), math.Hypot(d.X-c.X, d.Y-c.Y)
	d1, d2 := cross(a, b, c)/lab, cross(a, b, d)/lab
	d3, d4 := cross(c, d, a)/lcd, cross(c, d, b)/lcd
	return ((d1 > tol && d2 < -tol) || (d1 < -tol && d2 > tol)) && ((d3 > tol && d4 < -tol) || (d3 < -tol && d4 > tol))
}

// selfIntersection finds two non-adjacent edges of a closed polygon that cross or touch.
func selfIntersection(p []mesh.Point) (int, int, bool) {
	n := len(p)
	for i := 0; i < n; i++ {
		a, b := p[i], p[(i+1)%n]
		for k := i + 2; k < n; k++ {
			if i == 0 && k == n-1 {
				continue
			}
			c, d := p[k], p[(k+1)%n]
			if properCross(a, b, c, d, 0) || segDist(c, a, b) == 0 || segDist(a, c, d) == 0 {
				return i, k, true
			}
		}
	}
	return 0, 0, false
}

// turnShape is the cross-section of a coil turn.
func (t *Turn) shape() shape {
	c := mesh.Point{X: t.R, Y: t.Z}
	if t.Kind == TubeSection {
		ri := 0.0
		if t.Wall > 0 {
			ri = t.Diameter/2 - t.Wall
		}
		return &roundShape{c: c, ro: t.Diameter / 2, ri: ri}
	}
	w := 0.0
	if t.Kind == BarSection {
		w = t.Wall
	}
	return &rectShape{lo: mesh.Point{X: t.R - t.Width/2, Y: t.Z - t.Height/2}, hi: mesh.Point{X: t.R + t.Width/2, Y: t.Z + t.Height/2}, wall: w}
}

// shape is the cross-section of a part.
func (p *Part) shape() shape {
	switch p.Shape {
	case Sphere:
		return &halfDisc{zc: p.Z, a: p.Radius}
	case Cylinder:
		return &rectShape{lo: mesh.Point{Y: p.Z}, hi: mesh.Point{X: p.Radius, Y: p.Z + p.Height}}
	case TubePart:
		return &rectShape{lo: mesh.Point{X: p.Inner, Y: p.Z}, hi: mesh.Point{X: p.Radius, Y: p.Z + p.Height}}
	case Cup:
		ri, top, floor := p.Radius-p.Wall, p.Z+p.Height, p.Z+p.Base
		return newPolyShape([]mesh.Point{
			{X: 0, Y: p.Z}, {X: p.Radius, Y: p.Z}, {X: p.Radius, Y: top}, {X: ri, Y: top}, {X: ri, Y: floor}, {X: 0, Y: floor},
		}, math.Min(p.Wall, p.Base))
	default:
		return newPolyShape(p.Points, 0)
	}
}

// coarseVertices lists boundary points of a shape: polygon corners and arcs at 64 points per turn, enough for
// the overlap test.
func coarseVertices(s shape) [][]mesh.Point {
	var out [][]mesh.Point
	for _, l := range s.loops() {
		var pts []mesh.Point
		for _, pc := range l {
			if !pc.arc {
				pts = append(pts, pc.start)
				continue
			}
			n := int(math.Ceil((pc.a1 - pc.a0) / (2 * math.Pi) * 64))
			for i := 0; i < n; i++ {
				a := pc.a0 + (pc.a1-pc.a0)*float64(i)/float64(n)
				pts = append(pts, mesh.Point{X: pc.c.X + pc.rad*math.Cos(a), Y: pc.c.Y + pc.rad*math.Sin(a)})
			}
		}
		out = append(out, pts)
	}
	return out
}

// overlap reports whether the interiors of two shapes meet by more than tol.
func overlap(a, b shape, tol float64) bool {
	alo, ahi := a.bbox()
	blo, bhi := b.bbox()
	if alo.X >= bhi.X-tol || blo.X >= ahi.X-tol || alo.Y >= bhi.Y-tol || blo.Y >= ahi.Y-tol {
		return false
	}
	if b.sdf(a.seed()) < -tol || a.sdf(b.seed()) < -tol {
		return true
	}
	va, vb := coarseVertices(a), coarseVertices(b)
	for _, l := range va {
		for _, p := range l {
			if b.sdf(p) < -tol {
				return true
			}
		}
	}
	for _, l := range vb {
		for _, p := range l {
			if a.sdf(p) < -tol {
				return true
			}
		}
	}
	for _, la := range va {
		for i := range la {
			p, q := la[i], la[(i+1)%len(la)]
			for _, lb := range vb {
				for k := range lb {
					if properCross(p, q, lb[k], lb[(k+1)%len(lb)], tol) {
						return true
					}
				}
			}
		}
	}
	return false
}

// conductor is one conductor of the job with where it came from, for messages.
type conductor struct {
	s    shape
	key  string // indexed key path of the value that placed it
	what string
}

func (j *Job) conductors() []conductor {
	var out []conductor
	for ci := range j.Coils {
		c := &j.Coils[ci]
		for ti := range c.Turns {
			t := &c.Turns[ti]
			out = append(out, conductor{s: t.shape(), key: fmt.Sprintf("coil[%d].turn[%d].r", ci, t.Entry),
				what: fmt.Sprintf("turn %d of coil %q", ti+1, c.Name)})
		}
	}
	for pi := range j.Parts {
		key := fmt.Sprintf("part[%d].z", pi)
		if j.Parts[pi].Shape == Polygon {
			key = fmt.Sprintf("part[%d].points", pi)
		}
		out = append(out, conductor{s: j.Parts[pi].shape(), key: key,
			what: fmt.Sprintf("part %q", j.Parts[pi].Name)})
	}
	return out
}

// overlapTol is the depth of interpenetration tolerated between two conductors that should only touch.
func (j *Job) overlapTol() float64 { return j.curveTol() }

// checkGeometry rejects overlapping conductors.
func (j *Job) checkGeometry() error {
	cs := j.conductors()
	tol := j.overlapTol()
	for a := 1; a < len(cs); a++ {
		for b := 0; b < a; b++ {
			if !overlap(cs[a].s, cs[b].s, tol) {
				continue
			}
			return j.lines.errAt(cs[a].key, "%s overlaps %s (move or shrink one of them; conductors may touch but not overlap)", cs[a].what, cs[b].what)
		}
	}
	return nil
}

// curveTol is the curve tolerance in use, m: the file's value or 1/4000 of the smallest curve radius (a circle
// cut into chords loses about 4/3 of the sagitta over the radius in area, so 1/4000 keeps a round conductor's DC
// resistance within about 0.03 %).
func (j *Job) curveTol() float64 {
	if j.Mesh.CurveTol > 0 {
		return j.Mesh.CurveTol
	}
	rmin := math.Inf(1)
	ext := 0.0
	for _, c := range j.conductors() {
		rmin = math.Min(rmin, c.s.minRadius())
		lo, hi := c.s.bbox()
		ext = math.Max(ext, math.Max(hi.X, math.Max(math.Abs(lo.Y), math.Abs(hi.Y))))
	}
	if math.IsInf(rmin, 1) {
		rmin = ext
	}
	if rmin == 0 || math.IsInf(rmin, 1) {
		rmin = 1
	}
	return rmin / 4000
}
