package fem

import (
	"math"
	"math/cmplx"
	"slices"
	"time"

	"eddyrz/fem/sparse"
)

// Frequency-shifted solves. The system (K + jωM + Q/(jω)) x = b(ω) changes smoothly with ω on one pattern, so a
// factorisation at an anchor frequency ω₀ is a good preconditioner at nearby frequencies: the preconditioned
// operator is I + A(ω₀)⁻¹[j(ω−ω₀)M + Q(1/(jω) − 1/(jω₀))]. SolveNear starts from the Galerkin solution in a
// small reduced basis (the earlier solutions, orthonormalised: a sweep's solutions lie close to a
// low-dimensional subspace), then runs GMRES left-preconditioned with the anchor's factor, in a norm weighted by
// the matrix diagonal, until the preconditioned residual (an estimate of the error) is below NearTolerance of
// the solution. A point that does not converge within NearMaxIterations is factorised afresh and becomes the
// new anchor. GMRES as in Saad, Iterative Methods for Sparse Linear Systems, 2nd ed., 2003, §6.5 and §9.3.1.

const (
	// nearBasis caps the reduced basis (vectors of the unknowns' length) SolveNear keeps.
	nearBasis = 120
	// NearTolerance bounds the estimated relative error ‖A₀⁻¹(b − A x)‖∞ / ‖x‖∞ of an iterative solve. (The scaled
	// residual ‖b − A x‖∞ / (‖A‖∞‖x‖∞ + ‖b‖∞) of the direct solve is no guide here: the coil's circuit rows
	// are tiny beside the stiffest field rows, so 1e-14 in it still allowed 1e-5 errors in R.)
	NearTolerance = 1e-12
	// NearMaxIterations bounds the preconditioned GMRES iterations of one SolveNear before it gives up and
	// factorises afresh (a factorisation costs about ten preconditioner applications).
	NearMaxIterations = 12
)

// nearState is a Solver's anchor factorisation and its reduced basis.
type nearState struct {
	fac      *sparse.Factor // storage kept for Refactor even when not anchored
	anchored bool           // fac holds the factorisation at anchorF
	anchorF  float64        // Hz
	// basis is orthonormal (Hermitian inner product); bk, bm, bq hold Xᴴ K X, Xᴴ M X and Xᴴ Q X row by row
	// (bk[i][j] = X_iᴴ K X_j), b0, b1, b2 the projections Xᴴ r0, Xᴴ r1, Xᴴ r2 of the right-hand side's parts.
	basis      [][]complex128
	bk, bm, bq [][]complex128
	b0, b1, b2 []complex128
	// pending solutions, added to the basis only when an iterative solve needs it (a sweep of direct solves
	// never pays for the projections)
	pending [][]complex128
	// wt, when set, weights the inner product the basis is orthonormalised in (Σ wt_i conj(u_i) v_i); nil means
	// the plain Hermitian one
	wt []float64
	// ops are the reduced-basis helpers built from the current materials' values (dropped with them)
	ops *sweepOps
	// reducedMode is set while the state serves Sweep/SolveReduced (a weighted basis of factorised solutions and
	// their derivatives) rather than SolveNear (anchor, GMRES); switching from one to the other starts afresh
	reducedMode bool
	// work space, reused across solves
	m          *sparse.Matrix
	b          []complex128
	v          [][]complex128
	kx, mx, qx []complex128
}

// detached drops a SolveNear solution's references to the system, whose storage the next SolveNear re-uses.
func detached(s *Solution) *Solution {
	s.sys, s.rhs = nil, nil
	return s
}

// ResetNear forgets SolveNear's anchor and remembered solutions, so that the next SolveNear is independent of
// what came before; the factor's storage is kept for re-use.
func (s *Solver) ResetNear() {
	if ns := s.near; ns != nil {
		*ns = nearState{fac: ns.fac, m: ns.m, b: ns.b, v: ns.v, kx: ns.kx, mx: ns.mx, qx: ns.qx, ops: ns.ops}
	}
}

// AnchorFrequency returns the frequency (Hz) of SolveNear's current anchor factorisation, 0 without one.
func (s *Solver) AnchorFrequency() float64 {
	if s.near == nil || !s.near.anchored {
		return 0
	}
	return s.near.anchorF
}

// SolveNear solves at frequency f (Hz) like SolveAt, but iteratively when it can: preconditioned by the
// factorisation kept from an earlier call (the anchor) and started from the best combination of the earlier
// solutions. Without an anchor, or when the iteration does not reach NearTolerance within NearMaxIterations, it
// factorises at f, which becomes the anchor. Stats.Iterations counts the GMRES iterations (0 for a direct
// solve). The result equals a direct solve's within the residual target; which path was taken depends only on
// the sequence of calls since the last ResetNear or material override, never on timing.
func (s *Solver) SolveNear(f float64) (*Solution, error) {
	if err := checkFrequency(f); err != nil {
		return nil, err
	}
	if s.near == nil {
		s.near = &nearState{}
	}
	if s.near.reducedMode {
		s.ResetNear()
	}
	ns := s.near
	a := s.asm
	st := Stats{Assemble: s.asmTime}
	s.asmTime = 0
	t0 := time.Now()
	// A sweep re-uses one matrix and right-hand side: the factor keeps its own copy of the values, and a
	// SolveNear solution does not keep its system (ExportSystem needs a SolveAt solution).
	if ns.m == nil {
		ns.m, ns.b = a.System(f)
	} else {
		a.systemInto(f, ns.m, ns.b)
	}
	m, b := ns.m, ns.b
	st.Assemble += time.Since(t0)
	st.Unknowns, st.NonZeros = a.n, m.Nnz()
	if ns.anchored && ns.anchorF != f {
		t0 = time.Now()
		x, its, res, ok := s.iterate(f, m, b)
		st.Solve = time.Since(t0)
		if ok {
			st.Iterations, st.Residual = its, res
			ns.keep(x)
			return detached(a.solution(f, m, b, x, st)), nil
		}
	}
	// Direct: factorise at f and keep the factor as the anchor.
	t0 = time.Now()
	ns.anchored = false
	x, err := s.factorSolve(&ns.fac, m, b, &st, t0)
	if err != nil {
		return nil, err
	}
	ns.anchored, ns.anchorF = true, f
	ns.keep(x)
	return detached(a.solution(f, m, b, x, st)), nil
}

// keep queues a solution for the basis, dropping the oldest queued ones beyond the basis cap.
func (ns *nearState) keep(x []complex128) {
	if len(ns.pending) >= nearBasis {
		ns.pending = append(ns.pending[:0], ns.pending[1:]...)
	}
	ns.pending = append(ns.pending, x)
}

// enrich adds the parts of the given vectors that the reduced basis does not yet span.
func (s *Solver) enrich(vs ...[]complex128) {
	ns := s.near
	a := s.asm
	n := a.n
	for _, v0 := range vs {
		if len(ns.basis) >= nearBasis {
			return
		}
		v := slices.Clone(v0)
		orig := ns.norm(v)
		if orig == 0 {
			continue
		}
		for pass := 0; pass < 2; pass++ {
			for _, u := range ns.basis {
				axpy(v, u, -ns.dot(u, v))
			}
		}
		nv := ns.norm(v)
		if !(nv > 1e-13*orig) {
			continue
		}
		for i := range v {
			v[i] /= complex(nv, 0)
		}
		if ns.kx == nil {
			ns.kx, ns.mx, ns.qx = make([]complex128, n), make([]complex128, n), make([]complex128, n)
		}
		a.mulKMQ(ns.kx, ns.mx, ns.qx, v)
		p := len(ns.basis)
		ns.basis = append(ns.basis, v)
		// K, M and Q are real symmetric, so vᴴ K X_i = conj(X_iᴴ K v).
		rk, rm, rq := make([]complex128, p+1), make([]complex128, p+1), make([]complex128, p+1)
		for i, u := range ns.basis {
			rk[i], rm[i], rq[i] = dotc(u, ns.kx), dotc(u, ns.mx), dotc(u, ns.qx)
			if i < p {
				ns.bk[i] = append(ns.bk[i], rk[i])
				ns.bm[i] = append(ns.bm[i], rm[i])
				ns.bq[i] = append(ns.bq[i], rq[i])
				rk[i], rm[i], rq[i] = cmplx.Conj(rk[i]), cmplx.Conj(rm[i]), cmplx.Conj(rq[i])
			}
		}
		ns.bk, ns.bm, ns.bq = append(ns.bk, rk), append(ns.bm, rm), append(ns.bq, rq)
		ns.b0 = append(ns.b0, dotc(v, a.r0))
		ns.b1 = append(ns.b1, dotc(v, a.r1))
		ns.b2 = append(ns.b2, dotc(v, a.r2))
	}
}

// dot is the basis inner product of u and v (see wt).
func (ns *nearState) dot(u, v []complex128) complex128 {
	if ns.wt == nil {
		return dotc(u, v)
	}
	return wdotc(ns.wt, u, v)
}

// wdotc is the weighted Hermitian inner product Σ wt_i conj(a_i) b_i.
func wdotc(wt []float64, a, b []complex128) complex128 {
	b, wt = b[:len(a)], wt[:len(a)]
	var re, im float64
	for i, x := range a {
		y := b[i]
		re += wt[i] * (real(x)*real(y) + imag(x)*imag(y))
		im += wt[i] * (real(x)*imag(y) - imag(x)*real(y))
	}
	return complex(re, im)
}

func (ns *nearState) norm(v []complex128) float64 { return math.Sqrt(real(ns.dot(v, v))) }

// mulKMQ sets kx = K x, mx = M x and qx = Q x for the frequency-independent parts of the symmetric system.
func (a *Assembler) mulKMQ(kx, mx, qx, x []complex128) {
	clear(kx)
	clear(mx)
	clear(qx)
	p := a.pat
	for j := 0; j < p.N; j++ {
		xj := x[j]
		var sk, sm, sq complex128
		for q := p.ColPtr[j]; q < p.ColPtr[j+1]; q++ {
			i := int(p.RowIdx[q])
			k, mv, qv := a.kv[q], a.mv[q], a.qv[q]
			kx[i] += complex(k, 0) * xj
			mx[i] += complex(mv, 0) * xj
			qx[i] += complex(qv, 0) * xj
			if i != j {
				xi := x[i]
				sk += complex(k, 0) * xi
				sm += complex(mv, 0) * xi
				sq += complex(qv, 0) * xi
			}
		}
		kx[j] += sk
		mx[j] += sm
		qx[j] += sq
	}
}

// iterate solves m x = b by the Galerkin start and GMRES left-preconditioned with the anchor, whose residual
// A₀⁻¹(b − A x) estimates the error x* − x (A₀⁻¹A is close to I). ok is false when the estimate does not fall to
// NearTolerance·‖x‖∞ within NearMaxIterations (or the iteration breaks down). res is the final scaled residual
// ‖b − A x‖∞ / (‖A‖∞‖x‖∞ + ‖b‖∞), for the Stats.
func (s *Solver) iterate(f float64, m *sparse.Matrix, b []complex128) (x []complex128, its int, res float64, ok bool) {
	ns := s.near
	n := s.asm.n
	s.enrich(ns.pending...)
	ns.pending = ns.pending[:0]
	x = make([]complex128, n)
	s.galerkinStart(x, 2*math.Pi*f)
	r := make([]complex128, n)
	pr := make([]complex128, n)
	// Norms are weighted by |A_ii| (an energy-like norm), so that the coil's circuit unknowns count as much as
	// the field's; wdot and wnorm are the weighted inner product and norm.
	wt := make([]float64, n)
	for j := range n {
		wt[j] = cmplx.Abs(m.Val[m.ColPtr[j]]) // the diagonal leads each column
	}
	wdot := func(a, b []complex128) complex128 { return wdotc(wt, a, b) }
	wnorm := func(a []complex128) float64 { return math.Sqrt(real(wdot(a, a))) }
	// precResidual sets pr = A₀⁻¹(b − m x) and returns ‖pr‖ / ‖x‖ in the weighted norm.
	precResidual := func() (float64, bool) {
		m.MulVec(r, x)
		for i := range r {
			r[i] = b[i] - r[i]
		}
		ns.fac.Apply(pr, r)
		ne, nx := wnorm(pr), wnorm(x)
		if nx == 0 {
			return math.Inf(1), true
		}
		return ne / nx, !math.IsNaN(ne)
	}
	est, good := precResidual()
	if !good {
		return x, 0, 0, false
	}
	mm := NearMaxIterations
	if len(ns.v) < mm+1 {
		ns.v = make([][]complex128, mm+1)
		for i := range ns.v {
			ns.v[i] = make([]complex128, n)
		}
	}
	V := ns.v
	H := make([][]complex128, mm+1) // H[i][k]: column k of the Hessenberg matrix
	for i := range H {
		H[i] = make([]complex128, mm)
	}
	cs := make([]float64, mm)
	sn := make([]complex128, mm)
	g := make([]complex128, mm+1)
	for its < mm && est > NearTolerance {
		beta := wnorm(pr)
		nx := wnorm(x)
		for i := range V[0] {
			V[0][i] = pr[i] / complex(beta, 0)
		}
		clear(g)
		g[0] = complex(beta, 0)
		k := 0
		for its < mm {
			vk := V[k+1]
			m.MulVec(r, V[k])
			ns.fac.Apply(vk, r)
			its++
			for i := 0; i <= k; i++ {
				H[i][k] = 0
			}
			for pass := 0; pass < 2; pass++ { // modified Gram–Schmidt, repeated once
				for i := 0; i <= k; i++ {
					h := wdot(V[i], vk)
					H[i][k] += h
					axpy(vk, V[i], -h)
				}
			}
			hk := wnorm(vk)
			H[k+1][k] = complex(hk, 0)
			if hk > 0 {
				for i := range vk {
					vk[i] /= complex(hk, 0)
				}
			}
			for i := 0; i < k; i++ { // earlier rotations
				a0, a1 := H[i][k], H[i+1][k]
				H[i][k] = complex(cs[i], 0)*a0 + sn[i]*a1
				H[i+1][k] = -cmplx.Conj(sn[i])*a0 + complex(cs[i], 0)*a1
			}
			cs[k], sn[k] = givens(H[k][k], H[k+1][k])
			H[k][k] = complex(cs[k], 0)*H[k][k] + sn[k]*H[k+1][k]
			H[k+1][k] = 0
			g[k+1] = -cmplx.Conj(sn[k]) * g[k]
			g[k] = complex(cs[k], 0) * g[k]
			k++
			// the least-squares residual is the weighted norm of the preconditioned residual (checked afresh below)
			if cmplx.Abs(g[k]) <= NearTolerance*nx || hk == 0 {
				break
			}
		}
		y := make([]complex128, k)
		for i := k - 1; i >= 0; i-- {
			sum := g[i]
			for j := i + 1; j < k; j++ {
				sum -= H[i][j] * y[j]
			}
			if H[i][i] == 0 {
				return x, its, 0, false
			}
			y[i] = sum / H[i][i]
		}
		for j := range k {
			axpy(x, V[j], y[j])
		}
		if est, good = precResidual(); !good {
			return x, its, 0, false
		}
	}
	if !(est <= NearTolerance) {
		return x, its, 0, false
	}
	// r = b − m x from the last check.
	var nr, nx, nb float64
	for i := range r {
		nr = max(nr, cmplx.Abs(r[i]))
		nx = max(nx, cmplx.Abs(x[i]))
		nb = max(nb, cmplx.Abs(b[i]))
	}
	if den := normInf(m)*nx + nb; den > 0 {
		res = nr / den
	}
	return x, its, res, true
}

// galerkinStart sets x to the Galerkin solution in the reduced basis X: x = X y with
// Xᴴ A(ω) X y = Xᴴ b(ω), a small dense system assembled from the stored projections; x stays zero without a
// basis or when the small system is singular (and false is returned then).
func (s *Solver) galerkinStart(x []complex128, w float64) bool {
	ns := s.near
	p := len(ns.basis)
	if p == 0 {
		return false
	}
	jw := complex(0, w)
	ijw := 1 / jw
	g := make([][]complex128, p)
	y := make([]complex128, p)
	for i := range p {
		g[i] = make([]complex128, p)
		for j := range p {
			g[i][j] = ns.bk[i][j] + jw*ns.bm[i][j] + ijw*ns.bq[i][j]
		}
		y[i] = ns.b0[i] + jw*ns.b1[i] + ijw*ns.b2[i]
	}
	if !solveDense(g, y) {
		return false
	}
	for i, u := range ns.basis {
		axpy(x, u, y[i])
	}
	return true
}

// solveDense overwrites y with g⁻¹ y by Gaussian elimination with partial pivoting (g is destroyed); false
// when g is singular.
func solveDense(g [][]complex128, y []complex128) bool {
	p := len(y)
	for k := range p {
		piv := k
		for i := k + 1; i < p; i++ {
			if cmplx.Abs(g[i][k]) > cmplx.Abs(g[piv][k]) {
				piv = i
			}
		}
		if g[piv][k] == 0 {
			return false
		}
		g[k], g[piv] = g[piv], g[k]
		y[k], y[piv] = y[piv], y[k]
		for i := k + 1; i < p; i++ {
			l := g[i][k] / g[k][k]
			if l == 0 {
				continue
			}
			for j := k + 1; j < p; j++ {
				g[i][j] -= l * g[k][j]
			}
			y[i] -= l * y[k]
		}
	}
	for i := p - 1; i >= 0; i-- {
		for j := i + 1; j < p; j++ {
			y[i] -= g[i][j] * y[j]
		}
		y[i] /= g[i][i]
		if cmplx.IsNaN(y[i]) || cmplx.IsInf(y[i]) {
			return false
		}
	}
	return true
}

// givens returns c (real) and s with [c s; −s̄ c]·[a; b] = [ρ; 0].
func givens(a, b complex128) (float64, complex128) {
	if b == 0 {
		return 1, 0
	}
	if a == 0 {
		return 0, cmplx.Conj(b) / complex(cmplx.Abs(b), 0)
	}
	aa, ab := cmplx.Abs(a), cmplx.Abs(b)
	d := math.Hypot(aa, ab)
	return aa / d, (a / complex(aa, 0)) * cmplx.Conj(b) / complex(d, 0)
}

// dotc is the Hermitian inner product Σ conj(a_i) b_i (GMRES orthogonalises in the ordinary Hermitian sense;
// only the system matrix is complex symmetric).
func dotc(a, b []complex128) complex128 {
	b = b[:len(a)]
	var re, im float64
	for i, x := range a {
		y := b[i]
		re += real(x)*real(y) + imag(x)*imag(y)
		im += real(x)*imag(y) - imag(x)*real(y)
	}
	return complex(re, im)
}

// axpy sets y += α x.
func axpy(y, x []complex128, alpha complex128) {
	x = x[:len(y)]
	for i := range y {
		y[i] += alpha * x[i]
	}
}

func norm2(x []complex128) float64 {
	var s float64
	for _, v := range x {
		s += real(v)*real(v) + imag(v)*imag(v)
	}
	return math.Sqrt(s)
}

// normInf is ‖m‖∞ of the full symmetric matrix (maximum absolute row sum).
func normInf(m *sparse.Matrix) float64 {
	rs := make([]float64, m.N)
	for j := 0; j < m.N; j++ {
		for p := m.ColPtr[j]; p < m.ColPtr[j+1]; p++ {
			i := int(m.RowIdx[p])
			v := cmplx.Abs(m.Val[p])
			rs[i] += v
			if i != j {
				rs[j] += v
			}
		}
	}
	var mx float64
	for _, v := range rs {
		mx = max(mx, v)
	}
	return mx
}
