package levitate

import (
	"fmt"
	"math"
	"sort"
	"sync"
	"sync/atomic"

	"eddyrz/geometry"
)

// Run performs the levitation study of opt on job: the height sweep (solves spread over opt.Workers goroutines,
// each building its own model: the part is re-meshed at every height), the weight, the refined equilibria with
// their stiffness, the floating current when asked, the small-body lateral estimate and the heating sweep.
func Run(job *geometry.Job, opt Options) (*Result, error) {
	s, err := resolve(job, opt)
	if err != nil {
		return nil, err
	}
	sv := newSolver(job, s)
	var solves atomic.Int64
	count := func(n int) { solves.Add(int64(n)) }
	part := job.Parts[s.partIndex]
	rho := part.Material.Density(part.Temperature)
	if !(rho > 0) {
		return nil, fmt.Errorf("%s: part %q: its material %q has no density, so its weight is unknown", job.File, part.Name, part.Material.Name)
	}
	vol := Volume(part)
	res := &Result{Job: job.Name, Part: part.Name, HeightReference: HeightReference(part), FrequencyHz: job.Frequency,
		TemperatureK: part.Temperature, DensityKgM3: rho, VolumeM3: vol, MassKg: rho * vol,
		Weight: rho * vol * StandardGravity, Gravity: StandardGravity, Warnings: []string{}, Cautions: []string{},
		Mesh: MeshUsed{PerSkinDepth: s.mesh.PerSkinDepth, Growth: s.mesh.Growth, Order: s.mesh.Order, MeshTemperatureK: sv.meshT}}
	for _, c := range job.Coils {
		res.Currents = append(res.Currents, CoilCurrent{Coil: c.Name, Current: c.Value})
	}

	states, blocked, err := sv.many(s.z, s.temps)
	count(len(s.z) * (1 + len(s.temps)))
	if err != nil {
		return nil, err
	}
	var zs []float64
	var good []*state
	for i, st := range states {
		if st == nil {
			res.Blocked = append(res.Blocked, s.z[i])
			res.Warnings = append(res.Warnings, fmt.Sprintf("height %.4g mm skipped: %v", s.z[i]*1e3, blocked[i]))
			continue
		}
		zs = append(zs, st.z)
		good = append(good, st)
		p := Point{Z: st.z, ForceZ: st.force[0], Power: st.power[0], Impedance: st.impedance, BalanceError: st.balance}
		if o := st.other[0]; !math.IsNaN(o) && !math.IsInf(o, 0) {
			p.ForceZOther = &o
		}
		res.Curve = append(res.Curve, p)
		res.Mesh.Unknowns = max(res.Mesh.Unknowns, st.unknowns)
	}
	if len(good) < 3 {
		return nil, fmt.Errorf("%s: only %d of %d heights could be solved (the part overlaps the coil elsewhere): choose another range", job.File, len(good), len(s.z))
	}
	forces := make([]float64, len(good))
	for i, st := range good {
		forces[i] = st.force[0]
	}
	fmax := 0.0
	for _, x := range forces {
		fmax = math.Max(fmax, math.Abs(x))
	}
	ripple := Ripple(zs, forces, math.Max(res.Weight, 0.1*fmax))
	for i := range res.Curve {
		res.Curve[i].Ripple = ripple[i]
		res.MaxRipple = math.Max(res.MaxRipple, ripple[i])
	}
	res.RippleNote = "ripple: deviation of F_z at each interior height from the cubic through the four nearest other heights, relative to max(|F_z|, m g, 10 % of max |F_z|)"
	if res.MaxRipple > 0.005 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("force ripple between neighbouring heights reaches %.2g %% (> 0.5 %%): mesh noise or a real feature of the force curve; refine the mesh or the height step", 100*res.MaxRipple))
	}

	// Equilibria at the job's current, refined by real solves.
	eqs, n, err := refineAll(sv, zs, forces, res.Weight, s)
	count(n)
	if err != nil {
		return nil, err
	}
	res.ForceMethod = s.force
	res.Equilibria = eqs
	if len(eqs) == 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("no equilibrium in the swept range: F_z stays %s the weight %.4g N", aboveBelow(forces, res.Weight), res.Weight))
	}

	if s.floatAt != nil {
		fc, n, err := floatCurrent(sv, *s.floatAt, s.h, res.Weight, job)
		count(n)
		if err != nil {
			return nil, err
		}
		res.Float = fc
	}

	if s.lateral {
		est, err := lateral(job, s, part, zs, res.Equilibria)
		count(1)
		if err != nil {
			res.Warnings = append(res.Warnings, "lateral estimate not available: "+err.Error())
		} else {
			res.Lateral = est
		}
	}

	for k, t := range s.temps {
		tp := TemperaturePoint{TemperatureK: t, Liquid: part.Material.Liquid(t), Resistivity: part.Material.Resistivity(t)}
		for _, st := range good {
			tp.ForceZ = append(tp.ForceZ, st.force[k+1])
			tp.Power = append(tp.Power, st.power[k+1])
		}
		tp.Equilibria = gridEquilibria(zs, tp.ForceZ, tp.Power, res.Weight)
		for i := len(tp.Equilibria) - 1; i >= 0; i-- {
			if e := tp.Equilibria[i]; e.Stable {
				z, p := e.Z, e.Power
				tp.StableZ, tp.PowerAtStable = &z, &p
				break
			}
		}
		if tp.StableZ == nil {
			res.Warnings = append(res.Warnings, fmt.Sprintf("at %.0f °C (%s) no stable equilibrium remains in the swept range: the part would fall out of the coil",
				t-273.15, phase(tp.Liquid)))
		}
		res.Temperature = append(res.Temperature, tp)
	}
	res.Solves = int(solves.Load())
	res.Cautions = cautions(res, job)
	res.Notes = append(res.Notes,
		fmt.Sprintf("heights are the part's %s (z up, gravity along −z, g = 9.80665 m/s²)", refWords(res.HeightReference)),
		"the field is linear: force and power scale with I² (all coil currents scaled together), impedance does not change",
		fmt.Sprintf("every height is re-meshed; mesh: %g elements per skin depth, growth %g, order %d, sized for the part at %.0f °C",
			s.mesh.PerSkinDepth, s.mesh.Growth, s.mesh.Order, sv.meshT-273.15),
		"equilibria of the height sweep are refined by Illinois regula falsi with real solves; those of the temperature sweep are interpolated (cubic) on the sweep grid",
		"temperature sweep: the mass is conserved (weight of the job's temperature) and the shape is not rescaled for thermal expansion; liquid properties at and above the melting point",
	)
	return res, nil
}

func refWords(ref string) string {
	if ref == RefCentre {
		return "centre height (sphere)"
	}
	return "bottom face height"
}

func phase(liquid bool) string {
	if liquid {
		return "liquid"
	}
	return "solid"
}

func aboveBelow(f []float64, w float64) string {
	for _, x := range f {
		if x < w {
			return "below"
		}
	}
	return "above"
}

// Ripple returns, for each interior sample of a force curve on heights z, the deviation of F[i] from a smooth
// fit of its neighbours: the cubic through the four nearest other samples (two on each side where there are,
// else shifted inwards), evaluated at z[i]; relative to max(|F[i]|, floor) so that a crossing of zero does not
// inflate it (the study passes floor = max(m·g, 0.1·max|F|): the force that matters where F is small is the
// weight it balances). The ends get 0. A smooth curve sampled at step Δ leaves O(Δ⁴ d⁴F/dz⁴) in the deviation, so
// what remains on a fine enough step is mesh noise.
func Ripple(z, f []float64, floor float64) []float64 {
	n := len(f)
	out := make([]float64, n)
	if n < 5 {
		return out
	}
	for i := 1; i < n-1; i++ {
		lo := min(max(i-2, 0), n-5) // window [lo, lo+4] holds i and four others
		var xs, ys [4]float64
		k := 0
		for j := lo; j < lo+5; j++ {
			if j != i {
				xs[k], ys[k] = z[j], f[j]
				k++
			}
		}
		fit := lagrange(xs[:], ys[:], z[i])
		out[i] = math.Abs(f[i]-fit) / math.Max(math.Abs(f[i]), floor)
	}
	return out
}

// lagrange evaluates at x the polynomial through the points (xs, ys).
func lagrange(xs, ys []float64, x float64) float64 {
	var v float64
	for i := range xs {
		l := 1.0
		for j := range xs {
			if j != i {
				l *= (x - xs[j]) / (xs[i] - xs[j])
			}
		}
		v += l * ys[i]
	}
	return v
}

// brackets returns the indices i with F[i] − w and F[i+1] − w of opposite signs (or F[i] = w exactly).
func brackets(f []float64, w float64) []int {
	var out []int
	for i := 0; i+1 < len(f); i++ {
		a, b := f[i]-w, f[i+1]-w
		if a == 0 || a*b < 0 {
			out = append(out, i)
		}
	}
	return out
}

// refineAll finds every equilibrium on the sweep and refines it with real solves; roots run concurrently.
func refineAll(sv *solver, zs, f []float64, w float64, s *settings) ([]Equilibrium, int, error) {
	br := brackets(f, w)
	eqs := make([]Equilibrium, len(br))
	errs := make([]error, len(br))
	ns := make([]int, len(br))
	var wg sync.WaitGroup
	for k, i := range br {
		wg.Add(1)
		go func() {
			defer wg.Done()
			eqs[k], ns[k], errs[k] = refine(sv, zs[i], zs[i+1], f[i], f[i+1], w, s)
		}()
	}
	wg.Wait()
	total := 0
	for k := range br {
		total += ns[k]
		if errs[k] != nil {
			return nil, total, errs[k]
		}
	}
	return eqs, total, nil
}

// refine solves F(z) = w in [a, b] (F(a) − w and F(b) − w of opposite signs) by the Illinois variant of regula
// falsi with real solves, then forms k_z from solves at z ± h.
func refine(sv *solver, a, b, fa, fb, w float64, s *settings) (Equilibrium, int, error) {
	fa, fb = fa-w, fb-w
	n := 0
	z, fz, pz := a, fa, math.NaN()
	if fa != 0 {
		for it := 0; it < s.refineIter; it++ {
			z = b - fb*(b-a)/(fb-fa)
			st, err := sv.at(z, nil)
			n++
			if err != nil {
				return Equilibrium{}, n, fmt.Errorf("refining the equilibrium in [%.4g, %.4g] mm: %w", a*1e3, b*1e3, err)
			}
			fz, pz = st.force[0]-w, st.power[0]
			if math.Abs(fz) <= 1e-5*math.Abs(w) || math.Abs(b-a) < 1e-7 {
				break
			}
			if fz*fb < 0 {
				a, fa = b, fb
			} else {
				// The new point fell on b's side: halve the stale end's value (Illinois).
				fa /= 2
			}
			b, fb = z, fz
		}
	}
	if math.IsNaN(pz) {
		st, err := sv.at(z, nil)
		n++
		if err != nil {
			return Equilibrium{}, n, err
		}
		fz, pz = st.force[0]-w, st.power[0]
	}
	k, nk, err := stiffness(sv, z, fz+w, s.h)
	n += nk
	if err != nil {
		return Equilibrium{}, n, err
	}
	return Equilibrium{Z: z, ForceZ: fz + w, Residual: fz, Stiffness: k, StepM: s.h, Stable: k > 0, Power: pz, Solves: n}, n, nil
}

// stiffness is −dF/dz at z from solves at z ± h (one-sided with F(z) = f0 when one side is blocked).
func stiffness(sv *solver, z, f0, h float64) (float64, int, error) {
	states, blocked, err := sv.many([]float64{z - h, z + h}, nil)
	if err != nil {
		return 0, 2, err
	}
	lo, hi := states[0], states[1]
	switch {
	case lo != nil && hi != nil:
		return -(hi.force[0] - lo.force[0]) / (2 * h), 2, nil
	case hi != nil:
		return -(hi.force[0] - f0) / h, 2, nil
	case lo != nil:
		return -(f0 - lo.force[0]) / h, 2, nil
	}
	return 0, 2, fmt.Errorf("stiffness at %.4g mm: both neighbours blocked: %v", z*1e3, blocked[0])
}

// gridEquilibria locates F = w on the sweep grid by a cubic (Catmull-Rom) interpolant of F between samples,
// and takes k_z and the power from the interpolants.
func gridEquilibria(z, f, p []float64, w float64) []Equilibrium {
	var out []Equilibrium
	for _, i := range brackets(f, w) {
		fi := func(t float64) float64 { return hermite(f, i, t) }
		lo, hi := 0.0, 1.0
		for it := 0; it < 60; it++ {
			m := (lo + hi) / 2
			if (fi(lo)-w)*(fi(m)-w) <= 0 {
				hi = m
			} else {
				lo = m
			}
		}
		t := (lo + hi) / 2
		dz := z[i+1] - z[i]
		k := -hermiteSlope(f, i, t) / dz
		out = append(out, Equilibrium{Z: z[i] + t*dz, ForceZ: fi(t), Residual: fi(t) - w, Stiffness: k, StepM: dz,
			Stable: k > 0, Power: hermite(p, i, t)})
	}
	sort.Slice(out, func(a, b int) bool { return out[a].Z < out[b].Z })
	return out
}

// hermite evaluates the Catmull-Rom cubic of samples y between y[i] and y[i+1] at fraction t (uniform grid;
// one-sided tangents at the ends).
func hermite(y []float64, i int, t float64) float64 {
	m0, m1 := tangent(y, i), tangent(y, i+1)
	t2, t3 := t*t, t*t*t
	return (2*t3-3*t2+1)*y[i] + (t3-2*t2+t)*m0 + (-2*t3+3*t2)*y[i+1] + (t3-t2)*m1
}

func hermiteSlope(y []float64, i int, t float64) float64 {
	m0, m1 := tangent(y, i), tangent(y, i+1)
	t2 := t * t
	return (6*t2-6*t)*y[i] + (3*t2-4*t+1)*m0 + (-6*t2+6*t)*y[i+1] + (3*t2-2*t)*m1
}

func tangent(y []float64, i int) float64 {
	switch {
	case i == 0:
		return y[1] - y[0]
	case i == len(y)-1:
		return y[i] - y[i-1]
	}
	return (y[i+1] - y[i-1]) / 2
}

// floatCurrent finds the current scale that floats the part at z: F scales with I².
func floatCurrent(sv *solver, z, h, w float64, job *geometry.Job) (*FloatCurrent, int, error) {
	st, err := sv.at(z, nil)
	if err != nil {
		return nil, 1, fmt.Errorf("floating current at %.4g mm: %w", z*1e3, err)
	}
	fc := &FloatCurrent{Z: z, ForceZ: st.force[0]}
	if !(st.force[0] > 0) {
		fc.Note = fmt.Sprintf("the force at this height points down (%.4g N at the job's current): no current floats the part here", st.force[0])
		return fc, 1, nil
	}
	k, n, err := stiffness(sv, z, st.force[0], h)
	if err != nil {
		return nil, 1 + n, err
	}
	fc.Possible = true
	s2 := w / st.force[0]
	fc.Scale = math.Sqrt(s2)
	for _, c := range job.Coils {
		fc.Currents = append(fc.Currents, CoilCurrent{Coil: c.Name, Current: c.Value * fc.Scale})
	}
	fc.Stiffness, fc.Stable, fc.Power = k*s2, k > 0, st.power[0]*s2
	fc.Note = "force and power scale with I² in this linear model: every coil current is multiplied by √(m g / F_z(z))"
	if !fc.Stable {
		fc.Note += "; the part would be held there in an UNSTABLE equilibrium (k_z ≤ 0)"
	}
	return fc, 1 + n, nil
}

// lateral solves the coil alone and evaluates the small-body estimate on the sweep heights and equilibria.
func lateral(job *geometry.Job, s *settings, part geometry.Part, zs []float64, eqs []Equilibrium) (*LateralEstimate, error) {
	vol := Volume(part)
	a := math.Cbrt(3 * vol / (4 * math.Pi))
	delta := part.Material.SkinDepth(job.Frequency, part.Temperature)
	q := a / delta
	reAlpha := -8 * math.Pi * a * a * a / 3 * ForceFunctionG(q)
	off := centreOffset(part)
	zlo, zhi := zs[0]+off-a, zs[len(zs)-1]+off+a
	for _, e := range eqs {
		zlo, zhi = math.Min(zlo, e.Z+off-a), math.Max(zhi, e.Z+off+a)
	}
	sol, err := fieldWithoutPart(job, s.mesh, s.partIndex, zlo, zhi, a/2)
	if err != nil {
		return nil, err
	}
	af := axisField{sol: sol.Field, k: sol.Scale}
	est := &LateralEstimate{Assumption: LateralAssumption, EquivalentRadius: a, Q: q, ReAlpha: reAlpha}
	for _, z := range zs {
		lp, err := lateralAt(af, reAlpha, a, off, z)
		if err != nil {
			return nil, err
		}
		est.Curve = append(est.Curve, lp)
	}
	for i := range eqs {
		lp, err := lateralAt(af, reAlpha, a, off, eqs[i].Z)
		if err != nil {
			return nil, err
		}
		eqs[i].Lateral = &lp
	}
	return est, nil
}

// cautions are the warnings a designer needs about the melt leaving the coil when the operating point moves.
func cautions(res *Result, job *geometry.Job) []string {
	var out []string
	var stable *Equilibrium
	for i := len(res.Equilibria) - 1; i >= 0; i-- {
		if res.Equilibria[i].Stable {
			stable = &res.Equilibria[i]
			break
		}
	}
	if stable != nil {
		// Lowering the current moves the stable point down the falling branch until it reaches the force peak
		// below it; under I·√(mg/F_peak) the part drops out.
		peak := stable.ForceZ
		for _, p := range res.Curve {
			if p.Z <= stable.Z && p.ForceZ > peak {
				peak = p.ForceZ
			}
		}
		ratio := math.Sqrt(res.Weight / peak)
		out = append(out, fmt.Sprintf("current: the stable height %.4g mm holds down to about %.0f %% of the job's current (peak lift %.4g N below it, at swept heights); below that the part falls out of the coil",
			stable.Z*1e3, 100*ratio, peak))
	}
	if len(res.Temperature) > 0 {
		lost := ""
		for _, tp := range res.Temperature {
			if tp.StableZ == nil {
				lost = fmt.Sprintf("%.0f °C", tp.TemperatureK-273.15)
				break
			}
		}
		if lost != "" {
			out = append(out, "temperature: no stable equilibrium at "+lost+" in the swept range: the part falls out of the coil as it heats (resistivity rises, most of all on melting)")
		} else {
			out = append(out, "temperature: the stable equilibrium moves as the part heats (see the temperature sweep); at melting the resistivity jumps and the lift changes with it")
		}
	}
	out = append(out, fmt.Sprintf("frequency: the lift depends on a/δ (skin depth ∝ 1/√f); at a frequency other than %.4g kHz re-run the study before relying on these heights", job.Frequency/1e3))
	return out
}
