package ode_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"loopwise/builtins/ode"
)

func decay(_ float64, y, dy []float64) error {
	for i := range y {
		dy[i] = -y[i]
	}
	return nil
}

// Input that cannot be integrated is refused before any work, with a
// message that says what is wrong.
func TestBadInput(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	for _, tc := range []struct {
		name   string
		f      ode.Func
		t0, t1 float64
		y0     []float64
		opt    ode.Options
		want   string
	}{
		{"no equations", decay, 0, 1, nil, ode.Options{}, "no equations: y0 is empty"},
		{"empty y0", decay, 0, 1, []float64{}, ode.Options{}, "no equations: y0 is empty"},
		{"t1 == t0", decay, 2, 2, []float64{1}, ode.Options{}, "end time equals start time (t0 = t1 = 2): nothing to integrate"},
		{"NaN in y0", decay, 0, 1, []float64{1, nan}, ode.Options{}, "initial value y0[1] = NaN is not finite"},
		{"Inf in y0", decay, 0, 1, []float64{inf}, ode.Options{}, "initial value y0[0] = +Inf is not finite"},
		{"NaN t0", decay, nan, 1, []float64{1}, ode.Options{}, "start time t0 = NaN is not finite"},
		{"Inf t1", decay, 0, inf, []float64{1}, ode.Options{}, "end time t1 = +Inf is not finite"},
		{"nil f", nil, 0, 1, []float64{1}, ode.Options{}, "no function f given"},
		{"negative RelTol", decay, 0, 1, []float64{1}, ode.Options{RelTol: -1e-6}, "relative tolerance -1e-06 must be finite and not negative"},
		{"NaN AbsTol", decay, 0, 1, []float64{1}, ode.Options{AbsTol: nan}, "absolute tolerance NaN must be finite and not negative"},
		{"tiny RelTol", decay, 0, 1, []float64{1}, ode.Options{RelTol: 1e-15}, "relative tolerance 1e-15 is below 1e-13, which float64 cannot deliver"},
		{"RelTol 1", decay, 0, 1, []float64{1}, ode.Options{RelTol: 1}, "relative tolerance 1 must be below 1"},
		{"negative MaxStep", decay, 0, 1, []float64{1}, ode.Options{MaxStep: -1}, "maximum step -1 must be finite and not negative"},
		{"negative InitialStep", decay, 0, 1, []float64{1}, ode.Options{InitialStep: -1}, "initial step -1 must be finite and not negative"},
		{"negative MaxSteps", decay, 0, 1, []float64{1}, ode.Options{MaxSteps: -5}, "maximum number of steps -5 must not be negative"},
	} {
		sol, err := ode.Solve(tc.f, tc.t0, tc.t1, tc.y0, tc.opt)
		if err == nil || err.Error() != tc.want {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.want)
		}
		if sol != nil {
			t.Errorf("%s: a solution was returned with the error", tc.name)
		}
	}
}

// integrationError checks that err is an *ode.Error of the given kind and
// returns it.
func integrationError(t *testing.T, err error, kind error) *ode.Error {
	t.Helper()
	var oe *ode.Error
	if !errors.As(err, &oe) || !errors.Is(err, kind) {
		t.Fatalf("error %v, want an *ode.Error wrapping %v", err, kind)
	}
	if !strings.Contains(err.Error(), "at t = ") {
		t.Errorf("message %q does not name t", err)
	}
	return oe
}

// f returning NaN at the start is an error at t0.
func TestNaNAtStart(t *testing.T) {
	f := func(_ float64, y, dy []float64) error { dy[0] = math.NaN(); return nil }
	_, err := ode.Solve(f, 3, 4, []float64{1}, ode.Options{})
	oe := integrationError(t, err, ode.ErrNonFinite)
	if oe.T != 3 {
		t.Errorf("error at t = %g, want 3", oe.T)
	}
	if want := "non-finite value at t = 3: f[0] is not finite at the initial values"; err.Error() != want {
		t.Errorf("message %q, want %q", err, want)
	}
}

// f turning NaN past t = 1: the steps shrink towards t = 1 and the error
// names it; the solution accepted up to there is returned and is right.
func TestNaNLater(t *testing.T) {
	f := func(tt float64, y, dy []float64) error {
		dy[0] = -y[0]
		if tt > 1 {
			dy[0] = math.NaN()
		}
		return nil
	}
	sol, err := ode.Solve(f, 0, 2, []float64{1}, ode.Options{})
	oe := integrationError(t, err, ode.ErrNonFinite)
	if math.Abs(oe.T-1) > 1e-9 {
		t.Errorf("error at t = %.12g, want 1", oe.T)
	}
	if sol == nil {
		t.Fatal("no partial solution")
	}
	ts := sol.Times()
	end := ts[len(ts)-1]
	if end > 1 || end < 0.999 {
		t.Errorf("accepted part ends at %g, want just before 1", end)
	}
	// e^(−t) at the end of the accepted part (to the dense-output bound of
	// linear_test.go).
	y := []float64{0}
	sol.At(end, y)
	if d := math.Abs(y[0] - math.Exp(-end)); d > denseFactor*estBound(ode.DefaultRelTol, ode.DefaultAbsTol, 1) {
		t.Errorf("y(%g) off by %.3g", end, d)
	}
}

// y' = 1/(1 − t) has a pole at t = 1 (y = −ln(1 − t)): the steps shrink
// until they cannot advance t.
func TestStepUnderflow(t *testing.T) {
	f := func(tt float64, y, dy []float64) error { dy[0] = 1 / (1 - tt); return nil }
	_, err := ode.Solve(f, 0, 2, []float64{0}, ode.Options{})
	oe := integrationError(t, err, ode.ErrStepUnderflow)
	if math.Abs(oe.T-1) > 1e-6 {
		t.Errorf("error at t = %.12g, want near the pole at 1", oe.T)
	}
	t.Log(err)
}

// Van der Pol (stiff_test.go) needs hundreds of steps; allowed 50, it stops.
func TestTooManySteps(t *testing.T) {
	sol, err := ode.Solve(vanDerPol, 0, 1700, []float64{2, 0}, ode.Options{MaxSteps: 50})
	integrationError(t, err, ode.ErrTooManySteps)
	if st := sol.Stats(); st.Steps+st.Rejected != 50 {
		t.Errorf("stopped after %d steps and %d rejections, want 50 together", st.Steps, st.Rejected)
	}
	t.Log(err)
}

// Errors of f, of the Jacobian function and of Check come back unchanged.
func TestCallerErrors(t *testing.T) {
	errF := errors.New("f failed")
	calls := 0
	f := func(tt float64, y, dy []float64) error {
		calls++
		if calls > 20 {
			return errF
		}
		return decay(tt, y, dy)
	}
	if _, err := ode.Solve(f, 0, 1, []float64{1}, ode.Options{}); err != errF {
		t.Errorf("f's error: got %v", err)
	}

	errJ := errors.New("jacobian failed")
	jac := func(float64, []float64, []float64) error { return errJ }
	if _, err := ode.Solve(decay, 0, 1, []float64{1}, ode.Options{Jac: jac}); err != errJ {
		t.Errorf("Jac's error: got %v", err)
	}

	errStop := errors.New("interrupted")
	polls := 0
	check := func() error {
		polls++
		if polls > 5 {
			return errStop
		}
		return nil
	}
	sol, err := ode.Solve(vanDerPol, 0, 1700, []float64{2, 0}, ode.Options{Check: check})
	if err != errStop {
		t.Fatalf("Check's error: got %v", err)
	}
	// Polled once before each of the steps: the sixth poll stops it.
	if st := sol.Stats(); st.Steps+st.Rejected != 5 {
		t.Errorf("stopped after %d steps and %d rejections, want 5 together", st.Steps, st.Rejected)
	}
}

// A Jacobian with NaN is refused with the entry named.
func TestNaNJacobian(t *testing.T) {
	jac := func(_ float64, _ []float64, J []float64) error { J[0] = math.NaN(); return nil }
	_, err := ode.Solve(decay, 0, 1, []float64{1}, ode.Options{Jac: jac})
	integrationError(t, err, ode.ErrNonFinite)
	if want := "non-finite value at t = 0: the Jacobian entry (0, 0) is NaN"; err.Error() != want {
		t.Errorf("message %q, want %q", err, want)
	}
}

// Times starts at t0 and ends exactly at t1; At at a step end gives the
// accepted value, outside the range the nearer end, and at NaN NaN.
func TestTimesAndAt(t *testing.T) {
	sol, err := ode.Solve(decay, 0.5, 3, []float64{1, 2}, ode.Options{MaxStep: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	ts := sol.Times()
	if ts[0] != 0.5 || ts[len(ts)-1] != 3 {
		t.Errorf("Times from %g to %g, want 0.5 to 3", ts[0], ts[len(ts)-1])
	}
	for i := 1; i < len(ts); i++ {
		if h := ts[i] - ts[i-1]; h > 0.1*(1+1e-12) {
			t.Errorf("step %d of %g exceeds MaxStep 0.1", i, h)
		}
	}
	if len(ts) != sol.Stats().Steps+1 {
		t.Errorf("%d times for %d steps", len(ts), sol.Stats().Steps)
	}
	y, z := make([]float64, 2), make([]float64, 2)
	sol.At(0.5, y)
	if y[0] != 1 || y[1] != 2 {
		t.Errorf("At(t0) = %v, want y0", y)
	}
	sol.At(-10, z)
	if z[0] != 1 || z[1] != 2 {
		t.Errorf("At before t0 = %v, want y0", z)
	}
	sol.At(3, y)
	sol.At(30, z)
	if y[0] != z[0] || y[1] != z[1] {
		t.Errorf("At after t1 = %v, At(t1) = %v", z, y)
	}
	sol.At(math.NaN(), y)
	if !math.IsNaN(y[0]) || !math.IsNaN(y[1]) {
		t.Errorf("At(NaN) = %v", y)
	}
}
