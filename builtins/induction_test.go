package builtins_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mathext"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// run evaluates setup lines then returns the value of the last line.
func run(t *testing.T, lines ...string) runtime.Value {
	t.Helper()
	s := runtime.NewSession(builtins.Standard())
	var v runtime.Value
	for i, l := range lines {
		res, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, l)
		if err != nil {
			t.Fatalf("%s: %v", l, err)
		}
		v = res.Value
	}
	return v
}

func q(t *testing.T, v runtime.Value, unit string) float64 {
	t.Helper()
	x, ok := v.(runtime.Quantity)
	u, err := runtime.ParseUnit(unit)
	if err != nil {
		t.Fatal(err)
	}
	if !ok || x.D != u.Dim {
		t.Fatalf("got %v, want a quantity in %s", runtime.Format(v, 6), unit)
	}
	return x.V / u.Scale()
}

// TestLanguageInduction checks the induction builtins end to end through
// the language against published closed forms; the numeric core has its
// own, tighter tests in builtins/em. Flux and mutual inductance are asked of
// the quadrature to relative 1e-10 and checked to 1e-9 (a factor 10 for an
// optimistic error estimate) unless stated.
func TestLanguageInduction(t *testing.T) {
	// Loop on axis: B = μ0 I a²/(2(a²+z²)^{3/2}) (Griffiths, Introduction to
	// Electrodynamics, 4th ed., 2017, Ex. 5.6).
	b := run(t, "b_at(source(circle([0,0,0] m, [0,0,1], 40 mm), 3 A), [0,0,30] mm)").(runtime.Vector)
	want := 1.25663706212e-6 * 3 * 0.04 * 0.04 / (2 * math.Pow(0.04*0.04+0.03*0.03, 1.5))
	if !scalar.EqualWithinAbsOrRel(b.V[2], want, 0, 1e-13) {
		t.Errorf("loop on axis: %g T, want %g T", b.V[2], want)
	}

	// Flux of one loop through a coaxial one = M·I with Maxwell's formula
	// (Maxwell, Treatise, 1873, §701): the language's flux() and
	// maxwell_mutual() must agree.
	phi := q(t, run(t, "flux(source(circle([0,0,0] m, [0,0,1], 40 mm), 3 A), circle([0,0,25] mm, [0,0,1], 30 mm))"), "Wb")
	m := q(t, run(t, "maxwell_mutual(40 mm, 30 mm, 25 mm)"), "H")
	if !scalar.EqualWithinAbsOrRel(phi, 3*m, 0, 1e-9) {
		t.Errorf("flux %g Wb, want M·I = %g Wb", phi, 3*m)
	}

	// Uniform field through a tilted disk: Φ = B·n πr² (definition of flux).
	phi = q(t, run(t, "flux(uniform([0, 0, 2] mT), disk([0,0,0] m, [1, 0, 1], 50 mm))"), "Wb")
	if want := 2e-3 * math.Cos(math.Pi/4) * math.Pi * 0.05 * 0.05; !scalar.EqualWithinAbsOrRel(phi, want, 0, 1e-9) {
		t.Errorf("uniform flux through tilted disk %g, want %g", phi, want)
	}
	// ... and around the disk's rim (∮A·dl with A = ½B×r): the same.
	phi = q(t, run(t, "flux(uniform([0, 0, 2] mT), circle([0,0,0] m, [1, 0, 1], 50 mm))"), "Wb")
	if want := 2e-3 * math.Cos(math.Pi/4) * math.Pi * 0.05 * 0.05; !scalar.EqualWithinAbsOrRel(phi, want, 0, 1e-12) {
		t.Errorf("uniform flux around tilted circle %g, want %g", phi, want)
	}

	// Sliding bar: EMF = B·L·v (Griffiths 4th ed. §7.1.3, motional EMF),
	// sign by ∮(v×B)·dl along the bar's direction.
	e := q(t, run(t, "motional_emf(uniform([0,0,0.4] T), segment([0,0,0] m, [0,0.25,0] m), [3,0,0] m/s)"), "V")
	if !scalar.EqualWithinAbsOrRel(e, -0.4*0.25*3, 0, 1e-12) {
		t.Errorf("sliding bar EMF %g V, want %g V", e, -0.3)
	}

	// A rod turning about one end in a uniform field, velocity ω × p: EMF
	// ½BωR² from the axis to the rim (Faraday disc; Griffiths 4th ed.,
	// 2017, Ex. 7.4, from memory): ½·0.8·120·0.15² = 1.08 V. The integrand
	// is linear along the rod: exact to rounding, 1e-12.
	e = q(t, run(t, "v(p) = cross([0, 0, 120] / (1 s), p)",
		"motional_emf(uniform([0, 0, 0.8] T), segment([0, 0, 0] m, [0.15, 0, 0] m), v)"), "V")
	if !scalar.EqualWithinAbsOrRel(e, 0.5*0.8*120*0.15*0.15, 0, 1e-12) {
		t.Errorf("turning rod EMF %g V, want %g V", e, 1.08)
	}
	// The same rod with ω written in rad/s (ω × r is then in m*rad/s, the
	// radian of the arc length s = rθ) and in rpm: 120 rad/s is
	// 120·60/2π rpm (NIST SP 811: 1 r/min = 2π/60 rad/s).
	for _, w := range []string{"[0, 0, 120] * 1 rad/s", fmt.Sprintf("[0, 0, %.17g] * 1 rpm", 120*60/(2*math.Pi))} {
		e = q(t, run(t, "v(p) = cross("+w+", p)",
			"motional_emf(uniform([0, 0, 0.8] T), segment([0, 0, 0] m, [0.15, 0, 0] m), v)"), "V")
		if !scalar.EqualWithinAbsOrRel(e, 0.5*0.8*120*0.15*0.15, 0, 1e-12) {
			t.Errorf("turning rod, ω = %s: EMF %g V, want %g V", w, e, 1.08)
		}
	}
	// A 40 mm × 30 mm loop turning about z in B along x, at the instant
	// its plane holds B: the peak EMF NBAω = 0.8·1.2e-3·120 = 0.1152 V
	// (N = 1; the AC generator, flux rule, Griffiths §7.1.3), sign −: its
	// normal s1 × s2 = −ŷ turns towards +x̂, so the flux grows.
	e = q(t, run(t, "v(p) = cross([0, 0, 120] / (1 s), p)",
		"motional_emf(uniform([0.8, 0, 0] T), rectangle([-20, 0, -15] mm, [40, 0, 0] mm, [0, 0, 30] mm), v)"), "V")
	if !scalar.EqualWithinAbsOrRel(e, -0.8*0.04*0.03*120, 0, 1e-12) {
		t.Errorf("turning loop EMF %g V, want %g V", e, -0.1152)
	}

	// EMF of a sinusoidal current at its zero crossing: −M·I0·ω (Faraday's
	// law, EMF = −M dI/dt, with M from Maxwell's formula above).
	e = q(t, run(t, "I(t) = 5 A * sin(2*pi*60 Hz*t)",
		"emf(source(circle([0,0,0] m, [0,0,1], 40 mm), I), circle([0,0,25] mm, [0,0,1], 30 mm), 0 s)"), "V")
	if want := -m * 5 * 2 * math.Pi * 60; !scalar.EqualWithinAbsOrRel(e, want, 0, 1e-7) {
		t.Errorf("emf %g V, want %g V (tolerance 1e-7: the numerical dI/dt)", e, want)
	}

	// Loop self-inductance L = μ0R(ln(8R/a) − 7/4) (Grover, Inductance
	// Calculations, 1946, from memory), neglected terms O((a/R)²): a/R =
	// 1e-3 gives agreement well inside 1e-5.
	l := q(t, run(t, "inductance(circle([0,0,0] m, [0,0,1], 100 mm), 0.1 mm)"), "H")
	if want := 1.25663706212e-6 * 0.1 * (math.Log(8*0.1/1e-4) - 1.75); !scalar.EqualWithinAbsOrRel(l, want, 0, 1e-5) {
		t.Errorf("loop inductance %g H, want %g H", l, want)
	}

	// Sources superpose: two opposite currents in the same loop cancel.
	b = run(t, "loop = circle([0,0,0] m, [0,0,1], 40 mm)", "b_at(source(loop, 3 A) + source(reverse(loop), 3 A), [0, 10, 5] mm)").(runtime.Vector)
	if math.Abs(b.V[0])+math.Abs(b.V[1])+math.Abs(b.V[2]) > 1e-20 {
		t.Errorf("opposite currents: B = %v, want 0", b.V)
	}

	// Time-dependent source: B follows the current, B(t) = B(1 A)·I(t)
	// (Biot–Savart is linear in I), here at t = 1 ms.
	b1 := run(t, "b_at(source(circle([0,0,0] m, [0,0,1], 40 mm), 1 A), [0,0,0] m)").(runtime.Vector)
	bt := run(t, "I(t) = 5 A * sin(2*pi*60 Hz*t)", "b_at(source(circle([0,0,0] m, [0,0,1], 40 mm), I), [0,0,0] m, 1 ms)").(runtime.Vector)
	if want := b1.V[2] * 5 * math.Sin(2*math.Pi*60*1e-3); !scalar.EqualWithinAbsOrRel(bt.V[2], want, 0, 1e-13) {
		t.Errorf("B(t) = %g, want %g", bt.V[2], want)
	}
}

// TestLongTableShown: a long table shows its first 40 and last 10 rows
// around a count of the rest (project convention), and an assignment of a
// table shows its one-line summary.
func TestLongTableShown(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	s.Eval(lang.Pos{Line: 1, Col: 1}, "src = source(circle([0,0,0] m, [0,0,1], 25 mm), 2 A)")
	res, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "sample_line(b_field(src), [0,0,-50] mm, [0,0,50] mm, 200)")
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(res.Text, "\n")
	if len(lines) != 1+40+1+10 || lines[41] != "… 150 more rows …" {
		t.Errorf("table shown in %d lines; line 42 = %q", len(lines), lines[min(41, len(lines)-1)])
	}
	res, err = s.Eval(lang.Pos{Line: 3, Col: 1}, "t = sample_line(b_field(src), [0,0,-50] mm, [0,0,50] mm, 200)")
	if err != nil || !strings.HasPrefix(res.Text, "table of 200 rows: ") {
		t.Errorf("assignment shows %q, %v", res.Text, err)
	}
}

// TestSampleFields: sample_line and sample_plane take any field value. Each
// table is checked against a closed form that shares no code with the
// route that fills it.
func TestSampleFields(t *testing.T) {
	const (
		a  = 0.025 // loop radius, m
		I  = 2.0   // A
		mu = 1.25663706212e-6
	)
	// Vector potential of a circular loop off its axis, through the parallel
	// kernel: A_φ = μ0 I/(π k) √(a/ρ) [(1 − k²/2) K(k) − E(k)],
	// k² = 4aρ/((a+ρ)² + z²) (Jackson, Classical Electrodynamics, 3rd ed.,
	// 1999, eq. 5.37, from memory), with gonum's complete elliptic integrals
	// of parameter m = k². Tolerance 1e-12 relative: both sides are closed
	// forms in float64.
	tab := run(t, "src = source(circle([0,0,0] m, [0,0,1], 25 mm), 2 A)",
		"sample_line(a_field(src), [5,0,10] mm, [60,0,10] mm, 12)").(*builtins.Table)
	if got := strings.Join(tab.Cols, " "); got != "s x y z Ax Ay Az |A|" {
		t.Fatalf("columns %q", got)
	}
	for _, row := range tab.Rows {
		rho, z := row[1], row[3]
		k2 := 4 * a * rho / ((a+rho)*(a+rho) + z*z)
		want := mu * I / (math.Pi * math.Sqrt(k2)) * math.Sqrt(a/rho) * ((1-k2/2)*mathext.CompleteK(k2) - mathext.CompleteE(k2))
		if !scalar.EqualWithinAbsOrRel(row[5], want, 0, 1e-12) || row[7] != math.Abs(row[5]) {
			t.Errorf("A_φ at ρ = %g m: %g, want %g", rho, row[5], want)
		}
	}
	// Your own field, point by point: F(p) = [-y, x, 0] T/m is exact.
	tab = run(t, "F(p) = [-p.y, p.x, 0] * 1 T/m",
		"sample_plane(F, [-1,-1,0] m, [2,0,0] m, [0,2,0] m, 3, 3)").(*builtins.Table)
	if got := strings.Join(tab.Cols, " "); got != "u v x y z Fx Fy Fz |F|" || len(tab.Rows) != 9 {
		t.Fatalf("columns %q, %d rows", got, len(tab.Rows))
	}
	for _, row := range tab.Rows {
		if row[5] != -row[3] || row[6] != row[2] {
			t.Errorf("F at (%g, %g) = (%g, %g)", row[2], row[3], row[5], row[6])
		}
	}
	// Induced E of a source whose current ramps at 1 kA/s: E = −A(1 A)·dI/dt,
	// with A from the same closed form as above.
	tab = run(t, "I(t) = 1 kA/s * t", "src = source(circle([0,0,0] m, [0,0,1], 25 mm), I)",
		"sample_line(e_field(src), [10,0,0] mm, [40,0,0] mm, 4, 1 ms)").(*builtins.Table)
	for _, row := range tab.Rows {
		rho := row[1]
		k2 := 4 * a * rho / ((a + rho) * (a + rho))
		want := -1000 * mu / (math.Pi * math.Sqrt(k2)) * math.Sqrt(a/rho) * ((1-k2/2)*mathext.CompleteK(k2) - mathext.CompleteE(k2))
		// tolerance 1e-7: dI/dt comes from step-based differences
		if !scalar.EqualWithinAbsOrRel(row[5], want, 0, 1e-7) {
			t.Errorf("E_φ at ρ = %g m: %g, want %g", rho, row[5], want)
		}
	}
}

// TestCoilsPlacedByCentre: rings() spreads its turns about the centre it is
// given. B on the axis is the sum of the loop formula
// B = μ0 I a²/(2(a²+z²)^{3/2}) (Griffiths, Introduction to Electrodynamics,
// 4th ed., 2017, Example 5.6) over turns at (k + ½)·L/N − L/2 from the
// centre, a route that shares no code with the elliptic closed form the
// builtin uses. Tolerance 1e-12 relative: closed forms in float64.
func TestCoilsPlacedByCentre(t *testing.T) {
	const (
		a, L, n, z = 0.02, 0.03, 7, 0.011 // m, m, turns, m above the centre
		mu, I      = 1.25663706212e-6, 1.5
	)
	b := run(t, "b_at(source(rings([0, 0, 100] mm, [0, 0, 1], 20 mm, 30 mm, 7), 1.5 A), [0, 0, 111] mm)").(runtime.Vector)
	want := 0.0
	for k := 0; k < n; k++ {
		dz := z - ((float64(k)+0.5)*L/n - L/2)
		want += mu * I * a * a / (2 * math.Pow(a*a+dz*dz, 1.5))
	}
	if !scalar.EqualWithinAbsOrRel(b.V[2], want, 0, 1e-12) {
		t.Errorf("B on the axis = %.15g T, want %.15g T", b.V[2], want)
	}
}
