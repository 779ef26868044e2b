package runtime_test

import (
	"errors"
	"strings"
	"testing"

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

// FuzzEval evaluates any text as one statement (continued over lines when
// it holds newlines) in a session with a few names defined. It fails on a
// panic (the session reports a recovered one as "internal error"), on a
// statement that runs past the hang guard, on a nil or non-finite result,
// on an error that is not a positioned *lang.Error on a line of the
// statement, and on an internal name in a message or a shown result. A
// successful assignment is read back by name and must show the same text.
func FuzzEval(f *testing.F) {
	for _, tc := range errorCases {
		f.Add(tc.in)
	}
	for _, in := range validStatements {
		f.Add(in)
	}
	for _, in := range namedInputs {
		f.Add(in)
	}
	f.Fuzz(func(t *testing.T, in string) {
		s := newTestSession(t, nil)
		base := lang.Pos{File: "t.lw", Line: 3, Col: 1}
		res, err := evalBounded(t, s, base, in)
		if errors.Is(err, runtime.ErrNotSessionCommand) {
			return
		}
		lines := append([]string{"", ""}, strings.Split(in, "\n")...)
		if err != nil {
			checkError(t, "Eval", in, err, base.File, base.Line, len(lines), lines)
			var le *lang.Error
			if errors.As(err, &le) && len(lines) > 3 && le.Source != string([]rune(lines[le.Pos.Line-1])) {
				t.Fatalf("Eval(%q) error shows %q, want its line %q", in, le.Source, lines[le.Pos.Line-1])
			}
			return
		}
		checkResult(t, "Eval", in, res)
		if res.Stmt.Kind == lang.Assign {
			again, err := evalBounded(t, s, lang.Pos{File: "t.lw", Line: 9, Col: 1}, res.Stmt.Name)
			if err != nil {
				t.Fatalf("Eval(%q) assigned %s, which then fails: %v", in, res.Stmt.Name, err)
			}
			checkResult(t, "Eval", res.Stmt.Name, again)
		}
	})
}
