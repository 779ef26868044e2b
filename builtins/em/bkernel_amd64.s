//go:build amd64 && !purego

#include "textflag.h"

// Vector kernels of B for straight segments; see bkernel.go for the
// layout, the formula, the guard and why they are written by hand.
// Primes mark negated vectors: r1' = x − a = −r1 and r2' = x − b = −r2
// (negation is exact), so that the subtraction takes its segment operand
// from memory; c' = r1' × (b − a) = −c, and the sums subtract f·c'.

// 1.0 and the floor 2^-200 of the guard.
DATA bconst<>+0(SB)/8, $0x3ff0000000000000
DATA bconst<>+8(SB)/8, $0x3370000000000000
GLOBL bconst<>(SB), RODATA|NOPTR, $16

// func bGroupsAVX512(blk *float64, from, n int, x, y, z float64, acc *[24]float64) int
TEXT ·bGroupsAVX512(SB), NOSPLIT, $0-64
	MOVQ blk+0(FP), SI
	MOVQ from+8(FP), AX
	MOVQ n+16(FP), CX
	MOVQ acc+48(FP), DI
	VBROADCASTSD x+24(FP), Z29
	VBROADCASTSD y+32(FP), Z30
	VBROADCASTSD z+40(FP), Z31
	VMOVUPD 0(DI), Z26
	VMOVUPD 64(DI), Z27
	VMOVUPD 128(DI), Z28
	VBROADCASTSD bconst<>+0(SB), Z23 // 1
	VBROADCASTSD bconst<>+8(SB), Z25 // floor
	VPXORQ Z24, Z24, Z24             // 0
	MOVQ AX, DX
	SHLQ $9, DX                      // 512 bytes a block
	ADDQ DX, SI

loop512:
	CMPQ AX, CX
	JGE  done512

	// r1' = x − a, r2' = x − b, d = b − a
	VSUBPD  0(SI), Z29, Z0
	VSUBPD  64(SI), Z30, Z1
	VSUBPD  128(SI), Z31, Z2
	VMOVUPD 192(SI), Z6
	VMOVUPD 256(SI), Z7
	VMOVUPD 320(SI), Z8
	VSUBPD  Z6, Z29, Z3
	VSUBPD  Z7, Z30, Z4
	VSUBPD  Z8, Z31, Z5
	VSUBPD  0(SI), Z6, Z6
	VSUBPD  64(SI), Z7, Z7
	VSUBPD  128(SI), Z8, Z8

	// n1, n2
	VMULPD      Z0, Z0, Z9
	VFMADD231PD Z1, Z1, Z9
	VFMADD231PD Z2, Z2, Z9
	VSQRTPD     Z9, Z9
	VMULPD      Z3, Z3, Z10
	VFMADD231PD Z4, Z4, Z10
	VFMADD231PD Z5, Z5, Z10
	VSQRTPD     Z10, Z10

	// dot = r1·r2, rounded as the scalar loop rounds it
	VMULPD Z0, Z3, Z11
	VMULPD Z1, Z4, Z12
	VADDPD Z12, Z11, Z11
	VMULPD Z2, Z5, Z12
	VADDPD Z12, Z11, Z11

	// c' = r1' × d, rounded as the scalar loop rounds r1 × d
	VMULPD Z1, Z8, Z13
	VMULPD Z2, Z7, Z14
	VSUBPD Z14, Z13, Z13
	VMULPD Z2, Z6, Z14
	VMULPD Z0, Z8, Z15
	VSUBPD Z15, Z14, Z14
	VMULPD Z0, Z7, Z15
	VMULPD Z1, Z6, Z16
	VSUBPD Z16, Z15, Z15

	// |c|²
	VMULPD      Z13, Z13, Z17
	VFMADD231PD Z14, Z14, Z17
	VFMADD231PD Z15, Z15, Z17

	VMULPD  Z9, Z10, Z18         // nn = n1 n2
	VADDPD  Z10, Z9, Z9          // n1 + n2
	VMULPD  384(SI), Z9, Z9      // W = w (n1 + n2)
	VCMPPD  $1, Z24, Z11, K1     // K1: dot < 0
	VMOVAPD Z23, Z19             // num = 1 ...
	VSUBPD  Z11, Z18, K1, Z19    // ... or nn − dot
	VADDPD  Z11, Z18, Z20        // den = nn + dot ...
	VMOVAPD Z17, K1, Z20         // ... or |c|²

	// guard: den ≤ max(t·num, floor)
	VMULPD   448(SI), Z19, Z21
	VMAXPD   Z25, Z21, Z21
	VCMPPD   $2, Z21, Z20, K2
	KORTESTW K2, K2
	JNZ      done512

	VMULPD       Z20, Z18, Z18   // nn·den
	VMULPD       Z19, Z9, Z9     // W·num
	VDIVPD       Z18, Z9, Z9     // f
	VFNMADD231PD Z9, Z13, Z26
	VFNMADD231PD Z9, Z14, Z27
	VFNMADD231PD Z9, Z15, Z28

	ADDQ $512, SI
	INCQ AX
	JMP  loop512

done512:
	VMOVUPD Z26, 0(DI)
	VMOVUPD Z27, 64(DI)
	VMOVUPD Z28, 128(DI)
	MOVQ    AX, ret+56(FP)
	VZEROUPPER
	RET

// func bGroupsAVX2(blk *float64, from, n int, x, y, z float64, acc *[24]float64) int
TEXT ·bGroupsAVX2(SB), NOSPLIT, $0-64
	MOVQ blk+0(FP), BX
	MOVQ from+8(FP), AX
	MOVQ n+16(FP), CX
	MOVQ acc+48(FP), DI
	VMOVUPD 0(DI), Y13
	VMOVUPD 64(DI), Y14
	VMOVUPD 128(DI), Y15

loop2:
	CMPQ AX, CX
	JGE  done2

	// SI = blk + (g/2)·512 + (g mod 2)·32
	MOVQ AX, DX
	SHRQ $1, DX
	SHLQ $9, DX
	MOVQ AX, R8
	ANDQ $1, R8
	SHLQ $5, R8
	LEAQ (BX)(DX*1), SI
	ADDQ R8, SI

	// r1' = x − a, r2' = x − b
	VBROADCASTSD x+24(FP), Y0
	VSUBPD       0(SI), Y0, Y0
	VBROADCASTSD y+32(FP), Y1
	VSUBPD       64(SI), Y1, Y1
	VBROADCASTSD z+40(FP), Y2
	VSUBPD       128(SI), Y2, Y2
	VBROADCASTSD x+24(FP), Y3
	VSUBPD       192(SI), Y3, Y3
	VBROADCASTSD y+32(FP), Y4
	VSUBPD       256(SI), Y4, Y4
	VBROADCASTSD z+40(FP), Y5
	VSUBPD       320(SI), Y5, Y5

	// n1, n2
	VMULPD      Y0, Y0, Y6
	VFMADD231PD Y1, Y1, Y6
	VFMADD231PD Y2, Y2, Y6
	VSQRTPD     Y6, Y6
	VMULPD      Y3, Y3, Y7
	VFMADD231PD Y4, Y4, Y7
	VFMADD231PD Y5, Y5, Y7
	VSQRTPD     Y7, Y7

	// dot, rounded as the scalar loop rounds it
	VMULPD Y0, Y3, Y8
	VMULPD Y1, Y4, Y9
	VADDPD Y9, Y8, Y8
	VMULPD Y2, Y5, Y9
	VADDPD Y9, Y8, Y8

	// d = b − a
	VMOVUPD 192(SI), Y3
	VSUBPD  0(SI), Y3, Y3
	VMOVUPD 256(SI), Y4
	VSUBPD  64(SI), Y4, Y4
	VMOVUPD 320(SI), Y5
	VSUBPD  128(SI), Y5, Y5

	VMULPD Y6, Y7, Y9            // nn
	VADDPD Y7, Y6, Y6            // n1 + n2
	VMULPD 384(SI), Y6, Y6       // W

	VXORPD       Y10, Y10, Y10
	VCMPPD       $1, Y10, Y8, Y10    // dot < 0
	VSUBPD       Y8, Y9, Y7          // nn − dot
	VADDPD       Y8, Y9, Y8          // nn + dot
	VBROADCASTSD bconst<>+0(SB), Y11
	VBLENDVPD    Y10, Y7, Y11, Y7    // num

	// c' = r1' × d, rounded as the scalar loop rounds r1 × d
	VMULPD Y1, Y5, Y11
	VMULPD Y2, Y4, Y12
	VSUBPD Y12, Y11, Y11
	VMULPD Y2, Y3, Y12
	VMULPD Y0, Y5, Y5
	VSUBPD Y5, Y12, Y12
	VMULPD Y0, Y4, Y4
	VMULPD Y1, Y3, Y3
	VSUBPD Y3, Y4, Y3

	// |c|², den
	VMULPD      Y11, Y11, Y0
	VFMADD231PD Y12, Y12, Y0
	VFMADD231PD Y3, Y3, Y0
	VBLENDVPD   Y10, Y0, Y8, Y8

	// guard: den ≤ max(t·num, floor)
	VMULPD       448(SI), Y7, Y1
	VBROADCASTSD bconst<>+8(SB), Y2
	VMAXPD       Y2, Y1, Y1
	VCMPPD       $2, Y1, Y8, Y2
	VMOVMSKPD    Y2, DX
	TESTQ        DX, DX
	JNZ          done2

	VMULPD       Y8, Y9, Y9      // nn·den
	VMULPD       Y7, Y6, Y6      // W·num
	VDIVPD       Y9, Y6, Y6      // f
	VFNMADD231PD Y6, Y11, Y13
	VFNMADD231PD Y6, Y12, Y14
	VFNMADD231PD Y6, Y3, Y15

	INCQ AX
	JMP  loop2

done2:
	VMOVUPD Y13, 0(DI)
	VMOVUPD Y14, 64(DI)
	VMOVUPD Y15, 128(DI)
	MOVQ    AX, ret+56(FP)
	VZEROUPPER
	RET
