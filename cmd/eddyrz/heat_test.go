package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"testing"

	"eddyrz/geometry"
)

// The heat command runs the zinc slug to its stop temperature and writes its files; --json carries the keys
// the issue asks for.
func TestHeatCommandJSON(t *testing.T) {
	dir := t.TempDir()
	var buf bytes.Buffer
	c := newHeatCmd(&buf, &bytes.Buffer{})
	c.SetArgs([]string{"../../post/heating/testdata/zinc-slug.toml", "--json", "--out", dir, "--maps", "1,2"})
	if err := c.Execute(); err != nil {
		t.Fatal(err)
	}
	var rep map[string]any
	if err := json.Unmarshal(buf.Bytes(), &rep); err != nil {
		t.Fatalf("stdout is not JSON: %v\n%s", err, buf.String())
	}
	if v, ok := rep["time_to_target_s"].(float64); !ok || !(v > 0) {
		t.Errorf("time_to_target_s = %v", rep["time_to_target_s"])
	}
	if v, ok := rep["energy_balance_error"].(float64); !ok || !(v < 0.005) {
		t.Errorf("energy_balance_error = %v", rep["energy_balance_error"])
	}
	hist, _ := rep["history"].([]any)
	if len(hist) < 2 {
		t.Fatalf("history has %d entries", len(hist))
	}
	for _, k := range []string{"t_s", "power_w", "t_max_c", "t_min_c"} {
		if _, ok := hist[1].(map[string]any)[k]; !ok {
			t.Errorf("history entry lacks %q", k)
		}
	}
	for _, f := range []string{"heating.json", "history.csv", "summary.txt", "temperature.png", "power.svg", "map-1s.png", "map-2s.png"} {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
}

// A job without [heating] is an input error (exit status 2), and nothing is written.
func TestHeatCommandNoHeating(t *testing.T) {
	dir := t.TempDir()
	c := newHeatCmd(&bytes.Buffer{}, &bytes.Buffer{})
	c.SetArgs([]string{"../../examples/levitation-slug.toml", "--out", filepath.Join(dir, "out")})
	err := c.Execute()
	var in *geometry.InputError
	if !errors.As(err, &in) || exitCode(err) != exitInput {
		t.Fatalf("got %v (exit %d)", err, exitCode(err))
	}
	if _, err := os.Stat(filepath.Join(dir, "out")); !os.IsNotExist(err) {
		t.Errorf("output directory written for a failed run")
	}
}
