package runtime_test

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"loopwise/lang"
	"loopwise/runtime"
)

// This file holds the one checker the fuzz targets and the malformed-input
// table of this package share: what every answer to any input must satisfy.

// internalRes match text that belongs to the implementation and means
// nothing to a user: placeholder and engine names (__L0, __call), Go
// package and type names, the words nil and <nil>, a format error, signs
// of a panic, and names of temporary files.
var internalRes = []*regexp.Regexp{
	regexp.MustCompile(`__[A-Za-z0-9_]+`),
	regexp.MustCompile(`<nil>|\bnil\b`),
	regexp.MustCompile(`\b(lang|runtime|builtins|em|expr|ast|vm|reflect|strconv|math|big|file|conf)\.[A-Za-z]`),
	regexp.MustCompile(`\b(float64|int64|interface \{\}|func\(|map\[|\[\]\w+)`),
	regexp.MustCompile(`%!|\bpanic\b|goroutine|runtime error|internal error`),
	regexp.MustCompile(`/tmp/|\.tmp\b|\.lw-\w+`),
}

// internalName returns the first internal text in msg, or "". Text the
// input itself contains does not count: a user may name a variable nil.
func internalName(in, msg string) string {
	for _, re := range internalRes {
		for _, m := range re.FindAllString(msg, -1) {
			if !strings.Contains(in, m) {
				return m
			}
		}
	}
	return ""
}

// nonFiniteRe finds a NaN or an infinity in a shown value.
var nonFiniteRe = regexp.MustCompile(`\bNaN\b|\bInf\b|[+-]Inf\b|∞`)

// nonFinite returns a description of the first NaN or infinity in v, or "".
func nonFinite(v runtime.Value) string {
	bad := func(x float64) bool { return math.IsNaN(x) || math.IsInf(x, 0) }
	switch x := v.(type) {
	case runtime.Quantity:
		if bad(x.V) {
			return "quantity"
		}
	case runtime.Vector:
		for _, c := range x.V {
			if bad(c) {
				return "vector component"
			}
		}
	case runtime.Tabular:
		_, _, rows := x.Tabulate()
		for i, row := range rows {
			for _, c := range row {
				if bad(c) {
					return fmt.Sprintf("table row %d", i+1)
				}
			}
		}
	}
	if sh, ok := v.(runtime.Shower); ok {
		if m := nonFiniteRe.FindString(sh.Show(6) + " " + sh.Summary(6)); m != "" {
			return sh.Kind() + " shows " + m
		}
	}
	return ""
}

// checkError fails t unless err is a positioned *lang.Error in file, on one
// of the lines first..last, with a column inside that line of text (or just
// past its end) and a message without internal names. lines are the lines
// of the source, indexed from line 1.
func checkError(t *testing.T, what, in string, err error, file string, first, last int, lines []string) {
	t.Helper()
	var le *lang.Error
	if !errors.As(err, &le) {
		t.Fatalf("%s(%q): error %T %q is not a *lang.Error", what, in, err, err)
	}
	if le.Pos.File != file || le.Pos.Line < first || le.Pos.Line > last {
		t.Fatalf("%s(%q): error at %v, want %s lines %d..%d: %v", what, in, le.Pos, file, first, last, err)
	}
	if k := le.Pos.Line - 1; k < len(lines) {
		if n := utf8.RuneCountInString(lines[k]); le.Pos.Col < 1 || le.Pos.Col > n+1 {
			t.Fatalf("%s(%q): error column %d outside 1..%d: %v", what, in, le.Pos.Col, n+1, err)
		}
	}
	if strings.TrimSpace(le.Msg) == "" {
		t.Fatalf("%s(%q): empty message at %v", what, in, le.Pos)
	}
	if bad := internalName(in, le.Msg); bad != "" {
		t.Fatalf("%s(%q): message %q shows internal text %q", what, in, le.Msg, bad)
	}
}

// checkResult fails t unless a statement that succeeded produced what its
// kind promises: an expression or assignment a value (never nil), finite,
// shown and recorded without "<nil>", NaN, infinities or internal names.
func checkResult(t *testing.T, what, in string, res *runtime.Result) {
	t.Helper()
	if res == nil || res.Stmt == nil {
		t.Fatalf("%s(%q): neither a result nor an error", what, in)
	}
	switch res.Stmt.Kind {
	case lang.Expr, lang.Assign:
		if res.Value == nil {
			t.Fatalf("%s(%q): nil value (shown %q)", what, in, res.Text)
		}
		if bad := nonFinite(res.Value); bad != "" {
			t.Fatalf("%s(%q): non-finite %s: %s", what, in, bad, res.Text)
		}
		for _, text := range []string{res.Text, res.Record} {
			if m := nonFiniteRe.FindString(text); m != "" && !strings.Contains(in, m) {
				t.Fatalf("%s(%q): shows %q: %q", what, in, m, text)
			}
			if bad := internalName(in, text); bad != "" {
				t.Fatalf("%s(%q): shows internal text %q: %q", what, in, bad, text)
			}
		}
	}
	if bad := internalName(in, res.Note); bad != "" {
		t.Fatalf("%s(%q): note shows internal text %q: %q", what, in, bad, res.Note)
	}
}

// hangLimit bounds one fuzz input or one table case: a guard against
// runaway work, not a claim of speed. A case that uses up the default
// work budget (5 s of work on a quiet machine) takes two to three times
// that on a loaded two-core machine, so the guard is well above it.
const hangLimit = 30 * time.Second

// evalBounded evaluates in on s and fails t when it has not returned within
// hangLimit (the session is interrupted first, so the goroutine ends when
// the work polls for it).
func evalBounded(t *testing.T, s *runtime.Session, base lang.Pos, in string) (*runtime.Result, error) {
	t.Helper()
	type answer struct {
		res *runtime.Result
		err error
	}
	done := make(chan answer, 1)
	go func() {
		res, err := s.Eval(base, in)
		done <- answer{res, err}
	}()
	select {
	case a := <-done:
		return a.res, a.err
	case <-time.After(hangLimit):
		s.Interrupt()
		t.Fatalf("Eval(%.200q… %d bytes) still running after %v", in, len(in), hangLimit)
		return nil, nil
	}
}

// namedInputs are inputs that once gave a nil result or a wrapped exponent;
// they are seeds of the evaluator's fuzz target.
var namedInputs = []string{"5 m^2x", "5 mm^1e9", "0A^0A", "0C^0A", "(1) m^2e", "1e9223372036854775805 km"}
