package study

import (
	"fmt"

	"eddyrz/fem"
	"eddyrz/post"
)

// SolveNear solves at frequency f (Hz) by fem.Solver.SolveNear (iteratively, preconditioned with the
// factorisation of an earlier SolveNear, when it can) and derives the quantities a frequency sweep needs, scaled
// to the job's drive level. The Maxwell-stress cross-check of the parts' forces is skipped (the Lorentz forces
// are still there). The numbers equal SolveAt's within the solver's residual target.
func (sw *Sweeper) SolveNear(f float64) (*Solution, error) {
	sol, err := sw.s.SolveNear(f)
	if err != nil {
		return nil, fmt.Errorf("solving %s at %g Hz: %w", sw.md.Job.File, f, err)
	}
	return sw.md.analyzeWith(sol, post.Options{MeshTime: sw.md.MeshTime, PowerOnly: true})
}

// ResetNear forgets SolveNear's anchor factorisation and remembered solutions.
func (sw *Sweeper) ResetNear() { sw.s.ResetNear() }

// analyzeWith is analyze with the given analysis options.
func (md *Model) analyzeWith(sol *fem.Solution, opt post.Options) (*Solution, error) {
	res, err := post.Analyze(sol, opt)
	if err != nil {
		return nil, fmt.Errorf("analysing %s: %w", md.Job.File, err)
	}
	s := &Solution{Model: md, Field: sol, Result: res, Scale: 1}
	if md.PowerDrive >= 0 {
		c := md.Job.Coils[md.PowerDrive]
		s.Result, s.Scale, err = res.ScaleToPartPower(c.Into, c.Value)
		if err != nil {
			return nil, fmt.Errorf("coil %q: %w", c.Name, err)
		}
	}
	if err := s.check(); err != nil {
		return nil, err
	}
	return s, nil
}
