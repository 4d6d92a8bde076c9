package fem

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"

	"eddyrz/fem/sparse"
	"eddyrz/mesh"
)

// QuadPoint is the field at one quadrature point of the solution, for integrating derived quantities:
// ∫ g 2πr dr dz ≈ Σ g(point)·Weight.
type QuadPoint struct {
	Elem   int        // triangle index
	Tag    int32      // triangle's region tag
	Region int        // index into Solution.Regions, -1 for untagged air
	Weight float64    // quadrature weight × area × 2πr, m³ (per radian × 2π)
	R, Z   float64    // m
	A      complex128 // Wb/m rms
	J      complex128 // azimuthal current density, A/m² rms
	Br, Bz complex128 // T rms

	// Sigma (S/m) and MuR are the conductivity and relative permeability in force in the triangle: its region's,
	// or the element values of Solver.SetElementMaterials (MuR 1 where the region leaves it 0 or in untagged air).
	Sigma, MuR float64
}

// EachPoint calls fn for every quadrature point of every triangle, in triangle order. The rule is the one the
// assembly used (Radon's 7 points, 28 on triangles touching the axis).
func (s *Solution) EachPoint(fn func(QuadPoint)) { s.eachPointIn(nil, fn) }

// eachPointIn is EachPoint over the triangles whose region index (−1 for untagged air) keep accepts; nil keeps
// every triangle. Skipped triangles cost nothing.
func (s *Solution) eachPointIn(keep func(ri int) bool, fn func(QuadPoint)) {
	m := s.Mesh
	nl := s.Order.NumNodes()
	nd := make([]int, nl)
	dr, dz := make([]float64, nl), make([]float64, nl)
	w := 2 * math.Pi * s.Frequency
	// The shape values at a rule's points are the same in every triangle.
	shapes := func(q *QuadRule) [][]float64 {
		tab := make([][]float64, len(q.L))
		for g, l := range q.L {
			tab[g] = make([]float64, nl)
			s.Order.Shape(l, tab[g])
		}
		return tab
	}
	shInterior, shAxis := shapes(&s.rules.Interior), shapes(&s.rules.Axis)
	for t, tri := range m.Tris {
		if keep != nil && !keep(s.elemRg[t]) {
			continue
		}
		var p [3][2]float64
		axis := false
		for k, v := range tri {
			nd[k] = int(v)
			p[k] = [2]float64{m.Nodes[v].X, m.Nodes[v].Y}
			axis = axis || s.axis[v]
		}
		if nl == 6 {
			for k, v := range m.Mid[t] {
				nd[3+k] = int(v)
			}
		}
		q, shTab := &s.rules.Interior, shInterior
		if axis {
			q, shTab = &s.rules.Axis, shAxis
		}
		area, gl := triGeom(p)
		ri := s.elemRg[t]
		reg := s.regionAt(t, ri)
		mur := reg.MuR
		if mur <= 0 {
			mur = 1
		}
		for g, l := range q.L {
			sh := shTab[g]
			s.Order.ShapeGrad(l, gl, dr, dz)
			qp := QuadPoint{Elem: t, Tag: m.Tags[t], Region: ri, Sigma: reg.Sigma, MuR: mur}
			qp.R = l[0]*p[0][0] + l[1]*p[1][0] + l[2]*p[2][0]
			qp.Z = l[0]*p[0][1] + l[1]*p[1][1] + l[2]*p[2][1]
			qp.Weight = q.W[g] * area * 2 * math.Pi * qp.R
			var dAr, dAz complex128
			for i, v := range nd {
				a := s.A[v]
				qp.A += a * complex(sh[i], 0)
				dAr += a * complex(dr[i], 0)
				dAz += a * complex(dz[i], 0)
			}
			qp.Br = -dAz
			qp.Bz = dAr + complex(real(qp.A)/qp.R, imag(qp.A)/qp.R) // A/r, as complex division by a real gives it
			qp.J = s.currentDensity(t, ri, qp.R, qp.A, w)
			fn(qp)
		}
	}
}

// currentDensity is J in triangle t of region ri at radius r with potential a (physics.md, Conductors).
func (s *Solution) currentDensity(t, ri int, r float64, a complex128, w float64) complex128 {
	if ri < 0 {
		return 0
	}
	reg := s.regionAt(t, ri)
	switch reg.Kind {
	case SolidTurn:
		return complex(0, -w*reg.Sigma)*a + complex(reg.Sigma/(2*math.Pi*r), 0)*s.TurnU[ri]
	case Part:
		return complex(0, -w*reg.Sigma) * a
	case Stranded:
		return complex(float64(reg.Strands*reg.Sense)/s.areas[ri], 0) * s.CoilI[reg.Coil]
	}
	return 0
}

// RegionPower is the time-averaged Joule power in the region(s) with the given tag, W: ∫|J|²/σ 2πr dr dz for
// conductors, Rdc·|I|² for stranded blocks (their copper loss as the job states it).
func (s *Solution) RegionPower(tag int32) float64 {
	var p float64
	for _, r := range s.Regions {
		if r.Tag == tag && r.Kind == Stranded {
			p += r.Rdc * abs2(s.CoilI[r.Coil])
		}
	}
	s.EachPoint(func(q QuadPoint) {
		if q.Tag != tag || q.Region < 0 {
			return
		}
		if s.Regions[q.Region].Kind != Stranded && q.Sigma > 0 {
			p += abs2(q.J) / q.Sigma * q.Weight
		}
	})
	return p
}

// MagneticEnergy is the time-averaged magnetic energy, J: ∫ ν|B|²/2 2πr dr dz over the mesh, plus, with a
// Robin outer boundary and no applied field, the energy of the exterior dipole field the boundary stands for,
// ½∮ (ν0/R)|A|² dS (for a dipole A = C sinθ/ρ², ∫_{ρ>R} ν|B|² dV = ∮ (ν/R)|A|² dS = 8πν|C|²/(3R³)). With an
// applied field the exterior energy is unbounded and only the mesh's part is returned.
func (s *Solution) MagneticEnergy() float64 {
	return s.interiorEnergy() + s.BoundaryEnergy()
}

// BoundaryEnergy is the part of MagneticEnergy that lies outside the mesh, J: the Robin boundary's exterior term
// ½∮(ν0/R)|A|² dS when no field is applied, else 0.
func (s *Solution) BoundaryEnergy() float64 {
	if s.AppliedBz != 0 {
		return 0
	}
	return s.robinEnergy()
}

// EnergyDensity is the time-averaged magnetic energy density at a quadrature point, ν|B|²/2 with rms B, J/m³;
// times q.Weight it is the point's share of the stored energy.
func EnergyDensity(q QuadPoint) float64 {
	return (abs2(q.Br) + abs2(q.Bz)) / (2 * Mu0 * q.MuR)
}

func (s *Solution) interiorEnergy() float64 {
	var e float64
	s.EachPoint(func(q QuadPoint) { e += EnergyDensity(q) * q.Weight })
	return e
}

// robinEnergy is ½∮ (ν0/R)|A|² dS over the Robin boundary (0 without one).
func (s *Solution) robinEnergy() float64 {
	if !s.Outer.Robin {
		return 0
	}
	var e float64
	s.eachOuterPoint(func(r, ds float64, a complex128) {
		e += 0.5 / (Mu0 * s.Outer.Radius) * abs2(a) * ds
	})
	return e
}

// eachOuterPoint calls fn at the Gauss points of every far-boundary (OuterTag) edge with the radius r (m), the
// weight ds of ∮ … 2πr dl (m²) and the solution's A there (Wb/m rms).
func (s *Solution) eachOuterPoint(fn func(r, ds float64, a complex128)) {
	m := s.Mesh
	sh := make([]float64, 3)
	for _, ed := range m.Edges {
		if ed.Tag != OuterTag {
			continue
		}
		nd := [3]int32{ed.A, ed.B, ed.M}
		pa, pb := m.Nodes[ed.A], m.Nodes[ed.B]
		length := math.Hypot(pb.X-pa.X, pb.Y-pa.Y)
		for g, t := range gauss5.X {
			edgeShape(s.Order, t, sh)
			a := s.A[nd[0]]*complex(sh[0], 0) + s.A[nd[1]]*complex(sh[1], 0)
			if s.Order == 2 {
				a += s.A[nd[2]] * complex(sh[2], 0)
			}
			r := pa.X + t*(pb.X-pa.X)
			fn(r, gauss5.W[g]*length*2*math.Pi*r, a)
		}
	}
}

// Balance compares the complex power supplied, S = Σ_coils V I* plus what the applied field brings in through
// the outer boundary, with the Joule power (all regions plus Rdc I² of stranded blocks) and with 2ω W_m, where
// W_m counts the Robin boundary's exterior term ½∮(ν0/R)|A|² dS whether or not a field is applied (that is the
// energy the discrete equations account for). BalanceError reduces the two comparisons to one number.
func (s *Solution) Balance() (supplied complex128, joule, twoOmegaWm float64) {
	for ci := range s.Coils {
		supplied += s.CoilV[ci] * cmplx.Conj(s.CoilI[ci])
	}
	supplied += s.boundarySupply
	seen := map[int32]bool{}
	for _, r := range s.Regions {
		if !seen[r.Tag] {
			seen[r.Tag] = true
			joule += s.RegionPower(r.Tag)
		}
	}
	twoOmegaWm = 2 * 2 * math.Pi * s.Frequency * (s.interiorEnergy() + s.robinEnergy())
	return supplied, joule, twoOmegaWm
}

// BalanceError is max(|Re S − P|, |Im S − 2ωW_m|)/|S| (see Balance); NaN when nothing drives the problem.
func (s *Solution) BalanceError() float64 {
	sup, p, q := s.Balance()
	if sup == 0 {
		return math.NaN()
	}
	return max(math.Abs(real(sup)-p), math.Abs(imag(sup)-q)) / cmplx.Abs(sup)
}

// FieldValue is the field at one point.
type FieldValue struct {
	A, J, Br, Bz complex128
	Tag          int32
}

// At evaluates the field at (r, z) (m); ok is false outside the mesh. Point location uses a bucket index of
// the mesh, built on the first call (safe for concurrent callers).
func (s *Solution) At(r, z float64) (v FieldValue, ok bool) {
	s.locOnce.Do(func() { s.loc = s.Mesh.Index() })
	t, l := s.loc.Locate(mesh.Point{X: r, Y: z})
	if t < 0 {
		return v, false
	}
	m := s.Mesh
	nl := s.Order.NumNodes()
	var p [3][2]float64
	nd := make([]int, nl)
	for k, n := range m.Tris[t] {
		p[k] = [2]float64{m.Nodes[n].X, m.Nodes[n].Y}
		nd[k] = int(n)
	}
	if nl == 6 {
		for k, n := range m.Mid[t] {
			nd[3+k] = int(n)
		}
	}
	_, gl := triGeom(p)
	sh, dr, dz := make([]float64, nl), make([]float64, nl), make([]float64, nl)
	s.Order.Shape(l, sh)
	s.Order.ShapeGrad(l, gl, dr, dz)
	var dAr, dAz complex128
	for i, n := range nd {
		v.A += s.A[n] * complex(sh[i], 0)
		dAr += s.A[n] * complex(dr[i], 0)
		dAz += s.A[n] * complex(dz[i], 0)
	}
	v.Br = -dAz
	if r > 0 {
		v.Bz = dAr + v.A/complex(r, 0)
		v.J = s.currentDensity(t, s.elemRg[t], r, v.A, 2*math.Pi*s.Frequency)
	} else {
		v.Bz = 2 * dAr // A = 0 on the axis, so A/r → ∂A/∂r there
	}
	v.Tag = m.Tags[t]
	return v, true
}

// ExportSystem writes the solved linear system to dir as A.mtx (Matrix Market coordinate complex symmetric,
// lower triangle) and b.mtx (array complex general). Unknowns are the free node values (in node order), then
// turn loop voltages, then currents of voltage-driven coils; rows of circuit unknowns are scaled as in
// physics.md (divided by jω or −jω).
func (s *Solution) ExportSystem(dir string) error {
	if s.sys == nil {
		return errors.New("export: this solution does not keep its linear system (solutions of Solver.SolveNear share one; solve with Solve or SolveAt to export)")
	}
	write := func(name string, body func(w io.Writer) error) error {
		f, err := os.Create(filepath.Join(dir, name))
		if err != nil {
			return fmt.Errorf("export system: %w", err)
		}
		w := bufio.NewWriter(f)
		if err := body(w); err != nil {
			f.Close()
			return fmt.Errorf("export system %s: %w", name, err)
		}
		if err := w.Flush(); err != nil {
			f.Close()
			return fmt.Errorf("export system %s: %w", name, err)
		}
		if err := f.Close(); err != nil {
			return fmt.Errorf("export system %s: %w", name, err)
		}
		return nil
	}
	if err := write("A.mtx", func(w io.Writer) error { return sparse.WriteMatrixMarket(w, s.sys) }); err != nil {
		return err
	}
	return write("b.mtx", func(w io.Writer) error { return sparse.WriteVector(w, s.rhs) })
}

func sq(x float64) float64 { return x * x }

// abs2 is |z|², without the square root (and overflow guard) of cmplx.Abs.
func abs2(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }
