package fem

import (
	"fmt"
	"math"
)

// Per-triangle materials. Temperature varies strongly inside a heated part (a skin-heated surface over a cold
// core; a Curie front moving inward), so its conductivity and permeability vary element by element, not region
// by region. Element values replace the region's inside the assembly (σ in the eddy-current and turn terms, μr
// in the reluctivity) and in everything a Solution derives (J, Joule power, magnetic energy).

// SetElementMaterials sets the conductivity σ (S/m) and relative permeability μr of single triangles, indexed
// like Mesh.Tris, and re-assembles the values into the existing pattern. Entries apply to the triangles of
// conducting regions (SolidTurn and Part) only; entries of other triangles are ignored, and a NaN entry keeps
// the triangle's region value. A nil slice keeps the region values of that property everywhere, so
// SetElementMaterials(nil, nil) returns to plain region values. Element values take precedence over region
// values, including those of later SetMaterials overrides, until the next call. The slices are copied.
func (a *Assembler) SetElementMaterials(sigma, mur []float64) error {
	nt := len(a.prob.Mesh.Tris)
	for _, v := range []struct {
		name string
		x    []float64
	}{{"conductivity", sigma}, {"permeability", mur}} {
		if v.x != nil && len(v.x) != nt {
			return fmt.Errorf("element %s: %d values for %d triangles", v.name, len(v.x), nt)
		}
	}
	for t, ri := range a.elemRg {
		if ri < 0 {
			continue
		}
		r := a.prob.Regions[ri]
		if r.Kind != SolidTurn && r.Kind != Part {
			continue
		}
		if sigma != nil && !math.IsNaN(sigma[t]) {
			s := sigma[t]
			if s < 0 || math.IsInf(s, 0) || (r.Kind == SolidTurn && s == 0) {
				return fmt.Errorf("triangle %d of region %q: conductivity %g S/m is not usable", t, r.Name, s)
			}
		}
		if mur != nil && !math.IsNaN(mur[t]) {
			if m := mur[t]; !(m > 0) || math.IsInf(m, 0) {
				return fmt.Errorf("triangle %d of region %q: relative permeability %g is not usable", t, r.Name, m)
			}
		}
	}
	a.elemSigma, a.elemMur = cloneOrNil(sigma), cloneOrNil(mur)
	a.assemble()
	return nil
}

// SetElementMaterials sets per-triangle conductivity and permeability for the following solves; see
// Assembler.SetElementMaterials. The sparse pattern and the symbolic analysis are kept.
func (s *Solver) SetElementMaterials(sigma, mur []float64) error {
	return s.asm.SetElementMaterials(sigma, mur)
}

// regionAt returns the electrical data in force in triangle t of region ri: the region's, with the element
// values in place where set. It returns the zero Region (air) for ri < 0.
func (a *Assembler) regionAt(t, ri int) Region {
	return elementRegion(a.prob.Regions, a.elemSigma, a.elemMur, t, ri)
}

// regionAt is Assembler.regionAt for the values a solution was solved with.
func (s *Solution) regionAt(t, ri int) Region {
	return elementRegion(s.Regions, s.elemSigma, s.elemMur, t, ri)
}

// ElementSigma returns the conductivity in force in triangle t, S/m (0 in air and stranded blocks).
func (s *Solution) ElementSigma(t int) float64 {
	r := s.regionAt(t, s.elemRg[t])
	if r.Kind != SolidTurn && r.Kind != Part {
		return 0
	}
	return r.Sigma
}

func elementRegion(regs []Region, sigma, mur []float64, t, ri int) Region {
	if ri < 0 {
		return Region{}
	}
	r := regs[ri]
	if r.Kind != SolidTurn && r.Kind != Part {
		return r
	}
	if sigma != nil && !math.IsNaN(sigma[t]) {
		r.Sigma = sigma[t]
	}
	if mur != nil && !math.IsNaN(mur[t]) {
		r.MuR = mur[t]
	}
	return r
}

// reluctivity is ν = 1/(μ0 μr), m/H; μr ≤ 0 means 1.
func reluctivity(mur float64) float64 {
	if mur <= 0 {
		mur = 1
	}
	return 1 / (Mu0 * mur)
}

func cloneOrNil(x []float64) []float64 {
	if x == nil {
		return nil
	}
	return append([]float64(nil), x...)
}
