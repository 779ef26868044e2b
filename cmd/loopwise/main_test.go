package main

import (
	"flag"
	"os"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/cli from the actual output")

// TestMain registers the command so scripts can run it as "loopwise"; the
// test binary re-executes itself under that name.
func TestMain(m *testing.M) {
	testscript.Main(m, map[string]func(){
		"loopwise": func() { os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr)) },
	})
}

// TestScripts runs the CLI and REPL scripts in testdata/cli. Each script runs
// in a fresh work directory with HOME and the config directory pointed
// inside it, so a user's own history or settings never leak in.
func TestScripts(t *testing.T) {
	testscript.Run(t, testscript.Params{
		Dir:                 "../../testdata/cli",
		UpdateScripts:       *update,
		RequireExplicitExec: true,
		RequireUniqueNames:  true,
		Setup: func(env *testscript.Env) error {
			env.Setenv("HOME", env.WorkDir+"/home")
			env.Setenv("XDG_CONFIG_HOME", env.WorkDir+"/home/.config")
			return nil
		},
	})
}
