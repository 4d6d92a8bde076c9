#include "textflag.h"

// func cpuid(eaxArg, ecxArg uint32) (eax, ebx, ecx, edx uint32)
TEXT ·cpuid(SB), NOSPLIT, $0-24
	MOVL eaxArg+0(FP), AX
	MOVL ecxArg+4(FP), CX
	CPUID
	MOVL AX, eax+8(FP)
	MOVL BX, ebx+12(FP)
	MOVL CX, ecx+16(FP)
	MOVL DX, edx+20(FP)
	RET

// func xgetbv() (eax uint32)
TEXT ·xgetbv(SB), NOSPLIT, $0-4
	MOVL $0, CX
	XGETBV
	MOVL AX, eax+0(FP)
	RET

// func ctile4x3AVX2(a *complex128, lda int, w *complex128, ldw int, c0, c1, c2 *complex128, k, nb int)
// For nb blocks of 4 rows (block b: rows 4b..4b+3 of a and of the columns c0, c1, c2) and j < 3:
//   c_j[i] −= Σ_{p<k} a[p·lda + i] · w[j·ldw + p]   (complex128 interleaved; k ≥ 1)
// Each product is accumulated as Σ a·Re(w) and Σ a·Im(w) with FMAs (zeroed accumulators, p ascending); the
// halves are combined once at the end as (rr − ii, ri + ir), exactly as tileEntry does.
// Registers: Y0–Y11 accumulators (column j: Y(4j), Y(4j+1) for a·Re(w) over rows 0–1, 2–3; Y(4j+2), Y(4j+3)
// for a·Im(w)), Y12–Y13 the four a values, Y14–Y15 broadcast Re(w), Im(w).
TEXT ·ctile4x3AVX2(SB), NOSPLIT, $0-72
	MOVQ a+0(FP), SI
	MOVQ lda+8(FP), R8
	SHLQ $4, R8
	MOVQ w+16(FP), DX
	MOVQ ldw+24(FP), R9
	SHLQ $4, R9
	LEAQ (R9)(R9*1), R10
	MOVQ c0+32(FP), R11
	MOVQ c1+40(FP), R12
	MOVQ c2+48(FP), R13
	MOVQ k+56(FP), R14
	MOVQ nb+64(FP), DI
	TESTQ DI, DI
	JZ   tdone

tblock:
	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1
	VXORPD Y2, Y2, Y2
	VXORPD Y3, Y3, Y3
	VXORPD Y4, Y4, Y4
	VXORPD Y5, Y5, Y5
	VXORPD Y6, Y6, Y6
	VXORPD Y7, Y7, Y7
	VXORPD Y8, Y8, Y8
	VXORPD Y9, Y9, Y9
	VXORPD Y10, Y10, Y10
	VXORPD Y11, Y11, Y11
	MOVQ SI, AX
	MOVQ DX, BX
	MOVQ R14, CX

tloop:
	VMOVUPD (AX), Y12
	VMOVUPD 32(AX), Y13
	VBROADCASTSD (BX), Y14
	VBROADCASTSD 8(BX), Y15
	VFMADD231PD Y14, Y12, Y0
	VFMADD231PD Y14, Y13, Y1
	VFMADD231PD Y15, Y12, Y2
	VFMADD231PD Y15, Y13, Y3
	VBROADCASTSD (BX)(R9*1), Y14
	VBROADCASTSD 8(BX)(R9*1), Y15
	VFMADD231PD Y14, Y12, Y4
	VFMADD231PD Y14, Y13, Y5
	VFMADD231PD Y15, Y12, Y6
	VFMADD231PD Y15, Y13, Y7
	VBROADCASTSD (BX)(R10*1), Y14
	VBROADCASTSD 8(BX)(R10*1), Y15
	VFMADD231PD Y14, Y12, Y8
	VFMADD231PD Y14, Y13, Y9
	VFMADD231PD Y15, Y12, Y10
	VFMADD231PD Y15, Y13, Y11
	ADDQ R8, AX
	ADDQ $16, BX
	DECQ CX
	JNZ  tloop

	// (rr, ri) addsub swap(ir, ii) = (rr − ii, ri + ir); then c −= that.
	VPERMILPD $5, Y2, Y2
	VADDSUBPD Y2, Y0, Y0
	VPERMILPD $5, Y3, Y3
	VADDSUBPD Y3, Y1, Y1
	VMOVUPD   (R11), Y12
	VSUBPD    Y0, Y12, Y12
	VMOVUPD   Y12, (R11)
	VMOVUPD   32(R11), Y13
	VSUBPD    Y1, Y13, Y13
	VMOVUPD   Y13, 32(R11)
	VPERMILPD $5, Y6, Y6
	VADDSUBPD Y6, Y4, Y4
	VPERMILPD $5, Y7, Y7
	VADDSUBPD Y7, Y5, Y5
	VMOVUPD   (R12), Y12
	VSUBPD    Y4, Y12, Y12
	VMOVUPD   Y12, (R12)
	VMOVUPD   32(R12), Y13
	VSUBPD    Y5, Y13, Y13
	VMOVUPD   Y13, 32(R12)
	VPERMILPD $5, Y10, Y10
	VADDSUBPD Y10, Y8, Y8
	VPERMILPD $5, Y11, Y11
	VADDSUBPD Y11, Y9, Y9
	VMOVUPD   (R13), Y12
	VSUBPD    Y8, Y12, Y12
	VMOVUPD   Y12, (R13)
	VMOVUPD   32(R13), Y13
	VSUBPD    Y9, Y13, Y13
	VMOVUPD   Y13, 32(R13)

	ADDQ $64, SI
	ADDQ $64, R11
	ADDQ $64, R12
	ADDQ $64, R13
	DECQ DI
	JNZ  tblock
	VZEROUPPER

tdone:
	RET

// func ctile1x3AVX2(a *complex128, lda int, w *complex128, ldw int, c0, c1, c2 *complex128, k, nr int)
// ctile4x3AVX2 for nr single rows (any nr ≥ 0): one complex per XMM register, the same operations per entry.
// Registers: X0–X5 accumulators (column j: X(2j) for a·Re(w), X(2j+1) for a·Im(w)), X12 the a value, X14–X15
// the duplicated Re(w), Im(w).
TEXT ·ctile1x3AVX2(SB), NOSPLIT, $0-72
	MOVQ a+0(FP), SI
	MOVQ lda+8(FP), R8
	SHLQ $4, R8
	MOVQ w+16(FP), DX
	MOVQ ldw+24(FP), R9
	SHLQ $4, R9
	LEAQ (R9)(R9*1), R10
	MOVQ c0+32(FP), R11
	MOVQ c1+40(FP), R12
	MOVQ c2+48(FP), R13
	MOVQ k+56(FP), R14
	MOVQ nr+64(FP), DI
	TESTQ DI, DI
	JZ   sdone

srow:
	VXORPD X0, X0, X0
	VXORPD X1, X1, X1
	VXORPD X2, X2, X2
	VXORPD X3, X3, X3
	VXORPD X4, X4, X4
	VXORPD X5, X5, X5
	MOVQ SI, AX
	MOVQ DX, BX
	MOVQ R14, CX

sloop:
	VMOVUPD  (AX), X12
	VMOVDDUP (BX), X14
	VMOVDDUP 8(BX), X15
	VFMADD231PD X14, X12, X0
	VFMADD231PD X15, X12, X1
	VMOVDDUP (BX)(R9*1), X14
	VMOVDDUP 8(BX)(R9*1), X15
	VFMADD231PD X14, X12, X2
	VFMADD231PD X15, X12, X3
	VMOVDDUP (BX)(R10*1), X14
	VMOVDDUP 8(BX)(R10*1), X15
	VFMADD231PD X14, X12, X4
	VFMADD231PD X15, X12, X5
	ADDQ R8, AX
	ADDQ $16, BX
	DECQ CX
	JNZ  sloop

	VPERMILPD $1, X1, X1
	VADDSUBPD X1, X0, X0
	VMOVUPD   (R11), X12
	VSUBPD    X0, X12, X12
	VMOVUPD   X12, (R11)
	VPERMILPD $1, X3, X3
	VADDSUBPD X3, X2, X2
	VMOVUPD   (R12), X12
	VSUBPD    X2, X12, X12
	VMOVUPD   X12, (R12)
	VPERMILPD $1, X5, X5
	VADDSUBPD X5, X4, X4
	VMOVUPD   (R13), X12
	VSUBPD    X4, X12, X12
	VMOVUPD   X12, (R13)

	ADDQ $16, SI
	ADDQ $16, R11
	ADDQ $16, R12
	ADDQ $16, R13
	DECQ DI
	JNZ  srow

sdone:
	RET

// func ctile4x1AVX2(a *complex128, lda int, w *complex128, c *complex128, k, nb int)
// ctile4x3AVX2 for one target column: for nb blocks of 4 rows, c[i] −= Σ_{p<k} a[p·lda + i]·w[p], each entry
// accumulated exactly as tileEntry does (k ≥ 1). The forward substitution's update of the rows below a panel.
// Registers: Y0–Y1 Σ a·Re(w) over rows 0–1, 2–3; Y2–Y3 Σ a·Im(w); Y12–Y13 the four a values; Y14–Y15 Re(w), Im(w).
TEXT ·ctile4x1AVX2(SB), NOSPLIT, $0-48
	MOVQ a+0(FP), SI
	MOVQ lda+8(FP), R8
	SHLQ $4, R8
	MOVQ w+16(FP), DX
	MOVQ c+24(FP), R11
	MOVQ k+32(FP), R14
	MOVQ nb+40(FP), DI
	TESTQ DI, DI
	JZ   udone

ublock:
	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1
	VXORPD Y2, Y2, Y2
	VXORPD Y3, Y3, Y3
	MOVQ SI, AX
	MOVQ DX, BX
	MOVQ R14, CX

uloop:
	VMOVUPD (AX), Y12
	VMOVUPD 32(AX), Y13
	VBROADCASTSD (BX), Y14
	VBROADCASTSD 8(BX), Y15
	VFMADD231PD Y14, Y12, Y0
	VFMADD231PD Y14, Y13, Y1
	VFMADD231PD Y15, Y12, Y2
	VFMADD231PD Y15, Y13, Y3
	ADDQ R8, AX
	ADDQ $16, BX
	DECQ CX
	JNZ  uloop

	VPERMILPD $5, Y2, Y2
	VADDSUBPD Y2, Y0, Y0
	VPERMILPD $5, Y3, Y3
	VADDSUBPD Y3, Y1, Y1
	VMOVUPD   (R11), Y12
	VSUBPD    Y0, Y12, Y12
	VMOVUPD   Y12, (R11)
	VMOVUPD   32(R11), Y13
	VSUBPD    Y1, Y13, Y13
	VMOVUPD   Y13, 32(R11)

	ADDQ $64, SI
	ADDQ $64, R11
	DECQ DI
	JNZ  ublock
	VZEROUPPER

udone:
	RET

// func cdot4AVX2(a0, a1, a2, a3 *complex128, gv *complex128, np int, out *[32]float64)
// Partial dot products of four columns with g over np pairs of entries (2·np complex values; np ≥ 0): for
// column c, out[8c:8c+4] = Σ_q (a_c ⊙ g) and out[8c+4:8c+8] = Σ_q (a_c ⊙ swap(g)) lane by lane, where for pair q
// the lanes are (Re a·Re g, Im a·Im g) of entry 2q then of entry 2q+1, and swap exchanges the real and imaginary
// parts of each g entry; one FMA per lane per pair, q ascending from zero. dotFinish combines them.
// Registers: Y0–Y3 the ⊙ g sums, Y4–Y7 the ⊙ swap(g) sums, Y8 g, Y9 swap(g), Y10 a.
TEXT ·cdot4AVX2(SB), NOSPLIT, $0-56
	MOVQ a0+0(FP), SI
	MOVQ a1+8(FP), DI
	MOVQ a2+16(FP), R8
	MOVQ a3+24(FP), R9
	MOVQ gv+32(FP), DX
	MOVQ np+40(FP), CX
	MOVQ out+48(FP), R11
	VXORPD Y0, Y0, Y0
	VXORPD Y1, Y1, Y1
	VXORPD Y2, Y2, Y2
	VXORPD Y3, Y3, Y3
	VXORPD Y4, Y4, Y4
	VXORPD Y5, Y5, Y5
	VXORPD Y6, Y6, Y6
	VXORPD Y7, Y7, Y7
	XORQ BX, BX
	TESTQ CX, CX
	JZ   dstore

dloop:
	VMOVUPD (DX)(BX*1), Y8
	VPERMILPD $5, Y8, Y9
	VMOVUPD (SI)(BX*1), Y10
	VFMADD231PD Y8, Y10, Y0
	VFMADD231PD Y9, Y10, Y4
	VMOVUPD (DI)(BX*1), Y10
	VFMADD231PD Y8, Y10, Y1
	VFMADD231PD Y9, Y10, Y5
	VMOVUPD (R8)(BX*1), Y10
	VFMADD231PD Y8, Y10, Y2
	VFMADD231PD Y9, Y10, Y6
	VMOVUPD (R9)(BX*1), Y10
	VFMADD231PD Y8, Y10, Y3
	VFMADD231PD Y9, Y10, Y7
	ADDQ $32, BX
	DECQ CX
	JNZ  dloop

dstore:
	VMOVUPD Y0, (R11)
	VMOVUPD Y4, 32(R11)
	VMOVUPD Y1, 64(R11)
	VMOVUPD Y5, 96(R11)
	VMOVUPD Y2, 128(R11)
	VMOVUPD Y6, 160(R11)
	VMOVUPD Y3, 192(R11)
	VMOVUPD Y7, 224(R11)
	VZEROUPPER
	RET
