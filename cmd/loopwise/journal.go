package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"

	"loopwise/lang"
	"loopwise/runtime"
)

// The prompt keeps two files in its state directory (stateDir):
//
//   - history: the lines typed, appended as each is entered (history.go);
//   - session-PID-TIME.journal: the statements of the running session that
//     were evaluated without error, appended and synced after each one. A
//     clean exit (Ctrl-D, :quit) removes it; one left by a process that no
//     longer runs (a crash, kill -9, a closed terminal) is offered for
//     restoring at the next start of the prompt.
//
// Only the terminal prompt writes them: piped input and scripts never write
// a file unless a statement asks (:save).

// stateDirEnv overrides where the prompt keeps its history and journal.
const stateDirEnv = "LOOPWISE_STATE_DIR"

// stateDir is $LOOPWISE_STATE_DIR, else $XDG_STATE_HOME/loopwise, else
// loopwise in the user's config directory (os.UserConfigDir); "" when none
// can be found.
func stateDir() string {
	if d := os.Getenv(stateDirEnv); d != "" {
		return d
	}
	if d := os.Getenv("XDG_STATE_HOME"); d != "" && filepath.IsAbs(d) {
		return filepath.Join(d, "loopwise")
	}
	d, err := os.UserConfigDir()
	if err != nil {
		return ""
	}
	return filepath.Join(d, "loopwise")
}

const (
	journalPrefix = "session-"
	journalExt    = ".journal"
	journalHeader = "# Loopwise journal: the statements of a prompt session, kept to restore it after a crash\n"
	// declinedName is where a journal the user did not restore is set
	// aside, as a script :load reads.
	declinedName = "declined" + runtime.ScriptExt
)

// journal appends the statements of a session to its file.
type journal struct {
	dir    string
	path   string
	f      *os.File
	logged int  // transcript entries written
	broken bool // a write failed; the session goes on without a journal
}

// update appends the transcript entries not yet written and syncs the file.
// It reports a failure once, as an error.
func (j *journal) update(tr []runtime.Entry) error {
	if j.broken || j.dir == "" || j.logged >= len(tr) {
		return nil
	}
	var b strings.Builder
	for _, e := range tr[j.logged:] {
		b.WriteString(e.Line)
		b.WriteByte('\n')
	}
	err := j.open()
	if err == nil {
		_, err = j.f.WriteString(b.String())
	}
	if err == nil {
		err = j.f.Sync()
	}
	if err != nil {
		j.broken = true
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return fmt.Errorf("cannot keep a journal of this session in %s: %v; the session goes on without one", j.dir, err)
	}
	j.logged = len(tr)
	return nil
}

// open creates the journal file at the first statement.
func (j *journal) open() error {
	if j.f != nil {
		return nil
	}
	if err := os.MkdirAll(j.dir, 0o700); err != nil {
		return err
	}
	name := fmt.Sprintf("%s%d-%d%s", journalPrefix, os.Getpid(), time.Now().UnixNano(), journalExt)
	path := filepath.Join(j.dir, name)
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL|os.O_APPEND, 0o600)
	if err != nil {
		return err
	}
	if _, err := f.WriteString(journalHeader); err != nil {
		f.Close()
		os.Remove(path)
		return err
	}
	if d, err := os.Open(j.dir); err == nil { // make the new name durable
		d.Sync()
		d.Close()
	}
	j.f, j.path = f, path
	return nil
}

// remove deletes the journal at a clean exit.
func (j *journal) remove() {
	if j.f != nil {
		j.f.Close()
		os.Remove(j.path)
		j.f = nil
	}
}

// staleJournal is a journal left by a process that no longer runs.
type staleJournal struct {
	path  string
	mod   time.Time
	stmts []string
}

// staleJournals lists the journals in dir whose process is gone, newest
// first. Empty ones are removed on the way.
func staleJournals(dir string) []staleJournal {
	if dir == "" {
		return nil
	}
	names, _ := filepath.Glob(filepath.Join(dir, journalPrefix+"*"+journalExt))
	var out []staleJournal
	for _, p := range names {
		rest := strings.TrimSuffix(strings.TrimPrefix(filepath.Base(p), journalPrefix), journalExt)
		pidText, _, _ := strings.Cut(rest, "-")
		pid, err := strconv.Atoi(pidText)
		if err != nil || (pid != os.Getpid() && runtime.ProcessAlive(pid)) {
			continue // another prompt's, still running
		}
		fi, err := os.Lstat(p)
		if err != nil || !fi.Mode().IsRegular() || fi.Size() > maxJournalSize {
			continue
		}
		data, err := os.ReadFile(p)
		if err != nil {
			continue
		}
		stmts := journalStatements(string(data))
		if len(stmts) == 0 {
			os.Remove(p)
			continue
		}
		out = append(out, staleJournal{path: p, mod: fi.ModTime(), stmts: stmts})
	}
	sort.Slice(out, func(a, b int) bool { return out[a].mod.After(out[b].mod) })
	return out
}

// maxJournalSize bounds the journal read back: far beyond a day's typing,
// and a file larger than this is not one Loopwise wrote.
const maxJournalSize = 64 << 20

// journalStatements splits a journal's text into statements. A statement
// continues over lines while a bracket is open, as at the prompt; a last
// line without its newline was cut short by the crash and is dropped, and
// so is a statement it leaves open.
func journalStatements(text string) []string {
	text, ok := strings.CutPrefix(text, journalHeader)
	if !ok {
		return nil
	}
	if i := strings.LastIndexByte(text, '\n'); i >= 0 {
		text = text[:i]
	} else {
		return nil
	}
	var out, pending []string
	for _, l := range strings.Split(text, "\n") {
		pending = append(pending, l)
		joined := strings.Join(pending, "\n")
		if !strings.HasPrefix(strings.TrimSpace(pending[0]), ":") && lang.NeedsMore(joined) {
			continue
		}
		out = append(out, joined)
		pending = nil
	}
	return out
}

// restore evaluates a journal's statements quietly into the session, until
// stopped says to stop; it returns how many succeeded and the first error.
func restore(s *runtime.Session, stmts []string, stopped func() bool) (ok int, first error) {
	line := 1
	for _, text := range stmts {
		if stopped() {
			break
		}
		st, err := lang.ParseStatement(lang.Pos{File: "journal", Line: line, Col: 1}, text)
		if err == nil {
			_, err = s.Exec(st)
		}
		if err == nil {
			ok++
		} else if first == nil {
			first = err
		}
		line += strings.Count(text, "\n") + 1
	}
	return ok, first
}

// setAside writes a journal the user did not restore as a script in dir
// (replacing the last one set aside) and removes the journal.
func setAside(dir string, j staleJournal) (string, error) {
	var b strings.Builder
	fmt.Fprintf(&b, "# Loopwise session of %s, not restored\n\n```%s\n", j.mod.Format("2006-01-02 15:04"), runtime.FenceTag)
	for _, s := range j.stmts {
		b.WriteString(s + "\n")
	}
	b.WriteString("```\n")
	path := filepath.Join(dir, declinedName)
	if err := runtime.WriteFileAtomic(path, []byte(b.String())); err != nil {
		return "", err
	}
	os.Remove(j.path)
	return path, nil
}
