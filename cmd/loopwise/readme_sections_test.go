package main

import (
	"bytes"
	"os"
	"strings"
	"testing"
)

// TestReadmeTranscripts replays the prompt transcripts in README.md's
// sections on multilayer coils, wire losses, printed coils, AC circuits, circuits in time,
// magnets and tolerances, so the page shows what the program prints.
func TestReadmeTranscripts(t *testing.T) {
	for _, title := range []string{"### Multilayer coils", "### Wire losses at AC", "### Printed coils", "### AC: phasors, circuits and the two-coil link", "### Circuits in time and the ring ejector", "### Magnets, ideal sources, steel plates and cores", "### Tolerances and uncertainty", "### Exact derivatives", "### Numerical error"} {
		t.Run(title[4:], func(t *testing.T) { replaySection(t, title) })
	}
}

func replaySection(t *testing.T, title string) {
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, sec, ok := strings.Cut(string(data), title+"\n")
	if !ok {
		t.Fatalf("README has no section %q", title)
	}
	_, after, ok := strings.Cut(sec, "```text\n")
	if !ok {
		t.Fatalf("the section %q has no ```text block", title)
	}
	block, _, _ := strings.Cut(after, "```")
	var inputs []string
	var want strings.Builder
	for _, line := range strings.Split(strings.TrimSuffix(block, "\n"), "\n") {
		if in, ok := strings.CutPrefix(line, prompt); ok {
			inputs = append(inputs, in)
			continue
		}
		if in, ok := strings.CutPrefix(line, morePrompt); ok {
			inputs = append(inputs, in)
			continue
		}
		want.WriteString(line + "\n")
	}
	var got bytes.Buffer
	c := newConsole(&got, &got)
	for _, in := range inputs {
		c.line(in)
	}
	if got.String() != want.String() {
		t.Errorf("README's transcript under %q differs from the program.\n--- README\n%s--- program\n%s", title, want.String(), got.String())
	}
}
