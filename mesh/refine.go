package mesh

import (
	"fmt"
	"math"
)

// Delaunay refinement after L. P. Chew (1989) and J. Ruppert, "A Delaunay refinement algorithm for quality
// 2-dimensional mesh generation", J. Algorithms 18 (1995), with J. R. Shewchuk's practical rules from
// "Delaunay refinement algorithms for triangular mesh generation", Comput. Geom. 22 (2002):
//   - a subsegment is encroached when a vertex lies strictly inside its diametral circle; encroached
//     subsegments are split before any triangle;
//   - a subsegment with exactly one input-vertex end is split at a power-of-two distance from that vertex
//     (concentric shells), so splits on segments meeting at a small angle land on common circles and stop
//     encroaching each other;
//   - a bad triangle's circumcentre is inserted unless it would encroach a subsegment, in which case those
//     subsegments are split instead;
//   - skinny triangles whose smallest angle is an input angle, or whose shortest edge joins two split points
//     on segments meeting at a vertex at equal distance from it (the Miller–Pav–Walkington situation), are
//     left alone, because splitting them cannot improve them and may not terminate.

// badTri is a queued triangle with its corners, to detect that its slot has been reused since.
type badTri struct {
	t, v0, v1, v2 int32
}

// Priority buckets: the upper half holds too-large triangles by the logarithm of how much too large they are,
// the lower half skinny triangles by the cosine of their smallest angle; higher buckets are served first.
const (
	numBuckets  = 4096
	sizeBuckets = numBuckets / 2
)

// badQueue is a bucketed priority queue of bad triangles (as in Shewchuk's Triangle): O(1) push and amortised
// O(1) pop, exact order only up to the bucket width, which is all refinement needs. Within a bucket the most
// recently queued triangle comes first, which keeps the working set small. The order is deterministic.
type badQueue struct {
	b   [numBuckets][]badTri
	top int // no bucket above top is non-empty
	n   int
}

func (q *badQueue) push(x badTri, bucket int) {
	q.b[bucket] = append(q.b[bucket], x)
	q.top = max(q.top, bucket)
	q.n++
}

// pop removes and returns a triangle of the highest non-empty bucket; q must not be empty.
func (q *badQueue) pop() (badTri, int) {
	for len(q.b[q.top]) == 0 {
		q.top--
	}
	l := q.b[q.top]
	x := l[len(l)-1]
	q.b[q.top] = l[:len(l)-1]
	q.n--
	return x, q.top
}

// sizeBucket maps how much too large a triangle is (ratio > 1) to a bucket: by binary exponent and the top
// four mantissa bits, so sixteen buckets per doubling.
func sizeBucket(ratio float64) int {
	k := int(math.Float64bits(ratio)>>48) - int(math.Float64bits(1)>>48)
	return sizeBuckets + max(0, min(numBuckets-sizeBuckets-1, k))
}

// refiner carries the refinement criteria.
type refiner struct {
	b       *builder
	cos2    float64 // squared cosine of the minimum angle; 0 disables angle refinement
	size    SizeFunc
	maxArea float64
	cosMin  float64 // cosine of the minimum angle
	queue   *badQueue
	stuck   map[[2]int32]bool // subsegments too short to split in floating point
}

func (b *builder) refine(opt Options) error {
	r := &refiner{b: b, size: opt.Size, maxArea: opt.MaxArea, stuck: map[[2]int32]bool{}, queue: new(badQueue)}
	ang := opt.MinAngle
	if ang == 0 {
		ang = DefaultMinAngle
	}
	if ang > 0 {
		if ang >= 60 {
			return fmt.Errorf("mesh: minimum angle %g° is not below 60°", ang)
		}
		c := math.Cos(ang * math.Pi / 180)
		r.cos2 = c * c
		r.cosMin = c
	}
	maxPts := opt.MaxPoints
	if maxPts <= 0 {
		maxPts = DefaultMaxPoints
	}
	if r.cos2 == 0 && r.size == nil && r.maxArea <= 0 {
		return nil
	}
	nt := int32(len(b.tag))
	for t := range nt {
		if b.alive(t) {
			r.check(t)
			for k := range int32(3) {
				r.checkEnc(t, k)
			}
		}
	}
	head := 0
	for {
		if len(b.pts)-3 > maxPts {
			return fmt.Errorf("%w (%d points)", ErrTooManyPoints, maxPts)
		}
		if head < len(b.enc) {
			e := b.enc[head]
			head++
			if head == len(b.enc) {
				b.enc, head = b.enc[:0], 0
			}
			r.splitSeg(e[0], e[1])
			continue
		}
		if r.queue.n == 0 {
			break
		}
		it, bucket := r.queue.pop()
		t := it.t
		if !b.alive(t) || b.tv[3*t] != it.v0 || b.tv[3*t+1] != it.v1 || b.tv[3*t+2] != it.v2 {
			continue
		}
		r.splitTri(it, bucket)
	}
	return nil
}

// check queues t if it is bad: triangles too large first (largest first), then skinny ones (worst first).
func (r *refiner) check(t int32) {
	b := r.b
	v0, v1, v2 := b.tv[3*t], b.tv[3*t+1], b.tv[3*t+2]
	p0, p1, p2 := b.pts[v0], b.pts[v1], b.pts[v2]
	// l[k] is the squared length of the edge opposite corner k.
	l := [3]float64{dist2(p1, p2), dist2(p2, p0), dist2(p0, p1)}
	key := 0.0
	if r.size != nil {
		h := r.size(Point{(p0.X + p1.X + p2.X) / 3, (p0.Y + p1.Y + p2.Y) / 3})
		if lm := max(l[0], l[1], l[2]); lm > h*h {
			key = lm / (h * h)
		}
	}
	if r.maxArea > 0 {
		if a := 0.5 * Orient2D(p0, p1, p2); a > r.maxArea {
			key = max(key, a/r.maxArea)
		}
	}
	if key > 0 {
		r.queue.push(badTri{t, v0, v1, v2}, sizeBucket(key))
		return
	}
	if r.cos2 == 0 {
		return
	}
	i := 0 // corner with the smallest angle, opposite the shortest edge
	if l[1] < l[i] {
		i = 1
	}
	if l[2] < l[i] {
		i = 2
	}
	pw := [3]Point{p0, p1, p2}
	w, u, v := pw[i], pw[nxt[i]], pw[prv[i]]
	d := (u.X-w.X)*(v.X-w.X) + (u.Y-w.Y)*(v.Y-w.Y)
	la, lb := l[prv[i]], l[nxt[i]]
	if d <= 0 || d*d <= r.cos2*la*lb {
		return
	}
	if r.exempt(t, i) {
		return
	}
	cos := d / math.Sqrt(la*lb)
	r.queue.push(badTri{t, v0, v1, v2}, max(0, min(sizeBuckets-1, int((cos-r.cosMin)/(1-r.cosMin)*sizeBuckets))))
}

// exempt reports whether skinny triangle t, with its smallest angle at corner i, must be left alone.
func (r *refiner) exempt(t int32, i int) bool {
	b := r.b
	base := 3 * t
	if b.tc[base+int32(i)] >= 0 && b.tc[base+int32(prv[i])] >= 0 {
		return true // the small angle is between two segments
	}
	p, q := b.tv[base+int32(nxt[i])], b.tv[base+int32(prv[i])]
	sp, sq := b.vseg[p], b.vseg[q]
	if sp < 0 || sq < 0 || sp == sq {
		return false
	}
	s1, s2 := b.segs[sp], b.segs[sq]
	// The vertex where the two segments meet: an end point of one lying on the other.
	for _, o := range [4]int32{s1.A, s1.B, s2.A, s2.B} {
		if b.onSeg(o, s1) && b.onSeg(o, s2) {
			dp, dq := dist2(b.pts[o], b.pts[p]), dist2(b.pts[o], b.pts[q])
			return math.Abs(dp-dq) <= 1e-3*max(dp, dq)
		}
	}
	return false
}

// onSeg reports whether vertex o is an end point of s or lies exactly on it.
func (b *builder) onSeg(o int32, s Segment) bool {
	if o == s.A || o == s.B {
		return true
	}
	pa, pb, po := b.pts[s.A], b.pts[s.B], b.pts[o]
	return Orient2D(pa, pb, po) == 0 && dot(pa, pb, po) > 0 && dot(pb, pa, po) > 0
}

func dist2(a, c Point) float64 { return (a.X-c.X)*(a.X-c.X) + (a.Y-c.Y)*(a.Y-c.Y) }

// checkEnc queues edge k of t if it is a subsegment encroached by t's opposite corner.
func (r *refiner) checkEnc(t, k int32) {
	b := r.b
	if b.tc[3*t+k] < 0 {
		return
	}
	u, v, w := b.tv[3*t+k], b.tv[3*t+int32(nxt[k])], b.tv[3*t+int32(prv[k])]
	if encroaches(b.pts[u], b.pts[v], b.pts[w]) {
		b.enc = append(b.enc, [2]int32{u, v})
	}
}

// afterInsert queues the bad triangles and encroached subsegments among the newest triangles.
func (r *refiner) afterInsert() {
	b := r.b
	for _, t := range b.newT {
		r.check(t)
		for k := range int32(3) {
			r.checkEnc(t, k)
		}
	}
}

// splitSeg splits the subsegment between vertices a and c, if it still exists, and reports whether a vertex
// was inserted. A subsegment too short to split in floating point is remembered as stuck.
func (r *refiner) splitSeg(a, c int32) bool {
	b := r.b
	t, k := b.findEdge(a, c)
	if t < 0 || b.tc[3*t+k] < 0 {
		return false
	}
	s := b.tc[3*t+k]
	pa, pc := b.pts[a], b.pts[c]
	f := 0.5
	ain, cin := a < int32(b.nIn), c < int32(b.nIn)
	if ain != cin {
		// Concentric shells: the split point's distance from the input vertex is a power of two.
		o, x := pa, pc
		if cin {
			o, x = pc, pa
		}
		L := math.Sqrt(dist2(o, x))
		d := math.Exp2(math.Round(math.Log2(L / 2)))
		fo := d / L
		if fo > 0.1 && fo < 0.9 {
			pa, pc, f = o, x, fo
		}
	}
	p := Point{pa.X + f*(pc.X-pa.X), pa.Y + f*(pc.Y-pa.Y)}
	if p != pa && p != pc && b.insert(p, -1, t, k, false, s) >= 0 {
		r.afterInsert()
		return true
	}
	r.stuck[[2]int32{a, c}], r.stuck[[2]int32{c, a}] = true, true
	return false
}

// splitTri inserts the circumcentre of a bad triangle or, as in Ruppert's algorithm, splits the subsegments
// that stand in its way: the one that blocks the walk from the triangle to its circumcentre (the centre lies
// beyond it, or on it), or those whose diametral circles the centre would encroach. The triangle is queued
// again only when some vertex was inserted, so every retry is paid for by progress and refinement ends.
func (r *refiner) splitTri(it badTri, bucket int) {
	b := r.b
	t := it.t
	p0, p1, p2 := b.pts[it.v0], b.pts[it.v1], b.pts[it.v2]
	c, ok := circumcenter(p0, p1, p2)
	if !ok {
		return
	}
	tt, loc, k := b.walk(c, t, true)
	switch loc {
	case locVertex:
		return
	case locBlocked, locEdge:
		if loc == locBlocked || b.tc[3*tt+k] >= 0 {
			u, v := b.tv[3*tt+k], b.tv[3*tt+int32(nxt[k])]
			if !r.stuck[[2]int32{u, v}] && r.splitSeg(u, v) {
				r.requeue(it, bucket)
			}
			return
		}
	case locInside:
		k = -1
	}
	n0 := len(b.enc)
	if b.insert(c, -1, tt, k, true, -1) >= 0 {
		r.afterInsert()
		return
	}
	// Split the encroached subsegments now (later ones may have gone with earlier splits).
	split := false
	n1 := len(b.enc)
	for i := n0; i < n1; i++ {
		e := b.enc[i]
		if !r.stuck[e] && r.splitSeg(e[0], e[1]) {
			split = true
		}
	}
	// Keep only what the splits themselves found encroached.
	b.enc = b.enc[:n0+copy(b.enc[n0:], b.enc[n1:])]
	if split {
		r.requeue(it, bucket)
	}
}

// requeue queues it again, in the same bucket, if its triangle is still there.
func (r *refiner) requeue(it badTri, bucket int) {
	b := r.b
	if t := it.t; b.alive(t) && b.tv[3*t] == it.v0 && b.tv[3*t+1] == it.v1 && b.tv[3*t+2] == it.v2 {
		r.queue.push(it, bucket)
	}
}

// circumcenter returns the centre of the circle through a, b, c; false for a degenerate triangle.
func circumcenter(a, b, c Point) (Point, bool) {
	bx, by := b.X-a.X, b.Y-a.Y
	cx, cy := c.X-a.X, c.Y-a.Y
	d := 2 * (bx*cy - by*cx)
	if d == 0 {
		return Point{}, false
	}
	b2, c2 := bx*bx+by*by, cx*cx+cy*cy
	p := Point{a.X + (cy*b2-by*c2)/d, a.Y + (bx*c2-cx*b2)/d}
	if math.IsInf(p.X, 0) || math.IsInf(p.Y, 0) || math.IsNaN(p.X) || math.IsNaN(p.Y) {
		return Point{}, false
	}
	return p, true
}
