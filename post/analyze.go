// Package post derives the quantities a coil designer reads from a harmonic solution: coil impedance, power,
// per-turn currents and losses, power and forces on each part, where the heat goes, efficiency and energy, and
// writes them as JSON, text and CSV.
//
// Conventions (physics.md): SI units; phasors are RMS, x(t) = √2 Re{X e^{jωt}}; powers, forces and energies
// are time averages. Joule power density p = |J|²/σ (W/m³); force density Re{J × B*} (N/m³); complex power
// S = V I* (VA).
package post

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"time"

	"eddyrz/fem"
)

// Options controls Analyze. The zero value computes everything.
type Options struct {
	// SkipStress turns off the Maxwell-stress cross-check of the parts' axial forces.
	SkipStress bool
	// PowerOnly keeps what a frequency sweep reads (impedances, region powers, forces, energy, balance) and
	// skips where the heat sits in each part (peak density, skin share, thirds and z extent are NaN) and the
	// stress check.
	PowerOnly bool
	// MeshTime is how long the caller spent meshing, reported in the timings.
	MeshTime time.Duration
}

// Result holds everything Analyze derives from one solution. All phasors are RMS.
type Result struct {
	Frequency float64 // Hz
	Nodes     int     // mesh nodes (corner and midpoint)
	Triangles int
	Unknowns  int
	// BalanceError is max(|Re S − P_Joule|, |Im S − 2ωW_m|)/|S| with S = Σ V I* over the coils (the definition
	// of fem.Solution.BalanceError); NaN when an applied field drives the problem.
	BalanceError float64
	StoredEnergy float64 // time-averaged magnetic energy, J
	// Efficiency is Σ part power / Σ coil terminal power Re{V I*}; NaN when the coils deliver no power.
	Efficiency float64
	AppliedBz  complex128 // applied uniform axial flux density, T rms (0 for none)
	Coils      []CoilResult
	Parts      []PartResult
	Timing     Timing
}

// Timing is how long each stage took.
type Timing struct {
	Mesh, Assemble, Factor, Solve, Analyze time.Duration
}

// Total is the sum of the stages.
func (t Timing) Total() time.Duration { return t.Mesh + t.Assemble + t.Factor + t.Solve + t.Analyze }

// CoilResult describes one coil at its terminals.
type CoilResult struct {
	Name    string
	Current complex128 // A rms
	Voltage complex128 // terminal voltage, V rms
	// Impedance Z = V/I (Ω); Resistance = Re Z (Ω); Inductance = Im Z/ω (H); QualityFactor = ωL/R;
	// PowerFactor = R/|Z| (cos of the angle of Z; lagging when L > 0). NaN when the current is zero.
	Impedance                  complex128
	Resistance, Inductance     float64
	QualityFactor, PowerFactor float64
	Power                      float64 // Re{V I*}, W
	ReactivePower              float64 // Im{V I*}, var
	Loss                       float64 // Joule loss in the coil's own conductors (incl. Rdc I² of stranded blocks), W
	Turns                      []TurnResult
}

// TurnResult is one solid turn or stranded block of a coil, in the order of fem.Solution.Regions.
type TurnResult struct {
	Name    string
	Kind    fem.RegionKind // fem.SolidTurn or fem.Stranded
	Sense   int            // winding sense, ±1
	Strands int            // series turns in the block (1 for a solid turn)
	Current complex128     // current in the conductor, A rms, in the +φ direction (Sense × coil current)
	// LoopVoltage is the voltage around the loop in the +φ direction, V rms: the solved U of a solid turn; for a
	// stranded block, the block-averaged induced loop voltage jω∫2πrA dr dz/area.
	LoopVoltage complex128
	// Voltage is the turn's share of the coil's terminal voltage, V rms (Sense·U for a solid turn;
	// Sense·Strands·LoopVoltage + Rdc·I for a block). The shares sum to the coil voltage.
	Voltage complex128
	Loss    float64 // Joule loss, W (∫|J|²/σ dV; Rdc|I|² for a stranded block)
}

// PartResult describes the power and force on one part (workpiece).
type PartResult struct {
	Name  string
	Power float64 // Joule power, W
	// ForceZ is the time-averaged axial Lorentz force −∫Re{J B_r*} 2πr dr dz, N (positive up, +z).
	ForceZ float64
	// ForceR is ∫Re{J B_z*} 2πr dr dz, N: the volume integral of the radial force density (positive outward),
	// a measure of the pinch (< 0) or expansion (> 0) load, not a net force (that is zero by symmetry).
	ForceR float64
	// ForceZStress is the axial force from the Maxwell stress in the surrounding air (see stress.go), N; NaN
	// when it was skipped or there is no room for it (StressNote says why). StressDiff is
	// |ForceZStress − ForceZ|/|ForceZ|.
	ForceZStress, StressDiff float64
	// ShellInner and ShellOuter are the distances from the part between which the stress weight falls from 1
	// to 0, m.
	ShellInner, ShellOuter float64
	StressNote             string
	// PeakDensity is the largest Joule power density found at the part's nodes and quadrature points, W/m³,
	// at (PeakR, PeakZ), m.
	PeakDensity, PeakR, PeakZ float64
	// SkinDepth δ = √(2/(ωμ0μrσ)), m; SkinShare is the fraction of the part's power within δ of its surface
	// (its boundary off the axis), judged at quadrature points. NaN for a part with no power.
	SkinDepth, SkinShare float64
	// Thirds is the power in the bottom, middle and top thirds of the part's z extent, W (by quadrature point).
	Thirds     [3]float64
	ZMin, ZMax float64 // the part's z extent, m
	// MuR is the part's relative permeability as solved (a linear, effective value).
	MuR float64
}

// Analyze derives the designer's quantities from sol. It returns an error when sol has no mesh or fields.
func Analyze(sol *fem.Solution, opt Options) (*Result, error) {
	t0 := time.Now()
	if sol == nil || sol.Mesh == nil || len(sol.Mesh.Tris) == 0 {
		return nil, errors.New("analyze: solution has no mesh")
	}
	if len(sol.A) != len(sol.Mesh.Nodes) {
		return nil, fmt.Errorf("analyze: solution has %d potentials for %d nodes", len(sol.A), len(sol.Mesh.Nodes))
	}
	w := 2 * math.Pi * sol.Frequency
	var mi *meshInfo // part outlines and the stress shells' air; not needed for PowerOnly
	if !opt.PowerOnly {
		mi = newMeshInfo(sol)
	}
	res := &Result{
		Frequency: sol.Frequency, Nodes: len(sol.Mesh.Nodes), Triangles: len(sol.Mesh.Tris),
		Unknowns: sol.Stats.Unknowns, AppliedBz: sol.AppliedBz,
		Timing: Timing{Mesh: opt.MeshTime, Assemble: sol.Stats.Assemble, Factor: sol.Stats.Factor, Solve: sol.Stats.Solve},
	}

	// Per-part set-up: outline, skin depth, stress shell.
	type partWork struct {
		ri    int
		o     *outline
		sh    *shell
		delta float64
	}
	var parts []*partWork
	partOf := make([]int, len(sol.Regions)) // region → index in parts, or -1
	shells := map[int][]int{}               // triangle → parts whose shell gradient is non-zero there
	for ri, r := range sol.Regions {
		partOf[ri] = -1
		if r.Kind != fem.Part {
			continue
		}
		pw := &partWork{ri: ri, delta: skinDepth(w, r.Sigma, r.MuR)}
		pr := PartResult{Name: r.Name, ForceZStress: math.NaN(), StressDiff: math.NaN(), SkinDepth: pw.delta,
			ZMin: math.NaN(), ZMax: math.NaN(), PeakR: math.NaN(), PeakZ: math.NaN(), MuR: r.MuR}
		if mi != nil {
			pw.o = mi.newOutline(ri)
			pr.ZMin, pr.ZMax = pw.o.lo.Y, pw.o.hi.Y
		}
		if opt.PowerOnly {
			pr.StressNote = "skipped"
		} else if len(pw.o.elems) == 0 {
			pr.StressNote = "part has no triangles in the mesh"
		} else if opt.SkipStress {
			pr.StressNote = "skipped"
		} else {
			var note string
			pw.sh, note = mi.newShell(ri, pw.o)
			pr.StressNote = note
			if pw.sh != nil && r.MuR > 1 {
				// The stress in the air is the whole force on the body; the Lorentz volume integral leaves out the
				// pull on its magnetisation, so on a magnetic part the two differ by physics, not by error.
				pr.StressNote = fmt.Sprintf("magnetic part (μr = %g): the stress-tensor value includes the force on "+
					"its magnetisation, which the Lorentz volume integral leaves out; use the stress-tensor value", r.MuR)
			}
			if pw.sh != nil {
				pr.ShellInner, pr.ShellOuter = pw.sh.inner, pw.sh.outer
				pr.ForceZStress = 0
				for t := range pw.sh.grad {
					shells[t] = append(shells[t], len(parts))
				}
			}
		}
		partOf[ri] = len(parts)
		parts = append(parts, pw)
		res.Parts = append(res.Parts, pr)
	}

	// One pass over the quadrature points.
	loss := make([]float64, len(sol.Regions))
	intA := make([]complex128, len(sol.Regions)) // ∫ A 2πr dr dz, for stranded flux linkage
	area := make([]float64, len(sol.Regions))    // ∫ dr dz
	skin := make([]float64, len(parts))
	var energy float64 // ∫ ν|B|²/2 dV over the mesh
	sol.EachPoint(func(q fem.QuadPoint) {
		energy += fem.EnergyDensity(q) * q.Weight
		for _, pi := range shells[q.Elem] {
			res.Parts[pi].ForceZStress += stressDensity(q.Br, q.Bz, parts[pi].sh.grad[q.Elem]) * q.Weight
		}
		if q.Region < 0 {
			return
		}
		reg := sol.Regions[q.Region]
		if reg.Kind == fem.Stranded {
			intA[q.Region] += q.A * complex(q.Weight, 0)
			area[q.Region] += q.Weight / (2 * math.Pi * q.R)
			return
		}
		p := jouleDensity(q.J, q.Sigma)
		loss[q.Region] += p * q.Weight
		pi := partOf[q.Region]
		if pi < 0 {
			return
		}
		pr, pw := &res.Parts[pi], parts[pi]
		pr.ForceZ += lorentzFz(q)
		pr.ForceR += lorentzFr(q)
		if opt.PowerOnly {
			return
		}
		pr.peak(p, q.R, q.Z)
		if pw.o.distWithin(pointRZ(q.R, q.Z), pw.delta) <= pw.delta {
			skin[pi] += p * q.Weight
		}
		pr.Thirds[third(q.Z, pr.ZMin, pr.ZMax)] += p * q.Weight
	})

	for pi, pw := range parts {
		pr := &res.Parts[pi]
		pr.Power = loss[pw.ri]
		pr.SkinShare = math.NaN()
		if opt.PowerOnly {
			pr.PeakDensity = math.NaN()
			pr.Thirds = [3]float64{math.NaN(), math.NaN(), math.NaN()}
		} else if pr.Power > 0 {
			pr.SkinShare = skin[pi] / pr.Power
		}
		if pr.ForceZ != 0 {
			pr.StressDiff = math.Abs(pr.ForceZStress-pr.ForceZ) / math.Abs(pr.ForceZ)
		}
		if opt.PowerOnly {
			continue
		}
		// The surface value is the peak in a skin-effect profile; nodes on the surface catch it.
		for _, t := range pw.o.elems {
			sigma := sol.ElementSigma(t)
			for _, v := range triNodes(sol, t) {
				pt := sol.Mesh.Nodes[v]
				pr.peak(jouleDensity(complex(0, -w*sigma)*sol.A[v], sigma), pt.X, pt.Y)
			}
		}
	}

	var coilPower, partPower float64
	jw := complex(0, w)
	for ci, c := range sol.Coils {
		cr := CoilResult{Name: c.Name, Current: sol.CoilI[ci], Voltage: sol.CoilV[ci], Impedance: sol.CoilZ[ci]}
		s := cr.Voltage * cmplx.Conj(cr.Current)
		cr.Power, cr.ReactivePower = real(s), imag(s)
		cr.setImpedance(w)
		for ri, r := range sol.Regions {
			if r.Coil != ci || (r.Kind != fem.SolidTurn && r.Kind != fem.Stranded) {
				continue
			}
			sense := complex(float64(r.Sense), 0)
			tr := TurnResult{Name: r.Name, Kind: r.Kind, Sense: r.Sense, Strands: 1, Current: sense * cr.Current}
			switch r.Kind {
			case fem.SolidTurn:
				tr.LoopVoltage = sol.TurnU[ri]
				tr.Voltage = sense * tr.LoopVoltage
				tr.Loss = loss[ri]
			case fem.Stranded:
				tr.Strands = r.Strands
				if area[ri] > 0 {
					tr.LoopVoltage = jw * intA[ri] / complex(area[ri], 0)
				}
				tr.Voltage = sense*complex(float64(r.Strands), 0)*tr.LoopVoltage + complex(r.Rdc, 0)*cr.Current
				tr.Loss = r.Rdc * sqAbs(cr.Current)
			}
			cr.Loss += tr.Loss
			cr.Turns = append(cr.Turns, tr)
		}
		coilPower += cr.Power
		res.Coils = append(res.Coils, cr)
	}
	for _, p := range res.Parts {
		partPower += p.Power
	}
	res.Efficiency = math.NaN()
	if coilPower != 0 {
		res.Efficiency = partPower / coilPower
	}

	// Energy balance with the losses found above (fem.Solution.BalanceError's definition, without its extra
	// passes over the mesh).
	res.StoredEnergy = energy + sol.BoundaryEnergy() // fem.Solution.MagneticEnergy, from the pass above
	res.BalanceError = math.NaN()
	var supplied complex128
	for ci := range sol.Coils {
		supplied += sol.CoilV[ci] * cmplx.Conj(sol.CoilI[ci])
	}
	if sol.AppliedBz == 0 && supplied != 0 {
		var joule float64
		for ri, r := range sol.Regions {
			if r.Kind == fem.Stranded {
				joule += r.Rdc * sqAbs(sol.CoilI[r.Coil])
			} else {
				joule += loss[ri]
			}
		}
		res.BalanceError = max(math.Abs(real(supplied)-joule), math.Abs(imag(supplied)-2*w*res.StoredEnergy)) /
			cmplx.Abs(supplied)
	}
	res.Timing.Analyze = time.Since(t0)
	return res, nil
}

// jouleDensity is the time-averaged Joule power density |J|²/σ, W/m³, for an rms current density J (A/m²) in a
// conductor of conductivity sigma (S/m); 0 where sigma is 0 (air, or a stranded block whose loss is Rdc I²).
func jouleDensity(j complex128, sigma float64) float64 {
	if sigma <= 0 {
		return 0
	}
	return sqAbs(j) / sigma
}

// skinDepth is δ = √(2/(ωμ0μrσ)), m (physics.md); +Inf for a non-conductor. A zero μr means 1.
func skinDepth(w, sigma, mur float64) float64 {
	if mur == 0 {
		mur = 1
	}
	if sigma <= 0 {
		return math.Inf(1)
	}
	return math.Sqrt(2 / (w * fem.Mu0 * mur * sigma))
}

func (c *CoilResult) setImpedance(w float64) {
	if c.Current == 0 {
		c.Impedance = cmplx.NaN()
		c.Resistance, c.Inductance, c.QualityFactor, c.PowerFactor = math.NaN(), math.NaN(), math.NaN(), math.NaN()
		return
	}
	z := c.Impedance
	c.Resistance, c.Inductance = real(z), imag(z)/w
	c.QualityFactor = imag(z) / real(z)
	c.PowerFactor = real(z) / cmplx.Abs(z)
}

func (p *PartResult) peak(d, r, z float64) {
	if d > p.PeakDensity || math.IsNaN(p.PeakR) {
		p.PeakDensity, p.PeakR, p.PeakZ = d, r, z
	}
}

// third is 0, 1 or 2 for z in the bottom, middle or top third of [lo, hi].
func third(z, lo, hi float64) int {
	if hi <= lo {
		return 1
	}
	return min(2, max(0, int(3*(z-lo)/(hi-lo))))
}

// triNodes lists the nodes of triangle t (corners, then midpoints on a quadratic mesh).
func triNodes(sol *fem.Solution, t int) []int32 {
	n := sol.Mesh.Tris[t][:]
	if sol.Mesh.Mid != nil {
		n = append(n[:3:3], sol.Mesh.Mid[t][:]...)
	}
	return n
}
