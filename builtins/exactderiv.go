package builtins

import (
	"errors"
	"fmt"

	"loopwise/runtime"
)

// Exact derivatives of user functions (runtime.Func.Derivative, forward-
// mode automatic differentiation) for emf's dI/dt, the induced E of
// sources, ddt, deriv, curl and div; step differences (em.DerivativeEst,
// em.Jacobian) remain for what a derivative cannot flow through, and the
// result's note says so.

// tangentOf differentiates f at args along dir of argument i. It returns
// the Dual, or a reason (for the note) when the derivative cannot flow and
// the caller should use differences, or an error: a stop (interrupt,
// budget), a *runtime.KinkError, *runtime.JumpError or
// *runtime.InfiniteSlopeError.
func tangentOf(env runtime.Env, f *runtime.Func, args []runtime.Value, i int, dir [3]float64) (runtime.Dual, string, error) {
	d, err := f.Derivative(env, args, i, dir)
	if err == nil {
		return d, "", nil
	}
	var nt *runtime.NoTangentError
	var ke *runtime.KinkError
	var je *runtime.JumpError
	var ie *runtime.InfiniteSlopeError
	switch {
	case stopping(err), errors.As(err, &ke), errors.As(err, &je), errors.As(err, &ie):
		return runtime.Dual{}, "", err
	case errors.As(err, &nt):
		return runtime.Dual{}, nt.Error(), nil
	}
	// an error on Duals: the differences will meet it again, or show that
	// it was met only on one side
	return runtime.Dual{}, "its evaluation stopped: " + err.Error(), nil
}

// noteDifferences says on the result that a derivative was taken by
// differences.
func noteDifferences(env runtime.Env, fn string, f *runtime.Func, reason string) {
	runtime.AddNote(env, fmt.Sprintf("%s: the derivative of %s is by step differences, not exact (%s); its error estimate is the differences' own", fn, f.Signature(), lineOf(reason)))
}

// lineOf keeps the first line of a message, shortened.
func lineOf(s string) string {
	for i, r := range s {
		if r == '\n' {
			s = s[:i]
			break
		}
	}
	if len([]rune(s)) > 160 {
		s = string([]rune(s)[:160]) + "…"
	}
	return s
}

// realTangent is the tangent of a real quantity or vector as an em.Vec,
// and whether it is a vector; ok is false for other values.
func realTangent(d runtime.Dual) (v [3]float64, dim runtime.Dim, vec, ok bool) {
	switch x := d.V.(type) {
	case runtime.Quantity:
		return [3]float64{real(d.T[0])}, x.D, false, true
	case runtime.Vector:
		return [3]float64{real(d.T[0]), real(d.T[1]), real(d.T[2])}, x.D, true, true
	}
	return v, dim, false, false
}
