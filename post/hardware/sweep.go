// Package hardware turns a solved coil into the hardware around it: a frequency sweep of the coil's impedance
// and power split, the resonant tank (capacitor bank, matching transformer, inverter) with its duty checked
// against the bank's ratings, and the coil's cooling water.
//
// Conventions: SI units; phasors are RMS (x(t) = √2 Re{X e^{jωt}}); complex power S = V I*; impedances are
// Z = R + jX with X > 0 inductive. Temperatures are kelvin inside and °C only in printed text.
package hardware

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strings"
	"sync"
	"time"

	"eddyrz/geometry"
	"eddyrz/post/study"
)

// Spacing is how the frequencies of a sweep are spread between its ends.
type Spacing int

const (
	// LogSpacing spaces the frequencies evenly in log f (a constant ratio between neighbours).
	LogSpacing Spacing = iota
	// LinearSpacing spaces them evenly in f.
	LinearSpacing
)

// String returns "log" or "linear".
func (s Spacing) String() string {
	switch s {
	case LogSpacing:
		return "log"
	case LinearSpacing:
		return "linear"
	}
	return fmt.Sprintf("Spacing(%d)", int(s))
}

// ParseSpacing reads "log" or "linear".
func ParseSpacing(s string) (Spacing, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "log", "logarithmic":
		return LogSpacing, nil
	case "linear", "lin":
		return LinearSpacing, nil
	}
	return 0, fmt.Errorf("spacing %q: want \"log\" or \"linear\"", s)
}

// Frequencies returns n frequencies (Hz) from `from` to `to`, both included, in increasing order. n = 1 gives
// just `from` (and then to must equal from).
func Frequencies(from, to float64, n int, sp Spacing) ([]float64, error) {
	if !(from > 0) || math.IsInf(from, 0) || !(to > 0) || math.IsInf(to, 0) {
		return nil, fmt.Errorf("sweep frequencies must be positive and finite, got %g Hz to %g Hz", from, to)
	}
	if n < 1 {
		return nil, fmt.Errorf("a sweep needs at least one point, got %d", n)
	}
	if n == 1 {
		if from != to {
			return nil, fmt.Errorf("one sweep point cannot span %g Hz to %g Hz (ask for at least 2 points)", from, to)
		}
		return []float64{from}, nil
	}
	if !(to > from) {
		return nil, fmt.Errorf("sweep end %g Hz must be above its start %g Hz", to, from)
	}
	if sp != LogSpacing && sp != LinearSpacing {
		return nil, fmt.Errorf("unknown spacing %d", int(sp))
	}
	f := make([]float64, n)
	for i := range f {
		t := float64(i) / float64(n-1)
		if sp == LogSpacing {
			f[i] = from * math.Pow(to/from, t)
		} else {
			f[i] = from + (to-from)*t
		}
	}
	f[0], f[n-1] = from, to
	return f, nil
}

// CoilPoint is one coil at one sweep frequency, at the job's drive level (for a coil driven by a target part
// power: the current that puts that power into the part at this frequency).
type CoilPoint struct {
	Name       string
	Resistance float64    // Ω, Re Z
	Inductance float64    // H, Im Z / ω
	Q          float64    // ωL/R
	Current    complex128 // A rms
	Voltage    complex128 // V rms
	Power      float64    // W, Re{V I*} at the terminals
	Loss       float64    // W, Joule loss in the coil's own conductors
}

// SweepPoint is the solution at one frequency.
type SweepPoint struct {
	Frequency float64 // Hz
	Coils     []CoilPoint
	// PartPower is the Joule power of each part (W), in the order of SweepResult.Parts.
	PartPower []float64
	// Efficiency is Σ part power / Σ coil terminal power.
	Efficiency   float64
	BalanceError float64
	Unknowns     int
	// Iterations is the number of preconditioned GMRES iterations that solved this point, 0 where it was
	// factorised directly.
	Iterations int
	Elapsed    time.Duration // this point's solve and analysis
}

// SweepResult is a frequency sweep of one model.
type SweepResult struct {
	Job           string  // job name
	File          string  // job file
	MeshFrequency float64 // Hz, frequency whose skin depths the mesh was built to resolve
	Nodes         int
	Unknowns      int
	Parts         []string
	Points        []SweepPoint // in increasing frequency
	Workers       int
	Elapsed       time.Duration // wall time of the solves (after meshing)
	MeshTime      time.Duration
}

// SweepJob meshes job once at the highest sweep frequency (so that the mesh resolves the smallest skin depth of
// the sweep) and solves it at every frequency in freqs; see SweepModel.
func SweepJob(job *geometry.Job, freqs []float64, workers int) (*SweepResult, error) {
	if len(freqs) == 0 {
		return nil, errors.New("sweep: no frequencies")
	}
	md, err := study.Build(job.WithFrequency(slices.Max(freqs)))
	if err != nil {
		return nil, err
	}
	return SweepModel(md, freqs, workers)
}

// sweepGroup is the number of neighbouring sweep points that share one anchor factorisation: the anchor is the
// group's middle point, the others are solved iteratively (fem.Solver.SolveNear) from its factor and the group's
// earlier solutions. Measured on the billet example (116k unknowns, 40 log points 1-10 kHz, CPU time on a shared
// machine): groups of 1 (every point factorised, the factor's storage re-used) 61 s, groups of 5 102 s, of 10
// 81 s. GMRES needs 5-12 iterations per point to the 1e-12 error target and each iteration costs about a tenth
// of a factorisation (the factor's Solve refines iteratively), so iterating does not pay yet: every point is
// factorised.
const sweepGroup = 1

// SweepModel solves md at every frequency in freqs on the model's mesh, re-using the sparse pattern, the
// symbolic factorisation and the factor's storage, with the light analysis a sweep needs (no Maxwell-stress
// cross-check). The frequencies are cut into groups of sweepGroup neighbours; a group factorises once, at its
// middle, and solves its other points by preconditioned GMRES to within fem.NearTolerance (falling back to a
// fresh factorisation where that does not converge quickly). The groups are spread over `workers` goroutines,
// each with its own study.Sweeper on the shared read-only model (workers ≤ 0 means one per CPU); the groups do
// not depend on the number of workers, so neither does the result. Points come back sorted by frequency.
func SweepModel(md *study.Model, freqs []float64, workers int) (*SweepResult, error) {
	return sweepModel(md, freqs, workers, sweepGroup)
}

// sweepModel is SweepModel with groups of `group` points (1: every point factorised directly).
func sweepModel(md *study.Model, freqs []float64, workers, group int) (*SweepResult, error) {
	if len(freqs) == 0 {
		return nil, errors.New("sweep: no frequencies")
	}
	for _, f := range freqs {
		if !(f > 0) || math.IsInf(f, 0) {
			return nil, fmt.Errorf("sweep: frequency %g Hz is not positive and finite", f)
		}
	}
	groups := sweepGroups(freqs, group)
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, len(groups))
	res := &SweepResult{
		Job: md.Job.Name, File: md.Job.File, MeshFrequency: md.Job.Frequency, Nodes: len(md.Mesh.Nodes),
		Workers: workers, MeshTime: md.MeshTime, Points: make([]SweepPoint, len(freqs)),
	}
	for _, p := range md.Job.Parts {
		res.Parts = append(res.Parts, p.Name)
	}
	t0 := time.Now()
	var (
		mu   sync.Mutex
		next int
		errs = make([]error, workers)
		wg   sync.WaitGroup
	)
	// The highest groups first: they have the finest skin depths and are the likeliest to fail, so a bad sweep
	// stops early.
	take := func() ([]int, bool) {
		mu.Lock()
		defer mu.Unlock()
		if next >= len(groups) || slices.ContainsFunc(errs, func(e error) bool { return e != nil }) {
			return nil, false
		}
		g := groups[len(groups)-1-next]
		next++
		return g, true
	}
	fail := func(w int, err error) {
		mu.Lock()
		errs[w] = err
		mu.Unlock()
	}
	for w := 0; w < workers; w++ {
		wg.Go(func() {
			sw, err := md.NewSweeper()
			if err != nil {
				fail(w, err)
				return
			}
			for {
				g, ok := take()
				if !ok {
					return
				}
				sw.ResetNear()
				for _, i := range g {
					t1 := time.Now()
					s, err := sw.SolveNear(freqs[i])
					if err != nil {
						fail(w, err)
						return
					}
					pt := pointOf(s)
					pt.Elapsed = time.Since(t1)
					res.Points[i] = pt // each index is written by one goroutine only
				}
			}
		})
	}
	wg.Wait()
	if err := errors.Join(errs...); err != nil {
		return nil, fmt.Errorf("sweep: %w", err)
	}
	res.Elapsed = time.Since(t0)
	slices.SortStableFunc(res.Points, func(a, b SweepPoint) int { return cmpFloat(a.Frequency, b.Frequency) })
	if len(res.Points) > 0 {
		res.Unknowns = res.Points[0].Unknowns
	}
	return res, nil
}

// sweepGroups cuts the indices of freqs, in increasing frequency, into runs of about `size` neighbours,
// lowest run first; each run lists its middle point first, then the points above it upwards, then those below
// it downwards (so each solve starts next to the previous ones).
func sweepGroups(freqs []float64, size int) [][]int {
	order := make([]int, len(freqs))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmpFloat(freqs[a], freqs[b]) })
	ng := (len(order) + size - 1) / size
	var groups [][]int
	for k := range ng {
		run := order[len(order)*k/ng : len(order)*(k+1)/ng]
		mid := len(run) / 2
		g := []int{run[mid]}
		for i := mid + 1; i < len(run); i++ {
			g = append(g, run[i])
		}
		for i := mid - 1; i >= 0; i-- {
			g = append(g, run[i])
		}
		groups = append(groups, g)
	}
	return groups
}

// pointOf condenses a solution into a sweep point.
func pointOf(s *study.Solution) SweepPoint {
	r := s.Result
	pt := SweepPoint{Frequency: r.Frequency, Efficiency: r.Efficiency, BalanceError: r.BalanceError,
		Unknowns: r.Unknowns, Iterations: s.Field.Stats.Iterations}
	for _, c := range r.Coils {
		pt.Coils = append(pt.Coils, CoilPoint{
			Name: c.Name, Resistance: c.Resistance, Inductance: c.Inductance, Q: c.QualityFactor,
			Current: c.Current, Voltage: c.Voltage, Power: c.Power, Loss: c.Loss,
		})
	}
	for _, p := range r.Parts {
		pt.PartPower = append(pt.PartPower, p.Power)
	}
	return pt
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
