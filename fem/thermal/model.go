// Package thermal solves transient axisymmetric heat conduction in the workpieces of an induction heater,
//
//	ρc ∂T/∂t = (1/r) ∂/∂r(k r ∂T/∂r) + ∂/∂z(k ∂T/∂z) + q,
//
// on the part triangles of an r-z mesh (X = r, Y = z, metres; the corners of quadratic triangles are used as a
// linear mesh). The weak form is weighted by 2πr, so every nodal quantity is a whole ring: volumes in m³, powers in W,
// energies in J. The axis r = 0 is a natural symmetry boundary; outer edges lose heat by convection and radiation.
//
// Numerics: linear triangles with row-sum lumped heat capacity (which, with a non-obtuse mesh, keeps the discrete
// maximum principle), backward Euler in time, and an enthalpy formulation H(T) = ∫ρc dT + ρL·f_l(T) with the nodal
// energy as unknown: each step is solved by Newton iterations on the energy (radiation linearised exactly) whose
// matrix leaves out the conductivity's temperature dependence, so that it stays symmetric positive definite; one
// extra solve with the k′(T) term moved to the right-hand side restores most of Newton's convergence. The linear
// systems are solved by conjugate gradients preconditioned with a sparse Cholesky factor (nested-dissection
// order) of a recent Newton matrix, refactored when it stops keeping the iterations few (incomplete Cholesky
// when the pattern cannot be analysed). A Newton move that leaves a melting interval stops on its
// edge (the tangent changes there by ρL/(ρc·w)), and a step that still does not converge is split in halves.
// Because the stored energy is evaluated from the same H(T) as the unknown, latent heat is conserved exactly; the
// energy balance closes to the Newton tolerance.
//
// Temperatures are kelvin everywhere in this package; convert from and to °C only at the user's edge.
package thermal

import "eddyrz/mesh"

// StefanBoltzmann is σ_SB, W/(m²·K⁴): CODATA 2018 recommended value (Tiesinga et al., Rev. Mod. Phys. 93 (2021)
// 025010), exact in the 2019 SI because h, k_B and c are fixed there.
const StefanBoltzmann = 5.670374419e-8

// ZeroCelsius is 0 °C in kelvin, for conversions at the user's edge.
const ZeroCelsius = 273.15

// BoundaryEdge is one outer edge of the parts, between corner nodes A and B (indices into Mesh.Nodes), with its own
// heat-exchange coefficients. The heat leaving through it, per unit area, is
//
//	h (T − Ambient) + ε σ_SB (T⁴ − Surroundings⁴) − Flux.
//
// Edges on the axis must not be listed: r = 0 is a symmetry line and carries no flux.
type BoundaryEdge struct {
	A, B         int32
	HeatTransfer float64 // convective coefficient h, W/(m²·K), ≥ 0
	Ambient      float64 // fluid temperature for convection, K
	Emissivity   float64 // total hemispherical emissivity ε, in [0, 1]
	Surroundings float64 // temperature of the radiation sink, K; 0 means Ambient
	Flux         float64 // prescribed heat flux into the part, W/m² (for validation and special cases)
}

// Model is the thermal problem: the mesh, the materials of the regions that take part, and the boundary.
type Model struct {
	Mesh *mesh.Mesh
	// Materials by region tag. Triangles whose tag is not a key (air, coil) are not part of the thermal problem;
	// touching parts share nodes, i.e. are in perfect thermal contact.
	Materials map[int32]Material
	// Boundary lists the heat-exchanging outer edges of the parts (see OuterEdges).
	Boundary []BoundaryEdge
	// Tolerance is the relative energy residual at which a step's Newton iterations stop; 0 means 1e-10.
	Tolerance float64
	// MaxIterations bounds the Newton iterations of a step; 0 means 50.
	MaxIterations int
}

// OuterEdges returns the boundary edges of the sub-mesh made of the triangles whose tag satisfies keep, as corner
// node pairs (A, B) with the sub-mesh to the left of A→B, leaving out edges that lie on the axis (both ends at
// r ≤ axisTol, m). Edges between two kept triangles, even of different regions, are interior.
func OuterEdges(m *mesh.Mesh, keep func(tag int32) bool, axisTol float64) [][2]int32 {
	type key struct{ a, b int32 }
	count := make(map[key]int)
	for t, tri := range m.Tris {
		if !keep(m.Tags[t]) {
			continue
		}
		for k := 0; k < 3; k++ {
			a, b := tri[k], tri[(k+1)%3]
			if a > b {
				a, b = b, a
			}
			count[key{a, b}]++
		}
	}
	var out [][2]int32
	for t, tri := range m.Tris {
		if !keep(m.Tags[t]) {
			continue
		}
		for k := 0; k < 3; k++ {
			a, b := tri[k], tri[(k+1)%3]
			lo, hi := a, b
			if lo > hi {
				lo, hi = hi, lo
			}
			if count[key{lo, hi}] != 1 {
				continue
			}
			if m.Nodes[a].X <= axisTol && m.Nodes[b].X <= axisTol {
				continue
			}
			out = append(out, [2]int32{a, b})
		}
	}
	return out
}
