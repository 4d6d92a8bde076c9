package plot

import (
	"image/color"
	"math"
	"math/rand"
	"testing"
)

func labOf(c color.NRGBA) okLab {
	return labFromLinear(srgbDecode(float64(c.R)/255), srgbDecode(float64(c.G)/255), srgbDecode(float64(c.B)/255))
}

func dist(p, q okLab) float64 { return math.Hypot(p.L-q.L, math.Hypot(p.A-q.A, p.B-q.B)) }

func TestOKLabReference(t *testing.T) {
	// Ottosson (2020) defines OKLab so that the D65 white point, linear sRGB (1, 1, 1), has L = 1 and a = b = 0,
	// and black has L = 0. The matrices are quoted from memory; this and the round trip check them.
	w := labFromLinear(1, 1, 1)
	if math.Abs(w.L-1) > 1e-4 || math.Abs(w.A) > 1e-4 || math.Abs(w.B) > 1e-4 {
		t.Errorf("white = %+v, want (1, 0, 0)", w)
	}
	if k := labFromLinear(0, 0, 0); k.L != 0 {
		t.Errorf("black L = %g", k.L)
	}
	rng := rand.New(rand.NewSource(1))
	for range 1000 {
		r, g, b := rng.Float64(), rng.Float64(), rng.Float64()
		r2, g2, b2 := labFromLinear(r, g, b).linearRGB()
		if math.Abs(r-r2)+math.Abs(g-g2)+math.Abs(b-b2) > 1e-6 {
			t.Fatalf("round trip (%g %g %g) -> (%g %g %g)", r, g, b, r2, g2, b2)
		}
	}
	for _, v := range []float64{0, 0.002, 0.0031308, 0.01, 0.5, 1} {
		if got := srgbDecode(srgbEncode(v)); math.Abs(got-v) > 1e-12 {
			t.Errorf("sRGB transfer round trip %g -> %g", v, got)
		}
	}
}

func TestColorMapLightnessMonotone(t *testing.T) {
	// In floating point, before 8-bit rounding, lightness is strictly increasing.
	prev := -1.0
	for i := 0; i <= 1000; i++ {
		r, g, b := emberAt(float64(i) / 1000)
		L := labFromLinear(srgbDecode(r), srgbDecode(g), srgbDecode(b)).L
		if L <= prev {
			t.Fatalf("lightness not increasing at t=%g: %g after %g", float64(i)/1000, L, prev)
		}
		prev = L
	}
	// The 8-bit table: steps of 4 entries (ΔL ≈ 0.012) are far above rounding, so they must rise too.
	cm := NewColorMap(0, 1)
	for i := 4; i < lutSize; i += 4 {
		if labOf(cm.lut[i]).L <= labOf(cm.lut[i-4]).L {
			t.Errorf("table lightness not increasing between %d and %d", i-4, i)
		}
	}
	lo, hi := labOf(cm.lut[0]), labOf(cm.lut[lutSize-1])
	if hi.L-lo.L < 0.7 || dist(lo, hi) < 0.7 {
		t.Errorf("endpoints too close: %+v %+v", lo, hi)
	}
	// Neighbouring table entries are distinct colours nearly everywhere (a smooth map, no flat stretches).
	same := 0
	for i := 1; i < lutSize; i++ {
		if cm.lut[i] == cm.lut[i-1] {
			same++
		}
	}
	if same > 0 {
		t.Errorf("%d repeated neighbouring colours", same)
	}
}

func TestColorMapInterface(t *testing.T) {
	cm := NewColorMap(2, 5)
	tests := []struct {
		v    float64
		ok   bool
		want color.NRGBA
	}{
		{2, true, cm.lut[0]},
		{5, true, cm.lut[lutSize-1]},
		{3.5, true, cm.lut[lutSize/2]},
		{1.9, false, color.NRGBA{}},
		{5.1, false, color.NRGBA{}},
		{math.NaN(), false, color.NRGBA{}},
	}
	for _, tc := range tests {
		c, err := cm.At(tc.v)
		if (err == nil) != tc.ok {
			t.Errorf("At(%g) error = %v", tc.v, err)
			continue
		}
		if tc.ok && c != tc.want {
			t.Errorf("At(%g) = %v, want %v", tc.v, c, tc.want)
		}
	}
	if n := len(cm.Palette(7).Colors()); n != 7 {
		t.Errorf("palette has %d colours", n)
	}
	cm.SetAlpha(0.5)
	if c, _ := cm.At(3); c.(color.NRGBA).A != 128 {
		t.Errorf("alpha not applied: %v", c)
	}
	defer func() {
		if recover() == nil {
			t.Error("SetAlpha(2) did not panic")
		}
	}()
	cm.SetAlpha(2)
}

func TestQualitativeColorsDistinct(t *testing.T) {
	for name, f := range map[string]func(int) color.NRGBA{"region": RegionColor, "series": SeriesColor} {
		for i := range 8 {
			for j := range i {
				if d := dist(labOf(f(i)), labOf(f(j))); d < 0.04 {
					t.Errorf("%s colours %d and %d too close: ΔE_ok = %.3f", name, i, j, d)
				}
			}
		}
	}
}
