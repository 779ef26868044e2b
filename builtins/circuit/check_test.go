package circuit

import (
	"math"
	"testing"
)

// Every problem Check refuses, with its full message.
func TestCheckMessages(t *testing.T) {
	ok := []Element{V("V1", "a", "0", 1), R("R1", "a", "0", 10)}
	with := func(extra ...Element) []Element { return append(append([]Element(nil), ok...), extra...) }
	for _, tc := range []struct {
		name string
		c    Circuit
		want string
	}{
		{"empty", Circuit{}, "the circuit has no elements"},
		{"no name", Circuit{Elements: with(R("", "a", "b", 1))}, `element 3 (from "a" to "b") has no name`},
		{"duplicate", Circuit{Elements: with(R("R1", "a", "0", 5))}, `two elements are named "R1" (elements 2 and 3)`},
		{"no kind", Circuit{Elements: with(Element{Name: "X", From: "a", To: "0", Value: 1})},
			"element X: unknown kind 0 (use Resistor, Inductor, Capacitor, VoltageSource or CurrentSource)"},
		{"empty node", Circuit{Elements: with(R("R2", "a", "", 1))}, `resistor R2: both nodes must be named (from "a" to "")`},
		{"self loop", Circuit{Elements: with(C("C1", "a", "a", 1e-6))}, `capacitor C1: both ends are on node "a"`},
		{"negative R", Circuit{Elements: with(R("R2", "a", "0", -3))}, "resistor R2: resistance must be ≥ 0 ohm, got -3 ohm"},
		{"NaN R", Circuit{Elements: with(R("R2", "a", "0", math.NaN()))}, "resistor R2: value is not a finite number (NaN)"},
		{"infinite L", Circuit{Elements: with(L("L1", "a", "0", math.Inf(1)))}, "inductor L1: value is not a finite number (+Inf)"},
		{"zero L", Circuit{Elements: with(L("L1", "a", "0", 0))}, "inductor L1: inductance must be > 0 H, got 0 H"},
		{"zero C", Circuit{Elements: with(C("C1", "a", "0", 0))}, "capacitor C1: a capacitance of 0 F is an open circuit; leave the capacitor out"},
		{"negative C", Circuit{Elements: with(C("C1", "a", "0", -1e-9))}, "capacitor C1: capacitance must be > 0 F, got -1e-09 F"},
		{"phasor on R", Circuit{Elements: with(Element{Name: "R2", Kind: Resistor, From: "a", To: "0", Value: 1, Phasor: 2})},
			"resistor R2: only sources take a phasor; give its value in Value"},
		{"value on source", Circuit{Elements: with(Element{Name: "V2", Kind: VoltageSource, From: "b", To: "0", Value: 5})},
			"voltage source V2: a source takes its amplitude as a phasor; Value is for resistors, inductors and capacitors"},
		{"NaN phasor", Circuit{Elements: with(I("J", "0", "a", complex(math.NaN(), 0)))}, "current source J: phasor is not finite ((NaN+0i))"},
		{"no ground", Circuit{Elements: []Element{V("V1", "a", "b", 1), R("R1", "a", "b", 1)}}, `no element is connected to the ground node "0"`},
		{"named ground missing", Circuit{Elements: ok, Ground: "gnd"}, `no element is connected to the ground node "gnd"`},
		{"floating part", Circuit{Elements: with(L("L2", "s", "t", 1e-3), R("RL", "s", "t", 5))},
			`nodes "s", "t" have no conductive path to the ground node "0" (through L2, RL); connect one of them to ground (coils coupled only magnetically still need one)`},
		{"voltage loop", Circuit{Elements: with(V("V2", "a", "0", 2))},
			"voltage source V1 and voltage source V2 form a loop that fixes the voltage around it: the equations are singular (add a resistance in the loop)"},
		{"loop with shorts", Circuit{Elements: with(R("S1", "a", "m", 0), R("S2", "m", "n", 0), V("V2", "n", "0", 2))},
			"resistor S1 (0 ohm), resistor S2 (0 ohm), voltage source V1 and voltage source V2 form a loop that fixes the voltage around it: the equations are singular (add a resistance in the loop)"},
		{"current cut-set", Circuit{Elements: with(I("J1", "a", "x", 1), C("Cx", "x", "y", 1e-6), I("J2", "y", "0", 1))},
			`nodes "x", "y" are joined to the rest of the circuit only through current source J1 and current source J2, which fix the current into them: the equations are singular (add a resistance from them to the rest)`},
		{"current source alone", Circuit{Elements: with(I("J1", "0", "x", 1))},
			`node "x" is joined to the rest of the circuit only through current source J1, which fixes the current into it: the equations are singular (add a resistance from it to the rest)`},
		{"coupling to unknown", Circuit{Elements: with(L("L1", "a", "0", 1)), Couplings: []Coupling{{"L1", "L9", 0.1}}},
			`coupling L1–L9: there is no element named "L9"`},
		{"coupling to resistor", Circuit{Elements: with(L("L1", "a", "0", 1)), Couplings: []Coupling{{"L1", "R1", 0.1}}},
			"coupling L1–R1: R1 is a resistor; only inductors can be coupled"},
		{"self coupling", Circuit{Elements: with(L("L1", "a", "0", 1)), Couplings: []Coupling{{"L1", "L1", 0.1}}},
			"coupling L1–L1: an inductor cannot be coupled with itself (its self inductance is its value)"},
		{"k > 1", Circuit{Elements: with(L("L1", "a", "0", 1e-3), L("L2", "a", "0", 4e-3)), Couplings: []Coupling{{"L1", "L2", -2.5e-3}}},
			"coupling L1–L2: |M| = 0.0025 H exceeds √(L_L1·L_L2) = 0.002 H (coupling coefficient k = 1.25 > 1)"},
		{"NaN M", Circuit{Elements: with(L("L1", "a", "0", 1e-3), L("L2", "a", "0", 4e-3)), Couplings: []Coupling{{"L1", "L2", math.NaN()}}},
			"coupling L1–L2: mutual inductance is not a finite number (NaN)"},
		{"coupled twice", Circuit{Elements: with(L("L1", "a", "0", 1e-3), L("L2", "a", "0", 4e-3)), Couplings: []Coupling{{"L1", "L2", 1e-3}, {"L2", "L1", 1e-3}}},
			"coupling L2–L1: the pair is coupled twice; give one mutual inductance"},
		// k12 = k13 = 0.9 and k23 = −0.9 pass pairwise, but the coupling
		// matrix [[1 .9 .9] [.9 1 −.9] [.9 −.9 1]] has the eigenvector
		// (1, −1, −1) with eigenvalue 1 − 2·0.9 = −0.8 (the other two are
		// 1.9: (1, 1, 0) is one, and the trace is 3).
		{"three coils impossible", Circuit{Elements: with(L("L1", "a", "0", 1), L("L2", "a", "0", 1), L("L3", "a", "0", 1)),
			Couplings: []Coupling{{"L1", "L2", 0.9}, {"L1", "L3", 0.9}, {"L2", "L3", -0.9}}},
			"couplings among L1, L2, L3 are not physically possible: for some currents the stored energy ½·Iᵀ·L·I would be negative (the inductance matrix has eigenvalue -0.8 in units of the self inductances)"},
	} {
		err := tc.c.Check()
		if err == nil {
			t.Errorf("%s: no error, want %q", tc.name, tc.want)
			continue
		}
		if err.Error() != tc.want {
			t.Errorf("%s:\n got %s\nwant %s", tc.name, err, tc.want)
		}
		// AC and StateEquations check first and give the same message.
		if _, err := tc.c.AC(50); err == nil || err.Error() != tc.want {
			t.Errorf("%s: AC gives %v", tc.name, err)
		}
		if _, err := tc.c.StateEquations(func(string, float64) float64 { return 0 }); err == nil || err.Error() != tc.want {
			t.Errorf("%s: StateEquations gives %v", tc.name, err)
		}
	}
}

// Circuits Check must accept: a 0-ohm resistor outside any loop of
// sources, k exactly 1 computed as k·√(L1·L2), a secondary grounded at one
// point, three physically possible couplings.
func TestCheckAccepts(t *testing.T) {
	l1, l2 := 3e-3, 7e-3
	for _, c := range []Circuit{
		{Elements: []Element{V("V", "a", "0", 1), R("S", "a", "b", 0), R("R", "b", "0", 1)}},
		{Elements: []Element{V("V", "a", "0", 1), L("L1", "a", "0", l1), L("L2", "s", "0", l2), R("RL", "s", "0", 1)},
			Couplings: []Coupling{{"L1", "L2", 1 * math.Sqrt(l1*l2)}}},
		{Elements: []Element{V("V", "a", "0", 1), L("L1", "a", "0", 1), L("L2", "a", "0", 1), L("L3", "a", "0", 1)},
			Couplings: []Coupling{{"L1", "L2", 0.5}, {"L1", "L3", 0.5}, {"L2", "L3", 0.5}}},
	} {
		if err := c.Check(); err != nil {
			t.Errorf("%v: %v", c.Elements, err)
		}
	}
}
