package fem

import (
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"sync"
	"time"

	"eddyrz/fem/sparse"
	"eddyrz/mesh"
)

// Solver solves one Problem at many frequencies and material states, re-using the numbering, the sparse
// pattern and the fill-reducing analysis. It is not safe for concurrent use: give each goroutine its own.
type Solver struct {
	asm     *Assembler
	sym     *sparse.Symbolic
	fac     *sparse.Factor // SolveAt's factorisation, refactored in place by later calls
	asmTime time.Duration
	near    *nearState // SolveNear's anchor factorisation and recent solutions (shift.go)
}

// NewSolver validates p and assembles its frequency-independent parts.
func NewSolver(p *Problem) (*Solver, error) {
	t0 := time.Now()
	a, err := NewAssembler(p)
	if err != nil {
		return nil, err
	}
	return &Solver{asm: a, asmTime: time.Since(t0)}, nil
}

// Analysis returns the fill-reducing symbolic analysis of the solver's sparse pattern, nil before its first
// factorisation. It is read-only and may be handed to other solvers of the same problem (see UseAnalysis).
func (s *Solver) Analysis() *sparse.Symbolic { return s.sym }

// UseAnalysis gives a solver that has not yet factorised the symbolic analysis of another solver of the same
// problem (same mesh, regions and coils, hence the same sparse pattern; materials may differ), so that it skips
// its own. A mismatched pattern is refused when the solver factorises.
func (s *Solver) UseAnalysis(sym *sparse.Symbolic) {
	if s.sym == nil {
		s.sym = sym
	}
}

// Solve solves p at p.Frequency.
func Solve(p *Problem) (*Solution, error) {
	s, err := NewSolver(p)
	if err != nil {
		return nil, err
	}
	return s.SolveAt(p.Frequency)
}

// Stats describes a solve: sizes, times and the linear solver's scaled residual
// ‖b − A x‖∞ / (‖A‖∞‖x‖∞ + ‖b‖∞).
type Stats struct {
	Unknowns, NonZeros int
	Assemble           time.Duration // assembly (or re-assembly after overrides) plus frequency recombination
	Factor             time.Duration // ordering analysis (first solve only) plus numeric factorisation
	Solve              time.Duration // triangular solves with refinement
	Residual           float64
	Iterations         int // preconditioned GMRES iterations of SolveNear, 0 for a direct solve
	// Basis is the reduced-basis size a Sweep point was taken from, 0 for a factorised solve; Indicator is then
	// its accepted weighted residual (see SweepTolerance).
	Basis     int
	Indicator float64
}

// SolveAt solves at frequency f (Hz) after applying material overrides (which persist for later calls).
func (s *Solver) SolveAt(f float64, ov ...Override) (*Solution, error) {
	if err := checkFrequency(f); err != nil {
		return nil, err
	}
	a := s.asm
	st := Stats{Assemble: s.asmTime}
	s.asmTime = 0
	t0 := time.Now()
	if len(ov) > 0 {
		s.near = nil // new materials: SolveNear's anchor and solutions no longer apply
		if err := a.SetMaterials(ov...); err != nil {
			return nil, err
		}
	}
	m, b := a.System(f)
	st.Assemble += time.Since(t0)
	t0 = time.Now()
	x, err := s.factorSolve(&s.fac, m, b, &st, t0)
	if err != nil {
		return nil, err
	}
	st.Unknowns, st.NonZeros = a.n, m.Nnz()
	return a.solution(f, m, b, x, st), nil
}

// factorSolve analyses m's pattern on first use, factors m into *fac (refactoring in place when *fac already holds a factorisation of this pattern:
// same storage, no new L to allocate and touch), solves m x = b, and records the factor time (from t0) and the
// solve time and residual in st. A failed factorisation leaves *fac nil.
func (s *Solver) factorSolve(fac **sparse.Factor, m *sparse.Matrix, b []complex128, st *Stats, t0 time.Time) ([]complex128, error) {
	n := len(b)
	if s.sym == nil {
		sym, err := sparse.Analyze(m, sparse.Options{Coords: s.asm.Coords()})
		if err != nil {
			return nil, fmt.Errorf("analysing the %d-unknown system: %w", n, err)
		}
		s.sym = sym
	}
	var err error
	if *fac == nil {
		*fac, err = s.sym.Factor(m)
	} else {
		err = (*fac).Refactor(m)
	}
	if err != nil {
		*fac = nil
		return nil, fmt.Errorf("factorising the %d-unknown system: %w", n, err)
	}
	st.Factor = time.Since(t0)
	t0 = time.Now()
	x := make([]complex128, n)
	info, err := (*fac).Solve(x, b)
	st.Residual = info.Residual
	if err != nil {
		return nil, fmt.Errorf("solving the %d-unknown system: %w", n, err)
	}
	st.Solve = time.Since(t0)
	return x, nil
}

// Solution is the result of one harmonic solve. All phasors are RMS.
type Solution struct {
	Frequency float64 // Hz
	Order     Order
	Mesh      *mesh.Mesh
	Regions   []Region // as solved (after overrides)
	Coils     []Coil
	// A is the azimuthal vector potential at every mesh node, Wb/m (rms).
	A []complex128
	// TurnU and TurnI are each region's loop voltage (V) and net current (A) for SolidTurn regions, zero for
	// others; indexed like Regions.
	TurnU, TurnI []complex128
	// CoilI, CoilV and CoilZ are each coil's current (A), terminal voltage (V) and impedance V/I (Ω).
	CoilI, CoilV, CoilZ []complex128
	AppliedBz           complex128
	Outer               OuterBoundary
	Stats               Stats

	elemRg []int
	areas  []float64
	axis   []bool
	rules  Rules
	sys    *sparse.Matrix
	// complex power that enters through the outer boundary with the applied field, W
	boundarySupply complex128
	// point location for At, built on first use
	locOnce sync.Once
	loc     *mesh.Locator
	rhs     []complex128

	// per-triangle σ and μr the system was assembled with (see elementwise.go); nil where regions hold
	elemSigma, elemMur []float64
}

func (a *Assembler) solution(f float64, m *sparse.Matrix, b, x []complex128, st Stats) *Solution {
	p := &a.prob
	s := &Solution{
		Frequency: f, Order: a.order, Mesh: p.Mesh, Regions: slices.Clone(p.Regions), Coils: slices.Clone(p.Coils),
		A: make([]complex128, len(p.Mesh.Nodes)), TurnU: make([]complex128, len(p.Regions)),
		TurnI: make([]complex128, len(p.Regions)), CoilI: make([]complex128, len(p.Coils)),
		CoilV: make([]complex128, len(p.Coils)), CoilZ: make([]complex128, len(p.Coils)),
		AppliedBz: p.AppliedBz, Outer: p.Outer, Stats: st, elemRg: a.elemRg, elemSigma: a.elemSigma, elemMur: a.elemMur, areas: a.areas, axis: a.axis, rules: a.rules,
		sys: m, rhs: b,
	}
	for i, e := range a.eq {
		if e >= 0 {
			s.A[i] = x[e]
		} else {
			s.A[i] = a.fixed[i]
		}
	}
	for ci, c := range p.Coils {
		if e := a.coilE[ci]; e >= 0 {
			s.CoilI[ci] = x[e]
		} else {
			s.CoilI[ci] = c.Value
		}
	}
	jw := complex(0, 2*math.Pi*f)
	for ri, r := range p.Regions {
		switch r.Kind {
		case SolidTurn:
			s.TurnU[ri] = x[a.turnE[ri]]
			s.TurnI[ri] = complex(float64(r.Sense), 0) * s.CoilI[r.Coil]
			s.CoilV[r.Coil] += complex(float64(r.Sense), 0) * s.TurnU[ri]
		case Stranded:
			s.CoilV[r.Coil] += complex(r.Rdc, 0) * s.CoilI[r.Coil]
		}
	}
	// Stranded flux linkage jω ∫ (N s/area) 2πr A, accumulated over the blocks' quadrature points.
	stranded := func(ri int) bool { return ri >= 0 && s.Regions[ri].Kind == Stranded }
	s.eachPointIn(stranded, func(q QuadPoint) {
		r := s.Regions[q.Region]
		js := float64(r.Strands*r.Sense) / s.areas[q.Region]
		s.CoilV[r.Coil] += jw * complex(js*q.Weight, 0) * q.A
	})
	s.boundarySupply = a.boundarySupply(2*math.Pi*f, s)
	for ci, c := range p.Coils {
		if c.Drive == VoltageDrive {
			s.CoilV[ci] = c.Value
		}
		if s.CoilI[ci] != 0 {
			s.CoilZ[ci] = s.CoilV[ci] / s.CoilI[ci]
		}
	}
	return s
}

// boundarySupply is the complex power the applied field delivers through the outer boundary. Testing the
// unreduced equations with the conjugate solution gives S = P + j2ωW_m = Σ_coils V I* + jω Σ_prescribed g_i R̄_i
// + jω Σ_i A_i f̄_i, where R_i is the residual of prescribed node i's equation (the boundary's reaction) and
// f the Robin boundary's applied-field source.
func (a *Assembler) boundarySupply(w float64, s *Solution) complex128 {
	if a.prob.AppliedBz == 0 {
		return 0
	}
	jw := complex(0, w)
	var sup complex128
	sc := newScratch(a.nloc)
	nl := a.nloc
	for t := range a.prob.Mesh.Tris {
		touches := false
		for _, v := range a.prob.Mesh.Tris[t] {
			touches = touches || (a.eq[v] < 0 && a.fixed[v] != 0)
		}
		if a.order == 2 {
			for _, v := range a.prob.Mesh.Mid[t] {
				touches = touches || (a.eq[v] < 0 && a.fixed[v] != 0)
			}
		}
		if !touches {
			continue
		}
		a.integrate(t, sc)
		ri := a.elemRg[t]
		for i := range nl {
			vi := sc.nd[i]
			if a.eq[vi] >= 0 || a.fixed[vi] == 0 {
				continue
			}
			var r complex128
			for j := range nl {
				r += complex(sc.ke[i*nl+j], w*sc.me[i*nl+j]) * s.A[sc.nd[j]]
			}
			if ri >= 0 {
				switch reg := a.prob.Regions[ri]; reg.Kind {
				case SolidTurn:
					r -= complex(sc.c[i], 0) * s.TurnU[ri]
				case Stranded:
					r -= complex(sc.b[i], 0) * s.CoilI[reg.Coil]
				}
			}
			sup += jw * a.fixed[vi] * cmplx.Conj(r)
		}
	}
	if a.prob.Outer.Robin {
		R := a.prob.Outer.Radius
		s.eachOuterPoint(func(r, ds float64, av complex128) {
			f := 1.5 / Mu0 * (r / R) * ds
			sup += jw * av * cmplx.Conj(complex(f, 0)*a.prob.AppliedBz)
		})
	}
	return sup
}
