package builtins_test

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// csvSession is a session reading data files from a fresh directory
// holding the given files.
func csvSession(t *testing.T, files map[string]string) (*runtime.Session, string) {
	t.Helper()
	dir := t.TempDir()
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	s := runtime.NewSession(builtins.Standard())
	s.InDir = dir
	return s, dir
}

// TestPathFromCSV: a rectangle 40 mm × 25 mm listed in mm (closed by
// repeating the first point), in cm with columns in another order, and
// open. Its length is 130 mm by arithmetic; the path must equal
// polygon(...) of the same corners, whose inductance is compared exactly
// (the same computation on the same pieces: this checks the reading, not
// the inductance).
func TestPathFromCSV(t *testing.T) {
	s, _ := csvSession(t, map[string]string{
		"mm.csv":   "# invented outline\r\nx [mm], y [mm], z [mm]\r\n0, 0, 0\r\n40, 0, 0\r\n40, 25, 0\r\n\r\n0, 25, 0\r\n0, 0, 0\r\n",
		"cm.csv":   "\ufeffz [cm],x [cm],y [cm]\n0,0,0\n0,4,0\n0,4,2.5\n0,0,2.5\n",
		"open.csv": "x [m], y [m], z [m]\n0, 0, 0\n0.04, 0, 0\n0.04, 0.025, 0\n",
	})
	eval := func(line string) runtime.Value {
		t.Helper()
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line)
		if err != nil {
			t.Fatalf("%s: %v", line, err)
		}
		return res.Value
	}
	want := eval(`inductance(polygon([0, 0, 0] mm, [40, 0, 0] mm, [40, 25, 0] mm, [0, 25, 0] mm), 0.3 mm)`).(runtime.Quantity)
	for _, c := range []string{`path_from_csv("mm.csv")`, `path_from_csv("cm.csv", "closed")`} {
		if l := eval(`length(` + c + `)`).(runtime.Quantity); math.Abs(l.V-0.13) > 1e-15 {
			t.Errorf("%s: length %.17g m, want 0.13 m", c, l.V)
		}
		if l := eval(`inductance(` + c + `, 0.3 mm)`).(runtime.Quantity); l.V != want.V {
			t.Errorf("%s: inductance %.17g H, polygon %.17g H", c, l.V, want.V)
		}
	}
	if l := eval(`length(path_from_csv("open.csv"))`).(runtime.Quantity); math.Abs(l.V-0.065) > 1e-15 {
		t.Errorf("open path: length %.17g m, want 0.065 m", l.V)
	}
	if got := eval(`path_from_csv("cm.csv")`).(runtime.Shower).Show(6); !strings.Contains(got, "open") {
		t.Errorf(`cm.csv without "closed": %s, want an open path`, got)
	}
}

// TestPathFromCSVErrors: every bad file or name is a positioned error with
// the file and line where it applies; nothing outside the directory is read.
func TestPathFromCSVErrors(t *testing.T) {
	s, dir := csvSession(t, map[string]string{
		"short.csv":  "x [mm], y [mm], z [mm]\n0, 0, 0\n1, 2\n",
		"word.csv":   "x [mm], y [mm], z [mm]\n0, 0, 0\n1, two, 3\n",
		"hex.csv":    "x [mm], y [mm], z [mm]\n0, 0, 0\n0x10, 0, 0\n",
		"inf.csv":    "x [mm], y [mm], z [mm]\n0, 0, 0\ninf, 0, 0\n",
		"unit.csv":   "x [mm], y [s], z [mm]\n",
		"nounit.csv": "x, y, z\n",
		"twice.csv":  "x [mm], x [mm], z [mm]\n",
		"noz.csv":    "x [mm], y [mm]\n0, 0\n1, 1\n",
		"dup.csv":    "x [mm], y [mm], z [mm]\n0, 0, 0\n0, 0, 0\n1, 0, 0\n",
		"empty.csv":  "# nothing\n",
		"one.csv":    "x [mm], y [mm], z [mm]\n1, 2, 3\n",
		"long.csv":   "x [mm], y [mm], z [mm]\n" + strings.Repeat("1", 5000) + ", 0, 0\n",
		"big.csv":    "x [mm], y [mm], z [mm]\n1e400, 0, 0\n2, 0, 0\n",
	})
	outside := filepath.Join(filepath.Dir(dir), filepath.Base(dir)+"-secret.csv")
	if err := os.WriteFile(outside, []byte("x [mm], y [mm], z [mm]\n0,0,0\n1,0,0\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.Remove(outside) })
	if err := os.Symlink(outside, filepath.Join(dir, "link.csv")); err != nil {
		t.Fatal(err)
	}
	os.Mkdir(filepath.Join(dir, "sub"), 0o755)
	for _, c := range []struct{ in, msg string }{
		{`path_from_csv("short.csv")`, `short.csv:3: 2 fields, but the header has 3`},
		{`path_from_csv("word.csv")`, `word.csv:3: y = "two" is not a decimal number`},
		{`path_from_csv("hex.csv")`, `hex.csv:3: x = "0x10" is not a decimal number`},
		{`path_from_csv("inf.csv")`, `inf.csv:3: x = "inf" is not a decimal number`},
		{`path_from_csv("unit.csv")`, `unit.csv:1: column y: the unit must be a length, such as mm, not "s"`},
		{`path_from_csv("nounit.csv")`, `nounit.csv:1: the header names each column with its unit in brackets, as x [mm], y [mm], z [mm]; not "x"`},
		{`path_from_csv("twice.csv")`, `twice.csv:1: the column x appears twice`},
		{`path_from_csv("noz.csv")`, `noz.csv:1: the header has no column z`},
		{`path_from_csv("dup.csv")`, `dup.csv:3: the point is the same as the one on line 2`},
		{`path_from_csv("empty.csv")`, `empty.csv has no header line`},
		{`path_from_csv("one.csv")`, `one.csv has 1 distinct points; a path needs at least 2`},
		{`path_from_csv("long.csv")`, `long.csv:2: the line is longer than 4096 bytes`},
		{`path_from_csv("big.csv")`, `big.csv:2: x: number "1e400" is too large`},
		{`path_from_csv("missing.csv")`, `cannot read missing.csv: no such file or directory`},
		{`path_from_csv("sub")`, `sub is not a regular file`},
		{`path_from_csv("../` + filepath.Base(outside) + `")`, `leaves the script's directory`},
		{`path_from_csv("` + outside + `")`, `leaves the script's directory`},
		{`path_from_csv("link.csv")`, `leaves the script's directory`},
		{`path_from_csv("short.csv", "round")`, `the closure is "open" or "closed", not "round"`},
		{`path_from_csv(3 m)`, `the file name is text in quotes`},
	} {
		_, err := s.Eval(lang.Pos{Line: 7, Col: 1}, c.in)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("%s: error %v, want a positioned error", c.in, err)
			continue
		}
		if !strings.Contains(err.Error(), c.msg) || !strings.Contains(err.Error(), "7:1") {
			t.Errorf("%s: error\n%v\nwant one at 7:1 containing %q", c.in, err, c.msg)
		}
	}
	// a session without an input directory reads nothing
	bare := runtime.NewSession(builtins.Standard())
	if _, err := bare.Eval(lang.Pos{Line: 1, Col: 1}, `path_from_csv("short.csv")`); err == nil || !strings.Contains(err.Error(), "reads no data files") {
		t.Errorf("session without InDir: %v", err)
	}
}
