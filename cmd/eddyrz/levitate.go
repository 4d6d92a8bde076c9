package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"eddyrz/geometry"
	"eddyrz/post/levitate"
	"eddyrz/post/plot"
)

type levitateOptions struct {
	job          string
	out          string
	asJSON       bool
	part         string
	from, to     string
	positions    int
	temperatures string
	noHeating    bool
	floatAt      string
	workers      int
	jobMesh      bool
	force        string
	stdout       io.Writer
}

func newLevitateCmd(stdout io.Writer) *cobra.Command {
	o := &levitateOptions{stdout: stdout}
	c := &cobra.Command{
		Use:   "levitate JOB.toml",
		Short: "Sweep a part's height in the coil: lift, weight, equilibria and their stability",
		Long: `levitate moves a part along the axis through a range of heights (re-meshing it at each height, the
heights solved in parallel) and reports the axial force F_z(z), the power it absorbs P(z) and the coil
impedance Z(z); its weight m·g (g = 9.80665 m/s², gravity along −z); every height where F_z = m·g, refined
with further solves, with the axial stiffness k_z = −dF_z/dz and whether it is stable; optionally the coil
current that floats the part at a height you name (force scales with I² in this linear model); a small-body
ESTIMATE of lateral stability from the coil's field on the axis; and the same equilibria with the part at
other temperatures up to and past its melting point. A sphere's height is its centre, other parts' their
bottom face. Defaults come from the job's [levitation] section, else from the coil's axial extent.

Into --out it writes levitation.json, curve.csv, equilibria.csv, temperature.csv, lateral.csv, summary.txt
and the charts force.png/.svg, power.png/.svg and heating.png/.svg. Nothing is written when the job fails.`,
		Example: `  eddyrz levitate examples/levitation-slug.toml
  eddyrz levitate examples/levitation-slug.toml --from -6mm --to 12mm --positions 41 --json
  eddyrz levitate examples/levitation-slug.toml --float-at 5mm --temperatures "20 C, 600 C, 700 C"`,
		Args: cobra.ExactArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			o.job = args[0]
			return runLevitate(o)
		},
	}
	f := c.Flags()
	f.StringVarP(&o.out, "out", "o", "", "directory for reports and charts (default out/JOBNAME)")
	f.BoolVar(&o.asJSON, "json", false, "print the study as JSON on stdout instead of the summary")
	f.StringVar(&o.part, "part", "", "part to levitate (default: the [levitation] section's, or the only part)")
	f.StringVar(&o.from, "from", "", "lowest height of the sweep, e.g. \"-4 mm\"")
	f.StringVar(&o.to, "to", "", "highest height of the sweep, e.g. \"10 mm\"")
	f.IntVar(&o.positions, "positions", 0, "number of heights (default: the [levitation] section's, else 21)")
	f.StringVar(&o.temperatures, "temperatures", "", "comma-separated part temperatures for the heating sweep, e.g. \"20 C, 500 C, 700 C\"")
	f.BoolVar(&o.noHeating, "no-heating", false, "skip the sweep over part temperature")
	f.StringVar(&o.floatAt, "float-at", "", "also find the current that floats the part at this height, e.g. \"5 mm\"")
	f.IntVar(&o.workers, "workers", 0, "concurrent solves (default: the number of CPUs)")
	f.BoolVar(&o.jobMesh, "job-mesh", false, "use the job's own mesh controls instead of the coarser sweep mesh (slower; more accurate power)")
	f.StringVar(&o.force, "force", levitate.ForceStress, "how F_z is formed: \"stress\" (Maxwell stress in the air) or \"volume\" (−∫Re{J B_r*} dV)")
	return c
}

func runLevitate(o *levitateOptions) error {
	job, err := geometry.ReadFile(o.job)
	if err != nil {
		return err
	}
	opt := levitate.Options{Part: o.part, Positions: o.positions, Workers: o.workers, NoTemperatureSweep: o.noHeating, Force: o.force}
	length := func(flag, s string) (float64, error) {
		v, err := geometry.ParseQuantity(s, geometry.Length)
		if err != nil {
			return 0, &flagError{fmt.Errorf("--%s %q: %w", flag, s, err)}
		}
		return v, nil
	}
	if (o.from == "") != (o.to == "") {
		return &flagError{fmt.Errorf("give both --from and --to, or neither")}
	}
	if o.from != "" {
		if opt.ZFrom, err = length("from", o.from); err != nil {
			return err
		}
		if opt.ZTo, err = length("to", o.to); err != nil {
			return err
		}
	}
	if o.floatAt != "" {
		z, err := length("float-at", o.floatAt)
		if err != nil {
			return err
		}
		opt.FloatAt = &z
	}
	if o.temperatures != "" {
		for _, s := range strings.Split(o.temperatures, ",") {
			t, err := geometry.ParseQuantity(strings.TrimSpace(s), geometry.Temperature)
			if err != nil {
				return &flagError{fmt.Errorf("--temperatures %q: %w", s, err)}
			}
			opt.Temperatures = append(opt.Temperatures, t)
		}
	}
	if o.jobMesh {
		m := job.Mesh
		opt.Mesh = &m
	}
	res, err := levitate.Run(job, opt)
	if err != nil {
		return err
	}
	out := newOutputs(defaultOut(o.job, o.out))
	out.addJSON("levitation.json", res)
	out.addWriter("summary.txt", res.WriteText)
	out.addWriter("curve.csv", res.WriteCurveCSV)
	out.addWriter("equilibria.csv", res.WriteEquilibriaCSV)
	out.addWriter("temperature.csv", res.WriteTemperatureCSV)
	out.addWriter("lateral.csv", res.WriteLateralCSV)
	force, power, heating, err := res.Figures()
	if err != nil {
		return err
	}
	for _, ext := range []string{"png", "svg"} {
		out.add("force."+ext, func(p string) error { return plot.Save(force, p, 18, 12) })
		out.add("power."+ext, func(p string) error { return plot.Save(power, p, 18, 12) })
		if heating != nil {
			out.add("heating."+ext, func(p string) error { return plot.Save(heating, p, 18, 12) })
		}
	}
	if err := out.commit(); err != nil {
		return err
	}
	if o.asJSON {
		return writeJSON(o.stdout, res)
	}
	if err := res.WriteText(o.stdout); err != nil {
		return err
	}
	fmt.Fprintf(o.stdout, "\nfiles in %s: %v\n", out.dir, out.names())
	return nil
}
