package sparse

import (
	"math"
	"runtime"
	"sync"
	"sync/atomic"
)

// The triangular substitutions stream L once forward and once backward, so they are bound by memory and by the
// multiply-adds per loaded entry. Both work on one supernode at a time, holding its pivots and its rows below in
// a contiguous work vector, and take its columns in small groups: forward, each group updates every row below
// it with one pass of the register-tiled kernel (tile4x1); backward, each group's dot products with the rows
// below it share one pass over the work vector (dot4). As in the factorisation, each result is computed by the
// same sequence of floating-point operations in the vector kernels and in their portable forms.

// substGroup is the number of columns of a supernode the forward substitution applies per pass.
const substGroup = 4

// tile4x1Go is the portable one-column tile kernel: c[co+i] −= Σ_{p<len(w)} L[o+i+p·m]·w[p] for i < 4·nb.
func tile4x1Go(L []complex128, o, m int, w []complex128, c []complex128, co, nb int) {
	for i := 0; i < tileRows*nb; i++ {
		c[co+i] -= tileEntry(L, o+i, m, w)
	}
}

// gemvSub sets c[i] −= Σ_{p<len(w)} L[o+i+p·m]·w[p] for every i < len(c): the blocks of four rows through the
// vector kernel when the processor has one, the rest entry by entry (the same arithmetic either way).
func gemvSub(L []complex128, o, m int, w, c []complex128) {
	k, h := len(w), len(c)
	if k == 0 || h == 0 {
		return
	}
	_ = L[o+(k-1)*m+h-1]
	nb := h / tileRows
	if nb > 0 {
		if hasAVX2FMA {
			ctile4x1AVX2(&L[o], m, &w[0], &c[0], k, nb)
		} else {
			tile4x1Go(L, o, m, w, c, 0, nb)
		}
	}
	for i := tileRows * nb; i < h; i++ {
		c[i] -= tileEntry(L, o+i, m, w)
	}
}

// dot4Go is the portable cdot4AVX2: the lane-wise partial sums of four columns (starting at L[o[c]]) against g
// over np pairs of entries.
func dot4Go(L []complex128, o [4]int, g []complex128, np int, out *[32]float64) {
	*out = [32]float64{}
	for q := 0; q < np; q++ {
		g0, g1 := g[2*q], g[2*q+1]
		for c := range o {
			a0, a1 := L[o[c]+2*q], L[o[c]+2*q+1]
			s := out[8*c : 8*c+8]
			s[0] = math.FMA(real(a0), real(g0), s[0])
			s[1] = math.FMA(imag(a0), imag(g0), s[1])
			s[2] = math.FMA(real(a1), real(g1), s[2])
			s[3] = math.FMA(imag(a1), imag(g1), s[3])
			s[4] = math.FMA(real(a0), imag(g0), s[4])
			s[5] = math.FMA(imag(a0), real(g0), s[5])
			s[6] = math.FMA(real(a1), imag(g1), s[6])
			s[7] = math.FMA(imag(a1), real(g1), s[7])
		}
	}
}

// dot4 returns Σ_{i<len(g)} L[o[c]+i]·g[i] for the four columns c (a column may repeat; its sum is then
// computed twice). Pairs of entries go through the vector kernel when the processor has one; an odd last entry
// is added after the pairs' sums are combined.
func dot4(L []complex128, o [4]int, g []complex128) [4]complex128 {
	n := len(g)
	var r [4]complex128
	if n == 0 {
		return r
	}
	for _, oc := range o {
		_ = L[oc+n-1]
	}
	np := n / 2
	var out [32]float64
	if np > 0 {
		if hasAVX2FMA {
			cdot4AVX2(&L[o[0]], &L[o[1]], &L[o[2]], &L[o[3]], &g[0], np, &out)
		} else {
			dot4Go(L, o, g, np, &out)
		}
	}
	for c := range o {
		s := out[8*c : 8*c+8]
		rr, ii, ri, ir := s[0]+s[2], s[1]+s[3], s[4]+s[6], s[5]+s[7]
		if n%2 == 1 {
			a, gt := L[o[c]+n-1], g[n-1]
			rr = math.FMA(real(a), real(gt), rr)
			ii = math.FMA(imag(a), imag(gt), ii)
			ri = math.FMA(real(a), imag(gt), ri)
			ir = math.FMA(imag(a), real(gt), ir)
		}
		r[c] = complex(rr-ii, ri+ir)
	}
	return r
}

// parallelSolveMin is the order below which the substitutions run their tasks one after another (the same
// arithmetic, without the goroutines).
const parallelSolveMin = 50000

// solveOnce sets x = A⁻¹ b by permutation, forward substitution with the diagonal scaling, and back
// substitution. x and b may alias. The independent subtrees of the factorisation (the Symbolic's tasks) are
// substituted side by side, each collecting its updates of the top part in its own vector, added in task order
// before the top part's own substitution, so the result does not depend on the number of goroutines.
func (f *Factor) solveOnce(x, b []complex128) {
	s := f.s
	y := make([]complex128, s.n)
	for k, old := range s.perm {
		y[k] = b[old]
	}
	ns := len(s.first) - 1
	accs := make([][]complex128, len(s.tasks))
	s.eachTask(func(t int, w []complex128) {
		acc := make([]complex128, len(s.topPiv))
		for sn := int(s.tasks[t][0]); sn <= int(s.tasks[t][1]); sn++ {
			f.forward(sn, y, w, acc)
		}
		accs[t] = acc
	})
	for _, acc := range accs {
		for i, p := range s.topPiv {
			y[p] += acc[i]
		}
	}
	w := make([]complex128, s.stats.MaxFront)
	for sn := 0; sn < ns; sn++ {
		if s.taskOf[sn] < 0 {
			f.forward(sn, y, w, nil)
		}
	}
	for sn := ns - 1; sn >= 0; sn-- {
		if s.taskOf[sn] < 0 {
			f.backward(sn, y, w)
		}
	}
	s.eachTask(func(t int, w []complex128) {
		for sn := int(s.tasks[t][1]); sn >= int(s.tasks[t][0]); sn-- {
			f.backward(sn, y, w)
		}
	})
	for k, old := range s.perm {
		x[old] = y[k]
	}
}

// eachTask calls fn for every task, over up to GOMAXPROCS goroutines for a large system, each with its own work
// vector of the largest front's size.
func (s *Symbolic) eachTask(fn func(t int, w []complex128)) {
	nt := len(s.tasks)
	procs := min(runtime.GOMAXPROCS(0), nt)
	if s.n < parallelSolveMin || procs < 2 {
		w := make([]complex128, s.stats.MaxFront)
		for t := range nt {
			fn(t, w)
		}
		return
	}
	var next atomic.Int32
	var wg sync.WaitGroup
	for range procs {
		wg.Go(func() {
			w := make([]complex128, s.stats.MaxFront)
			for {
				t := int(next.Add(1)) - 1
				if t >= nt {
					return
				}
				fn(t, w)
			}
		})
	}
	wg.Wait()
}

// supernode returns supernode sn's first pivot fc, its number of pivots k, its row pattern (its own pivots
// first) and its m×k column-major block of L.
func (f *Factor) supernode(sn int) (fc, k int, rows []int32, L []complex128) {
	s := f.s
	fc = int(s.first[sn])
	return fc, int(s.first[sn+1]) - fc, s.rows[s.rowPtr[sn]:s.rowPtr[sn+1]], s.block(f.lx, sn)
}

// forward applies supernode sn's columns of the unit lower factor to y (in pivot order), with w (at least the
// front size) as work space: its pivots are solved (and left divided by their diagonal entries) and the rows
// below them updated, those of the top part into acc (indexed by topIdx) when acc is not nil.
func (f *Factor) forward(sn int, y, w, acc []complex128) {
	s := f.s
	fc, k, rows, L := f.supernode(sn)
	m := len(rows)
	w = w[:m]
	copy(w, y[fc:fc+k])
	clear(w[k:])
	for jb := 0; jb < k; jb += substGroup {
		je := min(jb+substGroup, k)
		for j := jb; j < je; j++ {
			wj := w[j]
			for i := j + 1; i < je; i++ {
				w[i] -= L[j*m+i] * wj
			}
		}
		gemvSub(L, jb*m+je, m, w[jb:je], w[je:m])
	}
	for j, v := range w[:k] { // the diagonal scaling D⁻¹, while the block is at hand
		y[fc+j] = v / L[j*m+j]
	}
	for i, r := range rows[k:] {
		if acc != nil {
			if t := s.topIdx[r]; t >= 0 {
				acc[t] += w[k+i]
				continue
			}
		}
		y[r] += w[k+i]
	}
}

// backward solves supernode sn's pivots of the unit upper factor Lᵀ in y, whose later entries are final, with w
// (at least the front size) as work space.
func (f *Factor) backward(sn int, y, w []complex128) {
	fc, k, rows, L := f.supernode(sn)
	m := len(rows)
	w = w[:m]
	copy(w, y[fc:fc+k])
	for i, r := range rows[k:] {
		w[k+i] = y[r]
	}
	for je := k; je > 0; je -= 4 {
		jb := max(je-4, 0)
		var o [4]int
		for c := range o {
			o[c] = min(jb+c, je-1)*m + je
		}
		d := dot4(L, o, w[je:m])
		for c := je - 1; c >= jb; c-- {
			sum := d[c-jb]
			for i := c + 1; i < je; i++ {
				sum += L[c*m+i] * w[i]
			}
			w[c] -= sum
		}
	}
	copy(y[fc:fc+k], w[:k])
}
