package main

import (
	"strings"
	"testing"
	"time"
)

// TestProgressPrinter: nothing for the first second; then, off a
// terminal, a plain line at most every ten seconds; on a terminal, one line
// rewritten in place at most five times a second and cleared at the end.
func TestProgressPrinter(t *testing.T) {
	t0 := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	var now time.Time
	clock := func() time.Time { return now }
	steps := []struct {
		at   time.Duration
		done int
	}{{0, 0}, {500 * time.Millisecond, 10}, {1500 * time.Millisecond, 20}, {1600 * time.Millisecond, 21}, {2 * time.Second, 25}, {12 * time.Second, 60}, {13 * time.Second, 100}}

	var log strings.Builder
	p := progressPrinterOn(&log, false, clock)
	for _, s := range steps {
		now = t0.Add(s.at)
		p("inductance", s.done, 100)
	}
	want := "inductance: 20% (20 of 100) after 2 s\ninductance: 60% (60 of 100) after 12 s\n"
	if log.String() != want {
		t.Errorf("off a terminal:\n%q\nwant\n%q", log.String(), want)
	}

	var tty strings.Builder
	p = progressPrinterOn(&tty, true, clock)
	for _, s := range steps {
		now = t0.Add(s.at)
		p("inductance", s.done, 100)
	}
	got := tty.String()
	if n := strings.Count(got, "\r"); n != 3+2 || !strings.Contains(got, "\rinductance: 25% (25 of 100)") || strings.Contains(got, "21 of 100") {
		t.Errorf("on a terminal: %q", got)
	}
	if !strings.HasSuffix(got, "\r"+strings.Repeat(" ", 60)+"\r") {
		t.Errorf("on a terminal the line is not cleared at the end: %q", got)
	}

	// a statement that ends early (an error, Ctrl-C) clears its line too
	tty.Reset()
	p = progressPrinterOn(&tty, true, clock)
	now = t0
	p("flux", 0, 100)
	now = t0.Add(2 * time.Second)
	p("flux", 30, 100)
	p("", 0, -1)
	if got := tty.String(); got != "\rflux: 30% (30 of 100)\r"+strings.Repeat(" ", 60)+"\r" {
		t.Errorf("an ended statement leaves %q", got)
	}
}
