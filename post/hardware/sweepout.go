package hardware

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math/cmplx"
	"strconv"

	gplot "gonum.org/v1/plot"

	"eddyrz/post"
	"eddyrz/post/plot"
)

// SweepJSON is the JSON shape of a sweep; units are in the keys, currents and voltages rms.
type SweepJSON struct {
	Job             string           `json:"job"`
	File            string           `json:"file"`
	MeshFrequencyHz post.Num         `json:"mesh_frequency_hz"`
	Nodes           int              `json:"nodes"`
	Unknowns        int              `json:"unknowns"`
	Workers         int              `json:"workers"`
	MeshSeconds     post.Num         `json:"mesh_s"`
	SolveSeconds    post.Num         `json:"sweep_s"`
	Factorised      int              `json:"factorised_points"`
	Points          []SweepPointJSON `json:"points"`
}

// SweepPointJSON is one frequency.
type SweepPointJSON struct {
	FrequencyHz  post.Num            `json:"frequency_hz"`
	Coils        []SweepCoilJSON     `json:"coils"`
	PartPowerW   map[string]post.Num `json:"part_power_w"`
	Efficiency   post.Num            `json:"efficiency"`
	BalanceError post.Num            `json:"balance_error"`
	// ReducedBasis is the size of the reduced basis the point was taken from, 0 where it was factorised;
	// Indicator is then its accepted weighted residual.
	ReducedBasis int      `json:"reduced_basis"`
	Indicator    post.Num `json:"residual_indicator"`
}

// SweepCoilJSON is one coil at one frequency.
type SweepCoilJSON struct {
	Name          string       `json:"name"`
	ResistanceOhm post.Num     `json:"resistance_ohm"`
	InductanceH   post.Num     `json:"inductance_h"`
	QualityFactor post.Num     `json:"quality_factor"`
	CurrentA      post.Complex `json:"current_a_rms"`
	VoltageV      post.Complex `json:"voltage_v_rms"`
	PowerW        post.Num     `json:"terminal_power_w"`
	LossW         post.Num     `json:"coil_loss_w"`
}

func cx(z complex128) post.Complex { return post.Complex{Re: post.Num(real(z)), Im: post.Num(imag(z))} }

// JSON returns the JSON shape of the sweep.
func (r *SweepResult) JSON() SweepJSON {
	out := SweepJSON{
		Job: r.Job, File: r.File, MeshFrequencyHz: post.Num(r.MeshFrequency), Nodes: r.Nodes, Unknowns: r.Unknowns,
		Workers: r.Workers, MeshSeconds: post.Num(r.MeshTime.Seconds()), SolveSeconds: post.Num(r.Elapsed.Seconds()),
		Factorised: r.Factorised(),
	}
	for _, p := range r.Points {
		pj := SweepPointJSON{FrequencyHz: post.Num(p.Frequency), PartPowerW: map[string]post.Num{},
			Efficiency: post.Num(p.Efficiency), BalanceError: post.Num(p.BalanceError), ReducedBasis: p.Basis,
			Indicator: post.Num(p.Indicator)}
		for _, c := range p.Coils {
			pj.Coils = append(pj.Coils, SweepCoilJSON{
				Name: c.Name, ResistanceOhm: post.Num(c.Resistance), InductanceH: post.Num(c.Inductance),
				QualityFactor: post.Num(c.Q), CurrentA: cx(c.Current), VoltageV: cx(c.Voltage),
				PowerW: post.Num(c.Power), LossW: post.Num(c.Loss),
			})
		}
		for i, name := range r.Parts {
			pj.PartPowerW[name] = post.Num(p.PartPower[i])
		}
		out.Points = append(out.Points, pj)
	}
	return out
}

// Factorised counts the points that were factorised (the others came from the reduced basis).
func (r *SweepResult) Factorised() int {
	n := 0
	for _, p := range r.Points {
		if p.Basis == 0 {
			n++
		}
	}
	return n
}

// WriteJSON writes the sweep as indented JSON.
func (r *SweepResult) WriteJSON(w io.Writer) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(r.JSON())
}

// WriteCSV writes one row per frequency: frequency_hz, then per coil resistance_ohm, inductance_h,
// quality_factor, current_a_rms (magnitude), voltage_v_rms (magnitude), terminal_power_w, coil_loss_w, then the
// power of each part (W) and the efficiency. Coil columns carry the coil's name as a prefix when there is more
// than one coil.
func (r *SweepResult) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	head := []string{"frequency_hz"}
	var coilNames []string
	if len(r.Points) > 0 {
		for _, c := range r.Points[0].Coils {
			coilNames = append(coilNames, c.Name)
		}
	}
	for _, n := range coilNames {
		pre := ""
		if len(coilNames) > 1 {
			pre = n + ":"
		}
		for _, k := range []string{"resistance_ohm", "inductance_h", "quality_factor", "current_a_rms",
			"voltage_v_rms", "terminal_power_w", "coil_loss_w"} {
			head = append(head, pre+k)
		}
	}
	for _, p := range r.Parts {
		head = append(head, "power_w:"+p)
	}
	head = append(head, "efficiency")
	if err := cw.Write(head); err != nil {
		return err
	}
	g := func(x float64) string { return strconv.FormatFloat(x, 'g', 8, 64) }
	for _, p := range r.Points {
		row := []string{g(p.Frequency)}
		for _, c := range p.Coils {
			row = append(row, g(c.Resistance), g(c.Inductance), g(c.Q), g(cmplx.Abs(c.Current)),
				g(cmplx.Abs(c.Voltage)), g(c.Power), g(c.Loss))
		}
		for _, pw := range p.PartPower {
			row = append(row, g(pw))
		}
		row = append(row, g(p.Efficiency))
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// NamedPlot is a chart with the base name of the file it belongs in.
type NamedPlot struct {
	Name string // e.g. "sweep-resistance"; the caller adds the extension
	Plot *gplot.Plot
}

// Figures returns the sweep's line charts against frequency (kHz): resistance, inductance, quality factor,
// power split (coil terminals, coil loss, each part) and efficiency. logX draws the frequency on a log axis.
func (r *SweepResult) Figures(logX bool) ([]NamedPlot, error) {
	if len(r.Points) == 0 {
		return nil, fmt.Errorf("sweep: no points to plot")
	}
	fk := make([]float64, len(r.Points))
	for i, p := range r.Points {
		fk[i] = p.Frequency / 1e3
	}
	col := func(get func(p SweepPoint) float64) []float64 {
		y := make([]float64, len(r.Points))
		for i, p := range r.Points {
			y[i] = get(p)
		}
		return y
	}
	perCoil := func(scale float64, get func(c CoilPoint) float64) []plot.Series {
		var s []plot.Series
		for ci, c := range r.Points[0].Coils {
			s = append(s, plot.Series{Name: c.Name, X: fk, Points: true,
				Y: col(func(p SweepPoint) float64 { return scale * get(p.Coils[ci]) })})
		}
		return s
	}
	title := func(what string) string { return fmt.Sprintf("%s: %s against frequency", r.Job, what) }
	xl := "f (kHz)"
	specs := []struct {
		name string
		spec plot.LineSpec
	}{
		{"sweep-resistance", plot.LineSpec{Title: title("coil resistance"), XLabel: xl, YLabel: "R (mΩ)", LogX: logX,
			Series: perCoil(1e3, func(c CoilPoint) float64 { return c.Resistance })}},
		{"sweep-inductance", plot.LineSpec{Title: title("coil inductance"), XLabel: xl, YLabel: "L (µH)", LogX: logX,
			Series: perCoil(1e6, func(c CoilPoint) float64 { return c.Inductance })}},
		{"sweep-quality", plot.LineSpec{Title: title("coil quality factor"), XLabel: xl, YLabel: "Q = ωL/R", LogX: logX,
			Series: perCoil(1, func(c CoilPoint) float64 { return c.Q })}},
	}
	var pw []plot.Series
	for ci, c := range r.Points[0].Coils {
		pw = append(pw,
			plot.Series{Name: c.Name + " terminals", X: fk, Y: col(func(p SweepPoint) float64 { return p.Coils[ci].Power / 1e3 })},
			plot.Series{Name: c.Name + " own loss", X: fk, Y: col(func(p SweepPoint) float64 { return p.Coils[ci].Loss / 1e3 })})
	}
	for pi, name := range r.Parts {
		pw = append(pw, plot.Series{Name: name, X: fk, Y: col(func(p SweepPoint) float64 { return p.PartPower[pi] / 1e3 })})
	}
	specs = append(specs, struct {
		name string
		spec plot.LineSpec
	}{"sweep-power", plot.LineSpec{Title: title("power split"), XLabel: xl, YLabel: "P (kW)", LogX: logX, Series: pw}})
	specs = append(specs, struct {
		name string
		spec plot.LineSpec
	}{"sweep-efficiency", plot.LineSpec{Title: title("electrical efficiency"), XLabel: xl,
		YLabel: "η = P_parts / P_terminals", LogX: logX,
		Series: []plot.Series{{X: fk, Y: col(func(p SweepPoint) float64 { return p.Efficiency }), Points: true}}}})

	var out []NamedPlot
	for _, s := range specs {
		if len(s.spec.Series) == 0 {
			continue
		}
		if s.name == "sweep-efficiency" && len(r.Parts) == 0 {
			continue
		}
		p, err := plot.Lines(s.spec)
		if err != nil {
			return nil, fmt.Errorf("sweep plot %s: %w", s.name, err)
		}
		out = append(out, NamedPlot{Name: s.name, Plot: p})
	}
	return out, nil
}
