// Package heating runs a coupled induction-heating transient: the time-harmonic field gives the Joule heat in
// the parts, transient axisymmetric heat conduction (fem/thermal, on the same mesh) turns it into temperature,
// and the field is solved again, with conductivity and permeability per element at the element's temperature,
// whenever the estimated change in power passes the job's tolerance (the Curie transition of a steel included).
//
// Units are SI inside (kelvin, seconds, watts, joules); the JSON and CSV outputs give temperatures in °C and say
// so in their names. Coil currents are rms.
package heating

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"time"

	"eddyrz/fem/thermal"
	"eddyrz/geometry"
	"eddyrz/post/study"
)

// DefaultMaxDuration bounds a run that stops on a target temperature, s: a target the drive cannot reach (the
// losses catch up with the input) must not run forever.
const DefaultMaxDuration = 3600.0

// HeatTolerance is the Newton tolerance of the heat-conduction steps: the residual of each node's energy balance,
// summed, relative to the step's energy flows (thermal.Model.Tolerance). At 1e-7 the energy balance closes far
// below the time-discretisation error of a 0.5 s step, with fewer Newton iterations than the solver's default
// 1e-10 needs (on the billet example before the k′ correction: 398 instead of 581 over 100 steps).
const HeatTolerance = 1e-7

// DefaultMaps is how many temperature maps a run keeps when Options.MapTimes is empty.
const DefaultMaps = 4

// Options adjust a heating run. The zero value runs the job as written.
type Options struct {
	// MapTimes are the times (s) at which temperature maps are kept (the first step end at or after each). Empty:
	// DefaultMaps maps evenly spread over the run, the last at its end.
	MapTimes []float64
	// HoldCurrent makes a coil driven by a target part power keep the current found at the first field solve,
	// instead of re-targeting the power at every re-solve (a current-driven or voltage-driven coil is always held
	// as the job says).
	HoldCurrent bool
	// Duration, when > 0, replaces the job's stop condition: the run lasts this long, s.
	Duration float64
	// Tolerance, when > 0, replaces the job's re-solve tolerance (relative power change).
	Tolerance float64
	// MaxDuration bounds a run that stops on a target temperature, s; 0 means DefaultMaxDuration.
	MaxDuration float64
	// StopProbe, when set, names the probe whose temperature must reach the job's stop temperature, in place of
	// the stop part's coldest point (a long bar heated at one end never heats through as a whole).
	StopProbe string
	// Progress, if set, is called after every time step.
	Progress func(Progress)
}

// Progress reports a running simulation.
type Progress struct {
	Time     float64 // simulated time, s
	Fraction float64 // estimated share of the run done, 0..1
	Solves   int     // field solves so far
	TMin     float64 // coldest part temperature, K
	TMax     float64 // hottest part temperature, K
}

// Sample is the state at the end of one time step (and at t = 0). Power and CoilCurrent are the values applied
// during the step that ends at T (held constant over a step); at t = 0 those of the first field solve.
type Sample struct {
	T           float64   // s
	Power       float64   // Joule power into all parts, W
	PartPower   []float64 // per part, in the order of Result.Parts, W
	CoilCurrent []float64 // per coil, A rms
	TMax, TMin  float64   // hottest and coldest part node, K
	Probes      []float64 // per probe, K
	// StopCold is the temperature the stop condition watches, K: the stop part's coldest point, or the stop
	// probe's temperature (NaN without a stop temperature).
	StopCold float64
	// Solved is true when the field was solved again at the start of the step ending here.
	Solved bool
}

// Snapshot is a temperature map: the temperature of every mesh node at time T (K, NaN outside the parts).
type Snapshot struct {
	T           float64
	Temperature []float64
}

// Result is a finished heating run.
type Result struct {
	Job        *geometry.Job
	Model      *study.Model
	Parts      []string // part names, in the order of Sample.PartPower
	Coils      []string // coil names, in the order of Sample.CoilCurrent
	Probes     []geometry.Probe
	TimeStep   float64 // s
	Tolerance  float64 // relative power change that triggers a field re-solve
	Rule       string  // the re-solve rule in words (ResolveRule)
	Held       string  // what the drive holds, in words
	Stop       string  // the stop condition in words
	Reached    bool    // the stop temperature was reached (always false for a fixed duration)
	TargetTime float64 // time at which the stop part's coldest point reached the stop temperature, s (NaN if not)
	Solves     int     // field solves, the first included
	Steps      int     // time steps taken
	History    []Sample
	Maps       []Snapshot
	Final      []float64 // final node temperatures, K (NaN outside the parts)
	// EnergyIn is ∫P dt of the Joule power the field solutions put into the parts, J. Energy is the heat
	// solver's bookkeeping (its Stored is computed from the enthalpy of the final state, latent heat included).
	EnergyIn float64
	Energy   thermal.Energy
	// EnergyBalanceError is |EnergyIn − (Stored + Convection + Radiation)| / EnergyIn.
	EnergyBalanceError float64
	// LiquidVolume is the molten volume at the end, m³.
	LiquidVolume float64
	// Elapsed is the wall time of the run; FieldTime and HeatTime its field solves and heat-conduction steps.
	Elapsed, FieldTime, HeatTime time.Duration
}

// RunJob lays out and meshes job and runs its [heating] section.
func RunJob(job *geometry.Job, opt Options) (*Result, error) {
	md, err := study.Build(job)
	if err != nil {
		return nil, err
	}
	return Run(md, opt)
}

// Run runs the heating transient of a built model whose job has a [heating] section.
func Run(md *study.Model, opt Options) (*Result, error) {
	t0 := time.Now()
	job := md.Job
	h := job.Heating
	if h == nil {
		return nil, fmt.Errorf("%s: %w", job.File, ErrNoHeating)
	}
	if opt.StopProbe == "" {
		opt.StopProbe = h.StopProbe // the job's own stop probe, unless the caller names another
	}
	res := &Result{Job: job, Model: md, Probes: h.Probes, TimeStep: h.TimeStep, Tolerance: h.Tolerance,
		Rule: ResolveRule, TargetTime: math.NaN()}
	if opt.Tolerance > 0 {
		res.Tolerance = opt.Tolerance
	}
	duration, stopT := h.Duration, h.StopTemperature
	if opt.Duration > 0 {
		duration, stopT = opt.Duration, 0
	}
	maxDur := opt.MaxDuration
	if maxDur <= 0 {
		maxDur = DefaultMaxDuration
	}
	if !(h.TimeStep > 0) {
		return nil, fmt.Errorf("%s: heating time step %g s must be positive", job.File, h.TimeStep)
	}

	th, partTags, stopNodes, err := newThermal(md, h, stopT)
	if err != nil {
		return nil, err
	}
	for _, r := range md.Layout.Regions {
		if r.Kind == geometry.PartRegion {
			res.Parts = append(res.Parts, r.Name)
		}
	}
	for _, c := range job.Coils {
		res.Coils = append(res.Coils, c.Name)
	}
	res.Held, res.Stop = describeDrive(job, md.PowerDrive, opt.HoldCurrent), describeStop(h, duration, stopT, opt.StopProbe)
	stopProbe := -1
	if opt.StopProbe != "" && stopT > 0 {
		for i, p := range h.Probes {
			if p.Name == opt.StopProbe {
				stopProbe = i
			}
		}
		if stopProbe < 0 {
			return nil, fmt.Errorf("%s: no probe named %q to stop on", job.File, opt.StopProbe)
		}
	}
	for _, p := range h.Probes {
		if _, ok := th.Probe(p.R, p.Z); !ok {
			return nil, &geometry.InputError{File: job.File, Key: "heating.probe",
				Msg: fmt.Sprintf("probe %q at r = %g mm, z = %g mm is not inside a part", p.Name, p.R*1e3, p.Z*1e3)}
		}
	}

	cp, err := newCoupler(md, opt.HoldCurrent)
	if err != nil {
		return nil, err
	}
	// T is the mesh-node temperature of the current state: Temperature() builds a fresh mesh-sized slice, so it is
	// taken once per step and shared by the sample, the maps and the next re-solve test.
	T := th.Temperature()
	tf := time.Now()
	if err := cp.solve(T); err != nil {
		return nil, err
	}
	res.FieldTime += time.Since(tf)
	end := duration
	if stopT > 0 {
		end = maxDur
	}
	mapTimes := slices.Clone(opt.MapTimes)
	slices.Sort(mapTimes)
	autoMaps := len(mapTimes) == 0
	keep := newThinner(DefaultMaps)

	sample := func(T []float64, solved bool) Sample {
		s := Sample{T: th.Time(), Power: cp.total, CoilCurrent: slices.Clone(cp.current),
			TMax: th.Hottest().T, TMin: th.Coldest().T, Solved: solved, StopCold: math.NaN()}
		for _, tag := range partTags {
			s.PartPower = append(s.PartPower, cp.partP[tag])
		}
		for _, p := range h.Probes {
			v, _ := th.Probe(p.R, p.Z)
			s.Probes = append(s.Probes, v)
		}
		if stopProbe >= 0 {
			s.StopCold = s.Probes[stopProbe]
		} else if stopNodes != nil {
			s.StopCold = math.Inf(1)
			for _, n := range stopNodes {
				s.StopCold = math.Min(s.StopCold, T[n])
			}
		}
		return s
	}
	res.History = append(res.History, sample(T, true))
	if stopT > 0 && res.History[0].StopCold >= stopT {
		return nil, fmt.Errorf("%s: part %q starts at or above the stop temperature", job.File, h.StopPart)
	}
	if autoMaps {
		keep.offer(0, T)
	}
	for th.Time() < end*(1-1e-12) {
		solved := false
		if res.Steps > 0 {
			if cp.powerChange(T) > res.Tolerance {
				tf := time.Now()
				if err := cp.solve(T); err != nil {
					return nil, fmt.Errorf("at t = %g s: %w", th.Time(), err)
				}
				res.FieldTime += time.Since(tf)
				solved = true
			}
		}
		dt := math.Min(h.TimeStep, end-th.Time())
		ts := time.Now()
		if _, err := th.Step(dt, cp.source); err != nil {
			return nil, fmt.Errorf("heat conduction at t = %g s: %w", th.Time(), err)
		}
		res.HeatTime += time.Since(ts)
		res.Steps++
		res.EnergyIn += cp.total * dt
		T = th.Temperature()
		s := sample(T, solved)
		prev := res.History[len(res.History)-1]
		res.History = append(res.History, s)
		for len(mapTimes) > 0 && s.T >= mapTimes[0]*(1-1e-12) {
			res.Maps = append(res.Maps, Snapshot{T: s.T, Temperature: T})
			mapTimes = mapTimes[1:]
		}
		if autoMaps {
			keep.offer(s.T, T)
		}
		if opt.Progress != nil {
			frac := s.T / end
			if stopT > 0 {
				frac = math.Max(frac, (s.StopCold-res.History[0].StopCold)/(stopT-res.History[0].StopCold))
			}
			opt.Progress(Progress{Time: s.T, Fraction: math.Min(1, frac), Solves: cp.solves, TMin: s.TMin, TMax: s.TMax})
		}
		if stopT > 0 && s.StopCold >= stopT {
			res.Reached = true
			// Linear interpolation within the step that crossed the stop temperature.
			res.TargetTime = prev.T + (s.T-prev.T)*(stopT-prev.StopCold)/(s.StopCold-prev.StopCold)
			break
		}
	}
	res.Final = slices.Clone(T)
	if autoMaps {
		res.Maps = keep.pick(th.Time(), res.Final)
	}
	res.Solves = cp.solves
	res.Energy = th.Energy()
	res.LiquidVolume = th.LiquidVolume()
	out := res.Energy.Stored + res.Energy.Convection + res.Energy.Radiation
	if res.EnergyIn > 0 {
		res.EnergyBalanceError = math.Abs(res.EnergyIn-out) / res.EnergyIn
	}
	res.Elapsed = time.Since(t0)
	return res, nil
}

// newThermal builds the heat-conduction solver of the model's parts at the heating section's initial
// temperature, with convection and radiation on every outer edge of the parts (edges on the axis excluded). It
// returns the part tags in layout order and the corner nodes of the stop part (nil without a stop temperature).
func newThermal(md *study.Model, h *geometry.Heating, stopT float64) (*thermal.Solver, []int32, []int32, error) {
	m := md.Mesh
	mats := map[int32]thermal.Material{}
	emis := map[int32]float64{}
	var tags []int32
	var stopTag int32 = -1
	for _, r := range md.Layout.Regions {
		if r.Kind != geometry.PartRegion {
			continue
		}
		if !r.Material.HasThermal() {
			return nil, nil, nil, fmt.Errorf("%s: part %q: material %q lacks thermal data", md.Job.File, r.Name, r.Material.Name)
		}
		mats[r.Tag] = Thermal(r.Material)
		emis[r.Tag] = r.Material.Emissivity(h.Initial)
		if h.Emissivity > 0 {
			emis[r.Tag] = h.Emissivity
		}
		tags = append(tags, r.Tag)
		if stopT > 0 && r.Name == h.StopPart {
			stopTag = r.Tag
		}
	}
	if len(tags) == 0 {
		return nil, nil, nil, fmt.Errorf("%s: no parts to heat", md.Job.File)
	}
	if stopT > 0 && stopTag < 0 {
		return nil, nil, nil, fmt.Errorf("%s: no part named %q to stop on", md.Job.File, h.StopPart)
	}
	// Each outer edge takes the emissivity of the part triangle it bounds.
	edgeTag := map[[2]int32]int32{}
	for t, tri := range m.Tris {
		if _, ok := mats[m.Tags[t]]; !ok {
			continue
		}
		for k := range 3 {
			edgeTag[[2]int32{tri[k], tri[(k+1)%3]}] = m.Tags[t]
		}
	}
	model := thermal.Model{Mesh: m, Materials: mats, Tolerance: HeatTolerance}
	axisTol := 1e-9 * sizeOf(md)
	for _, e := range thermal.OuterEdges(m, func(tag int32) bool { _, ok := mats[tag]; return ok }, axisTol) {
		model.Boundary = append(model.Boundary, thermal.BoundaryEdge{A: e[0], B: e[1], HeatTransfer: h.Convection,
			Ambient: h.Ambient, Emissivity: emis[edgeTag[e]], Surroundings: h.Ambient})
	}
	th, err := thermal.NewSolver(model, []float64{h.Initial})
	if err != nil {
		return nil, nil, nil, fmt.Errorf("%s: heat conduction: %w", md.Job.File, err)
	}
	var stopNodes []int32
	if stopTag >= 0 {
		seen := map[int32]bool{}
		for t, tri := range m.Tris {
			if m.Tags[t] != stopTag {
				continue
			}
			for _, v := range tri {
				if !seen[v] {
					seen[v] = true
					stopNodes = append(stopNodes, v)
				}
			}
		}
		slices.Sort(stopNodes)
	}
	return th, tags, stopNodes, nil
}

// sizeOf is the largest node coordinate of the mesh, m, a length scale for tolerances.
func sizeOf(md *study.Model) float64 {
	s := 0.0
	for _, p := range md.Mesh.Nodes {
		s = math.Max(s, math.Max(math.Abs(p.X), math.Abs(p.Y)))
	}
	return s
}

func describeDrive(job *geometry.Job, powerCoil int, hold bool) string {
	if powerCoil >= 0 {
		c := job.Coils[powerCoil]
		if hold {
			return fmt.Sprintf("coil %q: current held at the value that puts %.4g W into part %q at the start", c.Name, c.Value, c.Into)
		}
		return fmt.Sprintf("coil %q: power into part %q held at %.4g W (the current is re-scaled at every field solve)", c.Name, c.Into, c.Value)
	}
	var s string
	for i, c := range job.Coils {
		if i > 0 {
			s += "; "
		}
		switch c.Drive {
		case geometry.DriveVoltage:
			s += fmt.Sprintf("coil %q: terminal voltage held at %.4g V rms", c.Name, c.Value)
		default:
			s += fmt.Sprintf("coil %q: current held at %.4g A rms", c.Name, c.Value)
		}
	}
	return s
}

func describeStop(h *geometry.Heating, duration, stopT float64, probe string) string {
	if stopT > 0 && probe != "" {
		return fmt.Sprintf("stop when probe %q reaches %.1f °C", probe, stopT-thermal.ZeroCelsius)
	}
	if stopT > 0 {
		return fmt.Sprintf("stop when the coldest point of part %q reaches %.1f °C", h.StopPart, stopT-thermal.ZeroCelsius)
	}
	return fmt.Sprintf("run for %g s", duration)
}

// thinner keeps at most about 2n snapshots evenly spaced in time without knowing the run's length: it keeps
// one per interval and, when too many pile up, doubles the interval and drops every other.
type thinner struct {
	n     int
	every float64
	snaps []Snapshot
	last  float64
}

func newThinner(n int) *thinner { return &thinner{n: n, last: math.Inf(-1)} }

func (k *thinner) offer(t float64, T []float64) {
	if k.every == 0 || t >= k.last+k.every*(1-1e-9) {
		k.snaps = append(k.snaps, Snapshot{T: t, Temperature: T})
		k.last = t
		if k.every == 0 && len(k.snaps) == 2 {
			k.every = t
		}
	}
	if len(k.snaps) > 2*k.n {
		kept := k.snaps[:0]
		for i, s := range k.snaps {
			if i%2 == 0 {
				kept = append(kept, s)
			}
		}
		k.snaps = kept
		k.every *= 2
		k.last = k.snaps[len(k.snaps)-1].T
	}
}

// pick returns n snapshots nearest to the even times end/n, 2end/n, …, end, the last being the final state.
func (k *thinner) pick(end float64, final []float64) []Snapshot {
	var out []Snapshot
	for i := 1; i < k.n; i++ {
		want := end * float64(i) / float64(k.n)
		best := -1
		for j, s := range k.snaps {
			if best < 0 || math.Abs(s.T-want) < math.Abs(k.snaps[best].T-want) {
				best = j
			}
		}
		if best >= 0 && (len(out) == 0 || out[len(out)-1].T < k.snaps[best].T) && k.snaps[best].T < end {
			out = append(out, k.snaps[best])
		}
	}
	return append(out, Snapshot{T: end, Temperature: final})
}

// ErrNoHeating is returned (wrapped) by Run for a job without a [heating] section.
var ErrNoHeating = errors.New("the job has no [heating] section (add one to run a heating transient)")
