package geometry

import (
	"math"
	"testing"
)

func TestParseQuantity(t *testing.T) {
	cases := []struct {
		in   string
		d    Dim
		want float64
	}{
		{"12 mm", Length, 0.012},
		{"12mm", Length, 0.012},
		{"3/8 in", Length, 0.0254 * 3 / 8}, // inch = 25.4 mm exactly (1959 international yard and pound agreement)
		{"2 ft", Length, 0.6096},
		{"1.5 um", Length, 1.5e-6},
		{"1.5 µm", Length, 1.5e-6},
		{"0.25", Length, 0.25},
		{"-4 mm", Length, -0.004},
		{"60 kHz", Frequency, 60e3},
		{"1.2 MHz", Frequency, 1.2e6},
		{"450 A", Current, 450},
		{"2 kA", Current, 2000},
		{"400 V", Voltage, 400},
		{"25 kW", Power, 25e3},
		{"300 kvar", ReactivePower, 3e5},
		{"900 C", Temperature, 1173.15},
		{"900 °C", Temperature, 1173.15},
		{"1173.15 K", Temperature, 1173.15},
		{"212 F", Temperature, 373.15},
		{"15 K", TempDifference, 15},
		{"15 C", TempDifference, 15},
		{"18 F", TempDifference, 10},
		{"1.7e-8 ohm m", Resistivity, 1.7e-8},
		{"1.7e-8 Ω·m", Resistivity, 1.7e-8},
		{"1.7e-8 ohm-m", Resistivity, 1.7e-8},
		{"1.72 uohm cm", Resistivity, 1.72e-8},
		{"0.0172 ohm mm2/m", Resistivity, 1.72e-8},
		{"58 MS/m", Conductivity, 58e6},
		{"2.5 uF", Capacitance, 2.5e-6},
		{"470 nF", Capacitance, 470e-9},
		{"4 bar", Pressure, 4e5},
		{"350 kPa", Pressure, 3.5e5},
		{"1 psi", Pressure, 6894.757293168361}, // 1 lbf/in², exact by the definitions of pound, g_n and inch
		{"90 s", Time, 90},
		{"2 min", Time, 120},
		{"250 ms", Time, 0.25},
		{"12 L/min", FlowRate, 2e-4},
		{"20 mT", FluxDensity, 0.02},
		{"8 kA/m", FieldStrength, 8000},
		{"7.85 g/cm3", Density, 7850},
		{"460 J/(kg K)", SpecificHeat, 460},
		{"0.46 kJ/(kg K)", SpecificHeat, 460},
		{"45 W/(m K)", ThermalCond, 45},
		{"270 kJ/kg", SpecificEnergy, 270e3},
		{"10 W/(m2 K)", HeatTransfer, 10},
		{"10 W/(m² K)", HeatTransfer, 10},
		{"28 deg", Angle, 28},
		{"50 %", Dimensionless, 0.5},
		{"1_000 Hz", Frequency, 1000},
	}
	for _, c := range cases {
		got, err := ParseQuantity(c.in, c.d)
		if err != nil {
			t.Errorf("ParseQuantity(%q, %v): %v", c.in, c.d, err)
			continue
		}
		if math.Abs(got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("ParseQuantity(%q, %v) = %.15g, want %.15g", c.in, c.d, got, c.want)
		}
	}
}

func TestParseQuantityRejects(t *testing.T) {
	cases := []struct {
		in string
		d  Dim
	}{
		{"12 mV", Length}, {"mm", Length}, {"", Length}, {"12 kmm", Length}, {"1/0 in", Length},
		{"1e999 m", Length}, {"NaN", Length}, {"Inf m", Length}, {"5 kC", Temperature}, {"3 Hz", Current},
		{"12 mm mm", Length}, {". m", Length},
	}
	for _, c := range cases {
		if v, err := ParseQuantity(c.in, c.d); err == nil {
			t.Errorf("ParseQuantity(%q, %v) = %g, want an error", c.in, c.d, v)
		}
	}
}

func FuzzParseQuantity(f *testing.F) {
	for _, s := range []string{"12 mm", "3/8 in", "900 C", "1.7e-8 ohm m", "-1e308 kW", "1/3", "µΩ cm", "5e"} {
		f.Add(s, 1)
	}
	f.Fuzz(func(t *testing.T, s string, d int) {
		dim := Dim(((d % int(numDims)) + int(numDims)) % int(numDims))
		v, err := ParseQuantity(s, dim)
		if err == nil && (math.IsNaN(v) || math.IsInf(v, 0)) {
			t.Fatalf("ParseQuantity(%q) = %v without an error", s, v)
		}
	})
}
