package runtime_test

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"loopwise/lang"
	"loopwise/runtime"
)

// evalC evaluates one line in a fresh standard session and returns its
// value and shown text.
func evalC(t *testing.T, s *runtime.Session, line string) (runtime.Value, string, error) {
	t.Helper()
	res, err := s.Eval(lang.Pos{File: "t.lw", Line: 1, Col: 1}, line)
	if err != nil {
		return nil, "", err
	}
	return res.Value, res.Text, nil
}

// TestComplexArithmetic checks the operators on complex quantities against
// the field axioms worked by hand: (a+bj)(c+dj) = (ac−bd) + (ad+bc)j and
// (a+bj)/(c+dj) = ((ac+bd) + (bc−ad)j)/(c²+d²) (any algebra text; e.g.
// Ahlfors, Complex Analysis, 3rd ed. 1979, §1.1). The operands are small
// integers, so every result is exact in binary and compared exactly,
// except where a division by 25 rounds (one ulp allowed).
func TestComplexArithmetic(t *testing.T) {
	s := stdSession()
	cases := []struct {
		in       string
		re, im   float64
		unit     string
		ulpsRoom float64
	}{
		{"(3 + 4j) * (3 - 4j)", 25, 0, "", 0},
		{"(1 + 2j) / (3 + 4j)", 11.0 / 25, 2.0 / 25, "", 2},
		{"(3 + 4j)^2", -7, 24, "", 0},
		{"(1 + 1j)^-1", 0.5, -0.5, "", 0},
		{"4j * 4j", -16, 0, "", 0},
		{"(3 ohm + 4j ohm) * 2 A", 6, 8, "V", 0},
		{"2 A * (3 + 4j) ohm", 6, 8, "V", 0},
		{"10 V / ((3 + 4j) ohm)", 1.2, -1.6, "A", 2},
		// a unit after a bracket binds to the bracket, not to the quotient
		{"10 V / (3 + 4j) ohm", 1.2, -1.6, "A", 2},
		{"-(1 + 2j) mH", -1e-3, -2e-3, "H", 0},
		{"(1 + 2j) mH - 1 mH", 0, 2e-3, "H", 1},
		{"j^2", -1, 0, "", 0},
	}
	for _, c := range cases {
		v, _, err := evalC(t, s, c.in)
		if err != nil {
			t.Errorf("%s: %v", c.in, err)
			continue
		}
		z, ok := v.(runtime.Complex)
		if !ok {
			t.Errorf("%s: got %s, want a complex value", c.in, runtime.TypeName(v))
			continue
		}
		var d runtime.Dim
		if c.unit != "" {
			d = unitDim(t, c.unit)
		}
		if z.D != d {
			t.Errorf("%s: dimension %s, want %s", c.in, z.D.Describe(), d.Describe())
		}
		room := c.ulpsRoom * 2.3e-16 * cmplx.Abs(complex(c.re, c.im))
		if math.Abs(real(z.V)-c.re) > room || math.Abs(imag(z.V)-c.im) > room {
			t.Errorf("%s = %v, want %v", c.in, z.V, complex(c.re, c.im))
		}
	}
}

// TestComplexRefusals: what has no meaning for complex values is refused
// with a message that says what to do.
func TestComplexRefusals(t *testing.T) {
	s := stdSession()
	cases := []struct{ in, want string }{
		{"(1 + 1j) < 2", "complex values have no order"},
		{"(1 + 1j) ohm + 1 V", "cannot add resistance (Ω) and voltage (V)"},
		{"[1, 2, 3] m * [1j, 0, 0]", "cannot multiply two vectors"},
		{"sin(2j)", "take abs(z), re(z) or im(z) first"},
		{"((1 + 1j) m)^0.5", "fractional exponent"},
		{"2 m ^ (1j)", "dimensionless base"},
		{"(1 + 1j) / 0j", "division by zero"},
		{"(1 + 1j) % 2", "remainder"},
		{"1 as polar", "only a complex value has a polar form"},
		{"(1 + 1j) V as A", "cannot show a complex voltage (V) in A"},
		{"arg(0j)", "zero has no angle"},
		{"polar(1 V, 30)", "the angle needs its unit"},
	}
	for _, c := range cases {
		_, _, err := evalC(t, s, c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.in, err, c.want)
		}
	}
}

// TestComplexShown: the rectangular form rounds both parts at the last
// digit of the larger one, uses the best SI prefix for the larger part,
// and the polar form reads back as the same value.
func TestComplexShown(t *testing.T) {
	s := stdSession()
	cases := []struct{ in, want string }{
		{"(3 + 4j) ohm", "(3 + 4j) Ω"},
		{"1 / ((3 + 4j) ohm)", "(120 - 160j) mS"},
		{"exp(j*pi)", "-1 + 0j"}, // sin(π) in binary is 1.2e-16: noise, shown as 0
		{"(2 + 0.001j) kV", "(2 + 0.001j) kV"},
		{"(2 + 0.0000001j) kV", "(2 + 0j) kV"}, // below the 6th digit of 2 kV
		{"polar(10 V, 30 deg) as polar", "polar(10 V, 30 deg)"},
		{"polar(10 V, -90 deg) as mV polar", "polar(10000 mV, -90 deg)"},
		{"(3 + 4j) ohm as kohm", "(0.003 + 0.004j) kohm"},
		{"0j", "0 + 0j"},
	}
	for _, c := range cases {
		_, got, err := evalC(t, s, c.in)
		if err != nil {
			t.Errorf("%s: %v", c.in, err)
			continue
		}
		if got != c.want {
			t.Errorf("%s shows %q, want %q", c.in, got, c.want)
		}
	}
}

// TestComplexReadsBack: what a complex result shows, typed again, is the
// same value to the digits shown (12 significant digits of the larger
// part for recorded results).
func TestComplexReadsBack(t *testing.T) {
	for _, in := range []string{"(3 + 4j) ohm", "1 / ((3.3 + 4.7j) ohm)", "polar(2.5 mV, 123.4 deg)", "exp(0.3j) * 7 A", "-(0.001 - 2000j) H"} {
		for _, form := range []string{"", " as polar"} {
			s := stdSession()
			s.Digits = runtime.RecordDigits
			v, text, err := evalC(t, s, in+form)
			if err != nil {
				t.Fatalf("%s: %v", in, err)
			}
			w, _, err := evalC(t, s, text)
			if err != nil {
				t.Fatalf("%s shows %q, which does not read back: %v", in, text, err)
			}
			a, b := v.(runtime.Complex), w.(runtime.Complex)
			// 12 digits: half a unit in the 12th place of the magnitude
			if a.D != b.D || cmplx.Abs(a.V-b.V) > 1e-11*cmplx.Abs(a.V) {
				t.Errorf("%s%s: %v reads back as %v", in, form, a, b)
			}
		}
	}
}

// TestComplexRecordAndCheck: complex results are recorded and checked as
// points in the plane: a change below the tolerance of the magnitude is
// not drift, above it is.
func TestComplexRecordAndCheck(t *testing.T) {
	src := "```lw\nZ = (3 + 4j) ohm\nI = 10 V / Z\nI as polar\n```\n"
	got := record(t, src)
	for _, want := range []string{"↳ (3 + 4j) Ω", "↳ (1.2 - 1.6j) A", "↳ polar(2 A, -53.130102354 deg)"} {
		if !strings.Contains(got, want) {
			t.Fatalf("recorded\n%s\nlacks %q", got, want)
		}
	}
	if rep := check(t, got, 1e-9); len(rep.Drifts) != 0 {
		t.Fatalf("a freshly recorded script drifts:\n%s", report(rep))
	}
	// 1e-12 of |I| = 2 A moved into the imaginary part: within 1e-9
	quiet := strings.Replace(got, "(1.2 - 1.6j) A", "(1.2 - 1.600000000002j) A", 1)
	if rep := check(t, quiet, 1e-9); len(rep.Drifts) != 0 {
		t.Errorf("a change of 1e-12 is reported as drift:\n%s", report(rep))
	}
	moved := strings.Replace(got, "-53.130102354 deg", "-53.2 deg", 1)
	if rep := check(t, moved, 1e-9); len(rep.Drifts) != 1 {
		t.Errorf("a changed phase is not drift:\n%s", report(rep))
	}
}

// TestComplexVectorRecorded: a complex vector is recorded and checked as
// a whole (the norm of the change against the norm of the value).
func TestComplexVectorRecorded(t *testing.T) {
	src := "```lw\nv = [1 + 2j, 0, -3j] mT\nv * 2\nv.z\n```\n"
	got := record(t, src)
	for _, want := range []string{"↳ [1 + 2j, 0 + 0j, 0 - 3j] mT", "↳ [2 + 4j, 0 + 0j, 0 - 6j] mT", "↳ (0 - 3j) mT"} {
		if !strings.Contains(got, want) {
			t.Fatalf("recorded\n%s\nlacks %q", got, want)
		}
	}
	if rep := check(t, got, 1e-9); len(rep.Drifts) != 0 {
		t.Fatalf("a freshly recorded script drifts:\n%s", report(rep))
	}
	moved := strings.Replace(got, "[2 + 4j, 0 + 0j, 0 - 6j] mT", "[2 + 4j, 0 + 0.001j, 0 - 6j] mT", 1)
	if rep := check(t, moved, 1e-9); len(rep.Drifts) != 1 {
		t.Errorf("a changed component is not drift:\n%s", report(rep))
	}
}

// TestTableNoiseFloor: cells below 1e-12 of their column's largest value
// are rounding noise and match each other; a change above it is drift.
func TestTableNoiseFloor(t *testing.T) {
	src := "```lw\nk = 2 A\nf(x) = k * x\nsweep(f, 0 m, 1 m, 3)\n```\n"
	got := record(t, src)
	noisy := strings.Replace(got, "│     0        0\n", "│     0    1e-17\n", 1)
	if noisy == got {
		t.Fatalf("the recorded table has no zero row to perturb:\n%s", got)
	}
	if rep := check(t, noisy, 1e-9); len(rep.Drifts) != 0 {
		t.Errorf("a cell of 1e-17 against a column of 2 is reported as drift:\n%s", report(rep))
	}
	big := strings.Replace(got, "│     0        0\n", "│     0    1e-09\n", 1)
	if rep := check(t, big, 1e-9); len(rep.Drifts) != 1 {
		t.Errorf("a cell of 1e-9 against a column of 2 is not drift:\n%s", report(rep))
	}
}
