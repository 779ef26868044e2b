package builtins_test

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func vecOf(t *testing.T, v runtime.Value) [3]float64 {
	t.Helper()
	x, ok := v.(runtime.Vector)
	if !ok {
		t.Fatalf("got %s, want a vector", runtime.Format(v, 6))
	}
	return x.V
}

func vclose(a, b [3]float64, rel, abs float64) bool {
	d := math.Sqrt((a[0]-b[0])*(a[0]-b[0]) + (a[1]-b[1])*(a[1]-b[1]) + (a[2]-b[2])*(a[2]-b[2]))
	n := math.Max(math.Sqrt(a[0]*a[0]+a[1]*a[1]+a[2]*a[2]), math.Sqrt(b[0]*b[0]+b[1]*b[1]+b[2]*b[2]))
	return d <= abs || d <= rel*n
}

// TestStokesAndFaraday checks Faraday's law in integral form, ∮E·dl =
// −dΦ/dt, and in differential form, curl E = −∂B/∂t, and div B = 0, for
// the induced field of a loop whose current is I(t) = 3 A·sin(2π·60 Hz·t)
// + 1 A·t/s (Griffiths, Introduction to Electrodynamics, 4th ed., 2017,
// eqs. 7.14–7.15; div B = 0 in §5.3, from memory).
//
// Integral form, two routes whose closed form (A against B), quadrature
// (1-D along the loop against 2-D over a surface) and dI/dt (numerical
// against by hand) differ:
//   - left: circulation(e_field(src), loop, t) integrates E = −A₁·dI/dt
//     along the loop's own primitives (1-D adaptive Gauss–Kronrod), with
//     A₁ the closed-form vector potential of the source circle per ampere
//     (em.ArcA) and dI/dt the builtin's numerical derivative of I;
//   - right: −Φ₁·İ(t), with Φ₁ = surface_flux(b_field(source(circle, 1 A)),
//     S) the flux per ampere by 2-D quadrature of the closed-form B
//     (em.ArcB) over a surface S bounded by the loop (a disk,
//     rectangle_surface, or spanned for the triangle), and İ written here in
//     closed form: 3 A·2π·60 Hz·cos(2π·60 Hz·t) + 1 A/s.
//
// They share em's path geometry, the evaluator that sums a path's pieces,
// and gonum's elliptic integrals.
// Tolerance: the quadratures are asked for relative 1e-10 each; the
// numerical dI/dt on the left stops at the first step whose estimate agrees
// with both neighbours to 1e-6 (builtins.derivative), so its error is
// bounded by about 1e-6 relative, hence 2e-6 overall.
func TestStokesAndFaraday(t *testing.T) {
	setup := []string{
		"I(t) = 3 A * sin(2*pi*60 Hz*t) + 1 A * t / (1 s)",
		"src = source(circle([0,0,0] m, [0,0,1], 40 mm), I)",
		"unit = source(circle([0,0,0] m, [0,0,1], 40 mm), 1 A)",
		"E = e_field(src)",
		"Bf = b_field(src)",
	}
	s := runtime.NewSession(builtins.Standard())
	for i, l := range setup {
		if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, l); err != nil {
			t.Fatal(err)
		}
	}
	ev := func(in string) runtime.Value {
		res, err := s.Eval(lang.Pos{Line: 9, Col: 1}, in)
		if err != nil {
			t.Fatalf("%s: %v", in, err)
		}
		return res.Value
	}
	// dI/dt of I above, differentiated by hand.
	didt := func(tm float64) float64 {
		w := 2 * math.Pi * 60
		return 3*w*math.Cos(w*tm) + 1
	}
	for _, c := range []struct{ loop, surface string }{
		{"circle([0,0,25] mm, [0,0,1], 30 mm)", "disk([0,0,25] mm, [0,0,1], 30 mm)"},
		{"rectangle([10,-20,5] mm, [0,40,0] mm, [0,0,30] mm)", "rectangle_surface([10,-20,5] mm, [0,40,0] mm, [0,0,30] mm)"},
		{"polygon([0,0,15] mm, [60,0,15] mm, [0,60,40] mm)", "spanned(polygon([0,0,15] mm, [60,0,15] mm, [0,60,40] mm))"},
	} {
		phi1 := q(t, ev("surface_flux(b_field(unit), "+c.surface+") / 1 A"), "Wb/A")
		for _, tm := range []float64{0, 3.7e-3} {
			ts := runtime.FormatNumber(tm, 17) + " s"
			circ := q(t, ev("circulation(E, "+c.loop+", "+ts+")"), "V")
			want := -phi1 * didt(tm)
			if !scalar.EqualWithinAbsOrRel(circ, want, 0, 2e-6) {
				t.Errorf("%s at %s: ∮E·dl = %.12g V, −Φ₁·İ = %.12g V (relative %.2g)", c.loop, ts, circ, want, math.Abs(circ/want-1))
			}
			t.Logf("%s at %s: ∮E·dl = %.12g V, −Φ₁·İ = %.12g V, relative difference %.2g", c.loop, ts, circ, want, math.Abs(circ/want-1))
		}
	}
	// Differential form: curl E (numerical space derivatives, in curl, of
	// the closed-form A times the numerical dI/dt) against −∂B/∂t (the
	// numerical time derivative, in ddt, of the closed-form B). They share
	// the Richardson step search (plateauDerivative) but not the closed
	// form or the variable differentiated. The time search accepts an
	// estimate agreeing with its neighbours to 1e-6 relative, hence 1e-6.
	// div B is compared with |∇B| ~ |B|/distance, and must be below 1e-6 of it.
	for _, p := range []string{"[3, 4, 5] mm", "[70, -20, 10] mm", "[0, 0, 90] mm"} {
		curlE := vecOf(t, ev("curl(E, "+p+", 2 ms)"))
		dBdt := vecOf(t, ev("-ddt(Bf, "+p+", 2 ms)"))
		if !vclose(curlE, dBdt, 1e-6, 0) {
			t.Errorf("at %s: curl E = %v, −∂B/∂t = %v", p, curlE, dBdt)
		}
		div := q(t, ev("div(Bf, "+p+", 2 ms)"), "T/m")
		grad := vecOf(t, ev("curl(b_field(source(circle([0,0,0] m, [0,0,1], 40 mm), 1 A)), "+p+")"))
		bmag := vecOf(t, ev("b_at(src, "+p+", 2 ms)"))
		scale := math.Sqrt(bmag[0]*bmag[0]+bmag[1]*bmag[1]+bmag[2]*bmag[2]) / 0.01
		if math.Abs(div) > 1e-6*scale {
			t.Errorf("at %s: div B = %g T/m, want 0 (scale %g; curl of the static field %v)", p, div, scale, grad)
		}
	}
}

// TestWorkPerTurn: the induced field is not conservative; the work on a
// charge carried once around a loop is W = q∮E·dl = −q dΦ/dt (Faraday).
// Both sides integrate the same vector potential with the same numerical
// dI/dt, so this checks work_per_turn's definition (W = e·EMF, e exact in
// the SI), not Faraday's law, which TestStokesAndFaraday checks.
func TestWorkPerTurn(t *testing.T) {
	w := q(t, run(t, "I(t) = 200 A * sin(2*pi*50 Hz*t)",
		"src = source(circle([0,0,0] m, [0,0,1], 25 mm), I)",
		"work_per_turn(e, e_field(src), circle([0,0,10] mm, [0,0,1], 20 mm), 0 s)"), "J")
	emf := q(t, run(t, "I(t) = 200 A * sin(2*pi*50 Hz*t)",
		"emf(source(circle([0,0,0] m, [0,0,1], 25 mm), I), circle([0,0,10] mm, [0,0,1], 20 mm), 0 s)"), "V")
	if !scalar.EqualWithinAbsOrRel(w, 1.602176634e-19*emf, 0, 1e-9) || w == 0 {
		t.Errorf("work per turn %g J, want e·EMF = %g J", w, 1.602176634e-19*emf)
	}
}

// TestSolveAccuracy: solve's help promises the root to 1e-12 relative in
// x, or 1e-24 of the larger end of the bracket for a root at zero. The
// roots below are exact by construction (x^n = r^n with r a power of ten,
// exp(x/1e6) = e);
// each is placed far from the bracket's scale, where a stopping rule
// relative to the bracket would give only 1e-9 or 1e-3 relative. The
// tolerance is the promise itself.
func TestSolveAccuracy(t *testing.T) {
	for _, c := range []struct {
		f, target, lo, hi string
		root              float64
	}{
		{"x^2", "1e12", "0", "1e9", 1e6},
		{"x^3", "1e18", "0", "1e9", 1e6},
		{"x^2", "1e-18", "0", "1", 1e-9},
		{"x^3", "1e-27", "0", "1", 1e-9},
		{"exp(x / 1e6)", "exp(1)", "0", "1e8", 1e6},
		{"x^3", "0", "-1", "2", 0},
	} {
		x := q(t, run(t, "f(x) = "+c.f, "solve(f, "+c.target+", "+c.lo+", "+c.hi+")"), "1")
		if c.root == 0 {
			if math.Abs(x) > 2e-24 {
				t.Errorf("f(x) = %s, root 0 in [%s, %s]: got %g, want |x| <= 2e-24", c.f, c.lo, c.hi, x)
			}
			continue
		}
		if !scalar.EqualWithinRel(x, c.root, 1e-12) {
			t.Errorf("f(x) = %s = %s in [%s, %s]: got %.17g, want %g (relative error %.2g)", c.f, c.target, c.lo, c.hi, x, c.root, math.Abs(x/c.root-1))
		}
	}
}

// TestSolveAndSweep: solve finds roots known in closed form; sweep tabulates.
func TestSolveAndSweep(t *testing.T) {
	// x² = 2 → √2 (OEIS A002193), Brent to 1e-12 relative.
	x := q(t, run(t, "f(x) = x^2", "solve(f, 2 m^2, 0 m, 3 m)"), "m")
	if !scalar.EqualWithinAbsOrRel(x, math.Sqrt2, 0, 1e-12) {
		t.Errorf("solve x² = 2: %v", x)
	}
	// Turns for a 1 V rms pick-up: N = V/(4.44288 f A B) (transformer
	// EMF rule, common practice; exact factor 2π/√2).
	n := q(t, run(t, "V(N) = 2*pi/sqrt(2) * 50 Hz * N * 2 cm^2 * 0.8 mT", "solve(V, 1 V, 1, 100000)"), "1")
	if want := 1 / (2 * math.Pi / math.Sqrt2 * 50 * 2e-4 * 0.8e-3); !scalar.EqualWithinAbsOrRel(n, want, 0, 1e-10) {
		t.Errorf("turns: %v, want %v", n, want)
	}
	// The gap where two coaxial rings couple with k = 0.3 (Maxwell's
	// formula): evaluating k at the solution gives 0.3.
	g := q(t, run(t, "L1 = inductance(circle([0,0,0] m, [0,0,1], 20 mm), 0.3 mm)",
		"k(d) = maxwell_mutual(20 mm, 20 mm, d) / L1",
		"solve(k, 0.3, 0.1 mm, 50 mm)"), "m")
	k := q(t, run(t, "L1 = inductance(circle([0,0,0] m, [0,0,1], 20 mm), 0.3 mm)",
		"maxwell_mutual(20 mm, 20 mm, "+runtime.FormatNumber(g, 17)+" m) / L1"), "1")
	if !scalar.EqualWithinAbsOrRel(k, 0.3, 0, 1e-9) {
		t.Errorf("k at the solved gap %g m = %v, want 0.3", g, k)
	}
	// No root bracketed: a clear error.
	s := runtime.NewSession(builtins.Standard())
	s.Eval(lang.Pos{Line: 1, Col: 1}, "f(x) = x^2 + 1 m^2")
	if _, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "solve(f, 0 m^2, -1 m, 1 m)"); err == nil || !strings.Contains(err.Error(), "no solution is bracketed") {
		t.Errorf("unbracketed: %v", err)
	}
	// sweep: n rows from from to to, f evaluated at each (x² at 0..2 m).
	tab, ok := run(t, "f(x) = x^2", "sweep(f, 0 m, 2 m, 5)").(*builtins.Table)
	if !ok || len(tab.Rows) != 5 {
		t.Fatalf("sweep: %v", tab)
	}
	for i, r := range tab.Rows {
		xi := 0.5 * float64(i)
		if r[0] != xi || r[1] != xi*xi {
			t.Errorf("row %d = %v, want [%g %g]", i, r, xi, xi*xi)
		}
	}
}

// evalIn evaluates setup lines in a fresh session and returns an
// evaluator for further statements, and one for statements expected to
// fail (it returns the error).
func evalIn(t *testing.T, setup ...string) (func(string) runtime.Value, func(string) error) {
	t.Helper()
	s := runtime.NewSession(builtins.Standard())
	for i, l := range setup {
		if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, l); err != nil {
			t.Fatalf("%s: %v", l, err)
		}
	}
	ev := func(in string) runtime.Value {
		t.Helper()
		res, err := s.Eval(lang.Pos{Line: 20, Col: 1}, in)
		if err != nil {
			t.Fatalf("%s: %v", in, err)
		}
		return res.Value
	}
	fail := func(in string) error {
		t.Helper()
		_, err := s.Eval(lang.Pos{Line: 20, Col: 1}, in)
		if err == nil {
			t.Fatalf("%s: no error", in)
		}
		return err
	}
	return ev, fail
}

func norm3(v [3]float64) float64 { return math.Sqrt(v[0]*v[0] + v[1]*v[1] + v[2]*v[2]) }

// TestCurlNearCoil: B of a 12-ring coil (radius 20 mm, pitch 6 mm) is
// smooth wherever it is 10 mm or more from every wire; there ∇ × B = μ0 J = 0
// and ∇ · B = 0 (Ampère's law and Gauss's law for B in differential form,
// e.g. Griffiths, Introduction to Electrodynamics, 4th ed., 2017, eqs. 5.50
// and 5.55; from memory), and B = ∇ × A. The curl must be an answer, not a
// refusal, including on the axis, at the coil's centre (where every
// derivative of B vanishes by symmetry) and in the plane of the first ring.
// Tolerance: the derivatives of B have the scale |B|/d, d = 10 mm the
// distance from the wires; the Richardson central difference at the chosen
// step balances truncation (h/d)⁴ against rounding δ/(h/d), δ ≈ 1e-14 the
// relative rounding of the closed-form fields, so its error is of order
// δ^{4/5} ≈ 1e-11 of |B|/d: 1e-8 of |B|/d allows a thousandfold. For
// curl A against B, the same 1e-8 of |B|; the nested curl differentiates
// values good to ~1e-11, so its error is ~(1e-11)^{4/5} ≈ 2e-9 of |B|/d:
// allowed 1e-6.
func TestCurlNearCoil(t *testing.T) {
	ev, _ := evalIn(t,
		"coil = source(rings([0, 0, 36] mm, [0, 0, 1], 20 mm, 72 mm, 12), 1 A)",
		"Bc = b_field(coil)",
		"G(p) = curl(a_field(coil), p)",
	)
	for _, p := range []string{"[0, 0, 3] mm", "[0, 0, 36] mm", "[10, 0, 36] mm", "[10, 5, 3] mm", "[0, 0, -30] mm", "[45, 0, 20] mm", "[0, 35, 80] mm"} {
		b := norm3(vecOf(t, ev("b_at(coil, "+p+")")))
		scale := b / 0.01
		if c := vecOf(t, ev("curl(Bc, "+p+")")); norm3(c) > 1e-8*scale {
			t.Errorf("at %s: curl B = %v T/m, want 0 (|B|/d = %g T/m)", p, c, scale)
		}
		if d := q(t, ev("div(Bc, "+p+")"), "T/m"); math.Abs(d) > 1e-8*scale {
			t.Errorf("at %s: div B = %g T/m, want 0 (|B|/d = %g T/m)", p, d, scale)
		}
		ca, bv := vecOf(t, ev("G("+p+")")), vecOf(t, ev("b_at(coil, "+p+")"))
		if !vclose(ca, bv, 1e-8, 0) {
			t.Errorf("at %s: curl A = %v, B = %v", p, ca, bv)
		}
		if cc := vecOf(t, ev("curl(G, "+p+")")); norm3(cc) > 1e-6*scale {
			t.Errorf("at %s: curl (curl A) = %v T/m, want 0 (|B|/d = %g T/m)", p, cc, scale)
		}
	}
}

// TestCurlAnalytic: curl of fields given as functions, against hand
// calculus: F = [−yz, xz, 0]·1 T/m² has ∇×F = [−x, −y, 2z] T/m; F3 =
// [−y³, x³, 0]·1 T/m³ has ∇×F3 = [0, 0, 3(x² + y²)] T/m and ∇×∇×F3 =
// [6y, −6x, 0] T/m² (a nested curl). F and ∇×F3 are polynomials of degree
// ≤ 2, on which the Richardson central difference is exact but for
// rounding: 1e-9 relative; the nested curl differentiates those rounded
// values: 1e-6 (as in TestCurlNearCoil).
func TestCurlAnalytic(t *testing.T) {
	ev, _ := evalIn(t,
		"F(p) = [-p.y*p.z, p.x*p.z, 0] * 1 T/m^2",
		"F3(p) = [-p.y^3, p.x^3, 0] * 1 T/m^3",
		"G(p) = curl(F3, p)",
	)
	for _, c := range []struct {
		in   string
		want [3]float64
		rel  float64
	}{
		{"curl(F, [1, 2, 3] m)", [3]float64{-1, -2, 6}, 1e-9},
		{"curl(F, [0, 0, 0.5] m)", [3]float64{0, 0, 1}, 1e-9},
		{"curl(F, [3, -1, 0] mm)", [3]float64{-3e-3, 1e-3, 0}, 1e-9},
		{"curl(F3, [1, 2, 3] m)", [3]float64{0, 0, 15}, 1e-9},
		{"curl(G, [1, 2, 3] m)", [3]float64{12, -6, 0}, 1e-6},
		{"curl(G, [0.1, -0.3, 2] m)", [3]float64{-1.8, -0.6, 0}, 1e-6},
	} {
		if got := vecOf(t, ev(c.in)); !vclose(got, c.want, c.rel, 0) {
			t.Errorf("%s = %v, want %v", c.in, got, c.want)
		}
	}
}

// TestDerivativeKinks: a field with a kink at the point has no derivative
// there; curl and ddt say so instead of averaging the two sides. The E of
// an ideal solenoid (dbdt_ideal_solenoid) has ∂E_y/∂x = −½·dB/dt inside and
// +½·dB/dt·R²/r²·… outside; on the boundary r = R along x the two sides are
// −1.5 T/s and +1.5 T/s for dB/dt = 3 T/s (from E_φ = −(r/2)Ḃ inside and
// −(R²/2r)Ḃ outside, Griffiths 4th ed. §7.2; from memory). Just inside the
// curl is −Ḃ along the axis and just outside 0 (curl E = −∂B/∂t, Faraday);
// the field is linear in position inside, so 1e-9 relative, and outside
// its curl is 0 to 1e-8 of Ḃ (as TestCurlNearCoil). A current |t| has a
// kink at 0.
func TestDerivativeKinks(t *testing.T) {
	ev, fail := evalIn(t,
		"reg = dbdt_ideal_solenoid([0, 0, 0] m, [0, 0, 1], 25 mm, 3 T/s)",
		"E = e_field(reg)",
		"I(t) = 2 A * abs(t/(1 ms))",
		"Bt = b_field(source(circle([0, 0, 0] m, [0, 0, 1], 20 mm), I))",
	)
	err := fail("curl(E, [25, 0, 0] mm)")
	want := "curl: the field has a kink at this point along x (on a region boundary or a wire?): its derivative along x is [0, -1.5, 0] T/s on the − side and [0, 1.5, 0] T/s on the + side"
	if !strings.Contains(err.Error(), want) {
		t.Errorf("error %q, want %q", err, want)
	}
	if c := vecOf(t, ev("curl(E, [24, 0, 0] mm)")); !vclose(c, [3]float64{0, 0, -3}, 1e-9, 0) {
		t.Errorf("curl E just inside = %v, want [0, 0, -3] T/s", c)
	}
	if c := vecOf(t, ev("curl(E, [26, 0, 0] mm)")); norm3(c) > 1e-8*3 {
		t.Errorf("curl E just outside = %v, want 0", c)
	}
	err = fail("ddt(Bt, [0, 0, 5] mm, 0 s)")
	if !strings.Contains(err.Error(), "ddt: the field has a kink in time at t = 0 s: its rate of change is") {
		t.Errorf("ddt at the kink: %v", err)
	}
	err = fail("emf(source(circle([0, 0, 0] m, [0, 0, 1], 20 mm), I), circle([0, 0, 5] mm, [0, 0, 1], 10 mm), 0 s)")
	if !strings.Contains(err.Error(), "emf: the current function I(t) has a kink at t = 0 s: its slope is -2 kA/s just before and 2 kA/s just after") {
		t.Errorf("emf at the kink: %v", err)
	}
}
