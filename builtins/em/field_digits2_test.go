package em

import (
	"math"
	"math/big"
	"testing"
)

// bigCircleC3 returns C3 = ∫0^2π cos φ dφ/R³ and I3 = ∫0^2π dφ/R³,
// R² = ρ² + a² + z² − 2aρ cos φ, in refPrec bits by the trapezoidal rule on
// n points, as bigCircleC1 does for C1 (Trefethen & Weideman, SIAM Review
// 56, 2014, theorem 3.2: geometric convergence for a periodic analytic
// integrand). No closed form, no code of field.go. B of a circle of radius
// a carrying I is μ0 I a/4π · (z·C3, 0, a·I3 − ρ·C3) in (ρ̂, φ̂, ẑ) (the
// Biot–Savart integral written in cylindrical coordinates).
func bigCircleC3(a, rho, z float64, n int) (c3, i3 *big.Float) {
	c, s := bigf(0), bigf(1)
	half := bigf(0.5)
	for m := 4; m < n; m *= 2 {
		c, s = bigSqrt(bigMul(half, bigAdd(bigf(1), c))), bigSqrt(bigMul(half, bigSub(bigf(1), c)))
	}
	A, Rho, Z := bigf(a), bigf(rho), bigf(z)
	base := bigAdd(bigAdd(bigMul(A, A), bigMul(Rho, Rho)), bigMul(Z, Z))
	two := bigMul(bigf(2), bigMul(A, Rho))
	sc, si := bigf(0), bigf(0)
	ck, sk := bigf(1), bigf(0)
	for k := 0; k < n; k++ {
		r2 := bigSub(base, bigMul(two, ck))
		inv3 := bigQuo(bigf(1), bigMul(r2, bigSqrt(r2)))
		sc = bigAdd(sc, bigMul(ck, inv3))
		si = bigAdd(si, inv3)
		ck, sk = bigSub(bigMul(ck, c), bigMul(sk, s)), bigAdd(bigMul(sk, c), bigMul(ck, s))
	}
	w := bigQuo(bigMul(bigf(2), bigPi()), bigf(float64(n)))
	return bigMul(w, sc), bigMul(w, si)
}

// refCircleB is B_ρ and B_z of a circle per ampere from bigCircleC3 on 256
// points, checked against 128: they must agree to 1e-30 or the reference
// is not converged.
func refCircleB(t *testing.T, a, rho, z float64) (br, bz float64) {
	t.Helper()
	c3, i3 := bigCircleC3(a, rho, z, 256)
	c3c, _ := bigCircleC3(a, rho, z, 128)
	d, _ := bigSub(c3, c3c).Float64()
	f, _ := c3.Float64()
	if math.Abs(d) > 1e-30*math.Abs(f) {
		t.Fatalf("reference not converged at a=%g ρ=%g z=%g: %g", a, rho, z, d/f)
	}
	k := bigMul(bigf(k0), bigf(a))
	br, _ = bigMul(k, bigMul(bigf(z), c3)).Float64()
	bz, _ = bigMul(k, bigSub(bigMul(bigf(a), i3), bigMul(bigf(rho), c3))).Float64()
	return br, bz
}

// TestCircleBNearAxis: B_ρ and B_z of a whole circle near its axis
// against bigCircleC3's extended-precision reference, at ρ/a from 1e-12 to
// 0.3, at several heights, and on both sides of the switch between the
// series and the closed form (β = 1/2: at 0.9, 1 ∓ 1e-6 and 1.1 of its ρ).
// Before the series, B_ρ was off by up to 5e-4 at ρ = 1e-12 a (relative
// error about ε·(a² + z²)/(4aρ)), and by 5e-15 still at ρ = 1e-2 a.
// Tolerance 3e-15 relative: the series' truncation is below 2^-60, its
// ~30 terms and the prefactor a dozen roundings; on the closed-form side
// (β ≥ 1/2) gonum's complete integrals (a few 1e-16) divided by m ≥ 0.5
// and a dozen roundings. The circle is in its own frame, so the local
// coordinates are exact. Largest errors are logged.
func TestCircleBNearAxis(t *testing.T) {
	const tol = 3e-15
	a := 0.05
	loop, err := NewCircle(Vec{}, Vec{Z: 1}, a)
	if err != nil {
		t.Fatal(err)
	}
	var worstR, worstZ float64
	for _, zr := range []float64{0.3, -0.05, -1.7, 5} {
		z := zr * a
		var rhos []float64
		if s := a*a + z*z; circleC3Beta*circleC3Beta*s < a*a {
			rt := circleRhoAtBeta(a, z, circleC3Beta)
			rhos = append(rhos, 0.9*rt, (1-1e-6)*rt, (1+1e-6)*rt, 1.1*rt)
		}
		for e := -12.0; e <= -0.5; e += 0.25 {
			rhos = append(rhos, a*math.Pow(10, e))
		}
		for _, rho := range rhos {
			got, err := ArcB(loop, Vec{X: rho, Z: z})
			if err != nil {
				t.Fatal(err)
			}
			br, bz := refCircleB(t, a, rho, z)
			// x on the +X axis: B_ρ along +X, no B_φ
			er, ez := math.Abs(got.X-br)/math.Abs(br), math.Abs(got.Z-bz)/math.Abs(bz)
			worstR, worstZ = math.Max(worstR, er), math.Max(worstZ, ez)
			if er > tol || ez > tol || math.Abs(got.Y) > tol*math.Abs(br) {
				t.Errorf("z=%g a, ρ=%g a: B = %v, reference (%.17g, 0, %.17g), relative %.2g, %.2g", zr, rho/a, got, br, bz, er, ez)
			}
		}
	}
	t.Logf("largest relative error: B_ρ %.2g, B_z %.2g", worstR, worstZ)
}

// TestCircleC3SeriesCoefficients checks the series' first coefficients as
// a formula, apart from the code: at ρ = 1e-2 a the three-term form
// 3μ0 a² z ρ/(4S⁵)·(1 + 35β²/32 + 1155β⁴/1024) must match the reference to
// O(β⁶) ≈ 1e-11, and the leading term alone must not (it misses by
// O(β²) ≈ 1e-4).
func TestCircleC3SeriesCoefficients(t *testing.T) {
	a := 1.0
	for _, z := range []float64{0.2, 1.3} {
		rho := 1e-2
		br, _ := refCircleB(t, a, rho, z)
		s2 := a*a + z*z + rho*rho
		b := 2 * a * rho / s2
		lead := 3 * Mu0 * a * a * z * rho / (4 * s2 * s2 * math.Sqrt(s2))
		three := lead * (1 + 35*b*b/32 + 1155*b*b*b*b/1024)
		if rel := math.Abs(three-br) / br; rel > 1e-10 {
			t.Errorf("z=%g: three-term series off by %.2g", z, rel)
		}
		if rel := math.Abs(lead-br) / br; rel < 1e-6 {
			t.Errorf("z=%g: leading term alone within %.2g: the test cannot see the next terms", z, rel)
		}
	}
}
