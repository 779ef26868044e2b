package builtins_test

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func cval(t *testing.T, s *runtime.Session, line string) complex128 {
	t.Helper()
	v := eval(t, s, line)
	switch x := v.(type) {
	case runtime.Complex:
		return x.V
	case runtime.Quantity:
		return complex(x.V, 0)
	}
	t.Fatalf("%s: %s, want a number", line, runtime.TypeName(v))
	return 0
}

func near(a, b complex128, tol float64) bool {
	return cmplx.Abs(a-b) <= tol*math.Max(cmplx.Abs(a), cmplx.Abs(b))
}

// TestSeriesResonance: a series RLC driven at f0 = 1/(2π√(LC)) draws
// I = V/R in phase with V, the inductor's voltage is jQ·V with
// Q = ω0·L/R, and the resistor takes ½|V|²/R on average (peak phasors)
// (J. W. Nilsson and S. A. Riedel, Electric Circuits, 10th ed. 2015,
// §14.4 and §10.2, from memory; any circuits text). Tolerance 1e-11: the
// solver agrees with closed forms to 1e-12 on well-conditioned circuits
// (its package tests), and f0 is formed in a few roundings.
func TestSeriesResonance(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, `net = circuit(voltage_source("V1", "in", "0", polar(12 V, 20 deg)), resistor("R1", "in", "a", 2.5 ohm), inductor("L1", "a", "b", 47 uH), capacitor("C1", "b", "0", 330 nF))`)
	eval(t, s, "sol = ac_solve(net, 1/(2*pi*sqrt(47 uH * 330 nF)))")
	V := cmplx.Rect(12, 20*math.Pi/180)
	R, L, C := 2.5, 47e-6, 330e-9
	w0 := 1 / math.Sqrt(L*C)
	Q := w0 * L / R
	if got := cval(t, s, `element_current(sol, "R1")`); !near(got, V/complex(R, 0), 1e-11) {
		t.Errorf("I = %v, want V/R = %v", got, V/complex(R, 0))
	}
	if got := cval(t, s, `element_voltage(sol, "L1")`); !near(got, complex(0, Q)*V, 1e-11) {
		t.Errorf("V_L = %v, want jQ·V = %v", got, complex(0, Q)*V)
	}
	if got := cval(t, s, `element_power(sol, "R1")`); !near(got, complex(144/(2*R), 0), 1e-11) {
		t.Errorf("P_R = %v W, want ½|V|²/R = %v W", got, 144/(2*R))
	}
	if got := cval(t, s, `input_impedance(sol, "V1")`); !near(got, complex(R, 0), 1e-11) {
		t.Errorf("Z_in = %v, want R at resonance", got)
	}
	// the source delivers what R takes (Tellegen): P_V1 = −P_R
	if got := cval(t, s, `element_power(sol, "V1") + element_power(sol, "R1")`); cmplx.Abs(got) > 1e-11*144/(2*R) {
		t.Errorf("source and resistor powers do not balance: %v W", got)
	}
}

// TestLowPassAndCoupledCoils: an RC divider gives Vout/Vin = 1/(1 + jωRC);
// two coils in series with coupling k have L1 + L2 + 2k√(L1L2) when the
// currents enter both dots, L1 + L2 − 2k√(L1L2) when one is reversed
// (Nilsson and Riedel, Electric Circuits, 10th ed. 2015, §6.4 and §9.11,
// from memory). Tolerance 1e-11 as above.
func TestLowPassAndCoupledCoils(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, `sol = ac_solve(circuit(voltage_source("V1", "in", "0", 1 V), resistor("R1", "in", "out", 1.5 kohm), capacitor("C1", "out", "0", 10 nF)), 20 kHz)`)
	w := 2 * math.Pi * 20e3
	if got, want := cval(t, s, `node_voltage(sol, "out")`), 1/complex(1, w*1.5e3*10e-9); !near(got, want, 1e-11) {
		t.Errorf("RC divider: %v, want %v", got, want)
	}
	L1, L2, k := 30e-6, 12e-6, 0.4
	m := k * math.Sqrt(L1*L2)
	for _, c := range []struct {
		to2, from2 string
		sign       float64
	}{{"b", "0", 1}, {"0", "b", -1}} {
		eval(t, s, `pair = circuit(voltage_source("V1", "a", "0", 1 V), inductor("L1", "a", "b", 30 uH), inductor("L2", "`+c.to2+`", "`+c.from2+`", 12 uH), coupled("L1", "L2", 0.4))`)
		// L2 is written from its from node to its to node; with from = "b"
		// the current enters its dot, as it enters L1's
		_ = c
		got := cval(t, s, `input_impedance(ac_solve(pair, 50 kHz), "V1")`)
		want := complex(0, 2*math.Pi*50e3*(L1+L2+2*c.sign*m))
		if !near(got, want, 1e-11) {
			t.Errorf("coupled coils, sign %+g: Z = %v, want %v", c.sign, got, want)
		}
	}
}

// TestLinkAgainstSolver: the closed-form link efficiency at its optimal
// load (coil_link, optimal_load, max_link_efficiency) against the same
// link built as a circuit and solved by ac_solve: power into the load
// over power from the source into the primary. The solver shares no code
// with the closed forms (modified nodal analysis vs. formulas);
// tolerance 1e-10 (condition of a tuned high-Q link about 1e3–1e5).
func TestLinkAgainstSolver(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for _, line := range []string{
		"lk = coil_link(24 uH, 0.12 ohm, 11 uH, 0.09 ohm, 0.3, 140 kHz)",
		`RL = optimal_load(lk, "series")`,
		`C2 = optimal_c2(lk, "series")`,
		"C1 = series_tuning(24 uH, 140 kHz)",
		`net = circuit(voltage_source("V1", "s", "0", 5 V), capacitor("C1", "s", "p", C1), resistor("R1", "p", "q", 0.12 ohm), inductor("L1", "q", "0", 24 uH), inductor("L2", "x", "0", 11 uH), resistor("R2", "x", "y", 0.09 ohm), capacitor("C2", "y", "z", C2), resistor("RL", "z", "0", RL), coupled("L1", "L2", 0.3))`,
		"sol = ac_solve(net, 140 kHz)",
	} {
		eval(t, s, line)
	}
	solver := real(cval(t, s, `element_power(sol, "RL") / -element_power(sol, "V1")`))
	closed := real(cval(t, s, "max_link_efficiency(lk)"))
	formula := real(cval(t, s, `link_efficiency(lk, RL, C2, "series")`))
	if math.Abs(solver-closed) > 1e-10 || math.Abs(formula-closed) > 1e-10 {
		t.Errorf("efficiency: solver %.15g, max_link_efficiency %.15g, link_efficiency %.15g", solver, closed, formula)
	}
	// a load 10 % off the optimum is worse, by the solver
	eval(t, s, `sol2 = ac_solve(circuit(voltage_source("V1", "s", "0", 5 V), capacitor("C1", "s", "p", C1), resistor("R1", "p", "q", 0.12 ohm), inductor("L1", "q", "0", 24 uH), inductor("L2", "x", "0", 11 uH), resistor("R2", "x", "y", 0.09 ohm), capacitor("C2", "y", "z", C2), resistor("RL", "z", "0", RL*1.1), coupled("L1", "L2", 0.3)), 140 kHz)`)
	if off := real(cval(t, s, `element_power(sol2, "RL") / -element_power(sol2, "V1")`)); !(off < solver) {
		t.Errorf("a load 10 %% above the optimum gives %.15g, not below %.15g", off, solver)
	}
}

// TestCircuitErrors: bad circuits are refused where they are written,
// with the parts named.
func TestCircuitErrors(t *testing.T) {
	cases := []struct{ in, want string }{
		{`resistor("R1", "a", 0, 5 ohm)`, `is a name in quotes, such as "0"`},
		{`resistor("R1", "a", "b", 5 H)`, "must be resistance (Ω), not inductance (H)"},
		{`inductor("L1", "a", "a", 5 uH)`, `both ends are on node "a"`},
		{`coupled("L1", "L2", 1.5)`, "from -1 to 1"},
		{`circuit(resistor("R1", "a", "0", 1 ohm), resistor("R1", "a", "0", 2 ohm))`, `two elements are named "R1"`},
		{`circuit(voltage_source("V1", "a", "0", 1 V), resistor("R1", "a", "0", 1 ohm), coupled("R1", "L9", 0.5))`, "couples inductors"},
		{`circuit(voltage_source("V1", "a", "b", 1 V), resistor("R1", "a", "b", 1 ohm))`, "R1"},
		{"V(t) = 5 V", ""},
		{`ac_solve(circuit(voltage_source("V1", "a", "0", V), resistor("R1", "a", "0", 1 ohm)), 1 kHz)`, "is a function of time"},
		{`ac_solve(circuit(voltage_source("V1", "a", "0", 1 V), resistor("R1", "a", "0", 1 ohm)), 1 s)`, "must be a frequency"},
		{`element_current(ac_solve(circuit(voltage_source("V1", "a", "0", 1 V), resistor("R1", "a", "0", 1 ohm)), 1 kHz), "R9")`, "R9"},
	}
	s := runtime.NewSession(builtins.Standard())
	for _, c := range cases {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		if c.want == "" {
			if err != nil {
				t.Fatalf("%s: %v", c.in, err)
			}
			continue
		}
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.in, err, c.want)
		}
	}
}

// TestComplexSweep: sweep_log spaces its points geometrically (1, 10,
// 100, 1000 kHz here, exact to rounding), and a complex result fills four
// columns: re, im, magnitude and angle of Z = R + jωL, compared with the
// closed form to 1e-15 (a few roundings).
func TestComplexSweep(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "Z(f) = 2 ohm + 2j*pi*f*10 uH")
	tab, ok := eval(t, s, "sweep_log(Z, 1 kHz, 1 MHz, 4)").(runtime.Tabular)
	if !ok {
		t.Fatal("sweep_log gives no table")
	}
	cols, _, rows := tab.Tabulate()
	if strings.Join(cols, ",") != "f,re Z,im Z,|Z|,arg Z" {
		t.Fatalf("columns %q", cols)
	}
	for i, r := range rows {
		f := math.Pow(10, float64(3+i))
		if math.Abs(r[0]-f) > 1e-15*f {
			t.Errorf("row %d: f = %.17g, want %g", i+1, r[0], f)
		}
		z := complex(2, 2*math.Pi*f*10e-6)
		for j, want := range []float64{real(z), imag(z), cmplx.Abs(z), cmplx.Phase(z)} {
			if math.Abs(r[j+1]-want) > 1e-15*math.Abs(want) {
				t.Errorf("row %d, %s = %.17g, want %.17g", i+1, cols[j+1], r[j+1], want)
			}
		}
	}
}
