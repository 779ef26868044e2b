package runtime_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/lang"
	"loopwise/runtime"
)

// Sources of the checks below: JCGM 100:2008, Evaluation of measurement
// data — Guide to the expression of uncertainty in measurement (the GUM):
// §5.1.2 eq. (10), the law of propagation for uncorrelated inputs; §5.1.6
// eq. (12), its form for a product of powers, (u(y)/y)² = Σ (p_i·u(x_i)/x_i)²;
// §5.2.2 eq. (13), correlated inputs (a difference of one input with itself
// has zero uncertainty, r = 1); §7.2.6, u quoted to at most two significant
// digits and the estimate rounded to match.

// uncRun evaluates lines in a fresh session and returns the last result.
func uncRun(t *testing.T, lines ...string) *runtime.Result {
	t.Helper()
	s := stdSession()
	var res *runtime.Result
	for i, l := range lines {
		r, err := s.Eval(lang.Pos{File: "u.lw", Line: i + 1, Col: 1}, l)
		if err != nil {
			t.Fatalf("%s: %v", l, err)
		}
		res = r
	}
	return res
}

// uOf is the combined standard uncertainty of a one-number result.
func uOf(t *testing.T, r *runtime.Result) float64 {
	t.Helper()
	if len(r.Contributions) == 0 {
		t.Fatalf("%s: no uncertainty carried", r.Stmt.Text)
	}
	var s float64
	for _, c := range r.Contributions {
		s += c.CU[0] * c.CU[0]
	}
	return math.Sqrt(s)
}

// TestUncertainProductOfPowers: P = I²·R with u(I)/I = 2 % and
// u(R)/R = 1 %: GUM eq. (12) gives u(P)/P = √((2·0.02)² + 0.01²). A
// square and a product are exact under a central difference, so the
// agreement is to rounding: 1e-12.
func TestUncertainProductOfPowers(t *testing.T) {
	r := uncRun(t, "I = 2 A ± 2 %", "R = 5 ohm ± 0.05 ohm", "P = I^2 * R")
	want := 20 * math.Sqrt(math.Pow(2*0.02, 2)+0.01*0.01)
	if got := uOf(t, r); math.Abs(got/want-1) > 1e-12 {
		t.Errorf("u(P) = %.15g W, GUM eq. (12) %.15g W", got, want)
	}
	if r.Text != "20.00 W ± 0.82 W" {
		t.Errorf("shown %q", r.Text)
	}
	if len(r.Contributions) != 2 || r.Contributions[0].Input.Label != "I" || r.Contributions[1].Input.Label != "R" {
		t.Errorf("contributions %+v", r.Contributions)
	}
}

// TestUncertainCorrelation: the same input read twice is one input (GUM
// §5.2, r = 1): r − r and r/r have zero uncertainty, and 2r − r has u(r).
func TestUncertainCorrelation(t *testing.T) {
	for _, c := range []struct {
		expr string
		want float64
	}{{"r - r", 0}, {"r / r", 0}, {"2*r - r", 0.1e-3}, {"f(r) - r", 0.1e-3}} {
		r := uncRun(t, "r = 10 mm ± 0.1 mm", "f(x) = 2*x", c.expr)
		if got := uOf(t, r); math.Abs(got-c.want) > 1e-15 {
			t.Errorf("%s: u = %g, want %g", c.expr, got, c.want)
		}
	}
	// a name read inside a user function's body counts too
	r := uncRun(t, "r = 10 mm ± 0.1 mm", "g(x) = x * r", "g(3)")
	if got := uOf(t, r); math.Abs(got-0.3e-3) > 1e-15 {
		t.Errorf("g(3) = 3r: u = %g, want 3e-4", got)
	}
}

// TestUncertainThroughBuiltins: the field at the centre of a ring,
// B = μ0·I/(2r) (Jackson, Classical Electrodynamics, 3rd ed., 1999, §5.5),
// with u(r)/r = 1 % and u(I)/I = 0.5 %: a product of powers, so GUM
// eq. (12) gives u(B)/B = √(0.01² + 0.005²). The radius enters through the
// path (a circle built from r) and the current through the source. The
// central difference of 1/r with step u is off by (u/r)² = 1e-4 relative
// from the derivative: tolerance 2e-4.
func TestUncertainThroughBuiltins(t *testing.T) {
	r := uncRun(t, "R = 20 mm ± 0.2 mm", "I = 3 A ± 0.5 %", "ring = circle([0, 0, 0] m, [0, 0, 1], R)", "b_at(source(ring, I), [0, 0, 0] m)")
	if len(r.Contributions) != 2 {
		t.Fatalf("contributions %+v", r.Contributions)
	}
	var u2 float64
	for _, c := range r.Contributions {
		u2 += c.CU[2] * c.CU[2] // the z component
	}
	b := 4e-7 * math.Pi * 3 / (2 * 0.02)
	want := b * math.Sqrt(0.01*0.01+0.005*0.005)
	if got := math.Sqrt(u2); math.Abs(got/want-1) > 2e-4 {
		t.Errorf("u(B_z) = %.6g T, GUM eq. (12) %.6g T", got, want)
	}
}

// TestUncertainRounding: GUM §7.2.6 — u to two significant digits, the
// estimate to the same decimal place, in the value's unit, both written as
// entered.
func TestUncertainRounding(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"x = 12 mm ± 0.1 mm", "12.00 mm ± 0.10 mm"},
		{"x = 100.02147 g ± 0.35 mg", "100.02147 g ± 0.00035 g"},
		{"x = 1.234567 ± 0.000123", "1.23457 ± 0.00012"},
		{"x = 1234.5 V ± 23 V", "1.235 kV ± 0.023 kV"},
		{"x = 5 A ± 0.0996 A", "5.00 A ± 0.10 A"},
		{"x = 7.3 H ± 12 H", "7 H ± 12 H"},
		{"x = 10 mm ± 0 mm", "10 mm ± 0 mm"},
	} {
		r := uncRun(t, c.in)
		if r.Text != c.want {
			t.Errorf("%s: shown %q, want %q", c.in, r.Text, c.want)
		}
	}
}

// TestUncertainErrors: bad uncertain values are positioned errors.
func TestUncertainErrors(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"x = 5 m ± 1 s", "must measure what the value does"},
		{"x = 5 m ±", "needs an uncertainty after it"},
		{"x = ± 5 m", "needs a value before it"},
		{"x = 5 m ± 1 m ± 2 m", "a second ± in one value"},
		{"x = 5 m ± -1 m", "finite number ≥ 0"},
		{"x = [1, 2, 3] m ± 1 m", "give each component of a vector its own ±"},
		{"f(x) = x ± 1", "cannot be written inside a function"},
		{"x = 2 A ± 3 A %", "a plain number of percent"},
	} {
		s := stdSession()
		_, err := s.Eval(lang.Pos{File: "u.lw", Line: 1, Col: 1}, c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "u.lw:1:") {
			t.Errorf("%s: got %v, want a positioned error with %q", c.in, err, c.want)
		}
	}
}

// TestUncertainPlusMinusSpelling: "+-" with spaces is ±; "a +-b" stays a
// sum with a negative number.
func TestUncertainPlusMinusSpelling(t *testing.T) {
	if r := uncRun(t, "x = 3 mm +- 0.1 mm"); r.Text != "3.00 mm ± 0.10 mm" {
		t.Errorf("spaced +-: %q", r.Text)
	}
	if r := uncRun(t, "3 +-1"); r.Text != "2" {
		t.Errorf("3 +-1: %q", r.Text)
	}
}

// TestSensitivityTable: for P = I²R the sensitivity coefficients are
// ∂P/∂I = 2IR and ∂P/∂R = I² (GUM §5.1.3, eq. (11a)), and the shares of
// the variance add up to 100 %. Exact under central differences (the
// result is quadratic in I and linear in R): 1e-12.
func TestSensitivityTable(t *testing.T) {
	r := uncRun(t, "I = 2 A ± 2 %", "R = 5 ohm ± 0.05 ohm", "P = I^2 * R", "sensitivity(P)")
	tab, ok := r.Value.(*runtime.Sensitivity)
	if !ok {
		t.Fatalf("sensitivity gave %T", r.Value)
	}
	cI := tab.Rows[0].CU[0] / tab.Rows[0].Input.U
	cR := tab.Rows[1].CU[0] / tab.Rows[1].Input.U
	if math.Abs(cI/20-1) > 1e-12 || math.Abs(cR/4-1) > 1e-12 {
		t.Errorf("c_I = %g V (want 2IR = 20 V), c_R = %g A² (want I² = 4 A²)", cI, cR)
	}
	_, _, rows := tab.Tabulate()
	if sum := rows[0][1] + rows[1][1]; math.Abs(sum-100) > 1e-10 {
		t.Errorf("shares add up to %g %%", sum)
	}
	if !strings.Contains(r.Text, "94.1 %") || !strings.Contains(r.Text, "5.88 %") {
		t.Errorf("table:\n%s", r.Text)
	}
}

// TestSensitivityCorrelated: y = V/I with r(V, I) = 0.5: u(y)² =
// (c_V u_V)² + (c_I u_I)² + 2 c_V u_V c_I u_I r (GUM §5.2.2, eq. (16)), by
// hand 0.25 + 0.0625 − 0.125 = 0.1875 Ω²; the correlation row's share is
// −0.125/0.1875 = −66.7 %, and with the inputs' 133 % and 33.3 % the
// shares add up to 100 %. Tolerance 3e-6 relative: V/I is not linear in
// I, and the central difference's (u²/6)·|y‴/y′| = (u_I/I)² = 1e-6 of c_I.
func TestSensitivityCorrelated(t *testing.T) {
	r := uncRun(t, "V = 5 V ± 0.01 V", "I = 20 mA ± 0.02 mA", "correlate(V, I, 0.5)", "sensitivity(V / I)")
	tab := r.Value.(*runtime.Sensitivity)
	if math.Abs(tab.U*tab.U/0.1875-1) > 3e-6 || math.Abs(tab.Corr/-0.125-1) > 3e-6 {
		t.Errorf("u² = %g Ω² (want 0.1875), correlation terms %g Ω² (want −0.125)", tab.U*tab.U, tab.Corr)
	}
	for _, want := range []string{"133 %", "33.3 %", "(correlations)", "-66.7 %"} {
		if !strings.Contains(r.Text, want) {
			t.Errorf("table lacks %q:\n%s", want, r.Text)
		}
	}
}

// TestCentralDifferenceError: for y = x³ the central difference over
// x ± u gives c·u = 3x²u + u³, the derivative's 3x²u plus exactly the
// error term (u²/6)·y‴·u the help states (Taylor's theorem; y‴ = 6).
// Tolerance 1e-12 relative: rounding.
func TestCentralDifferenceError(t *testing.T) {
	r := uncRun(t, "x = 2 ± 0.1", "x^3")
	want := 3*4*0.1 + 0.001
	if got := r.Contributions[0].CU[0]; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("c·u = %.15g, want 3x²u + u³ = %.15g", got, want)
	}
}

// TestMonteCarloAdaptive: the adaptive procedure of JCGM 101:2008 §7.9.4
// on y = x with x Gaussian, u = 2.0 (δ = 0.05, half a unit in u's second
// digit, §7.9.2): it stops at a whole number of batches of 10⁴, at least
// two, says it is stable, and then the mean, standard deviation and
// interval ends are within 2δ of the exact Gaussian's 0, 2 and ±1.96·2
// (the stopping rule makes twice each one's standard deviation ≤ δ, so 2δ
// is four of them). The same run replayed gives the same trial count.
func TestMonteCarloAdaptive(t *testing.T) {
	r := uncRun(t, "x = 0 ± 2", "monte_carlo(x, \"adaptive\")")
	mc := r.Value.(*runtime.MonteCarlo)
	d := 0.05
	if mc.Trials%10000 != 0 || mc.Trials < 20000 || !mc.Stable || !strings.Contains(r.Text, "adaptive") {
		t.Fatalf("trials %d, stable %v:\n%s", mc.Trials, mc.Stable, r.Text)
	}
	t.Logf("stopped after %d trials", mc.Trials)
	if math.Abs(mc.Mean) > 2*d || math.Abs(mc.SD-2) > 2*d || math.Abs(mc.Low+1.96*2) > 2*d || math.Abs(mc.High-1.96*2) > 2*d {
		t.Errorf("mean %g, sd %g, interval [%g, %g]", mc.Mean, mc.SD, mc.Low, mc.High)
	}
	r2 := uncRun(t, "x = 0 ± 2", "monte_carlo(x, \"adaptive\")")
	if r2.Value.(*runtime.MonteCarlo).Trials != mc.Trials {
		t.Errorf("replay stopped after %d trials, first run %d", r2.Value.(*runtime.MonteCarlo).Trials, mc.Trials)
	}
}

// TestMonteCarloLinear: for y = 2a + 3b with Gaussian inputs the output is
// Gaussian with the first-order u exactly (JCGM 101:2008 §9.2, the linear
// additive model, where first order and Monte Carlo must agree). With
// M = 20 000 trials the sample mean is within 4u/√M of y and the sample
// standard deviation within 4u/√(2M) of u (four standard errors of each);
// the interval ends within 4 of their standard errors,
// √(p(1 − p)/M)/φ(1.96) ≈ 0.019u for p = 0.025.
func TestMonteCarloLinear(t *testing.T) {
	r := uncRun(t, "a = 10 mm ± 0.3 mm", "b = 4 mm ± 0.2 mm", "y = 2*a + 3*b", "monte_carlo(y, 20000)")
	mc, ok := r.Value.(*runtime.MonteCarlo)
	if !ok {
		t.Fatalf("got %T", r.Value)
	}
	y, u := 32e-3, math.Sqrt(math.Pow(2*0.3e-3, 2)+math.Pow(3*0.2e-3, 2))
	M := 20000.0
	if math.Abs(mc.Mean-y) > 4*u/math.Sqrt(M) || math.Abs(mc.SD-u) > 4*u/math.Sqrt(2*M) {
		t.Errorf("mean %g sd %g, want %g and %g", mc.Mean, mc.SD, y, u)
	}
	se := 4 * 0.019 * u
	if math.Abs(mc.Low-(y-1.96*u)) > se || math.Abs(mc.High-(y+1.96*u)) > se {
		t.Errorf("interval [%g, %g], want %g ± 1.96·%g", mc.Low, mc.High, y, u)
	}
	if !mc.Agree || !strings.Contains(r.Text, "agrees") {
		t.Errorf("a linear model must validate first order:\n%s", r.Text)
	}
	// replay is exact: the same statement gives the same numbers
	r2 := uncRun(t, "a = 10 mm ± 0.3 mm", "b = 4 mm ± 0.2 mm", "y = 2*a + 3*b", "monte_carlo(y, 20000)")
	if r2.Text != r.Text {
		t.Errorf("not reproducible:\n%s\n%s", r.Text, r2.Text)
	}
}

// TestMonteCarloLognormal: y = exp(x) with x Gaussian (μ = 1, σ = 0.5) is
// lognormal: mean e^(μ + σ²/2) and 95 % interval [e^(μ − 1.96σ),
// e^(μ + 1.96σ)] (N. L. Johnson, S. Kotz and N. Balakrishnan, Continuous
// Univariate Distributions, vol. 1, 2nd ed., 1994, ch. 14; from memory).
// With M = 10⁵ the ends' standard errors are 0.42 % of each (√(p(1 − p)/M)
// over the density there): tolerance 2 %. First order is far off here
// (its interval reaches below zero) and must be reported as disagreeing.
func TestMonteCarloLognormal(t *testing.T) {
	r := uncRun(t, "x = 1 ± 0.5", "monte_carlo(exp(x), 100000)")
	mc := r.Value.(*runtime.MonteCarlo)
	lo, hi, mean := math.Exp(1-1.96*0.5), math.Exp(1+1.96*0.5), math.Exp(1+0.125)
	if math.Abs(mc.Low/lo-1) > 0.02 || math.Abs(mc.High/hi-1) > 0.02 || math.Abs(mc.Mean/mean-1) > 0.02 {
		t.Errorf("interval [%g, %g] mean %g, want [%g, %g] and %g", mc.Low, mc.High, mc.Mean, lo, hi, mean)
	}
	if mc.Agree || !strings.Contains(r.Text, "DISAGREES") {
		t.Errorf("first order must be reported as disagreeing:\n%s", r.Text)
	}
}

// TestMonteCarloChain: a trial re-runs the assignments in order, so a name
// reassigned without uncertainty keeps its new value, and a path built
// from an uncertain radius is rebuilt in every trial.
func TestMonteCarloChain(t *testing.T) {
	r := uncRun(t, "r = 10 mm ± 0.1 mm", "A = pi*r^2", "r = 3 mm", "monte_carlo(A + 0*r^2, 2000)")
	mc := r.Value.(*runtime.MonteCarlo)
	if math.Abs(mc.SD/(2*math.Pi*0.01*0.1e-3)-1) > 0.1 {
		t.Errorf("sd of A = %g m², want about 2πr·u", mc.SD)
	}
	s := stdSession()
	for i, l := range []string{"r = 10 mm ± 0.1 mm", "r = 3 mm"} {
		if _, err := s.Eval(lang.Pos{File: "u.lw", Line: i + 1, Col: 1}, l); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := s.Eval(lang.Pos{File: "u.lw", Line: 3, Col: 1}, "monte_carlo(r, 2000)"); err == nil || !strings.Contains(err.Error(), "reads no uncertain value") {
		t.Errorf("r reassigned without ±: %v", err)
	}
}

// TestGUMAnnexH2: the simultaneous measurement of resistance and
// reactance of JCGM 100:2008 annex H.2 (Tables H.2 and H.3; the numbers
// from memory): V = 4.99900 V, s = 0.0032 V; I = 19.6610 mA, s = 0.0095 mA;
// φ = 1.04446 rad, s = 0.00075 rad; r(V, I) = −0.36, r(V, φ) = 0.86,
// r(I, φ) = −0.65; R = V cos φ/I = 127.732 Ω with u = 0.071 Ω, X = V sin φ/I
// = 219.847 Ω with u = 0.295 Ω, Z = V/I = 254.260 Ω with u = 0.236 Ω. The
// estimates are checked to half a unit of their last published digit; the
// uncertainties to 3 %, since the inputs' s and r are published to two
// digits (0.0032 alone is uncertain by 1.6 %) and the annex computed from
// the unrounded data.
func TestGUMAnnexH2(t *testing.T) {
	base := []string{"V = 4.99900 V ± 0.0032 V", "I = 19.6610 mA ± 0.0095 mA", "phi = 1.04446 rad ± 0.00075 rad",
		"correlate(V, I, -0.36)", "correlate(V, phi, 0.86)", "correlate(I, phi, -0.65)"}
	for _, c := range []struct {
		expr    string
		y, u, d float64
	}{{"V/I*cos(phi)", 127.732, 0.071, 0.0005}, {"V/I*sin(phi)", 219.847, 0.295, 0.0005}, {"V/I", 254.260, 0.236, 0.0005}} {
		r := uncRun(t, append(base, c.expr)...)
		y := r.Value.(runtime.Quantity).V
		if math.Abs(y-c.y) > c.d || len(r.U) != 1 || math.Abs(r.U[0]/c.u-1) > 0.03 {
			t.Errorf("%s = %.6f ± %v Ω; GUM H.2: %.3f ± %.3f Ω", c.expr, y, r.U, c.y, c.u)
		}
		t.Logf("%s = %.4f Ω ± %.4f Ω (GUM H.2: %.3f ± %.3f)", c.expr, y, r.U[0], c.y, c.u)
	}
	// Monte Carlo with the same correlations: the sample standard
	// deviation of R within 2 % of first order (R is nearly linear over
	// these small spreads; 4 standard errors of an SD at M = 2·10⁴ is
	// 4/√(2M) = 2 %)
	r := uncRun(t, append(base, "R = V/I*cos(phi)", "monte_carlo(R, 20000)")...)
	mc := r.Value.(*runtime.MonteCarlo)
	if math.Abs(mc.SD/mc.U-1) > 0.02 || !mc.Agree {
		t.Errorf("Monte Carlo sd %g against first order %g", mc.SD, mc.U)
	}
}

// TestCorrelateErrors: inconsistent or misplaced correlations are refused.
func TestCorrelateErrors(t *testing.T) {
	for _, c := range []struct {
		lines []string
		want  string
	}{
		{[]string{"a = 1 ± 0.1", "b = 2 ± 0.1", "d = 3 ± 0.1", "correlate(a, b, 0.5)", "correlate(b, d, 0.5)", "correlate(a, d, -0.9)"}, "not positive definite"},
		{[]string{"a = 1 ± 0.1", "correlate(a, q, 0.5)"}, `"q" is not a name assigned an uncertain value`},
		{[]string{"a = 1 ± 0.1", "b = 2 ± 0.1", "correlate(a, b, 2)"}, "from -1 to 1"},
		{[]string{"a = 1 ± 0.1", "correlate(a, a, 0.5)"}, "fully correlated with itself"},
		{[]string{"a = 1 ± 0.1", "b = 2*a", "correlate(a, b, 0.5)"}, `"b" is not a name assigned an uncertain value`},
	} {
		s := stdSession()
		var err error
		for i, l := range c.lines {
			_, err = s.Eval(lang.Pos{File: "u.lw", Line: i + 1, Col: 1}, l)
			if err != nil && i < len(c.lines)-1 {
				t.Fatalf("%s: %v", l, err)
			}
		}
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: got %v, want %q", c.lines, err, c.want)
		}
	}
}

// TestUncertainVariables: the list of variables shows the uncertainty.
func TestUncertainVariables(t *testing.T) {
	s := stdSession()
	for i, l := range []string{"r = 10 mm ± 0.1 mm", "A = pi*r^2"} {
		if _, err := s.Eval(lang.Pos{File: "u.lw", Line: i + 1, Col: 1}, l); err != nil {
			t.Fatal(err)
		}
	}
	got := map[string]string{}
	for _, v := range s.Variables() {
		got[v.Name] = v.Text
	}
	if got["r"] != "10.00 mm ± 0.10 mm" || got["A"] != "314.2 mm^2 ± 6.3 mm^2" {
		t.Errorf("variables %v", got)
	}
}

// TestUncertainWorldFails: a statement that fails with an input moved
// gives its value with a note that says which input and why.
func TestUncertainWorldFails(t *testing.T) {
	r := uncRun(t, "r = 10 mm ± 0.1 mm", "x = sqrt((r - 10 mm)/1 mm)")
	if r.Contributions != nil || !strings.Contains(r.Note, "the uncertainty is not carried: with r moved to 9.9 mm the statement fails (sqrt: the argument is negative") {
		t.Errorf("note %q, contributions %v", r.Note, r.Contributions)
	}
}
