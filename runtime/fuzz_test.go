package runtime_test

import (
	"errors"
	"strings"
	"testing"
	"unicode/utf8"

	"loopwise/lang"
	"loopwise/runtime"
)

// validStatements seed the fuzzer with statements that succeed.
var validStatements = []string{
	"",
	"// only a comment",
	"2 m + 3 m",
	"5 mT",
	"5mT * 2",
	"gap * 3 A/ms",
	"x = 2 kg*m^2/s^2",
	"k: W/(m*K) = 1.5 W/(m*K)",
	"B = [0, 0, 5] mT",
	"B.z as uT",
	"(2+3) mm",
	"2 m * 3 s",
	"1.2e-3 Wb as uWb",
	"1_000 A",
	"5 µT + 3 uT",
	"I(20 ms) as mA",
	"f(a, b) = a*b + 1 m^2",
	"sqrt(2 H * 8 H)",
	"sin(30 deg) + cos(pi/3)",
	"gap >= 2 mm",
	"true ? 1 m : 2 m",
	":digits 4",
	"-[1, 2, 3] mm",
	"(1 m^2)^0.5",
	"2 ^ 10",
	"3000 rpm as rad/s",
	"(50 Hz * 1 rev) as rad/s",
	"-10 °C as degC",
	"f: kHz = 1/(2 ms)",
	"50 Hz as rad/s",
	"5 °C/s",
	"5 m^",
	"1 Qm + 1 qm",
	"5 mm^1e9",
	"0A^0A",
	"(1) m^2e",
	"1e9223372036854775805 km",
	"1 m\r2 m",
	"count = 3",
}

// FuzzEval checks that Eval never panics and that every error it returns is
// a *lang.Error on the given line (or, for input holding newlines, on the
// line of the error) with a column inside that line (or just past its end). A recovered panic shows as "internal error"; that must not
// happen either.
func FuzzEval(f *testing.F) {
	for _, tc := range errorCases {
		f.Add(tc.in)
	}
	for _, in := range validStatements {
		f.Add(in)
	}
	f.Fuzz(func(t *testing.T, in string) {
		s := newTestSession(t, nil)
		base := lang.Pos{File: "t.lw", Line: 3, Col: 1}
		res, err := s.Eval(base, in)
		if err == nil {
			// a statement gives a value or an error, never nothing
			if k := res.Stmt.Kind; (k == lang.Expr || k == lang.Assign) && res.Value == nil {
				t.Fatalf("Eval(%q) gave no value and no error", in)
			}
			if k := res.Stmt.Kind; (k == lang.Expr || k == lang.Assign) && strings.Contains(res.Text, "nil") {
				t.Fatalf("Eval(%q) shows %q", in, res.Text)
			}
			return
		}
		if errors.Is(err, runtime.ErrNotSessionCommand) {
			return
		}
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Fatalf("Eval(%q) error %T %q is not a *lang.Error", in, err, err)
		}
		if strings.Contains(le.Msg, "internal error") {
			t.Fatalf("Eval(%q) recovered a panic or met a guard: %v", in, err)
		}
		if leaksName(le.Msg) {
			t.Fatalf("Eval(%q) message shows an internal __ name: %v", in, err)
		}
		// A statement continued over lines (it holds newlines) reports on
		// the line where the error is, counted from base.
		lines := strings.Split(in, "\n")
		k := le.Pos.Line - base.Line
		if k < 0 || k >= len(lines) || le.Pos.File != base.File {
			t.Fatalf("Eval(%q) error at %v, want one of lines %d..%d of t.lw", in, le.Pos, base.Line, base.Line+len(lines)-1)
		}
		if n := utf8.RuneCountInString(lines[k]); le.Pos.Col < 1 || le.Pos.Col > n+1 {
			t.Fatalf("Eval(%q) error column %d outside 1..%d: %v", in, le.Pos.Col, n+1, err)
		}
		if want := string([]rune(lines[k])); len(lines) > 1 && le.Source != want {
			t.Fatalf("Eval(%q) error shows %q, want its line %q", in, le.Source, want)
		}
	})
}
