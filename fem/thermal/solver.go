package thermal

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"eddyrz/mesh"
)

// ErrNotConverged is returned (wrapped) by Step when the Newton iterations do not reach the tolerance even after
// the step has been split 10 times; the solver's state is left at the start of the step.
var ErrNotConverged = errors.New("thermal: Newton iterations did not converge")

// StepInfo reports one time step.
type StepInfo struct {
	Time       float64 // time at the end of the step, s
	Iterations int     // Newton iterations
	CGIter     int     // conjugate-gradient iterations, summed over the Newton iterations
	Residual   float64 // final ‖R‖₁ relative to the energy flows of the step (largest over the substeps)
	Substeps   int     // backward-Euler steps taken: 1, or more when a step had to be split to converge
	MaxChange  float64 // largest |ΔT| of a node over the step, K
}

// Energy is the cumulative energy bookkeeping since the solver was created, J. Stored includes latent heat.
// In a converged run Stored ≈ Source + FluxIn − Convection − Radiation.
type Energy struct {
	Source     float64 // volumetric heat input, ∫∫ q dV dt
	FluxIn     float64 // prescribed boundary flux into the parts
	Convection float64 // convective loss (negative when the fluid heats the part)
	Radiation  float64 // radiative loss
	Stored     float64 // rise of the enthalpy content of the parts
}

// element is a part triangle with its precomputed geometry.
type element struct {
	n   [3]int32      // local node numbers
	mat int32         // index into Solver.mats
	tri int32         // triangle index in the mesh (for per-element sources)
	g   [3][3]float64 // 2π r̄ A ∇φa·∇φb, m: times k gives the conduction matrix, W/K
	w   [3]float64    // ∫ φa 2πr dA, m³: lumped volume and source weight of each corner
	pos [9]int32      // positions of the 3×3 block in the matrix
}

// Solver advances the temperature of the parts in time. It is not safe for concurrent use, but separate Solvers
// are independent.
type Solver struct {
	model  Model
	global []int32 // local node → mesh node
	local  []int32 // mesh node → local node, −1 outside the parts
	elems  []element
	elemOf []int32 // mesh triangle → element, −1 outside the parts
	loc    *mesh.Locator
	mats   []Material
	tabs   []*enthalpy
	// Volume of each node per material: entries capStart[i]..capStart[i+1] of capMat/capVol.
	capStart []int32
	capMat   []int32
	capVol   []float64 // m³
	// Solidus and liquidus temperatures of the melting materials at each node (K): entries kinkStart[i]..kinkStart[i+1].
	kinkStart []int32
	kinks     []float64
	// Boundary coefficients gathered per node: Σw·h (W/K), Σw·h·T_amb (W), Σw·ε·σ (W/K⁴), Σw·ε·σ·T_sur⁴ (W), Σw·flux (W).
	bH, bHT, bE, bET4, bF []float64
	tol                   float64
	maxIter               int

	a   *csr
	pre ic0
	cg  cgWork
	// chol is a sparse Cholesky factor of a recent Newton matrix, the CG preconditioner while it keeps the
	// iterations few (nil when the pattern could not be analysed: then IC(0) of every Newton matrix is used).
	chol *cholesky

	e, e0, t []float64 // node energy (J), initial node energy (J), temperature (K)
	rate     []float64 // dE/dt of each node over the last step, W (the next step's predictor)
	havePrev bool
	time     float64
	energy   Energy

	// scratch, one slot per node
	eOld, tOld, tStep, q, r, rTry, y, eTry, tTry, c, cTry, kt []float64
}

// NewSolver prepares a solver for m with initial temperature T0 in kelvin: one value for a uniform start, or one
// per mesh node (len(Mesh.Nodes) or Mesh.NumVertices). The solver keeps m; do not change it afterwards.
func NewSolver(m Model, T0 []float64) (*Solver, error) {
	if m.Mesh == nil {
		return nil, errors.New("thermal: model has no mesh")
	}
	if len(m.Materials) == 0 {
		return nil, errors.New("thermal: model has no materials")
	}
	msh := m.Mesh
	s := &Solver{model: m, tol: m.Tolerance, maxIter: m.MaxIterations}
	if s.tol == 0 {
		s.tol = 1e-10
	}
	if s.maxIter == 0 {
		s.maxIter = 30
	}
	tags := make([]int32, 0, len(m.Materials))
	for tag := range m.Materials {
		tags = append(tags, tag)
	}
	sort.Slice(tags, func(i, j int) bool { return tags[i] < tags[j] })
	matIndex := make(map[int32]int32, len(tags))
	for i, tag := range tags {
		mat := m.Materials[tag]
		if mat == nil {
			return nil, fmt.Errorf("thermal: region %d: nil material", tag)
		}
		tab, err := newEnthalpy(mat)
		if err != nil {
			return nil, fmt.Errorf("thermal: region %d: %w", tag, err)
		}
		matIndex[tag] = int32(i)
		s.mats = append(s.mats, mat)
		s.tabs = append(s.tabs, tab)
	}

	// Local numbering: the mesh corners used by part triangles, in mesh order.
	s.local = make([]int32, len(msh.Nodes))
	for i := range s.local {
		s.local[i] = -1
	}
	for t, tri := range msh.Tris {
		if _, ok := matIndex[msh.Tags[t]]; ok {
			for _, v := range tri {
				s.local[v] = 0
			}
		}
	}
	for v, l := range s.local {
		if l == 0 {
			s.local[v] = int32(len(s.global))
			s.global = append(s.global, int32(v))
		}
	}
	n := len(s.global)
	if n == 0 {
		return nil, errors.New("thermal: no mesh triangle belongs to a region with a material")
	}

	// Elements and the per-node, per-material volumes.
	type nodeMat struct{ node, mat int32 }
	vol := make(map[nodeMat]float64)
	var conn [][3]int32
	for t, tri := range msh.Tris {
		mi, ok := matIndex[msh.Tags[t]]
		if !ok {
			continue
		}
		el := element{mat: mi, tri: int32(t)}
		var r, z [3]float64
		for k, v := range tri {
			el.n[k] = s.local[v]
			r[k], z[k] = msh.Nodes[v].X, msh.Nodes[v].Y
			if r[k] < 0 {
				return nil, fmt.Errorf("thermal: triangle %d: node %d at r = %g m < 0", t, v, r[k])
			}
		}
		area := 0.5 * ((r[1]-r[0])*(z[2]-z[0]) - (r[2]-r[0])*(z[1]-z[0]))
		if !(area > 0) {
			return nil, fmt.Errorf("thermal: triangle %d: area %g m² (must be counter-clockwise and non-degenerate)", t, area)
		}
		rsum := r[0] + r[1] + r[2]
		var gr, gz [3]float64 // gradients of the shape functions times 2A
		for a := 0; a < 3; a++ {
			b, c := (a+1)%3, (a+2)%3
			gr[a], gz[a] = z[b]-z[c], r[c]-r[b]
			el.w[a] = 2 * math.Pi * area * (r[a] + rsum) / 12
			vol[nodeMat{el.n[a], mi}] += el.w[a]
		}
		f := 2 * math.Pi * (rsum / 3) / (4 * area)
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				el.g[a][b] = f * (gr[a]*gr[b] + gz[a]*gz[b])
			}
		}
		s.elems = append(s.elems, el)
		conn = append(conn, el.n)
	}
	keys := make([]nodeMat, 0, len(vol))
	for k := range vol {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if keys[i].node != keys[j].node {
			return keys[i].node < keys[j].node
		}
		return keys[i].mat < keys[j].mat
	})
	s.capStart = make([]int32, n+1)
	for _, k := range keys {
		s.capMat = append(s.capMat, k.mat)
		s.capVol = append(s.capVol, vol[k])
		s.capStart[k.node+1]++
	}
	for i := 0; i < n; i++ {
		s.capStart[i+1] += s.capStart[i]
	}

	s.elemOf = make([]int32, len(msh.Tris))
	for i := range s.elemOf {
		s.elemOf[i] = -1
	}
	for ei, el := range s.elems {
		s.elemOf[el.tri] = int32(ei)
	}
	s.loc = msh.Index()

	s.kinkStart = make([]int32, n+1)
	for i := 0; i < n; i++ {
		for p := s.capStart[i]; p < s.capStart[i+1]; p++ {
			if tab := s.tabs[s.capMat[p]]; !math.IsInf(tab.solidus, 1) {
				s.kinks = append(s.kinks, tab.solidus, tab.solidus+tab.width)
			}
		}
		s.kinkStart[i+1] = int32(len(s.kinks))
	}

	s.a = newCSR(n, conn)
	for i := range s.elems {
		el := &s.elems[i]
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				el.pos[3*a+b] = s.a.pos(el.n[a], el.n[b])
			}
		}
	}

	coords := make([][2]float64, n)
	for i, v := range s.global {
		coords[i] = [2]float64{msh.Nodes[v].X, msh.Nodes[v].Y}
	}
	if c, err := newCholesky(s.a, coords); err == nil {
		s.chol = c
	}

	if err := s.setBoundary(m.Boundary); err != nil {
		return nil, err
	}

	s.t = make([]float64, n)
	switch len(T0) {
	case 1:
		for i := range s.t {
			s.t[i] = T0[0]
		}
	case len(msh.Nodes), msh.NumVertices:
		for i, v := range s.global {
			s.t[i] = T0[v]
		}
	default:
		return nil, fmt.Errorf("thermal: %d initial temperatures for a mesh of %d nodes (%d vertices)",
			len(T0), len(msh.Nodes), msh.NumVertices)
	}
	s.e = make([]float64, n)
	for i, T := range s.t {
		if !(T > 0) || math.IsInf(T, 0) {
			return nil, fmt.Errorf("thermal: initial temperature %g K at node %d", T, s.global[i])
		}
		s.e[i], _ = s.nodeEnergy(i, T)
	}
	s.e0 = append([]float64(nil), s.e...)
	s.tOld, s.tStep, s.rate = make([]float64, n), make([]float64, n), make([]float64, n)
	s.eOld, s.q, s.r, s.rTry = make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	s.y, s.eTry, s.tTry = make([]float64, n), make([]float64, n), make([]float64, n)
	s.c, s.cTry, s.kt = make([]float64, n), make([]float64, n), make([]float64, n)
	return s, nil
}

func (s *Solver) setBoundary(edges []BoundaryEdge) error {
	n := len(s.global)
	s.bH, s.bHT, s.bE, s.bET4, s.bF = make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	nodes := s.model.Mesh.Nodes
	for k, ed := range edges {
		if ed.A < 0 || int(ed.A) >= len(nodes) || ed.B < 0 || int(ed.B) >= len(nodes) ||
			s.local[ed.A] < 0 || s.local[ed.B] < 0 || ed.A == ed.B {
			return fmt.Errorf("thermal: boundary edge %d (%d, %d) is not an edge between part nodes", k, ed.A, ed.B)
		}
		if ed.HeatTransfer < 0 || ed.Emissivity < 0 || ed.Emissivity > 1 {
			return fmt.Errorf("thermal: boundary edge %d: h = %g W/(m²·K), ε = %g out of range", k, ed.HeatTransfer, ed.Emissivity)
		}
		tsur := ed.Surroundings
		if tsur == 0 {
			tsur = ed.Ambient
		}
		if (ed.HeatTransfer > 0 || ed.Emissivity > 0) && !(ed.Ambient > 0 && tsur > 0) {
			return fmt.Errorf("thermal: boundary edge %d: ambient %g K / surroundings %g K must be positive", k, ed.Ambient, tsur)
		}
		pa, pb := nodes[ed.A], nodes[ed.B]
		length := math.Hypot(pb.X-pa.X, pb.Y-pa.Y)
		// ∫ φ 2πr ds over the edge for each end (r linear along it): the lumped ring area of the end, m².
		w := [2]float64{2 * math.Pi * length * (2*pa.X + pb.X) / 6, 2 * math.Pi * length * (pa.X + 2*pb.X) / 6}
		for j, v := range [2]int32{ed.A, ed.B} {
			i := s.local[v]
			s.bH[i] += w[j] * ed.HeatTransfer
			s.bHT[i] += w[j] * ed.HeatTransfer * ed.Ambient
			s.bE[i] += w[j] * ed.Emissivity * StefanBoltzmann
			s.bET4[i] += w[j] * ed.Emissivity * StefanBoltzmann * math.Pow(tsur, 4)
			s.bF[i] += w[j] * ed.Flux
		}
	}
	return nil
}

// nodeEnergy returns the enthalpy content of node i's ring at temperature T, J, and its Newton tangent dE/dT, J/K.
func (s *Solver) nodeEnergy(i int, T float64) (e, c float64) {
	for p := s.capStart[i]; p < s.capStart[i+1]; p++ {
		tab := s.tabs[s.capMat[p]]
		h, _ := tab.at(T)
		e += s.capVol[p] * h
		c += s.capVol[p] * tab.tangent(T)
	}
	return e, c
}

// clipAtKink limits a Newton move of node i from temperature from to energy e (J): a move that starts inside a
// melting interval and leaves it stops on the solidus or liquidus it crosses. The tangent inside the interval is
// far steeper than in the solid or the liquid, so an energy error that is harmless inside becomes a large
// temperature error outside; stopping at the kink lets the next iteration go on with the right tangent. Moves into
// an interval need no limit: there the same energy error shrinks in temperature.
func (s *Solver) clipAtKink(i int, from, e float64) (eNew, T, c float64) {
	T, c = s.nodeTemperature(i, e)
	kinks := s.kinks[s.kinkStart[i]:s.kinkStart[i+1]]
	for p := 0; p+1 < len(kinks); p += 2 {
		lo, hi := kinks[p], kinks[p+1]
		if from <= lo+kinkTol || from >= hi-kinkTol {
			continue
		}
		switch {
		case T < lo:
			eNew, c = s.nodeEnergy(i, lo)
			return eNew, lo, c
		case T > hi:
			eNew, c = s.nodeEnergy(i, hi)
			return eNew, hi, c
		}
	}
	return e, T, c
}

// nodeTemperature inverts nodeEnergy: it returns the T (K) at which node i holds energy e, and dE/dT there.
func (s *Solver) nodeTemperature(i int, e float64) (T, c float64) {
	p0, p1 := s.capStart[i], s.capStart[i+1]
	if p1-p0 == 1 {
		tab, v := s.tabs[s.capMat[p0]], s.capVol[p0]
		T = tab.temperature(e / v)
		return T, v * tab.tangent(T)
	}
	// A node shared by several materials: the root lies between the temperatures each material alone would have.
	vt := 0.0
	for p := p0; p < p1; p++ {
		vt += s.capVol[p]
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for p := p0; p < p1; p++ {
		Tp := s.tabs[s.capMat[p]].temperature(e / vt)
		lo, hi = math.Min(lo, Tp), math.Max(hi, Tp)
	}
	for k := 0; k < 200 && hi-lo > 1e-13*math.Abs(hi); k++ {
		mid := 0.5 * (lo + hi)
		if em, _ := s.nodeEnergy(i, mid); em < e {
			lo = mid
		} else {
			hi = mid
		}
	}
	T = 0.5 * (lo + hi)
	_, c = s.nodeEnergy(i, T)
	return T, c
}

// residual sets R = (E − E_old)/dt + K(T)·T + loss(T) − Q − flux (W) for the state (e, t), and returns ‖R‖₁ and
// the reference scale of the step's energy flows it is measured against.
func (s *Solver) residual(R, e, t []float64, dt float64) (norm, scale float64, err error) {
	kt := s.kt
	for i := range kt {
		kt[i] = 0
	}
	for ei := range s.elems {
		el := &s.elems[ei]
		k, err := s.conductivity(el, t)
		if err != nil {
			return 0, 0, err
		}
		for a := 0; a < 3; a++ {
			v := 0.0
			for b := 0; b < 3; b++ {
				v += el.g[a][b] * t[el.n[b]]
			}
			kt[el.n[a]] += k * v
		}
	}
	for i := range R {
		T := t[i]
		stor := (e[i] - s.eOld[i]) / dt
		loss := s.bH[i]*T - s.bHT[i] + s.bE[i]*T*T*T*T - s.bET4[i]
		R[i] = stor + kt[i] + loss - s.q[i] - s.bF[i]
		norm += math.Abs(R[i])
		scale += math.Abs(stor) + math.Abs(loss) + math.Abs(s.q[i]) + math.Abs(s.bF[i])
	}
	return norm, scale, nil
}

func (s *Solver) conductivity(el *element, t []float64) (float64, error) {
	tm := (t[el.n[0]] + t[el.n[1]] + t[el.n[2]]) / 3
	k := s.mats[el.mat].Conductivity(tm)
	if !(k > 0) || math.IsInf(k, 0) {
		return 0, fmt.Errorf("thermal: conductivity %g W/(m·K) at %g K in region %d", k, tm, s.model.Mesh.Tags[el.tri])
	}
	return k, nil
}

// assemble fills the Newton matrix K(T) + diag(C/dt + dloss/dT), which is symmetric positive definite.
func (s *Solver) assemble(t, c []float64, dt float64) error {
	val := s.a.val
	for i := range val {
		val[i] = 0
	}
	for ei := range s.elems {
		el := &s.elems[ei]
		k, err := s.conductivity(el, t)
		if err != nil {
			return err
		}
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				val[el.pos[3*a+b]] += k * el.g[a][b]
			}
		}
	}
	for i, T := range t {
		val[s.a.diag[i]] += c[i]/dt + s.bH[i] + 4*s.bE[i]*T*T*T
	}
	return nil
}

// Step advances the solution by dt seconds (backward Euler) with the volumetric power density source[t] (W/m³) in
// each mesh triangle t (len(Mesh.Tris) values; those of non-part triangles are ignored; nil means no source).
// The source is held constant over the step; pass a new one whenever the field has been re-solved. A step whose
// Newton iterations do not converge is split into halves automatically (StepInfo.Substeps); on error the state is
// that of the start of the step.
func (s *Solver) Step(dt float64, source []float64) (StepInfo, error) {
	if !(dt > 0) || math.IsInf(dt, 0) {
		return StepInfo{}, fmt.Errorf("thermal: time step %g s must be positive and finite", dt)
	}
	if source != nil && len(source) != len(s.model.Mesh.Tris) {
		return StepInfo{}, fmt.Errorf("thermal: %d source values for %d triangles", len(source), len(s.model.Mesh.Tris))
	}
	for i := range s.q {
		s.q[i] = 0
	}
	if source != nil {
		for ei := range s.elems {
			el := &s.elems[ei]
			qv := source[el.tri]
			if math.IsNaN(qv) || math.IsInf(qv, 0) {
				return StepInfo{}, fmt.Errorf("thermal: source %g W/m³ in triangle %d", qv, el.tri)
			}
			for a := 0; a < 3; a++ {
				s.q[el.n[a]] += qv * el.w[a]
			}
		}
	}
	saved := s.save()
	info, err := s.advance(dt, 0)
	info.Time = s.time
	if err != nil {
		s.restore(saved)
		info.Time = s.time
		return info, err
	}
	return info, nil
}

// linearSolve solves the Newton system s.a·y = s.r (from the y given) to the relative residual eta and
// returns the CG iterations. The preconditioner is the Cholesky factor of an earlier Newton matrix while CG
// converges within refactorAbove iterations with it; past that, the factor is redone from the current matrix
// and CG goes on from where it stopped. Without a Cholesky analysis, or when a pivot fails, IC(0) of the current
// matrix preconditions.
func (s *Solver) linearSolve(b []float64, eta float64) int {
	maxIter := 10*len(s.y) + 100
	if s.chol == nil {
		s.pre.factor(s.a)
		it, _ := pcg(s.a, &s.pre, s.y, b, eta, maxIter, &s.cg)
		return it
	}
	total := 0
	if s.chol.ok {
		it, rel := pcg(s.a, s.chol, s.y, b, eta, refactorAbove, &s.cg)
		total += it
		if rel <= eta {
			return total
		}
	}
	var pre preconditioner = s.chol
	if !s.chol.factor(s.a) {
		s.pre.factor(s.a)
		pre = &s.pre
	}
	it, _ := pcg(s.a, pre, s.y, b, eta, maxIter, &s.cg)
	return total + it
}

// conductivitySlopeTerm sets out = N·y, where N is the part of the conduction Jacobian that comes from k(T):
// with the element conductivity taken at the mean corner temperature T̄, ∂(k(T̄)·G·T)_a/∂T_c = k′(T̄)/3·(G·T)_a.
// k′ is a central difference over ±0.05 K. It returns false (out unusable) if a conductivity is not usable.
func (s *Solver) conductivitySlopeTerm(out, t, y []float64) bool {
	const h = 0.05
	clear(out)
	for ei := range s.elems {
		el := &s.elems[ei]
		tm := (t[el.n[0]] + t[el.n[1]] + t[el.n[2]]) / 3
		mat := s.mats[el.mat]
		dk := (mat.Conductivity(tm+h) - mat.Conductivity(tm-h)) / (2 * h)
		if math.IsNaN(dk) || math.IsInf(dk, 0) {
			return false
		}
		if dk == 0 {
			continue
		}
		f := dk * (y[el.n[0]] + y[el.n[1]] + y[el.n[2]]) / 3
		for a := 0; a < 3; a++ {
			v := 0.0
			for b := 0; b < 3; b++ {
				v += el.g[a][b] * t[el.n[b]]
			}
			out[el.n[a]] += f * v
		}
	}
	return true
}

// refactorAbove is the number of CG iterations with an earlier Newton matrix's Cholesky factor after which the
// factor is redone from the current matrix: on 2D meshes a refactorisation costs about as much as that many
// preconditioned iterations.
const refactorAbove = 8

// maxHalvings bounds how often a step that does not converge is split in two.
const maxHalvings = 10

// advance moves the solution by dt with the current source, splitting the step in halves (recursively) when the
// Newton iterations do not converge: a shorter step makes the capacity term dominate and the iterations easy.
func (s *Solver) advance(dt float64, depth int) (StepInfo, error) {
	info, err := s.solve(dt)
	if err == nil || !errors.Is(err, ErrNotConverged) || depth == maxHalvings {
		return info, err
	}
	total := StepInfo{Iterations: info.Iterations, CGIter: info.CGIter}
	for half := 0; half < 2; half++ {
		sub, err := s.advance(dt/2, depth+1)
		total.Iterations += sub.Iterations
		total.CGIter += sub.CGIter
		total.Substeps += sub.Substeps
		total.Residual = math.Max(total.Residual, sub.Residual)
		if err != nil {
			return total, err
		}
	}
	for i, T := range s.t {
		total.MaxChange = math.Max(total.MaxChange, math.Abs(T-s.tStep[i]))
	}
	return total, nil
}

// snapshot is the solver state at the start of a Step, to undo a step that fails.
type snapshot struct {
	e, rate  []float64
	energy   Energy
	time     float64
	havePrev bool
}

func (s *Solver) save() snapshot {
	copy(s.tStep, s.t)
	return snapshot{e: append([]float64(nil), s.e...), rate: append([]float64(nil), s.rate...),
		energy: s.energy, time: s.time, havePrev: s.havePrev}
}

func (s *Solver) restore(sn snapshot) {
	copy(s.e, sn.e)
	copy(s.t, s.tStep)
	copy(s.rate, sn.rate)
	s.energy, s.time, s.havePrev = sn.energy, sn.time, sn.havePrev
}

// solve takes one backward-Euler step of dt with the current source by Newton iterations on the nodal energies,
// and books its energy flows. On failure the state is left as it was.
func (s *Solver) solve(dt float64) (StepInfo, error) {
	copy(s.eOld, s.e)
	tOld := s.tOld
	copy(tOld, s.t)
	restore := func() {
		copy(s.e, s.eOld)
		copy(s.t, tOld)
	}
	for i := range s.c {
		_, s.c[i] = s.nodeEnergy(i, s.t[i])
	}

	info := StepInfo{Time: s.time + dt, Substeps: 1}
	norm, scale, err := s.residual(s.r, s.e, s.t, dt)
	if err != nil {
		restore()
		return info, err
	}
	if s.havePrev {
		// Predictor: continue each node's energy at the rate of the previous step; keep it if it helps.
		for i := range s.e {
			s.eTry[i], s.tTry[i], s.cTry[i] = s.clipAtKink(i, s.t[i], s.e[i]+s.rate[i]*dt)
		}
		if nTry, sTry, err := s.residual(s.rTry, s.eTry, s.tTry, dt); err == nil && nTry < norm {
			s.e, s.eTry = s.eTry, s.e
			s.t, s.tTry = s.tTry, s.t
			s.c, s.cTry = s.cTry, s.c
			s.r, s.rTry = s.rTry, s.r
			norm, scale = nTry, sTry
		}
	}
	converged := norm <= s.tol*scale
	for !converged && info.Iterations < s.maxIter {
		info.Iterations++
		if err := s.assemble(s.t, s.c, dt); err != nil {
			restore()
			return info, err
		}
		for i := range s.y {
			s.y[i] = 0
			s.r[i] = -s.r[i]
		}
		// Inexact Newton: solve only as far as the next iterate can use (the residual test below is on R itself).
		eta := math.Min(1e-2, math.Max(1e-14, 0.1*s.tol*scale/norm))
		info.CGIter += s.linearSolve(s.r, eta)
		if s.chol != nil {
			// One correction for the conductivity's temperature dependence, which the symmetric Newton matrix
			// leaves out: solve again with the right-hand side −R − N·y, N the k′(T) part of the Jacobian.
			// The lagged iteration contracts by about |k′·ΔT/k| per step; with the correction, by its square.
			if s.conductivitySlopeTerm(s.rTry, s.t, s.y) && norm2(s.rTry) < 0.5*norm2(s.r) {
				for i := range s.rTry {
					s.rTry[i] = s.r[i] - s.rTry[i]
				}
				info.CGIter += s.linearSolve(s.rTry, eta)
			}
		}

		// Update the energies along the Newton direction ΔE = C·y, halving the step while ‖R‖₁ does not fall.
		alpha, tMax, change := 1.0, 0.0, 0.0
		var nTry, sTry float64
		for ls := 0; ; ls++ {
			change, tMax = 0, 0
			for i := range s.e {
				s.eTry[i], s.tTry[i], s.cTry[i] = s.clipAtKink(i, s.t[i], s.e[i]+alpha*s.c[i]*s.y[i])
				change = math.Max(change, math.Abs(s.tTry[i]-s.t[i]))
				tMax = math.Max(tMax, math.Abs(s.tTry[i]))
			}
			nTry, sTry, err = s.residual(s.rTry, s.eTry, s.tTry, dt)
			if err == nil && nTry <= (1-1e-4*alpha)*norm || ls == 12 {
				break
			}
			alpha /= 2
		}
		if err != nil {
			restore()
			return info, err
		}
		s.e, s.eTry = s.eTry, s.e
		s.t, s.tTry = s.tTry, s.t
		s.c, s.cTry = s.cTry, s.c
		s.r, s.rTry = s.rTry, s.r
		norm, scale = nTry, sTry
		// Converged on the residual, or the update has reached round-off.
		converged = norm <= s.tol*scale || change <= 1e-12*tMax
	}
	info.Residual = norm / math.Max(scale, math.SmallestNonzeroFloat64)
	if !converged {
		restore()
		return info, fmt.Errorf("thermal: step to t = %g s with dt = %g s: %d iterations, residual %.3g: %w",
			info.Time, dt, info.Iterations, info.Residual, ErrNotConverged)
	}
	for i, T := range s.t {
		info.MaxChange = math.Max(info.MaxChange, math.Abs(T-tOld[i]))
		s.energy.Source += dt * s.q[i]
		s.energy.FluxIn += dt * s.bF[i]
		s.energy.Convection += dt * (s.bH[i]*T - s.bHT[i])
		s.energy.Radiation += dt * (s.bE[i]*T*T*T*T - s.bET4[i])
	}
	s.energy.Stored = 0
	for i := range s.e {
		s.energy.Stored += s.e[i] - s.e0[i]
	}
	for i := range s.rate {
		s.rate[i] = (s.e[i] - s.eOld[i]) / dt
	}
	s.havePrev = true
	s.time = info.Time
	return info, nil
}
