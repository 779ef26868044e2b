package runtime

import (
	"fmt"
	"math"
)

// DimError is a dimension or type mismatch found while evaluating.
type DimError struct{ Msg string }

func (e *DimError) Error() string { return e.Msg }

// EvalError is any other problem found while evaluating (division by zero,
// a value out of a function's domain, a wrong argument count).
type EvalError struct{ Msg string }

func (e *EvalError) Error() string { return e.Msg }

// causedError is an evaluation error that keeps the cause of a positioned
// error it passes on (ErrInterrupted, ErrBudget), if any.
type causedError struct {
	msg   string
	cause error
}

func (e *causedError) Error() string { return e.msg }
func (e *causedError) Unwrap() error { return e.cause }

func dimErr(format string, args ...any) error  { return &DimError{fmt.Sprintf(format, args...)} }
func evalErr(format string, args ...any) error { return &EvalError{fmt.Sprintf(format, args...)} }

// normalize turns Go numbers that can appear inside the engine into
// quantities.
func normalize(v Value) Value {
	switch x := v.(type) {
	case float64:
		return Num(x)
	case int:
		return Num(float64(x))
	}
	return v
}

func checkFinite(q Quantity, what string) (Value, error) {
	if math.IsNaN(q.V) {
		return nil, evalErr("%s is not a number (NaN)", what)
	}
	if math.IsInf(q.V, 0) {
		return nil, evalErr("%s overflows to infinity", what)
	}
	return q, nil
}

// vectorComplex reports operands that make a complex vector: a complex
// vector on either side, or a complex scalar with a real vector.
func vectorComplex(a, b Value) bool {
	if isCVector(a) || isCVector(b) {
		return true
	}
	_, va := a.(Vector)
	_, vb := b.(Vector)
	return isComplex(a, b) && (va || vb)
}

// Add is a + b.
func Add(a, b Value) (Value, error) { return addSub(a, b, 1, "add", "+") }

// Sub is a - b.
func Sub(a, b Value) (Value, error) { return addSub(a, b, -1, "subtract", "-") }

func addSub(a, b Value, sign float64, verb, op string) (Value, error) {
	a, b = normalize(a), normalize(b)
	if x, ok := a.(Adder); ok && sign > 0 {
		return x.Plus(b)
	}
	if vectorComplex(a, b) {
		return cvectorArith(op, a, b)
	}
	if isComplex(a, b) {
		return complexArith(op, a, b)
	}
	switch x := a.(type) {
	case Quantity:
		if y, ok := b.(Quantity); ok {
			if x.D != y.D {
				return nil, dimErr("cannot %s %s and %s%s", verb, x.D.Describe(), y.D.Describe(), angleNote(x.D, y.D))
			}
			return checkFinite(Quantity{V: x.V + sign*y.V, D: x.D, Cyc: x.Cyc && y.Cyc}, "the result of "+op)
		}
	case Vector:
		if y, ok := b.(Vector); ok {
			if x.D != y.D {
				return nil, dimErr("cannot %s vectors of %s and of %s", verb, x.D.Describe(), y.D.Describe())
			}
			return checkFiniteVec(Vector{[3]float64{x.V[0] + sign*y.V[0], x.V[1] + sign*y.V[1], x.V[2] + sign*y.V[2]}, x.D})
		}
	}
	return nil, dimErr("cannot %s %s and %s", verb, sumTerm(a), sumTerm(b))
}

// sumTerm names a term of a sum that does not fit the other: a single
// quantity is called one, so that it reads apart from a vector of the
// same dimension ("a vector of length (m) and a single length (m)").
func sumTerm(v Value) string {
	if q, ok := v.(Quantity); ok && !q.D.IsZero() {
		return "a single " + q.D.Describe()
	}
	return TypeName(v)
}

// dimOf returns the dimension of a quantity or vector.
func dimOf(v Value) (Dim, bool) {
	switch x := v.(type) {
	case Quantity:
		return x.D, true
	case Vector:
		return x.D, true
	}
	return Dim{}, false
}

// productDim is the dimension of a*b (q = 1) or a/b (q = -1).
func productDim(a, b Value, q int) (Dim, error) {
	da, _ := dimOf(a)
	db, _ := dimOf(b)
	d, ok := da.Combine(1, db, q)
	if !ok {
		return d, dimErr("%s", errExpRange)
	}
	return d, nil
}

// Mul is a * b: quantities, or a vector scaled by a quantity.
func Mul(a, b Value) (Value, error) {
	a, b = normalize(a), normalize(b)
	if vectorComplex(a, b) {
		return cvectorArith("*", a, b)
	}
	if isComplex(a, b) {
		return complexArith("*", a, b)
	}
	_, okA := dimOf(a)
	_, okB := dimOf(b)
	if !okA || !okB {
		return nil, dimErr("cannot multiply %s and %s", TypeName(a), TypeName(b))
	}
	d, err := productDim(a, b, 1)
	if err != nil {
		return nil, err
	}
	switch x := a.(type) {
	case Quantity:
		switch y := b.(type) {
		case Quantity:
			return checkFinite(Quantity{V: x.V * y.V, D: d}, "the product")
		case Vector:
			return scaleVec(y, x.V, d)
		}
	case Vector:
		switch y := b.(type) {
		case Quantity:
			return scaleVec(x, y.V, d)
		case Vector:
			return nil, dimErr("cannot multiply two vectors with *; use dot(a, b) or cross(a, b)")
		}
	}
	return nil, dimErr("cannot multiply %s and %s", TypeName(a), TypeName(b))
}

// scaleVec returns v·s with the dimension d of the product.
func scaleVec(v Vector, s float64, d Dim) (Value, error) {
	return checkFiniteVec(Vector{[3]float64{v.V[0] * s, v.V[1] * s, v.V[2] * s}, d})
}

func checkFiniteVec(v Vector) (Value, error) {
	for _, c := range v.V {
		if _, err := checkFinite(Quantity{V: c}, "a component of the vector"); err != nil {
			return nil, err
		}
	}
	return v, nil
}

// Div is a / b.
func Div(a, b Value) (Value, error) {
	a, b = normalize(a), normalize(b)
	if vectorComplex(a, b) {
		return cvectorArith("/", a, b)
	}
	if isComplex(a, b) {
		return complexArith("/", a, b)
	}
	y, ok := b.(Quantity)
	if !ok {
		return nil, dimErr("cannot divide %s by %s", TypeName(a), TypeName(b))
	}
	if y.V == 0 {
		return nil, evalErr("division by zero")
	}
	if _, ok := dimOf(a); !ok {
		return nil, dimErr("cannot divide %s by %s", TypeName(a), TypeName(b))
	}
	d, err := productDim(a, b, -1)
	if err != nil {
		return nil, err
	}
	switch x := a.(type) {
	case Quantity:
		return checkFinite(Quantity{V: x.V / y.V, D: d}, "the quotient")
	case Vector:
		return checkFiniteVec(Vector{[3]float64{x.V[0] / y.V, x.V[1] / y.V, x.V[2] / y.V}, d})
	}
	return nil, dimErr("cannot divide %s by %s", TypeName(a), TypeName(b))
}

// Mod is the remainder a % b of quantities of the same dimension.
func Mod(a, b Value) (Value, error) {
	a, b = normalize(a), normalize(b)
	x, ok1 := a.(Quantity)
	y, ok2 := b.(Quantity)
	if !ok1 || !ok2 {
		return nil, dimErr("cannot take the remainder of %s by %s", TypeName(a), TypeName(b))
	}
	if x.D != y.D {
		return nil, dimErr("cannot take the remainder of %s by %s%s", x.D.Describe(), y.D.Describe(), angleNote(x.D, y.D))
	}
	if y.V == 0 {
		return nil, evalErr("remainder by zero")
	}
	return Quantity{V: math.Mod(x.V, y.V), D: x.D, Cyc: x.Cyc && y.Cyc}, nil
}

// Pow is a ^ b. The exponent is dimensionless; a quantity with a dimension
// may be raised only to powers that give whole exponents of every base unit
// (so (m^2)^0.5 works, m^0.5 does not). As in mathematics, ^ groups from
// the right: a^2^0.5 is a^(2^0.5), which no unit allows.
func Pow(a, b Value) (Value, error) {
	a, b = normalize(a), normalize(b)
	if isComplex(a, b) {
		return complexPow(a, b)
	}
	x, ok1 := a.(Quantity)
	y, ok2 := b.(Quantity)
	if !ok1 || !ok2 {
		return nil, dimErr("cannot raise %s to %s", TypeName(a), TypeName(b))
	}
	if !y.D.IsZero() {
		return nil, dimErr("an exponent must be dimensionless, not %s", y.D.Describe())
	}
	var d Dim
	if !x.D.IsZero() {
		for i, e := range x.D {
			p := float64(e) * y.V
			r := math.Round(p)
			if math.Abs(p-r) > 1e-9 {
				return nil, dimErr("cannot raise %s to the power %s: the unit would need a fractional exponent", x.D.Describe(), FormatNumber(y.V, 6))
			}
			if math.Abs(r) > maxExp {
				return nil, dimErr("cannot raise %s to the power %s: %s", x.D.Describe(), FormatNumber(y.V, 6), errExpRange)
			}
			d[i] = int8(r)
		}
	}
	if x.V == 0 && y.V < 0 {
		return nil, evalErr("zero raised to a negative power (division by zero)")
	}
	return checkFinite(Quantity{V: math.Pow(x.V, y.V), D: d}, "the power")
}

// Neg is -a.
func Neg(a Value) (Value, error) {
	switch x := normalize(a).(type) {
	case Quantity:
		return Quantity{V: -x.V, D: x.D, Cyc: x.Cyc}, nil
	case Vector:
		return Vector{[3]float64{-x.V[0], -x.V[1], -x.V[2]}, x.D}, nil
	case Complex:
		return Complex{V: -x.V, D: x.D}, nil
	case CVector:
		return CVector{V: [3]complex128{-x.V[0], -x.V[1], -x.V[2]}, D: x.D}, nil
	}
	return nil, dimErr("cannot negate %s", TypeName(a))
}

// Compare implements ==, !=, <, <=, >, >=.
func Compare(op string, a, b Value) (Value, error) {
	a, b = normalize(a), normalize(b)
	if isCVector(a) || isCVector(b) {
		x, okA := asCVector(a)
		y, okB := asCVector(b)
		if !okA || !okB || (op != "==" && op != "!=") {
			return nil, dimErr("cannot compare %s with %s using %s", TypeName(a), TypeName(b), op)
		}
		if x.D != y.D {
			return nil, dimErr("cannot compare vectors of %s and of %s", x.D.Describe(), y.D.Describe())
		}
		return (x.V == y.V) == (op == "=="), nil
	}
	if isComplex(a, b) {
		return compareComplex(op, a, b)
	}
	switch x := a.(type) {
	case Quantity:
		y, ok := b.(Quantity)
		if !ok {
			break
		}
		if x.D != y.D {
			return nil, dimErr("cannot compare %s with %s%s", x.D.Describe(), y.D.Describe(), angleNote(x.D, y.D))
		}
		switch op {
		case "==":
			return x.V == y.V, nil
		case "!=":
			return x.V != y.V, nil
		case "<":
			return x.V < y.V, nil
		case "<=":
			return x.V <= y.V, nil
		case ">":
			return x.V > y.V, nil
		case ">=":
			return x.V >= y.V, nil
		}
	case Vector:
		y, ok := b.(Vector)
		if !ok || (op != "==" && op != "!=") {
			break
		}
		if x.D != y.D {
			return nil, dimErr("cannot compare vectors of %s and of %s", x.D.Describe(), y.D.Describe())
		}
		return (x.V == y.V) == (op == "=="), nil
	case bool:
		y, ok := b.(bool)
		if !ok || (op != "==" && op != "!=") {
			break
		}
		return (x == y) == (op == "=="), nil
	}
	return nil, dimErr("cannot compare %s with %s using %s", TypeName(a), TypeName(b), op)
}

// MakeVector builds a vector from three quantities of one dimension. A
// plain zero fits any dimension, so [-p.y, p.x, 0] works for lengths.
func MakeVector(args []Value) (Value, error) {
	if len(args) != 3 {
		return nil, evalErr("a vector needs exactly 3 components, got %d", len(args))
	}
	var v Vector
	var qs [3]Quantity
	first := -1
	for i, a := range args {
		if _, c := a.(Complex); c {
			return makeCVector(args)
		}
		q, ok := normalize(a).(Quantity)
		if !ok {
			return nil, dimErr("vector component %d is %s, not a quantity", i+1, TypeName(a))
		}
		qs[i] = q
		if first < 0 && !(q.V == 0 && q.D.IsZero()) {
			first = i
		}
	}
	if first >= 0 {
		v.D = qs[first].D
	}
	for i, q := range qs {
		if q.D != v.D && !(q.V == 0 && q.D.IsZero()) {
			return nil, dimErr("vector components must share one dimension: component %d is %s, component %d is %s", first+1, v.D.Describe(), i+1, q.D.Describe())
		}
		v.V[i] = q.V
	}
	return v, nil
}

// Component returns component i (0, 1, 2) of a vector.
func Component(v Value, i int) (Value, error) {
	if c, ok := v.(CVector); ok {
		return Complex{V: c.V[i], D: c.D}, nil
	}
	x, ok := v.(Vector)
	if !ok {
		return nil, dimErr("only a vector has components .x, .y, .z; this is %s", TypeName(v))
	}
	return Quantity{V: x.V[i], D: x.D}, nil
}

// AngleNote is angleNote for builtins: "" or "; ..." explaining how to
// fix a value whose dimension differs from the wanted one only by a power
// of angle.
func AngleNote(got, want Dim) string { return angleNote(got, want) }

// angleNote explains a mismatch of dimensions that differ only in their
// power of plane angle, such as rad/s against s^-1: the radian is never
// added or dropped silently.
func angleNote(a, b Dim) string {
	k := angleGap(a, b)
	switch {
	case k == 0:
		return ""
	case a.IsZero() || b.IsZero():
		return "; an angle is not a plain number: if the plain number is an angle in radians (as a phase 2*pi*f*t is), multiply it by 1 rad; otherwise write the number with a unit (0.5 rad, 30 deg), or divide the angle by 1 rad for its value in radians"
	case (a == dFreq && b == dAngle.Div(dTime)) || (b == dFreq && a == dAngle.Div(dTime)):
		return "; a frequency (Hz, s^-1) counts cycles, an angular velocity (rad/s) turns an angle: an angular velocity is a frequency times 1 rev (one cycle is 2π rad), a frequency is an angular velocity divided by 1 rev; a bare 2*pi*f becomes rad/s times 1 rad"
	}
	return fmt.Sprintf("; they differ by rad^%d: multiply or divide by 1 rad where the angle belongs", k)
}

// angleGap returns b's power of angle minus a's when a and b differ in
// nothing else, and 0 otherwise.
func angleGap(a, b Dim) int {
	if a == b {
		return 0
	}
	ka, kb := a[Angle], b[Angle]
	a[Angle], b[Angle] = 0, 0
	if a != b {
		return 0
	}
	return int(kb) - int(ka)
}

// makeCVector builds a complex vector from three real or complex
// quantities of one dimension (a plain zero fits any).
func makeCVector(args []Value) (Value, error) {
	var zs [3]Complex
	first := -1
	for i, a := range args {
		z, ok := AsComplex(a)
		if !ok {
			return nil, dimErr("vector component %d is %s, not a quantity", i+1, TypeName(a))
		}
		zs[i] = z
		if first < 0 && !(z.V == 0 && z.D.IsZero()) {
			first = i
		}
	}
	var v CVector
	if first >= 0 {
		v.D = zs[first].D
	}
	for i, z := range zs {
		if z.D != v.D && !(z.V == 0 && z.D.IsZero()) {
			return nil, dimErr("vector components must share one dimension: component %d is %s, component %d is %s", first+1, v.D.Describe(), i+1, z.D.Describe())
		}
		v.V[i] = z.V
	}
	return v, nil
}
