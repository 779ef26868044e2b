package main

import (
	"bytes"
	"slices"
	"strings"
	"testing"

	"loopwise/lang"
	"loopwise/runtime"
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

// TestPipeLongLines: piped input is read line by line whatever the length
// of a line (a line longer than the reader's buffer once stopped reading
// with "token too long" and ignored every later line). A line longer than
// a statement may be is reported with its line number and skipped, and
// reading goes on; a byte-order mark before the first line is skipped.
func TestPipeLongLines(t *testing.T) {
	in := runtime.ByteOrderMark + "x = 1 m\r\n" +
		strings.Repeat("(", 500_000) + "1" + strings.Repeat(")", 500_000) + "\n" +
		"y = 2*x\n" +
		strings.Repeat("-", 1_000_000) + "1\n" +
		"v = [1 m,\n" + strings.Repeat("a", 3*lang.MaxLineBytes) + "\n" +
		"z = " + strings.Repeat("b", 99_000) + "\n" +
		"x + y" // no line ending at the end
	var out, errOut bytes.Buffer
	code := run(nil, strings.NewReader(in), &out, &errOut)
	if code != 1 {
		t.Errorf("exit status %d, want 1 (lines failed)", code)
	}
	if got, want := out.String(), "x = 1 m\ny = 2 m\n3 m\n"; got != want {
		t.Errorf("stdout %q, want %q", got, want)
	}
	var at []string
	for _, l := range strings.Split(errOut.String(), "\n") {
		if i := strings.Index(l, ": "); i > 0 && !strings.HasPrefix(l, " ") {
			at = append(at, l[:i])
		}
	}
	// line 2 and 4: too long; line 5 opens a vector that line 6 (too long)
	// cuts off, so it reports its open bracket; line 7: an unknown name.
	if want := []string{"2:100001", "4:100001", "5:5", "6:100001", "7:5"}; !slices.Equal(at, want) {
		t.Errorf("errors at %v, want %v:\n%s", at, want, errOut.String())
	}
	if n := errOut.Len(); n > 3000 {
		t.Errorf("%d bytes of messages for five errors", n)
	}
}
