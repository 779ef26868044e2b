package lang_test

import (
	"errors"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"loopwise/lang"
	"loopwise/runtime"
)

// fuzzSeeds are statements, good and bad, that start both fuzz targets of
// this package: literals of every shape, assignments, declarations,
// definitions, commands, comments, strings, and statements continued over
// lines while a bracket is open.
var fuzzSeeds = []string{
	"",
	"// only a comment",
	"5 mT",
	"2 kg*m^2/s^2 + 3 J",
	"[0, 0, 5] mm",
	"(2 + 3) mm^2",
	"x = 2 m",
	"k: W/(m*K) = 1.5 W/(m*K)",
	"f(a, b) = a*b + 1 m^2",
	"I(t) = 20 A * sin(2*pi*50 Hz*t)",
	"flux(src, loop) as uWb",
	":digits 4",
	"  :help b_at   // which one",
	"v = [1 m,\n  2 m,\n  3 m]",
	"f(\n  2 m) // done",
	"g(x) = (x +\n 1 m) as mm",
	"\"a string\" + 'b'",
	"5 µT + 3 uT",
	"-10 °C",
	"1.5e-3 Wb as uWb",
	"1_000 A",
	".5 mm",
	"v.x",
	"v. 0",
	"5 m^",
	"5 kg**",
	"2and 3",
	"x = 1 = 2",
	"gap as",
	"f(a,) = a",
	"[1, (2]",
	"a ? b : c",
	"5 m^2x",
	"(1) m^2e",
	"0A^0A",
	"1e9223372036854775805 km",
	"$env",
	"\ufeff5 m",
	"x\r",
}

// internalName finds, in a message, text that belongs to the
// implementation and means nothing to a user: placeholder and engine names
// (__L0, __call), Go package and type names, the words nil and <nil>, a
// format error, signs of a panic. Text the input itself contains does not
// count (a user may type "nil" or "float64" as a name). It returns the
// offending text, or "".
func internalName(in, msg string) string {
	for _, re := range internalRes {
		if m := re.FindString(msg); m != "" && !strings.Contains(in, strings.TrimSpace(m)) {
			return m
		}
	}
	return ""
}

var internalRes = []*regexp.Regexp{
	regexp.MustCompile(`__[A-Za-z0-9_]+`),
	regexp.MustCompile(`<nil>|\bnil\b`),
	regexp.MustCompile(`\b(lang|runtime|builtins|em|expr|ast|vm|reflect|strconv|math|big)\.[A-Za-z]`),
	regexp.MustCompile(`\b(float64|int64|interface \{\}|func\(|map\[|\[\]\w+)`),
	regexp.MustCompile(`%!|\bpanic\b|goroutine|runtime error|internal error`),
}

// checkPositioned fails t unless err is a *lang.Error on one of the lines
// of text (counted from base), with a column inside that line or just past
// its end, whose message shows no internal name.
func checkPositioned(t *testing.T, what, text string, base lang.Pos, err error) {
	t.Helper()
	var le *lang.Error
	if !errors.As(err, &le) {
		t.Fatalf("%s(%q): error %T %q is not a *lang.Error", what, text, err, err)
	}
	lines := strings.Split(text, "\n")
	k := le.Pos.Line - base.Line
	if le.Pos.File != base.File || k < 0 || k >= len(lines) {
		t.Fatalf("%s(%q): error at %v, want a line in %d..%d of %s", what, text, le.Pos, base.Line, base.Line+len(lines)-1, base.File)
	}
	first := 1
	if k == 0 {
		first = base.Col
	}
	last := utf8.RuneCountInString(lines[k]) + 1
	if k == 0 {
		last += base.Col - 1
	}
	if le.Pos.Col < first || le.Pos.Col > last {
		t.Fatalf("%s(%q): error column %d outside %d..%d: %v", what, text, le.Pos.Col, first, last, err)
	}
	if bad := internalName(text, le.Msg); bad != "" {
		t.Fatalf("%s(%q): message %q shows internal text %q", what, text, le.Msg, bad)
	}
	if le.Msg == "" {
		t.Fatalf("%s(%q): empty message at %v", what, text, le.Pos)
	}
}

// hangGuard fails the test when the work it guards takes longer than
// hangLimit: a hang guard against runaway loops, not a claim of speed.
func hangGuard(t *testing.T, what, text string) func() {
	t0 := time.Now()
	return func() {
		if d := time.Since(t0); d > hangLimit {
			t.Fatalf("%s(%.200q… %d bytes) took %v, over the hang guard of %v", what, text, len(text), d, hangLimit)
		}
	}
}

const hangLimit = 5 * time.Second

// statements splits text into statements the way a script or the prompt
// does: a line that leaves a bracket open takes the following lines. It
// returns each statement's text and the 0-based line it starts on.
func statements(text string) (stmts []string, first []int) {
	lines := strings.Split(text, "\n")
	for i := 0; i < len(lines); {
		j := i
		st := lines[i]
		for lang.NeedsMore(st) && j+1 < len(lines) {
			j++
			st += "\n" + lines[j]
		}
		stmts = append(stmts, st)
		first = append(first, i)
		i = j + 1
	}
	return stmts, first
}

// FuzzParseStatement splits any text into statements as the readers do
// (continuing over lines while a bracket is open) and parses each. It fails
// on a panic, a nil statement without an error, an error that is not a
// positioned *lang.Error on a line of the statement, an internal name in a
// message, or offsets outside the statement.
func FuzzParseStatement(f *testing.F) {
	for _, s := range fuzzSeeds {
		f.Add(s)
	}
	f.Add("a = 1\nb = (2,\n 3\nc = 4")
	f.Fuzz(func(t *testing.T, text string) {
		defer hangGuard(t, "ParseStatement", text)()
		stmts, first := statements(text)
		for i, st := range stmts {
			base := lang.Pos{File: "p.lw", Line: 10 + first[i], Col: 3}
			s, err := lang.ParseStatement(base, st)
			if err != nil {
				checkPositioned(t, "ParseStatement", st, base, err)
				continue
			}
			if s == nil {
				t.Fatalf("ParseStatement(%q) returned neither a statement nor an error", st)
			}
			n := utf8.RuneCountInString(st)
			for _, off := range []int{s.ExprOff, s.AsOff, s.DeclaredOff} {
				if off < 0 || off > n {
					t.Fatalf("ParseStatement(%q): offset %d outside 0..%d: %+v", st, off, n, s)
				}
			}
			if (s.Kind == lang.Expr || s.Kind == lang.Assign || s.Kind == lang.Define) && strings.TrimSpace(s.Expr) == "" {
				t.Fatalf("ParseStatement(%q): kind %d without an expression", st, s.Kind)
			}
			if r := []rune(st); s.Expr != "" && (s.ExprOff+utf8.RuneCountInString(s.Expr) > len(r)) {
				t.Fatalf("ParseStatement(%q): expression %q at %d runs past the end", st, s.Expr, s.ExprOff)
			}
		}
	})
}

// FuzzRewrite runs the unit-literal pre-lexer, with the real unit
// catalogue, on the expression of every statement that parses. It fails on
// a panic, on a nil result without an error, on an error that is not a
// positioned *lang.Error or shows an internal name, and on a rewrite that
// breaks its own contract: every placeholder stands in the rewritten text,
// every literal's offsets and every mapped offset lie inside the
// expression, the map never runs backwards, and a literal's number is a
// decimal number.
func FuzzRewrite(f *testing.F) {
	for _, s := range fuzzSeeds {
		f.Add(s)
	}
	units := runtime.UnitTable{}
	f.Fuzz(func(t *testing.T, text string) {
		defer hangGuard(t, "Rewrite", text)()
		base := lang.Pos{File: "r.lw", Line: 2, Col: 1}
		st, err := lang.ParseStatement(base, text)
		if err != nil || st.Kind == lang.Empty || st.Kind == lang.Command {
			return // FuzzParseStatement checks these
		}
		w, err := lang.Rewrite(st, st.Expr, st.ExprOff, units)
		if err != nil {
			checkPositioned(t, "Rewrite", text, base, err)
			return
		}
		if w == nil {
			t.Fatalf("Rewrite(%q) returned neither a result nor an error", st.Expr)
		}
		n := utf8.RuneCountInString(st.Expr)
		for _, l := range w.Lits {
			if !strings.Contains(w.Src, strings.TrimSpace(l.Placeholder)) {
				t.Fatalf("Rewrite(%q): placeholder %q missing from %q", st.Expr, l.Placeholder, w.Src)
			}
			if l.Off < 0 || l.Off > n || l.UnitOff < l.Off || l.UnitOff > n {
				t.Fatalf("Rewrite(%q): literal %+v outside 0..%d", st.Expr, l, n)
			}
			if l.Unit == "" && !l.Imag {
				t.Fatalf("Rewrite(%q): literal %+v without a unit", st.Expr, l)
			}
			if l.Imag && l.Number == "" {
				t.Fatalf("Rewrite(%q): imaginary literal %+v without a number", st.Expr, l)
			}
			if l.Number != "" {
				if _, err := strconv.ParseFloat(l.Number, 64); err != nil && !errors.Is(err, strconv.ErrRange) {
					t.Fatalf("Rewrite(%q): literal number %q: %v", st.Expr, l.Number, err)
				}
			}
		}
		prev := 0
		for i := range utf8.RuneCountInString(w.Src) {
			o := w.Orig(i)
			if o < 0 || o > n || o < prev {
				t.Fatalf("Rewrite(%q) = %q: rune %d maps to %d (previous %d, length %d)", st.Expr, w.Src, i, o, prev, n)
			}
			prev = o
		}
	})
}
