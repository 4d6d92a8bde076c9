package cooling

import (
	"fmt"
	"math"
)

// DefaultMaxVelocity is the water velocity (m/s) above which erosion-corrosion of copper tube becomes a concern;
// about 3 m/s is common practice, not a derived limit.
const DefaultMaxVelocity = 3.0

// Circuit describes the water path of a hollow coil and its duty.
type Circuit struct {
	Loss             float64 // W, the coil's own Joule loss carried away by the water; > 0
	BoreDiameter     float64 // m, inner diameter of the tube; > 0
	PathLength       float64 // m, total length of water-carrying tube (the helix length); each of the Circuits parallel water circuits is PathLength/Circuits long; > 0
	Circuits         int     // number of parallel water circuits sharing the loss equally; 0 means 1
	InletTemperature float64 // K, water temperature at the inlet
	TemperatureRise  float64 // K, allowed bulk temperature rise inlet to outlet; > 0
	SupplyPressure   float64 // Pa gauge, pressure difference available across each circuit; 0 means not given (no check)
	OutletPressure   float64 // Pa absolute at the circuit outlet, where the boiling check is made; 0 means StandardAtmosphere (open drain)
	Roughness        float64 // m, absolute wall roughness ε (drawn copper tube ≈ 1.5e-6, common practice); ≥ 0
	MinorLossK       float64 // dimensionless, sum of minor-loss coefficients per circuit (bends, fittings, hose ends); Δp = K ρ v²/2
	FluxPeaking      float64 // dimensionless ≥ 1, peak-to-mean ratio of the wall heat flux; 0 means 1 (uniform flux)
	MaxVelocity      float64 // m/s, erosion limit for the warning; 0 means DefaultMaxVelocity
}

// WarningKind classifies a cooling warning.
type WarningKind int

const (
	WarnLaminar      WarningKind = iota + 1 // Re < ReLaminar: poor heat transfer, 64/Re friction and Nu = 4.36 used
	WarnTransitional                        // ReLaminar ≤ Re < ReTurbulent: heat transfer uncertain
	WarnCorrelation                         // Gnielinski applied outside its stated range
	WarnWallBoiling                         // inner wall at or above saturation at the outlet pressure: subcooled boiling likely
	WarnBulkBoiling                         // outlet bulk temperature at or above saturation
	WarnPressure                            // pressure needed exceeds the supply pressure
	WarnVelocity                            // velocity above the erosion limit
)

// Warning is one finding of Solve, with a message for the user.
type Warning struct {
	Kind    WarningKind
	Message string
}

// Result is the cooling duty of one Circuit. Per-circuit figures are for one of the parallel circuits.
type Result struct {
	MassFlow           float64 // kg/s, total over all circuits, ṁ = P/(c_p ΔT)
	FlowLPerMin        float64 // L/min, total volume flow at the bulk mean temperature
	CircuitFlowLPerMin float64 // L/min per circuit
	Velocity           float64 // m/s, mean velocity in the bore
	Reynolds           float64 // ρ v D/μ at the bulk mean temperature
	Prandtl            float64 // at the bulk mean temperature
	Water              Water   // properties at the bulk mean temperature (and the outlet pressure, or the vapour pressure if higher)

	FrictionFactor       float64 // Darcy friction factor used (64/Re laminar, Colebrook otherwise)
	FrictionHaaland      float64 // Haaland explicit estimate, a cross-check (turbulent formula; also reported when laminar)
	FrictionPressureDrop float64 // Pa per circuit, Darcy-Weisbach over PathLength/Circuits
	MinorPressureDrop    float64 // Pa per circuit, MinorLossK ρ v²/2
	PressureDrop         float64 // Pa per circuit, friction + minor: the supply pressure needed

	Nusselt             float64 // Nu used: Gnielinski for Re ≥ ReLaminar, 48/11 below
	NusseltDB           float64 // Dittus-Boelter Nu, a cross-check
	HeatTransferCoeff   float64 // W/(m²·K), Nu k/D
	HeatTransferCoeffDB float64 // W/(m²·K), Dittus-Boelter cross-check

	MeanHeatFlux          float64 // W/m², Loss over the whole bore surface π D PathLength
	PeakHeatFlux          float64 // W/m², FluxPeaking × MeanHeatFlux
	OutletTemperature     float64 // K, bulk outlet temperature
	WallTemperature       float64 // K, inner wall at the outlet, T_out + PeakHeatFlux/h
	SaturationTemperature float64 // K, at the outlet pressure

	Warnings []Warning
}

// Has reports whether r carries a warning of kind k.
func (r Result) Has(k WarningKind) bool {
	for _, w := range r.Warnings {
		if w.Kind == k {
			return true
		}
	}
	return false
}

// Solve sizes the water flow for c.
//
// Model and assumptions: the energy balance ṁ = P/(c_p ΔT) with c_p at the bulk mean temperature; fully developed
// flow over the whole length (entrance effects, which raise h near the inlet, are ignored: conservative); the
// loss is shared equally by the parallel circuits; properties at the bulk mean temperature; the wall temperature
// is estimated at the outlet, where the water is hottest and the pressure lowest, from the heat flux
// FluxPeaking·P/(π D L) — FluxPeaking = 1 is uniform flux around and along the bore, a larger value models the
// loss concentrated on the side of the tube facing the workpiece (the induced current crowds there); heat
// spreading through the copper wall is ignored. Elevation changes are ignored.
func (c Circuit) Solve() (Result, error) {
	if err := c.validate(); err != nil {
		return Result{}, err
	}
	n := c.Circuits
	if n == 0 {
		n = 1
	}
	peak := c.FluxPeaking
	if peak == 0 {
		peak = 1
	}
	vmax := c.MaxVelocity
	if vmax == 0 {
		vmax = DefaultMaxVelocity
	}
	pout := c.OutletPressure
	if pout == 0 {
		pout = StandardAtmosphere
	}
	tin := c.InletTemperature
	tout := tin + c.TemperatureRise
	tmean := tin + c.TemperatureRise/2

	var r Result
	r.OutletTemperature = tout
	tsat, err := SaturationTemperature(pout)
	if err != nil {
		return Result{}, fmt.Errorf("cooling: outlet pressure: %w", err)
	}
	r.SaturationTemperature = tsat
	// Properties: at the outlet pressure, raised to the vapour pressure if the mean water would boil there
	// (liquid properties hardly depend on pressure; the boiling itself is warned about below).
	pprop := pout
	if ps, err := SaturationPressure(tmean); err == nil && ps > pprop {
		pprop = ps
	}
	w, err := WaterAt(tmean, pprop)
	if err != nil {
		return Result{}, fmt.Errorf("cooling: water at the bulk mean temperature: %w", err)
	}
	r.Water = w
	r.Prandtl = w.Prandtl

	d := c.BoreDiameter
	area := math.Pi * d * d / 4
	lc := c.PathLength / float64(n)
	r.MassFlow = c.Loss / (w.SpecificHeat * c.TemperatureRise)
	q := r.MassFlow / w.Density // m³/s total
	r.FlowLPerMin = q * 60e3
	r.CircuitFlowLPerMin = r.FlowLPerMin / float64(n)
	r.Velocity = q / float64(n) / area
	r.Reynolds = w.Density * r.Velocity * d / w.Viscosity

	rr := c.Roughness / d
	if r.FrictionFactor, err = DarcyFriction(r.Reynolds, rr); err != nil {
		return Result{}, err
	}
	r.FrictionHaaland = Haaland(r.Reynolds, rr)
	dyn := w.Density * r.Velocity * r.Velocity / 2
	r.FrictionPressureDrop = r.FrictionFactor * lc / d * dyn
	r.MinorPressureDrop = c.MinorLossK * dyn
	r.PressureDrop = r.FrictionPressureDrop + r.MinorPressureDrop

	r.NusseltDB = DittusBoelter(r.Reynolds, r.Prandtl)
	r.HeatTransferCoeffDB = r.NusseltDB * w.Conductivity / d
	switch {
	case r.Reynolds < ReLaminar:
		r.Nusselt = LaminarNusselt
		r.warn(WarnLaminar, "laminar flow (Re = %.0f < %.0f): heat transfer is poor; raise the flow or use a smaller bore", r.Reynolds, ReLaminar)
	default:
		var ok bool
		r.Nusselt, ok = Gnielinski(r.Reynolds, r.Prandtl)
		if r.Reynolds < ReTurbulent {
			r.warn(WarnTransitional, "transitional flow (Re = %.0f): the heat transfer coefficient is uncertain", r.Reynolds)
		}
		if !ok {
			r.warn(WarnCorrelation, "Gnielinski correlation used outside 3000 ≤ Re ≤ 5e6, 0.5 ≤ Pr ≤ 2000 (Re = %.0f, Pr = %.2f)", r.Reynolds, r.Prandtl)
		}
	}
	r.HeatTransferCoeff = r.Nusselt * w.Conductivity / d

	r.MeanHeatFlux = c.Loss / (math.Pi * d * c.PathLength)
	r.PeakHeatFlux = peak * r.MeanHeatFlux
	r.WallTemperature = tout + r.PeakHeatFlux/r.HeatTransferCoeff

	if tout >= tsat {
		r.warn(WarnBulkBoiling, "outlet water %.1f °C reaches saturation %.1f °C at the outlet pressure: bulk boiling",
			tout-ZeroCelsius, tsat-ZeroCelsius)
	}
	if r.WallTemperature >= tsat {
		r.warn(WarnWallBoiling, "inner wall at the outlet %.1f °C ≥ saturation %.1f °C: subcooled boiling at the wall likely; raise the flow or the outlet pressure",
			r.WallTemperature-ZeroCelsius, tsat-ZeroCelsius)
	}
	if c.SupplyPressure > 0 && r.PressureDrop > c.SupplyPressure {
		r.warn(WarnPressure, "pressure needed %.3g bar exceeds the supply %.3g bar; use more parallel circuits or a larger bore",
			r.PressureDrop/1e5, c.SupplyPressure/1e5)
	}
	if r.Velocity > vmax {
		r.warn(WarnVelocity, "velocity %.2f m/s above %.2f m/s (erosion of copper, common practice)", r.Velocity, vmax)
	}
	return r, nil
}

func (r *Result) warn(k WarningKind, format string, args ...any) {
	r.Warnings = append(r.Warnings, Warning{Kind: k, Message: fmt.Sprintf(format, args...)})
}

func (c Circuit) validate() error {
	pos := []struct {
		name string
		v    float64
	}{
		{"loss (W)", c.Loss}, {"bore diameter (m)", c.BoreDiameter}, {"path length (m)", c.PathLength},
		{"temperature rise (K)", c.TemperatureRise},
	}
	for _, p := range pos {
		if !(p.v > 0) || math.IsInf(p.v, 0) {
			return fmt.Errorf("cooling: %s must be positive and finite, got %g", p.name, p.v)
		}
	}
	nonneg := []struct {
		name string
		v    float64
	}{
		{"supply pressure (Pa)", c.SupplyPressure}, {"outlet pressure (Pa)", c.OutletPressure},
		{"roughness (m)", c.Roughness}, {"minor-loss coefficient", c.MinorLossK}, {"max velocity (m/s)", c.MaxVelocity},
	}
	for _, p := range nonneg {
		if !(p.v >= 0) || math.IsInf(p.v, 0) {
			return fmt.Errorf("cooling: %s must be non-negative and finite, got %g", p.name, p.v)
		}
	}
	if c.Circuits < 0 {
		return fmt.Errorf("cooling: number of circuits %d must not be negative", c.Circuits)
	}
	if c.FluxPeaking != 0 && !(c.FluxPeaking >= 1) {
		return fmt.Errorf("cooling: flux peaking factor %g must be ≥ 1 (or 0 for uniform)", c.FluxPeaking)
	}
	if c.Roughness >= c.BoreDiameter/2 {
		return fmt.Errorf("cooling: roughness %g m is not small against the bore %g m", c.Roughness, c.BoreDiameter)
	}
	if !(c.InletTemperature >= ZeroCelsius) {
		return fmt.Errorf("cooling: inlet temperature %g K is below 0 °C", c.InletTemperature)
	}
	return nil
}
