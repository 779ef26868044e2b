package runtime_test

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func stdSession() *runtime.Session { return runtime.NewSession(builtins.Standard()) }

func parse(t *testing.T, text string) *runtime.Script {
	t.Helper()
	sc, err := runtime.ParseScript("t.lw", []byte(text))
	if err != nil {
		t.Fatalf("ParseScript: %v", err)
	}
	return sc
}

// stmtLines lists the 1-based first line of every statement found.
func stmtLines(sc *runtime.Script) []int {
	var out []int
	for _, st := range sc.Stmts {
		out = append(out, st.Line+1)
	}
	return out
}

// TestFences pins which fences open and close a block of statements. The
// rules are CommonMark's (CommonMark Spec 0.31.2, 2024, section 4.5 "Fenced
// code blocks"): a fence is three or more backticks or tildes indented by at
// most three spaces; the closing fence uses the same character, is at least
// as long and has no info string; the first word of the info string names
// the language; an unclosed block runs to the end of the document.
func TestFences(t *testing.T) {
	tests := []struct {
		name string
		text string
		want []int // lines of the statements found
	}{
		{"backticks", "```lw\na = 1\n```\n", []int{2}},
		{"tildes", "~~~lw\na = 1\n~~~\n", []int{2}},
		{"space before the tag", "``` lw\na = 1\n```\n", []int{2}},
		{"attributes after the tag", "```lw title=coil\na = 1\n```\n", []int{2}},
		{"four tildes and a space", "~~~~ lw\na = 1\n~~~~\n", []int{2}},
		{"longer closing fence", "```lw\na = 1\n`````\n", []int{2}},
		{"indented by three spaces", "   ```lw\na = 1\n   ```\n", []int{2}},
		{"indented by four spaces is not a fence", "    ```lw\na = 1\n    ```\n", nil},
		{"another tag", "```lwx\na = 1\n```\n```python\nb = 2\n```\n", nil},
		{"tag must come first", "```text lw\na = 1\n```\n", nil},
		{"two backticks are not a fence", "``lw\na = 1\n``\n", nil},
		{"backtick info string may not hold a backtick", "```lw`\na = 1\n```\n", nil},
		// Inside a block of another language, a shorter fence or one of
		// the other character does not close it, so the lw fence inside
		// is text; the statement after the real close is found.
		{"shorter fence inside", "````markdown\n```lw\na = 1\n```\n````\n```lw\nb = 2\n```\n", []int{7}},
		{"other character inside", "~~~text\n```\n```lw\na = 1\n~~~\n```lw\nb = 2\n```\n", []int{7}},
		{"closing fence with info opens nothing", "```text\nx\n```lw\n```\n```lw\nb = 2\n```\n", []int{6}},
		{"unclosed block of another language runs to the end", "```lw\na = 1\n```\n```text\n```lw\nb = 2\n```\n", []int{2}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sc := parse(t, tc.text)
			if got := stmtLines(sc); !equalInts(got, tc.want) {
				t.Errorf("statements on lines %v, want %v", got, tc.want)
			}
		})
	}
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestFenceErrors: a block of statements must be closed (stricter than
// CommonMark, where it would run to the end of the file and show the rest
// as code), and a fence inside it that does not close it is reported rather
// than read as a statement.
func TestFenceErrors(t *testing.T) {
	tests := []struct{ name, text, want string }{
		{"never closed", "# x\n\n```lw\na = 1\n",
			"t.lw:3:1: this block of statements is never closed with ```\n    ```lw\n    ^^^"},
		{"never closed, tildes", "~~~~ lw\na = 1\n~~~\n",
			"t.lw:3:1: ~~~ does not close the block opened with ~~~~ at line 1: close it with ~~~~ (the same character, at least as many, nothing after it)\n    ~~~\n    ^^^"},
		{"other character", "~~~lw\na = 1\n```\n~~~\n",
			"t.lw:3:1: ``` does not close the block opened with ~~~ at line 1: close it with ~~~ (the same character, at least as many, nothing after it)\n    ```\n    ^^^"},
		{"another block opens", "```lw\na = 1\n```lw\nb = 2\n```\n",
			"t.lw:3:1: a block of statements must be closed with ``` before another one opens\n    ```lw\n    ^^^"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := runtime.ParseScript("t.lw", []byte(tc.text))
			var le *lang.Error
			if !errors.As(err, &le) {
				t.Fatalf("got %v, want a *lang.Error", err)
			}
			if le.Error() != tc.want {
				t.Errorf("got\n%s\nwant\n%s", le.Error(), tc.want)
			}
		})
	}
}

// TestNoStatements: a script in which no statement was found is refused by
// Run, Check and Record, with a message that shows how to write a block.
func TestNoStatements(t *testing.T) {
	for _, text := range []string{
		"",
		"# Only prose\n\nNothing to run.\n",
		"```lw\n// a comment only\n\n```\n",
		"```python\nx = 1\n```\n",
	} {
		sc := parse(t, text)
		var none *runtime.NoStatementsError
		if err := sc.Run(stdSession(), new(bytes.Buffer)); !errors.As(err, &none) {
			t.Errorf("Run(%q): got %v, want a NoStatementsError", text, err)
		}
		if _, err := sc.Check(stdSession(), 1e-9); !errors.As(err, &none) {
			t.Errorf("Check(%q): got %v, want a NoStatementsError", text, err)
		}
		_, err := sc.Record(stdSession())
		if !errors.As(err, &none) {
			t.Errorf("Record(%q): got %v, want a NoStatementsError", text, err)
			continue
		}
		if msg := err.Error(); !strings.Contains(msg, "    ```lw\n    gap = 4 mm\n    ```") {
			t.Errorf("the message does not show a block:\n%s", msg)
		}
	}
	sc := parse(t, "# x\n\n````text\n```lw\na = 1\n```\n")
	_, err := sc.Check(stdSession(), 1e-9)
	if err == nil || !strings.Contains(err.Error(), "The code block opened at line 3 is never closed") {
		t.Errorf("an unclosed block that hides statements is not named: %v", err)
	}
}

func record(t *testing.T, text string) string {
	t.Helper()
	out, err := parse(t, text).Record(stdSession())
	if err != nil {
		t.Fatalf("Record: %v", err)
	}
	return string(out)
}

func check(t *testing.T, text string, tol float64) runtime.CheckReport {
	t.Helper()
	rep, err := parse(t, text).Check(stdSession(), tol)
	if err != nil {
		t.Fatalf("Check: %v", err)
	}
	return rep
}

func report(rep runtime.CheckReport) string {
	var b strings.Builder
	rep.Write(&b, "t.lw")
	return b.String()
}

// TestTableRecorded: a table's rows are recorded under its result, and
// every cell is checked. The values are f(x) = 2 A · x at x = 0, 0.25, 0.5,
// 0.75, 1 m: exact binary fractions, so they print exactly (by hand).
func TestTableRecorded(t *testing.T) {
	src := "```lw\nk = 2 A\nf(x) = k * x\nsweep(f, 0 m, 1 m, 5)\n```\n"
	want := "```lw\nk = 2 A\n↳ 2 A\nf(x) = k * x\n↳ defined f(x)\nsweep(f, 0 m, 1 m, 5)\n" +
		"↳ table of 5 rows: x [m], f [A*m]\n" +
		"│ x [m]  f [A*m]\n" +
		"│     0        0\n" +
		"│  0.25      0.5\n" +
		"│   0.5        1\n" +
		"│  0.75      1.5\n" +
		"│     1        2\n" +
		"```\n"
	got := record(t, src)
	if got != want {
		t.Fatalf("recorded\n%s\nwant\n%s", got, want)
	}
	if rep := check(t, got, 1e-9); len(rep.Drifts) != 0 {
		t.Fatalf("a freshly recorded table drifts:\n%s", report(rep))
	}
	// One changed cell is drift, named by row and column.
	edited := strings.Replace(got, "│   0.5        1\n", "│   0.5   1.0001\n", 1)
	rep := check(t, edited, 1e-9)
	if len(rep.Drifts) != 1 || rep.Drifts[0].What != "row 3, f [A*m]" || rep.Drifts[0].Line != 11 {
		t.Fatalf("one changed cell:\n%s", report(rep))
	}
	if d := rep.Drifts[0]; d.Recorded != "1.0001 A*m" || d.Now != "1 A*m" || math.Abs(d.Rel+1e-4/1.0001) > 1e-12 {
		t.Errorf("drift %+v", d)
	}
	// ... unless within the tolerance: 1e-4 relative passes at 1e-3.
	if rep := check(t, edited, 1e-3); len(rep.Drifts) != 0 {
		t.Errorf("a cell within tolerance drifts:\n%s", report(rep))
	}
	// The same value written in another unit of the same dimension matches.
	other := strings.Replace(got, "│ x [m]  f [A*m]\n│     0        0\n│  0.25      0.5\n│   0.5        1\n│  0.75      1.5\n│     1        2\n",
		"│ x [mm]  f [A*m]\n│     0        0\n│   250      0.5\n│   500        1\n│   750      1.5\n│  1000        2\n", 1)
	if rep := check(t, other, 1e-9); len(rep.Drifts) != 0 {
		t.Errorf("a column in mm drifts:\n%s", report(rep))
	}
	// A missing row is drift.
	short := strings.Replace(got, "│     1        2\n", "", 1)
	if rep := check(t, short, 1e-9); len(rep.Drifts) != 1 || rep.Drifts[0].What != "table rows" {
		t.Errorf("a missing row:\n%s", report(rep))
	}
	// Rows that are not recorded at all are drift too.
	bare := strings.Split(got, "│")[0]
	bare = bare[:strings.LastIndex(bare, "\n")+1] + "```\n"
	if rep := check(t, bare, 1e-9); len(rep.Drifts) != 1 || rep.Drifts[0].Why != "the table's rows are not recorded" {
		t.Errorf("rows not recorded:\n%s", report(rep))
	}
}

// TestLongTableRecordsStatistics: beyond RecordRows rows a table records
// column statistics. For f(x) = x on 0..300 m in 301 steps (by hand): first
// 0, last 300, min 0, max 300, mean 150, rms sqrt(Σk²/301) = sqrt(300·601/6)
// = sqrt(30050) = 173.349358234 m.
func TestLongTableRecordsStatistics(t *testing.T) {
	if runtime.RecordRows >= 301 {
		t.Fatalf("RecordRows is %d; this test needs a longer table", runtime.RecordRows)
	}
	src := "```lw\nf(x) = x\nsweep(f, 0 m, 300 m, 301)\n```\n"
	got := record(t, src)
	want := "│ stat           x [m]          f [m]\n" +
		"│ first              0              0\n" +
		"│ last             300            300\n" +
		"│ min                0              0\n" +
		"│ max              300            300\n" +
		"│ mean             150            150\n" +
		"│ rms    173.349358234  173.349358234\n"
	if !strings.Contains(got, "↳ table of 301 rows: x [m], f [m]\n"+want) {
		t.Fatalf("recorded\n%s\nwant the statistics\n%s", got, want)
	}
	if rep := check(t, got, 1e-9); len(rep.Drifts) != 0 {
		t.Fatalf("freshly recorded statistics drift:\n%s", report(rep))
	}
	changed := strings.Replace(got, "300 m, 301)", "300 m, 302)", 1)
	if rep := check(t, changed, 1e-9); len(rep.Drifts) == 0 {
		t.Errorf("a table of 302 rows matches the statistics of 301")
	}
}

// TestNumbersInText: results that are text with numbers (summaries of
// paths, assessments) compare their numbers with the tolerance and their
// words exactly.
func TestNumbersInText(t *testing.T) {
	rec := "path: 1 circle, length 62.8318530718 mm, closed"
	tests := []struct {
		now  string
		tol  float64
		want bool
	}{
		{"path: 1 circle, length 62.8318530718 mm, closed", 1e-9, true},
		{"path: 1 circle, length 62.8318530719 mm, closed", 1e-9, true}, // 1.6e-12 relative
		{"path: 1 circle, length 62.84 mm, closed", 1e-9, false},
		{"path: 1 circle, length 62.84 mm, closed", 1e-3, true}, // 1.3e-4 relative
		{"path: 1 circle, length 62.8318530718 mm, open", 1e-9, false},
		{"path: 2 circles, length 62.8318530718 mm, closed", 0.9, false}, // words differ
		{"path: 1 circle, length 62.8318530718 mm, 2 closed loops", 1e-9, false},
	}
	for _, tc := range tests {
		ok, _, _ := runtime.Matches(rec, nil, tc.now, tc.tol)
		if ok != tc.want {
			t.Errorf("Matches(%q, %q, tol %g) = %v, want %v", rec, tc.now, tc.tol, ok, tc.want)
		}
	}
	_, _, rel := runtime.Matches("ratio 2 of limit 10", nil, "ratio 2.5 of limit 10", 1e-9)
	if rel != 0.25 {
		t.Errorf("relative change %g, want 0.25", rel)
	}
}

const caution230 = "caution: 230 V is above extra-low voltage (50 V AC rms, 120 V ripple-free DC; IEC 61140 and IEC 60364-4-41, from memory). Treat it as hazardous: follow local electrical codes, exposure rules and licensed practice."

// TestCautionsRecorded: a caution is recorded beside its result and is
// checked: one that appears or disappears is drift.
func TestCautionsRecorded(t *testing.T) {
	got := record(t, "```lw\nV = 230 V\nV / 10\n```\n")
	want := "```lw\nV = 230 V\n↳ 230 V\n↳ ⚠ " + caution230 + "\nV / 10\n↳ 23 V\n```\n"
	if got != want {
		t.Fatalf("recorded\n%s\nwant\n%s", got, want)
	}
	if rep := check(t, got, 1e-9); len(rep.Drifts) != 0 {
		t.Fatalf("recorded cautions drift:\n%s", report(rep))
	}
	appeared := strings.Replace(got, "↳ ⚠ "+caution230+"\n", "", 1)
	rep := check(t, appeared, 1e-9)
	if len(rep.Drifts) != 1 || rep.Drifts[0].Why != "a caution appeared" || rep.Drifts[0].Now != caution230 {
		t.Errorf("a caution that appeared:\n%s", report(rep))
	}
	gone := strings.Replace(got, "V = 230 V\n↳ 230 V", "V = 23 V\n↳ 23 V", 1)
	gone = strings.Replace(gone, "↳ 23 V\n```", "↳ 2.3 V\n```", 1)
	rep = check(t, gone, 1e-9)
	if len(rep.Drifts) != 1 || rep.Drifts[0].Why != "a caution disappeared" || rep.Drifts[0].Line != 4 {
		t.Errorf("a caution that disappeared:\n%s", report(rep))
	}
	// The numbers in a caution compare with the tolerance too.
	moved := strings.Replace(got, "↳ ⚠ caution: 230 V", "↳ ⚠ caution: 231 V", 1)
	if rep := check(t, moved, 1e-9); len(rep.Drifts) != 1 || rep.Drifts[0].What != "caution" {
		t.Errorf("a caution's number moved:\n%s", report(rep))
	}
	if rep := check(t, moved, 1e-2); len(rep.Drifts) != 0 {
		t.Errorf("a caution's number within 1e-2:\n%s", report(rep))
	}
}

// TestDriftReport pins the whole report: statement and its line, the part
// that drifted with its line and relative change, recorded and new text,
// and the count.
func TestDriftReport(t *testing.T) {
	text := "# x\n\n```lw\na = 2 m\n↳ 2 m\nb = [a,\n     3 m, 0 m]\n↳ [2, 3, 0] m\np = a * 3\n↳ 6.3 m\nq = a\n```\n"
	got := report(check(t, text, 1e-9))
	want := "t.lw:9: p = a * 3\n" +
		"    result (line 10) drifted by -4.76%\n" +
		"    recorded: 6.3 m\n" +
		"    now:      6 m\n" +
		"t.lw:11: q = a\n" +
		"    result (line 11): no result is recorded for this statement\n" +
		"    now:      2 m\n" +
		"t.lw: 2 of 4 results drifted\n"
	if got != want {
		t.Errorf("report\n%s\nwant\n%s", got, want)
	}
}

// TestContinuedStatements: a statement continues while a bracket is open;
// its result follows its last line; errors point at the right line.
func TestContinuedStatements(t *testing.T) {
	src := "```lw\n  v = [1 m,   // x\n       2 m,\n       3 m]\nnorm = sqrt(\n  v.x^2 + v.y^2 + v.z^2)\n```\n"
	want := "```lw\n  v = [1 m,   // x\n       2 m,\n       3 m]\n  ↳ [1, 2, 3] m\nnorm = sqrt(\n  v.x^2 + v.y^2 + v.z^2)\n↳ 3.74165738677 m\n```\n"
	got := record(t, src)
	if got != want {
		t.Fatalf("recorded\n%s\nwant\n%s", got, want)
	}
	if rep := check(t, got, 1e-9); len(rep.Drifts) != 0 || rep.Results != 2 {
		t.Fatalf("continued statements drift:\n%s", report(rep))
	}
	var out bytes.Buffer
	if err := parse(t, got).Run(stdSession(), &out); err != nil {
		t.Fatal(err)
	}
	wantRun := "    v = [1 m,   // x\n         2 m,\n         3 m]\n    ↳ [1, 2, 3] m\n    norm = sqrt(\n      v.x^2 + v.y^2 + v.z^2)\n    ↳ 3.74166 m\n"
	if out.String() != wantRun {
		t.Errorf("run printed\n%s\nwant\n%s", out.String(), wantRun)
	}
	// An error on a continuation line points at it, with its own source line.
	bad := "```lw\nx = [1 m,\n     2 m + 1 s,\n     3 m]\n```\n"
	_, err := parse(t, bad).Record(stdSession())
	var le *lang.Error
	if !errors.As(err, &le) {
		t.Fatalf("got %v, want a *lang.Error", err)
	}
	wantErr := "t.lw:3:10: cannot add length (m) and time (s)\n         2 m + 1 s,\n             ^"
	if err.Error() != wantErr {
		t.Errorf("got\n%v\nwant\n%s", err, wantErr)
	}
	// A bracket never closed before the block ends is reported at the bracket.
	_, err = parse(t, "```lw\na = 1 m\nx = (a +\n  2 m\n```\n").Record(stdSession())
	wantErr = "t.lw:3:5: parenthesis '(' is never closed\n    x = (a +\n        ^"
	if err == nil || err.Error() != wantErr {
		t.Errorf("got\n%v\nwant\n%s", err, wantErr)
	}
}

// TestSessionScriptContinued: a session saved as a script writes continued
// statements and tables back so that they check.
func TestSessionScriptContinued(t *testing.T) {
	s := stdSession()
	for _, line := range []string{"v = [1 m,\n  2 m, 3 m]", "f(x) = 2 * x", "sweep(f,\n  0 m, 1 m, 3)", "V = 230 V"} {
		if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line); err != nil {
			t.Fatal(err)
		}
	}
	data := runtime.SessionScript("saved", s.Transcript)
	sc, err := runtime.ParseScript("saved.lw", data)
	if err != nil {
		t.Fatal(err)
	}
	rep, err := sc.Check(stdSession(), 1e-9)
	if err != nil || len(rep.Drifts) != 0 || rep.Results != 4 {
		t.Errorf("saved session does not check (%v):\n%s\n%s", err, report(rep), data)
	}
}

// TestRecordKeepsLineEndings: CR LF stays CR LF, on new lines too, and a
// file without a final newline keeps that.
func TestRecordKeepsLineEndings(t *testing.T) {
	src := "# x\r\n\r\n```lw\r\na = 2 m\r\nb = [a,\r\n  a, a]\r\n↳ old\r\n```\r\n"
	want := "# x\r\n\r\n```lw\r\na = 2 m\r\n↳ 2 m\r\nb = [a,\r\n  a, a]\r\n↳ [2, 2, 2] m\r\n```\r\n"
	if got := record(t, src); got != want {
		t.Errorf("recorded %q\nwant     %q", got, want)
	}
	src = "```lw\na = 2 m\n```"
	if got := record(t, src); got != "```lw\na = 2 m\n↳ 2 m\n```" {
		t.Errorf("without a final newline: %q", got)
	}
}

// TestWriteFileAtomicKeepsModeAndLinks: permissions stay, and a symbolic
// link stays a link whose target gets the new text.
func TestWriteFileAtomicKeepsModeAndLinks(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "a.lw")
	if err := os.WriteFile(path, []byte("old"), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(path, 0o640); err != nil {
		t.Fatal(err)
	}
	if err := runtime.WriteFileAtomic(path, []byte("new")); err != nil {
		t.Fatal(err)
	}
	fi, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if fi.Mode().Perm() != 0o640 {
		t.Errorf("mode %v, want 0640", fi.Mode().Perm())
	}
	sub := filepath.Join(dir, "sub")
	if err := os.Mkdir(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(sub, "link.lw")
	if err := os.Symlink(filepath.Join("..", "a.lw"), link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	if err := runtime.WriteFileAtomic(link, []byte("newer")); err != nil {
		t.Fatal(err)
	}
	li, err := os.Lstat(link)
	if err != nil || li.Mode()&os.ModeSymlink == 0 {
		t.Fatalf("the link is no longer a link (%v)", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "newer" {
		t.Errorf("target holds %q, want the new text", b)
	}
	if fi, _ := os.Stat(path); fi.Mode().Perm() != 0o640 {
		t.Errorf("target mode %v after a write through the link, want 0640", fi.Mode().Perm())
	}
	if ents, _ := os.ReadDir(sub); len(ents) != 1 {
		t.Errorf("the link's directory holds %d entries, want the link alone", len(ents))
	}
}

// FuzzScript reads any text as a script, runs it, checks it against what
// it records and records it. It fails on a panic, on a run past the hang
// guard, on an error that is neither a positioned *lang.Error on a line of
// the file (without internal names) nor a NoStatementsError, on "<nil>",
// NaN, an infinity or an internal name in what a run shows or a record
// writes, and on a freshly recorded script that does not read back or does
// not check clean.
func FuzzScript(f *testing.F) {
	f.Add("```lw\na = 2 m\n```\n")
	f.Add("~~~~ lw\nf(x) = 2 A * x\nsweep(f, 0 m, 1 m, 3)\n~~~~\n")
	f.Add("```lw\nV = 230 V\nv = [1 m,\n 2 m, 3 m]\n```")
	f.Add("# x\r\n```lw\r\na = (1 m +\r\n  2 m)\r\n↳ 3 m\r\n│ x\r\n```\r\n")
	f.Add(runtime.ByteOrderMark + "```lw\nx = 5 mm^1e9\ny = 0A^0A\n```\n")
	f.Add("```lw\nloop = circle([0,0,0] m, [0,0,1], 1 cm)\nb_at(source(loop, 1 A), [0,0,0] m)\n↳ 1 T\n```\n")
	f.Add("text\n  ```lw extra\n  x: mm = 2 m\n  x\n  ```\n```lw\n:digits 3\n```\n")
	f.Fuzz(func(t *testing.T, text string) {
		lines := strings.Split(text, "\n")
		okErr := func(what string, err error) {
			t.Helper()
			var none *runtime.NoStatementsError
			if err == nil || errors.As(err, &none) {
				return
			}
			checkError(t, what, text, err, "t.lw", 1, len(lines), lines)
		}
		clean := func(what, out string) {
			t.Helper()
			for _, l := range strings.Split(out, "\n") {
				if strings.Contains(text, l) {
					continue // the script's own text
				}
				if m := nonFiniteRe.FindString(l); m != "" {
					t.Fatalf("%s(%q) shows %q: %q", what, text, m, l)
				}
				if bad := internalName(text, l); bad != "" {
					t.Fatalf("%s(%q) shows internal text %q: %q", what, text, bad, l)
				}
			}
		}
		bounded := func(what string, s *runtime.Session, work func()) {
			t.Helper()
			done := make(chan struct{})
			go func() { work(); close(done) }()
			select {
			case <-done:
			case <-time.After(hangLimit):
				s.Interrupt()
				t.Fatalf("%s(%.200q… %d bytes) still running after %v", what, text, len(text), hangLimit)
			}
		}
		sc, err := runtime.ParseScript("t.lw", []byte(text))
		if err != nil {
			okErr("ParseScript", err)
			return
		}
		var out strings.Builder
		s := stdSession()
		bounded("Run", s, func() { err = sc.Run(s, &out) })
		okErr("Run", err)
		clean("Run", out.String())
		s = stdSession()
		bounded("Check", s, func() { _, err = sc.Check(s, 1e-9) })
		okErr("Check", err)
		var rec []byte
		s = stdSession()
		bounded("Record", s, func() { rec, err = sc.Record(s) })
		if err != nil {
			okErr("Record", err)
			return
		}
		clean("Record", string(rec))
		again, err := runtime.ParseScript("t.lw", rec)
		if err != nil {
			t.Fatalf("recorded text of %q does not parse: %v\n%s", text, err, rec)
		}
		var rep runtime.CheckReport
		s = stdSession()
		bounded("Check", s, func() { rep, err = again.Check(s, 1e-9) })
		if err != nil || len(rep.Drifts) != 0 {
			t.Fatalf("recorded text of %q does not check clean (%v):\n%s\n%s", text, err, report(rep), rec)
		}
	})
}

// TestTableNoiseCells: a cell below 1e-10 of its column's largest magnitude
// is written as 0 (rounding noise, as for vector components). Here g(1 m) =
// 1 m − 1 m·(1 − 1e-12) ≈ 1e-12 m against 1 m at g(0).
func TestTableNoiseCells(t *testing.T) {
	got := record(t, "```lw\ng(x) = 1 m - x * (1 - 1e-12)\nsweep(g, 0 m, 1 m, 2)\n```\n")
	want := "│ x [m]  g [m]\n│     0      1\n│     1      0\n"
	if !strings.Contains(got, want) {
		t.Fatalf("recorded\n%s\nwant the rows\n%s", got, want)
	}
	if rep := check(t, got, 1e-9); len(rep.Drifts) != 0 {
		t.Errorf("noise cells drift:\n%s", report(rep))
	}
}

// TestEvaluate: every statement comes back with its result and its drifts;
// the first error stops the evaluation at its statement, whose error names
// its line, and the statements after it are not evaluated.
func TestEvaluate(t *testing.T) {
	text := "# x\n\n```lw\na = 2 m\n↳ 2 m\np = a * 3\n↳ 6.3 m\nq = a / nosuch\nr = 1\n↳ 1\n```\n"
	sc := parse(t, text)
	res, err := sc.Evaluate(stdSession(), 1e-9)
	if err == nil || !strings.Contains(err.Error(), "t.lw:8:") {
		t.Fatalf("error %v, want one at t.lw:8", err)
	}
	if len(res) != 4 {
		t.Fatalf("%d results, want 4", len(res))
	}
	if r := res[0]; r.Result == nil || r.Result.Record != "2 m" || r.Recorded != "2 m" || len(r.Drifts) != 0 {
		t.Errorf("first statement: %+v", r)
	}
	if r := res[1]; r.Result == nil || r.Result.Record != "6 m" || len(r.Drifts) != 1 || r.Drifts[0].Recorded != "6.3 m" {
		t.Errorf("second statement: %+v", r)
	}
	if r := res[2]; r.Err != err || r.Result != nil || !r.Evaluated() {
		t.Errorf("third statement: %+v", r)
	}
	if r := res[3]; r.Evaluated() || r.Recorded != "1" {
		t.Errorf("fourth statement: %+v", r)
	}
	rep := sc.Report(res)
	if rep.Drifted != 1 || rep.Results != 2 || rep.Statements != 4 {
		t.Errorf("report %+v", rep)
	}
}
