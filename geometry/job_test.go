package geometry

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"eddyrz/geometry/material"
	"eddyrz/mesh"
)

// Each bad job file under testdata/jobs has one mistake; the reader must report it as one exact line.
func TestBadJobs(t *testing.T) {
	dir := "../testdata/jobs/"
	cases := []struct{ file, want string }{
		{"unknown-key.toml", "21: part.hieght: unknown key (did you mean height?)"},
		{"unknown-key-in-group.toml", "16: coil.turn.colour: unknown key (check the spelling; keys allowed in [coil.turn]: count, diameter, pitch, r, r_step, sense, shape, wall, z)"},
		{"missing-frequency.toml", `1: frequency: missing value (add for example frequency = "60 kHz")`},
		{"bad-unit.toml", `10: coil.turn.diameter: "6 mV" is not a length (write it like "12 mm")`},
		{"negative-size.toml", `20: part.radius: must be greater than zero, got -15 mm (give a positive length such as "12 mm")`},
		{"turn-overlaps-turn.toml", `12: coil.turn.r: turn 2 of coil "c" overlaps turn 1 of coil "c" (move or shrink one of them; conductors may touch but not overlap)`},
		{"turn-overlaps-part.toml", `22: part.z: part "billet" overlaps turn 1 of coil "c" (move or shrink one of them; conductors may touch but not overlap)`},
		{"part-across-axis.toml", "20: part.points: point 4 has r = -2 mm < 0, across the axis (the model is the half plane r ≥ 0: use r = 0 for points on the axis)"},
		{"turn-across-axis.toml", "12: coil.turn.r: turn 1 of this entry reaches r = -1 mm < 0, across the axis (move it outward: the model is the half plane r ≥ 0)"},
		{"unknown-material.toml", `23: part.material: unknown material "unobtainium" (use a built-in one: aluminium, aluminium-alloy, brass, copper, graphite, stainless-steel, steel, titanium, zinc-alloy; or define it in a [[material]] table)`},
		{"zero-frequency.toml", `2: frequency: must be above zero, got 0 Hz (for a nearly static field use a low frequency such as "1 Hz" instead of 0 Hz)`},
		{"tube-wall.toml", `11: coil.turn.wall: wall 3 mm is not less than the tube's outer radius 3 mm (make the wall thinner than half the diameter, or leave wall out for a solid round conductor)`},
		{"power-into-missing-part.toml", `7: coil.into: no part is named "slug" (name one of the [[part]] tables)`},
		{"two-drives.toml", `6: coil.current: give exactly one of current, voltage or power for coil "c", found 2 (for example current = "400 A")`},
		{"bad-sense.toml", "16: coil.turn.sense: must be 1 or -1, got 2 (-1 for turns wound the other way)"},
		{"syntax-error.toml", "5: coil.name: TOML syntax: strings cannot contain newlines (see docs/job-file.md for the file's form)"},
	}
	files, _ := filepath.Glob(dir + "*.toml")
	if len(files) != len(cases) {
		t.Errorf("%d files in %s, %d cases: every bad file needs a case", len(files), dir, len(cases))
	}
	for _, c := range cases {
		_, err := ReadFile(dir + c.file)
		var ie *InputError
		if !errors.As(err, &ie) {
			t.Errorf("%s: got %v, want an *InputError", c.file, err)
			continue
		}
		if got, want := err.Error(), dir+c.file+":"+c.want; got != want {
			t.Errorf("%s:\n got %s\nwant %s", c.file, got, want)
		}
		if strings.Contains(err.Error(), "\n") {
			t.Errorf("%s: message spans lines", c.file)
		}
	}
}

func readExample(t testing.TB, name string) *Job {
	t.Helper()
	j, err := ReadFile("../examples/" + name + ".toml")
	if err != nil {
		t.Fatal(err)
	}
	return j
}

var exampleNames = []string{"levitation-slug", "billet-heater", "crucible-melt"}

func TestExamplesRead(t *testing.T) {
	lev := readExample(t, "levitation-slug")
	if n := len(lev.Coils[0].Turns); n != 6 {
		t.Fatalf("levitation coil has %d turns, want 4 + 2", n)
	}
	senses := 0
	for _, tr := range lev.Coils[0].Turns {
		senses += tr.Sense
	}
	if senses != 2 {
		t.Errorf("sum of senses %d, want 4 - 2", senses)
	}
	// The fourth main turn: r = 8 + 3·2.5 mm, z = -12 + 3·6 mm.
	if tr := lev.Coils[0].Turns[3]; math.Abs(tr.R-0.0155) > 1e-15 || math.Abs(tr.Z-0.006) > 1e-15 {
		t.Errorf("turn 4 at (%g, %g)", tr.R, tr.Z)
	}
	if lev.Levitation == nil || lev.Levitation.Positions != 15 || len(lev.Levitation.Temperatures) != 3 {
		t.Errorf("levitation section: %+v", lev.Levitation)
	}
	b := readExample(t, "billet-heater")
	if b.Tank == nil || !b.Tank.Parallel || b.Tank.Capacitance != 1250e-6 || b.Cooling == nil || b.Cooling.Pressure != 4e5 {
		t.Errorf("tank/cooling: %+v %+v", b.Tank, b.Cooling)
	}
	if h := b.Heating; h == nil || h.StopProbe != "core" || h.StopPart != "" || math.Abs(h.StopTemperature-1423.15) > 1e-9 || len(h.Probes) != 2 {
		t.Errorf("heating: %+v", b.Heating)
	}
	if b.Coils[0].Drive != DrivePower || b.Coils[0].Into != "bar" || b.Coils[0].Value != 25e3 {
		t.Errorf("drive: %+v", b.Coils[0])
	}
	c := readExample(t, "crucible-melt")
	if c.Heating.Duration != 600 || c.Parts[0].Shape != Cup || c.Coils[0].Material.Name != "copper" {
		t.Errorf("crucible: %+v", c.Heating)
	}
}

func TestUserMaterialAndKeyLines(t *testing.T) {
	src := `frequency = 50000
applied_field = "8 kA/m"

[[material]]
name = "my-alloy"
resistivity = [["20 C", "5e-8 ohm m"], ["520 C", "1e-7 ohm m"]]
density = "8 g/cm3"

[[part]]
name = "a"
shape = "sphere"
radius = "5 mm"
z = 0
material = "my-alloy"

[[part]]
name = "b"
shape = "tube"
radius = "20 mm"
inner_radius = "25 mm"
height = "10 mm"
z = 0
material = "copper"
`
	_, err := Parse("user.toml", []byte(src))
	// The second [[part]]'s inner_radius is on line 20: the line index must tell the two parts apart.
	if err == nil || !strings.HasPrefix(err.Error(), "user.toml:20: part.inner_radius: inner radius 25 mm is not less than") {
		t.Fatalf("got %v", err)
	}
	j, err := Parse("user.toml", []byte(strings.Replace(src, `"25 mm"`, `"15 mm"`, 1)))
	if err != nil {
		t.Fatal(err)
	}
	m := j.Parts[0].Material
	if got := m.Resistivity(material.CToK(270)); math.Abs(got-7.5e-8) > 1e-20 {
		t.Errorf("user table interpolation: %g, want 7.5e-8", got)
	}
	if m.DensitySolid != 8000 {
		t.Errorf("density %g", m.DensitySolid)
	}
	// 8 kA/m rms applied: B = μ0·H.
	if math.Abs(j.AppliedB-material.Mu0*8000) > 1e-18 {
		t.Errorf("applied B %g", j.AppliedB)
	}
}

func TestIndexKeys(t *testing.T) {
	src := "a = 1 # c\n[[coil]]\nname = \"x\"\n[[coil.turn]]\nr = [\n 1,\n 2]\ns = \"\"\"\nz = 3\n\"\"\"\n[[coil.turn]]\n\"r\" = 2\n[[coil]]\n[[coil.turn]]\nq.w = 1\n"
	got := indexKeys(src)
	want := map[string]int{"a": 1, "coil[0]": 2, "coil[0].name": 3, "coil[0].turn[0]": 4, "coil[0].turn[0].r": 5,
		"coil[0].turn[0].s": 8, "coil[0].turn[1].r": 12, "coil[1].turn[0]": 14, "coil[1].turn[0].q.w": 15}
	for k, v := range want {
		if got[k] != v {
			t.Errorf("line of %s = %d, want %d", k, got[k], v)
		}
	}
	if _, ok := got["coil[0].turn[0].z"]; ok {
		t.Error("a line inside a multi-line string was taken for a key")
	}
}

func TestCopies(t *testing.T) {
	j := readExample(t, "levitation-slug")
	m, err := j.MovePart("slug", 0.005)
	if err != nil {
		t.Fatal(err)
	}
	if m.Parts[0].Z != 0.005 || j.Parts[0].Z != 0.002 {
		t.Errorf("MovePart: moved %g, original %g", m.Parts[0].Z, j.Parts[0].Z)
	}
	if _, err := j.MovePart("slug", 0.016); err == nil {
		t.Error("moving the slug into the top turns should fail")
	}
	if _, err := j.MovePart("nothing", 0); err == nil {
		t.Error("unknown part moved")
	}
	f := j.WithFrequency(1e5)
	if f.Frequency != 1e5 || j.Frequency != 3e5 {
		t.Error("WithFrequency")
	}
	h := j.WithPartTemperature("slug", 1000)
	if h.Parts[0].Temperature != 1000 || j.Parts[0].Temperature == 1000 {
		t.Error("WithPartTemperature")
	}
	l0, _ := j.Layout()
	l1, _ := h.Layout()
	// Liquid above 925 K: resistivity jumps, so the skin depth grows.
	if !(l1.Regions[len(l1.Regions)-1].SkinDepth > 1.3*l0.Regions[len(l0.Regions)-1].SkinDepth) {
		t.Error("temperature did not reach the layout")
	}
}

// FuzzParse feeds mutated job files to the reader: it may reject them, but must not panic, and accepted jobs
// must lay out or fail with an error.
func FuzzParse(f *testing.F) {
	for _, pat := range []string{"../examples/*.toml", "../testdata/jobs/*.toml"} {
		files, _ := filepath.Glob(pat)
		for _, name := range files {
			b, err := os.ReadFile(name)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(b)
		}
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		j, err := Parse("fuzz.toml", src)
		if err != nil {
			var ie *InputError
			if !errors.As(err, &ie) {
				t.Fatalf("error is not an *InputError: %v", err)
			}
			return
		}
		if len(j.Coils) > 0 && len(j.Coils[0].Turns) > 50 {
			return // keep each fuzz case quick
		}
		_, _ = j.Layout()
	})
}

var _ = mesh.Point{}

// The stop condition of [heating] names exactly one of a part or a probe.
func TestHeatingStop(t *testing.T) {
	base := `frequency = "10 kHz"
applied_field = "1 mT"
[[part]]
name = "p"
shape = "cylinder"
radius = "10 mm"
height = "20 mm"
z = 0
material = "steel"
[heating]
%s
  [[heating.probe]]
  name = "core"
  r = 0
  z = "10 mm"
`
	cases := []struct{ body, want string }{
		{"stop_temperature = \"900 C\"\nstop_probe = \"core\"", ""},
		{"stop_temperature = \"900 C\"\nstop_part = \"p\"", ""},
		{"stop_temperature = \"900 C\"", "give exactly one of stop_part"},
		{"stop_temperature = \"900 C\"\nstop_part = \"p\"\nstop_probe = \"core\"", "give exactly one of stop_part"},
		{"stop_temperature = \"900 C\"\nstop_probe = \"tip\"", `heating.stop_probe: no probe is named "tip"`},
		{"duration = \"10 s\"\nstop_probe = \"core\"", "need stop_temperature instead of duration"},
	}
	for _, c := range cases {
		_, err := Parse("h.toml", []byte(fmt.Sprintf(base, c.body)))
		switch {
		case c.want == "" && err != nil:
			t.Errorf("%q: %v", c.body, err)
		case c.want != "" && (err == nil || !strings.Contains(err.Error(), c.want)):
			t.Errorf("%q: got %v, want an error containing %q", c.body, err, c.want)
		}
	}
}
