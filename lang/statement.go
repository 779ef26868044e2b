package lang

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Kind tells what a statement does.
type Kind int

const (
	// Empty is a blank line or a line holding only a comment.
	Empty Kind = iota
	// Expr shows the value of an expression, optionally in a chosen unit.
	Expr
	// Assign binds a name to a value: "gap = 4 mm" or "gap: mm = 4 mm".
	Assign
	// Define defines a function: "I(t) = 20 A * sin(2*pi*50 Hz*t)".
	Define
	// Command is a session command such as ":digits 4".
	Command
)

// Statement is one line of Loopwise split into its parts. All offsets are
// rune offsets into Text (0-based).
type Statement struct {
	Base Pos    // position of the first rune of Text
	Text string // the whole line as written

	Kind   Kind
	Name   string   // assigned or defined name
	Params []string // parameters of a function definition

	Declared    string // declared unit of an assignment, "" when none
	DeclaredOff int

	Expr    string // the expression text
	ExprOff int

	As    string // display unit after "as", "" when none
	AsOff int

	Cmd  string // command name without the colon
	Args string // command arguments
}

// Pos returns the position of rune offset off of the statement. A statement
// continued over several lines (see NeedsMore) holds newlines: offsets past
// one count from the start of their own line, column 1.
func (s *Statement) Pos(off int) Pos {
	line, start := s.lineOf(off)
	if line == 0 {
		return s.Base.Shift(off)
	}
	return Pos{File: s.Base.File, Line: s.Base.Line + line, Col: off - start + 1}
}

// lineOf returns which line of Text (0 for the first) holds rune offset off,
// and the rune offset where that line starts.
func (s *Statement) lineOf(off int) (line, start int) {
	i := 0
	for _, c := range s.Text {
		if i >= off {
			break
		}
		if c == '\n' {
			line++
			start = i + 1
		}
		i++
	}
	return line, start
}

// Errorf returns a positioned error at rune offset off of the statement,
// with width carets. The error's source is the one line that holds off.
func (s *Statement) Errorf(off, width int, format string, args ...any) *Error {
	src := s.Text
	if strings.Contains(src, "\n") {
		_, start := s.lineOf(off)
		runes := []rune(src)
		end := start
		for end < len(runes) && runes[end] != '\n' {
			end++
		}
		src = string(runes[start:end])
		width = min(width, max(1, end-off)) // carets stop at the line's end
	}
	return &Error{Pos: s.Pos(off), Msg: fmt.Sprintf(format, args...), Source: src, Width: width}
}

// NeedsMore reports whether text leaves a bracket ( [ or { open, outside
// strings and comments: the statement continues on the next line. A closing
// bracket that matches nothing ends the statement, so the parser can report
// it.
//
// Text already longer than MaxStatementLen never needs more: ParseStatement
// refuses it.
func NeedsMore(text string) bool {
	if len(text) > MaxLineBytes || strings.Count(text, "\n") >= MaxStatementLines {
		return false
	}
	r := []rune(text)
	depth := 0
	for i := 0; i < len(r); i++ {
		switch c := r[i]; {
		case c == '"' || c == '\'' || c == '`':
			j := i + 1
			for j < len(r) && r[j] != c && r[j] != '\n' {
				if r[j] == '\\' && c != '`' {
					j++
				}
				j++
			}
			if j >= len(r) || r[j] == '\n' {
				return false // an unclosed string is an error, not a continuation
			}
			i = j
		case c == '/' && i+1 < len(r) && r[i+1] == '/':
			for i < len(r) && r[i] != '\n' {
				i++
			}
		case c == '(' || c == '[' || c == '{':
			depth++
		case c == ')' || c == ']' || c == '}':
			if depth == 0 {
				return false
			}
			depth--
		}
	}
	return depth > 0
}

// ParseStatement splits one line into a statement. base is the position of
// the line's first rune.
func ParseStatement(base Pos, text string) (*Statement, error) {
	s := &Statement{Base: base, Text: text}
	runes := []rune(text)
	if err := checkLimits(s, runes); err != nil {
		return nil, err
	}
	sc, err := scanTop(s, runes)
	if err != nil {
		return nil, err
	}
	end := sc.end // end of code (before a comment)
	start := skipSpace(runes, 0)
	if start >= end {
		s.Kind = Empty
		return s, nil
	}
	if runes[start] == ':' && start+1 < end && isIdentStart(runes[start+1]) {
		j := start + 1
		for j < end && isIdentPart(runes[j]) {
			j++
		}
		s.Kind = Command
		s.Cmd = string(runes[start+1 : j])
		s.Args = strings.TrimSpace(string(runes[j:end]))
		return s, nil
	}
	exprStart, exprEnd := start, end
	if sc.as >= 0 {
		u := skipSpace(runes, sc.as+2)
		ue := end
		for ue > u && unicode.IsSpace(runes[ue-1]) {
			ue--
		}
		if u >= ue {
			return nil, s.Errorf(sc.as, 2, "\"as\" needs a unit after it, as in \"flux as uWb\"")
		}
		s.As = string(runes[u:ue])
		s.AsOff = u
		exprEnd = sc.as
	}
	if sc.eq >= 0 {
		if err := s.parseLeft(runes, start, sc.eq); err != nil {
			return nil, err
		}
		exprStart = sc.eq + 1
	} else {
		s.Kind = Expr
	}
	exprStart = skipSpace(runes, exprStart)
	for exprEnd > exprStart && unicode.IsSpace(runes[exprEnd-1]) {
		exprEnd--
	}
	if exprStart >= exprEnd {
		at := exprStart
		if at > len(runes) {
			at = len(runes)
		}
		return nil, s.Errorf(at, 1, "an expression is missing here")
	}
	s.Expr = string(runes[exprStart:exprEnd])
	s.ExprOff = exprStart
	if s.Kind == Define && s.As != "" {
		return nil, s.Errorf(sc.as, 2, "a function definition cannot be shown \"as\" a unit; convert its calls instead")
	}
	return s, nil
}

// parseLeft reads the left side of "=": name, name(params) or name: unit.
func (s *Statement) parseLeft(r []rune, start, eq int) error {
	i := start
	if !isIdentStart(r[i]) {
		return s.Errorf(start, trimmedWidth(r, start, eq), "the left side of = must be a name, name(parameters) or name: unit")
	}
	j := i
	for j < eq && isIdentPart(r[j]) {
		j++
	}
	s.Name = string(r[i:j])
	if err := s.checkName(i, s.Name); err != nil {
		return err
	}
	k := skipSpace(r, j)
	switch {
	case k == eq:
		s.Kind = Assign
		return nil
	case r[k] == ':':
		u := skipSpace(r, k+1)
		ue := eq
		for ue > u && unicode.IsSpace(r[ue-1]) {
			ue--
		}
		if u >= ue {
			return s.Errorf(k, 1, "a declared unit is missing after ':'")
		}
		s.Kind = Assign
		s.Declared = string(r[u:ue])
		s.DeclaredOff = u
		return nil
	case r[k] == '(':
		close := -1
		for m := k + 1; m < eq; m++ {
			if r[m] == ')' {
				close = m
				break
			}
		}
		if close < 0 {
			return s.Errorf(k, 1, "the parameter list is not closed with ')'")
		}
		if after := skipSpace(r, close+1); after != eq {
			return s.Errorf(after, eq-after, "unexpected text between the parameter list and =")
		}
		inner := string(r[k+1 : close])
		off := k + 1
		seen := map[string]bool{}
		for _, p := range strings.Split(inner, ",") {
			lead := len([]rune(p)) - len([]rune(strings.TrimLeft(p, " \t")))
			name := strings.TrimSpace(p)
			if name == "" {
				if strings.TrimSpace(inner) == "" {
					break
				}
				return s.Errorf(off+lead, 1, "empty parameter name")
			}
			if !isIdent(name) {
				return s.Errorf(off+lead, utf8.RuneCountInString(name), "parameter %q is not a name", name)
			}
			if err := s.checkName(off+lead, name); err != nil {
				return err
			}
			if seen[name] {
				return s.Errorf(off+lead, utf8.RuneCountInString(name), "parameter %q appears twice", name)
			}
			seen[name] = true
			s.Params = append(s.Params, name)
			off += utf8.RuneCountInString(p) + 1
		}
		s.Kind = Define
		return nil
	default:
		return s.Errorf(start, trimmedWidth(r, start, eq), "the left side of = must be a name, name(parameters) or name: unit")
	}
}

// trimmedWidth is the width of r[a:b] without trailing spaces (at least 1).
func trimmedWidth(r []rune, a, b int) int {
	for b > a+1 && unicode.IsSpace(r[b-1]) {
		b--
	}
	return max(1, b-a)
}

func (s *Statement) checkName(off int, name string) error {
	if strings.HasPrefix(name, "__") {
		return s.Errorf(off, utf8.RuneCountInString(name), "names starting with \"__\" are reserved")
	}
	if Keywords[name] {
		return s.Errorf(off, utf8.RuneCountInString(name), "%q is a reserved word and cannot be a name", name)
	}
	return nil
}

// Keywords are words of the expression syntax that cannot be names.
var Keywords = map[string]bool{
	"and": true, "or": true, "not": true, "in": true, "as": true,
	"true": true, "false": true, "nil": true, "if": true, "else": true, "let": true,
	"matches": true, "contains": true, "startsWith": true, "endsWith": true,
}

type topScan struct {
	eq  int // rune offset of the assignment '=', or -1
	as  int // rune offset of the last top-level "as", or -1
	end int // end of code: start of a "//" comment or len
}

// scanTop finds, outside strings and brackets, the assignment sign, the last
// "as" and the start of a comment; it also reports unbalanced brackets.
func scanTop(s *Statement, r []rune) (topScan, error) {
	sc := topScan{eq: -1, as: -1, end: len(r)}
	type open struct {
		ch  rune
		off int
	}
	var stack []open
	for i := 0; i < len(r); i++ {
		c := r[i]
		switch {
		case c == '"' || c == '\'' || c == '`':
			j := i + 1
			for j < len(r) && r[j] != c {
				if r[j] == '\\' && c != '`' {
					j++
				}
				j++
			}
			if j >= len(r) {
				return sc, s.Errorf(i, 1, "this string is never closed")
			}
			i = j
		case c == '/' && i+1 < len(r) && r[i+1] == '/':
			nl := i
			for nl < len(r) && r[nl] != '\n' {
				nl++
			}
			if nl == len(r) {
				sc.end = i
				i = len(r)
				break
			}
			// a comment inside a continued statement ends with its line;
			// blank it so the expression keeps its offsets
			for k := i; k < nl; k++ {
				r[k] = ' '
			}
			i = nl
		case c == '(' || c == '[' || c == '{':
			stack = append(stack, open{c, i})
		case c == ')' || c == ']' || c == '}':
			want := map[rune]rune{')': '(', ']': '[', '}': '{'}[c]
			if len(stack) == 0 {
				return sc, s.Errorf(i, 1, "unexpected %q: nothing to close", c)
			}
			top := stack[len(stack)-1]
			if top.ch != want {
				at := s.Pos(top.off)
				if where := s.Pos(i); where.Line != at.Line {
					return sc, s.Errorf(i, 1, "%q does not match the %q at line %d, column %d", c, top.ch, at.Line, at.Col)
				}
				return sc, s.Errorf(i, 1, "%q does not match the %q at column %d", c, top.ch, at.Col)
			}
			stack = stack[:len(stack)-1]
		case c == '=' && len(stack) == 0:
			prev := rune(0)
			if i > 0 {
				prev = r[i-1]
			}
			next := rune(0)
			if i+1 < len(r) {
				next = r[i+1]
			}
			if next == '=' {
				i++ // "=="
				continue
			}
			if prev == '=' || prev == '!' || prev == '<' || prev == '>' {
				continue
			}
			if sc.eq < 0 {
				sc.eq = i
			} else {
				return sc, s.Errorf(i, 1, "only one = is allowed in a statement; compare with ==")
			}
		case isIdentStart(c):
			j := i
			for j < len(r) && isIdentPart(r[j]) {
				j++
			}
			if j-i == 2 && r[i] == 'a' && r[i+1] == 's' && len(stack) == 0 {
				sc.as = i
			}
			i = j - 1
		case c >= '0' && c <= '9':
			// skip a number so that "1e3" is not read as an identifier
			j := i
			for j < len(r) && (isIdentPart(r[j]) || r[j] == '.') {
				if (r[j] == 'e' || r[j] == 'E') && j+1 < len(r) && (r[j+1] == '-' || r[j+1] == '+') {
					j++
				}
				j++
			}
			i = j - 1
		}
	}
	if len(stack) > 0 {
		top := stack[len(stack)-1]
		if top.off < sc.end {
			what := map[rune]string{'(': "parenthesis '(' is never closed", '[': "unterminated vector: '[' is never closed with ']'", '{': "brace '{' is never closed"}[top.ch]
			return sc, s.Errorf(top.off, 1, "%s", what)
		}
	}
	if sc.as >= 0 && sc.as > sc.end {
		sc.as = -1
	}
	if sc.eq >= sc.end {
		sc.eq = -1
	}
	if sc.as >= 0 && sc.eq > sc.as {
		return sc, s.Errorf(sc.as, 2, "\"as\" must come at the end of the statement")
	}
	return sc, nil
}

func skipSpace(r []rune, i int) int {
	for i < len(r) && unicode.IsSpace(r[i]) {
		i++
	}
	return i
}

func isIdentStart(c rune) bool {
	return c == '_' || c == 'µ' || c == 'Ω' || unicode.IsLetter(c)
}

func isIdentPart(c rune) bool {
	return isIdentStart(c) || unicode.IsDigit(c)
}

func isIdent(s string) bool {
	for i, c := range s {
		if i == 0 && !isIdentStart(c) || !isIdentPart(c) {
			return false
		}
	}
	return s != ""
}
