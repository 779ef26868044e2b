package runtime

import (
	"math"
	"reflect"
	"sort"
)

// Numerical error: the error estimates that adaptive integrals, roots
// and derivatives produce, carried to the statement's result.
//
// A builtin reports the estimate of the value it returns with
// Env.NumericalError (an absolute bound, in the SI unit of the value; for
// a vector, a bound on each component). The session keeps, for every call
// the statement's expression makes directly (depth 1), the function, its
// value and the estimate. The result's bound is then found by replaying
// the expression with every such call answered from that record (nothing
// is computed again) and one source of error moved at a time: a call's
// value moved by its estimate, or a name's value moved by the bound it
// carries from its own statement; the bound of the result is the sum of
// the changes, a first-order worst case (errors are bounds, not standard
// uncertainties, so they add rather than combine in quadrature). A
// builtin called inside a user function or a sweep reports at a deeper
// level; its estimate then cannot be carried, and the result says so.

// numCall is one direct call of the running statement.
type numCall struct {
	f    *Func
	args []Value
	val  Value
	err  []float64 // per component; nil: no estimate reported
}

// numState is the session's bookkeeping for numerical error.
type numState struct {
	calls   []numCall
	cur     int  // the direct call running, -1 outside one
	nested  bool // an estimate was reported below depth 1
	replay  *numReplay
	names   map[string][]float64 // bounds carried by names
	showAll bool                 // :numerr on
}

// numReplay answers the direct calls from the record, with call move
// moved by delta (move < 0: none).
type numReplay struct {
	next     int
	move     int
	delta    []float64
	mismatch bool
}

// NumericalError implements Env: the value the calling builtin returns
// has an absolute error of at most err per component.
func (s *Session) NumericalError(err ...float64) {
	st := &s.num
	if st.replay != nil || s.unc.cur != nil {
		return
	}
	if s.depth != 1 || st.cur < 0 {
		st.nested = true
		return
	}
	c := &st.calls[st.cur]
	if c.err == nil {
		c.err = make([]float64, len(err))
	}
	for i, e := range err {
		if i < len(c.err) && !math.IsNaN(e) {
			c.err[i] += math.Abs(e)
		}
	}
}

// moveBy returns v with component i moved by d (components as in
// components()); false when v has no such component.
func moveBy(v Value, i int, d float64) (Value, bool) {
	switch x := v.(type) {
	case Quantity:
		if i == 0 {
			x.V += d
			return x, true
		}
	case Vector:
		if i < 3 {
			x.V[i] += d
			return x, true
		}
	case Complex:
		switch i {
		case 0:
			x.V += complex(d, 0)
			return x, true
		case 1:
			x.V += complex(0, d)
			return x, true
		}
	}
	return nil, false
}

// numericalBound replays the compiled statement p (whose value as
// computed is v) once per source of numerical error and returns the
// bound per component of v, nil when there is no source, and false when
// an estimate could not be carried (reported inside a function, or the
// replay took another path).
func (s *Session) numericalBound(p *program, v Value) ([]float64, bool) {
	st := &s.num
	y0, ok := components(v)
	if !ok {
		return nil, !st.nested
	}
	type source struct {
		call int    // a direct call, or -1
		name string // a name read
		comp int
		d    float64
	}
	var srcs []source
	for k, c := range st.calls {
		for i, e := range c.err {
			if e > 0 {
				srcs = append(srcs, source{call: k, comp: i, d: e})
			}
		}
	}
	var names []string
	for _, name := range identRE.FindAllString(p.st.Expr, -1) {
		if b := st.names[name]; b != nil {
			names = append(names, name)
		}
	}
	sort.Strings(names)
	for i, name := range names {
		if i > 0 && names[i-1] == name {
			continue
		}
		for c, e := range st.names[name] {
			if e > 0 {
				srcs = append(srcs, source{call: -1, name: name, comp: c, d: e})
			}
		}
	}
	if len(srcs) == 0 {
		return nil, !st.nested
	}
	bound := make([]float64, len(y0))
	defer func() { st.replay = nil }()
	for _, src := range srcs {
		env := s.vars
		rp := &numReplay{move: -1}
		if src.call >= 0 {
			rp.move = src.call
			rp.delta = make([]float64, src.comp+1)
			rp.delta[src.comp] = src.d
		} else {
			moved, ok := moveBy(s.vars[src.name], src.comp, src.d)
			if !ok {
				continue
			}
			env = make(map[string]Value, len(s.vars))
			for k, x := range s.vars {
				env[k] = x
			}
			env[src.name] = moved
		}
		st.replay = rp
		w, err := s.runEnv(p, env)
		if err != nil || rp.mismatch || rp.next != len(st.calls) {
			return nil, false
		}
		y, ok := components(w)
		if !ok || len(y) != len(y0) {
			return nil, false
		}
		for i := range y {
			bound[i] += math.Abs(y[i] - y0[i])
		}
	}
	return bound, !st.nested
}

// replayCall answers a direct call during a replay: the recorded value,
// moved when it is the call being moved, when the call's arguments are
// those recorded. A call whose arguments moved (sqrt of a moved value,
// abs of a moved call) is computed again: ok false tells the caller to
// call it. The count of direct calls advances either way.
func (s *Session) replayCall(f *Func, args []Value) (v Value, ok bool, err error) {
	rp := s.num.replay
	k := rp.next
	rp.next++
	if k >= len(s.num.calls) || s.num.calls[k].f != f {
		rp.mismatch = true
		return nil, true, evalErr("the replay took another path")
	}
	c := s.num.calls[k]
	if k != rp.move && !sameValues(args, c.args) {
		return nil, false, nil
	}
	v = c.val
	if k == rp.move {
		for i, d := range rp.delta {
			if d != 0 {
				v, _ = moveBy(v, i, d)
			}
		}
	}
	return v, true, nil
}

// sameValues reports whether two argument lists are the same values: by
// value for numbers, vectors and other comparable values, and otherwise
// (values holding slices or maps) never, so that such a call is
// computed again rather than answered wrongly.
func sameValues(a, b []Value) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] == nil || b[i] == nil {
			if a[i] != b[i] {
				return false
			}
			continue
		}
		ta, tb := reflect.TypeOf(a[i]), reflect.TypeOf(b[i])
		if ta != tb || !ta.Comparable() || a[i] != b[i] {
			return false
		}
	}
	return true
}

// setNumErr keeps the bound a name carries (nil: none).
func (s *Session) setNumErr(name string, b []float64) {
	if b == nil {
		delete(s.num.names, name)
		return
	}
	if s.num.names == nil {
		s.num.names = map[string][]float64{}
	}
	s.num.names[name] = b
}

// numErrVisible reports whether a bound reaches the digits shown: above
// half a unit in the last of digits significant digits of the value.
func numErrVisible(v Value, b []float64, digits int) bool {
	y, ok := components(v)
	if !ok {
		return false
	}
	big := 0.0
	for _, x := range y {
		big = math.Max(big, math.Abs(x))
	}
	return maxAbs(b) > 0.5*math.Pow10(1-digits)*big
}

// FormatNumErr writes a bound as "(numerical error ≤ 3.2e-9 µH)", in the
// unit the value is shown in (or unit).
func FormatNumErr(v Value, b []float64, unit string) string {
	var d Dim
	var big float64
	switch x := v.(type) {
	case Quantity:
		d, big = x.D, math.Abs(x.V)
	case Vector:
		d, big = x.D, x.Norm().V
	case Complex:
		d, big = x.D, math.Abs(real(x.V))+math.Abs(imag(x.V))
	}
	text, scale := BestUnit(d, big, DefaultDigits)
	if unit != "" {
		if ue, err := ParseUnit(unit); err == nil && ue.Dim == d && ue.Offset == 0 {
			text, scale = unit, ue.Scale()
		}
	}
	if text != "" {
		text = " " + text
	}
	return "(numerical error ≤ " + strconvG(maxAbs(b)/scale) + text + ")"
}

func strconvG(x float64) string { return FormatNumber(roundSig(x, 2), 2) }
