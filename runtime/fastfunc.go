package runtime

import (
	"math"

	"github.com/expr-lang/expr/ast"
)

// Fast evaluation of user functions of one quantity.
//
// A builtin that calls a user function thousands of times with arguments
// of one dimension (parametric_path traces a curve through 10^4 points)
// spends most of its time wrapping every intermediate number in a
// Quantity, checking its unit and boxing it for the engine. For a body
// made only of arithmetic, vector literals and components, numbers, named
// values and builtins that have a plain-number form (RealFunc), the units
// of every part follow from the argument's unit alone, so they are
// checked once, when the evaluator is built, and each call then works on
// plain float64. Anything else (a condition, a call of another user
// function, a power whose exponent is not a constant, a plain number that
// might be 0 beside lengths in a vector) makes Fast return nil, and the
// caller uses Invoke. A call whose numbers go non-finite anywhere (a
// division by zero, an overflow, a root of a negative number) reports
// that it failed, and the caller calls Invoke for it, which gives the
// message.

// RealFunc is the plain-number form of a builtin of one quantity: Dim
// gives the unit of the result for the unit of the argument (false when
// the builtin refuses that unit), F the number.
type RealFunc struct {
	Dim func(d Dim) (Dim, bool)
	F   func(x float64) float64
}

// fastBody is what Fast needs of a user function.
type fastBody struct {
	s *Session
	p *program
}

// FastFunc is a user function of one quantity evaluated on plain numbers.
type FastFunc struct {
	// Vec tells whether the result is a vector; D is its dimension.
	Vec  bool
	D    Dim
	eval func(x float64) [3]float64
	bad  *bool
}

// At evaluates the function at x (in SI units of the dimension Fast was
// given): the components (a quantity in the first), and false when a
// number went non-finite on the way (call Invoke for the message).
func (f *FastFunc) At(x float64) ([3]float64, bool) {
	*f.bad = false
	v := f.eval(x)
	return v, !*f.bad
}

// Fast returns an evaluator of f on plain numbers for an argument of
// dimension d, or nil when f is not a user function of one argument whose
// body the evaluator handles. The names f uses are read now: the
// evaluator is for use within one builtin's call, during which no name
// changes.
func (f *Func) Fast(d Dim) *FastFunc {
	if f.body == nil || f.MinArgs != 1 || f.MaxArgs != 1 || f.body.p.prog == nil {
		return nil
	}
	b := &fastBuilder{s: f.body.s, arg: d, bad: new(bool)}
	n, ok := b.build(f.body.p.prog.Node())
	if !ok {
		return nil
	}
	out := &FastFunc{Vec: n.vec, D: n.d, bad: b.bad}
	if n.vec {
		out.eval = n.v
	} else {
		s := n.s
		out.eval = func(x float64) [3]float64 { return [3]float64{s(x), 0, 0} }
	}
	return out
}

// fastNode is a part of the body: a quantity (s) or a vector (v) of
// dimension d; zero marks the constant plain number 0, which fits any
// vector component.
type fastNode struct {
	vec  bool
	d    Dim
	zero bool
	s    func(x float64) float64
	v    func(x float64) [3]float64
}

type fastBuilder struct {
	s   *Session
	arg Dim
	bad *bool
}

// fin flags a number that is not finite (x − x is NaN for ±Inf and NaN).
func (b *fastBuilder) fin(x float64) float64 {
	if x-x != 0 {
		*b.bad = true
	}
	return x
}

func constNode(v any) (fastNode, bool) {
	switch c := normalize(v).(type) {
	case Quantity:
		x := c.V
		return fastNode{d: c.D, zero: x == 0 && c.D.IsZero(), s: func(float64) float64 { return x }}, true
	case Vector:
		x := c.V
		return fastNode{vec: true, d: c.D, v: func(float64) [3]float64 { return x }}, true
	}
	return fastNode{}, false
}

func (b *fastBuilder) build(n ast.Node) (fastNode, bool) {
	switch n := n.(type) {
	case *ast.ConstantNode:
		return constNode(n.Value)
	case *ast.IdentifierNode:
		v, ok := b.s.current()[n.Value]
		if !ok {
			return fastNode{}, false
		}
		return constNode(v)
	case *ast.CallNode:
		id, ok := n.Callee.(*ast.IdentifierNode)
		if !ok {
			return fastNode{}, false
		}
		return b.call(id.Value, n.Arguments)
	}
	return fastNode{}, false
}

func (b *fastBuilder) call(name string, args []ast.Node) (fastNode, bool) {
	fail := fastNode{}
	if name == fnArg {
		if c, ok := args[0].(*ast.ConstantNode); !ok || c.Value != 0 {
			return fail, false
		}
		return fastNode{d: b.arg, s: func(x float64) float64 { return x }}, true
	}
	if name == fnCall {
		return b.builtin(args)
	}
	ns := make([]fastNode, 0, len(args))
	for _, a := range args {
		if name == fnComp && len(ns) == 1 {
			break // the index is read below
		}
		x, ok := b.build(a)
		if !ok {
			return fail, false
		}
		ns = append(ns, x)
	}
	switch name {
	case "__add", "__sub":
		x, y := ns[0], ns[1]
		if x.vec != y.vec || x.d != y.d {
			return fail, false
		}
		sign := 1.0
		if name == "__sub" {
			sign = -1
		}
		if x.vec {
			xv, yv := x.v, y.v
			return fastNode{vec: true, d: x.d, v: func(u float64) [3]float64 {
				p, q := xv(u), yv(u)
				return [3]float64{b.fin(p[0] + sign*q[0]), b.fin(p[1] + sign*q[1]), b.fin(p[2] + sign*q[2])}
			}}, true
		}
		xs, ys := x.s, y.s
		return fastNode{d: x.d, s: func(u float64) float64 { return b.fin(xs(u) + sign*ys(u)) }}, true
	case "__mul", "__div":
		x, y := ns[0], ns[1]
		q := 1
		if name == "__div" {
			q = -1
		}
		d, ok := x.d.Combine(1, y.d, q)
		if !ok || (x.vec && y.vec) || (q < 0 && y.vec) {
			return fail, false
		}
		if q < 0 {
			ys := y.s
			div := func(u float64) float64 {
				z := ys(u)
				if z == 0 {
					*b.bad = true // division by zero: Invoke says so
				}
				return z
			}
			if x.vec {
				xv := x.v
				return fastNode{vec: true, d: d, v: func(u float64) [3]float64 {
					p, z := xv(u), div(u)
					return [3]float64{b.fin(p[0] / z), b.fin(p[1] / z), b.fin(p[2] / z)}
				}}, true
			}
			xs := x.s
			return fastNode{d: d, s: func(u float64) float64 { return b.fin(xs(u) / div(u)) }}, true
		}
		switch {
		case x.vec || y.vec:
			vv, ss := x.v, y.s
			if y.vec {
				vv, ss = y.v, x.s
			}
			return fastNode{vec: true, d: d, v: func(u float64) [3]float64 {
				p, z := vv(u), ss(u)
				return [3]float64{b.fin(p[0] * z), b.fin(p[1] * z), b.fin(p[2] * z)}
			}}, true
		}
		xs, ys := x.s, y.s
		return fastNode{d: d, s: func(u float64) float64 { return b.fin(xs(u) * ys(u)) }}, true
	case "__neg":
		x := ns[0]
		if x.vec {
			xv := x.v
			return fastNode{vec: true, d: x.d, v: func(u float64) [3]float64 { p := xv(u); return [3]float64{-p[0], -p[1], -p[2]} }}, true
		}
		xs := x.s
		return fastNode{d: x.d, s: func(u float64) float64 { return -xs(u) }}, true
	case "__pow":
		x, y := ns[0], ns[1]
		// the exponent must be a constant, so that the unit is known now
		c, ok := args[1].(*ast.ConstantNode)
		if !ok || x.vec || y.vec || !y.d.IsZero() {
			return fail, false
		}
		e, ok := normalize(c.Value).(Quantity)
		if !ok {
			return fail, false
		}
		// the unit of the power, by the rule Pow applies
		r, err := Pow(Quantity{V: 1, D: x.d}, e)
		if err != nil {
			return fail, false
		}
		d := r.(Quantity).D
		xs, ev := x.s, e.V
		return fastNode{d: d, s: func(u float64) float64 {
			z := xs(u)
			if z == 0 && ev < 0 {
				*b.bad = true
			}
			return b.fin(math.Pow(z, ev))
		}}, true
	case fnVec:
		if len(ns) != 3 {
			return fail, false
		}
		var d Dim
		for _, x := range ns {
			if x.vec {
				return fail, false
			}
			if !x.zero && !x.d.IsZero() {
				d = x.d
			}
		}
		for _, x := range ns {
			// a plain number beside lengths fits only when it is 0, which
			// only the constant 0 is sure to be
			if x.d != d && !x.zero {
				return fail, false
			}
		}
		s0, s1, s2 := ns[0].s, ns[1].s, ns[2].s
		return fastNode{vec: true, d: d, v: func(u float64) [3]float64 { return [3]float64{s0(u), s1(u), s2(u)} }}, true
	case fnComp:
		x := ns[0]
		c, ok := args[1].(*ast.ConstantNode)
		i, isInt := 0, false
		if ok {
			i, isInt = c.Value.(int)
		}
		if !x.vec || !isInt || i < 0 || i > 2 {
			return fail, false
		}
		xv := x.v
		return fastNode{d: x.d, s: func(u float64) float64 { return xv(u)[i] }}, true
	}
	return fail, false
}

// builtin is __call(name, x) of a builtin with a plain-number form.
func (b *fastBuilder) builtin(args []ast.Node) (fastNode, bool) {
	fail := fastNode{}
	if len(args) != 2 {
		return fail, false
	}
	id, ok := args[0].(*ast.IdentifierNode)
	if !ok {
		return fail, false
	}
	f, ok := b.s.current()[id.Value].(*Func)
	if !ok || f.Real == nil {
		return fail, false
	}
	x, ok := b.build(args[1])
	if !ok || x.vec {
		return fail, false
	}
	d, ok := f.Real.Dim(x.d)
	if !ok {
		return fail, false
	}
	xs, fn := x.s, f.Real.F
	return fastNode{d: d, s: func(u float64) float64 { return b.fin(fn(xs(u))) }}, true
}
