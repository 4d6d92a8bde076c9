package sparse

import (
	"fmt"
	"math/cmplx"
	"testing"
)

// BenchmarkKernel times the rank-update tile kernel on a panelWidth-wide panel and the given number of rows,
// three target columns; the metric is complex multiply-adds per second.
func BenchmarkKernel(b *testing.B) {
	for _, rows := range []int{16, 64, 256} {
		b.Run(fmt.Sprintf("rows=%d", rows), func(b *testing.B) {
			m, k := rows, panelWidth
			L := make([]complex128, m*k)
			for i := range L {
				L[i] = complex(float64(i%7), 1)
			}
			W := make([]complex128, tileCols*k)
			for i := range W {
				W[i] = complex(1e-9, float64(i))
			}
			var c [3][]complex128
			for j := range c {
				c[j] = make([]complex128, rows)
			}
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				tile4x3(L, 0, m, W, 0, k, c, [3]int{}, rows/tileRows)
			}
			b.ReportMetric(float64(rows*k*tileCols)*float64(b.N)/b.Elapsed().Seconds()/1e9, "Gcmadd/s")
		})
	}
}

// TestTile4x3: the tile kernel agrees bitwise with its portable form (same fused operations per entry) and to
// rounding with a plain complex sum, for several panel widths and row-block counts, leaving the entries around
// the tile untouched.
func TestTile4x3(t *testing.T) {
	t.Logf("AVX2+FMA kernel: %v", hasAVX2FMA)
	for _, k := range []int{1, 2, 3, 7, 32} {
		for _, nb := range []int{1, 2, 5, 17} {
			m := tileRows*nb + 5 // L is m×k column-major; the tile starts at row 2
			L := make([]complex128, m*k)
			for i := range L {
				L[i] = complex(float64((i*7)%11)-5.5, float64((i*5)%9)-3.25)
			}
			W := make([]complex128, 1+tileCols*k)
			for i := range W {
				W[i] = complex(float64(i%5)-1.5, 0.75*float64(i%3)-1)
			}
			fill := func() ([3][]complex128, [3]int) {
				var c [3][]complex128
				for j := range c {
					c[j] = make([]complex128, tileRows*nb+3)
					for i := range c[j] {
						c[j][i] = complex(float64(i+j), -float64(i%4))
					}
				}
				return c, [3]int{1, 2, 3}
			}
			cv, co := fill()
			cg, _ := fill()
			want, _ := fill()
			tile4x3(L, 2, m, W, 1, k, cv, co, nb)
			tile4x3Go(L, 2, m, W, 1, k, cg, co, nb)
			for j := range want {
				for i := 0; i < tileRows*nb; i++ {
					var s complex128
					for p := 0; p < k; p++ {
						s += L[2+i+p*m] * W[1+j*k+p]
					}
					want[j][co[j]+i] -= s
				}
				for i := range want[j] {
					if cv[j][i] != cg[j][i] {
						t.Fatalf("k=%d nb=%d col %d row %d: kernel %v, portable %v (must be bitwise equal)", k, nb, j, i, cv[j][i], cg[j][i])
					}
					if cmplx.Abs(cv[j][i]-want[j][i]) > 1e-13*(1+cmplx.Abs(want[j][i])) {
						t.Fatalf("k=%d nb=%d col %d row %d: kernel %v, plain sum %v", k, nb, j, i, cv[j][i], want[j][i])
					}
				}
			}
		}
	}
}

// TestTile1x3: the single-row tile kernel agrees bitwise with its portable form and with tileEntry entry by
// entry, and to rounding with a plain complex sum, leaving its neighbours alone.
func TestTile1x3(t *testing.T) {
	for _, k := range []int{1, 4, 31} {
		for _, nr := range []int{0, 1, 2, 3, 6} {
			m := nr + 4
			L := make([]complex128, m*k)
			for i := range L {
				L[i] = complex(float64((i*5)%13)-6.5, float64((i*3)%7)-2.75)
			}
			W := make([]complex128, 2+tileCols*k)
			for i := range W {
				W[i] = complex(0.5*float64(i%7)-1.25, float64(i%4)-1.5)
			}
			fill := func() [3][]complex128 {
				var c [3][]complex128
				for j := range c {
					c[j] = make([]complex128, nr+2)
					for i := range c[j] {
						c[j][i] = complex(float64(2*i-j), float64(i%3))
					}
				}
				return c
			}
			co := [3]int{1, 0, 2}
			cv, cg, want := fill(), fill(), fill()
			tile1x3(L, 3, m, W, 2, k, cv, co, nr)
			tile1x3Go(L, 3, m, W, 2, k, cg, co, nr)
			for j := range want {
				w := W[2+j*k : 2+j*k+k]
				for i := 0; i < nr; i++ {
					want[j][co[j]+i] -= tileEntry(L, 3+i, m, w)
					var s complex128
					for p := 0; p < k; p++ {
						s += L[3+i+p*m] * w[p]
					}
					if d := want[j][co[j]+i] - (fill()[j][co[j]+i] - s); cmplx.Abs(d) > 1e-13*(1+cmplx.Abs(s)) {
						t.Fatalf("k=%d nr=%d col %d row %d: tileEntry off the plain sum by %v", k, nr, j, i, d)
					}
				}
				for i := range want[j] {
					if cv[j][i] != want[j][i] || cg[j][i] != want[j][i] {
						t.Fatalf("k=%d nr=%d col %d row %d: kernel %v, portable %v, tileEntry %v (must be bitwise equal)", k, nr, j, i, cv[j][i], cg[j][i], want[j][i])
					}
				}
			}
		}
	}
}

// TestRankUpdateColsDense: the tiled rank update of a front (panel columns in L, the rest packed in cb) equals a
// plain triple loop on the dense lower triangle, for fronts whose sizes leave every kind of edge (triangle rows,
// short tails, leftover columns, row-tile boundaries) and for arbitrary target-column ranges.
func TestRankUpdateColsDense(t *testing.T) {
	cases := []struct{ m, k, jb, je, c0, c1 int }{
		{1, 1, 0, 1, 1, 1}, {5, 2, 0, 1, 1, 5}, {9, 4, 1, 3, 3, 9}, {40, 7, 0, 5, 5, 40}, {40, 7, 0, 5, 8, 23},
		{300, 40, 0, 32, 32, 300}, {300, 40, 32, 40, 40, 300}, {611, 3, 0, 3, 3, 611}, {611, 100, 64, 96, 97, 450},
	}
	for _, tc := range cases {
		m, k, jb, je := tc.m, tc.k, tc.jb, tc.je
		m2 := m - k
		L := make([]complex128, m*k)
		for i := range L {
			L[i] = complex(float64((i*7)%13)-6, float64((i*3)%7)*0.5)
		}
		cb := make([]complex128, m2*(m2+1)/2)
		for i := range cb {
			cb[i] = complex(float64(i%9), 1)
		}
		bw := je - jb
		W := make([]complex128, bw*(m-je))
		for i := range W {
			W[i] = complex(float64(i%5)*0.25, -float64(i%3))
		}
		// Dense copy of the front's lower triangle.
		get := func(L, cb []complex128, i, c int) *complex128 {
			if c < k {
				return &L[c*m+i]
			}
			t := c - k
			return &cb[t*m2-t*(t-1)/2+i-c]
		}
		L0 := append([]complex128(nil), L...)
		cb0 := append([]complex128(nil), cb...)
		want := make([]complex128, m*m)
		for c := 0; c < m; c++ {
			for i := c; i < m; i++ {
				if c >= je || c < k {
					want[c*m+i] = *get(L0, cb0, i, c)
				}
			}
		}
		for c := tc.c0; c < tc.c1; c++ {
			for i := c; i < m; i++ {
				var s complex128
				for p := jb; p < je; p++ {
					s += L0[p*m+i] * W[(c-je)*bw+p-jb]
				}
				want[c*m+i] -= s
			}
		}
		rankUpdateCols(L, m, k, jb, je, tc.c0, tc.c1, W, cb)
		for c := je; c < m; c++ {
			for i := c; i < m; i++ {
				got, w := *get(L, cb, i, c), want[c*m+i]
				if cmplx.Abs(got-w) > 1e-12*(1+cmplx.Abs(w)) {
					t.Fatalf("%+v: entry (%d,%d) = %v, want %v", tc, i, c, got, w)
				}
			}
		}
		for i := 0; i < je*m; i++ {
			if L[i] != L0[i] {
				t.Fatalf("%+v: panel entry %d of a source column changed", tc, i)
			}
		}
	}
}

// TestFactorFrontDense: factorFront (blocked panels, tile kernel, packed update matrix) matches a plain
// right-looking LDLᵀ elimination of the first k columns of a dense complex symmetric front, including the
// Schur complement left in cb, for sizes around the panel and tile widths, serial and split over goroutines.
func TestFactorFrontDense(t *testing.T) {
	for _, sz := range [][2]int{{1, 1}, {2, 1}, {5, 5}, {7, 3}, {40, 33}, {70, 31}, {70, 64}, {101, 70}, {300, 97}} {
		for _, procs := range []int{1, 3} {
			m, k := sz[0], sz[1]
			A := make([]complex128, m*m) // column-major, symmetric
			for c := 0; c < m; c++ {
				for i := c; i < m; i++ {
					v := complex(float64((i*7+c*3)%11)-5, float64((i*5+c)%9)-4) / 8
					if i == c {
						v += complex(float64(m), 0.5*float64(m))
					}
					A[c*m+i], A[i*m+c] = v, v
				}
			}
			// Plain elimination: after it, ref holds D and L in the first k columns and the Schur complement.
			ref := append([]complex128(nil), A...)
			for p := 0; p < k; p++ {
				d := ref[p*m+p]
				for i := p + 1; i < m; i++ {
					ref[p*m+i] /= d
				}
				for c := p + 1; c < m; c++ {
					f := d * ref[p*m+c]
					for i := c; i < m; i++ {
						ref[c*m+i] -= ref[p*m+i] * f
					}
				}
			}
			L := append([]complex128(nil), A[:m*k]...)
			m2 := m - k
			cb := make([]complex128, m2*(m2+1)/2)
			for t := 0; t < m2; t++ {
				for i := t; i < m2; i++ {
					cb[t*m2-t*(t-1)/2+i-t] = A[(k+t)*m+k+i]
				}
			}
			work := make([]complex128, panelWidth*m)
			scratch := make([]complex128, panelScratch(m))
			if bad, _ := factorFront(L, m, k, cb, work, scratch, procs); bad >= 0 {
				t.Fatalf("m=%d k=%d: zero pivot at %d", m, k, bad)
			}
			check := func(got, want complex128, what string, i, c int) {
				if cmplx.Abs(got-want) > 1e-12*(1+cmplx.Abs(want)) {
					t.Fatalf("m=%d k=%d procs=%d: %s (%d,%d) = %v, want %v", m, k, procs, what, i, c, got, want)
				}
			}
			for c := 0; c < k; c++ {
				for i := c; i < m; i++ {
					check(L[c*m+i], ref[c*m+i], "L/D", i, c)
				}
			}
			for t2 := 0; t2 < m2; t2++ {
				for i := t2; i < m2; i++ {
					check(cb[t2*m2-t2*(t2-1)/2+i-t2], ref[(k+t2)*m+k+i], "Schur", k+i, k+t2)
				}
			}
		}
	}
}

// TestSubstitutionKernels: the one-column tile kernel (gemvSub) and the four-column dot kernel (dot4) agree to
// rounding with plain complex sums for every length from 0 to 13 (blocks and tails), and gemvSub leaves the
// entries around its target untouched.
func TestSubstitutionKernels(t *testing.T) {
	for k := 1; k <= 6; k++ {
		for h := 0; h <= 13; h++ {
			m := h + k + 3
			L := make([]complex128, m*(k+4))
			for i := range L {
				L[i] = complex(float64((i*7)%11)-5.5, float64((i*5)%9)-3.25)
			}
			w := make([]complex128, k)
			for i := range w {
				w[i] = complex(float64(i%5)-1.5, 0.75*float64(i%3)-1)
			}
			c := make([]complex128, h+2)
			want := make([]complex128, h+2)
			for i := range c {
				c[i] = complex(float64(i), -float64(i%4))
				want[i] = c[i]
			}
			gemvSub(L, 2, m, w, c[1:h+1])
			for i := 0; i < h; i++ {
				var s complex128
				for p := 0; p < k; p++ {
					s += L[2+i+p*m] * w[p]
				}
				want[1+i] -= s
			}
			for i := range c {
				if cmplx.Abs(c[i]-want[i]) > 1e-13*(1+cmplx.Abs(want[i])) {
					t.Fatalf("gemvSub k=%d h=%d row %d: %v, want %v", k, h, i, c[i], want[i])
				}
			}
			o := [4]int{1, m + 2, 2*m + 3, 1}
			g := make([]complex128, h)
			for i := range g {
				g[i] = complex(0.5*float64(i%7)-1, float64(i%3)-0.25)
			}
			d := dot4(L, o, g)
			for j, oj := range o {
				var s complex128
				for i := range g {
					s += L[oj+i] * g[i]
				}
				if cmplx.Abs(d[j]-s) > 1e-13*(1+cmplx.Abs(s)) {
					t.Fatalf("dot4 h=%d column %d: %v, want %v", h, j, d[j], s)
				}
			}
		}
	}
}
