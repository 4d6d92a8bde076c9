package post

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"slices"
	"strings"
	"testing"
)

// smallResult is a hand-made result with a NaN (no stress check) to exercise the writers without a solve.
func smallResult() *Result {
	return &Result{
		Frequency: 5e3, Nodes: 100, Triangles: 40, Unknowns: 90, BalanceError: 1e-12, StoredEnergy: 0.5,
		Efficiency: 0.8,
		Coils: []CoilResult{{Name: "main", Current: 100, Voltage: complex(10, 50), Impedance: complex(0.1, 0.5),
			Resistance: 0.1, Inductance: 0.5 / (2 * math.Pi * 5e3), QualityFactor: 5, PowerFactor: 0.196, Power: 1000,
			ReactivePower: 5000, Loss: 200, Turns: []TurnResult{{Name: "t1", Sense: 1, Strands: 1, Current: 100,
				LoopVoltage: complex(10, 50), Voltage: complex(10, 50), Loss: 200}}}},
		Parts: []PartResult{{Name: "billet", Power: 800, ForceZ: 1.5, ForceZStress: math.NaN(), StressDiff: math.NaN(),
			PeakDensity: 1e8, PeakR: 0.01, PeakZ: 0.02, SkinDepth: 1e-3, SkinShare: 0.86, Thirds: [3]float64{200, 400, 200}}},
	}
}

// keysOf returns the keys of a JSON object.
func keysOf(t *testing.T, v any) []string {
	t.Helper()
	m, ok := v.(map[string]any)
	if !ok {
		t.Fatalf("want a JSON object, got %T", v)
	}
	var k []string
	for key := range m {
		k = append(k, key)
	}
	return k
}

func hasKeys(t *testing.T, where string, v any, want ...string) {
	t.Helper()
	got := keysOf(t, v)
	for _, k := range want {
		if !slices.Contains(got, k) {
			t.Errorf("%s: key %q missing (have %v)", where, k, got)
		}
	}
}

// The JSON report carries the keys the command line and users rely on (task brief), complex numbers as
// {re, im}, and null for undefined numbers.
func TestJSONKeys(t *testing.T) {
	var buf bytes.Buffer
	if err := smallResult().Report().WriteJSON(&buf); err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
		t.Fatalf("report is not valid JSON: %v\n%s", err, buf.String())
	}
	hasKeys(t, "top", doc, "frequency_hz", "mesh", "balance_error", "coils", "parts", "efficiency",
		"stored_energy_j", "timing_s", "cautions")
	hasKeys(t, "mesh", doc["mesh"], "nodes", "triangles", "unknowns")
	hasKeys(t, "timing_s", doc["timing_s"], "mesh", "assemble", "factor", "solve", "total")
	coil := doc["coils"].([]any)[0]
	hasKeys(t, "coil", coil, "name", "current_a_rms", "voltage_v_rms", "resistance_ohm", "inductance_h",
		"quality_factor", "power_w", "turns")
	hasKeys(t, "coil voltage", coil.(map[string]any)["voltage_v_rms"], "re", "im")
	if v := coil.(map[string]any)["voltage_v_rms"].(map[string]any); v["re"] != 10.0 || v["im"] != 50.0 {
		t.Errorf("voltage %v, want {re: 10, im: 50}", v)
	}
	part := doc["parts"].([]any)[0].(map[string]any)
	hasKeys(t, "part", part, "name", "power_w", "force_z_n", "force_z_stress_n", "peak_power_density_w_m3",
		"peak_at_m", "skin_share")
	if part["force_z_stress_n"] != nil {
		t.Errorf("a skipped stress check must be null, got %v", part["force_z_stress_n"])
	}
	if at := part["peak_at_m"].([]any); len(at) != 2 || at[0] != 0.01 || at[1] != 0.02 {
		t.Errorf("peak_at_m = %v, want [0.01, 0.02]", at)
	}
	if c := doc["cautions"].([]any); len(c) < 3 {
		t.Errorf("want the safety cautions, got %v", c)
	}
}

func TestCSVHeaders(t *testing.T) {
	rep := smallResult().Report()
	for _, c := range []struct {
		name  string
		write func(*bytes.Buffer) error
		head  string
		rows  int
	}{
		{"turns", func(b *bytes.Buffer) error { return rep.WriteTurnsCSV(b) },
			"coil,turn,kind,sense,strands,current_re_a_rms,current_im_a_rms,loop_voltage_re_v_rms,loop_voltage_im_v_rms,voltage_share_re_v_rms,voltage_share_im_v_rms,loss_w", 1},
		{"parts", func(b *bytes.Buffer) error { return rep.WritePartsCSV(b) },
			"part,power_w,force_z_n,force_z_stress_n,force_z_rel_diff,force_r_n,peak_power_density_w_m3,peak_r_m,peak_z_m,skin_depth_m,skin_share,power_bottom_w,power_middle_w,power_top_w", 1},
	} {
		var buf bytes.Buffer
		if err := c.write(&buf); err != nil {
			t.Fatal(err)
		}
		recs, err := csv.NewReader(&buf).ReadAll()
		if err != nil {
			t.Fatalf("%s CSV unreadable: %v", c.name, err)
		}
		if got := strings.Join(recs[0], ","); got != c.head {
			t.Errorf("%s header\n got %s\nwant %s", c.name, got, c.head)
		}
		if len(recs) != 1+c.rows {
			t.Errorf("%s: %d data rows, want %d", c.name, len(recs)-1, c.rows)
		}
		for _, r := range recs[1:] {
			if len(r) != len(recs[0]) {
				t.Errorf("%s: row %v has %d fields, header %d", c.name, r, len(r), len(recs[0]))
			}
		}
	}
}

// The text summary states rms, gives units, and shows undefined numbers as n/a.
func TestWriteText(t *testing.T) {
	var buf bytes.Buffer
	if err := smallResult().Report().WriteText(&buf); err != nil {
		t.Fatal(err)
	}
	s := buf.String()
	for _, want := range []string{"100 A rms", "W/m³", "800 W", "5 kHz", "n/a", "rms", "caution:"} {
		if !strings.Contains(s, want) {
			t.Errorf("text report lacks %q:\n%s", want, s)
		}
	}
}
