package builtins_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"loopwise/builtins"
	"loopwise/builtins/em"
	"loopwise/lang"
	"loopwise/runtime"
)

// randomExpr builds a smooth expression in x of the given depth (plain
// numbers; arguments kept in the functions' domains).
func randomExpr(r *rand.Rand, depth int) string {
	if depth == 0 {
		if r.IntN(3) == 0 {
			return fmt.Sprintf("%.3g", 0.5+r.Float64()*2)
		}
		return "x"
	}
	a, b := randomExpr(r, depth-1), randomExpr(r, depth-1)
	switch r.IntN(14) {
	case 0:
		return "(" + a + " + " + b + ")"
	case 1:
		return "(" + a + " - " + b + ")"
	case 2:
		return "(" + a + " * " + b + ")"
	case 3:
		return "(" + a + " / (1.5 + (" + b + ")^2))"
	case 4:
		return "sin(" + a + ")"
	case 5:
		return "cos(" + a + ")"
	case 6:
		return "exp(tanh(" + a + "))"
	case 7:
		return "sqrt(1 + (" + a + ")^2)"
	case 8:
		return "(atan(" + a + ")/(1 rad))"
	case 9:
		return "hypot(" + a + ", 0.7)"
	case 10:
		return "(" + a + ")^3"
	case 11:
		return "ln(2 + sin(" + a + "))"
	case 12:
		return "(atan2(" + a + ", 2 + cos(" + b + "))/(1 rad))"
	}
	return "g(" + a + ")" // a user function inside
}

// TestExactMatchesDifferences cross-checks the exact derivatives against
// the step search of em.DerivativeEst on ordinary calls of the same
// function, a route that shares no code with the tangent propagation
// (only the values). 300 random smooth expressions with a fixed seed,
// at random points: agreement within the differences' own error estimate
// plus 1e-9 of the derivative's scale (the plateau test accepts 1e-6 of
// it; the estimate is the tighter bound where it holds).
func TestExactMatchesDifferences(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	s := runtime.NewSession(builtins.Standard())
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "g(y) = y * exp(-y^2/4) + 0.3"); err != nil {
		t.Fatal(err)
	}
	checked, worst := 0, 0.0
	for i := 0; i < 300; i++ {
		body := randomExpr(r, 1+r.IntN(4))
		res, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "f(x) = "+body)
		if err != nil {
			t.Fatalf("f(x) = %s: %v", body, err)
		}
		f := res.Value.(*runtime.Func)
		x := -2 + 4*r.Float64()
		d, err := f.Derivative(s, []runtime.Value{runtime.Num(x)}, 0, [3]float64{1})
		if err != nil {
			t.Errorf("f(x) = %s at %g: %v", body, x, err)
			continue
		}
		g := func(u float64) (em.Vec, error) {
			v, err := f.Invoke(s, []runtime.Value{runtime.Num(u)})
			if err != nil {
				return em.Vec{}, err
			}
			return em.Vec{X: v.(runtime.Quantity).V}, nil
		}
		fd, est, err := em.DerivativeEst(g, x, 1, -12, true)
		if err != nil {
			continue // the step search found no plateau: nothing to compare
		}
		exact := real(d.T[0])
		scale := math.Max(math.Abs(exact), 1)
		diff := math.Abs(exact - fd.X)
		worst = math.Max(worst, diff/scale)
		if diff > est+1e-9*scale {
			t.Errorf("f(x) = %s at x = %.17g: exact %.17g, differences %.17g ± %.3g", body, x, exact, fd.X, est)
		}
		checked++
	}
	t.Logf("%d compared; largest difference %.3g of the derivative's scale", checked, worst)
	if checked < 250 {
		t.Errorf("only %d of 300 compared", checked)
	}
}
