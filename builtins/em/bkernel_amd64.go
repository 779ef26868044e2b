//go:build amd64 && !purego

package em

import "golang.org/x/sys/cpu"

// The kernels are written by hand in Go assembly (bkernel_amd64.s): Go has
// no vector types in a plain build (its simd package needs a
// GOEXPERIMENT), and the guard's proof (bkernel.go) rests on the exact
// order and rounding of each operation, which a small hand-written loop
// states plainly and no generator would make clearer.

// bGroupsAVX512 is the kernel of bKernel.run with 8 lanes (AVX-512F).
//
//go:noescape
func bGroupsAVX512(blk *float64, chain *uint8, from, n int, x, y, z float64, acc *[24]float64) int

// bGroupsAVX2 is the kernel of bKernel.run with 4 lanes (AVX2 and FMA);
// group k is half k mod 2 of block k/2.
//
//go:noescape
func bGroupsAVX2(blk *float64, chain *uint8, from, n int, x, y, z float64, acc *[24]float64) int

// bKernels lists the kernels this CPU runs, widest first (x/sys/cpu checks
// that the operating system saves the vector registers too).
var bKernels = cpuKernels()

func cpuKernels() []bKernel {
	var ks []bKernel
	if cpu.X86.HasAVX512F {
		ks = append(ks, bKernel{name: "avx512", lanes: 8, id: kernelAVX512})
	}
	if cpu.X86.HasAVX2 && cpu.X86.HasFMA {
		ks = append(ks, bKernel{name: "avx2", lanes: 4, id: kernelAVX2})
	}
	return ks
}

const (
	kernelAVX512 = iota
	kernelAVX2
)

// run calls the kernel's assembly function directly (not through a
// function value, which would make acc escape to the heap at every point).
func (k *bKernel) run(blk *float64, chain *uint8, from, n int, x, y, z float64, acc *[24]float64) int {
	if k.id == kernelAVX512 {
		return bGroupsAVX512(blk, chain, from, n, x, y, z, acc)
	}
	return bGroupsAVX2(blk, chain, from, n, x, y, z, acc)
}
