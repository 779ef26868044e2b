package circuit

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/mat"
)

// layout numbers the unknowns of a modified nodal analysis: the node
// voltages (ground excluded) first, then the branch currents of the
// elements that are written as branch equations.
type layout struct {
	ground string
	nodes  []string       // non-ground nodes, in order of appearance
	node   map[string]int // node name → unknown index; ground is absent
	branch map[string]int // element name → unknown index of its current
	size   int
}

func newLayout(c *Circuit, isBranch func(Element) bool) *layout {
	l := &layout{ground: c.GroundNode(), node: map[string]int{}, branch: map[string]int{}}
	for _, n := range c.nodes() {
		if n != l.ground {
			l.node[n] = len(l.nodes)
			l.nodes = append(l.nodes, n)
		}
	}
	l.size = len(l.nodes)
	for _, e := range c.Elements {
		if isBranch(e) {
			l.branch[e.Name] = l.size
			l.size++
		}
	}
	return l
}

// idx is the unknown index of node n, or −1 for ground.
func (l *layout) idx(n string) int {
	if i, ok := l.node[n]; ok {
		return i
	}
	return -1
}

// csys is a dense complex system a·x = b being assembled.
type csys struct {
	n int
	a []complex128
	b []complex128
}

func newCsys(n int) *csys {
	return &csys{n: n, a: make([]complex128, n*n), b: make([]complex128, n)}
}

func (s *csys) add(i, j int, v complex128) {
	if i >= 0 && j >= 0 {
		s.a[i*s.n+j] += v
	}
}

func (s *csys) rhs(i int, v complex128) {
	if i >= 0 {
		s.b[i] += v
	}
}

// admittance stamps y between nodes p and q (indices, −1 for ground).
func (s *csys) admittance(p, q int, y complex128) {
	s.add(p, p, y)
	s.add(q, q, y)
	s.add(p, q, -y)
	s.add(q, p, -y)
}

// branchIncidence stamps a branch current k flowing p→q: it leaves p and
// enters q (KCL rows), and the branch row reads v_p − v_q.
func (s *csys) branchIncidence(p, q, k int) {
	s.add(p, k, 1)
	s.add(q, k, -1)
	s.add(k, p, 1)
	s.add(k, q, -1)
}

// currentSource stamps a known current j flowing p→q through a source.
func currentSource(b []complex128, p, q int, j complex128) {
	if p >= 0 {
		b[p] -= j
	}
	if q >= 0 {
		b[q] += j
	}
}

// maxCond is the largest condition estimate accepted. The relative error
// of a solution is bounded by about cond·eps (eps ≈ 1.1e-16), so 1e13
// leaves at least three significant digits; beyond it the circuit is
// treated as singular.
const maxCond = 1e13

// factored is an LU factorisation of an equilibrated real matrix
// R·A·C, with the row and column scales kept to solve A·x = b.
type factored struct {
	lu   mat.LU
	r, c []float64
	cond float64
}

// factor equilibrates a (rows, then columns, to unit largest magnitude)
// and factorises it. Equilibration is written here because gonum exposes
// no routine for it; it keeps the condition estimate from reflecting only
// the mix of units (siemens in node rows, ohms in inductor rows). The
// matrix must have no zero row or column (callers ensure it by Check).
func factor(a *mat.Dense) *factored {
	n, _ := a.Dims()
	f := &factored{r: make([]float64, n), c: make([]float64, n)}
	for i := 0; i < n; i++ {
		m := 0.0
		for j := 0; j < n; j++ {
			m = math.Max(m, math.Abs(a.At(i, j)))
		}
		f.r[i] = 1
		if m > 0 {
			f.r[i] = 1 / m
		}
	}
	for j := 0; j < n; j++ {
		m := 0.0
		for i := 0; i < n; i++ {
			m = math.Max(m, math.Abs(f.r[i]*a.At(i, j)))
		}
		f.c[j] = 1
		if m > 0 {
			f.c[j] = 1 / m
		}
	}
	s := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			s.Set(i, j, f.r[i]*a.At(i, j)*f.c[j])
		}
	}
	f.lu.Factorize(s)
	f.cond = f.lu.Cond()
	return f
}

func (f *factored) singular() bool {
	return !(f.cond <= maxCond) // also NaN and +Inf
}

// solve returns x with A·x = b.
func (f *factored) solve(b []float64) ([]float64, error) {
	n := len(b)
	rb := mat.NewVecDense(n, nil)
	for i, v := range b {
		rb.SetVec(i, f.r[i]*v)
	}
	var z mat.VecDense
	if err := f.lu.SolveVecTo(&z, false, rb); err != nil {
		if _, ok := err.(mat.Condition); !ok {
			return nil, err
		}
		// A mat.Condition error still carries the solution; the
		// condition was judged against maxCond already.
	}
	x := make([]float64, n)
	for i := range x {
		x[i] = f.c[i] * z.AtVec(i)
	}
	return x, nil
}

// ACSolution is the sinusoidal steady state of a circuit at one
// frequency. Values are peak phasors in SI units. Its methods only read
// it and may be called from several goroutines.
type ACSolution struct {
	freq  float64
	omega float64
	c     Circuit // a copy of the solved circuit
	index map[string]int
	lay   *layout
	fac   *factored
	x     []complex128
}

// AC solves the circuit in sinusoidal steady state at frequency f (Hz,
// finite and > 0), every source at that frequency with its phasor. It
// checks the circuit first (Check) and refuses a circuit whose equations
// are singular or too ill-conditioned at f, naming the likely cause.
func (c *Circuit) AC(f float64) (*ACSolution, error) {
	if !(f > 0) || math.IsInf(f, 0) {
		return nil, fmt.Errorf("the frequency must be finite and > 0 Hz, got %g Hz", f)
	}
	if err := c.Check(); err != nil {
		return nil, err
	}
	cc := Circuit{Elements: append([]Element(nil), c.Elements...), Couplings: append([]Coupling(nil), c.Couplings...), Ground: c.Ground}
	omega := 2 * math.Pi * f
	lay := newLayout(&cc, func(e Element) bool {
		return e.Kind == VoltageSource || e.Kind == Inductor || (e.Kind == Resistor && e.Value == 0)
	})
	s := newCsys(lay.size)
	for _, e := range cc.Elements {
		p, q := lay.idx(e.From), lay.idx(e.To)
		switch e.Kind {
		case Resistor:
			if e.Value == 0 {
				s.branchIncidence(p, q, lay.branch[e.Name])
			} else {
				s.admittance(p, q, complex(1/e.Value, 0))
			}
		case Capacitor:
			s.admittance(p, q, complex(0, omega*e.Value))
		case Inductor:
			k := lay.branch[e.Name]
			s.branchIncidence(p, q, k)
			s.add(k, k, complex(0, -omega*e.Value))
		case VoltageSource:
			s.branchIncidence(p, q, lay.branch[e.Name])
		}
	}
	for _, cp := range cc.Couplings {
		a, b := lay.branch[cp.A], lay.branch[cp.B]
		s.add(a, b, complex(0, -omega*cp.M))
		s.add(b, a, complex(0, -omega*cp.M))
	}
	// The equivalent real system [[A −B],[B A]]·[xr; xi] = [br; bi].
	n := lay.size
	big := mat.NewDense(2*n, 2*n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			v := s.a[i*n+j]
			big.Set(i, j, real(v))
			big.Set(i, j+n, -imag(v))
			big.Set(i+n, j, imag(v))
			big.Set(i+n, j+n, real(v))
		}
	}
	fac := factor(big)
	if fac.singular() {
		return nil, singularAC(&cc, f, fac.cond)
	}
	sol := &ACSolution{freq: f, omega: omega, c: cc, index: cc.index(), lay: lay, fac: fac}
	x, err := sol.solveFor(func(e Element) complex128 { return e.Phasor })
	if err != nil {
		return nil, err
	}
	if !allFinite(rx(x)) {
		return nil, fmt.Errorf("the circuit's voltages or currents at %.6g Hz are too large to represent: the values are out of range", f)
	}
	sol.x = x
	return sol, nil
}

// rx lists the real and imaginary parts of x.
func rx(x []complex128) []float64 {
	out := make([]float64, 0, 2*len(x))
	for _, v := range x {
		out = append(out, real(v), imag(v))
	}
	return out
}

func allFinite(x []float64) bool {
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// solveFor solves with each source at the phasor phasor(e).
func (s *ACSolution) solveFor(phasor func(Element) complex128) ([]complex128, error) {
	n := s.lay.size
	b := make([]complex128, n)
	for _, e := range s.c.Elements {
		switch e.Kind {
		case VoltageSource:
			b[s.lay.branch[e.Name]] += phasor(e)
		case CurrentSource:
			currentSource(b, s.lay.idx(e.From), s.lay.idx(e.To), phasor(e))
		}
	}
	rb := make([]float64, 2*n)
	for i, v := range b {
		rb[i], rb[i+n] = real(v), imag(v)
	}
	rx, err := s.fac.solve(rb)
	if err != nil {
		return nil, fmt.Errorf("solving the circuit at %.6g Hz: %v", s.freq, err)
	}
	x := make([]complex128, n)
	for i := range x {
		x[i] = complex(rx[i], rx[i+n])
	}
	return x, nil
}

// singularAC explains a singular AC system by its most likely cause.
func singularAC(c *Circuit, f, cond float64) error {
	head := fmt.Sprintf("the circuit equations are singular at %.6g Hz (condition estimate %.3g)", f, cond)
	for _, cp := range c.Couplings {
		a, _ := c.element(cp.A)
		b, _ := c.element(cp.B)
		if k := math.Abs(cp.M) / math.Sqrt(a.Value*b.Value); k > 1-1e-9 {
			return fmt.Errorf("%s; likely cause: %s and %s are coupled with k = %.12g, so their currents are not independent when both are held by sources or shorts; use k < 1 or add resistance", head, cp.A, cp.B, k)
		}
	}
	var hasL, hasC bool
	for _, e := range c.Elements {
		hasL = hasL || e.Kind == Inductor
		hasC = hasC || e.Kind == Capacitor
	}
	if hasL && hasC {
		return fmt.Errorf("%s; likely cause: an inductor and a capacitor resonate at this frequency with no resistance to limit the current or voltage; add the coil's resistance", head)
	}
	return fmt.Errorf("%s; likely cause: element values spanning too many orders of magnitude", head)
}

// Frequency is the frequency solved for, in Hz.
func (s *ACSolution) Frequency() float64 { return s.freq }

// Cond is the condition estimate of the solved (equilibrated) system: the
// solution's relative error is bounded by about Cond·1.1e-16.
func (s *ACSolution) Cond() float64 { return s.fac.cond }

// Elements is a copy of the solved circuit's elements, in order.
func (s *ACSolution) Elements() []Element { return append([]Element(nil), s.c.Elements...) }

// LargestVoltage is the element with the largest peak voltage across it
// and that peak (V). At resonance it can be far above the sources' (Q
// times, in a series RLC), which is what a caution about dangerous
// voltages needs; the peak is √2 times the rms value such limits are
// usually stated in.
func (s *ACSolution) LargestVoltage() (element string, peak float64) {
	for _, e := range s.c.Elements {
		v, _ := s.elementVI(s.x, e, sourcePhasor)
		if a := cmplx.Abs(v); a > peak || element == "" {
			element, peak = e.Name, a
		}
	}
	return element, peak
}

// Voltage is the peak phasor voltage of node (V) against ground.
func (s *ACSolution) Voltage(node string) (complex128, error) {
	if node == s.lay.ground {
		return 0, nil
	}
	i, ok := s.lay.node[node]
	if !ok {
		return 0, fmt.Errorf("the circuit has no node %q", node)
	}
	return s.x[i], nil
}

func (s *ACSolution) find(name string) (Element, error) {
	i, ok := s.index[name]
	if !ok {
		return Element{}, fmt.Errorf("the circuit has no element %q", name)
	}
	return s.c.Elements[i], nil
}

func (s *ACSolution) v(x []complex128, n string) complex128 {
	if i := s.lay.idx(n); i >= 0 {
		return x[i]
	}
	return 0
}

// elementVI returns the voltage V(From) − V(To) and the current From→To
// of e in the solution x, with the sources at phasor(e).
func (s *ACSolution) elementVI(x []complex128, e Element, phasor func(Element) complex128) (v, i complex128) {
	v = s.v(x, e.From) - s.v(x, e.To)
	if k, ok := s.lay.branch[e.Name]; ok {
		return v, x[k]
	}
	switch e.Kind {
	case Resistor:
		i = v / complex(e.Value, 0)
	case Capacitor:
		i = v * complex(0, s.omega*e.Value)
	case CurrentSource:
		i = phasor(e)
	}
	return v, i
}

func sourcePhasor(e Element) complex128 { return e.Phasor }

// Current is the peak phasor current (A) through element, From→To.
func (s *ACSolution) Current(element string) (complex128, error) {
	e, err := s.find(element)
	if err != nil {
		return 0, err
	}
	_, i := s.elementVI(s.x, e, sourcePhasor)
	return finiteC(i, "current", element)
}

// finiteC and finiteF refuse a result that overflowed.
func finiteC(z complex128, what, element string) (complex128, error) {
	if cmplx.IsNaN(z) || cmplx.IsInf(z) {
		return 0, fmt.Errorf("the %s of %s is too large to represent: the values are out of range", what, element)
	}
	return z, nil
}

func finiteF(v float64, what, element string) (float64, error) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("the %s of %s is too large to represent: the values are out of range", what, element)
	}
	return v, nil
}

// ElementVoltage is the peak phasor voltage (V) across element,
// V(From) − V(To).
func (s *ACSolution) ElementVoltage(element string) (complex128, error) {
	e, err := s.find(element)
	if err != nil {
		return 0, err
	}
	v, _ := s.elementVI(s.x, e, sourcePhasor)
	return finiteC(v, "voltage", element)
}

// Power is the average power (W) element absorbs, ½·Re(V·I*) with peak
// phasors; negative for a source that delivers power.
func (s *ACSolution) Power(element string) (float64, error) {
	e, err := s.find(element)
	if err != nil {
		return 0, err
	}
	v, i := s.elementVI(s.x, e, sourcePhasor)
	return finiteF(0.5*real(v*cmplx.Conj(i)), "power", element)
}

// InputImpedance is the impedance (ohm) the rest of the circuit presents
// to source, with every other independent source set to zero (voltage
// sources shorted, current sources opened): the voltage across the
// network's terminals divided by the current the source drives into it.
// It does not depend on the source's own phasor. A voltage source that
// drives no current sees an open circuit, which is an error.
func (s *ACSolution) InputImpedance(source string) (complex128, error) {
	e, err := s.find(source)
	if err != nil {
		return 0, err
	}
	if e.Kind != VoltageSource && e.Kind != CurrentSource {
		return 0, fmt.Errorf("%s is a %s, not a source; InputImpedance takes a voltage or current source", source, e.Kind)
	}
	unit := func(o Element) complex128 {
		if o.Name == source {
			return 1
		}
		return 0
	}
	x, err := s.solveFor(unit)
	if err != nil {
		return 0, err
	}
	v, i := s.elementVI(x, e, unit)
	if i == 0 {
		return 0, fmt.Errorf("voltage source %s drives no current at %.6g Hz: the circuit it sees is open, its impedance infinite", source, s.freq)
	}
	// Passive convention for the source: a voltage source drives −i out of
	// its From node into the network, across which it holds v, so
	// Z = v/(−i); a current source drives i into the network at its To
	// node, across which the network holds V(To) − V(From) = −v, so again
	// Z = −v/i.
	return finiteC(-v/i, "input impedance", source)
}
