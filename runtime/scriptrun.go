package runtime

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"loopwise/lang"
)

// Running a script: evaluating its statements in order, printing or
// recording their results, and writing a session out as a script.

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

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}
