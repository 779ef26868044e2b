package circuit

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// Kind is the kind of a circuit element.
type Kind int

// The element kinds. The zero Kind is not a kind, so an Element whose Kind
// was forgotten is refused by Check.
const (
	Resistor      Kind = iota + 1 // Value in ohm (0 is a short)
	Inductor                      // Value in H
	Capacitor                     // Value in F
	VoltageSource                 // Phasor: V(From) − V(To), peak V
	CurrentSource                 // Phasor: current From→To through it, peak A
)

// String is the kind's name as messages use it.
func (k Kind) String() string {
	switch k {
	case Resistor:
		return "resistor"
	case Inductor:
		return "inductor"
	case Capacitor:
		return "capacitor"
	case VoltageSource:
		return "voltage source"
	case CurrentSource:
		return "current source"
	}
	return fmt.Sprintf("kind %d", int(k))
}

// Element is one two-terminal element. Its current flows From→To through
// it and its voltage is V(From) − V(To).
type Element struct {
	Name     string
	Kind     Kind
	From, To string     // node names
	Value    float64    // resistance (ohm, ≥ 0), inductance (H, > 0) or capacitance (F, > 0); 0 for sources
	Phasor   complex128 // sources only: peak phasor of the AC value (V or A); 0 for R, L and C
}

// Coupling is a mutual inductance M (H) between the inductors named A and
// B. M may be negative; |M| ≤ √(L_A·L_B).
type Coupling struct {
	A, B string
	M    float64
}

// Circuit is a linear lumped circuit.
type Circuit struct {
	Elements  []Element
	Couplings []Coupling
	Ground    string // name of the reference node; "" means "0"
}

// GroundNode is the name of the reference node: c.Ground, or "0".
func (c *Circuit) GroundNode() string {
	if c.Ground == "" {
		return "0"
	}
	return c.Ground
}

// coupleTol is the relative slack allowed when |M| is compared with
// √(L1·L2): M computed as k·√(L1·L2) with k = 1 may exceed the square root
// by a few roundings.
const coupleTol = 8 * 0x1p-53

// Check reports the first problem that would make the circuit meaningless
// or its equations singular for every frequency: names missing or
// repeated, unknown kinds, an element with both ends on one node, values
// out of range or not finite, nodes without a path to ground, couplings
// between unknown or identical inductors or stronger than k = 1 (or, for
// three or more coupled coils, an inductance matrix that is not positive
// semidefinite), loops made only of voltage sources and 0-ohm resistors,
// and groups of nodes joined to the rest only through current sources.
// Each message names the elements or nodes involved.
func (c *Circuit) Check() error {
	if len(c.Elements) == 0 {
		return fmt.Errorf("the circuit has no elements")
	}
	g := c.GroundNode()
	seen := map[string]int{}
	touchesGround := false
	for i, e := range c.Elements {
		if strings.TrimSpace(e.Name) == "" {
			return fmt.Errorf("element %d (from %q to %q) has no name", i+1, e.From, e.To)
		}
		if j, ok := seen[e.Name]; ok {
			return fmt.Errorf("two elements are named %q (elements %d and %d)", e.Name, j+1, i+1)
		}
		seen[e.Name] = i
		if err := checkElement(e); err != nil {
			return err
		}
		if e.From == g || e.To == g {
			touchesGround = true
		}
	}
	if !touchesGround {
		return fmt.Errorf("no element is connected to the ground node %q", g)
	}
	if err := c.checkCouplings(); err != nil {
		return err
	}
	if err := c.checkTopology(all, isVoltageLike(false), isCurrentLike(false)); err != nil {
		return err
	}
	return nil
}

// CheckElement checks one element on its own: its nodes, its kind and its
// value (Check does this for every element, and the topology besides).
func CheckElement(e Element) error { return checkElement(e) }

func checkElement(e Element) error {
	what := fmt.Sprintf("%s %s", e.Kind, e.Name)
	if e.From == "" || e.To == "" {
		return fmt.Errorf("%s: both nodes must be named (from %q to %q)", what, e.From, e.To)
	}
	if e.From == e.To {
		return fmt.Errorf("%s: both ends are on node %q", what, e.From)
	}
	switch e.Kind {
	case Resistor, Inductor, Capacitor:
		if e.Phasor != 0 {
			return fmt.Errorf("%s: only sources take a phasor; give its value in Value", what)
		}
		if math.IsNaN(e.Value) || math.IsInf(e.Value, 0) {
			return fmt.Errorf("%s: value is not a finite number (%g)", what, e.Value)
		}
	case VoltageSource, CurrentSource:
		if e.Value != 0 {
			return fmt.Errorf("%s: a source takes its amplitude as a phasor; Value is for resistors, inductors and capacitors", what)
		}
		if cmplx.IsNaN(e.Phasor) || cmplx.IsInf(e.Phasor) {
			return fmt.Errorf("%s: phasor is not finite (%v)", what, e.Phasor)
		}
		return nil
	default:
		return fmt.Errorf("element %s: unknown kind %d (use Resistor, Inductor, Capacitor, VoltageSource or CurrentSource)", e.Name, int(e.Kind))
	}
	switch {
	case e.Kind == Resistor && e.Value < 0:
		return fmt.Errorf("%s: resistance must be ≥ 0 ohm, got %g ohm", what, e.Value)
	case e.Kind == Inductor && e.Value <= 0:
		return fmt.Errorf("%s: inductance must be > 0 H, got %g H", what, e.Value)
	case e.Kind == Capacitor && e.Value == 0:
		return fmt.Errorf("%s: a capacitance of 0 F is an open circuit; leave the capacitor out", what)
	case e.Kind == Capacitor && e.Value < 0:
		return fmt.Errorf("%s: capacitance must be > 0 F, got %g F", what, e.Value)
	}
	return nil
}

// index maps each element's name to its position (names are unique once
// Check has passed).
func (c *Circuit) index() map[string]int {
	m := make(map[string]int, len(c.Elements))
	for i, e := range c.Elements {
		m[e.Name] = i
	}
	return m
}

// element returns the element named name.
func (c *Circuit) element(name string) (Element, bool) {
	for _, e := range c.Elements {
		if e.Name == name {
			return e, true
		}
	}
	return Element{}, false
}

func (c *Circuit) checkCouplings() error {
	pairs := map[[2]string]bool{}
	for _, cp := range c.Couplings {
		label := fmt.Sprintf("coupling %s–%s", cp.A, cp.B)
		if cp.A == cp.B {
			return fmt.Errorf("%s: an inductor cannot be coupled with itself (its self inductance is its value)", label)
		}
		var ls [2]float64
		for i, n := range []string{cp.A, cp.B} {
			e, ok := c.element(n)
			if !ok {
				return fmt.Errorf("%s: there is no element named %q", label, n)
			}
			if e.Kind != Inductor {
				return fmt.Errorf("%s: %s is a %s; only inductors can be coupled", label, n, e.Kind)
			}
			ls[i] = e.Value
		}
		key := [2]string{cp.A, cp.B}
		if cp.B < cp.A {
			key = [2]string{cp.B, cp.A}
		}
		if pairs[key] {
			return fmt.Errorf("%s: the pair is coupled twice; give one mutual inductance", label)
		}
		pairs[key] = true
		if math.IsNaN(cp.M) || math.IsInf(cp.M, 0) {
			return fmt.Errorf("%s: mutual inductance is not a finite number (%g)", label, cp.M)
		}
		lim := math.Sqrt(ls[0] * ls[1])
		if math.Abs(cp.M) > lim*(1+coupleTol) {
			return fmt.Errorf("%s: |M| = %g H exceeds √(L_%s·L_%s) = %g H (coupling coefficient k = %.6g > 1)",
				label, math.Abs(cp.M), cp.A, cp.B, lim, math.Abs(cp.M)/lim)
		}
	}
	return c.checkInductanceMatrix()
}

// inductanceMatrix is the symmetric matrix of self and mutual inductances
// of the inductors, in element order, with their names.
func (c *Circuit) inductanceMatrix() (*mat.SymDense, []string) {
	var names []string
	idx := map[string]int{}
	var vals []float64
	for _, e := range c.Elements {
		if e.Kind == Inductor {
			idx[e.Name] = len(names)
			names = append(names, e.Name)
			vals = append(vals, e.Value)
		}
	}
	if len(names) == 0 {
		return nil, nil
	}
	l := mat.NewSymDense(len(names), nil)
	for i, v := range vals {
		l.SetSym(i, i, v)
	}
	for _, cp := range c.Couplings {
		l.SetSym(idx[cp.A], idx[cp.B], cp.M)
	}
	return l, names
}

// checkInductanceMatrix refuses couplings among three or more coils that no
// real set of coils can have: the magnetic energy ½·Iᵀ·L·I must be ≥ 0 for
// every set of currents, so L must be positive semidefinite. Pairwise
// k ≤ 1 (checked before) is not enough for three coils (k12 = k13 = 1 with
// k23 = −1 passes pairwise).
func (c *Circuit) checkInductanceMatrix() error {
	if len(c.Couplings) < 2 {
		return nil // one pair: k ≤ 1 is the whole condition
	}
	l, names := c.inductanceMatrix()
	// Work on the matrix scaled to unit diagonal (the coupling
	// coefficients), so that the eigenvalue test is independent of the
	// sizes of the inductances.
	n := len(names)
	k := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			k.SetSym(i, j, l.At(i, j)/math.Sqrt(l.At(i, i)*l.At(j, j)))
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(k, false) {
		return fmt.Errorf("couplings: the eigenvalues of the coupling matrix could not be computed")
	}
	vals := eig.Values(nil)
	// A symmetric eigensolver's error is about n·eps times the largest
	// eigenvalue, which is at most n for a matrix with unit diagonal and
	// off-diagonal entries of at most 1; allow 100 times that below zero,
	// so that couplings at k = 1 exactly (a semidefinite matrix) pass.
	if tol := 100 * float64(n) * 0x1p-52 * float64(n); vals[0] < -tol {
		var coupled []string
		for _, cp := range c.Couplings {
			coupled = append(coupled, cp.A, cp.B)
		}
		return fmt.Errorf("couplings among %s are not physically possible: for some currents the stored energy ½·Iᵀ·L·I would be negative (the inductance matrix has eigenvalue %.3g in units of the self inductances)",
			strings.Join(uniq(coupled), ", "), vals[0])
	}
	return nil
}

func uniq(s []string) []string {
	var out []string
	seen := map[string]bool{}
	for _, x := range s {
		if !seen[x] {
			seen[x] = true
			out = append(out, x)
		}
	}
	return out
}

// all selects every element.
func all(Element) bool { return true }

// isVoltageLike selects the elements that fix the voltage between their
// nodes: voltage sources and 0-ohm resistors, and in the time domain
// capacitors (whose voltage is a state).
func isVoltageLike(timeDomain bool) func(Element) bool {
	return func(e Element) bool {
		return e.Kind == VoltageSource || (e.Kind == Resistor && e.Value == 0) || (timeDomain && e.Kind == Capacitor)
	}
}

// isCurrentLike selects the elements that fix their current: current
// sources, and in the time domain inductors (whose current is a state).
func isCurrentLike(timeDomain bool) func(Element) bool {
	return func(e Element) bool {
		return e.Kind == CurrentSource || (timeDomain && e.Kind == Inductor)
	}
}

// unionFind joins nodes.
type unionFind map[string]string

func (u unionFind) find(x string) string {
	for {
		p, ok := u[x]
		if !ok || p == x {
			return x
		}
		if gp, ok := u[p]; ok {
			u[x] = gp
		}
		x = p
	}
}

func (u unionFind) union(a, b string) bool {
	ra, rb := u.find(a), u.find(b)
	if ra == rb {
		return false
	}
	u[ra] = rb
	return true
}

// nodes lists the circuit's nodes in order of first appearance.
func (c *Circuit) nodes() []string {
	var out []string
	seen := map[string]bool{}
	for _, e := range c.Elements {
		for _, n := range []string{e.From, e.To} {
			if !seen[n] {
				seen[n] = true
				out = append(out, n)
			}
		}
	}
	return out
}

// checkTopology finds, among the elements selected by use: nodes with no
// path to ground; loops made only of voltage-like elements; and groups of
// nodes joined to the rest only through current-like elements.
func (c *Circuit) checkTopology(use, voltageLike, currentLike func(Element) bool) error {
	g := c.GroundNode()
	nodes := c.nodes()

	// Floating parts.
	uf := unionFind{}
	for _, e := range c.Elements {
		if use(e) {
			uf.union(e.From, e.To)
		}
	}
	if float := c.cutOff(nodes, uf, g); float != nil {
		return fmt.Errorf("node%s %s %s no conductive path to the ground node %q (through %s); connect one of them to ground (coils coupled only magnetically still need one)",
			plural(len(float.nodes)), quoteList(float.nodes), hasHave(len(float.nodes)), g, strings.Join(float.elements, ", "))
	}

	// Loops of voltage-like elements: joining two nodes already joined
	// closes a loop, which the path between them in the forest so far
	// completes.
	var forest []Element
	uf = unionFind{}
	for _, e := range c.Elements {
		if !use(e) || !voltageLike(e) {
			continue
		}
		if !uf.union(e.From, e.To) {
			loop := append(forestPath(forest, e.From, e.To), e.Name)
			return fmt.Errorf("%s form a loop that fixes the voltage around it: the equations are singular (add a resistance in the loop)", describeAll(c, loop))
		}
		forest = append(forest, e)
	}

	// Cut-sets of current-like elements: without them, some nodes lose
	// their path to ground.
	uf = unionFind{}
	for _, e := range c.Elements {
		if use(e) && !currentLike(e) {
			uf.union(e.From, e.To)
		}
	}
	if cut := c.cutOff(nodes, uf, g); cut != nil {
		var through []string
		in := map[string]bool{}
		for _, n := range cut.nodes {
			in[n] = true
		}
		for _, e := range c.Elements {
			if use(e) && currentLike(e) && in[e.From] != in[e.To] {
				through = append(through, e.Name)
			}
		}
		return fmt.Errorf("node%s %s %s joined to the rest of the circuit only through %s, which %s the current into %s: the equations are singular (add a resistance from %s to the rest)",
			plural(len(cut.nodes)), quoteList(cut.nodes), isAre(len(cut.nodes)), describeAll(c, through), fixFixes(len(through)), themIt(len(cut.nodes)), themIt(len(cut.nodes)))
	}
	return nil
}

type part struct{ nodes, elements []string }

// cutOff returns the nodes (and the elements among them) of the first
// group that uf does not join to ground, or nil.
func (c *Circuit) cutOff(nodes []string, uf unionFind, g string) *part {
	root := uf.find(g)
	var first string
	for _, n := range nodes {
		if uf.find(n) != root {
			first = uf.find(n)
			break
		}
	}
	if first == "" {
		return nil
	}
	p := &part{}
	in := map[string]bool{}
	for _, n := range nodes {
		if uf.find(n) == first {
			p.nodes = append(p.nodes, n)
			in[n] = true
		}
	}
	for _, e := range c.Elements {
		if in[e.From] || in[e.To] {
			p.elements = append(p.elements, e.Name)
		}
	}
	return p
}

// forestPath returns the names of the elements on the path from a to b in
// a forest (a and b are known to be joined).
func forestPath(forest []Element, a, b string) []string {
	type step struct {
		node, via, prev string
	}
	adj := map[string][]Element{}
	for _, e := range forest {
		adj[e.From] = append(adj[e.From], e)
		adj[e.To] = append(adj[e.To], e)
	}
	prev := map[string]step{a: {node: a}}
	queue := []string{a}
	for len(queue) > 0 {
		n := queue[0]
		queue = queue[1:]
		if n == b {
			break
		}
		for _, e := range adj[n] {
			m := e.To
			if m == n {
				m = e.From
			}
			if _, ok := prev[m]; !ok {
				prev[m] = step{node: m, via: e.Name, prev: n}
				queue = append(queue, m)
			}
		}
	}
	var path []string
	for n := b; n != a; n = prev[n].prev {
		path = append(path, prev[n].via)
	}
	sort.Strings(path)
	return path
}

// describeAll names elements with their kinds: "voltage source V1 and
// resistor R0 (0 ohm)".
func describeAll(c *Circuit, names []string) string {
	var parts []string
	for _, n := range names {
		e, _ := c.element(n)
		s := e.Kind.String() + " " + n
		if e.Kind == Resistor && e.Value == 0 {
			s += " (0 ohm)"
		}
		parts = append(parts, s)
	}
	switch len(parts) {
	case 0:
		return ""
	case 1:
		return parts[0]
	}
	return strings.Join(parts[:len(parts)-1], ", ") + " and " + parts[len(parts)-1]
}

func quoteList(s []string) string {
	q := make([]string, len(s))
	for i, x := range s {
		q[i] = fmt.Sprintf("%q", x)
	}
	return strings.Join(q, ", ")
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

func hasHave(n int) string {
	if n == 1 {
		return "has"
	}
	return "have"
}

func isAre(n int) string {
	if n == 1 {
		return "is"
	}
	return "are"
}

func themIt(n int) string {
	if n == 1 {
		return "it"
	}
	return "them"
}

func fixFixes(n int) string {
	if n == 1 {
		return "fixes"
	}
	return "fix"
}
