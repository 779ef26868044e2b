package circuit

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// The state equations are checked by evaluating the derivatives at
// arbitrary times and states against derivatives written by hand from
// Kirchhoff's laws and the element laws v = L·di/dt, i = C·dv/dt (no
// integrator is involved).
//
// Tolerance: each derivative is compared with the sum of the magnitudes
// of the terms of its hand formula as the scale, at 1e-12 relative, or
// 2·Cond·eps where that is larger: the solver's error bound (as in the AC
// tests), the hand formulas adding a few roundings.

func mustStates(t *testing.T, c *Circuit, src func(string, float64) float64) *StateSystem {
	t.Helper()
	s, err := c.StateEquations(src)
	if err != nil {
		t.Fatal(err)
	}
	if s.Cond() > 1e6 {
		t.Fatalf("condition estimate %g above the 1e6 the tolerance allows for", s.Cond())
	}
	return s
}

func deriv(t *testing.T, s *StateSystem, tm float64, y []float64) []float64 {
	t.Helper()
	dy := make([]float64, len(y))
	if err := s.F(tm, y, dy); err != nil {
		t.Fatal(err)
	}
	return dy
}

func near(got, want, scale, tol float64) bool {
	return math.Abs(got-want) <= tol*scale
}

func stateTol(s *StateSystem) float64 { return math.Max(1e-12, 2*s.Cond()*eps) }

// samples are (t, y) pairs that exercise signs and sizes.
var sampleTimes = []float64{0, 1.3e-4, 0.0071, 0.5}

// RL in series with a voltage source: v = R·i + L·di/dt, so
// di/dt = (v(t) − R·i)/L.
func TestStateRL(t *testing.T) {
	const r, l = 3.3, 12e-3
	v := func(tm float64) float64 { return 24 * math.Sin(2*math.Pi*60*tm+0.4) }
	c := &Circuit{Elements: []Element{V("Vs", "a", "0", 0), R("R", "a", "b", r), L("L", "b", "0", l)}}
	s := mustStates(t, c, func(name string, tm float64) float64 {
		if name != "Vs" {
			t.Fatalf("source function asked for %q", name)
		}
		return v(tm)
	})
	if len(s.States) != 1 || s.States[0] != (State{Element: "L", Kind: Inductor, Unit: "A"}) {
		t.Fatalf("states %+v", s.States)
	}
	for _, tm := range sampleTimes {
		for _, i := range []float64{0, 2.5, -7} {
			dy := deriv(t, s, tm, []float64{i})
			want := (v(tm) - r*i) / l
			if !near(dy[0], want, (math.Abs(v(tm))+math.Abs(r*i))/l, stateTol(s)) {
				t.Errorf("t = %g, i = %g: di/dt = %.15g, want %.15g", tm, i, dy[0], want)
			}
		}
	}
}

// Series RLC: v = R·i + L·di/dt + v_C and i = C·dv_C/dt, so
// di/dt = (v − R·i − v_C)/L and dv_C/dt = i/C. The instant's outputs
// follow: the resistor's current is i and node b is at v − R·i.
func TestStateSeriesRLC(t *testing.T) {
	const r, l, cap = 10.0, 2e-3, 4.7e-6
	v := func(tm float64) float64 { return 5 + 3*math.Cos(1e4*tm) }
	c := &Circuit{Elements: []Element{V("Vs", "a", "0", 0), R("R", "a", "b", r), L("L", "b", "c", l), C("C", "c", "0", cap)}}
	s := mustStates(t, c, func(_ string, tm float64) float64 { return v(tm) })
	if len(s.States) != 2 || s.States[0].Element != "L" || s.States[1] != (State{Element: "C", Kind: Capacitor, Unit: "V"}) {
		t.Fatalf("states %+v", s.States)
	}
	for _, tm := range sampleTimes {
		for _, y := range [][]float64{{0, 0}, {0.3, -2}, {-1.1, 9}} {
			i, vc := y[0], y[1]
			dy := deriv(t, s, tm, y)
			want := (v(tm) - r*i - vc) / l
			if !near(dy[0], want, (math.Abs(v(tm))+math.Abs(r*i)+math.Abs(vc))/l, stateTol(s)) {
				t.Errorf("t = %g, y = %v: di/dt = %.15g, want %.15g", tm, y, dy[0], want)
			}
			if !near(dy[1], i/cap, math.Abs(i/cap), stateTol(s)) {
				t.Errorf("t = %g, y = %v: dv/dt = %.15g, want %.15g", tm, y, dy[1], i/cap)
			}
			in, err := s.At(tm, y)
			if err != nil {
				t.Fatal(err)
			}
			ir := must[float64](t)(in.Current("R"))
			vb := must[float64](t)(in.Voltage("b"))
			if !near(ir, i, math.Abs(i)+1e-300, stateTol(s)) || !near(vb, v(tm)-r*i, math.Abs(v(tm))+math.Abs(r*i), stateTol(s)) {
				t.Errorf("t = %g, y = %v: I(R) = %g (want %g), V(b) = %g (want %g)", tm, y, ir, i, vb, v(tm)-r*i)
			}
		}
	}
}

// A current source into R ∥ C: J = v/R + C·dv/dt, so dv/dt = (J − v/R)/C.
func TestStateParallelRC(t *testing.T) {
	const r, cap = 1e3, 1e-6
	j := func(tm float64) float64 { return 1e-3 * math.Exp(-tm/1e-3) }
	c := &Circuit{Elements: []Element{I("J", "0", "n", 0), R("R", "n", "0", r), C("C", "n", "0", cap)}}
	s := mustStates(t, c, func(_ string, tm float64) float64 { return j(tm) })
	for _, tm := range sampleTimes {
		for _, v := range []float64{0, 0.7, -3} {
			dy := deriv(t, s, tm, []float64{v})
			want := (j(tm) - v/r) / cap
			if !near(dy[0], want, (math.Abs(j(tm))+math.Abs(v/r))/cap, stateTol(s)) {
				t.Errorf("t = %g, v = %g: dv/dt = %.15g, want %.15g", tm, v, dy[0], want)
			}
		}
	}
}

// A coupled pair: the primary driven through R1, the secondary closed by
// R2. With the dots at the From ends, v_L1 = L1·di1/dt + M·di2/dt and
// v_L2 = M·di1/dt + L2·di2/dt; the loops give v_L1 = v − R1·i1 and
// v_L2 = −R2·i2 (i2 leaves node s through L2 and R2 returns it). By
// Cramer's rule, with D = L1·L2 − M²:
// di1/dt = (L2·a − M·b)/D, di2/dt = (L1·b − M·a)/D, a = v − R1·i1,
// b = −R2·i2.
func TestStateCoupledPair(t *testing.T) {
	const l1, l2, r1, r2 = 40e-6, 10e-6, 0.2, 0.5
	v := func(tm float64) float64 { return 12 * math.Sin(2*math.Pi*100e3*tm) }
	for _, k := range []float64{0.1, -0.5, 0.95} {
		m := k * math.Sqrt(l1*l2)
		c := &Circuit{
			Elements: []Element{V("V", "p", "0", 0), R("R1", "p", "q", r1), L("L1", "q", "0", l1),
				L("L2", "s", "0", l2), R("R2", "s", "0", r2)},
			Couplings: []Coupling{{"L2", "L1", m}},
		}
		s := mustStates(t, c, func(_ string, tm float64) float64 { return v(tm) })
		d := l1*l2 - m*m
		for _, tm := range []float64{0, 1.7e-6, 3.1e-6} {
			for _, y := range [][]float64{{0, 0}, {1.5, -0.4}, {-2, 3}} {
				a, b := v(tm)-r1*y[0], -r2*y[1]
				want := []float64{(l2*a - m*b) / d, (l1*b - m*a) / d}
				scale := []float64{(l2*math.Abs(a) + math.Abs(m*b)) / d, (l1*math.Abs(b) + math.Abs(m*a)) / d}
				dy := deriv(t, s, tm, y)
				// The inductance matrix's condition (1 + |k|)/(1 − |k|)
				// enters through Cond, hence stateTol.
				for i := range dy {
					if !near(dy[i], want[i], scale[i], stateTol(s)) {
						t.Errorf("k = %g, t = %g, y = %v: dy[%d] = %.15g, want %.15g", k, tm, y, i, dy[i], want[i])
					}
				}
			}
		}
	}
}

// Consistency of the two formulations (a check of agreement between this
// package's own routes, not against an outside source): in sinusoidal
// steady state every state is y(t) = Re(Y·e^{jωt}) with Y the AC
// solution's phasor, so F(t, y(t)) must equal Re(jω·Y·e^{jωt}). The
// circuit is a detuned series–series link with a parallel capacitor on
// the load as well. Tolerance: both solvers' bounds (2·cond·eps each)
// relative to the largest derivative.
func TestStateMatchesAC(t *testing.T) {
	const f = 85e3
	w := 2 * math.Pi * f
	src := cmplx.Rect(20, 0.3)
	c := &Circuit{
		Elements: []Element{
			V("V", "in", "0", src), C("C1", "in", "a", 0.9/(w*w*30e-6)), R("R1", "a", "b", 0.15), L("L1", "b", "0", 30e-6),
			L("L2", "x", "0", 12e-6), R("R2", "x", "y", 0.1), C("C2", "y", "z", 1.1/(w*w*12e-6)), R("RL", "z", "0", 6), C("CL", "z", "0", 20e-9),
		},
		Couplings: []Coupling{{"L1", "L2", 0.25 * math.Sqrt(30e-6*12e-6)}},
	}
	ac := mustAC(t, c, f)
	s := mustStates(t, c, func(_ string, tm float64) float64 { return real(src * cmplx.Exp(complex(0, w*tm))) })
	phasors := make([]complex128, len(s.States))
	for i, st := range s.States {
		if st.Kind == Inductor {
			phasors[i] = must[complex128](t)(ac.Current(st.Element))
		} else {
			phasors[i] = must[complex128](t)(ac.ElementVoltage(st.Element))
		}
	}
	tol := 2*ac.Cond()*eps + stateTol(s)
	for _, tm := range []float64{0, 2.1e-6, 5e-6, 1e-3} {
		e := cmplx.Exp(complex(0, w*tm))
		y := make([]float64, len(phasors))
		want := make([]float64, len(phasors))
		for i, p := range phasors {
			y[i] = real(p * e)
			want[i] = real(complex(0, w) * p * e)
		}
		dy := deriv(t, s, tm, y)
		for i := range dy {
			scale := w * cmplx.Abs(phasors[i])
			if !near(dy[i], want[i], scale, tol) {
				t.Errorf("t = %g: d/dt of %s %s = %.15g, steady state gives %.15g", tm, s.States[i].Element, s.States[i].Unit, dy[i], want[i])
			}
		}
	}
}

// What the time domain refuses beyond Check, with the full messages.
func TestStateRefusals(t *testing.T) {
	zero := func(string, float64) float64 { return 0 }
	for _, tc := range []struct {
		name string
		c    Circuit
		src  func(string, float64) float64
		want string
	}{
		{"capacitor across a source", Circuit{Elements: []Element{V("V", "a", "0", 0), C("C", "a", "0", 1e-6), R("R", "a", "0", 1)}}, zero,
			"in the time domain, voltage source V and capacitor C form a loop that fixes the voltage around it: the equations are singular (add a resistance in the loop)"},
		{"inductors in series", Circuit{Elements: []Element{V("V", "a", "0", 0), L("L1", "a", "b", 1e-3), L("L2", "b", "0", 1e-3)}}, zero,
			`in the time domain, node "b" is joined to the rest of the circuit only through inductor L1 and inductor L2, which fix the current into it: the equations are singular (add a resistance from it to the rest)`},
		{"perfect coupling", Circuit{
			Elements:  []Element{V("V", "a", "0", 0), R("R", "a", "b", 1), L("L1", "b", "0", 1e-3), L("L2", "s", "0", 4e-3), R("RL", "s", "0", 1)},
			Couplings: []Coupling{{"L1", "L2", 2e-3}}}, zero,
			"in the time domain, the inductance matrix of L1, L2 cannot be inverted: L1 and L2 are coupled with k = 1, so their currents are not independent; use k < 1"},
		{"no state", Circuit{Elements: []Element{V("V", "a", "0", 0), R("R", "a", "0", 1)}}, zero,
			"the circuit has no inductors or capacitors: it has no state to follow in time"},
		{"no source function", Circuit{Elements: []Element{I("J", "0", "a", 0), R("R", "a", "0", 1), C("C", "a", "0", 1)}}, nil,
			"current source J needs a value over time, but no source function was given"},
	} {
		_, err := tc.c.StateEquations(tc.src)
		if err == nil || err.Error() != tc.want {
			t.Errorf("%s:\n got %v\nwant %s", tc.name, err, tc.want)
		}
	}
}

// F and At refuse wrong sizes and non-finite numbers instead of panicking.
func TestStateBadCalls(t *testing.T) {
	c := &Circuit{Elements: []Element{V("V", "a", "0", 0), R("R", "a", "b", 1), L("L", "b", "0", 1)}}
	val := 1.0
	s := mustStates(t, c, func(string, float64) float64 { return val })
	for _, tc := range []struct {
		y, dy []float64
		want  string
	}{
		{[]float64{1, 2}, make([]float64, 1), "the state has 2 values; the circuit has 1 states"},
		{[]float64{1}, nil, "the derivative has room for 0 values; the circuit has 1 states"},
		{[]float64{math.NaN()}, make([]float64, 1), "state 1 (L A) is not finite at t = 0 s"},
	} {
		if err := s.F(0, tc.y, tc.dy); err == nil || err.Error() != tc.want {
			t.Errorf("y %v: %v, want %q", tc.y, err, tc.want)
		}
	}
	val = math.Inf(-1)
	if err := s.F(2, []float64{0}, make([]float64, 1)); err == nil || err.Error() != "voltage source V has no finite value at t = 2 s (-Inf)" {
		t.Errorf("infinite source: %v", err)
	}
	val = 1
	in, err := s.At(0, []float64{0.5})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := in.Current("nope"); err == nil || !strings.Contains(err.Error(), `no element "nope"`) {
		t.Errorf("unknown element: %v", err)
	}
	if _, err := in.Voltage("q"); err == nil || !strings.Contains(err.Error(), `no node "q"`) {
		t.Errorf("unknown node: %v", err)
	}
	// The inductor's current is its state; the source's is minus it.
	if i := must[float64](t)(in.Current("L")); i != 0.5 {
		t.Errorf("I(L) = %g, want the state 0.5", i)
	}
	if i := must[float64](t)(in.Current("V")); math.Abs(i+0.5) > 1e-15 {
		t.Errorf("I(V) = %g, want −0.5", i)
	}
}
