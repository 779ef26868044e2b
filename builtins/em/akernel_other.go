//go:build !amd64 || purego

package em

// aKernels lists the vector kernels for segmentsA this machine has: none
// outside amd64 (or with the purego tag), where the scalar loop runs.
var aKernels []*aKernel
