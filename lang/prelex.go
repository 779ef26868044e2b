package lang

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"
)

// UnitNames tells the pre-lexer which identifiers are unit symbols (with or
// without an SI prefix) and suggests a near name for a misspelt one.
type UnitNames interface {
	IsUnit(name string) bool
	SuggestUnit(name string) string
}

// Literal is a unit literal found by the pre-lexer.
type Literal struct {
	Placeholder string // identifier that stands for it in Rewritten.Src
	Number      string // decimal text of the number ("" for a postfix unit after ']' or ')')
	Unit        string // unit expression text, such as "kg*m^2/s^2"
	Off         int    // rune offset of the literal in the expression
	UnitOff     int    // rune offset of the unit text
	// Imag marks an imaginary literal, a number with j glued to it ("4j",
	// "2.5j ohm"); Unit is "" when no unit follows.
	Imag bool
}

// Rewritten is an expression with its unit literals replaced by
// placeholders, ready for the expression engine.
type Rewritten struct {
	Src     string
	Lits    []Literal
	orig    []int // rune index in Src -> rune offset in the original expression
	origLen int   // rune length of the original expression
	// PMs counts the uncertain values (a ± b) in the expression; the k-th
	// (from 0, in the order they end) became PMFunc(a, b, k), or
	// PMRelFunc(a, r, k) for a relative uncertainty "a ± r %".
	PMs int
	// PMOffs holds each one's rune offset of the ± in the expression.
	PMOffs []int
}

// Orig maps a rune offset in Src back to the rune offset in the expression
// that was rewritten.
func (w *Rewritten) Orig(i int) int {
	if i < 0 {
		return 0
	}
	if i >= len(w.orig) {
		return w.origLen + (i - len(w.orig))
	}
	return w.orig[i]
}

// PMFunc and PMRelFunc are the calls an uncertain value "a ± b" (also
// written "a +- b") and "a ± r %" become.
const (
	PMFunc    = "__pm"
	PMRelFunc = "__pmrel"
)

// badChars are characters the expression engine would give a meaning
// Loopwise does not have (variables like $env, predicates #).
const badChars = "$#@;~\\"

// PlaceholderPrefix starts every identifier the pre-lexer invents; users may
// not write names that start with "__".
const PlaceholderPrefix = "__L"

// Rewrite replaces unit literals in the statement's expression. A unit
// literal is a number followed (optionally after spaces) by a unit
// expression written without spaces: "5 mT", "3 A/ms", "2 kg*m^2/s^2",
// "9.81 m/s^2", "4 ohm". A unit may also follow a closing ']' or ')' to
// scale a vector or a parenthesised expression: "[0, 0, 5] mm". Such a
// unit binds to the bracketed operand (with the name of a call or an
// indexed value before it), not to everything before it:
// "10 V / (3 + 4j) ohm" is 10 V divided by (3 + 4j) Ω.
func Rewrite(s *Statement, src string, srcOff int, units UnitNames) (*Rewritten, error) {
	r := []rune(src)
	w := &Rewritten{origLen: len(r)}
	var out []rune
	emit := func(text string, origAt int) {
		for _, c := range text {
			out = append(out, c)
			w.orig = append(w.orig, origAt)
		}
	}
	copyRange := func(a, b int) {
		for k := a; k < b; k++ {
			out = append(out, r[k])
			w.orig = append(w.orig, k)
		}
	}
	errAt := func(off, width int, format string, args ...any) error {
		return s.Errorf(srcOff+off, width, format, args...)
	}
	newLit := func(num, unit string, off, uoff int) string {
		ph := fmt.Sprintf("%s%d", PlaceholderPrefix, len(w.Lits))
		if n := len(out); n > 0 && isIdentPart(out[n-1]) {
			ph = " " + ph // never glue the placeholder to a name
		}
		w.Lits = append(w.Lits, Literal{Placeholder: ph, Number: num, Unit: unit, Off: off, UnitOff: uoff})
		return ph
	}
	// Brackets in out: open holds the indices of the unclosed ones, openOf
	// maps the index of each closing one to its opening one, and
	// insertBefore counts the '(' to insert before an index of out when
	// the statement is done (a postfix unit groups its operand; inserting
	// at the end keeps every recorded index valid).
	var open []int
	openOf := map[int]int{}
	insertBefore := map[int][]string{}
	// levels tracks, for every open bracket and for the whole expression,
	// where its current operand starts in out (after the bracket or the
	// last comma) and where a ± in it was written (-1: none), so that
	// "a ± b" becomes PMFunc(a, b, k) over exactly that operand.
	type level struct{ start, pm, pmSrc int }
	levels := []level{{0, -1, 0}}
	closePM := func() error {
		lv := &levels[len(levels)-1]
		if lv.pm < 0 {
			return nil
		}
		fn := PMFunc
		k := len(out) - 1
		for k > lv.pm && out[k] == ' ' {
			k--
		}
		if k <= lv.pm+1 {
			return errAt(lv.pmSrc, 1, "± needs an uncertainty after it, as in 12 mm ± 0.1 mm")
		}
		if out[k] == '%' {
			fn = PMRelFunc
			out = append(out[:k], out[k+1:]...)
			w.orig = append(w.orig[:k], w.orig[k+1:]...)
		}
		insertBefore[lv.start] = append([]string{fn + "("}, insertBefore[lv.start]...)
		emit(fmt.Sprintf(", %d)", w.PMs), w.orig[len(w.orig)-1])
		w.PMs++
		w.PMOffs = append(w.PMOffs, lv.pmSrc)
		lv.pm = -1
		return nil
	}
	pmAt := func(i int) int { // width of a ± at r[i], 0 if none
		if r[i] == '±' {
			return 1
		}
		if r[i] == '+' && i+1 < len(r) && r[i+1] == '-' && i > 0 && r[i-1] == ' ' && (i+2 == len(r) || r[i+2] == ' ') {
			return 2 // "a +- b", spaced, is a ± (a +-b stays a + (-b))
		}
		return 0
	}
	// operandStart is where the operand ending with the bracket at out[k]
	// starts: its opening bracket, preceded by a name ("sqrt(2)", "v[1]")
	// or by further bracketed groups ("f(a)(b)").
	operandStart := func(k int) int {
		p, ok := openOf[k]
		if !ok {
			return -1
		}
		for p > 0 {
			prev := out[p-1]
			if q, ok := openOf[p-1]; ok && (prev == ')' || prev == ']') {
				p = q
				continue
			}
			if isIdentPart(prev) {
				for p > 0 && (isIdentPart(out[p-1]) || out[p-1] == '.') {
					p--
				}
				continue
			}
			// a power binds tighter than the unit: "10^(-3) m" is
			// (10^(-3)) m, so the operand takes in the power's base
			q := p
			for q > 0 && out[q-1] == ' ' {
				q--
			}
			if q > 0 && out[q-1] == '^' || q > 1 && out[q-1] == '*' && out[q-2] == '*' {
				q--
				if out[q] == '*' {
					q--
				}
				for q > 0 && out[q-1] == ' ' {
					q--
				}
				if q > 0 && (isIdentPart(out[q-1]) || out[q-1] == ')' || out[q-1] == ']') {
					p = q
					if c, ok := openOf[q-1]; ok {
						p = c
					} else if !isIdentPart(out[q-1]) {
						break
					}
					continue
				}
			}
			break
		}
		return p
	}
	// unitAfter looks for a unit expression starting at or after spaces from
	// j; it returns its start and end, or -1 when the next word is not a unit.
	unitAfter := func(j int) (int, int, error) {
		k := j
		for k < len(r) && (r[k] == ' ' || r[k] == '\t') {
			k++
		}
		if k >= len(r) || !isUnitStart(r[k]) {
			return -1, -1, nil
		}
		e := unitWordEnd(r, k)
		word := string(r[k:e])
		if Keywords[word] || strings.HasPrefix(word, "__") {
			return -1, -1, nil // "__" names are refused where they stand
		}
		if !units.IsUnit(word) {
			return k, e, nil // caller decides
		}
		return k, scanUnit(r, k, units), nil
	}

	for i := 0; i < len(r); {
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
				return nil, errAt(i, 1, "this string is never closed")
			}
			copyRange(i, j+1)
			i = j + 1
		case isIdentStart(c):
			j := i
			for j < len(r) && isIdentPart(r[j]) {
				j++
			}
			word := string(r[i:j])
			if strings.HasPrefix(word, "__") {
				return nil, errAt(i, j-i, "names starting with \"__\" are reserved")
			}
			copyRange(i, j)
			i = j
		case c == '\r':
			return nil, errAt(i, 1, "a carriage return (CR) in the middle of a line; lines end with LF or CR LF")
		case strings.ContainsRune(badChars, c):
			return nil, errAt(i, 1, "unexpected character %q", c)
		case unicode.IsDigit(c) && !isDigit(c):
			// a digit of another script: expr would read it as a name
			return nil, errAt(i, 1, "unexpected character %q; numbers are written with the digits 0 to 9", c)
		case isDigit(c) || (c == '.' && i+1 < len(r) && isDigit(r[i+1]) && (i == 0 || !strings.ContainsRune(".)]", r[i-1]) && !isIdentPart(r[i-1]))):
			k := i - 1 // the '.' before the number, spaces allowed: "v. 0"
			for k >= 0 && (r[k] == ' ' || r[k] == '\t' || r[k] == '\r' || r[k] == '\n') {
				k--
			}
			if c != '.' && k >= 0 && r[k] == '.' && (k < 1 || r[k-1] != '.') {
				// "v.0": a component is named .x, .y or .z
				return nil, errAt(k, i-k+1, "a number cannot follow '.' here; vector components are .x, .y and .z")
			}
			j := scanNumber(r, i)
			num := strings.ReplaceAll(string(r[i:j]), "_", "")
			if j+1 < len(r) && r[j] == '.' && isIdentStart(r[j+1]) && !exponentAt(r, j+1) {
				// "0.e", "2.m": the engine would read a broken number
				return nil, errAt(j, 1, "a decimal point must be followed by a digit, as in %s.0", num)
			}
			if j < len(r) && r[j] == 'j' && (j+1 >= len(r) || !isIdentPart(r[j+1])) {
				// an imaginary literal: "4j", "4j ohm"
				if _, err := strconv.ParseFloat(num, 64); err != nil {
					return nil, errAt(i, j-i, "number %q is too large", Abbrev(num, 40))
				}
				unit, uoff, end := "", j+1, j+1
				if us, ue, err := unitAfter(j + 1); err == nil && us >= 0 && units.IsUnit(firstAtom(string(r[us:ue]))) {
					if err := unitTail(r, us, ue, num+"j", errAt); err != nil {
						return nil, err
					}
					unit, uoff, end = string(r[us:ue]), us, ue
				}
				ph := newLit(num, unit, i, uoff)
				w.Lits[len(w.Lits)-1].Imag = true
				emit(ph, i)
				i = end
				continue
			}
			us, ue, err := unitAfter(j)
			if err != nil {
				return nil, err
			}
			if us < 0 {
				if j < len(r) && isIdentStart(r[j]) {
					// digits glued to a keyword, e.g. "2and"
					return nil, errAt(i, j-i+1, "a number must be followed by a space or an operator here")
				}
				if _, err := strconv.ParseFloat(num, 64); err != nil {
					return nil, errAt(i, j-i, "number %q is too large", Abbrev(num, 40))
				}
				if c == '.' {
					emit("0", i)
				}
				copyRange(i, j)
				if _, err := strconv.ParseInt(num, 10, 64); err != nil && strings.Trim(num, "0123456789") == "" {
					// a whole number beyond int64: the engine would refuse it
					// as an integer, so it is read as a decimal number
					emit(".0", j-1)
				}
				i = j
				continue
			}
			word := string(r[us:ue])
			if !units.IsUnit(firstAtom(word)) {
				msg := fmt.Sprintf("unknown unit %q after a number", Abbrev(word, 40))
				if sug := units.SuggestUnit(word); sug != "" {
					msg += fmt.Sprintf("; did you mean %q?", sug)
				} else {
					msg += fmt.Sprintf(" (to multiply by a name, write %s*%s)", Abbrev(num, 20), Abbrev(word, 40))
				}
				return nil, errAt(us, ue-us, "%s", msg)
			}
			if err := unitTail(r, us, ue, num, errAt); err != nil {
				return nil, err
			}
			ph := newLit(num, word, i, us)
			emit(ph, i)
			i = ue
		case pmAt(i) > 0:
			lv := &levels[len(levels)-1]
			if lv.pm >= 0 {
				return nil, errAt(i, pmAt(i), "a second ± in one value; write (a ± b) with brackets around each uncertain value")
			}
			if strings.TrimSpace(string(out[lv.start:])) == "" {
				return nil, errAt(i, pmAt(i), "± needs a value before it, as in 12 mm ± 0.1 mm")
			}
			lv.pm, lv.pmSrc = len(out), i
			emit(", ", i)
			i += pmAt(i)
		case c == ',':
			if err := closePM(); err != nil {
				return nil, err
			}
			copyRange(i, i+1)
			levels[len(levels)-1].start = len(out)
			i++
		case c == '(' || c == '[':
			open = append(open, len(out))
			copyRange(i, i+1)
			levels = append(levels, level{len(out), -1, 0})
			i++
		case c == ']' || c == ')':
			if err := closePM(); err != nil {
				return nil, err
			}
			if len(levels) > 1 {
				levels = levels[:len(levels)-1]
			}
			if n := len(open); n > 0 {
				openOf[len(out)] = open[n-1]
				open = open[:n-1]
			}
			closeAt := len(out)
			copyRange(i, i+1)
			us, ue, err := unitAfter(i + 1)
			if err != nil {
				return nil, err
			}
			if us < 0 || !units.IsUnit(firstAtom(string(r[us:ue]))) {
				i++
				continue
			}
			if err := unitTail(r, us, ue, "", errAt); err != nil {
				return nil, err
			}
			if k := skipBlanks(r, ue); k < len(r) && r[k] == '^' {
				// "[1, 2, 3] m ^ 2" would raise only the unit (the unit
				// after a bracket multiplies it): say which is meant
				return nil, errAt(us, k-us+1, "a power after the unit %q that follows a bracket is ambiguous: write the power on the unit without spaces (%s^2) or put the whole in brackets", Abbrev(string(r[us:ue]), 40), Abbrev(string(r[us:ue]), 40))
			}
			ph := newLit("", string(r[us:ue]), us, us)
			if p := operandStart(closeAt); p >= 0 {
				insertBefore[p] = append([]string{"("}, insertBefore[p]...)
				emit("*"+ph+")", us)
			} else {
				emit("*"+ph, us)
			}
			i = ue
		default:
			copyRange(i, i+1)
			i++
		}
	}
	levels = levels[:1]
	if err := closePM(); err != nil {
		return nil, err
	}
	if len(insertBefore) > 0 {
		grouped := make([]rune, 0, len(out)+len(insertBefore))
		orig := make([]int, 0, len(out)+len(insertBefore))
		for k, c := range out {
			for _, text := range insertBefore[k] {
				for _, c := range text {
					grouped = append(grouped, c)
					orig = append(orig, w.orig[k])
				}
			}
			grouped = append(grouped, c)
			orig = append(orig, w.orig[k])
		}
		out, w.orig = grouped, orig
	}
	w.Src = string(out)
	return w, nil
}

// unitTail reports a unit literal r[us:ue] that is directly followed by an
// operator the unit scanner could not take: a '^' without a whole power
// ("5 m^", "5 m^x"), or '*', '/' or "**" with nothing after it ("5 kg**").
// The error points at the unit text, where the mistake is.
func unitTail(r []rune, us, ue int, num string, errAt func(off, width int, format string, args ...any) error) error {
	if ue >= len(r) {
		return nil
	}
	unit := string(r[us:ue])
	if isIdentPart(r[ue]) || r[ue] == '°' {
		// "5 m^2x", "5 mm^1e9": text glued to the unit would be glued to
		// its placeholder and read as one unknown name
		g := ue
		for g < len(r) && (isIdentPart(r[g]) || r[g] == '°') {
			g++
		}
		msg := fmt.Sprintf("the unit %q runs into %q: put a space or an operator after a unit", Abbrev(unit, 40), Abbrev(string(r[ue:g]), 40))
		if strings.ContainsRune(unit, '^') && unicode.IsDigit(r[ue-1]) {
			msg += "; a unit power is a whole number, as in m^2"
		}
		return errAt(us, g-us, "%s", msg)
	}
	if r[ue] == '^' {
		unit := Abbrev(unit, 40)
		msg := fmt.Sprintf("after the unit %q, ^ needs a whole power written with it, as in %s^2 or %s^-1", unit, unit, unit)
		if num != "" {
			msg += fmt.Sprintf("; to raise the whole quantity, write (%s %s)^...", Abbrev(num, 20), unit)
		}
		return errAt(us, ue-us+1, "%s", msg)
	}
	if r[ue] != '*' && r[ue] != '/' {
		return nil
	}
	k := ue + 1
	if k < len(r) && r[k] == r[ue] {
		if r[ue] == '/' {
			return nil // a comment
		}
		k++
	}
	if strings.TrimSpace(string(r[k:])) == "" {
		return errAt(us, k-us, "the unit %q is followed by %q and nothing else: a unit or a value is missing", Abbrev(unit, 40), string(r[ue:k]))
	}
	return nil
}

func firstAtom(u string) string {
	r := []rune(u)
	return string(r[:unitWordEnd(r, 0)])
}

// isUnitStart reports whether c may start a unit symbol: a name's first
// character, or the degree sign of °C.
func isUnitStart(c rune) bool { return isIdentStart(c) || c == '°' }

// unitWordEnd returns the end of the unit symbol starting at k.
func unitWordEnd(r []rune, k int) int {
	e := k
	if e < len(r) && r[e] == '°' {
		e++
	}
	for e < len(r) && isIdentPart(r[e]) {
		e++
	}
	return e
}

// scanNumber returns the end of the number that starts at i: digits with
// optional underscores, an optional fraction and an optional exponent.
func scanNumber(r []rune, i int) int {
	j := i
	digits := func() {
		for j < len(r) && (isDigit(r[j]) || (r[j] == '_' && j+1 < len(r) && isDigit(r[j+1]))) {
			j++
		}
	}
	digits()
	if j+1 < len(r) && r[j] == '.' && isDigit(r[j+1]) {
		j++
		digits()
	} else if j < len(r) && r[j] == '.' && (j+1 >= len(r) || r[j+1] != '.') && (!isIdentStart(safe(r, j+1)) || exponentAt(r, j+1)) {
		j++ // "5." and "5.e3" are numbers
	}
	if j < len(r) && (r[j] == 'e' || r[j] == 'E') {
		k := j + 1
		if k < len(r) && (r[k] == '+' || r[k] == '-') {
			k++
		}
		if k < len(r) && isDigit(r[k]) {
			j = k
			digits()
		}
	}
	return j
}

func safe(r []rune, i int) rune {
	if i < len(r) {
		return r[i]
	}
	return 0
}

// scanUnit returns the end of the unit expression that starts with a unit
// atom at k. Grammar (no spaces inside):
//
//	unit   = factor { ("*" | "/") factor }
//	factor = (atom | "(" unit ")") [ "^" ["-"] digits ]
func scanUnit(r []rune, k int, units UnitNames) int {
	end, ok := scanUnitSeq(r, k, units, 0)
	if !ok {
		return k
	}
	return end
}

func scanUnitSeq(r []rune, k int, units UnitNames, depth int) (int, bool) {
	if depth > MaxNesting {
		return k, false // ParseStatement refuses this before; never recurse without end
	}
	e, ok := scanFactor(r, k, units, depth)
	if !ok {
		return k, false
	}
	for e < len(r) && (r[e] == '*' || r[e] == '/') {
		if e+1 < len(r) && r[e+1] == r[e] {
			break // "**" is power in the expression syntax, "//" a comment
		}
		n, ok := scanFactor(r, e+1, units, depth)
		if !ok {
			break
		}
		e = n
	}
	return e, true
}

func scanFactor(r []rune, k int, units UnitNames, depth int) (int, bool) {
	if k >= len(r) {
		return k, false
	}
	var e int
	switch {
	case r[k] == '(':
		n, ok := scanUnitSeq(r, k+1, units, depth+1)
		if !ok || n >= len(r) || r[n] != ')' {
			return k, false
		}
		e = n + 1
	case isUnitStart(r[k]):
		e = unitWordEnd(r, k)
		if !units.IsUnit(string(r[k:e])) {
			return k, false
		}
	default:
		return k, false
	}
	if e < len(r) && r[e] == '^' {
		p := e + 1
		if p < len(r) && r[p] == '-' {
			p++
		}
		q := p
		for q < len(r) && isDigit(r[q]) {
			q++
		}
		// a fractional power ("m^0.5") is taken whole so that the unit
		// parser can reject it with a clear message
		if q > p && q+1 < len(r) && r[q] == '.' && isDigit(r[q+1]) {
			q++
			for q < len(r) && isDigit(r[q]) {
				q++
			}
		}
		if q > p {
			e = q
		}
	}
	return e, true
}

// isDigit reports an ASCII digit: numbers are written with 0 to 9 only.
func isDigit(c rune) bool { return c >= '0' && c <= '9' }

// exponentAt reports a complete decimal exponent at r[k:]: e or E, an
// optional sign, a digit ("1.e-3" is a number).
func exponentAt(r []rune, k int) bool {
	if k >= len(r) || (r[k] != 'e' && r[k] != 'E') {
		return false
	}
	k++
	if k < len(r) && (r[k] == '+' || r[k] == '-') {
		k++
	}
	return k < len(r) && isDigit(r[k])
}

// skipBlanks returns the index of the first rune at or after k that is not
// a space or a tab.
func skipBlanks(r []rune, k int) int {
	for k < len(r) && (r[k] == ' ' || r[k] == '\t') {
		k++
	}
	return k
}
