package thermal

import (
	"math"

	"eddyrz/mesh"
)

// Time returns the simulated time, s.
func (s *Solver) Time() float64 { return s.time }

// Energy returns the cumulative energy bookkeeping, J.
func (s *Solver) Energy() Energy { return s.energy }

// EnergyBalanceError returns |Stored − (Source + FluxIn − Convection − Radiation)| relative to the largest of the
// input, the losses and the stored change (0 before any energy has moved).
func (s *Solver) EnergyBalanceError() float64 {
	e := s.energy
	in := math.Abs(e.Source) + math.Abs(e.FluxIn)
	out := math.Abs(e.Convection) + math.Abs(e.Radiation)
	ref := math.Max(math.Max(in, out), math.Abs(e.Stored))
	if ref == 0 {
		return 0
	}
	return math.Abs(e.Stored-(e.Source+e.FluxIn-e.Convection-e.Radiation)) / ref
}

// Temperature returns the temperature of every mesh node, K: part corner nodes carry the solution, midpoint nodes
// of a quadratic mesh the mean of their edge's ends, and nodes outside the parts NaN.
func (s *Solver) Temperature() []float64 { return s.nodal(s.t) }

// LiquidFraction returns the liquid fraction of every mesh node in [0, 1] (volume-weighted where materials meet;
// 0 for materials that do not melt), laid out as Temperature.
func (s *Solver) LiquidFraction() []float64 {
	f := make([]float64, len(s.t))
	for i, T := range s.t {
		v, fv := 0.0, 0.0
		for p := s.capStart[i]; p < s.capStart[i+1]; p++ {
			v += s.capVol[p]
			fv += s.capVol[p] * s.tabs[s.capMat[p]].fraction(T)
		}
		f[i] = fv / v
	}
	return s.nodal(f)
}

// LiquidVolume returns the molten volume of the parts, m³ (lumped: Σ node volume × liquid fraction).
func (s *Solver) LiquidVolume() float64 {
	total := 0.0
	for i, T := range s.t {
		for p := s.capStart[i]; p < s.capStart[i+1]; p++ {
			total += s.capVol[p] * s.tabs[s.capMat[p]].fraction(T)
		}
	}
	return total
}

// Volume returns the total volume of the parts, m³.
func (s *Solver) Volume() float64 {
	total := 0.0
	for _, v := range s.capVol {
		total += v
	}
	return total
}

func (s *Solver) nodal(x []float64) []float64 {
	m := s.model.Mesh
	out := make([]float64, len(m.Nodes))
	for v, l := range s.local {
		if l >= 0 {
			out[v] = x[l]
		} else {
			out[v] = math.NaN()
		}
	}
	if m.Mid != nil {
		for t, mid := range m.Mid {
			for k := 0; k < 3; k++ {
				a, b := m.Tris[t][k], m.Tris[t][(k+1)%3]
				if s.local[a] >= 0 && s.local[b] >= 0 && mid[k] >= 0 {
					out[mid[k]] = 0.5 * (out[a] + out[b])
				}
			}
		}
	}
	return out
}

// NodeValue is a node of the mesh with its position (m) and temperature (K).
type NodeValue struct {
	Node int
	R, Z float64
	T    float64
}

// Hottest returns the hottest part node.
func (s *Solver) Hottest() NodeValue { return s.extreme(1) }

// Coldest returns the coldest part node.
func (s *Solver) Coldest() NodeValue { return s.extreme(-1) }

func (s *Solver) extreme(sign float64) NodeValue {
	best := 0
	for i, T := range s.t {
		if sign*T > sign*s.t[best] {
			best = i
		}
	}
	v := s.global[best]
	p := s.model.Mesh.Nodes[v]
	return NodeValue{Node: int(v), R: p.X, Z: p.Y, T: s.t[best]}
}

// Probe returns the temperature (K) at (r, z) in metres, interpolated linearly in the part triangle that contains
// the point, and false when no part triangle does.
func (s *Solver) Probe(r, z float64) (float64, bool) {
	if tri, bary := s.loc.Locate(mesh.Point{X: r, Y: z}); tri >= 0 && s.elemOf[tri] >= 0 {
		el := &s.elems[s.elemOf[tri]]
		return bary[0]*s.t[el.n[0]] + bary[1]*s.t[el.n[1]] + bary[2]*s.t[el.n[2]], true
	}
	// On an edge between a part and another region the locator may answer with the other triangle: look among
	// the part triangles themselves.
	nodes := s.model.Mesh.Nodes
	for ei := range s.elems {
		el := &s.elems[ei]
		tri := s.model.Mesh.Tris[el.tri]
		p0, p1, p2 := nodes[tri[0]], nodes[tri[1]], nodes[tri[2]]
		d := (p1.X-p0.X)*(p2.Y-p0.Y) - (p2.X-p0.X)*(p1.Y-p0.Y)
		l1 := ((r-p0.X)*(p2.Y-p0.Y) - (p2.X-p0.X)*(z-p0.Y)) / d
		l2 := ((p1.X-p0.X)*(z-p0.Y) - (r-p0.X)*(p1.Y-p0.Y)) / d
		l0 := 1 - l1 - l2
		const eps = -1e-12
		if l0 >= eps && l1 >= eps && l2 >= eps {
			return l0*s.t[el.n[0]] + l1*s.t[el.n[1]] + l2*s.t[el.n[2]], true
		}
	}
	return math.NaN(), false
}
