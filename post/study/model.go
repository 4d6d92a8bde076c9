// Package study runs the analyses a coil designer asks for, end to end: a job file's model is laid out, meshed,
// solved and post-processed. Each study is a library call first; the command line only wraps it.
package study

import (
	"fmt"
	"sync"
	"time"

	"eddyrz/fem"
	"eddyrz/fem/sparse"
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

	// analysis is the symbolic factorisation of the problem's sparse pattern, computed by the first of the
	// model's solvers to factorise and handed to those made after it (the only state a Model gains after Build).
	mu       sync.Mutex
	analysis *sparse.Symbolic
}

// sharedAnalysis returns the symbolic analysis one of the model's solvers has computed, nil before that.
func (md *Model) sharedAnalysis() *sparse.Symbolic {
	md.mu.Lock()
	defer md.mu.Unlock()
	return md.analysis
}

// keepAnalysis offers a solver's symbolic analysis for the model's later solvers.
func (md *Model) keepAnalysis(sym *sparse.Symbolic) {
	if sym == nil {
		return
	}
	md.mu.Lock()
	defer md.mu.Unlock()
	if md.analysis == nil {
		md.analysis = sym
	}
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
