//go:build amd64

package sparse

// cgemv4AVX2 sets d[i] −= Σ_{p<4} w[p]·a_p[i] for i < n (n even) with AVX2 and FMA. Callers check hasAVX2FMA
// and that every slice behind the pointers holds n values (w holds 4).
//
//go:noescape
func cgemv4AVX2(d, a0, a1, a2, a3, w *complex128, n int)

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

// gemv4 sets d −= w[0]·a0 + w[1]·a1 + w[2]·a2 + w[3]·a3 (all of len(d)) with the vector kernel when the
// processor has one.
func gemv4(d, a0, a1, a2, a3 []complex128, w []complex128) {
	n := len(d)
	if n >= 2 && hasAVX2FMA {
		a0, a1, a2, a3, w = a0[:n], a1[:n], a2[:n], a3[:n], w[:4]
		cgemv4AVX2(&d[0], &a0[0], &a1[0], &a2[0], &a3[0], &w[0], n&^1)
		if n&1 == 0 {
			return
		}
		i := n - 1
		d[i] -= w[0]*a0[i] + w[1]*a1[i] + w[2]*a2[i] + w[3]*a3[i]
		return
	}
	gemv4Go(d, a0, a1, a2, a3, w)
}
