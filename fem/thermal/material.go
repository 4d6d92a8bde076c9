package thermal

import (
	"fmt"
	"math"
	"sort"
)

// Material gives the thermal properties of a region as functions of temperature T in kelvin.
//
// The mesh does not move, so density enters only through the volumetric heat capacity ρ(T)·c(T) (J/(m³·K)) and the
// volumetric latent heat ρ(T_m)·L; thermal expansion and the volume change on melting are not modelled.
type Material interface {
	// Conductivity is the thermal conductivity k, W/(m·K); it must be positive.
	Conductivity(T float64) float64
	// Density is ρ, kg/m³; it must be positive.
	Density(T float64) float64
	// SpecificHeat is the sensible specific heat c, J/(kg·K), without latent heat; it must be positive.
	SpecificHeat(T float64) float64
}

// PhaseChanger is implemented by a Material that melts. A Material without it never melts.
type PhaseChanger interface {
	Melting() Melting
}

// Melting describes a solid-liquid transition for the enthalpy formulation.
//
// The liquid fraction rises linearly from 0 at Point − Mushy/2 to 1 at Point + Mushy/2. A pure metal melts at one
// temperature; the finite interval is a numerical regularisation that makes T(H) single-valued and Lipschitz. The
// latent heat in the energy balance does not depend on it: crossing the interval always stores exactly ρ(Point)·Latent
// per unit volume on top of the sensible heat. Narrow intervals only flatten the temperature plateau further.
type Melting struct {
	Point  float64 // melting temperature, K (> 0 to enable melting)
	Latent float64 // latent heat of fusion, J/kg (≥ 0)
	Mushy  float64 // width of the melting interval, K; 0 means DefaultMushy
}

// DefaultMushy is the melting-interval width used when Melting.Mushy is zero, K.
const DefaultMushy = 1.0

// Constant is a Material with temperature-independent properties and an optional melting transition.
type Constant struct {
	K    float64 // conductivity, W/(m·K)
	Rho  float64 // density, kg/m³
	Cp   float64 // specific heat, J/(kg·K)
	Melt Melting // zero value: no melting
}

// Conductivity returns K.
func (c Constant) Conductivity(float64) float64 { return c.K }

// Density returns Rho.
func (c Constant) Density(float64) float64 { return c.Rho }

// SpecificHeat returns Cp.
func (c Constant) SpecificHeat(float64) float64 { return c.Cp }

// Melting returns Melt.
func (c Constant) Melting() Melting { return c.Melt }

// Funcs is a Material whose properties are arbitrary functions of temperature (K).
type Funcs struct {
	K, Rho, Cp func(T float64) float64
	Melt       Melting
}

// Conductivity returns K(T).
func (f Funcs) Conductivity(T float64) float64 { return f.K(T) }

// Density returns Rho(T).
func (f Funcs) Density(T float64) float64 { return f.Rho(T) }

// SpecificHeat returns Cp(T).
func (f Funcs) SpecificHeat(T float64) float64 { return f.Cp(T) }

// Melting returns Melt.
func (f Funcs) Melting() Melting { return f.Melt }

// Enthalpy tables cover [tableLow, tableHigh] K and continue linearly beyond with the end heat capacities.
const (
	tableLow  = 150.0
	tableHigh = 4500.0
	tableStep = 0.5 // K, refined to Mushy/8 for narrow melting intervals
)

// enthalpy is a material's volumetric enthalpy H(T), J/m³, as a piecewise-linear function on a uniform grid:
// H(T) = ∫ρc dT + ρ(T_m)·L·f_l(T), with H(tableLow) = 0. Being piecewise linear and strictly increasing, it is
// inverted exactly, so T(H(T)) = T and stored energy is computed from the same function the solver uses.
type enthalpy struct {
	t0, dt  float64   // grid origin and spacing, K
	h       []float64 // H at t0 + i·dt
	lo, hi  float64   // dH/dT below and above the grid, J/(m³·K)
	solidus float64   // K; +Inf when the material does not melt
	width   float64   // liquidus − solidus, K
}

func newEnthalpy(m Material) (*enthalpy, error) {
	var melt Melting
	if pc, ok := m.(PhaseChanger); ok {
		melt = pc.Melting()
	}
	e := &enthalpy{t0: tableLow, dt: tableStep, solidus: math.Inf(1)}
	latent := 0.0
	if melt.Point > 0 {
		if melt.Latent < 0 || melt.Mushy < 0 {
			return nil, fmt.Errorf("melting: negative latent heat %g J/kg or interval %g K", melt.Latent, melt.Mushy)
		}
		w := melt.Mushy
		if w == 0 {
			w = DefaultMushy
		}
		e.solidus, e.width = melt.Point-w/2, w
		// Grid points on the solidus and the liquidus make the latent part exactly piecewise linear.
		e.dt = w / math.Max(8, math.Ceil(w/tableStep))
		e.t0 = e.solidus - math.Ceil((e.solidus-tableLow)/e.dt)*e.dt
		latent = m.Density(melt.Point) * melt.Latent
	}
	n := int(math.Ceil((tableHigh-e.t0)/e.dt)) + 1
	e.h = make([]float64, n)
	rc := func(T float64) (float64, error) {
		v := m.Density(T) * m.SpecificHeat(T)
		if !(v > 0) || math.IsInf(v, 0) {
			return 0, fmt.Errorf("heat capacity ρc = %g J/(m³·K) at %g K is not positive and finite", v, T)
		}
		return v, nil
	}
	prev, err := rc(e.t0)
	if err != nil {
		return nil, err
	}
	e.lo = prev
	for i := 1; i < n; i++ {
		T := e.t0 + float64(i)*e.dt
		cur, err := rc(T)
		if err != nil {
			return nil, err
		}
		e.h[i] = e.h[i-1] + 0.5*(prev+cur)*e.dt
		prev = cur
	}
	e.hi = prev
	if latent > 0 {
		for i := range e.h {
			e.h[i] += latent * e.fraction(e.t0+float64(i)*e.dt)
		}
	}
	return e, nil
}

// fraction is the liquid fraction of the melting model at T (K), in [0, 1].
func (e *enthalpy) fraction(T float64) float64 {
	switch {
	case T <= e.solidus:
		return 0
	case T >= e.solidus+e.width:
		return 1
	}
	return (T - e.solidus) / e.width
}

// at returns H(T), J/m³, and the slope dH/dT of the interval containing T, J/(m³·K).
func (e *enthalpy) at(T float64) (h, slope float64) {
	x := (T - e.t0) / e.dt
	last := len(e.h) - 1
	switch {
	case x < 0:
		return e.h[0] + e.lo*(T-e.t0), e.lo
	case x >= float64(last):
		return e.h[last] + e.hi*(T-e.t0-float64(last)*e.dt), e.hi
	}
	i := int(x)
	if i == last {
		i--
	}
	s := (e.h[i+1] - e.h[i]) / e.dt
	return e.h[i] + s*(T-e.t0-float64(i)*e.dt), s
}

// kinkTol is how close (K) a temperature must be to the solidus or liquidus to count as sitting on it.
const kinkTol = 1e-9

// tangent returns the slope dH/dT used by the Newton iterations at T, J/(m³·K). On the solidus or the liquidus it is
// the smaller of the two one-sided slopes, so that a node resting on a kink never takes the steep mushy slope for a
// move that leaves the interval.
func (e *enthalpy) tangent(T float64) float64 {
	if math.Abs(T-e.solidus) <= kinkTol || math.Abs(T-e.solidus-e.width) <= kinkTol {
		_, l := e.at(T - e.dt/2)
		_, r := e.at(T + e.dt/2)
		return math.Min(l, r)
	}
	_, s := e.at(T)
	return s
}

// temperature inverts H: it returns the T (K) with H(T) = h.
func (e *enthalpy) temperature(h float64) float64 {
	last := len(e.h) - 1
	switch {
	case h < e.h[0]:
		return e.t0 + (h-e.h[0])/e.lo
	case h >= e.h[last]:
		return e.t0 + float64(last)*e.dt + (h-e.h[last])/e.hi
	}
	i := sort.SearchFloat64s(e.h, h) // first index with e.h[i] ≥ h, in [0, last]
	if i == 0 {
		return e.t0
	}
	i--
	return e.t0 + (float64(i)+(h-e.h[i])/(e.h[i+1]-e.h[i]))*e.dt
}
