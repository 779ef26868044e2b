package builtins_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// components of a quantity or vector result.
func comps(t *testing.T, v runtime.Value) []float64 {
	t.Helper()
	switch x := v.(type) {
	case runtime.Quantity:
		return []float64{x.V}
	case runtime.Vector:
		return x.V[:]
	}
	t.Fatalf("got %s, want a quantity or a vector", runtime.TypeName(v))
	return nil
}

// TestExactDerivClosedForms: deriv of user functions is exact (forward-
// mode automatic differentiation) and agrees with the derivatives of
// calculus: Abramowitz & Stegun, Handbook of Mathematical Functions, 1964,
// 4.1.47 (ln), 4.2.54 (exp, a^x), 4.3.105–4.3.107 (sin, cos, tan), 4.4.52–
// 4.4.54 (asin, acos, atan), 4.5.76–4.5.78 (sinh, cosh, tanh), with the
// product, quotient and chain rules and d/dx xⁿ = n·xⁿ⁻¹ (any calculus
// text). The closed forms are evaluated here in float64, a different
// route (no tangent propagation, formulas written out), so each side
// carries a few roundings: the tolerance is 1e-14 of the derivative's
// scale (its amplitude for sines, else its size), about 50 ulps, and the
// reported numerical error must cover the difference up to 4 ulps of the
// scale for the reference's own rounding. No note may say differences.
func TestExactDerivClosedForms(t *testing.T) {
	w50, w1M := 2*math.Pi*50, 2*math.Pi*1e6
	cases := []struct {
		name  string
		defs  []string
		call  string
		want  []float64
		scale float64
	}{
		{"50 Hz sine", []string{"I(t) = 2 A * sin(2*pi*50 Hz*t)"}, "deriv(I, 3 ms)",
			[]float64{2 * w50 * math.Cos(w50*3e-3)}, 2 * w50},
		{"50 Hz sine late", []string{"I(t) = 2 A * sin(2*pi*50 Hz*t)"}, "deriv(I, 7.3 ms)",
			[]float64{2 * w50 * math.Cos(w50*7.3e-3)}, 2 * w50},
		{"1 MHz cosine", []string{"I(t) = 0.5 A * cos(2*pi*1 MHz*t)"}, "deriv(I, 0.37 us)",
			[]float64{-0.5 * w1M * math.Sin(w1M*0.37e-6)}, 0.5 * w1M},
		{"ramp", []string{"I(t) = 5 A * t / (2 ms) + 1 A"}, "deriv(I, 0.7 ms)", []float64{2500}, 2500},
		{"exponential", []string{"I(t) = 3 A * exp(-t/(4 ms))"}, "deriv(I, 1.7 ms)",
			[]float64{-3 / 4e-3 * math.Exp(-1.7/4)}, 3 / 4e-3 * math.Exp(-1.7/4)},
		{"product", []string{"I(t) = 2 A * exp(-t/(1 ms)) * sin(2*pi*1 kHz*t)"}, "deriv(I, 0.3 ms)",
			[]float64{2 * math.Exp(-0.3) * (-1e3*math.Sin(2*math.Pi*0.3) + 2*math.Pi*1e3*math.Cos(2*math.Pi*0.3))}, 2 * 2 * math.Pi * 1e3},
		{"quotient", []string{"f(x) = x / (1 m + x^2/(1 m))"}, "deriv(f, 0.6 m)",
			[]float64{(1 - 0.36) / ((1 + 0.36) * (1 + 0.36))}, 0.4},
		{"composition", []string{"f(x) = ln(cosh(x/(1 m))) + sqrt(1 + sin(x/(1 m))^2)"}, "deriv(f, 0.8 m)",
			[]float64{math.Tanh(0.8) + math.Sin(0.8)*math.Cos(0.8)/math.Sqrt(1+math.Sin(0.8)*math.Sin(0.8))}, 1},
		{"powers", []string{"f(x) = (x/(1 m))^2.5 + (1 m)^3 / x^3"}, "deriv(f, 1.3 m)",
			[]float64{2.5*math.Pow(1.3, 1.5) - 3/math.Pow(1.3, 4)}, 3},
		{"varying exponent", []string{"f(x) = x^x + 2^(3*x)"}, "deriv(f, 1.7)",
			[]float64{math.Pow(1.7, 1.7)*(math.Log(1.7)+1) + 3*math.Ln2*math.Pow(2, 5.1)}, 100},
		{"nested user functions", []string{"g(y) = y^3 - 2*y", "h(x) = g(sin(x)) * exp(g(x/2))"}, "deriv(h, 0.9)",
			func() []float64 {
				g := func(y float64) float64 { return y*y*y - 2*y }
				dg := func(y float64) float64 { return 3*y*y - 2 }
				x := 0.9
				return []float64{dg(math.Sin(x))*math.Cos(x)*math.Exp(g(x/2)) + g(math.Sin(x))*math.Exp(g(x/2))*dg(x/2)/2}
			}(), 2},
		{"inverse and hyperbolic functions", []string{"f(x) = (asin(x) + acos(x/2) + atan(3*x))/(1 rad) + sinh(x) + cosh(2*x) + tanh(x) + tan(x) + log10(x)"}, "deriv(f, 0.4)",
			[]float64{1/math.Sqrt(1-0.16) - 0.5/math.Sqrt(1-0.04) + 3/(1+1.44) + math.Cosh(0.4) + 2*math.Sinh(0.8) +
				1 - math.Tanh(0.4)*math.Tanh(0.4) + 1/(math.Cos(0.4)*math.Cos(0.4)) + 1/(0.4*math.Ln10)}, 10},
		{"atan2, hypot, abs, min, max", []string{"f(x) = atan2(x, 2 m)/(1 rad) + hypot(x, 1 m)/(1 m) + abs(x - 3 m)/(1 m) + min(x, 5 m)/(1 m) + max(2*x, 1 m)/(1 m)"}, "deriv(f, 1.5 m)",
			[]float64{2/(4+2.25) + 1.5/math.Sqrt(1+2.25) - 1 + 1 + 2}, 3},
		{"vector of a quantity", []string{"v(x) = [cos(x), sin(x), x]"}, "deriv(v, 0.7)",
			[]float64{-math.Sin(0.7), math.Cos(0.7), 1}, 1},
		{"vector products", []string{"a(x) = [x, x^2, 1]", "f(x) = dot(a(x), [1, 2, 3]) + norm(cross(a(x), [0, 0, 1]))"}, "deriv(f, 0.5)",
			// dot: x + 2x² + 3 → 1 + 4x; |a × ẑ| = √(x² + x⁴) → (x + 2x³)/√(x² + x⁴)
			[]float64{1 + 4*0.5 + (0.5+2*0.125)/math.Sqrt(0.25+0.0625)}, 3},
		{"complex intermediate", []string{"f(x) = abs((1 + x) * exp(j * x))"}, "deriv(f, 0.5)", []float64{1}, 1}, // |e^{jx}| = 1
		{"recursion ending on a constant tie", []string{"p(x, n) = n == 0 ? 1 : x * p(x, n - 1)", "q(x) = p(x, 4)"}, "deriv(q, 3)", []float64{108}, 108},
		{"a smooth join", []string{"f(x) = x < 1 ? x^2 : 2*x - 1"}, "deriv(f, 1)", []float64{2}, 2},
		{"a piecewise constant part", []string{"f(x) = floor(x) + x^2"}, "deriv(f, 2.5)", []float64{5}, 5},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			lines := append(append([]string{}, c.defs...), c.call)
			r := numRun(t, lines...)
			got := comps(t, r.Value)
			if len(got) != len(c.want) {
				t.Fatalf("got %d components, want %d", len(got), len(c.want))
			}
			if strings.Contains(r.Note, "differences") {
				t.Errorf("note %q: the derivative should be exact", r.Note)
			}
			for i := range got {
				diff := math.Abs(got[i] - c.want[i])
				if diff > 1e-14*c.scale {
					t.Errorf("component %d: got %.17g, want %.17g (difference %.3g of the scale)", i, got[i], c.want[i], diff/c.scale)
				}
				var bound float64
				if r.NumErr != nil {
					bound = r.NumErr[i]
				}
				if diff > bound+4*0x1p-52*c.scale {
					t.Errorf("component %d: difference %.3g exceeds the reported bound %.3g", i, diff, bound)
				}
			}
		})
	}
}

// TestEMFExactRing: the EMF of a ring carrying a sinusoidal current
// through a coaxial loop is −M·dI/dt, with M from Maxwell's formula for
// coaxial circles (maxwell_mutual; Maxwell, Treatise, 1873, §701) and
// dI/dt = I0·ω·cos(ωt) (calculus). The loop's flux is ∮A·dl of the ring's
// closed-form A, constant along the coaxial loop, so the quadrature is
// exact to rounding; dI/dt is exact by tangent propagation. What is left
// is rounding in the elliptic integrals of both routes and a few
// operations: the bound asked is 1e-13 relative. Before exact derivatives
// the step differences left 5e-9 (50 Hz) and 8e-8 (ramp) here.
func TestEMFExactRing(t *testing.T) {
	w := 2 * math.Pi * 50
	for _, c := range []struct {
		name, current string
		t             string
		didt          float64
	}{
		{"50 Hz sine", "I(t) = 2 A * sin(2*pi*50 Hz*t)", "3 ms", 2 * w * math.Cos(w*3e-3)},
		{"50 Hz sine at 0", "I(t) = 2 A * sin(2*pi*50 Hz*t)", "0 s", 2 * w},
		{"1 MHz sine", "I(t) = 0.2 A * sin(2*pi*1 MHz*t)", "0.1 us", 0.2 * 2 * math.Pi * 1e6 * math.Cos(2*math.Pi*0.1)},
		{"ramp", "I(t) = 5 A * t / (2 ms)", "1 ms", 2500},
	} {
		t.Run(c.name, func(t *testing.T) {
			s := runtime.NewSession(builtins.Standard())
			eval := func(line string) *runtime.Result {
				r, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line)
				if err != nil {
					t.Fatalf("%s: %v", line, err)
				}
				return r
			}
			eval(c.current)
			r := eval("emf(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), I), circle([0, 0, 10] mm, [0, 0, 1], 20 mm), " + c.t + ")")
			m := eval("maxwell_mutual(25 mm, 20 mm, 10 mm)").Value.(runtime.Quantity).V
			got := r.Value.(runtime.Quantity).V
			want := -m * c.didt
			if rel := math.Abs(got-want) / math.Abs(want); rel > 1e-13 {
				t.Errorf("emf %.17g V, −M·dI/dt %.17g V: relative difference %.3g", got, want, rel)
			}
			if strings.Contains(r.Note, "differences") {
				t.Errorf("note %q", r.Note)
			}
		})
	}
}

// TestInducedEExact: the induced E of a ring with a time-varying current
// is −A·dI/dt (E = −∂A/∂t), A of the same ring at the same point per
// ampere times the exact rate; the two share the closed form of A, so
// they agree to a few roundings (bound 1e-14 relative).
func TestInducedEExact(t *testing.T) {
	r := numRun(t, "I(t) = 3 A * exp(-t/(2 ms))", "ring = circle([0, 0, 0] m, [0, 0, 1], 25 mm)",
		"e_at(source(ring, I), [12, 5, 7] mm, 1 ms)")
	a := numRun(t, "a_at(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 1 A), [12, 5, 7] mm)")
	e, av := r.Value.(runtime.Vector), a.Value.(runtime.Vector)
	didt := -3 / 2e-3 * math.Exp(-0.5)
	for i := range e.V {
		want := -av.V[i] * didt
		if math.Abs(e.V[i]-want) > 1e-14*math.Abs(av.V[0]*didt)+1e-14*math.Abs(want) {
			t.Errorf("E[%d] = %.17g, −A·dI/dt = %.17g", i, e.V[i], want)
		}
	}
}

// TestExactCurlDiv: curl and div of user fields by exact partial
// derivatives, against the hand curl and divergence (vector calculus: for
// F = k(−y, x, 0), ∇×F = (0, 0, 2k) and ∇·F = 0; for
// G = k(xy, y² sin z, eˣ z), ∇×G = k(−y² cos z, −eˣ z, −x) and
// ∇·G = k(y + 2y sin z + eˣ)). Tolerance 1e-14 of the largest partial
// derivative (a few roundings on each side).
func TestExactCurlDiv(t *testing.T) {
	x, y, z := 0.3, -0.7, 1.1
	for _, c := range []struct {
		name, def, call string
		want            []float64
	}{
		{"rotation curl", "F(p) = [-p.y, p.x, 0 m] * 1 T/m", "curl(F, [1, 2, 3] m)", []float64{0, 0, 2}},
		{"rotation div", "F(p) = [-p.y, p.x, 0 m] * 1 T/m", "div(F, [1, 2, 3] m)", []float64{0}},
		{"nonlinear curl", "G(p) = [p.x*p.y/(1 m), p.y^2 * sin(p.z/(1 m))/(1 m), exp(p.x/(1 m)) * p.z] * 1 T/m",
			"curl(G, [0.3, -0.7, 1.1] m)", []float64{-y * y * math.Cos(z), -math.Exp(x) * z, -x}},
		{"nonlinear div", "G(p) = [p.x*p.y/(1 m), p.y^2 * sin(p.z/(1 m))/(1 m), exp(p.x/(1 m)) * p.z] * 1 T/m",
			"div(G, [0.3, -0.7, 1.1] m)", []float64{y + 2*y*math.Sin(z) + math.Exp(x)}},
		{"time-dependent field", "H(p, t) = [p.y, -p.x, 0 m] * (1 T/m) * cos(2*pi*50 Hz*t)",
			"curl(H, [1, 2, 3] m, 2 ms)", []float64{0, 0, -2 * math.Cos(2*math.Pi*50*2e-3)}},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := numRun(t, c.def, c.call)
			got := comps(t, r.Value)
			for i := range c.want {
				if math.Abs(got[i]-c.want[i]) > 1e-14*3 {
					t.Errorf("component %d: got %.17g, want %.17g", i, got[i], c.want[i])
				}
			}
			if strings.Contains(r.Note, "differences") {
				t.Errorf("note %q", r.Note)
			}
		})
	}
	// ∂/∂t of a user field: d/dt of k·x·cos(ωt) is −k·x·ω·sin(ωt)
	r := numRun(t, "H(p, t) = [p.x * cos(2*pi*50 Hz * t), 0 m, 0 m] * 1 T/m", "ddt(H, [2, 0, 0] m, 1 ms)")
	got := comps(t, r.Value)
	want := -2 * 2 * math.Pi * 50 * math.Sin(2*math.Pi*50*1e-3)
	if math.Abs(got[0]-want) > 1e-14*2*2*math.Pi*50 || got[1] != 0 || got[2] != 0 {
		t.Errorf("ddt: got %v, want [%.17g, 0, 0]", got, want)
	}
}

// TestDerivFallback: a function that calls solve (which has no derivative
// rule) is differentiated by step differences, says so, and agrees within
// its own estimate and the old tolerance (1e-6 relative, what the step
// search asks of its plateau): x + x³/(1 s²) = t at t = 2 s has the root
// x = 1 s, and dx/dt = 1/(1 + 3x²) = 1/4 (the inverse function's
// derivative).
func TestDerivFallback(t *testing.T) {
	defs := []string{"g(x) = x + x^3/(1 s^2)", "M(t) = 1 A * solve(g, t, -10 s, 10 s) / (1 s)"}
	r := numRun(t, append(defs, "deriv(M, 2 s)")...)
	got := r.Value.(runtime.Quantity).V
	if !strings.Contains(r.Note, "deriv: the derivative of M(t) is by step differences, not exact (solve has no derivative rule)") {
		t.Errorf("note %q", r.Note)
	}
	if math.Abs(got-0.25) > 1e-6*0.25 {
		t.Errorf("deriv: got %.12g A/s, want 0.25 A/s", got)
	}
	// the EMF with that current: −M·dI/dt with M from Maxwell's formula
	r = numRun(t, append(defs, "emf(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), M), circle([0, 0, 10] mm, [0, 0, 1], 20 mm), 2 s)")...)
	m := numRun(t, "maxwell_mutual(25 mm, 20 mm, 10 mm)").Value.(runtime.Quantity).V
	e := r.Value.(runtime.Quantity).V
	if math.Abs(e+m*0.25) > 1e-6*m*0.25 || !strings.Contains(r.Note, "emf: the derivative of M(t) is by step differences") {
		t.Errorf("emf %.12g V, want %.12g V; note %q", e, -m*0.25, r.Note)
	}
}

// TestExactKinksAndJumps: where the derivative is one-sided, the exact
// route reports the corner or the jump with both sides, positioned at the
// call. Slopes of |t − t0| are ∓ its factor (calculus).
func TestExactKinksAndJumps(t *testing.T) {
	loop := "circle([0, 0, 10] mm, [0, 0, 1], 20 mm)"
	ring := "circle([0, 0, 0] m, [0, 0, 1], 25 mm)"
	for _, c := range []struct {
		name, def, call, want string
		col                   int
	}{
		{"abs at t0", "I(t) = 2 A * abs(t - 1 ms) / (1 ms)", "emf(source(" + ring + ", I), " + loop + ", 1 ms)",
			"emf: the current function I(t) has a kink at t = 1 ms: its slope is -2 kA/s just before and 2 kA/s just after, so dI/dt is not defined there; take t a little before or after", 1},
		{"min of equal arguments", "I(t) = min(t * 1 A/s, 2 A - t * 1 A/s)", "  emf(source(" + ring + ", I), " + loop + ", 1 s)",
			"emf: the current function I(t) has a kink at t = 1 s: its slope is 1 A/s just before and -1 A/s just after, so dI/dt is not defined there; take t a little before or after", 3},
		{"a condition switching at t", "I(t) = t < 1 ms ? 0 A : (t - 1 ms) * 1 A/s", "emf(source(" + ring + ", I), " + loop + ", 1 ms)",
			"emf: the current function I(t) has a kink at t = 1 ms: its slope is 0 A/s just before and 1 A/s just after, so dI/dt is not defined there; take t a little before or after", 1},
		{"a step", "I(t) = t < 1 ms ? 0 A : 1 A", "emf(source(" + ring + ", I), " + loop + ", 1 ms)",
			"emf: the current function I(t) has no derivative at t = 1 ms: it jumps there (0 A just before, 1 A at t, 1 A just after); take t a little before or after", 1},
		{"a sawtooth's wrap", "I(t) = 2 A * (t % (1 ms)) / (1 ms)", "emf(source(" + ring + ", I), " + loop + ", 2 ms)",
			"emf: the current function I(t) has no derivative at t = 2 ms: it jumps there (2 A just before, 0 A at t, 0 A just after); take t a little before or after", 1},
		{"floor at a whole number", "f(x) = floor(x)", "deriv(f, 3)",
			"deriv: f(x) has no derivative at 3: it jumps there (2 just before, 3 at the point, 3 just after)", 1},
		{"sqrt at 0", "f(x) = sqrt(x)", "deriv(f, 0 m^2, 1 m^2)",
			"deriv: f(x) has no derivative at 0 m^2: the slope of sqrt at 0 is infinite here", 1},
		// sqrt(x²) = |x|: the slope of x² is 0 at 0 and sqrt's infinite,
		// which the exact route cannot resolve; the differences find the kink
		{"sqrt of a square at 0", "f(x) = sqrt(x^2)", "deriv(f, 0, 1)",
			"deriv: f(x) has a kink at 0: its slope is -1 just before and 1 just after, so the derivative is not defined there", 1},
		{"a kink in space", "K(p) = [abs(p.x), 0 m, 0 m]", "div(K, [0, 1, 0] m)",
			"div: the field K(p) has a kink at this point along x: its derivative along x is [-1, 0, 0] on the − side and [1, 0, 0] on the + side", 1},
	} {
		t.Run(c.name, func(t *testing.T) {
			s := runtime.NewSession(builtins.Standard())
			if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.def); err != nil {
				t.Fatal(err)
			}
			_, err := s.Eval(lang.Pos{Line: 2, Col: 1}, c.call)
			var le *lang.Error
			if !errors.As(err, &le) {
				t.Fatalf("got %v, want a positioned error", err)
			}
			if le.Msg != c.want || le.Pos.Line != 2 || le.Pos.Col != c.col {
				t.Errorf("got %d:%d: %s\nwant 2:%d: %s", le.Pos.Line, le.Pos.Col, le.Msg, c.col, c.want)
			}
			if !strings.Contains(le.Error(), "^") {
				t.Errorf("no caret in %q", le.Error())
			}
		})
	}
}

// TestExactSourceDdt: ∂B/∂t on the axis of a ring whose current is a
// sine is the on-axis field per ampere, μ0a²/(2(a² + z²)^{3/2}) (Jackson,
// Classical Electrodynamics, 3rd ed., 1999, §5.5, from memory), times
// dI/dt = I0·ω·cos(ωt). The kernel's closed form and the formula round
// differently: bound 1e-13 relative.
func TestExactSourceDdt(t *testing.T) {
	r := numRun(t, "I(t) = 2 A * sin(2*pi*50 Hz*t)",
		"ddt(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), I)), [0, 0, 7] mm, 1.3 ms)")
	got := comps(t, r.Value)
	a, z, w := 0.025, 0.007, 2*math.Pi*50
	mu0 := numRun(t, "mu0").Value.(runtime.Quantity).V
	want := mu0 * a * a / (2 * math.Pow(a*a+z*z, 1.5)) * 2 * w * math.Cos(w*1.3e-3)
	if math.Abs(got[2]-want) > 1e-13*math.Abs(want) || math.Abs(got[0]) > 1e-13*math.Abs(want) || math.Abs(got[1]) > 1e-13*math.Abs(want) {
		t.Errorf("ddt B = %v T/s, want [0, 0, %.17g]", got, want)
	}
	if strings.Contains(r.Note, "differences") {
		t.Errorf("note %q", r.Note)
	}
}
