package runtime_test

import (
	"errors"
	"fmt"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// defaultSetup is evaluated (as lines 1 and 2 of t.lw) before every case
// that does not bring its own setup.
var defaultSetup = []string{
	"gap = 4 mm",
	"I(t) = 2 A * t/1 s",
}

// errorCase is one malformed statement, evaluated as line 3 of t.lw after
// its setup lines. col is the 1-based column the caret must start at, caret
// the whole caret line as printed under the source (without the four-space
// indent) and msg the message between "t.lw:3:col: " and the source line.
type errorCase struct {
	name  string
	setup []string // nil: defaultSetup
	in    string
	col   int
	msg   string
	caret string
}

// errorCases pins the full text of the errors users see. The column of each
// case was chosen from the input (under the operator of a mismatch, under an
// unknown unit or name, under the bracket that is never closed), not copied
// from what the code happened to print.
var errorCases = []errorCase{
	// Unit literals.
	{name: "unknown unit with suggestion", in: "2 mTT", col: 3,
		msg:   `unknown unit "mTT" after a number; did you mean "mT"?`,
		caret: "  ^^^"},
	{name: "unknown unit with suggestion after prefix", in: "2 kgg", col: 3,
		msg:   `unknown unit "kgg" after a number; did you mean "kg"?`,
		caret: "  ^^^"},
	{name: "unknown unit without suggestion", in: "5 foo", col: 3,
		msg:   `unknown unit "foo" after a number (to multiply by a name, write 5*foo)`,
		caret: "  ^^^"},
	{name: "unit power out of range", in: "2 m^99", col: 4,
		msg:   `a unit power must be a whole number from -12 to 12`,
		caret: "   ^^^"},
	{name: "fractional unit power in a literal", in: "2 m^0.5", col: 4,
		msg:   `a unit power must be a whole number from -12 to 12`,
		caret: "   ^^^^"},
	{name: "fractional power of a length", in: "(2 m)^0.5", col: 6,
		msg:   `cannot raise length (m) to the power 0.5: the unit would need a fractional exponent`,
		caret: "     ^"},
	{name: "number too large", in: "1e999", col: 1,
		msg:   `number "1e999" is too large`,
		caret: "^^^^^"},
	{name: "number glued to a keyword", in: "2and 3", col: 1,
		msg:   `a number must be followed by a space or an operator here`,
		caret: "^^"},

	// Names.
	{name: "unknown name with suggestion", in: "gapp + 1 mm", col: 1,
		msg:   `unknown name "gapp"; did you mean "gap"?`,
		caret: "^^^^"},
	{name: "unknown name without suggestion", in: "2*gap + bar", col: 9,
		msg:   `unknown name "bar"`,
		caret: "        ^^^"},
	{name: "unknown one-letter name", in: "x + 1 mm", col: 1,
		msg:   `unknown name "x"`,
		caret: "^"},
	{name: "unit used as a name", in: "T + 1", col: 1,
		msg:   `unknown name "T" (T is a unit: write a number before it, as in 1 T)`,
		caret: "^"},
	{name: "unknown name after non-ASCII unit", in: "5 µT + xyzzy", col: 8,
		msg:   `unknown name "xyzzy"`,
		caret: "       ^^^^^"},
	{name: "unknown name in a function body", in: "f(x) = x + undefinedthing", col: 12,
		msg:   `unknown name "undefinedthing"`,
		caret: "           ^^^^^^^^^^^^^^"},

	// Dimensions.
	{name: "add mismatch", in: "2 m + 3 T", col: 5,
		msg:   `cannot add length (m) and magnetic flux density (T)`,
		caret: "    ^"},
	{name: "subtract mismatch", in: "gap - 1 s", col: 5,
		msg:   `cannot subtract length (m) and time (s)`,
		caret: "    ^"},
	{name: "add mismatch with a tab", in: "2 m\t+ 1 s", col: 5,
		msg:   `cannot add length (m) and time (s)`,
		caret: "    ^"},
	{name: "add mismatch after non-ASCII unit", in: "1 µm + 1 s", col: 6,
		msg:   `cannot add length (m) and time (s)`,
		caret: "     ^"},
	{name: "add mismatch in an assignment", in: "gap = gap + 1 T", col: 11,
		msg:   `cannot add length (m) and magnetic flux density (T)`,
		caret: "          ^"},
	{name: "less-than mismatch", in: "gap < 1 A", col: 5,
		msg:   `cannot compare length (m) with electric current (A)`,
		caret: "    ^"},
	{name: "equality mismatch", in: "gap == 2 T", col: 5,
		msg:   `cannot compare length (m) with magnetic flux density (T)`,
		caret: "    ^^"},
	{name: "nested comparison mismatch", in: "1 + (gap >= 2 s)", col: 10,
		msg:   `cannot compare length (m) with time (s)`,
		caret: "         ^^"},
	{name: "exponent with a dimension", in: "1 m ^ 1 m", col: 5,
		msg:   `an exponent must be dimensionless, not length (m)`,
		caret: "    ^"},
	{name: "vector plus scalar", in: "[0,0,5] mm + 1 m", col: 12,
		msg:   `cannot add a vector of length (m) and a single length (m)`,
		caret: "           ^"},
	{name: "function plus number", in: "I + 1", col: 3,
		msg:   `cannot add the function I and a plain number`,
		caret: "  ^"},

	// Function arguments.
	{name: "sin of a length", in: "sin(3 m)", col: 1,
		msg:   `sin: the first argument must be an angle (rad, deg, rev) or a plain number in radians, not length (m)`,
		caret: "^^^"},
	{name: "sin of a length inside a sum", in: "1 + sin(3 m)", col: 5,
		msg:   `sin: the first argument must be an angle (rad, deg, rev) or a plain number in radians, not length (m)`,
		caret: "    ^^^"},
	{name: "hypot of mixed dimensions", in: "hypot(3 mm, 4 s)", col: 1,
		msg:   `hypot: both arguments must have one dimension; got length (m) and time (s)`,
		caret: "^^^^^"},
	{name: "builtin argument count", in: "sin(1, 2)", col: 1,
		msg:   `sin takes 1 argument, got 2`,
		caret: "^^^"},
	{name: "builtin without arguments", in: "sin()", col: 1,
		msg:   `sin takes 1 argument, got 0`,
		caret: "^^^"},
	{name: "user function argument count", in: "I(1 s, 2 s)", col: 1,
		msg:   `I takes 1 argument, got 2`,
		caret: "^"},
	{name: "user function without arguments", in: "I()", col: 1,
		msg:   `I takes 1 argument, got 0`,
		caret: "^"},
	{name: "error inside a user function", setup: []string{"g(t) = t + 1 s"}, in: "g(1 m)", col: 1,
		msg:   `in g(t) (defined at t.lw:1:1, column 10): cannot add length (m) and time (s)`,
		caret: "^"},
	{name: "recursion without end", setup: []string{"f(x) = f(x)"}, in: "f(1)", col: 1,
		msg:   `in f(x) (defined at t.lw:1:1, column 8): calls nest deeper than 200 (a function that calls itself without end?)`,
		caret: "^"},
	{name: "calling a quantity", in: "gap(2)", col: 1,
		msg:   `length (m) is not a function and cannot be called`,
		caret: "^^^"},

	// Arithmetic.
	{name: "division by zero", in: "1 m / 0", col: 5,
		msg:   `division by zero`,
		caret: "    ^"},
	{name: "division by a computed zero", in: "gap / (2 mm - 2 mm)", col: 5,
		msg:   `division by zero`,
		caret: "    ^"},
	{name: "remainder by zero", in: "1 m % 0 m", col: 5,
		msg:   `remainder by zero`,
		caret: "    ^"},
	{name: "zero to a negative power", in: "0^-1", col: 2,
		msg:   `zero raised to a negative power (division by zero)`,
		caret: " ^"},
	{name: "zero metres to a negative power", in: "0 m ^ -2", col: 5,
		msg:   `zero raised to a negative power (division by zero)`,
		caret: "    ^"},
	{name: "overflow", in: "1e308 * 10", col: 7,
		msg:   `the product overflows to infinity`,
		caret: "      ^"},

	// Syntax.
	{name: "dangling operator", in: "2 +", col: 3,
		msg:   `syntax error: the expression ends too early`,
		caret: "  ^"},
	{name: "dangling operator before a comment", in: "1 m + // c", col: 5,
		msg:   `syntax error: the expression ends too early`,
		caret: "    ^"},
	{name: "two operators", in: "2 + * 3", col: 5,
		msg:   `syntax error: unexpected operator "*"`,
		caret: "    ^"},
	{name: "missing left operand", in: "* 3", col: 1,
		msg:   `syntax error: unexpected operator "*"`,
		caret: "^"},
	{name: "missing operator", in: "2 3", col: 3,
		msg:   `syntax error: unexpected number "3"`,
		caret: "  ^"},
	{name: "empty parentheses", in: "()", col: 2,
		msg:   `syntax error: unexpected bracket ")"`,
		caret: " ^"},
	{name: "two as", in: "1 mm as mm as m", col: 6,
		msg:   `syntax error: unexpected name "as"`,
		caret: "     ^^"},
	{name: "unterminated vector", in: "[1, 2, 3", col: 1,
		msg:   `unterminated vector: '[' is never closed with ']'`,
		caret: "^"},
	{name: "unterminated parenthesis", in: "(2 + 3", col: 1,
		msg:   `parenthesis '(' is never closed`,
		caret: "^"},
	{name: "unterminated call", in: "2 * sin(1", col: 8,
		msg:   `parenthesis '(' is never closed`,
		caret: "       ^"},
	{name: "unterminated string", in: `"abc`, col: 1,
		msg:   `this string is never closed`,
		caret: "^"},
	{name: "unterminated single-quoted string", in: `gap + 'abc`, col: 7,
		msg:   `this string is never closed`,
		caret: "      ^"},
	{name: "nothing to close", in: "1 )", col: 3,
		msg:   `unexpected ')': nothing to close`,
		caret: "  ^"},
	{name: "mismatched brackets", in: "(1]", col: 3,
		msg:   `']' does not match the '(' at column 1`,
		caret: "  ^"},

	// Vectors.
	{name: "vector with 2 components", in: "[1, 2]", col: 1,
		msg:   `a vector needs exactly 3 components, got 2`,
		caret: "^"},
	{name: "vector with 4 components", in: "[1, 2, 3, 4]", col: 1,
		msg:   `a vector needs exactly 3 components, got 4`,
		caret: "^"},
	{name: "mixed-dimension vector", in: "[1 m, 2 s, 3 m]", col: 1,
		msg:   `vector components must share one dimension: component 1 is length (m), component 2 is time (s)`,
		caret: "^"},
	{name: "vector times vector", in: "[1,2,3] * [1,2,3]", col: 9,
		msg:   `cannot multiply two vectors with *; use dot(a, b) or cross(a, b)`,
		caret: "        ^"},
	{name: "member of a scalar", in: "gap.x", col: 5,
		msg:   `only a vector has components .x, .y, .z; this is length (m)`,
		caret: "    ^"},
	{name: "unknown member", in: "gap.w", col: 5,
		msg:   `a vector has components .x, .y and .z, not .w`,
		caret: "    ^"},
	{name: "index", in: "gap[0]", col: 4,
		msg:   `only .x, .y and .z may follow a value`,
		caret: "   ^"},

	// Conversions and declared units.
	{name: "as with a wrong dimension", in: "gap as T", col: 8,
		msg:   `cannot show length (m) in T, which measures magnetic flux density (T)`,
		caret: "       ^"},
	{name: "as with an unknown unit", in: "gap as mmm", col: 8,
		msg:   `unknown unit "mmm"; did you mean "mm"?`,
		caret: "       ^^^"},
	{name: "as without a unit", in: "gap as", col: 5,
		msg:   `"as" needs a unit after it, as in "flux as uWb"`,
		caret: "    ^^"},
	{name: "declared unit violated", in: "x: mm = 2 T", col: 9,
		msg:   `x is declared in mm, which measures length (m); cannot assign magnetic flux density (T)`,
		caret: "        ^^^"},
	{name: "declared unit violated later", setup: []string{"gap: mm = 4 mm"}, in: "gap = 3 s", col: 7,
		msg:   `gap is declared in mm, which measures length (m); cannot assign time (s)`,
		caret: "      ^^^"},
	{name: "declared unit given a function", in: "x: mm = sin", col: 9,
		msg:   `x is declared in mm; cannot assign the function sin`,
		caret: "        ^^^"},
	{name: "declared unit unknown", in: "x: foo = 2", col: 4,
		msg:   `unknown unit "foo"`,
		caret: "   ^^^"},
	{name: "declared unit incomplete", in: "x: mm/ = 2 mm", col: 7,
		msg:   `a unit is missing`,
		caret: "      ^"},

	// Left sides and names that cannot be assigned.
	{name: "assign to a constant", in: "pi = 3", col: 1,
		msg:   `pi is a constant; choose another name`,
		caret: "^^"},
	{name: "reserved prefix assigned", in: "__x = 2", col: 1,
		msg:   `names starting with "__" are reserved`,
		caret: "^^^"},
	{name: "reserved prefix used", in: "__x + 1", col: 1,
		msg:   `names starting with "__" are reserved`,
		caret: "^^^"},
	{name: "keyword assigned", in: "and = 2", col: 1,
		msg:   `"and" is a reserved word and cannot be a name`,
		caret: "^^^"},
	{name: "number on the left", in: "2 = x", col: 1,
		msg:   `the left side of = must be a name, name(parameters) or name: unit`,
		caret: "^"},
	{name: "number as a parameter", in: "f(1) = 2", col: 3,
		msg:   `parameter "1" is not a name`,
		caret: "  ^"},
	{name: "repeated parameter", in: "f(a, a) = a", col: 6,
		msg:   `parameter "a" appears twice`,
		caret: "     ^"},
	{name: "two assignments", in: "x = = 1", col: 5,
		msg:   `only one = is allowed in a statement; compare with ==`,
		caret: "    ^"},
	{name: "missing definition body", in: "I(t) =", col: 7,
		msg:   `an expression is missing here`,
		caret: "      ^"},
	{name: "digits out of range", in: ":digits 99", col: 1,
		msg:   `:digits needs a whole number from 2 to 15`,
		caret: "^^^^^^^^^^"},

	// Syntax of the expression engine that Loopwise does not use.
	{name: "map literal", in: "{a: 1}", col: 1,
		msg:   `this syntax is not part of the Loopwise language`,
		caret: "^"},
	{name: "predicate", in: "map([1,2,3], # * 2)", col: 14,
		msg:   `unexpected character '#'`,
		caret: "             ^"},
	{name: "in operator", in: "1 in [1, 2, 3]", col: 3,
		msg:   `the operator "in" is not part of the Loopwise language`,
		caret: "  ^^"},
	{name: "range operator", in: "1..3", col: 2,
		msg:   `the operator ".." is not part of the Loopwise language`,
		caret: " ^^"},
	// The caret sits under the operand that is not true/false.
	{name: "and on numbers", in: "1 and 2", col: 1,
		msg:   `and, or and not need true/false values (from a comparison), not a plain number`,
		caret: "^"},
	{name: "or with a length on the right", in: "1 > 2 or gap", col: 10,
		msg:   `and, or and not need true/false values (from a comparison), not length (m)`,
		caret: "         ^^^"},
	{name: "condition that is a quantity", in: "gap ? 1 : 2", col: 1,
		msg:   `the condition before "?" must be true or false, not length (m)`,
		caret: "^^^"},

	// Text glued to a unit: each of these once evaluated to no value at
	// all (the glued text joined the literal's placeholder into a name the
	// engine did not know). The caret covers the unit and what follows it.
	{name: "unit power runs into an exponent", in: "5 mm^1e9", col: 3,
		msg:   `the unit "mm^1" runs into "e9": put a space or an operator after a unit; a unit power is a whole number, as in m^2`,
		caret: "  ^^^^^^"},
	{name: "unit power runs into a name", in: "5 m^2x", col: 3,
		msg:   `the unit "m^2" runs into "x": put a space or an operator after a unit; a unit power is a whole number, as in m^2`,
		caret: "  ^^^^"},
	{name: "unit power runs into a unit", in: "0A^0A", col: 2,
		msg:   `the unit "A^0" runs into "A": put a space or an operator after a unit; a unit power is a whole number, as in m^2`,
		caret: " ^^^^"},
	{name: "unit after a bracket runs into a letter", in: "(1) m^2e", col: 5,
		msg:   `the unit "m^2" runs into "e": put a space or an operator after a unit; a unit power is a whole number, as in m^2`,
		caret: "    ^^^^"},
	{name: "unit runs into a name after a parenthesis", in: "5 m/(s)x", col: 3,
		msg:   `the unit "m/(s)" runs into "x": put a space or an operator after a unit`,
		caret: "  ^^^^^^"},
	// The decimal exponent once wrapped around when the unit's power of
	// ten (km: 10^3) was added, giving 0 m.
	{name: "exponent near the int64 limit", in: "1e9223372036854775805 km", col: 1,
		msg:   `number "1e9223372036854775805" is too large`,
		caret: "^^^^^^^^^^^^^^^^^^^^^^^^"},
	{name: "exponent beyond int64", in: "2e99999999999999999999 mm", col: 1,
		msg:   `number "2e99999999999999999999" is too large`,
		caret: "^^^^^^^^^^^^^^^^^^^^^^^^^"},
	// A lone carriage return is not a line ending; it is shown as a space.
	{name: "lone carriage return", in: "1 m\r2 m", col: 4,
		msg:   `a carriage return (CR) in the middle of a line; lines end with LF or CR LF`,
		caret: "   ^"},
	// The engine's message names a literal as it was written, not by its
	// placeholder.
	{name: "two literals without an operator", in: "1 m 2 m", col: 5,
		msg:   `syntax error: unexpected "2 m"`,
		caret: "    ^"},
	// The engine reads name(...) as its own list operation for these
	// names (the list is the engine's builtins that take a predicate).
	{name: "function named like a list operation", in: "sum(x) = x", col: 1,
		msg:   `sum cannot name a function: the expression syntax reserves sum(...) for itself, so it could never be called; choose another name, such as sum_of`,
		caret: "^^^"},
	{name: "function value named like a list operation", in: "map = sin", col: 1,
		msg:   `map cannot name a function: the expression syntax reserves map(...) for itself, so it could never be called; choose another name, such as map_of`,
		caret: "^^^"},
	{name: "call of a list operation", in: "count(2)", col: 1,
		msg:   `count(...) is reserved by the expression syntax and cannot be called here`,
		caret: "^^^^^"},
	// The engine's parser would say "expected at least 2 arguments".
	{name: "call of a list operation with one argument", in: "2 m + map (gap)", col: 7,
		msg:   `map(...) is reserved by the expression syntax and cannot be called here`,
		caret: "      ^^^"},
	// Limits of one statement (lang.MaxNesting).
	{name: "prefix operators beyond the limit", in: strings.Repeat("-", 201) + "1", col: 1,
		msg:   `more than 200 prefix operators (- + ! not) follow one another, the most Loopwise allows`,
		caret: strings.Repeat("^", 60)},
}

// leaks are texts that must never reach a user: signs of a Go panic, Go
// type names and the engine's token names. Names of the pre-lexer's
// placeholders and engine functions are checked by leaksName.
var leaks = []string{
	"goroutine", "panic", "runtime error", "interface {}",
	"Operator(", "Bracket(", "Identifier(", "runtime.", "strconv.", "internal error",
}

// leaksName reports whether msg shows a name starting with "__" (a
// placeholder such as __L0 or an engine function such as __add). The
// message about reserved names quotes the bare prefix "__", which is fine,
// and so is a user's name with "__" inside it (A__0).
func leaksName(msg string) bool {
	isWord := func(c byte) bool { return c == '_' || unicode.IsLetter(rune(c)) || unicode.IsDigit(rune(c)) }
	for i := strings.Index(msg, "__"); i >= 0; {
		rest := msg[i+2:]
		if rest != "" && isWord(rest[0]) && (i == 0 || !isWord(msg[i-1])) {
			return true
		}
		j := strings.Index(rest, "__")
		if j < 0 {
			break
		}
		i += 2 + j
	}
	return false
}

func newTestSession(t testing.TB, setup []string) *runtime.Session {
	t.Helper()
	if setup == nil {
		setup = defaultSetup
	}
	s := runtime.NewSession(builtins.Standard())
	for i, line := range setup {
		if _, err := s.Eval(lang.Pos{File: "t.lw", Line: i + 1, Col: 1}, line); err != nil {
			t.Fatalf("setup %q: %v", line, err)
		}
	}
	return s
}

func TestErrorMessages(t *testing.T) {
	if len(errorCases) < 45 {
		t.Fatalf("only %d cases", len(errorCases))
	}
	for _, tc := range errorCases {
		t.Run(tc.name, func(t *testing.T) {
			s := newTestSession(t, tc.setup)
			res, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, tc.in)
			if err == nil {
				t.Fatalf("Eval(%q) = %q, want an error", tc.in, res.Text)
			}
			var le *lang.Error
			if !errors.As(err, &le) {
				t.Fatalf("Eval(%q) error %T %q is not a *lang.Error", tc.in, err, err)
			}
			wantPos := lang.Pos{File: "t.lw", Line: 3, Col: tc.col}
			if le.Pos != wantPos {
				t.Errorf("Eval(%q) position %v, want %v", tc.in, le.Pos, wantPos)
			}
			src := strings.Map(func(c rune) rune {
				if unicode.IsControl(c) {
					return ' '
				}
				return c
			}, tc.in)
			if n := utf8.RuneCountInString(src); n > lang.ShowWidth {
				src = string([]rune(src)[:lang.ShowWidth]) + lang.Ellipsis
			}
			want := fmt.Sprintf("t.lw:3:%d: %s\n    %s\n    %s", tc.col, tc.msg, src, tc.caret)
			if got := err.Error(); got != want {
				t.Errorf("Eval(%q) error\n got: %s\nwant: %s", tc.in, got, want)
			}
			for _, bad := range leaks {
				if strings.Contains(le.Msg, bad) {
					t.Errorf("Eval(%q) message %q contains %q", tc.in, le.Msg, bad)
				}
			}
			if leaksName(le.Msg) {
				t.Errorf("Eval(%q) message %q shows an internal __ name", tc.in, le.Msg)
			}
		})
	}
}

// TestUnknownCommand checks that a command the session does not handle is
// handed back to the caller rather than reported as an error of the user.
func TestUnknownCommand(t *testing.T) {
	s := newTestSession(t, nil)
	res, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, ":bogus")
	if !errors.Is(err, runtime.ErrNotSessionCommand) {
		t.Fatalf("Eval(:bogus) = %v, %v; want ErrNotSessionCommand", res, err)
	}
	if res != nil {
		t.Errorf("Eval(:bogus) result %+v, want nil", res)
	}
}

// TestDimensionExponentOverflow: base-unit exponents are int8; a product
// whose exponent leaves that range must be an error, not a wrapped-around
// unit. (1 m^12)^10 is m^120; twice that is m^240, beyond 127.
func TestDimensionExponentOverflow(t *testing.T) {
	s := newTestSession(t, nil)
	in := "(1 m^12)^10 * (1 m^12)^10"
	res, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, in)
	if err == nil {
		t.Fatalf("Eval(%q) = %q, want an error", in, res.Text)
	}
	le, ok := lang.AsError(err)
	if !ok {
		t.Fatalf("Eval(%q) error %T is not a *lang.Error", in, err)
	}
	if want := (lang.Pos{File: "t.lw", Line: 3, Col: 13}); le.Pos != want {
		t.Errorf("Eval(%q) position %v, want %v (under the *)", in, le.Pos, want)
	}
}

// TestFailedStatementLeavesSessionUnchanged: an error must not bind a name
// half-way.
func TestFailedStatementLeavesSessionUnchanged(t *testing.T) {
	s := newTestSession(t, nil)
	for i, line := range []string{"f(x) = x + nope", "y = 2 m + 1 s", "gap = 1 s/0"} {
		if _, err := s.Eval(lang.Pos{File: "t.lw", Line: 3 + i, Col: 1}, line); err == nil {
			t.Fatalf("Eval(%q) succeeded, want an error", line)
		}
	}
	for _, name := range []string{"f", "y"} {
		if v, ok := s.Lookup(name); ok {
			t.Errorf("after failed statements, %s = %v; want it undefined", name, v)
		}
	}
	res, err := s.Eval(lang.Pos{File: "t.lw", Line: 9, Col: 1}, "gap")
	if err != nil || res.Text != "4 mm" {
		t.Errorf("gap after a failed reassignment = %v, %v; want 4 mm", res, err)
	}
}

// TestShadowBuiltin: a user name may hide a builtin (flux, emf and force are
// natural variable names); the result carries a note and the session goes
// on using the user's value.
func TestShadowBuiltin(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "sin = 3 mV")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(res.Note, "builtin sin is hidden") {
		t.Errorf("note = %q, want a note about hiding the builtin", res.Note)
	}
	res, err = s.Eval(lang.Pos{Line: 2, Col: 1}, "sin * 2")
	if err != nil || res.Text != "6 mV" {
		t.Errorf("sin * 2 = %v, %v; want 6 mV", res, err)
	}
	if _, err := s.Eval(lang.Pos{Line: 3, Col: 1}, "pi = 3"); err == nil {
		t.Error("pi = 3 succeeded; constants must not be rebound")
	}
}

// TestFailedAsLeavesNameUnassigned: "x = 3 T as mm" fails on its display
// unit, and x must not be left assigned (a failed statement changes nothing).
func TestFailedAsLeavesNameUnassigned(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "x = 3 T as mm"); err == nil {
		t.Fatal("x = 3 T as mm succeeded")
	}
	if _, ok := s.Lookup("x"); ok {
		t.Error("x was assigned by a failed statement")
	}
}
