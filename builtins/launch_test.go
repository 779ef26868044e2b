package builtins_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

const launchSetup = `coil = rings([0, 0, 0] m, [0, 0, 1], 15 mm, 20 mm, 40)
ring = circle([0, 0, 14] mm, [0, 0, 1], 18 mm)
L1 = inductance(coil, 0.5 mm)
L2 = inductance(ring, 1.5 mm)`

func launchSession(t *testing.T) *runtime.Session {
	s := runtime.NewSession(builtins.Standard())
	for _, line := range strings.Split(launchSetup, "\n") {
		eval(t, s, line)
	}
	return s
}

// TestRingLaunchEnergy: the bank's energy ½CV0² equals, at every
// instant, what is left in the bank, the magnetic energy
// ½L1·i1² + ½L2·i2² + M(z)·i1·i2, the heat in both circuits, and the
// ring's kinetic and potential energy ½mv² + mgz (conservation of energy
// for coupled circuits with motion; e.g. Woodson and Melcher,
// Electromechanical Dynamics, 1968, Part I, ch. 3, from memory). M(z) is
// taken here by Neumann's integral of the coil and the ring moved to z
// (mutual, a route that shares no code with the launcher's Maxwell
// formula). Tolerance 1e-6 of the bank's energy: the integrator runs at
// relative 1e-8, Neumann's integral at 1e-10, and the energies are sums
// of terms up to the bank's energy. The table's numerical error bounds,
// carried into the balance, must also cover its error.
func TestRingLaunchEnergy(t *testing.T) {
	s := launchSession(t)
	res := eval(t, s, "ring_launch(coil, ring, L1, 0.05 ohm, L2, 0.4 mohm, 1 mF, 100 V, 4 g, 3 ms, 13)")
	ne := res.(*builtins.Table).NumErr
	cols, rows := tableCols(t, res)
	l1 := eval(t, s, "L1").(runtime.Quantity).V
	l2 := eval(t, s, "L2").(runtime.Quantity).V
	w0 := 0.5 * 1e-3 * 100 * 100
	worst := 0.0
	defer func() { t.Logf("worst energy balance error: %.2g of the bank's energy", worst) }()
	for _, r := range rows {
		z := r[cols["z"]]
		m := eval(t, s, "mutual(coil, translate(ring, [0, 0, "+runtime.FormatNumber(z, 17)+"] m))").(runtime.Quantity).V
		i1, i2, v := r[cols["I coil"]], r[cols["I ring"]], r[cols["v"]]
		vc := r[cols["V bank"]]
		w := 0.5*1e-3*vc*vc + 0.5*l1*i1*i1 + 0.5*l2*i2*i2 + m*i1*i2 +
			r[cols["heat coil"]] + r[cols["heat ring"]] + 0.5*0.004*v*v + 0.004*9.80665*z
		worst = math.Max(worst, math.Abs(w-w0)/w0)
		// the table's numerical error bounds, carried to first order
		// into the balance (the mutual's own 1e-10 added), must cover
		// its error
		bound := 1e-3*math.Abs(vc)*ne[cols["V bank"]] + (l1*math.Abs(i1)+math.Abs(m*i2))*ne[cols["I coil"]] +
			(l2*math.Abs(i2)+math.Abs(m*i1))*ne[cols["I ring"]] + ne[cols["heat coil"]] + ne[cols["heat ring"]] +
			0.004*math.Abs(v)*ne[cols["v"]] + 0.004*9.80665*ne[cols["z"]] + 1e-10*math.Abs(m*i1*i2)
		if math.Abs(w-w0) > bound {
			t.Errorf("t = %g s: energy balance off by %.3g J, beyond the table's numerical error bound %.3g J", r[0], w-w0, bound)
		}
		if math.Abs(w-w0) > 1e-6*w0 {
			t.Errorf("t = %g s: energy %.9g J, bank had %g J (off by %.2g)", r[0], w, w0, (w-w0)/w0)
		}
	}
	if z := rows[len(rows)-1][cols["z"]]; !(z > 1e-3) {
		t.Errorf("the ring did not rise (z = %g m at the end)", z)
	}
}

// TestRingLaunchLockedStart: in the first microseconds the ring has not
// moved measurably, so its current is that of the locked ring: the same
// bank, coil and ring as a circuit with a fixed coupling M(z0) (mutual of
// the paths), solved by transient (modified nodal analysis: a different
// formulation of the same physics). In 10 µs the ring rises less than
// 1e-9 m, which changes M by less than 1e-7 of itself (dM/dz·Δz/M);
// tolerance 1e-6 of the ring current's largest value in the window.
func TestRingLaunchLockedStart(t *testing.T) {
	s := launchSession(t)
	cols, rows := tableCols(t, eval(t, s, "ring_launch(coil, ring, L1, 0.05 ohm, L2, 0.4 mohm, 1 mF, 100 V, 4 g, 10 us, 11)"))
	eval(t, s, "M0 = mutual(coil, ring)")
	lc, lr := tableCols(t, eval(t, s, `transient(circuit(capacitor("C", "a", "0", 1 mF, 100 V), resistor("R1", "a", "b", 0.05 ohm), inductor("L1", "b", "0", L1), inductor("L2", "x", "0", L2), resistor("R2", "x", "0", 0.4 mohm), coupled("L1", "L2", M0)), 10 us, 11)`))
	peak := 0.0
	for _, r := range rows {
		peak = math.Max(peak, math.Abs(r[cols["I ring"]]))
	}
	worst := 0.0
	defer func() { t.Logf("worst difference from the locked ring: %.2g of the peak ring current", worst) }()
	for k, r := range rows {
		worst = math.Max(worst, math.Max(math.Abs(r[cols["I ring"]]-lr[k][lc["I L2"]]), math.Abs(r[cols["I coil"]]-lr[k][lc["I L1"]]))/peak)
		// the circuit's current of L2 runs from x to ground through the
		// coil and back through R2: the ring's current in its path's
		// direction is I L2; the coil's is I L1
		if d := math.Abs(r[cols["I ring"]] - lr[k][lc["I L2"]]); d > 1e-6*peak {
			t.Errorf("t = %g s: ring current %g A, locked-ring circuit %g A", r[0], r[cols["I ring"]], lr[k][lc["I L2"]])
		}
		if d := math.Abs(r[cols["I coil"]] - lr[k][lc["I L1"]]); d > 1e-6*peak {
			t.Errorf("t = %g s: coil current %g A, locked-ring circuit %g A", r[0], r[cols["I coil"]], lr[k][lc["I L1"]])
		}
	}
	if z := rows[len(rows)-1][cols["z"]]; z > 1e-9 {
		t.Errorf("the ring rose %g m in 10 µs; the test's premise fails", z)
	}
}

// TestRingLaunchRefusals: geometry the launcher cannot model, and the
// cautions for a bank above the hazardous energy level and a fast ring.
func TestRingLaunchRefusals(t *testing.T) {
	s := launchSession(t)
	for _, c := range []struct{ in, want string }{
		{"ring_launch(helix([0, 0, 0] m, [0, 0, 1], 15 mm, 1 mm, 5), ring, L1, 0.05 ohm, L2, 0.4 mohm, 1 mF, 100 V, 4 g, 1 ms)", "whole circles on one axis"},
		{"ring_launch(coil, circle([1, 0, 14] mm, [0, 0, 1], 18 mm), L1, 0.05 ohm, L2, 0.4 mohm, 1 mF, 100 V, 4 g, 1 ms)", "on the coil's axis"},
		{"ring_launch(coil, ring, 1 nH, 0.05 ohm, L2, 0.4 mohm, 1 mF, 100 V, 4 g, 1 ms)", "not below √(L1·L2)"},
		{"ring_launch(coil, ring, L1, 0.05 ohm, L2, 0.4 mohm, 1 mF, 100 V, 0 g, 1 ms)", "above zero"},
	} {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.in, err, c.want)
		}
	}
	res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "ring_launch(coil, ring, L1, 0.05 ohm, L2, 0.4 mohm, 4 mF, 400 V, 4 g, 2 ms, 5)")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(res.Note, "320 J") || !strings.Contains(res.Note, "projectile") {
		t.Errorf("a 320 J bank throwing a ring gives the note %q", res.Note)
	}
}
