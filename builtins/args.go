package builtins

import (
	"fmt"
	"math"

	"loopwise/runtime"
)

// argError is a bad argument to a builtin.
type argError struct{ msg string }

func (e *argError) Error() string { return e.msg }

func errorf(format string, args ...any) error { return &argError{fmt.Sprintf(format, args...)} }

func ordinal(i int) string {
	return [...]string{"first", "second", "third", "fourth", "fifth", "sixth"}[min(i, 5)]
}

// quantity returns argument i as a quantity.
func quantity(fn string, args []runtime.Value, i int) (runtime.Quantity, error) {
	q, ok := args[i].(runtime.Quantity)
	if !ok {
		return q, errorf("%s: the %s argument must be a quantity, not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return q, nil
}

// number returns argument i as a dimensionless number (angles in radians
// are dimensionless).
func number(fn string, args []runtime.Value, i int) (float64, error) {
	q, err := quantity(fn, args, i)
	if err != nil {
		return 0, err
	}
	if !q.D.IsZero() {
		return 0, errorf("%s: the %s argument must be dimensionless (an angle in rad or deg, or a plain number), not %s", fn, ordinal(i), q.D.Describe())
	}
	return q.V, nil
}

// vector returns argument i as a vector.
func vector(fn string, args []runtime.Value, i int) (runtime.Vector, error) {
	v, ok := args[i].(runtime.Vector)
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
