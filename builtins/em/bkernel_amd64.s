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

// Block layout (bkernel.go): rows of 8 lanes, 64 bytes each, at
#define AX_ 0
#define AY_ 64
#define AZ_ 128
#define BX_ 192
#define BY_ 256
#define BZ_ 320
#define DX_ 384
#define DY_ 448
#define DZ_ 512
#define W_ 576
#define T_ 640
#define BLOCK 704

// func bGroupsAVX512(blk *float64, chain *uint8, from, n int, x, y, z float64, acc *[24]float64) int
//
// Registers: Z3–Z5 r1' = x − a of the current block, Z6 its n1; Z10–Z12
// and Z13 the same for the next block, carried over: when chain[k] is set
// the starts of block k+1 are the ends of block k, so that r2' and n2 are
// r1' and n1 shifted by one lane and cost no square root. Z17–Z19 r2',
// then c'; Z20 n2; Z21 r1·r2; Z22 |c|².
TEXT ·bGroupsAVX512(SB), NOSPLIT, $0-72
	MOVQ blk+0(FP), SI
	MOVQ chain+8(FP), R9
	MOVQ from+16(FP), AX
	MOVQ n+24(FP), CX
	MOVQ acc+56(FP), DI
	VBROADCASTSD x+32(FP), Z29
	VBROADCASTSD y+40(FP), Z30
	VBROADCASTSD z+48(FP), Z31
	VMOVUPD 0(DI), Z26
	VMOVUPD 64(DI), Z27
	VMOVUPD 128(DI), Z28
	VBROADCASTSD bconst<>+0(SB), Z23 // 1
	VBROADCASTSD bconst<>+8(SB), Z25 // floor
	VPXORQ Z24, Z24, Z24             // 0
	CMPQ AX, CX
	JGE  done512
	MOVQ  AX, DX
	IMULQ $BLOCK, DX
	ADDQ  DX, SI

	// r1', n1 of the first block
	VSUBPD      AX_(SI), Z29, Z3
	VSUBPD      AY_(SI), Z30, Z4
	VSUBPD      AZ_(SI), Z31, Z5
	VMULPD      Z3, Z3, Z6
	VFMADD231PD Z4, Z4, Z6
	VFMADD231PD Z5, Z5, Z6
	VSQRTPD     Z6, Z6

loop512:
	// r1', n1 of the next block (the last block is followed by one
	// whose starts are its last end)
	VSUBPD      (BLOCK+AX_)(SI), Z29, Z10
	VSUBPD      (BLOCK+AY_)(SI), Z30, Z11
	VSUBPD      (BLOCK+AZ_)(SI), Z31, Z12
	VMULPD      Z10, Z10, Z13
	VFMADD231PD Z11, Z11, Z13
	VFMADD231PD Z12, Z12, Z13
	VSQRTPD     Z13, Z13

	MOVBQZX (R9)(AX*1), DX
	TESTQ   DX, DX
	JZ      ends512

	// joined: r2', n2 are r1', n1 one lane on
	VALIGNQ $1, Z3, Z10, Z17
	VALIGNQ $1, Z4, Z11, Z18
	VALIGNQ $1, Z5, Z12, Z19
	VALIGNQ $1, Z6, Z13, Z20
	JMP     both512

ends512:
	VSUBPD      BX_(SI), Z29, Z17
	VSUBPD      BY_(SI), Z30, Z18
	VSUBPD      BZ_(SI), Z31, Z19
	VMULPD      Z17, Z17, Z20
	VFMADD231PD Z18, Z18, Z20
	VFMADD231PD Z19, Z19, Z20
	VSQRTPD     Z20, Z20

both512:
	// dot = r1·r2, rounded as the scalar loop rounds it
	VMULPD Z3, Z17, Z21
	VMULPD Z4, Z18, Z22
	VADDPD Z22, Z21, Z21
	VMULPD Z5, Z19, Z22
	VADDPD Z22, Z21, Z21

	// c' = r1' × d, rounded as the scalar loop rounds r1 × d
	VMULPD DZ_(SI), Z4, Z17
	VMULPD DY_(SI), Z5, Z22
	VSUBPD Z22, Z17, Z17
	VMULPD DX_(SI), Z5, Z18
	VMULPD DZ_(SI), Z3, Z22
	VSUBPD Z22, Z18, Z18
	VMULPD DY_(SI), Z3, Z19
	VMULPD DX_(SI), Z4, Z22
	VSUBPD Z22, Z19, Z19

	// |c|²
	VMULPD      Z17, Z17, Z22
	VFMADD231PD Z18, Z18, Z22
	VFMADD231PD Z19, Z19, Z22

	VMULPD  Z6, Z20, Z14         // nn = n1 n2
	VADDPD  Z6, Z20, Z15         // n1 + n2
	VMULPD  W_(SI), Z15, Z15     // W = w (n1 + n2)
	VCMPPD  $1, Z24, Z21, K1     // K1: dot < 0
	VMOVAPD Z23, Z16             // num = 1 ...
	VSUBPD  Z21, Z14, K1, Z16    // ... or nn − dot
	VADDPD  Z21, Z14, Z20        // den = nn + dot ...
	VMOVAPD Z22, K1, Z20         // ... or |c|²

	// guard: den ≤ t·num + floor
	VMOVAPD     Z25, Z21
	VFMADD231PD T_(SI), Z16, Z21
	VCMPPD      $2, Z21, Z20, K2
	KORTESTW    K2, K2
	JNZ         done512

	VMULPD       Z20, Z14, Z14   // nn·den
	VMULPD       Z16, Z15, Z15   // W·num
	VDIVPD       Z14, Z15, Z15   // f
	VFNMADD231PD Z15, Z17, Z26
	VFNMADD231PD Z15, Z18, Z27
	VFNMADD231PD Z15, Z19, Z28

	// the next block becomes the current one
	VMOVAPD Z10, Z3
	VMOVAPD Z11, Z4
	VMOVAPD Z12, Z5
	VMOVAPD Z13, Z6
	ADDQ    $BLOCK, SI
	INCQ    AX
	CMPQ    AX, CX
	JLT     loop512

done512:
	VMOVUPD Z26, 0(DI)
	VMOVUPD Z27, 64(DI)
	VMOVUPD Z28, 128(DI)
	MOVQ    AX, ret+64(FP)
	VZEROUPPER
	RET

// func bGroupsAVX2(blk *float64, chain *uint8, from, n int, x, y, z float64, acc *[24]float64) int
//
// Group g is half g mod 2 of block g/2. chain is not used: n2 is computed
// for every group. Registers: Y0–Y2 r1', Y3–Y5 r2', Y6 n1 then W, Y7 n2
// then num, Y8 r1·r2 then den, Y9 nn, Y10 the mask r1·r2 < 0, Y11, Y12,
// Y3 c', Y13–Y15 the sums.
TEXT ·bGroupsAVX2(SB), NOSPLIT, $0-72
	MOVQ blk+0(FP), BX
	MOVQ from+16(FP), AX
	MOVQ n+24(FP), CX
	MOVQ acc+56(FP), DI
	VMOVUPD 0(DI), Y13
	VMOVUPD 64(DI), Y14
	VMOVUPD 128(DI), Y15

loop2:
	CMPQ AX, CX
	JGE  done2

	// SI = blk + (g/2)·BLOCK + (g mod 2)·32
	MOVQ  AX, DX
	SHRQ  $1, DX
	IMULQ $BLOCK, DX
	MOVQ  AX, R8
	ANDQ  $1, R8
	SHLQ  $5, R8
	LEAQ  (BX)(DX*1), SI
	ADDQ  R8, SI

	// r1' = x − a, r2' = x − b
	VBROADCASTSD x+32(FP), Y0
	VSUBPD       AX_(SI), Y0, Y0
	VBROADCASTSD y+40(FP), Y1
	VSUBPD       AY_(SI), Y1, Y1
	VBROADCASTSD z+48(FP), Y2
	VSUBPD       AZ_(SI), Y2, Y2
	VBROADCASTSD x+32(FP), Y3
	VSUBPD       BX_(SI), Y3, Y3
	VBROADCASTSD y+40(FP), Y4
	VSUBPD       BY_(SI), Y4, Y4
	VBROADCASTSD z+48(FP), Y5
	VSUBPD       BZ_(SI), Y5, Y5

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

	VMULPD Y6, Y7, Y9            // nn
	VADDPD Y7, Y6, Y6            // n1 + n2
	VMULPD W_(SI), Y6, Y6        // W

	VXORPD       Y10, Y10, Y10
	VCMPPD       $1, Y10, Y8, Y10    // dot < 0
	VSUBPD       Y8, Y9, Y7          // nn − dot
	VADDPD       Y8, Y9, Y8          // nn + dot
	VBROADCASTSD bconst<>+0(SB), Y11
	VBLENDVPD    Y10, Y7, Y11, Y7    // num

	// c' = r1' × d, rounded as the scalar loop rounds r1 × d
	VMULPD DZ_(SI), Y1, Y11
	VMULPD DY_(SI), Y2, Y12
	VSUBPD Y12, Y11, Y11
	VMULPD DX_(SI), Y2, Y12
	VMULPD DZ_(SI), Y0, Y3
	VSUBPD Y3, Y12, Y12
	VMULPD DY_(SI), Y0, Y3
	VMULPD DX_(SI), Y1, Y4
	VSUBPD Y4, Y3, Y3

	// |c|², den
	VMULPD      Y11, Y11, Y0
	VFMADD231PD Y12, Y12, Y0
	VFMADD231PD Y3, Y3, Y0
	VBLENDVPD   Y10, Y0, Y8, Y8

	// guard: den ≤ t·num + floor
	VBROADCASTSD bconst<>+8(SB), Y1
	VFMADD231PD  T_(SI), Y7, Y1
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
	MOVQ    AX, ret+64(FP)
	VZEROUPPER
	RET
