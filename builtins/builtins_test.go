package builtins_test

import (
	"errors"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func eval(t *testing.T, s *runtime.Session, line string) runtime.Value {
	t.Helper()
	res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line)
	if err != nil {
		t.Fatalf("%s: %v", line, err)
	}
	return res.Value
}

// TestHelpComplete checks that every builtin and constant documents its
// signature, summary, outside reference and an example, and that the
// example runs (the prompt's :help shows its result).
func TestHelpComplete(t *testing.T) {
	lib := builtins.Standard()
	for _, f := range lib.Funcs {
		h := f.Help
		if h == nil || h.Signature == "" || h.Summary == "" || h.Example == "" || h.Reference == "" {
			t.Errorf("%s: help incomplete: %+v", f.Name, h)
			continue
		}
		s := runtime.NewSession(lib)
		s.InDir = filepath.Join("..") // examples read data files from the repository's top directory
		for _, stmt := range strings.Split(h.Example, "\n") {
			eval(t, s, stmt)
		}
	}
	for _, c := range lib.Consts {
		if c.Help == nil || c.Help.Example == "" || c.Help.Reference == "" {
			t.Errorf("%s: help incomplete", c.Name)
			continue
		}
		s := runtime.NewSession(lib)
		for _, stmt := range strings.Split(c.Help.Example, "\n") {
			eval(t, s, stmt)
		}
	}
}

// TestMathValues compares builtins with values known exactly or to many
// digits from outside the project.
func TestMathValues(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	cases := []struct {
		in   string
		want float64
		tol  float64 // relative; a few ulps for one libm call and a unit factor
		src  string
	}{
		{"sin(30 deg)", 0.5, 1e-15, "sin 30° = 1/2 exactly (elementary trigonometry)"},
		{"cos(60 deg)", 0.5, 1e-15, "cos 60° = 1/2 exactly"},
		{"tan(45 deg)", 1, 1e-15, "tan 45° = 1 exactly"},
		{"asin(0.5) / (1 deg)", 30, 1e-14, "asin(1/2) = 30°"},
		{"atan2(1 mm, -1 mm) / (1 deg)", 135, 1e-14, "second quadrant: atan2(1, -1) = 135°"},
		{"exp(1)", math.E, 1e-15, "e = 2.718281828459045 (Go math.E, OEIS A001113)"},
		{"ln(10)", 2.302585092994046, 1e-15, "ln 10 = 2.302585092994046 (OEIS A002392)"},
		{"log10(1000)", 3, 1e-15, "log10 1000 = 3"},
		{"sqrt(2)", math.Sqrt2, 1e-15, "√2 = 1.4142135623730951 (OEIS A002193)"},
		{"hypot(3 mm, 4 mm) / (1 mm)", 5, 1e-15, "3-4-5 right triangle"},
		{"max(3 mm, 0.2 inch) / (1 mm)", 5.08, 1e-15, "0.2 in = 5.08 mm (NIST SP 811: 1 in = 25.4 mm)"},
		{"min(3 mm, 0.2 inch) / (1 mm)", 3, 1e-15, "3 mm < 5.08 mm"},
		{"norm([3, 4, 12] mm) / (1 mm)", 13, 1e-15, "3-4-12-13 Pythagorean quadruple"},
		{"dot([1, 2, 3] A, [4, -5, 6] m) / (1 A*m)", 12, 1e-15, "1·4 − 2·5 + 3·6 = 12"},
	}
	for _, c := range cases {
		q, ok := eval(t, s, c.in).(runtime.Quantity)
		if !ok {
			t.Errorf("%s: not a quantity", c.in)
			continue
		}
		if !q.D.IsZero() || !scalar.EqualWithinAbsOrRel(q.V, c.want, 0, c.tol) {
			t.Errorf("%s = %v %v, want %v (%s)", c.in, q.V, q.D, c.want, c.src)
		}
	}
}

// TestCrossIsRightHanded checks x̂ × ŷ = ẑ and the unit of a Lorentz-force
// style product (v × B has the unit of an electric field, V/m).
func TestCrossIsRightHanded(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	v := eval(t, s, "cross([1, 0, 0] m/s, [0, 1, 0] T)").(runtime.Vector)
	if v.V != [3]float64{0, 0, 1} {
		t.Errorf("x × y = %v, want [0 0 1] (right-hand rule)", v.V)
	}
	vm, _ := runtime.ParseUnit("V/m")
	if v.D != vm.Dim {
		t.Errorf("(m/s) × T has Dim %v, want that of V/m %v (E = v × B)", v.D, vm.Dim)
	}
}

// TestArgumentChecks checks that builtins reject wrong dimensions and
// kinds with a positioned error.
func TestArgumentChecks(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for _, in := range []string{
		"sin(3 m)", "sqrt(-4 m^2)", "sqrt(2 m)", "atan2(1 m, 1 s)", "max(1 m, 2 s)",
		"dot([1,0,0] m, 2 m)", "norm(3 m)", "direction([0, 0, 0] m)", "ln(-1)", "exp(1000)",
	} {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, in)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("%s: got %v, want a positioned error", in, err)
		}
	}
}

// TestSweepKeepsHertz: a sweep over cycle frequencies heads its column in
// Hz (the SI Brochure, 9th ed., Table 4 note, keeps the hertz for periodic
// phenomena), and a function that keeps the value a cycle frequency keeps
// Hz in its column too; one that scales it does not.
func TestSweepKeepsHertz(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "h(f) = f + 1 Hz")
	eval(t, s, "g(f) = 2*pi*f")
	for _, c := range []struct{ in, header string }{
		{"sweep(h, 50 Hz, 1 kHz, 2)", "f [kHz]  h [kHz]"},
		{"sweep(g, 50 Hz, 1 kHz, 2)", "f [kHz]  g [s^-1]"},
		{"sweep(g, 0.05 s^-1, 1 s^-1, 2)", "f [s^-1]  g [s^-1]"},
	} {
		res, err := s.Eval(lang.Pos{Line: 9, Col: 1}, c.in)
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.SplitN(res.Text, "\n", 2)[0]; got != c.header {
			t.Errorf("%s: header %q, want %q", c.in, got, c.header)
		}
	}
}

// TestRecordedTableKeepsHertz: a recorded table heads a column of cycle
// frequencies in Hz too, as the table shows it (SI Brochure, 9th ed.,
// Table 4 note: the hertz for periodic phenomena).
func TestRecordedTableKeepsHertz(t *testing.T) {
	sc, err := runtime.ParseScript("t.lw", []byte("```lw\nh(f) = f + 1 Hz\nsweep(h, 50 Hz, 1 kHz, 2)\n```\n"))
	if err != nil {
		t.Fatal(err)
	}
	out, err := sc.Record(runtime.NewSession(builtins.Standard()))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(out), "│ f [kHz]  h [kHz]") {
		t.Errorf("recorded:\n%s", out)
	}
}
