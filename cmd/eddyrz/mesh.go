package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"eddyrz/geometry"
	"eddyrz/post/plot"
	"eddyrz/post/study"
)

type meshOptions struct {
	job    string
	out    string
	asJSON bool
	stdout io.Writer
}

func newMeshCmd(stdout io.Writer) *cobra.Command {
	o := &meshOptions{stdout: stdout}
	c := &cobra.Command{
		Use:   "mesh JOB.toml",
		Short: "Mesh a job's r-z cross-section and report its size and quality",
		Long: `mesh lays out the job's coil and parts in the r-z half plane, triangulates it (constrained Delaunay,
refined to the job's minimum angle and to a size field set by the skin depth at the job's frequency) and
prints the node and triangle counts, the triangles in every region, the smallest angle and the worst
aspect ratio. A picture of the mesh (regions coloured, axes in mm) is written as mesh.png and mesh.svg
into --out.`,
		Example: `  eddyrz mesh examples/levitation-slug.toml
  eddyrz mesh examples/billet-heater.toml --json --out out/billet`,
		Args: exactArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			o.job = args[0]
			return runMesh(o)
		},
	}
	c.Flags().StringVarP(&o.out, "out", "o", "", "directory for the mesh pictures (default out/JOBNAME)")
	c.Flags().BoolVar(&o.asJSON, "json", false, "print the summary as JSON on stdout")
	return c
}

// defaultOut is the output directory used when --out is not given: out/ followed by the job file's base name.
func defaultOut(job, out string) string {
	if out != "" {
		return out
	}
	return filepath.Join("out", strings.TrimSuffix(filepath.Base(job), filepath.Ext(job)))
}

func runMesh(o *meshOptions) error {
	job, err := geometry.ReadFile(o.job)
	if err != nil {
		return err
	}
	md, err := study.Build(job)
	if err != nil {
		return err
	}
	info := md.MeshInfo()
	names := map[int32]string{}
	for _, r := range md.Layout.Regions {
		names[r.Tag] = r.Name
	}
	title := fmt.Sprintf("%s: mesh, %d triangles", job.Name, info.Triangles)
	fig, err := plot.MeshPicture(md.Mesh, plot.MeshSpec{Title: title, RegionNames: names})
	if err != nil {
		return err
	}
	out := newOutputs(defaultOut(o.job, o.out))
	for _, ext := range []string{"png", "svg"} {
		out.add("mesh."+ext, func(p string) error { return plot.Save(fig, p, 16, 16) })
	}
	out.addJSON("mesh.json", info)
	if err := out.commit(); err != nil {
		return err
	}
	if o.asJSON {
		return writeJSON(o.stdout, info)
	}
	tw := tabwriter.NewWriter(o.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "job\t%s\n", job.Name)
	fmt.Fprintf(tw, "nodes\t%d\t(%d vertices, order %d elements)\n", info.Nodes, info.Vertices, info.Order)
	fmt.Fprintf(tw, "triangles\t%d\n", info.Triangles)
	fmt.Fprintf(tw, "min angle\t%.2f deg\n", info.MinAngleDeg)
	fmt.Fprintf(tw, "max aspect ratio\t%.3f\t(1 = equilateral)\n", info.MaxAspectRatio)
	fmt.Fprintf(tw, "mesh time\t%.3f s\n", info.MeshSeconds)
	for _, r := range info.Regions {
		fmt.Fprintf(tw, "  %s\t%d triangles", r.Name, r.Triangles)
		if r.SkinDepthM > 0 {
			fmt.Fprintf(tw, "\tskin depth %.3f mm", r.SkinDepthM*1e3)
		}
		fmt.Fprintln(tw)
	}
	fmt.Fprintf(tw, "pictures\t%s\n", filepath.Join(out.dir, "mesh.{png,svg}"))
	return tw.Flush()
}
