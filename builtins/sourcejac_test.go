package builtins_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// jacSession evaluates setup lines and returns an evaluator of further
// statements that gives the whole result.
func jacSession(t *testing.T, setup ...string) func(string) *runtime.Result {
	t.Helper()
	s := runtime.NewSession(builtins.Standard())
	for i, l := range setup {
		if _, err := s.Eval(lang.Pos{File: "j.lw", Line: i + 1, Col: 1}, l); err != nil {
			t.Fatalf("%s: %v", l, err)
		}
	}
	return func(in string) *runtime.Result {
		t.Helper()
		r, err := s.Eval(lang.Pos{File: "j.lw", Line: 99, Col: 1}, in)
		if err != nil {
			t.Fatalf("%s: %v", in, err)
		}
		return r
	}
}

func numErrOr(r *runtime.Result, i int, def float64) float64 {
	if r.NumErr == nil {
		return def
	}
	return r.NumErr[i]
}

var jacSetup = []string{
	"ring = source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)",
	"tilted = source(arc([4, -3, 2] mm, [0.3, -0.5, 0.8], [4, -3, 2] mm + 27 mm * direction(cross([0.3, -0.5, 0.8], [1, 0, 0])), 2.5), -1.2 A)",
	"hel = source(helix([0, 0, -15] mm, [0.1, 0, 1], 12 mm, 30 mm, 5), 1.5 A)",
	"pent = source(polygon([-30, -20, 0] mm, [20, -25, 5] mm, [30, 15, -4] mm, [0, 30, 10] mm, [-25, 10, 3] mm), 3 A)",
	"all = ring + tilted + hel + pent + uniform([10, -20, 30] uT)",
}

var jacPts = []string{"[7, 3, 11] mm", "[-40, 12, -5] mm", "[2, -1, 0.5] mm", "[33, 28, -19] mm", "[0, 0, 45] mm"}

// TestSessionCurlAExact: curl(a_field(S), p) = b_at(S, p) (B = ∇ × A;
// Jackson, Classical Electrodynamics, 3rd ed., 1999, eq. 5.27, from
// memory), b_at being the closed-form kernels (for the helix, the
// quadrature of Biot–Savart itself): a different route. Tolerance 1e-12 of
// |B| (the em tests see 3e-15; each partial is asked for 1e-13 of a scale
// a few times |B|). The reported numerical error, plus b_at's own (or, when
// it reports none, 128ε of |B|, its closed forms' accuracy: fieldbound.go)
// must cover the difference; no note may speak of differences.
func TestSessionCurlAExact(t *testing.T) {
	ev := jacSession(t, jacSetup...)
	for _, s := range []string{"ring", "tilted", "hel", "pent", "all"} {
		for _, p := range jacPts {
			r := ev("curl(a_field(" + s + "), " + p + ")")
			b := ev("b_at(" + s + ", " + p + ")")
			c, bv := comps(t, r.Value), comps(t, b.Value)
			nb := math.Sqrt(bv[0]*bv[0] + bv[1]*bv[1] + bv[2]*bv[2])
			if r.NumErr == nil || strings.Contains(r.Note, "differences") {
				t.Errorf("%s at %s: numerical error %v, note %q", s, p, r.NumErr, r.Note)
			}
			for i := range c {
				d := math.Abs(c[i] - bv[i])
				if d > 1e-12*nb {
					t.Errorf("%s at %s: curl A component %d = %.17g, B = %.17g (rel %.3g)", s, p, i, c[i], bv[i], d/nb)
				}
				if d > numErrOr(r, i, 0)+numErrOr(b, i, 128*0x1p-53*nb) {
					t.Errorf("%s at %s: component %d differs by %.3g, beyond the bounds %.3g and %.3g", s, p, i, d, numErrOr(r, i, 0), numErrOr(b, i, 0))
				}
			}
		}
	}
}

// TestSessionDivB: div B = 0 (Jackson 1999, eq. 5.22; from memory) for
// every source and their sum, the uniform field included: |div B| within
// the reported numerical error, which must be small: below 1e-12 of
// |B|/(1 mm), the field's rate of change at these distances being about
// |B|/(10 mm) and more.
func TestSessionDivB(t *testing.T) {
	ev := jacSession(t, jacSetup...)
	for _, s := range []string{"ring", "tilted", "hel", "pent", "all"} {
		for _, p := range jacPts {
			r := ev("div(b_field(" + s + "), " + p + ")")
			b := comps(t, ev("b_at("+s+", "+p+")").Value)
			nb := math.Sqrt(b[0]*b[0] + b[1]*b[1] + b[2]*b[2])
			d := math.Abs(comps(t, r.Value)[0])
			if r.NumErr == nil || d > r.NumErr[0] || r.NumErr[0] > 1e-12*nb/1e-3 {
				t.Errorf("%s at %s: div B = %g T/m, numerical error %v (|B|/mm = %g)", s, p, d, r.NumErr, nb/1e-3)
			}
		}
	}
}

// TestSessionCurlEExact: curl E = −∂B/∂t (Faraday; Jackson 1999, eq.
// 5.85, from memory) for the E of a source with a sinusoidal current:
// curl of e_field (A's Jacobian times −dI/dt) against ddt of b_field (B
// per ampere times dI/dt): the sides share only dI/dt's exact tangent.
// Tolerance 1e-12 of |∂B/∂t|, and the two numerical errors must cover the
// difference.
func TestSessionCurlEExact(t *testing.T) {
	setup := append([]string{"I(t) = 2 A * sin(2*pi*50 Hz*t) + 0.5 A"}, jacSetup...)
	setup = append(setup, "S = source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), I) + source(helix([0, 0, -15] mm, [0.1, 0, 1], 12 mm, 30 mm, 5), I) + pent")
	ev := jacSession(t, setup...)
	for _, p := range jacPts {
		r := ev("curl(e_field(S), " + p + ", 2 ms)")
		d := ev("ddt(b_field(S), " + p + ", 2 ms)")
		c, dv := comps(t, r.Value), comps(t, d.Value)
		nd := math.Sqrt(dv[0]*dv[0] + dv[1]*dv[1] + dv[2]*dv[2])
		if r.NumErr == nil || strings.Contains(r.Note, "differences") {
			t.Errorf("at %s: numerical error %v, note %q", p, r.NumErr, r.Note)
		}
		for i := range c {
			diff := math.Abs(c[i] + dv[i])
			if diff > 1e-12*nd || diff > numErrOr(r, i, 0)+numErrOr(d, i, 0)+128*0x1p-53*nd {
				t.Errorf("at %s: curl E component %d = %.17g, −∂B/∂t = %.17g (rel %.3g, bounds %v %v)", p, i, c[i], -dv[i], diff/nd, r.NumErr, d.NumErr)
			}
		}
	}
}

// TestSessionJacobianFallbacks: a dipole (a shape) keeps the step
// differences and says so, with the differences' own error estimate; its
// curl A still equals B (Jackson 1999, eqs. 5.55–5.56) to the differences'
// accuracy (1e-8, what the step search asks of its plateau) and within
// that estimate. A uniform field's A =
// ½B × r has curl B exactly. A point on the wire is the usual error.
func TestSessionJacobianFallbacks(t *testing.T) {
	ev := jacSession(t, append(jacSetup, "d = dipole([0, 0, 0] m, [0, 0, 0.5] A*m^2) + ring")...)
	r := ev("curl(a_field(d), [10, 20, 30] mm)")
	if !strings.Contains(r.Note, "by step differences") || !strings.Contains(r.Note, "dipole") || r.NumErr == nil {
		t.Errorf("dipole: note %q, numerical error %v", r.Note, r.NumErr)
	}
	c, b := comps(t, r.Value), comps(t, ev("b_at(d, [10, 20, 30] mm)").Value)
	nb := math.Sqrt(b[0]*b[0] + b[1]*b[1] + b[2]*b[2])
	for i := range c {
		if math.Abs(c[i]-b[i]) > 1e-8*nb || math.Abs(c[i]-b[i]) > numErrOr(r, i, 0)+128*0x1p-53*nb {
			t.Errorf("dipole: curl A = %v, B = %v, bound %v", c, b, r.NumErr)
		}
	}
	u := comps(t, ev("curl(a_field(uniform([10, -20, 30] uT)), [1, 2, 3] m)").Value)
	for i, w := range []float64{10e-6, -20e-6, 30e-6} {
		if math.Abs(u[i]-w) > 4*0x1p-53*30e-6 {
			t.Errorf("uniform: curl A = %v", u)
		}
	}
	s := runtime.NewSession(builtins.Standard())
	for _, l := range jacSetup {
		if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, l); err != nil {
			t.Fatal(err)
		}
	}
	for _, in := range []string{"curl(b_field(ring), [25, 0, 0] mm)", "div(a_field(ring), [0, 25, 0] mm)"} {
		_, err := s.Eval(lang.Pos{Line: 2, Col: 1}, in)
		if err == nil || !strings.Contains(err.Error(), "lies on a wire") {
			t.Errorf("%s: %v", in, err)
		}
	}
}

// TestSessionJacobianMirror: a ring before a permeable plate (its image
// carries (μr − 1)/(μr + 1) of the current): curl A against b_at (B = ∇ ×
// A, as above; the image enters both through the same term), within 1e-12
// of |B| and the reported bounds; a point behind the plate is refused as
// b_at refuses it.
func TestSessionJacobianMirror(t *testing.T) {
	ev := jacSession(t, "m = mirror(source(circle([0, 0, 5] mm, [0, 0, 1], 20 mm), 1 A), [0, 0, 0] m, [0, 0, 1], 1000)")
	for _, p := range []string{"[3, 4, 2] mm", "[-15, 7, 12] mm", "[0, 0, 0.5] mm"} {
		r := ev("curl(a_field(m), " + p + ")")
		b := ev("b_at(m, " + p + ")")
		c, bv := comps(t, r.Value), comps(t, b.Value)
		nb := math.Sqrt(bv[0]*bv[0] + bv[1]*bv[1] + bv[2]*bv[2])
		for i := range c {
			d := math.Abs(c[i] - bv[i])
			if d > 1e-12*nb || d > numErrOr(r, i, 0)+numErrOr(b, i, 128*0x1p-53*nb) {
				t.Errorf("at %s: curl A = %v, B = %v (numerical error %v)", p, c, bv, r.NumErr)
			}
		}
	}
	s := runtime.NewSession(builtins.Standard())
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "m = mirror(source(circle([0, 0, 5] mm, [0, 0, 1], 20 mm), 1 A), [0, 0, 0] m, [0, 0, 1], 1000)"); err != nil {
		t.Fatal(err)
	}
	_, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "div(b_field(m), [0, 0, -2] mm)")
	if err == nil || !strings.Contains(err.Error(), "behind the permeable plate") {
		t.Errorf("behind the plate: %v", err)
	}
}
