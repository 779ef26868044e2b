package main

import (
	"fmt"
	"os"
	"reflect"
	"strings"
	"syscall"
	"testing"

	"github.com/peterh/liner"
)

// TestJournalStatements: statements continue while a bracket is open, and
// a last line cut short by a crash (no newline) is dropped with the
// statement it leaves open.
func TestJournalStatements(t *testing.T) {
	for _, c := range []struct {
		text string
		want []string
	}{
		{journalHeader + "a = 1 m\nv = [1 m,\n  2 m, 3 m]\n:digits 4\n", []string{"a = 1 m", "v = [1 m,\n  2 m, 3 m]", ":digits 4"}},
		{journalHeader + "a = 1 m\nb = 2", []string{"a = 1 m"}},
		{journalHeader + "a = 1 m\nv = [1 m,\n  2 m", []string{"a = 1 m"}},
		{journalHeader + "a = 1 m\nv = [1 m,\n", []string{"a = 1 m"}},
		{"a = 1 m\n", nil}, // not a journal
		{journalHeader, nil},
	} {
		if got := journalStatements(c.text); !reflect.DeepEqual(got, c.want) {
			t.Errorf("journalStatements(%q) = %q, want %q", c.text, got, c.want)
		}
	}
}

// TestHistoryLines: the history file is cut to liner's limit, keeping the
// newest lines, and lines liner cannot read back (too long, not UTF-8) are
// dropped; a file that needs no change is left as it is.
func TestHistoryLines(t *testing.T) {
	var b strings.Builder
	for i := range liner.HistoryLimit + 5 {
		fmt.Fprintf(&b, "x = %d m\n", i)
	}
	kept, changed := historyLines(b.String())
	if !changed || len(kept) != liner.HistoryLimit || kept[0] != "x = 5 m" || kept[len(kept)-1] != fmt.Sprintf("x = %d m", liner.HistoryLimit+4) {
		t.Errorf("cut to %d lines from %q to %q, changed %v", len(kept), kept[0], kept[len(kept)-1], changed)
	}
	kept, changed = historyLines("a = 1 m\n" + strings.Repeat("b", maxHistoryLine+1) + "\n\xff\nc = 2 m\n")
	if !changed || !reflect.DeepEqual(kept, []string{"a = 1 m", "c = 2 m"}) {
		t.Errorf("kept %q, changed %v", kept, changed)
	}
	if _, changed := historyLines("a = 1 m\nc = 2 m\n"); changed {
		t.Errorf("a short clean history would be rewritten")
	}
}

// TestInterrupter: Ctrl-C outside a statement does nothing (at the prompt
// it is a key); during one, the first stops it, the second stops and
// warns, the third leaves; a new statement counts afresh; SIGTERM leaves.
func TestInterrupter(t *testing.T) {
	var ir interrupter
	if a := ir.on(os.Interrupt); a != ignore {
		t.Errorf("at the prompt: %v, want ignore", a)
	}
	ir.begin()
	for i, want := range []sigAction{stop, stopAndWarn, leave} {
		if a := ir.on(os.Interrupt); a != want {
			t.Errorf("Ctrl-C number %d: %v, want %v", i+1, a, want)
		}
	}
	ir.end()
	ir.begin()
	if a := ir.on(os.Interrupt); a != stop {
		t.Errorf("first Ctrl-C of the next statement: %v, want stop", a)
	}
	if a := ir.on(syscall.SIGTERM); a != leave {
		t.Errorf("SIGTERM: %v, want leave", a)
	}
}
