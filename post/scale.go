package post

import (
	"fmt"
	"math"
	"slices"
)

// Scaled returns a copy of r for every source multiplied by k: the field is linear in the sources, so currents,
// voltages and the applied field scale by k, and powers, forces, energies and power densities by |k|².
// Impedances, efficiency, shares, positions and the balance error do not change.
func (r *Result) Scaled(k complex128) *Result {
	k2 := real(k)*real(k) + imag(k)*imag(k)
	out := *r
	out.AppliedBz *= k
	out.StoredEnergy *= k2
	out.Coils = slices.Clone(r.Coils)
	for i := range out.Coils {
		c := &out.Coils[i]
		c.Current *= k
		c.Voltage *= k
		c.Power *= k2
		c.ReactivePower *= k2
		c.Loss *= k2
		c.Turns = slices.Clone(c.Turns)
		for j := range c.Turns {
			t := &c.Turns[j]
			t.Current *= k
			t.LoopVoltage *= k
			t.Voltage *= k
			t.Loss *= k2
		}
	}
	out.Parts = slices.Clone(r.Parts)
	for i := range out.Parts {
		p := &out.Parts[i]
		p.Power *= k2
		p.ForceZ *= k2
		p.ForceR *= k2
		p.ForceZStress *= k2
		p.PeakDensity *= k2
		for j := range p.Thirds {
			p.Thirds[j] *= k2
		}
	}
	return &out
}

// ScaleToPartPower scales every source by the real factor k > 0 that puts watts (W) into the named part, for
// power-driven runs, and returns the scaled result and k: the coils' currents and voltages in the scaled result
// are the ones this power needs. It fails when the part is unknown, has no power, or watts is not positive.
func (r *Result) ScaleToPartPower(part string, watts float64) (*Result, complex128, error) {
	if !(watts > 0) || math.IsInf(watts, 0) {
		return nil, 0, fmt.Errorf("target power for part %q must be positive and finite, got %g W", part, watts)
	}
	for _, p := range r.Parts {
		if p.Name != part {
			continue
		}
		if !(p.Power > 0) {
			return nil, 0, fmt.Errorf("part %q takes no power (%g W), so no drive level gives %g W", part, p.Power, watts)
		}
		k := complex(math.Sqrt(watts/p.Power), 0)
		return r.Scaled(k), k, nil
	}
	return nil, 0, fmt.Errorf("no part named %q", part)
}
