// Package levitate studies a part held by a coil's Lorentz force: the axial force, absorbed power and coil
// impedance over a range of heights, the weight and every equilibrium height (refined with real solves), the
// axial stiffness and stability there, the current that floats the part at a chosen height, a small-body
// estimate of lateral stability, and how the equilibrium and the power move as the part heats up to and past its
// melting point.
//
// Conventions: SI units; z points up and gravity acts along −z (g = 9.80665 m/s², standard gravity); a part's
// height is its reference height as the job file defines it: the centre of a sphere, the bottom face of the
// other shapes (the lowest point of a polygon). Currents are rms phasors; forces are time averages.
package levitate

import (
	"errors"
	"fmt"
	"math"
	"runtime"

	"eddyrz/geometry"
)

// StandardGravity is g_n, m/s² (CGPM 1901; ISO 80000-3).
const StandardGravity = 9.80665

// Options choose a levitation study. Zero values take the job's [levitation] section, then defaults.
type Options struct {
	// Part names the levitated part ("" : the [levitation] section's, or the job's only part).
	Part string
	// ZFrom and ZTo bound the part's reference height, m; Positions is the number of heights (≥ 3). When both
	// heights are zero they come from the [levitation] section, else from the coil's axial extent.
	ZFrom, ZTo float64
	Positions  int
	// Temperatures (K) for the heating sweep; nil takes the [levitation] section's, else a ladder from room
	// temperature to just past the melting point. NoTemperatureSweep turns the heating sweep off.
	Temperatures       []float64
	NoTemperatureSweep bool
	// FloatAt asks for the current that floats the part at this height, m (nil: not asked).
	FloatAt *float64
	// Workers is the number of concurrent solves (0: GOMAXPROCS).
	Workers int
	// Mesh replaces the job's mesh controls for every solve of the study (nil: SweepMesh of the job's).
	Mesh *geometry.MeshControls
	// RefineIterations bounds the root-refinement solves per equilibrium (0: 6).
	RefineIterations int
	// StiffnessStep is h in k_z = −(F(z+h) − F(z−h))/(2h), m (0: a third of the sweep spacing).
	StiffnessStep float64
	// Force chooses how the axial force is formed: ForceStress (the default) or ForceVolume.
	Force string
	// NoLateral skips the small-body lateral estimate (one extra solve of the coil alone).
	NoLateral bool
}

// SweepMesh returns the mesh controls the study uses by default for a job whose own controls are mc: linear
// elements, one element per skin depth and growth at most 1.5 (about 14 700 unknowns on the levitation example against
// 250 000 at the single-solve defaults). With the Maxwell-stress force this stays within 0.5 % of the fine
// reference on the levitation example (the study is in TestSweepMeshStudy's comment). Absorbed power and
// impedance are less accurate on this mesh (power a few per cent high): use the job's own controls
// (Options.Mesh) where they matter. The far boundary and curve tolerance are the job's.
func SweepMesh(mc geometry.MeshControls) geometry.MeshControls {
	out := mc
	out.PerSkinDepth = math.Min(mc.PerSkinDepth, sweepPerSkinDepth)
	out.Growth = math.Min(mc.Growth, sweepGrowth)
	out.Order = 1
	return out
}

const (
	sweepPerSkinDepth = 1
	sweepGrowth       = 1.5
)

// Force methods. Both are exact for the continuum; on a coarse mesh the Maxwell stress in the air around the
// part converges faster than the volume integral −∫Re{J B_r*} dV, whose surface currents need the skin depth
// resolved (see TestSweepMeshStudy), so the study uses the stress and reports the volume integral beside it.
const (
	ForceStress = "stress"
	ForceVolume = "volume"
)

// Height reference names, as the output states them.
const (
	RefCentre = "centre"
	RefBottom = "bottom"
)

// settings are Options resolved against a job.
type settings struct {
	part       string
	partIndex  int
	z          []float64
	temps      []float64
	workers    int
	mesh       geometry.MeshControls
	refineIter int
	h          float64
	floatAt    *float64
	lateral    bool
	force      string
}

// resolve fills the defaults of opt for job.
func resolve(job *geometry.Job, opt Options) (*settings, error) {
	if job == nil {
		panic("levitate: nil job")
	}
	s := &settings{part: opt.Part, workers: opt.Workers, refineIter: opt.RefineIterations, h: opt.StiffnessStep,
		floatAt: opt.FloatAt, lateral: !opt.NoLateral, force: opt.Force}
	switch s.force {
	case "":
		s.force = ForceStress
	case ForceStress, ForceVolume:
	default:
		return nil, fmt.Errorf("levitation: force method %q: use %q or %q", opt.Force, ForceStress, ForceVolume)
	}
	lev := job.Levitation
	if s.part == "" {
		switch {
		case lev != nil:
			s.part = lev.Part
		case len(job.Parts) == 1:
			s.part = job.Parts[0].Name
		default:
			return nil, fmt.Errorf("%s: %d parts and no [levitation] section: name the part to levitate", job.File, len(job.Parts))
		}
	}
	s.partIndex = -1
	for i, p := range job.Parts {
		if p.Name == s.part {
			s.partIndex = i
		}
	}
	if s.partIndex < 0 {
		return nil, fmt.Errorf("%s: no part named %q to levitate", job.File, s.part)
	}
	if len(job.Coils) == 0 {
		return nil, fmt.Errorf("%s: levitation needs a coil", job.File)
	}
	for _, c := range job.Coils {
		if c.Drive != geometry.DriveCurrent {
			return nil, fmt.Errorf("%s: coil %q: levitation needs current-driven coils (the force scales with I², and a voltage or power drive would change the current from height to height)", job.File, c.Name)
		}
	}
	zf, zt, n := opt.ZFrom, opt.ZTo, opt.Positions
	if zf == 0 && zt == 0 {
		if lev != nil {
			zf, zt = lev.ZFrom, lev.ZTo
		} else {
			zf, zt = coilExtent(job)
		}
	}
	if n == 0 {
		n = 21
		if lev != nil {
			n = lev.Positions
		}
	}
	if !(zt > zf) {
		return nil, fmt.Errorf("%s: levitation range: z_to (%g m) must lie above z_from (%g m)", job.File, zt, zf)
	}
	if n < 3 {
		return nil, fmt.Errorf("%s: levitation needs at least 3 positions, got %d", job.File, n)
	}
	s.z = make([]float64, n)
	for i := range s.z {
		s.z[i] = zf + (zt-zf)*float64(i)/float64(n-1)
	}
	if s.workers <= 0 {
		s.workers = runtime.GOMAXPROCS(0)
	}
	if s.refineIter <= 0 {
		s.refineIter = 6
	}
	if s.h <= 0 {
		s.h = (zt - zf) / float64(n-1) / 3
	}
	if opt.Mesh != nil {
		s.mesh = *opt.Mesh
	} else {
		s.mesh = SweepMesh(job.Mesh)
	}
	if !opt.NoTemperatureSweep {
		s.temps = opt.Temperatures
		if s.temps == nil && lev != nil {
			s.temps = lev.Temperatures
		}
		if s.temps == nil {
			s.temps = defaultTemperatures(job.Parts[s.partIndex])
		}
		for _, t := range s.temps {
			if !(t > 0) {
				return nil, errors.New("levitation: temperatures must be above 0 K")
			}
		}
	}
	return s, nil
}

// coilExtent is the axial span of all coil turns, m.
func coilExtent(job *geometry.Job) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, c := range job.Coils {
		for _, t := range c.Turns {
			hh := t.Height / 2
			if t.Kind == geometry.TubeSection {
				hh = t.Diameter / 2
			}
			lo, hi = math.Min(lo, t.Z-hh), math.Max(hi, t.Z+hh)
		}
	}
	return lo, hi
}

// defaultTemperatures is a ladder from 20 °C to just below the melting point in five steps, then the liquid
// just above it; a material that does not melt gets 20 °C to 1000 °C.
func defaultTemperatures(p geometry.Part) []float64 {
	const room = 293.15
	top := 1273.15
	melt := p.Material.Melting
	if !math.IsInf(melt, 1) && melt > room+10 {
		top = melt - 1
	}
	var ts []float64
	for i := 0; i <= 5; i++ {
		ts = append(ts, room+(top-room)*float64(i)/5)
	}
	if !math.IsInf(melt, 1) && melt > room+10 {
		ts = append(ts, melt+1)
	}
	return ts
}

// HeightReference says what the part's height measures: RefCentre for a sphere, RefBottom otherwise.
func HeightReference(p geometry.Part) string {
	if p.Shape == geometry.Sphere {
		return RefCentre
	}
	return RefBottom
}

// Volume is the exact volume of revolution of the part, m³ (Pappus for a polygon).
func Volume(p geometry.Part) float64 {
	switch p.Shape {
	case geometry.Sphere:
		return 4 * math.Pi * p.Radius * p.Radius * p.Radius / 3
	case geometry.Cylinder:
		return math.Pi * p.Radius * p.Radius * p.Height
	case geometry.TubePart:
		return math.Pi * (p.Radius*p.Radius - p.Inner*p.Inner) * p.Height
	case geometry.Cup:
		ri := p.Radius - p.Wall
		return math.Pi * (p.Radius*p.Radius*p.Height - ri*ri*(p.Height-p.Base))
	}
	// Polygon: V = 2π ∫∫ r dr dz = 2π Σ (x_i y_{i+1} − x_{i+1} y_i)(x_i + x_{i+1})/6.
	var v float64
	pts := p.Points
	for i := range pts {
		a, b := pts[i], pts[(i+1)%len(pts)]
		v += (a.X*b.Y - b.X*a.Y) * (a.X + b.X) / 6
	}
	return 2 * math.Pi * math.Abs(v)
}
