package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/spf13/cobra"

	"eddyrz/geometry"
	"eddyrz/post/heating"
	"eddyrz/post/plot"
)

type heatOptions struct {
	job         string
	out         string
	asJSON      bool
	holdCurrent bool
	duration    float64
	tolerance   float64
	maxTime     float64
	maps        []float64
	stopProbe   string
	stdout      io.Writer
	stderr      io.Writer
}

// newHeatCmd builds the heat command; stderr takes the progress bar (drawn only when it is a terminal).
func newHeatCmd(stdout, stderr io.Writer) *cobra.Command {
	o := &heatOptions{stdout: stdout, stderr: stderr}
	c := &cobra.Command{
		Use:   "heat JOB.toml",
		Short: "Run a coupled heating transient: field, Joule heat, heat conduction, re-solves as the parts warm",
		Long: `heat runs the job's [heating] section: the eddy-current field gives the Joule heat in the parts, a
transient heat-conduction solve on the same mesh (temperature-dependent properties, melting with latent
heat, convection and radiation at the surfaces) turns it into temperature, and the field is solved again,
with conductivity and permeability element by element at the element's temperature, whenever the
estimated change of the parts' power since the last field solve exceeds the job's tolerance. The coil
drive is held as the job says (current, voltage, or target power; --hold-current keeps a power-driven
coil's starting current instead). The run stops after the duration, or when the stop part's coldest
point (or --stop-probe) reaches the stop temperature.

Into --out it writes: heating.json (with time_to_target_s, energy_balance_error and the history),
history.csv, summary.txt, temperature.png/.svg (probes, hottest and coldest points against time),
power.png/.svg (power into the parts against time) and temperature maps map-<t>s.png.
Temperatures are °C in the outputs; currents are rms. Nothing is written when the run fails.`,
		Example: `  eddyrz heat examples/crucible-melt.toml --out out/crucible
  eddyrz heat examples/billet-heater.toml --stop-probe core --json > heat.json
  eddyrz heat examples/billet-heater.toml --hold-current --duration 20 --maps 2,5,10`,
		Args: exactArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			o.job = args[0]
			return runHeat(o)
		},
	}
	f := c.Flags()
	f.StringVarP(&o.out, "out", "o", "", "directory for reports and plots (default out/JOBNAME)")
	f.BoolVar(&o.asJSON, "json", false, "print the report as JSON on stdout instead of the summary")
	f.BoolVar(&o.holdCurrent, "hold-current", false, "keep a power-driven coil's starting current instead of its target power")
	f.Var(newQuantityFlag(geometry.Time, &o.duration), "duration", "run this long instead of the job's stop condition, e.g. \"90 s\" or \"2 min\"")
	f.Float64Var(&o.tolerance, "tolerance", 0, "relative power change that triggers a field re-solve (default: the job's)")
	f.Var(newQuantityFlag(geometry.Time, &o.maxTime), "max-time", "give up on a stop temperature after this much simulated time (default \"1 h\")")
	f.Var(newQuantityListFlag(geometry.Time, &o.maps), "maps", "times for temperature maps, e.g. \"10 s, 30 s, 1 min\" (default: four spread over the run)")
	f.StringVar(&o.stopProbe, "stop-probe", "", "stop when this probe, not the stop part's coldest point, reaches the stop temperature")
	return c
}

func runHeat(o *heatOptions) error {
	if o.duration < 0 || o.tolerance < 0 || o.maxTime < 0 {
		return &flagError{errors.New("--duration, --tolerance and --max-time must not be negative")}
	}
	job, err := geometry.ReadFile(o.job)
	if err != nil {
		return err
	}
	if job.Heating == nil {
		return &geometry.InputError{File: o.job, Key: "heating", Msg: "the job has no [heating] section (add one to run a heating transient)"}
	}
	opt := heating.Options{MapTimes: o.maps, HoldCurrent: o.holdCurrent, Duration: o.duration, Tolerance: o.tolerance,
		MaxDuration: o.maxTime, StopProbe: o.stopProbe}
	bar := newProgressBar(o.stderr)
	if bar != nil {
		opt.Progress = bar.update
	}
	res, err := heating.RunJob(job, opt)
	bar.done()
	if err != nil {
		return err
	}
	rep := res.Report()
	out := newOutputs(defaultOut(o.job, o.out))
	out.addWriter("heating.json", rep.WriteJSON)
	out.addWriter("summary.txt", rep.WriteText)
	out.addWriter("history.csv", res.WriteCSV)
	tc, err := res.TemperatureChart()
	if err != nil {
		return fmt.Errorf("temperature chart: %w", err)
	}
	pc, err := res.PowerChart()
	if err != nil {
		return fmt.Errorf("power chart: %w", err)
	}
	for _, ext := range []string{"png", "svg"} {
		out.add("temperature."+ext, func(p string) error { return plot.Save(tc, p, 18, 11) })
		out.add("power."+ext, func(p string) error { return plot.Save(pc, p, 18, 11) })
	}
	for _, s := range res.Maps {
		fig, err := res.MapFigure(s)
		if err != nil {
			return fmt.Errorf("temperature map at %g s: %w", s.T, err)
		}
		out.add(fmt.Sprintf("map-%ss.png", strings.ReplaceAll(fmt.Sprintf("%.4g", s.T), "+", "")), func(p string) error {
			return plot.Save(fig, p, 14, 16)
		})
	}
	if err := out.commit(); err != nil {
		return err
	}
	if o.asJSON {
		return rep.WriteJSON(o.stdout)
	}
	if err := rep.WriteText(o.stdout); err != nil {
		return err
	}
	fmt.Fprintf(o.stdout, "\nfiles in %s: %v\n", out.dir, out.names())
	return nil
}

// progressBar draws one self-overwriting line on a terminal.
type progressBar struct {
	w    io.Writer
	last int
}

// newProgressBar returns a bar on w when w is a terminal, else nil (a nil bar ignores done).
func newProgressBar(w io.Writer) *progressBar {
	f, ok := w.(*os.File)
	if !ok {
		return nil
	}
	st, err := f.Stat()
	if err != nil || st.Mode()&os.ModeCharDevice == 0 {
		return nil
	}
	return &progressBar{w: w, last: -1}
}

func (b *progressBar) update(p heating.Progress) {
	const width = 30
	n := int(p.Fraction*width + 0.5)
	pct := int(p.Fraction * 100)
	if pct == b.last {
		return
	}
	b.last = pct
	fmt.Fprintf(b.w, "\r[%s%s] %3d%%  t %.1f s  %d field solves  %.0f–%.0f °C ", strings.Repeat("#", n),
		strings.Repeat(" ", width-n), pct, p.Time, p.Solves, p.TMin-273.15, p.TMax-273.15)
}

func (b *progressBar) done() {
	if b != nil {
		fmt.Fprintln(b.w)
	}
}
