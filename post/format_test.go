package post

import (
	"math"
	"testing"
)

func TestSI(t *testing.T) {
	for _, c := range []struct {
		x    float64
		unit string
		want string
	}{
		{300e3, "Hz", "300 kHz"},
		{1.5796e-7, "H", "158 nH"},
		{0.0088127, "Ω", "8.813 mΩ"},
		{-0.15718, "N", "-157.2 mN"},
		{25e3, "W", "25 kW"},
		{0, "W", "0 W"},
		{1, "A", "1 A"},
		{0.99999, "A", "1 A"},
		{math.NaN(), "W", "n/a"},
		{math.Inf(1), "W", "n/a"},
	} {
		if got := SI(c.x, c.unit); got != c.want {
			t.Errorf("SI(%g, %q) = %q, want %q", c.x, c.unit, got, c.want)
		}
	}
}
