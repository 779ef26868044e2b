//go:build !amd64 || purego

package em

// bKernels is empty where no vector kernel is written: the scalar loop
// (segmentsB) computes every field.
var bKernels []bKernel

// run is never called: there are no kernels here.
func (k *bKernel) run(blk *float64, chain *uint8, from, n int, x, y, z float64, acc *[24]float64) int {
	panic("em: no vector B kernel on this architecture")
}
