package fem

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"

	"eddyrz/fem/sparse"
)

// Override replaces the conductivity and relative permeability of the region with the given tag for one solve
// (a sweep over temperature, say). Sigma in S/m; MuR 0 means 1.
type Override struct {
	Tag   int32
	Sigma float64
	MuR   float64
}

// Assembler owns the numbering, the sparse pattern and the frequency-independent pieces of the harmonic system
//
//	(K + jω M + Q/(jω)) x = r0 + jω r1 + r2/(jω),
//
// where K holds the reluctivity terms and the circuit couplings, M the conductivity mass terms and Q the turn
// conductances and the 1/(jω)-scaled circuit entries. A new frequency only recombines these real arrays; a new
// σ or μr re-integrates the element values into the same pattern (a scatter through the recorded slot map).
// An Assembler is not safe for concurrent use; build one per goroutine for parallel sweeps.
type Assembler struct {
	prob   Problem // shallow copy; Regions copied so overrides never touch the caller's
	order  Order
	rules  Rules
	nloc   int
	elemRg []int // region index per triangle, -1 for air
	areas  []float64

	axis  []bool       // node lies on r = 0
	eq    []int        // equation index per mesh node, -1 where A is prescribed
	fixed []complex128 // prescribed A per node (valid where eq < 0), Wb/m rms
	nNode int          // number of free node unknowns (they come first)
	turnE []int        // per region: equation index of its loop voltage U (SolidTurn), else -1
	coilE []int        // per coil: equation index of its current (VoltageDrive), else -1
	n     int

	pat        *sparse.Matrix // pattern (Val unused)
	slot       []int
	elemStart  []int // first slot-map index of each triangle's entries
	edgeStart  int   // first slot-map index of the outer-edge entries
	kv, mv, qv []float64
	r0, r1, r2 []complex128
	// per-triangle σ (S/m) and μr, nil or NaN where the region's value holds (elementwise.go)
	elemSigma, elemMur []float64
}

// NewAssembler validates p, numbers the unknowns, builds the pattern and assembles the values.
func NewAssembler(p *Problem) (*Assembler, error) {
	if err := validate(p); err != nil {
		return nil, err
	}
	a := &Assembler{prob: *p, rules: DefaultRules()}
	a.prob.Regions = append([]Region(nil), p.Regions...)
	m := p.Mesh
	a.order = 1
	if m.Mid != nil {
		a.order = 2
	}
	a.nloc = a.order.NumNodes()
	byTag := map[int32]int{}
	for i, r := range p.Regions {
		byTag[r.Tag] = i
	}
	a.elemRg = make([]int, len(m.Tris))
	a.areas = make([]float64, len(p.Regions))
	for t := range m.Tris {
		ri, ok := byTag[m.Tags[t]]
		if !ok {
			ri = -1
		}
		a.elemRg[t] = ri
		ar, _ := triGeom(a.corners(t))
		if ar <= 0 {
			return nil, fmt.Errorf("triangle %d has non-positive area %g m² (corners must be counter-clockwise)", t, ar)
		}
		if ri >= 0 {
			a.areas[ri] += ar
		}
	}
	if err := a.number(); err != nil {
		return nil, err
	}
	// Room for every element's lower triangle and circuit column, every diagonal and some boundary terms, so that
	// the triplet lists are not regrown (and copied) on the way.
	tr := sparse.NewTriplet(a.n, len(m.Tris)*(a.nloc*(a.nloc+1)/2+a.nloc+1)+a.n+4096)
	a.elemStart = make([]int, len(m.Tris)+1)
	ps := &patternSink{tr: tr}
	sc := newScratch(a.nloc)
	for t := range m.Tris {
		a.elemStart[t] = tr.Len()
		a.triangle(t, ps, sc, true)
	}
	a.elemStart[len(m.Tris)] = tr.Len()
	a.edgeStart = tr.Len()
	a.edges(ps)
	a.globals(ps)
	// Every unknown gets a diagonal entry, so the pattern is structurally complete.
	for i := range a.n {
		tr.Add(i, i, 0)
	}
	a.pat, a.slot = tr.Compile()
	a.assemble()
	return a, nil
}

// validate checks the problem's data; errors name the offending region or coil.
func validate(p *Problem) error {
	if p.Mesh == nil || len(p.Mesh.Tris) == 0 {
		return errors.New("problem has no mesh")
	}
	if len(p.Mesh.Tags) != len(p.Mesh.Tris) {
		return fmt.Errorf("mesh has %d triangles but %d tags", len(p.Mesh.Tris), len(p.Mesh.Tags))
	}
	if p.Mesh.Mid != nil && len(p.Mesh.Mid) != len(p.Mesh.Tris) {
		return fmt.Errorf("mesh has %d triangles but %d midpoint triples", len(p.Mesh.Tris), len(p.Mesh.Mid))
	}
	if err := checkFrequency(p.Frequency); err != nil {
		return err
	}
	if p.Outer.Robin && !(p.Outer.Radius > 0) {
		return fmt.Errorf("Robin outer boundary needs a positive radius, got %g m", p.Outer.Radius)
	}
	if p.Outer.Robin {
		// The Robin term assumes the boundary is the stated circle; a mismatch would silently bias every answer.
		for _, e := range p.Mesh.Edges {
			if e.Tag != OuterTag {
				continue
			}
			for _, v := range []int32{e.A, e.B} {
				q := p.Mesh.Nodes[v]
				if d := math.Hypot(q.X, q.Y-p.Outer.CenterZ); math.Abs(d-p.Outer.Radius) > 1e-6*p.Outer.Radius {
					return fmt.Errorf("outer boundary node at (%g, %g) m is %g m from (0, %g), not on the Robin circle of radius %g m",
						q.X, q.Y, d, p.Outer.CenterZ, p.Outer.Radius)
				}
			}
		}
	}
	used := make([]bool, len(p.Coils))
	for _, r := range p.Regions {
		if err := checkRegion(r, len(p.Coils)); err != nil {
			return fmt.Errorf("region %q (tag %d): %w", r.Name, r.Tag, err)
		}
		if r.Kind == SolidTurn || r.Kind == Stranded {
			used[r.Coil] = true
		}
	}
	for i, c := range p.Coils {
		if !used[i] {
			return fmt.Errorf("coil %q has no turns or winding blocks", c.Name)
		}
	}
	return nil
}

func checkFrequency(f float64) error {
	if !(f > 0) || math.IsInf(f, 0) {
		return fmt.Errorf("frequency must be positive and finite, got %g Hz; for a DC-like answer use a low frequency such as 1 Hz", f)
	}
	return nil
}

func checkRegion(r Region, nCoils int) error {
	if r.MuR < 0 || math.IsNaN(r.MuR) || (r.MuR > 0 && r.MuR < 1e-6) {
		return fmt.Errorf("relative permeability %g is not usable", r.MuR)
	}
	if r.Sigma < 0 || math.IsNaN(r.Sigma) || math.IsInf(r.Sigma, 0) {
		return fmt.Errorf("conductivity %g S/m is not usable", r.Sigma)
	}
	switch r.Kind {
	case Air, Part:
	case SolidTurn, Stranded:
		if r.Coil < 0 || r.Coil >= nCoils {
			return fmt.Errorf("coil index %d out of range (%d coils)", r.Coil, nCoils)
		}
		if r.Sense != 1 && r.Sense != -1 {
			return fmt.Errorf("winding sense must be +1 or -1, got %d", r.Sense)
		}
		if r.Kind == SolidTurn && !(r.Sigma > 0) {
			return errors.New("a solid turn needs a positive conductivity")
		}
		if r.Kind == Stranded && r.Strands < 1 {
			return fmt.Errorf("a stranded block needs at least one turn, got %d", r.Strands)
		}
		if r.Kind == Stranded && (r.Rdc < 0 || math.IsNaN(r.Rdc)) {
			return fmt.Errorf("stranded block resistance %g Ω is not usable", r.Rdc)
		}
	default:
		return fmt.Errorf("unknown region kind %d", r.Kind)
	}
	return nil
}

func (a *Assembler) corners(t int) [3][2]float64 {
	m := a.prob.Mesh
	var p [3][2]float64
	for k, v := range m.Tris[t] {
		p[k] = [2]float64{m.Nodes[v].X, m.Nodes[v].Y}
	}
	return p
}

// nodes writes the element's node indices (corners, then midpoints) into nd.
func (a *Assembler) nodes(t int, nd []int) {
	m := a.prob.Mesh
	for k, v := range m.Tris[t] {
		nd[k] = int(v)
	}
	if a.order == 2 {
		for k, v := range m.Mid[t] {
			nd[3+k] = int(v)
		}
	}
}

// number decides which node values are prescribed and gives every unknown its equation index: free nodes
// first, then turn voltages, then currents of voltage-driven coils.
func (a *Assembler) number() error {
	m := a.prob.Mesh
	nn := len(m.Nodes)
	a.eq = make([]int, nn)
	a.fixed = make([]complex128, nn)
	var rmax float64
	for _, p := range m.Nodes {
		rmax = max(rmax, math.Abs(p.X))
	}
	onAxis := make([]bool, nn)
	onOuter := make([]bool, nn)
	for _, e := range m.Edges {
		var mark []bool
		switch e.Tag {
		case AxisTag:
			mark = onAxis
		case OuterTag:
			mark = onOuter
		default:
			continue
		}
		mark[e.A], mark[e.B] = true, true
		if e.M >= 0 {
			mark[e.M] = true
		}
	}
	for i, p := range m.Nodes {
		if p.X < -1e-12*rmax {
			return fmt.Errorf("node %d at r = %g m lies left of the axis", i, p.X)
		}
		if p.X <= 1e-12*rmax {
			onAxis[i] = true
		}
	}
	a.axis = onAxis
	bz := a.prob.AppliedBz
	for i := range nn {
		switch {
		case onAxis[i]:
			a.eq[i] = -1
		case onOuter[i] && !a.prob.Outer.Robin:
			a.eq[i] = -1
			a.fixed[i] = bz * complex(m.Nodes[i].X/2, 0)
		default:
			a.eq[i] = a.nNode
			a.nNode++
		}
	}
	a.n = a.nNode
	a.turnE = make([]int, len(a.prob.Regions))
	for i, r := range a.prob.Regions {
		a.turnE[i] = -1
		if r.Kind == SolidTurn {
			a.turnE[i] = a.n
			a.n++
		}
	}
	a.coilE = make([]int, len(a.prob.Coils))
	for i, c := range a.prob.Coils {
		a.coilE[i] = -1
		if c.Drive == VoltageDrive {
			a.coilE[i] = a.n
			a.n++
		}
	}
	// A solid turn touching the axis would have infinite DC conductance.
	for t := range m.Tris {
		ri := a.elemRg[t]
		if ri < 0 || a.prob.Regions[ri].Kind != SolidTurn {
			continue
		}
		for _, v := range m.Tris[t] {
			if onAxis[v] {
				r := a.prob.Regions[ri]
				return fmt.Errorf("region %q (tag %d): a solid turn must not touch the axis", r.Name, r.Tag)
			}
		}
	}
	return nil
}

// sink receives the system's entries. Matrix entries (i, j) come with their K, M and Q parts (the value is
// k + jωm + q/(jω)); right-hand-side entries with their r0, r1, r2 parts. The pattern pass and the value pass
// call mat under exactly the same conditions, so the k-th call of each refers to the same slot.
type sink interface {
	mat(i, j int, k, m, q float64)
	rhs(i int, r0, r1, r2 complex128)
}

type patternSink struct{ tr *sparse.Triplet }

func (s *patternSink) mat(i, j int, _, _, _ float64)               { s.tr.Add(i, j, 0) }
func (s *patternSink) rhs(int, complex128, complex128, complex128) {}

// valueSink accumulates values into its own arrays, starting at slot-map position next.
type valueSink struct {
	slot       []int
	next       int
	kv, mv, qv []float64
	r0, r1, r2 []complex128
}

func (s *valueSink) mat(_, _ int, k, m, q float64) {
	p := s.slot[s.next]
	s.next++
	s.kv[p] += k
	s.mv[p] += m
	s.qv[p] += q
}

func (s *valueSink) rhs(i int, r0, r1, r2 complex128) {
	s.r0[i] += r0
	s.r1[i] += r1
	s.r2[i] += r2
}

// entry routes a matrix entry between two global unknowns, each either an equation index (≥ 0) or a prescribed
// node (eq < 0, value g): free-free entries go to the matrix (once, in the lower triangle), free-prescribed ones
// move to the right-hand side, prescribed rows are dropped.
func entry(s sink, ei, ej int, gj complex128, k, m, q float64) {
	switch {
	case ei < 0:
	case ej >= 0:
		if ei >= ej {
			s.mat(ei, ej, k, m, q)
		}
	case gj != 0:
		s.rhs(ei, -complex(k, 0)*gj, -complex(m, 0)*gj, -complex(q, 0)*gj)
	}
}

// elemScratch holds one worker's per-element buffers.
type elemScratch struct {
	nd        []int
	n, dr, dz []float64
	ke, me    []float64
	c, b      []float64
}

func newScratch(nloc int) *elemScratch {
	return &elemScratch{
		nd: make([]int, nloc), n: make([]float64, nloc), dr: make([]float64, nloc), dz: make([]float64, nloc),
		ke: make([]float64, nloc*nloc), me: make([]float64, nloc*nloc), c: make([]float64, nloc),
		b: make([]float64, nloc),
	}
}

func (a *Assembler) nu(ri int) float64 {
	mur := 1.0
	if ri >= 0 && a.prob.Regions[ri].MuR > 0 {
		mur = a.prob.Regions[ri].MuR
	}
	return 1 / (Mu0 * mur)
}

// rule returns the quadrature rule for triangle t.
func (a *Assembler) rule(t int) *QuadRule {
	for _, v := range a.prob.Mesh.Tris[t] {
		if a.axis[v] {
			return &a.rules.Axis
		}
	}
	return &a.rules.Interior
}

// integrate computes the element arrays of triangle t into sc (nodes in sc.nd): ke (reluctivity), me
// (conductivity mass), c (turn coupling ∫σφ dr dz), b (stranded source ∫(N s/area)φ 2πr dr dz) and returns
// the turn conductance ∫σ/(2πr) dr dz (0 outside solid turns).
func (a *Assembler) integrate(t int, sc *elemScratch) (gTurn float64) {
	nl := a.nloc
	a.nodes(t, sc.nd)
	ri := a.elemRg[t]
	var reg Region
	if ri >= 0 {
		reg = a.regionAt(t, ri)
	}
	eddy := (reg.Kind == SolidTurn || reg.Kind == Part) && reg.Sigma > 0
	clear(sc.ke)
	clear(sc.me)
	clear(sc.c)
	clear(sc.b)
	area, gl := triGeom(a.corners(t))
	p := a.corners(t)
	nu := reluctivity(reg.MuR)
	q := a.rule(t)
	for g, l := range q.L {
		r := l[0]*p[0][0] + l[1]*p[1][0] + l[2]*p[2][0]
		w := q.W[g] * area
		wr := w * 2 * math.Pi * r
		a.order.Shape(l, sc.n)
		a.order.ShapeGrad(l, gl, sc.dr, sc.dz)
		for i := range nl {
			bi := sc.dr[i] + sc.n[i]/r
			for j := range nl {
				sc.ke[i*nl+j] += nu * wr * (sc.dz[i]*sc.dz[j] + bi*(sc.dr[j]+sc.n[j]/r))
			}
		}
		if eddy {
			for i := range nl {
				for j := range nl {
					sc.me[i*nl+j] += reg.Sigma * wr * sc.n[i] * sc.n[j]
				}
			}
		}
		if reg.Kind == SolidTurn {
			for i := range nl {
				sc.c[i] += reg.Sigma * w * sc.n[i]
			}
			gTurn += reg.Sigma * w / (2 * math.Pi * r)
		}
		if reg.Kind == Stranded {
			js := float64(reg.Strands*reg.Sense) / a.areas[ri]
			for i := range nl {
				sc.b[i] += js * wr * sc.n[i]
			}
		}
	}
	return gTurn
}

// triangle emits the entries of triangle t. In the pattern pass it only emits positions (values are zero).
func (a *Assembler) triangle(t int, s sink, sc *elemScratch, pattern bool) {
	nl := a.nloc
	a.nodes(t, sc.nd)
	ri := a.elemRg[t]
	var reg Region
	if ri >= 0 {
		reg = a.prob.Regions[ri]
	}
	var gTurn float64
	if pattern {
		clear(sc.ke)
		clear(sc.me)
		clear(sc.c)
		clear(sc.b)
	} else {
		gTurn = a.integrate(t, sc)
	}
	for i := range nl {
		ei := a.eq[sc.nd[i]]
		for j := range nl {
			vj := sc.nd[j]
			entry(s, ei, a.eq[vj], a.fixed[vj], sc.ke[i*nl+j], sc.me[i*nl+j], 0)
		}
	}
	switch reg.Kind {
	case SolidTurn:
		// Field rows: −c_i U; turn row: −cᵀA + (G/jω) U (physics.md, symmetric bordered form).
		u := a.turnE[ri]
		for i := range nl {
			v := sc.nd[i]
			entry(s, u, a.eq[v], a.fixed[v], -sc.c[i], 0, 0)
		}
		entry(s, u, u, 0, 0, 0, gTurn)
	case Stranded:
		cur := a.coilE[reg.Coil]
		if cur >= 0 {
			// Field rows: −b_i I; voltage row (divided by −jω): −bᵀA.
			for i := range nl {
				v := sc.nd[i]
				entry(s, cur, a.eq[v], a.fixed[v], -sc.b[i], 0, 0)
			}
		} else if !pattern {
			I := a.prob.Coils[reg.Coil].Value
			for i := range nl {
				if e := a.eq[sc.nd[i]]; e >= 0 {
					s.rhs(e, complex(sc.b[i], 0)*I, 0, 0)
				}
			}
		}
	}
}

// edges emits the Robin terms of the outer boundary: (ν0/R)∮ A v dS on the left and the applied field's part
// (3/2)ν0 B0 ∮ (r/R) v dS on the right. On a circle of radius R about the centre, a dipole's A_φ = C sinθ/ρ²
// has B_θ = A_φ/R; the applied uniform field has A = B0 ρ sinθ/2 and B_θ = −B0 sinθ. So the total
// B_θ = A/R − (3/2) B0 sinθ, sinθ = r/R, and the weak form's boundary term ∮ ν B_θ v dS splits as above.
func (a *Assembler) edges(s sink) {
	if !a.prob.Outer.Robin {
		return
	}
	m := a.prob.Mesh
	R := a.prob.Outer.Radius
	nu0 := 1 / Mu0
	ne := 2
	if a.order == 2 {
		ne = 3
	}
	nd := make([]int, ne)
	sh := make([]float64, ne)
	ke := make([]float64, ne*ne)
	fe := make([]float64, ne)
	for _, e := range m.Edges {
		if e.Tag != OuterTag {
			continue
		}
		nd[0], nd[1] = int(e.A), int(e.B)
		if ne == 3 {
			nd[2] = int(e.M)
		}
		pa, pb := m.Nodes[e.A], m.Nodes[e.B]
		length := math.Hypot(pb.X-pa.X, pb.Y-pa.Y)
		clear(ke)
		clear(fe)
		for g, t := range gauss5.X {
			r := pa.X + t*(pb.X-pa.X)
			w := gauss5.W[g] * length * 2 * math.Pi * r
			edgeShape(a.order, t, sh)
			for i := range ne {
				fe[i] += 1.5 * nu0 * (r / R) * w * sh[i]
				for j := range ne {
					ke[i*ne+j] += nu0 / R * w * sh[i] * sh[j]
				}
			}
		}
		for i := range ne {
			ei := a.eq[nd[i]]
			for j := range ne {
				entry(s, ei, a.eq[nd[j]], a.fixed[nd[j]], ke[i*ne+j], 0, 0)
			}
			if ei >= 0 {
				s.rhs(ei, complex(fe[i], 0)*a.prob.AppliedBz, 0, 0)
			}
		}
	}
}

// globals emits the circuit entries that belong to no element: turn current sources, the voltage row's
// diagonal and its couplings to the turn voltages.
func (a *Assembler) globals(s sink) {
	for ri, r := range a.prob.Regions {
		u := a.turnE[ri]
		if u < 0 {
			continue
		}
		c := a.prob.Coils[r.Coil]
		if cur := a.coilE[r.Coil]; cur >= 0 {
			// Turn row: … − s_k I/(jω) = 0; voltage row: … − s_k U_k/(jω).
			entry(s, cur, u, 0, 0, 0, -float64(r.Sense))
		} else {
			s.rhs(u, 0, 0, complex(float64(r.Sense), 0)*c.Value)
		}
	}
	for ci, c := range a.prob.Coils {
		cur := a.coilE[ci]
		if cur < 0 {
			continue
		}
		var rdc float64
		for _, r := range a.prob.Regions {
			if r.Kind == Stranded && r.Coil == ci {
				rdc += r.Rdc
			}
		}
		// Voltage row divided by −jω: … − Rdc I/(jω) = −V/(jω).
		entry(s, cur, cur, 0, 0, 0, -rdc)
		s.rhs(cur, 0, 0, -c.Value)
	}
}

// assemble (re)computes all values into the fixed pattern, in parallel over chunks of triangles; each worker
// accumulates into its own arrays, summed at the end.
func (a *Assembler) assemble() {
	a.assembleWith(min(runtime.GOMAXPROCS(0), max(1, len(a.prob.Mesh.Tris)/2000)))
}

func (a *Assembler) assembleWith(workers int) {
	nnz := a.pat.Nnz()
	newSink := func(next int) *valueSink {
		return &valueSink{slot: a.slot, next: next, kv: make([]float64, nnz), mv: make([]float64, nnz),
			qv: make([]float64, nnz), r0: make([]complex128, a.n), r1: make([]complex128, a.n),
			r2: make([]complex128, a.n)}
	}
	nt := len(a.prob.Mesh.Tris)
	sinks := make([]*valueSink, workers)
	var wg sync.WaitGroup
	for w := range workers {
		lo, hi := nt*w/workers, nt*(w+1)/workers
		sinks[w] = newSink(a.elemStart[lo])
		wg.Go(func() {
			sc := newScratch(a.nloc)
			for t := lo; t < hi; t++ {
				a.triangle(t, sinks[w], sc, false)
			}
		})
	}
	wg.Wait()
	s0 := sinks[0]
	s0.next = a.edgeStart
	a.edges(s0)
	a.globals(s0)
	for _, s := range sinks[1:] {
		for p := range nnz {
			s0.kv[p] += s.kv[p]
			s0.mv[p] += s.mv[p]
			s0.qv[p] += s.qv[p]
		}
		for i := range a.n {
			s0.r0[i] += s.r0[i]
			s0.r1[i] += s.r1[i]
			s0.r2[i] += s.r2[i]
		}
	}
	a.kv, a.mv, a.qv, a.r0, a.r1, a.r2 = s0.kv, s0.mv, s0.qv, s0.r0, s0.r1, s0.r2
}

// SetMaterials applies overrides (by region tag) and re-assembles the values into the existing pattern.
// Changing a region's kind or a coil's wiring needs a new Assembler.
func (a *Assembler) SetMaterials(ov ...Override) error {
	for _, o := range ov {
		found := false
		for i := range a.prob.Regions {
			r := &a.prob.Regions[i]
			if r.Tag != o.Tag {
				continue
			}
			found = true
			nr := *r
			nr.Sigma, nr.MuR = o.Sigma, o.MuR
			if err := checkRegion(nr, len(a.prob.Coils)); err != nil {
				return fmt.Errorf("override of region %q (tag %d): %w", r.Name, r.Tag, err)
			}
			*r = nr
		}
		if !found {
			return fmt.Errorf("override: no region with tag %d", o.Tag)
		}
	}
	a.assemble()
	return nil
}

// Size returns the number of unknowns and of stored (lower-triangle) matrix entries.
func (a *Assembler) Size() (unknowns, nonzeros int) { return a.n, a.pat.Nnz() }

// System returns the matrix and right-hand side at frequency f (Hz), fresh arrays sharing the pattern.
func (a *Assembler) System(f float64) (*sparse.Matrix, []complex128) {
	m := &sparse.Matrix{N: a.pat.N, ColPtr: a.pat.ColPtr, RowIdx: a.pat.RowIdx, Val: make([]complex128, a.pat.Nnz())}
	b := make([]complex128, a.n)
	a.systemInto(f, m, b)
	return m, b
}

// systemInto is System writing into m (which must have the assembler's pattern, as System returns it) and b.
func (a *Assembler) systemInto(f float64, m *sparse.Matrix, b []complex128) {
	w := 2 * math.Pi * f
	jw := complex(0, w)
	ijw := 1 / jw
	for p := range m.Val {
		m.Val[p] = complex(a.kv[p], w*a.mv[p]-a.qv[p]/w)
	}
	for i := range b {
		b[i] = a.r0[i] + jw*a.r1[i] + ijw*a.r2[i]
	}
}

// Coords returns each unknown's (r, z) for the fill-reducing ordering, NaN for circuit unknowns.
func (a *Assembler) Coords() [][2]float64 {
	c := make([][2]float64, a.n)
	for i := a.nNode; i < a.n; i++ {
		c[i] = [2]float64{math.NaN(), math.NaN()}
	}
	for v, e := range a.eq {
		if e >= 0 {
			p := a.prob.Mesh.Nodes[v]
			c[e] = [2]float64{p.X, p.Y}
		}
	}
	return c
}
