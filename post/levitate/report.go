package levitate

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"

	gplot "gonum.org/v1/plot"

	"eddyrz/post/plot"
)

// Figures returns the study's charts: F_z(z) with the weight line and the equilibria marked stable or unstable,
// P(z), and (nil without a heating sweep) the stable equilibrium height and its power against temperature.
func (r *Result) Figures() (force, power, heating *gplot.Plot, err error) {
	ref := "centre"
	if r.HeightReference == RefBottom {
		ref = "bottom face"
	}
	xl := fmt.Sprintf("part %s height z (mm)", ref)
	var z, f, fo, p []float64
	for _, c := range r.Curve {
		z, f, p = append(z, c.Z*1e3), append(f, c.ForceZ), append(p, c.Power)
		if c.ForceZOther != nil {
			fo = append(fo, *c.ForceZOther)
		}
	}
	spec := plot.LineSpec{
		Title:  fmt.Sprintf("%s: axial force on %s (%s)", r.Job, r.Part, r.ForceMethod),
		XLabel: xl, YLabel: "F_z (N), up positive",
		Series: []plot.Series{{Name: "F_z", X: z, Y: f, Points: true}},
		HLines: []plot.HLine{{Y: r.Weight, Label: fmt.Sprintf("weight m·g = %.4g N", r.Weight)}},
	}
	for _, e := range r.Equilibria {
		k, lab := plot.MarkUnstable, "unstable equilibrium"
		if e.Stable {
			k, lab = plot.MarkStable, "stable equilibrium"
		}
		spec.Marks = append(spec.Marks, plot.Mark{X: e.Z * 1e3, Y: e.ForceZ, Kind: k, Label: lab})
	}
	if force, err = plot.Lines(spec); err != nil {
		return nil, nil, nil, fmt.Errorf("force chart: %w", err)
	}
	if power, err = plot.Lines(plot.LineSpec{
		Title:  fmt.Sprintf("%s: power absorbed by %s", r.Job, r.Part),
		XLabel: xl, YLabel: "P (W)",
		Series: []plot.Series{{Name: "P", X: z, Y: p, Points: true}},
	}); err != nil {
		return nil, nil, nil, fmt.Errorf("power chart: %w", err)
	}
	var tz, tzT, tp []float64
	for _, t := range r.Temperature {
		if t.StableZ != nil {
			tzT, tz, tp = append(tzT, t.TemperatureK-273.15), append(tz, *t.StableZ*1e3), append(tp, *t.PowerAtStable)
		}
	}
	if len(tz) > 0 {
		sp := plot.LineSpec{
			Title:  fmt.Sprintf("%s: stable height of %s as it heats (grid-interpolated)", r.Job, r.Part),
			XLabel: "part temperature (°C)", YLabel: fmt.Sprintf("stable %s height (mm)", ref),
			Series: []plot.Series{{Name: "stable height", X: tzT, Y: tz, Points: true}},
		}
		if heating, err = plot.Lines(sp); err != nil {
			return nil, nil, nil, fmt.Errorf("heating chart: %w", err)
		}
	}
	return force, power, heating, nil
}

func g(x float64) string { return strconv.FormatFloat(x, 'g', 8, 64) }

// WriteCurveCSV writes the height sweep: z, F_z, the other method's F_z, P, ripple, and R, X, L per coil.
func (r *Result) WriteCurveCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	head := []string{"z_m", "force_z_n", "force_z_other_n", "power_w", "ripple", "balance_error"}
	if len(r.Curve) > 0 {
		for _, z := range r.Curve[0].Impedance {
			head = append(head, z.Coil+"_r_ohm", z.Coil+"_x_ohm", z.Coil+"_l_h")
		}
	}
	_ = cw.Write(head)
	for _, c := range r.Curve {
		o := ""
		if c.ForceZOther != nil {
			o = g(*c.ForceZOther)
		}
		row := []string{g(c.Z), g(c.ForceZ), o, g(c.Power), g(c.Ripple), g(c.BalanceError)}
		for _, z := range c.Impedance {
			row = append(row, g(z.R), g(z.X), g(z.L))
		}
		_ = cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

// WriteEquilibriaCSV writes the refined equilibria (and, per temperature, the grid-interpolated ones).
func (r *Result) WriteEquilibriaCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"temperature_k", "refined", "z_m", "force_z_n", "residual_n", "stiffness_n_per_m", "stable", "power_w", "k_r_estimate_n_per_m"})
	row := func(t float64, refined bool, e Equilibrium) {
		kr := ""
		if e.Lateral != nil {
			kr = g(e.Lateral.Kr)
		}
		_ = cw.Write([]string{g(t), strconv.FormatBool(refined), g(e.Z), g(e.ForceZ), g(e.Residual), g(e.Stiffness),
			strconv.FormatBool(e.Stable), g(e.Power), kr})
	}
	for _, e := range r.Equilibria {
		row(r.TemperatureK, true, e)
	}
	for _, tp := range r.Temperature {
		for _, e := range tp.Equilibria {
			row(tp.TemperatureK, false, e)
		}
	}
	cw.Flush()
	return cw.Error()
}

// WriteTemperatureCSV writes the heating sweep as one row per (temperature, height).
func (r *Result) WriteTemperatureCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"temperature_k", "liquid", "resistivity_ohm_m", "z_m", "force_z_n", "power_w"})
	for _, tp := range r.Temperature {
		for i, c := range r.Curve {
			_ = cw.Write([]string{g(tp.TemperatureK), strconv.FormatBool(tp.Liquid), g(tp.Resistivity), g(c.Z), g(tp.ForceZ[i]), g(tp.Power[i])})
		}
	}
	cw.Flush()
	return cw.Error()
}

// WriteLateralCSV writes the small-body lateral estimate along the sweep (header line states it is an estimate).
func (r *Result) WriteLateralCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"z_m", "centre_z_m", "b0_t_rms", "b2_curvature_t2_per_m2", "k_r_estimate_n_per_m", "k_z_small_body_n_per_m", "force_z_small_body_n", "laterally_stable_estimate"})
	if r.Lateral != nil {
		for _, l := range r.Lateral.Curve {
			_ = cw.Write([]string{g(l.Z), g(l.CentreZ), g(l.B0), g(l.B2Curvature), g(l.Kr), g(l.KzSmall), g(l.FzSmall), strconv.FormatBool(l.Stable)})
		}
	}
	cw.Flush()
	return cw.Error()
}

// WriteText writes a short summary for the terminal.
func (r *Result) WriteText(w io.Writer) error {
	pf := func(format string, a ...any) { fmt.Fprintf(w, format, a...) }
	pf("levitation of %q in %q at %.4g kHz (heights: part %s; z up, gravity along −z)\n", r.Part, r.Job, r.FrequencyHz/1e3, r.HeightReference)
	for _, c := range r.Currents {
		pf("  coil %s: %.4g A rms\n", c.Coil, c.Current)
	}
	pf("  mass %.4g g (volume %.4g cm³, density %.4g kg/m³ at %.0f °C), weight %.4g N (g = 9.80665 m/s²)\n",
		r.MassKg*1e3, r.VolumeM3*1e6, r.DensityKgM3, r.TemperatureK-273.15, r.Weight)
	pf("  %d heights from %.4g to %.4g mm, force by %s, max mesh ripple %.2g %%, %d solves\n",
		len(r.Curve), r.Curve[0].Z*1e3, r.Curve[len(r.Curve)-1].Z*1e3, r.ForceMethod, 100*r.MaxRipple, r.Solves)
	if len(r.Equilibria) == 0 {
		pf("  no equilibrium in the swept range\n")
	}
	for _, e := range r.Equilibria {
		st := "UNSTABLE"
		if e.Stable {
			st = "stable"
		}
		pf("  equilibrium at z = %.4g mm: k_z = %.4g N/m (%s), part power %.4g W", e.Z*1e3, e.Stiffness, st, e.Power)
		if e.Lateral != nil {
			ls := "laterally unstable"
			if e.Lateral.Stable {
				ls = "laterally stable"
			}
			pf("; lateral ESTIMATE k_r ≈ %.3g N/m (%s)", e.Lateral.Kr, ls)
		}
		pf("\n")
	}
	if f := r.Float; f != nil {
		if f.Possible {
			pf("  to float at %.4g mm: currents × %.4g (", f.Z*1e3, f.Scale)
			for i, c := range f.Currents {
				if i > 0 {
					pf(", ")
				}
				pf("%s %.4g A rms", c.Coil, c.Current)
			}
			pf("); k_z %.4g N/m, power %.4g W — %s\n", f.Stiffness, f.Power, f.Note)
		} else {
			pf("  to float at %.4g mm: %s\n", f.Z*1e3, f.Note)
		}
	}
	for _, t := range r.Temperature {
		if t.StableZ != nil {
			pf("  at %.0f °C (%s): stable height %.4g mm, power %.4g W\n", t.TemperatureK-273.15, phase(t.Liquid), *t.StableZ*1e3, *t.PowerAtStable)
		} else {
			pf("  at %.0f °C (%s): no stable equilibrium\n", t.TemperatureK-273.15, phase(t.Liquid))
		}
	}
	if r.Lateral != nil {
		pf("  lateral figure: %s\n", r.Lateral.Assumption)
	}
	for _, s := range r.Warnings {
		pf("  warning: %s\n", s)
	}
	for _, s := range r.Cautions {
		pf("  caution: %s\n", s)
	}
	for _, s := range r.Notes {
		pf("  note: %s\n", s)
	}
	return nil
}
