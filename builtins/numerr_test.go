package builtins_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// numRun evaluates lines in a fresh session and returns the last result.
func numRun(t *testing.T, lines ...string) *runtime.Result {
	t.Helper()
	s := runtime.NewSession(builtins.Standard())
	var res *runtime.Result
	for i, l := range lines {
		r, err := s.Eval(lang.Pos{File: "n.lw", Line: i + 1, Col: 1}, l)
		if err != nil {
			t.Fatalf("%s: %v", l, err)
		}
		res = r
	}
	return res
}

// TestNumericalErrorBounds: each method's error estimate, carried to the
// result, must bound the actual error against a closed form the method
// does not see. Derivatives: d/dx sin = cos, d/dx exp = exp,
// d/dx xⁿ = n·xⁿ⁻¹, the product and chain rules (any calculus text). Roots:
// √2, ln 3 and the fixed point of cos, 0.7390851332151607 (the Dottie
// number; e.g. OEIS A003957). Extremes: the minimum of (x − 0.3)² at 0.3,
// of cos at π, of x·ln x at 1/e, the maximum of sin at π/2. Line integrals: Ampère's law, ∮B·dl = μ0·I
// around a wire (Jackson, Classical Electrodynamics, 3rd ed., 1999, §5.3;
// μ0 of CODATA 2018, and the finite wire's factor (L/2)/√((L/2)² + ρ²)),
// and ∮ of F = (−y, x, 0) around a circle of radius R, 2πR² (Stokes).
// Mutual inductance: Maxwell's formula for coaxial circles,
// μ0√(ab)[(2/k − k)K(k) − (2/k)E(k)] (Maxwell, Treatise, 1873, §701), with
// gonum's complete elliptic integrals (maxwellM, magnets_test.go),
// against the general route (a circle
// made of two arcs); flux of an infinite wire through a rectangle in its
// plane, μ0·I·h·ln(b/a)/(2π) (any text on Ampère's law; the sign: the
// rectangle's circulation runs against the wire's B there), and the EMF
// −dΦ/dt of that loop for a sine and a ramp (Faraday's law). A
// case passes when the actual error is at most the bound; the bound
// being loose is allowed (it is the method's own worst case).
func TestNumericalErrorBounds(t *testing.T) {
	cases := []struct {
		name  string
		lines []string
		exact float64
	}{
		{"deriv sin at 0.3", []string{"f(x) = sin(x)", "deriv(f, 0.3)"}, math.Cos(0.3)},
		{"deriv sin at 2", []string{"f(x) = sin(x)", "deriv(f, 2)"}, math.Cos(2)},
		{"deriv exp at 1", []string{"f(x) = exp(x)", "deriv(f, 1)"}, math.E},
		{"deriv exp at -3", []string{"f(x) = exp(x)", "deriv(f, -3)"}, math.Exp(-3)},
		{"deriv cube at 2", []string{"f(x) = x^3", "deriv(f, 2)"}, 12},
		{"deriv x^5 at 0.7", []string{"f(x) = x^5", "deriv(f, 0.7)"}, 5 * math.Pow(0.7, 4)},
		{"deriv 1/x at 0.5", []string{"f(x) = 1/x", "deriv(f, 0.5)"}, -4},
		{"deriv sqrt at 2", []string{"f(x) = sqrt(x)", "deriv(f, 2)"}, 0.5 / math.Sqrt2},
		{"deriv product", []string{"f(x) = sin(x)*exp(x)", "deriv(f, 1.2)"}, math.Exp(1.2) * (math.Sin(1.2) + math.Cos(1.2))},
		{"deriv composition", []string{"f(x) = sin(exp(x))", "deriv(f, 0.4)"}, math.Cos(math.Exp(0.4)) * math.Exp(0.4)},
		{"deriv in time", []string{"i(t) = 3 A * sin(2*pi*50 Hz * t)", "deriv(i, 1 ms) / 1 A*s"}, 3 * 2 * math.Pi * 50 * math.Cos(2*math.Pi*50*1e-3)},
		// the same by differences: 0 times a builtin without a derivative
		// rule (maxwell_mutual) leaves the values and stops the exact route
		{"deriv sin at 0.3 by differences", []string{"f(x) = sin(x) + 0 * maxwell_mutual(1 m, 2 m, x * 1 m) / (1 H)", "deriv(f, 0.3)"}, math.Cos(0.3)},
		{"deriv cube at 2 by differences", []string{"f(x) = x^3 + 0 * maxwell_mutual(1 m, 2 m, x * 1 m) / (1 H)", "deriv(f, 2)"}, 12},
		{"deriv in time by differences", []string{"i(t) = 3 A * sin(2*pi*50 Hz * t) + 0 A * maxwell_mutual(1 m, 2 m, t * 1 m/s) / (1 H)", "deriv(i, 1 ms) / 1 A*s"}, 3 * 2 * math.Pi * 50 * math.Cos(2*math.Pi*50*1e-3)},
		{"solve sqrt 2", []string{"g(x) = x^2", "solve(g, 2, 0, 2)"}, math.Sqrt2},
		{"solve ln 3", []string{"g(x) = exp(x)", "solve(g, 3, 0, 5)"}, math.Log(3)},
		{"solve cos fixed point", []string{"g(x) = cos(x) - x", "solve(g, 0, 0, 1)"}, 0.7390851332151607},
		{"solve a length", []string{"g(x) = x^2", "solve(g, 2 mm^2, 0 mm, 5 mm) / 1 mm"}, math.Sqrt2},
		{"minimize a parabola", []string{"q(x) = (x - 0.3)^2 + 1", "minimize(q, 0, 1)"}, 0.3},
		{"minimize cos", []string{"q(x) = cos(x)", "minimize(q, 2, 4)"}, math.Pi},
		{"maximize sin", []string{"q(x) = sin(x)", "maximize(q, 0, 3)"}, math.Pi / 2},
		{"minimize x ln x", []string{"q(x) = x*ln(x)", "minimize(q, 0.1, 1)"}, 1 / math.E},
		{"Ampère", []string{"w = segment([0, 0, -50] m, [0, 0, 50] m)", "line_integral(b_field(source(w, 3 A)), circle([0, 0, 0] m, [0, 0, 1], 20 mm)) / 1 T/m"}, 1.25663706212e-6 * 3 * (50 / math.Hypot(50, 0.02))},
		{"mutual, general route", []string{"h1 = arc([0, 0, 0] m, [0, 0, 1], [25, 0, 0] mm, pi)", "h2 = arc([0, 0, 0] m, [0, 0, 1], [-25, 0, 0] mm, pi)", "mutual(join(h1, h2), circle([0, 0, 12] mm, [0, 0, 1], 18 mm)) / 1 H"}, maxwellM(0.025, 0.018, 0.012)},
		{"mutual, close circles", []string{"h1 = arc([0, 0, 0] m, [0, 0, 1], [25, 0, 0] mm, pi)", "h2 = arc([0, 0, 0] m, [0, 0, 1], [-25, 0, 0] mm, pi)", "mutual(join(h1, h2), circle([0, 0, 0.5] mm, [0, 0, 1], 24 mm)) / 1 H"}, maxwellM(0.025, 0.024, 0.0005)},
		{"mutual, far circles", []string{"h1 = arc([0, 0, 0] m, [0, 0, 1], [25, 0, 0] mm, pi)", "h2 = arc([0, 0, 0] m, [0, 0, 1], [-25, 0, 0] mm, pi)", "mutual(join(h1, h2), circle([0, 0, 400] mm, [0, 0, 1], 10 mm)) / 1 H"}, 1.914637572328644704e-12},
		{"flux of an infinite wire", []string{"w = infinite_wire([0, 0, 0] m, [0, 0, 1], 4 A)", "flux(w, rectangle([10, 0, 0] mm, [30, 0, 0] mm, [0, 0, 50] mm)) / 1 Wb"}, -1.25663706212e-6 * 4 * 0.05 / (2 * math.Pi) * math.Log(4)},
		{"flux of a long wire through a surface", []string{"w = infinite_wire([0, 0, 0] m, [0, 0, 1], 4 A)", "flux(w, rectangle_surface([10, 0, 0] mm, [20, 0, 0] mm, [0, 0, 50] mm)) / 1 Wb"}, -1.25663706212e-6 * 4 * 0.05 / (2 * math.Pi) * math.Log(3)},
		{"flux of a ring through a coaxial disk", []string{"ring = circle([0, 0, 0] m, [0, 0, 1], 25 mm)", "flux(source(ring, 2 A), disk([0, 0, 12] mm, [0, 0, 1], 18 mm)) / 1 Wb"}, 2 * maxwellM(0.025, 0.018, 0.012)},
		{"emf of a sine beside a long wire", []string{"I(t) = 3 A * sin(2*pi*50 Hz*t)", "w = infinite_wire([0, 0, 0] m, [0, 0, 1], I)", "emf(w, rectangle([10, 0, 0] mm, [30, 0, 0] mm, [0, 0, 50] mm), 1 ms) / 1 V"}, 1.25663706212e-6 * 0.05 * math.Log(4) / (2 * math.Pi) * 3 * 2 * math.Pi * 50 * math.Cos(2*math.Pi*50*1e-3)},
		{"emf of a ramp beside a long wire", []string{"I(t) = 2 kA/s * t", "w = infinite_wire([0, 0, 0] m, [0, 0, 1], I)", "emf(w, rectangle([10, 0, 0] mm, [30, 0, 0] mm, [0, 0, 50] mm), 3 ms) / 1 V"}, 1.25663706212e-6 * 0.05 * math.Log(4) / (2 * math.Pi) * 2000},
		{"Stokes", []string{"F(p) = [-p.y, p.x, 0 m]", "line_integral(F, circle([0, 0, 0] m, [0, 0, 1], 0.3 m)) / 1 m^2"}, 2 * math.Pi * 0.09},
	}
	for _, c := range cases {
		r := numRun(t, c.lines...)
		q, ok := r.Value.(runtime.Quantity)
		if !ok {
			t.Fatalf("%s: %T", c.name, r.Value)
		}
		actual := math.Abs(q.V - c.exact)
		if r.NumErr == nil {
			if actual > 0 {
				t.Errorf("%s: no estimate, actual error %.3g", c.name, actual)
			}
			continue
		}
		bound := r.NumErr[0]
		t.Logf("%-24s actual %.2e, bound %.2e (%.2g×)", c.name, actual, bound, bound/math.Max(actual, 1e-300))
		if actual > bound {
			t.Errorf("%s: actual error %.3g exceeds the bound %.3g", c.name, actual, bound)
		}
	}
}

// TestNumericalErrorCarried: the bound is carried through arithmetic and
// names by the replay (numerr.go): a multiple scales it, a difference of
// one value with itself has none (it is the same error), and an estimate
// made inside a user function is not carried and says so.
//
// f is x³ made so that its derivative cannot flow exactly (maxwell_mutual
// has no derivative rule; 0 times it adds nothing to the values): deriv
// then takes differences, whose estimate is large enough for the replay
// to move the value by it without rounding it away.
func TestNumericalErrorCarried(t *testing.T) {
	const fx3 = "f(x) = x^3 + 0 * maxwell_mutual(20 mm, 15 mm, x * 1 mm) / (1 nH)"
	base := numRun(t, fx3, "deriv(f, 2)")
	b := base.NumErr[0]
	for _, c := range []struct {
		lines []string
		want  float64
	}{
		{[]string{fx3, "2 * deriv(f, 2) + 1"}, 2 * b},
		{[]string{fx3, "d = deriv(f, 2)", "3 * d"}, 3 * b},
		{[]string{fx3, "d = deriv(f, 2)", "d - d"}, 0},
		{[]string{fx3, "deriv(f, 2) - deriv(f, 2)"}, 2 * b},
	} {
		r := numRun(t, c.lines...)
		got := 0.0
		if r.NumErr != nil {
			got = r.NumErr[0]
		}
		if math.Abs(got-c.want) > 1e-12*c.want {
			t.Errorf("%v: bound %g, want %g", c.lines, got, c.want)
		}
	}
	r := numRun(t, fx3, "h(x) = deriv(f, x)", "h(2)")
	if r.NumErr != nil || !strings.Contains(r.Note, "not carried") {
		t.Errorf("inside a function: bound %v, note %q", r.NumErr, r.Note)
	}
	if !strings.Contains(base.Text, "(numerical error ≤ 0.00011)") {
		t.Errorf("shown %q", base.Text)
	}
}
