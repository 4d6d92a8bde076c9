package sparse

import (
	"fmt"
	"math"
	"os"
	"runtime"
	"runtime/metrics"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// peakHeap samples the bytes of live and not yet reused heap spans (runtime/metrics, which unlike
// runtime.ReadMemStats does not stop the world and so does not disturb the timed code) every 20 ms while fn runs,
// and returns the peak above the starting level, in bytes (sampling can miss short spikes).
func peakHeap(fn func()) uint64 {
	runtime.GC()
	sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}, {Name: "/memory/classes/heap/unused:bytes"}}
	inuse := func() uint64 {
		metrics.Read(sample)
		return sample[0].Value.Uint64() + sample[1].Value.Uint64()
	}
	base := inuse()
	var peak atomic.Uint64
	stop := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		t := time.NewTicker(20 * time.Millisecond)
		defer t.Stop()
		for {
			select {
			case <-stop:
				return
			case <-t.C:
				if v := inuse(); v > peak.Load() {
					peak.Store(v)
				}
			}
		}
	}()
	fn()
	close(stop)
	wg.Wait()
	p := max(peak.Load(), inuse())
	if p < base {
		return 0
	}
	return p - base
}

// reportCPU reports the process CPU time per iteration since cpu0 (all goroutines, including the runtime's), as
// "cpu-s/op": on a shared machine it is steadier than the wall time.
func reportCPU(b *testing.B, cpu0 time.Duration) {
	if cpu0 > 0 {
		b.ReportMetric((processCPU()-cpu0).Seconds()/float64(b.N), "cpu-s/op")
	}
}

var benchSizes = []struct {
	name string
	n    int
	long bool
}{{"n=20k", 20000, false}, {"n=100k", 100000, false}, {"n=400k", 400000, false}, {"n=1.5M", 1500000, true}}

// BenchmarkSolve times order + factor + solve on the axisymmetric test matrices (two border rows).
func BenchmarkSolve(b *testing.B) {
	for _, sz := range benchSizes {
		b.Run(sz.name, func(b *testing.B) {
			if sz.long && testing.Short() {
				b.Skip("1.5M case skipped in -short")
			}
			a, xy, rhs := newAxi(gridSide(sz.n), 2).build()
			b.ReportAllocs()
			b.ResetTimer()
			cpu0 := processCPU()
			defer func() { reportCPU(b, cpu0) }()
			var st SymbolicStats
			var peak uint64
			for i := 0; i < b.N; i++ {
				peak = max(peak, peakHeap(func() {
					s, err := Analyze(a, Options{Coords: xy})
					if err != nil {
						b.Fatal(err)
					}
					f, err := s.Factor(a)
					if err != nil {
						b.Fatal(err)
					}
					x := make([]complex128, a.N)
					if _, err := f.Solve(x, rhs); err != nil {
						b.Fatal(err)
					}
					st = s.Stats()
				}))
			}
			b.ReportMetric(float64(st.NnzL), "nnzL")
			b.ReportMetric(float64(peak)/(1<<20), "peakMiB")
			b.ReportMetric(st.Flops, "cflops")
		})
	}
}

// BenchmarkRefactor times Factor + Solve with the Symbolic reused, as in a frequency sweep.
func BenchmarkRefactor(b *testing.B) {
	for _, sz := range benchSizes[:3] {
		b.Run(sz.name, func(b *testing.B) {
			a, xy, rhs := newAxi(gridSide(sz.n), 2).build()
			s, err := Analyze(a, Options{Coords: xy})
			if err != nil {
				b.Fatal(err)
			}
			x := make([]complex128, a.N)
			b.ReportAllocs()
			b.ResetTimer()
			cpu0 := processCPU()
			defer func() { reportCPU(b, cpu0) }()
			for i := 0; i < b.N; i++ {
				f, err := s.Factor(a)
				if err != nil {
					b.Fatal(err)
				}
				if _, err := f.Solve(x, rhs); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkMatrixMarket solves the system in the files named by EDDYRZ_BENCH_A (coordinate complex symmetric,
// lower triangle) and EDDYRZ_BENCH_B (array complex general) with graph-only ordering, reporting the seconds of
// each phase and the scaled residual.
func BenchmarkMatrixMarket(b *testing.B) {
	pa, pb := os.Getenv("EDDYRZ_BENCH_A"), os.Getenv("EDDYRZ_BENCH_B")
	if pa == "" || pb == "" {
		b.Skip("EDDYRZ_BENCH_A / EDDYRZ_BENCH_B not set")
	}
	a, rhs := readBenchSystem(b, pa, pb)
	b.ResetTimer()
	var to, tf, ts time.Duration
	var res float64
	for i := 0; i < b.N; i++ {
		t0 := time.Now()
		s, err := Analyze(a, Options{})
		if err != nil {
			b.Fatal(err)
		}
		t1 := time.Now()
		f, err := s.Factor(a)
		if err != nil {
			b.Fatal(err)
		}
		t2 := time.Now()
		x := make([]complex128, a.N)
		info, err := f.Solve(x, rhs)
		if err != nil {
			b.Fatal(err)
		}
		t3 := time.Now()
		to, tf, ts, res = to+t1.Sub(t0), tf+t2.Sub(t1), ts+t3.Sub(t2), info.Residual
		b.ReportMetric(float64(s.Stats().NnzL), "nnzL")
	}
	nb := float64(b.N)
	b.ReportMetric(to.Seconds()/nb, "order-s")
	b.ReportMetric(tf.Seconds()/nb, "factor-s")
	b.ReportMetric(ts.Seconds()/nb, "solve-s")
	// The benchmark line prints metrics with few decimals: report the scaled residual as −log10 (digits).
	b.ReportMetric(-math.Log10(math.Max(res, 1e-300)), "residual-digits")
}

func readBenchSystem(b *testing.B, pa, pb string) (*Matrix, []complex128) {
	fa, err := os.Open(pa)
	if err != nil {
		b.Fatal(err)
	}
	defer fa.Close()
	a, err := ReadMatrixMarket(fa)
	if err != nil {
		b.Fatal(err)
	}
	fb, err := os.Open(pb)
	if err != nil {
		b.Fatal(err)
	}
	defer fb.Close()
	rhs, err := ReadVector(fb)
	if err != nil {
		b.Fatal(err)
	}
	if len(rhs) != a.N {
		b.Fatal(fmt.Errorf("rhs length %d for N=%d", len(rhs), a.N))
	}
	return a, rhs
}

// BenchmarkRefactorInPlace times Factor.Refactor + Solve on one Factor, its storage reused, as a frequency sweep
// that keeps its factor does.
func BenchmarkRefactorInPlace(b *testing.B) {
	for _, sz := range benchSizes[:3] {
		b.Run(sz.name, func(b *testing.B) {
			a, _, f, rhs := factoredAxi(b, sz.n)
			x := make([]complex128, a.N)
			b.ReportAllocs()
			b.ResetTimer()
			cpu0 := processCPU()
			defer func() { reportCPU(b, cpu0) }()
			for i := 0; i < b.N; i++ {
				if err := f.Refactor(a); err != nil {
					b.Fatal(err)
				}
				if _, err := f.Solve(x, rhs); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkApply times one forward, diagonal and back substitution (Factor.Apply), the step a frequency sweep
// repeats per point and an iterative solve per iteration, reporting the stored entries of L streamed per second.
func BenchmarkApply(b *testing.B) {
	for _, sz := range benchSizes[:3] {
		b.Run(sz.name, func(b *testing.B) {
			a, s, f, rhs := factoredAxi(b, sz.n)
			x := make([]complex128, a.N)
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				f.Apply(x, rhs)
			}
			stored := float64(s.lOff[len(s.lOff)-1])
			b.ReportMetric(stored, "storedL")
			b.ReportMetric(2*stored*float64(b.N)/b.Elapsed().Seconds()/1e9, "G-entries/s")
		})
	}
}

// factoredAxi builds the axisymmetric test system of about n unknowns (two border rows), analyses and factors it.
func factoredAxi(tb testing.TB, n int) (*Matrix, *Symbolic, *Factor, []complex128) {
	tb.Helper()
	a, xy, rhs := newAxi(gridSide(n), 2).build()
	s, err := Analyze(a, Options{Coords: xy})
	if err != nil {
		tb.Fatal(err)
	}
	f, err := s.Factor(a)
	if err != nil {
		tb.Fatal(err)
	}
	return a, s, f, rhs
}
