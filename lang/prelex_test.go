package lang_test

import (
	"reflect"
	"testing"
	"unicode/utf8"

	"loopwise/lang"
)

// fakeUnits is a small unit table for the pre-lexer: lang must not import
// runtime, so the tests bring their own.
type fakeUnits map[string]bool

func (u fakeUnits) IsUnit(name string) bool { return u[name] }

func (u fakeUnits) SuggestUnit(name string) string {
	if name == "mTT" {
		return "mT"
	}
	return ""
}

var units = fakeUnits{
	"m": true, "mm": true, "s": true, "ms": true, "A": true, "kg": true,
	"T": true, "mT": true, "µT": true, "uT": true, "W": true, "K": true, "Wb": true,
	"°C": true,
}

// rewrite parses in as a statement and rewrites its expression.
func rewrite(t *testing.T, in string) (*lang.Statement, *lang.Rewritten, error) {
	t.Helper()
	st, err := lang.ParseStatement(lang.Pos{File: "t.lw", Line: 1, Col: 1}, in)
	if err != nil {
		t.Fatalf("ParseStatement(%q): %v", in, err)
	}
	w, err := lang.Rewrite(st, st.Expr, st.ExprOff, units)
	return st, w, err
}

func TestRewriteLiterals(t *testing.T) {
	lit := func(ph, num, unit string, off, uoff int) lang.Literal {
		return lang.Literal{Placeholder: ph, Number: num, Unit: unit, Off: off, UnitOff: uoff}
	}
	tests := []struct {
		in   string
		src  string
		lits []lang.Literal
	}{
		{"5 mT", "__L0", []lang.Literal{lit("__L0", "5", "mT", 0, 2)}},
		{"5mT", "__L0", []lang.Literal{lit("__L0", "5", "mT", 0, 1)}},
		{"5   mT", "__L0", []lang.Literal{lit("__L0", "5", "mT", 0, 4)}},
		{"3 A/ms", "__L0", []lang.Literal{lit("__L0", "3", "A/ms", 0, 2)}},
		{"2 kg*m^2/s^2", "__L0", []lang.Literal{lit("__L0", "2", "kg*m^2/s^2", 0, 2)}},
		{"1.5 W/(m*K)", "__L0", []lang.Literal{lit("__L0", "1.5", "W/(m*K)", 0, 4)}},
		{"2 m^-2", "__L0", []lang.Literal{lit("__L0", "2", "m^-2", 0, 2)}},
		{"[0, 0, 5] mm", "([0, 0, 5]*__L0)", []lang.Literal{lit("__L0", "", "mm", 10, 10)}},
		{"(2+3) mm", "((2+3)*__L0)", []lang.Literal{lit("__L0", "", "mm", 6, 6)}},
		// A unit after a bracket binds to the bracketed operand, with the
		// name of a call before it and the base of a power.
		{"10 A / (3 + x) mm", "__L0 / ((3 + x)*__L1)", []lang.Literal{lit("__L0", "10", "A", 0, 3), lit("__L1", "", "mm", 15, 15)}},
		{"1 / sqrt(4) m", "1 / (sqrt(4)*__L0)", []lang.Literal{lit("__L0", "", "m", 12, 12)}},
		{"1 / 10^(-3) m", "1 / (10^(-3)*__L0)", []lang.Literal{lit("__L0", "", "m", 12, 12)}},
		{"1 / (2) ** (2) m", "1 / ((2) ** (2)*__L0)", []lang.Literal{lit("__L0", "", "m", 15, 15)}},
		{"a / f(b)(c) m", "a / (f(b)(c)*__L0)", []lang.Literal{lit("__L0", "", "m", 12, 12)}},
		{"([1, 2] mm)", "(([1, 2]*__L0))", []lang.Literal{lit("__L0", "", "mm", 8, 8)}},
		// A space ends the unit: s is a name here, multiplied.
		{"2 m * s", "__L0 * s", []lang.Literal{lit("__L0", "2", "m", 0, 2)}},
		// The degree sign starts a unit symbol (°C).
		{"20 °C", "__L0", []lang.Literal{lit("__L0", "20", "°C", 0, 3)}},
		{"-5°C + x", "-__L0 + x", []lang.Literal{lit("__L0", "5", "°C", 1, 2)}},
		// "**" is the engine's power operator, not a unit product.
		{"2 m**2", "__L0**2", []lang.Literal{lit("__L0", "2", "m", 0, 2)}},
		{"1.2e-3 Wb", "__L0", []lang.Literal{lit("__L0", "1.2e-3", "Wb", 0, 7)}},
		{"1_000 A", "__L0", []lang.Literal{lit("__L0", "1000", "A", 0, 6)}},
		{".5 m", "__L0", []lang.Literal{lit("__L0", ".5", "m", 0, 3)}},
		{"5 µT + x", "__L0 + x", []lang.Literal{lit("__L0", "5", "µT", 0, 2)}},
		{"2 mm + 3 ms", "__L0 + __L1", []lang.Literal{lit("__L0", "2", "mm", 0, 2), lit("__L1", "3", "ms", 7, 9)}},
		{"x = 4 mm // gap", "__L0", []lang.Literal{lit("__L0", "4", "mm", 0, 2)}},
		{"'5 mT' + 5 mT", "'5 mT' + __L0", []lang.Literal{lit("__L0", "5", "mT", 9, 11)}},
		{"2 + 3", "2 + 3", nil},
		{".5 + 1", "0.5 + 1", nil},
		{"2 and x", "2 and x", nil},
	}
	for _, tc := range tests {
		_, w, err := rewrite(t, tc.in)
		if err != nil {
			t.Errorf("Rewrite(%q): %v", tc.in, err)
			continue
		}
		if w.Src != tc.src {
			t.Errorf("Rewrite(%q).Src = %q, want %q", tc.in, w.Src, tc.src)
		}
		if !reflect.DeepEqual(w.Lits, tc.lits) {
			t.Errorf("Rewrite(%q).Lits\n got %+v\nwant %+v", tc.in, w.Lits, tc.lits)
		}
	}
}

// TestRewriteOrig checks the map from runes of the rewritten text back to
// runes of the original expression: every rune of a placeholder maps to the
// start of its literal, copied runes map to themselves, and an offset just
// past the end maps to just past the end of the original.
func TestRewriteOrig(t *testing.T) {
	tests := []struct {
		in   string
		orig []int // Orig(i) for i = 0 .. len(Src) inclusive
	}{
		// "__L0 + x" from "5 µT + x": µ is one rune, so x is rune 7.
		{"5 µT + x", []int{0, 0, 0, 0, 4, 5, 6, 7, 8}},
		// The expression of an assignment: offsets are into "5 µT + y".
		{"y = 5 µT + y", []int{0, 0, 0, 0, 4, 5, 6, 7, 8}},
		{"2 m * s", []int{0, 0, 0, 0, 3, 4, 5, 6, 7}},
		// "([0, 0, 5]*__L0)": the inserted "(" maps to the "[", the
		// inserted "*", the placeholder and the closing ")" to mm.
		{"[0, 0, 5] mm", []int{0, 0, 1, 2, 3, 4, 5, 6, 7, 8, 10, 10, 10, 10, 10, 10, 12}},
		// The "0" put in front of ".5" maps to the ".".
		{".5 + 1", []int{0, 0, 1, 2, 3, 4, 5, 6}},
		{"µ + 5 mT", []int{0, 1, 2, 3, 4, 4, 4, 4, 8}},
		// An expression that ends with a literal.
		{"5 mT", []int{0, 0, 0, 0, 4}},
		{"x*1 mm", []int{0, 1, 2, 2, 2, 2, 6}},
	}
	for _, tc := range tests {
		st, w, err := rewrite(t, tc.in)
		if err != nil {
			t.Errorf("Rewrite(%q): %v", tc.in, err)
			continue
		}
		if n := utf8.RuneCountInString(w.Src); n+1 != len(tc.orig) {
			t.Errorf("Rewrite(%q).Src = %q has %d runes; the test lists %d offsets", tc.in, w.Src, n, len(tc.orig))
			continue
		}
		var got []int
		for i := range tc.orig {
			got = append(got, w.Orig(i))
		}
		if !reflect.DeepEqual(got, tc.orig) {
			t.Errorf("Rewrite(%q) (expr %q, Src %q) Orig = %v, want %v", tc.in, st.Expr, w.Src, got, tc.orig)
		}
		if got := w.Orig(-1); got != 0 {
			t.Errorf("Rewrite(%q).Orig(-1) = %d, want 0", tc.in, got)
		}
	}
}

func TestRewriteErrors(t *testing.T) {
	tests := []struct {
		in   string
		want string
	}{
		{"2 mTT",
			"t.lw:1:3: unknown unit \"mTT\" after a number; did you mean \"mT\"?\n    2 mTT\n      ^^^"},
		{"x = 2 foo + 1",
			"t.lw:1:7: unknown unit \"foo\" after a number (to multiply by a name, write 2*foo)\n    x = 2 foo + 1\n          ^^^"},
		{"5 µT + 2 µX",
			"t.lw:1:10: unknown unit \"µX\" after a number (to multiply by a name, write 2*µX)\n    5 µT + 2 µX\n             ^^"},
		{"1 + __L0",
			"t.lw:1:5: names starting with \"__\" are reserved\n    1 + __L0\n        ^^^^"},
		// A unit directly followed by an operator it cannot take: the
		// caret is on the unit.
		{"5 m^",
			"t.lw:1:3: after the unit \"m\", ^ needs a whole power written with it, as in m^2 or m^-1; to raise the whole quantity, write (5 m)^...\n    5 m^\n      ^^"},
		{"5 kg**",
			"t.lw:1:3: the unit \"kg\" is followed by \"**\" and nothing else: a unit or a value is missing\n    5 kg**\n      ^^^^"},
		{"(1 + 2) mm/ ",
			"t.lw:1:9: the unit \"mm\" is followed by \"/\" and nothing else: a unit or a value is missing\n    (1 + 2) mm/ \n            ^^^"},
		// a number after a member dot, with or without a space: never a
		// placeholder name in a message
		{"x = 2 m. 5 A",
			"t.lw:1:8: a number cannot follow '.' here; vector components are .x, .y and .z\n    x = 2 m. 5 A\n           ^^^"},
		{"v.0",
			"t.lw:1:2: a number cannot follow '.' here; vector components are .x, .y and .z\n    v.0\n     ^^"},
		{"2and 3",
			"t.lw:1:1: a number must be followed by a space or an operator here\n    2and 3\n    ^^"},
	}
	for _, tc := range tests {
		_, w, err := rewrite(t, tc.in)
		if err == nil {
			t.Errorf("Rewrite(%q) = %q, want an error", tc.in, w.Src)
			continue
		}
		if _, ok := lang.AsError(err); !ok {
			t.Errorf("Rewrite(%q) error %T is not a *lang.Error", tc.in, err)
			continue
		}
		if got := err.Error(); got != tc.want {
			t.Errorf("Rewrite(%q) error\n got: %s\nwant: %s", tc.in, got, tc.want)
		}
	}
}
