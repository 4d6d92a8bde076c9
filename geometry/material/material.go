// Package material holds the electrical and thermal properties of the conductors eddyrz models, as functions
// of temperature, and a built-in library with the published source of every number.
//
// Units are SI: kelvin, ohm metres, siemens per metre, kg/m³, J/(kg·K), W/(m·K), J/kg. A material has two
// phases: solid below its melting point and liquid at or above it (T ≥ Melting means liquid). Properties are
// interpolated linearly in tables and held constant beyond the ends of a table.
package material

import (
	"fmt"
	"math"
	"sort"
)

// Table is a property tabulated against temperature: V[i] at T[i] kelvin, T strictly increasing. Between
// points it interpolates linearly; outside the range it holds the end values.
type Table struct {
	T, V []float64
}

// Const is a table with one value at every temperature.
func Const(v float64) Table { return Table{T: []float64{293.15}, V: []float64{v}} }

// At returns the interpolated value at temperature t (K).
func (tb Table) At(t float64) float64 {
	n := len(tb.T)
	switch {
	case n == 0:
		return 0
	case t <= tb.T[0] || n == 1:
		return tb.V[0]
	case t >= tb.T[n-1]:
		return tb.V[n-1]
	}
	i := sort.SearchFloat64s(tb.T, t) // tb.T[i-1] < t ≤ tb.T[i]
	f := (t - tb.T[i-1]) / (tb.T[i] - tb.T[i-1])
	return tb.V[i-1] + f*(tb.V[i]-tb.V[i-1])
}

// Check reports a malformed table: unequal lengths, no points, T not strictly increasing, non-finite or
// non-positive values when positive is set.
func (tb Table) Check(positive bool) error {
	if len(tb.T) == 0 || len(tb.T) != len(tb.V) {
		return fmt.Errorf("table needs equal, non-zero numbers of temperatures and values (%d, %d)", len(tb.T), len(tb.V))
	}
	for i := range tb.T {
		if math.IsNaN(tb.T[i]) || math.IsInf(tb.T[i], 0) || math.IsNaN(tb.V[i]) || math.IsInf(tb.V[i], 0) {
			return fmt.Errorf("table point %d is not a finite number", i+1)
		}
		if i > 0 && tb.T[i] <= tb.T[i-1] {
			return fmt.Errorf("table temperatures must increase (point %d)", i+1)
		}
		if positive && tb.V[i] <= 0 {
			return fmt.Errorf("table value %d must be positive", i+1)
		}
	}
	return nil
}

// Material is a conductor's property set. The zero value of an optional field means "not known"; HasThermal
// says whether the thermal set is complete.
type Material struct {
	Name        string
	Description string
	// Resistivity of the solid, Ω·m, against temperature.
	ResistivitySolid Table
	// ResistivityLiquid is the liquid's resistivity, Ω·m (0: use the solid table's last value).
	ResistivityLiquid float64
	// MuRel is the relative permeability below the Curie temperature (1 for non-magnetic materials). For a
	// steel it is a linear effective value: an approximation of a field-dependent property.
	MuRel float64
	// Curie is the Curie temperature, K (0 for non-magnetic materials). At and above it μr = 1.
	Curie float64
	// DensitySolid and DensityLiquid, kg/m³ (liquid 0: same as solid).
	DensitySolid, DensityLiquid float64
	// SpecificHeatTable, J/(kg·K), against temperature.
	SpecificHeatTable Table
	// ThermalCondTable, W/(m·K), against temperature (the liquid keeps the value at the melting point).
	ThermalCondTable Table
	// EmissivityValue is the total hemispherical emissivity of the surface as heated (0–1).
	EmissivityValue float64
	// Melting is the melting point (liquidus for alloys), K; +Inf for a material that does not melt.
	Melting float64
	// Latent is the latent heat of fusion, J/kg (0 for a material that does not melt).
	Latent float64
}

// Liquid reports whether the material is liquid at temperature t (K): t ≥ Melting.
func (m *Material) Liquid(t float64) bool { return t >= m.Melting }

// Resistivity returns the electrical resistivity at temperature t (K), Ω·m.
func (m *Material) Resistivity(t float64) float64 {
	if m.Liquid(t) && m.ResistivityLiquid > 0 {
		return m.ResistivityLiquid
	}
	return m.ResistivitySolid.At(t)
}

// Conductivity returns the electrical conductivity at temperature t (K), S/m.
func (m *Material) Conductivity(t float64) float64 { return 1 / m.Resistivity(t) }

// MuR returns the relative permeability at temperature t (K): MuRel below the Curie temperature, 1 above it.
func (m *Material) MuR(t float64) float64 {
	if m.MuRel <= 1 || (m.Curie > 0 && t >= m.Curie) {
		return 1
	}
	return m.MuRel
}

// Magnetic reports whether the material has μr > 1 at some temperature (its μr is then an approximation).
func (m *Material) Magnetic() bool { return m.MuRel > 1 }

// Density returns the mass density at temperature t (K), kg/m³.
func (m *Material) Density(t float64) float64 {
	if m.Liquid(t) && m.DensityLiquid > 0 {
		return m.DensityLiquid
	}
	return m.DensitySolid
}

// SpecificHeat returns the specific heat capacity at temperature t (K), J/(kg·K).
func (m *Material) SpecificHeat(t float64) float64 { return m.SpecificHeatTable.At(t) }

// ThermalConductivity returns the thermal conductivity at temperature t (K), W/(m·K); the liquid keeps the
// value at the melting point.
func (m *Material) ThermalConductivity(t float64) float64 {
	if m.Liquid(t) {
		t = m.Melting
	}
	return m.ThermalCondTable.At(t)
}

// Emissivity returns the surface emissivity at temperature t (K) (constant in this library).
func (m *Material) Emissivity(t float64) float64 { return m.EmissivityValue }

// SkinDepth returns δ = sqrt(2ρ/(ω μ0 μr)) in metres at frequency f (Hz) and temperature t (K).
func (m *Material) SkinDepth(f, t float64) float64 {
	return math.Sqrt(2 * m.Resistivity(t) / (2 * math.Pi * f * Mu0 * m.MuR(t)))
}

// HasThermal reports whether density, specific heat, thermal conductivity and emissivity are all given.
func (m *Material) HasThermal() bool {
	return m.DensitySolid > 0 && len(m.SpecificHeatTable.T) > 0 && len(m.ThermalCondTable.T) > 0 && m.EmissivityValue > 0
}

// Check reports an inconsistent material (programmer or user data): bad tables, values out of range.
func (m *Material) Check() error {
	if err := m.ResistivitySolid.Check(true); err != nil {
		return fmt.Errorf("material %q resistivity: %w", m.Name, err)
	}
	if m.ResistivityLiquid < 0 || m.MuRel < 0 || m.Curie < 0 || m.DensitySolid < 0 || m.DensityLiquid < 0 || m.Latent < 0 {
		return fmt.Errorf("material %q: negative property", m.Name)
	}
	if m.EmissivityValue < 0 || m.EmissivityValue > 1 {
		return fmt.Errorf("material %q: emissivity %g outside 0..1", m.Name, m.EmissivityValue)
	}
	for _, tb := range []Table{m.SpecificHeatTable, m.ThermalCondTable} {
		if len(tb.T) > 0 {
			if err := tb.Check(true); err != nil {
				return fmt.Errorf("material %q: %w", m.Name, err)
			}
		}
	}
	return nil
}

// Mu0 is the magnetic constant, H/m, taken as 4π·10⁻⁷ (the pre-2019 exact value; the CODATA 2018 value
// differs by about 5·10⁻¹⁰ relative, far below anything eddyrz resolves).
const Mu0 = 4e-7 * math.Pi

// CToK converts degrees Celsius to kelvin.
func CToK(c float64) float64 { return c + 273.15 }
