package heating

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"

	"eddyrz/fem/thermal"
	"eddyrz/post/plot"
	"eddyrz/post/study"

	gplot "gonum.org/v1/plot"
)

// Report is the JSON form of a heating run. Temperatures are °C, times s, powers W, energies J, currents A rms.
type Report struct {
	Job                string          `json:"job"`
	Parts              []string        `json:"parts"`
	Coils              []string        `json:"coils"`
	Drive              string          `json:"drive"`
	Stop               string          `json:"stop"`
	TimeStep           float64         `json:"time_step_s"`
	Tolerance          float64         `json:"resolve_tolerance"`
	ResolveRule        string          `json:"resolve_rule"`
	TargetReached      bool            `json:"target_reached"`
	TimeToTarget       *float64        `json:"time_to_target_s"`
	EndTime            float64         `json:"end_time_s"`
	Steps              int             `json:"steps"`
	FieldSolves        int             `json:"field_solves"`
	EnergyIn           float64         `json:"energy_in_j"`
	EnergyStored       float64         `json:"energy_stored_j"`
	EnergyConvection   float64         `json:"energy_convection_j"`
	EnergyRadiation    float64         `json:"energy_radiation_j"`
	EnergyBalanceError float64         `json:"energy_balance_error"`
	LiquidVolume       float64         `json:"liquid_volume_m3"`
	FinalMaxC          float64         `json:"final_t_max_c"`
	FinalMinC          float64         `json:"final_t_min_c"`
	Probes             []ProbeReport   `json:"probes"`
	Notes              []string        `json:"notes"`
	History            []HistoryRecord `json:"history"`
	ElapsedS           float64         `json:"elapsed_s"`
	FieldS             float64         `json:"field_solve_s"`
	HeatS              float64         `json:"heat_step_s"`
}

// ProbeReport names a probe point, m.
type ProbeReport struct {
	Name string  `json:"name"`
	R    float64 `json:"r_m"`
	Z    float64 `json:"z_m"`
}

// HistoryRecord is one Sample in report units.
type HistoryRecord struct {
	T           float64   `json:"t_s"`
	Power       float64   `json:"power_w"`
	PartPower   []float64 `json:"part_power_w"`
	CoilCurrent []float64 `json:"coil_current_a"`
	TMax        float64   `json:"t_max_c"`
	TMin        float64   `json:"t_min_c"`
	Probes      []float64 `json:"probes_c"`
	StopCold    *float64  `json:"stop_part_min_c,omitempty"`
	FieldSolve  bool      `json:"field_solve"`
}

func celsius(T float64) float64 { return T - thermal.ZeroCelsius }

// Report returns the run in report units.
func (r *Result) Report() *Report {
	rep := &Report{Job: r.Job.Name, Parts: r.Parts, Coils: r.Coils, Drive: r.Held, Stop: r.Stop,
		TimeStep: r.TimeStep, Tolerance: r.Tolerance, ResolveRule: r.Rule, TargetReached: r.Reached,
		Steps: r.Steps, FieldSolves: r.Solves, EnergyIn: r.EnergyIn, EnergyStored: r.Energy.Stored,
		EnergyConvection: r.Energy.Convection, EnergyRadiation: r.Energy.Radiation,
		EnergyBalanceError: r.EnergyBalanceError, LiquidVolume: r.LiquidVolume, ElapsedS: r.Elapsed.Seconds(),
		FieldS: r.FieldTime.Seconds(), HeatS: r.HeatTime.Seconds()}
	if r.Reached {
		t := r.TargetTime
		rep.TimeToTarget = &t
	}
	for _, p := range r.Probes {
		rep.Probes = append(rep.Probes, ProbeReport{Name: p.Name, R: p.R, Z: p.Z})
	}
	last := r.History[len(r.History)-1]
	rep.EndTime, rep.FinalMaxC, rep.FinalMinC = last.T, celsius(last.TMax), celsius(last.TMin)
	for _, s := range r.History {
		h := HistoryRecord{T: s.T, Power: s.Power, PartPower: s.PartPower, CoilCurrent: s.CoilCurrent,
			TMax: celsius(s.TMax), TMin: celsius(s.TMin), FieldSolve: s.Solved}
		for _, p := range s.Probes {
			h.Probes = append(h.Probes, celsius(p))
		}
		if !math.IsNaN(s.StopCold) {
			c := celsius(s.StopCold)
			h.StopCold = &c
		}
		rep.History = append(rep.History, h)
	}
	rep.Notes = append(rep.Notes, "re-solve rule: "+r.Rule+fmt.Sprintf(" (tolerance %g)", r.Tolerance))
	rep.Notes = append(rep.Notes, "energy balance: energy_in_j (the field solutions' Joule power integrated over time) against "+
		"the rise of the parts' enthalpy (latent heat included) plus convection and radiation losses")
	for _, reg := range r.Model.Layout.Regions {
		if reg.Material != nil && reg.Material.Magnetic() {
			rep.Notes = append(rep.Notes, fmt.Sprintf("region %q: μr = %g below the Curie temperature (%.0f °C) is a linear "+
				"effective approximation of a field-dependent permeability", reg.Name, reg.Material.MuRel, celsius(reg.Material.Curie)))
		}
	}
	return rep
}

// WriteJSON writes the report as indented JSON.
func (rep *Report) WriteJSON(w io.Writer) error {
	e := json.NewEncoder(w)
	e.SetIndent("", "  ")
	return e.Encode(rep)
}

// WriteText writes a short summary for the terminal.
func (rep *Report) WriteText(w io.Writer) error {
	var err error
	p := func(format string, a ...any) {
		if err == nil {
			_, err = fmt.Fprintf(w, format, a...)
		}
	}
	p("%s: heating\n", rep.Job)
	p("  drive: %s\n  stop: %s\n", rep.Drive, rep.Stop)
	if rep.TimeToTarget != nil {
		p("  target reached after %.2f s\n", *rep.TimeToTarget)
	} else if rep.Stop != "" && rep.TimeToTarget == nil && !rep.TargetReached && len(rep.History) > 0 && rep.History[0].StopCold != nil {
		p("  target NOT reached within %.1f s\n", rep.EndTime)
	}
	p("  end %.2f s after %d steps of %.3g s, %d field solves (re-solve tolerance %.3g)\n", rep.EndTime, rep.Steps, rep.TimeStep, rep.FieldSolves, rep.Tolerance)
	p("  final temperatures: hottest %.1f °C, coldest %.1f °C\n", rep.FinalMaxC, rep.FinalMinC)
	if len(rep.History) > 0 {
		last := rep.History[len(rep.History)-1]
		for i, pr := range rep.Probes {
			p("  probe %q (r %.1f mm, z %.1f mm): %.1f °C\n", pr.Name, pr.R*1e3, pr.Z*1e3, last.Probes[i])
		}
	}
	p("  energy: in %.4g J, stored %.4g J, convection %.4g J, radiation %.4g J; balance error %.2e\n",
		rep.EnergyIn, rep.EnergyStored, rep.EnergyConvection, rep.EnergyRadiation, rep.EnergyBalanceError)
	if rep.LiquidVolume > 0 {
		p("  molten volume %.4g cm³\n", rep.LiquidVolume*1e6)
	}
	for _, n := range rep.Notes {
		p("  note: %s\n", n)
	}
	return err
}

// WriteCSV writes the history as CSV with a header row: time, power, per-part power, per-coil current,
// hottest, coldest, per-probe temperatures (°C) and whether the field was solved again for the step.
func (r *Result) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	head := []string{"t_s", "power_w"}
	for _, p := range r.Parts {
		head = append(head, "power_w:"+p)
	}
	for _, c := range r.Coils {
		head = append(head, "current_a_rms:"+c)
	}
	head = append(head, "t_max_c", "t_min_c")
	for _, p := range r.Probes {
		head = append(head, "t_c:"+p.Name)
	}
	head = append(head, "field_solve")
	if err := cw.Write(head); err != nil {
		return err
	}
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', 8, 64) }
	for _, s := range r.History {
		row := []string{f(s.T), f(s.Power)}
		for _, p := range s.PartPower {
			row = append(row, f(p))
		}
		for _, c := range s.CoilCurrent {
			row = append(row, f(c))
		}
		row = append(row, f(celsius(s.TMax)), f(celsius(s.TMin)))
		for _, p := range s.Probes {
			row = append(row, f(celsius(p)))
		}
		row = append(row, strconv.FormatBool(s.Solved))
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// TemperatureChart plots temperature against time at the probes and at the hottest and coldest points, °C,
// with the stop temperature as a dashed line when the run has one.
func (r *Result) TemperatureChart() (*gplot.Plot, error) {
	n := len(r.History)
	t := make([]float64, n)
	hot, cold := make([]float64, n), make([]float64, n)
	probes := make([][]float64, len(r.Probes))
	for i, s := range r.History {
		t[i], hot[i], cold[i] = s.T, celsius(s.TMax), celsius(s.TMin)
		for k, v := range s.Probes {
			probes[k] = append(probes[k], celsius(v))
		}
	}
	spec := plot.LineSpec{Title: r.Job.Name + ": temperature", XLabel: "t (s)", YLabel: "T (°C)",
		Series: []plot.Series{{Name: "hottest point", X: t, Y: hot}, {Name: "coldest point", X: t, Y: cold}}}
	for k, p := range r.Probes {
		spec.Series = append(spec.Series, plot.Series{Name: p.Name, X: t, Y: probes[k]})
	}
	if h := r.Job.Heating; h != nil && h.StopTemperature > 0 && !math.IsNaN(r.History[0].StopCold) {
		spec.HLines = append(spec.HLines, plot.HLine{Y: celsius(h.StopTemperature), Label: "stop temperature"})
	}
	if r.Reached {
		spec.Marks = append(spec.Marks, plot.Mark{X: r.TargetTime, Y: celsius(r.Job.Heating.StopTemperature), Label: "target reached"})
	}
	return plot.Lines(spec)
}

// PowerChart plots the Joule power into each part against time, W, with markers where the field was solved.
func (r *Result) PowerChart() (*gplot.Plot, error) {
	n := len(r.History)
	t := make([]float64, n)
	total := make([]float64, n)
	parts := make([][]float64, len(r.Parts))
	var marks []plot.Mark
	for i, s := range r.History {
		t[i], total[i] = s.T, s.Power
		for k, p := range s.PartPower {
			parts[k] = append(parts[k], p)
		}
		if s.Solved {
			marks = append(marks, plot.Mark{X: s.T, Y: s.Power, Label: "field solved"})
		}
	}
	spec := plot.LineSpec{Title: r.Job.Name + ": power into the parts", XLabel: "t (s)", YLabel: "P (W)", Marks: marks}
	if len(r.Parts) > 1 {
		spec.Series = append(spec.Series, plot.Series{Name: "all parts", X: t, Y: total})
		for k, p := range r.Parts {
			spec.Series = append(spec.Series, plot.Series{Name: p, X: t, Y: parts[k]})
		}
	} else {
		spec.Series = append(spec.Series, plot.Series{Name: r.Parts[0], X: t, Y: total})
	}
	return plot.Lines(spec)
}

// MapFigure draws a temperature map of the parts, °C, with the region outlines.
func (r *Result) MapFigure(s Snapshot) (*plot.Figure, error) {
	m := r.Model.Mesh
	vals := make([]float64, len(s.Temperature))
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, T := range s.Temperature {
		vals[i] = celsius(T)
		if !math.IsNaN(T) {
			lo, hi = math.Min(lo, vals[i]), math.Max(hi, vals[i])
		}
	}
	w := r.Model.ConductorWindow(0.1)
	spec := plot.FieldSpec{Title: fmt.Sprintf("%s: temperature at %.4g s", r.Job.Name, s.T), Unit: "°C",
		NodeValues: vals, Outlines: study.Outlines(m), View: w}
	if !(hi > lo) {
		spec.Min, spec.Max = lo-0.5, lo+0.5
	}
	return plot.FieldMap(m, spec)
}
