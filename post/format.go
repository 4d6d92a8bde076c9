package post

import (
	"fmt"
	"math"
)

// SI formats x with four significant digits and the SI prefix that suits it ("12.5 kHz", "3.2 mm", "1.89 µH");
// "n/a" when x is not finite.
func SI(x float64, unit string) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "n/a"
	}
	if x == 0 {
		return "0 " + unit
	}
	prefixes := [...]struct {
		p string
		k float64
	}{{"G", 1e9}, {"M", 1e6}, {"k", 1e3}, {"", 1}, {"m", 1e-3}, {"µ", 1e-6}, {"n", 1e-9}, {"p", 1e-12}}
	a := math.Abs(x)
	for _, p := range prefixes {
		if a >= p.k*0.99995 {
			return fmt.Sprintf("%.4g %s%s", x/p.k, p.p, unit)
		}
	}
	return fmt.Sprintf("%.4g %s", x, unit)
}
