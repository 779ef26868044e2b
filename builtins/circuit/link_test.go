package circuit

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// The link closed forms are checked against the general solver (AC) on the
// same circuit: an independent route, since the solver knows nothing of
// reflected impedances or tuning and only assembles Kirchhoff's laws.
//
// Tolerance: 1e-12 relative, or 2·cond·eps where that is larger (cond the
// solver's condition estimate, eps = 2⁻⁵³). The solver's relative error
// is bounded by about cond·eps (the usual bound for a backward-stable LU,
// the estimate standing in for the exact condition number); the closed
// forms add a few roundings. Circuits with weak coupling and high-Q coils
// reach cond ≈ 3e5 — physically, the solver finds the tuned primary's
// small impedance as the difference of its coil's and capacitor's
// voltages, each Q1 times larger — so there the tolerance is up to about
// 7e-11; cond is asserted below 1e6 so that it cannot grow further
// unnoticed. The primary is tuned so that the source's power ½·Re(V·I*)
// is not a small difference of large reactive terms.

// linkCircuit builds the link as a circuit: a 1 V source, c1, R1 and L1 in
// series; L2 and R2 in series feeding c2 and the load rl, c2 in series
// with the load (parallel false) or across it (parallel true).
func linkCircuit(l Link, c1, c2, rl float64, parallel bool) *Circuit {
	el := []Element{
		V("V", "in", "0", 1), C("C1", "in", "a", c1), R("R1", "a", "b", l.R1), L("L1", "b", "0", l.L1),
		L("L2", "x", "0", l.L2), R("R2", "x", "y", l.R2),
	}
	if parallel {
		el = append(el, C("C2", "y", "0", c2), R("RL", "y", "0", rl))
	} else {
		el = append(el, C("C2", "y", "z", c2), R("RL", "z", "0", rl))
	}
	return &Circuit{Elements: el, Couplings: []Coupling{{"L1", "L2", l.M()}}}
}

// solverEfficiency is the load's power over the power the source delivers,
// from the solver, the solver's input impedance, and the tolerance for
// comparing them with closed forms.
func solverEfficiency(t *testing.T, l Link, c1, c2, rl float64, parallel bool) (eta float64, zin complex128, tol float64) {
	t.Helper()
	s := mustAC(t, linkCircuit(l, c1, c2, rl, parallel), l.Omega/(2*math.Pi))
	checkCond(t, s, 1e6)
	pl := must[float64](t)(s.Power("RL"))
	ps := must[float64](t)(s.Power("V"))
	return pl / -ps, must[complex128](t)(s.InputImpedance("V")), math.Max(1e-12, 2*s.Cond()*eps)
}

func rel(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// links spans weak to strong coupling, low and high coil Q, and two
// frequencies (a 100 kHz charging pad and a 6.78 MHz band).
func links() []Link {
	var out []Link
	for _, f := range []float64{100e3, 6.78e6} {
		w := 2 * math.Pi * f
		for _, k := range []float64{0.02, 0.2, 0.6, -0.9} {
			for _, q := range [][2]float64{{30, 50}, {250, 120}} {
				l1, l2 := 24e-6*100e3/f, 9e-6*100e3/f
				out = append(out, Link{Omega: w, L1: l1, R1: w * l1 / q[0], L2: l2, R2: w * l2 / q[1], K: k})
			}
		}
	}
	return out
}

func TestLinkEfficiencyAgainstSolver(t *testing.T) {
	for _, l := range links() {
		c1 := SeriesTuning(l.Omega, l.L1)
		for _, rl := range []float64{0.3, 4, 60} {
			for _, tc := range []struct {
				name     string
				parallel bool
				c2       float64
			}{
				{"SS, series tuning", false, SeriesTuning(l.Omega, l.L2)},
				{"SS, detuned 5 %", false, 1.05 * SeriesTuning(l.Omega, l.L2)},
				{"SP, series tuning", true, SeriesTuning(l.Omega, l.L2)},
				{"SP, parallel tuning", true, ParallelTuning(l.Omega, l.L2, l.R2)},
			} {
				label := fmt.Sprintf("%s, k = %g, Q = %.0f/%.0f, f = %g Hz, R_L = %g ohm", tc.name, l.K, l.Q1(), l.Q2(), l.Omega/(2*math.Pi), rl)
				var got float64
				var zl complex128
				if tc.parallel {
					got = must[float64](t)(l.EfficiencySP(rl, tc.c2))
					zl = l.ParallelLoad(rl, tc.c2)
				} else {
					got = must[float64](t)(l.EfficiencySS(rl, tc.c2))
					zl = l.SeriesLoad(rl, tc.c2)
				}
				want, zin, tol := solverEfficiency(t, l, c1, tc.c2, rl, tc.parallel)
				if r := rel(got, want); r > tol {
					t.Errorf("%s: η = %.15g, solver %.15g (rel %.2g)", label, got, want, r)
				}
				if z := l.InputImpedance(c1, zl); crel(z, zin) > tol {
					t.Errorf("%s: Z_in = %v, solver %v (rel %.2g)", label, z, zin, crel(z, zin))
				}
			}
		}
	}
}

// The series–series formula written out in EfficiencySS's comment,
// η = ω²M²·R_L / [(R1(R2 + R_L) + ω²M²)(R2 + R_L)], is the general form
// at c2 = 1/(ω²L2) (Kiani and Ghovanloo 2012, from memory); checked here
// against the general form, a separate expression.
func TestSeriesSeriesWrittenOut(t *testing.T) {
	for _, l := range links() {
		for _, rl := range []float64{0.3, 4, 60} {
			w2m2 := l.Omega * l.Omega * l.M() * l.M()
			want := w2m2 * rl / ((l.R1*(l.R2+rl) + w2m2) * (l.R2 + rl))
			got := must[float64](t)(l.EfficiencySS(rl, SeriesTuning(l.Omega, l.L2)))
			// Both are a dozen roundings of the same quantity; the
			// reactance left by the rounded 1/(ω²L2) is ~eps·ωL2, whose
			// effect on |Z2|² is second order.
			if r := rel(got, want); r > 1e-13 {
				t.Errorf("k = %g, R_L = %g: η = %.16g, written-out form %.16g", l.K, rl, got, want)
			}
		}
	}
}

// The optimum loads reach MaxEfficiency in the solver, and a 1 % change of
// the load resistance or of the secondary capacitor either way lowers the
// solver's efficiency.
func TestOptimalLoadMaximisesSolverEfficiency(t *testing.T) {
	for _, l := range links() {
		etaMax := must[float64](t)(l.MaxEfficiency())
		c1 := SeriesTuning(l.Omega, l.L1)
		for _, parallel := range []bool{false, true} {
			var rl, c2 float64
			var err error
			if parallel {
				rl, c2, err = l.OptimalLoadSP()
			} else {
				rl, c2, err = l.OptimalLoadSS()
			}
			if err != nil {
				t.Fatal(err)
			}
			label := fmt.Sprintf("parallel %v, k = %g, Q = %.0f/%.0f, f = %g Hz", parallel, l.K, l.Q1(), l.Q2(), l.Omega/(2*math.Pi))
			best, _, tol := solverEfficiency(t, l, c1, c2, rl, parallel)
			if r := rel(best, etaMax); r > tol {
				t.Errorf("%s: solver η at the optimum = %.15g, η_max = %.15g (rel %.2g)", label, best, etaMax, r)
			}
			for _, d := range []float64{0.99, 1.01} {
				for _, which := range []string{"R_L", "C2"} {
					r, c := rl, c2
					if which == "R_L" {
						r *= d
					} else {
						c *= d
					}
					eta, _, tol := solverEfficiency(t, l, c1, c, r, parallel)
					// At a maximum the drop is second order, about
					// ½·|η''|·(1 %)², far above the solver's error; it
					// must be positive and ten times that error.
					if !(best-eta > 10*tol*best) {
						t.Errorf("%s: %s × %g gives η = %.15g, not below the optimum %.15g", label, which, d, eta, best)
					}
				}
			}
		}
	}
}

// η_max against a direct search: the solver's efficiency of the tuned
// series–series link maximised over R_L by golden-section search on
// log R_L (a route that uses neither the formula nor its derivation).
// The search stops when the bracket is 1e-6 wide in log R_L; near the
// maximum η is flat to second order, so the found maximum is within about
// 1e-12 relative of the true one, to which the solver's own tolerance
// (above) is added.
func TestMaxEfficiencyBySearch(t *testing.T) {
	for _, l := range links()[:8] {
		c1, c2 := SeriesTuning(l.Omega, l.L1), SeriesTuning(l.Omega, l.L2)
		tol := 0.0
		eta := func(x float64) float64 {
			e, _, et := solverEfficiency(t, l, c1, c2, math.Exp(x), false)
			tol = math.Max(tol, et)
			return e
		}
		a, b := math.Log(l.R2*1e-3), math.Log(l.R2*1e4)
		g := (math.Sqrt(5) - 1) / 2
		x1, x2 := b-g*(b-a), a+g*(b-a)
		f1, f2 := eta(x1), eta(x2)
		for b-a > 1e-6 {
			if f1 < f2 {
				a, x1, f1 = x1, x2, f2
				x2 = a + g*(b-a)
				f2 = eta(x2)
			} else {
				b, x2, f2 = x2, x1, f1
				x1 = b - g*(b-a)
				f1 = eta(x1)
			}
		}
		found := math.Max(f1, f2)
		want := must[float64](t)(l.MaxEfficiency())
		if r := rel(found, want); r > 1e-12+tol {
			t.Errorf("k = %g, Q = %.0f/%.0f: searched maximum %.15g, η_max %.15g (rel %.2g)", l.K, l.Q1(), l.Q2(), found, want, r)
		}
	}
}

// Tuning capacitors in the solver: a coil with its series tuning capacitor
// presents Z = R; with its parallel tuning capacitor across it, the tank's
// impedance is real and equals the dynamic resistance L/(C·R) (the
// zero-phase resonance of a tank with a lossy coil; common practice in
// radio engineering, from memory).
func TestTuningInSolver(t *testing.T) {
	for _, q := range []float64{0.8, 5, 300} {
		const l, f = 50e-6, 200e3
		w := 2 * math.Pi * f
		r := w * l / q
		cs := SeriesTuning(w, l)
		s := mustAC(t, &Circuit{Elements: []Element{V("V", "a", "0", 1), R("R", "a", "b", r), L("L", "b", "c", l), C("C", "c", "0", cs)}}, f)
		checkCond(t, s, 1e6)
		tol := math.Max(1e-12, 2*s.Cond()*eps) // as for the link circuits
		if z := must[complex128](t)(s.InputImpedance("V")); crel(z, complex(r, 0)) > tol {
			t.Errorf("Q = %g: series tuned Z = %v, want %g ohm", q, z, r)
		}
		cp := ParallelTuning(w, l, r)
		s = mustAC(t, &Circuit{Elements: []Element{I("J", "0", "a", 1), R("R", "a", "b", r), L("L", "b", "0", l), C("C", "a", "0", cp)}}, f)
		checkCond(t, s, 1e6)
		tol = math.Max(1e-12, 2*s.Cond()*eps)
		z := must[complex128](t)(s.InputImpedance("J"))
		want := l / (cp * r)
		if crel(z, complex(want, 0)) > tol {
			t.Errorf("Q = %g: parallel tuned Z = %v, want L/(CR) = %g ohm (rel %.2g)", q, z, want, crel(z, complex(want, 0)))
		}
	}
}

func TestLinkBadInput(t *testing.T) {
	good := Link{Omega: 1e6, L1: 1e-6, R1: 0.1, L2: 1e-6, R2: 0.1, K: 0.3}
	for _, tc := range []struct {
		l    Link
		want string
	}{
		{Link{Omega: 0, L1: 1, R1: 1, L2: 1, R2: 1}, "link: omega must be finite and > 0 s^-1, got 0"},
		{Link{Omega: 1, L1: -1, R1: 1, L2: 1, R2: 1}, "link: L1 must be finite and > 0 H, got -1"},
		{Link{Omega: 1, L1: 1, R1: math.NaN(), L2: 1, R2: 1}, "link: R1 must be finite and > 0 ohm, got NaN"},
		{Link{Omega: 1, L1: 1, R1: 1, L2: math.Inf(1), R2: 1}, "link: L2 must be finite and > 0 H, got +Inf"},
		{Link{Omega: 1, L1: 1, R1: 1, L2: 1, R2: 0}, "link: R2 must be finite and > 0 ohm, got 0"},
		{Link{Omega: 1, L1: 1, R1: 1, L2: 1, R2: 1, K: 1.2}, "link: the coupling coefficient k must be between −1 and 1, got 1.2"},
		{Link{Omega: 1, L1: 1, R1: 1, L2: 1, R2: 1, K: math.NaN()}, "link: the coupling coefficient k must be between −1 and 1, got NaN"},
	} {
		if _, err := tc.l.MaxEfficiency(); err == nil || err.Error() != tc.want {
			t.Errorf("%+v: %v, want %q", tc.l, err, tc.want)
		}
		if _, err := tc.l.EfficiencySS(1, 1); err == nil || err.Error() != tc.want {
			t.Errorf("%+v: EfficiencySS %v", tc.l, err)
		}
	}
	if _, err := good.EfficiencySS(0, 1e-6); err == nil || err.Error() != "link: the load resistance must be finite and > 0 ohm, got 0" {
		t.Errorf("zero load: %v", err)
	}
	if _, err := good.EfficiencySP(1, math.Inf(1)); err == nil || !strings.Contains(err.Error(), "secondary capacitance must be finite and > 0 F") {
		t.Errorf("infinite C2: %v", err)
	}
}
