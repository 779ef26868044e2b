package lang

import "fmt"

// Pos is a position in a source: file name (may be empty), 1-based line and
// 1-based column counted in runes (characters, not bytes).
type Pos struct {
	File string
	Line int
	Col  int
}

// String prints "file:line:col", or "line:col" when there is no file name.
func (p Pos) String() string {
	if p.File == "" {
		return fmt.Sprintf("%d:%d", p.Line, p.Col)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}

// Shift returns p moved n runes to the right on the same line.
func (p Pos) Shift(n int) Pos {
	p.Col += n
	return p
}
