//go:build amd64 && !purego

// Vector kernels for segmentsA (akernel.go) and their logarithm. Written
// by hand: Go has no vector types or intrinsics and no vector logarithm
// (see akernel.go). Each lane does what segmentsAScalar does for one
// segment; the near-line test uses the same operations in the same order
// without fused multiply-adds, so it flags exactly the segments the scalar
// loop hands to SegmentA.
//
// The logarithm ln x = k·ln 2 + ln m, x = 2^k·m with √2/2 ≤ m < √2:
// the exponent and mantissa are split by VGETEXPPD/VGETMANTPD (AVX-512)
// or by integer bit operations (AVX2), then with f = m − 1 and
// s = f/(2 + f), ln m = 2 atanh s = f − (f²/2 − s(f²/2 + R(s²))), R a
// polynomial of degree 7 in s² (|s| ≤ 0.1716), and ln 2 split in a high
// part whose product with k is exact and a low part. This is the method
// and the coefficients of fdlibm's e_log.c (Sun Microsystems, 1993; the
// same as Go's math.log), after W. J. Cody and W. Waite, Software Manual
// for the Elementary Functions, Prentice-Hall, 1980, ch. 5, and J.-M.
// Muller, Elementary Functions, 3rd ed., Birkhäuser, 2016, ch. 11 (range
// reduction). Its error is below 1 ulp in fdlibm; TestVectorLog measures
// it against math.Log.
//
// The kernels take log1p(x), x = 2L/(R1 + R2 − L), not the logarithm of
// the ratio 1 + x: far from a segment x ≈ L/R, and the rounding of 1 + x
// would cost ε/x of the result. Their log1p is the logarithm of u = 1 + x
// rounded, with f = m − 1 replaced by x itself where u < √2 (there k = 0
// and m = u, so f = x exactly, and the rest of the method is that of
// fdlibm's s_log1p.c for k = 0): below x = √2 − 1 the error is the
// logarithm's. Above, the rounding of u adds at most 2^-53/(u ln u) ≤
// 2.1·2^-53 of the result, which falls as x grows. TestVectorLog1p
// measures it against math.Log1p.

#include "textflag.h"

// 1
DATA one<>+0(SB)/8, $0x3ff0000000000000
DATA one<>+8(SB)/8, $0x3ff0000000000000
DATA one<>+16(SB)/8, $0x3ff0000000000000
DATA one<>+24(SB)/8, $0x3ff0000000000000
GLOBL one<>(SB), RODATA|NOPTR, $32

// 2
DATA two<>+0(SB)/8, $0x4000000000000000
DATA two<>+8(SB)/8, $0x4000000000000000
DATA two<>+16(SB)/8, $0x4000000000000000
DATA two<>+24(SB)/8, $0x4000000000000000
GLOBL two<>(SB), RODATA|NOPTR, $32

// 1/2
DATA half<>+0(SB)/8, $0x3fe0000000000000
DATA half<>+8(SB)/8, $0x3fe0000000000000
DATA half<>+16(SB)/8, $0x3fe0000000000000
DATA half<>+24(SB)/8, $0x3fe0000000000000
GLOBL half<>(SB), RODATA|NOPTR, $32

// 4
DATA four<>+0(SB)/8, $0x4010000000000000
DATA four<>+8(SB)/8, $0x4010000000000000
DATA four<>+16(SB)/8, $0x4010000000000000
DATA four<>+24(SB)/8, $0x4010000000000000
GLOBL four<>(SB), RODATA|NOPTR, $32

// 8
DATA eight<>+0(SB)/8, $0x4020000000000000
DATA eight<>+8(SB)/8, $0x4020000000000000
DATA eight<>+16(SB)/8, $0x4020000000000000
DATA eight<>+24(SB)/8, $0x4020000000000000
GLOBL eight<>(SB), RODATA|NOPTR, $32

// √2 (math.Sqrt2 rounded)
DATA sqrt2<>+0(SB)/8, $0x3ff6a09e667f3bcd
DATA sqrt2<>+8(SB)/8, $0x3ff6a09e667f3bcd
DATA sqrt2<>+16(SB)/8, $0x3ff6a09e667f3bcd
DATA sqrt2<>+24(SB)/8, $0x3ff6a09e667f3bcd
GLOBL sqrt2<>(SB), RODATA|NOPTR, $32

// ln 2, high part (32 trailing zero bits: k·ln2hi is exact)
DATA ln2hi<>+0(SB)/8, $0x3fe62e42fee00000
DATA ln2hi<>+8(SB)/8, $0x3fe62e42fee00000
DATA ln2hi<>+16(SB)/8, $0x3fe62e42fee00000
DATA ln2hi<>+24(SB)/8, $0x3fe62e42fee00000
GLOBL ln2hi<>(SB), RODATA|NOPTR, $32

// ln 2 − ln2hi
DATA ln2lo<>+0(SB)/8, $0x3dea39ef35793c76
DATA ln2lo<>+8(SB)/8, $0x3dea39ef35793c76
DATA ln2lo<>+16(SB)/8, $0x3dea39ef35793c76
DATA ln2lo<>+24(SB)/8, $0x3dea39ef35793c76
GLOBL ln2lo<>(SB), RODATA|NOPTR, $32

// fdlibm e_log.c Lg1 … Lg7
DATA lg1<>+0(SB)/8, $0x3fe5555555555593
DATA lg1<>+8(SB)/8, $0x3fe5555555555593
DATA lg1<>+16(SB)/8, $0x3fe5555555555593
DATA lg1<>+24(SB)/8, $0x3fe5555555555593
GLOBL lg1<>(SB), RODATA|NOPTR, $32

DATA lg2<>+0(SB)/8, $0x3fd999999997fa04
DATA lg2<>+8(SB)/8, $0x3fd999999997fa04
DATA lg2<>+16(SB)/8, $0x3fd999999997fa04
DATA lg2<>+24(SB)/8, $0x3fd999999997fa04
GLOBL lg2<>(SB), RODATA|NOPTR, $32

DATA lg3<>+0(SB)/8, $0x3fd2492494229359
DATA lg3<>+8(SB)/8, $0x3fd2492494229359
DATA lg3<>+16(SB)/8, $0x3fd2492494229359
DATA lg3<>+24(SB)/8, $0x3fd2492494229359
GLOBL lg3<>(SB), RODATA|NOPTR, $32

DATA lg4<>+0(SB)/8, $0x3fcc71c51d8e78af
DATA lg4<>+8(SB)/8, $0x3fcc71c51d8e78af
DATA lg4<>+16(SB)/8, $0x3fcc71c51d8e78af
DATA lg4<>+24(SB)/8, $0x3fcc71c51d8e78af
GLOBL lg4<>(SB), RODATA|NOPTR, $32

DATA lg5<>+0(SB)/8, $0x3fc7466496cb03de
DATA lg5<>+8(SB)/8, $0x3fc7466496cb03de
DATA lg5<>+16(SB)/8, $0x3fc7466496cb03de
DATA lg5<>+24(SB)/8, $0x3fc7466496cb03de
GLOBL lg5<>(SB), RODATA|NOPTR, $32

DATA lg6<>+0(SB)/8, $0x3fc39a09d078c69f
DATA lg6<>+8(SB)/8, $0x3fc39a09d078c69f
DATA lg6<>+16(SB)/8, $0x3fc39a09d078c69f
DATA lg6<>+24(SB)/8, $0x3fc39a09d078c69f
GLOBL lg6<>(SB), RODATA|NOPTR, $32

DATA lg7<>+0(SB)/8, $0x3fc2f112df3e5244
DATA lg7<>+8(SB)/8, $0x3fc2f112df3e5244
DATA lg7<>+16(SB)/8, $0x3fc2f112df3e5244
DATA lg7<>+24(SB)/8, $0x3fc2f112df3e5244
GLOBL lg7<>(SB), RODATA|NOPTR, $32

// smallest normal, 2^-1022
DATA minnorm<>+0(SB)/8, $0x0010000000000000
DATA minnorm<>+8(SB)/8, $0x0010000000000000
DATA minnorm<>+16(SB)/8, $0x0010000000000000
DATA minnorm<>+24(SB)/8, $0x0010000000000000
GLOBL minnorm<>(SB), RODATA|NOPTR, $32

// 2^52
DATA two52<>+0(SB)/8, $0x4330000000000000
DATA two52<>+8(SB)/8, $0x4330000000000000
DATA two52<>+16(SB)/8, $0x4330000000000000
DATA two52<>+24(SB)/8, $0x4330000000000000
GLOBL two52<>(SB), RODATA|NOPTR, $32

// 52
DATA c52<>+0(SB)/8, $0x404a000000000000
DATA c52<>+8(SB)/8, $0x404a000000000000
DATA c52<>+16(SB)/8, $0x404a000000000000
DATA c52<>+24(SB)/8, $0x404a000000000000
GLOBL c52<>(SB), RODATA|NOPTR, $32

// 2^52 + 1023
DATA expbias<>+0(SB)/8, $0x43300000000003ff
DATA expbias<>+8(SB)/8, $0x43300000000003ff
DATA expbias<>+16(SB)/8, $0x43300000000003ff
DATA expbias<>+24(SB)/8, $0x43300000000003ff
GLOBL expbias<>(SB), RODATA|NOPTR, $32

// mantissa bits
DATA mant<>+0(SB)/8, $0x000fffffffffffff
DATA mant<>+8(SB)/8, $0x000fffffffffffff
DATA mant<>+16(SB)/8, $0x000fffffffffffff
DATA mant<>+24(SB)/8, $0x000fffffffffffff
GLOBL mant<>(SB), RODATA|NOPTR, $32

// +Inf
DATA inf<>+0(SB)/8, $0x7ff0000000000000
DATA inf<>+8(SB)/8, $0x7ff0000000000000
DATA inf<>+16(SB)/8, $0x7ff0000000000000
DATA inf<>+24(SB)/8, $0x7ff0000000000000
GLOBL inf<>(SB), RODATA|NOPTR, $32

// −Inf
DATA neginf<>+0(SB)/8, $0xfff0000000000000
DATA neginf<>+8(SB)/8, $0xfff0000000000000
DATA neginf<>+16(SB)/8, $0xfff0000000000000
DATA neginf<>+24(SB)/8, $0xfff0000000000000
GLOBL neginf<>(SB), RODATA|NOPTR, $32

// NaN
DATA nan<>+0(SB)/8, $0x7ff8000000000000
DATA nan<>+8(SB)/8, $0x7ff8000000000000
DATA nan<>+16(SB)/8, $0x7ff8000000000000
DATA nan<>+24(SB)/8, $0x7ff8000000000000
GLOBL nan<>(SB), RODATA|NOPTR, $32

// lane numbers
DATA iota<>+0(SB)/8, $0x0000000000000000
DATA iota<>+8(SB)/8, $0x3ff0000000000000
DATA iota<>+16(SB)/8, $0x4000000000000000
DATA iota<>+24(SB)/8, $0x4008000000000000
DATA iota<>+32(SB)/8, $0x4010000000000000
DATA iota<>+40(SB)/8, $0x4014000000000000
DATA iota<>+48(SB)/8, $0x4018000000000000
DATA iota<>+56(SB)/8, $0x401c000000000000
GLOBL iota<>(SB), RODATA|NOPTR, $64

// LOG4: Y3 = ln Y0 (AVX2 with FMA). Clobbers Y1, Y2, Y4–Y8.
// Subnormal x is scaled by 2^52 first; +Inf and NaN give themselves,
// x < 0 NaN and ±0 −Inf, as math.Log. LOG4A reduces (k in Y3, f = m − 1
// in Y4), LOG4B finishes.
#define LOG4 LOG4A; LOG4B

#define LOG4A \
	VCMPPD      $0x11, minnorm<>(SB), Y0, Y1; \
	VMULPD      two52<>(SB), Y0, Y2; \
	VBLENDVPD   Y1, Y2, Y0, Y2; \
	VANDPD      c52<>(SB), Y1, Y1; \
	VPSRLQ      $52, Y2, Y3; \
	VPOR        two52<>(SB), Y3, Y3; \
	VSUBPD      expbias<>(SB), Y3, Y3; \
	VSUBPD      Y1, Y3, Y3; \
	VANDPD      mant<>(SB), Y2, Y4; \
	VORPD       one<>(SB), Y4, Y4; \
	VCMPPD      $0x1d, sqrt2<>(SB), Y4, Y5; \
	VMULPD      half<>(SB), Y4, Y6; \
	VBLENDVPD   Y5, Y6, Y4, Y4; \
	VANDPD      one<>(SB), Y5, Y5; \
	VADDPD      Y5, Y3, Y3; \
	VSUBPD      one<>(SB), Y4, Y4

#define LOG4B \
	VADDPD      two<>(SB), Y4, Y5; \
	VDIVPD      Y5, Y4, Y5; \
	VMULPD      Y5, Y5, Y6; \
	VMULPD      Y6, Y6, Y7; \
	VMOVUPD     lg7<>(SB), Y8; \
	VFMADD213PD lg5<>(SB), Y7, Y8; \
	VFMADD213PD lg3<>(SB), Y7, Y8; \
	VFMADD213PD lg1<>(SB), Y7, Y8; \
	VMULPD      Y6, Y8, Y8; \
	VMOVUPD     lg6<>(SB), Y1; \
	VFMADD213PD lg4<>(SB), Y7, Y1; \
	VFMADD213PD lg2<>(SB), Y7, Y1; \
	VMULPD      Y7, Y1, Y1; \
	VADDPD      Y1, Y8, Y1; \
	VMULPD      Y4, Y4, Y6; \
	VMULPD      half<>(SB), Y6, Y6; \
	VADDPD      Y1, Y6, Y1; \
	VMULPD      ln2lo<>(SB), Y3, Y7; \
	VFMADD231PD Y1, Y5, Y7; \
	VSUBPD      Y7, Y6, Y6; \
	VSUBPD      Y4, Y6, Y6; \
	VMULPD      ln2hi<>(SB), Y3, Y3; \
	VSUBPD      Y6, Y3, Y3; \
	VCMPPD      $0x15, inf<>(SB), Y0, Y1; \
	VBLENDVPD   Y1, Y0, Y3, Y3; \
	VXORPD      Y2, Y2, Y2; \
	VCMPPD      $0x11, Y2, Y0, Y1; \
	VBLENDVPD   Y1, nan<>(SB), Y3, Y3; \
	VCMPPD      $0x00, Y2, Y0, Y1; \
	VBLENDVPD   Y1, neginf<>(SB), Y3, Y3

// LOG8: Z15 = ln Z0 (AVX-512F). Clobbers Z1–Z5, Z9, Z11–Z14, K5.
// VGETEXPPD/VGETMANTPD take subnormals, +Inf and NaN as they are;
// VGETMANTPD gives NaN for x < 0 ($8: mantissa in [1, 2), NaN if
// negative); ±0 is set to −Inf at the end, as math.Log. LOG8A reduces
// (k in Z1, f = m − 1 in Z3), LOG8B finishes.
#define LOG8 LOG8A; LOG8B

#define LOG8A \
	VGETEXPPD        Z0, Z1; \
	VGETMANTPD       $8, Z0, Z2; \
	VCMPPD.BCST      $0x1d, sqrt2<>(SB), Z2, K5; \
	VMULPD.BCST      half<>(SB), Z2, K5, Z2; \
	VADDPD.BCST      one<>(SB), Z1, K5, Z1; \
	VSUBPD.BCST      one<>(SB), Z2, Z3

#define LOG8B \
	VADDPD.BCST      two<>(SB), Z3, Z4; \
	VDIVPD           Z4, Z3, Z4; \
	VMULPD           Z4, Z4, Z5; \
	VMULPD           Z5, Z5, Z9; \
	VBROADCASTSD     lg7<>(SB), Z11; \
	VFMADD213PD.BCST lg5<>(SB), Z9, Z11; \
	VFMADD213PD.BCST lg3<>(SB), Z9, Z11; \
	VFMADD213PD.BCST lg1<>(SB), Z9, Z11; \
	VMULPD           Z5, Z11, Z11; \
	VBROADCASTSD     lg6<>(SB), Z12; \
	VFMADD213PD.BCST lg4<>(SB), Z9, Z12; \
	VFMADD213PD.BCST lg2<>(SB), Z9, Z12; \
	VMULPD           Z9, Z12, Z12; \
	VADDPD           Z12, Z11, Z11; \
	VMULPD           Z3, Z3, Z13; \
	VMULPD.BCST      half<>(SB), Z13, Z13; \
	VADDPD           Z11, Z13, Z11; \
	VMULPD.BCST      ln2lo<>(SB), Z1, Z14; \
	VFMADD231PD      Z11, Z4, Z14; \
	VSUBPD           Z14, Z13, Z13; \
	VSUBPD           Z3, Z13, Z13; \
	VMULPD.BCST      ln2hi<>(SB), Z1, Z15; \
	VSUBPD           Z13, Z15, Z15; \
	VPXORQ           Z14, Z14, Z14; \
	VCMPPD           $0x00, Z14, Z0, K5; \
	VBROADCASTSD     neginf<>(SB), K5, Z15

// LOG1P4: Y3 = log1p(Y0) for Y0 ≥ 0 (AVX2 with FMA), as described at the
// top. Clobbers Y0 (1 + x), Y1, Y2, Y4–Y8 (x is kept in Y7, which LOG4A
// leaves alone).
#define LOG1P4 \
	VMOVAPD   Y0, Y7; \
	VADDPD    one<>(SB), Y0, Y0; \
	LOG4A; \
	VCMPPD    $0x11, sqrt2<>(SB), Y0, Y5; \
	VBLENDVPD Y5, Y7, Y4, Y4; \
	LOG4B

// LOG1P8: Z15 = log1p(Z16) for Z16 ≥ 0 (AVX-512F), as described at the
// top. Sets Z0 to 1 + x; clobbers Z1–Z5, Z9, Z11–Z14, K5, K6.
#define LOG1P8 \
	VADDPD.BCST      one<>(SB), Z16, Z0; \
	LOG8A; \
	VCMPPD.BCST      $0x11, sqrt2<>(SB), Z0, K6; \
	VMOVAPD          Z16, K6, Z3; \
	LOG8B

// The rows of a block (akernel.go, aBlocks), 8 lanes of 8 bytes: ax 0,
// ay 64, az 128, bx 192, by 256, bz 320, ex 384, ey 448, ez 512, l 576,
// ki (μ0/4π·I) 640; a block is 704 bytes.

// PRE4: for the four segments at SI (half a block) and the lane numbers
// in Y0, with x, y, z in Y13–Y15 and lo, hi at 0(SP), 32(SP): the
// near-line mask (bits in BX), the mask of lanes to add in Y9 (in range,
// not near the line), and in Y0 the argument of log1p,
// x = L(R1 + R2 + L)/t, t = R1R2 + r1·r2 (when r1·r2 < 0 as
// L²|r1 × ê|²/(R1R2 − r1·r2), as segmentsAScalar: x is then
// (R1 + R2 + L)(R1R2 − r1·r2)/(L|r1 × ê|²)).
#define PRE4 \
	VCMPPD    $0x1d, 0(SP), Y0, Y1; \
	VCMPPD    $0x11, 32(SP), Y0, Y9; \
	VANDPD    Y1, Y9, Y9; \
	VMOVUPD   0(SI), Y0; \
	VSUBPD    Y13, Y0, Y0; \
	VMOVUPD   64(SI), Y1; \
	VSUBPD    Y14, Y1, Y1; \
	VMOVUPD   128(SI), Y2; \
	VSUBPD    Y15, Y2, Y2; \
	VMOVUPD   192(SI), Y3; \
	VSUBPD    Y13, Y3, Y3; \
	VMOVUPD   256(SI), Y4; \
	VSUBPD    Y14, Y4, Y4; \
	VMOVUPD   320(SI), Y5; \
	VSUBPD    Y15, Y5, Y5; \
	VMULPD    Y0, Y0, Y6; \
	VMULPD    Y1, Y1, Y7; \
	VADDPD    Y7, Y6, Y6; \
	VMULPD    Y2, Y2, Y7; \
	VADDPD    Y7, Y6, Y6; \
	VSQRTPD   Y6, Y6; \
	VMULPD    Y3, Y3, Y7; \
	VMULPD    Y4, Y4, Y8; \
	VADDPD    Y8, Y7, Y7; \
	VMULPD    Y5, Y5, Y8; \
	VADDPD    Y8, Y7, Y7; \
	VSQRTPD   Y7, Y7; \
	VMULPD    Y3, Y0, Y3; \
	VMULPD    Y4, Y1, Y4; \
	VADDPD    Y4, Y3, Y3; \
	VMULPD    Y5, Y2, Y5; \
	VADDPD    Y5, Y3, Y3; \
	VMULPD    512(SI), Y1, Y4; \
	VMULPD    448(SI), Y2, Y5; \
	VSUBPD    Y5, Y4, Y4; \
	VMULPD    384(SI), Y2, Y5; \
	VMULPD    512(SI), Y0, Y8; \
	VSUBPD    Y8, Y5, Y5; \
	VMULPD    448(SI), Y0, Y0; \
	VMULPD    384(SI), Y1, Y1; \
	VSUBPD    Y1, Y0, Y0; \
	VMULPD    Y4, Y4, Y4; \
	VMULPD    Y5, Y5, Y5; \
	VADDPD    Y5, Y4, Y4; \
	VMULPD    Y0, Y0, Y0; \
	VADDPD    Y0, Y4, Y4; \
	VADDPD    Y7, Y6, Y0; \
	VBROADCASTSD ·aNearLine(SB), Y1; \
	VMULPD    Y1, Y0, Y1; \
	VMULPD    Y1, Y1, Y1; \
	VCMPPD    $0x12, Y1, Y4, Y1; \
	VANDPD    Y1, Y9, Y2; \
	VMOVMSKPD Y2, BX; \
	VANDNPD   Y9, Y1, Y9; \
	VMULPD    Y7, Y6, Y6; \
	VMOVUPD   576(SI), Y5; \
	VADDPD    Y5, Y0, Y0; \
	VXORPD    Y1, Y1, Y1; \
	VCMPPD    $0x1d, Y1, Y3, Y1; \
	VSUBPD    Y3, Y6, Y2; \
	VMULPD    Y2, Y0, Y2; \
	VMULPD    Y5, Y0, Y0; \
	VMULPD    Y4, Y5, Y5; \
	VADDPD    Y3, Y6, Y7; \
	VBLENDVPD Y1, Y0, Y2, Y2; \
	VBLENDVPD Y1, Y7, Y5, Y5; \
	VDIVPD    Y5, Y2, Y0

// POST4: w = ki·log1p x (Y3) added, times ê, to the sums Y10–Y12 in the
// lanes of Y9.
#define POST4 \
	VMULPD      640(SI), Y3, Y3; \
	VANDPD      Y9, Y3, Y3; \
	VFMADD231PD 384(SI), Y3, Y10; \
	VFMADD231PD 448(SI), Y3, Y11; \
	VFMADD231PD 512(SI), Y3, Y12

// SUM4: the four lanes of Y added in a fixed order into X0.
#define SUM4(Y, X) \
	VEXTRACTF128 $1, Y, X0; \
	VADDPD       X0, X, X0; \
	VUNPCKHPD    X0, X0, X1; \
	VADDSD       X1, X0, X0

// The AVX-512 kernel does PRE4, LOG1P4 and POST4 on eight lanes, with masks
// in K registers: K1 the lanes in range, K2 those near their line, K3
// those to add. Constant registers: x, y, z Z31–Z29, lo Z28, hi Z27, the
// lane numbers Z26, 8 in Z25, the sums Z22–Z24, 0 in Z21.

// SUM8: the eight lanes of Z added in a fixed order into X0.
#define SUM8(Z) \
	VEXTRACTF64X4 $1, Z, Y0; \
	VEXTRACTF64X4 $0, Z, Y1; \
	VADDPD        Y0, Y1, Y0; \
	VEXTRACTF128  $1, Y0, X1; \
	VADDPD        X1, X0, X0; \
	VUNPCKHPD     X0, X0, X1; \
	VADDSD        X1, X0, X0

// func logAVX2(dst, src *float64, n int)
TEXT ·logAVX2(SB), NOSPLIT, $0-24
	MOVQ dst+0(FP), DI
	MOVQ src+8(FP), SI
	MOVQ n+16(FP), CX
	XORQ AX, AX

log4loop:
	CMPQ    AX, CX
	JGE     log4done
	VMOVUPD (SI)(AX*8), Y0
	LOG4
	VMOVUPD Y3, (DI)(AX*8)
	ADDQ    $4, AX
	JMP     log4loop

log4done:
	VZEROUPPER
	RET

// func logAVX512(dst, src *float64, n int)
TEXT ·logAVX512(SB), NOSPLIT, $0-24
	MOVQ dst+0(FP), DI
	MOVQ src+8(FP), SI
	MOVQ n+16(FP), CX
	XORQ AX, AX

log8loop:
	CMPQ    AX, CX
	JGE     log8done
	VMOVUPD (SI)(AX*8), Z0
	LOG8
	VMOVUPD Z15, (DI)(AX*8)
	ADDQ    $8, AX
	JMP     log8loop

log8done:
	VZEROUPPER
	RET

// func log1pAVX2(dst, src *float64, n int)
TEXT ·log1pAVX2(SB), NOSPLIT, $0-24
	MOVQ dst+0(FP), DI
	MOVQ src+8(FP), SI
	MOVQ n+16(FP), CX
	XORQ AX, AX

log1p4loop:
	CMPQ    AX, CX
	JGE     log1p4done
	VMOVUPD (SI)(AX*8), Y0
	LOG1P4
	VMOVUPD Y3, (DI)(AX*8)
	ADDQ    $4, AX
	JMP     log1p4loop

log1p4done:
	VZEROUPPER
	RET

// func log1pAVX512(dst, src *float64, n int)
TEXT ·log1pAVX512(SB), NOSPLIT, $0-24
	MOVQ dst+0(FP), DI
	MOVQ src+8(FP), SI
	MOVQ n+16(FP), CX
	XORQ AX, AX

log1p8loop:
	CMPQ    AX, CX
	JGE     log1p8done
	VMOVUPD (SI)(AX*8), Z16
	LOG1P8
	VMOVUPD Z15, (DI)(AX*8)
	ADDQ    $8, AX
	JMP     log1p8loop

log1p8done:
	VZEROUPPER
	RET

// func aKernelAVX2(p *float64, nb int, lo, hi, first, x, y, z float64) (sx, sy, sz float64, done int, flags uint64)
TEXT ·aKernelAVX2(SB), NOSPLIT, $96-104
	MOVQ         p+0(FP), DI
	MOVQ         nb+8(FP), CX
	XORQ         DX, DX
	XORQ         R8, R8
	VBROADCASTSD lo+16(FP), Y0
	VMOVUPD      Y0, 0(SP)
	VBROADCASTSD hi+24(FP), Y0
	VMOVUPD      Y0, 32(SP)
	VBROADCASTSD first+32(FP), Y0
	VADDPD       iota<>(SB), Y0, Y0
	VMOVUPD      Y0, 64(SP)
	VBROADCASTSD x+40(FP), Y13
	VBROADCASTSD y+48(FP), Y14
	VBROADCASTSD z+56(FP), Y15
	VXORPD       Y10, Y10, Y10
	VXORPD       Y11, Y11, Y11
	VXORPD       Y12, Y12, Y12
	TESTQ        CX, CX
	JLE          k4out

k4loop:
	MOVQ    DI, SI
	VMOVUPD 64(SP), Y0
	PRE4
	LOG1P4
	POST4
	MOVQ    BX, R8
	LEAQ    32(DI), SI
	VMOVUPD 64(SP), Y0
	VADDPD  four<>(SB), Y0, Y0
	PRE4
	LOG1P4
	POST4
	SHLQ    $4, BX
	ORQ     BX, R8
	INCQ    DX
	TESTQ   R8, R8
	JNZ     k4out
	VMOVUPD 64(SP), Y0
	VADDPD  eight<>(SB), Y0, Y0
	VMOVUPD Y0, 64(SP)
	ADDQ    $704, DI
	CMPQ    DX, CX
	JLT     k4loop

k4out:
	MOVQ DX, done+88(FP)
	MOVQ R8, flags+96(FP)
	SUM4(Y10, X10)
	MOVSD X0, sx+64(FP)
	SUM4(Y11, X11)
	MOVSD X0, sy+72(FP)
	SUM4(Y12, X12)
	MOVSD X0, sz+80(FP)
	VZEROUPPER
	RET

// func aKernelAVX512(p *float64, nb int, lo, hi, first, x, y, z float64) (sx, sy, sz float64, done int, flags uint64)
TEXT ·aKernelAVX512(SB), NOSPLIT, $0-104
	MOVQ         p+0(FP), DI
	MOVQ         nb+8(FP), CX
	XORQ         DX, DX
	XORQ         AX, AX
	VBROADCASTSD lo+16(FP), Z28
	VBROADCASTSD hi+24(FP), Z27
	VBROADCASTSD first+32(FP), Z26
	VADDPD       iota<>(SB), Z26, Z26
	VBROADCASTSD eight<>(SB), Z25
	VBROADCASTSD x+40(FP), Z31
	VBROADCASTSD y+48(FP), Z30
	VBROADCASTSD z+56(FP), Z29
	VPXORQ       Z21, Z21, Z21
	VPXORQ       Z22, Z22, Z22
	VPXORQ       Z23, Z23, Z23
	VPXORQ       Z24, Z24, Z24
	TESTQ        CX, CX
	JLE          k8out

k8loop:
	VCMPPD  $0x1d, Z28, Z26, K1
	VCMPPD  $0x11, Z27, Z26, K1, K1
	VMOVUPD 0(DI), Z0
	VSUBPD  Z31, Z0, Z0
	VMOVUPD 64(DI), Z1
	VSUBPD  Z30, Z1, Z1
	VMOVUPD 128(DI), Z2
	VSUBPD  Z29, Z2, Z2
	VMOVUPD 192(DI), Z3
	VSUBPD  Z31, Z3, Z3
	VMOVUPD 256(DI), Z4
	VSUBPD  Z30, Z4, Z4
	VMOVUPD 320(DI), Z5
	VSUBPD  Z29, Z5, Z5
	VMOVUPD 384(DI), Z6
	VMOVUPD 448(DI), Z7
	VMOVUPD 512(DI), Z8
	VMOVUPD 576(DI), Z9
	VMOVUPD 640(DI), Z10

	// R1, R2
	VMULPD  Z0, Z0, Z11
	VMULPD  Z1, Z1, Z12
	VADDPD  Z12, Z11, Z11
	VMULPD  Z2, Z2, Z12
	VADDPD  Z12, Z11, Z11
	VSQRTPD Z11, Z11
	VMULPD  Z3, Z3, Z12
	VMULPD  Z4, Z4, Z13
	VADDPD  Z13, Z12, Z12
	VMULPD  Z5, Z5, Z13
	VADDPD  Z13, Z12, Z12
	VSQRTPD Z12, Z12

	// h² = |r1 × ê|², the near-line test h² ≤ (nearLineA·(R1 + R2))²
	VMULPD      Z8, Z1, Z13
	VMULPD      Z7, Z2, Z14
	VSUBPD      Z14, Z13, Z13
	VMULPD      Z6, Z2, Z14
	VMULPD      Z8, Z0, Z15
	VSUBPD      Z15, Z14, Z14
	VMULPD      Z7, Z0, Z15
	VMULPD      Z6, Z1, Z16
	VSUBPD      Z16, Z15, Z15
	VMULPD      Z13, Z13, Z13
	VMULPD      Z14, Z14, Z14
	VADDPD      Z14, Z13, Z13
	VMULPD      Z15, Z15, Z15
	VADDPD      Z15, Z13, Z13
	VADDPD      Z12, Z11, Z14
	VMULPD.BCST ·aNearLine(SB), Z14, Z15
	VMULPD      Z15, Z15, Z15
	VCMPPD      $0x12, Z15, Z13, K1, K2
	KANDNW      K1, K2, K3

	// x = L(R1 + R2 + L)/t
	VMULPD  Z12, Z11, Z15
	VMULPD  Z3, Z0, Z16
	VMULPD  Z4, Z1, Z17
	VADDPD  Z17, Z16, Z16
	VMULPD  Z5, Z2, Z17
	VADDPD  Z17, Z16, Z16
	VADDPD  Z9, Z14, Z14
	VMULPD  Z9, Z14, Z17
	VCMPPD  $0x1d, Z21, Z16, K4
	VSUBPD  Z16, Z15, Z18
	VMULPD  Z18, Z14, Z18
	VMULPD  Z13, Z9, Z19
	VADDPD  Z16, Z15, Z20
	VMOVAPD Z17, K4, Z18
	VMOVAPD Z20, K4, Z19
	VDIVPD  Z19, Z18, Z16

	LOG1P8

	VMULPD      Z10, Z15, Z15
	VFMADD231PD Z6, Z15, K3, Z22
	VFMADD231PD Z7, Z15, K3, Z23
	VFMADD231PD Z8, Z15, K3, Z24
	INCQ        DX
	KORTESTW    K2, K2
	JNZ         k8flag
	ADDQ        $704, DI
	VADDPD      Z25, Z26, Z26
	CMPQ        DX, CX
	JLT         k8loop
	JMP         k8out

k8flag:
	KMOVW K2, AX

k8out:
	MOVQ  DX, done+88(FP)
	MOVQ  AX, flags+96(FP)
	SUM8(Z22)
	MOVSD X0, sx+64(FP)
	SUM8(Z23)
	MOVSD X0, sy+72(FP)
	SUM8(Z24)
	MOVSD X0, sz+80(FP)
	VZEROUPPER
	RET
