package levitate

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"eddyrz/fem"
	"eddyrz/geometry"
	"eddyrz/geometry/material"
	"eddyrz/post"
	"eddyrz/post/study"
)

// errBlocked marks a height at which the part would overlap a coil turn or another part.
var errBlocked = errors.New("part overlaps a conductor at this height")

// state is the outcome of the solves at one height: index 0 is the part at its job temperature, index k ≥ 1
// the part at temps[k−1] (same mesh, new material values).
type state struct {
	z float64
	// force is the study's axial force (ForceStress or ForceVolume, see Options.Force) per temperature, N;
	// other is the other method's, N (NaN when unavailable).
	force, other, power []float64
	impedance           []Impedance
	balance             float64
	unknowns            int
}

// solver runs the field solves of a study. Each call builds its own model, so calls may run concurrently;
// sem bounds how many do.
type solver struct {
	job   *geometry.Job // the job with the study's mesh controls
	part  string
	pi    int
	meshT float64 // part temperature the mesh is built for (smallest skin depth of the study), K
	sem   chan struct{}
	// stress selects the Maxwell-stress force as the study's force.
	stress bool
}

func newSolver(job *geometry.Job, s *settings) *solver {
	j := job.Copy()
	j.Mesh = s.mesh
	p := job.Parts[s.partIndex]
	// Mesh for the thinnest skin depth the study meets, so that every temperature is resolved on one mesh.
	meshT, dmin := p.Temperature, p.Material.SkinDepth(job.Frequency, p.Temperature)
	for _, t := range s.temps {
		if d := p.Material.SkinDepth(job.Frequency, t); d < dmin {
			meshT, dmin = t, d
		}
	}
	return &solver{job: j, part: s.part, pi: s.partIndex, meshT: meshT, sem: make(chan struct{}, s.workers),
		stress: s.force == ForceStress}
}

// at solves with the part's reference height at z, at its job temperature and then at each of temps.
func (sv *solver) at(z float64, temps []float64) (*state, error) {
	sv.sem <- struct{}{}
	defer func() { <-sv.sem }()
	moved, err := sv.job.MovePart(sv.part, z)
	if err != nil {
		return nil, fmt.Errorf("%w: %v", errBlocked, err)
	}
	p := moved.Parts[sv.pi]
	baseT := p.Temperature
	md, err := study.Build(moved.WithPartTemperature(sv.part, sv.meshT))
	if err != nil {
		return nil, fmt.Errorf("height %.4g mm: %w", z*1e3, err)
	}
	sw, err := md.NewSweeper()
	if err != nil {
		return nil, fmt.Errorf("height %.4g mm: %w", z*1e3, err)
	}
	st := &state{z: z}
	for k, t := range append([]float64{baseT}, temps...) {
		ov := md.TemperatureOverrides(func(r geometry.Region) float64 {
			if r.Kind == geometry.PartRegion && r.Part == sv.pi {
				return t
			}
			return r.Temperature
		})
		sol, err := sw.SolveAt(moved.Frequency, ov...)
		if err != nil {
			return nil, fmt.Errorf("height %.4g mm, part at %.1f K: %w", z*1e3, t, err)
		}
		pr, ok := partResult(sol, sv.part)
		if !ok {
			return nil, fmt.Errorf("height %.4g mm: part %q missing from the result", z*1e3, sv.part)
		}
		f, o := pr.ForceZ, pr.ForceZStress
		if sv.stress {
			if math.IsNaN(o) || math.IsInf(o, 0) {
				return nil, fmt.Errorf("height %.4g mm: the Maxwell-stress force is not available (%s); use the volume force", z*1e3, pr.StressNote)
			}
			f, o = o, f
		}
		st.force = append(st.force, f)
		st.other = append(st.other, o)
		st.power = append(st.power, pr.Power)
		if k == 0 {
			st.balance = sol.Result.BalanceError
			st.unknowns = sol.Result.Unknowns
			for _, c := range sol.Result.Coils {
				st.impedance = append(st.impedance, Impedance{Coil: c.Name, R: real(c.Impedance), X: imag(c.Impedance),
					L: imag(c.Impedance) / (2 * math.Pi * sol.Result.Frequency)})
			}
		}
	}
	return st, nil
}

func partResult(sol *study.Solution, name string) (post.PartResult, bool) {
	for _, p := range sol.Result.Parts {
		if p.Name == name {
			return p, true
		}
	}
	return post.PartResult{}, false
}

// many solves at every height of zs concurrently (bounded by the solver's semaphore) and returns the states in
// order; a blocked height gives a nil state and its error in blocked.
func (sv *solver) many(zs []float64, temps []float64) (states []*state, blocked []error, err error) {
	states = make([]*state, len(zs))
	blocked = make([]error, len(zs))
	errs := make([]error, len(zs))
	var wg sync.WaitGroup
	for i, z := range zs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			states[i], errs[i] = sv.at(z, temps)
		}()
	}
	wg.Wait()
	for i, e := range errs {
		if e == nil {
			continue
		}
		if errors.Is(e, errBlocked) {
			blocked[i] = e
			continue
		}
		return nil, nil, e
	}
	return states, blocked, nil
}

// fieldWithoutPart solves the coil's field with the part replaced by a non-conducting probe cylinder on the
// axis that spans [zlo, zhi] (radius rp), so that the mesh resolves the axis there; it returns the solution.
func fieldWithoutPart(job *geometry.Job, mc geometry.MeshControls, pi int, zlo, zhi, rp float64) (*study.Solution, error) {
	j := job.Copy()
	j.Mesh = mc
	// A fictitious material of 1 Ω·m: its skin depth is metres, so the size field takes the probe's shape.
	probe := &material.Material{Name: "axis probe", ResistivitySolid: material.Const(1), MuRel: 1, Melting: math.Inf(1)}
	j.Parts[pi] = geometry.Part{Name: "axis probe", Shape: geometry.Cylinder, Radius: rp, Height: zhi - zlo, Z: zlo,
		Material: probe, Temperature: 293.15}
	md, err := study.Build(j)
	if err != nil {
		return nil, fmt.Errorf("coil field without the part: %w", err)
	}
	reg, err := md.PartRegion("axis probe")
	if err != nil {
		return nil, err
	}
	sw, err := md.NewSweeper()
	if err != nil {
		return nil, err
	}
	// σ = 0 makes the probe air; it only shapes the mesh.
	sol, err := sw.SolveAt(j.Frequency, fem.Override{Tag: reg.Tag, Sigma: 0, MuR: 1})
	if err != nil {
		return nil, fmt.Errorf("coil field without the part: %w", err)
	}
	return sol, nil
}
