//go:build amd64

package sparse

func cpuid(eaxArg, ecxArg uint32) (eax, ebx, ecx, edx uint32)

func xgetbv() (eax uint32)

// hasAVX2FMA reports whether the processor and operating system support the AVX2 + FMA kernel (CPUID leaf 1:
// FMA, OSXSAVE, AVX; XCR0: XMM and YMM state enabled; leaf 7: AVX2). It is fixed for the life of the process.
var hasAVX2FMA = func() bool {
	maxLeaf, _, _, _ := cpuid(0, 0)
	if maxLeaf < 7 {
		return false
	}
	_, _, c1, _ := cpuid(1, 0)
	const fma, osxsave, avx = 1 << 12, 1 << 27, 1 << 28
	if c1&fma == 0 || c1&osxsave == 0 || c1&avx == 0 {
		return false
	}
	if xgetbv()&6 != 6 {
		return false
	}
	_, b7, _, _ := cpuid(7, 0)
	return b7&(1<<5) != 0
}()

// ctile4x3AVX2 is the vector tile4x3Go (see kernel_amd64.s); callers check hasAVX2FMA and every index.
//
//go:noescape
func ctile4x3AVX2(a *complex128, lda int, w *complex128, ldw int, c0, c1, c2 *complex128, k, nb int)

// ctile1x3AVX2 is the single-row vector tile1x3Go (see kernel_amd64.s); callers check hasAVX2FMA and every index.
//
//go:noescape
func ctile1x3AVX2(a *complex128, lda int, w *complex128, ldw int, c0, c1, c2 *complex128, k, nr int)

// ctile4x1AVX2 is the vector tile4x1Go (see kernel_amd64.s); callers check hasAVX2FMA and every index.
//
//go:noescape
func ctile4x1AVX2(a *complex128, lda int, w *complex128, c *complex128, k, nb int)

// cdot4AVX2 is the vector dot4Go (see kernel_amd64.s); callers check hasAVX2FMA and every index.
//
//go:noescape
func cdot4AVX2(a0, a1, a2, a3 *complex128, gv *complex128, np int, out *[32]float64)
