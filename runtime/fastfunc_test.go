package runtime_test

import (
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestFastMatchesInvoke: a user function evaluated on plain numbers
// (Func.Fast) gives bit for bit what the language gives through Invoke,
// with the same unit, for bodies it takes; it declines the others, and a
// call whose numbers go non-finite reports so instead of a value. The
// reference is the language's own evaluation (Invoke), a route through
// the engine and the operator dispatcher that shares no code with the
// plain-number evaluator.
func TestFastMatchesInvoke(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for i, l := range []string{
		"R = 25 mm",
		"off = [1, 2, 3] mm",
		"helix(u) = [R * cos(u), R * sin(u), 4 mm * u / (1 rev)]",
		"moved(u) = off + [R * cos(u), 0, R * sin(2*u)] - [0, 0, 1 mm] * u / (1 rad)",
		"knot(u) = [sin(u) + 2 * sin(2*u), cos(u) - 2 * cos(2*u), -sin(3*u)] * 5 mm",
		"line(s) = off + [s, s / 2, -s] / 3",
		"spiral(u) = [1 mm, 0 mm, 0 mm] * exp(u / 10) * cos(u) + [0, 1, 0] * 1 mm * sqrt(abs(u))",
		"sq(s) = [s^2 / (1 m), (s^2)^0.5, -(s^3) / (1 m^2)]",
		"comp(u) = (off * u).y + R",
		"scalar(x) = x * x / (2 m)",
		"cond(u) = u < 1 ? [1, 0, 0] m : [0, 1, 0] m",
		"calls(u) = helix(u) + off",
		"varpow(u) = [1, 1, 1] m * 2^u",
		"plainvar(u) = [u, 1 m, 0 m]",
		"half(x) = 1 m / x",
	} {
		if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, l); err != nil {
			t.Fatalf("%s: %v", l, err)
		}
	}
	rad, _ := runtime.ParseUnit("rad")
	m, _ := runtime.ParseUnit("m")
	for _, c := range []struct {
		name string
		d    runtime.Dim
		fast bool
	}{
		{"helix", rad.Dim, true},
		{"helix", runtime.Dimensionless, false}, // m/rad beside m: the language refuses it too
		{"moved", rad.Dim, true},
		{"knot", runtime.Dimensionless, true},
		{"line", m.Dim, true},
		{"spiral", runtime.Dimensionless, true},
		{"sq", m.Dim, true},
		{"comp", runtime.Dimensionless, true},
		{"scalar", m.Dim, true},
		{"half", runtime.Dimensionless, true},
		{"helix", m.Dim, false}, // cos of a length: refused, the language says why
		{"cond", runtime.Dimensionless, false},
		{"calls", rad.Dim, false},
		{"varpow", runtime.Dimensionless, false},
		{"plainvar", runtime.Dimensionless, false}, // a plain number beside lengths fits only when 0
	} {
		v, _ := s.Lookup(c.name)
		f := v.(*runtime.Func)
		ff := f.Fast(c.d)
		if (ff != nil) != c.fast {
			t.Errorf("%s(%s): Fast gave %v, want an evaluator: %v", c.name, c.d.Describe(), ff, c.fast)
			continue
		}
		if ff == nil {
			continue
		}
		for _, x := range []float64{-3.7, -1, -0.25, 0.001, 0.5, 1, 2.2, 7, 123.456} {
			want, err := f.Invoke(s, []runtime.Value{runtime.Quantity{V: x, D: c.d}})
			got, ok := ff.At(x)
			if err != nil {
				if ok {
					t.Errorf("%s(%g): the language says %v, Fast gave %v", c.name, x, err, got)
				}
				continue
			}
			if !ok {
				t.Errorf("%s(%g): Fast failed where the language gives %v", c.name, x, want)
				continue
			}
			switch w := want.(type) {
			case runtime.Vector:
				if !ff.Vec || ff.D != w.D || got != w.V {
					t.Errorf("%s(%g): Fast %v %s, the language %v %s", c.name, x, got, ff.D.Describe(), w.V, w.D.Describe())
				}
			case runtime.Quantity:
				if ff.Vec || ff.D != w.D || got[0] != w.V {
					t.Errorf("%s(%g): Fast %v %s, the language %v %s", c.name, x, got[0], ff.D.Describe(), w.V, w.D.Describe())
				}
			}
		}
	}
	// division by zero and an overflow: no value
	for _, c := range []struct {
		name string
		d    runtime.Dim
		x    float64
	}{{"half", runtime.Dimensionless, 0}, {"scalar", m.Dim, 1e200}} {
		v, _ := s.Lookup(c.name)
		if got, ok := v.(*runtime.Func).Fast(c.d).At(c.x); ok {
			t.Errorf("%s(%g): Fast gave %v", c.name, c.x, got)
		}
	}
}
