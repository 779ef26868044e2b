package runtime_test

import (
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"loopwise/lang"
	"loopwise/runtime"
)

// The malformed-input table lives in ../testdata/malformed/*.txt, one file
// per kind of mistake. A case is
//
//	case NAME
//	in STATEMENT          (one or more: statements 1, 2, … of a fresh session)
//	file "SCRIPT"         (instead of in: a whole script, read and run)
//	want LINE:COL: MESSAGE
//
// A field that is one whole Go quoted string is unquoted ("a\nb" holds a
// newline, so it is one statement continued over lines); a field may hold {{N*"text"}}, which
// stands for text repeated N times (huge inputs are made by the test, not
// stored). Every statement before the last must succeed; the last, or the
// script, must fail with exactly the message at exactly the position, a
// positioned *lang.Error. A script without statements answers "none:"
// and the first line of its message. Lines starting with # are comments.
//
// named.txt holds the hostile inputs that once crashed Loopwise, gave a
// nil result or a wrapped exponent.
//
// go test ./runtime -run TestMalformedInputs -update rewrites the want lines
// from what Loopwise answers now: read the diff before keeping it.

var updateMalformed = flag.Bool("update", false, "rewrite the want lines of testdata/malformed from the current answers")

type malformedCase struct {
	name    string
	file    string // the .txt file
	line    int    // line of "case" in it
	in      []string
	raw     []string // in (or the file) as written, markers unexpanded
	doc     string   // the script, for file cases
	isDoc   bool
	want    string // expanded
	wantRaw string // as written
}

var markerRe = regexp.MustCompile(`\{\{(\d+)\*("(?:[^"\\]|\\.)*")\}\}`)

// expand replaces every {{N*"text"}} in s by text repeated N times.
func expand(s string) (string, error) { return expandAs(s, false) }

// expandAs is expand; with quoted, each expansion is written as it would
// be inside a Go quoted string, for a field that is unquoted afterwards.
func expandAs(s string, quoted bool) (string, error) {
	var err error
	out := markerRe.ReplaceAllStringFunc(s, func(m string) string {
		sub := markerRe.FindStringSubmatch(m)
		n, e1 := strconv.Atoi(sub[1])
		text, e2 := strconv.Unquote(sub[2])
		if e1 != nil || e2 != nil || n > 10_000_000 {
			err = fmt.Errorf("bad marker %s", m)
			return ""
		}
		out := strings.Repeat(text, n)
		if quoted {
			q := strconv.Quote(out)
			return q[1 : len(q)-1]
		}
		return out
	})
	return out, err
}

// field reads a field's text: a field that is one whole Go quoted string
// is unquoted; any other text is taken as written.
func field(s string) (string, error) {
	s = strings.TrimSpace(s)
	if strings.HasPrefix(s, `"`) && strings.HasSuffix(s, `"`) && len(s) >= 2 {
		q, err := expandAs(s, true)
		if err != nil {
			return "", err
		}
		if u, err := strconv.Unquote(q); err == nil {
			return u, nil
		}
	}
	return expand(s)
}

func readMalformed(t *testing.T, path string) []*malformedCase {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var cases []*malformedCase
	var c *malformedCase
	for i, line := range strings.Split(string(data), "\n") {
		fail := func(err error) { t.Fatalf("%s:%d: %v", path, i+1, err) }
		key, rest, _ := strings.Cut(line, " ")
		switch {
		case strings.TrimSpace(line) == "" || strings.HasPrefix(line, "#"):
		case key == "case":
			c = &malformedCase{name: strings.TrimSpace(rest), file: filepath.Base(path), line: i + 1}
			cases = append(cases, c)
		case c == nil:
			fail(fmt.Errorf("%q before the first case", line))
		case key == "in":
			s, err := field(rest)
			if err != nil {
				fail(err)
			}
			c.in = append(c.in, s)
			c.raw = append(c.raw, rest)
		case key == "file":
			s, err := field(rest)
			if err != nil {
				fail(err)
			}
			c.doc, c.isDoc = s, true
			c.raw = append(c.raw, rest)
		case key == "want":
			s, err := expand(strings.TrimSpace(rest))
			if err != nil {
				fail(err)
			}
			c.want, c.wantRaw = s, strings.TrimSpace(rest)
		default:
			fail(fmt.Errorf("unknown line %q", line))
		}
	}
	return cases
}

// answer runs a case in a fresh session and returns its answer in the form
// of a want line: "LINE:COL: MESSAGE", "none: …", or "ok: RESULT" (a
// malformed input that was accepted).
func (c *malformedCase) answer(t *testing.T) string {
	t.Helper()
	s := stdSession()
	done := make(chan string, 1)
	go func() { done <- c.run(s) }()
	select {
	case a := <-done:
		return a
	case <-time.After(hangLimit):
		s.Interrupt()
		t.Fatalf("%s:%d %s: still running after %v", c.file, c.line, c.name, hangLimit)
		return ""
	}
}

func (c *malformedCase) run(s *runtime.Session) string {
	var err error
	var res *runtime.Result
	all := strings.Join(c.in, "\n")
	if c.isDoc {
		all = c.doc
		var sc *runtime.Script
		sc, err = runtime.ParseScript("m.lw", []byte(c.doc))
		if err == nil {
			err = sc.Run(s, new(strings.Builder))
		}
	} else {
		line := 1
		for i, in := range c.in {
			res, err = s.Eval(lang.Pos{File: "m.lw", Line: line, Col: 1}, in)
			line += strings.Count(in, "\n") + 1
			if i < len(c.in)-1 && err != nil {
				return strings.ReplaceAll("setup failed: "+err.Error(), "\n", `\n`)
			}
		}
	}
	// one line in the file: a newline in a message is written \n
	return strings.ReplaceAll(c.outcome(all, res, err), "\n", `\n`)
}

func (c *malformedCase) outcome(all string, res *runtime.Result, err error) string {
	var none *runtime.NoStatementsError
	var le *lang.Error
	switch {
	case err == nil && res != nil:
		return "ok: " + res.Text
	case err == nil:
		return "ok"
	case errors.As(err, &none):
		first, _, _ := strings.Cut(err.Error(), "\n")
		return "none: " + first
	case errors.As(err, &le):
		if le.Pos.File != "m.lw" {
			return "wrong file: " + err.Error()
		}
		if bad := internalName(all, le.Msg); bad != "" {
			return "internal text " + strconv.Quote(bad) + ": " + le.Msg
		}
		return fmt.Sprintf("%d:%d: %s", le.Pos.Line, le.Pos.Col, le.Msg)
	default:
		return fmt.Sprintf("not positioned (%T): %v", err, err)
	}
}

// compress writes the markers of the case's input back into an answer, so a
// message that quotes a huge input stays short in the file.
func (c *malformedCase) compress(a string) string {
	for _, raw := range c.raw {
		for _, m := range markerRe.FindAllString(raw, -1) {
			if x, err := expand(m); err == nil && len(x) > 40 {
				a = strings.ReplaceAll(a, x, m)
			}
		}
	}
	return a
}

func TestMalformedInputs(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "testdata", "malformed", "*.txt"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no malformed-input files (%v)", err)
	}
	total := 0
	for _, path := range files {
		cases := readMalformed(t, path)
		total += len(cases)
		got := map[*malformedCase]string{}
		t.Run(strings.TrimSuffix(filepath.Base(path), ".txt"), func(t *testing.T) {
			for _, c := range cases {
				t.Run(c.name, func(t *testing.T) {
					for _, bad := range []string{"ok", "setup failed", "not positioned", "internal text", "wrong file"} {
						if strings.HasPrefix(c.wantRaw, bad) {
							t.Errorf("%s:%d %s: pins %q, which is not a positioned error", c.file, c.line, c.name, c.wantRaw)
						}
					}
					full := c.answer(t)
					a := c.compress(full)
					got[c] = a
					if a != c.wantRaw && full != c.want {
						t.Errorf("%s:%d %s\n got: %s\nwant: %s", c.file, c.line, c.name, a, c.want)
					}
				})
			}
		})
		if *updateMalformed {
			rewriteWants(t, path, got)
		}
	}
	if total < 150 {
		t.Errorf("%d malformed inputs, want at least 150", total)
	}
}

// rewriteWants replaces (or adds) each case's want line with its answer.
func rewriteWants(t *testing.T, path string, got map[*malformedCase]string) {
	byLine := map[int]string{}
	for c, a := range got {
		byLine[c.line] = a
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	pendingWant := ""
	flush := func() {
		if pendingWant != "" {
			out = append(out, "want "+pendingWant)
			pendingWant = ""
		}
	}
	for i, line := range strings.Split(strings.TrimRight(string(data), "\n"), "\n") {
		if strings.HasPrefix(line, "want ") {
			continue
		}
		if strings.HasPrefix(line, "case ") || strings.TrimSpace(line) == "" || strings.HasPrefix(line, "#") {
			flush()
		}
		out = append(out, line)
		if a, ok := byLine[i+1]; ok {
			pendingWant = a
		}
	}
	flush()
	if err := os.WriteFile(path, []byte(strings.Join(out, "\n")+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
}
