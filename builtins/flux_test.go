package builtins

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/builtins/em"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestDerivative checks the numerical dI/dt of current functions against
// their analytic derivatives (elementary calculus), over time scales from
// hours to nanoseconds. Tolerance 1e-7 relative: the method accepts a
// plateau where neighbouring estimates agree to 1e-6 (sum of two
// differences), and the Richardson-extrapolated central difference is
// then good to well below that.
func TestDerivative(t *testing.T) {
	cases := []struct {
		def  string
		at   float64
		want float64
	}{
		{"I(t) = 20 A * sin(2*pi*50 Hz*t)", 0, 20 * 2 * math.Pi * 50},
		{"I(t) = 20 A * sin(2*pi*50 Hz*t)", 0.0031, 20 * 2 * math.Pi * 50 * math.Cos(2*math.Pi*50*0.0031)},
		{"I(t) = 2 A * sin(2*pi*100 kHz*t)", 0, 2 * 2 * math.Pi * 1e5},
		{"I(t) = 2 A * sin(2*pi*13.56 MHz*t)", 1e-8, 2 * 2 * math.Pi * 13.56e6 * math.Cos(2*math.Pi*13.56e6*1e-8)},
		{"I(t) = 100 A + 1 A * t / (1 h)", 7200, 1.0 / 3600},
		{"I(t) = 5 A * exp(-t/(1 us))", 2e-6, -5 / 1e-6 * math.Exp(-2)},
		{"I(t) = 3 A * (t/(1 s))^2", 4, 24},
		{"I(t) = 7 A", 1, 0},
	}
	for _, c := range cases {
		s := runtime.NewSession(Standard())
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.def)
		if err != nil {
			t.Fatal(err)
		}
		got, err := derivative(s, "test", res.Value.(*runtime.Func), c.at)
		if err != nil {
			t.Fatalf("%s: %v", c.def, err)
		}
		if !scalar.EqualWithinAbsOrRel(got, c.want, 1e-12, 1e-7) {
			t.Errorf("%s at t=%g: dI/dt = %.12g, want %.12g", c.def, c.at, got, c.want)
		}
	}
}

// derivOf defines a current function in a fresh session and returns it
// with the session.
func derivOf(t *testing.T, def string) (*runtime.Session, *runtime.Func) {
	t.Helper()
	s := runtime.NewSession(Standard())
	res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, def)
	if err != nil {
		t.Fatal(err)
	}
	return s, res.Value.(*runtime.Func)
}

// TestDerivativeKink: a current with a corner at t has no dI/dt there; the
// step search must say so, with both one-sided slopes, and not return their
// average. The slopes are elementary: |t| has slopes −1 and +1 at 0; the
// triangle wave 1 − 4|u − round(u)|, u = f·t, has slopes +4f and −4f at its
// peaks u = k. The reported slopes are one-sided second-order differences
// of exactly linear pieces, so they are exact to rounding; 1e-6 relative
// allows the rounding of t ± h near t = 3000 s (ε·t/h with h ≥ 1 ms).
func TestDerivativeKink(t *testing.T) {
	cases := []struct {
		def           string
		at            float64
		before, after float64 // A/s
	}{
		{"I(t) = 1 A * abs(t/(1 s))", 0, -1, 1},
		{"I(t) = 1 A * abs(t/(1 s) - 0.003)", 0.003, -1, 1},
		{"I(t) = t > 2 ms ? 5 A + 2 A*(t - 2 ms)/(1 s) : 5 A + 1 A*(t - 2 ms)/(1 s)", 0.002, 1, 2},
		// triangle waves at a peak (t = 3 periods), 1 MHz and 1 mHz
		{"I(t) = 1 A * (1 - 4*abs(1 MHz*t - floor(1 MHz*t + 0.5)))", 3e-6, 4e6, -4e6},
		{"I(t) = 1 A * (1 - 4*abs(1 mHz*t - floor(1 mHz*t + 0.5)))", 3000, 4e-3, -4e-3},
	}
	for _, c := range cases {
		s, f := derivOf(t, c.def)
		got, err := derivative(s, "emf", f, c.at)
		if err == nil {
			t.Errorf("%s at %g s: dI/dt = %g, want a kink error", c.def, c.at, got)
			continue
		}
		var ke *em.KinkError
		if _, err2 := em.Derivative(func(x float64) (em.Vec, error) {
			i, err := currentAt(s, "test", f, x, true)
			return em.Vec{X: i}, err
		}, c.at, 1, -12, true); !errors.As(err2, &ke) {
			t.Errorf("%s at %g s: %v, want a kink", c.def, c.at, err2)
			continue
		}
		if !scalar.EqualWithinRel(ke.Before.X, c.before, 1e-6) || !scalar.EqualWithinRel(ke.After.X, c.after, 1e-6) {
			t.Errorf("%s at %g s: slopes %g, %g A/s, want %g, %g", c.def, c.at, ke.Before.X, ke.After.X, c.before, c.after)
		}
		if !strings.Contains(err.Error(), "has a kink at t = ") || !strings.Contains(err.Error(), "just before and") {
			t.Errorf("%s: message %q", c.def, err)
		}
	}
	s, f := derivOf(t, "I(t) = 1 A * abs(t/(1 s))")
	_, err := derivative(s, "emf", f, 0)
	want := "emf: the current function I(t) has a kink at t = 0 s: its slope is -1 A/s just before and 1 A/s just after, so dI/dt is not defined there; take t a little before or after"
	if err == nil || err.Error() != want {
		t.Errorf("message %v, want %q", err, want)
	}
}

// TestDerivativeSmoothNoKink: smooth currents must not be taken for kinks,
// at zero crossings and peaks, on time scales of 1 MHz and 1 mHz, and a
// ramp. Expected values are elementary calculus; tolerance 1e-7 relative to
// the amplitude of the derivative (ωA or the ramp's slope), as in
// TestDerivative: at a peak the true derivative is 0 and the estimate is
// rounding, judged against the derivative's scale.
func TestDerivativeSmoothNoKink(t *testing.T) {
	const w1, w2 = 2 * math.Pi * 1e6, 2 * math.Pi * 1e-3
	cases := []struct {
		def        string
		at         float64
		want, size float64
	}{
		{"I(t) = 2 A * sin(2*pi*1 MHz*t)", 0, 2 * w1, 2 * w1},
		{"I(t) = 2 A * sin(2*pi*1 MHz*t)", 0.25e-6, 0, 2 * w1},
		{"I(t) = 2 A * sin(2*pi*1 MHz*t)", 3.1e-6, 2 * w1 * math.Cos(w1*3.1e-6), 2 * w1},
		{"I(t) = 2 A * sin(2*pi*1 mHz*t)", 0, 2 * w2, 2 * w2},
		{"I(t) = 2 A * sin(2*pi*1 mHz*t)", 250, 0, 2 * w2},
		{"I(t) = 2 A * sin(2*pi*1 mHz*t)", 3100, 2 * w2 * math.Cos(w2*3100), 2 * w2},
		{"I(t) = 2 A * cos(2*pi*1 mHz*t)", 0, 0, 2 * w2},
		{"I(t) = 3 A * t / (1 us)", 0, 3e6, 3e6},
		{"I(t) = 3 A * t / (1 us)", 5e-6, 3e6, 3e6},
		{"I(t) = 3 A * t / (1000 s)", 4000, 3e-3, 3e-3},
		// growing fast at the larger steps (exp(1000) overflows at 1 s)
		{"I(t) = 1 A * exp(t/(1 ms))", 0.01, 1e3 * math.Exp(10), 1e3 * math.Exp(10)},
		// far from t = 0, where t ± 1 ps rounds: 1e4 s has an ulp of 1.8e-12 s
		{"I(t) = 2 A * sin(2*pi*50 Hz*t)", 1e4, 2 * 100 * math.Pi * math.Cos(100*math.Pi*1e4), 2 * 100 * math.Pi},
	}
	for _, c := range cases {
		s, f := derivOf(t, c.def)
		got, err := derivative(s, "emf", f, c.at)
		if err != nil {
			t.Errorf("%s at %g s: %v", c.def, c.at, err)
			continue
		}
		if math.Abs(got-c.want) > 1e-7*c.size {
			t.Errorf("%s at %g s: dI/dt = %.12g, want %.12g", c.def, c.at, got, c.want)
		}
	}
}
