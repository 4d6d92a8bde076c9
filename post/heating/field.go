package heating

import (
	"fmt"
	"math"
	"math/cmplx"

	"eddyrz/fem"
	"eddyrz/geometry"
	"eddyrz/mesh"
	"eddyrz/post/study"
)

// coupler keeps the harmonic field in step with the parts' temperatures: per-element σ and μr from the element
// temperatures, a re-solve when the estimated power change passes the tolerance, and the Joule source the heat
// solver takes.
type coupler struct {
	md     *study.Model
	solver *fem.Solver
	freq   float64
	// hold fixes the drive scale after the first solve (power-driven coil with the current held).
	hold bool
	// drive is the index of the power-driven coil, −1 when the coils are driven by current or voltage.
	drive  int
	target float64 // W into the target part
	into   int32   // tag of the target part's region

	elems  []int // part triangles
	state  []elementState
	vol    []float64 // volume of each triangle, m³ (∫2πr dr dz)
	sigma  []float64
	mur    []float64
	scale2 float64 // |drive scale|² applied to the last solve
	solves int

	// Quadrature of the part triangles, fixed by the mesh: the rule of each (fem.DefaultRules, as the assembly
	// uses), its corner positions and mesh nodes (corners, then midpoints for quadratic elements).
	rules  fem.Rules
	onAxis []bool // mesh node lies on r = 0 (the assembly's test: an axis edge, or r ≤ 1e-12 of the largest r)

	// At the last field solve: Joule density per triangle at the drive level (W/m³), the element power (W) and
	// √(ρμr) of every part element, the coil currents (A rms) and the power into each part tag (W).
	source  []float64
	elemP   []float64
	surf0   []float64
	current []float64
	partP   map[int32]float64
	total   float64
}

func newCoupler(md *study.Model, hold bool) (*coupler, error) {
	s, err := fem.NewSolver(md.Problem)
	if err != nil {
		return nil, fmt.Errorf("setting up the field of %s: %w", md.Job.File, err)
	}
	m := md.Mesh
	c := &coupler{md: md, solver: s, freq: md.Problem.Frequency, hold: hold, drive: md.PowerDrive,
		vol: make([]float64, len(m.Tris)), sigma: make([]float64, len(m.Tris)), mur: make([]float64, len(m.Tris)),
		state: make([]elementState, len(m.Tris))}
	c.rules, c.onAxis = fem.DefaultRules(), axisNodes(m)
	byTag := map[int32]geometry.Region{}
	for _, r := range md.Layout.Regions {
		if r.Kind == geometry.PartRegion {
			byTag[r.Tag] = r
		}
	}
	for t := range m.Tris {
		c.sigma[t], c.mur[t] = math.NaN(), math.NaN()
		if r, ok := byTag[m.Tags[t]]; ok {
			c.elems = append(c.elems, t)
			c.state[t].mat = r.Material
		}
	}
	if c.drive >= 0 {
		coil := md.Job.Coils[c.drive]
		r, err := md.PartRegion(coil.Into)
		if err != nil {
			return nil, err
		}
		c.target, c.into = coil.Value, r.Tag
	}
	return c, nil
}

// solve sets the element materials from the nodal temperatures (K; NaN outside the parts), solves the field and
// derives the source. Corner temperatures are averaged over each triangle.
func (c *coupler) solve(nodeT []float64) error {
	m := c.md.Mesh
	for _, t := range c.elems {
		tri := m.Tris[t]
		T := (nodeT[tri[0]] + nodeT[tri[1]] + nodeT[tri[2]]) / 3
		c.state[t].T = T
		c.sigma[t], c.mur[t] = electrical(c.state[t].mat, T)
	}
	if err := c.solver.SetElementMaterials(c.sigma, c.mur); err != nil {
		return fmt.Errorf("element materials: %w", err)
	}
	// SolveNear at the one frequency of the run always factorises directly (its iterative path is for frequency
	// shifts), but refactors into the storage of the previous solve's factor instead of allocating a new one.
	sol, err := c.solver.SolveNear(c.freq)
	if err != nil {
		return fmt.Errorf("field solve %d: %w", c.solves+1, err)
	}
	c.solves++
	first := c.source == nil
	q := c.joule(sol)
	// q holds each triangle's power at the solved drive; find the drive scale.
	partP := map[int32]float64{}
	for _, t := range c.elems {
		partP[m.Tags[t]] += q[t]
	}
	if c.drive >= 0 && (!c.hold || first) {
		if !(partP[c.into] > 0) {
			return fmt.Errorf("part %q takes no power, so no coil current gives the %g W the job asks for",
				c.md.Job.Coils[c.drive].Into, c.target)
		}
		c.scale2 = c.target / partP[c.into]
	} else if first {
		c.scale2 = 1
	}
	c.source = make([]float64, len(m.Tris))
	c.elemP = make([]float64, len(m.Tris))
	c.surf0 = make([]float64, len(m.Tris))
	c.total = 0
	for _, t := range c.elems {
		p := q[t] * c.scale2
		c.elemP[t] = p
		c.total += p
		if c.vol[t] > 0 {
			c.source[t] = p / c.vol[t]
		}
		c.surf0[t] = surfaceFactor(c.state[t].mat, c.state[t].T)
	}
	c.partP = map[int32]float64{}
	for tag, p := range partP {
		c.partP[tag] = p * c.scale2
	}
	c.current = make([]float64, len(sol.CoilI))
	for i, I := range sol.CoilI {
		c.current[i] = cmplx.Abs(I) * math.Sqrt(c.scale2)
	}
	return nil
}

// axisNodes marks the mesh nodes on r = 0 as the field assembly does: the ends (and midpoints) of edges tagged
// fem.AxisTag, and nodes within 1e-12 of the largest radius of r = 0.
func axisNodes(m *mesh.Mesh) []bool {
	on := make([]bool, len(m.Nodes))
	for _, e := range m.Edges {
		if e.Tag == fem.AxisTag {
			on[e.A], on[e.B] = true, true
			if e.M >= 0 {
				on[e.M] = true
			}
		}
	}
	rmax := 0.0
	for _, p := range m.Nodes {
		rmax = math.Max(rmax, p.X)
	}
	for i, p := range m.Nodes {
		if p.X <= 1e-12*rmax {
			on[i] = true
		}
	}
	return on
}

// joule returns the time-averaged Joule power of every part triangle at the solved drive, W (0 elsewhere), and
// on the first call fills c.vol: ∫ ω²σ|A|² 2πr dr dz (a part carries J = −jωσA, physics.md, Conductors) with the
// quadrature rule the assembly used and σ the element value set for the solve. Only the part triangles are
// visited: the air and the coil, most of the mesh, take no heat.
func (c *coupler) joule(sol *fem.Solution) []float64 {
	m := sol.Mesh
	q := make([]float64, len(m.Tris))
	first := c.source == nil
	w2 := sq(2 * math.Pi * sol.Frequency)
	nl := sol.Order.NumNodes()
	nd := make([]int32, nl)
	sh := make([]float64, nl)
	for _, t := range c.elems {
		tri := m.Tris[t]
		axis := false
		var r, z [3]float64
		for k, v := range tri {
			nd[k] = v
			r[k], z[k] = m.Nodes[v].X, m.Nodes[v].Y
			axis = axis || c.onAxis[v]
		}
		if nl == 6 {
			copy(nd[3:], m.Mid[t][:])
		}
		rule := &c.rules.Interior
		if axis {
			rule = &c.rules.Axis
		}
		area := 0.5 * ((r[1]-r[0])*(z[2]-z[0]) - (r[2]-r[0])*(z[1]-z[0]))
		var p, vol float64
		for g, l := range rule.L {
			sol.Order.Shape(l, sh)
			var a complex128
			for i, v := range nd {
				a += sol.A[v] * complex(sh[i], 0)
			}
			w := rule.W[g] * area * 2 * math.Pi * (l[0]*r[0] + l[1]*r[1] + l[2]*r[2])
			vol += w
			p += w * (real(a)*real(a) + imag(a)*imag(a))
		}
		q[t] = w2 * c.sigma[t] * p
		if first {
			c.vol[t] = vol
		}
	}
	return q
}

func sq(x float64) float64 { return x * x }

// powerChange estimates the relative change of the parts' power since the last field solve from the element
// temperatures nodeT (K), by the surface-impedance scaling P ∝ √(ρ μr) applied element by element and weighted
// by each element's power at the last solve: Σ_e P_e |√(ρ_e μ_e / ρ⁰_e μ⁰_e) − 1| / Σ_e P_e. Absolute values keep
// changes of opposite sign in different places from cancelling.
func (c *coupler) powerChange(nodeT []float64) float64 {
	if !(c.total > 0) {
		return 0
	}
	m := c.md.Mesh
	var d float64
	for _, t := range c.elems {
		if c.elemP[t] == 0 {
			continue
		}
		tri := m.Tris[t]
		T := (nodeT[tri[0]] + nodeT[tri[1]] + nodeT[tri[2]]) / 3
		d += c.elemP[t] * math.Abs(surfaceFactor(c.state[t].mat, T)/c.surf0[t]-1)
	}
	return d / c.total
}

// ResolveRule states, for outputs, when the field is solved again.
const ResolveRule = "the field is solved again before a time step when the estimated relative change of the parts' " +
	"power since the last field solve, Σ_e P_e·|√(ρ_e·μr_e / (ρ⁰_e·μr⁰_e)) − 1| / Σ_e P_e over the part elements " +
	"(P_e the element's Joule power at the last solve, superscript 0 its values then; the surface-impedance scaling " +
	"P ∝ √(ρ·μr)), exceeds the tolerance"
