package em

import (
	"math"
	"math/big"
	"testing"
)

// bigMaxwell returns Maxwell's mutual inductance of two coaxial circles
// (radii a, b, planes d apart) and its derivative in d from the defining
// Neumann integral in refPrec bits:
//
//	M = μ0/4π ∮∮ dl1·dl2/|r1 − r2| = μ0 a b/2 ∫0^2π cos φ dφ/R,
//	dM/dd = −μ0 a b d/2 ∫0^2π cos φ dφ/R³,   R² = a² + b² + d² − 2ab cos φ,
//
// (Neumann's formula for two coaxial circles, e.g. Grover, Inductance
// Calculations, 1946, ch. 13), each integral by bigCircleC1/bigCircleC3's
// trapezoidal rule on 256 points, checked against 128 (agreement to 1e-30
// or the reference is not converged). Shares no code with coupling.go.
func bigMaxwell(t *testing.T, a, b, d float64) (m, dm float64) {
	t.Helper()
	c1 := bigCircleC1(a, b, d, 256)
	c1c := bigCircleC1(a, b, d, 128)
	c3, _ := bigCircleC3(a, b, d, 256)
	c3c, _ := bigCircleC3(a, b, d, 128)
	for _, p := range [][2]float64{{f64(c1), f64(bigSub(c1, c1c))}, {f64(c3), f64(bigSub(c3, c3c))}} {
		if math.Abs(p[1]) > 1e-30*math.Abs(p[0]) {
			t.Fatalf("reference not converged at a=%g b=%g d=%g", a, b, d)
		}
	}
	k := bigMul(bigf(Mu0/2), bigMul(bigf(a), bigf(b)))
	m = f64(bigMul(k, c1))
	dm = -f64(bigMul(bigMul(k, bigf(d)), c3))
	return m, dm
}

func f64(x *big.Float) float64 {
	v, _ := x.Float64()
	return v
}

// TestMaxwellFar: MaxwellMutual and MaxwellMutualDd for coaxial circles
// from one to 10⁶ radii apart against bigMaxwell. Far apart
// the bracket (2 − m)E/(1 − m) − 2K of the closed form of dM/dd is
// 3πm²/16 + O(m³) out of terms of O(1), so it kept only about ε/m² of
// itself (m ≈ 4ab/d²): 8.5e10 relative at 10⁶ radii, the sign lost
// beyond 10⁴. Tolerance 3e-15 relative: the series in m (below m = 1/2)
// summed to 1e-17 of itself, ~60 terms and the prefactor a few dozen
// roundings; above it gonum's complete integrals (a few 1e-16 each), in
// differences a few times smaller than their terms near m = 1/2 (seen
// there: 1.9e-15 for M, 1.3e-15 for dM/dd). Largest errors are logged.
func TestMaxwellFar(t *testing.T) {
	const tol = 3e-15
	var worstM, worstD float64
	for _, ab := range [][2]float64{{0.05, 0.05}, {0.05, 0.02}, {0.01, 0.3}, {1, 0.999}} {
		a, b := ab[0], ab[1]
		for e := 0.0; e <= 6; e += 0.25 {
			d := math.Max(a, b) * math.Pow(10, e)
			m, dm := bigMaxwell(t, a, b, d)
			gm, gd := MaxwellMutual(a, b, d), MaxwellMutualDd(a, b, d)
			em, ed := math.Abs(gm-m)/math.Abs(m), math.Abs(gd-dm)/math.Abs(dm)
			worstM, worstD = math.Max(worstM, em), math.Max(worstD, ed)
			if em > tol || ed > tol {
				t.Errorf("a=%g b=%g d=%g: M %.17g (ref %.17g, %.2g), dM/dd %.17g (ref %.17g, %.2g)", a, b, d, gm, m, em, gd, dm, ed)
			}
		}
	}
	t.Logf("largest relative error: M %.2g, dM/dd %.2g", worstM, worstD)
}
