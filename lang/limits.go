package lang

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// Limits on the size and shape of one statement. ParseStatement checks them
// before anything recursive runs (the expression engine's parser, the unit
// parser, the pre-lexer's unit scanner), so hostile input gets a positioned
// message instead of exhausting the stack or the memory.
const (
	// MaxStatementLen is the most characters (runes) a statement may have,
	// all its continuation lines included.
	MaxStatementLen = 100_000
	// MaxStatementLines is the most lines a statement continued over
	// several lines (an open bracket) may span.
	MaxStatementLines = 1000
	// MaxNesting is the deepest a statement may nest brackets ( [ { , and
	// the longest run of prefix operators (- + ! not) one after another.
	MaxNesting = 200
	// MaxLineBytes is the most bytes a reader keeps of one input line: no
	// line of more bytes can hold a statement of MaxStatementLen runes.
	MaxLineBytes = MaxStatementLen * utf8.UTFMax
)

// TooLongError builds the error for a line or statement longer than
// MaxStatementLen characters; src is (a prefix of) the line, pos the
// position of its first character.
func TooLongError(pos Pos, src string) *Error {
	p := pos
	p.Col += MaxStatementLen
	return &Error{Pos: p, Source: src, Width: 1, Msg: tooLongMsg}
}

var tooLongMsg = fmt.Sprintf("this statement is longer than %s characters, the most Loopwise reads in one statement", thousands(MaxStatementLen))

// thousands writes n with a space between groups of three digits.
func thousands(n int) string {
	s := fmt.Sprint(n)
	var b strings.Builder
	for i, c := range s {
		if i > 0 && (len(s)-i)%3 == 0 {
			b.WriteByte(' ')
		}
		b.WriteRune(c)
	}
	return b.String()
}

// checkLimits refuses a statement that is too long, spans too many lines,
// nests too deep or chains too many prefix operators. It only loops.
func checkLimits(s *Statement, r []rune) error {
	if len(r) > MaxStatementLen {
		return s.Errorf(MaxStatementLen, 1, "%s", tooLongMsg)
	}
	lines, run, runStart := 1, 0, 0
	depth := 0
	for i := 0; i < len(r); i++ {
		c := r[i]
		switch {
		case c == '\n':
			lines++
			if lines > MaxStatementLines {
				return s.Errorf(i+1, 1, "this statement continues over more than %s lines, the most one statement may span (is a bracket left open?)", thousands(MaxStatementLines))
			}
			continue
		case c == '"' || c == '\'' || c == '`':
			j := i + 1
			for j < len(r) && r[j] != c {
				if r[j] == '\\' && c != '`' {
					j++
				}
				j++
			}
			i = j
			run = 0
			continue
		case c == '(' || c == '[' || c == '{':
			depth++
			if depth > MaxNesting {
				return s.Errorf(i, 1, "brackets nest deeper than %d levels, the most Loopwise allows", MaxNesting)
			}
			continue // "-(-(" keeps counting the run
		case c == ')' || c == ']' || c == '}':
			depth = max(0, depth-1)
		case c == ' ' || c == '\t' || c == '\r':
			continue
		case c == '-' || c == '+' || c == '!':
			if run == 0 {
				runStart = i
			}
			run++
		case c == 'n' && i+3 <= len(r) && string(r[i:i+3]) == "not" && (i+3 == len(r) || !isIdentPart(r[i+3])) && (i == 0 || !isIdentPart(r[i-1])):
			if run == 0 {
				runStart = i
			}
			run++
			i += 2
		default:
			run = 0
			continue
		}
		if run > MaxNesting {
			return s.Errorf(runStart, i-runStart+1, "more than %d prefix operators (- + ! not) follow one another, the most Loopwise allows", MaxNesting)
		}
	}
	return nil
}

// Ellipsis marks text left out of a message or a shown source line.
const Ellipsis = "…"

// Abbrev shortens s to at most n runes for a message, with an ellipsis in
// the middle, so that a huge name cannot flood the screen.
func Abbrev(s string, n int) string {
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	r := []rune(s)
	h := (n - 1) / 2
	return string(r[:h]) + Ellipsis + string(r[len(r)-(n-1-h):])
}
