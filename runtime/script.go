package runtime

import (
	"fmt"
	"strings"
	"unicode/utf8"

	"loopwise/lang"
)

// A script is a Markdown file. Statements sit in fenced code blocks whose
// info string starts with the word FenceTag:
//
//	```lw
//	gap = 4 mm
//	↳ 4 mm
//	```
//
// Fences follow CommonMark: a run of at least three backticks or tildes,
// indented by at most three spaces; the block closes at a fence of the same
// character at least as long with nothing after it. The first word of the
// info string decides (```lw title=x and ~~~~ lw both open a block of
// statements). A statement continues over several lines while a bracket is
// open (lang.NeedsMore).
//
// After a statement's last line come its recorded result lines: the value
// behind ResultMark, for a table its rows behind TableMark, then each
// caution behind ResultMark and CautionMark. Everything outside the blocks
// is prose.
const (
	FenceTag   = "lw"
	ResultMark = "↳"
	// TableMark starts each recorded row of a table.
	TableMark = "│"
	// ScriptExt is the file extension of scripts found in directories.
	ScriptExt = ".lw"
	// CautionMark flags a safety caution, in printed output and, behind
	// ResultMark, in recorded results.
	CautionMark = "⚠"
)

// DefaultTolerance is the relative tolerance of a replay check.
const DefaultTolerance = 1e-9

// RecordRows is the most rows of a table a script records one by one. A
// longer table is recorded as six rows of column statistics (first, last,
// min, max, mean, rms) under a header whose first cell is "stat".
const RecordRows = 200

// Script is a parsed script file.
type Script struct {
	Path  string
	Lines []string // without line endings
	Stmts []ScriptStmt
	block []bool // line i lies inside a block of statements
	fence []bool // line i opens or closes a block of statements
	crlf  []bool // line i ended with CR LF
	// finalEOL tells whether the last line ended with a line ending.
	finalEOL bool
	// unclosed is the 0-based line of a fence of another language that is
	// never closed (so the rest of the file is inside it), or -1.
	unclosed int
	// bom tells whether the file started with a byte-order mark, which is
	// skipped when reading and kept when recording.
	bom bool
}

// ByteOrderMark is the UTF-8 encoding of U+FEFF, which some editors write
// at the start of a text file.
const ByteOrderMark = "\ufeff"

// ScriptStmt is one statement of a script and its recorded result lines.
type ScriptStmt struct {
	Line     int   // 0-based index of the statement's first line
	End      int   // 0-based index of its last line (Line unless continued)
	Result   int   // 0-based index of its result line, or -1
	Table    []int // 0-based indices of its recorded table rows
	Cautions []int // 0-based indices of its recorded cautions
}

// Text returns the statement as evaluated: its first line without
// indentation and its continuation lines as written, joined by newlines.
func (sc *Script) Text(st ScriptStmt) string {
	text, _ := statementText(sc.Lines[st.Line])
	for i := st.Line + 1; i <= st.End; i++ {
		text += "\n" + sc.Lines[i]
	}
	return text
}

// Recorded returns the recorded result text of a statement, or "".
func (sc *Script) Recorded(st ScriptStmt) string {
	if st.Result < 0 {
		return ""
	}
	return recordedText(sc.Lines[st.Result])
}

func recordedText(line string) string {
	t := strings.TrimSpace(line)
	t = strings.TrimPrefix(t, ResultMark)
	return strings.TrimSpace(t)
}

// resultKind tells what a line inside a block records: 0 none, 'v' a value,
// 't' a table row, 'c' a caution.
func resultKind(line string) byte {
	t := strings.TrimSpace(line)
	switch {
	case strings.HasPrefix(t, TableMark):
		return 't'
	case strings.HasPrefix(t, ResultMark):
		if strings.HasPrefix(strings.TrimSpace(strings.TrimPrefix(t, ResultMark)), CautionMark) {
			return 'c'
		}
		return 'v'
	}
	return 0
}

func isResultLine(line string) bool { return resultKind(line) != 0 }

// fenceLine is a CommonMark code fence.
type fenceLine struct {
	ch   byte   // '`' or '~'
	n    int    // length of the run
	info string // the info string, trimmed
}

// parseFence reads a code fence: at most three spaces, then three or more
// backticks or tildes, then the info string (which for backticks may not
// hold a backtick).
func parseFence(line string) (fenceLine, bool) {
	i := 0
	for i < len(line) && i < 4 && line[i] == ' ' {
		i++
	}
	if i > 3 || i >= len(line) || (line[i] != '`' && line[i] != '~') {
		return fenceLine{}, false
	}
	ch := line[i]
	j := i
	for j < len(line) && line[j] == ch {
		j++
	}
	if j-i < 3 {
		return fenceLine{}, false
	}
	info := strings.TrimSpace(line[j:])
	if ch == '`' && strings.Contains(info, "`") {
		return fenceLine{}, false
	}
	return fenceLine{ch: ch, n: j - i, info: info}, true
}

// closes reports whether f closes a block opened by open.
func (f fenceLine) closes(open fenceLine) bool {
	return f.ch == open.ch && f.n >= open.n && f.info == ""
}

func (f fenceLine) String() string { return strings.Repeat(string(f.ch), f.n) }

// isStatementFence reports whether an opening fence starts a block of
// statements: the first word of its info string is FenceTag.
func (f fenceLine) isStatementFence() bool {
	w := strings.Fields(f.info)
	return len(w) > 0 && w[0] == FenceTag
}

// ParseScript splits script text into prose and statements. A block of
// statements that is never closed is an error (CommonMark would run it to
// the end of the file, showing all that follows as code); a block of
// another language that is never closed runs to the end of the file, as in
// CommonMark.
func ParseScript(path string, data []byte) (*Script, error) {
	text := string(data)
	sc := &Script{Path: path, unclosed: -1}
	text, sc.bom = strings.CutPrefix(text, ByteOrderMark)
	if text != "" {
		sc.finalEOL = strings.HasSuffix(text, "\n")
		sc.Lines = strings.Split(strings.TrimSuffix(text, "\n"), "\n")
	}
	sc.crlf = make([]bool, len(sc.Lines))
	for i, l := range sc.Lines {
		if strings.HasSuffix(l, "\r") {
			sc.Lines[i], sc.crlf[i] = strings.TrimSuffix(l, "\r"), true
		}
		// A carriage return alone ends a line in CommonMark (old Mac
		// files); record could not keep such endings, so refuse the file
		// rather than read it as one long line with no block in it.
		if j := strings.IndexByte(sc.Lines[i], '\r'); j >= 0 {
			line := sc.Lines[i][:j]
			return nil, &lang.Error{Pos: lang.Pos{File: path, Line: i + 1, Col: utf8.RuneCountInString(line) + 1},
				Msg:    "a carriage return alone ends a line here (old Mac line endings); Loopwise reads scripts with LF or CR LF line endings: convert the file",
				Source: line, Width: 1}
		}
	}
	sc.block = make([]bool, len(sc.Lines))
	sc.fence = make([]bool, len(sc.Lines))
	type span struct{ from, to int } // content lines of a block of statements
	var blocks []span
	var open fenceLine
	inLW, inOther := false, false
	openLine := 0
	for i, line := range sc.Lines {
		f, isFence := parseFence(line)
		switch {
		case inLW && isFence && f.closes(open):
			inLW = false
			sc.fence[i] = true
			blocks = append(blocks, span{openLine + 1, i})
		case inLW && isFence:
			msg := fmt.Sprintf("%s does not close the block opened with %s at line %d: close it with %s (the same character, at least as many, nothing after it)", f, open, openLine+1, open)
			if f.ch == open.ch && f.n >= open.n {
				msg = fmt.Sprintf("a block of statements must be closed with %s before another one opens", open)
			}
			return nil, scriptErr(path, i, line, msg)
		case inLW:
			sc.block[i] = true
		case inOther:
			if isFence && f.closes(open) {
				inOther = false
			}
		case isFence && f.isStatementFence():
			inLW, open, openLine = true, f, i
			sc.fence[i] = true
		case isFence:
			inOther, open, openLine = true, f, i
		}
	}
	if inLW {
		return nil, scriptErr(path, openLine, sc.Lines[openLine], fmt.Sprintf("this block of statements is never closed with %s", open))
	}
	if inOther {
		sc.unclosed = openLine
	}
	for _, b := range blocks {
		sc.parseBlock(b.from, b.to)
	}
	return sc, nil
}

// parseBlock finds the statements of the block whose content lines are
// [from, to), and the result lines that follow each.
func (sc *Script) parseBlock(from, to int) {
	next := -1 // the line where the last statement's next result line may sit
	for i := from; i < to; i++ {
		line := sc.Lines[i]
		if k := resultKind(line); k != 0 {
			n := len(sc.Stmts)
			if n > 0 && i == next {
				st := &sc.Stmts[n-1]
				switch {
				case k == 'v' && st.Result < 0 && len(st.Table) == 0 && len(st.Cautions) == 0:
					st.Result = i
				case k == 't' && len(st.Cautions) == 0:
					st.Table = append(st.Table, i)
				case k == 'c':
					st.Cautions = append(st.Cautions, i)
				default:
					continue // out of order: left for record to drop
				}
				next = i + 1
			}
			// a result line with no statement above it is left for
			// record to drop
			continue
		}
		if t := strings.TrimSpace(line); t == "" || strings.HasPrefix(t, "//") {
			continue // blank and comment lines are kept as they are
		}
		st := ScriptStmt{Line: i, End: i, Result: -1}
		text, _ := statementText(line)
		for lang.NeedsMore(text) && st.End+1 < to && !isResultLine(sc.Lines[st.End+1]) {
			st.End++
			text += "\n" + sc.Lines[st.End]
		}
		sc.Stmts = append(sc.Stmts, st)
		i = st.End
		next = i + 1
	}
}

func scriptErr(path string, i int, line, msg string) error {
	f, _ := parseFence(line)
	col := len(line) - len(strings.TrimLeft(line, " ")) + 1
	return &lang.Error{Pos: lang.Pos{File: path, Line: i + 1, Col: col}, Msg: msg, Source: line, Width: max(3, f.n)}
}

// NoStatementsError is returned when a script holds no statement at all:
// replaying it would check nothing.
type NoStatementsError struct {
	Path string
	// Unclosed is the 1-based line of a fence of another language that is
	// never closed and so takes in the rest of the file, or 0.
	Unclosed int
}

func (e *NoStatementsError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s: no statements found, so there is nothing to run or check.\n", e.Path)
	if e.Unclosed > 0 {
		fmt.Fprintf(&b, "The code block opened at line %d is never closed, so the rest of the file is inside it.\n", e.Unclosed)
	}
	b.WriteString("Statements go in a fenced block marked lw, each result on the line after it:\n\n")
	b.WriteString("    ```lw\n    gap = 4 mm\n    ```\n\n")
	b.WriteString("then run: loopwise record " + e.Path)
	return b.String()
}

// requireStatements refuses a script without statements.
func (sc *Script) requireStatements() error {
	if len(sc.Stmts) > 0 {
		return nil
	}
	return &NoStatementsError{Path: sc.Path, Unclosed: sc.unclosed + 1}
}

// statementText returns the statement line without leading indentation and
// the column where it starts.
func statementText(line string) (string, int) {
	t := strings.TrimLeft(line, " \t")
	return t, len([]rune(line)) - len([]rune(t)) + 1
}

// Prose reports whether line i (0-based) is prose: outside every block of
// statements and not one of their fences.
func (sc *Script) Prose(i int) bool { return !sc.block[i] && !sc.fence[i] }

// Fence reports whether line i (0-based) opens or closes a block of
// statements.
func (sc *Script) Fence(i int) bool { return sc.fence[i] }
