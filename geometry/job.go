// Package geometry is eddyrz's job model: it reads and checks the plain-text job file (coils, parts, materials,
// mesh controls and analysis requests, all in the r-z half plane r ≥ 0), and turns the model into the mesher's
// input, a tagged planar straight-line graph with a size field (see Layout).
//
// Units are SI inside (metres, hertz, amperes, volts, watts, kelvin); the file may use any unit ParseQuantity
// knows. Currents, voltages and fields are RMS values (x(t) = √2 Re{X e^{jωt}}).
package geometry

import (
	"fmt"
	"math"
	"os"
	"slices"

	"eddyrz/geometry/material"
	"eddyrz/mesh"
)

// Job is one checked job file.
type Job struct {
	File string // the file it was read from, for messages
	Name string
	// Frequency is the operating frequency, Hz (> 0).
	Frequency float64
	// AppliedB is an applied uniform axial flux density, tesla rms (0 for none).
	AppliedB float64
	Coils    []Coil
	Parts    []Part
	// Materials holds the built-in library plus the file's own materials, by name.
	Materials map[string]*material.Material
	Mesh      MeshControls
	// Optional analysis requests; nil when the section is absent.
	Levitation *Levitation
	Tank       *Tank
	Cooling    *Cooling
	Heating    *Heating

	lines *reader // key lines, for errors found after reading (overlaps)
}

// SectionKind is the cross-section of a coil turn.
type SectionKind int

const (
	// TubeSection is a round tube (a solid round conductor when Wall is 0); the bore is air.
	TubeSection SectionKind = iota
	// BarSection is a rectangle, hollow when Wall > 0 (the bore is air).
	BarSection
	// StrandedSection is a winding block of many thin turns: uniform current, no eddy currents.
	StrandedSection
)

// Turn is one series turn of a coil: its cross-section centred at (R, Z), metres.
type Turn struct {
	Kind SectionKind
	R, Z float64
	// Diameter is a tube's outer diameter, m.
	Diameter float64
	// Width (radial) and Height (axial) of a bar or stranded block, m.
	Width, Height float64
	// Wall thickness of a tube or hollow bar, m (0: solid).
	Wall float64
	// Strands is the number of series turns in a stranded block (1 otherwise).
	Strands int
	// Fill is the copper fill factor of a stranded block, 0 < Fill ≤ 1 (1 otherwise).
	Fill float64
	// Sense is the winding sense, +1 or −1: the turn carries Sense·I.
	Sense int
	// Entry is the index of the [[coil.turn]] entry this turn came from.
	Entry int
}

// DriveKind says what fixes a coil's current.
type DriveKind int

const (
	// DriveCurrent fixes the rms current, A.
	DriveCurrent DriveKind = iota
	// DriveVoltage fixes the rms terminal voltage, V.
	DriveVoltage
	// DrivePower asks for the current that puts Value watts into the part named Into.
	DrivePower
)

// Coil is a set of turns in series, driven by one source.
type Coil struct {
	Name     string
	Material *material.Material
	// Temperature of the conductor, K.
	Temperature float64
	Drive       DriveKind
	// Value is the drive's size: A rms, V rms or W.
	Value float64
	// Into names the part a power drive aims at.
	Into  string
	Turns []Turn
}

// PartShape is the form of a workpiece's cross-section.
type PartShape int

const (
	Sphere   PartShape = iota // half disc on the axis: Radius, Z = centre
	Cylinder                  // solid cylinder (billet, bar end): Radius, Height, Z = bottom
	TubePart                  // hollow cylinder: Radius (outer), Inner, Height, Z = bottom
	Cup                       // crucible: Radius (outer), Height, Wall, Base, Z = bottom
	Polygon                   // any simple polygon with r ≥ 0: Points
)

var partShapeNames = []string{"sphere", "cylinder", "tube", "cup", "polygon"}

func (s PartShape) String() string { return partShapeNames[s] }

// Part is a workpiece: a conductor with induced currents only (no net current).
type Part struct {
	Name  string
	Shape PartShape
	// Radius (outer), Inner radius, Height, Wall and Base thickness, m, as the shape uses them.
	Radius, Inner, Height, Wall, Base float64
	// Z is the reference height, m: the centre of a sphere, the bottom face otherwise (unused for polygons).
	Z float64
	// Points of a polygon, counter-clockwise, metres (X = r, Y = z).
	Points   []mesh.Point
	Material *material.Material
	// Temperature, K.
	Temperature float64
}

// MeshControls are the mesh settings of the job.
type MeshControls struct {
	// PerSkinDepth is the number of elements per skin depth at conductor surfaces.
	PerSkinDepth float64
	// Growth is the factor by which element size may grow from one element to the next (> 1).
	Growth float64
	// OuterSize is the far boundary's radius as a multiple of the device's extent (the radius, about the
	// device's mid-height on the axis, that holds every conductor).
	OuterSize float64
	// CurveTol is the largest distance allowed between a curve and its straight segments (sagitta), m; 0 means
	// automatic: 1/4000 of the smallest curve radius.
	CurveTol float64
	// MinAngle is the smallest triangle angle the mesher should reach, degrees.
	MinAngle float64
	// Order is the element order, 1 (linear) or 2 (quadratic).
	Order int
	// MaxSize caps the element size anywhere, m (0: a tenth of the far boundary's radius).
	MaxSize float64
}

// DefaultMeshControls are the settings used where the file says nothing.
func DefaultMeshControls() MeshControls {
	return MeshControls{PerSkinDepth: 1.5, Growth: 1.6, OuterSize: 5, MinAngle: 28, Order: 2}
}

// Levitation asks for a sweep of the axial force on a part over a range of heights.
type Levitation struct {
	Part         string
	ZFrom, ZTo   float64 // m, reference height of the part (sphere centre, bottom face otherwise)
	Positions    int     // number of heights, ≥ 2
	Temperatures []float64
}

// Tank describes the capacitor bank and inverter of a resonant circuit.
type Tank struct {
	Parallel    bool    // parallel bank (else series)
	Capacitance float64 // F
	// Ratings of the bank, 0 when not given: V rms, A rms, var.
	VoltageRating, CurrentRating, VarRating float64
	// InverterVoltage is the inverter's rms output voltage, V; BusVoltage its DC bus, V (one of the two).
	InverterVoltage, BusVoltage float64
	// Power wanted in the part Into, W (0: not asked).
	Power float64
	Into  string
}

// Cooling describes the coil's cooling water.
type Cooling struct {
	Inlet    float64 // K
	Rise     float64 // allowed temperature rise, K
	Pressure float64 // supply pressure (gauge), Pa
	// Roughness of the tube bore, m.
	Roughness float64
	Circuits  int
}

// Probe is a named point where a temperature history is wanted, m.
type Probe struct {
	Name string
	R, Z float64
}

// Heating asks for a transient heating run.
type Heating struct {
	// Duration, s (0 when a stop temperature is used instead).
	Duration float64
	// StopTemperature (K): stop when the coolest point of StopPart, or the probe named StopProbe, reaches it
	// (exactly one of the two is set with it).
	StopPart        string
	StopProbe       string
	StopTemperature float64
	Ambient         float64 // K
	// Emissivity overrides the materials' emissivity when > 0.
	Emissivity float64
	// Convection is the surface heat transfer coefficient, W/(m²·K).
	Convection float64
	TimeStep   float64 // s
	Initial    float64 // K
	// Tolerance is the relative change in resistivity (or permeability) that triggers a new field solve.
	Tolerance float64
	Probes    []Probe
}

// ReadFile reads and checks a job file. User mistakes come back as *InputError.
func ReadFile(path string) (*Job, error) {
	src, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("reading job file: %w", err)
	}
	return Parse(path, src)
}

// roomTemperature is the default temperature of parts and coils, 20 °C.
const roomTemperature = 293.15

// Parse reads and checks a job from src; file names the source in messages.
func Parse(file string, src []byte) (*Job, error) {
	r := &reader{file: file}
	tree, err := r.decodeTOML(string(src))
	if err != nil {
		return nil, err
	}
	r.lines = indexKeys(string(src))
	root := r.root(tree)
	j := &Job{File: file, Mesh: DefaultMeshControls(), lines: r}
	if j.Name, err = root.str("name", false, file); err != nil {
		return nil, err
	}
	if j.Frequency, _, err = root.quantity("frequency", Frequency, true, 0); err != nil {
		return nil, err
	}
	if !(j.Frequency > 0) {
		return nil, root.err("frequency", "must be above zero, got %v (for a nearly static field use a low frequency such as \"1 Hz\" instead of 0 Hz)", root.m["frequency"])
	}
	if err := j.readApplied(root); err != nil {
		return nil, err
	}
	if err := j.readMaterials(root); err != nil {
		return nil, err
	}
	if err := j.readMesh(root); err != nil {
		return nil, err
	}
	if err := j.readCoils(root); err != nil {
		return nil, err
	}
	if err := j.readParts(root); err != nil {
		return nil, err
	}
	if len(j.Coils) == 0 && j.AppliedB == 0 {
		return nil, root.err("coil", "no [[coil]] and no applied_field (add a [[coil]] with its turns, or an applied_field)")
	}
	if err := j.readAnalyses(root); err != nil {
		return nil, err
	}
	if err := root.finish(); err != nil {
		return nil, err
	}
	if err := j.checkGeometry(); err != nil {
		return nil, err
	}
	if err := j.checkReferences(); err != nil {
		return nil, err
	}
	return j, nil
}

func (j *Job) readApplied(root *node) error {
	if !root.has("applied_field") {
		return nil
	}
	raw := root.m["applied_field"]
	if s, ok := raw.(string); ok {
		if b, err := ParseQuantity(s, FluxDensity); err == nil {
			j.AppliedB = b
			return nil
		}
		if h, err := ParseQuantity(s, FieldStrength); err == nil {
			j.AppliedB = material.Mu0 * h
			return nil
		}
		return root.err("applied_field", "%q is neither a flux density nor a field strength (write it like \"20 mT\" or \"8 kA/m\", rms)", s)
	}
	b, err := root.valueQuantity("applied_field", raw, FluxDensity)
	j.AppliedB = b
	return err
}

func (j *Job) readMesh(root *node) error {
	n, err := root.table("mesh")
	if err != nil || n == nil {
		return err
	}
	m := &j.Mesh
	if m.PerSkinDepth, _, err = n.positive("elements_per_skin_depth", Dimensionless, false, m.PerSkinDepth); err != nil {
		return err
	}
	if m.Growth, _, err = n.quantity("growth", Dimensionless, false, m.Growth); err != nil {
		return err
	}
	if !(m.Growth > 1 && m.Growth <= 3) {
		return n.err("growth", "must be above 1 and at most 3, got %v (1.2 to 1.5 is usual)", n.m["growth"])
	}
	if m.OuterSize, _, err = n.quantity("outer_size", Dimensionless, false, m.OuterSize); err != nil {
		return err
	}
	if !(m.OuterSize >= 1.5) {
		return n.err("outer_size", "must be at least 1.5 times the device's extent, got %v (5 is the default)", n.m["outer_size"])
	}
	if m.CurveTol, _, err = n.positive("curve_tolerance", Length, false, 0); err != nil {
		return err
	}
	if m.MinAngle, _, err = n.quantity("min_angle", Angle, false, m.MinAngle); err != nil {
		return err
	}
	if !(m.MinAngle > 0 && m.MinAngle <= 34) {
		return n.err("min_angle", "must lie between 0 and 34 degrees, got %v (mesh refinement may not end above about 34°; 28 is the default)", n.m["min_angle"])
	}
	if m.Order, _, err = n.integer("order", false, m.Order); err != nil {
		return err
	}
	if m.Order != 1 && m.Order != 2 {
		return n.err("order", "must be 1 or 2, got %d (2, quadratic elements, is the default)", m.Order)
	}
	if m.MaxSize, _, err = n.positive("max_size", Length, false, 0); err != nil {
		return err
	}
	return n.finish()
}

// material looks a material name up, reporting an unknown one at key.
func (j *Job) material(n *node, key, def string) (*material.Material, error) {
	name, err := n.str(key, def == "", def)
	if err != nil {
		return nil, err
	}
	m, ok := j.Materials[name]
	if !ok {
		return nil, n.err(key, "unknown material %q (use a built-in one: %s; or define it in a [[material]] table)", name, joinNames(material.Names()))
	}
	return m, nil
}

func joinNames(s []string) string {
	out := ""
	for i, x := range s {
		if i > 0 {
			out += ", "
		}
		out += x
	}
	return out
}

func (j *Job) readMaterials(root *node) error {
	j.Materials = map[string]*material.Material{}
	for _, name := range material.Names() {
		j.Materials[name], _ = material.Builtin(name)
	}
	list, err := root.tables("material")
	if err != nil {
		return err
	}
	for _, n := range list {
		m := &material.Material{MuRel: 1, Melting: math.Inf(1)}
		if m.Name, err = n.str("name", true, ""); err != nil {
			return err
		}
		if _, dup := j.Materials[m.Name]; dup {
			return n.err("name", "material %q is already defined (choose another name; built-in materials cannot be redefined)", m.Name)
		}
		if m.Description, err = n.str("description", false, "user-defined material "+m.Name); err != nil {
			return err
		}
		if m.ResistivitySolid, err = n.propTable("resistivity", Resistivity, true); err != nil {
			return err
		}
		if m.ResistivityLiquid, _, err = n.positive("liquid_resistivity", Resistivity, false, 0); err != nil {
			return err
		}
		if m.MuRel, _, err = n.quantity("relative_permeability", Dimensionless, false, 1); err != nil {
			return err
		}
		if m.MuRel < 1 {
			return n.err("relative_permeability", "must be at least 1, got %v (diamagnetic and paramagnetic metals are 1 to the accuracy needed)", n.m["relative_permeability"])
		}
		if m.Curie, _, err = n.positive("curie_temperature", Temperature, false, 0); err != nil {
			return err
		}
		if m.DensitySolid, _, err = n.positive("density", Density, false, 0); err != nil {
			return err
		}
		if m.DensityLiquid, _, err = n.positive("liquid_density", Density, false, 0); err != nil {
			return err
		}
		if m.SpecificHeatTable, err = n.propTable("specific_heat", SpecificHeat, false); err != nil {
			return err
		}
		if m.ThermalCondTable, err = n.propTable("thermal_conductivity", ThermalCond, false); err != nil {
			return err
		}
		if m.EmissivityValue, _, err = n.quantity("emissivity", Dimensionless, false, 0); err != nil {
			return err
		}
		if m.EmissivityValue < 0 || m.EmissivityValue > 1 {
			return n.err("emissivity", "must lie between 0 and 1, got %v", n.m["emissivity"])
		}
		if m.Melting, _, err = n.positive("melting_point", Temperature, false, math.Inf(1)); err != nil {
			return err
		}
		if m.Latent, _, err = n.positive("latent_heat", SpecificEnergy, false, 0); err != nil {
			return err
		}
		if err := n.finish(); err != nil {
			return err
		}
		j.Materials[m.Name] = m
	}
	return nil
}

// propTable reads a property that is either one quantity or a table [[temperature, value], ...].
func (n *node) propTable(key string, d Dim, required bool) (material.Table, error) {
	if !n.has(key) {
		if required {
			return material.Table{}, n.missingErr(key, dimExamples[d])
		}
		return material.Table{}, nil
	}
	path := n.keyPath(key)
	raw := n.m[key]
	arr, isArr := raw.([]any)
	if !isArr {
		v, err := n.valueQuantity(path, raw, d)
		if err != nil {
			return material.Table{}, err
		}
		if !(v > 0) {
			return material.Table{}, n.err(key, "must be greater than zero, got %v", raw)
		}
		return material.Const(v), nil
	}
	var tb material.Table
	for i, row := range arr {
		pair, ok := row.([]any)
		if !ok || len(pair) != 2 {
			return material.Table{}, n.err(key, "row %d is not a pair [temperature, value] (write e.g. [[\"20 C\", %s], [\"500 C\", ...]])", i+1, dimExamples[d])
		}
		t, err := n.valueQuantity(path, pair[0], Temperature)
		if err != nil {
			return material.Table{}, err
		}
		v, err := n.valueQuantity(path, pair[1], d)
		if err != nil {
			return material.Table{}, err
		}
		tb.T = append(tb.T, t)
		tb.V = append(tb.V, v)
	}
	if err := tb.Check(true); err != nil {
		return material.Table{}, n.err(key, "%v (list rows by rising temperature, values above zero)", err)
	}
	return tb, nil
}

func (j *Job) readCoils(root *node) error {
	list, err := root.tables("coil")
	if err != nil {
		return err
	}
	names := map[string]bool{}
	for ci, n := range list {
		c := Coil{}
		if c.Name, err = n.str("name", false, fmt.Sprintf("coil%d", ci+1)); err != nil {
			return err
		}
		if names[c.Name] {
			return n.err("name", "coil %q is named twice (give each coil its own name)", c.Name)
		}
		names[c.Name] = true
		if c.Material, err = j.material(n, "material", "copper"); err != nil {
			return err
		}
		if c.Temperature, _, err = n.positive("temperature", Temperature, false, roomTemperature); err != nil {
			return err
		}
		if err := c.readDrive(n); err != nil {
			return err
		}
		turns, err := n.tables("turn")
		if err != nil {
			return err
		}
		if len(turns) == 0 {
			return n.err("turn", "coil %q has no turns (add [[coil.turn]] tables after its [[coil]])", c.Name)
		}
		for ti, tn := range turns {
			group, err := readTurns(tn, ti)
			if err != nil {
				return err
			}
			c.Turns = append(c.Turns, group...)
		}
		if err := n.finish(); err != nil {
			return err
		}
		j.Coils = append(j.Coils, c)
	}
	return nil
}

func (c *Coil) readDrive(n *node) error {
	given := 0
	for _, k := range []string{"current", "voltage", "power"} {
		if n.has(k) {
			given++
		}
	}
	n.has("into")
	if given != 1 {
		return n.err("current", "give exactly one of current, voltage or power for coil %q, found %d (for example current = \"400 A\")", c.Name, given)
	}
	var err error
	switch {
	case n.has("current"):
		c.Drive = DriveCurrent
		c.Value, _, err = n.positive("current", Current, true, 0)
	case n.has("voltage"):
		c.Drive = DriveVoltage
		c.Value, _, err = n.positive("voltage", Voltage, true, 0)
	default:
		c.Drive = DrivePower
		if c.Value, _, err = n.positive("power", Power, true, 0); err != nil {
			return err
		}
		c.Into, err = n.str("into", true, "")
	}
	if err == nil && c.Drive != DrivePower && n.has("into") {
		return n.err("into", "only a power drive names a part (remove into, or use power = \"...\")")
	}
	return err
}

// readTurns reads one [[coil.turn]] entry: one turn, or a helix group of count turns.
func readTurns(n *node, entry int) ([]Turn, error) {
	kind, err := n.choice("shape", true, "", "tube", "bar", "stranded")
	if err != nil {
		return nil, err
	}
	t := Turn{Strands: 1, Fill: 1, Entry: entry}
	switch kind {
	case "tube":
		t.Kind = TubeSection
		if t.Diameter, _, err = n.positive("diameter", Length, true, 0); err != nil {
			return nil, err
		}
		if t.Wall, _, err = n.positive("wall", Length, false, 0); err != nil {
			return nil, err
		}
		if t.Wall >= t.Diameter/2 {
			return nil, n.err("wall", "wall %v is not less than the tube's outer radius %s (make the wall thinner than half the diameter, or leave wall out for a solid round conductor)", n.m["wall"], fmtLen(t.Diameter/2))
		}
	case "bar", "stranded":
		t.Kind = BarSection
		if t.Width, _, err = n.positive("width", Length, true, 0); err != nil {
			return nil, err
		}
		if t.Height, _, err = n.positive("height", Length, true, 0); err != nil {
			return nil, err
		}
		if kind == "bar" {
			if t.Wall, _, err = n.positive("wall", Length, false, 0); err != nil {
				return nil, err
			}
			if 2*t.Wall >= math.Min(t.Width, t.Height) {
				return nil, n.err("wall", "wall %v leaves no bore in a %s × %s bar (make it less than half the smaller side, or leave wall out for a solid bar)", n.m["wall"], fmtLen(t.Width), fmtLen(t.Height))
			}
			break
		}
		t.Kind = StrandedSection
		if t.Strands, _, err = n.integer("turns", true, 0); err != nil {
			return nil, err
		}
		if t.Strands < 1 {
			return nil, n.err("turns", "must be at least 1, got %d", t.Strands)
		}
		if t.Fill, _, err = n.quantity("fill", Dimensionless, false, 0.6); err != nil {
			return nil, err
		}
		if !(t.Fill > 0 && t.Fill <= 1) {
			return nil, n.err("fill", "must lie in (0, 1], got %v (the copper share of the block's area, often 0.4-0.7)", n.m["fill"])
		}
	}
	if t.R, _, err = n.quantity("r", Length, true, 0); err != nil {
		return nil, err
	}
	if t.Z, _, err = n.quantity("z", Length, true, 0); err != nil {
		return nil, err
	}
	if t.Sense, _, err = n.integer("sense", false, 1); err != nil {
		return nil, err
	}
	if t.Sense != 1 && t.Sense != -1 {
		return nil, n.err("sense", "must be 1 or -1, got %d (-1 for turns wound the other way)", t.Sense)
	}
	count, _, err := n.integer("count", false, 1)
	if err != nil {
		return nil, err
	}
	if count < 1 || count > 10000 {
		return nil, n.err("count", "must be between 1 and 10000, got %d", count)
	}
	pitch, hasPitch, err := n.quantity("pitch", Length, count > 1, 0)
	if err != nil {
		return nil, err
	}
	if hasPitch && pitch == 0 && count > 1 {
		return nil, n.err("pitch", "must not be zero for a group of %d turns (the axial step from one turn to the next, e.g. \"8 mm\"; negative winds downward)", count)
	}
	rstep, _, err := n.quantity("r_step", Length, false, 0)
	if err != nil {
		return nil, err
	}
	if err := n.finish(); err != nil {
		return nil, err
	}
	out := make([]Turn, count)
	for i := range out {
		out[i] = t
		out[i].R = t.R + float64(i)*rstep
		out[i].Z = t.Z + float64(i)*pitch
		if out[i].R-t.halfWidth() < 0 {
			return nil, n.err("r", "turn %d of this entry reaches r = %s < 0, across the axis (move it outward: the model is the half plane r ≥ 0)", i+1, fmtLen(out[i].R-t.halfWidth()))
		}
	}
	return out, nil
}

func (t *Turn) halfWidth() float64 {
	if t.Kind == TubeSection {
		return t.Diameter / 2
	}
	return t.Width / 2
}

// fmtLen writes a length in millimetres for messages.
func fmtLen(m float64) string { return fmt.Sprintf("%.4g mm", m*1e3) }

func (j *Job) readParts(root *node) error {
	list, err := root.tables("part")
	if err != nil {
		return err
	}
	names := map[string]bool{}
	for _, n := range list {
		p := Part{}
		if p.Name, err = n.str("name", true, ""); err != nil {
			return err
		}
		if names[p.Name] {
			return n.err("name", "part %q is named twice (give each part its own name)", p.Name)
		}
		names[p.Name] = true
		shape, err := n.choice("shape", true, "", partShapeNames...)
		if err != nil {
			return err
		}
		for i, s := range partShapeNames {
			if s == shape {
				p.Shape = PartShape(i)
			}
		}
		if err := p.readShape(n); err != nil {
			return err
		}
		if p.Material, err = j.material(n, "material", ""); err != nil {
			return err
		}
		if p.Temperature, _, err = n.positive("temperature", Temperature, false, roomTemperature); err != nil {
			return err
		}
		if err := n.finish(); err != nil {
			return err
		}
		j.Parts = append(j.Parts, p)
	}
	return nil
}

func (p *Part) readShape(n *node) error {
	var err error
	if p.Shape == Polygon {
		return p.readPolygon(n)
	}
	if p.Radius, _, err = n.positive("radius", Length, true, 0); err != nil {
		return err
	}
	if p.Z, _, err = n.quantity("z", Length, true, 0); err != nil {
		return err
	}
	if p.Shape == Sphere {
		return nil
	}
	if p.Height, _, err = n.positive("height", Length, true, 0); err != nil {
		return err
	}
	switch p.Shape {
	case TubePart:
		if p.Inner, _, err = n.positive("inner_radius", Length, true, 0); err != nil {
			return err
		}
		if p.Inner >= p.Radius {
			return n.err("inner_radius", "inner radius %s is not less than the outer radius %s (make it smaller, or use shape = \"cylinder\")", fmtLen(p.Inner), fmtLen(p.Radius))
		}
	case Cup:
		if p.Wall, _, err = n.positive("wall", Length, true, 0); err != nil {
			return err
		}
		if p.Wall >= p.Radius {
			return n.err("wall", "wall %s is not less than the cup's outer radius %s (make it thinner)", fmtLen(p.Wall), fmtLen(p.Radius))
		}
		if p.Base, _, err = n.positive("base", Length, true, 0); err != nil {
			return err
		}
		if p.Base >= p.Height {
			return n.err("base", "base %s is not less than the cup's height %s (make it thinner)", fmtLen(p.Base), fmtLen(p.Height))
		}
	}
	return nil
}

func (p *Part) readPolygon(n *node) error {
	if !n.has("points") {
		return n.missingErr("points", `[["0 mm", "0 mm"], ["20 mm", "0 mm"], ["20 mm", "30 mm"]]`)
	}
	arr, ok := n.m["points"].([]any)
	if !ok || len(arr) < 3 {
		return n.err("points", "need at least three [r, z] points (write points = [[\"0 mm\", \"0 mm\"], [\"20 mm\", \"0 mm\"], [\"20 mm\", \"30 mm\"]])")
	}
	path := n.keyPath("points")
	for i, a := range arr {
		pair, ok := a.([]any)
		if !ok || len(pair) != 2 {
			return n.err("points", "point %d is not a pair [r, z] (write e.g. [\"20 mm\", \"0 mm\"])", i+1)
		}
		r, err := n.valueQuantity(path, pair[0], Length)
		if err != nil {
			return err
		}
		z, err := n.valueQuantity(path, pair[1], Length)
		if err != nil {
			return err
		}
		if r < 0 {
			return n.err("points", "point %d has r = %s < 0, across the axis (the model is the half plane r ≥ 0: use r = 0 for points on the axis)", i+1, fmtLen(r))
		}
		p.Points = append(p.Points, mesh.Point{X: r, Y: z})
	}
	if a := polyArea(p.Points); a < 0 {
		for i, k := 0, len(p.Points)-1; i < k; i, k = i+1, k-1 {
			p.Points[i], p.Points[k] = p.Points[k], p.Points[i]
		}
	} else if a == 0 {
		return n.err("points", "the polygon has zero area (give its corners in order around it)")
	}
	if i, k, bad := selfIntersection(p.Points); bad {
		return n.err("points", "the polygon's edges %d and %d cross (give the corners in order around the outline, without crossings)", i+1, k+1)
	}
	return nil
}

func (j *Job) readAnalyses(root *node) error {
	if n, err := root.table("levitation"); err != nil {
		return err
	} else if n != nil {
		l := &Levitation{}
		if l.Part, err = n.str("part", true, ""); err != nil {
			return err
		}
		if l.ZFrom, _, err = n.quantity("z_from", Length, true, 0); err != nil {
			return err
		}
		if l.ZTo, _, err = n.quantity("z_to", Length, true, 0); err != nil {
			return err
		}
		if l.ZTo <= l.ZFrom {
			return n.err("z_to", "must be above z_from (give the lowest height in z_from, the highest in z_to)")
		}
		if l.Positions, _, err = n.integer("positions", false, 11); err != nil {
			return err
		}
		if l.Positions < 2 {
			return n.err("positions", "must be at least 2, got %d", l.Positions)
		}
		if l.Temperatures, err = n.quantityList("temperatures", Temperature); err != nil {
			return err
		}
		if err := n.finish(); err != nil {
			return err
		}
		j.Levitation = l
	}
	if n, err := root.table("tank"); err != nil {
		return err
	} else if n != nil {
		t := &Tank{}
		conn, err := n.choice("connection", true, "", "parallel", "series")
		if err != nil {
			return err
		}
		t.Parallel = conn == "parallel"
		if t.Capacitance, _, err = n.positive("capacitance", Capacitance, true, 0); err != nil {
			return err
		}
		if t.VoltageRating, _, err = n.positive("voltage_rating", Voltage, false, 0); err != nil {
			return err
		}
		if t.CurrentRating, _, err = n.positive("current_rating", Current, false, 0); err != nil {
			return err
		}
		if t.VarRating, _, err = n.positive("kvar_rating", ReactivePower, false, 0); err != nil {
			return err
		}
		var hasInv, hasBus bool
		if t.InverterVoltage, hasInv, err = n.positive("inverter_voltage", Voltage, false, 0); err != nil {
			return err
		}
		if t.BusVoltage, hasBus, err = n.positive("bus_voltage", Voltage, false, 0); err != nil {
			return err
		}
		if hasInv == hasBus {
			return n.err("inverter_voltage", "give exactly one of inverter_voltage (rms output) or bus_voltage (DC bus) (for example inverter_voltage = \"400 V\")")
		}
		var hasPower bool
		if t.Power, hasPower, err = n.positive("power", Power, false, 0); err != nil {
			return err
		}
		if t.Into, err = n.str("into", hasPower, ""); err != nil {
			return err
		}
		if err := n.finish(); err != nil {
			return err
		}
		j.Tank = t
	}
	if n, err := root.table("cooling"); err != nil {
		return err
	} else if n != nil {
		c := &Cooling{}
		if c.Inlet, _, err = n.positive("inlet_temperature", Temperature, false, roomTemperature); err != nil {
			return err
		}
		if c.Rise, _, err = n.positive("temperature_rise", TempDifference, false, 20); err != nil {
			return err
		}
		if c.Pressure, _, err = n.positive("supply_pressure", Pressure, true, 0); err != nil {
			return err
		}
		// 1.5 μm: drawn copper tubing [common practice; Moody-chart tables list drawn tubing at 1.5 μm, memory].
		if c.Roughness, _, err = n.positive("roughness", Length, false, 1.5e-6); err != nil {
			return err
		}
		if c.Circuits, _, err = n.integer("circuits", false, 1); err != nil {
			return err
		}
		if c.Circuits < 1 {
			return n.err("circuits", "must be at least 1, got %d", c.Circuits)
		}
		if err := n.finish(); err != nil {
			return err
		}
		j.Cooling = c
	}
	if n, err := root.table("heating"); err != nil {
		return err
	} else if n != nil {
		h, err := readHeating(n)
		if err != nil {
			return err
		}
		j.Heating = h
	}
	return nil
}

func readHeating(n *node) (*Heating, error) {
	h := &Heating{}
	var err error
	var hasDur, hasStop bool
	if h.Duration, hasDur, err = n.positive("duration", Time, false, 0); err != nil {
		return nil, err
	}
	if h.StopTemperature, hasStop, err = n.positive("stop_temperature", Temperature, false, 0); err != nil {
		return nil, err
	}
	if hasDur == hasStop {
		return nil, n.err("duration", "give exactly one of duration or stop_temperature (with stop_part) (for example duration = \"60 s\")")
	}
	if h.StopPart, err = n.str("stop_part", false, ""); err != nil {
		return nil, err
	}
	if h.StopProbe, err = n.str("stop_probe", false, ""); err != nil {
		return nil, err
	}
	if hasStop && (h.StopPart == "") == (h.StopProbe == "") {
		return nil, n.err("stop_temperature", "give exactly one of stop_part (its coldest point) or stop_probe (a named probe) with it (for example stop_probe = \"core\")")
	}
	if !hasStop && (h.StopPart != "" || h.StopProbe != "") {
		return nil, n.err("duration", "stop_part and stop_probe need stop_temperature instead of duration (for example stop_temperature = \"1150 C\")")
	}
	if h.Ambient, _, err = n.positive("ambient", Temperature, false, roomTemperature); err != nil {
		return nil, err
	}
	if h.Emissivity, _, err = n.quantity("emissivity", Dimensionless, false, 0); err != nil {
		return nil, err
	}
	if h.Emissivity < 0 || h.Emissivity > 1 {
		return nil, n.err("emissivity", "must lie between 0 and 1, got %v", n.m["emissivity"])
	}
	// 10 W/(m²·K): natural convection in still air [common practice].
	if h.Convection, _, err = n.quantity("convection", HeatTransfer, false, 10); err != nil {
		return nil, err
	}
	if h.Convection < 0 {
		return nil, n.err("convection", "must not be negative, got %v", n.m["convection"])
	}
	if h.TimeStep, _, err = n.positive("time_step", Time, false, 1); err != nil {
		return nil, err
	}
	if h.Initial, _, err = n.positive("initial_temperature", Temperature, false, h.Ambient); err != nil {
		return nil, err
	}
	if h.Tolerance, _, err = n.positive("tolerance", Dimensionless, false, 0.05); err != nil {
		return nil, err
	}
	probes, err := n.tables("probe")
	if err != nil {
		return nil, err
	}
	for i, pn := range probes {
		p := Probe{}
		if p.Name, err = pn.str("name", false, fmt.Sprintf("probe%d", i+1)); err != nil {
			return nil, err
		}
		if p.R, _, err = pn.quantity("r", Length, true, 0); err != nil {
			return nil, err
		}
		if p.R < 0 {
			return nil, pn.err("r", "probe %q is at r < 0, across the axis (use r ≥ 0)", p.Name)
		}
		if p.Z, _, err = pn.quantity("z", Length, true, 0); err != nil {
			return nil, err
		}
		if err := pn.finish(); err != nil {
			return nil, err
		}
		h.Probes = append(h.Probes, p)
	}
	return h, n.finish()
}

// partIndex returns the index of the part called name, or -1.
func (j *Job) partIndex(name string) int {
	for i := range j.Parts {
		if j.Parts[i].Name == name {
			return i
		}
	}
	return -1
}

// checkReferences checks that every named part exists and that heating has the thermal data it needs.
func (j *Job) checkReferences() error {
	r := j.lines
	for ci, c := range j.Coils {
		if c.Drive == DrivePower && j.partIndex(c.Into) < 0 {
			return r.errAt(fmt.Sprintf("coil[%d].into", ci), "no part is named %q (name one of the [[part]] tables)", c.Into)
		}
	}
	if l := j.Levitation; l != nil && j.partIndex(l.Part) < 0 {
		return r.errAt("levitation.part", "no part is named %q (name one of the [[part]] tables)", l.Part)
	}
	if t := j.Tank; t != nil && t.Into != "" && j.partIndex(t.Into) < 0 {
		return r.errAt("tank.into", "no part is named %q (name one of the [[part]] tables)", t.Into)
	}
	if h := j.Heating; h != nil {
		if h.StopPart != "" && j.partIndex(h.StopPart) < 0 {
			return r.errAt("heating.stop_part", "no part is named %q (name one of the [[part]] tables)", h.StopPart)
		}
		if h.StopProbe != "" && !slices.ContainsFunc(h.Probes, func(p Probe) bool { return p.Name == h.StopProbe }) {
			return r.errAt("heating.stop_probe", "no probe is named %q (name one of the [[heating.probe]] tables)", h.StopProbe)
		}
		for i, p := range j.Parts {
			if !p.Material.HasThermal() {
				return r.errAt(fmt.Sprintf("part[%d].material", i), "material %q lacks density, specific_heat, thermal_conductivity or emissivity, which [heating] needs (add them to its [[material]] table)", p.Material.Name)
			}
		}
	}
	return nil
}

// Copy returns a copy of j that can be changed without touching j (materials are shared: they are read-only).
func (j *Job) Copy() *Job {
	c := *j
	c.Parts = append([]Part(nil), j.Parts...)
	for i := range c.Parts {
		c.Parts[i].Points = append([]mesh.Point(nil), j.Parts[i].Points...)
	}
	c.Coils = append([]Coil(nil), j.Coils...)
	for i := range c.Coils {
		c.Coils[i].Turns = append([]Turn(nil), j.Coils[i].Turns...)
	}
	return &c
}

// WithFrequency returns a copy of j at frequency f, Hz. It panics if f is not positive.
func (j *Job) WithFrequency(f float64) *Job {
	if !(f > 0) {
		panic(fmt.Sprintf("geometry: WithFrequency(%v): frequency must be positive", f))
	}
	c := j.Copy()
	c.Frequency = f
	return c
}

// WithPartTemperature returns a copy of j with the part called name at temperature T, K. It panics if there is
// no such part or T is not positive.
func (j *Job) WithPartTemperature(name string, T float64) *Job {
	i := j.partIndex(name)
	if i < 0 || !(T > 0) {
		panic(fmt.Sprintf("geometry: WithPartTemperature(%q, %v): no such part or bad temperature", name, T))
	}
	c := j.Copy()
	c.Parts[i].Temperature = T
	return c
}

// MovePart returns a copy of j with the part called name moved along the axis so that its reference height
// (a sphere's centre, the bottom face of the other shapes, the lowest point of a polygon) is z, metres. It fails
// if there is no such part or the moved part would overlap a coil turn or another part.
func (j *Job) MovePart(name string, z float64) (*Job, error) {
	i := j.partIndex(name)
	if i < 0 {
		return nil, fmt.Errorf("moving part: no part is named %q", name)
	}
	c := j.Copy()
	p := &c.Parts[i]
	if p.Shape == Polygon {
		dz := z - polyMinZ(p.Points)
		for k := range p.Points {
			p.Points[k].Y += dz
		}
	} else {
		p.Z = z
	}
	if err := c.checkGeometry(); err != nil {
		return nil, fmt.Errorf("moving part %q to z = %s: %w", name, fmtLen(z), err)
	}
	return c, nil
}

func polyMinZ(p []mesh.Point) float64 {
	z := math.Inf(1)
	for _, q := range p {
		z = math.Min(z, q.Y)
	}
	return z
}
