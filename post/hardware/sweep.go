// Package hardware turns a solved coil into the hardware around it: a frequency sweep of the coil's impedance
// and power split, the resonant tank (capacitor bank, matching transformer, inverter) with its duty checked
// against the bank's ratings, and the coil's cooling water.
//
// Conventions: SI units; phasors are RMS (x(t) = √2 Re{X e^{jωt}}); complex power S = V I*; impedances are
// Z = R + jX with X > 0 inductive. Temperatures are kelvin inside and °C only in printed text.
package hardware

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strings"
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
	// Basis is the size of the reduced basis this point was taken from, 0 where it was factorised; Indicator is
	// then its accepted weighted residual (fem.SweepTolerance).
	Basis     int
	Indicator float64
	Elapsed   time.Duration // this point's assembly and solve
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

// SweepModel solves md at every frequency in freqs on the model's mesh (fem.Solver.Sweep: the sparse pattern and
// the symbolic factorisation re-used, a few points factorised in place and the others taken from the reduced
// basis of those solutions, each checked against its own residual), with the light analysis a sweep needs (no
// Maxwell-stress cross-check) spread over `workers` goroutines (≤ 0 means one per CPU; the factorisations use
// every CPU themselves). The numbers do not depend on workers. Points come back sorted by frequency.
func SweepModel(md *study.Model, freqs []float64, workers int) (*SweepResult, error) {
	if md == nil {
		return nil, errors.New("sweep: no model")
	}
	if len(freqs) == 0 {
		return nil, errors.New("sweep: no frequencies")
	}
	for _, f := range freqs {
		if !(f > 0) || math.IsInf(f, 0) {
			return nil, fmt.Errorf("sweep: frequency %g Hz is not positive and finite", f)
		}
	}
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, len(freqs))
	res := &SweepResult{
		Job: md.Job.Name, File: md.Job.File, MeshFrequency: md.Job.Frequency, Nodes: len(md.Mesh.Nodes),
		Workers: workers, MeshTime: md.MeshTime, Points: make([]SweepPoint, len(freqs)),
	}
	for _, p := range md.Job.Parts {
		res.Parts = append(res.Parts, p.Name)
	}
	t0 := time.Now()
	sw, err := md.NewSweeper()
	if err != nil {
		return nil, fmt.Errorf("sweep: %w", err)
	}
	// Each index is written by one call only.
	err = sw.Sweep(freqs, workers, func(i int, s *study.Solution) { res.Points[i] = pointOf(s) })
	if err != nil {
		return nil, fmt.Errorf("sweep: %w", err)
	}
	res.Elapsed = time.Since(t0)
	slices.SortStableFunc(res.Points, func(a, b SweepPoint) int { return cmp.Compare(a.Frequency, b.Frequency) })
	res.Unknowns = res.Points[0].Unknowns
	return res, nil
}

// pointOf condenses a solution into a sweep point.
func pointOf(s *study.Solution) SweepPoint {
	r := s.Result
	st := s.Field.Stats
	pt := SweepPoint{Frequency: r.Frequency, Efficiency: r.Efficiency, BalanceError: r.BalanceError,
		Unknowns: r.Unknowns, Basis: st.Basis, Indicator: st.Indicator, Elapsed: st.Assemble + st.Factor + st.Solve}
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
