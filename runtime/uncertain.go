package runtime

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"loopwise/lang"
)

// Uncertainty, first order (JCGM 100:2008, the GUM, §5.1).
//
// A value written "a ± b" is an input: an estimate a with standard
// uncertainty b. Every statement that reads inputs, directly or through
// names and user functions, is evaluated once as written and then twice
// per input it reads, with that one input moved to a − b and a + b and
// everything else at its estimate. Each name keeps the values it took in
// those moved evaluations ("worlds"), whatever their type (paths, sources,
// tables as well as numbers), so a later statement reads a path built
// from a moved radius in the world where that radius moved. The
// sensitivity of a result y to input i, times u_i, is then
//
//	c_i·u_i ≈ (y(x_i + u_i) − y(x_i − u_i))/2,
//
// a central difference of the actual computation with the step equal to
// the uncertainty: exact for a result linear in x_i, and for a smooth one
// within (u_i²/6)·|y'''|/|y'| of the derivative at the estimate (the
// central difference's error term), which is the first-order law's own
// order of neglect. With one step per input the method is the symmetric
// form of the spreadsheet technique of J. Kragten, Analyst 119 (1994)
// 2161. Inputs are independent; the same input read twice is the same
// world, so correlation through shared inputs is kept (x − x has zero
// uncertainty). The combined standard uncertainty is
// u(y) = √Σ (c_i·u_i)² (GUM eq. 10).

// Input is an uncertain input: one ± in a statement.
type Input struct {
	ID    int
	Label string   // the name it was assigned to, or its text
	Value Quantity // the estimate
	U     float64  // standard uncertainty, SI units of Value
}

// world is an evaluation with one input moved by sign·u.
type world struct {
	id   int
	sign float64
}

// uncState is the session's uncertainty bookkeeping.
type uncState struct {
	inputs []Input
	// worlds[name][id] holds name's value with input id moved down and up.
	worlds map[string]map[int][2]Value
	cur    *world           // the world being evaluated, nil for the estimate
	env    map[string]Value // the names as the current world sees them
	stmtPM []int            // input ids of the running statement's ±, by order
	label  func(k int) string
	// chain holds the assignments made since the first input, for Monte
	// Carlo trials (montecarlo.go); z, in a trial, the inputs' standard
	// normal draws (cur.id is then -1).
	chain []chainStep
	z     []float64
	// corr holds the correlation coefficients given with correlate, by
	// the pair of input ids (lower first).
	corr map[[2]int]float64
}

// Inputs lists the uncertain inputs of the session in the order entered.
func (s *Session) Inputs() []Input { return append([]Input(nil), s.unc.inputs...) }

// pmFunc is PMFunc(a, b, k) and, with rel, PMRelFunc(a, r, k).
func (s *Session) pmFunc(rel bool) func(p ...any) (any, error) {
	return func(p ...any) (any, error) {
		v, ok := normalize(p[0]).(Quantity)
		if !ok {
			return nil, dimErr("± takes a number with its unit before it, not %s; give each component of a vector its own ±", TypeName(normalize(p[0])))
		}
		uq, ok := normalize(p[1]).(Quantity)
		if !ok {
			return nil, dimErr("the uncertainty after ± must be a number, not %s", TypeName(normalize(p[1])))
		}
		u := uq.V
		if rel {
			if !uq.D.IsZero() {
				return nil, dimErr("a relative uncertainty (± r %%) takes a plain number of percent, not %s", uq.D.Describe())
			}
			u = math.Abs(v.V) * uq.V / 100
		} else if uq.D != v.D {
			return nil, dimErr("the uncertainty after ± must measure what the value does: %s ± %s%s", v.D.Describe(), uq.D.Describe(), angleNote(uq.D, v.D))
		}
		if !(u >= 0) || math.IsInf(u, 0) {
			return nil, dimErr("a standard uncertainty is a finite number ≥ 0, not %s", Format(Quantity{V: u, D: v.D}, 6))
		}
		var k int
		switch x := p[2].(type) {
		case int:
			k = x
		case Quantity:
			k = int(x.V) // the engine's integer literal, made a quantity
		}
		st := &s.unc
		if st.cur == nil {
			if k >= len(st.stmtPM) {
				id := len(st.inputs)
				label := fmt.Sprintf("input %d", id+1)
				if st.label != nil {
					label = st.label(k)
				}
				st.inputs = append(st.inputs, Input{ID: id, Label: label, Value: v, U: u})
				st.stmtPM = append(st.stmtPM, id)
			}
			return v, nil
		}
		if k < len(st.stmtPM) {
			id := st.stmtPM[k]
			switch {
			case st.cur.id < 0 && id < len(st.z):
				in := st.inputs[id] // a Monte Carlo trial: the input's own u
				v.V = in.Value.V + in.U*st.z[id]
			case id == st.cur.id:
				v.V += st.cur.sign * u
			}
		}
		return v, nil
	}
}

// identRE finds names in an expression (a superset of those it reads).
var identRE = regexp.MustCompile(`[A-Za-z_][A-Za-z0-9_]*`)

// readsInputs returns, sorted, the inputs the expression may read: those
// of the names in it, and of the names in the bodies of the user functions
// it names (transitively).
func (s *Session) readsInputs(expr string) []int {
	if len(s.unc.worlds) == 0 {
		return nil
	}
	seen := map[string]bool{}
	ids := map[int]bool{}
	var visit func(text string)
	visit = func(text string) {
		for _, name := range identRE.FindAllString(text, -1) {
			if seen[name] {
				continue
			}
			seen[name] = true
			for id := range s.unc.worlds[name] {
				ids[id] = true
			}
			if f, ok := s.vars[name].(*Func); ok && f.Body != "" {
				visit(f.Body)
			}
		}
	}
	visit(expr)
	out := make([]int, 0, len(ids))
	for id := range ids {
		out = append(out, id)
	}
	sort.Ints(out)
	return out
}

// propagate evaluates the compiled statement p in the worlds of the
// inputs it reads (see the comment at the top of this file). It returns
// the values by input id, or nil when it reads none or v, the value as
// written, is shown and not kept (a plot); err, if a moved
// evaluation fails, says which input and how.
func (s *Session) propagate(p *program, v Value) (map[int][2]Value, error) {
	if _, ok := components(v); !ok && p.st.Kind != lang.Assign {
		return nil, nil // a plot or a table shown once: nothing reads its moved values
	}
	if sh, ok := v.(Shower); ok && sh.Kind() == "a plot" {
		return nil, nil // a picture is drawn once, from the estimates
	}
	ids := s.readsInputs(p.st.Expr)
	for _, id := range s.unc.stmtPM {
		ids = append(ids, id)
	}
	if len(ids) == 0 {
		return nil, nil
	}
	sort.Ints(ids)
	ids = dedupInts(ids)
	copies := make(map[int][2]Value, len(ids))
	defer func() { s.unc.cur, s.unc.env = nil, nil }()
	for _, id := range ids {
		var pair [2]Value
		for j, sign := range []float64{-1, 1} {
			env := make(map[string]Value, len(s.vars))
			for name, v := range s.vars {
				env[name] = v
			}
			for name, w := range s.unc.worlds {
				if c, ok := w[id]; ok {
					env[name] = c[j]
				}
			}
			s.unc.cur, s.unc.env = &world{id: id, sign: sign}, env
			v, err := s.runIn(p, env)
			if err != nil {
				in := s.unc.inputs[id]
				msg := err.Error()
				var le *lang.Error
				if errors.As(err, &le) {
					msg = le.Msg
				}
				if errors.Is(err, ErrBudget) || errors.Is(err, ErrInterrupted) {
					return nil, &causedError{fmt.Sprintf("carrying the uncertainty of %d input(s) takes %d more evaluations of this statement, and they stopped: %s", len(ids), 2*len(ids), msg), causeOf(err)}
				}
				return nil, fmt.Errorf("with %s moved to %s the statement fails (%s)", in.Label, Format(Quantity{V: in.Value.V + sign*in.U, D: in.Value.D}, 6), lang.Abbrev(msg, 200))
			}
			pair[j] = v
		}
		copies[id] = pair
	}
	return copies, nil
}

func dedupInts(a []int) []int {
	out := a[:0]
	for i, x := range a {
		if i == 0 || x != a[i-1] {
			out = append(out, x)
		}
	}
	return out
}

// runIn runs p with the names in env.
func (s *Session) runIn(p *program, env map[string]Value) (Value, error) {
	return s.runEnv(p, env)
}

// Contribution is one input's part in a result's uncertainty.
type Contribution struct {
	Input Input
	// CU is the sensitivity coefficient times the input's uncertainty,
	// (y(x + u) − y(x − u))/2, per component of the result (one for a
	// number, three for a vector, re and im for a complex number).
	CU []float64
}

// components lists the real numbers of a value whose uncertainty can be
// shown, and false for others (paths, tables...).
func components(v Value) ([]float64, bool) {
	switch x := v.(type) {
	case Quantity:
		return []float64{x.V}, true
	case Vector:
		return x.V[:], true
	case Complex:
		return []float64{real(x.V), imag(x.V)}, true
	}
	return nil, false
}

// contributions turns the moved values of a result into contributions,
// or nil when the result has no numbers to show an uncertainty on.
func (s *Session) contributions(v Value, copies map[int][2]Value) []Contribution {
	if _, ok := components(v); !ok || len(copies) == 0 {
		return nil
	}
	ids := make([]int, 0, len(copies))
	for id := range copies {
		ids = append(ids, id)
	}
	sort.Ints(ids)
	var out []Contribution
	for _, id := range ids {
		lo, ok1 := components(copies[id][0])
		hi, ok2 := components(copies[id][1])
		if !ok1 || !ok2 || len(lo) != len(hi) {
			return nil
		}
		cu := make([]float64, len(lo))
		for i := range lo {
			cu[i] = (hi[i] - lo[i]) / 2
		}
		out = append(out, Contribution{Input: s.unc.inputs[id], CU: cu})
	}
	return out
}

// combined is √(Σ_ij c_i·u_i · c_j·u_j · r_ij) per component, r_ij the
// correlation of inputs i and j (1 on the diagonal, 0 unless given with
// correlate): GUM eq. (16).
func (s *Session) combined(cs []Contribution) []float64 {
	if len(cs) == 0 {
		return nil
	}
	u := make([]float64, len(cs[0].CU))
	for a, ca := range cs {
		for b, cb := range cs {
			r := 1.0
			if a != b {
				r = s.unc.corr[corrKey(ca.Input.ID, cb.Input.ID)]
				if r == 0 {
					continue
				}
			}
			for i := range u {
				u[i] += ca.CU[i] * cb.CU[i] * r
			}
		}
	}
	for i := range u {
		u[i] = math.Sqrt(math.Max(0, u[i]))
	}
	return u
}

func corrKey(a, b int) [2]int { return [2]int{min(a, b), max(a, b)} }

// FormatUncertain shows an estimate with its standard uncertainty as
// "y ± u unit": u rounded to two significant digits and y to the same
// decimal place (GUM §7.2.6), in the given unit or the one Format would
// choose for y. With full, both are written with RecordDigits significant
// digits instead (for scripts, which compare them on replay).
func FormatUncertain(v Value, u []float64, unit string, digits int, full bool) (string, error) {
	var d Dim
	var big float64
	switch x := v.(type) {
	case Quantity:
		d, big = x.D, math.Abs(x.V)
	case Vector:
		d, big = x.D, x.Norm().V
	case Complex:
		d, big = x.D, math.Max(math.Abs(real(x.V)), math.Abs(imag(x.V)))
	default:
		return "", fmt.Errorf("%s has no uncertainty to show", TypeName(v))
	}
	text, scale := "", 1.0
	if unit != "" {
		ue, err := ParseUnit(unit)
		if err != nil {
			return "", err
		}
		if ue.Dim != d || ue.Offset != 0 {
			return "", fmt.Errorf("cannot show %s in %s", d.Describe(), unit)
		}
		text, scale = unit, ue.Scale()
	} else {
		big = math.Max(big, maxAbs(u))
		text, scale = BestUnit(d, big, digits)
	}
	pair := func(y, uy float64) (string, string) {
		y, uy = y/scale, uy/scale
		if full {
			return FormatNumber(y, RecordDigits), FormatNumber(uy, RecordDigits)
		}
		return roundPair(y, uy, digits)
	}
	suffix := ""
	if text != "" {
		suffix = " " + text
	}
	// written as it is entered, so that it reads back: "12.00 mm ± 0.10 mm"
	switch x := v.(type) {
	case Quantity:
		a, b := pair(x.V, u[0])
		return a + suffix + " ± " + b + suffix, nil
	case Vector:
		var as, bs [3]string
		for i := range 3 {
			as[i], bs[i] = pair(x.V[i], u[i])
		}
		return "[" + strings.Join(as[:], ", ") + "]" + suffix + " ± [" + strings.Join(bs[:], ", ") + "]" + suffix, nil
	case Complex:
		a, b := pair(real(x.V), u[0])
		c, e := pair(imag(x.V), u[1])
		return "(" + a + suffix + " ± " + b + suffix + ") + (" + c + suffix + " ± " + e + suffix + ")j", nil
	}
	return "", nil
}

func maxAbs(a []float64) float64 {
	m := 0.0
	for _, x := range a {
		m = math.Max(m, math.Abs(x))
	}
	return m
}

// roundPair rounds u to two significant digits and y to the same decimal
// place; a zero u leaves y at digits significant digits.
func roundPair(y, u float64, digits int) (string, string) {
	if u == 0 || math.IsNaN(u) {
		return FormatNumber(y, digits), "0"
	}
	e := int(math.Floor(math.Log10(u)))
	if r := roundSig(u, 2); r >= 100*math.Pow10(e-1) { // 0.0995 → 0.10
		e++
	}
	dec := 1 - e // decimals that keep two significant digits of u
	if dec >= 0 {
		// scale and round before formatting, so that a value shown in a
		// prefixed unit (1234.5 V as 1.2345 kV, just below in binary)
		// rounds as its decimal digits read
		q := math.Pow10(dec)
		return strconv.FormatFloat(math.Round(y*q)/q, 'f', dec, 64), strconv.FormatFloat(math.Round(u*q)/q, 'f', dec, 64)
	}
	q := math.Pow10(-dec)
	return strconv.FormatFloat(math.Round(y/q)*q, 'f', 0, 64), strconv.FormatFloat(math.Round(u/q)*q, 'f', 0, 64)
}

// pmLabeller names the inputs of a statement: an assignment of one
// uncertain value is named after its variable, anything else by the
// statement's text.
func pmLabeller(st *lang.Statement, rw *lang.Rewritten) func(k int) string {
	return func(k int) string {
		if st.Kind == lang.Assign && rw.PMs == 1 {
			return st.Name
		}
		text := lang.Abbrev(strings.TrimSpace(st.Expr), 40)
		if rw.PMs > 1 {
			return fmt.Sprintf("%s (± %d of %d)", text, k+1, rw.PMs)
		}
		return text
	}
}

// width is the rune count of s, at least 1, for positioned errors.
func width(s string) int { return max(1, utf8.RuneCountInString(s)) }

// setWorlds keeps name's moved values (none: forget them).
func (s *Session) setWorlds(name string, copies map[int][2]Value) {
	if len(copies) == 0 {
		delete(s.unc.worlds, name)
		return
	}
	if s.unc.worlds == nil {
		s.unc.worlds = map[string]map[int][2]Value{}
	}
	s.unc.worlds[name] = copies
}

// current is the names as the running evaluation sees them: the session's,
// or those of the world being evaluated.
func (s *Session) current() map[string]Value {
	if s.unc.env != nil {
		return s.unc.env
	}
	return s.vars
}
