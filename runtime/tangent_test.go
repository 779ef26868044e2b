package runtime_test

import (
	"errors"
	"math"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// fnOf defines lines in a fresh session and returns the function name.
func fnOf(t *testing.T, name string, lines ...string) (*runtime.Session, *runtime.Func) {
	t.Helper()
	s := runtime.NewSession(builtins.Standard())
	var f *runtime.Func
	for i, l := range lines {
		r, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, l)
		if err != nil {
			t.Fatalf("%s: %v", l, err)
		}
		if g, ok := r.Value.(*runtime.Func); ok && g.Name == name {
			f = g
		}
	}
	if f == nil {
		t.Fatalf("no function %s", name)
	}
	return s, f
}

// TestDerivativeUnitsAndValue: the tangent of a quantity of dimension D
// along an argument of dimension X has dimension D/X, and the Dual's value
// is bit for bit the value ordinary evaluation gives (the same dispatcher
// computes both). d/dt of I0·sin(ωt) is I0·ω·cos(ωt) (calculus); the
// tolerance, 1e-15 of I0·ω, allows the few roundings of each route.
func TestDerivativeUnitsAndValue(t *testing.T) {
	s, f := fnOf(t, "I", "I(t) = 2 A * sin(2*pi*50 Hz*t)")
	arg := []runtime.Value{runtime.Quantity{V: 3e-3, D: runtime.Dim{runtime.Time: 1}}}
	d, err := f.Derivative(s, arg, 0, [3]float64{1})
	if err != nil {
		t.Fatal(err)
	}
	v, err := f.Invoke(s, arg)
	if err != nil {
		t.Fatal(err)
	}
	if v.(runtime.Quantity).V != d.V.(runtime.Quantity).V {
		t.Errorf("value %v, ordinary evaluation %v", d.V, v)
	}
	tv, err := runtime.TangentValue(d, runtime.Dim{runtime.Time: 1})
	if err != nil {
		t.Fatal(err)
	}
	q := tv.(runtime.Quantity)
	if want := (runtime.Dim{runtime.Current: 1, runtime.Time: -1}); q.D != want {
		t.Errorf("tangent in %s, want A/s", q.D.Describe())
	}
	w := 2 * math.Pi * 50
	if want := 2 * w * math.Cos(w*3e-3); math.Abs(q.V-want) > 1e-15*2*w {
		t.Errorf("tangent %.17g, want %.17g", q.V, want)
	}
	// a vector argument moved along y: ∂/∂y of [x·y, y², 0]·1 T/m² is [x, 2y, 0] T/m
	s, g := fnOf(t, "F", "F(p) = [p.x*p.y, p.y^2, 0 m^2] * 1 T/m^2")
	d, err = g.Derivative(s, []runtime.Value{runtime.Vector{V: [3]float64{3, 5, 7}, D: runtime.Dim{runtime.Length: 1}}}, 0, [3]float64{0, 1, 0})
	if err != nil {
		t.Fatal(err)
	}
	tv, err = runtime.TangentValue(d, runtime.Dim{runtime.Length: 1})
	if err != nil {
		t.Fatal(err)
	}
	if vv := tv.(runtime.Vector); vv.V != [3]float64{3, 10, 0} || vv.D != (runtime.Dim{runtime.Mass: 1, runtime.Time: -2, runtime.Current: -1, runtime.Length: -1}) {
		t.Errorf("∂F/∂y = %v in %s, want [3, 10, 0] T/m", vv.V, vv.D.Describe())
	}
}

// TestDerivativeErrors: the kinds of failure a caller tells apart.
func TestDerivativeErrors(t *testing.T) {
	one := []runtime.Value{runtime.Num(1)}
	for _, c := range []struct {
		def  string
		want any
	}{
		{"f(x) = abs(x - 1)", new(*runtime.KinkError)},
		{"f(x) = x < 1 ? 0 : 1", new(*runtime.JumpError)},
		{"f(x) = sqrt(x - 1)", new(*runtime.InfiniteSlopeError)},
		{"f(x) = solve(sin, x - 1, -1, 1)", new(*runtime.NoTangentError)},
	} {
		s, f := fnOf(t, "f", c.def)
		_, err := f.Derivative(s, one, 0, [3]float64{1})
		if !errors.As(err, c.want) {
			t.Errorf("%s: got %v (%T), want %T", c.def, err, err, c.want)
		}
	}
}
