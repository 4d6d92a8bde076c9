package hardware

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"eddyrz/geometry"
	"eddyrz/post/plot"
)

func TestFrequencies(t *testing.T) {
	cases := []struct {
		from, to float64
		n        int
		sp       Spacing
		want     []float64
	}{
		{10e3, 1000e3, 3, LogSpacing, []float64{10e3, 100e3, 1000e3}},
		{10e3, 40e3, 4, LinearSpacing, []float64{10e3, 20e3, 30e3, 40e3}},
		{5e3, 5e3, 1, LogSpacing, []float64{5e3}},
	}
	for _, c := range cases {
		got, err := Frequencies(c.from, c.to, c.n, c.sp)
		if err != nil {
			t.Fatalf("%v: %v", c, err)
		}
		for i := range c.want {
			if rel(got[i], c.want[i]) > 1e-12 {
				t.Errorf("%s %g..%g: point %d is %g, want %g", c.sp, c.from, c.to, i, got[i], c.want[i])
			}
		}
	}
	// Property: log points have a constant ratio, linear a constant step, both increase and hit the ends.
	for n := 2; n < 60; n += 7 {
		for _, sp := range []Spacing{LogSpacing, LinearSpacing} {
			f, err := Frequencies(1e3, 2.5e5, n, sp)
			if err != nil {
				t.Fatal(err)
			}
			if len(f) != n || f[0] != 1e3 || f[n-1] != 2.5e5 {
				t.Fatalf("%s n=%d: %v", sp, n, f)
			}
			for i := 2; i < n; i++ {
				if sp == LogSpacing && rel(f[i]/f[i-1], f[1]/f[0]) > 1e-9 ||
					sp == LinearSpacing && rel(f[i]-f[i-1], f[1]-f[0]) > 1e-9 {
					t.Errorf("%s n=%d: uneven at %d: %v", sp, n, i, f)
				}
			}
		}
	}
	bad := []struct {
		from, to float64
		n        int
	}{{0, 1e3, 3}, {1e3, 1e3, 3}, {2e3, 1e3, 3}, {1e3, 2e3, 0}, {1e3, 2e3, 1}, {1e3, math.Inf(1), 3}, {math.NaN(), 1e3, 3}}
	for _, b := range bad {
		if _, err := Frequencies(b.from, b.to, b.n, LogSpacing); err == nil {
			t.Errorf("Frequencies(%g, %g, %d) must fail", b.from, b.to, b.n)
		}
	}
}

func TestParseSpacing(t *testing.T) {
	for s, want := range map[string]Spacing{"log": LogSpacing, "Linear": LinearSpacing, " lin ": LinearSpacing} {
		got, err := ParseSpacing(s)
		if err != nil || got != want {
			t.Errorf("ParseSpacing(%q) = %v, %v", s, got, err)
		}
	}
	if _, err := ParseSpacing("octave"); err == nil {
		t.Error("ParseSpacing(octave) must fail")
	}
}

// A sweep of the ring heater: each point equals a direct solve on the same mesh, the result does not depend on
// the number of workers, the power balances at every point, and R(f) rises while L(f) falls, as for every
// passive network of resistors and inductors (Foster's reactance theorem; e.g. Guillemin, Synthesis of Passive
// Networks, 1957, on RL impedances; from memory for the reference).
func TestSweepRingHeater(t *testing.T) {
	md, _ := load(t, "testdata/ring-heater.toml", nil)
	freqs, err := Frequencies(5e3, 80e3, 7, LogSpacing)
	if err != nil {
		t.Fatal(err)
	}
	one, err := SweepModel(md, freqs, 1)
	if err != nil {
		t.Fatal(err)
	}
	two, err := SweepModel(md, freqs, 2)
	if err != nil {
		t.Fatal(err)
	}
	sw, err := md.NewSweeper()
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range two.Points {
		q := one.Points[i]
		if p.Frequency != freqs[i] || q.Frequency != freqs[i] {
			t.Fatalf("point %d at %g Hz and %g Hz, want %g Hz", i, p.Frequency, q.Frequency, freqs[i])
		}
		if rel(p.Coils[0].Resistance, q.Coils[0].Resistance) > 1e-12 || rel(p.Coils[0].Inductance, q.Coils[0].Inductance) > 1e-12 {
			t.Errorf("%g Hz: one worker R %g L %g, two workers R %g L %g", p.Frequency,
				q.Coils[0].Resistance, q.Coils[0].Inductance, p.Coils[0].Resistance, p.Coils[0].Inductance)
		}
		if i%3 == 0 {
			s, err := sw.SolveAt(p.Frequency)
			if err != nil {
				t.Fatal(err)
			}
			c := s.Result.Coils[0]
			if rel(p.Coils[0].Resistance, c.Resistance) > 1e-9 || rel(p.Coils[0].Inductance, c.Inductance) > 1e-9 {
				t.Errorf("%g Hz: sweep R %g L %g, direct R %g L %g", p.Frequency, p.Coils[0].Resistance, p.Coils[0].Inductance, c.Resistance, c.Inductance)
			}
		}
		// The power-driven coil puts the job's 5 kW into the slug at every frequency.
		if rel(p.PartPower[0], 5e3) > 1e-9 {
			t.Errorf("%g Hz: slug power %g W, want the drive's 5 kW", p.Frequency, p.PartPower[0])
		}
		if bal := p.Coils[0].Power - p.Coils[0].Loss - p.PartPower[0]; math.Abs(bal) > 1e-6*p.Coils[0].Power {
			t.Errorf("%g Hz: terminal power %g W ≠ coil loss %g W + slug %g W", p.Frequency, p.Coils[0].Power, p.Coils[0].Loss, p.PartPower[0])
		}
		if rel(p.Efficiency, p.PartPower[0]/p.Coils[0].Power) > 1e-9 {
			t.Errorf("%g Hz: efficiency %g", p.Frequency, p.Efficiency)
		}
		if i > 0 {
			prev := two.Points[i-1].Coils[0]
			if !(p.Coils[0].Resistance > prev.Resistance) || !(p.Coils[0].Inductance < prev.Inductance) {
				t.Errorf("%g Hz: R %g (before %g) must rise and L %g (before %g) fall with frequency", p.Frequency,
					p.Coils[0].Resistance, prev.Resistance, p.Coils[0].Inductance, prev.Inductance)
			}
		}
	}

	var b bytes.Buffer
	if err := two.WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(freqs)+1 || rows[0][0] != "frequency_hz" || rows[0][1] != "resistance_ohm" ||
		rows[0][len(rows[0])-2] != "power_w:slug" || len(rows[1]) != len(rows[0]) {
		t.Errorf("CSV header %v, %d rows", rows[0], len(rows))
	}
	b.Reset()
	if err := two.WriteJSON(&b); err != nil {
		t.Fatal(err)
	}
	var js SweepJSON
	if err := json.Unmarshal(b.Bytes(), &js); err != nil {
		t.Fatal(err)
	}
	if len(js.Points) != len(freqs) || float64(js.Points[3].Coils[0].InductanceH) != two.Points[3].Coils[0].Inductance ||
		float64(js.Points[3].PartPowerW["slug"]) != two.Points[3].PartPower[0] {
		t.Errorf("JSON round trip lost data: %+v", js.Points[3])
	}
	figs, err := two.Figures(true)
	if err != nil {
		t.Fatal(err)
	}
	if len(figs) != 5 {
		t.Errorf("%d figures, want 5 (R, L, Q, power split, efficiency)", len(figs))
	}
	if err := plot.Save(figs[0].Plot, filepath.Join(t.TempDir(), figs[0].Name+".png"), 16, 10); err != nil {
		t.Fatal(err)
	}
}

// SweepJob meshes at the highest frequency: its model's skin depths are those of the top of the sweep.
// The bare stranded coil has a frequency-independent impedance: R and L are flat across the sweep.
func TestSweepJobStranded(t *testing.T) {
	job, err := geometry.ReadFile("testdata/stranded-series.toml")
	if err != nil {
		t.Fatal(err)
	}
	freqs := []float64{20e3, 1e3, 7e3}
	res, err := SweepJob(job, freqs, 0)
	if err != nil {
		t.Fatal(err)
	}
	if res.MeshFrequency != 20e3 || res.Points[0].Frequency != 1e3 || res.Points[2].Frequency != 20e3 {
		t.Errorf("mesh at %g Hz, points at %g..%g Hz", res.MeshFrequency, res.Points[0].Frequency, res.Points[2].Frequency)
	}
	c0 := res.Points[0].Coils[0]
	for _, p := range res.Points {
		c := p.Coils[0]
		if rel(c.Inductance, c0.Inductance) > 1e-9 || rel(c.Resistance, c0.Resistance) > 1e-9 {
			t.Errorf("%g Hz: R %g L %g differ from %g, %g", p.Frequency, c.Resistance, c.Inductance, c0.Resistance, c0.Inductance)
		}
	}
	// No parts: no efficiency chart.
	figs, err := res.Figures(false)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range figs {
		if strings.Contains(f.Name, "efficiency") {
			t.Error("a job without parts has no efficiency chart")
		}
	}
	if _, err := SweepModel(nil, nil, 1); err == nil {
		t.Error("an empty sweep must fail")
	}
}

// A dense sweep takes most points from the reduced basis; every one of them must still give a direct solve's R,
// L, coil loss and part power to 1e-8.
func TestSweepReducedBasisMatchesDirect(t *testing.T) {
	md, _ := load(t, "testdata/ring-heater.toml", nil)
	freqs, err := Frequencies(10e3, 100e3, 30, LogSpacing)
	if err != nil {
		t.Fatal(err)
	}
	res, err := SweepModel(md, freqs, 2)
	if err != nil {
		t.Fatal(err)
	}
	sw, err := md.NewSweeper()
	if err != nil {
		t.Fatal(err)
	}
	reduced := 0
	for _, p := range res.Points {
		if p.Basis > 0 {
			reduced++
		}
		d, err := sw.SolveAt(p.Frequency)
		if err != nil {
			t.Fatal(err)
		}
		c, q := d.Result.Coils[0], p.Coils[0]
		for _, v := range []struct {
			name      string
			got, want float64
		}{
			{"R", q.Resistance, c.Resistance}, {"L", q.Inductance, c.Inductance}, {"coil loss", q.Loss, c.Loss},
			{"part power", p.PartPower[0], d.Result.Parts[0].Power},
		} {
			if !(rel(v.got, v.want) <= 1e-8) {
				t.Errorf("%g Hz (basis %d, indicator %.2g): %s %.10g, direct %.10g", p.Frequency, p.Basis, p.Indicator, v.name, v.got, v.want)
			}
		}
	}
	t.Logf("%d of %d points from the reduced basis", reduced, len(freqs))
	if reduced < len(freqs)/2 {
		t.Errorf("only %d of %d points came from the reduced basis", reduced, len(freqs))
	}
}
