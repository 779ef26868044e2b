package runtime_test

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// References for this file:
//   [SI]  BIPM, The International System of Units (SI Brochure), 9th ed.,
//         2019: Table 4 and its notes (the hertz is for periodic phenomena,
//         rad/s for angular velocity), Table 6 (rad/s, rad/s^2), Table 8
//         (1° = π/180 rad), §2.3.1 (t/°C = T/K − 273.15).
//   [811] NIST SP 811 (2008), Guide for the Use of the SI, Appendix B.8:
//         "revolution per minute (rpm) (r/min) to radian per second (rad/s)
//         1.047198 E-01", "degree (°) to radian (rad) 1.745329 E-02" (both
//         from memory).

// evalQ evaluates lines in a fresh session and returns the last result.
func evalQ(t *testing.T, lines ...string) *runtime.Result {
	t.Helper()
	s := runtime.NewSession(builtins.Standard())
	var res *runtime.Result
	for i, l := range lines {
		var err error
		res, err = s.Eval(lang.Pos{File: "t.lw", Line: i + 1, Col: 1}, l)
		if err != nil {
			t.Fatalf("%q: %v", l, err)
		}
	}
	return res
}

// TestAngleUnitsNIST checks every unit that involves an angle or a
// rotation against the published factor, through the whole language (unit
// literal, arithmetic, "as"). The published figures have 7 significant
// digits, so the tolerance is half a unit in their last place.
func TestAngleUnitsNIST(t *testing.T) {
	tests := []struct {
		line string
		want float64 // the number shown in the unit after "as"
		abs  float64
		src  string
	}{
		{"1 rpm as rad/s", 0.1047198, 5e-8, "[811] r/min to rad/s 1.047198 E-01"},
		{"3000 rpm as rad/s", 314.1593, 5e-5, "[811] 3000 × 1.047198 E-01 (7 digits)"},
		{"1 deg as rad", 0.01745329, 5e-9, "[811] degree to radian 1.745329 E-02"},
		{"1 rev as deg", 360, 1e-12, "[SI] Table 8: 1° = π/180 rad, so a full turn (2π rad) is 360°"},
		{"1 rev as rad", 6.283185, 5e-7, "[811] App. B: revolution (r) to radian 6.283185 E+00 (from memory)"},
		{"60 rpm as rev/s", 1, 1e-15, "[811]: r/min is one revolution a minute"},
		{"1 sr as rad^2", 1, 0, "[SI] Table 4: sr = m^2/m^2, the square of the radian"},
		{"(50 Hz * 1 rev) as rad/s", 314.1593, 5e-5, "[SI] Table 4 note: ω = 2π f for a sinusoid of frequency f"},
		{"(3000 rpm / 1 rev) as Hz", 50, 1e-12, "[811]: 3000 r/min is 50 revolutions a second"},
		{"(2*pi*50 Hz * 1 rad) as rpm", 3000, 1e-9, "[811] 314.159 rad/s ÷ 0.1047198"},
		{"asin(0.5) as deg", 30, 1e-12, "sin 30° = 1/2"},
		{"acos(0.5) as deg", 60, 1e-12, "cos 60° = 1/2"},
		{"atan(1) as deg", 45, 1e-12, "tan 45° = 1"},
		{"atan2(1 mm, -1 mm) as deg", 135, 1e-12, "the point (-1, 1) lies at 135°"},
		{"(90 deg + 1 rad) as rad", math.Pi/2 + 1, 1e-15, "[SI] Table 8"},
		{"(1 rad/s * 1 s) as deg", 57.29578, 5e-6, "[811] radian to degree 5.729578 E+01 (from memory)"},
	}
	for _, tt := range tests {
		res := evalQ(t, tt.line)
		// the shown text has 6 digits; compare the recorded 12 instead
		num, _, _ := strings.Cut(res.Record, " ")
		got, err := strconv.ParseFloat(num, 64)
		if err != nil {
			t.Errorf("%s records %q", tt.line, res.Record)
			continue
		}
		if !scalar.EqualWithinAbs(got, tt.want, math.Max(tt.abs, 1e-11*math.Abs(tt.want))) {
			t.Errorf("%s = %v (recorded %q), want %v within %g (%s)", tt.line, got, res.Record, tt.want, tt.abs, tt.src)
		}
	}
}

// TestTrigTakesAngles checks that sin, cos and tan take an angle or a plain
// number in radians, and that the angle's unit is applied: sin 18° =
// (√5 − 1)/4 (a classical exact value, from memory), reached here through
// 3000 rpm × 1 ms = 0.1π rad, a route that shares no code with math.Sin's
// argument reduction of 18°. Tolerance 4 ulp: the literal, the product and
// sin each round once.
func TestTrigTakesAngles(t *testing.T) {
	want := (math.Sqrt(5) - 1) / 4
	for _, line := range []string{"sin(3000 rpm * 1 ms)", "sin(18 deg)", "sin(0.1*pi)", "sin(0.05 rev)"} {
		q := evalQ(t, line).Value.(runtime.Quantity)
		if !q.D.IsZero() || !scalar.EqualWithinAbsOrRel(q.V, want, 0, 4*unitRoundoff) {
			t.Errorf("%s = %v %v, want %v (sin 18° = (√5 − 1)/4)", line, q.V, q.D, want)
		}
	}
	// The 2π trap of the old catalogue: 3000 rpm × 1 ms was 0.05 "rad".
	if q := evalQ(t, "sin(3000 rpm * 1 ms)").Value.(runtime.Quantity); math.Abs(q.V-math.Sin(0.05)) < 1e-3 {
		t.Errorf("sin(3000 rpm * 1 ms) = %v, the sine of 0.05 (a revolution counted as 1)", q.V)
	}
	if q := evalQ(t, "cos(1 rev)").Value.(runtime.Quantity); math.Abs(q.V-1) > 4*unitRoundoff {
		t.Errorf("cos(1 rev) = %v, want 1", q.V)
	}
	if q := evalQ(t, "asin(1)").Value.(runtime.Quantity); q.D != unitDim(t, "rad") {
		t.Errorf("asin(1) has dimension %v, want plane angle", q.D)
	}
}

// TestAngleErrors checks that a conversion that needs a factor 2π or a
// radian is refused with a positioned message that says how to write it,
// that the suggested statement runs and gives the value the message quotes,
// and that the 2π-wrong number never appears.
func TestAngleErrors(t *testing.T) {
	tests := []struct {
		setup, line string
		col         int      // where the caret starts (the unit after "as")
		suggest     string   // the spelling the message must suggest
		never       []string // 2π-wrong results that must not appear
	}{
		{"", "50 Hz as rad/s", 10, "(50 Hz * 1 rev) as rad/s", []string{"= 50 rad/s"}},
		{"f = 50 Hz", "f as rad/s", 6, "(f * 1 rev) as rad/s", []string{"= 50 rad/s"}},
		{"", "(2*pi*50 Hz) as rad/s", 17, "(2*pi*50 Hz * 1 rad) as rad/s", []string{"1973.92"}},
		{"", "3000 rpm as Hz", 13, "(3000 rpm / 1 rev) as Hz", []string{"314.159 Hz", "= 3000 Hz"}},
		{"", "(2*pi*50 Hz) as rpm", 17, "(2*pi*50 Hz * 1 rad) as rpm", []string{"18849.6"}},
		{"", "50 Hz as rpm", 10, "(50 Hz * 1 rev) as rpm", []string{"477.465"}},
		{"", "0.5 as deg", 8, "(0.5 * 1 rad) as deg", nil},
	}
	for _, tt := range tests {
		s := runtime.NewSession(builtins.Standard())
		if tt.setup != "" {
			if _, err := s.Eval(lang.Pos{File: "t.lw", Line: 1, Col: 1}, tt.setup); err != nil {
				t.Fatal(err)
			}
		}
		_, err := s.Eval(lang.Pos{File: "t.lw", Line: 2, Col: 1}, tt.line)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("%s: %v, want a positioned error", tt.line, err)
			continue
		}
		if le.Pos.Col != tt.col {
			t.Errorf("%s: error at column %d, want %d (the unit)", tt.line, le.Pos.Col, tt.col)
		}
		i := strings.Index(le.Msg, tt.suggest)
		if i < 0 {
			t.Errorf("%s: message %q does not suggest %q", tt.line, le.Msg, tt.suggest)
			continue
		}
		for _, bad := range tt.never {
			if strings.Contains(le.Msg, bad) {
				t.Errorf("%s: message %q shows %q", tt.line, le.Msg, bad)
			}
		}
		// the quoted result "(= 314.159 rad/s)" is what the suggestion gives
		rest := le.Msg[i+len(tt.suggest):]
		quoted, ok := strings.CutPrefix(rest, " (= ")
		if !ok {
			t.Errorf("%s: message %q quotes no result", tt.line, le.Msg)
			continue
		}
		quoted, _, _ = strings.Cut(quoted, ")")
		res, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, tt.suggest)
		if err != nil {
			t.Errorf("%s: the suggestion %q fails: %v", tt.line, tt.suggest, err)
			continue
		}
		if res.Text != quoted {
			t.Errorf("%s: the suggestion %q shows %q, the message says %q", tt.line, tt.suggest, res.Text, quoted)
		}
	}
}

// TestAngleStrict checks that adding, comparing or assigning across a
// power of angle is refused with a message that names the angle.
func TestAngleStrict(t *testing.T) {
	for _, tt := range []struct{ setup, line, part string }{
		{"", "30 deg + 0.1", "an angle is not a plain number"},
		{"", "1 rad < 2", "an angle is not a plain number"},
		{"", "1 rad/s + 1 Hz", "counts cycles"},
		{"", "w: rad/s = 2*pi*50 Hz", "1 rad"},
		{"", "exp(1 rad)", "divide it by 1 rad"},
		{"", "ln(30 deg)", "not an angle"},
		{"", "sin(1 Hz)", "an angle (rad, deg, rev) or a plain number"},
		{"", "2 V + 3 V*rad", "rad^1"},
	} {
		s := runtime.NewSession(builtins.Standard())
		_, err := s.Eval(lang.Pos{File: "t.lw", Line: 1, Col: 1}, tt.line)
		if err == nil || !strings.Contains(err.Error(), tt.part) {
			t.Errorf("%s: error %v, want one containing %q", tt.line, err, tt.part)
		}
	}
	// a plain 0 still fits a vector of any dimension, angles included
	if v := evalQ(t, "[1 rad, 0, 0]").Value.(runtime.Vector); v.D != unitDim(t, "rad") {
		t.Errorf("[1 rad, 0, 0] has dimension %v", v.D)
	}
}

// TestCycleDisplay checks when s^-1 is shown in Hz: only for a quantity
// known to count cycles ([SI] Table 4 note: the hertz is used only for
// periodic phenomena). Every shown text must parse back to the value.
func TestCycleDisplay(t *testing.T) {
	tests := []struct {
		lines []string
		want  string
	}{
		{[]string{"f = 50 Hz"}, "50 Hz"},
		{[]string{"f = 50 Hz", "f"}, "50 Hz"},
		{[]string{"13.56 MHz"}, "13.56 MHz"},
		{[]string{"f = 50 Hz", "f + 10 Hz"}, "60 Hz"},
		{[]string{"f = 50 Hz", "f - 10 Hz"}, "40 Hz"},
		{[]string{"f = 50 Hz", "-f"}, "-50 Hz"},
		{[]string{"f = 50 Hz", "abs(-f)"}, "50 Hz"},
		{[]string{"f = 50 Hz", "max(f, 60 Hz)"}, "60 Hz"},
		{[]string{"f = 50 Hz", "min(f, 60 Hz)"}, "50 Hz"},
		{[]string{"1/(20 ms) as Hz"}, "50 Hz"},
		{[]string{"g = 1/(20 ms) as Hz", "g + 1 Hz"}, "51 Hz"},
		{[]string{"g: Hz = 1/(20 ms)", "g * 1"}, "50 s^-1"},
		{[]string{"g: kHz = 1/(20 ms)", "g + 0 Hz"}, "50 Hz"},
		// dropped by products, quotients and powers
		{[]string{"2*pi*50 Hz"}, "314.159 s^-1"},
		{[]string{"f = 50 Hz", "2*f"}, "100 s^-1"},
		{[]string{"f = 50 Hz", "f/2"}, "25 s^-1"},
		{[]string{"1/(2 s)"}, "0.5 s^-1"},
		{[]string{"(2 s)^-1"}, "0.5 s^-1"},
		{[]string{"f = 50 Hz", "f + 2*pi*1 Hz"}, "56.2832 s^-1"},
		{[]string{"(2*pi*50 Hz * 1 rad) as rad/s"}, "314.159 rad/s"},
		{[]string{"3000 rpm"}, "314.159 rad/s"},
	}
	for _, tt := range tests {
		res := evalQ(t, tt.lines...)
		if res.Text != tt.want {
			t.Errorf("%v shows %q, want %q", tt.lines, res.Text, tt.want)
		}
		num, unit, _ := strings.Cut(res.Record, " ")
		u, err := runtime.ParseUnit(unit)
		if err != nil {
			t.Errorf("%v recorded %q: the unit does not parse back: %v", tt.lines, res.Record, err)
			continue
		}
		x, _ := strconv.ParseFloat(num, 64)
		q := res.Value.(runtime.Quantity)
		if u.Dim != q.D || !scalar.EqualWithinRel(x*u.Scale(), q.V, 1e-11) {
			t.Errorf("%v recorded %q, which reads back as %v %v, not %v %v", tt.lines, res.Record, x*u.Scale(), u.Dim, q.V, q.D)
		}
	}
}

// TestCelsius checks °C as an absolute temperature ([SI] §2.3.1:
// t/°C = T/K − 273.15). "20 °C" is built from decimal text in one rounding,
// so it is exactly the float64 nearest 293.15, as "293.15 K" is.
func TestCelsius(t *testing.T) {
	for _, tt := range []struct {
		line string
		want string // decimal kelvin
	}{
		{"20 °C", "293.15"},
		{"20 degC", "293.15"},
		{"0 °C", "273.15"},
		{"-10 °C", "263.15"},
		{"-273.15 °C", "0"},
		{"1e2 °C", "373.15"},
		{"-(40 °C)", "233.15"},
	} {
		q := evalQ(t, tt.line).Value.(runtime.Quantity)
		if want := decimal(t, tt.want); q.V != want || q.D != unitDim(t, "K") {
			t.Errorf("%s = %v %v, want %s K exactly", tt.line, q.V, q.D, tt.want)
		}
	}
	// a difference of two Celsius temperatures is in kelvin
	if q := evalQ(t, "30 °C - 20 °C").Value.(runtime.Quantity); math.Abs(q.V-10) > 1e-12 {
		t.Errorf("30 °C - 20 °C = %v K, want 10 K", q.V)
	}
	if got := evalQ(t, "293.15 K as °C").Text; got != "20 °C" {
		t.Errorf("293.15 K as °C shows %q, want 20 °C", got)
	}
	if got := evalQ(t, "T: °C = 300 K", "T").Text; got != "26.85 °C" {
		t.Errorf("T: °C = 300 K shows %q, want 26.85 °C", got)
	}
	// °C has an offset: never inside a compound unit, a power, or after a
	// bracket (where it would scale, not shift)
	for _, tt := range []struct {
		line string
		col  int
	}{
		{"5 °C/s", 3}, {"1 W/°C", 3}, {"5 °C^2", 3}, {"(2 + 3) °C", 9}, {"5 degC*m", 3},
	} {
		s := runtime.NewSession(builtins.Standard())
		_, err := s.Eval(lang.Pos{File: "t.lw", Line: 1, Col: 1}, tt.line)
		var le *lang.Error
		if !errors.As(err, &le) || le.Pos.Col != tt.col || !strings.Contains(le.Msg, "offset") {
			t.Errorf("%s: %v, want an error about the offset at column %d", tt.line, err, tt.col)
		}
	}
}

// TestPowerGroupsRight checks that ^ groups from the right, as in
// mathematics (common practice: a^b^c = a^(b^c)), and that the docs'
// example of a root of a squared unit is written with brackets.
func TestPowerGroupsRight(t *testing.T) {
	if q := evalQ(t, "2^3^2").Value.(runtime.Quantity); q.V != 512 {
		t.Errorf("2^3^2 = %v, want 512 = 2^(3^2)", q.V)
	}
	if q := evalQ(t, "a = 3 m", "(a^2)^0.5").Value.(runtime.Quantity); q.V != 3 || q.D != unitDim(t, "m") {
		t.Errorf("(a^2)^0.5 = %v %v, want 3 m", q.V, q.D)
	}
	s := runtime.NewSession(builtins.Standard())
	s.Eval(lang.Pos{Line: 1, Col: 1}, "a = 3 m")
	if _, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "a^2^0.5"); err == nil || !strings.Contains(err.Error(), "fractional exponent") {
		t.Errorf("a^2^0.5 = a^1.414…: %v, want the fractional-exponent error", err)
	}
}

// TestUnitSyntaxCaret checks that a malformed unit after a number is
// reported at the unit text.
func TestUnitSyntaxCaret(t *testing.T) {
	for _, tt := range []struct {
		line       string
		col, width int
	}{
		{"5 m^", 3, 2},
		{"5 m^x", 3, 2},
		{"5 m/(s", 5, 1}, // the bracket that is never closed
		{"5 kg**", 3, 4},
		{"5 m/", 3, 2},
		{"1 + 5 A/", 7, 2},
	} {
		s := runtime.NewSession(builtins.Standard())
		_, err := s.Eval(lang.Pos{File: "t.lw", Line: 1, Col: 1}, tt.line)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("%s: %v, want a positioned error", tt.line, err)
			continue
		}
		if le.Pos.Col != tt.col || le.Width != tt.width {
			t.Errorf("%s: error at column %d width %d, want %d width %d: %v", tt.line, le.Pos.Col, le.Width, tt.col, tt.width, err)
		}
	}
}
