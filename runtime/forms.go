package runtime

import (
	"regexp"
	"unicode/utf8"

	"loopwise/lang"
)

// Session forms (sensitivity, monte_carlo, correlate) work on a whole
// statement rather than on values; formCall is how each of them reads
// it.

// formCallRE matches a statement that is one call: name(arguments).
var formCallRE = regexp.MustCompile(`^(\s*([A-Za-z_][A-Za-z0-9_]*)\s*\()(.*)\)\s*$`)

// formCall is a statement that is one call of a session form.
type formCall struct {
	st   *lang.Statement
	args []topArg // offsets in runes from the start of the expression
}

// matchForm reads st as a call of the form name, unless the statement is
// something else or the user has given the name a value or a function.
func (s *Session) matchForm(st *lang.Statement, name string) (*formCall, bool) {
	if s.kinds[name] == kindVar || s.kinds[name] == kindUserFunc {
		return nil, false
	}
	m := formCallRE.FindStringSubmatchIndex(st.Expr)
	if m == nil || st.Expr[m[4]:m[5]] != name {
		return nil, false
	}
	args := splitTopLevel(st.Expr[m[6]:m[7]])
	open := utf8.RuneCountInString(st.Expr[:m[6]])
	for i := range args {
		args[i].off += open
	}
	return &formCall{st: st, args: args}, true
}

// errorf is an error at the whole expression.
func (c *formCall) errorf(format string, args ...any) error {
	return c.st.Errorf(c.st.ExprOff, max(1, utf8.RuneCountInString(c.st.Expr)), format, args...)
}

// sub is argument a as an expression statement of its own, positioned
// where it stands in the line.
func (c *formCall) sub(a topArg) *lang.Statement {
	sub := *c.st
	sub.Kind, sub.Name, sub.As, sub.Declared = lang.Expr, "", "", ""
	sub.Expr, sub.ExprOff = a.text, c.st.ExprOff+a.off
	return &sub
}
