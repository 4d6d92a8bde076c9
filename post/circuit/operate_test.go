package circuit

import (
	"fmt"
	"math"
	"math/rand"
	"testing"
)

func mustResonance(t *testing.T, tank Tank, guess float64) Resonance {
	t.Helper()
	res, err := tank.Resonance(guess)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func near(t *testing.T, name string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.7g, want %.7g (rel tol %g)", name, got, want, rel)
	}
}

// Hand-worked series tank: R = 0.05 Ω, L = 10 µH, C = 2 µF, so √(L/C) = √5 Ω = ωL = 1/(ωC) at resonance.
// 8 kW into the work at η = 0.8 is 10 kW at the coil: I = √(10 kW / 0.05 Ω) = 447.21 A; the capacitor sees
// I·√5 = 1000.0 V and I²·√5 = 447.2 kvar; the tank presents 0.05 Ω, so 400 V rms from the inverter needs
// n = 400/(447.21·0.05) = 17.89 (step down) and 25 A.
func TestOperateSeriesHandWorked(t *testing.T) {
	tank := Tank{Coil: fixedCoil(0.05, 10e-6), C: 2e-6, Topology: Series}
	res := mustResonance(t, tank, 30e3)
	op, err := tank.Operate(res, Drive{Power: 8e3, Efficiency: 0.8, InverterVoltage: 400}, Ratings{})
	if err != nil {
		t.Fatal(err)
	}
	i := math.Sqrt(10e3 / 0.05)
	near(t, "coil power", op.CoilPower, 10e3, 1e-12)
	near(t, "coil current", op.CoilCurrent, i, 1e-9)
	near(t, "coil voltage", op.CoilVoltage, i*math.Hypot(0.05, math.Sqrt(5)), 1e-6)
	near(t, "capacitor current", op.CapacitorCurrent, i, 1e-9)
	near(t, "capacitor voltage", op.CapacitorVoltage, i*math.Sqrt(5), 1e-6)
	near(t, "capacitor kvar", op.CapacitorKvar, i*i*math.Sqrt(5)/1e3, 1e-6)
	near(t, "tank Q", op.TankQ, math.Sqrt(5)/0.05, 1e-6)
	near(t, "coil Q", op.CoilQ, math.Sqrt(5)/0.05, 1e-6)
	near(t, "input resistance", op.InputResistance, 0.05, 1e-9)
	near(t, "tank voltage", op.TankVoltage, i*0.05, 1e-6)
	near(t, "turns ratio", op.TurnsRatio, 400/(i*0.05), 1e-6)
	near(t, "inverter current", op.InverterCurrent, 25, 1e-9)
	near(t, "load resistance", op.LoadResistance, 16, 1e-9)
	near(t, "start frequency", op.StartFrequency, 1.15*res.Frequency, 1e-12)
	for _, c := range op.Checks {
		if c.Status != NotRated {
			t.Errorf("%s: status %v with no rating", c.Name, c.Status)
		}
	}
}

// Hand-worked parallel tank, same parts: at zero phase R² + ω²L² = L/C, so |Z_coil| = √5 Ω exactly, the tank
// voltage is 447.21 A · √5 Ω = 1000 V and the dynamic resistance L/(CR) = 100 Ω takes 1000²/100 = 10 kW.
func TestOperateParallelHandWorked(t *testing.T) {
	tank := Tank{Coil: fixedCoil(0.05, 10e-6), C: 2e-6, Topology: Parallel}
	res := mustResonance(t, tank, 30e3)
	op, err := tank.Operate(res, Drive{Power: 10e3, Efficiency: 1, BusVoltage: 600}, Ratings{})
	if err != nil {
		t.Fatal(err)
	}
	near(t, "tank voltage", op.TankVoltage, 1000, 1e-6)
	near(t, "dynamic resistance", op.InputResistance, 100, 1e-5)
	near(t, "input power", op.InputPower, 10e3, 1e-6)
	near(t, "tank current", op.TankCurrent, 10, 1e-5)
	w := 2 * math.Pi * res.Frequency
	near(t, "capacitor current = ωCV", op.CapacitorCurrent, w*2e-6*1000, 1e-9)
	// Full bridge on a 600 V bus: fundamental 2√2/π · 600 = 540.19 V rms.
	near(t, "inverter voltage", op.InverterVoltage, 540.1897, 1e-6)
	near(t, "turns ratio", op.TurnsRatio, 0.5401897, 1e-5)
	near(t, "inverter current", op.InverterCurrent, 10e3/540.1897, 1e-5)
}

// Property over random tanks and drives: I_cap = ωCV_cap and Q_cap = ωCV_cap² for an ideal bank; power balance;
// the inverter sees n²R_in = V_inv²/P_in and delivers P_in = V_inv·I_inv.
func TestOperateProperties(t *testing.T) {
	rng := rand.New(rand.NewSource(2))
	for i := 0; i < 100; i++ {
		l := math.Pow(10, -6+2*rng.Float64())
		c := math.Pow(10, -7+2*rng.Float64())
		f0 := 1 / (2 * math.Pi * math.Sqrt(l*c))
		r := 2 * math.Pi * f0 * l / math.Pow(10, 0.5+1.5*rng.Float64())
		esr := 0.0
		if i%2 == 1 {
			esr = r * 0.05 * rng.Float64()
		}
		for _, top := range []Topology{Series, Parallel} {
			tank := Tank{Coil: fixedCoil(r, l), C: c, ESR: esr, Topology: top}
			res := mustResonance(t, tank, f0)
			d := Drive{Power: 1e3 + 1e5*rng.Float64(), Efficiency: 0.3 + 0.7*rng.Float64(), InverterVoltage: 50 + 500*rng.Float64()}
			op, err := tank.Operate(res, d, Ratings{})
			if err != nil {
				t.Fatal(err)
			}
			w := 2 * math.Pi * op.Frequency
			name := fmt.Sprintf("case %d %s", i, top)
			if esr == 0 {
				near(t, name+" I_cap vs ωCV", op.CapacitorCurrent, w*c*op.CapacitorVoltage, 1e-9)
				near(t, name+" var vs ωCV²", op.CapacitorReactive, w*c*op.CapacitorVoltage*op.CapacitorVoltage, 1e-9)
			}
			near(t, name+" power balance", op.InputPower, op.CoilPower+op.CapacitorCurrent*op.CapacitorCurrent*esr, 1e-5)
			near(t, name+" n²R_in", op.TurnsRatio*op.TurnsRatio*op.InputResistance, op.LoadResistance, 1e-9)
			near(t, name+" V_inv I_inv", op.InverterVoltage*op.InverterCurrent, op.InputPower, 1e-9)
			near(t, name+" tank V·I", op.TankVoltage*op.TankCurrent, op.InputPower, 1e-5)
		}
	}
}

func TestCheckBoundaries(t *testing.T) {
	cases := []struct {
		value, rating float64
		status        Status
		margin        float64
	}{
		{100, 0, NotRated, 0},
		{100, 100, Pass, 0},
		{100, 100 * (1 + 1e-12), Pass, 1e-12},
		{100 * (1 + 1e-12), 100, Over, -1e-12},
		{50, 100, Pass, 0.5},
		{150, 100, Over, -0.5},
	}
	for _, tc := range cases {
		c := NewCheck("x", "A rms", tc.value, tc.rating)
		if c.Status != tc.status {
			t.Errorf("value %v rating %v: status %v, want %v", tc.value, tc.rating, c.Status, tc.status)
		}
		if math.Abs(c.Margin-tc.margin) > 1e-15 {
			t.Errorf("value %v rating %v: margin %g, want %g", tc.value, tc.rating, c.Margin, tc.margin)
		}
	}
	if Pass.String() != "PASS" || Over.String() != "OVER" || NotRated.String() != "not rated" {
		t.Error("status strings")
	}
}

// Ratings set exactly at the hand-worked duty pass; a rating 1 % below fails.
func TestOperateRatings(t *testing.T) {
	tank := Tank{Coil: fixedCoil(0.05, 10e-6), C: 2e-6, Topology: Series}
	res := mustResonance(t, tank, 30e3)
	d := Drive{Power: 10e3, Efficiency: 1, InverterVoltage: 400}
	op, err := tank.Operate(res, d, Ratings{})
	if err != nil {
		t.Fatal(err)
	}
	exact := Ratings{op.CoilCurrent, op.CoilVoltage, op.CapacitorCurrent, op.CapacitorVoltage, op.CapacitorReactive, op.InverterCurrent}
	op2, _ := tank.Operate(res, d, exact)
	if !op2.AllPass() {
		t.Errorf("ratings equal to the duty must pass: %+v", op2.Checks)
	}
	for _, c := range op2.Checks {
		if c.Status != Pass {
			t.Errorf("%s: %v", c.Name, c.Status)
		}
	}
	low := exact
	low.CapacitorCurrent *= 0.99
	op3, _ := tank.Operate(res, d, low)
	if op3.AllPass() {
		t.Error("a capacitor current rating 1 % low must fail")
	}
	if c := op3.Checks[2]; c.Status != Over || math.Abs(c.Margin-(0.99-1)/0.99) > 1e-9 {
		t.Errorf("capacitor current check %+v", c)
	}
}

func TestOperateErrors(t *testing.T) {
	tank := Tank{Coil: fixedCoil(0.05, 10e-6), C: 2e-6, Topology: Series}
	res := mustResonance(t, tank, 30e3)
	bad := []Drive{
		{Power: 0, Efficiency: 0.5},
		{Power: 1e3, Efficiency: 0},
		{Power: 1e3, Efficiency: 1.2},
		{Power: 1e3, Efficiency: 0.5, InverterVoltage: -1},
	}
	for _, d := range bad {
		if _, err := tank.Operate(res, d, Ratings{}); err == nil {
			t.Errorf("drive %+v: no error", d)
		}
	}
	par := tank
	par.Topology = Parallel
	if _, err := par.Operate(res, Drive{Power: 1, Efficiency: 1}, Ratings{}); err == nil {
		t.Error("topology mismatch accepted")
	}
}

func ExampleTank_Operate() {
	// A 6 µH coil with 0.02 Ω load-reflected resistance, on a 4 µF series bank.
	tank := Tank{Coil: func(f float64) (complex128, error) {
		return complex(0.02, 2*math.Pi*f*6e-6), nil
	}, C: 4e-6, Topology: Series}
	res, err := tank.Resonance(25e3)
	if err != nil {
		fmt.Println(err)
		return
	}
	op, _ := tank.Operate(res, Drive{Power: 5e3, Efficiency: 0.8, BusVoltage: 540}, Ratings{CapacitorVoltage: 800})
	fmt.Printf("f = %.0f Hz, I_coil = %.0f A rms, V_cap = %.0f V rms (%v), %.0f kvar, n = %.2f\n",
		op.Frequency, op.CoilCurrent, op.CapacitorVoltage, op.Checks[3].Status, op.CapacitorKvar, op.TurnsRatio)
	// Output: f = 32487 Hz, I_coil = 559 A rms, V_cap = 685 V rms (PASS), 383 kvar, n = 43.48
}
