package em

import (
	"errors"
	"math"
	"math/big"
	"testing"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/spatial/r3"
)

// qRefSlack is the allowance for rounding in a float64 reference value that is
// computed from an exact closed form with a handful (≤ 8) of correctly or
// nearly correctly rounded operations: each contributes at most ~1 ulp, so
// 8·eps·|ref| bounds the difference between the float64 reference and the
// exact value.
func qRefSlack(ref float64) float64 { return 8 * quadEps * math.Abs(ref) }

// qCheckScalar asserts that the result meets the requested tolerance and that
// the error estimate bounds the true error: |val-ref| <= est + qRefSlack(ref).
// Together with est <= max(Abs, Rel*|val|) (the acceptance rule) this bounds
// the true error by the requested tolerance.
func qCheckScalar(t *testing.T, name string, val, est, ref float64, tol Tol) {
	t.Helper()
	trueErr := math.Abs(val - ref)
	target := math.Max(tol.Abs, tol.Rel*math.Abs(val))
	if est > target {
		t.Errorf("%s: estimate %.3g exceeds target %.3g", name, est, target)
	}
	if trueErr > est+qRefSlack(ref) {
		t.Errorf("%s: true error %.3g not bounded by estimate %.3g (val %.17g, ref %.17g)", name, trueErr, est, val, ref)
	}
	t.Logf("%s: val=%.17g ref=%.17g trueErr=%.3g est=%.3g", name, val, ref, trueErr, est)
}

func qCheckVec(t *testing.T, name string, val r3.Vec, est float64, ref r3.Vec, tol Tol) {
	t.Helper()
	trueErr := r3.Norm(r3.Sub(val, ref))
	target := math.Max(tol.Abs, tol.Rel*r3.Norm(val))
	if est > target {
		t.Errorf("%s: estimate %.3g exceeds target %.3g", name, est, target)
	}
	if trueErr > est+qRefSlack(r3.Norm(ref)) {
		t.Errorf("%s: true error %.3g not bounded by estimate %.3g (val %v, ref %v)", name, trueErr, est, val, ref)
	}
	t.Logf("%s: val=%v trueErr=%.3g est=%.3g", name, val, trueErr, est)
}

// qCounted wraps f and counts its calls.
func qCounted(f func(float64) float64, n *int) func(float64) float64 {
	return func(x float64) float64 { *n++; return f(x) }
}

// TestRuleTables checks the QUADPACK node/weight tables independently of
// their source: on [-1,1], ∫x^k dx = 2/(k+1) for even k and 0 for odd k. The
// 15-point Kronrod extension of the 7-point Gauss rule is exact up to degree
// 3·7+1 = 22 (23 by symmetry) and the Gauss rule up to 2·7-1 = 13; both rules
// are unique with these properties, so passing this test pins every entry. Sums
// of 15 terms with weights summing to 2 and |x^k| <= 1 round to within
// 15·2·eps ≈ 7e-15; 1e-14 is used. Degree 24 must not be exact (the K15 rule
// is not of higher degree), which guards against a mistyped test.
func TestRuleTables(t *testing.T) {
	moment := func(w [15]float64, k int) float64 {
		s := 0.0
		for i, x := range gkNodes {
			s += w[i] * math.Pow(x, float64(k))
		}
		return s
	}
	exact := func(k int) float64 {
		if k%2 == 1 {
			return 0
		}
		return 2 / float64(k+1)
	}
	for k := 0; k <= 23; k++ {
		if d := math.Abs(moment(gkKW, k) - exact(k)); d > 1e-14 {
			t.Errorf("Kronrod rule degree %d: error %.3g", k, d)
		}
	}
	for k := 0; k <= 13; k++ {
		if d := math.Abs(moment(gkGW, k) - exact(k)); d > 1e-14 {
			t.Errorf("Gauss rule degree %d: error %.3g", k, d)
		}
	}
	if d := math.Abs(moment(gkKW, 24) - exact(24)); d < 1e-10 {
		t.Errorf("Kronrod rule unexpectedly exact at degree 24 (%.3g)", d)
	}
	if d := math.Abs(moment(gkGW, 14) - exact(14)); d < 1e-6 {
		t.Errorf("Gauss rule unexpectedly exact at degree 14 (%.3g)", d)
	}
}

// TestPolynomialExact: a degree-13 polynomial (= 2·7-1, the Gauss degree, so
// both rules of the pair are exact) with integer coefficients on [-1, 2]. The
// reference is the exact rational ∫ computed with math/big. The first rule
// application must already be accepted (15 calls) and the result is exact up
// to rounding: 15 Horner evaluations of degree 13 with ≤ 2·13 roundings each,
// plus the 15-term sum, give an error below (2·13+15+2)·eps·S where
// S = ∫|c_k||x|^k dx ≤ Σ|c_k|·2^(k+1)/(k+1); 64·eps·S is asserted.
func TestPolynomialExact(t *testing.T) {
	c := []int64{3, -7, 2, 5, -1, 4, -6, 1, 2, -3, 1, 1, -2, 1} // c[k] x^k
	a, b := int64(-1), int64(2)
	p := func(x float64) float64 {
		s := 0.0
		for k := len(c) - 1; k >= 0; k-- {
			s = s*x + float64(c[k])
		}
		return s
	}
	exact := new(big.Rat)
	scale := 0.0
	for k, ck := range c {
		// ck (b^(k+1) - a^(k+1)) / (k+1)
		bp := new(big.Int).Exp(big.NewInt(b), big.NewInt(int64(k+1)), nil)
		ap := new(big.Int).Exp(big.NewInt(a), big.NewInt(int64(k+1)), nil)
		num := new(big.Int).Mul(big.NewInt(ck), new(big.Int).Sub(bp, ap))
		exact.Add(exact, new(big.Rat).SetFrac(num, big.NewInt(int64(k+1))))
		scale += math.Abs(float64(ck)) * math.Pow(2, float64(k+1)) / float64(k+1)
	}
	ref, _ := exact.Float64()
	n := 0
	tol := Tol{Rel: 1e-12}
	val, est, err := Integrate(qCounted(p, &n), float64(a), float64(b), tol)
	if err != nil {
		t.Fatal(err)
	}
	if n != 15 {
		t.Errorf("polynomial of Gauss degree needed %d calls, want 15 (one rule)", n)
	}
	if d := math.Abs(val - ref); d > 64*quadEps*scale {
		t.Errorf("polynomial: error %.3g > %.3g", d, 64*quadEps*scale)
	}
	qCheckScalar(t, "degree-13 polynomial", val, est, ref, tol)

	// A tolerance below the rounding floor (50·eps·∫|p| ≈ 1.1e-14·∫|p|) cannot
	// be met; the roundoff test must stop the loop after a few bisections
	// instead of spending the whole default budget of 200000 calls, and the
	// best value is still exact up to rounding.
	n = 0
	v2, _, err := Integrate(qCounted(p, &n), float64(a), float64(b), Tol{Rel: 1e-16})
	if !errors.Is(err, ErrNoConvergence) || n > 1000 || math.Abs(v2-ref) > 64*quadEps*scale {
		t.Errorf("unreachable tolerance: %v after %d calls, value %v", err, n, v2)
	}
	t.Logf("unreachable tolerance: %v", err)
}

// TestSmoothAndSingular covers smooth and endpoint-singular 1-D integrands. Every
// case requests Rel (and, where the reference can be 0, Abs) and is checked with
// qCheckScalar, i.e. true error <= estimate <= requested tolerance.
func TestSmoothAndSingular(t *testing.T) {
	const eps = 1e-4
	cases := []struct {
		name string
		f    func(float64) float64
		a, b float64
		ref  float64
		tol  Tol
	}{
		// ∫_0^π sin x dx = [-cos x]_0^π = 2 (elementary antiderivative).
		{"sin on [0,π]", math.Sin, 0, math.Pi, 2, Tol{Rel: 1e-12}},
		// ∫_0^1 x^-1/2 dx = [2√x]_0^1 = 2 (elementary antiderivative);
		// integrable endpoint singularity.
		{"x^-1/2 on [0,1]", func(x float64) float64 { return 1 / math.Sqrt(x) }, 0, 1, 2, Tol{Rel: 1e-8}},
		// ∫_0^1 ln x dx = [x ln x - x]_0^1 = -1 (elementary antiderivative).
		{"ln x on [0,1]", math.Log, 0, 1, -1, Tol{Rel: 1e-8}},
		// ∫_{-1}^{1} dx/(x²+ε²) = (2/ε)·atan(1/ε) (antiderivative atan(x/ε)/ε);
		// sharp peak of height 1e8 and width 1e-4.
		{"peak ε=1e-4", func(x float64) float64 { return 1 / (x*x + eps*eps) }, -1, 1,
			2 / eps * math.Atan(1/eps), Tol{Rel: 1e-10}},
		// Reversed bounds: ∫_π^0 sin = -2.
		{"sin on [π,0]", math.Sin, math.Pi, 0, -2, Tol{Rel: 1e-12}},
		// Pure absolute tolerance: ∫_0^{2π} sin = 0.
		{"sin on [0,2π] abs", math.Sin, 0, 2 * math.Pi, 0, Tol{Abs: 1e-12}},
	}
	for _, c := range cases {
		n := 0
		val, est, err := Integrate(qCounted(c.f, &n), c.a, c.b, c.tol)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		qCheckScalar(t, c.name, val, est, c.ref, c.tol)
		t.Logf("%s: %d integrand calls", c.name, n)
		maxEval := c.tol.MaxEval
		if maxEval == 0 {
			maxEval = quadDefaultMaxEval
		}
		if n > maxEval {
			t.Errorf("%s: %d calls exceed MaxEval %d", c.name, n, maxEval)
		}
	}
}

// TestCompleteK compares K(m) = ∫_0^{π/2} (1 - m sin²θ)^{-1/2} dθ with gonum's
// mathext.CompleteK (Fukushima's piecewise minimax approximation, J. Comput.
// Appl. Math. 282 (2015) 71-76, accurate to a few ulp), an independent
// implementation. The requested relative tolerance is 1e-12; allowed is
// |val - ref| <= est + 8·eps·|ref| (reference rounding, see qRefSlack) and
// K(0) = π/2 exactly.
func TestCompleteK(t *testing.T) {
	tol := Tol{Rel: 1e-12}
	for _, m := range []float64{0, 0.1, 0.5, 0.9, 0.99, 0.9999} {
		f := func(th float64) float64 {
			s := math.Sin(th)
			return 1 / math.Sqrt(1-m*s*s)
		}
		val, est, err := Integrate(f, 0, math.Pi/2, tol)
		if err != nil {
			t.Errorf("m=%g: %v", m, err)
			continue
		}
		qCheckScalar(t, "K(m)", val, est, mathext.CompleteK(m), tol)
	}
}

// TestIntegrateVec: two vector integrands with closed forms.
func TestIntegrateVec(t *testing.T) {
	// ∫_0^{π/2} (cos t, sin t, t) dt = (1, 1, π²/8) (elementary antiderivatives).
	tol := Tol{Rel: 1e-12}
	val, est, err := IntegrateVec(func(t float64) r3.Vec {
		return r3.Vec{X: math.Cos(t), Y: math.Sin(t), Z: t}
	}, 0, math.Pi/2, tol)
	if err != nil {
		t.Fatal(err)
	}
	qCheckVec(t, "(cos,sin,t)", val, est, r3.Vec{X: 1, Y: 1, Z: math.Pi * math.Pi / 8}, tol)

	// Line integral ∮ dl × (P - r)/|P - r|³ around the circle r(t) = R(cos t,
	// sin t, 0), P = (0, 0, z). Direct algebra: dl/dt = R(-sin t, cos t, 0),
	// P - r = (-R cos t, -R sin t, z), cross product (Rz cos t, Rz sin t, R²),
	// |P - r|² = R² + z²; the cos/sin terms integrate to 0 over a period, so the
	// result is (0, 0, 2πR²/(R²+z²)^{3/2}).
	const R, z = 0.7, 0.3
	P := r3.Vec{Z: z}
	f := func(t float64) r3.Vec {
		s, c := math.Sincos(t)
		r := r3.Vec{X: R * c, Y: R * s}
		dl := r3.Vec{X: -R * s, Y: R * c}
		d := r3.Sub(P, r)
		n := r3.Norm(d)
		return r3.Scale(1/(n*n*n), r3.Cross(dl, d))
	}
	ref := r3.Vec{Z: 2 * math.Pi * R * R / math.Pow(R*R+z*z, 1.5)}
	val, est, err = IntegrateVec(f, 0, 2*math.Pi, tol)
	if err != nil {
		t.Fatal(err)
	}
	qCheckVec(t, "loop integral", val, est, ref, tol)

	// Reversed bounds negate.
	rev, _, err := IntegrateVec(f, 2*math.Pi, 0, tol)
	if err != nil {
		t.Fatal(err)
	}
	if rev != r3.Scale(-1, val) {
		t.Errorf("reversed bounds: %v, want %v", rev, r3.Scale(-1, val))
	}
}

// TestIntegrate2 covers the surface integrals.
func TestIntegrate2(t *testing.T) {
	cases := []struct {
		name           string
		f              func(u, v float64) float64
		a0, b0, a1, b1 float64
		ref            float64
		tol            Tol
	}{
		// ∫_0^1∫_0^1 xy dy dx = (1/2)(1/2) = 1/4 (separable).
		{"xy on unit square", func(x, y float64) float64 { return x * y }, 0, 1, 0, 1, 0.25, Tol{Rel: 1e-13}},
		// Disk of radius 1.5 in polar coordinates: ∫_0^{1.5}∫_0^{2π} r dθ dr = π·1.5².
		{"disk area (polar)", func(r, th float64) float64 { return r }, 0, 1.5, 0, 2 * math.Pi,
			math.Pi * 1.5 * 1.5, Tol{Rel: 1e-13}},
		// ∫_0^1∫_0^1 e^{x+y} = (e-1)² (separable).
		{"exp(x+y)", func(x, y float64) float64 { return math.Exp(x + y) }, 0, 1, 0, 1,
			(math.E - 1) * (math.E - 1), Tol{Rel: 1e-12}},
		// ∫_0^1∫_0^1 (x²+y²)^{-1/2} dy dx: by symmetry twice the triangle
		// 0<=θ<=π/4, 0<=r<=1/cos θ in polar coordinates, where the integrand
		// times r is 1, so the value is 2∫_0^{π/4} sec θ dθ =
		// 2 ln(sec θ + tan θ)|_0^{π/4} = 2 ln(1+√2). Corner 1/r singularity.
		{"1/r corner", func(x, y float64) float64 { return 1 / math.Hypot(x, y) }, 0, 1, 0, 1,
			2 * math.Log(1+math.Sqrt2), Tol{Rel: 1e-8}},
		// Reversed u range flips the sign.
		{"xy reversed u", func(x, y float64) float64 { return x * y }, 1, 0, 0, 1, -0.25, Tol{Rel: 1e-13}},
	}
	for _, c := range cases {
		n := 0
		f := func(u, v float64) float64 { n++; return c.f(u, v) }
		val, est, err := Integrate2(f, c.a0, c.b0, c.a1, c.b1, c.tol)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		qCheckScalar(t, c.name, val, est, c.ref, c.tol)
		t.Logf("%s: %d integrand calls", c.name, n)
	}
}

// TestBreaks: ∫_0^1 |x-0.3| dx = 0.3²/2 + 0.7²/2 = 0.29 (two triangles), and
// ∫_0^1 |x-0.7| dx = 0.29 likewise. With the kinks given as break points each
// piece is linear, so the first rules are exact up to rounding (15 calls per
// piece); without them the adaptive loop must resolve the kink.
func TestBreaks(t *testing.T) {
	tol := Tol{Rel: 1e-12}
	n := 0
	f := func(x float64) r3.Vec {
		n++
		return r3.Vec{X: math.Abs(x - 0.3), Y: math.Abs(x - 0.7), Z: 1}
	}
	ref := r3.Vec{X: 0.29, Y: 0.29, Z: 1}
	val, est, err := IntegrateVecBreaks(f, []float64{0, 0.3, 0.7, 1}, tol)
	if err != nil {
		t.Fatal(err)
	}
	qCheckVec(t, "with breaks", val, est, ref, tol)
	if n != 45 {
		t.Errorf("with breaks: %d calls, want 45", n)
	}
	withBreaks := n

	// Repeated break points are skipped.
	n = 0
	val2, _, err := IntegrateVecBreaks(f, []float64{0, 0.3, 0.3, 0.7, 1, 1}, tol)
	if err != nil || n != 45 || val2 != val {
		t.Errorf("repeated breaks: %v, %d calls, %v", val2, n, err)
	}

	n = 0
	val, est, err = IntegrateVec(f, 0, 1, tol)
	if err != nil {
		t.Fatal(err)
	}
	qCheckVec(t, "without breaks", val, est, ref, tol)
	t.Logf("|x-0.3|,|x-0.7|: %d calls with breaks, %d without", withBreaks, n)
}

// TestNoConvergence: a budget too small for x^-1/2 must yield ErrNoConvergence
// wrapped in a *QuadError that repeats the returned best value and estimate.
func TestNoConvergence(t *testing.T) {
	n := 0
	f := qCounted(func(x float64) float64 { return 1 / math.Sqrt(x) }, &n)
	val, est, err := Integrate(f, 0, 1, Tol{Rel: 1e-10, MaxEval: 100})
	if !errors.Is(err, ErrNoConvergence) {
		t.Fatalf("err = %v, want ErrNoConvergence", err)
	}
	var qe *QuadError
	if !errors.As(err, &qe) {
		t.Fatalf("err %T is not *QuadError", err)
	}
	if qe.Value != val || qe.Estimate != est || qe.Evals != n || n > 100 {
		t.Errorf("QuadError %+v, returned val %v est %v, calls %d", qe, val, est, n)
	}
	// The best value is still a usable approximation and the estimate bounds
	// its error: |val - 2| <= est.
	if math.Abs(val-2) > est || est <= qe.Target {
		t.Errorf("best value %v with estimate %v (target %v)", val, est, qe.Target)
	}
	t.Logf("MaxEval=100: %v; val=%v |val-2|=%.3g", err, val, math.Abs(val-2))

	// Vector and 2-D variants carry their own best values.
	v, _, err := IntegrateVec(func(x float64) r3.Vec { return r3.Vec{Y: 1 / math.Sqrt(x)} }, 0, 1, Tol{Rel: 1e-10, MaxEval: 40})
	if !errors.As(err, &qe) || qe.Vec != v || qe.Value != 0 || qe.Evals != 15 {
		t.Errorf("IntegrateVec: %v %+v", err, qe)
	}
	u, _, err := Integrate2(func(x, y float64) float64 { return 1 / math.Hypot(x, y) }, 0, 1, 0, 1, Tol{Rel: 1e-10, MaxEval: 1000})
	if !errors.As(err, &qe) || qe.Value != u || qe.Evals != 675 {
		t.Errorf("Integrate2: %v %+v", err, qe)
	}
}

// TestDeterminism: repeated runs give bit-identical values and estimates.
func TestDeterminism(t *testing.T) {
	run := func() [4]uint64 {
		tol := Tol{Rel: 1e-10}
		a, ea, _ := Integrate(func(x float64) float64 { return 1 / (x*x + 1e-8) }, -1, 1, tol)
		b, eb, _ := Integrate2(func(x, y float64) float64 { return 1 / math.Hypot(x, y) }, 0, 1, 0, 1, Tol{Rel: 1e-8})
		return [4]uint64{math.Float64bits(a), math.Float64bits(ea), math.Float64bits(b), math.Float64bits(eb)}
	}
	first := run()
	for i := 0; i < 3; i++ {
		if got := run(); got != first {
			t.Fatalf("run %d: %x, first %x", i, got, first)
		}
	}
}

// TestInvalidInputs: bad inputs give plain errors (not ErrNoConvergence), never
// panics; a == b gives 0.
func TestInvalidInputs(t *testing.T) {
	one := func(float64) float64 { return 1 }
	good := Tol{Rel: 1e-10}
	if v, e, err := Integrate(one, 0.5, 0.5, good); v != 0 || e != 0 || err != nil {
		t.Errorf("a==b: %v %v %v", v, e, err)
	}
	if v, e, err := Integrate2(func(u, v float64) float64 { return 1 }, 0, 1, 2, 2, good); v != 0 || e != 0 || err != nil {
		t.Errorf("2-D degenerate: %v %v %v", v, e, err)
	}
	plain := func(name string, err error) {
		t.Helper()
		if err == nil || errors.Is(err, ErrNoConvergence) {
			t.Errorf("%s: err = %v, want a plain error", name, err)
		}
	}
	nan, inf := math.NaN(), math.Inf(1)
	_, _, err := Integrate(one, nan, 1, good)
	plain("NaN bound", err)
	_, _, err = Integrate(one, 0, inf, good)
	plain("Inf bound", err)
	_, _, err = Integrate(one, 0, 1, Tol{})
	plain("zero tolerance", err)
	_, _, err = Integrate(one, 0, 1, Tol{Rel: -1e-8, Abs: 1})
	plain("negative Rel", err)
	_, _, err = Integrate(one, 0, 1, Tol{Abs: nan})
	plain("NaN Abs", err)
	_, _, err = Integrate(one, 0, 1, Tol{Rel: 1e-8, MaxEval: -1})
	plain("negative MaxEval", err)
	_, _, err = Integrate(nil, 0, 1, good)
	plain("nil f", err)
	_, _, err = Integrate2(func(u, v float64) float64 { return 1 }, 0, 1, nan, 1, good)
	plain("2-D NaN bound", err)
	_, _, err = Integrate2(func(u, v float64) float64 { return 1 }, 0, 1, 0, 1, Tol{Rel: inf})
	plain("2-D Inf tolerance", err)
	_, _, err = IntegrateVecBreaks(func(float64) r3.Vec { return r3.Vec{} }, []float64{0, 2, 1}, good)
	plain("unsorted breaks", err)
	_, _, err = IntegrateVecBreaks(func(float64) r3.Vec { return r3.Vec{} }, []float64{0}, good)
	plain("single break", err)
	_, _, err = IntegrateVecBreaks(func(float64) r3.Vec { return r3.Vec{} }, []float64{0, nan}, good)
	plain("NaN break", err)

	// Integrands that return NaN or Inf somewhere give an error, not a NaN
	// result. The NaN appears only after some bisections.
	_, _, err = Integrate(func(x float64) float64 {
		if x > 0.5 && x < 0.5+1e-3 {
			return nan
		}
		return 1 / math.Sqrt(math.Abs(x-0.5))
	}, 0, 1, good)
	plain("NaN integrand", err)
	_, _, err = Integrate(func(x float64) float64 { return 1 / x }, -1, 1, good) // f(0) = +Inf at the centre node
	plain("Inf integrand", err)
	_, _, err = IntegrateVec(func(x float64) r3.Vec { return r3.Vec{Z: math.Log(x)} }, -1, 1, good)
	plain("vector NaN integrand", err)
	_, _, err = Integrate2(func(u, v float64) float64 { return 1 / (u + v) }, -1, 1, -1, 1, good)
	plain("2-D Inf integrand", err)
	t.Logf("example: %v", err)
}

// TestNoPerCallAllocation: the adaptive loop must not allocate per integrand
// call. x^-1/2 to 1e-10 needs thousands of calls; allowed are the fixed
// setup allocations (closures, the heap's backing array) and its doublings,
// which number O(log intervals), far below the call count.
func TestNoPerCallAllocation(t *testing.T) {
	f := func(x float64) r3.Vec { return r3.Vec{X: 1 / math.Sqrt(x)} }
	allocs := testing.AllocsPerRun(20, func() {
		_, _, _ = IntegrateVec(f, 0, 1, Tol{Rel: 1e-10})
	})
	n := 0
	_, _, _ = Integrate(qCounted(func(x float64) float64 { return 1 / math.Sqrt(x) }, &n), 0, 1, Tol{Rel: 1e-10})
	t.Logf("%v allocations for %d integrand calls", allocs, n)
	if allocs > 12 {
		t.Errorf("%v allocations per run", allocs)
	}
}

func BenchmarkIntegrateSqrt(b *testing.B) {
	f := func(x float64) float64 { return 1 / math.Sqrt(x) }
	b.ReportAllocs()
	for b.Loop() {
		_, _, _ = Integrate(f, 0, 1, Tol{Rel: 1e-10})
	}
}

func BenchmarkIntegrateVecLoop(b *testing.B) {
	P := r3.Vec{Z: 0.3}
	f := func(t float64) r3.Vec {
		s, c := math.Sincos(t)
		r := r3.Vec{X: 0.7 * c, Y: 0.7 * s}
		dl := r3.Vec{X: -0.7 * s, Y: 0.7 * c}
		d := r3.Sub(P, r)
		n := r3.Norm(d)
		return r3.Scale(1/(n*n*n), r3.Cross(dl, d))
	}
	b.ReportAllocs()
	for b.Loop() {
		_, _, _ = IntegrateVec(f, 0, 2*math.Pi, Tol{Rel: 1e-12})
	}
}

func BenchmarkIntegrate2Corner(b *testing.B) {
	f := func(x, y float64) float64 { return 1 / math.Hypot(x, y) }
	b.ReportAllocs()
	for b.Loop() {
		_, _, _ = Integrate2(f, 0, 1, 0, 1, Tol{Rel: 1e-8})
	}
}
