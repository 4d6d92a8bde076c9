// Package study runs the analyses a coil designer asks for, end to end: a job file's model is laid out, meshed,
// solved and post-processed. Each study is a library call first; the command line only wraps it.
package study

import (
	"fmt"
	"math"
	"time"

	"eddyrz/fem"
	"eddyrz/geometry"
	"eddyrz/mesh"
)

// Model is a job made ready to solve: its layout, its mesh and the field problem on that mesh.
type Model struct {
	Job      *geometry.Job
	Layout   *geometry.Layout
	Mesh     *mesh.Mesh
	Problem  *fem.Problem
	MeshTime time.Duration // layout plus triangulation
	// PowerDrive is the index of the coil driven by a target part power (solved at 1 A and scaled), or −1.
	PowerDrive int
}

// Build lays out, meshes and sets up the field problem of job. It does not solve.
func Build(job *geometry.Job) (*Model, error) {
	t0 := time.Now()
	lay, err := job.Layout()
	if err != nil {
		return nil, fmt.Errorf("laying out %s: %w", job.File, err)
	}
	m, err := mesh.Triangulate(lay.PSLG, mesh.Options{MinAngle: lay.MinAngle, Size: lay.Size})
	if err != nil {
		return nil, fmt.Errorf("meshing %s: %w", job.File, err)
	}
	if lay.Order == 2 {
		m.MakeQuadratic()
	}
	md := &Model{Job: job, Layout: lay, Mesh: m, MeshTime: time.Since(t0), PowerDrive: -1}
	md.Problem, md.PowerDrive, err = problem(job, lay, m)
	if err != nil {
		return nil, err
	}
	return md, nil
}

// problem maps a laid-out job onto the field problem. A coil driven by a target part power is solved at 1 A
// rms and scaled afterwards (the field is linear); its index is returned, −1 when there is none.
func problem(job *geometry.Job, lay *geometry.Layout, m *mesh.Mesh) (*fem.Problem, int, error) {
	p := &fem.Problem{
		Mesh:      m,
		Frequency: job.Frequency,
		AppliedBz: complex(job.AppliedB, 0),
		Outer:     fem.OuterBoundary{Robin: true, CenterZ: lay.Outer.CenterZ, Radius: lay.Outer.Radius},
	}
	powerCoil := -1
	for i, c := range job.Coils {
		fc := fem.Coil{Name: c.Name}
		switch c.Drive {
		case geometry.DriveCurrent:
			fc.Drive, fc.Value = fem.CurrentDrive, complex(c.Value, 0)
		case geometry.DriveVoltage:
			fc.Drive, fc.Value = fem.VoltageDrive, complex(c.Value, 0)
		case geometry.DrivePower:
			if powerCoil >= 0 {
				return nil, -1, fmt.Errorf("%s: coils %q and %q are both driven by a target power; drive at most one coil that way",
					job.File, job.Coils[powerCoil].Name, c.Name)
			}
			fc.Drive, fc.Value = fem.CurrentDrive, 1
			powerCoil = i
		}
		p.Coils = append(p.Coils, fc)
	}
	if powerCoil >= 0 && len(job.Coils) > 1 {
		return nil, -1, fmt.Errorf("%s: a target-power drive needs the coil to be the only one (the scale factor would change the others too)", job.File)
	}
	for _, r := range lay.Regions {
		fr := fem.Region{Tag: r.Tag, Name: r.Name, Coil: -1, Sense: 1, Strands: 1, MuR: 1}
		if r.Material != nil {
			fr.MuR = r.Material.MuR(r.Temperature)
		}
		switch r.Kind {
		case geometry.AirRegion:
			fr.Kind = fem.Air
		case geometry.TurnRegion:
			fr.Kind, fr.Coil, fr.Sense = fem.SolidTurn, r.Coil, r.Sense
			fr.Sigma = r.Material.Conductivity(r.Temperature)
		case geometry.StrandedRegion:
			fr.Kind, fr.Coil, fr.Sense, fr.Strands = fem.Stranded, r.Coil, r.Sense, r.Strands
			fr.MuR = 1
			fr.Rdc = strandedRdc(job, r)
		case geometry.PartRegion:
			fr.Kind = fem.Part
			fr.Sigma = r.Material.Conductivity(r.Temperature)
		default:
			return nil, -1, fmt.Errorf("region %q: unknown kind %d", r.Name, r.Kind)
		}
		p.Regions = append(p.Regions, fr)
	}
	return p, powerCoil, nil
}

// strandedRdc is the DC resistance of a stranded block, Ω: N turns of mean length 2π r_c in a copper area of
// fill·area shared by N strands, R = ρ N² 2π r_c / (fill·area).
func strandedRdc(job *geometry.Job, r geometry.Region) float64 {
	t := job.Coils[r.Coil].Turns[r.Turn]
	if r.Fill <= 0 || r.Area <= 0 {
		return 0
	}
	n := float64(r.Strands)
	return r.Material.Resistivity(r.Temperature) * n * n * 2 * math.Pi * t.R / (r.Fill * r.Area)
}
