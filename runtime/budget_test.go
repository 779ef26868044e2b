package runtime_test

import (
	"errors"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestBudgetCommand: :budget sets the session's work budget in seconds
// within 0.001 … 86400 and says what it set; anything else is a positioned
// error that leaves the budget as it was.
func TestBudgetCommand(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	if s.Budget != runtime.DefaultBudget || runtime.DefaultBudget != 5 {
		t.Fatalf("a new session's budget is %g, want 5", s.Budget)
	}
	for _, c := range []struct {
		in   string
		want float64
		text string
	}{
		{":budget 30", 30, "work budget 30 s a statement (about 3e+09 elementary evaluations)"},
		{":budget 0.5", 0.5, "work budget 0.5 s a statement (about 5e+07 elementary evaluations)"},
		{":budget 3600", 3600, "work budget 60 min a statement (about 3.6e+11 elementary evaluations)"},
	} {
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		if err != nil {
			t.Fatalf("%s: %v", c.in, err)
		}
		if s.Budget != c.want || res.Text != c.text {
			t.Errorf("%s: budget %g, %q; want %g, %q", c.in, s.Budget, res.Text, c.want, c.text)
		}
	}
	for _, bad := range []string{":budget", ":budget 0", ":budget 0.0001", ":budget 86401", ":budget Inf", ":budget 5 min"} {
		_, err := s.Eval(lang.Pos{Line: 2, Col: 1}, bad)
		if _, ok := lang.AsError(err); !ok || !strings.Contains(err.Error(), ":budget needs a number of seconds from 0.001 to 86400") {
			t.Errorf("%s: got %v", bad, err)
		}
		if s.Budget != 3600 {
			t.Errorf("%s changed the budget to %g", bad, s.Budget)
		}
	}
}

// TestBudgetError: Charge refuses work beyond the budget without charging
// it, Afford only checks, and the message states the estimate in
// evaluations and time (at runtime.EvalsPerSecond) and how to raise the
// budget.
func TestBudgetError(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	if err := s.Charge("x", 4e8); err != nil { // 4 s of the 5
		t.Fatal(err)
	}
	err := s.Afford("work", 2e8)
	var be *runtime.BudgetError
	if !errors.As(err, &be) || !errors.Is(err, runtime.ErrBudget) {
		t.Fatalf("Afford over the budget: got %v", err)
	}
	want := "work: this needs about 2e+08 elementary evaluations (about 2 s at about 1e+08 a second), more than the work budget of 5 s; raise it with :budget SECONDS at the prompt or -budget SECONDS for run, check and record, or ask for less"
	if err.Error() != want {
		t.Errorf("message\n%s\nwant\n%s", err, want)
	}
	if err := s.Charge("work", 2e8); err == nil || s.Spent() != 4e8 {
		t.Errorf("a refused Charge: %v, spent %g (want 4e8)", err, s.Spent())
	}
	if err := s.Afford("work", 1e8); err != nil || s.Spent() != 4e8 {
		t.Errorf("Afford within the budget: %v, spent %g", err, s.Spent())
	}
	// a new statement starts afresh
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "1 + 1"); err != nil || s.Spent() != 0 {
		t.Errorf("after a statement: %v, spent %g", err, s.Spent())
	}
}

// TestSeconds: rough durations in messages.
func TestSeconds(t *testing.T) {
	for _, c := range []struct {
		s    float64
		want string
	}{{0.06, "0.06 s"}, {2, "2 s"}, {4.5, "4.5 s"}, {60, "60 s"}, {150, "2 min"}, {2520, "42 min"}, {7920, "2.2 h"}, {1e6, "12 days"}} {
		if got := runtime.Seconds(c.s); got != c.want {
			t.Errorf("Seconds(%g) = %q, want %q", c.s, got, c.want)
		}
	}
}
