package builtins

import (
	"fmt"
	"math"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

// argError is a bad argument to a builtin.
type argError struct{ msg string }

func (e *argError) Error() string { return e.msg }

func errorf(format string, args ...any) error { return &argError{fmt.Sprintf(format, args...)} }

func ordinal(i int) string {
	return [...]string{"first", "second", "third", "fourth", "fifth", "sixth", "seventh", "eighth", "ninth"}[min(i, 8)]
}

// quantity returns argument i as a quantity.
func quantity(fn string, args []runtime.Value, i int) (runtime.Quantity, error) {
	q, ok := args[i].(runtime.Quantity)
	if !ok {
		if _, c := args[i].(runtime.Complex); c {
			return q, errorf("%s: the %s argument must be a real quantity, not %s; take abs(z), re(z) or im(z) first", fn, ordinal(i), runtime.TypeName(args[i]))
		}
		return q, errorf("%s: the %s argument must be a quantity, not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return q, nil
}

// number returns argument i as a plain (dimensionless) number. An angle is
// not a plain number (plane angle is a dimension in Loopwise); the message
// says how to pass its value in radians.
func number(fn string, args []runtime.Value, i int) (float64, error) {
	q, err := quantity(fn, args, i)
	if err != nil {
		return 0, err
	}
	if q.D == dimAngle {
		return 0, errorf("%s: the %s argument must be a plain number, not an angle; to use the angle's value in radians, divide it by 1 rad", fn, ordinal(i))
	}
	if !q.D.IsZero() {
		return 0, errorf("%s: the %s argument must be a plain number, not %s", fn, ordinal(i), q.D.Describe())
	}
	return q.V, nil
}

// angle returns argument i in radians: a plane angle (rad, deg, rev) or a
// plain number, read as radians.
func angle(fn string, args []runtime.Value, i int) (float64, error) {
	q, err := quantity(fn, args, i)
	if err != nil {
		return 0, err
	}
	if q.D != dimAngle && !q.D.IsZero() {
		return 0, errorf("%s: the %s argument must be an angle (rad, deg, rev) or a plain number in radians, not %s", fn, ordinal(i), q.D.Describe())
	}
	return q.V, nil
}

// vector returns argument i as a vector.
func vector(fn string, args []runtime.Value, i int) (runtime.Vector, error) {
	v, ok := args[i].(runtime.Vector)
	if _, c := args[i].(runtime.CVector); c {
		return v, errorf("%s: the %s argument must be a real vector, not %s; take re(v) or im(v) first (abs(v) is the length of a complex vector)", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	if !ok {
		return v, errorf("%s: the %s argument must be a vector, not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return v, nil
}

func finite(fn string, x float64, d runtime.Dim) (runtime.Value, error) {
	if math.IsNaN(x) {
		return nil, errorf("%s: the argument is outside the function's domain (result is not a number)", fn)
	}
	if math.IsInf(x, 0) {
		return nil, errorf("%s: the result is infinite", fn)
	}
	return runtime.Quantity{V: x, D: d}, nil
}

var (
	dimLength       = mustDim("m")
	dimArea         = mustDim("m^2")
	dimTime         = mustDim("s")
	dimCurrent      = mustDim("A")
	dimTesla        = mustDim("T")
	dimWeber        = mustDim("Wb")
	dimVpot         = mustDim("Wb/m")
	dimVolt         = mustDim("V")
	dimHenry        = mustDim("H")
	dimNewton       = mustDim("N")
	dimSpeed        = mustDim("m/s")
	dimHertz        = mustDim("Hz")
	dimAngle        = mustDim("rad")
	dimVolume       = mustDim("m^3")
	dimEfield       = mustDim("V/m")
	dimRate         = mustDim("T/s")
	dimCharge       = mustDim("C")
	dimJoule        = mustDim("J")
	dimPowerDensity = mustDim("W/m^3")
)

// Limits that keep absurd requests from exhausting memory or time.
const (
	maxPrims  = 200_000   // pieces in one path
	maxPoints = 1_000_000 // field points in one request
	maxTurns  = 100_000   // turns of one helix, ring set or toroid
	maxTerms  = 10_000    // currents (paths with their current) in one source
)

func toVec(v runtime.Vector) em.Vec { return em.Vec{X: v.V[0], Y: v.V[1], Z: v.V[2]} }

func fromVec(v em.Vec, d runtime.Dim) runtime.Vector {
	return runtime.Vector{V: [3]float64{v.X, v.Y, v.Z}, D: d}
}

// point returns argument i as a position (a vector of lengths).
func point(fn string, args []runtime.Value, i int) (em.Vec, error) {
	v, err := vector(fn, args, i)
	if err != nil {
		return em.Vec{}, err
	}
	if v.D != dimLength {
		return em.Vec{}, errorf("%s: the %s argument must be a position in m, not a vector of %s", fn, ordinal(i), v.D.Describe())
	}
	return toVec(v), nil
}

// axis returns argument i as a non-zero direction (any unit).
func axis(fn string, args []runtime.Value, i int) (em.Vec, error) {
	v, err := vector(fn, args, i)
	if err != nil {
		return em.Vec{}, err
	}
	x := toVec(v)
	if x.X == 0 && x.Y == 0 && x.Z == 0 {
		return em.Vec{}, errorf("%s: the %s argument is a direction and must not be the zero vector", fn, ordinal(i))
	}
	return x, nil
}

// positiveLength returns argument i as a length > 0.
func positiveLength(fn string, args []runtime.Value, i int) (float64, error) {
	q, err := quantity(fn, args, i)
	if err != nil {
		return 0, err
	}
	if q.D != dimLength {
		return 0, errorf("%s: the %s argument must be a length, not %s", fn, ordinal(i), q.D.Describe())
	}
	if !(q.V > 0) || math.IsInf(q.V, 0) {
		return 0, errorf("%s: the %s argument must be a positive length, not %s", fn, ordinal(i), runtime.Format(q, 6))
	}
	return q.V, nil
}

// ofDim returns argument i as a quantity of dimension d.
func ofDim(fn string, args []runtime.Value, i int, d runtime.Dim) (float64, error) {
	q, err := quantity(fn, args, i)
	if err != nil {
		return 0, err
	}
	if q.D != d {
		return 0, errorf("%s: the %s argument must be %s, not %s%s", fn, ordinal(i), d.Describe(), q.D.Describe(), runtime.AngleNote(q.D, d))
	}
	return q.V, nil
}

// count returns argument i as a whole number from lo to hi.
func count(fn string, args []runtime.Value, i, lo, hi int) (int, error) {
	x, err := number(fn, args, i)
	if err != nil {
		return 0, err
	}
	if x != math.Trunc(x) || x < float64(lo) || x > float64(hi) {
		return 0, errorf("%s: the %s argument must be a whole number from %d to %d, not %s", fn, ordinal(i), lo, hi, runtime.FormatNumber(x, 6))
	}
	return int(x), nil
}

func pathArg(fn string, args []runtime.Value, i int) (em.Path, error) {
	p, ok := args[i].(*Path)
	if !ok {
		return em.Path{}, errorf("%s: the %s argument must be a path, not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return p.P, nil
}

func sourceArg(fn string, args []runtime.Value, i int) (*Source, error) {
	s, ok := args[i].(*Source)
	if !ok {
		hint := ""
		if _, isPath := args[i].(*Path); isPath {
			hint = " (give the path a current with source(path, I))"
		}
		return nil, errorf("%s: the %s argument must be a source%s, not %s", fn, ordinal(i), hint, runtime.TypeName(args[i]))
	}
	return s, nil
}

// timeArg reads the optional time argument at index i.
func timeArg(fn string, args []runtime.Value, i int) (float64, bool, error) {
	if len(args) <= i {
		return 0, false, nil
	}
	t, err := ofDim(fn, args, i, dimTime)
	return t, true, err
}

func checkPrims(fn string, n int) error {
	if n > maxPrims {
		return errorf("%s: the path would have %d pieces; the limit is %d", fn, n, maxPrims)
	}
	return nil
}

// argReader reads a builtin's arguments in order and keeps the first
// error, so that a builtin's body reads like its signature:
//
//	r := readArgs("circle", args)
//	c, ax, rad := r.point(0), r.axis(1), r.positiveLength(2)
//	if r.err != nil {
//		return nil, r.err
//	}
type argReader struct {
	fn   string
	args []runtime.Value
	err  error
}

func readArgs(fn string, args []runtime.Value) *argReader { return &argReader{fn: fn, args: args} }

func (r *argReader) point(i int) em.Vec {
	if r.err != nil {
		return em.Vec{}
	}
	v, err := point(r.fn, r.args, i)
	r.err = err
	return v
}

func (r *argReader) axis(i int) em.Vec {
	if r.err != nil {
		return em.Vec{}
	}
	v, err := axis(r.fn, r.args, i)
	r.err = err
	return v
}

func (r *argReader) positiveLength(i int) float64 {
	if r.err != nil {
		return 0
	}
	v, err := positiveLength(r.fn, r.args, i)
	r.err = err
	return v
}

func (r *argReader) ofDim(i int, d runtime.Dim) float64 {
	if r.err != nil {
		return 0
	}
	v, err := ofDim(r.fn, r.args, i, d)
	r.err = err
	return v
}

func (r *argReader) angle(i int) float64 {
	if r.err != nil {
		return 0
	}
	v, err := angle(r.fn, r.args, i)
	r.err = err
	return v
}

func (r *argReader) number(i int) float64 {
	if r.err != nil {
		return 0
	}
	v, err := number(r.fn, r.args, i)
	r.err = err
	return v
}

func (r *argReader) count(i, lo, hi int) int {
	if r.err != nil {
		return 0
	}
	v, err := count(r.fn, r.args, i, lo, hi)
	r.err = err
	return v
}

func (r *argReader) path(i int) em.Path {
	if r.err != nil {
		return em.Path{}
	}
	v, err := pathArg(r.fn, r.args, i)
	r.err = err
	return v
}

func (r *argReader) source(i int) *Source {
	if r.err != nil {
		return nil
	}
	v, err := sourceArg(r.fn, r.args, i)
	r.err = err
	return v
}

// time reads the optional time argument at index i.
func (r *argReader) time(i int) (float64, bool) {
	if r.err != nil {
		return 0, false
	}
	t, hasT, err := timeArg(r.fn, r.args, i)
	r.err = err
	return t, hasT
}

// fail records an error unless one is already recorded.
func (r *argReader) fail(err error) {
	if r.err == nil {
		r.err = err
	}
}

// positive reads argument i as a quantity of dimension d above zero.
func (r *argReader) positive(i int, d runtime.Dim) float64 {
	v := r.ofDim(i, d)
	if r.err == nil && !(v > 0) {
		r.err = errorf("%s: the %s argument must be above zero, not %s", r.fn, ordinal(i), runtime.Format(runtime.Quantity{V: v, D: d}, 6))
	}
	return v
}

// nonNegative reads argument i as a quantity of dimension d, zero or more.
func (r *argReader) nonNegative(i int, d runtime.Dim) float64 {
	v := r.ofDim(i, d)
	if r.err == nil && v < 0 {
		r.err = errorf("%s: the %s argument must not be negative, not %s", r.fn, ordinal(i), runtime.Format(runtime.Quantity{V: v, D: d}, 6))
	}
	return v
}
