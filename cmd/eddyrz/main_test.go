package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"eddyrz/geometry"
)

// runCmd runs the command line in-process and returns its exit status and streams.
func runCmd(args ...string) (code int, stdout, stderr string) {
	var o, e bytes.Buffer
	code = run(args, &o, &e)
	return code, o.String(), e.String()
}

// Every bad job file gives, through mesh and solve alike, exactly the reader's one-line message on stderr,
// exit status 2, and no output directory.
func TestBadJobsThroughCommands(t *testing.T) {
	files, err := filepath.Glob("../../testdata/jobs/*.toml")
	if err != nil || len(files) < 10 {
		t.Fatalf("want at least ten bad job files, found %d (%v)", len(files), err)
	}
	for _, f := range files {
		_, rerr := geometry.ReadFile(f)
		if rerr == nil {
			t.Errorf("%s: the reader accepts it", f)
			continue
		}
		for _, verb := range []string{"mesh", "solve"} {
			out := filepath.Join(t.TempDir(), "out")
			code, stdout, stderr := runCmd(verb, f, "--out", out)
			if code != exitInput {
				t.Errorf("%s %s: exit %d, want %d", verb, f, code, exitInput)
			}
			if want := rerr.Error() + "\n"; stderr != want {
				t.Errorf("%s %s: stderr\n%q\nwant\n%q", verb, f, stderr, want)
			}
			if stdout != "" {
				t.Errorf("%s %s: unexpected stdout %q", verb, f, stdout)
			}
			if _, err := os.Stat(out); !os.IsNotExist(err) {
				t.Errorf("%s %s: output directory exists after a failed run", verb, f)
			}
		}
	}
}

func TestUsageErrors(t *testing.T) {
	cases := [][]string{
		{"solve"},
		{"solve", "a.toml", "b.toml"},
		{"solve", "x.toml", "--no-such-flag"},
		{"no-such-command"},
	}
	for _, args := range cases {
		code, _, stderr := runCmd(args...)
		if code != exitInput {
			t.Errorf("%v: exit %d, want %d (stderr %q)", args, code, exitInput, stderr)
		}
	}
	// A missing file is a runtime failure, not a job-file mistake.
	if code, _, _ := runCmd("solve", filepath.Join(t.TempDir(), "missing.toml")); code == exitOK {
		t.Errorf("missing job file: exit 0")
	}
}

func TestVersion(t *testing.T) {
	code, out, _ := runCmd("version")
	if code != 0 || !strings.HasPrefix(out, "eddyrz ") {
		t.Errorf("version: exit %d, output %q", code, out)
	}
}

// The mesh command on every example: the JSON keys the issue names, and a minimum angle of at least 28°.
func TestMeshJSON(t *testing.T) {
	for _, ex := range []string{"levitation-slug", "billet-heater", "crucible-melt"} {
		t.Run(ex, func(t *testing.T) { checkMeshJSON(t, "../../examples/"+ex+".toml") })
	}
}

func checkMeshJSON(t *testing.T, job string) {
	out := filepath.Join(t.TempDir(), "m")
	code, stdout, stderr := runCmd("mesh", job, "--json", "--out", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var got struct {
		Nodes          int     `json:"nodes"`
		Triangles      int     `json:"triangles"`
		MinAngleDeg    float64 `json:"min_angle_deg"`
		MaxAspectRatio float64 `json:"max_aspect_ratio"`
		Regions        []struct {
			Name      string `json:"name"`
			Triangles int    `json:"triangles"`
		} `json:"regions"`
	}
	if err := json.Unmarshal([]byte(stdout), &got); err != nil {
		t.Fatalf("bad JSON: %v\n%s", err, stdout)
	}
	if got.Nodes == 0 || got.Triangles == 0 || len(got.Regions) < 3 {
		t.Errorf("empty mesh summary: %+v", got)
	}
	if got.MinAngleDeg < 28 {
		t.Errorf("min angle %.2f° < 28°", got.MinAngleDeg)
	}
	for _, r := range got.Regions {
		if r.Triangles == 0 {
			t.Errorf("region %q has no triangles", r.Name)
		}
	}
	for _, f := range []string{"mesh.png", "mesh.svg", "mesh.json"} {
		if st, err := os.Stat(filepath.Join(out, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s missing or empty", f)
		}
	}
}
