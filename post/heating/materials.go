package heating

import (
	"math"

	"eddyrz/fem/thermal"
	"eddyrz/geometry/material"
)

// thermalMaterial presents a library material to the heat-conduction solver (kelvin in, SI out).
type thermalMaterial struct{ m *material.Material }

// Conductivity is the thermal conductivity k(T), W/(m·K).
func (a thermalMaterial) Conductivity(T float64) float64 { return a.m.ThermalConductivity(T) }

// Density is ρ(T), kg/m³.
func (a thermalMaterial) Density(T float64) float64 { return a.m.Density(T) }

// SpecificHeat is the sensible specific heat c(T), J/(kg·K).
func (a thermalMaterial) SpecificHeat(T float64) float64 { return a.m.SpecificHeat(T) }

// Melting places the enthalpy model's melting interval (thermal.DefaultMushy wide) on the material's melting
// point, with its latent heat; a material that does not melt (Melting = +Inf or no latent heat) gets none.
func (a thermalMaterial) Melting() thermal.Melting {
	if math.IsInf(a.m.Melting, 0) || !(a.m.Melting > 0) || !(a.m.Latent > 0) {
		return thermal.Melting{}
	}
	return thermal.Melting{Point: a.m.Melting, Latent: a.m.Latent}
}

// Thermal returns the heat-conduction view of a library material, for thermal.Model.Materials.
func Thermal(m *material.Material) thermal.Material { return thermalMaterial{m} }

// elementState is what the field solve needs of one part triangle: its material and temperature, K.
type elementState struct {
	mat *material.Material
	T   float64
}

// electrical returns σ (S/m) and μr of a part element at temperature T (K).
func electrical(m *material.Material, T float64) (sigma, mur float64) {
	return m.Conductivity(T), m.MuR(T)
}

// surfaceFactor is √(ρ μr) at T: the surface-impedance scaling of the power a conductor takes at a held surface
// field (P ∝ R_s = √(ω μ0 μr ρ / 2) per unit area).
func surfaceFactor(m *material.Material, T float64) float64 {
	return math.Sqrt(m.Resistivity(T) * m.MuR(T))
}
