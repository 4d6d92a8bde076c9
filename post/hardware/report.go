package hardware

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"eddyrz/post"
	"eddyrz/post/circuit"
	"eddyrz/post/study"
)

// Report is the hardware side of a solved job, in its JSON shape: the tank (when the job has [tank]) and the
// coil's cooling water (when it has [cooling]). Currents and voltages are rms.
type Report struct {
	Tank    *TankReport    `json:"tank,omitempty"`
	Cooling *CoolingReport `json:"cooling,omitempty"`
	Notes   []string       `json:"notes,omitempty"`
}

// TankReport is the tank. Its top-level figures are the cold load's; Hot repeats them for the hot load.
type TankReport struct {
	Connection   string   `json:"connection"`
	Capacitance  post.Num `json:"capacitance_f"`
	TargetPowerW post.Num `json:"target_power_w"`
	TargetPart   string   `json:"target_part,omitempty"`
	PowerBasis   string   `json:"target_power_basis"`
	TankStateReport
	Hot *TankStateReport `json:"hot,omitempty"`
	// ShiftHz is the hot minus the cold resonant frequency.
	ShiftHz       post.Num `json:"resonance_shift_hz,omitempty"`
	ShiftRelative post.Num `json:"resonance_shift_relative,omitempty"`
	AllPass       bool     `json:"all_pass"`
}

// TankStateReport is the tank with the load in one temperature state.
type TankStateReport struct {
	Load                string        `json:"load"`
	LoadBasis           string        `json:"load_basis"`
	ResonantFrequencyHz post.Num      `json:"resonant_frequency_hz"`
	IdealFrequencyHz    post.Num      `json:"ideal_lc_frequency_hz"`
	StartFrequencyHz    post.Num      `json:"start_frequency_hz"`
	QualityFactor       post.Num      `json:"quality_factor"`
	CoilQ               post.Num      `json:"coil_quality_factor"`
	CoilResistance      post.Num      `json:"coil_resistance_ohm"`
	CoilInductance      post.Num      `json:"coil_inductance_h"`
	InputImpedance      post.Complex  `json:"input_impedance_ohm"`
	Efficiency          post.Num      `json:"coil_efficiency"`
	CoilCurrent         post.Num      `json:"coil_current_a_rms"`
	CoilVoltage         post.Num      `json:"coil_voltage_v_rms"`
	CoilLoss            post.Num      `json:"coil_loss_w"`
	CapacitorVoltage    post.Num      `json:"capacitor_voltage_v_rms"`
	CapacitorCurrent    post.Num      `json:"capacitor_current_a_rms"`
	CapacitorKvar       post.Num      `json:"capacitor_kvar"`
	TankVoltage         post.Num      `json:"tank_voltage_v_rms"`
	TankCurrent         post.Num      `json:"tank_current_a_rms"`
	InverterVoltage     post.Num      `json:"inverter_voltage_v_rms"`
	InverterCurrent     post.Num      `json:"inverter_current_a_rms"`
	TurnsRatio          post.Num      `json:"turns_ratio"`
	Checks              []CheckReport `json:"checks"`
	FieldSolves         int           `json:"field_solves"`
}

// CheckReport is one duty figure against its rating; Status is "PASS", "OVER" or "not rated".
type CheckReport struct {
	Name   string   `json:"name"`
	Unit   string   `json:"unit"`
	Value  post.Num `json:"value"`
	Rating post.Num `json:"rating,omitempty"`
	Margin post.Num `json:"margin,omitempty"`
	Status string   `json:"status"`
}

// CoolingReport is the coil's water.
type CoolingReport struct {
	CoilLossW          post.Num `json:"coil_loss_w"`
	LossBasis          string   `json:"coil_loss_basis"`
	BoreDiameterM      post.Num `json:"bore_diameter_m"`
	Bore               string   `json:"bore_basis"`
	PathLengthM        post.Num `json:"path_length_m"`
	Circuits           int      `json:"circuits"`
	InletC             post.Num `json:"inlet_c"`
	RiseK              post.Num `json:"temperature_rise_k"`
	FlowLPerMin        post.Num `json:"flow_l_per_min"`
	VelocityMPerS      post.Num `json:"velocity_m_per_s"`
	Reynolds           post.Num `json:"reynolds"`
	Prandtl            post.Num `json:"prandtl"`
	FrictionFactor     post.Num `json:"friction_factor"`
	PressureDropPa     post.Num `json:"pressure_drop_pa"`
	SupplyPressurePa   post.Num `json:"supply_pressure_pa"`
	HeatTransfer       post.Num `json:"heat_transfer_w_per_m2k"`
	WallTemperatureC   post.Num `json:"wall_temperature_c"`
	OutletTemperatureC post.Num `json:"outlet_temperature_c"`
	SaturationC        post.Num `json:"saturation_temperature_c"`
	Warnings           []string `json:"warnings"`
}

// Evaluate runs the hardware analyses the job asks for: the tank (StudyTank) when it has [tank], the coil's
// water (StudyCooling) when it has [cooling]. md is the built model and sol its solution at the job's
// frequency and drive. The cooling loss is the coil's own loss at the tank's operating point (the larger of the
// cold and hot loads) when there is a tank, else the coil loss of sol. It returns nil, nil when the job has
// neither section. The tank search costs field solves (about 4-10 per load state, the two states in parallel).
func Evaluate(md *study.Model, sol *study.Solution) (*Report, error) {
	job := md.Job
	if job.Tank == nil && job.Cooling == nil {
		return nil, nil
	}
	rep := &Report{}
	var ts *TankStudy
	if job.Tank != nil {
		var err error
		if ts, err = StudyTank(md, sol); err != nil {
			return nil, err
		}
		rep.Tank = ts.report()
		rep.Notes = append(rep.Notes, ts.Notes...)
	}
	if job.Cooling != nil {
		if len(sol.Result.Coils) != 1 {
			return nil, fmt.Errorf("cooling: the job has %d coils; the cooling analysis handles exactly one", len(sol.Result.Coils))
		}
		loss := sol.Result.Coils[0].Loss
		basis := fmt.Sprintf("the job's own drive at %.4g kHz", sol.Result.Frequency/1e3)
		if ts != nil {
			loss, basis = ts.Cold.CoilLoss, fmt.Sprintf("tank operating point, %s load", ts.Cold.Load.Name)
			if ts.Hot != nil && ts.Hot.CoilLoss > loss {
				loss, basis = ts.Hot.CoilLoss, fmt.Sprintf("tank operating point, %s load (the larger coil loss)", ts.Hot.Load.Name)
			}
		}
		cs, err := StudyCooling(job, loss, basis)
		if err != nil {
			return nil, err
		}
		rep.Cooling = cs.report()
		rep.Notes = append(rep.Notes, cs.Notes...)
	}
	return rep, nil
}

func (ts *TankStudy) report() *TankReport {
	tr := &TankReport{
		Connection: ts.Tank.Topology.String(), Capacitance: post.Num(ts.Tank.C), TargetPowerW: post.Num(ts.TargetPower),
		TargetPart: ts.TargetPart, PowerBasis: ts.PowerBasis, TankStateReport: ts.Cold.report(),
		AllPass: ts.Cold.Operating.AllPass(),
	}
	if ts.Hot != nil {
		h := ts.Hot.report()
		tr.Hot = &h
		tr.ShiftHz, tr.ShiftRelative = post.Num(ts.Shift.Delta), post.Num(ts.Shift.Relative)
		tr.AllPass = tr.AllPass && ts.Hot.Operating.AllPass()
	}
	return tr
}

func (st TankState) report() TankStateReport {
	op := st.Operating
	r := TankStateReport{
		Load: st.Load.Name, LoadBasis: st.Load.Basis,
		ResonantFrequencyHz: post.Num(op.Frequency), IdealFrequencyHz: post.Num(st.Resonance.IdealFrequency),
		StartFrequencyHz: post.Num(op.StartFrequency), QualityFactor: post.Num(op.TankQ), CoilQ: post.Num(op.CoilQ),
		CoilResistance: post.Num(op.CoilResistance), CoilInductance: post.Num(op.CoilInductance),
		InputImpedance: cx(st.Resonance.InputZ), Efficiency: post.Num(st.Efficiency),
		CoilCurrent: post.Num(op.CoilCurrent), CoilVoltage: post.Num(op.CoilVoltage), CoilLoss: post.Num(st.CoilLoss),
		CapacitorVoltage: post.Num(op.CapacitorVoltage), CapacitorCurrent: post.Num(op.CapacitorCurrent),
		CapacitorKvar: post.Num(op.CapacitorKvar), TankVoltage: post.Num(op.TankVoltage),
		TankCurrent: post.Num(op.TankCurrent), InverterVoltage: post.Num(op.InverterVoltage),
		InverterCurrent: post.Num(op.InverterCurrent), TurnsRatio: post.Num(op.TurnsRatio), FieldSolves: st.Solves,
	}
	for _, c := range op.Checks {
		r.Checks = append(r.Checks, CheckReport{Name: c.Name, Unit: c.Unit, Value: post.Num(c.Value),
			Rating: post.Num(c.Rating), Margin: post.Num(c.Margin), Status: c.Status.String()})
	}
	return r
}

func (cs *CoolingStudy) report() *CoolingReport {
	c, r := cs.Circuit, cs.Result
	n := c.Circuits
	if n == 0 {
		n = 1
	}
	cr := &CoolingReport{
		CoilLossW: post.Num(c.Loss), LossBasis: cs.LossBasis, BoreDiameterM: post.Num(c.BoreDiameter), Bore: cs.Bore,
		PathLengthM: post.Num(c.PathLength), Circuits: n, InletC: post.Num(c.InletTemperature - zeroCelsius),
		RiseK: post.Num(c.TemperatureRise), FlowLPerMin: post.Num(r.FlowLPerMin), VelocityMPerS: post.Num(r.Velocity),
		Reynolds: post.Num(r.Reynolds), Prandtl: post.Num(r.Prandtl), FrictionFactor: post.Num(r.FrictionFactor),
		PressureDropPa: post.Num(r.PressureDrop), SupplyPressurePa: post.Num(c.SupplyPressure),
		HeatTransfer: post.Num(r.HeatTransferCoeff), WallTemperatureC: post.Num(r.WallTemperature - zeroCelsius),
		OutletTemperatureC: post.Num(r.OutletTemperature - zeroCelsius),
		SaturationC:        post.Num(r.SaturationTemperature - zeroCelsius), Warnings: []string{},
	}
	for _, w := range r.Warnings {
		cr.Warnings = append(cr.Warnings, w.Message)
	}
	return cr
}

// WriteText writes the report as an aligned plain-text summary, one figure a line; rating checks end in PASS,
// OVER or "not rated".
func (r *Report) WriteText(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	line := func(format string, a ...any) { fmt.Fprintf(tw, format+"\n", a...) }
	if t := r.Tank; t != nil {
		states := []*TankStateReport{&t.TankStateReport}
		head := "tank (" + t.Connection + fmt.Sprintf(", %s)", post.SI(float64(t.Capacitance), "F"))
		cols := "\t" + t.Load
		if t.Hot != nil {
			states = append(states, t.Hot)
			cols += "\t" + t.Hot.Load
		}
		line("%s%s", head, cols)
		row := func(name string, get func(s *TankStateReport) string) {
			var b strings.Builder
			for _, s := range states {
				b.WriteString("\t" + get(s))
			}
			line("  %s%s", name, b.String())
		}
		for _, s := range states {
			line("  %s load\t%s", s.Load, s.LoadBasis)
		}
		line("  target power\t%s into %s (%s)", post.SI(float64(t.TargetPowerW), "W"), partName(t.TargetPart, t.PowerBasis), t.PowerBasis)
		row("resonant frequency", func(s *TankStateReport) string { return post.SI(float64(s.ResonantFrequencyHz), "Hz") })
		row("ideal 1/(2π√(LC)) at that L", func(s *TankStateReport) string { return post.SI(float64(s.IdealFrequencyHz), "Hz") })
		row("start-up frequency (common practice)", func(s *TankStateReport) string { return post.SI(float64(s.StartFrequencyHz), "Hz") })
		row("coil R, L", func(s *TankStateReport) string {
			return post.SI(float64(s.CoilResistance), "Ω") + ", " + post.SI(float64(s.CoilInductance), "H")
		})
		row("coil Q, tank Q", func(s *TankStateReport) string {
			return fmt.Sprintf("%.3g, %.3g", float64(s.CoilQ), float64(s.QualityFactor))
		})
		row("tank impedance at resonance", func(s *TankStateReport) string {
			return fmt.Sprintf("%.4g %+.2g j Ω", float64(s.InputImpedance.Re), float64(s.InputImpedance.Im))
		})
		row("coil efficiency", func(s *TankStateReport) string { return fmt.Sprintf("%.3f", float64(s.Efficiency)) })
		row("coil current, voltage", func(s *TankStateReport) string {
			return post.SI(float64(s.CoilCurrent), "A") + ", " + post.SI(float64(s.CoilVoltage), "V")
		})
		row("coil own loss", func(s *TankStateReport) string { return post.SI(float64(s.CoilLoss), "W") })
		row("tank current, voltage", func(s *TankStateReport) string {
			return post.SI(float64(s.TankCurrent), "A") + ", " + post.SI(float64(s.TankVoltage), "V")
		})
		row("inverter current", func(s *TankStateReport) string {
			return post.SI(float64(s.InverterCurrent), "A") + " at " + post.SI(float64(s.InverterVoltage), "V")
		})
		row("transformer turns ratio n = N1/N2", func(s *TankStateReport) string { return fmt.Sprintf("%.3g : 1", float64(s.TurnsRatio)) })
		for i := range states[0].Checks {
			row(states[0].Checks[i].Name, func(s *TankStateReport) string {
				c := s.Checks[i]
				v := post.SI(float64(c.Value), c.Unit)
				if c.Status == circuit.NotRated.String() {
					return v + " (not rated)"
				}
				return fmt.Sprintf("%s of %s: %s", v, post.SI(float64(c.Rating), c.Unit), c.Status)
			})
		}
		if t.Hot != nil {
			line("  resonance shift cold → hot\t%s (%+.1f %%)", post.SI(float64(t.ShiftHz), "Hz"), 100*float64(t.ShiftRelative))
		}
		verdict := "PASS: every rated figure within its rating"
		if !t.AllPass {
			verdict = "OVER: a rated figure exceeds its rating"
		}
		line("  ratings\t%s", verdict)
	}
	if c := r.Cooling; c != nil {
		line("coil cooling water\t")
		line("  coil loss\t%s (%s)", post.SI(float64(c.CoilLossW), "W"), c.LossBasis)
		line("  bore, water path\t%s (%s), %s in %d circuit(s)", post.SI(float64(c.BoreDiameterM), "m"), c.Bore, post.SI(float64(c.PathLengthM), "m"), c.Circuits)
		line("  flow for a %.3g K rise\t%.3g L/min (inlet %.1f °C, outlet %.1f °C)", float64(c.RiseK), float64(c.FlowLPerMin), float64(c.InletC), float64(c.OutletTemperatureC))
		line("  velocity, Reynolds, Prandtl\t%.3g m/s, %.0f, %.3g", float64(c.VelocityMPerS), float64(c.Reynolds), float64(c.Prandtl))
		line("  friction factor (Colebrook), pressure drop\t%.4f, %.3g bar of %.3g bar supply", float64(c.FrictionFactor), float64(c.PressureDropPa)/1e5, float64(c.SupplyPressurePa)/1e5)
		line("  heat transfer (Gnielinski), wall at outlet\t%.4g W/(m²·K), %.1f °C (saturation %.1f °C)", float64(c.HeatTransfer), float64(c.WallTemperatureC), float64(c.SaturationC))
		for _, wmsg := range c.Warnings {
			line("  warning\t%s", wmsg)
		}
	}
	for _, n := range r.Notes {
		line("note\t%s", n)
	}
	return tw.Flush()
}

func partName(p, basis string) string {
	if basis == noPartsBasis {
		return "the coil"
	}
	if p == "" {
		return "all parts"
	}
	return fmt.Sprintf("%q", p)
}
