package runtime

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"

	"github.com/expr-lang/expr/ast"
)

// Exact derivatives of user functions by forward-mode automatic
// differentiation (Griewank and Walther, Evaluating Derivatives, 2nd ed.,
// SIAM 2008, ch. 3: tangent propagation).
//
// A user function's body is compiled once (compile.go) and run by the
// expression engine; ordinary evaluation is left exactly as it is. To
// differentiate, the body's patched syntax tree (the tree the engine
// compiled: every operator already a dispatcher call) is walked here with
// a Dual in place of every value: the value, computed by the same
// dispatcher functions (Add, Mul, Pow, Compare, MakeVector …) and so
// identical to what Invoke gives, and beside it the tangent, the
// derivative of each of its numbers along the chosen direction of one
// argument. The tangent's unit is implied: a value of dimension D
// differentiated along an argument of dimension X has a tangent in D/X
// (TangentValue builds it), and since the value's units are checked by the
// dispatcher at every step, the tangent's are right by construction.
//
// Builtins take part through Func.Tangent, their rule on Duals (set for
// the math set, dot, cross, norm); a builtin without one is still fine
// when no argument it gets depends on the variable (its value is then a
// constant), and otherwise the walk stops with a *NoTangentError, and the
// caller falls back to differences.
//
// One-sided points: where the rule of a part is one-sided at the point
// (abs at 0, min/max of equal arguments, a comparison between equal
// values whose tangents differ, floor at a whole number, % where it
// wraps), the walk at side 0 stops with errOneSided; Derivative then
// walks again with side −1 and +1, each part taking the branch it takes
// just before or just after the point (and giving its limit value from
// that side), and compares: different values are a jump (*JumpError),
// different slopes a kink (*KinkError), both equal the derivative.
//
// Rounding: every Dual carries first-order bounds on the error of its
// value (EV) and of its tangent (ET), a running error analysis (N. J.
// Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., SIAM
// 2002, §3.3): each operation adds the propagated bounds of its operands
// and the rounding of its own results (u = 2⁻⁵³ of each product, sum and
// quotient; libAllow ulps for library functions). Arguments and names
// count as exact.

// Dual is a value with its tangent along one direction of the variable.
// T holds the derivative of each number of V (T[0] for a quantity or a
// complex number, T[0..2] for a vector), in coherent SI units; EV and ET
// bound the rounding error of V's and of T's numbers (Euclidean norm).
type Dual struct {
	V      Value
	T      [3]complex128
	EV, ET float64
	// Var marks a value that depends on the variable (its tangent may
	// be zero at the point and not elsewhere: x² at 0).
	Var bool
}

// TangentRule is a builtin's rule on Duals: the value (as its Call gives
// it) and the tangent. side is 0, or −1/+1 for the limit just before or
// just after the point; at side 0 a rule whose derivative is one-sided at
// the point returns ErrOneSided.
type TangentRule func(args []Dual, side int) (Dual, error)

// ErrOneSided is what a TangentRule returns at side 0 where its
// derivative is one-sided.
var ErrOneSided = errors.New("the derivative is one-sided here")

var errOneSided = ErrOneSided

// NoTangentError says that a derivative cannot flow through a part (a
// builtin without a rule whose argument depends on the variable).
type NoTangentError struct {
	What string // the part without a rule
	Why  string // or the whole reason
}

func (e *NoTangentError) Error() string {
	if e.Why != "" {
		return e.Why
	}
	return e.What + " has no derivative rule"
}

// NoTangentWhy is a *NoTangentError with its whole reason.
func NoTangentWhy(format string, args ...any) error {
	return &NoTangentError{Why: fmt.Sprintf(format, args...)}
}

// InfiniteSlopeError is a derivative that is infinite at the point
// (sqrt or a fractional power at 0).
type InfiniteSlopeError struct{ What string }

func (e *InfiniteSlopeError) Error() string { return "the slope of " + e.What + " is infinite here" }

// KinkError is a corner: the one-sided derivatives differ.
type KinkError struct{ Before, After Dual }

func (e *KinkError) Error() string { return "the one-sided derivatives differ" }

// JumpError is a jump: the one-sided limits of the value differ, or
// differ from the value at the point.
type JumpError struct{ Before, At, After Value }

func (e *JumpError) Error() string { return "the value jumps here" }

// u is the unit roundoff of float64.
const u = 0x1p-53

// libAllow is the error allowed for a library function (math.Sin,
// math.Pow, …), in units of u of its result: Go's math package documents
// no bound; its functions are within an ulp or two in practice (from
// memory), so 8u leaves room.
const libAllow = 8

// NoTangent is a *NoTangentError for builtins' rules.
func NoTangent(format string, args ...any) error {
	return &NoTangentError{What: fmt.Sprintf(format, args...)}
}

// Derivative evaluates f at args with the argument i moving along dir
// (dir[0] = 1 for a quantity; a unit vector for a vector argument) and
// returns f's value and its derivative. Errors: *NoTangentError (fall
// back to differences), *KinkError, *JumpError, *InfiniteSlopeError, or
// an evaluation error (the one Invoke would give, or one met only on one
// side of the point).
func (f *Func) Derivative(env Env, args []Value, i int, dir [3]float64) (Dual, error) {
	if len(args) < f.MinArgs || (f.MaxArgs >= 0 && len(args) > f.MaxArgs) || i < 0 || i >= len(args) {
		return Dual{}, NoTangent("%s with %d arguments", f.Name, len(args))
	}
	in := make([]Dual, len(args))
	for k, a := range args {
		in[k] = Dual{V: normalize(a)}
	}
	in[i].Var = true
	switch in[i].V.(type) {
	case Quantity, Complex:
		in[i].T[0] = complex(dir[0], 0)
	case Vector, CVector:
		for k := range dir {
			in[i].T[k] = complex(dir[k], 0)
		}
	default:
		return Dual{}, NoTangent("an argument that is %s", TypeName(in[i].V))
	}
	d, err := f.tangentCall(in, 0)
	if !errors.Is(err, errOneSided) {
		return d, err
	}
	v0, err := f.Invoke(env, args)
	if err != nil {
		return Dual{}, err
	}
	before, err := f.tangentCall(in, -1)
	if err != nil {
		return Dual{}, err
	}
	after, err := f.tangentCall(in, 1)
	if err != nil {
		return Dual{}, err
	}
	nb, _ := numbers(before.V)
	na, _ := numbers(after.V)
	n0, ok := numbers(v0)
	if !ok {
		return Dual{}, NoTangent("a value that is %s", TypeName(v0))
	}
	// the two sides' values (and slopes) at the point come from different
	// pieces, which may differ by their own rounding: equal means within
	// twice their bounds plus 1e-12 of their size (a jump or kink smaller
	// than that is not told from rounding)
	tol := func(x, y [3]complex128, e float64) bool {
		return norm3(sub3(x, y)) <= 2*e+1e-12*math.Max(norm3(x), norm3(y))
	}
	if !tol(nb, na, before.EV+after.EV) || !tol(n0, nb, before.EV) || !tol(n0, na, after.EV) {
		return Dual{}, &JumpError{Before: before.V, At: v0, After: after.V}
	}
	if !tol(before.T, after.T, before.ET+after.ET) {
		return Dual{}, &KinkError{Before: before, After: after}
	}
	after.V = v0
	return after, nil
}

// TangentValue is the tangent of d as a value: a quantity, vector or
// complex value of d's dimension divided by per (the dimension of the
// variable).
func TangentValue(d Dual, per Dim) (Value, error) {
	dv, ok := dimOfAny(d.V)
	if !ok {
		return nil, dimErr("%s has no derivative", TypeName(d.V))
	}
	dt, ok := dv.Combine(1, per, -1)
	if !ok {
		return nil, dimErr("%s", errExpRange)
	}
	switch d.V.(type) {
	case Quantity:
		return Quantity{V: real(d.T[0]), D: dt}, nil
	case Complex:
		return Complex{V: d.T[0], D: dt}, nil
	case Vector:
		return Vector{V: [3]float64{real(d.T[0]), real(d.T[1]), real(d.T[2])}, D: dt}, nil
	case CVector:
		return CVector{V: d.T, D: dt}, nil
	}
	return nil, dimErr("%s has no derivative", TypeName(d.V))
}

func dimOfAny(v Value) (Dim, bool) {
	switch x := v.(type) {
	case Quantity:
		return x.D, true
	case Vector:
		return x.D, true
	case Complex:
		return x.D, true
	case CVector:
		return x.D, true
	}
	return Dim{}, false
}

// numbers returns the numbers of a numeric value (a quantity or complex
// number in [0]).
func numbers(v Value) ([3]complex128, bool) {
	switch x := v.(type) {
	case Quantity:
		return [3]complex128{complex(x.V, 0)}, true
	case Complex:
		return [3]complex128{x.V}, true
	case Vector:
		return [3]complex128{complex(x.V[0], 0), complex(x.V[1], 0), complex(x.V[2], 0)}, true
	case CVector:
		return x.V, true
	}
	return [3]complex128{}, false
}

func isVecValue(v Value) bool {
	switch v.(type) {
	case Vector, CVector:
		return true
	}
	return false
}

func isComplexValue(v Value) bool {
	switch v.(type) {
	case Complex, CVector:
		return true
	}
	return false
}

func norm3(c [3]complex128) float64 {
	return math.Sqrt(sq(c[0]) + sq(c[1]) + sq(c[2]))
}

func sq(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }

func sub3(a, b [3]complex128) [3]complex128 {
	return [3]complex128{a[0] - b[0], a[1] - b[1], a[2] - b[2]}
}

// IsConst reports a Dual that does not depend on the variable.
func (d Dual) IsConst() bool { return !d.Var }

// NumbersOf gives the numbers of a numeric value, for tangent rules.
func NumbersOf(v Value) ([3]complex128, bool) { return numbers(v) }

// Norm3 is the Euclidean norm of three complex numbers.
func Norm3(c [3]complex128) float64 { return norm3(c) }

// tangentCall runs f on Duals: a builtin by its rule, a user function by
// walking its body.
func (f *Func) tangentCall(args []Dual, side int) (Dual, error) {
	if f.body == nil || f.body.p == nil || f.body.p.prog == nil {
		if f.Tangent != nil {
			return f.Tangent(args, side)
		}
		return Dual{}, NoTangent("%s", f.Name)
	}
	s := f.body.s
	s.depth++
	defer func() { s.depth-- }()
	w := &tanWalk{s: s, f: f, args: args, side: side}
	return w.eval(f.body.p.prog.Node())
}

// tanWalk walks one user function's body on Duals.
type tanWalk struct {
	s    *Session
	f    *Func
	args []Dual
	side int
}

func (w *tanWalk) eval(n ast.Node) (Dual, error) {
	switch n := n.(type) {
	case *ast.ConstantNode:
		return Dual{V: normalize(n.Value)}, nil
	case *ast.BoolNode:
		return Dual{V: n.Value}, nil
	case *ast.StringNode:
		return Dual{V: n.Value}, nil
	case *ast.IdentifierNode:
		v, ok := w.s.current()[n.Value]
		if !ok {
			return Dual{}, NoTangent("the name %s", n.Value)
		}
		return Dual{V: v}, nil
	case *ast.ConditionalNode:
		c, err := w.eval(n.Cond)
		if err != nil {
			return Dual{}, err
		}
		b, ok := c.V.(bool)
		if !ok {
			return Dual{}, dimErr("the condition before \"?\" must be true or false, not %s", TypeName(c.V))
		}
		if b {
			return w.eval(n.Exp1)
		}
		return w.eval(n.Exp2)
	case *ast.BinaryNode:
		l, err := w.eval(n.Left)
		if err != nil {
			return Dual{}, err
		}
		lb, ok := l.V.(bool)
		if !ok {
			return Dual{}, NoTangent("the operator %s", n.Operator)
		}
		switch n.Operator {
		case "and", "&&":
			if !lb {
				return Dual{V: false}, nil
			}
		case "or", "||":
			if lb {
				return Dual{V: true}, nil
			}
		default:
			return Dual{}, NoTangent("the operator %s", n.Operator)
		}
		return w.eval(n.Right)
	case *ast.UnaryNode:
		x, err := w.eval(n.Node)
		if err != nil {
			return Dual{}, err
		}
		b, ok := x.V.(bool)
		if !ok || (n.Operator != "not" && n.Operator != "!") {
			return Dual{}, NoTangent("the operator %s", n.Operator)
		}
		return Dual{V: !b}, nil
	case *ast.CallNode:
		id, ok := n.Callee.(*ast.IdentifierNode)
		if !ok {
			return Dual{}, NoTangent("a call")
		}
		return w.call(id.Value, n.Arguments)
	}
	return Dual{}, NoTangent("this syntax")
}

func (w *tanWalk) evalAll(ns []ast.Node) ([]Dual, error) {
	out := make([]Dual, len(ns))
	for i, a := range ns {
		var err error
		if out[i], err = w.eval(a); err != nil {
			return nil, err
		}
	}
	return out, nil
}

func (w *tanWalk) call(name string, argNodes []ast.Node) (Dual, error) {
	switch name {
	case fnArg:
		c, ok := argNodes[0].(*ast.ConstantNode)
		i, isInt := 0, false
		if ok {
			i, isInt = c.Value.(int)
		}
		if !isInt || i < 0 || i >= len(w.args) {
			return Dual{}, NoTangent("a parameter")
		}
		return w.args[i], nil
	case fnComp:
		x, err := w.eval(argNodes[0])
		if err != nil {
			return Dual{}, err
		}
		c, ok := argNodes[1].(*ast.ConstantNode)
		i, isInt := 0, false
		if ok {
			i, isInt = c.Value.(int)
		}
		if !isInt || i < 0 || i > 2 {
			return Dual{}, NoTangent("a component")
		}
		v, err := Component(x.V, i)
		if err != nil {
			return Dual{}, err
		}
		return Dual{V: v, T: [3]complex128{x.T[i]}, EV: x.EV, ET: x.ET, Var: x.Var}, nil
	}
	args, err := w.evalAll(argNodes)
	if err != nil {
		return Dual{}, err
	}
	d, err := w.apply(name, args)
	if err == nil {
		for _, a := range args {
			d.Var = d.Var || a.Var
		}
	}
	return d, err
}

// apply is an engine function or operator on evaluated arguments.
func (w *tanWalk) apply(name string, args []Dual) (Dual, error) {
	switch name {
	case fnCall:
		return w.callValue(args)
	case fnBool, fnCond:
		if b, ok := args[0].V.(bool); ok {
			return Dual{V: b}, nil
		}
		if name == fnCond {
			return Dual{}, dimErr("the condition before \"?\" must be true or false, not %s", TypeName(args[0].V))
		}
		return Dual{}, dimErr("and, or and not need true/false values (from a comparison), not %s", TypeName(args[0].V))
	case fnVec:
		vals := make([]Value, len(args))
		var d Dual
		for i, a := range args {
			vals[i] = a.V
			if i < 3 {
				d.T[i] = a.T[0]
			}
			if isVecValue(a.V) {
				return Dual{}, NoTangent("a vector inside a vector")
			}
			d.EV = math.Hypot(d.EV, a.EV)
			d.ET = math.Hypot(d.ET, a.ET)
		}
		v, err := MakeVector(vals)
		if err != nil {
			return Dual{}, err
		}
		d.V = v
		return d, nil
	case "__add":
		return tanAddSub(args[0], args[1], 1)
	case "__sub":
		return tanAddSub(args[0], args[1], -1)
	case "__mul":
		return tanMul(args[0], args[1])
	case "__div":
		return tanDiv(args[0], args[1])
	case "__pow":
		return tanPow(args[0], args[1])
	case "__mod":
		return tanMod(args[0], args[1], w.side)
	case "__neg":
		v, err := Neg(args[0].V)
		if err != nil {
			return Dual{}, err
		}
		t := args[0].T
		return Dual{V: v, T: [3]complex128{-t[0], -t[1], -t[2]}, EV: args[0].EV, ET: args[0].ET}, nil
	case "__eq", "__ne", "__lt", "__le", "__gt", "__ge":
		return tanCompare(name, args[0], args[1], w.side)
	}
	return Dual{}, NoTangent("%s", name)
}

// callValue is __call(f, args...) on Duals.
func (w *tanWalk) callValue(p []Dual) (Dual, error) {
	f, ok := p[0].V.(*Func)
	if !ok {
		return Dual{}, dimErr("%s is not a function and cannot be called", TypeName(p[0].V))
	}
	args := p[1:]
	constant := true
	for _, a := range args {
		constant = constant && a.IsConst()
	}
	if constant {
		// nothing the call sees depends on the variable: its value is a
		// constant, whatever f is (solve, a table, integrate …)
		in := make([]any, len(p))
		for i, a := range p {
			in[i] = a.V
		}
		v, err := w.s.callFunc(in...)
		if err != nil {
			return Dual{}, err
		}
		return Dual{V: normalize(v)}, nil
	}
	if len(args) < f.MinArgs || (f.MaxArgs >= 0 && len(args) > f.MaxArgs) {
		return Dual{}, evalErr("%s takes %s, got %d", f.Name, argCount(f.MinArgs, f.MaxArgs), len(args))
	}
	if err := w.s.Err(); err != nil {
		return Dual{}, err
	}
	if f.body != nil {
		if err := w.s.chargeCall(f.Name); err != nil {
			return Dual{}, err
		}
		if w.s.depth >= maxDepth {
			return Dual{}, evalErr("calls nest deeper than %d (a function that calls itself without end?)", maxDepth)
		}
	}
	d, err := f.tangentCall(args, w.side)
	if err != nil {
		var nt *NoTangentError
		if f.body != nil && !errors.As(err, &nt) && !errors.Is(err, errOneSided) {
			var ce *causedError
			if !errors.As(err, &ce) {
				err = &causedError{fmt.Sprintf("in %s: %s", f.Signature(), err), causeOf(err)}
			}
		}
		return Dual{}, err
	}
	return d, nil
}

// rounding of one operation on values of magnitude m: u for real
// numbers, 4u for complex ones (a complex product rounds a few times).
func round(m float64, cplx bool) float64 {
	if cplx {
		return 4 * u * m
	}
	return u * m
}

func tanAddSub(a, b Dual, sign float64) (Dual, error) {
	var v Value
	var err error
	if sign > 0 {
		v, err = Add(a.V, b.V)
	} else {
		v, err = Sub(a.V, b.V)
	}
	if err != nil {
		return Dual{}, err
	}
	n, ok := numbers(v)
	if !ok {
		if a.IsConst() && b.IsConst() {
			return Dual{V: v}, nil
		}
		return Dual{}, NoTangent("a sum of %s", TypeName(v))
	}
	s := complex(sign, 0)
	d := Dual{V: v}
	for i := range d.T {
		d.T[i] = a.T[i] + s*b.T[i]
	}
	c := isComplexValue(v)
	d.EV = a.EV + b.EV + round(norm3(n), c)
	d.ET = a.ET + b.ET + round(norm3(d.T), c)
	return d, nil
}

// scalarOf is the number of a quantity or complex value.
func scalarOf(v Value) (complex128, bool) {
	if isVecValue(v) {
		return 0, false
	}
	n, ok := numbers(v)
	return n[0], ok
}

func tanMul(a, b Dual) (Dual, error) {
	v, err := Mul(a.V, b.V)
	if err != nil {
		return Dual{}, err
	}
	n, ok := numbers(v)
	if !ok {
		return Dual{}, NoTangent("a product of %s", TypeName(v))
	}
	// one side is a scalar s (with tangent st); the other x may be a vector
	s, x := a, b
	if _, ok := scalarOf(a.V); !ok {
		s, x = b, a
	}
	sv, ok := scalarOf(s.V)
	if !ok {
		return Dual{}, NoTangent("a product of vectors")
	}
	xn, _ := numbers(x.V)
	st := s.T[0]
	d := Dual{V: v}
	for i := range d.T {
		d.T[i] = st*xn[i] + sv*x.T[i]
	}
	c := isComplexValue(v)
	as, ax := cmplx.Abs(sv), norm3(xn)
	ast, axt := cmplx.Abs(st), norm3(x.T)
	d.EV = s.EV*ax + as*x.EV + round(norm3(n), c)
	d.ET = s.ET*ax + ast*x.EV + s.EV*axt + as*x.ET
	// rounding: each of the two products (u of its size), then their sum
	// (u of the result); with one product zero, that product alone
	if st != 0 && axt != 0 {
		d.ET += round(ast*ax+as*axt, c) + round(norm3(d.T), c)
	} else {
		d.ET += round(norm3(d.T), c)
	}
	return d, nil
}

func tanDiv(a, b Dual) (Dual, error) {
	v, err := Div(a.V, b.V)
	if err != nil {
		return Dual{}, err
	}
	q, ok := numbers(v)
	bv, okb := scalarOf(b.V)
	if !ok || !okb {
		return Dual{}, NoTangent("a quotient of %s", TypeName(v))
	}
	bt := b.T[0]
	d := Dual{V: v}
	for i := range d.T {
		d.T[i] = (a.T[i] - q[i]*bt) / bv
	}
	c := isComplexValue(v)
	ab := cmplx.Abs(bv)
	aq, abt := norm3(q), cmplx.Abs(bt)
	d.EV = (a.EV+aq*b.EV)/ab + round(aq, c)
	at := norm3(d.T)
	d.ET = (a.ET+d.EV*abt+aq*b.ET)/ab + at*b.EV/ab + round(3*at+aq*abt/ab, c)
	return d, nil
}

func tanPow(a, b Dual) (Dual, error) {
	v, err := Pow(a.V, b.V)
	if err != nil {
		return Dual{}, err
	}
	if a.IsConst() && b.IsConst() {
		return Dual{V: v, EV: libAllow * u * cmplx.Abs(mustScalar(v))}, nil
	}
	av, ok1 := scalarOf(a.V)
	bv, ok2 := scalarOf(b.V)
	y, ok3 := scalarOf(v)
	if !ok1 || !ok2 || !ok3 {
		return Dual{}, NoTangent("a power of %s", TypeName(a.V))
	}
	c := isComplexValue(v)
	d := Dual{V: v}
	ay := cmplx.Abs(y)
	if b.IsConst() {
		p := bv
		if p == 0 {
			return Dual{V: v}, nil
		}
		var dp, d2 complex128 // p·a^(p−1) and p(p−1)·a^(p−2)
		if c {
			if av == 0 {
				return Dual{}, NoTangent("a complex power at 0")
			}
			dp = p * cmplx.Pow(av, p-1)
			d2 = p * (p - 1) * cmplx.Pow(av, p-2)
		} else {
			x, pr := real(av), real(p)
			if x == 0 && pr < 1 {
				if a.T[0] == 0 {
					return Dual{}, NoTangentWhy("a power below 1 of a value at 0 whose slope is 0 (infinity times 0)")
				}
				return Dual{}, &InfiniteSlopeError{What: "a power below 1 at 0"}
			}
			dp = complex(pr*math.Pow(x, pr-1), 0)
			if x != 0 || pr >= 2 {
				d2 = complex(pr*(pr-1)*math.Pow(x, pr-2), 0)
			}
		}
		d.T[0] = dp * a.T[0]
		d.EV = cmplx.Abs(dp)*a.EV + libAllow*u*ay
		d.ET = cmplx.Abs(dp)*a.ET + cmplx.Abs(d2)*a.EV*cmplx.Abs(a.T[0]) + libAllow*u*cmplx.Abs(d.T[0]) + round(cmplx.Abs(d.T[0]), c)
		return d, nil
	}
	// a variable exponent: y·(ln a·b' + b·a'/a), for a > 0 (or complex a ≠ 0)
	if av == 0 || (!c && real(av) < 0) {
		return Dual{}, NoTangent("a power with a varying exponent of a number that is not positive")
	}
	var la complex128
	if c {
		la = cmplx.Log(av)
	} else {
		la = complex(math.Log(real(av)), 0)
	}
	g := la*b.T[0] + bv*a.T[0]/av
	d.T[0] = y * g
	aa := cmplx.Abs(av)
	d.EV = ay*(cmplx.Abs(la)*b.EV+cmplx.Abs(bv)*a.EV/aa) + libAllow*u*ay
	eg := (a.EV/aa)*cmplx.Abs(b.T[0]) + cmplx.Abs(la)*b.ET + b.EV*cmplx.Abs(a.T[0])/aa + cmplx.Abs(bv)*(a.ET+cmplx.Abs(a.T[0])*a.EV/aa)/aa
	d.ET = d.EV*cmplx.Abs(g) + ay*eg + libAllow*u*cmplx.Abs(d.T[0])
	return d, nil
}

func mustScalar(v Value) complex128 {
	z, _ := scalarOf(v)
	return z
}

// tanMod is a % b: a − k·b with k = trunc(a/b), which jumps where a/b
// crosses a whole number other than 0 (the remainder wraps).
func tanMod(a, b Dual, side int) (Dual, error) {
	v, err := Mod(a.V, b.V)
	if err != nil {
		return Dual{}, err
	}
	if a.IsConst() && b.IsConst() {
		return Dual{V: v}, nil
	}
	x, y, r := real(a.T[0]), real(b.T[0]), v.(Quantity)
	av, bv := a.V.(Quantity).V, b.V.(Quantity).V
	k := math.Trunc(av / bv)
	if r.V == 0 && av != 0 {
		// the quotient sits on the whole number n = a/b
		n := math.Round(av / bv)
		dq := (x - n*y) / bv // d(a/b)/dt
		if dq != 0 {
			if side == 0 {
				return Dual{}, errOneSided
			}
			if float64(side)*dq*n > 0 { // |a/b| grows: the next period starts at 0
				k = n
				r.V = math.Copysign(0, av)
			} else { // |a/b| shrinks: the previous period ends at ±|b|
				k = n - math.Copysign(1, n)
				r.V = av - k*bv
			}
		}
	}
	t := x - k*y
	return Dual{V: r, T: [3]complex128{complex(t, 0)}, EV: a.EV + math.Abs(k)*b.EV + u*math.Abs(r.V),
		ET: a.ET + math.Abs(k)*b.ET + u*math.Abs(t)}, nil
}

// tanCompare compares Duals: at side 0 as the dispatcher does, except
// that equal values whose tangents differ make the comparison switch at
// the point (errOneSided); at side ±1 such a tie is broken by the
// tangents, as the values compare just before or after.
func tanCompare(name string, a, b Dual, side int) (Dual, error) {
	op := map[string]string{"__eq": "==", "__ne": "!=", "__lt": "<", "__le": "<=", "__gt": ">", "__ge": ">="}[name]
	v, err := Compare(op, a.V, b.V)
	if err != nil {
		return Dual{}, err
	}
	x, okx := a.V.(Quantity)
	y, oky := b.V.(Quantity)
	if a.T == b.T {
		if okx && oky && x.V == y.V && (a.Var || b.Var) {
			// equal values moving alike: which side is larger near the
			// point is a question of higher order
			return Dual{}, NoTangentWhy("a comparison of two equal values with equal slopes, whose order nearby is of higher order")
		}
		return Dual{V: v}, nil
	}
	if !okx || !oky {
		if n1, ok := numbers(a.V); ok {
			if n2, _ := numbers(b.V); n1 == n2 {
				return Dual{}, NoTangent("a comparison of equal vectors or complex values")
			}
		}
		return Dual{V: v}, nil
	}
	if x.V != y.V {
		return Dual{V: v}, nil
	}
	if side == 0 {
		return Dual{}, errOneSided
	}
	m := float64(side) * (real(a.T[0]) - real(b.T[0])) // a − b moves by m·ε
	switch op {
	case "==":
		return Dual{V: false}, nil
	case "!=":
		return Dual{V: true}, nil
	case "<", "<=":
		return Dual{V: m < 0}, nil
	}
	return Dual{V: m > 0}, nil
}
