package builtins_test

import (
	"errors"
	"strings"
	"testing"
	"time"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// evalLines evaluates setup lines in a new session, failing on any error.
func evalLines(t *testing.T, lines ...string) *runtime.Session {
	t.Helper()
	s := runtime.NewSession(builtins.Standard())
	for i, l := range lines {
		if _, err := s.Eval(lang.Pos{File: "work.lw", Line: i + 1, Col: 1}, l); err != nil {
			t.Fatalf("%s: %v", l, err)
		}
	}
	return s
}

// hangGuard bounds how long a refused or interrupted statement may take.
// It guards against a hang (work that was not refused or did not stop);
// it is not a speed claim.
const hangGuard = 5 * time.Second

// TestBudgetRefuses: work far beyond the budget is refused before it
// starts, with a message that states the estimate in evaluations and time
// and how to raise the budget; the error wraps runtime.ErrBudget. The
// cases are the ones that ran for minutes before the budget existed.
func TestBudgetRefuses(t *testing.T) {
	cases := []struct{ name, in string }{
		{"inductance of a 100000-ring stack", "inductance(rings([0,0,0] m, [0,0,1], 10 mm, 1 m, 100000), 0.1 mm)"},
		{"flux of a 100000-turn helix", "flux(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 100000), 1 A), circle([0,0,0.3] m, [0,0,1], 20 mm))"},
		{"surface_flux of a 20000-turn helix", "surface_flux(b_field(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 20000), 1 A)), disk([0,0,0] m, [0,0,1], 5 mm))"},
		{"mutual of two 1000-turn helices on different axes", "mutual(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 1000), helix([0,0,0] m, [0,0.1,1], 20 mm, 1 m, 1000))"},
		{"sample_line of a 100000-turn helix", "sample_line(b_field(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 100000), 1 A)), [0,0,0] m, [0,0,1] m, 1000)"},
		{"sweep of a heavy function", "sweep(heavy, 1 A, 2 A, 100000)"},
		{"sample_line of a slow field function", "sample_line(slow, [0,0,0] m, [0,0,1] m, 20000)"},
		{"sample_line of a region's E", "sample_line(e_field(dfluxdt_toroid([0,0,0] m, [0,0,1], 20 mm, 30 mm, 10 mm, 5 V)), [0,0,0] m, [0,0,1] m, 20000)"},
		{"curl of a 100000-turn helix's field", "curl(b_field(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 100000), 1 A)), [0,0,0.1] m)"},
	}
	s := evalLines(t,
		"src = source(circle([0,0,0] m, [0,0,1], 5 mm), 1 A)",
		"heavy(i) = flux(source(rings([0,0,0] m, [0,0,1], 10 mm, 100 mm, 50), i), circle([0,0,0] m, [0,0,1], 20 mm))",
		"fib(n) = n < 2 ? n : fib(n-1) + fib(n-2)",
		"slow(p) = [0, 0, fib(17)] T",
	)
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			start := time.Now()
			_, err := s.Eval(lang.Pos{File: "work.lw", Line: 9, Col: 1}, c.in)
			if el := time.Since(start); el > hangGuard {
				t.Errorf("took %v", el)
			}
			if !errors.Is(err, runtime.ErrBudget) {
				t.Fatalf("got %v, want an error wrapping ErrBudget", err)
			}
			if _, ok := lang.AsError(err); !ok {
				t.Errorf("not a positioned error: %v", err)
			}
			msg := err.Error()
			for _, w := range []string{"work budget of 5 s", ":budget SECONDS", "-budget SECONDS", "elementary evaluations"} {
				if !strings.Contains(msg, w) {
					t.Errorf("message lacks %q:\n%s", w, msg)
				}
			}
			if !strings.Contains(msg, "a second") {
				t.Errorf("message gives no time estimate:\n%s", msg)
			}
		})
	}
	// the session goes on: a small statement works
	if res, err := s.Eval(lang.Pos{File: "work.lw", Line: 10, Col: 1}, "fib(10)"); err != nil || res.Text != "55" {
		t.Errorf("fib(10) after the refusals: %v, %v", res, err)
	}
}

// TestBudgetCalls: calls of user functions are counted against the budget
// as they happen: fib(40) (about 3e8 calls, minutes of work) is refused
// once its calls have used the budget (here 0.5 s), with a positioned
// message that says so once (not once per level of recursion).
func TestBudgetCalls(t *testing.T) {
	s := evalLines(t, ":budget 0.5", "fib(n) = n < 2 ? n : fib(n-1) + fib(n-2)")
	start := time.Now()
	_, err := s.Eval(lang.Pos{File: "work.lw", Line: 3, Col: 1}, "fib(40)")
	if el := time.Since(start); el > hangGuard {
		t.Errorf("took %v", el)
	}
	if !errors.Is(err, runtime.ErrBudget) {
		t.Fatalf("got %v, want an error wrapping ErrBudget", err)
	}
	le, ok := lang.AsError(err)
	if !ok || le.Pos.Line != 3 {
		t.Fatalf("not positioned on line 3: %v", err)
	}
	if n := strings.Count(le.Msg, "in fib(n)"); n != 1 || !strings.Contains(le.Msg, "work budget of 0.5 s") {
		t.Errorf("message (with %d \"in fib(n)\"): %s", n, le.Msg)
	}
	if res, err := s.Eval(lang.Pos{Line: 4, Col: 1}, "fib(15)"); err != nil || res.Text != "610" {
		t.Errorf("fib(15) after the refusal: %v, %v", res, err)
	}
}

// TestBudgetRaised: :budget raises the budget, and work refused under the
// default then runs (a 200-turn helix's field through a disk inside it:
// estimated at about 8 s of work, which is far more than it takes).
func TestBudgetRaised(t *testing.T) {
	s := evalLines(t, "f = b_field(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 200), 1 A))")
	in := "surface_flux(f, disk([0,0,0] m, [0,0,1], 5 mm))"
	if _, err := s.Eval(lang.Pos{Line: 2, Col: 1}, in); !errors.Is(err, runtime.ErrBudget) {
		t.Fatalf("under the default budget: got %v, want a refusal", err)
	}
	if _, err := s.Eval(lang.Pos{Line: 3, Col: 1}, ":budget 60"); err != nil {
		t.Fatal(err)
	}
	if s.Budget != 60 {
		t.Fatalf(":budget 60 left the budget at %g", s.Budget)
	}
	if _, err := s.Eval(lang.Pos{Line: 4, Col: 1}, in); err != nil {
		t.Fatalf("with :budget 60: %v", err)
	}
	for _, bad := range []string{":budget", ":budget 0", ":budget -1", ":budget NaN", ":budget 1e9", ":budget x"} {
		if _, err := s.Eval(lang.Pos{Line: 5, Col: 1}, bad); err == nil || !strings.Contains(err.Error(), ":budget needs a number of seconds") {
			t.Errorf("%s: got %v", bad, err)
		}
	}
}

// TestInterrupt: Session.Interrupt, called from another goroutine while a
// long statement runs, makes it return a positioned "interrupted" error
// wrapping runtime.ErrInterrupted; the session's names are intact and the
// next statement works. Each statement would run for minutes (the budget
// is raised so that it is not refused); hangGuard is the bound.
func TestInterrupt(t *testing.T) {
	cases := []struct{ name, in string }{
		{"parallel field kernel", "sample_line(b_field(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 20000), 1 A)), [0,0,0] m, [0,0,1] m, 10000)"},
		{"inductance loop", "inductance(rings([0,0,0] m, [0,0,1], 10 mm, 1 m, 100000), 0.1 mm)"},
		{"line integral", "flux(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 100000), 1 A), circle([0,0,0.3] m, [0,0,1], 20 mm))"},
		{"surface integral", "surface_flux(b_field(source(helix([0,0,0] m, [0,0,1], 10 mm, 1 m, 20000), 1 A)), disk([0,0,0] m, [0,0,1], 5 mm))"},
		{"volume cubature", "sample_line(e_field(core), [25,0,-1] mm, [25,0,1] mm, 20000)"},
		{"sweep", "sweep(heavy, 1 A, 2 A, 100000)"},
		{"recursion", "fib(40)"},
		{"user field in a line integral", "circulation(slow, circle([0,0,0] m, [0,0,1], 1 m))"},
	}
	s := evalLines(t,
		":budget 86400",
		"x = 42 mm",
		"core = dfluxdt_toroid([0,0,0] m, [0,0,1], 20 mm, 30 mm, 10 mm, 5 V)",
		"heavy(i) = flux(source(rings([0,0,0] m, [0,0,1], 10 mm, 100 mm, 50), i), circle([0,0,0] m, [0,0,1], 20 mm))",
		"fib(n) = n < 2 ? n : fib(n-1) + fib(n-2)",
		"slow(p) = [0, 0, fib(17)] T",
	)
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			type outcome struct {
				res *runtime.Result
				err error
			}
			done := make(chan outcome, 1)
			go func() {
				res, err := s.Eval(lang.Pos{File: "work.lw", Line: 10 + i, Col: 1}, c.in)
				done <- outcome{res, err}
			}()
			time.Sleep(100 * time.Millisecond)
			start := time.Now()
			s.Interrupt()
			// On a loaded machine the statement may not have started yet
			// (a new statement clears an earlier interrupt): repeat it.
			tick := time.NewTicker(50 * time.Millisecond)
			defer tick.Stop()
			guard := time.After(hangGuard)
			var o outcome
		wait:
			for {
				select {
				case o = <-done:
					break wait
				case <-tick.C:
					s.Interrupt()
				case <-guard:
					t.Fatalf("still running %v after Interrupt", hangGuard)
				}
			}
			t.Logf("stopped %v after Interrupt", time.Since(start))
			if !errors.Is(o.err, runtime.ErrInterrupted) {
				t.Fatalf("got %v, %v; want an error wrapping ErrInterrupted", o.res, o.err)
			}
			le, ok := lang.AsError(o.err)
			if !ok || le.Msg != "interrupted; nothing was changed" || le.Pos.Line != 10+i || le.Pos.File != "work.lw" {
				t.Errorf("want a positioned \"interrupted; nothing was changed\" at work.lw:%d, got %v", 10+i, o.err)
			}
			res, err := s.Eval(lang.Pos{Line: 30, Col: 1}, "x * 2")
			if err != nil || res.Text != "84 mm" {
				t.Errorf("after the interrupt, x * 2 = %v, %v; want 84 mm", res, err)
			}
		})
	}
}

// TestSourceTerms: a source holds at most 10000 currents (doubling one by
// s = s + s stops at the cap with a positioned message), and a source of
// thousands of terms shows a few and counts the rest.
func TestSourceTerms(t *testing.T) {
	s := evalLines(t, "s = source(circle([0,0,0] m, [0,0,1], 1 cm), 2 A)")
	var err error
	var res *runtime.Result
	for i := 0; i < 20 && err == nil; i++ {
		res, err = s.Eval(lang.Pos{Line: 2 + i, Col: 1}, "s = s + s")
		if err == nil && len(res.Text) > 1000 {
			t.Fatalf("the sum of %d terms shows %d characters", 2<<i, len(res.Text))
		}
	}
	if err == nil || !strings.Contains(err.Error(), "a source holds at most 10000") {
		t.Fatalf("doubling 20 times: got %v, want the cap", err)
	}
	if _, ok := lang.AsError(err); !ok {
		t.Errorf("not positioned: %v", err)
	}
	res, err = s.Eval(lang.Pos{Line: 30, Col: 1}, "s")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(res.Text, "and 8188 more terms") || len(res.Text) > 1000 {
		t.Errorf("a source of 8192 terms shows %q", res.Text)
	}
}

// TestSweepFinite: a sweep whose function gives an infinity or NaN is an
// error naming the argument of the row; a range so wide that its width
// overflows still gives finite arguments.
func TestSweepFinite(t *testing.T) {
	s := evalLines(t, "f(x) = x^2", "g(x) = x", "h(x) = 1 / (x - 2 m)")
	for _, c := range []struct{ in, want string }{
		{"sweep(f, -1e300 m, 1e300 m, 5)", "overflows"},
		{"sweep(h, 0 m, 4 m, 3)", "division by zero"},
	} {
		_, err := s.Eval(lang.Pos{Line: 9, Col: 1}, c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.in, err, c.want)
		}
	}
	res, err := s.Eval(lang.Pos{Line: 10, Col: 1}, "sweep(g, -1e308 m, 1e308 m, 3)")
	if err != nil {
		t.Fatal(err)
	}
	tab := res.Value.(runtime.Tabular)
	_, _, rows := tab.Tabulate()
	want := []float64{-1e308, 0, 1e308} // exact: (1 − s)·from + s·to
	for i, r := range rows {
		if r[0] != want[i] || r[1] != want[i] {
			t.Errorf("row %d: %v, want %g", i, r, want[i])
		}
	}
}

// TestProgress: long builtins report their progress through the session,
// labelled with their name, ending with all of their work done.
func TestProgress(t *testing.T) {
	s := evalLines(t,
		"coil = rings([0,0,0] m, [0,0,1], 10 mm, 50 mm, 300)",
		"h = join(helix([0,0,0] m, [0,0,1], 20 mm, 50 mm, 20), segment([20,0,25] mm, [20,0,-25] mm))",
		"g(x) = 2 * x",
	)
	type report struct{ done, total int }
	got := map[string][]report{}
	s.SetProgress(func(label string, done, total int) { got[label] = append(got[label], report{done, total}) })
	for _, c := range []struct{ fn, in string }{
		{"inductance", "inductance(coil, 0.02 mm)"},
		{"sample_line", "sample_line(b_field(source(coil, 1 A)), [0,0,0] m, [0,0,1] m, 1000)"},
		{"flux", "flux(source(coil, 1 A), h)"},
		{"mutual", "mutual(coil, h)"},
		{"sweep", "sweep(g, 0 m, 1 m, 100)"},
	} {
		if _, err := s.Eval(lang.Pos{Line: 9, Col: 1}, c.in); err != nil {
			t.Errorf("%s: %v", c.in, err)
			continue
		}
		r := got[c.fn]
		if len(r) < 2 {
			t.Errorf("%s: %d progress reports labelled %s", c.in, len(r), c.fn)
			continue
		}
		if last := r[len(r)-1]; last.done != last.total {
			t.Errorf("%s: last report %d of %d", c.in, last.done, last.total)
		}
	}
}
