package builtins_test

import (
	"testing"

	"loopwise/builtins"
	"loopwise/builtins/em"
	"loopwise/lang"
	"loopwise/runtime"
)

// benchCurrent is a current function as emf differentiates it.
func benchCurrent(b *testing.B) (*runtime.Session, *runtime.Func) {
	s := runtime.NewSession(builtins.Standard())
	r, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "I(t) = 2 A * exp(-t/(4 ms)) * sin(2*pi*50 Hz*t)")
	if err != nil {
		b.Fatal(err)
	}
	return s, r.Value.(*runtime.Func)
}

// BenchmarkDerivExact: one exact dI/dt (a walk of the body on Duals).
func BenchmarkDerivExact(b *testing.B) {
	s, f := benchCurrent(b)
	arg := []runtime.Value{runtime.Quantity{V: 3e-3, D: runtime.Dim{runtime.Time: 1}}}
	for b.Loop() {
		if _, err := f.Derivative(s, arg, 0, [3]float64{1}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkDerivDifferences: the same rate by the step search (em.DerivativeEst
// on ordinary calls), the route the exact one replaces.
func BenchmarkDerivDifferences(b *testing.B) {
	s, f := benchCurrent(b)
	g := func(x float64) (em.Vec, error) {
		v, err := f.Invoke(s, []runtime.Value{runtime.Quantity{V: x, D: runtime.Dim{runtime.Time: 1}}})
		if err != nil {
			return em.Vec{}, err
		}
		return em.Vec{X: v.(runtime.Quantity).V}, nil
	}
	for b.Loop() {
		if _, _, err := em.DerivativeEst(g, 3e-3, 1, -12, true); err != nil {
			b.Fatal(err)
		}
	}
}
