package main

import (
	"errors"
	"fmt"
	"os"
	"os/signal"
	"path/filepath"
	"strings"
	"sync/atomic"
	"syscall"
	"unicode/utf8"

	"github.com/peterh/liner"

	"loopwise/runtime"
)

// The terminal prompt. While a statement runs, the terminal is out of
// liner's raw mode, so Ctrl-C arrives as SIGINT: it interrupts the
// statement (Session.Interrupt) and the prompt comes back with every name
// intact. A third Ctrl-C during one statement that does not stop leaves
// Loopwise, and so do SIGTERM and SIGHUP (a closed terminal); then the
// terminal is restored and the journal stays for the next start.

// leaveAfter is how many Ctrl-C presses during one statement leave.
const leaveAfter = 3

func terminalLoop(c *console) int {
	c.s.SetProgress(progressPrinter(os.Stderr))
	ln := liner.NewLiner()
	defer ln.Close()
	ln.SetCtrlCAborts(true)
	ln.SetTabCompletionStyle(liner.TabPrints)
	ln.SetWordCompleter(func(line string, pos int) (string, []string, string) {
		return complete(c.s, line, pos)
	})
	dir := stateDir()
	hist := openHistory(ln, dir)
	defer hist.close()
	fmt.Fprintln(c.out, "Loopwise — induction calculations with units. :help for help, Ctrl-D to leave.")
	jr := &journal{dir: dir}
	var ir interrupter
	sigs := make(chan os.Signal, 8)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM, syscall.SIGHUP)
	defer signal.Stop(sigs)
	go func() {
		for sig := range sigs {
			switch ir.on(sig) {
			case ignore:
			case stop:
				c.s.Interrupt()
			case stopAndWarn:
				c.s.Interrupt()
				fmt.Fprintf(c.errOut, "\nstill stopping; Ctrl-C once more leaves Loopwise (the journal keeps this session)\n")
			case leave:
				ln.Close() // give the terminal back as it was
				fmt.Fprintf(c.errOut, "\nloopwise: %v; the journal keeps this session for the next start\n", sig)
				code := 128 + 2
				if s, ok := sig.(syscall.Signal); ok {
					code = 128 + int(s)
				}
				os.Exit(code)
			}
		}
	}()
	offerRestore(ln, c, jr, &ir)

	for {
		text, err := ln.Prompt(c.prompt())
		if errors.Is(err, liner.ErrPromptAborted) {
			c.drop() // Ctrl-C drops the line, and a statement left open, keeps the session
			continue
		}
		if err != nil { // io.EOF on Ctrl-D, and when the terminal hangs up
			if _, werr := fmt.Fprintln(c.out); werr != nil {
				return 129 // the terminal is gone: not a clean exit, keep the journal
			}
			c.finish()
			jr.remove()
			return 0
		}
		if strings.TrimSpace(text) != "" {
			hist.add(text)
		}
		ir.begin()
		quit := c.line(text)
		ir.end()
		if err := jr.update(c.s.Transcript); err != nil {
			fmt.Fprintln(c.errOut, "loopwise:", err)
		}
		if quit {
			jr.remove()
			return 0
		}
	}
}

// interrupter decides what a signal does: at the prompt liner reads
// Ctrl-C as a key, so SIGINT only comes from outside and is ignored; while
// a statement runs the first Ctrl-C stops it, the second also warns, and
// the leaveAfter-th leaves. Any other signal leaves.
type interrupter struct {
	running atomic.Bool
	presses atomic.Int32
}

type sigAction int

const (
	ignore sigAction = iota
	stop
	stopAndWarn
	leave
)

func (ir *interrupter) begin() { ir.presses.Store(0); ir.running.Store(true) }
func (ir *interrupter) end()   { ir.running.Store(false) }

// stopped reports whether Ctrl-C came since begin.
func (ir *interrupter) stopped() bool { return ir.presses.Load() > 0 }

func (ir *interrupter) on(sig os.Signal) sigAction {
	if sig != os.Interrupt {
		return leave
	}
	if !ir.running.Load() {
		return ignore
	}
	switch n := ir.presses.Add(1); {
	case n >= leaveAfter:
		return leave
	case n == leaveAfter-1:
		return stopAndWarn
	}
	return stop
}

// offerRestore asks, for each journal a crashed prompt left, whether to
// restore it into this session.
// Ctrl-C stops a restore; the journal is then set aside whole.
func offerRestore(ln *liner.State, c *console, jr *journal, ir *interrupter) {
	for _, old := range staleJournals(jr.dir) {
		fmt.Fprintf(c.errOut, "A session of %s did not end cleanly; its journal holds %d statement%s.\n",
			old.mod.Format("2006-01-02 15:04"), len(old.stmts), plural(len(old.stmts)))
		for {
			answer, err := ln.Prompt("restore it? (y/n) ")
			if err != nil { // Ctrl-C or Ctrl-D: ask again next time
				fmt.Fprintln(c.errOut, "kept for the next start")
				return
			}
			switch strings.ToLower(strings.TrimSpace(answer)) {
			case "y", "yes":
				ir.begin()
				n, first := restore(c.s, old.stmts, ir.stopped)
				ir.end()
				if err := jr.update(c.s.Transcript); err != nil {
					fmt.Fprintln(c.errOut, "loopwise:", err)
				}
				if ir.stopped() {
					fmt.Fprintf(c.errOut, "restoring stopped by Ctrl-C after %d of %d statements\n", n, len(old.stmts))
					if p, err := setAside(jr.dir, old); err != nil {
						fmt.Fprintf(c.errOut, "loopwise: %v; the journal stays for the next start\n", err)
					} else {
						fmt.Fprintf(c.errOut, "the whole journal is set aside as %s\n", p)
					}
					return
				}
				os.Remove(old.path)
				if first != nil {
					fmt.Fprintf(c.errOut, "restored %d of %d statements; the first that failed again:\n%v\n", n, len(old.stmts), first)
				} else {
					fmt.Fprintf(c.errOut, "restored %d statement%s; :vars lists the names\n", n, plural(n))
				}
			case "n", "no":
				if p, err := setAside(jr.dir, old); err != nil {
					fmt.Fprintf(c.errOut, "loopwise: %v; the journal stays for the next start\n", err)
				} else {
					fmt.Fprintf(c.errOut, "not restored; set aside as %s (:load it to get it back)\n", p)
				}
			default:
				continue
			}
			break
		}
	}
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// History: liner keeps the last liner.HistoryLimit lines; the file gets
// each line as it is entered (appended, so a crash loses nothing typed
// before it), and is cut back to that many lines when the prompt starts.
// Lines longer than maxHistoryLine are not kept: they are pastes, not
// something to recall with the arrow keys, and liner cannot read them back.
const maxHistoryLine = 4000

type history struct {
	ln *liner.State
	f  *os.File
}

func openHistory(ln *liner.State, dir string) *history {
	h := &history{ln: ln}
	if dir == "" {
		return h
	}
	path := filepath.Join(dir, "history")
	if data, err := os.ReadFile(path); err == nil {
		kept, changed := historyLines(string(data))
		ln.ReadHistory(strings.NewReader(strings.Join(kept, "\n")))
		if changed {
			runtime.WriteFileAtomic(path, []byte(strings.Join(kept, "\n")+"\n"))
		}
	}
	if err := os.MkdirAll(dir, 0o700); err != nil {
		return h
	}
	h.f, _ = os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_APPEND, 0o600)
	return h
}

// historyLines keeps the last liner.HistoryLimit lines of a history file
// that liner can read back; changed says the file should be rewritten.
func historyLines(data string) (kept []string, changed bool) {
	all := strings.Split(strings.TrimSuffix(data, "\n"), "\n")
	for _, l := range all {
		if l != "" && len(l) <= maxHistoryLine && utf8.ValidString(l) {
			kept = append(kept, l)
		}
	}
	if len(kept) > liner.HistoryLimit {
		kept = kept[len(kept)-liner.HistoryLimit:]
	}
	return kept, len(kept) != len(all)
}

func (h *history) add(line string) {
	h.ln.AppendHistory(line)
	if h.f != nil && len(line) <= maxHistoryLine && utf8.ValidString(line) {
		h.f.WriteString(line + "\n")
	}
}

func (h *history) close() {
	if h.f != nil {
		h.f.Close()
	}
}
