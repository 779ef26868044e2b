package main

import (
	"bytes"
	"os"
	"strings"
	"testing"
)

// TestReadmeWireLosses replays the prompt transcript in README.md's "Wire
// losses at AC" section, so the page shows what the program prints.
func TestReadmeWireLosses(t *testing.T) {
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, sec, ok := strings.Cut(string(data), "### Wire losses at AC\n")
	if !ok {
		t.Fatal("README has no wire-losses section")
	}
	_, after, ok := strings.Cut(sec, "```text\n")
	if !ok {
		t.Fatal("the wire-losses section has no ```text block")
	}
	block, _, _ := strings.Cut(after, "```")
	var inputs []string
	var want strings.Builder
	for _, line := range strings.Split(strings.TrimSuffix(block, "\n"), "\n") {
		if in, ok := strings.CutPrefix(line, prompt); ok {
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
		t.Errorf("README's wire-losses transcript differs from the program.\n--- README\n%s--- program\n%s", want.String(), got.String())
	}
}
