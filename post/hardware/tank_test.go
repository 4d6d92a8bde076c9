package hardware

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"sync"
	"testing"

	"eddyrz/geometry"
	"eddyrz/post/circuit"
	"eddyrz/post/study"
)

func rel(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// solved caches the built and solved test jobs: the models are read-only once built, and tests share them.
var solved sync.Map // file → *solvedJob

type solvedJob struct {
	once sync.Once
	md   *study.Model
	sol  *study.Solution
	err  error
}

func load(t testing.TB, file string, edit func(*geometry.Job)) (*study.Model, *study.Solution) {
	t.Helper()
	key := file
	if edit != nil {
		key += "+edit:" + t.Name()
	}
	v, _ := solved.LoadOrStore(key, &solvedJob{})
	sj := v.(*solvedJob)
	sj.once.Do(func() {
		job, err := geometry.ReadFile(file)
		if err != nil {
			sj.err = err
			return
		}
		if edit != nil {
			edit(job)
		}
		if sj.md, sj.err = study.Build(job); sj.err != nil {
			return
		}
		sj.sol, sj.err = sj.md.Solve()
	})
	if sj.err != nil {
		t.Fatal(sj.err)
	}
	return sj.md, sj.sol
}

// A bare stranded coil has no eddy currents anywhere, so its impedance is R_dc + jωL with L independent of
// frequency, and the tank must resonate where the textbook formulas put it: series ω0 = 1/√(LC) (Alexander &
// Sadiku, Fundamentals of Electric Circuits, "Series resonance"; from memory for the chapter), parallel (coil
// R + jωL across an ideal C) the zero-phase ω = √(1/(LC) − R²/L²) (Hayt & Kemmerly, Engineering Circuit
// Analysis, parallel resonance of a practical tank; from memory for the section). L and R come from a field
// solve at a different frequency than the search visits, through the whole StudyTank path.
func TestTankIdealLC(t *testing.T) {
	for _, parallel := range []bool{false, true} {
		name := "series"
		if parallel {
			name = "parallel"
		}
		t.Run(name, func(t *testing.T) {
			md, sol := load(t, "testdata/stranded-series.toml", func(j *geometry.Job) { j.Tank.Parallel = parallel })
			// L and R at 1 kHz, far from the resonance near 5.6 kHz.
			sw, err := md.NewSweeper()
			if err != nil {
				t.Fatal(err)
			}
			s1, err := sw.SolveAt(1e3)
			if err != nil {
				t.Fatal(err)
			}
			l, r := s1.Result.Coils[0].Inductance, s1.Result.Coils[0].Resistance
			c := md.Job.Tank.Capacitance
			w0 := 1 / math.Sqrt(l*c)
			want := w0 / (2 * math.Pi)
			if parallel {
				want = math.Sqrt(w0*w0-r*r/(l*l)) / (2 * math.Pi)
			}
			ts, err := StudyTank(md, sol)
			if err != nil {
				t.Fatal(err)
			}
			got := ts.Cold.Resonance.Frequency
			if rel(got, want) > 2*ResonanceTol {
				t.Errorf("resonance %.6f Hz, closed form %.6f Hz (rel. diff %.2g)", got, want, rel(got, want))
			}
			if ts.Hot != nil {
				t.Error("a job without parts has no hot state")
			}
			op := ts.Cold.Operating
			// Series: the tank Q is ωL/R and the capacitor carries the coil current at V = I/(ωC).
			w := 2 * math.Pi * got
			if !parallel {
				if rel(op.TankQ, w*l/r) > 1e-3 {
					t.Errorf("tank Q %.5g, ωL/R = %.5g", op.TankQ, w*l/r)
				}
				if rel(op.CapacitorCurrent, op.CoilCurrent) > 1e-12 {
					t.Errorf("series capacitor current %g A differs from the coil's %g A", op.CapacitorCurrent, op.CoilCurrent)
				}
			} else if rel(op.InputResistance, l/(c*r)) > 1e-3 {
				// Parallel: the dynamic resistance at zero phase is exactly L/(CR) for an ideal capacitor.
				t.Errorf("parallel tank input resistance %.6g Ω, L/(CR) = %.6g Ω", op.InputResistance, l/(c*r))
			}
			if rel(op.CapacitorVoltage, op.CapacitorCurrent/(w*c)) > 1e-9 {
				t.Errorf("capacitor voltage %g V, I/(ωC) = %g V", op.CapacitorVoltage, op.CapacitorCurrent/(w*c))
			}
			// No parts: the target is the coil's own terminal power at the job's drive, 10 A in R.
			if rel(ts.TargetPower, 100*r) > 1e-6 {
				t.Errorf("target power %g W, want I²R = %g W", ts.TargetPower, 100*r)
			}
			if rel(op.CoilCurrent, 10) > 1e-6 {
				t.Errorf("coil current at the target power %g A, want the job's 10 A", op.CoilCurrent)
			}
			if ts.Cold.Solves > 12 {
				t.Errorf("%d field solves for a frequency-independent coil", ts.Cold.Solves)
			}
		})
	}
}

// The frequency StudyTank reports must be where the tank's reactance, computed from independent field solves
// of the loaded coil at that same frequency, crosses zero: the reactance changes sign across ±0.05 % of it, and
// the linear zero between those two solves lies within 0.1 % of it. Real field solves of a coarse small job,
// cold (aluminium at 20 °C) and hot (molten aluminium).
func TestResonanceIsReactanceZero(t *testing.T) {
	md, sol := load(t, "testdata/ring-heater.toml", nil)
	ts, err := StudyTank(md, sol)
	if err != nil {
		t.Fatal(err)
	}
	if ts.Hot == nil {
		t.Fatal("aluminium melts: the job must have a hot state")
	}
	for _, st := range []TankState{ts.Cold, *ts.Hot} {
		sw, err := md.NewSweeper()
		if err != nil {
			t.Fatal(err)
		}
		ov := md.TemperatureOverrides(func(r geometry.Region) float64 {
			if r.Kind == geometry.PartRegion {
				return st.Load.Temperature[r.Part]
			}
			return r.Temperature
		})
		f0 := st.Resonance.Frequency
		x := func(f float64) float64 {
			s, err := sw.SolveAt(f, ov...)
			if err != nil {
				t.Fatal(err)
			}
			zc := s.Result.Coils[0].Impedance
			zcap := complex(0, -1/(2*math.Pi*f*ts.Tank.C))
			return imag(zc * zcap / (zc + zcap)) // parallel bank
		}
		fa, fb := f0*(1-5e-4), f0*(1+5e-4)
		xa, xb := x(fa), x(fb)
		if (xa < 0) == (xb < 0) {
			t.Errorf("%s: reactance %g Ω at %g Hz and %g Ω at %g Hz: no zero crossing around %g Hz", st.Load.Name, xa, fa, xb, fb, f0)
			continue
		}
		fz := fa - xa*(fb-fa)/(xb-xa)
		if rel(f0, fz) > 1e-3 {
			t.Errorf("%s: resonance %g Hz, reactance zero %g Hz", st.Load.Name, f0, fz)
		}
		t.Logf("%s: resonance %.2f Hz, reactance zero %.2f Hz (%.1e), %d solves", st.Load.Name, f0, fz, rel(f0, fz), st.Solves)
	}
	// Molten aluminium has a higher resistivity, so the field penetrates further and the coil's inductance
	// rises: the hot resonance lies below the cold one.
	if !(ts.Shift.Delta < 0) {
		t.Errorf("resonance shift cold → hot %g Hz; expected downward", ts.Shift.Delta)
	}
}

// Evaluate on the ring heater: the report's JSON carries the keys the solve report joins, its checks agree with
// the numbers and the ratings, and the cooling loss is the tank's larger coil loss.
func TestEvaluateReport(t *testing.T) {
	md, sol := load(t, "testdata/ring-heater.toml", nil)
	rep, err := Evaluate(md, sol)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := json.NewEncoder(&buf).Encode(rep); err != nil {
		t.Fatal(err)
	}
	var top map[string]json.RawMessage
	if err := json.Unmarshal(buf.Bytes(), &top); err != nil {
		t.Fatal(err)
	}
	m := map[string]map[string]any{}
	for _, k := range []string{"tank", "cooling"} {
		var sec map[string]any
		if err := json.Unmarshal(top[k], &sec); err != nil {
			t.Fatalf("%s: %v", k, err)
		}
		m[k] = sec
	}
	for _, k := range []string{"resonant_frequency_hz", "quality_factor", "capacitor_voltage_v_rms", "capacitor_current_a_rms",
		"turns_ratio", "checks", "hot", "start_frequency_hz", "input_impedance_ohm", "inverter_current_a_rms", "resonance_shift_hz"} {
		if _, ok := m["tank"][k]; !ok {
			t.Errorf("tank JSON lacks %q", k)
		}
	}
	for _, k := range []string{"flow_l_per_min", "pressure_drop_pa", "reynolds", "velocity_m_per_s", "wall_temperature_c", "warnings"} {
		if _, ok := m["cooling"][k]; !ok {
			t.Errorf("cooling JSON lacks %q", k)
		}
	}
	tk := rep.Tank
	tj := md.Job.Tank
	for _, st := range []*TankStateReport{&tk.TankStateReport, tk.Hot} {
		ratings := map[string]float64{"capacitor current": tj.CurrentRating, "capacitor voltage": tj.VoltageRating,
			"capacitor reactive power": tj.VarRating}
		for _, c := range st.Checks {
			rt, rated := ratings[c.Name]
			want := "not rated"
			if rated {
				want = "PASS"
				if float64(c.Value) > rt {
					want = "OVER"
				}
			}
			if c.Status != want {
				t.Errorf("%s load, %s: %g against %g gives %s, want %s", st.Load, c.Name, float64(c.Value), rt, c.Status, want)
			}
		}
		// Start-up above resonance by the common-practice factor; turns ratio from the bus's fundamental.
		if rel(float64(st.StartFrequencyHz), circuit.StartFactor*float64(st.ResonantFrequencyHz)) > 1e-12 {
			t.Errorf("start frequency %g Hz", float64(st.StartFrequencyHz))
		}
		vinv := circuit.FullBridgeFundamental * tj.BusVoltage
		if rel(float64(st.TurnsRatio), vinv/float64(st.TankVoltage)) > 1e-9 {
			t.Errorf("turns ratio %g, want %g", float64(st.TurnsRatio), vinv/float64(st.TankVoltage))
		}
		// Power: the target power over the coil efficiency reaches the coil terminals as I² R.
		pc := float64(st.CoilCurrent) * float64(st.CoilCurrent) * float64(st.CoilResistance)
		if rel(pc*float64(st.Efficiency), tj.Power) > 1e-9 {
			t.Errorf("%s load: I²R·η = %g W, want the target %g W", st.Load, pc*float64(st.Efficiency), tj.Power)
		}
	}
	// The test job is sized so that the cold load overloads the bank's 2000 A rating.
	if tk.AllPass || tk.Checks[2].Status != "OVER" {
		t.Errorf("cold capacitor current %g A against 2000 A must be OVER", float64(tk.Checks[2].Value))
	}
	wantLoss := math.Max(float64(tk.CoilLoss), float64(tk.Hot.CoilLoss))
	if rel(float64(rep.Cooling.CoilLossW), wantLoss) > 1e-12 {
		t.Errorf("cooling loss %g W, want the larger tank coil loss %g W", float64(rep.Cooling.CoilLossW), wantLoss)
	}
	var txt bytes.Buffer
	if err := rep.WriteText(&txt); err != nil {
		t.Fatal(err)
	}
	for _, s := range []string{"resonant frequency", "OVER", "PASS", "turns ratio", "flow for a 15 K rise", "pressure drop", "start-up frequency"} {
		if !strings.Contains(txt.String(), s) {
			t.Errorf("text report lacks %q:\n%s", s, txt.String())
		}
	}
}

// The coil loss at the tank's operating point equals the coil loss of a power-driven solve at the resonant
// frequency: the ring heater's coil is driven by the same 5 kW into the slug, so a direct solve at the cold
// resonance must give the same coil loss (and the same efficiency) as the tank analysis.
func TestTankCoilLossMatchesDirectSolve(t *testing.T) {
	md, sol := load(t, "testdata/ring-heater.toml", nil)
	ts, err := StudyTank(md, sol)
	if err != nil {
		t.Fatal(err)
	}
	sw, err := md.NewSweeper()
	if err != nil {
		t.Fatal(err)
	}
	s, err := sw.SolveAt(ts.Cold.Resonance.Frequency)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := ts.Cold.CoilLoss, s.Result.Coils[0].Loss; rel(got, want) > 1e-9 {
		t.Errorf("coil loss at the operating point %g W, direct power-driven solve %g W", got, want)
	}
	if got, want := ts.Cold.Operating.CoilCurrent, real(s.Result.Coils[0].Current); rel(got, want) > 1e-9 {
		t.Errorf("coil current %g A, direct solve %g A", got, want)
	}
}

func TestLoadStates(t *testing.T) {
	job, err := geometry.ReadFile("../../examples/billet-heater.toml")
	if err != nil {
		t.Fatal(err)
	}
	cold, hot := LoadStates(job)
	if cold.Temperature[0] != ColdTemperature || hot == nil || hot.Temperature[0] != job.Heating.StopTemperature {
		t.Errorf("billet: cold %v, hot %+v; want 293.15 K and the heating stop temperature", cold.Temperature, hot)
	}
	job.Heating = nil
	if _, hot = LoadStates(job); hot == nil || hot.Temperature[0] != job.Parts[0].Material.Melting {
		t.Errorf("without [heating] the hot state is the melting point, got %+v", hot)
	}
	job.Parts = nil
	if _, hot = LoadStates(job); hot != nil {
		t.Errorf("no parts, no hot state; got %+v", hot)
	}
}

func TestEvaluateErrors(t *testing.T) {
	md, sol := load(t, "testdata/ring-heater.toml", nil)
	bare := study.Model{Job: md.Job.Copy(), Layout: md.Layout, Mesh: md.Mesh, Problem: md.Problem, MeshTime: md.MeshTime,
		PowerDrive: md.PowerDrive}
	bare.Job.Tank, bare.Job.Cooling = nil, nil
	if rep, err := Evaluate(&bare, sol); rep != nil || err != nil {
		t.Errorf("a job without [tank] and [cooling] gives %v, %v; want nil, nil", rep, err)
	}
	bare.Job = md.Job.Copy()
	bare.Job.Tank = nil
	bare.Job.Coils[0].Turns[0].Wall = 0
	if _, err := Evaluate(&bare, sol); err == nil || !strings.Contains(err.Error(), "solid") {
		t.Errorf("a solid turn cannot carry water; got %v", err)
	}
	if _, err := StudyTank(&bare, sol); err == nil {
		t.Error("StudyTank without [tank] must fail")
	}
}
