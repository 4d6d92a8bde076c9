package study

import (
	"errors"
	"fmt"
	"runtime"
	"sync"
	"sync/atomic"

	"eddyrz/fem"
	"eddyrz/post"
)

// Sweep solves the model at every frequency of freqs (Hz) by fem.Solver.Sweep, a few points factorised and the
// rest taken from the reduced basis their solutions span, each checked against its own residual, and derives the
// quantities a frequency sweep needs, scaled to the job's drive level, on `workers` goroutines (≤ 0: one per
// CPU) while the solver goes on. The Maxwell-stress cross-check of the parts' forces is skipped (the Lorentz
// forces are still there). emit(i, s) is called once for every index of freqs, from those goroutines and so
// concurrently, in no fixed order; the numbers do not depend on workers. The first error (a solve's or an
// analysis's) stops the sweep and is returned.
func (sw *Sweeper) Sweep(freqs []float64, workers int, emit func(i int, s *Solution)) error {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	type point struct {
		i   int
		sol *fem.Solution
	}
	todo := make(chan point, workers)
	errs := make([]error, workers)
	var failed atomic.Bool
	var wg sync.WaitGroup
	opt := post.Options{MeshTime: sw.md.MeshTime, PowerOnly: true}
	for w := range workers {
		wg.Go(func() {
			for p := range todo {
				if failed.Load() {
					continue
				}
				s, err := sw.md.analyzeWith(p.sol, opt)
				if err != nil {
					errs[w] = fmt.Errorf("at %g Hz: %w", p.sol.Frequency, err)
					failed.Store(true)
					continue
				}
				emit(p.i, s)
			}
		})
	}
	stopped := errors.New("stopped")
	err := sw.s.Sweep(freqs, func(i int, sol *fem.Solution) error {
		if failed.Load() {
			return stopped
		}
		todo <- point{i, sol}
		return nil
	})
	close(todo)
	wg.Wait()
	sw.md.keepAnalysis(sw.s.Analysis())
	if err != nil && !errors.Is(err, stopped) {
		return fmt.Errorf("sweeping %s: %w", sw.md.Job.File, err)
	}
	return errors.Join(errs...)
}

// SolveReduced solves at frequency f (Hz) by fem.Solver.SolveReduced (from the reduced basis of this sweeper's
// earlier SolveReduced solutions when the point's residual allows, else factorised) with the given material
// overrides (which persist), and derives the quantities a sweep needs (as Sweep), scaled to the job's drive level.
func (sw *Sweeper) SolveReduced(f float64, ov ...fem.Override) (*Solution, error) {
	sol, err := sw.s.SolveReduced(f, ov...)
	sw.md.keepAnalysis(sw.s.Analysis())
	if err != nil {
		return nil, fmt.Errorf("solving %s at %g Hz: %w", sw.md.Job.File, f, err)
	}
	return sw.md.analyzeWith(sol, post.Options{MeshTime: sw.md.MeshTime, PowerOnly: true})
}

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
