package ode

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// The Radau IIA coefficients satisfy the simplifying assumptions that
// define the method (Hairer and Wanner, Solving ODE II, 2nd ed., 1996,
// §IV.5, Table 5.6 and Theorem 5.3): C(3), Σ_j a_ij c_j^(k−1) = c_i^k/k for
// k = 1..3, and B(5), Σ_i b_i c_i^(k−1) = 1/k for k = 1..5, with b the last
// row of A. Tolerance: 1e-14, a few rounding units of sums of three terms
// of size one.
func TestRadauCoefficients(t *testing.T) {
	const tol = 1e-14
	for i := 0; i < 3; i++ {
		for k := 1; k <= 3; k++ {
			var s float64
			for j := 0; j < 3; j++ {
				s += aRadau[i][j] * math.Pow(cRadau[j], float64(k-1))
			}
			if want := math.Pow(cRadau[i], float64(k)) / float64(k); math.Abs(s-want) > tol {
				t.Errorf("C(3): row %d, k = %d: %.17g, want %.17g", i, k, s, want)
			}
		}
	}
	for k := 1; k <= 5; k++ {
		var s float64
		for i := 0; i < 3; i++ {
			s += aRadau[2][i] * math.Pow(cRadau[i], float64(k-1))
		}
		if want := 1 / float64(k); math.Abs(s-want) > tol {
			t.Errorf("B(5): k = %d: %.17g, want %.17g", k, s, want)
		}
	}
}

// γ0 is an eigenvalue of A (the inverse of A⁻¹'s real eigenvalue; Hairer
// and Wanner 1996, §IV.8). Checked with gonum's general eigen-solver, a
// route that shares nothing with the closed form for γ0. Tolerance 1e-13:
// the eigen-solver's backward error on a 3×3 matrix of size one.
func TestGamma0IsEigenvalue(t *testing.T) {
	a := mat.NewDense(3, 3, nil)
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			a.Set(i, j, aRadau[i][j])
		}
	}
	var eig mat.Eigen
	if !eig.Factorize(a, mat.EigenNone) {
		t.Fatal("eigen-decomposition failed")
	}
	found := false
	for _, v := range eig.Values(nil) {
		if imag(v) == 0 || math.Abs(imag(v)) < 1e-14 {
			if math.Abs(real(v)-gamma0) < 1e-13 {
				found = true
			}
			t.Logf("real eigenvalue of A: %.16g (γ0 = %.16g)", real(v), gamma0)
		}
	}
	if !found {
		t.Errorf("γ0 = %.16g is not an eigenvalue of A: %v", gamma0, eig.Values(nil))
	}
}

// The embedded solution ŷ1 = y0 + h(γ0 f(t0, y0) + Σ b̂_i f_i) has order 3
// (Hairer and Wanner 1996, §IV.8), so the estimate ŷ1 − y1 = γ0 h f0 +
// Σ e_i Z_i, with Z = h A f, vanishes for y' = t^k, k = 0, 1, 2:
// γ0 δ_k0 + Σ_j (Aᵀe)_j c_j^k = 0. Tolerance 1e-13 (the e_i are of size 10).
func TestErrorEstimateOrder(t *testing.T) {
	for k := 0; k <= 2; k++ {
		s := 0.0
		if k == 0 {
			s = gamma0
		}
		for j := 0; j < 3; j++ {
			var ate float64
			for i := 0; i < 3; i++ {
				ate += aRadau[i][j] * eRadau[i]
			}
			s += ate * math.Pow(cRadau[j], float64(k))
		}
		if math.Abs(s) > 1e-13 {
			t.Errorf("k = %d: residual %.3g, want 0", k, s)
		}
	}
}
