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
	budget = runtime.ScriptBudget
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			rest = append(rest, args[i:]...)
			break
		}
		name, val, hasVal := strings.Cut(strings.TrimPrefix(a, "-"), "=")
		if !strings.HasPrefix(a, "-") || (name != "budget" && name != "-budget") {
			rest = append(rest, a)
			continue
		}
		if !hasVal {
			if i+1 == len(args) {
				fmt.Fprintf(stderr, "loopwise %s: -budget needs a number of seconds\n", cmd)
				return nil, 0, 2
			}
			i++
			val = args[i]
		}
		x, err := strconv.ParseFloat(val, 64)
		if err != nil || !(x >= 0.001 && x <= runtime.MaxBudget) {
			fmt.Fprintf(stderr, "loopwise %s: -budget must be a number of seconds from 0.001 to %g, got %q\n", cmd, runtime.MaxBudget, val)
			return nil, 0, 2
		}
		budget = x
	}
	return rest, budget, 0
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
