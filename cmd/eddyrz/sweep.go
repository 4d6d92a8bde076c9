package main

import (
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"eddyrz/geometry"
	"eddyrz/post/hardware"
	"eddyrz/post/plot"
)

type sweepOptions struct {
	job      string
	from, to string
	points   int
	spacing  string
	workers  int
	out      string
	asJSON   bool
	stdout   io.Writer
}

func newSweepCmd(stdout io.Writer) *cobra.Command {
	o := &sweepOptions{stdout: stdout}
	c := &cobra.Command{
		Use:   "sweep JOB.toml",
		Short: "Sweep the coil's impedance, power split and efficiency over frequency",
		Long: `sweep meshes the job once, at the highest sweep frequency so that the mesh resolves the thinnest skin depth of
the sweep, and solves it at every frequency, re-using the sparse pattern and its fill-reducing analysis. A few
frequencies are factorised; every other point is the best combination of those solutions, accepted only when
its own residual is below 1e-10 of the solution (weighted by the matrix diagonal; in the tests this matches
a direct solve to 1e-8), and factorised too when it is not. For every frequency it reports each
coil's resistance R, inductance L, quality factor Q = ωL/R, current and voltage (rms, at the job's drive: a
power-driven coil is scaled to its target power at every frequency), terminal power, own loss, the power in
each part and the electrical efficiency (parts / coil terminals).

Into --out it writes sweep.csv, sweep.json and the charts sweep-resistance, sweep-inductance, sweep-quality,
sweep-power and sweep-efficiency (.png and .svg). Nothing is written when the sweep fails.

Without --from and --to the sweep spans a decade centred (in log f) on the job's frequency.`,
		Example: `  eddyrz sweep examples/levitation-slug.toml --from 10kHz --to 200kHz --points 40
  eddyrz sweep examples/billet-heater.toml --from 1kHz --to 10kHz --spacing linear --json > sweep.json`,
		Args: cobra.ExactArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			o.job = args[0]
			return runSweep(o)
		},
	}
	f := c.Flags()
	f.StringVar(&o.from, "from", "", "lowest frequency, with its unit (e.g. 10kHz); default the job's frequency/√10")
	f.StringVar(&o.to, "to", "", "highest frequency, with its unit (e.g. 200kHz); default the job's frequency·√10")
	f.IntVar(&o.points, "points", 40, "number of frequencies, ends included")
	f.StringVar(&o.spacing, "spacing", "log", "spacing of the frequencies: log or linear")
	f.IntVar(&o.workers, "workers", 0, "goroutines for the per-point analysis (the factorisations use every CPU); 0 means one per CPU")
	f.StringVarP(&o.out, "out", "o", "", "directory for the tables and charts (default out/JOBNAME)")
	f.BoolVar(&o.asJSON, "json", false, "print the sweep as JSON on stdout instead of the table")
	return c
}

// sweepFrequencies turns the options into the list of frequencies; bad options are command-line errors.
func sweepFrequencies(o *sweepOptions, jobFreq float64) ([]float64, hardware.Spacing, error) {
	sp, err := hardware.ParseSpacing(o.spacing)
	if err != nil {
		return nil, 0, &flagError{fmt.Errorf("--spacing: %w", err)}
	}
	parse := func(name, s string, def float64) (float64, error) {
		if s == "" {
			return def, nil
		}
		v, err := geometry.ParseQuantity(s, geometry.Frequency)
		if err != nil {
			return 0, &flagError{fmt.Errorf("--%s: %w", name, err)}
		}
		return v, nil
	}
	from, err := parse("from", o.from, jobFreq/math.Sqrt(10))
	if err != nil {
		return nil, 0, err
	}
	to, err := parse("to", o.to, jobFreq*math.Sqrt(10))
	if err != nil {
		return nil, 0, err
	}
	freqs, err := hardware.Frequencies(from, to, o.points, sp)
	if err != nil {
		return nil, 0, &flagError{err}
	}
	return freqs, sp, nil
}

func runSweep(o *sweepOptions) error {
	job, err := geometry.ReadFile(o.job)
	if err != nil {
		return err
	}
	freqs, sp, err := sweepFrequencies(o, job.Frequency)
	if err != nil {
		return err
	}
	res, err := hardware.SweepJob(job, freqs, o.workers)
	if err != nil {
		return err
	}
	out := newOutputs(defaultOut(o.job, o.out))
	out.addWriter("sweep.csv", res.WriteCSV)
	out.addWriter("sweep.json", res.WriteJSON)
	figs, err := res.Figures(sp == hardware.LogSpacing)
	if err != nil {
		return err
	}
	for _, fg := range figs {
		for _, ext := range []string{"png", "svg"} {
			out.add(fg.Name+"."+ext, func(p string) error { return plot.Save(fg.Plot, p, 16, 11) })
		}
	}
	if err := out.commit(); err != nil {
		return err
	}
	if o.asJSON {
		return res.WriteJSON(o.stdout)
	}
	if err := writeSweepTable(o.stdout, res); err != nil {
		return err
	}
	fmt.Fprintf(o.stdout, "\n%d points on %d unknowns (mesh for %.4g kHz) in %.3g s: %d factorised, the rest from their reduced basis; files in %s: %v\n",
		len(res.Points), res.Unknowns, res.MeshFrequency/1e3, res.Elapsed.Seconds(), res.Factorised(), out.dir, out.names())
	return nil
}

// writeSweepTable prints one line per frequency for the first coil: R, L, Q, |I|, |V|, terminal power, coil
// loss, part power and efficiency.
func writeSweepTable(w io.Writer, res *hardware.SweepResult) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	coil := ""
	if len(res.Points) > 0 && len(res.Points[0].Coils) > 0 {
		coil = res.Points[0].Coils[0].Name
	}
	fmt.Fprintf(w, "%s: coil %q (currents and voltages rms)\n", res.Job, coil)
	fmt.Fprintln(tw, "f (kHz)\tR (mΩ)\tL (µH)\tQ\tI (A)\tV (V)\tP coil (W)\tloss (W)\tP parts (W)\tefficiency\t")
	for _, p := range res.Points {
		c := p.Coils[0]
		var parts float64
		for _, pw := range p.PartPower {
			parts += pw
		}
		fmt.Fprintf(tw, "%.4g\t%.4g\t%.4g\t%.3g\t%.4g\t%.4g\t%.4g\t%.4g\t%.4g\t%.3f\t\n", p.Frequency/1e3, c.Resistance*1e3,
			c.Inductance*1e6, c.Q, cmplx.Abs(c.Current), cmplx.Abs(c.Voltage), c.Power, c.Loss, parts, p.Efficiency)
	}
	return tw.Flush()
}
