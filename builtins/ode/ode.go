package ode

import (
	"errors"
	"fmt"
	"math"
)

// Func computes dy = f(t, y). It must not keep y or dy.
type Func func(t float64, y, dy []float64) error

// Jac, when given, writes ∂f/∂y into J (row-major n×n); otherwise it is formed by
// finite differences.
type Jac func(t float64, y []float64, J []float64) error

// Options steer Solve. The zero value asks for the defaults.
type Options struct {
	RelTol, AbsTol float64 // defaults 1e-6 and 1e-9 (AbsTol in the units of y)
	InitialStep    float64 // 0: chosen automatically
	MaxStep        float64 // 0: no limit
	MaxSteps       int     // 0: 100000 (accepted and rejected steps together)
	Jac            Jac
	Check          func() error // polled every step (interrupts, work budget); its error stops
}

// Defaults used where Options leave a field zero.
const (
	DefaultRelTol   = 1e-6
	DefaultAbsTol   = 1e-9
	DefaultMaxSteps = 100000
)

// MinRelTol is the smallest relative tolerance Solve accepts: below it the
// mapped tolerance (see the package doc) would ask for less than about ten
// rounding errors of float64.
const MinRelTol = 1e-13

// Stats counts the work of one Solve.
type Stats struct {
	Steps       int // accepted steps
	Rejected    int // rejected steps: error test failed, Newton did not converge, or f was not finite
	FEvals      int // calls of f, including those for finite-difference Jacobians
	JacEvals    int // Jacobians formed (by Options.Jac or by finite differences)
	LUDecomps   int // LU factorisations of the 3n×3n Newton matrix
	NewtonIters int // simplified Newton iterations, over all attempted steps
}

// The kinds of failure during integration; an *Error wraps one of them.
var (
	ErrStepUnderflow = errors.New("step size underflow")
	ErrTooManySteps  = errors.New("too many steps")
	ErrNonFinite     = errors.New("non-finite value")
	ErrSingular      = errors.New("singular Newton matrix")
)

// Error is a failure during integration at time T.
type Error struct {
	Kind   error   // ErrStepUnderflow, ErrTooManySteps, ErrNonFinite or ErrSingular
	T      float64 // where the integration stood
	H      float64 // the step size last tried (0 if none)
	Detail string  // what happened, in words
}

func (e *Error) Error() string {
	s := fmt.Sprintf("%v at t = %.10g", e.Kind, e.T)
	if e.Detail != "" {
		s += ": " + e.Detail
	}
	return s
}

func (e *Error) Unwrap() error { return e.Kind }

// checkInput refuses what cannot be integrated, before any work.
func checkInput(f Func, t0, t1 float64, y0 []float64, opt *Options) error {
	switch {
	case f == nil:
		return errors.New("no function f given")
	case len(y0) == 0:
		return errors.New("no equations: y0 is empty")
	case math.IsNaN(t0) || math.IsInf(t0, 0):
		return fmt.Errorf("start time t0 = %g is not finite", t0)
	case math.IsNaN(t1) || math.IsInf(t1, 0):
		return fmt.Errorf("end time t1 = %g is not finite", t1)
	case t1 == t0:
		return fmt.Errorf("end time equals start time (t0 = t1 = %g): nothing to integrate", t0)
	}
	for i, v := range y0 {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("initial value y0[%d] = %g is not finite", i, v)
		}
	}
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) || v < 0 }
	switch {
	case bad(opt.RelTol):
		return fmt.Errorf("relative tolerance %g must be finite and not negative", opt.RelTol)
	case bad(opt.AbsTol):
		return fmt.Errorf("absolute tolerance %g must be finite and not negative", opt.AbsTol)
	case bad(opt.InitialStep):
		return fmt.Errorf("initial step %g must be finite and not negative", opt.InitialStep)
	case bad(opt.MaxStep):
		return fmt.Errorf("maximum step %g must be finite and not negative", opt.MaxStep)
	case opt.MaxSteps < 0:
		return fmt.Errorf("maximum number of steps %d must not be negative", opt.MaxSteps)
	}
	if opt.RelTol == 0 {
		opt.RelTol = DefaultRelTol
	}
	if opt.AbsTol == 0 {
		opt.AbsTol = DefaultAbsTol
	}
	if opt.MaxSteps == 0 {
		opt.MaxSteps = DefaultMaxSteps
	}
	if opt.RelTol < MinRelTol {
		return fmt.Errorf("relative tolerance %g is below %g, which float64 cannot deliver", opt.RelTol, MinRelTol)
	}
	if opt.RelTol >= 1 {
		return fmt.Errorf("relative tolerance %g must be below 1", opt.RelTol)
	}
	return nil
}

// Solve integrates y' = f(t, y) from t0, where y = y0, to t1 (which may lie
// before t0) and returns the solution with dense output. See the package
// documentation for the method, the defaults and the errors.
func Solve(f Func, t0, t1 float64, y0 []float64, opt Options) (*Solution, error) {
	if err := checkInput(f, t0, t1, y0, &opt); err != nil {
		return nil, err
	}
	r := newRadau(f, t0, t1, y0, opt)
	err := r.run()
	return r.sol, err
}
