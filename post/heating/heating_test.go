package heating

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"eddyrz/fem/thermal"
	"eddyrz/geometry"
	"eddyrz/geometry/material"
	"eddyrz/post/plot"
)

func readJob(t testing.TB, name string) *geometry.Job {
	t.Helper()
	job, err := geometry.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	return job
}

// The zinc slug melts in part: the run must close its energy balance (Joule energy from the field solutions =
// enthalpy rise incl. latent heat + convection + radiation) within 0.5 %, melt some metal (the field is solved
// again when the liquid's resistivity, 5.8 times the solid's, moves the power) and report the losses with the
// right signs. The radiation loss must lie between the Stefan–Boltzmann bounds of the coldest and hottest
// surface states over the run.
func TestZincSlugMeltEnergyBalance(t *testing.T) {
	job := readJob(t, "zinc-slug.toml")
	res, err := RunJob(job, Options{Duration: 12})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("steps %d, solves %d, E_in %.5g J, stored %.5g J, conv %.4g J, rad %.4g J, balance %.2e, liquid %.3g cm³, field %v, heat %v",
		res.Steps, res.Solves, res.EnergyIn, res.Energy.Stored, res.Energy.Convection, res.Energy.Radiation,
		res.EnergyBalanceError, res.LiquidVolume*1e6, res.FieldTime, res.HeatTime)
	if !(res.EnergyBalanceError < 0.005) {
		t.Errorf("energy balance error %.3g, want < 0.5 %%", res.EnergyBalanceError)
	}
	// The heat solver's own bookkeeping of the source must be the energy the field solutions delivered.
	if d := math.Abs(res.Energy.Source-res.EnergyIn) / res.EnergyIn; d > 1e-9 {
		t.Errorf("heat solver got %.8g J of source, the field delivered %.8g J", res.Energy.Source, res.EnergyIn)
	}
	if !(res.LiquidVolume > 0) {
		t.Errorf("nothing melted (final hottest %.1f °C, melting point %.1f °C)", celsius(res.History[len(res.History)-1].TMax),
			celsius(job.Parts[0].Material.Melting))
	}
	if res.Solves < 2 {
		t.Errorf("only %d field solves: resistivity changes went unnoticed", res.Solves)
	}
	if !(res.Energy.Convection > 0 && res.Energy.Radiation > 0) {
		t.Errorf("losses convection %g J, radiation %g J: want both positive", res.Energy.Convection, res.Energy.Radiation)
	}
	// Stefan–Boltzmann bounds: the surface area of the slug times εσ(T⁴ − T_amb⁴) at the coldest and hottest
	// temperatures of the run, times the duration.
	p := job.Parts[0]
	area := 2*math.Pi*p.Radius*p.Height + 2*math.Pi*p.Radius*p.Radius
	eps, amb := job.Heating.Emissivity, job.Heating.Ambient
	var lo, hi float64
	for i := 1; i < len(res.History); i++ {
		s, dt := res.History[i], res.History[i].T-res.History[i-1].T
		lo += dt * area * eps * thermal.StefanBoltzmann * (math.Pow(res.History[i-1].TMin, 4) - math.Pow(amb, 4))
		hi += dt * area * eps * thermal.StefanBoltzmann * (math.Pow(s.TMax, 4) - math.Pow(amb, 4))
	}
	if r := res.Energy.Radiation; r < lo || r > hi {
		t.Errorf("radiation loss %.4g J outside the Stefan–Boltzmann bounds [%.4g, %.4g] J", r, lo, hi)
	}
	// Temperatures only rise under a steady heat input far above the losses.
	for i := 1; i < len(res.History); i++ {
		if res.History[i].TMax < res.History[i-1].TMax-1e-6 {
			t.Errorf("hottest point fell from %.2f K to %.2f K at %g s", res.History[i-1].TMax, res.History[i].TMax, res.History[i].T)
		}
	}
}

// Stopping on the stop part's coldest point: the run ends at the step that crosses the target, and the time to
// target interpolates inside that step.
func TestZincSlugTimeToTarget(t *testing.T) {
	job := readJob(t, "zinc-slug.toml")
	res, err := RunJob(job, Options{MaxDuration: 60})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Reached {
		t.Fatalf("target %.0f °C not reached in %g s (coldest %.1f °C)", celsius(job.Heating.StopTemperature),
			res.History[len(res.History)-1].T, celsius(res.History[len(res.History)-1].TMin))
	}
	n := len(res.History)
	last, prev := res.History[n-1], res.History[n-2]
	target := job.Heating.StopTemperature
	if !(last.StopCold >= target && prev.StopCold < target) {
		t.Errorf("stop part's coldest point %.2f K → %.2f K around the target %.2f K", prev.StopCold, last.StopCold, target)
	}
	if !(res.TargetTime > prev.T && res.TargetTime <= last.T) {
		t.Errorf("time to target %g s outside the last step [%g, %g] s", res.TargetTime, prev.T, last.T)
	}
	// Probe temperatures lie between the extremes.
	for _, s := range res.History {
		for k, v := range s.Probes {
			if v < s.TMin-1e-9 || v > s.TMax+1e-9 {
				t.Errorf("t=%g s: probe %d at %.3f K outside [%.3f, %.3f] K", s.T, k, v, s.TMin, s.TMax)
			}
		}
	}
	// Outputs: JSON keys, CSV shape, charts and a map.
	var buf bytes.Buffer
	if err := res.Report().WriteJSON(&buf); err != nil {
		t.Fatal(err)
	}
	var js map[string]any
	if err := json.Unmarshal(buf.Bytes(), &js); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"time_to_target_s", "energy_balance_error", "history", "resolve_rule", "resolve_tolerance"} {
		if _, ok := js[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if got := js["time_to_target_s"].(float64); got != res.TargetTime {
		t.Errorf("JSON time_to_target_s %g, want %g", got, res.TargetTime)
	}
	h0 := js["history"].([]any)[0].(map[string]any)
	for _, k := range []string{"t_s", "power_w", "t_max_c", "t_min_c"} {
		if _, ok := h0[k]; !ok {
			t.Errorf("JSON history lacks %q", k)
		}
	}
	if c := h0["t_min_c"].(float64); math.Abs(c-celsius(job.Heating.Initial)) > 1e-9 {
		t.Errorf("history starts at %g °C, want the initial %g °C", c, celsius(job.Heating.Initial))
	}
	buf.Reset()
	if err := res.WriteCSV(&buf); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(res.History)+1 || len(rows[0]) != 2+1+1+2+2+1 {
		t.Errorf("CSV %d rows × %d columns, want %d × %d", len(rows), len(rows[0]), len(res.History)+1, 9)
	}
	if _, err := res.TemperatureChart(); err != nil {
		t.Error(err)
	}
	if _, err := res.PowerChart(); err != nil {
		t.Error(err)
	}
	if len(res.Maps) == 0 || res.Maps[len(res.Maps)-1].T != last.T {
		t.Fatalf("maps %d, the last must be the final state", len(res.Maps))
	}
	fig, err := res.MapFigure(res.Maps[len(res.Maps)-1])
	if err != nil {
		t.Fatal(err)
	}
	if err := plot.Save(fig, filepath.Join(t.TempDir(), "map.png"), 12, 10); err != nil {
		t.Error(err)
	}
	var txt strings.Builder
	if err := res.Report().WriteText(&txt); err != nil || !strings.Contains(txt.String(), "target reached") {
		t.Errorf("summary: %v\n%s", err, txt.String())
	}
}

// The Curie transition on the bar-end heater with the coil current held. Below Curie the steel's μr is 50 (the
// library's linear approximation); the surface-impedance scaling P ∝ √(ρ μr) (at a held surface field) says the
// power of a surface layer falls by √50 ≈ 7 when it turns non-magnetic at 770 °C (ρ is continuous there),
// while below Curie the power rises with the surface temperature as √ρ (ρ: 0.16 → 1.1 μΩ·m from 20 to 770 °C,
// up to 2.6 times). After Curie the skin depth (≈ 9.6 mm at 3 kHz) is half the bar radius, so the bar takes
// more than the surface-impedance limit: we assert the rise first (peak above 1.3 times the start), then a fall
// to below half the peak once the surface is past Curie.
func TestBilletCuriePowerDrop(t *testing.T) {
	job := readJob(t, "billet-coarse.toml")
	res, err := RunJob(job, Options{Duration: 7, HoldCurrent: true})
	if err != nil {
		t.Fatal(err)
	}
	peak, ip := 0.0, 0
	for i, s := range res.History {
		t.Logf("t %4.1f s  P %8.0f W  I %6.0f A  hottest %6.1f °C  coldest %6.1f °C  solve %v", s.T, s.Power,
			s.CoilCurrent[0], celsius(s.TMax), celsius(s.TMin), s.Solved)
		if s.Power > peak {
			peak, ip = s.Power, i
		}
	}
	p0, pEnd := res.History[0].Power, res.History[len(res.History)-1].Power
	curie := job.Parts[0].Material.Curie
	if !(peak > 1.3*p0) {
		t.Errorf("power before Curie peaked at %.0f W from %.0f W: want a rise of at least 30 %% (P ∝ √ρ)", peak, p0)
	}
	if !(res.History[ip].TMax < curie+400) {
		t.Errorf("power peaked when the surface was at %.0f °C, well past Curie", celsius(res.History[ip].TMax))
	}
	if !(pEnd < 0.5*peak) {
		t.Errorf("power after Curie %.0f W, peak %.0f W: want a drop below half", pEnd, peak)
	}
	for _, s := range res.History {
		if math.Abs(s.CoilCurrent[0]-res.History[0].CoilCurrent[0]) > 1e-9*s.CoilCurrent[0] {
			t.Fatalf("coil current moved to %g A with the current held", s.CoilCurrent[0])
		}
	}
	if !(res.EnergyBalanceError < 0.005) {
		t.Errorf("energy balance error %.3g", res.EnergyBalanceError)
	}
}

// The thermal adapter passes the library's properties through and places the melting interval.
func TestThermalAdapter(t *testing.T) {
	lib := map[string]bool{"steel": true, "zinc-alloy": true, "copper": false}
	for name, melts := range lib {
		m, ok := material.Builtin(name)
		if !ok {
			t.Fatalf("no material %q", name)
		}
		a := Thermal(m)
		for _, T := range []float64{300, 800, 1200} {
			if a.Conductivity(T) != m.ThermalConductivity(T) || a.Density(T) != m.Density(T) || a.SpecificHeat(T) != m.SpecificHeat(T) {
				t.Errorf("%s at %g K: properties differ from the library's", name, T)
			}
		}
		mp := a.(thermal.PhaseChanger).Melting()
		if melts && (mp.Point != m.Melting || mp.Latent != m.Latent) {
			t.Errorf("%s: melting %+v, library %g K, %g J/kg", name, mp, m.Melting, m.Latent)
		}
		if !melts && mp.Point != 0 && math.IsInf(m.Melting, 0) {
			t.Errorf("%s: melting %+v for a material that does not melt", name, mp)
		}
	}
}

// The snapshot thinner keeps about evenly spaced maps for any run length, ending with the final state.
func TestThinner(t *testing.T) {
	for _, n := range []int{3, 17, 100, 1000} {
		k := newThinner(4)
		for i := 0; i <= n; i++ {
			k.offer(float64(i), nil)
		}
		if len(k.snaps) > 8 {
			t.Errorf("%d offers: %d kept", n, len(k.snaps))
		}
		got := k.pick(float64(n), nil)
		if got[len(got)-1].T != float64(n) {
			t.Errorf("%d offers: last map at %g", n, got[len(got)-1].T)
		}
		for i := 1; i < len(got); i++ {
			if got[i].T <= got[i-1].T {
				t.Errorf("%d offers: maps not increasing in time: %v", n, got)
			}
		}
		if n >= 100 && len(got) != 4 {
			t.Errorf("%d offers: %d maps, want 4", n, len(got))
		}
	}
}

func TestNoHeatingSection(t *testing.T) {
	job := readJob(t, "zinc-slug.toml").Copy()
	job.Heating = nil
	if _, err := RunJob(job, Options{}); err == nil || !strings.Contains(err.Error(), "no [heating]") {
		t.Errorf("got %v", err)
	}
}
