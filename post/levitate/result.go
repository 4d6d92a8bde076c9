package levitate

// Result is a levitation study. Heights are the part's reference height (HeightReference), m; forces are
// time-averaged axial forces, N, positive up; powers are time-averaged Joule powers in the part, W.
type Result struct {
	Job             string  `json:"job"`
	Part            string  `json:"part"`
	HeightReference string  `json:"height_reference"` // "centre" (sphere) or "bottom" (other shapes)
	FrequencyHz     float64 `json:"frequency_hz"`
	// Currents are the coils' rms currents the sweep was solved at, A.
	Currents []CoilCurrent `json:"coil_currents"`
	// TemperatureK is the part's temperature in the height sweep (the job's), K.
	TemperatureK float64 `json:"temperature_k"`
	DensityKgM3  float64 `json:"density_kg_m3"`
	VolumeM3     float64 `json:"volume_m3"`
	MassKg       float64 `json:"mass_kg"`
	// Weight is m·g, N (g = 9.80665 m/s², standard gravity, acting along −z).
	Weight  float64 `json:"weight_n"`
	Gravity float64 `json:"gravity_m_s2"`
	// ForceMethod says how F_z was formed: "stress" (Maxwell stress in the air around the part) or "volume".
	ForceMethod string  `json:"force_method"`
	Curve       []Point `json:"curve"`
	// Blocked lists heights skipped because the part would overlap a conductor there, m.
	Blocked []float64 `json:"blocked_z_m,omitempty"`
	// MaxRipple is the largest Point.Ripple of the sweep (interior heights), a fraction.
	MaxRipple  float64       `json:"max_ripple"`
	RippleNote string        `json:"ripple_note"`
	Equilibria []Equilibrium `json:"equilibria"`
	// Float is the current that holds the part at the height the caller named (nil when not asked).
	Float       *FloatCurrent      `json:"float,omitempty"`
	Lateral     *LateralEstimate   `json:"lateral,omitempty"`
	Temperature []TemperaturePoint `json:"temperature_sweep,omitempty"`
	// Mesh describes the mesh controls every solve of the study used.
	Mesh     MeshUsed `json:"mesh"`
	Solves   int      `json:"solves"`
	Warnings []string `json:"warnings"`
	Cautions []string `json:"cautions"`
	Notes    []string `json:"notes"`
}

// CoilCurrent is one coil's drive.
type CoilCurrent struct {
	Coil    string  `json:"coil"`
	Current float64 `json:"current_a_rms"`
}

// MeshUsed are the mesh controls of the study's solves.
type MeshUsed struct {
	PerSkinDepth float64 `json:"elements_per_skin_depth"`
	Growth       float64 `json:"growth"`
	Order        int     `json:"order"`
	// MeshTemperatureK is the part temperature the mesh is sized for (the smallest skin depth of the study).
	MeshTemperatureK float64 `json:"mesh_temperature_k"`
	Unknowns         int     `json:"unknowns"`
}

// Point is the sweep at one height.
type Point struct {
	Z      float64 `json:"z_m"`
	ForceZ float64 `json:"force_z_n"`
	// ForceZOther is the force by the other method (the volume integral when ForceMethod is "stress"), a
	// cross-check, N (omitted when it could not be formed).
	ForceZOther *float64    `json:"force_z_other_method_n,omitempty"`
	Power       float64     `json:"power_w"`
	Impedance   []Impedance `json:"impedance"`
	// Ripple is |F − F_fit|/max(|F|, m·g, 10 % of max|F|), where F_fit is the cubic through the four nearest other
	// heights (see Ripple); 0 at the ends.
	Ripple       float64 `json:"ripple"`
	BalanceError float64 `json:"balance_error"`
}

// Impedance is a coil's impedance Z = R + jX, Ω, and L = X/ω, H.
type Impedance struct {
	Coil string  `json:"coil"`
	R    float64 `json:"r_ohm"`
	X    float64 `json:"x_ohm"`
	L    float64 `json:"l_h"`
}

// Equilibrium is a height where F_z = m·g.
type Equilibrium struct {
	Z float64 `json:"z_m"`
	// ForceZ is the force solved at Z, N; Residual is ForceZ − m·g, N.
	ForceZ   float64 `json:"force_z_n"`
	Residual float64 `json:"residual_n"`
	// Stiffness k_z = −dF_z/dz, N/m, by central difference of solves at Z ± StepM; Stable is k_z > 0.
	Stiffness float64 `json:"stiffness_n_per_m"`
	StepM     float64 `json:"stiffness_step_m"`
	Stable    bool    `json:"stable"`
	Power     float64 `json:"power_w"`
	// Solves is the number of refinement solves (Illinois regula falsi on the bracket of the sweep).
	Solves int `json:"refine_solves"`
	// Lateral is the small-body lateral estimate at Z (nil when not computed).
	Lateral *LateralPoint `json:"lateral,omitempty"`
}

// FloatCurrent is the drive that floats the part at a named height: force scales with I² in this linear model,
// so every coil current is multiplied by Scale = √(m·g / F_z(z)).
type FloatCurrent struct {
	Z      float64 `json:"z_m"`
	ForceZ float64 `json:"force_z_n_at_job_current"`
	// Possible is false when F_z(z) ≤ 0: no current floats the part there.
	Possible bool          `json:"possible"`
	Scale    float64       `json:"current_scale"`
	Currents []CoilCurrent `json:"currents"`
	// Stiffness at the floating current, N/m, and whether that equilibrium is stable (k_z > 0).
	Stiffness float64 `json:"stiffness_n_per_m"`
	Stable    bool    `json:"stable"`
	Power     float64 `json:"power_w"`
	Note      string  `json:"note"`
}

// TemperaturePoint is the height sweep repeated with the part at one temperature (same meshes, new material
// values). Mass is conserved: the weight is the study's; the shape is not rescaled for thermal expansion.
type TemperaturePoint struct {
	TemperatureK float64 `json:"temperature_k"`
	Liquid       bool    `json:"liquid"`
	Resistivity  float64 `json:"resistivity_ohm_m"`
	// ForceZ and Power are aligned with Result.Curve's heights, N and W.
	ForceZ []float64 `json:"force_z_n"`
	Power  []float64 `json:"power_w"`
	// Equilibria from the sweep grid by cubic interpolation (not refined by extra solves).
	Equilibria []Equilibrium `json:"equilibria"`
	// StableZ is the highest stable equilibrium, m, and PowerAtStable the power there, W (nil: none).
	StableZ       *float64 `json:"stable_z_m,omitempty"`
	PowerAtStable *float64 `json:"power_at_stable_w,omitempty"`
}
