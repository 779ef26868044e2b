package builtins

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"

	"loopwise/builtins/circuit"
	"loopwise/lang"
	"loopwise/runtime"
)

// Circuits in the language: parts (resistor, inductor, capacitor, sources,
// couplings) are values; circuit(...) joins them into a network; ac_solve
// solves it at a frequency and transient follows it in time. The numerical
// work is in builtins/circuit.

const refCircuits = "modified nodal analysis (Ho, Ruehli and Brennan, IEEE Trans. Circuits and Systems 22(6), 1975); peak phasors, average power ½·Re(V·I*)"

// Part is one element of a circuit, or a coupling between two inductors.
type Part struct {
	el circuit.Element
	// a source's value: a real or complex quantity (its AC phasor, and a
	// real one is also its constant value in time) or a function of time
	src runtime.Value
	// initial inductor current (A) or capacitor voltage (V) for transient
	init float64
	// a coupling: the two inductors, and M (H) or k (plain number)
	couple     bool
	a, b       string
	m, k       float64
	kGiven     bool
	kindPhrase string
}

func (p *Part) Kind() string { return "a circuit part" }

func (p *Part) Show(digits int) string {
	if p.couple {
		if p.kGiven {
			return fmt.Sprintf("coupling of %s and %s, k = %s", p.a, p.b, runtime.FormatNumber(p.k, digits))
		}
		return fmt.Sprintf("coupling of %s and %s, M = %s", p.a, p.b, runtime.Format(runtime.Quantity{V: p.m, D: dimHenry}, digits))
	}
	val := ""
	switch p.el.Kind {
	case circuit.Resistor:
		val = runtime.Format(runtime.Quantity{V: p.el.Value, D: dimOhm}, digits)
	case circuit.Inductor:
		val = runtime.Format(runtime.Quantity{V: p.el.Value, D: dimHenry}, digits)
	case circuit.Capacitor:
		val = runtime.Format(runtime.Quantity{V: p.el.Value, D: dimFarad}, digits)
	default:
		if f, ok := p.src.(*runtime.Func); ok {
			val = f.Signature()
		} else {
			val = runtime.Format(p.src, digits)
		}
	}
	return fmt.Sprintf("%s %s from %q to %q, %s", p.kindPhrase, p.el.Name, p.el.From, p.el.To, val)
}

func (p *Part) Summary(digits int) string { return p.Show(digits) }

var (
	dimFarad = mustDim("F")
	dimWatt  = mustDim("W")
)

// nameArg reads argument i as a name in quotes (an element or a node).
func nameArg(fn, what string, args []runtime.Value, i int) (string, error) {
	s, ok := args[i].(string)
	if !ok {
		if q, isQ := args[i].(runtime.Quantity); isQ && q.D.IsZero() {
			return "", errorf("%s: the %s (the %s argument) is a name in quotes, such as \"%s\"", fn, what, ordinal(i), runtime.FormatNumber(q.V, 6))
		}
		return "", errorf("%s: the %s (the %s argument) must be a name in quotes, not %s", fn, what, ordinal(i), runtime.TypeName(args[i]))
	}
	if strings.TrimSpace(s) == "" {
		return "", errorf("%s: the %s (the %s argument) is empty", fn, what, ordinal(i))
	}
	return s, nil
}

// partHead reads name, from, to.
func partHead(fn string, args []runtime.Value) (name, from, to string, err error) {
	if name, err = nameArg(fn, "element's name", args, 0); err != nil {
		return
	}
	if from, err = nameArg(fn, "first node", args, 1); err != nil {
		return
	}
	to, err = nameArg(fn, "second node", args, 2)
	return
}

func passivePart(fn string, kind circuit.Kind, d runtime.Dim, phrase, initWhat string, initDim runtime.Dim) func(args []runtime.Value) (runtime.Value, error) {
	return func(args []runtime.Value) (runtime.Value, error) {
		name, from, to, err := partHead(fn, args)
		if err != nil {
			return nil, err
		}
		v, err := ofDim(fn, args, 3, d)
		if err != nil {
			return nil, err
		}
		p := &Part{el: circuit.Element{Name: name, Kind: kind, From: from, To: to, Value: v}, kindPhrase: phrase}
		if len(args) > 4 {
			if initWhat == "" {
				return nil, errorf("%s takes a name, two nodes and a value", fn)
			}
			x, err := ofDim(fn, args, 4, initDim)
			if err != nil {
				return nil, err
			}
			p.init = x
		}
		if err := circuitCheckPart(p); err != nil {
			return nil, errorf("%s: %v", fn, err)
		}
		return p, nil
	}
}

// circuitCheckPart checks one element alone (values, nodes), so that a
// bad part is reported where it is written.
func circuitCheckPart(p *Part) error { return circuit.CheckElement(p.el) }

func sourcePart(fn string, kind circuit.Kind, d runtime.Dim, phrase string) func(args []runtime.Value) (runtime.Value, error) {
	return func(args []runtime.Value) (runtime.Value, error) {
		name, from, to, err := partHead(fn, args)
		if err != nil {
			return nil, err
		}
		p := &Part{el: circuit.Element{Name: name, Kind: kind, From: from, To: to}, kindPhrase: phrase, src: args[3]}
		switch x := args[3].(type) {
		case runtime.Quantity:
			if x.D != d {
				return nil, errorf("%s: the value must be in %s, not %s", fn, runtime.DisplayUnitOf(d), x.D.Describe())
			}
			p.el.Phasor = complex(x.V, 0)
		case runtime.Complex:
			if x.D != d {
				return nil, errorf("%s: the value must be in %s, not %s", fn, runtime.DisplayUnitOf(d), x.D.Describe())
			}
			p.el.Phasor = x.V
		case *runtime.Func:
			if x.MinArgs > 1 || (x.MaxArgs >= 0 && x.MaxArgs < 1) {
				return nil, errorf("%s: a source function must take one argument, the time; %s does not", fn, x.Signature())
			}
		default:
			return nil, errorf("%s: the value must be a peak phasor in %s (real or complex) or a function of time, not %s", fn, runtime.DisplayUnitOf(d), runtime.TypeName(args[3]))
		}
		return p, nil
	}
}

// Network is a circuit built from parts.
type Network struct {
	c     circuit.Circuit
	parts map[string]*Part
}

func (n *Network) Kind() string { return "a circuit" }

func (n *Network) Show(digits int) string {
	var b strings.Builder
	b.WriteString(n.Summary(digits))
	for _, e := range n.c.Elements {
		b.WriteString("\n  " + n.parts[e.Name].Show(digits))
	}
	for _, cp := range n.c.Couplings {
		b.WriteString(fmt.Sprintf("\n  coupling of %s and %s, M = %s", cp.A, cp.B, runtime.Format(runtime.Quantity{V: cp.M, D: dimHenry}, digits)))
	}
	return b.String()
}

func (n *Network) Summary(digits int) string {
	nodes := map[string]bool{}
	for _, e := range n.c.Elements {
		nodes[e.From], nodes[e.To] = true, true
	}
	s := fmt.Sprintf("circuit: %d elements, %d nodes", len(n.c.Elements), len(nodes))
	if k := len(n.c.Couplings); k > 0 {
		s += fmt.Sprintf(", %d coupling", k)
		if k > 1 {
			s += "s"
		}
	}
	return s
}

// maxParts bounds a circuit: the dense solver's time grows as the cube.
const maxParts = 2000

func buildCircuit(args []runtime.Value) (runtime.Value, error) {
	const fn = "circuit"
	if len(args) > maxParts {
		return nil, errorf("%s: %d parts is more than the limit of %d", fn, len(args), maxParts)
	}
	n := &Network{parts: map[string]*Part{}}
	var couples []*Part
	for i, a := range args {
		p, ok := a.(*Part)
		if !ok {
			return nil, errorf("%s: argument %d must be a circuit part (resistor, inductor, capacitor, voltage_source, current_source, coupled), not %s", fn, i+1, runtime.TypeName(a))
		}
		if p.couple {
			couples = append(couples, p)
			continue
		}
		if _, dup := n.parts[p.el.Name]; dup {
			return nil, errorf("%s: two elements are named %q; every element needs its own name", fn, p.el.Name)
		}
		n.parts[p.el.Name] = p
		n.c.Elements = append(n.c.Elements, p.el)
	}
	for _, p := range couples {
		m := p.m
		if p.kGiven {
			la, okA := n.parts[p.a]
			lb, okB := n.parts[p.b]
			if !okA || !okB || la.el.Kind != circuit.Inductor || lb.el.Kind != circuit.Inductor {
				missing := p.a
				if okA && la.el.Kind == circuit.Inductor {
					missing = p.b
				}
				return nil, errorf("%s: coupled(%q, %q, ...) couples inductors, and the circuit has no inductor %q", fn, p.a, p.b, missing)
			}
			m = p.k * math.Sqrt(la.el.Value*lb.el.Value)
		}
		n.c.Couplings = append(n.c.Couplings, circuit.Coupling{A: p.a, B: p.b, M: m})
	}
	if len(n.c.Elements) == 0 {
		return nil, errorf("%s: a circuit needs at least one element", fn)
	}
	if err := n.c.Check(); err != nil {
		return nil, errorf("%s: %v", fn, err)
	}
	return n, nil
}

func networkArg(fn string, args []runtime.Value, i int) (*Network, error) {
	n, ok := args[i].(*Network)
	if !ok {
		return nil, errorf("%s: the %s argument must be a circuit (from circuit(...)), not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return n, nil
}

// ACResult is a circuit solved at one frequency.
type ACResult struct {
	net *Network
	sol *circuit.ACSolution
}

func (r *ACResult) Kind() string { return "an AC solution" }

func (r *ACResult) Summary(digits int) string {
	s := fmt.Sprintf("AC solution at %s: %d elements", runtime.Format(runtime.Quantity{V: r.sol.Frequency(), D: dimHertz, Cyc: true}, digits), len(r.net.c.Elements))
	if name, peak := r.sol.LargestVoltage(); name != "" {
		s += fmt.Sprintf("; largest voltage %s peak, across %s", runtime.Format(runtime.Quantity{V: peak, D: dimVolt}, digits), name)
	}
	return s
}

// Show lists every element: its voltage and current (peak phasors, in
// polar form) and the average power it absorbs.
func (r *ACResult) Show(digits int) string {
	var b strings.Builder
	b.WriteString(r.Summary(digits))
	b.WriteString("\n  element    voltage (peak)              current (peak)              power (average, absorbed)")
	for _, e := range r.net.c.Elements {
		v, _ := r.sol.ElementVoltage(e.Name)
		i, _ := r.sol.Current(e.Name)
		p := elementPower(r.sol, e.Name)
		b.WriteString(fmt.Sprintf("\n  %-10s %-27s %-27s %s", lang.Abbrev(e.Name, 10),
			polarShort(runtime.Complex{V: v, D: dimVolt}, digits),
			polarShort(runtime.Complex{V: i, D: dimCurrent}, digits),
			runtime.Format(runtime.Quantity{V: p, D: dimWatt}, digits)))
	}
	return b.String()
}

// polarShort writes a phasor as magnitude ∠ angle in degrees.
func polarShort(z runtime.Complex, digits int) string {
	m := runtime.Format(z.Abs(), digits)
	if cmplx.Abs(z.V) == 0 {
		return m
	}
	return m + " ∠ " + runtime.FormatNumber(runtime.RoundAngle(cmplx.Phase(z.V)*180/math.Pi, digits), digits) + "°"
}

// Tabulate implements runtime.Tabular: one row per element, in the order
// of the circuit: real and imaginary parts of its voltage and current,
// and its average power.
func (r *ACResult) Tabulate() ([]string, []runtime.Dim, [][]float64) {
	cols := []string{"re V", "im V", "re I", "im I", "P"}
	dims := []runtime.Dim{dimVolt, dimVolt, dimCurrent, dimCurrent, dimWatt}
	rows := make([][]float64, 0, len(r.net.c.Elements))
	for _, e := range r.net.c.Elements {
		v, _ := r.sol.ElementVoltage(e.Name)
		i, _ := r.sol.Current(e.Name)
		p := elementPower(r.sol, e.Name)
		rows = append(rows, []float64{real(v), imag(v), real(i), imag(i), p})
	}
	return cols, dims, rows
}

// RowLabels implements runtime.RowLabeller: the elements' names.
func (r *ACResult) RowLabels() []string {
	out := make([]string, len(r.net.c.Elements))
	for i, e := range r.net.c.Elements {
		out[i] = e.Name
	}
	return out
}

func (r *ACResult) LabelHeading() string { return "element" }

func acResultArg(fn string, args []runtime.Value, i int) (*ACResult, error) {
	r, ok := args[i].(*ACResult)
	if !ok {
		return nil, errorf("%s: the %s argument must be an AC solution (from ac_solve(circuit, f)), not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return r, nil
}

// frequencyArg reads argument i as a cycle frequency in Hz (an angular
// velocity in rad/s is divided by 2π).
func frequencyArg(fn string, args []runtime.Value, i int) (float64, error) {
	w, ok, err := angularFrequency(fn, args, i)
	if err != nil {
		return 0, err
	}
	if !ok {
		return 0, errorf("%s: the %s argument must be a frequency (Hz, or rad/s), not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return w / (2 * math.Pi), nil
}

func circuitFuncs() []*runtime.Func {
	acExample := "net = circuit(voltage_source(\"V1\", \"in\", \"0\", 10 V), resistor(\"R1\", \"in\", \"a\", 5 ohm), inductor(\"L1\", \"a\", \"b\", 100 uH), capacitor(\"C1\", \"b\", \"0\", 253.3 nF))\nsol = ac_solve(net, 1 kHz)\nelement_current(sol, \"R1\") as polar"
	return []*runtime.Func{
		fnc("resistor", []string{"name", "from", "to", "R"}, 4, 4, &runtime.Help{
			Signature: "resistor(name: text, from: node, to: node, R: ohm) -> circuit part",
			Summary:   "A resistor between two nodes (nodes are names in quotes; \"0\" is ground). Its current and voltage are taken from → to.",
			Example:   "resistor(\"R1\", \"in\", \"out\", 4.7 kohm)",
			Reference: refCircuits,
		}, passivePart("resistor", circuit.Resistor, dimOhm, "resistor", "", runtime.Dim{})),
		fnc("inductor", []string{"name", "from", "to", "L", "i0"}, 4, 5, &runtime.Help{
			Signature: "inductor(name: text, from: node, to: node, L: H[, i0: A at t = 0]) -> circuit part",
			Summary:   "An inductor between two nodes; its inductance may come from geometry (inductance(path, wire radius)). i0 is its current at t = 0 for transient (default 0). For coupled coils, the dot is at the from node.",
			Example:   "inductor(\"L1\", \"a\", \"0\", 22 uH)",
			Reference: refCircuits,
		}, passivePart("inductor", circuit.Inductor, dimHenry, "inductor", "current", dimCurrent)),
		fnc("capacitor", []string{"name", "from", "to", "C", "v0"}, 4, 5, &runtime.Help{
			Signature: "capacitor(name: text, from: node, to: node, C: F[, v0: V at t = 0]) -> circuit part",
			Summary:   "A capacitor between two nodes; v0 is its voltage (from minus to) at t = 0 for transient (default 0).",
			Example:   "capacitor(\"C1\", \"a\", \"0\", 100 nF)",
			Reference: refCircuits,
		}, passivePart("capacitor", circuit.Capacitor, dimFarad, "capacitor", "voltage", dimVolt)),
		fnc("voltage_source", []string{"name", "plus", "minus", "V"}, 4, 4, &runtime.Help{
			Signature: "voltage_source(name: text, plus: node, minus: node, V: V peak phasor (real or complex), or a function of time returning V) -> circuit part",
			Summary:   "An ideal voltage source: V(plus) − V(minus) = V. For ac_solve, V is the peak phasor (polar(10 V, 30 deg) is 10 V·cos(ωt + 30°); a real value has phase 0); for transient, a function of time (or a constant).",
			Example:   "voltage_source(\"V1\", \"in\", \"0\", polar(10 V, 0 deg))",
			Reference: refCircuits,
		}, sourcePart("voltage_source", circuit.VoltageSource, dimVolt, "voltage source")),
		fnc("current_source", []string{"name", "from", "to", "I"}, 4, 4, &runtime.Help{
			Signature: "current_source(name: text, from: node, to: node, I: A peak phasor (real or complex), or a function of time returning A) -> circuit part",
			Summary:   "An ideal current source driving I through itself from → to (into the to node); peak phasor for ac_solve, a function of time (or a constant) for transient.",
			Example:   "current_source(\"I1\", \"0\", \"a\", 2 mA)",
			Reference: refCircuits,
		}, sourcePart("current_source", circuit.CurrentSource, dimCurrent, "current source")),
		fnc("coupled", []string{"L1", "L2", "M_or_k"}, 3, 3, &runtime.Help{
			Signature: "coupled(L1: inductor name, L2: inductor name, M: H, or k: plain number from -1 to 1) -> circuit part",
			Summary:   "Magnetic coupling between two inductors of the circuit, by mutual inductance M (from geometry: mutual(path1, path2)) or coupling coefficient k (M = k·√(L1·L2)). With the dots at each inductor's from node, a positive M aids.",
			Example:   "coupled(\"L1\", \"L2\", 0.12)",
			Reference: refCircuits,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "coupled"
			a, err := nameArg(fn, "first inductor's name", args, 0)
			if err != nil {
				return nil, err
			}
			b, err := nameArg(fn, "second inductor's name", args, 1)
			if err != nil {
				return nil, err
			}
			if a == b {
				return nil, errorf("%s: an inductor cannot be coupled to itself (%q)", fn, a)
			}
			q, err := quantity(fn, args, 2)
			if err != nil {
				return nil, err
			}
			p := &Part{couple: true, a: a, b: b}
			switch q.D {
			case dimHenry:
				p.m = q.V
			case runtime.Dimensionless:
				if math.Abs(q.V) > 1 {
					return nil, errorf("%s: a coupling coefficient k is from -1 to 1, not %s", fn, runtime.FormatNumber(q.V, 6))
				}
				p.k, p.kGiven = q.V, true
			default:
				return nil, errorf("%s: the third argument is a mutual inductance (H) or a coupling coefficient (plain number), not %s", fn, q.D.Describe())
			}
			return p, nil
		}),
		fnc("circuit", []string{"part", "..."}, 1, -1, &runtime.Help{
			Signature: "circuit(part, part, ...) -> circuit",
			Summary:   "A linear circuit from its parts (resistor, inductor, capacitor, voltage_source, current_source, coupled). Node \"0\" is ground; every node needs a path to ground. A statement may continue over several lines inside the brackets.",
			Method:    "checks names, values, couplings (|M| ≤ √(L1·L2), and the inductance matrix of three or more coils), and loops of voltage sources or cut-sets of current sources, naming the parts involved",
			Example:   "circuit(voltage_source(\"V1\", \"in\", \"0\", 10 V), resistor(\"R1\", \"in\", \"0\", 50 ohm))",
			Reference: refCircuits,
		}, buildCircuit),
		fnc("ac_solve", []string{"circuit", "f"}, 2, 2, &runtime.Help{
			Signature: "ac_solve(circuit, f: Hz) -> AC solution",
			Summary:   "The sinusoidal steady state at frequency f, every source at f with its peak phasor. Shows each element's voltage and current (peak, polar) and average power absorbed (a delivering source is negative); read values with element_current, element_voltage, element_power, node_voltage, input_impedance.",
			Method:    "modified nodal analysis, the complex system solved as a real one of twice the size by gonum's LU with row and column scaling; refused as singular above a condition estimate of 1e13 (relative error about condition·1e-16); the tests agree with closed forms (dividers, series RLC, coupled coils, reflected impedance) to 1e-12",
			Example:   acExample,
			Reference: refCircuits,
		}, func(args []runtime.Value) (runtime.Value, error) {
			n, err := networkArg("ac_solve", args, 0)
			if err != nil {
				return nil, err
			}
			f, err := frequencyArg("ac_solve", args, 1)
			if err != nil {
				return nil, err
			}
			for _, e := range n.c.Elements {
				if fn, ok := n.parts[e.Name].src.(*runtime.Func); ok {
					return nil, errorf("ac_solve: the source %s is a function of time (%s); for ac_solve give its peak phasor, such as polar(10 V, 30 deg)", e.Name, fn.Signature())
				}
			}
			sol, err := n.c.AC(f)
			if err != nil {
				return nil, errorf("ac_solve: %v", err)
			}
			return &ACResult{net: n, sol: sol}, nil
		}),
		fncEnv("transient", []string{"circuit", "t_end", "n"}, 2, 3, &runtime.Help{
			Signature: "transient(circuit, t_end: s[, n: whole number, default 201]) -> table",
			Summary:   "Follows the circuit in time from t = 0 (capacitors at their v0, inductors at their i0, default 0) to t_end, with sources as functions of time (a constant source is switched on at t = 0): a table of n evenly spaced instants with every element's current (I R1, …; from → to) and every inductor's and capacitor's voltage (V C1, …). A circuit that starts with more than 20 J stored, or a capacitor above 120 V, carries a caution.",
			Method:    "state equations (inductor currents, capacitor voltages; the resistive network solved at each instant by modified nodal analysis), integrated by Radau IIA of order 5 with error control (relative 1e-8, absolute 1e-12 in A and V) and dense output; stiff circuits are cheap. The tests agree with the closed forms of an RL step and of series RLC circuits (under-, critically and over-damped) within 1e-7 of the peak, and the energy balance holds within 1e-7 of the stored energy. The last row, num. error, bounds each column's numerical error: twice the change from a second solve at 100× tighter tolerances (the tests find it above the actual error in all four closed-form cases); it costs that second solve",
			Example:   "net = circuit(capacitor(\"C1\", \"a\", \"0\", 100 uF, 50 V), resistor(\"R1\", \"a\", \"b\", 0.5 ohm), inductor(\"L1\", \"b\", \"0\", 200 uH))\nt = transient(net, 2 ms, 5)\nt",
			Reference: refTransient,
		}, transientBuiltin),
		acRead("element_current", "A", dimCurrent, "The current through an element (from its from node to its to node), a peak phasor.", func(s *circuit.ACSolution, name string) (runtime.Value, error) {
			i, err := s.Current(name)
			return runtime.Complex{V: i, D: dimCurrent}, err
		}),
		acRead("element_voltage", "V", dimVolt, "The voltage across an element, V(from) − V(to), a peak phasor.", func(s *circuit.ACSolution, name string) (runtime.Value, error) {
			v, err := s.ElementVoltage(name)
			return runtime.Complex{V: v, D: dimVolt}, err
		}),
		acRead("node_voltage", "V", dimVolt, "The voltage of a node against ground (\"0\"), a peak phasor.", func(s *circuit.ACSolution, name string) (runtime.Value, error) {
			v, err := s.Voltage(name)
			return runtime.Complex{V: v, D: dimVolt}, err
		}),
		acRead("element_power", "W", dimWatt, "The average power an element absorbs, ½·Re(V·I*) of its peak phasors; a source that delivers power gives a negative value, so efficiency is element_power(sol, \"Rload\") / -element_power(sol, \"V1\").", func(s *circuit.ACSolution, name string) (runtime.Value, error) {
			if _, err := s.Power(name); err != nil {
				return nil, err
			}
			return runtime.Quantity{V: elementPower(s, name), D: dimWatt}, nil
		}),
		acRead("input_impedance", "ohm", dimOhm, "The impedance the network presents to a source (its voltage over the current it drives, with every other source set to zero).", func(s *circuit.ACSolution, name string) (runtime.Value, error) {
			z, err := s.InputImpedance(name)
			return runtime.Complex{V: z, D: dimOhm}, err
		}),
	}
}

// acRead makes a builtin that reads one value of an AC solution by the
// name of an element or node.
func acRead(fn, unit string, d runtime.Dim, summary string, read func(*circuit.ACSolution, string) (runtime.Value, error)) *runtime.Func {
	complexOut := fn != "element_power"
	result := "complex " + unit + " (peak phasor)"
	if !complexOut {
		result = unit + " (average)"
	}
	what := "element"
	if fn == "node_voltage" {
		what = "node"
	} else if fn == "input_impedance" {
		what = "source"
	}
	example := map[string]string{"element": "\"R1\"", "node": "\"a\"", "source": "\"V1\""}[what]
	return fnc(fn, []string{"solution", what + "_name"}, 2, 2, &runtime.Help{
		Signature: fmt.Sprintf("%s(solution: from ac_solve, %s: name) -> %s", fn, what, result),
		Summary:   summary,
		Example:   "sol = ac_solve(circuit(voltage_source(\"V1\", \"in\", \"0\", 10 V), resistor(\"R1\", \"in\", \"a\", 5 ohm), capacitor(\"C1\", \"a\", \"0\", 1 uF)), 10 kHz)\n" + fn + "(sol, " + example + ")",
		Reference: refCircuits,
	}, func(args []runtime.Value) (runtime.Value, error) {
		r, err := acResultArg(fn, args, 0)
		if err != nil {
			return nil, err
		}
		name, err := nameArg(fn, what+"'s name", args, 1)
		if err != nil {
			return nil, err
		}
		v, err := read(r.sol, name)
		if err != nil {
			return nil, errorf("%s: %v", fn, err)
		}
		return v, nil
	})
}

// elementPower is the average power an element absorbs, with rounding
// noise removed: a power below 1e-12 of the element's volt-amperes
// |V||I|/2 (an inductor's or capacitor's, which is zero in exact
// arithmetic) is shown as 0.
func elementPower(s *circuit.ACSolution, name string) float64 {
	p, err := s.Power(name)
	if err != nil {
		return 0
	}
	v, _ := s.ElementVoltage(name)
	i, _ := s.Current(name)
	if math.Abs(p) < 1e-12*cmplx.Abs(v)*cmplx.Abs(i)/2 {
		return 0
	}
	return p
}
