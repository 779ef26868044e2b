package builtins_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/runtime"
)

// TestDerivAxisField: deriv of the computed axis field of a loop against
// the derivative of the closed form, dB/dz = −3 µ0 I R² z / (2 (R² + z²)^(5/2))
// (Griffiths, Introduction to Electrodynamics, 4th ed., 2017, Eq. 5.41,
// differentiated). Tolerance 1e-6 relative to the largest slope on the
// axis: the step search accepts estimates that agree with their
// neighbours to 1e-6 of the function's rate of change.
func TestDerivAxisField(t *testing.T) {
	const I, R = 2.0, 0.025
	ev, fail := evalIn(t, "B(z) = b_at(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A), [0, 0, 1] * z).z")
	slope := func(z float64) float64 {
		return -3 * builtins.VacuumPermeability * I * R * R * z / (2 * math.Pow(R*R+z*z, 2.5))
	}
	steepest := math.Abs(slope(R / 2))
	for _, z := range []float64{0.003, 0.0125, -0.02, 0.07} {
		q := quantityOf(t, ev("deriv(B, "+runtime.FormatNumber(z*1000, 12)+" mm)"))
		if got := runtime.Format(runtime.Quantity{V: 1, D: q.D}, 6); got != "1 T/m" {
			t.Errorf("deriv unit: %s, want T/m", got)
		}
		if want := slope(z); math.Abs(q.V-want) > 1e-6*steepest {
			t.Errorf("dB/dz at z = %g: %g, want %g (Griffiths Eq. 5.41 differentiated)", z, q.V, want)
		}
	}
	// at the centre the slope is 0; x = 0 needs a scale
	if q := quantityOf(t, ev("deriv(B, 0 mm, 10 mm)")); math.Abs(q.V) > 1e-6*steepest {
		t.Errorf("dB/dz at the centre: %g, want 0", q.V)
	}
	if err := fail("deriv(B, 0 mm)"); !strings.Contains(err.Error(), "deriv: at x = 0 the step cannot follow x; give the scale over which f changes as a third argument, such as deriv(f, 0 m, 1 m)") {
		t.Errorf("deriv at 0 without a scale: %v", err)
	}
}

// TestDerivClosedForms: derivatives known in closed form (elementary
// calculus), for plain numbers, units and vectors; tolerance as above.
func TestDerivClosedForms(t *testing.T) {
	ev, fail := evalIn(t, "p(x) = x^3", "w(x) = exp(-x / (2 mm))", "v(x) = [x, x^2 / (1 m), 0 m]", "a(x) = abs(x - 1 m)")
	for _, c := range []struct {
		in   string
		want float64
		unit string
	}{
		{"deriv(p, 2 m)", 12, "1 m^2"},                       // 3x² at 2
		{"deriv(w, 3 mm)", -math.Exp(-1.5) / 0.002, "1 1/m"}, // −e^(−x/a)/a
		{"deriv(sin, 1)", math.Cos(1), "1"},                  // a builtin works too
	} {
		q := quantityOf(t, ev(c.in))
		if math.Abs(q.V-c.want) > 1e-6*math.Abs(c.want) || runtime.Format(runtime.Quantity{V: 1, D: q.D}, 6) != c.unit {
			t.Errorf("%s = %v, want %g %s", c.in, q, c.want, c.unit)
		}
	}
	// d/dx [x, x²/m, 0] = [1, 2x/m, 0]
	v, ok := ev("deriv(v, 3 m)").(runtime.Vector)
	if !ok || math.Abs(v.V[0]-1) > 1e-6 || math.Abs(v.V[1]-6) > 6e-6 || v.V[2] != 0 || !v.D.IsZero() {
		t.Errorf("deriv of a vector: %v, want [1, 6, 0]", v)
	}
	if err := fail("deriv(a, 1 m)"); !strings.Contains(err.Error(), "deriv: a(x) has a kink at 1 m: its slope is -1 just before and 1 just after") {
		t.Errorf("deriv at a kink: %v", err)
	}
	if err := fail("deriv(p, 1 m, 1 s)"); !strings.Contains(err.Error(), "deriv: the scale must have the unit of x (length (m)), not time (s)") {
		t.Errorf("deriv with a scale of the wrong unit: %v", err)
	}
}

// TestMinimizeKnown: extrema known in closed form. Brent's localmin
// returns x within 2·(1.5e-8·|x| + (hi − lo)·1e-12/3) of the extremum
// (Brent 1973, ch. 5), plus the width over which the rounding of f hides
// the extremum, about sqrt(2e-16·|f/f”|); each tolerance adds the two.
func TestMinimizeKnown(t *testing.T) {
	ev, fail := evalIn(t,
		"P(R) = (1 V)^2 * R / (R + 50 ohm)^2",
		"q(x) = (x - 2 m)^2 + 1 m^2",
		// the slope of a loop's axis field, Griffiths 2017 Eq. 5.41
		// differentiated, written out in the language
		"S(z) = 3*mu0*2 A*(25 mm)^2*z / (2*((25 mm)^2 + z^2)^2.5)",
	)
	for _, c := range []struct {
		in        string
		want, tol float64
		src       string
	}{
		// cos has its minimum at π; |f/f''| = 1: 9.4e-8 + 2.1e-8
		{"minimize(cos, 2, 4)", math.Pi, 1.2e-7, "cos is least at π"},
		// the load takes the most power from a 50 Ω source when it is
		// 50 Ω (maximum power transfer; common practice, from memory:
		// dP/dR = 0 at R = 50 Ω); |P/P''| = 5e3 Ω²: 1.5e-6 + 1.1e-6 Ω
		{"maximize(P, 1 ohm, 500 ohm)", 50, 2.7e-6, "maximum power transfer"},
		// a parabola with its vertex at 2 m; |q/q''| = 0.5 m²: 6e-8 + 1.1e-8
		{"minimize(q, 0 m, 10 m)", 2, 8e-8, "vertex of a parabola"},
		// the axis field of a loop is steepest at z = R/2 (its second
		// derivative, from Eq. 5.41, vanishes where 4z² = R²);
		// |S/S''| ≈ R²/5: 3.7e-10 + 1.6e-10 m
		{"maximize(S, 0 mm, 50 mm)", 0.0125, 6e-10, "inflection of the loop's axis field at R/2"},
	} {
		q := quantityOf(t, ev(c.in))
		if math.Abs(q.V-c.want) > c.tol {
			t.Errorf("%s = %.12g, want %.12g ± %g (%s)", c.in, q.V, c.want, c.tol, c.src)
		}
	}
	for _, c := range []struct{ in, want string }{
		{"minimize(P, 1 ohm, 500 ohm)", "minimize: P(R) is smallest at the end lo = 1 Ω of the interval (384.468 µW there); the minimum lies at or beyond that end: move or widen the interval"},
		{"maximize(q, 0 m, 10 m)", "maximize: q(x) is largest at the end hi = 10 m of the interval (65 m^2 there)"},
		{"minimize(q, 3 m, 1 m)", "minimize: lo (3 m) must be below hi (1 m)"},
		{"minimize(q, 1 m, 3 s)", "minimize: lo and hi must have one unit; got length (m) and time (s)"},
	} {
		if err := fail(c.in); !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v\nwant %s", c.in, err, c.want)
		}
	}
}
