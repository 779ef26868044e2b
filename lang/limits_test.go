package lang_test

import (
	"errors"
	"strings"
	"testing"
	"unicode/utf8"

	"loopwise/lang"
)

// TestStatementLimits: input that once overflowed the stack of the
// expression engine's parser, the unit parser or the pre-lexer (a Go fatal
// error that recover cannot catch) is refused by ParseStatement with a
// positioned message naming the limit, before anything recursive runs. The
// huge cases are also rewritten (lang.Rewrite) when ParseStatement lets
// them through, which it must not.
func TestStatementLimits(t *testing.T) {
	lines := func(n int) string { return "v = [1 m," + strings.Repeat("\n 1 m,", n-2) + "\n 1 m]" }
	tests := []struct {
		name string
		in   string
		line int // relative to line 7, where base puts the statement
		col  int
		msg  string
	}{
		{"500 000 nested parentheses", strings.Repeat("(", 500_000) + "1" + strings.Repeat(")", 500_000),
			0, lang.MaxStatementLen + 1, "this statement is longer than 100 000 characters, the most Loopwise reads in one statement"},
		{"a million unary minus signs", strings.Repeat("-", 1_000_000) + "1",
			0, lang.MaxStatementLen + 1, "this statement is longer than 100 000 characters"},
		{"2 000 000 nested parentheses in a unit", "1 m/" + strings.Repeat("(", 2_000_000) + "s" + strings.Repeat(")", 2_000_000),
			0, lang.MaxStatementLen + 1, "this statement is longer than 100 000 characters"},
		// Under the length limit, the depth limit speaks: the caret sits
		// under the bracket that opens level 201.
		{"40 000 nested parentheses", strings.Repeat("(", 40_000) + "1" + strings.Repeat(")", 40_000),
			0, 201, "brackets nest deeper than 200 levels, the most Loopwise allows"},
		{"nested parentheses in a unit", "x = 1 m/" + strings.Repeat("(", 30_000) + "s" + strings.Repeat(")", 30_000),
			0, 9 + 200, "brackets nest deeper than 200 levels"},
		{"nested vectors", strings.Repeat("[", 300) + "1" + strings.Repeat("]", 300),
			0, 201, "brackets nest deeper than 200 levels"},
		{"nesting inside a function call", "sqrt" + strings.Repeat("(", 201) + "4" + strings.Repeat(")", 201),
			0, 5 + 200, "brackets nest deeper than 200 levels"},
		// A run of prefix operators nests in the parser as brackets do; the
		// caret starts at the run. Spaces and brackets between do not
		// break a run.
		{"90 000 unary minus signs", strings.Repeat("-", 90_000) + "1",
			0, 1, "more than 200 prefix operators (- + ! not) follow one another, the most Loopwise allows"},
		{"minus and plus with spaces", "x = " + strings.Repeat("- + ", 101) + "1",
			0, 5, "more than 200 prefix operators"},
		{"not not not", "ok = " + strings.Repeat("not ", 201) + "true",
			0, 6, "more than 200 prefix operators"},
		{"minus before brackets", strings.Repeat("-(", 150) + strings.Repeat("-", 60) + "1" + strings.Repeat(")", 150),
			0, 1, "more than 200 prefix operators"},
		// A statement continued over more than MaxStatementLines lines: the
		// caret is at the start of the first line too many.
		{"too many continuation lines", lines(lang.MaxStatementLines + 1),
			lang.MaxStatementLines, 1, "this statement continues over more than 1 000 lines, the most one statement may span (is a bracket left open?)"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			st, err := lang.ParseStatement(base, tc.in)
			var le *lang.Error
			if !errors.As(err, &le) {
				t.Fatalf("ParseStatement = %+v, %v; want a *lang.Error", st, err)
			}
			want := lang.Pos{File: "t.lw", Line: base.Line + tc.line, Col: tc.col}
			if le.Pos != want {
				t.Errorf("position %v, want %v", le.Pos, want)
			}
			if !strings.HasPrefix(le.Msg, tc.msg) {
				t.Errorf("message %q, want it to start with %q", le.Msg, tc.msg)
			}
			// What is printed stays short however long the line.
			if n := utf8.RuneCountInString(le.Error()); n > 600 {
				t.Errorf("the error prints %d characters", n)
			}
		})
	}
}

// TestStatementLimitsAccept: statements exactly at each limit are read.
func TestStatementLimitsAccept(t *testing.T) {
	lines := "v = [1 m," + strings.Repeat("\n 1 m,", lang.MaxStatementLines-2) + "\n 1 m]"
	for name, in := range map[string]string{
		"200 nested parentheses": strings.Repeat("(", 200) + "1" + strings.Repeat(")", 200),
		"200 unary minus signs":  strings.Repeat("-", 200) + "1",
		"binary minus in a row":  strings.Repeat("1 - ", 1000) + "1",
		"100 000 characters":     "x = 1" + strings.Repeat(" ", lang.MaxStatementLen-5),
		"1 000 lines":            lines,
		"brackets in a string":   `s = "` + strings.Repeat("(", 300) + `"`,
		"not inside names":       "x = " + strings.Repeat("-not_a + ", 300) + "1",
	} {
		if _, err := lang.ParseStatement(base, in); err != nil {
			t.Errorf("%s: %v", name, err)
		}
		if lang.NeedsMore(in) {
			t.Errorf("%s: NeedsMore is true", name)
		}
	}
}

// TestNeedsMoreStopsAtLimits: a bracket left open does not make a
// statement swallow input without end; ParseStatement then reports the
// limit.
func TestNeedsMoreStopsAtLimits(t *testing.T) {
	if !lang.NeedsMore("v = [1 m," + strings.Repeat("\n 1 m,", lang.MaxStatementLines-2)) {
		t.Errorf("a statement of %d lines with an open bracket should continue", lang.MaxStatementLines-1)
	}
	if lang.NeedsMore("v = [1 m," + strings.Repeat("\n 1 m,", lang.MaxStatementLines)) {
		t.Errorf("a statement beyond %d lines still asks for more", lang.MaxStatementLines)
	}
	if lang.NeedsMore("v = [" + strings.Repeat("x", lang.MaxLineBytes)) {
		t.Errorf("a statement beyond %d bytes still asks for more", lang.MaxLineBytes)
	}
}

// TestErrorWindow: a long source line is shown as a window around the
// caret with … where text is left out, and the caret stays under the
// character it points at.
func TestErrorWindow(t *testing.T) {
	long := strings.Repeat("a", 5000) + "+" + strings.Repeat("b", 5000)
	e := &lang.Error{Pos: lang.Pos{Line: 1, Col: 5001}, Msg: "m", Source: long, Width: 3}
	parts := strings.Split(e.Error(), "\n")
	if len(parts) != 3 {
		t.Fatalf("error has %d lines: %q", len(parts), e.Error())
	}
	src, caret := strings.TrimPrefix(parts[1], "    "), strings.TrimPrefix(parts[2], "    ")
	if !strings.HasPrefix(src, lang.Ellipsis) || !strings.HasSuffix(src, lang.Ellipsis) {
		t.Errorf("window %q is not marked with %s on both sides", src, lang.Ellipsis)
	}
	if n := utf8.RuneCountInString(src); n != lang.ShowWidth+2 {
		t.Errorf("window has %d characters, want %d", n, lang.ShowWidth+2)
	}
	at := strings.Index(caret, "^")
	if got := []rune(src)[at]; got != '+' {
		t.Errorf("caret under %q, want under '+':\n%s\n%s", got, src, caret)
	}
	if w := strings.Count(caret, "^"); w != 3 {
		t.Errorf("%d carets, want 3", w)
	}
	// A short line is shown whole, a tab and a stray CR as spaces.
	e = &lang.Error{Pos: lang.Pos{Line: 1, Col: 5}, Msg: "m", Source: "1\tm\r+ x", Width: 1}
	if got, want := e.Error(), "1:5: m\n    1 m + x\n        ^"; got != want {
		t.Errorf("got %q, want %q", got, want)
	}
}

func TestAbbrev(t *testing.T) {
	if got := lang.Abbrev("short", 40); got != "short" {
		t.Errorf("Abbrev kept %q", got)
	}
	got := lang.Abbrev(strings.Repeat("x", 20)+strings.Repeat("y", 1_000_000), 40)
	if utf8.RuneCountInString(got) != 40 || !strings.HasPrefix(got, strings.Repeat("x", 19)) || !strings.HasSuffix(got, "y") || !strings.Contains(got, lang.Ellipsis) {
		t.Errorf("Abbrev = %q", got)
	}
}

// TestGluedUnitText: text glued to the end of a unit literal is refused by
// the pre-lexer; it would otherwise become part of the placeholder's name.
func TestGluedUnitText(t *testing.T) {
	for _, in := range []string{"5 mm^1e9", "5 m^2x", "0A^0A", "(1) m^2e", "[1, 2, 3] m^2k", "5 m/(s)x", "5 m°C"} {
		_, w, err := rewrite(t, in)
		if err == nil {
			t.Errorf("Rewrite(%q) = %q, want an error", in, w.Src)
			continue
		}
		if !strings.Contains(err.Error(), "runs into") {
			t.Errorf("Rewrite(%q): %v", in, err)
		}
	}
}
