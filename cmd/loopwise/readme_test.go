package main

import (
	"bytes"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"

	"loopwise/runtime"
)

// TestReadmeTour replays the prompt transcript in README.md's tour, so the
// documentation cannot drift from what the program prints.
func TestReadmeTour(t *testing.T) {
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, after, ok := strings.Cut(string(data), "```text\n")
	if !ok {
		t.Fatal("README has no ```text block")
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
	if len(inputs) < 3 {
		t.Fatalf("tour has only %d inputs", len(inputs))
	}
	var got bytes.Buffer
	c := newConsole(&got, &got)
	for _, in := range inputs {
		c.line(in)
	}
	if got.String() != want.String() {
		t.Errorf("README tour differs from the program.\n--- README\n%s--- program\n%s", want.String(), got.String())
	}
}

// TestReadmeReservedNames: the README lists exactly the names the
// expression syntax reserves for calls (taken from the engine).
func TestReadmeReservedNames(t *testing.T) {
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, after, ok := strings.Cut(string(data), "The names `all`")
	if !ok {
		t.Fatal("README does not list the reserved names")
	}
	para, _, _ := strings.Cut("`all`"+after, "\n\n")
	var listed []string
	for _, f := range strings.Split(para, "`")[1:] {
		if f != "" && !strings.ContainsAny(f, " ,\n") {
			listed = append(listed, f)
		}
	}
	sort.Strings(listed)
	if want := runtime.ReservedCalls(); !slices.Equal(listed, want) {
		t.Errorf("README lists %v, the engine reserves %v", listed, want)
	}
}

// TestReadmePlots runs the statements of the README's "Plots" section as a
// script with an output directory: every plot is written, numbered unless
// named.
func TestReadmePlots(t *testing.T) {
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, sec, ok := strings.Cut(string(data), "\n## Plots\n")
	if !ok {
		t.Fatal("README has no Plots section")
	}
	_, after, ok := strings.Cut(sec, "```lw\n")
	if !ok {
		t.Fatal("the Plots section has no lw block")
	}
	block, _, _ := strings.Cut(after, "```")
	sc, err := runtime.ParseScript("plots.lw", []byte("```lw\n"+block+"```\n"))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	s := newSession()
	s.OutDir = dir
	var out bytes.Buffer
	if err := sc.Run(s, &out); err != nil {
		t.Fatalf("%v\n%s", err, out.String())
	}
	for _, f := range []string{"plot-1.svg", "coupling-log.svg", "plot-2.svg", "plot-3.svg"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("README's plots: %v", err)
		}
	}
}
