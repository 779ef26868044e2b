package main

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"loopwise/runtime"
)

// budgetUsage is the -budget part of the usage of run, check and record.
const budgetUsage = `  -budget SECONDS: the work one statement may do, in seconds of work on
  this machine class (default 60); a statement estimated to need more is
  refused with its estimate, before it starts. A script may set its own
  with a :budget SECONDS line.
`

// takeBudget removes a -budget SECONDS (or -budget=SECONDS) flag from the
// arguments of run, check or record, anywhere before "--", and returns the
// rest and the budget (runtime.ScriptBudget when not given). On a bad value
// it has printed why and code is 2.
func takeBudget(cmd string, args []string, stderr io.Writer) (rest []string, budget float64, code int) {
	rest, val, found, code := takeFlag(cmd, "budget", "a number of seconds", args, stderr)
	if code != 0 || !found {
		return rest, runtime.ScriptBudget, code
	}
	x, err := strconv.ParseFloat(val, 64)
	if err != nil || !(x >= 0.001 && x <= runtime.MaxBudget) {
		fmt.Fprintf(stderr, "loopwise %s: -budget must be a number of seconds from 0.001 to %g, got %q\n", cmd, runtime.MaxBudget, val)
		return nil, 0, 2
	}
	return rest, x, 0
}

// takeFlag removes a -NAME VALUE (or -NAME=VALUE, or with two dashes) flag
// from args, anywhere before "--": the commands take flags after the file
// names too, which the flag package does not (it stops at the first
// argument that is not a flag). The last one given counts. A missing or
// empty value has printed why, and code is 2.
func takeFlag(cmd, name, need string, args []string, stderr io.Writer) (rest []string, val string, found bool, code int) {
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			rest = append(rest, args[i:]...)
			break
		}
		n, v, hasVal := strings.Cut(strings.TrimPrefix(a, "-"), "=")
		if !strings.HasPrefix(a, "-") || (n != name && n != "-"+name) {
			rest = append(rest, a)
			continue
		}
		if !hasVal {
			if i+1 == len(args) {
				fmt.Fprintf(stderr, "loopwise %s: -%s needs %s\n", cmd, name, need)
				return nil, "", false, 2
			}
			i++
			v = args[i]
		}
		val, found = v, true
	}
	return rest, val, found, 0
}

// scriptSession is a session for run, check and record, with the given
// work budget.
func scriptSession(budget float64, progress io.Writer) *runtime.Session {
	s := newSession()
	s.Budget = budget
	if progress != nil {
		s.SetProgress(progressPrinter(progress))
	}
	return s
}
