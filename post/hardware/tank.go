package hardware

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"eddyrz/fem"
	"eddyrz/geometry"
	"eddyrz/post/circuit"
	"eddyrz/post/study"
)

// ColdTemperature is the temperature of every part in the cold load: 20 °C, K.
const ColdTemperature = 293.15

// zeroCelsius is 0 °C in kelvin.
const zeroCelsius = 273.15

// ResonanceTol is the relative tolerance on the resonant frequency of the field-coupled search: 1e-4 is far
// below what the model's other approximations allow, and each extra digit costs field solves.
const ResonanceTol = 1e-4

// MeshFrequencyMargin is how far (as a ratio) a resonant frequency may lie above the frequency the mesh was built
// for before a note advises re-meshing: the skin depth shrinks as 1/√f, so at 1.3× it is 12 % thinner than the
// mesh was sized for.
const MeshFrequencyMargin = 1.3

// LoadState is a temperature state of the parts for the tank analysis.
type LoadState struct {
	Name string // "cold" or "hot"
	// Temperature of each part, K, in the order of the job's parts.
	Temperature []float64
	Basis       string // where the temperatures come from, for the report
}

// LoadStates returns the cold state (every part at ColdTemperature) and, when the job says how hot the parts
// get, the hot state: every part at the [heating] stop temperature when the job has one; otherwise each part at
// its material's melting point (the charge just molten, liquid resistivity) when every part's material melts.
// Otherwise hot is nil. The coil stays at its own temperature in both states.
func LoadStates(job *geometry.Job) (cold LoadState, hot *LoadState) {
	cold = LoadState{Name: "cold", Basis: "parts at 20 °C", Temperature: make([]float64, len(job.Parts))}
	for i := range cold.Temperature {
		cold.Temperature[i] = ColdTemperature
	}
	if h := job.Heating; h != nil && h.StopTemperature > 0 {
		t := make([]float64, len(job.Parts))
		for i := range t {
			t[i] = h.StopTemperature
		}
		return cold, &LoadState{Name: "hot", Temperature: t,
			Basis: fmt.Sprintf("parts at the [heating] stop temperature %.0f °C", h.StopTemperature-zeroCelsius)}
	}
	t := make([]float64, len(job.Parts))
	for i, p := range job.Parts {
		if p.Material == nil || math.IsInf(p.Material.Melting, 0) || !(p.Material.Melting > 0) {
			return cold, nil
		}
		t[i] = p.Material.Melting
	}
	if len(t) == 0 {
		return cold, nil
	}
	return cold, &LoadState{Name: "hot", Temperature: t, Basis: "parts at their melting points (molten, liquid resistivity)"}
}

// overrides returns the material overrides that put the parts of md at the state's temperatures.
func (st LoadState) overrides(md *study.Model) []fem.Override {
	return md.TemperatureOverrides(func(r geometry.Region) float64 {
		if r.Kind == geometry.PartRegion && r.Part >= 0 && r.Part < len(st.Temperature) {
			return st.Temperature[r.Part]
		}
		return r.Temperature
	})
}

// evaluation is what one field solve at frequency f tells the tank analysis; every ratio is independent of the
// drive level.
type evaluation struct {
	Z          complex128 // coil impedance, Ω
	Terminal   float64    // coil terminal power Re{V I*}, W
	Target     float64    // power in the target part(s), W, at the same drive
	CoilLoss   float64    // coil's own Joule loss, W, at the same drive
	Efficiency float64    // Target / Terminal
}

// loadImpedance is a coil whose impedance comes from field solves of one model in one load state. It remembers
// every frequency it has solved.
type loadImpedance struct {
	md     *study.Model
	sw     *study.Sweeper
	ov     []fem.Override
	target func(s *study.Solution) float64
	seen   map[float64]evaluation
	solves int
}

func newLoadImpedance(md *study.Model, st LoadState, target func(s *study.Solution) float64) *loadImpedance {
	return &loadImpedance{md: md, ov: st.overrides(md), target: target, seen: map[float64]evaluation{}}
}

// at solves (or recalls) the model at f.
func (l *loadImpedance) at(f float64) (evaluation, error) {
	if e, ok := l.seen[f]; ok {
		return e, nil
	}
	if l.sw == nil {
		sw, err := l.md.NewSweeper()
		if err != nil {
			return evaluation{}, err
		}
		l.sw = sw
	}
	var ov []fem.Override
	if l.solves == 0 {
		ov = l.ov // overrides persist in the sweeper: apply them once
	}
	// A resonance search calls at nearby frequencies: most come from the reduced basis of the first few.
	s, err := l.sw.SolveReduced(f, ov...)
	if err != nil {
		return evaluation{}, err
	}
	l.solves++
	return l.remember(s), nil
}

// remember records what the solution s tells about its frequency.
func (l *loadImpedance) remember(s *study.Solution) evaluation {
	c := s.Result.Coils[0]
	e := evaluation{Z: c.Impedance, Terminal: c.Power, Target: l.target(s), CoilLoss: c.Loss}
	e.Efficiency = e.Target / e.Terminal
	l.seen[s.Result.Frequency] = e
	return e
}

// matchesJob reports whether the state puts every part at the temperature the job itself gives it.
func (st LoadState) matchesJob(job *geometry.Job) bool {
	if len(st.Temperature) != len(job.Parts) {
		return false
	}
	for i, p := range job.Parts {
		if p.Temperature != st.Temperature[i] {
			return false
		}
	}
	return true
}

// impedance is the circuit.ImpedanceFunc of the load.
func (l *loadImpedance) impedance(f float64) (complex128, error) {
	e, err := l.at(f)
	return e.Z, err
}

// TankState is the tank in one load state: its resonance and its duty at the target power.
type TankState struct {
	Load       LoadState
	Resonance  circuit.Resonance
	Operating  circuit.OperatingPoint
	Efficiency float64 // coil efficiency at resonance, P_target / P_terminals
	// CoilLoss is the coil's own Joule loss at the operating point, W.
	CoilLoss float64
	Solves   int // field solves spent on this state
}

// TankStudy is the resonant tank around the job's coil, cold and (when known) hot.
type TankStudy struct {
	Tank        circuit.Tank // Coil is nil: each state has its own
	TargetPower float64      // W, into TargetPart
	TargetPart  string       // "" means all parts
	PowerBasis  string       // where TargetPower comes from
	Cold        TankState
	Hot         *TankState
	Shift       *circuit.Shift // nil without a hot state
	Notes       []string
}

// targetPower decides the power the tank must deliver and into which part: the [tank] power when given, else a
// coil's target-power drive, else the power the job's own drive puts into all parts (from sol).
func targetPower(job *geometry.Job, sol *study.Solution) (watts float64, part, basis string, err error) {
	t := job.Tank
	switch {
	case t.Power > 0:
		return t.Power, t.Into, "[tank] power", nil
	case job.Coils[0].Drive == geometry.DrivePower:
		return job.Coils[0].Value, job.Coils[0].Into, "the coil's target-power drive", nil
	}
	if len(job.Parts) == 0 {
		return sol.Result.Coils[0].Power, "", noPartsBasis, nil
	}
	var sum float64
	for _, p := range sol.Result.Parts {
		sum += p.Power
	}
	if !(sum > 0) {
		return 0, "", "", errors.New("the tank needs a target power: give [tank] power and into (the job's drive puts no power into any part)")
	}
	return sum, "", "the power the job's drive puts into the parts", nil
}

// noPartsBasis names the target of a job without parts: the coil's own terminal power (a bare coil, e.g. for
// checking the tank against a closed form).
const noPartsBasis = "the coil's terminal power at the job's drive (the job has no parts)"

// partPower returns a function giving the power into the named part (all parts when name is empty; the coil's
// terminal power when there are no parts).
func partPower(name string) func(s *study.Solution) float64 {
	return func(s *study.Solution) float64 {
		if len(s.Result.Parts) == 0 {
			return s.Result.Coils[0].Power
		}
		var p float64
		for _, pr := range s.Result.Parts {
			if name == "" || pr.Name == name {
				p += pr.Power
			}
		}
		return p
	}
}

// StudyTank finds the self-consistent resonance of the job's tank with the coil's impedance from field solves
// of md, for the cold load and, when LoadStates gives one, the hot load (the two searches run in parallel, each
// on its own Sweeper of the shared read-only model), and the duty of each at the target power, checked
// against the bank's ratings. sol is the job's own solution (it supplies the target power when the job names
// none). The search starts at the job's frequency.
func StudyTank(md *study.Model, sol *study.Solution) (*TankStudy, error) {
	job := md.Job
	tj := job.Tank
	if tj == nil {
		return nil, errors.New("tank: the job has no [tank] section")
	}
	if len(job.Coils) != 1 {
		return nil, fmt.Errorf("tank: the job has %d coils; a tank analysis needs exactly one", len(job.Coils))
	}
	ts := &TankStudy{Tank: circuit.Tank{C: tj.Capacitance, Topology: circuit.Series}}
	if tj.Parallel {
		ts.Tank.Topology = circuit.Parallel
	}
	var err error
	ts.TargetPower, ts.TargetPart, ts.PowerBasis, err = targetPower(job, sol)
	if err != nil {
		return nil, fmt.Errorf("tank: %w", err)
	}
	cold, hot := LoadStates(job)
	states := []LoadState{cold}
	if hot != nil {
		states = append(states, *hot)
	}
	out := make([]TankState, len(states))
	errs := make([]error, len(states))
	var wg sync.WaitGroup
	for i, st := range states {
		wg.Add(1)
		go func() {
			defer wg.Done()
			out[i], errs[i] = ts.state(md, sol, st)
		}()
	}
	wg.Wait()
	if errs[0] != nil {
		return nil, fmt.Errorf("tank, cold load: %w", errs[0])
	}
	ts.Cold = out[0]
	if len(out) > 1 && errs[1] != nil {
		// The hot state is extra information: a failure there is reported, not fatal.
		ts.Notes = append(ts.Notes, fmt.Sprintf("hot load (%s): %v", states[1].Basis, errs[1]))
		out = out[:1]
	}
	if len(out) > 1 {
		ts.Hot = &out[1]
		ts.Shift = &circuit.Shift{Cold: ts.Cold.Resonance, Hot: ts.Hot.Resonance,
			Delta:    ts.Hot.Resonance.Frequency - ts.Cold.Resonance.Frequency,
			Relative: (ts.Hot.Resonance.Frequency - ts.Cold.Resonance.Frequency) / ts.Cold.Resonance.Frequency}
	}
	for _, st := range out {
		if f := st.Resonance.Frequency; f > MeshFrequencyMargin*job.Frequency {
			ts.Notes = append(ts.Notes, fmt.Sprintf(
				"the %s-load resonance %.4g kHz lies well above the %.4g kHz the mesh was built for: its skin depths are under-resolved; re-run with frequency = \"%.3g kHz\"",
				st.Load.Name, f/1e3, job.Frequency/1e3, f/1e3))
		}
	}
	return ts, nil
}

// state runs the resonance search and the duty for one load state.
func (ts *TankStudy) state(md *study.Model, sol *study.Solution, st LoadState) (TankState, error) {
	load := newLoadImpedance(md, st, partPower(ts.TargetPart))
	if sol != nil && st.matchesJob(md.Job) && sol.Result.Frequency == md.Job.Frequency {
		// The job's own solution is this state at the search's first frequency: one field solve saved.
		load.remember(sol)
	}
	tank := ts.Tank
	tank.Coil = load.impedance
	res, err := tank.ResonanceWithin(md.Job.Frequency, ResonanceTol)
	if err != nil {
		return TankState{}, err
	}
	e, err := load.at(res.Frequency)
	if err != nil {
		return TankState{}, err
	}
	if !(e.Target > 0) || !(e.Terminal > 0) {
		return TankState{}, fmt.Errorf("at resonance %g Hz the target part takes %g W of %g W at the terminals: no efficiency", res.Frequency, e.Target, e.Terminal)
	}
	eff := math.Min(e.Efficiency, 1)
	tj := md.Job.Tank
	op, err := tank.Operate(res,
		circuit.Drive{Power: ts.TargetPower, Efficiency: eff, InverterVoltage: tj.InverterVoltage, BusVoltage: tj.BusVoltage},
		circuit.Ratings{CapacitorVoltage: tj.VoltageRating, CapacitorCurrent: tj.CurrentRating, CapacitorReactive: tj.VarRating})
	if err != nil {
		return TankState{}, err
	}
	return TankState{Load: st, Resonance: res, Operating: op, Efficiency: eff,
		CoilLoss: e.CoilLoss * ts.TargetPower / e.Target, Solves: load.solves}, nil
}
