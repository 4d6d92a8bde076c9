// Package study runs the analyses a coil designer asks for, end to end: a job file's model is laid out, meshed,
// solved and post-processed. Each study is a library call first; the command line only wraps it.
package study

import (
	"fmt"
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
	m, err := fem.Mesh(job, lay)
	if err != nil {
		return nil, err
	}
	md := &Model{Job: job, Layout: lay, Mesh: m, MeshTime: time.Since(t0)}
	if md.PowerDrive, err = powerDrive(job); err != nil {
		return nil, err
	}
	if md.Problem, err = fem.FromLayout(job, lay, m); err != nil {
		return nil, fmt.Errorf("%s: %w", job.File, err)
	}
	return md, nil
}

// powerDrive checks that at most one coil, and then the only coil, is driven by a target part power, and
// returns its index (−1 for none). Such a coil is solved at 1 A rms and scaled afterwards: the field is linear.
func powerDrive(job *geometry.Job) (int, error) {
	idx := -1
	for i, c := range job.Coils {
		if c.Drive != geometry.DrivePower {
			continue
		}
		if idx >= 0 {
			return -1, fmt.Errorf("%s: coils %q and %q are both driven by a target power; drive at most one coil that way",
				job.File, job.Coils[idx].Name, c.Name)
		}
		idx = i
	}
	if idx >= 0 && len(job.Coils) > 1 {
		return -1, fmt.Errorf("%s: a target-power drive needs its coil to be the only one (scaling it would scale the others too)", job.File)
	}
	return idx, nil
}
