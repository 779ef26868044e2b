package em

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// cubeInvR2 is ∫_{[0,1]³} dV/(x²+y²+z²). Derivation: by symmetry the cube is
// three congruent pyramids with apex at the origin, e.g. 0 ≤ y, z ≤ x ≤ 1;
// with y = x s, z = x t the pyramid's integral is
// ∫_0^1 dx ∫∫_{[0,1]²} x²/(x²(1+s²+t²)) ds dt = ∫∫ ds dt/(1+s²+t²), and
// ∫_0^1 dt/(c²+t²) = atan(1/c)/c with c = √(1+s²), so the integral is
// 3 ∫_0^1 atan(1/√(1+s²))/√(1+s²) ds, a smooth 1-D integral evaluated here
// with Integrate to 1e-13.
func cubeInvR2(t *testing.T) float64 {
	t.Helper()
	v, _, err := Integrate(func(s float64) float64 {
		c := math.Sqrt(1 + s*s)
		return math.Atan(1/c) / c
	}, 0, 1, Tol{Rel: 1e-13})
	if err != nil {
		t.Fatal(err)
	}
	return 3 * v
}

// TestIntegrate3 checks the 3-D rule on a polynomial (exact), a Gaussian and
// a corner 1/r² singularity, scalar and vector.
func TestIntegrate3(t *testing.T) {
	// Polynomial: f = 1 + x²y³z⁵ − 3x⁷yz² on [0,1]×[−1,2]×[0.5,1.5]. Exact by
	// separation: the box volume 3, ∫x² = 1/3, ∫y³ = (16−1)/4, ∫z⁵ =
	// (1.5⁶−0.5⁶)/6, ∫x⁷ = 1/8, ∫y = (4−1)/2, ∫z² = (1.5³−0.5³)/3. All degrees
	// are ≤ 13, so Kronrod and Gauss agree and the first rule (3375 calls)
	// must be accepted at Rel 1e-13.
	poly := func(x, y, z float64) float64 {
		return 1 + x*x*y*y*y*math.Pow(z, 5) - 3*math.Pow(x, 7)*y*z*z
	}
	polyRef := 3 + (1.0/3)*(15.0/4)*(math.Pow(1.5, 6)-math.Pow(0.5, 6))/6 -
		3*(1.0/8)*(3.0/2)*(1.5*1.5*1.5-0.5*0.5*0.5)/3
	// Gaussian on [−1,2]³: (∫_{−1}^{2} e^{−x²} dx)³ = ((√π/2)(erf 2 + erf 1))³.
	gauss := func(x, y, z float64) float64 { return math.Exp(-(x*x + y*y + z*z)) }
	g1 := math.Sqrt(math.Pi) / 2 * (math.Erf(2) + math.Erf(1))
	gaussRef := g1 * g1 * g1
	invR2 := func(x, y, z float64) float64 { return 1 / (x*x + y*y + z*z) }
	invRef := cubeInvR2(t)

	cases := []struct {
		name   string
		f      func(x, y, z float64) float64
		box    [6]float64
		ref    float64
		tol    Tol
		maxCal int // expected upper bound of calls (0: none)
	}{
		{"polynomial", poly, [6]float64{0, 1, -1, 2, 0.5, 1.5}, polyRef, Tol{Rel: 1e-13}, 3375},
		{"gaussian", gauss, [6]float64{-1, 2, -1, 2, -1, 2}, gaussRef, Tol{Rel: 1e-10, MaxEval: 2_000_000}, 0},
		{"1/r² corner", invR2, [6]float64{0, 1, 0, 1, 0, 1}, invRef, Tol{Rel: 1e-6, MaxEval: 5_000_000}, 0},
		// Reversing one range flips the sign.
		{"polynomial reversed w", poly, [6]float64{0, 1, -1, 2, 1.5, 0.5}, -polyRef, Tol{Rel: 1e-13}, 3375},
	}
	for _, c := range cases {
		n := 0
		f := func(x, y, z float64) float64 { n++; return c.f(x, y, z) }
		b := c.box
		val, est, err := Integrate3(f, b[0], b[1], b[2], b[3], b[4], b[5], c.tol)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		qCheckScalar(t, c.name, val, est, c.ref, c.tol)
		if c.maxCal > 0 && n > c.maxCal {
			t.Errorf("%s: %d calls, want <= %d", c.name, n, c.maxCal)
		}
		t.Logf("%s: %d integrand calls", c.name, n)
	}

	// The three integrands as one vector integrand over the unit cube
	// (polynomial reference recomputed for [0,1]³: 1 + (1/3)(1/4)(1/6) −
	// 3(1/8)(1/2)(1/3)).
	tol := Tol{Rel: 1e-6, MaxEval: 5_000_000}
	g01 := math.Sqrt(math.Pi) / 2 * math.Erf(1)
	ref := r3.Vec{X: 1 + 1.0/72 - 1.0/16, Y: g01 * g01 * g01, Z: invRef}
	vf := func(x, y, z float64) r3.Vec { return r3.Vec{X: poly(x, y, z), Y: gauss(x, y, z), Z: invR2(x, y, z)} }
	v, est, err := IntegrateVec3(vf, 0, 1, 0, 1, 0, 1, tol)
	if err != nil {
		t.Fatal(err)
	}
	qCheckVec(t, "vector", v, est, ref, tol)

	// Zero width gives 0 without calls.
	calls := 0
	if v, e, err := Integrate3(func(x, y, z float64) float64 { calls++; return 1 }, 0, 1, 2, 2, 0, 1, tol); v != 0 || e != 0 || err != nil || calls != 0 {
		t.Errorf("zero width: %v %v %v (%d calls)", v, e, err, calls)
	}
}

// TestIntegrate3Limits: determinism, the evaluation budget and invalid inputs.
func TestIntegrate3Limits(t *testing.T) {
	invR2 := func(x, y, z float64) float64 { return 1 / (x*x + y*y + z*z) }
	run := func() [2]uint64 {
		v, e, _ := Integrate3(invR2, 0, 1, 0, 1, 0, 1, Tol{Rel: 1e-4, MaxEval: 1_000_000})
		return [2]uint64{math.Float64bits(v), math.Float64bits(e)}
	}
	first := run()
	for i := 0; i < 2; i++ {
		if got := run(); got != first {
			t.Fatalf("run %d: %x, first %x", i, got, first)
		}
	}

	// Budget: 3375 calls for the first rule, 6750 per bisection, so
	// MaxEval = 20000 allows two bisections (16875 calls) and no more; 1/r²
	// at Rel 1e-10 cannot be met there.
	n := 0
	f := func(x, y, z float64) float64 { n++; return invR2(x, y, z) }
	val, est, err := Integrate3(f, 0, 1, 0, 1, 0, 1, Tol{Rel: 1e-10, MaxEval: 20000})
	var qe *QuadError
	if !errors.Is(err, ErrNoConvergence) || !errors.As(err, &qe) {
		t.Fatalf("err = %v, want *QuadError wrapping ErrNoConvergence", err)
	}
	if qe.Value != val || qe.Estimate != est || qe.Evals != n || n != 16875 {
		t.Errorf("QuadError %+v, val %v est %v, %d calls (want 16875)", qe, val, est, n)
	}
	ref := cubeInvR2(t)
	if math.Abs(val-ref) > est {
		t.Errorf("best value %v: error %.3g above its estimate %.3g", val, math.Abs(val-ref), est)
	}
	vv, _, err := IntegrateVec3(func(x, y, z float64) r3.Vec { return r3.Vec{Y: invR2(x, y, z)} }, 0, 1, 0, 1, 0, 1, Tol{Rel: 1e-10, MaxEval: 1})
	if !errors.As(err, &qe) || qe.Vec != vv || qe.Value != 0 || qe.Evals != 3375 {
		t.Errorf("IntegrateVec3 budget: %v %+v", err, qe)
	}

	// Invalid inputs: plain errors, never ErrNoConvergence.
	one := func(x, y, z float64) float64 { return 1 }
	for name, err := range map[string]error{
		"nil f": func() error { _, _, err := Integrate3(nil, 0, 1, 0, 1, 0, 1, Tol{Rel: 1e-6}); return err }(),
		"nil vec f": func() error {
			_, _, err := IntegrateVec3(nil, 0, 1, 0, 1, 0, 1, Tol{Rel: 1e-6})
			return err
		}(),
		"NaN bound": func() error { _, _, err := Integrate3(one, 0, 1, math.NaN(), 1, 0, 1, Tol{Rel: 1e-6}); return err }(),
		"Inf bound": func() error { _, _, err := Integrate3(one, 0, 1, 0, 1, 0, math.Inf(1), Tol{Rel: 1e-6}); return err }(),
		"zero tol":  func() error { _, _, err := Integrate3(one, 0, 1, 0, 1, 0, 1, Tol{}); return err }(),
		"neg eval":  func() error { _, _, err := Integrate3(one, 0, 1, 0, 1, 0, 1, Tol{Rel: 1, MaxEval: -1}); return err }(),
		"NaN f": func() error {
			_, _, err := Integrate3(func(x, y, z float64) float64 { return math.NaN() }, 0, 1, 0, 1, 0, 1, Tol{Rel: 1e-6})
			return err
		}(),
	} {
		if err == nil || errors.Is(err, ErrNoConvergence) {
			t.Errorf("%s: err = %v, want a plain error", name, err)
		}
	}
}
