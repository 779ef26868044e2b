//go:build !amd64 || purego

package em

// bKernels is empty where no vector kernel is written: the scalar loop
// (segmentsB) computes every field.
var bKernels []bKernel
