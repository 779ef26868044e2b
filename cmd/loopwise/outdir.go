package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"loopwise/runtime"
)

// outUsage is the -out part of the usage of run and record.
const outUsage = `  -out DIR: where plots and other files the script writes go (default: a
  folder beside each script named after it, coil.lw → coil-out); with
  several scripts, each writes into DIR/NAME-out.
`

// promptOut is where the prompt writes its files.
const promptOut = "loopwise-out"

// takeOut removes a -out DIR (or -out=DIR) flag from the arguments of run
// or record, anywhere before "--". On a missing value it has printed why
// and code is 2.
func takeOut(cmd string, args []string, stderr io.Writer) (rest []string, out string, code int) {
	rest, out, found, code := takeFlag(cmd, "out", "a directory", args, stderr)
	if code == 0 && found && out == "" {
		fmt.Fprintf(stderr, "loopwise %s: -out needs a directory\n", cmd)
		return nil, "", 2
	}
	return rest, out, code
}

// outDirFor is the output directory of script: out if given (for one
// script), out/NAME-out for one of several, else NAME-out beside it.
func outDirFor(script, out string, several bool) string {
	base := strings.TrimSuffix(filepath.Base(script), runtime.ScriptExt) + "-out"
	switch {
	case out == "":
		return filepath.Join(filepath.Dir(script), base)
	case several:
		return filepath.Join(out, base)
	}
	return out
}
