// Package fem solves the time-harmonic axisymmetric eddy-current problem for the azimuthal magnetic vector
// potential A = A_φ(r, z) by the finite-element method, with solid turns tied in series by circuit rows in
// symmetric bordered form (see physics.md of the design notes). Phasors are RMS: x(t) = √2 Re{X e^{jωt}}.
// Units are SI throughout; the mesh's X is r and Y is z, in metres.
package fem

import "eddyrz/mesh"

// RegionKind says what a tagged mesh region is made of electrically.
type RegionKind int

const (
	// Air carries no current.
	Air RegionKind = iota
	// SolidTurn is one turn of a coil made of a solid conductor (tube or bar): eddy currents plus a loop voltage
	// unknown, with the turn's net current fixed by the series circuit.
	SolidTurn
	// Stranded is a winding block of many thin turns with uniform current density N·I/area and no eddy currents.
	Stranded
	// Part is a workpiece: eddy currents only, no net current (loop voltage zero).
	Part
)

// Region holds the electrical data of the triangles whose tag is Tag.
type Region struct {
	Tag   int32
	Name  string
	Kind  RegionKind
	Sigma float64 // electrical conductivity, S/m (0 in air and in stranded blocks)
	MuR   float64 // relative permeability (linear), ≥ 1 for the materials we model; 0 means 1
	// Coil is the index into Problem.Coils of the coil this region belongs to (SolidTurn, Stranded); -1 otherwise.
	Coil int
	// Sense is the winding sense of a turn or block, +1 or −1: the region's current is Sense·I_coil (times Strands).
	Sense int
	// Strands is the number of series turns in a Stranded block; 1 for a SolidTurn.
	Strands int
	// Rdc is the DC resistance of a Stranded block, Ω, added to the coil's voltage as Rdc·I.
	Rdc float64
}

// DriveKind says what the coil's source fixes.
type DriveKind int

const (
	// CurrentDrive fixes the coil's rms current phasor.
	CurrentDrive DriveKind = iota
	// VoltageDrive fixes the coil's rms terminal voltage phasor; the current is an unknown.
	VoltageDrive
)

// Coil is a set of regions in series, driven by one source.
type Coil struct {
	Name  string
	Drive DriveKind
	// Value is the drive's rms phasor: amperes for CurrentDrive, volts for VoltageDrive.
	Value complex128
}

// Boundary tags on mesh edges (mesh.Edge.Tag) that the solver gives meaning to.
const (
	// AxisTag marks edges on r = 0, where A = 0.
	AxisTag int32 = 1
	// OuterTag marks the far boundary of the air region.
	OuterTag int32 = 2
)

// Problem is everything one harmonic solve needs. It is a value: solving it does not modify it.
type Problem struct {
	Mesh      *mesh.Mesh
	Frequency float64 // Hz, > 0
	// Regions describe the tagged triangles; triangles whose tag no region lists are air.
	Regions []Region
	Coils   []Coil
	// AppliedBz is an applied uniform axial flux density, rms phasor in tesla (0 for none); it is imposed on the
	// far boundary as A = Bz·r/2.
	AppliedBz complex128
	// Outer chooses the condition on OuterTag edges.
	Outer OuterBoundary
}

// OuterBoundary is the far-boundary condition. With Robin false, A is prescribed there (A = AppliedBz·r/2, the
// applied field alone). With Robin true, the outer boundary must be a circle of radius Radius centred on the axis
// at z = CenterZ, and the reaction field (A minus the applied part) satisfies the condition that is exact for a
// dipole far field, H_t = ν A/R, which lets the boundary sit much closer than a Dirichlet one.
type OuterBoundary struct {
	Robin   bool
	CenterZ float64 // m
	Radius  float64 // m
}
