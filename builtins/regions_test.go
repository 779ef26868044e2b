package builtins_test

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/runtime"
)

// TestIdealSolenoid: the E of an infinitely long solenoid core, radius
// R = 25 mm, dB/dt = 3 T/s, on a tilted axis through an offset centre,
// at points 7 km along the axis (whose coordinates carry rounding of
// 7e3·1.1e-16 m, 1e-10 of 10 mm: tolerance 1e-9).
// Faraday's law on a circle about the axis with E azimuthal by symmetry
// (Griffiths, Introduction to Electrodynamics, 4th ed., 2017, §7.2; from
// memory): E_φ = −(r/2)·Ḃ inside, −(R²/2r)·Ḃ outside, φ̂ right-handed about
// the axis. The builtin evaluates these formulas; the test takes the
// independent routes: the circulation around circles (any centre, in a
// plane across the axis) must be −Ḃ times the area of the core inside the
// circle (Stokes), computed by adaptive quadrature of the field's values
// (relative 1e-10: tolerance 1e-9); and a dbdt_solenoid 30 km long (the
// axial integral in closed form, a different formula) must agree to 1e-6
// (its tolerance) at its mid-plane.
func TestIdealSolenoid(t *testing.T) {
	ev, fail := evalIn(t,
		"ax = [1, 2, 2] / 3",
		"o = [0.1, -0.2, 0.3] m",
		"reg = dbdt_ideal_solenoid(o, ax, 25 mm, 3 T/s)",
		"u = [2, -1, 0] / sqrt(5)", // ⊥ ax
		"w = cross(ax, u)",
		"E = e_field(reg)",
	)
	const R, bdot = 0.025, 3.0
	// E at r = 10 mm and 50 mm along u: −E_φ along w
	for _, rc := range []struct {
		r    float64
		text string
	}{{0.010, "10"}, {0.050, "50"}} {
		r := rc.r
		want := -r / 2 * bdot
		if r > R {
			want = -R * R / (2 * r) * bdot
		}
		got := vecOf(t, ev("e_at(reg, o + u * "+rc.text+" mm + ax * 7 km)"))
		ew := vecOf(t, ev("w"))
		dot := got[0]*ew[0] + got[1]*ew[1] + got[2]*ew[2]
		if !scalar.EqualWithinAbsOrRel(dot, want, 0, 1e-9) || math.Abs(norm3(got)-math.Abs(dot)) > 1e-9*math.Abs(want) {
			t.Errorf("r = %g mm: E = %v (%.12g along w), want %g V/m along w", r*1e3, got, dot, want)
		}
	}
	for _, c := range []struct {
		loop string
		want float64 // V
	}{
		{"circle(o + u * 5 mm + w * 3 mm, ax, 10 mm)", -math.Pi * 0.01 * 0.01 * bdot},
		{"circle(o + u * 5 mm, ax, 40 mm)", -math.Pi * R * R * bdot},
		{"circle(o + u * 60 mm, ax, 20 mm)", 0},
	} {
		got := q(t, ev("circulation(E, "+c.loop+")"), "V")
		if !scalar.EqualWithinAbsOrRel(got, c.want, 1e-9*math.Pi*R*R*bdot, 1e-9) {
			t.Errorf("circulation around %s = %.12g V, want %.12g V", c.loop, got, c.want)
		}
	}
	long := vecOf(t, ev("e_at(dbdt_solenoid(o, ax, 25 mm, 30 km, 3 T/s), o + u * 10 mm)"))
	ideal := vecOf(t, ev("e_at(reg, o + u * 10 mm)"))
	if !vclose(long, ideal, 1e-6, 0) {
		t.Errorf("30 km solenoid %v, ideal %v", long, ideal)
	}
	// circulation of the long finite core's E around an off-axis circle
	// inside it: −Ḃπa² up to the pole-face term πa²Ḃ·R²/(2h²) ≈ 2e-12
	// relative (solenoidFlux in builtins/em), so the field's 1e-6
	circ := q(t, ev("circulation(e_field(dbdt_solenoid(o, ax, 25 mm, 30 km, 3 T/s)), circle(o + u * 5 mm + w * 3 mm, ax, 10 mm))"), "V")
	if want := -math.Pi * 0.01 * 0.01 * bdot; !scalar.EqualWithinAbsOrRel(circ, want, 0, 1e-6) {
		t.Errorf("circulation in the 30 km core = %.12g V, want %.12g V", circ, want)
	}
	if s := runtime.Format(ev("reg"), 6); s != "region: ideal solenoid (infinitely long), dΦ/dt 5.89049 mV" {
		t.Errorf("shows %q", s)
	}
	if err := fail("dbdt_ideal_solenoid(o, [0, 0, 0], 25 mm, 3 T/s)"); !strings.Contains(err.Error(), "dbdt_ideal_solenoid") {
		t.Errorf("zero axis: %v", err)
	}
}
