package runtime

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
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

// evalStmt evaluates one statement of a script.
func (sc *Script) evalStmt(s *Session, st ScriptStmt) (*Result, error) {
	text := sc.Text(st)
	_, col := statementText(sc.Lines[st.Line])
	pos := lang.Pos{File: sc.Path, Line: st.Line + 1, Col: col}
	res, err := s.Eval(pos, text)
	if errors.Is(err, ErrNotSessionCommand) {
		return nil, &lang.Error{Pos: pos,
			Msg:    fmt.Sprintf("the command :%s works only at the interactive prompt", res0(text)),
			Source: sc.Lines[st.Line], Width: len([]rune(strings.TrimSpace(text)))}
	}
	if le, ok := lang.AsError(err); ok && le.Pos.File == sc.Path && le.Pos.Line == st.Line+1 {
		le.Source = sc.Lines[st.Line] // with its indentation, so the caret lines up
	}
	return res, err
}

func res0(text string) string {
	f := strings.Fields(strings.TrimPrefix(text, ":"))
	if len(f) == 0 {
		return ""
	}
	return f[0]
}

// Run evaluates a script in s and writes it as a worked calculation to w:
// prose as written, statements indented, each followed by its result. It
// stops at the first error.
func (sc *Script) Run(s *Session, w io.Writer) error {
	i := 0 // the next line to write
	writeUpTo := func(end int) {
		for ; i < end; i++ {
			line := sc.Lines[i]
			switch {
			case sc.fence[i] || isResultLineInBlock(sc, i):
			case sc.block[i] && strings.TrimSpace(line) != "":
				fmt.Fprintf(w, "    %s\n", strings.TrimLeft(line, " \t")) // a comment line
			default:
				fmt.Fprintln(w, strings.TrimRight(line, " \t"))
			}
		}
	}
	err := sc.evaluate(s, func(st ScriptStmt, res *Result) {
		writeUpTo(st.Line)
		line := sc.Lines[st.Line]
		indent := len(line) - len(strings.TrimLeft(line, " \t"))
		for j := st.Line; j <= st.End; j++ {
			l := sc.Lines[j]
			cut := min(indent, len(l)-len(strings.TrimLeft(l, " \t")))
			fmt.Fprintf(w, "    %s\n", strings.TrimRight(l[cut:], " \t"))
		}
		if res.Text != "" && res.Stmt.Kind != lang.Empty {
			fmt.Fprintf(w, "    %s %s\n", ResultMark, strings.ReplaceAll(res.Text, "\n", "\n      "))
		}
		for _, c := range res.Cautions {
			fmt.Fprintf(w, "    %s %s\n", CautionMark, c)
		}
		i = st.End + 1
	})
	if err != nil {
		return err
	}
	writeUpTo(len(sc.Lines))
	return nil
}

// evaluate is the one replay loop that Run, Check, Record and Evaluate
// share: it evaluates the statements in order in s and hands each result
// to fn. It refuses a script without statements and stops at the first
// error, which it returns.
func (sc *Script) evaluate(s *Session, fn func(st ScriptStmt, res *Result)) error {
	if err := sc.requireStatements(); err != nil {
		return err
	}
	for _, st := range sc.Stmts {
		res, err := sc.evalStmt(s, st)
		if err != nil {
			return err
		}
		fn(st, res)
	}
	return nil
}

// StatementResult is one statement of an evaluated script: its result now
// and how that compares with what the script records.
type StatementResult struct {
	Stmt ScriptStmt
	Text string // the statement as evaluated (Script.Text)
	// Result is the statement's result; nil when it failed (Err) or was
	// not reached because an earlier statement failed.
	Result *Result
	Err    error
	// Recorded is the recorded result text, or ""; RecordedCautions the
	// recorded cautions.
	Recorded         string
	RecordedCautions []string
	// Drifts are the recorded results that no longer match (see Check).
	Drifts []Drift
}

// Evaluated reports whether the statement ran (with or without an error).
func (r StatementResult) Evaluated() bool { return r.Result != nil || r.Err != nil }

// Evaluate re-evaluates the script in s and returns every statement with
// its result and its drifts against the recorded results (relative
// tolerance tol, as Check). It stops at the first error: that statement
// carries it in Err, the statements after it are returned unevaluated, and
// the error is also returned. A script without statements returns only
// the error.
func (sc *Script) Evaluate(s *Session, tol float64) ([]StatementResult, error) {
	out := make([]StatementResult, len(sc.Stmts))
	for k, st := range sc.Stmts {
		out[k] = StatementResult{Stmt: st, Text: sc.Text(st), Recorded: sc.Recorded(st)}
		for _, c := range st.Cautions {
			out[k].RecordedCautions = append(out[k].RecordedCautions, cautionText(sc.Lines[c]))
		}
	}
	k := 0
	err := sc.evaluate(s, func(st ScriptStmt, res *Result) {
		out[k].Result = res
		out[k].Drifts = sc.checkStmt(st, res, tol)
		k++
	})
	if err != nil {
		var none *NoStatementsError
		if errors.As(err, &none) {
			return nil, err
		}
		out[k].Err = err
	}
	return out, err
}

func isResultLineInBlock(sc *Script, i int) bool {
	return sc.block[i] && isResultLine(sc.Lines[i])
}

// moreLines returns the lines recorded after a result's value line: a
// table's rows behind TableMark, then each caution behind ResultMark and
// CautionMark.
func moreLines(res *Result) []string {
	var out []string
	if t, ok := res.Value.(Tabular); ok && res.Record != "" {
		for _, l := range gridOf(t).lines() {
			out = append(out, TableMark+" "+l)
		}
	}
	for _, c := range res.Cautions {
		out = append(out, ResultMark+" "+CautionMark+" "+c)
	}
	return out
}

// Drift is one recorded result that no longer matches.
type Drift struct {
	StmtLine int    // 1-based line of the statement's first line
	Stmt     string // the statement's text
	Line     int    // 1-based line of the result (or statement) line
	What     string // which part drifted: "result", "caution", "row 3, Bz [µT]"...
	Recorded string
	Now      string
	// Rel is the relative change of the number that moved most, (now −
	// recorded)/|recorded|; NaN when no number can be compared.
	Rel float64
	Why string // for a result that appeared or vanished
}

// CheckReport is the outcome of checking a script.
type CheckReport struct {
	Drifts []Drift
	// Statements counts the statements checked; Results those with a result
	// recorded or now; Drifted those among them with at least one drift.
	Statements, Results, Drifted int
}

// Check re-evaluates the script in s and compares every recorded result
// with relative tolerance tol: values, every cell of a table, the numbers
// in text, and the cautions. An error stops the check.
func (sc *Script) Check(s *Session, tol float64) (CheckReport, error) {
	results, err := sc.Evaluate(s, tol)
	return checkReport(len(sc.Stmts), results), err
}

// checkReport sums up the evaluated statements of a check.
func checkReport(statements int, results []StatementResult) CheckReport {
	rep := CheckReport{Statements: statements}
	for _, r := range results {
		if r.Result == nil {
			continue
		}
		if r.Result.Record != "" || r.Stmt.Result >= 0 {
			rep.Results++
		}
		if len(r.Drifts) > 0 {
			rep.Drifted++
			rep.Drifts = append(rep.Drifts, r.Drifts...)
		}
	}
	return rep
}

// Report sums up the results of Evaluate as Check does.
func (sc *Script) Report(results []StatementResult) CheckReport {
	return checkReport(len(sc.Stmts), results)
}

// checkStmt compares one statement's recorded lines with its result now.
func (sc *Script) checkStmt(st ScriptStmt, res *Result, tol float64) []Drift {
	base := Drift{StmtLine: st.Line + 1, Stmt: sc.Text(st), Line: st.Line + 1, What: "result", Rel: math.NaN()}
	add := func(ds *[]Drift, d Drift) { *ds = append(*ds, d) }
	var ds []Drift
	switch {
	case res.Record == "" && st.Result >= 0:
		d := base
		d.Line, d.Recorded, d.Why = st.Result+1, sc.Recorded(st), "this statement has no result now"
		add(&ds, d)
	case res.Record != "" && st.Result < 0:
		d := base
		d.Now, d.Why = res.Record, "no result is recorded for this statement"
		add(&ds, d)
	case res.Record != "":
		rec := sc.Recorded(st)
		if ok, now, rel := Matches(rec, res.Value, res.Record, tol); !ok {
			d := base
			d.Line, d.Recorded, d.Now, d.Rel = st.Result+1, rec, now, rel
			add(&ds, d)
		}
	}
	if t, ok := res.Value.(Tabular); ok && res.Record != "" && st.Result >= 0 {
		ds = append(ds, sc.checkTable(base, st, t, tol)...)
	}
	// cautions, in order
	for k := 0; k < max(len(res.Cautions), len(st.Cautions)); k++ {
		d := base
		d.What = "caution"
		switch {
		case k >= len(st.Cautions):
			d.Now, d.Why = res.Cautions[k], "a caution appeared"
			if st.Result >= 0 {
				d.Line = st.Result + 1
			}
		case k >= len(res.Cautions):
			d.Line, d.Recorded, d.Why = st.Cautions[k]+1, cautionText(sc.Lines[st.Cautions[k]]), "a caution disappeared"
		default:
			rec := cautionText(sc.Lines[st.Cautions[k]])
			ok, rel := matchText(rec, res.Cautions[k], tol)
			if ok {
				continue
			}
			d.Line, d.Recorded, d.Now, d.Rel = st.Cautions[k]+1, rec, res.Cautions[k], rel
		}
		add(&ds, d)
	}
	return ds
}

func cautionText(line string) string {
	return strings.TrimSpace(strings.TrimPrefix(recordedText(line), CautionMark))
}

// maxCellDrifts is how many drifted cells of one table are reported.
const maxCellDrifts = 5

// checkTable compares a table's recorded rows with its rows now.
func (sc *Script) checkTable(base Drift, st ScriptStmt, t Tabular, tol float64) []Drift {
	now := gridOf(t)
	var recLines []string
	for _, i := range st.Table {
		recLines = append(recLines, strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(sc.Lines[i]), TableMark)))
	}
	d := base
	d.Line = st.Result + 1
	if len(st.Table) > 0 {
		d.Line = st.Table[0] + 1
	}
	if len(recLines) == 0 {
		d.Why, d.What = "the table's rows are not recorded", "table"
		return []Drift{d}
	}
	rec, err := parseGrid(recLines)
	if err != nil {
		d.Why, d.What = "the recorded table cannot be read: "+err.Error(), "table"
		return []Drift{d}
	}
	if !sameColumns(rec, now) {
		d.What, d.Recorded, d.Now = "table columns", strings.Join(rec.header(), ", "), strings.Join(now.header(), ", ")
		return []Drift{d}
	}
	if len(rec.cells) != len(now.cells) || (rec.labels == nil) != (now.labels == nil) {
		d.What, d.Recorded, d.Now = "table rows", fmt.Sprintf("%d rows", len(rec.cells)), fmt.Sprintf("%d rows", len(now.cells))
		if now.labels != nil {
			d.Now = fmt.Sprintf("%d rows (more than %d: column statistics)", now.total, RecordRows)
		}
		return []Drift{d}
	}
	var ds []Drift
	more := 0
	// A cell below tableNoise of its column's largest magnitude is rounding
	// noise (the imaginary part of a voltage in phase, a power that is zero
	// in exact arithmetic): two such cells match.
	floor := make([]float64, len(rec.cols))
	for _, g := range []grid{rec, now} {
		for i := range g.cells {
			for j, x := range g.cells[i] {
				if j < len(floor) {
					floor[j] = math.Max(floor[j], tableNoise*math.Abs(x))
				}
			}
		}
	}
	for i := range rec.cells {
		if rec.labels != nil && rec.labels[i] != now.labels[i] {
			d := d
			d.What, d.Recorded, d.Now = "table row", rec.labels[i], now.labels[i]
			return []Drift{d}
		}
		for j := range rec.cells[i] {
			a, b := rec.cells[i][j], now.cells[i][j]
			if closeEnough(a, b, math.Max(math.Abs(a), math.Abs(b)), tol) {
				continue
			}
			if j < len(floor) && math.Abs(a) <= floor[j] && math.Abs(b) <= floor[j] {
				continue
			}
			if len(ds) == maxCellDrifts {
				more++
				continue
			}
			c := d
			c.Line = st.Table[min(i+1, len(st.Table)-1)] + 1
			row := fmt.Sprintf("row %d", i+1)
			if rec.labels != nil {
				row = rec.labels[i]
			}
			c.What = fmt.Sprintf("%s, %s", row, now.header()[j])
			c.Recorded = strings.TrimSpace(rec.text[i][j] + " " + rec.units[j])
			c.Now = strings.TrimSpace(now.cellText(i, j) + " " + now.units[j])
			c.Rel = relChange(a, b)
			ds = append(ds, c)
		}
	}
	if more > 0 {
		c := d
		c.What, c.Why = "table", fmt.Sprintf("and %d more cells drifted", more)
		ds = append(ds, c)
	}
	return ds
}

// sameColumns reports whether two grids have the same column names and
// dimensions (units may differ: cells are compared in SI units).
func sameColumns(a, b grid) bool {
	if len(a.cols) != len(b.cols) {
		return false
	}
	for j := range a.cols {
		if a.cols[j] != b.cols[j] || a.dims[j] != b.dims[j] {
			return false
		}
	}
	return true
}

// tableNoise is the fraction of a column's largest magnitude below which a
// cell is taken as rounding noise when a table is checked: far below the
// accuracy of any method here (the finest asks for 1e-12).
const tableNoise = 1e-12

func relChange(rec, now float64) float64 {
	if rec == 0 {
		if now == 0 {
			return 0
		}
		return math.Inf(int(math.Copysign(1, now)))
	}
	return (now - rec) / math.Abs(rec)
}

// Matches compares a recorded result text with a value now. Quantities and
// vectors written as "number unit" are compared numerically with relative
// tolerance tol (|a-b| <= tol*max(|a|,|b|), vectors against the larger
// norm); any other text is compared as words and numbers: the words must be
// equal and each number within tol. now is the value shown in the recorded
// unit when that is possible; rel is the relative change of the number
// that moved most (NaN when the texts cannot be compared number by number).
func Matches(recorded string, v Value, nowText string, tol float64) (ok bool, now string, rel float64) {
	if recorded == nowText {
		return true, nowText, 0
	}
	recBody, recErr := splitNumErr(recorded)
	nowBody, nowErr := splitNumErr(nowText)
	if floor := math.Max(recErr, nowErr); floor > 0 {
		// a change within the recorded or present numerical error is not
		// drift: the value is compared with that floor
		ok, now, rel = Matches(recBody, v, nowBody, tol)
		if ok {
			return ok, nowText, rel
		}
		rv, _, parsed := parseRecorded(recBody)
		if !parsed {
			return ok, nowText, rel
		}
		switch x := v.(type) {
		case Quantity:
			if r, isQ := rv.(Quantity); isQ && r.D == x.D && math.Abs(r.V-x.V) <= floor {
				return true, nowText, rel
			}
		case Vector:
			if r, isV := rv.(Vector); isV && r.D == x.D {
				within := true
				for i := range 3 {
					within = within && math.Abs(r.V[i]-x.V[i]) <= floor
				}
				if within {
					return true, nowText, rel
				}
			}
		}
		return false, nowText, rel
	}
	if rv, unit, ok := parseCVectorRecorded(recorded); ok {
		x, isV := v.(CVector)
		now = nowText
		if unit != "" {
			if t, err := FormatIn(v, unit, RecordDigits); err == nil {
				now = t
			}
		}
		if !isV || x.D != rv.D {
			return false, now, math.NaN()
		}
		var d CVector
		for i := range 3 {
			d.V[i] = x.V[i] - rv.V[i]
		}
		scale := math.Max(rv.Norm().V, x.Norm().V)
		rel = math.Inf(1)
		if n := rv.Norm().V; n > 0 {
			rel = d.Norm().V / n
		} else if d.Norm().V == 0 {
			rel = 0
		}
		return d.Norm().V <= tol*scale, now, rel
	}
	if z, form, ok := parseComplexRecorded(recorded); ok {
		// a complex result is compared as a point in the plane:
		// |z_now - z_recorded| within tol of the larger magnitude
		x, isC := v.(Complex)
		now = nowText
		if t, err := FormatIn(v, form, RecordDigits); err == nil {
			now = t
		}
		if !isC || x.D != z.D {
			return false, now, math.NaN()
		}
		scale := math.Max(cmplx.Abs(z.V), cmplx.Abs(x.V))
		diff := cmplx.Abs(x.V - z.V)
		rel = math.Inf(1)
		if a := cmplx.Abs(z.V); a > 0 {
			rel = diff / a
		} else if diff == 0 {
			rel = 0
		}
		return diff <= tol*scale, now, rel
	}
	rv, unit, parsed := parseRecorded(recorded)
	if !parsed {
		ok, rel := matchText(recorded, nowText, tol)
		return ok, nowText, rel
	}
	now = nowText
	if unit != "" {
		if t, err := FormatIn(v, unit, RecordDigits); err == nil {
			now = t
		}
	}
	switch x := v.(type) {
	case Quantity:
		r, ok := rv.(Quantity)
		if !ok || r.D != x.D {
			return false, now, math.NaN()
		}
		return closeEnough(r.V, x.V, math.Max(math.Abs(r.V), math.Abs(x.V)), tol), now, relChange(r.V, x.V)
	case Vector:
		r, ok := rv.(Vector)
		if !ok || r.D != x.D {
			return false, now, math.NaN()
		}
		scale := math.Max(r.Norm().V, x.Norm().V)
		ok = true
		var diff [3]float64
		for i := range 3 {
			diff[i] = x.V[i] - r.V[i]
			ok = ok && closeEnough(r.V[i], x.V[i], scale, tol)
		}
		rel = relChange(r.Norm().V, r.Norm().V+Vector{V: diff}.Norm().V)
		return ok, now, rel
	}
	return false, now, math.NaN()
}

func closeEnough(a, b, scale, tol float64) bool {
	return math.Abs(a-b) <= tol*scale
}

// numberRE matches a decimal number in text, as results write them.
var numberRE = regexp.MustCompile(`[-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?`)

// matchText compares two texts as words and numbers: the text between the
// numbers must be equal, and the numbers as many and each within relative
// tolerance tol. rel is the relative change of the number that moved most,
// NaN when the words differ.
func matchText(rec, now string, tol float64) (bool, float64) {
	rw, rn := splitNumbers(rec)
	nw, nn := splitNumbers(now)
	if len(rn) != len(nn) || strings.Join(rw, "\x00") != strings.Join(nw, "\x00") {
		return false, math.NaN()
	}
	ok, rel := true, 0.0
	for i := range rn {
		if !closeEnough(rn[i], nn[i], math.Max(math.Abs(rn[i]), math.Abs(nn[i])), tol) {
			ok = false
		}
		if r := relChange(rn[i], nn[i]); math.Abs(r) > math.Abs(rel) {
			rel = r
		}
	}
	return ok, rel
}

// splitNumbers returns the words between the numbers of text, and the
// numbers.
func splitNumbers(text string) ([]string, []float64) {
	var words []string
	var nums []float64
	at := 0
	for _, m := range numberRE.FindAllStringIndex(text, -1) {
		x, err := strconv.ParseFloat(text[m[0]:m[1]], 64)
		if err != nil {
			continue // out of range: compared as a word
		}
		words = append(words, text[at:m[0]])
		nums = append(nums, x)
		at = m[1]
	}
	return append(words, text[at:]), nums
}

// parseRecorded reads "number [unit]" or "[a, b, c] [unit]".
func parseRecorded(text string) (Value, string, bool) {
	text = strings.TrimSpace(text)
	if strings.HasPrefix(text, "[") {
		end := strings.Index(text, "]")
		if end < 0 {
			return nil, "", false
		}
		parts := strings.Split(text[1:end], ",")
		if len(parts) != 3 {
			return nil, "", false
		}
		unit := strings.TrimSpace(text[end+1:])
		scale, d := 1.0, Dimensionless
		if unit != "" {
			u, err := ParseUnit(unit)
			if err != nil {
				return nil, "", false
			}
			scale, d = u.Scale(), u.Dim
		}
		var v Vector
		v.D = d
		for i, p := range parts {
			x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
			if err != nil {
				return nil, "", false
			}
			v.V[i] = x * scale
		}
		return v, unit, true
	}
	num, unit, _ := strings.Cut(text, " ")
	x, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return nil, "", false
	}
	unit = strings.TrimSpace(unit)
	if unit == "" {
		return Num(x), "", true
	}
	u, err := ParseUnit(unit)
	if err != nil {
		return nil, "", false
	}
	v, err := LiteralValue(num, u)
	if err != nil {
		return nil, "", false
	}
	return Quantity{V: v, D: u.Dim, Cyc: u.Cyc}, unit, true
}

// Record re-evaluates the script in s and returns its text with every
// statement's result lines written anew (results with no statement are
// dropped). Each line keeps its line ending; new lines take the ending of
// their statement's last line. It returns an error, and no text, if any
// statement fails.
func (sc *Script) Record(s *Session) ([]byte, error) {
	results := make(map[int][]string, len(sc.Stmts))
	err := sc.evaluate(s, func(st ScriptStmt, res *Result) {
		if res.Record != "" {
			results[st.End] = append([]string{ResultMark + " " + res.Record}, moreLines(res)...)
		}
	})
	if err != nil {
		return nil, err
	}
	firstOf := make(map[int]int, len(sc.Stmts)) // last line -> first line
	for _, st := range sc.Stmts {
		firstOf[st.End] = st.Line
	}
	var b bytes.Buffer
	eol := func(i int) string {
		if sc.crlf[i] {
			return "\r\n"
		}
		return "\n"
	}
	for i, line := range sc.Lines {
		if isResultLineInBlock(sc, i) {
			continue // rewritten below its statement
		}
		b.WriteString(line)
		b.WriteString(eol(i))
		first := sc.Lines[firstOf[i]]
		indent := first[:len(first)-len(strings.TrimLeft(first, " \t"))]
		for _, r := range results[i] {
			b.WriteString(indent + r + eol(i))
		}
	}
	out := b.Bytes()
	if !sc.finalEOL && len(sc.Lines) > 0 {
		out = bytes.TrimSuffix(out, []byte(eol(len(sc.Lines)-1)))
	}
	if sc.bom {
		out = append([]byte(ByteOrderMark), out...)
	}
	return out, nil
}

// ExpandPaths turns a list of files and directories into script files:
// directories are searched recursively for *.lw files, in name order.
func ExpandPaths(args []string) ([]string, error) {
	var out []string
	for _, a := range args {
		fi, err := os.Stat(a)
		if err != nil {
			return nil, err
		}
		if !fi.IsDir() {
			out = append(out, a)
			continue
		}
		var found []string
		err = filepath.WalkDir(a, func(p string, d fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if !d.IsDir() && strings.HasSuffix(p, ScriptExt) {
				found = append(found, p)
			}
			return nil
		})
		if err != nil {
			return nil, err
		}
		if len(found) == 0 {
			return nil, fmt.Errorf("%s: no %s scripts in this directory", a, ScriptExt)
		}
		sort.Strings(found)
		out = append(out, found...)
	}
	return out, nil
}

// SessionScript writes a session's transcript as a script that replays.
func SessionScript(title string, entries []Entry) []byte {
	var b bytes.Buffer
	w := bufio.NewWriter(&b)
	fmt.Fprintf(w, "# %s\n\n```%s\n", title, FenceTag)
	for _, e := range entries {
		fmt.Fprintln(w, e.Line)
		if e.Record != "" {
			fmt.Fprintf(w, "%s %s\n", ResultMark, e.Record)
			for _, l := range e.MoreLines() {
				fmt.Fprintln(w, l)
			}
		}
	}
	fmt.Fprintln(w, "```")
	w.Flush()
	return b.Bytes()
}

// Write reports the drifts of a check of the script at path: each
// statement once (its FILE:LINE and text), then for each drift what moved,
// on which line, by how much relatively, and the recorded and new text. It
// ends with the count of drifted results, or "ok" when none drifted.
func (rep CheckReport) Write(w io.Writer, path string) {
	if len(rep.Drifts) == 0 {
		fmt.Fprintf(w, "%s: ok (%d statement%s)\n", path, rep.Statements, plural(rep.Statements))
		return
	}
	last := -1
	for _, d := range rep.Drifts {
		if d.StmtLine != last {
			fmt.Fprintf(w, "%s:%d: %s\n", path, d.StmtLine, strings.Join(strings.Fields(d.Stmt), " "))
			last = d.StmtLine
		}
		switch {
		case d.Why != "":
			fmt.Fprintf(w, "    %s (line %d): %s\n", d.What, d.Line, d.Why)
		default:
			fmt.Fprintf(w, "    %s (line %d) drifted%s\n", d.What, d.Line, relText(d.Rel))
		}
		if d.Recorded != "" {
			fmt.Fprintf(w, "    recorded: %s\n", d.Recorded)
		}
		if d.Now != "" {
			fmt.Fprintf(w, "    now:      %s\n", d.Now)
		}
	}
	fmt.Fprintf(w, "%s: %d of %d result%s drifted\n", path, rep.Drifted, rep.Results, plural(rep.Results))
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// relText shows a relative change as a signed percentage.
func relText(rel float64) string {
	switch {
	case math.IsNaN(rel):
		return ""
	case math.IsInf(rel, 0):
		return " from 0"
	}
	return fmt.Sprintf(" by %+.3g%%", 100*rel)
}

// Prose reports whether line i (0-based) is prose: outside every block of
// statements and not one of their fences.
func (sc *Script) Prose(i int) bool { return !sc.block[i] && !sc.fence[i] }

// Fence reports whether line i (0-based) opens or closes a block of
// statements.
func (sc *Script) Fence(i int) bool { return sc.fence[i] }

// numErrRE matches the numerical-error note a result may end with.
var numErrRE = regexp.MustCompile(` \(numerical error ≤ ([^ )]+)(?: ([^)]*))?\)$`)

// splitNumErr splits off a result's numerical-error note, returning the
// rest and the bound in SI units (0 when there is none).
func splitNumErr(text string) (string, float64) {
	m := numErrRE.FindStringSubmatchIndex(text)
	if m == nil {
		return text, 0
	}
	x, err := strconv.ParseFloat(text[m[2]:m[3]], 64)
	if err != nil {
		return text, 0
	}
	if m[4] >= 0 {
		u, err := ParseUnit(text[m[4]:m[5]])
		if err != nil {
			return text, 0
		}
		x *= u.Scale()
	}
	return text[:m[0]], x
}
