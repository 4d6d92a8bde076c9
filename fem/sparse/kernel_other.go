//go:build !amd64

package sparse

const hasAVX2FMA = false

func ctile4x3AVX2(a *complex128, lda int, w *complex128, ldw int, c0, c1, c2 *complex128, k, nb int) {
	panic("sparse: no vector kernel on this architecture")
}

func ctile1x3AVX2(a *complex128, lda int, w *complex128, ldw int, c0, c1, c2 *complex128, k, nr int) {
	panic("sparse: no vector kernel on this architecture")
}

func ctile4x1AVX2(a *complex128, lda int, w *complex128, c *complex128, k, nb int) {
	panic("sparse: no vector kernel on this architecture")
}

func cdot4AVX2(a0, a1, a2, a3 *complex128, g *complex128, np int, out *[32]float64) {
	panic("sparse: no vector kernel on this architecture")
}
