package main

import (
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"
)

// TestHelpExamplesPaste reads every builtin's :help as a user sees it,
// pastes the example's lines one by one into a fresh prompt session, and
// compares what the prompt prints for the last line with the result the
// help shows. An example that fails, or that needs anything the help does
// not show, fails the test.
func TestHelpExamplesPaste(t *testing.T) {
	lib := newSession().Library()
	n := 0
	for _, f := range lib.Funcs {
		if f.Help == nil || f.Help.Example == "" {
			t.Errorf("%s has no example in its help", f.Name)
			continue
		}
		var help, errOut strings.Builder
		hc := newConsole(&help, &errOut)
		hc.s.InDir = filepath.Join("..", "..")
		hc.line(":help " + f.Name)
		lines, shown := parseExample(t, f.Name, help.String())
		var out, pasteErr strings.Builder
		c := newConsole(&out, &pasteErr)
		c.s.InDir = filepath.Join("..", "..") // examples read data files from the repository's top directory, as at a prompt started there
		for i, l := range lines {
			if i == len(lines)-1 {
				out.Reset()
			}
			c.line(l)
		}
		if pasteErr.Len() > 0 {
			t.Errorf("%s: pasting the example gives an error:\n%s", f.Name, pasteErr.String())
			continue
		}
		if got := strings.TrimRight(out.String(), "\n"); got != shown {
			t.Errorf("%s: the help shows\n%s\nbut pasting prints\n%s", f.Name, shown, got)
		}
		n++
	}
	if n < 60 {
		t.Errorf("only %d examples checked", n)
	}
}

// parseExample reads the example block of a help text: the lines under
// "example:" up to the result mark, then the result (continuation lines
// are indented two more spaces).
func parseExample(t *testing.T, name, help string) (lines []string, shown string) {
	t.Helper()
	i := strings.Index(help, "\n  example:\n")
	if i < 0 {
		t.Fatalf("%s: no example block in\n%s", name, help)
	}
	var res []string
	inResult := false
	for _, l := range strings.Split(help[i+len("\n  example:\n"):], "\n") {
		switch {
		case strings.HasPrefix(l, "    ↳ "):
			inResult = true
			res = append(res, strings.TrimPrefix(l, "    ↳ "))
		case strings.HasPrefix(l, "    ✗ "):
			t.Errorf("%s: the help shows an error for its example: %s", name, l)
			return lines, ""
		case inResult && strings.HasPrefix(l, "      "):
			res = append(res, strings.TrimPrefix(l, "      "))
		case !inResult && strings.HasPrefix(l, "    "):
			lines = append(lines, strings.TrimPrefix(l, "    "))
		default:
			return lines, strings.Join(res, "\n")
		}
	}
	return lines, strings.Join(res, "\n")
}

// TestHelpWrap: on a terminal, help text is broken at spaces to the
// terminal's width with a hanging indent; elsewhere it is left whole.
func TestHelpWrap(t *testing.T) {
	c := &console{width: 40}
	got := c.wrap("  ", "method: modified nodal analysis, the complex system solved as a real one")
	for _, l := range strings.Split(got, "\n") {
		if utf8.RuneCountInString(l) > 39 {
			t.Errorf("line %q is wider than 39 columns", l)
		}
	}
	if want := "  method: modified nodal analysis, the\n    complex system solved as a real one"; got != want {
		t.Errorf("wrapped\n%s\nwant\n%s", got, want)
	}
	if got := (&console{}).wrap("  ", "a b"); got != "  a b" {
		t.Errorf("without a width: %q", got)
	}
}
