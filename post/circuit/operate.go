package circuit

import (
	"fmt"
	"math"
)

// FullBridgeFundamental is the ratio of the rms fundamental of a full-bridge square-wave output to its DC bus
// voltage: a ±V_bus square wave has a fundamental of peak 4V_bus/π, i.e. rms 2√2/π·V_bus ≈ 0.9003 V_bus
// (Fourier series of a square wave). A half bridge gives half of that; pass InverterVoltage directly then.
const FullBridgeFundamental = 2 * math.Sqrt2 / math.Pi

// Drive states what the tank must deliver and what feeds it.
type Drive struct {
	Power           float64 // W, target power into the workpiece; must be > 0
	Efficiency      float64 // coil electrical efficiency η = P_workpiece / P_coil_terminals, in (0, 1]
	InverterVoltage float64 // V rms, fundamental of the inverter output; 0 means derive it from BusVoltage
	BusVoltage      float64 // V, DC bus of a full bridge (square wave, fundamental FullBridgeFundamental·V_bus); used only if InverterVoltage is 0
}

// Ratings are the limits the parts must stay within. A zero field means "not rated" and is not checked.
type Ratings struct {
	CoilCurrent       float64 // A rms
	CoilVoltage       float64 // V rms
	CapacitorCurrent  float64 // A rms
	CapacitorVoltage  float64 // V rms
	CapacitorReactive float64 // var (reactive power of the bank)
	InverterCurrent   float64 // A rms (fundamental)
}

// Status is the outcome of a rating check.
type Status int

const (
	NotRated Status = iota // no rating given
	Pass                   // value ≤ rating
	Over                   // value > rating
)

// String returns "not rated", "PASS" or "OVER".
func (s Status) String() string {
	switch s {
	case Pass:
		return "PASS"
	case Over:
		return "OVER"
	}
	return "not rated"
}

// Check compares one duty figure with its rating.
type Check struct {
	Name   string  // what is checked, e.g. "capacitor current"
	Unit   string  // unit of Value and Rating: "A rms", "V rms", "var"
	Value  float64 // the duty at the operating point
	Rating float64 // the limit; 0 when not rated
	Margin float64 // (Rating − Value)/Rating: headroom as a fraction of the rating, negative when over; 0 when not rated
	Status Status  // Pass when Value ≤ Rating (a value exactly at its rating passes with margin 0)
}

// NewCheck builds a Check; rating 0 gives Status NotRated.
func NewCheck(name, unit string, value, rating float64) Check {
	c := Check{Name: name, Unit: unit, Value: value, Rating: rating}
	if rating <= 0 {
		return c
	}
	c.Margin = (rating - value) / rating
	c.Status = Pass
	if value > rating {
		c.Status = Over
	}
	return c
}

// OperatingPoint is the tank's duty at resonance for a given Drive. All currents and voltages are rms.
type OperatingPoint struct {
	Topology        Topology
	Frequency       float64 // Hz, resonant frequency
	StartFrequency  float64 // Hz, suggested start-up frequency StartFactor·Frequency (common practice)
	CoilResistance  float64 // Ω, Re{Z_coil} at resonance
	CoilInductance  float64 // H, Im{Z_coil}/ω at resonance
	CoilQ           float64 // ωL/R of the coil alone
	TankQ           float64 // capacitor reactive power / tank real input power (series: ≈ ωL/(R+ESR); parallel: ≈ R_d/(ωL))
	InputResistance float64 // Ω, Re{Z_in}: series ≈ R_coil + ESR; parallel the dynamic resistance, L/(C R) exactly for an ideal C

	CoilPower   float64 // W, power at the coil terminals, Drive.Power/Drive.Efficiency
	InputPower  float64 // W, real power into the tank (coil plus capacitor ESR)
	CoilCurrent float64 // A rms
	CoilVoltage float64 // V rms across the coil terminals

	CapacitorCurrent  float64 // A rms
	CapacitorVoltage  float64 // V rms across the bank terminals (ESR included)
	CapacitorReactive float64 // var, I_cap²/(ωC)
	CapacitorKvar     float64 // kvar, CapacitorReactive/1000, for reports

	TankVoltage float64 // V rms at the tank terminals
	TankCurrent float64 // A rms into the tank terminals

	InverterVoltage float64 // V rms fundamental at the inverter output; 0 if no inverter was specified
	InverterCurrent float64 // A rms fundamental, InputPower/InverterVoltage (unity power factor, ideal transformer)
	TurnsRatio      float64 // n = N_primary/N_secondary = InverterVoltage/TankVoltage of the ideal matching transformer (inverter on the primary); n < 1 steps up
	LoadResistance  float64 // Ω, resistance the inverter sees, n²·InputResistance = InverterVoltage²/InputPower

	Checks []Check // one per Ratings field, in the order of Ratings
}

// Operate computes the duty of the tank at the resonance res (from t.Resonance) for the drive d, and checks it
// against the ratings r.
//
// The coil current follows from the coil power: I_coil = √(P/(η R_coil)). Series tank: the capacitor and the
// terminals carry I_coil. Parallel tank: the tank voltage is the coil voltage, the capacitor current is
// V/|ESR + 1/(jωC)| and the terminal current V/|Z_in|. The transformer turns ratio makes the tank's input
// resistance look like the resistance V_inv²/P_in the inverter must see to deliver P_in at voltage V_inv.
func (t Tank) Operate(res Resonance, d Drive, r Ratings) (OperatingPoint, error) {
	if err := t.validate(); err != nil {
		return OperatingPoint{}, err
	}
	if res.Topology != t.Topology {
		return OperatingPoint{}, fmt.Errorf("circuit: resonance is for a %s tank, not %s", res.Topology, t.Topology)
	}
	if !(res.Frequency > 0) {
		return OperatingPoint{}, fmt.Errorf("circuit: resonant frequency %g Hz is not positive", res.Frequency)
	}
	if !(d.Power > 0) {
		return OperatingPoint{}, fmt.Errorf("circuit: target power %g W must be positive", d.Power)
	}
	if !(d.Efficiency > 0 && d.Efficiency <= 1) {
		return OperatingPoint{}, fmt.Errorf("circuit: coil efficiency %g must lie in (0, 1]", d.Efficiency)
	}
	if d.InverterVoltage < 0 || d.BusVoltage < 0 {
		return OperatingPoint{}, fmt.Errorf("circuit: inverter voltage %g V and bus voltage %g V must not be negative",
			d.InverterVoltage, d.BusVoltage)
	}
	rc := real(res.CoilZ)
	if !(rc > 0) {
		return OperatingPoint{}, fmt.Errorf("circuit: coil resistance %g Ω must be positive", rc)
	}
	f := res.Frequency
	w := 2 * math.Pi * f
	zc := res.CoilZ
	zcap := t.capZ(f)
	zin := t.inputZ(f, zc)

	op := OperatingPoint{
		Topology:        t.Topology,
		Frequency:       f,
		StartFrequency:  StartFactor * f,
		CoilResistance:  rc,
		CoilInductance:  imag(zc) / w,
		CoilQ:           imag(zc) / rc,
		InputResistance: real(zin),
		CoilPower:       d.Power / d.Efficiency,
	}
	op.CoilCurrent = math.Sqrt(op.CoilPower / rc)
	op.CoilVoltage = op.CoilCurrent * cabs(zc)
	switch t.Topology {
	case Series:
		op.CapacitorCurrent = op.CoilCurrent
		op.TankCurrent = op.CoilCurrent
		op.TankVoltage = op.CoilCurrent * cabs(zin)
	case Parallel:
		op.TankVoltage = op.CoilVoltage
		op.CapacitorCurrent = op.CoilVoltage / cabs(zcap)
		op.TankCurrent = op.CoilVoltage / cabs(zin)
	}
	op.CapacitorVoltage = op.CapacitorCurrent * cabs(zcap)
	op.CapacitorReactive = op.CapacitorCurrent * op.CapacitorCurrent / (w * t.C)
	op.CapacitorKvar = op.CapacitorReactive / 1000
	op.InputPower = op.TankCurrent * op.TankCurrent * real(zin)
	op.TankQ = op.CapacitorReactive / op.InputPower

	op.InverterVoltage = d.InverterVoltage
	if op.InverterVoltage == 0 {
		op.InverterVoltage = FullBridgeFundamental * d.BusVoltage
	}
	if op.InverterVoltage > 0 {
		op.InverterCurrent = op.InputPower / op.InverterVoltage
		op.TurnsRatio = op.InverterVoltage / op.TankVoltage
		op.LoadResistance = op.InverterVoltage * op.InverterVoltage / op.InputPower
	}
	op.Checks = []Check{
		NewCheck("coil current", "A rms", op.CoilCurrent, r.CoilCurrent),
		NewCheck("coil voltage", "V rms", op.CoilVoltage, r.CoilVoltage),
		NewCheck("capacitor current", "A rms", op.CapacitorCurrent, r.CapacitorCurrent),
		NewCheck("capacitor voltage", "V rms", op.CapacitorVoltage, r.CapacitorVoltage),
		NewCheck("capacitor reactive power", "var", op.CapacitorReactive, r.CapacitorReactive),
		NewCheck("inverter current", "A rms", op.InverterCurrent, r.InverterCurrent),
	}
	return op, nil
}

// AllPass reports whether no rated check is Over.
func (op OperatingPoint) AllPass() bool {
	for _, c := range op.Checks {
		if c.Status == Over {
			return false
		}
	}
	return true
}

// Shift is the move of the resonant frequency between a cold and a hot load (e.g. a steel billet below and above
// its Curie temperature, or a charge before and after melting).
type Shift struct {
	Cold, Hot Resonance
	Delta     float64 // Hz, Hot.Frequency − Cold.Frequency
	Relative  float64 // Delta / Cold.Frequency
}

// ResonanceShift finds the resonance of tank t (its Coil field is ignored) with the cold and with the hot coil
// impedance, starting the cold search at fGuess (Hz) and the hot search at the cold resonance.
func ResonanceShift(t Tank, cold, hot ImpedanceFunc, fGuess float64) (Shift, error) {
	if cold == nil || hot == nil {
		panic("circuit: ResonanceShift needs both impedance functions")
	}
	t.Coil = cold
	c, err := t.Resonance(fGuess)
	if err != nil {
		return Shift{}, fmt.Errorf("cold load: %w", err)
	}
	t.Coil = hot
	h, err := t.Resonance(c.Frequency)
	if err != nil {
		return Shift{}, fmt.Errorf("hot load: %w", err)
	}
	return Shift{Cold: c, Hot: h, Delta: h.Frequency - c.Frequency,
		Relative: (h.Frequency - c.Frequency) / c.Frequency}, nil
}

func cabs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }
