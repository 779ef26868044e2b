package builtins

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

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
