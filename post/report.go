package post

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"slices"
	"strconv"
	"text/tabwriter"

	"eddyrz/fem"
)

// cautions are the safety notes every report carries (common practice for induction equipment): general
// reminders, not a safety review. A constant table; Report copies it.
var cautions = [...]string{
	"Coil terminals and tank capacitors carry high voltage; capacitors can hold charge after shutdown.",
	"Strong alternating magnetic fields near the coil: keep people with implanted medical devices away.",
	"Metal objects, rings and watches near the coil heat quickly; remove them before operating.",
	"Run cooling water before power is applied and interlock the supply on water flow and temperature.",
	"Hot metal need not glow: handle heated parts and melts with tools and protective equipment.",
	"Moisture or wet tools in contact with molten metal can cause a steam explosion.",
	"Results are a model: verify on the real equipment at reduced power first.",
	"Follow local electrical and radio-frequency emission codes; installation and repair by licensed practice.",
}

// Num is a float that encodes NaN and ±Inf as JSON null.
type Num float64

// MarshalJSON writes the number, or null when it is not finite.
func (x Num) MarshalJSON() ([]byte, error) {
	f := float64(x)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, f, 'g', -1, 64), nil
}

// Complex is a phasor in JSON form.
type Complex struct {
	Re Num `json:"re"`
	Im Num `json:"im"`
}

func cx(c complex128) Complex { return Complex{Num(real(c)), Num(imag(c))} }

// Report is the JSON shape of a Result. Phasors are rms; units are in the keys.
type Report struct {
	FrequencyHz  Num          `json:"frequency_hz"`
	Mesh         MeshReport   `json:"mesh"`
	BalanceError Num          `json:"balance_error"`
	AppliedBzT   Complex      `json:"applied_bz_t_rms"`
	Coils        []CoilReport `json:"coils"`
	Parts        []PartReport `json:"parts"`
	Efficiency   Num          `json:"efficiency"`
	StoredEnergy Num          `json:"stored_energy_j"`
	Timing       TimingReport `json:"timing_s"`
	Cautions     []string     `json:"cautions"`
	// Notes qualify the results (approximations in the model), one sentence each.
	Notes []string `json:"notes"`
}

// MeshReport gives the problem's size.
type MeshReport struct {
	Nodes     int `json:"nodes"`
	Triangles int `json:"triangles"`
	Unknowns  int `json:"unknowns"`
}

// TimingReport is the time per stage, s.
type TimingReport struct {
	Mesh     Num `json:"mesh"`
	Assemble Num `json:"assemble"`
	Factor   Num `json:"factor"`
	Solve    Num `json:"solve"`
	Analyze  Num `json:"analyze"`
	Total    Num `json:"total"`
}

// CoilReport is one coil.
type CoilReport struct {
	Name          string       `json:"name"`
	Current       Complex      `json:"current_a_rms"`
	CurrentAbs    Num          `json:"current_abs_a_rms"`
	Voltage       Complex      `json:"voltage_v_rms"`
	VoltageAbs    Num          `json:"voltage_abs_v_rms"`
	Impedance     Complex      `json:"impedance_ohm"`
	Resistance    Num          `json:"resistance_ohm"`
	Inductance    Num          `json:"inductance_h"`
	QualityFactor Num          `json:"quality_factor"`
	PowerFactor   Num          `json:"power_factor"`
	Power         Num          `json:"power_w"`
	ReactivePower Num          `json:"reactive_power_var"`
	Loss          Num          `json:"coil_loss_w"`
	Turns         []TurnReport `json:"turns"`
}

// TurnReport is one turn or stranded block.
type TurnReport struct {
	Name        string  `json:"name"`
	Kind        string  `json:"kind"`
	Sense       int     `json:"sense"`
	Strands     int     `json:"strands"`
	Current     Complex `json:"current_a_rms"`
	LoopVoltage Complex `json:"loop_voltage_v_rms"`
	Voltage     Complex `json:"voltage_share_v_rms"`
	Loss        Num     `json:"loss_w"`
}

// PartReport is one part.
type PartReport struct {
	Name         string     `json:"name"`
	Power        Num        `json:"power_w"`
	ForceZ       Num        `json:"force_z_n"`
	ForceZStress Num        `json:"force_z_stress_n"`
	StressDiff   Num        `json:"force_z_rel_diff"`
	StressShell  [2]Num     `json:"stress_shell_m"`
	StressNote   string     `json:"stress_note,omitempty"`
	ForceR       Num        `json:"force_r_n"`
	PeakDensity  Num        `json:"peak_power_density_w_m3"`
	PeakAt       [2]Num     `json:"peak_at_m"`
	SkinDepth    Num        `json:"skin_depth_m"`
	SkinShare    Num        `json:"skin_share"`
	PowerThirds  ThirdsJSON `json:"power_thirds_w"`
	ZExtent      [2]Num     `json:"z_extent_m"`
}

// ThirdsJSON is a part's power by thirds of its height, W.
type ThirdsJSON struct {
	Bottom Num `json:"bottom"`
	Middle Num `json:"middle"`
	Top    Num `json:"top"`
}

// Report builds the JSON shape of r.
func (r *Result) Report() *Report {
	rep := &Report{
		FrequencyHz:  Num(r.Frequency),
		Mesh:         MeshReport{Nodes: r.Nodes, Triangles: r.Triangles, Unknowns: r.Unknowns},
		BalanceError: Num(r.BalanceError),
		AppliedBzT:   cx(r.AppliedBz),
		Efficiency:   Num(r.Efficiency),
		StoredEnergy: Num(r.StoredEnergy),
		Timing: TimingReport{
			Mesh: Num(r.Timing.Mesh.Seconds()), Assemble: Num(r.Timing.Assemble.Seconds()),
			Factor: Num(r.Timing.Factor.Seconds()), Solve: Num(r.Timing.Solve.Seconds()),
			Analyze: Num(r.Timing.Analyze.Seconds()), Total: Num(r.Timing.Total().Seconds()),
		},
		Cautions: slices.Clone(cautions[:]),
		Notes:    []string{},
		Coils:    []CoilReport{},
		Parts:    []PartReport{},
	}
	for _, c := range r.Coils {
		cr := CoilReport{
			Name: c.Name, Current: cx(c.Current), CurrentAbs: Num(cmplx.Abs(c.Current)),
			Voltage: cx(c.Voltage), VoltageAbs: Num(cmplx.Abs(c.Voltage)), Impedance: cx(c.Impedance),
			Resistance: Num(c.Resistance), Inductance: Num(c.Inductance), QualityFactor: Num(c.QualityFactor),
			PowerFactor: Num(c.PowerFactor), Power: Num(c.Power), ReactivePower: Num(c.ReactivePower),
			Loss: Num(c.Loss), Turns: []TurnReport{},
		}
		for _, t := range c.Turns {
			cr.Turns = append(cr.Turns, TurnReport{
				Name: t.Name, Kind: kindName(t.Kind), Sense: t.Sense, Strands: t.Strands, Current: cx(t.Current),
				LoopVoltage: cx(t.LoopVoltage), Voltage: cx(t.Voltage), Loss: Num(t.Loss),
			})
		}
		rep.Coils = append(rep.Coils, cr)
	}
	for _, p := range r.Parts {
		if p.MuR > 1 {
			rep.Notes = append(rep.Notes, fmt.Sprintf("part %q is solved with a linear effective permeability μr = %g: "+
				"an approximation of a saturable magnetic material", p.Name, p.MuR))
		}
		rep.Parts = append(rep.Parts, PartReport{
			Name: p.Name, Power: Num(p.Power), ForceZ: Num(p.ForceZ), ForceZStress: Num(p.ForceZStress),
			StressDiff: Num(p.StressDiff), StressShell: [2]Num{Num(p.ShellInner), Num(p.ShellOuter)},
			StressNote: p.StressNote, ForceR: Num(p.ForceR), PeakDensity: Num(p.PeakDensity),
			PeakAt: [2]Num{Num(p.PeakR), Num(p.PeakZ)}, SkinDepth: Num(p.SkinDepth), SkinShare: Num(p.SkinShare),
			PowerThirds: ThirdsJSON{Num(p.Thirds[0]), Num(p.Thirds[1]), Num(p.Thirds[2])},
			ZExtent:     [2]Num{Num(p.ZMin), Num(p.ZMax)},
		})
	}
	return rep
}

func kindName(k fem.RegionKind) string {
	switch k {
	case fem.SolidTurn:
		return "solid"
	case fem.Stranded:
		return "stranded"
	}
	return "other"
}

// WriteJSON writes the report as indented JSON.
func (rep *Report) WriteJSON(w io.Writer) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	if err := enc.Encode(rep); err != nil {
		return fmt.Errorf("writing JSON report: %w", err)
	}
	return nil
}

// WriteText writes a short aligned summary for a person; every number carries its unit.
func (rep *Report) WriteText(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	p := func(format string, a ...any) { fmt.Fprintf(tw, format+"\n", a...) }
	f := func(x Num, unit string) string { return SI(float64(x), unit) }
	mm := func(x Num) string { return fmt.Sprintf("%.2f mm", float64(x)*1e3) }
	p("frequency\t%s", f(rep.FrequencyHz, "Hz"))
	p("mesh\t%d nodes, %d triangles, %d unknowns", rep.Mesh.Nodes, rep.Mesh.Triangles, rep.Mesh.Unknowns)
	for _, c := range rep.Coils {
		p("coil %q\t", c.Name)
		p("  current\t%s rms", f(c.CurrentAbs, "A"))
		p("  terminal voltage\t%s rms", f(c.VoltageAbs, "V"))
		p("  impedance\t%s %+.4g j Ω", gnum(c.Impedance.Re), float64(c.Impedance.Im))
		p("  resistance, inductance\t%s, %s", f(c.Resistance, "Ω"), f(c.Inductance, "H"))
		p("  quality factor, power factor\t%s, %s", gnum(c.QualityFactor), gnum(c.PowerFactor))
		p("  power at the terminals\t%s (reactive %s)", f(c.Power, "W"), f(c.ReactivePower, "var"))
		p("  coil's own loss\t%s in %d turn(s)", f(c.Loss, "W"), len(c.Turns))
	}
	for _, q := range rep.Parts {
		p("part %q\t", q.Name)
		p("  power\t%s", f(q.Power, "W"))
		p("  axial force (volume)\t%s, up positive", f(q.ForceZ, "N"))
		p("  axial force (stress)\t%s, rel. diff. %s", f(q.ForceZStress, "N"), gnum(q.StressDiff))
		if q.StressNote != "" {
			p("  stress check note\t%s", q.StressNote)
		}
		p("  peak power density\t%s at r = %s, z = %s", f(q.PeakDensity, "W/m³"), mm(q.PeakAt[0]), mm(q.PeakAt[1]))
		p("  within one skin depth\t%.1f %% of the power (δ = %s)", 100*float64(q.SkinShare), mm(q.SkinDepth))
		p("  bottom, middle, top third\t%s, %s, %s", f(q.PowerThirds.Bottom, "W"), f(q.PowerThirds.Middle, "W"), f(q.PowerThirds.Top, "W"))
	}
	p("efficiency (parts / coil terminals)\t%.1f %%", 100*float64(rep.Efficiency))
	p("stored magnetic energy\t%s", f(rep.StoredEnergy, "J"))
	p("energy balance error\t%s", gnum(rep.BalanceError))
	p("time\t%.2f s (mesh %.2f, assemble %.2f, factor %.2f, solve %.2f, analyse %.2f)", float64(rep.Timing.Total),
		float64(rep.Timing.Mesh), float64(rep.Timing.Assemble), float64(rep.Timing.Factor), float64(rep.Timing.Solve),
		float64(rep.Timing.Analyze))
	p("(currents and voltages are rms; powers and forces are time averages)")
	for _, n := range rep.Notes {
		p("note: %s", n)
	}
	for _, s := range rep.Cautions {
		p("caution: %s", s)
	}
	if err := tw.Flush(); err != nil {
		return fmt.Errorf("writing text report: %w", err)
	}
	return nil
}

// gnum formats a number with 5 significant digits, "n/a" when it is not finite.
func gnum(x Num) string {
	f := float64(x)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return "n/a"
	}
	return strconv.FormatFloat(f, 'g', 5, 64)
}

// csvNum formats a number for CSV in full precision, empty when it is not finite.
func csvNum(x Num) string {
	f := float64(x)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return ""
	}
	return strconv.FormatFloat(f, 'g', -1, 64)
}

var turnsCSVHeader = []string{"coil", "turn", "kind", "sense", "strands", "current_re_a_rms", "current_im_a_rms",
	"loop_voltage_re_v_rms", "loop_voltage_im_v_rms", "voltage_share_re_v_rms", "voltage_share_im_v_rms", "loss_w"}

var partsCSVHeader = []string{"part", "power_w", "force_z_n", "force_z_stress_n", "force_z_rel_diff", "force_r_n",
	"peak_power_density_w_m3", "peak_r_m", "peak_z_m", "skin_depth_m", "skin_share", "power_bottom_w",
	"power_middle_w", "power_top_w"}

// WriteTurnsCSV writes one row per turn or stranded block, with a header row naming units.
func (rep *Report) WriteTurnsCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write(turnsCSVHeader)
	for _, c := range rep.Coils {
		for _, t := range c.Turns {
			cw.Write([]string{c.Name, t.Name, t.Kind, strconv.Itoa(t.Sense), strconv.Itoa(t.Strands),
				csvNum(t.Current.Re), csvNum(t.Current.Im), csvNum(t.LoopVoltage.Re), csvNum(t.LoopVoltage.Im),
				csvNum(t.Voltage.Re), csvNum(t.Voltage.Im), csvNum(t.Loss)})
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("writing turns CSV: %w", err)
	}
	return nil
}

// WritePartsCSV writes one row per part, with a header row naming units.
func (rep *Report) WritePartsCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write(partsCSVHeader)
	for _, p := range rep.Parts {
		cw.Write([]string{p.Name, csvNum(p.Power), csvNum(p.ForceZ), csvNum(p.ForceZStress), csvNum(p.StressDiff),
			csvNum(p.ForceR), csvNum(p.PeakDensity), csvNum(p.PeakAt[0]), csvNum(p.PeakAt[1]), csvNum(p.SkinDepth),
			csvNum(p.SkinShare), csvNum(p.PowerThirds.Bottom), csvNum(p.PowerThirds.Middle), csvNum(p.PowerThirds.Top)})
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("writing parts CSV: %w", err)
	}
	return nil
}
