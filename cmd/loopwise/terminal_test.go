//go:build unix

package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/creack/pty"
)

// hangGuard bounds every wait on the terminal. It only keeps a broken
// prompt from hanging the test; nothing here measures speed.
const hangGuard = 30 * time.Second

// ptyTerm is the command running on a pseudo-terminal, as a person sees it.
type ptyTerm struct {
	t    *testing.T
	cmd  *exec.Cmd
	pty  *os.File
	mu   sync.Mutex
	out  bytes.Buffer // everything the terminal showed, escapes removed at match time
	seen int          // offset in the cleaned output up to which expect has matched
	done chan struct{}
}

// startTerm starts the prompt on a new pseudo-terminal, its state kept in
// state and its work directory dir.
func startTerm(t *testing.T, state, dir string) *ptyTerm {
	t.Helper()
	cmd := exec.Command(os.Args[0])
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), runMainEnv+"=1", stateDirEnv+"="+state, "TERM=xterm", "HOME="+filepath.Join(dir, "home"))
	f, err := pty.StartWithSize(cmd, &pty.Winsize{Rows: 50, Cols: 220})
	if err != nil {
		t.Skip("no pseudo-terminal here:", err)
	}
	tm := &ptyTerm{t: t, cmd: cmd, pty: f, done: make(chan struct{})}
	go func() {
		buf := make([]byte, 4096)
		for {
			n, err := f.Read(buf)
			tm.mu.Lock()
			tm.out.Write(buf[:n])
			tm.mu.Unlock()
			if err != nil {
				close(tm.done)
				return
			}
		}
	}()
	t.Cleanup(func() {
		cmd.Process.Kill()
		cmd.Wait()
		f.Close()
	})
	return tm
}

var escapes = regexp.MustCompile(`\x1b\[[0-9;?]*[A-Za-z]|\r`)

func (tm *ptyTerm) text() string {
	tm.mu.Lock()
	defer tm.mu.Unlock()
	return escapes.ReplaceAllString(tm.out.String(), "")
}

// expect waits until the terminal shows text matching re after what was
// matched before, and returns the match.
func (tm *ptyTerm) expect(re string) string {
	tm.t.Helper()
	rx := regexp.MustCompile(re)
	deadline := time.Now().Add(hangGuard)
	for {
		all := tm.text()
		if loc := rx.FindStringIndex(all[tm.seen:]); loc != nil {
			m := all[tm.seen+loc[0] : tm.seen+loc[1]]
			tm.seen += loc[1]
			return m
		}
		if time.Now().After(deadline) {
			tm.t.Fatalf("the terminal did not show %q within %v; after the last match it shows:\n%s", re, hangGuard, all[tm.seen:])
		}
		time.Sleep(20 * time.Millisecond)
	}
}

func (tm *ptyTerm) send(s string) {
	tm.t.Helper()
	if _, err := io.WriteString(tm.pty, s); err != nil {
		tm.t.Fatal(err)
	}
}

// exitCode waits for the command to end.
func (tm *ptyTerm) exitCode() int {
	tm.t.Helper()
	ch := make(chan error, 1)
	go func() { ch <- tm.cmd.Wait() }()
	select {
	case err := <-ch:
		if ee, ok := err.(*exec.ExitError); ok {
			return ee.ExitCode()
		}
		if err != nil {
			tm.t.Fatal(err)
		}
		return 0
	case <-time.After(hangGuard):
		tm.t.Fatalf("the prompt did not end within %v", hangGuard)
	}
	return -1
}

func journals(t *testing.T, state string) []string {
	t.Helper()
	m, err := filepath.Glob(filepath.Join(state, journalPrefix+"*"+journalExt))
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestPromptInTerminal drives the prompt through a real terminal: define,
// compute, an error, Ctrl-C during a long computation, the session intact
// afterwards, Ctrl-C on a half-typed line, :save and its refusal to replace
// a file, and Ctrl-D. The history holds each line and the journal is gone
// after the clean exit.
func TestPromptInTerminal(t *testing.T) {
	dir, state := t.TempDir(), t.TempDir()
	tm := startTerm(t, state, dir)
	tm.expect(`Loopwise — induction calculations`)
	tm.expect(`lw> `)

	tm.send("gap = 4 mm\r")
	tm.expect(`gap = 4 mm\n`)
	tm.send("face = gap * 2 mm\r")
	tm.expect(`face = 8 mm\^2\n`)
	tm.send("bad = gap + 1 A\r")
	tm.expect(`\d+:11: cannot add length \(m\) and electric current \(A\)`)
	// fib(40) makes about 3e8 calls: minutes of work, stopped by Ctrl-C.
	tm.send("fib(n) = n < 2 ? n : fib(n-1) + fib(n-2)\r")
	tm.expect(`lw> `)
	tm.send("face = fib(40) * 1 mm^2\r")
	tm.expect(`face = fib\(40\) \* 1 mm\^2\n`) // the echo: the statement runs
	time.Sleep(300 * time.Millisecond)
	tm.send("\x03")
	tm.expect(`interrupted; nothing was changed`)
	tm.expect(`lw> `)
	tm.send("face\r")
	tm.expect(`\n8 mm\^2\n`)
	tm.send("half typed")
	tm.expect(`half typed`)
	tm.send("\x03") // at the prompt Ctrl-C clears the line
	tm.expect(`lw> `)
	tm.send("gap\r")
	tm.expect(`\n4 mm\n`)

	tm.send(":save work\r")
	tm.expect(`saved 5 statements to work.lw\n`)
	tm.send(":save work\r")
	tm.expect(`cannot save: work.lw exists; :save! work.lw replaces it`)
	tm.send("gap2 = 2 * gap\r")
	tm.expect(`gap2 = 8 mm`)
	tm.send(":save! work\r")
	tm.expect(`saved 6 statements to work.lw\n`)
	if len(journals(t, state)) != 1 {
		t.Errorf("journals while the prompt runs: %v, want one", journals(t, state))
	}
	tm.send("\x04")
	if code := tm.exitCode(); code != 0 {
		t.Errorf("Ctrl-D: exit %d, want 0", code)
	}
	if j := journals(t, state); len(j) != 0 {
		t.Errorf("journal left after a clean exit: %v", j)
	}
	saved, err := os.ReadFile(filepath.Join(dir, "work.lw"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"gap = 4 mm\n↳ 4 mm\n", "face = gap * 2 mm\n", "gap2 = 2 * gap\n↳ 8 mm\n"} {
		if !strings.Contains(string(saved), want) {
			t.Errorf("work.lw lacks %q:\n%s", want, saved)
		}
	}
	if strings.Contains(string(saved), "fib(40)") || strings.Contains(string(saved), "bad =") {
		t.Errorf("work.lw holds a statement that failed:\n%s", saved)
	}
	hist, err := os.ReadFile(filepath.Join(state, "history"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(hist), "gap = 4 mm\nface = gap * 2 mm\nbad = gap + 1 A\n") || strings.Contains(string(hist), "half typed") {
		t.Errorf("history:\n%s", hist)
	}
}

// TestPromptRestoreAfterKill: the prompt is killed with SIGKILL (nothing
// can run at exit), and the next start offers the journal; "y" restores
// every statement that had succeeded, including one over two lines. A
// second kill and "n" set the journal aside as a script. Expressions are
// kept as :save keeps them.
func TestPromptRestoreAfterKill(t *testing.T) {
	dir, state := t.TempDir(), t.TempDir()
	tm := startTerm(t, state, dir)
	tm.expect(`lw> `)
	tm.send("coil_r = 12 mm\r")
	tm.expect(`coil_r = 12 mm\n`)
	tm.send("twice(x) = 2*x\r")
	tm.expect(`lw> `)
	tm.send("v = [1 m,\r")
	tm.expect(`\.\.  `)
	tm.send("  2 m, 3 m]\r")
	tm.expect(`v = \[1, 2, 3\] m\n`)
	tm.send("bad = coil_r + 1 A\r")
	tm.expect(`cannot add`)
	tm.expect(`lw> `)
	if err := tm.cmd.Process.Signal(syscall.SIGKILL); err != nil {
		t.Fatal(err)
	}
	tm.exitCode()
	if len(journals(t, state)) != 1 {
		t.Fatalf("after kill -9 the journals are %v, want one", journals(t, state))
	}

	tm = startTerm(t, state, dir)
	tm.expect(`did not end cleanly; its journal holds 3 statements\.`)
	tm.expect(`restore it\? \(y/n\) `)
	tm.send("y\r")
	tm.expect(`restored 3 statements; :vars lists the names`)
	tm.expect(`lw> `)
	tm.send("twice(coil_r)\r")
	tm.expect(`\n24 mm\n`)
	tm.send("v\r")
	tm.expect(`\n\[1, 2, 3\] m\n`)
	tm.send("extra = 5 A\r")
	tm.expect(`extra = 5 A\n`)
	tm.expect(`lw> `) // the journal is written before the next prompt
	if j := journals(t, state); len(j) != 1 {
		t.Fatalf("after restoring, journals %v, want only the new one", j)
	}
	// A prompt that runs beside this one is not offered its journal.
	if s := staleJournals(state); len(s) != 0 {
		t.Errorf("the running prompt's journal is offered: %v", s)
	}
	tm.cmd.Process.Signal(syscall.SIGKILL)
	tm.exitCode()

	tm = startTerm(t, state, dir)
	tm.expect(`its journal holds 6 statements\.`)
	tm.send("n\r")
	tm.expect(`not restored; set aside as .*declined\.lw`)
	tm.send("coil_r\r")
	tm.expect(`unknown name`)
	tm.send(":quit\r")
	if code := tm.exitCode(); code != 0 {
		t.Errorf(":quit: exit %d", code)
	}
	if j := journals(t, state); len(j) != 0 {
		t.Errorf("journals left: %v", j)
	}
	aside, err := os.ReadFile(filepath.Join(state, declinedName))
	if err != nil {
		t.Fatal(err)
	}
	want := "```lw\ncoil_r = 12 mm\ntwice(x) = 2*x\nv = [1 m,\n  2 m, 3 m]\ntwice(coil_r)\nv\nextra = 5 A\n```\n"
	if !strings.HasSuffix(string(aside), want) {
		t.Errorf("set aside:\n%s\nwant it to end with\n%s", aside, want)
	}
}

// TestPromptHangupKeepsJournal: a terminal that goes away (its window
// closed) is not a clean exit: the journal stays for the next start.
func TestPromptHangupKeepsJournal(t *testing.T) {
	dir, state := t.TempDir(), t.TempDir()
	tm := startTerm(t, state, dir)
	tm.expect(`lw> `)
	tm.send("kept = 3 V\r")
	tm.expect(`kept = 3 V\n`)
	tm.expect(`lw> `)
	// What the terminal driver sends when the terminal goes away. (The
	// master side of the pseudo-terminal cannot be closed here
	// while the reader goroutine blocks on it.)
	if err := tm.cmd.Process.Signal(syscall.SIGHUP); err != nil {
		t.Fatal(err)
	}
	if code := tm.exitCode(); code == 0 {
		t.Errorf("after a hangup the exit status is 0, as for a clean exit")
	}
	j := journals(t, state)
	if len(j) != 1 {
		t.Fatalf("journals after a hangup: %v, want one", j)
	}
	data, err := os.ReadFile(j[0])
	if err != nil {
		t.Fatal(err)
	}
	if got := journalStatements(string(data)); len(got) != 1 || got[0] != "kept = 3 V" {
		t.Errorf("the journal holds %q", got)
	}
}

// TestPromptRestoreStoppedByCtrlC: Ctrl-C during a long restore stops it
// after the statements done so far, and the whole journal is set aside as
// a script rather than lost.
func TestPromptRestoreStoppedByCtrlC(t *testing.T) {
	dir, state := t.TempDir(), t.TempDir()
	ended := exec.Command(os.Args[0], "-test.run=^$")
	if err := ended.Run(); err != nil {
		t.Skip("cannot start a process:", err)
	}
	name := filepath.Join(state, fmt.Sprintf("%s%d-1%s", journalPrefix, ended.Process.Pid, journalExt))
	body := journalHeader + "a = 1 m\nfib(n) = n < 2 ? n : fib(n-1) + fib(n-2)\nslow = fib(40)\nb = 2 m\n"
	if err := os.WriteFile(name, []byte(body), 0o600); err != nil {
		t.Fatal(err)
	}
	tm := startTerm(t, state, dir)
	tm.expect(`its journal holds 4 statements\.`)
	tm.send("y\r")
	time.Sleep(300 * time.Millisecond)
	tm.send("\x03")
	tm.expect(`restoring stopped by Ctrl-C after 2 of 4 statements`)
	tm.expect(`the whole journal is set aside as .*declined\.lw`)
	tm.expect(`lw> `)
	tm.send("a\r")
	tm.expect(`\n1 m\n`)
	tm.send("b\r")
	tm.expect(`unknown name`)
	tm.send("\x04")
	if code := tm.exitCode(); code != 0 {
		t.Errorf("Ctrl-D: exit %d", code)
	}
	aside, err := os.ReadFile(filepath.Join(state, declinedName))
	if err != nil || !strings.Contains(string(aside), "slow = fib(40)\nb = 2 m\n```\n") {
		t.Errorf("set aside: %q, %v", aside, err)
	}
	if j := journals(t, state); len(j) != 0 {
		t.Errorf("journals left: %v", j)
	}
}

// TestPromptPlot: at the prompt a plot is written into ./loopwise-out and
// says where; a named plot says it too.
func TestPromptPlot(t *testing.T) {
	dir, state := t.TempDir(), t.TempDir()
	tm := startTerm(t, state, dir)
	tm.expect(`lw> `)
	tm.send("k(d) = maxwell_mutual(20 mm, 15 mm, d)\r")
	tm.expect(`lw> `)
	tm.send("plot_fn(k, 1 mm, 5 mm, 3)\r")
	tm.expect(`plot-1.svg: k against d, 3 points\r?\nwritten to loopwise-out/plot-1.svg`)
	tm.send("p = plot_fn(k, 1 mm, 5 mm, 3, \"near.svg\")\r")
	tm.expect(`p = near.svg: k against d, 3 points\r?\nwritten to loopwise-out/near.svg`)
	tm.send("\x04")
	if code := tm.exitCode(); code != 0 {
		t.Errorf("Ctrl-D: exit %d, want 0", code)
	}
	for _, f := range []string{"plot-1.svg", "near.svg"} {
		if _, err := os.Stat(filepath.Join(dir, "loopwise-out", f)); err != nil {
			t.Error(err)
		}
	}
}
