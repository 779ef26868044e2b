package runtime_test

import (
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// BenchmarkCompiledStatement measures one evaluation of a compiled
// statement whose every operator goes through the unit dispatcher: the cost
// of the unit layer on top of the expression engine.
func BenchmarkCompiledStatement(b *testing.B) {
	s := runtime.NewSession(builtins.Standard())
	for i, line := range []string{"N = 400 turns", "I0 = 2.5 A", "len = 42 mm", "r = 6 mm"} {
		if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, line); err != nil {
			b.Fatal(err)
		}
	}
	c, err := s.CompileExpr(lang.Pos{Line: 9, Col: 1}, "mu0 * N * I0 / len * pi * r^2 + 0.1 mWb")
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := c.Eval(); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkPlainFloat is the same arithmetic in plain Go floats, for scale.
func BenchmarkPlainFloat(b *testing.B) {
	mu0, n, i0, l, r, pi := 1.25663706212e-6, 400.0, 2.5, 0.042, 0.006, 3.141592653589793
	var sink float64
	for b.Loop() {
		sink = mu0*n*i0/l*pi*r*r + 1e-4
	}
	_ = sink
}

// BenchmarkEvalLine measures parse + compile + run of a new line, as the
// prompt does for every line typed.
func BenchmarkEvalLine(b *testing.B) {
	s := runtime.NewSession(builtins.Standard())
	for b.Loop() {
		if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "B = mu0 * 400 * 2.5 A / 42 mm as mT"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkUserCalls calibrates what a user-function call is charged
// against the work budget (runtime.CallEvals): fib(18) makes 8361 calls of
// a small recursive function. It reports ns/call.
func BenchmarkUserCalls(b *testing.B) {
	s := runtime.NewSession(builtins.Standard())
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "fib(n) = n < 2 ? n : fib(n-1) + fib(n-2)"); err != nil {
		b.Fatal(err)
	}
	n := 0
	for b.Loop() {
		if _, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "fib(18)"); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(n*8361), "ns/call")
}
