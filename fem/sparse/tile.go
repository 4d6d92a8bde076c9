package sparse

import "math"

// The rank update of a front, C −= L(:, jb:je) · Wᵀ with W(c, p) = d_p L(c, p), is computed in register tiles of
// 4 rows × 3 target columns: every loaded L value serves three columns and every W value four rows, with the
// tile's sums held in registers over the whole panel width. Each entry of C is always computed by the same
// sequence of operations (tileEntry), whether it falls inside a full tile, on an edge, or in a portable build,
// so the factor does not depend on how target columns are split over goroutines.

// tileRows and tileCols are the register tile of the rank-update kernel.
const (
	tileRows = 4
	tileCols = 3
)

// tileEntry returns Σ_{p<len(w)} L[o+p·m]·w[p], accumulated as the four real sums Σ Re a·Re w, Σ Im a·Re w,
// Σ Re a·Im w, Σ Im a·Im w with fused multiply-adds in ascending p from zero and combined once at the end. This
// is exactly the arithmetic of the vector kernel, entry by entry.
func tileEntry(L []complex128, o, m int, w []complex128) complex128 {
	var rr, ri, ir, ii float64
	for p, wp := range w {
		a := L[o+p*m]
		ar, ai := real(a), imag(a)
		br, bi := real(wp), imag(wp)
		rr = math.FMA(ar, br, rr)
		ri = math.FMA(ai, br, ri)
		ir = math.FMA(ar, bi, ir)
		ii = math.FMA(ai, bi, ii)
	}
	return complex(rr-ii, ri+ir)
}

// tile4x3Go is the portable tile kernel: for rows i < 4·nb and j < 3,
// c_j[co_j+i] −= Σ_{p<k} L[o+i+p·m]·W[wo+j·k+p] (the W rows of consecutive target columns are k apart).
func tile4x3Go(L []complex128, o, m int, W []complex128, wo, k int, c [3][]complex128, co [3]int, nb int) {
	for j := 0; j < tileCols; j++ {
		w := W[wo+j*k : wo+j*k+k]
		cj, oj := c[j], co[j]
		for i := 0; i < tileRows*nb; i++ {
			cj[oj+i] -= tileEntry(L, o+i, m, w)
		}
	}
}

// tile1x3Go is tile4x3Go for nr single rows.
func tile1x3Go(L []complex128, o, m int, W []complex128, wo, k int, c [3][]complex128, co [3]int, nr int) {
	for j := 0; j < tileCols; j++ {
		w := W[wo+j*k : wo+j*k+k]
		cj, oj := c[j], co[j]
		for i := 0; i < nr; i++ {
			cj[oj+i] -= tileEntry(L, o+i, m, w)
		}
	}
}

// tile1x3 is tile1x3Go, run by the vector kernel when the processor has one. It checks every index it will touch.
func tile1x3(L []complex128, o, m int, W []complex128, wo, k int, c [3][]complex128, co [3]int, nr int) {
	if nr <= 0 || k <= 0 {
		return
	}
	_ = L[o+(k-1)*m+nr-1]
	_ = W[wo+tileCols*k-1]
	for j := range c {
		_ = c[j][co[j]+nr-1]
	}
	if !hasAVX2FMA {
		tile1x3Go(L, o, m, W, wo, k, c, co, nr)
		return
	}
	ctile1x3AVX2(&L[o], m, &W[wo], k, &c[0][co[0]], &c[1][co[1]], &c[2][co[2]], k, nr)
}

// tile4x3 is tile4x3Go, run by the vector kernel when the processor has one. It checks every index it will touch.
func tile4x3(L []complex128, o, m int, W []complex128, wo, k int, c [3][]complex128, co [3]int, nb int) {
	if nb <= 0 || k <= 0 {
		return
	}
	h := tileRows * nb
	_ = L[o+(k-1)*m+h-1]
	_ = W[wo+tileCols*k-1]
	for j := range c {
		_ = c[j][co[j]+h-1]
	}
	if !hasAVX2FMA {
		tile4x3Go(L, o, m, W, wo, k, c, co, nb)
		return
	}
	ctile4x3AVX2(&L[o], m, &W[wo], k, &c[0][co[0]], &c[1][co[1]], &c[2][co[2]], k, nb)
}

// rankUpdateCols subtracts L(i, jb:je)·W(c−je, :) from every front entry (i, c) with c0 ≤ c < c1 and i ≥ c:
// columns c < k live in the panel L (m×k column-major), the others in the packed lower update matrix cb.
// W holds, for each target column, its bw = je−jb coefficients d_p L(c, p) contiguously.
func rankUpdateCols(L []complex128, m, k, jb, je, c0, c1 int, W []complex128, cb []complex128) {
	bw := je - jb
	m2 := m - k
	// col returns the slice holding target column c and the offset of its row 0 in it.
	col := func(c int) ([]complex128, int) {
		if c < k {
			return L, c * m
		}
		t := c - k
		return cb, t*m2 - t*(t-1)/2 - c
	}
	entry := func(i, c int) {
		buf, o := col(c)
		w := W[(c-je)*bw : (c-je)*bw+bw]
		buf[o+i] -= tileEntry(L, jb*m+i, m, w)
	}
	// Target columns go in groups of three from c0 (a short last group column by column). In each group, rows
	// c ≤ i < c+2 form a small triangle done entry by entry; rows from r0 = c+2 on are cut into blocks of four
	// from r0 with a short tail at m. Row tiles keep a slice of the panel cache-resident while all groups pass;
	// a block belongs to the tile holding its first row (it may reach 3 rows into the next).
	dummy := make([]complex128, 3) // sink for the triangle's unneeded tile results
	for ib := je; ib < m; ib += rowTile {
		ie := min(ib+rowTile, m)
		c := c0
		for ; c+tileCols <= c1 && c < ie; c += tileCols {
			r0 := c + tileCols - 1
			if ib <= c && c+1 < ie {
				// Row c of column c and row c+1 of columns c, c+1; the other results land in dummy.
				b0, o0 := col(c)
				b1, o1 := col(c + 1)
				wo := (c - je) * bw
				tile1x3(L, jb*m+c, m, W, wo, bw, [3][]complex128{b0, dummy, dummy}, [3]int{o0 + c, 0, 1}, 1)
				tile1x3(L, jb*m+c+1, m, W, wo, bw, [3][]complex128{b0, b1, dummy}, [3]int{o0 + c + 1, o1 + c + 1, 2}, 1)
			} else {
				for i := max(ib, c); i < min(ie, r0); i++ {
					for j := 0; j < tileCols && c+j <= i; j++ {
						entry(i, c+j)
					}
				}
			}
			rTail := r0 + (m-r0)/tileRows*tileRows
			s0 := r0
			if ib > r0 {
				s0 = r0 + (ib-r0+tileRows-1)/tileRows*tileRows
			}
			if sEnd := min(ie, rTail); sEnd > s0 {
				nb := (sEnd - s0 + tileRows - 1) / tileRows
				var cs [3][]complex128
				var co [3]int
				for j := range cs {
					cs[j], co[j] = col(c + j)
					co[j] += s0
				}
				tile4x3(L, jb*m+s0, m, W, (c-je)*bw, bw, cs, co, nb)
			}
			if rTail >= ib && rTail < ie {
				var cs [3][]complex128
				var co [3]int
				for j := range cs {
					cs[j], co[j] = col(c + j)
					co[j] += rTail
				}
				tile1x3(L, jb*m+rTail, m, W, (c-je)*bw, bw, cs, co, m-rTail)
			}
		}
		if c+tileCols > c1 {
			for ; c < min(ie, c1); c++ {
				for i := max(ib, c); i < ie; i++ {
					entry(i, c)
				}
			}
		}
	}
}

// panelScratch is the scratch size panelBelow needs for fronts of order up to m.
func panelScratch(m int) int { return tileCols*panelWidth + m }

// panelBelow finishes the rows je ≤ i < m of the panel columns jb ≤ j < je of an m-row front whose diagonal block
// (rows < je) is already factored: L(i, j) = (A(i, j) − Σ_{jb ≤ p < j} L(i, p) d_p L(j, p)) / d_j. Columns are
// taken three at a time: the contribution of the columns left of the group goes through the tile kernel, the
// few inside the group column by column. scratch holds at least panelScratch(m) entries.
func panelBelow(L []complex128, m, jb, je int, scratch []complex128) {
	h := m - je
	nb := h / tileRows
	W2 := scratch[:tileCols*panelWidth]
	dummy := scratch[tileCols*panelWidth : tileCols*panelWidth+h]
	for j0 := jb; j0 < je; j0 += tileCols {
		g := min(tileCols, je-j0)
		if q := j0 - jb; q > 0 {
			// W2[jj·q + p−jb] = d_p L(j0+jj, p); a short last group runs against a dummy column with zero weights.
			var cs [3][]complex128
			var co [3]int
			for jj := 0; jj < tileCols; jj++ {
				w := W2[jj*q : jj*q+q]
				if jj >= g {
					clear(w)
					cs[jj], co[jj] = dummy, 0
					continue
				}
				c := j0 + jj
				for p := jb; p < j0; p++ {
					w[p-jb] = L[p*m+p] * L[p*m+c]
				}
				cs[jj], co[jj] = L, c*m+je
			}
			tile4x3(L, jb*m+je, m, W2, 0, q, cs, co, nb)
			for jj := range co {
				co[jj] += tileRows * nb
			}
			tile1x3(L, jb*m+je+tileRows*nb, m, W2, 0, q, cs, co, h-tileRows*nb)
		}
		for c := j0; c < j0+g; c++ {
			col := L[c*m+je : c*m+m]
			for p := j0; p < c; p++ {
				axpyNeg(col, L[p*m+je:p*m+m], L[p*m+p]*L[p*m+c])
			}
			inv := 1 / L[c*m+c]
			for i := range col {
				col[i] *= inv
			}
		}
	}
}
