package sparse

import (
	"fmt"
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
