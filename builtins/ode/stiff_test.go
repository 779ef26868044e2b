package ode_test

import (
	"math"
	"testing"

	"loopwise/builtins/ode"
)

// robertson is the chemical kinetics problem of H. H. Robertson (1966),
// as in Hairer and Wanner, Solving ODE II, 2nd ed., 1996, §IV.1, eq. (1.3):
// rate constants 0.04, 1e4 and 3e7, y(0) = (1, 0, 0).
func robertson(_ float64, y, dy []float64) error {
	dy[0] = -0.04*y[0] + 1e4*y[1]*y[2]
	dy[1] = 0.04*y[0] - 1e4*y[1]*y[2] - 3e7*y[1]*y[1]
	dy[2] = 3e7 * y[1] * y[1]
	return nil
}

func robertsonJac(_ float64, y []float64, J []float64) error {
	copy(J, []float64{
		-0.04, 1e4 * y[2], 1e4 * y[1],
		0.04, -1e4*y[2] - 6e7*y[1], -1e4 * y[1],
		0, 6e7 * y[1], 0,
	})
	return nil
}

// Reference values at t = 40, computed outside the project by SciPy 1.10.1,
// scipy.integrate.solve_ivp with method LSODA (ODEPACK's BDF/Adams
// switching code, a different method family), rtol 1e-12, atol 1e-16,
// 1e-22, 1e-16 and the analytic Jacobian; its BDF and Radau methods at the
// same tolerances agreed to 5e-12 relative. They also agree with the
// values usually quoted for this test (0.7158, 9.185e-6, 0.2842; from
// memory).
var robertsonAt40 = []float64{7.158270687221239e-01, 9.185534764663406e-06, 2.841637457431123e-01}

func TestRobertson(t *testing.T) {
	for _, tc := range []struct {
		name string
		opt  ode.Options
	}{
		{"finite-difference Jacobian, defaults", ode.Options{}},
		{"analytic Jacobian, defaults", ode.Options{Jac: robertsonJac}},
		{"analytic Jacobian, RelTol 1e-10", ode.Options{Jac: robertsonJac, RelTol: 1e-10, AbsTol: 1e-16}},
	} {
		sol, err := ode.Solve(robertson, 0, 40, []float64{1, 0, 0}, tc.opt)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		rtol, atol := tc.opt.RelTol, tc.opt.AbsTol
		if rtol == 0 {
			rtol, atol = ode.DefaultRelTol, ode.DefaultAbsTol
		}
		y := make([]float64, 3)
		sol.At(40, y)
		// ymax per component: y1 and y3 stay within [0, 1]; y2 peaks
		// near 3.65e-5 (Hairer and Wanner 1996, §IV.1, Fig. 1.3; from
		// memory), so 4e-5 bounds it.
		ymax := []float64{1, 4e-5, 1}
		for i := range y {
			b := denseFactor * estBound(rtol, atol, ymax[i])
			d := math.Abs(y[i] - robertsonAt40[i])
			if d > b {
				t.Errorf("%s: y%d(40) = %.12g, reference %.12g: off by %.3g > %.3g", tc.name, i+1, y[i], robertsonAt40[i], d, b)
			}
		}
		// Runge–Kutta methods keep linear invariants (E. Hairer, C. Lubich,
		// G. Wanner, Geometric Numerical Integration, 2nd ed., 2006, §IV.1,
		// Theorem 1.5; from memory), and the simplified Newton iteration
		// does too as long as the Jacobian's columns sum to zero, which
		// finite differences give up to rounding. So y1 + y2 + y3 = 1 up to
		// rounding: a few ulps (1.1e-16) per step over at most a few
		// hundred steps is below 1e-13; allowed 1e-12.
		var drift float64
		for _, tt := range sol.Times() {
			sol.At(tt, y)
			drift = math.Max(drift, math.Abs(y[0]+y[1]+y[2]-1))
		}
		if drift > 1e-12 {
			t.Errorf("%s: y1+y2+y3 drifts from 1 by %.3g", tc.name, drift)
		}
		sol.At(40, y)
		t.Logf("%s: y(40) = %.10g, %.10g, %.10g; sum drift %.2g; %+v", tc.name, y[0], y[1], y[2], drift, sol.Stats())
	}
}

const vdpMu = 1000.0

// vanDerPol is the oscillator x” − μ(1 − x²)x' + x = 0 as a system.
func vanDerPol(_ float64, y, dy []float64) error {
	dy[0] = y[1]
	dy[1] = vdpMu*(1-y[0]*y[0])*y[1] - y[0]
	return nil
}

// Van der Pol's oscillator with μ = 1000 from (2, 0) over one period. The
// references are the times at which x crosses zero (the fast jumps):
// 807.08474058 (downwards) and 1614.28530325 (upwards), computed outside
// the project by SciPy 1.10.1 solve_ivp, method LSODA, rtol = atol =
// 1e-12, analytic Jacobian, with event location; its Radau method agreed
// to 5e-10. The period also matches the asymptotic formula
// T ≈ (3 − 2 ln 2)μ + 7.014 μ^(−1/3) = 1614.4 (Dorodnitsyn 1947; from
// memory) to the size of its next term.
//
// A jump takes a time of order 1/μ, so the crossing time is found on the
// dense output by bisection. Its error is that of the slow phase: time
// along a slow branch is the integral of dt = μ(1 − x²)/x dx, so a relative
// error ε in the state moves the crossing by about ε·T. With RelTol 1e-6
// the test allows 10·RelTol·T ≈ 0.016 s (the factor 10 for the global
// error being a few times the local tolerance, as in the linear tests).
func TestVanDerPolStiff(t *testing.T) {
	const t1 = 1700.0
	opt := ode.Options{RelTol: 1e-6}
	sol, err := ode.Solve(vanDerPol, 0, t1, []float64{2, 0}, opt)
	if err != nil {
		t.Fatal(err)
	}
	y := make([]float64, 2)
	x := func(tt float64) float64 { sol.At(tt, y); return y[0] }
	// Zero crossings of x, bracketed by the step ends, refined by bisection.
	var crossings []float64
	ts := sol.Times()
	for i := 1; i < len(ts); i++ {
		a, b := ts[i-1], ts[i]
		xa, xb := x(a), x(b)
		if xa == 0 || math.Signbit(xa) == math.Signbit(xb) {
			continue
		}
		for k := 0; k < 100 && b-a > 1e-12*t1; k++ {
			m := 0.5 * (a + b)
			if math.Signbit(x(m)) == math.Signbit(xa) {
				a = m
			} else {
				b = m
			}
		}
		crossings = append(crossings, 0.5*(a+b))
	}
	want := []float64{807.08474058, 1614.28530325}
	if len(crossings) != len(want) {
		t.Fatalf("found zero crossings at %v, want two near %v", crossings, want)
	}
	for i := range want {
		if d := math.Abs(crossings[i] - want[i]); d > 10*opt.RelTol*want[1] {
			t.Errorf("crossing %d at %.8g, reference %.8g: off by %.3g", i+1, crossings[i], want[i], d)
		} else {
			t.Logf("crossing %d at %.8g, reference %.8g: off by %.3g", i+1, crossings[i], want[i], d)
		}
	}

	// Stiffness handled: an explicit method is stable only while h|λ|
	// stays inside its stability region, which for the classical
	// fourth-order Runge–Kutta method lies within |hλ| < 3 (Hairer and
	// Wanner 1996, §IV.2, Fig. 2.1; from memory). Along the solution it
	// would need at least ∫ |λ_max(t)|/3 dt steps, λ_max the eigenvalue of
	// ∂f/∂y of largest modulus; estimated here by the midpoint rule on the
	// step ends of our solution.
	var explicit float64
	for i := 1; i < len(ts); i++ {
		tm := 0.5 * (ts[i-1] + ts[i])
		sol.At(tm, y)
		tr := vdpMu * (1 - y[0]*y[0])
		det := 2*vdpMu*y[0]*y[1] + 1
		disc := tr*tr - 4*det
		var lam float64
		if disc >= 0 {
			lam = math.Max(math.Abs(tr+math.Sqrt(disc)), math.Abs(tr-math.Sqrt(disc))) / 2
		} else {
			lam = math.Sqrt(math.Abs(det)) // |λ|² = det for a complex pair
		}
		explicit += lam / 3 * (ts[i] - ts[i-1])
	}
	st := sol.Stats()
	t.Logf("%+v; an explicit method would need at least %.3g steps", st, explicit)
	if float64(st.Steps+st.Rejected) > explicit/100 {
		t.Errorf("%d steps (%d rejected): not far below the explicit method's %.3g", st.Steps, st.Rejected, explicit)
	}
}
