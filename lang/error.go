package lang

import (
	"errors"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Error is the one positioned error of Loopwise: every message a user sees
// about bad input is an *Error. It prints as
//
//	file:line:col: message
//	  <the source line>
//	  <caret under the offending column>
type Error struct {
	Pos    Pos
	Msg    string
	Source string // the whole source line the position refers to; may be empty
	Width  int    // number of carets; at least 1
	// Cause, when set, is the reason behind the message that callers may
	// test with errors.Is (work interrupted, or over its budget).
	Cause error
}

// Unwrap returns the cause.
func (e *Error) Unwrap() error { return e.Cause }

// Errorf-like constructor.
func NewError(pos Pos, src string, width int, msg string) *Error {
	return &Error{Pos: pos, Msg: msg, Source: src, Width: width}
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.Pos.String())
	b.WriteString(": ")
	b.WriteString(e.Msg)
	if e.Source != "" && e.Pos.Col >= 1 {
		src, col, width := window(e.Source, e.Pos.Col, e.Width)
		b.WriteString("\n    ")
		b.WriteString(src)
		b.WriteString("\n    ")
		b.WriteString(Caret(src, col, width))
	}
	return b.String()
}

// ShowWidth is the most characters of a source line an error shows; a
// longer line is shown as a window around the caret, with … marking what
// is left out on either side.
const ShowWidth = 120

// window returns the part of src an error shows, with control characters
// (tabs, a stray carriage return) as spaces so the caret lines up, and the
// caret's column and width in it.
func window(src string, col, width int) (string, int, int) {
	r := []rune(src)
	for i, c := range r {
		if unicode.IsControl(c) {
			r[i] = ' '
		}
	}
	if len(r) <= ShowWidth {
		return string(r), col, width
	}
	width = min(max(width, 1), ShowWidth/2)
	start := max(0, col-1-ShowWidth/3)
	end := min(len(r), start+ShowWidth)
	start = max(0, min(start, end-ShowWidth))
	out := string(r[start:end])
	col -= start
	if start > 0 {
		out = Ellipsis + out
		col++
	}
	if end < len(r) {
		out += Ellipsis
	}
	return out, col, width
}

// Caret returns the caret line for column col (1-based, runes) of src, with
// width carets (at least one).
func Caret(src string, col, width int) string {
	if width < 1 {
		width = 1
	}
	n := utf8.RuneCountInString(src)
	if col > n+1 {
		col = n + 1
	}
	if col-1+width > n && n >= col {
		width = n - col + 1
	}
	if width < 1 {
		width = 1
	}
	return strings.Repeat(" ", col-1) + strings.Repeat("^", width)
}

// AsError reports whether err is (or wraps) a positioned *Error.
func AsError(err error) (*Error, bool) {
	var e *Error
	ok := errors.As(err, &e)
	return e, ok
}
