package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const sweepTestJob = "../../post/hardware/testdata/ring-heater.toml"

func TestSweepCommand(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "sw")
	if d := os.Getenv("EDDYRZ_SWEEP_TEST_OUT"); d != "" {
		dir = d // keep the files for a look
	}
	var buf bytes.Buffer
	c := newSweepCmd(&buf)
	c.SetArgs([]string{sweepTestJob, "--from", "5kHz", "--to", "40 kHz", "--points", "4", "--out", dir})
	if err := c.Execute(); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"sweep.csv", "sweep.json", "sweep-resistance.png", "sweep-inductance.svg",
		"sweep-quality.png", "sweep-power.png", "sweep-efficiency.png"} {
		if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
			t.Errorf("missing %s: %v", name, err)
		}
	}
	f, err := os.Open(filepath.Join(dir, "sweep.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 5 || rows[1][0] != "5000" || rows[4][0] != "40000" {
		t.Errorf("CSV: %d rows, first column %v", len(rows), rows)
	}
	out := buf.String()
	t.Logf("summary:\n%s", out)
	for _, s := range []string{"R (mΩ)", "L (µH)", "efficiency", "4 points"} {
		if !strings.Contains(out, s) {
			t.Errorf("summary lacks %q:\n%s", s, out)
		}
	}
	if len(strings.Split(strings.TrimSpace(out), "\n")) < 6 {
		t.Errorf("summary too short:\n%s", out)
	}

	buf.Reset()
	c = newSweepCmd(&buf)
	c.SetArgs([]string{sweepTestJob, "--from", "10kHz", "--to", "20kHz", "--points", "2", "--spacing", "linear",
		"--workers", "1", "--json", "--out", filepath.Join(t.TempDir(), "j")})
	if err := c.Execute(); err != nil {
		t.Fatal(err)
	}
	var js struct {
		Points []struct {
			F float64 `json:"frequency_hz"`
		} `json:"points"`
	}
	if err := json.Unmarshal(buf.Bytes(), &js); err != nil {
		t.Fatalf("--json output: %v\n%s", err, buf.String())
	}
	if len(js.Points) != 2 || js.Points[0].F != 10e3 || js.Points[1].F != 20e3 {
		t.Errorf("--json points %+v", js.Points)
	}
}

// Bad frequency options are command-line errors (exit status 2) and write nothing.
func TestSweepCommandBadFlags(t *testing.T) {
	cases := [][]string{
		{"--from", "20kHz", "--to", "10kHz"},
		{"--from", "ten kHz"},
		{"--to", "5 m"},
		{"--spacing", "octave"},
		{"--points", "0"},
	}
	for _, args := range cases {
		dir := filepath.Join(t.TempDir(), "bad")
		c := newSweepCmd(&bytes.Buffer{})
		c.SilenceUsage, c.SilenceErrors = true, true
		c.SetArgs(append([]string{sweepTestJob, "--out", dir}, args...))
		err := c.Execute()
		var fe *flagError
		if !errors.As(err, &fe) || exitCode(err) != exitInput {
			t.Errorf("%v: error %v, want a command-line error", args, err)
		}
		if _, err := os.Stat(dir); err == nil {
			t.Errorf("%v: output written despite the error", args)
		}
	}
}
