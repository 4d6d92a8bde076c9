#include "textflag.h"

// func cgemv4AVX2(d, a0, a1, a2, a3, w *complex128, n int)
// d[i] −= w[0]·a0[i] + w[1]·a1[i] + w[2]·a2[i] + w[3]·a3[i] for i < n (n even), complex128 interleaved.
// Each product sums Σ a·Re(w) and Σ swap(a)·Im(w) with FMAs and combines them with one add-subtract.
TEXT ·cgemv4AVX2(SB), NOSPLIT, $0-56
	MOVQ d+0(FP), DI
	MOVQ a0+8(FP), SI
	MOVQ a1+16(FP), R8
	MOVQ a2+24(FP), R9
	MOVQ a3+32(FP), R10
	MOVQ w+40(FP), DX
	MOVQ n+48(FP), CX
	SHRQ $1, CX
	JZ   done
	VBROADCASTSD 0(DX), Y8
	VBROADCASTSD 8(DX), Y9
	VBROADCASTSD 16(DX), Y10
	VBROADCASTSD 24(DX), Y11
	VBROADCASTSD 32(DX), Y12
	VBROADCASTSD 40(DX), Y13
	VBROADCASTSD 48(DX), Y14
	VBROADCASTSD 56(DX), Y7

loop:
	VMOVUPD     (SI), Y0
	VMULPD      Y8, Y0, Y4
	VPERMILPD   $5, Y0, Y0
	VMULPD      Y9, Y0, Y5
	VMOVUPD     (R8), Y1
	VFMADD231PD Y10, Y1, Y4
	VPERMILPD   $5, Y1, Y1
	VFMADD231PD Y11, Y1, Y5
	VMOVUPD     (R9), Y2
	VFMADD231PD Y12, Y2, Y4
	VPERMILPD   $5, Y2, Y2
	VFMADD231PD Y13, Y2, Y5
	VMOVUPD     (R10), Y3
	VFMADD231PD Y14, Y3, Y4
	VPERMILPD   $5, Y3, Y3
	VFMADD231PD Y7, Y3, Y5
	VADDSUBPD   Y5, Y4, Y4
	VMOVUPD     (DI), Y6
	VSUBPD      Y4, Y6, Y6
	VMOVUPD     Y6, (DI)
	ADDQ        $32, SI
	ADDQ        $32, R8
	ADDQ        $32, R9
	ADDQ        $32, R10
	ADDQ        $32, DI
	DECQ        CX
	JNZ         loop
	VZEROUPPER

done:
	RET

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
