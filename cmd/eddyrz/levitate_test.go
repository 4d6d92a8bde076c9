package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

// levitate end to end on the example, narrowed to the equilibrium: the JSON on stdout carries the keys the issue
// names, and every file is written.
func TestLevitateJSON(t *testing.T) {
	dir := t.TempDir()
	var buf bytes.Buffer
	c := newLevitateCmd(&buf)
	c.SetArgs([]string{"../../examples/levitation-slug.toml", "--from", "7 mm", "--to", "10 mm", "--positions", "5",
		"--temperatures", "20 C, 700 C", "--float-at", "6 mm", "--json", "--out", dir})
	if err := c.Execute(); err != nil {
		t.Fatal(err)
	}
	var got struct {
		WeightN         *float64 `json:"weight_n"`
		HeightReference string   `json:"height_reference"`
		Curve           []struct {
			Z, F, P   *float64
			Impedance []map[string]any `json:"impedance"`
		} `json:"curve"`
		Equilibria []struct {
			Z      *float64 `json:"z_m"`
			K      *float64 `json:"stiffness_n_per_m"`
			Stable *bool    `json:"stable"`
		} `json:"equilibria"`
		Lateral     *struct{ Assumption string } `json:"lateral"`
		Temperature []map[string]any             `json:"temperature_sweep"`
		Float       *struct{ Possible bool }     `json:"float"`
		Warnings    []string                     `json:"warnings"`
		Cautions    []string                     `json:"cautions"`
	}
	raw := buf.Bytes()
	if err := json.Unmarshal(raw, &got); err != nil {
		t.Fatalf("stdout is not JSON: %v\n%s", err, raw)
	}
	var curve []map[string]any
	var top map[string]json.RawMessage
	_ = json.Unmarshal(raw, &top)
	_ = json.Unmarshal(top["curve"], &curve)
	for _, p := range curve {
		for _, k := range []string{"z_m", "force_z_n", "power_w", "impedance"} {
			if _, ok := p[k]; !ok {
				t.Errorf("curve point without %q", k)
			}
		}
	}
	if got.WeightN == nil || got.HeightReference != "centre" || len(curve) != 5 {
		t.Errorf("weight %v, reference %q, %d curve points", got.WeightN, got.HeightReference, len(curve))
	}
	if len(got.Equilibria) == 0 || got.Equilibria[0].Z == nil || got.Equilibria[0].K == nil || got.Equilibria[0].Stable == nil {
		t.Errorf("equilibria %+v", got.Equilibria)
	}
	if got.Lateral == nil || got.Lateral.Assumption == "" || len(got.Temperature) != 2 || got.Float == nil || !got.Float.Possible {
		t.Errorf("lateral %v, temperatures %d, float %v", got.Lateral, len(got.Temperature), got.Float)
	}
	if got.Cautions == nil || got.Warnings == nil {
		t.Error("warnings and cautions must be present (possibly empty)")
	}
	for _, f := range []string{"levitation.json", "curve.csv", "equilibria.csv", "temperature.csv", "lateral.csv", "summary.txt",
		"force.png", "force.svg", "power.png", "heating.svg"} {
		if st, err := os.Stat(filepath.Join(dir, f)); err != nil || st.Size() == 0 {
			t.Errorf("%s not written: %v", f, err)
		}
	}
}

// Bad flags are input errors (exit status 2) and write nothing.
func TestLevitateBadFlags(t *testing.T) {
	for _, args := range [][]string{
		{"--from", "3 mm"},
		{"--from", "three", "--to", "4 mm"},
		{"--temperatures", "hot"},
	} {
		dir := t.TempDir()
		var buf bytes.Buffer
		c := newLevitateCmd(&buf)
		c.SetArgs(append([]string{"../../examples/levitation-slug.toml", "--out", filepath.Join(dir, "o")}, args...))
		err := c.Execute()
		if err == nil || exitCode(err) != exitInput {
			t.Errorf("%v: error %v, want an input error", args, err)
		}
		if _, e := os.Stat(filepath.Join(dir, "o")); e == nil {
			t.Errorf("%v: output written despite the error", args)
		}
	}
}
