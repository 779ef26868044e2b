package runtime_test

import (
	"strings"
	"testing"
	"time"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestInterruptUserRecursion: Interrupt from another goroutine stops a
// user function that calls itself millions of times (fib(40) makes about
// 3e8 calls); the statement ends with one short positioned message, the
// session keeps its names, and the next statement runs normally. The time
// bound guards against a hang only.
func TestInterruptUserRecursion(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for i, line := range []string{"fib(n) = n < 2 ? n : fib(n-1) + fib(n-2)", "kept = 3 mm"} {
		if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, line); err != nil {
			t.Fatal(err)
		}
	}
	done := make(chan error, 1)
	go func() {
		_, err := s.Eval(lang.Pos{Line: 3, Col: 1}, "kept = fib(40)")
		done <- err
	}()
	time.Sleep(100 * time.Millisecond)
	s.Interrupt()
	var err error
	select {
	case err = <-done:
	case <-time.After(30 * time.Second):
		t.Fatal("the statement did not stop within 30 s of Interrupt")
	}
	want := "3:1: interrupted; nothing was changed\n    kept = fib(40)\n    ^^^^^^^^^^^^^^"
	if err == nil || err.Error() != want {
		t.Fatalf("error %v\nwant %s", err, want)
	}
	res, err := s.Eval(lang.Pos{Line: 4, Col: 1}, "kept * 2")
	if err != nil || !strings.HasPrefix(res.Text, "6 mm") {
		t.Errorf("after the interrupt: %v, %v", res, err)
	}
}
