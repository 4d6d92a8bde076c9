package sparse

import (
	"fmt"
	"math/cmplx"
	"testing"
)

// BenchmarkKernel times the rank-update kernel gemvNeg on a 256-row tile with a 32-column panel, the shape
// rankUpdate feeds it; the metric is complex multiply-adds per second.
func BenchmarkKernel(b *testing.B) {
	for _, rows := range []int{16, 64, 256} {
		b.Run(fmt.Sprintf("rows=%d", rows), func(b *testing.B) {
			m, w := rows, make([]complex128, panelWidth)
			L := make([]complex128, m*panelWidth)
			for i := range L {
				L[i] = complex(float64(i%7), 1)
			}
			for i := range w {
				w[i] = complex(1e-9, float64(i))
			}
			d := make([]complex128, rows)
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				gemvNeg(d, L, m, 0, w)
			}
			b.ReportMetric(float64(rows*panelWidth)*float64(b.N)/b.Elapsed().Seconds()/1e9, "Gcmadd/s")
		})
	}
}

// TestGemv4: the vector kernel (when present) agrees with the portable loop to rounding, for even and odd
// lengths, and the portable loop matches a plain complex sum.
func TestGemv4(t *testing.T) {
	t.Logf("AVX2+FMA kernel: %v", hasAVX2FMA)
	for _, n := range []int{0, 1, 2, 3, 7, 8, 33, 256} {
		a := make([][]complex128, 4)
		for p := range a {
			a[p] = make([]complex128, n)
			for i := range a[p] {
				a[p][i] = complex(float64((i*7+p*3)%11)-5, float64((i*5+p)%9)-4)
			}
		}
		w := []complex128{1.5 - 2i, -0.25 + 1i, 3 + 0.5i, -1 - 1i}
		d1 := make([]complex128, n)
		for i := range d1 {
			d1[i] = complex(float64(i), -float64(i%3))
		}
		d2 := append([]complex128(nil), d1...)
		want := append([]complex128(nil), d1...)
		for i := range want {
			for p := 0; p < 4; p++ {
				want[i] -= w[p] * a[p][i]
			}
		}
		gemv4(d1, a[0], a[1], a[2], a[3], w)
		gemv4Go(d2, a[0], a[1], a[2], a[3], w)
		for i := range want {
			if cmplx.Abs(d1[i]-want[i]) > 1e-13*(1+cmplx.Abs(want[i])) || cmplx.Abs(d2[i]-want[i]) > 1e-13*(1+cmplx.Abs(want[i])) {
				t.Fatalf("n=%d i=%d: kernel %v, portable %v, want %v", n, i, d1[i], d2[i], want[i])
			}
		}
	}
}
