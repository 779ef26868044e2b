//go:build amd64 && !purego

package em

import "golang.org/x/sys/cpu"

// aKernels lists the vector kernels for segmentsA this CPU and its
// operating system support, slowest first: AVX2 with FMA (four lanes),
// then AVX-512F (eight lanes). golang.org/x/sys/cpu checks that the
// operating system saves the vector registers, too.
var aKernels = func() []*aKernel {
	var ks []*aKernel
	if cpu.X86.HasAVX2 && cpu.X86.HasFMA {
		ks = append(ks, &aKernel{name: "avx2", lanes: 4, run: aKernelAVX2})
	}
	if cpu.X86.HasAVX512F {
		ks = append(ks, &aKernel{name: "avx512", lanes: 8, run: aKernelAVX512})
	}
	return ks
}()

// aKernelAVX2 and aKernelAVX512 are aKernel.run (akernel_amd64.s).
//
//go:noescape
func aKernelAVX2(p *float64, nb int, lo, hi, first, x, y, z float64) (sx, sy, sz float64, done int, flags uint64)

//go:noescape
func aKernelAVX512(p *float64, nb int, lo, hi, first, x, y, z float64) (sx, sy, sz float64, done int, flags uint64)

// logAVX2 and logAVX512 set dst[i] = ln(src[i]) by the logarithm the
// kernels use, for n values (a multiple of 4, respectively 8), so that it
// can be tested alone.
//
//go:noescape
func logAVX2(dst, src *float64, n int)

//go:noescape
func logAVX512(dst, src *float64, n int)

// log1pAVX2 and log1pAVX512 set dst[i] = log1p(src[i]) (src[i] ≥ 0) by
// the log1p the kernels use, for n values (a multiple of 4, respectively
// 8), so that it can be tested alone.
//
//go:noescape
func log1pAVX2(dst, src *float64, n int)

//go:noescape
func log1pAVX512(dst, src *float64, n int)
