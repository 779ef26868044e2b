package main

import (
	"bytes"
	"testing"
)

// TestConsoleContinuation: a line that leaves a bracket open switches to the
// continuation prompt; Ctrl-C (drop) forgets the whole pending statement,
// not only its last line, and the session goes on.
func TestConsoleContinuation(t *testing.T) {
	var out, errOut bytes.Buffer
	c := newConsole(&out, &errOut)
	if c.prompt() != prompt {
		t.Fatalf("first prompt %q, want %q", c.prompt(), prompt)
	}
	c.line("v = [1 m,")
	c.line("  2 m,")
	if !c.more() || c.prompt() != morePrompt {
		t.Fatalf("after an open bracket: more %v, prompt %q; want the continuation prompt %q", c.more(), c.prompt(), morePrompt)
	}
	c.drop() // what Ctrl-C does at the prompt
	if c.more() || c.prompt() != prompt {
		t.Fatalf("after Ctrl-C the statement is still pending")
	}
	c.line("w = 2 m")
	if got := out.String(); got != "w = 2 m\n" {
		t.Errorf("printed %q, want only w's result", got)
	}
	if _, ok := c.s.Lookup("v"); ok {
		t.Errorf("the dropped statement assigned v")
	}
	if errOut.Len() != 0 || c.failed {
		t.Errorf("dropping a statement is not an error: %q", errOut.String())
	}
	// A continued statement completes on the line that closes its bracket.
	c.line("u = [3 m,")
	c.line("  4 m, 0 m]")
	if got := out.String(); got != "w = 2 m\nu = [3, 4, 0] m\n" {
		t.Errorf("printed %q", got)
	}
}
