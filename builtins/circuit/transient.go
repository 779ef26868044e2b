package circuit

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// State is one state variable of a StateSystem: the current of an
// inductor (A, From→To) or the voltage of a capacitor (V, V(From) − V(To)).
type State struct {
	Element string
	Kind    Kind   // Inductor or Capacitor
	Unit    string // "A" or "V"
}

// StateSystem is the time-domain state equations dy/dt = F(t, y) of a
// circuit. The state y holds the inductor currents (in element order)
// followed by the capacitor voltages (in element order); States names
// them. The sources are the caller's functions of time. F and At only read
// the system and may be called from several goroutines.
type StateSystem struct {
	States []State

	c      Circuit
	index  map[string]int
	lay    *layout
	fac    *factored
	src    func(name string, t float64) float64
	nL     int
	chol   *mat.Cholesky // inductance matrix, nil without inductors
	caps   []float64     // capacitances, in state order
	stateL map[string]int
	stateC map[string]int
	lNodes [][2]int // unknown indices of each inductor's From and To (−1: ground), in state order
}

// StateEquations builds the time-domain state equations. src gives the
// instantaneous value of each source at time t (V for a voltage source,
// held as V(From) − V(To); A for a current source, From→To); it may be nil
// for a circuit without sources. The Phasor fields are not used.
//
// Besides Check, the time domain needs independent states: no loop of
// capacitors, voltage sources and 0-ohm resistors (their voltages would be
// tied), no group of nodes joined to the rest only through inductors and
// current sources (their currents would be tied), and a positive definite
// inductance matrix (no pair of coils with k = 1). Each is refused with a
// message that names the elements.
func (c *Circuit) StateEquations(src func(name string, t float64) float64) (*StateSystem, error) {
	if err := c.Check(); err != nil {
		return nil, err
	}
	cc := Circuit{Elements: append([]Element(nil), c.Elements...), Couplings: append([]Coupling(nil), c.Couplings...), Ground: c.Ground}
	if err := cc.checkTopology(all, isVoltageLike(true), isCurrentLike(true)); err != nil {
		return nil, fmt.Errorf("in the time domain, %s", err)
	}
	s := &StateSystem{c: cc, index: cc.index(), src: src, stateL: map[string]int{}, stateC: map[string]int{}}
	for _, e := range cc.Elements {
		if (e.Kind == VoltageSource || e.Kind == CurrentSource) && src == nil {
			return nil, fmt.Errorf("%s %s needs a value over time, but no source function was given", e.Kind, e.Name)
		}
		if e.Kind == Inductor {
			s.stateL[e.Name] = len(s.States)
			s.States = append(s.States, State{Element: e.Name, Kind: Inductor, Unit: "A"})
		}
	}
	s.nL = len(s.States)
	for _, e := range cc.Elements {
		if e.Kind == Capacitor {
			s.stateC[e.Name] = len(s.States)
			s.States = append(s.States, State{Element: e.Name, Kind: Capacitor, Unit: "V"})
			s.caps = append(s.caps, e.Value)
		}
	}
	if len(s.States) == 0 {
		return nil, fmt.Errorf("the circuit has no inductors or capacitors: it has no state to follow in time")
	}
	if l, names := cc.inductanceMatrix(); l != nil {
		var ch mat.Cholesky
		if ok := ch.Factorize(l); !ok || !(ch.Cond() <= maxCond) {
			return nil, fmt.Errorf("in the time domain, the inductance matrix of %s cannot be inverted: %s; use k < 1",
				strings.Join(names, ", "), strongest(&cc))
		}
		s.chol = &ch
	}

	// The resistive network: inductors and current sources inject known
	// currents; capacitors, voltage sources and shorts are branch
	// equations with known voltages.
	s.lay = newLayout(&cc, isVoltageLike(true))
	for _, st := range s.States[:s.nL] {
		e, _ := cc.element(st.Element)
		s.lNodes = append(s.lNodes, [2]int{s.lay.idx(e.From), s.lay.idx(e.To)})
	}
	n := s.lay.size
	a := mat.NewDense(n, n, nil)
	add := func(i, j int, v float64) {
		if i >= 0 && j >= 0 {
			a.Set(i, j, a.At(i, j)+v)
		}
	}
	for _, e := range cc.Elements {
		p, q := s.lay.idx(e.From), s.lay.idx(e.To)
		if k, ok := s.lay.branch[e.Name]; ok {
			add(p, k, 1)
			add(q, k, -1)
			add(k, p, 1)
			add(k, q, -1)
		} else if e.Kind == Resistor {
			g := 1 / e.Value
			add(p, p, g)
			add(q, q, g)
			add(p, q, -g)
			add(q, p, -g)
		}
	}
	s.fac = factor(a)
	if s.fac.singular() {
		return nil, fmt.Errorf("in the time domain, the resistive network (inductors as current sources, capacitors as voltage sources) is singular (condition estimate %.3g); likely cause: element values spanning too many orders of magnitude", s.fac.cond)
	}
	return s, nil
}

// strongest describes the most strongly coupled pair.
func strongest(c *Circuit) string {
	best, desc := -1.0, "the couplings are too strong"
	for _, cp := range c.Couplings {
		a, _ := c.element(cp.A)
		b, _ := c.element(cp.B)
		if k := math.Abs(cp.M) / math.Sqrt(a.Value*b.Value); k > best {
			best = k
			desc = fmt.Sprintf("%s and %s are coupled with k = %.12g, so their currents are not independent", cp.A, cp.B, k)
		}
	}
	return desc
}

// Cond is the larger of the condition estimates of the resistive network
// (equilibrated) and of the inductance matrix: derivatives carry a
// relative error of about Cond·1.1e-16.
func (s *StateSystem) Cond() float64 {
	c := s.fac.cond
	if s.chol != nil {
		c = math.Max(c, s.chol.Cond())
	}
	return c
}

// Dim is the number of states.
func (s *StateSystem) Dim() int { return len(s.States) }

// Instant is the whole circuit at one time, from a state.
type Instant struct {
	T   float64
	sys *StateSystem
	y   []float64
	x   []float64
	src map[string]float64
}

// At solves the resistive network at time t with state y and returns every
// node voltage and element current at that instant.
func (s *StateSystem) At(t float64, y []float64) (*Instant, error) {
	if len(y) != len(s.States) {
		return nil, fmt.Errorf("the state has %d values; the circuit has %d states", len(y), len(s.States))
	}
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("state %d (%s %s) is not finite at t = %g s", i+1, s.States[i].Element, s.States[i].Unit, t)
		}
	}
	in := &Instant{T: t, sys: s, y: append([]float64(nil), y...), src: map[string]float64{}}
	b := make([]float64, s.lay.size)
	inject := func(e Element, j float64) {
		if p := s.lay.idx(e.From); p >= 0 {
			b[p] -= j
		}
		if q := s.lay.idx(e.To); q >= 0 {
			b[q] += j
		}
	}
	for _, e := range s.c.Elements {
		switch e.Kind {
		case VoltageSource, CurrentSource:
			v := s.src(e.Name, t)
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, fmt.Errorf("%s %s has no finite value at t = %g s (%g)", e.Kind, e.Name, t, v)
			}
			in.src[e.Name] = v
			if e.Kind == VoltageSource {
				b[s.lay.branch[e.Name]] = v
			} else {
				inject(e, v)
			}
		case Inductor:
			inject(e, y[s.stateL[e.Name]])
		case Capacitor:
			b[s.lay.branch[e.Name]] = y[s.stateC[e.Name]]
		}
	}
	x, err := s.fac.solve(b)
	if err != nil {
		return nil, fmt.Errorf("solving the circuit at t = %g s: %v", t, err)
	}
	if !allFinite(x) {
		return nil, fmt.Errorf("the circuit's voltages or currents at t = %g s are too large to represent: the values are out of range", t)
	}
	in.x = x
	return in, nil
}

// F writes dy/dt at time t and state y into dy: di_L/dt = L⁻¹·v_L and
// dv_C/dt = i_C / C.
func (s *StateSystem) F(t float64, y, dy []float64) error {
	if len(dy) != len(s.States) {
		return fmt.Errorf("the derivative has room for %d values; the circuit has %d states", len(dy), len(s.States))
	}
	in, err := s.At(t, y)
	if err != nil {
		return err
	}
	if s.nL > 0 {
		vl := mat.NewVecDense(s.nL, nil)
		for i, pq := range s.lNodes {
			vl.SetVec(i, in.at(pq[0])-in.at(pq[1]))
		}
		var di mat.VecDense
		if err := s.chol.SolveVecTo(&di, vl); err != nil {
			if _, ok := err.(mat.Condition); !ok {
				return fmt.Errorf("solving for the inductor currents' rates at t = %g s: %v", t, err)
			}
		}
		for i := 0; i < s.nL; i++ {
			dy[i] = di.AtVec(i)
		}
		if !allFinite(dy[:s.nL]) {
			return fmt.Errorf("the inductor currents' rates at t = %g s are too large to represent: the values are out of range", t)
		}
	}
	for j, st := range s.States[s.nL:] {
		dy[s.nL+j] = in.x[s.lay.branch[st.Element]] / s.caps[j]
	}
	if !allFinite(dy) {
		return fmt.Errorf("the capacitor voltages' rates at t = %g s are too large to represent: the values are out of range", t)
	}
	return nil
}

func (in *Instant) v(n string) float64 { return in.at(in.sys.lay.idx(n)) }

// at is unknown i of the solution, 0 for ground (−1).
func (in *Instant) at(i int) float64 {
	if i >= 0 {
		return in.x[i]
	}
	return 0
}

// Voltage is the voltage of node against ground (V).
func (in *Instant) Voltage(node string) (float64, error) {
	if node == in.sys.lay.ground {
		return 0, nil
	}
	if _, ok := in.sys.lay.node[node]; !ok {
		return 0, fmt.Errorf("the circuit has no node %q", node)
	}
	return in.v(node), nil
}

// ElementVoltage is V(From) − V(To) of element (V).
func (in *Instant) ElementVoltage(element string) (float64, error) {
	i, ok := in.sys.index[element]
	if !ok {
		return 0, fmt.Errorf("the circuit has no element %q", element)
	}
	e := in.sys.c.Elements[i]
	return finiteF(in.v(e.From)-in.v(e.To), "voltage", element)
}

// Current is the current through element, From→To (A).
func (in *Instant) Current(element string) (float64, error) {
	i, ok := in.sys.index[element]
	if !ok {
		return 0, fmt.Errorf("the circuit has no element %q", element)
	}
	e := in.sys.c.Elements[i]
	if k, ok := in.sys.lay.branch[e.Name]; ok {
		return in.x[k], nil
	}
	switch e.Kind {
	case Resistor:
		return finiteF((in.v(e.From)-in.v(e.To))/e.Value, "current", element)
	case Inductor:
		return in.y[in.sys.stateL[e.Name]], nil
	case CurrentSource:
		return in.src[e.Name], nil
	}
	return 0, fmt.Errorf("no current for %s %s", e.Kind, e.Name) // not reached: every kind is handled above
}
