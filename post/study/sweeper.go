package study

import (
	"fmt"

	"eddyrz/fem"
	"eddyrz/geometry"
)

// Sweeper solves one model many times, at new frequencies or with new material values, re-using the mesh, the
// sparse pattern and the fill-reducing symbolic analysis. It is not safe for concurrent use: give each goroutine
// its own (built from its own Model or the same one; a Model is read-only once built).
type Sweeper struct {
	md *Model
	s  *fem.Solver
}

// NewSweeper prepares repeated solves of the model.
func (md *Model) NewSweeper() (*Sweeper, error) {
	s, err := fem.NewSolver(md.Problem)
	if err != nil {
		return nil, fmt.Errorf("setting up %s: %w", md.Job.File, err)
	}
	s.UseAnalysis(md.sharedAnalysis())
	return &Sweeper{md: md, s: s}, nil
}

// SolveAt solves at frequency f (Hz) with the given material overrides (which persist for later calls) and
// derives the quantities, scaled to the job's drive level.
func (sw *Sweeper) SolveAt(f float64, ov ...fem.Override) (*Solution, error) {
	sol, err := sw.s.SolveAt(f, ov...)
	sw.md.keepAnalysis(sw.s.Analysis())
	if err != nil {
		return nil, fmt.Errorf("solving %s at %g Hz: %w", sw.md.Job.File, f, err)
	}
	return sw.md.analyze(sol)
}

// TemperatureOverrides returns the conductivity and permeability of every conductor region at the temperature
// temp gives it (K), for SolveAt. temp receives the layout region; return its own Temperature to leave it be.
func (md *Model) TemperatureOverrides(temp func(r geometry.Region) float64) []fem.Override {
	var ov []fem.Override
	for _, r := range md.Layout.Regions {
		if r.Material == nil || (r.Kind != geometry.TurnRegion && r.Kind != geometry.PartRegion) {
			continue
		}
		t := temp(r)
		ov = append(ov, fem.Override{Tag: r.Tag, Sigma: r.Material.Conductivity(t), MuR: r.Material.MuR(t)})
	}
	return ov
}

// PartRegion returns the layout region of the named part.
func (md *Model) PartRegion(name string) (geometry.Region, error) {
	for _, r := range md.Layout.Regions {
		if r.Kind == geometry.PartRegion && r.Name == name {
			return r, nil
		}
	}
	return geometry.Region{}, fmt.Errorf("%s: no part named %q", md.Job.File, name)
}
