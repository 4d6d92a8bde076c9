package main

import (
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"eddyrz/geometry"
	"eddyrz/post"
	"eddyrz/post/hardware"
	"eddyrz/post/plot"
	"eddyrz/post/study"
	"eddyrz/post/vtk"
)

type solveOptions struct {
	job          string
	out          string
	asJSON       bool
	writeVTK     bool
	linear       bool
	exportMatrix string
	stdout       io.Writer
}

func newSolveCmd(stdout io.Writer) *cobra.Command {
	o := &solveOptions{stdout: stdout}
	c := &cobra.Command{
		Use:   "solve JOB.toml",
		Short: "Solve a job's eddy-current field and report power, impedance and forces",
		Long: `solve meshes the job, solves the time-harmonic eddy-current field at the job's frequency and reports,
for every coil, its current, terminal voltage, impedance (R, L, Q, power factor) and losses per turn,
and for every part its Joule power, axial Lorentz force (volume integral, cross-checked by the Maxwell
stress tensor in the surrounding air), peak power density and where it sits, and the share of its power
within one skin depth of its surface. All currents and voltages are rms.

Into --out it writes: report.json, summary.txt, turns.csv, parts.csv, the field maps power.png/.svg/.pdf
(Joule power density with flux lines) and flux.png/.svg (|B| with flux lines), and with --vtk field.vtk.
Nothing is written when the job fails.`,
		Example: `  eddyrz solve examples/levitation-slug.toml --out out/levitation-slug
  eddyrz solve examples/billet-heater.toml --json > billet.json
  eddyrz solve examples/crucible-melt.toml --vtk --linear-scale
  eddyrz solve examples/billet-heater.toml --export-matrix out/matrix`,
		Args: exactArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			o.job = args[0]
			return runSolve(o)
		},
	}
	f := c.Flags()
	f.StringVarP(&o.out, "out", "o", "", "directory for reports and plots (default out/JOBNAME)")
	f.BoolVar(&o.asJSON, "json", false, "print the report as JSON on stdout instead of the summary")
	f.BoolVar(&o.writeVTK, "vtk", false, "also write the mesh and fields as a VTK unstructured grid (field.vtk)")
	f.BoolVar(&o.linear, "linear-scale", false, "colour the power density map on a linear scale (default logarithmic)")
	f.StringVar(&o.exportMatrix, "export-matrix", "", "also write the assembled system A.mtx and right-hand side b.mtx (Matrix Market) into this directory")
	return c
}

func runSolve(o *solveOptions) error {
	job, err := geometry.ReadFile(o.job)
	if err != nil {
		return err
	}
	s, err := study.Solve(job)
	if err != nil {
		return err
	}
	rep := s.Report()
	hw, err := hardware.Evaluate(s.Model, s)
	if err != nil {
		return err
	}
	full := solveReport{Report: rep}
	if hw != nil {
		full.Tank, full.Cooling = hw.Tank, hw.Cooling
		rep.Notes = append(rep.Notes, hw.Notes...)
	}
	out := newOutputs(defaultOut(o.job, o.out))
	if err := addSolveFiles(out, s, &full, o); err != nil {
		return err
	}
	if o.exportMatrix != "" {
		if err := os.MkdirAll(o.exportMatrix, 0o755); err != nil {
			return err
		}
		if err := s.Field.ExportSystem(o.exportMatrix); err != nil {
			return fmt.Errorf("exporting the linear system: %w", err)
		}
	}
	if err := out.commit(); err != nil {
		return err
	}
	if o.asJSON {
		return writeJSON(o.stdout, &full)
	}
	if err := full.writeText(o.stdout); err != nil {
		return err
	}
	fmt.Fprintf(o.stdout, "\nfiles in %s: %v\n", out.dir, out.names())
	return nil
}

// solveReport is the solve's report joined with the tank and cooling studies of a job that asks for them.
type solveReport struct {
	*post.Report
	Tank    *hardware.TankReport    `json:"tank,omitempty"`
	Cooling *hardware.CoolingReport `json:"cooling,omitempty"`
}

// writeText writes the field summary, then the tank and cooling studies.
func (r *solveReport) writeText(w io.Writer) error {
	if err := r.Report.WriteText(w); err != nil {
		return err
	}
	if r.Tank == nil && r.Cooling == nil {
		return nil
	}
	fmt.Fprintln(w)
	return (&hardware.Report{Tank: r.Tank, Cooling: r.Cooling}).WriteText(w)
}

// addSolveFiles registers the report, tables, plots and optional VTK file of a solve.
func addSolveFiles(out *outputs, s *study.Solution, full *solveReport, o *solveOptions) error {
	rep := full.Report
	out.addJSON("report.json", full)
	out.addWriter("summary.txt", full.writeText)
	out.addWriter("turns.csv", rep.WriteTurnsCSV)
	out.addWriter("parts.csv", rep.WritePartsCSV)
	joule, flux, err := s.Figures(study.FigureOptions{Log: !o.linear})
	if err != nil {
		return err
	}
	w, h := s.FigureSize(18)
	for _, ext := range []string{"png", "svg", "pdf"} {
		out.add("power."+ext, func(p string) error { return plot.Save(joule, p, w, h) })
	}
	for _, ext := range []string{"png", "svg"} {
		out.add("flux."+ext, func(p string) error { return plot.Save(flux, p, w, h) })
	}
	if o.writeVTK {
		cf := s.Cells()
		a := make([]complex128, len(s.Field.A))
		for i, v := range s.Field.A {
			a[i] = v * s.Scale
		}
		pts := []vtk.Field{vtk.Complex("A_Wb_per_m_rms", a), vtk.Scalar("flux_Wb", s.FluxFunction())}
		cells := []vtk.Field{vtk.Scalar("joule_W_per_m3", cf.Joule), vtk.Scalar("B_T_rms", cf.B)}
		out.addWriter("field.vtk", func(w io.Writer) error {
			return vtk.WriteUnstructured(w, s.Field.Mesh, pts, cells)
		})
	}
	return nil
}
