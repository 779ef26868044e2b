package runtime

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"loopwise/lang"
)

// A script is a Markdown file. Statements sit in fenced blocks whose info
// string is FenceTag:
//
//	```lw
//	gap = 4 mm
//	↳ 4 mm
//	```
//
// Each statement's recorded result is on the line after it, behind
// ResultMark. Everything outside those blocks is prose.
const (
	FenceTag   = "lw"
	ResultMark = "↳"
	// ScriptExt is the file extension of scripts found in directories.
	ScriptExt = ".lw"
	// CautionMark flags a safety caution in a script's printed output.
	CautionMark = "⚠"
)

// DefaultTolerance is the relative tolerance of a replay check.
const DefaultTolerance = 1e-9

// Script is a parsed script file.
type Script struct {
	Path  string
	Lines []string
	Stmts []ScriptStmt
	block []bool // line i lies inside a block of statements
	fence []bool // line i opens or closes a block of statements
}

// ScriptStmt is one statement line of a script.
type ScriptStmt struct {
	Line   int // 0-based index of the statement line
	Result int // 0-based index of its result line, or -1
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

func isResultLine(line string) bool {
	return strings.HasPrefix(strings.TrimSpace(line), ResultMark)
}

// fence reports whether line opens or closes a fenced block and its info
// string.
func fence(line string) (bool, string) {
	t := strings.TrimSpace(line)
	if !strings.HasPrefix(t, "```") {
		return false, ""
	}
	return true, strings.TrimSpace(strings.TrimLeft(t, "`"))
}

// ParseScript splits script text into prose and statements.
func ParseScript(path string, data []byte) (*Script, error) {
	text := strings.ReplaceAll(string(data), "\r\n", "\n")
	text = strings.TrimSuffix(text, "\n")
	sc := &Script{Path: path}
	if text != "" {
		sc.Lines = strings.Split(text, "\n")
	}
	inLW, inOther := false, false
	openLine := 0
	sc.block = make([]bool, len(sc.Lines))
	sc.fence = make([]bool, len(sc.Lines))
	for i, line := range sc.Lines {
		if ok, info := fence(line); ok {
			switch {
			case inLW:
				if info != "" {
					return nil, scriptErr(path, i, line, "a block of statements must be closed with ``` before another one opens")
				}
				inLW = false
				sc.fence[i] = true
			case inOther:
				inOther = false
			case info == FenceTag:
				inLW, openLine = true, i
				sc.fence[i] = true
			default:
				inOther = true
			}
			continue
		}
		if !inLW {
			continue
		}
		sc.block[i] = true
		if isResultLine(line) {
			n := len(sc.Stmts)
			if n > 0 && sc.Stmts[n-1].Line == i-1 && sc.Stmts[n-1].Result < 0 {
				sc.Stmts[n-1].Result = i
			}
			// a result line with no statement above it is left for
			// record to drop
			continue
		}
		if t := strings.TrimSpace(line); t == "" || strings.HasPrefix(t, "//") {
			continue // blank and comment lines are kept as they are
		}
		sc.Stmts = append(sc.Stmts, ScriptStmt{Line: i, Result: -1})
	}
	if inLW {
		return nil, scriptErr(path, openLine, sc.Lines[openLine], "this block of statements is never closed with ```")
	}
	return sc, nil
}

func scriptErr(path string, i int, line, msg string) error {
	return &lang.Error{Pos: lang.Pos{File: path, Line: i + 1, Col: 1}, Msg: msg, Source: line, Width: 3}
}

// statementText returns the statement line without leading indentation and
// the column where it starts.
func statementText(line string) (string, int) {
	t := strings.TrimLeft(line, " \t")
	return t, len([]rune(line)) - len([]rune(t)) + 1
}

// evalStmt evaluates one statement line of a script.
func (sc *Script) evalStmt(s *Session, st ScriptStmt) (*Result, error) {
	text, col := statementText(sc.Lines[st.Line])
	res, err := s.Eval(lang.Pos{File: sc.Path, Line: st.Line + 1, Col: col}, text)
	if errors.Is(err, ErrNotSessionCommand) {
		return nil, &lang.Error{Pos: lang.Pos{File: sc.Path, Line: st.Line + 1, Col: col},
			Msg:    fmt.Sprintf("the command :%s works only at the interactive prompt", res0(text)),
			Source: sc.Lines[st.Line], Width: len([]rune(strings.TrimSpace(text)))}
	}
	if le, ok := lang.AsError(err); ok && le.Source == text {
		le.Source = sc.Lines[st.Line]
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
	next := 0
	for i, line := range sc.Lines {
		if next < len(sc.Stmts) && sc.Stmts[next].Line == i {
			st := sc.Stmts[next]
			next++
			res, err := sc.evalStmt(s, st)
			if err != nil {
				return err
			}
			fmt.Fprintf(w, "    %s\n", strings.TrimLeft(line, " \t"))
			if res.Text != "" && res.Stmt.Kind != lang.Empty {
				fmt.Fprintf(w, "    %s %s\n", ResultMark, res.Text)
			}
			for _, n := range strings.Split(res.Note, "\n") {
				if strings.HasPrefix(n, "caution:") {
					fmt.Fprintf(w, "    %s %s\n", CautionMark, n)
				}
			}
			continue
		}
		switch {
		case sc.fence[i] || isResultLineInBlock(sc, i):
		case sc.block[i] && strings.TrimSpace(line) != "":
			fmt.Fprintf(w, "    %s\n", strings.TrimLeft(line, " \t")) // a comment line
		default:
			fmt.Fprintln(w, strings.TrimRight(line, " \t"))
		}
	}
	return nil
}

func isResultLineInBlock(sc *Script, i int) bool {
	return sc.block[i] && isResultLine(sc.Lines[i])
}

// Drift is one recorded result that no longer matches.
type Drift struct {
	Line     int // 1-based line number of the result (or statement) line
	Recorded string
	Now      string
	Why      string
}

// Check re-evaluates the script in s and compares every recorded result
// with relative tolerance tol. An error stops the check.
func (sc *Script) Check(s *Session, tol float64) ([]Drift, error) {
	var drifts []Drift
	for _, st := range sc.Stmts {
		res, err := sc.evalStmt(s, st)
		if err != nil {
			return drifts, err
		}
		if res.Record == "" {
			if st.Result >= 0 {
				drifts = append(drifts, Drift{Line: st.Result + 1, Recorded: sc.Recorded(st), Why: "this statement has no result now"})
			}
			continue
		}
		if st.Result < 0 {
			drifts = append(drifts, Drift{Line: st.Line + 1, Now: res.Record, Why: "no result is recorded for this statement"})
			continue
		}
		rec := sc.Recorded(st)
		if ok, now := Matches(rec, res.Value, res.Record, tol); !ok {
			drifts = append(drifts, Drift{Line: st.Result + 1, Recorded: rec, Now: now})
		}
	}
	return drifts, nil
}

// Matches compares a recorded result text with a value now. Quantities and
// vectors written as "number unit" are compared numerically with relative
// tolerance tol (|a-b| <= tol*max(|a|,|b|)); anything else is compared as
// text. now is the value shown in the recorded unit when that is possible.
func Matches(recorded string, v Value, nowText string, tol float64) (bool, string) {
	if recorded == nowText {
		return true, nowText
	}
	rv, unit, ok := parseRecorded(recorded)
	if !ok {
		return false, nowText
	}
	now := nowText
	if unit != "" {
		if t, err := FormatIn(v, unit, RecordDigits); err == nil {
			now = t
		}
	}
	switch x := v.(type) {
	case Quantity:
		r, ok := rv.(Quantity)
		if !ok || r.D != x.D {
			return false, now
		}
		return closeEnough(r.V, x.V, math.Max(math.Abs(r.V), math.Abs(x.V)), tol), now
	case Vector:
		r, ok := rv.(Vector)
		if !ok || r.D != x.D {
			return false, now
		}
		scale := math.Max(r.Norm().V, x.Norm().V)
		for i := range 3 {
			if !closeEnough(r.V[i], x.V[i], scale, tol) {
				return false, now
			}
		}
		return true, now
	}
	return false, now
}

func closeEnough(a, b, scale, tol float64) bool {
	return math.Abs(a-b) <= tol*scale
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
// statement's result line written anew (results with no statement are
// dropped). It returns an error, and no text, if any statement fails.
func (sc *Script) Record(s *Session) ([]byte, error) {
	results := make(map[int]string, len(sc.Stmts))
	for _, st := range sc.Stmts {
		res, err := sc.evalStmt(s, st)
		if err != nil {
			return nil, err
		}
		if res.Record != "" {
			results[st.Line] = res.Record
		}
	}
	var b bytes.Buffer
	for i, line := range sc.Lines {
		if isResultLineInBlock(sc, i) {
			continue // rewritten below its statement
		}
		b.WriteString(line)
		b.WriteByte('\n')
		if r, ok := results[i]; ok {
			indent := line[:len(line)-len(strings.TrimLeft(line, " \t"))]
			fmt.Fprintf(&b, "%s%s %s\n", indent, ResultMark, r)
		}
	}
	return b.Bytes(), nil
}

// WriteFileAtomic writes data to path through a temporary file in the same
// directory and a rename, so the file is either old or new, never half.
func WriteFileAtomic(path string, data []byte) error {
	dir := filepath.Dir(path)
	mode := fs.FileMode(0o644)
	if fi, err := os.Stat(path); err == nil {
		mode = fi.Mode().Perm()
	}
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	cerr := tmp.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(name, mode)
	}
	if werr == nil {
		werr = os.Rename(name, path)
	}
	if werr != nil {
		os.Remove(name)
	}
	return werr
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
		}
	}
	fmt.Fprintln(w, "```")
	w.Flush()
	return b.Bytes()
}
