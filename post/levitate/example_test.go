package levitate

import (
	"math"
	"strconv"
	"testing"

	"eddyrz/geometry"
)

const exampleJob = "../../examples/levitation-slug.toml"

func readExample(t testing.TB) *geometry.Job {
	t.Helper()
	job, err := geometry.ReadFile(exampleJob)
	if err != nil {
		t.Fatal(err)
	}
	return job
}

// The levitation example (its own [levitation] section: −4…10 mm, 15 heights, 20/500/700 °C) must hold its slug
// in a stable equilibrium: F_z falls through m·g going up. Checks: the weight from the sphere's volume and the
// alloy's density (2700 kg/m³, the library's value), the refined equilibrium's residual, stability from both the
// refined stiffness and the sweep's slope, and the heating sweep: a stable height at every temperature, and an
// absorbed power that rises with the resistivity (strong skin effect, a/δ ≫ 1: P ∝ Hp(q)/σ ≈ (q − 1)ρ grows
// with ρ, reference/README.md §1), most of all on melting. (The stable height itself hardly moves here: the
// lift of a sphere in a uniform gradient falls with G(a/δ), but this slug sits close to the counter-wound turns,
// whose push down also weakens as the currents sink deeper, and the two nearly cancel: +0.01 mm from 20 °C to
// the liquid on the sweep mesh. No direction is asserted.)
func TestLevitationExample(t *testing.T) {
	job := readExample(t)
	res, err := Run(job, Options{})
	if err != nil {
		t.Fatal(err)
	}
	logResult(t, res)
	if res.HeightReference != RefCentre {
		t.Errorf("height reference %q, want %q for a sphere", res.HeightReference, RefCentre)
	}
	// 7 mm sphere, 2700 kg/m³, g_n: m = 4/3 π (7 mm)³ · 2700 = 3.8793 g (hand calculation).
	wantW := 4.0 / 3 * math.Pi * 343e-9 * 2700 * 9.80665
	if math.Abs(res.Weight-wantW) > 1e-9*wantW {
		t.Errorf("weight %.8g N, want %.8g N", res.Weight, wantW)
	}
	var stable *Equilibrium
	for i := range res.Equilibria {
		e := &res.Equilibria[i]
		if math.Abs(e.Residual) > 1e-3*res.Weight {
			t.Errorf("equilibrium at %.4g mm: residual %.3g N after refinement", e.Z*1e3, e.Residual)
		}
		if e.Stable {
			stable = e
		}
	}
	if stable == nil {
		t.Fatal("no stable equilibrium in the example")
	}
	// The sweep's own slope across the bracket must agree: F above the weight below z, below it above z.
	for i := 0; i+1 < len(res.Curve); i++ {
		a, b := res.Curve[i], res.Curve[i+1]
		if a.Z <= stable.Z && stable.Z <= b.Z && !(a.ForceZ > res.Weight && b.ForceZ < res.Weight) {
			t.Errorf("stable equilibrium at %.4g mm but the sweep brackets it with F = %.4g, %.4g N", stable.Z*1e3, a.ForceZ, b.ForceZ)
		}
	}
	if len(res.Temperature) != 3 {
		t.Fatalf("%d temperature points, want 3", len(res.Temperature))
	}
	prevP := 0.0
	for _, tp := range res.Temperature {
		if tp.StableZ == nil {
			t.Errorf("%.0f K: no stable equilibrium", tp.TemperatureK)
			continue
		}
		if !(*tp.PowerAtStable > prevP) {
			t.Errorf("%.0f K: power at the stable height %.4g W did not rise above %.4g W with the resistivity", tp.TemperatureK, *tp.PowerAtStable, prevP)
		}
		prevP = *tp.PowerAtStable
	}
	if !res.Temperature[2].Liquid || res.Temperature[1].Liquid {
		t.Errorf("phases: 500 °C liquid %v, 700 °C liquid %v; want solid, liquid", res.Temperature[1].Liquid, res.Temperature[2].Liquid)
	}
	if res.Lateral == nil || stable.Lateral == nil {
		t.Fatal("no lateral estimate")
	}
	// A counter-wound levitation coil is built to hold the melt laterally (Okress et al. 1952; common practice).
	if !stable.Lateral.Stable {
		t.Errorf("lateral estimate at the stable height: k_r = %.4g N/m, want > 0", stable.Lateral.Kr)
	}
}

func logResult(t *testing.T, res *Result) {
	t.Helper()
	t.Logf("weight %.5g N, %d solves, max ripple %.3g %%, mesh %+v", res.Weight, res.Solves, 100*res.MaxRipple, res.Mesh)
	for i, p := range res.Curve {
		o := math.NaN()
		if p.ForceZOther != nil {
			o = *p.ForceZOther
		}
		lat := ""
		if res.Lateral != nil {
			l := res.Lateral.Curve[i]
			lat = " " + formatLat(l)
		}
		t.Logf("  z %6.2f mm  F %.6g N (other %.6g)  P %.5g W  ripple %.2g%s", p.Z*1e3, p.ForceZ, o, p.Power, p.Ripple, lat)
	}
	for _, e := range res.Equilibria {
		lat := ""
		if e.Lateral != nil {
			lat = formatLat(*e.Lateral)
		}
		t.Logf("  equilibrium %.4f mm: F %.6g N, k_z %.4g N/m, stable %v, %d solves %s", e.Z*1e3, e.ForceZ, e.Stiffness, e.Stable, e.Solves, lat)
	}
	for _, tp := range res.Temperature {
		z := math.NaN()
		if tp.StableZ != nil {
			z = *tp.StableZ * 1e3
		}
		t.Logf("  T %.0f K: stable z %.4g mm, %d equilibria", tp.TemperatureK, z, len(tp.Equilibria))
	}
	for _, w := range res.Warnings {
		t.Logf("  warning: %s", w)
	}
}

func formatLat(l LateralPoint) string {
	return "k_r " + ftoa(l.Kr) + " N/m, small-body F " + ftoa(l.FzSmall) + " N, k_z " + ftoa(l.KzSmall)
}

func ftoa(x float64) string { return fmtG(x) }

func fmtG(x float64) string { return strconv.FormatFloat(x, 'g', 4, 64) }

// Mesh ripple: the part is re-meshed at every height, so mesh noise shows as ripple between neighbours. On a
// fine step (0.25 mm about the equilibrium, where the force curve is steep) a smooth force leaves a deviation
// of O(Δ⁴ d⁴F/dz⁴), far below the 0.5 % bar; what the test measures is the mesh.
func TestRippleNearEquilibrium(t *testing.T) {
	job := readExample(t)
	res, err := Run(job, Options{ZFrom: 7.5e-3, ZTo: 9.5e-3, Positions: 9, NoTemperatureSweep: true, NoLateral: true})
	if err != nil {
		t.Fatal(err)
	}
	logResult(t, res)
	if res.MaxRipple > 0.005 {
		t.Errorf("force ripple %.3g %% exceeds 0.5 %%", 100*res.MaxRipple)
	}
}
