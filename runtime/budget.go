package runtime

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// The work budget bounds how long one statement may compute. Builtins that
// can run long estimate their cost before they start, in elementary
// evaluations (one straight segment's field at one point is one), and
// refuse work that would not fit; user-function calls are counted against
// the same budget as they happen. The budget is in seconds of work,
// converted to evaluations at EvalsPerSecond.
const (
	// EvalsPerSecond is about how many elementary evaluations one core
	// does in a second: BenchmarkElementaryEval in builtins/em measures
	// about 11 ns each (about 9e7 a second) on an idle two-core x86-64
	// virtual machine of the kind Loopwise is developed on, rounded to
	// 1e8; two to five times slower when the machine is busy.
	EvalsPerSecond = 1e8
	// CallEvals is what one call of a user function is charged, in
	// elementary evaluations: BenchmarkUserCalls in runtime measures about
	// 1.4 µs per call of a small recursive function on the same machine
	// when idle (up to 4.5 µs when busy), the time of about 150
	// evaluations.
	CallEvals = 150
	// DefaultBudget is the budget of a new session, in seconds of work
	// (the prompt's default).
	DefaultBudget = 5.0
	// ScriptBudget is the budget of loopwise run, check and record unless
	// -budget says otherwise, in seconds of work.
	ScriptBudget = 60.0
	// MaxBudget is the largest budget :budget and -budget accept (a day).
	MaxBudget = 86400.0
)

// ErrBudget is wrapped by the error of work refused by the work budget.
var ErrBudget = errors.New("more work than the budget")

// BudgetError is work refused by the work budget.
type BudgetError struct {
	Label   string  // the builtin or function that asked
	Evals   float64 // the estimate (or, for calls, the work done so far)
	Budget  float64 // the budget in seconds
	Running bool    // counted as it happened (calls), not estimated before
}

func (e *BudgetError) Error() string {
	how := "raise it with :budget SECONDS at the prompt or -budget SECONDS for run, check and record"
	if e.Running {
		return fmt.Sprintf("%s: the work of this statement has used up the work budget of %s (about %s elementary evaluations, user-function calls counted as %d each); %s, or ask for less",
			e.Label, Seconds(e.Budget), Count(e.Evals), CallEvals, how)
	}
	return fmt.Sprintf("%s: this needs about %s elementary evaluations (about %s at about %s a second), more than the work budget of %s; %s, or ask for less",
		e.Label, Count(e.Evals), Seconds(e.Evals/EvalsPerSecond), Count(EvalsPerSecond), Seconds(e.Budget), how)
}

func (e *BudgetError) Unwrap() error { return ErrBudget }

// Count shows a large count briefly: 1200, 3.4e+07.
func Count(x float64) string {
	if x < 1e5 {
		return strconv.FormatFloat(math.Round(x), 'f', -1, 64)
	}
	return strconv.FormatFloat(x, 'g', 2, 64)
}

// Seconds shows a duration given in seconds roughly: 3 s, 4 min, 2.5 h.
func Seconds(s float64) string {
	switch {
	case s < 1:
		return strings.TrimSuffix(strconv.FormatFloat(s, 'g', 1, 64), ".0") + " s"
	case s < 10:
		return strconv.FormatFloat(s, 'g', 2, 64) + " s"
	case s < 120:
		return strconv.FormatFloat(s, 'f', 0, 64) + " s"
	case s < 7200:
		return strconv.FormatFloat(s/60, 'f', 0, 64) + " min"
	case s < 2*86400:
		return strconv.FormatFloat(s/3600, 'g', 2, 64) + " h"
	}
	return strconv.FormatFloat(s/86400, 'g', 2, 64) + " days"
}

// limit is the budget in evaluations.
func (s *Session) limit() float64 { return s.Budget * EvalsPerSecond }

// Afford implements Env.
func (s *Session) Afford(label string, evals float64) error {
	if !(s.work+evals <= s.limit()) { // NaN refused too
		return &BudgetError{Label: label, Evals: evals, Budget: s.Budget}
	}
	return nil
}

// Charge implements Env.
func (s *Session) Charge(label string, evals float64) error {
	if err := s.Afford(label, evals); err != nil {
		return err
	}
	s.work += evals
	return nil
}

// Spent implements Env.
func (s *Session) Spent() float64 { return s.work }

// chargeCall counts one user-function call; it is refused when the
// statement's work is over the budget.
func (s *Session) chargeCall(name string) error {
	s.work += CallEvals
	if s.work > s.limit() {
		return &BudgetError{Label: name, Evals: s.work, Budget: s.Budget, Running: true}
	}
	return nil
}

// SetBudget sets the work budget in seconds (from 0.001 up to MaxBudget).
func (s *Session) SetBudget(seconds float64) error {
	if !(seconds >= 0.001 && seconds <= MaxBudget) {
		return fmt.Errorf("the work budget must be a number of seconds from 0.001 to %g", MaxBudget)
	}
	s.Budget = seconds
	return nil
}
