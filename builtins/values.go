package builtins

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

// Path is a current path value: pieces (segments, arcs, helices) joined end
// to end, possibly several closed loops (the turns of a coil). A path
// never changes once made; info caches what Show needs (a long path is
// shown two or three times per statement, and its length and loops cost
// a pass over every piece).
type Path struct {
	P    em.Path
	info *pathInfo
}

type pathInfo struct {
	parts  string
	length float64
	state  string
}

func (p *Path) Kind() string { return "a path" }

func (p *Path) describe() *pathInfo {
	if p.info != nil {
		return p.info
	}
	counts := map[em.Kind]int{}
	circles := 0
	for _, q := range p.P.Prims {
		if q.IsCircle() {
			circles++
		} else {
			counts[q.Kind]++
		}
	}
	var parts []string
	add := func(n int, one, many string) {
		switch {
		case n == 1:
			parts = append(parts, "1 "+one)
		case n > 1:
			parts = append(parts, fmt.Sprintf("%d %s", n, many))
		}
	}
	add(counts[em.Segment], "segment", "segments")
	add(counts[em.Arc], "arc", "arcs")
	add(circles, "circle", "circles")
	add(counts[em.Helix], "helix", "helices")
	loops, closed := p.P.LoopsClosed()
	state := "open"
	if closed {
		state = "closed"
		if len(loops) > 1 {
			state = fmt.Sprintf("%d closed loops", len(loops))
		}
	}
	p.info = &pathInfo{parts: strings.Join(parts, ", "), length: p.P.Length(), state: state}
	return p.info
}

func (p *Path) Show(digits int) string {
	in := p.describe()
	return fmt.Sprintf("path: %s, length %s, %s", in.parts,
		runtime.Format(runtime.Quantity{V: in.length, D: dimLength}, digits), in.state)
}

func (p *Path) Summary(digits int) string { return p.Show(digits) }

// Surface is a surface value for flux integrals.
type Surface struct{ S em.Surface }

func (s *Surface) Kind() string { return "a surface" }

func (s *Surface) Show(digits int) string {
	return fmt.Sprintf("surface: %s, area %s", s.S.Kind, runtime.Format(runtime.Quantity{V: s.S.Area, D: dimArea}, digits))
}

func (s *Surface) Summary(digits int) string { return s.Show(digits) }

// sourceTerm is a path with its current: a quantity in A, or a function of
// time returning one. A term may instead hold a shape (a current sheet, an
// ideal conductor, a dipole) whose per-ampere field its current scales;
// desc then shows it. factor multiplies the current (an image in a
// permeable plate carries (μr−1)/(μr+1) of it; 0 stands for 1), and plate
// is the plate the source was mirrored in, behind which its field is
// refused.
type sourceTerm struct {
	path    em.Path
	current runtime.Value
	shape   em.Shape
	desc    func(digits int) string
	whole   bool // desc says all, the current included (magnets, dipoles)
	factor  float64
	plate   *em.Plate
}

// gain is the factor the term's current is multiplied by.
func (t sourceTerm) gain() float64 {
	if t.factor == 0 {
		return 1
	}
	return t.factor
}

// em is the term as a source of the numerical core, carrying current i
// (before the term's factor).
func (t sourceTerm) em(i float64) em.Source {
	return em.Source{Path: t.path, I: i * t.gain(), Shape: t.shape, Plate: t.plate}
}

// weight is the cost of the term's field at one point (see pathWeight).
func (t sourceTerm) weight() float64 {
	w := pathWeight(t.path)
	if t.shape != nil {
		w += t.shape.Weight()
	}
	return w
}

// Source is a set of currents (and uniform fields) whose fields add.
type Source struct {
	terms   []sourceTerm
	uniform []em.Vec // uniform flux densities, T
}

func (s *Source) Kind() string { return "a source" }

// showTerms is the most terms of a source shown; the rest are counted.
const showTerms = 4

func (s *Source) Show(digits int) string {
	var parts []string
	for i, t := range s.terms {
		if i == showTerms {
			parts[len(parts)-1] += fmt.Sprintf(" and %d more terms", len(s.terms)-showTerms)
			break
		}
		cur := runtime.Format(t.current, digits)
		if f, ok := t.current.(*runtime.Func); ok {
			cur = f.Signature()
		}
		what := strings.TrimPrefix((&Path{P: t.path}).Show(digits), "path: ")
		if t.desc != nil {
			what = t.desc(digits)
		}
		if t.whole {
			parts = append(parts, what)
			continue
		}
		parts = append(parts, fmt.Sprintf("%s in (%s)", cur, what))
	}
	if len(s.uniform) > 0 {
		// uniform fields add: show their sum
		b := s.uniformB()
		parts = append(parts, "uniform field "+runtime.Format(runtime.Vector{V: [3]float64{b.X, b.Y, b.Z}, D: dimTesla}, digits))
	}
	return "source: " + strings.Join(parts, "; ")
}

func (s *Source) Summary(digits int) string { return s.Show(digits) }

// Plus superposes two sources.
func (s *Source) Plus(other runtime.Value) (runtime.Value, error) {
	o, ok := other.(*Source)
	if !ok {
		return nil, errorf("a source can only be added to another source, not %s", runtime.TypeName(other))
	}
	if !samePlate(s, o) {
		return nil, errorf("a source mirrored in a permeable plate can only be added to another mirrored in the same plate: add the sources first, then mirror the sum")
	}
	if n := len(s.terms) + len(o.terms); n > maxTerms {
		return nil, errorf("the sum would have %d currents; a source holds at most %d (put paths that carry one current into one path with join() or repeat() instead)", n, maxTerms)
	}
	if len(s.uniform)+len(o.uniform) > 1 { // uniform fields add into one
		return &Source{
			terms:   append(append([]sourceTerm{}, s.terms...), o.terms...),
			uniform: []em.Vec{r3.Add(s.uniformB(), o.uniformB())},
		}, nil
	}
	return &Source{
		terms:   append(append([]sourceTerm{}, s.terms...), o.terms...),
		uniform: append(append([]em.Vec{}, s.uniform...), o.uniform...),
	}, nil
}

// timeDependent reports whether some current is a function of time.
func (s *Source) timeDependent() bool {
	for _, t := range s.terms {
		if _, ok := t.current.(*runtime.Func); ok {
			return true
		}
	}
	return false
}

// currentAt evaluates a term's current at time t (seconds); hasT tells
// whether a time was given.
func currentAt(env runtime.Env, fn string, cur runtime.Value, t float64, hasT bool) (float64, error) {
	switch c := cur.(type) {
	case runtime.Quantity:
		return c.V, nil
	case runtime.Complex:
		return 0, errorf("%s: the source's current %s is a phasor, which stands for a sinusoid at a frequency; this builtin needs an instantaneous current (write it as a function of time), or use a builtin that takes the frequency (emf, flux)", fn, runtime.Format(c, 6))
	case *runtime.Func:
		if !hasT {
			return 0, errorf("%s: the source's current %s depends on time; give the time as the last argument", fn, c.Signature())
		}
		v, err := c.Invoke(env, []runtime.Value{runtime.Quantity{V: t, D: dimTime}})
		if err != nil {
			return 0, err
		}
		q, ok := v.(runtime.Quantity)
		if !ok || q.D != dimCurrent {
			return 0, errorf("%s: the current function %s must return a current (A), not %s", fn, c.Signature(), runtime.TypeName(v))
		}
		return q.V, nil
	}
	return 0, errorf("%s: a current must be a quantity in A or a function of time", fn)
}

// sources evaluates the currents at time t into em sources.
func (s *Source) sources(env runtime.Env, fn string, t float64, hasT bool) ([]em.Source, error) {
	out := make([]em.Source, 0, len(s.terms))
	for _, term := range s.terms {
		i, err := currentAt(env, fn, term.current, t, hasT)
		if err != nil {
			return nil, err
		}
		out = append(out, term.em(i))
	}
	return out, nil
}

// plate is the permeable plate the source was mirrored in, or nil.
func (s *Source) plate() *em.Plate {
	for _, t := range s.terms {
		if t.plate != nil {
			return t.plate
		}
	}
	return nil
}

// samePlate reports whether two sources were mirrored in the same plate
// (or neither was).
func samePlate(a, b *Source) bool {
	pa, pb := a.plate(), b.plate()
	if pa == nil || pb == nil {
		return pa == nil && pb == nil
	}
	return *pa == *pb
}

func (s *Source) uniformB() em.Vec {
	var b em.Vec
	for _, u := range s.uniform {
		b = r3.Add(b, u)
	}
	return b
}

// Table is a table of sampled values, column by column in SI units.
type Table struct {
	Title string
	// Caution, when set, is a safety caution that belongs to the table's
	// result (a stored energy above the hazardous level, say).
	Caution string
	Cols    []string
	Dims    []runtime.Dim
	// Cyc marks columns of cycle frequencies (shown in Hz, see
	// runtime.Quantity.Cyc); it may be shorter than Cols.
	Cyc  []bool
	Rows [][]float64
	// NumErr, when set, bounds each column's numerical error (absolute,
	// SI units, over all rows); Show writes it under the table.
	NumErr []float64
}

func (t *Table) Kind() string { return "a table" }

// ColumnNumErr gives each column's numerical error bound (nil: none), for
// the report.
func (t *Table) ColumnNumErr() []float64 { return t.NumErr }

// CycleColumns implements runtime.CycleColumns.
func (t *Table) CycleColumns() []bool { return t.Cyc }

// Tabulate implements runtime.Tabular.
func (t *Table) Tabulate() ([]string, []runtime.Dim, [][]float64) { return t.Cols, t.Dims, t.Rows }

// columnUnits picks one display unit per column.
func (t *Table) columnUnits(digits int) ([]string, []float64) {
	units := make([]string, len(t.Cols))
	scales := make([]float64, len(t.Cols))
	for j := range t.Cols {
		big := 0.0
		for _, r := range t.Rows {
			if a := math.Abs(r[j]); a > big { // cells are finite (checked when made)
				big = a
			}
		}
		units[j], scales[j] = runtime.ColumnUnit(t, j, t.Dims[j], big, digits)
	}
	return units, scales
}

// showRows is the most rows a table shows; longer tables show their first
// and last rows around a count of the rest.
const showRows = 50

func (t *Table) Show(digits int) string {
	units, scales := t.columnUnits(digits)
	rows := t.Rows
	hidden := 0
	if len(rows) > showRows {
		hidden = len(rows) - showRows
		rows = append(append([][]float64{}, t.Rows[:showRows-10]...), t.Rows[len(t.Rows)-10:]...)
	}
	cells := make([][]string, len(rows)+1)
	cells[0] = make([]string, len(t.Cols))
	for j, c := range t.Cols {
		cells[0][j] = c
		if units[j] != "" {
			cells[0][j] = c + " [" + units[j] + "]"
		}
	}
	for i, r := range rows {
		cells[i+1] = make([]string, len(r))
		for j, x := range r {
			cells[i+1][j] = runtime.FormatNumber(x/scales[j], digits)
		}
	}
	if len(t.NumErr) == len(t.Cols) {
		// a last row: each column's bound, in the column's unit
		foot := make([]string, len(t.Cols))
		for j, e := range t.NumErr {
			if e > 0 {
				foot[j] = "≤ " + runtime.FormatNumber(RoundUp2(e/scales[j]), 2)
			}
		}
		if foot[0] == "" {
			foot[0] = "num. error"
		}
		cells = append(cells, foot)
	}
	width := make([]int, len(t.Cols))
	for _, row := range cells {
		for j, c := range row {
			width[j] = max(width[j], len([]rune(c)))
		}
	}
	var b strings.Builder
	if t.Title != "" {
		b.WriteString(t.Title + "\n")
	}
	for i, row := range cells {
		if hidden > 0 && i == showRows-10+1 {
			fmt.Fprintf(&b, "… %d more rows …\n", hidden)
		}
		for j, c := range row {
			if j > 0 {
				b.WriteString("  ")
			}
			b.WriteString(strings.Repeat(" ", width[j]-len([]rune(c))) + c)
		}
		if i < len(cells)-1 {
			b.WriteByte('\n')
		}
	}
	return b.String()
}

// RoundUp2 rounds a bound up to two significant digits, so that the
// bound shown is still a bound.
func RoundUp2(x float64) float64 {
	if x <= 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	p := math.Pow(10, math.Floor(math.Log10(x))-1)
	return math.Ceil(x/p) * p
}

func (t *Table) Summary(digits int) string {
	units, _ := t.columnUnits(digits)
	cols := make([]string, len(t.Cols))
	for j, c := range t.Cols {
		cols[j] = c
		if units[j] != "" {
			cols[j] += " [" + units[j] + "]"
		}
	}
	return fmt.Sprintf("table of %d rows: %s", len(t.Rows), strings.Join(cols, ", "))
}
