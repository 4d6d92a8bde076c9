package geometry

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Dim is the physical dimension a quantity in the job file must have. Every quantity is converted to SI on
// reading: metres, hertz, amperes, volts, watts, kelvin, ohm metres, siemens per metre, farads, pascals,
// seconds, cubic metres per second, tesla, amperes per metre, kilograms per cubic metre, J/(kg·K), W/(m·K),
// J/kg, W/(m²·K), degrees (angles stay in degrees, the unit the mesher takes).
type Dim int

// The dimensions the job file uses.
const (
	Dimensionless Dim = iota
	Length
	Frequency
	Current
	Voltage
	Power
	ReactivePower
	Temperature    // absolute: "900 C", "1173 K", "1650 F"; bare numbers are kelvin
	TempDifference // "15 K" or "15 C" (same size), "27 F"
	Resistivity    // Ω·m
	Conductivity   // S/m
	Capacitance    // F
	Pressure       // Pa
	Time           // s
	FlowRate       // m³/s
	FluxDensity    // T
	FieldStrength  // A/m
	Density        // kg/m³
	SpecificHeat   // J/(kg·K)
	ThermalCond    // W/(m·K)
	SpecificEnergy // J/kg
	HeatTransfer   // W/(m²·K)
	Angle          // degrees
	numDims
)

var dimNames = [numDims]string{
	"a plain number", "a length", "a frequency", "a current", "a voltage", "a power", "a reactive power",
	"a temperature", "a temperature difference", "a resistivity", "a conductivity", "a capacitance",
	"a pressure", "a time", "a flow rate", "a flux density", "a field strength", "a density",
	"a specific heat", "a thermal conductivity", "a specific energy", "a heat transfer coefficient", "an angle",
}

// dimExamples are shown in error messages as a correct way to write a value.
var dimExamples = [numDims]string{
	`"0.8"`, `"12 mm"`, `"60 kHz"`, `"450 A"`, `"400 V"`, `"25 kW"`, `"300 kvar"`, `"900 C"`, `"15 K"`,
	`"1.7e-8 ohm m"`, `"58 MS/m"`, `"2.5 uF"`, `"4 bar"`, `"90 s"`, `"12 L/min"`, `"20 mT"`, `"8 kA/m"`,
	`"7850 kg/m3"`, `"460 J/(kg K)"`, `"45 W/(m K)"`, `"270 kJ/kg"`, `"10 W/(m2 K)"`, `"28 deg"`,
}

func (d Dim) String() string {
	if d < 0 || d >= numDims {
		return fmt.Sprintf("Dim(%d)", int(d))
	}
	return dimNames[d]
}

// unitDef is one spelling of a unit: value_SI = scale·x + offset. Prefixable units also accept an SI prefix.
type unitDef struct {
	sym        string
	scale      float64
	offset     float64
	prefixable bool
}

// unitTable lists the accepted spellings per dimension, after normalisation (see normUnit).
var unitTable = [numDims][]unitDef{
	Dimensionless:  {{"%", 0.01, 0, false}},
	Length:         {{"m", 1, 0, true}, {"in", 0.0254, 0, false}, {"inch", 0.0254, 0, false}, {"ft", 0.3048, 0, false}}, // inch and foot: exact by the 1959 international yard agreement
	Frequency:      {{"Hz", 1, 0, true}},
	Current:        {{"A", 1, 0, true}},
	Voltage:        {{"V", 1, 0, true}},
	Power:          {{"W", 1, 0, true}},
	ReactivePower:  {{"var", 1, 0, true}, {"VAr", 1, 0, true}, {"VAR", 1, 0, true}},
	Temperature:    {{"K", 1, 0, false}, {"C", 1, 273.15, false}, {"degC", 1, 273.15, false}, {"F", 5.0 / 9, 273.15 - 32*5.0/9, false}, {"degF", 5.0 / 9, 273.15 - 32*5.0/9, false}},
	TempDifference: {{"K", 1, 0, false}, {"C", 1, 0, false}, {"degC", 1, 0, false}, {"F", 5.0 / 9, 0, false}, {"degF", 5.0 / 9, 0, false}},
	Resistivity:    {{"ohm m", 1, 0, true}, {"ohm cm", 0.01, 0, true}, {"ohm mm2/m", 1e-6, 0, true}},
	Conductivity:   {{"S/m", 1, 0, true}},
	Capacitance:    {{"F", 1, 0, true}},
	Pressure:       {{"Pa", 1, 0, true}, {"bar", 1e5, 0, true}, {"psi", 6894.757293168361, 0, false}}, // psi = 0.45359237 kg·9.80665 m/s² / (0.0254 m)², exact by definition
	Time:           {{"s", 1, 0, true}, {"min", 60, 0, false}, {"h", 3600, 0, false}},
	FlowRate:       {{"m3/s", 1, 0, false}, {"L/min", 1e-3 / 60, 0, false}, {"l/min", 1e-3 / 60, 0, false}, {"L/s", 1e-3, 0, false}, {"l/s", 1e-3, 0, false}, {"m3/h", 1.0 / 3600, 0, false}},
	FluxDensity:    {{"T", 1, 0, true}, {"G", 1e-4, 0, false}},
	FieldStrength:  {{"A/m", 1, 0, true}},
	Density:        {{"kg/m3", 1, 0, false}, {"g/cm3", 1000, 0, false}},
	SpecificHeat:   {{"J/(kg K)", 1, 0, true}, {"J/kg/K", 1, 0, true}, {"J/(g K)", 1000, 0, false}},
	ThermalCond:    {{"W/(m K)", 1, 0, true}, {"W/m/K", 1, 0, true}},
	SpecificEnergy: {{"J/kg", 1, 0, true}, {"J/g", 1000, 0, false}},
	HeatTransfer:   {{"W/(m2 K)", 1, 0, true}, {"W/m2/K", 1, 0, true}},
	Angle:          {{"deg", 1, 0, false}, {"°", 1, 0, false}, {"rad", 180 / math.Pi, 0, false}},
}

// siPrefixes are the prefixes accepted before a prefixable unit.
var siPrefixes = map[string]float64{
	"p": 1e-12, "n": 1e-9, "u": 1e-6, "µ": 1e-6, "μ": 1e-6, "m": 1e-3, "c": 1e-2,
	"k": 1e3, "M": 1e6, "G": 1e9,
}

// normUnit writes a unit in the table's spelling: Ω → ohm, ·, * and - between factors → one space, ² ³ → 2 3,
// "°C" → "C", runs of spaces collapsed.
func normUnit(u string) string {
	r := strings.NewReplacer("Ω", "ohm", "·", " ", "*", " ", "⋅", " ", "²", "2", "³", "3", "°C", "C", "°F", "F", "ohm-m", "ohm m", "ohm-cm", "ohm cm")
	u = r.Replace(u)
	u = strings.Join(strings.Fields(u), " ")
	// "ohmm" and "ohmcm" written without a separator.
	for _, p := range []string{"", "p", "n", "u", "µ", "μ", "m", "k", "M"} {
		if strings.HasPrefix(u, p+"ohmm") || strings.HasPrefix(u, p+"ohmcm") {
			u = strings.Replace(u, "ohm", "ohm ", 1)
		}
	}
	return u
}

// ParseQuantity reads a quantity such as "12 mm", "3/8 in", "60 kHz" or "900 C" and returns it in SI (see Dim).
// A number without a unit is taken as SI already (kelvin for temperatures). The result is always finite.
func ParseQuantity(s string, d Dim) (float64, error) {
	if d < 0 || d >= numDims {
		panic(fmt.Sprintf("geometry: ParseQuantity: bad dimension %d", int(d)))
	}
	s = strings.TrimSpace(s)
	num, unit := splitNumber(s)
	if num == "" {
		return 0, fmt.Errorf("%q does not start with a number", s)
	}
	x, err := parseNumber(num)
	if err != nil {
		return 0, fmt.Errorf("%q: %w", s, err)
	}
	unit = normUnit(strings.TrimSpace(unit))
	if unit == "" {
		return x, nil
	}
	for _, u := range unitTable[d] {
		if unit == u.sym {
			return finite(s, u.scale*x+u.offset)
		}
	}
	for _, u := range unitTable[d] {
		if !u.prefixable || !strings.HasSuffix(unit, u.sym) {
			continue
		}
		// The prefix applies to the first factor of compound units ("uohm cm", "kJ/kg") or the unit ("kW").
		if f, ok := siPrefixes[strings.TrimSuffix(unit, u.sym)]; ok {
			return finite(s, f*u.scale*x+u.offset)
		}
	}
	return 0, fmt.Errorf("%q is not %s", s, d)
}

func finite(s string, v float64) (float64, error) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%q is out of range", s)
	}
	return v, nil
}

// splitNumber splits s into a leading number (digits, sign, decimal point, exponent, or a fraction a/b) and the
// rest.
func splitNumber(s string) (num, rest string) {
	i := 0
	n := len(s)
	if i < n && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := func() int {
		j := i
		for i < n && (s[i] >= '0' && s[i] <= '9' || s[i] == '_') {
			i++
		}
		return i - j
	}
	nd := digits()
	if i < n && s[i] == '.' {
		i++
		nd += digits()
	}
	if nd == 0 {
		return "", s
	}
	if i < n && (s[i] == 'e' || s[i] == 'E') {
		j := i
		i++
		if i < n && (s[i] == '+' || s[i] == '-') {
			i++
		}
		if digits() == 0 {
			i = j // "5 E" is not an exponent
		}
	}
	// A fraction "3/8" (no spaces inside).
	if i+1 < n && s[i] == '/' && s[i+1] >= '0' && s[i+1] <= '9' {
		i++
		digits()
		if i < n && s[i] == '.' {
			i++
			digits()
		}
	}
	return s[:i], s[i:]
}

func parseNumber(num string) (float64, error) {
	num = strings.ReplaceAll(num, "_", "")
	if a, b, ok := strings.Cut(num, "/"); ok {
		x, err := strconv.ParseFloat(a, 64)
		if err != nil {
			return 0, fmt.Errorf("bad number %q", num)
		}
		y, err := strconv.ParseFloat(b, 64)
		if err != nil || y == 0 {
			return 0, fmt.Errorf("bad fraction %q", num)
		}
		return x / y, nil
	}
	x, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return 0, fmt.Errorf("bad number %q", num)
	}
	return x, nil
}
