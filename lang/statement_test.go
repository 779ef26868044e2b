package lang_test

import (
	"errors"
	"reflect"
	"strings"
	"testing"

	"loopwise/lang"
)

var base = lang.Pos{File: "t.lw", Line: 7, Col: 1}

func TestParseStatementKinds(t *testing.T) {
	tests := []struct {
		in   string
		want lang.Statement // Base and Text are filled in by the test
	}{
		{"", lang.Statement{Kind: lang.Empty}},
		{"   \t", lang.Statement{Kind: lang.Empty}},
		{"// only a comment", lang.Statement{Kind: lang.Empty}},
		{"   // indented comment = with as", lang.Statement{Kind: lang.Empty}},

		{"2 m + 3 m", lang.Statement{Kind: lang.Expr, Expr: "2 m + 3 m"}},
		{"  gap * 2  // twice", lang.Statement{Kind: lang.Expr, Expr: "gap * 2", ExprOff: 2}},
		{"a == b", lang.Statement{Kind: lang.Expr, Expr: "a == b"}},
		{"a <= b", lang.Statement{Kind: lang.Expr, Expr: "a <= b"}},
		{"a >= b", lang.Statement{Kind: lang.Expr, Expr: "a >= b"}},
		{"a != b", lang.Statement{Kind: lang.Expr, Expr: "a != b"}},
		{"a==b", lang.Statement{Kind: lang.Expr, Expr: "a==b"}},
		{`"x = y" + s`, lang.Statement{Kind: lang.Expr, Expr: `"x = y" + s`}},
		{"max(a, b = c)", lang.Statement{Kind: lang.Expr, Expr: "max(a, b = c)"}},
		{"alias + gas", lang.Statement{Kind: lang.Expr, Expr: "alias + gas"}},
		{"1e-3 as m", lang.Statement{Kind: lang.Expr, Expr: "1e-3", As: "m", AsOff: 8}},
		{"flux as uWb", lang.Statement{Kind: lang.Expr, Expr: "flux", As: "uWb", AsOff: 8}},
		{"B.z as µT  // shown in microtesla", lang.Statement{Kind: lang.Expr, Expr: "B.z", As: "µT", AsOff: 7}},

		{"gap = 4 mm", lang.Statement{Kind: lang.Assign, Name: "gap", Expr: "4 mm", ExprOff: 6}},
		{"gap=4 mm // air gap", lang.Statement{Kind: lang.Assign, Name: "gap", Expr: "4 mm", ExprOff: 4}},
		{"ok = a == b", lang.Statement{Kind: lang.Assign, Name: "ok", Expr: "a == b", ExprOff: 5}},
		{"ok = a <= b", lang.Statement{Kind: lang.Assign, Name: "ok", Expr: "a <= b", ExprOff: 5}},
		{"ok = a != b", lang.Statement{Kind: lang.Assign, Name: "ok", Expr: "a != b", ExprOff: 5}},
		{"x: mm = 2 mm", lang.Statement{Kind: lang.Assign, Name: "x", Declared: "mm", DeclaredOff: 3, Expr: "2 mm", ExprOff: 8}},
		{"k : W/(m*K) = 1.5 W/(m*K)", lang.Statement{Kind: lang.Assign, Name: "k", Declared: "W/(m*K)", DeclaredOff: 4, Expr: "1.5 W/(m*K)", ExprOff: 14}},
		{"area = 3 mm*4 mm as mm^2", lang.Statement{Kind: lang.Assign, Name: "area", Expr: "3 mm*4 mm", ExprOff: 7, As: "mm^2", AsOff: 20}},
		{"µ0r = 5 µT", lang.Statement{Kind: lang.Assign, Name: "µ0r", Expr: "5 µT", ExprOff: 6}},

		{"I(t) = 20 A * sin(t)", lang.Statement{Kind: lang.Define, Name: "I", Params: []string{"t"}, Expr: "20 A * sin(t)", ExprOff: 7}},
		{"f(a, b) = a*b", lang.Statement{Kind: lang.Define, Name: "f", Params: []string{"a", "b"}, Expr: "a*b", ExprOff: 10}},
		{"f( a ,b )=a", lang.Statement{Kind: lang.Define, Name: "f", Params: []string{"a", "b"}, Expr: "a", ExprOff: 10}},
		{"g() = 1 m", lang.Statement{Kind: lang.Define, Name: "g", Expr: "1 m", ExprOff: 6}},

		{":digits 4", lang.Statement{Kind: lang.Command, Cmd: "digits", Args: "4"}},
		{"  :help sin   // which one", lang.Statement{Kind: lang.Command, Cmd: "help", Args: "sin"}},
		{":vars", lang.Statement{Kind: lang.Command, Cmd: "vars"}},
	}
	for _, tc := range tests {
		got, err := lang.ParseStatement(base, tc.in)
		if err != nil {
			t.Errorf("ParseStatement(%q): %v", tc.in, err)
			continue
		}
		want := tc.want
		want.Base, want.Text = base, tc.in
		if !reflect.DeepEqual(*got, want) {
			t.Errorf("ParseStatement(%q)\n got %+v\nwant %+v", tc.in, *got, want)
		}
	}
}

func TestParseStatementErrors(t *testing.T) {
	tests := []struct {
		in   string
		want string
	}{
		{"x = 1 = 2",
			"t.lw:7:7: only one = is allowed in a statement; compare with ==\n    x = 1 = 2\n          ^"},
		{"gap as",
			"t.lw:7:5: \"as\" needs a unit after it, as in \"flux as uWb\"\n    gap as\n        ^^"},
		{"gap as mm = 2",
			"t.lw:7:5: \"as\" must come at the end of the statement\n    gap as mm = 2\n        ^^"},
		{"f(x) = x as mm",
			"t.lw:7:10: a function definition cannot be shown \"as\" a unit; convert its calls instead\n    f(x) = x as mm\n             ^^"},
		{"x =   // nothing",
			"t.lw:7:7: an expression is missing here\n    x =   // nothing\n          ^"},
		{"x: = 2",
			"t.lw:7:2: a declared unit is missing after ':'\n    x: = 2\n     ^"},
		{"f(a,) = a",
			"t.lw:7:5: empty parameter name\n    f(a,) = a\n        ^"},
		// The caret belongs under the ")" that ends the empty parameter,
		// not under the space before it.
		{"f(a, ) = a",
			"t.lw:7:6: empty parameter name\n    f(a, ) = a\n         ^"},
		{"f(a) b = a",
			"t.lw:7:6: unexpected text between the parameter list and =\n    f(a) b = a\n         ^^"},
		{"f(a, not) = a",
			"t.lw:7:6: \"not\" is a reserved word and cannot be a name\n    f(a, not) = a\n         ^^^"},
		{"f(a, __b) = a",
			"t.lw:7:6: names starting with \"__\" are reserved\n    f(a, __b) = a\n         ^^^"},
		{"[1, (2]",
			"t.lw:7:7: ']' does not match the '(' at column 5\n    [1, (2]\n          ^"},
		{"µ + 'it",
			"t.lw:7:5: this string is never closed\n    µ + 'it\n        ^"},
		{"sin(x // note)",
			"t.lw:7:4: parenthesis '(' is never closed\n    sin(x // note)\n       ^"},
	}
	for _, tc := range tests {
		st, err := lang.ParseStatement(base, tc.in)
		if err == nil {
			t.Errorf("ParseStatement(%q) = %+v, want an error", tc.in, st)
			continue
		}
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("ParseStatement(%q) error %T is not a *lang.Error", tc.in, err)
			continue
		}
		if got := err.Error(); got != tc.want {
			t.Errorf("ParseStatement(%q) error\n got: %s\nwant: %s", tc.in, got, tc.want)
		}
	}
}

// TestStatementPos: offsets are runes of the line and positions are
// relative to the line's base (a script statement may be indented).
func TestStatementPos(t *testing.T) {
	st, err := lang.ParseStatement(lang.Pos{File: "c.lw", Line: 2, Col: 5}, "µ = 1")
	if err != nil {
		t.Fatal(err)
	}
	if got, want := st.Pos(st.ExprOff), (lang.Pos{File: "c.lw", Line: 2, Col: 9}); got != want {
		t.Errorf("Pos(ExprOff) = %v, want %v", got, want)
	}
	e := st.Errorf(2, 1, "bad %s", "thing")
	if got, want := e.Pos, (lang.Pos{File: "c.lw", Line: 2, Col: 7}); got != want {
		t.Errorf("Errorf position = %v, want %v", got, want)
	}
	if e.Msg != "bad thing" || e.Source != "µ = 1" || e.Width != 1 {
		t.Errorf("Errorf = %+v", e)
	}
}

func TestNeedsMore(t *testing.T) {
	tests := []struct {
		in   string
		want bool
	}{
		{"x = 1 m", false},
		{"B = b_at(src,", true},
		{"v = [1 m,", true},
		{"v = [1 m,\n  2 m,", true},
		{"v = [1 m,\n  2 m, 3 m]", false},
		{"f(a, // not closed here )", true},
		{`s = "(" + x`, false},
		{`s = "unclosed (`, false}, // an error for the parser, not a continuation
		{"x = 1 m)", false},        // nothing to close: the parser reports it
		{"{ (", true},
	}
	for _, tc := range tests {
		if got := lang.NeedsMore(tc.in); got != tc.want {
			t.Errorf("NeedsMore(%q) = %v, want %v", tc.in, got, tc.want)
		}
	}
}

func TestParseContinuedStatement(t *testing.T) {
	text := "B = b_at(src, // the coil\n    [0 m, 0 m, 5 mm])  // on axis"
	st, err := lang.ParseStatement(base, text)
	if err != nil {
		t.Fatal(err)
	}
	// The comment inside the statement is blanked to keep offsets; the
	// trailing one ends the expression.
	want := "b_at(src, " + strings.Repeat(" ", len("// the coil")) + "\n    [0 m, 0 m, 5 mm])"
	if st.Kind != lang.Assign || st.Name != "B" || st.Expr != want {
		t.Fatalf("got kind %v name %q expr %q, want an assignment of B to %q", st.Kind, st.Name, st.Expr, want)
	}
	// An offset on the second line is reported on that line, counted from
	// its own first column.
	off := len([]rune("B = b_at(src, // the coil\n    "))
	if got := st.Pos(off); got != (lang.Pos{File: "t.lw", Line: 8, Col: 5}) {
		t.Errorf("Pos(%d) = %v, want t.lw:8:5", off, got)
	}
}

func TestContinuedStatementErrors(t *testing.T) {
	tests := []struct{ in, want string }{
		{"x = (1 m +\n   2 m))",
			"t.lw:8:8: unexpected ')': nothing to close\n       2 m))\n           ^"},
		{"x = (1 m +\n   2 m]",
			"t.lw:8:7: ']' does not match the '(' at line 7, column 5\n       2 m]\n          ^"},
		{"v = [1 m,\n  (2 m, 3 m",
			"t.lw:8:3: parenthesis '(' is never closed\n      (2 m, 3 m\n      ^"},
	}
	for _, tc := range tests {
		_, err := lang.ParseStatement(base, tc.in)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("ParseStatement(%q): got %v, want a *lang.Error", tc.in, err)
			continue
		}
		if got := le.Error(); got != tc.want {
			t.Errorf("ParseStatement(%q):\ngot\n%s\nwant\n%s", tc.in, got, tc.want)
		}
	}
}
