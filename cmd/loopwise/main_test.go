package main

import (
	"errors"
	"flag"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// runMainEnv makes the test binary run the command (see TestMain).
const runMainEnv = "LOOPWISE_TEST_RUN_MAIN"

var update = flag.Bool("update", false, "rewrite the golden files in testdata/cli from the actual output")

// TestMain registers the command so scripts can run it as "loopwise": the
// test binary re-executes itself under that name.
//
// With runMainEnv set the test binary is the command itself: the terminal
// tests start it on a pseudo-terminal that way.
func TestMain(m *testing.M) {
	if os.Getenv(runMainEnv) == "1" {
		os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
	}
	testscript.Main(m, map[string]func(){
		"loopwise": func() { os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr)) },
	})
}

// TestScripts runs the CLI and REPL scripts in testdata/cli; go test
// ./cmd/loopwise -update rewrites their golden sections from the output.
// The numbers in the goldens are computed by Loopwise: they guard output
// and behaviour against drift only (the builtins' own tests compare with
// outside sources).
//
// Each script runs in a fresh work directory with HOME inside it, so the
// user's own config dir (the prompt's history file) is never read.
func TestScripts(t *testing.T) {
	testscript.Run(t, testscript.Params{
		Dir:                 "../../testdata/cli",
		UpdateScripts:       *update,
		RequireExplicitExec: true,
		RequireUniqueNames:  true,
		Setup: func(env *testscript.Env) error {
			env.Setenv("HOME", filepath.Join(env.WorkDir, "home"))
			return nil
		},
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){
			"exitcode":  cmdExitcode,
			"droplines": cmdDroplines,
		},
	})
}

// cmdExitcode runs "exitcode N program args..." like exec, and fails unless
// the program exits with status N; exec itself only tells zero from non-zero,
// and loopwise gives 1 for a failed calculation and 2 for a usage error.
func cmdExitcode(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) < 2 {
		ts.Fatalf("usage: exitcode N program [args...]")
	}
	want, err := strconv.Atoi(args[0])
	if err != nil {
		ts.Fatalf("exitcode: %v", err)
	}
	got := 0
	if err := ts.Exec(args[1], args[2:]...); err != nil {
		var ee *exec.ExitError
		if !errors.As(err, &ee) {
			ts.Fatalf("exitcode: %v", err)
		}
		got = ee.ExitCode()
	}
	if got != want {
		ts.Fatalf("%s exited with status %d, want %d", args[1], got, want)
	}
}

// cmdDroplines runs "droplines N src dst": it writes src without its first
// N lines to dst, so a golden can skip a line that holds the date.
func cmdDroplines(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 3 {
		ts.Fatalf("usage: droplines N src dst")
	}
	n, err := strconv.Atoi(args[0])
	if err != nil {
		ts.Fatalf("droplines: %v", err)
	}
	lines := strings.SplitAfter(ts.ReadFile(args[1]), "\n")
	if n > len(lines) {
		n = len(lines)
	}
	ts.Check(os.WriteFile(ts.MkAbs(args[2]), []byte(strings.Join(lines[n:], "")), 0o666))
}

// TestDevNullIsNotATerminal: /dev/null is a character device but not a
// terminal; the prompt must read it as empty input and exit 0 at once.
func TestDevNullIsNotATerminal(t *testing.T) {
	f, err := os.Open(os.DevNull)
	if err != nil {
		t.Skip(err)
	}
	defer f.Close()
	if isTerminal(f) {
		t.Fatal("isTerminal(/dev/null) = true")
	}
	var out, errOut strings.Builder
	if code := run(nil, f, &out, &errOut); code != 0 || out.Len() != 0 || errOut.Len() != 0 {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out.String(), errOut.String())
	}
}
