package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime/debug"
	"strings"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

const usage = `usage:
  loopwise                          interactive prompt (reads a pipe line by line)
  loopwise FILE.lw                  same as loopwise run FILE.lw
  loopwise run FILE|DIR...          evaluate scripts and print the worked calculation
  loopwise check [-tol R] FILE|DIR...
                                    re-evaluate scripts and compare recorded results
                                    (relative tolerance R, default 1e-9); exit 1 on drift
                                    or when a file holds no statement
  loopwise record FILE|DIR...       rewrite recorded results in place (atomically)
  loopwise report [-o OUT.html] FILE
                                    write the script as one self-contained HTML page:
                                    prose, results, tables, plots, cautions, drift status
  loopwise watch [-port N] FILE     serve the report on 127.0.0.1 and update it on every save
  run, check, record, report and watch take -budget SECONDS: the work one statement may do
  (default 60 s; at the prompt 5 s, changed with :budget SECONDS)
  loopwise version                  the version of this build
  loopwise help                     this text; type :help at the prompt for the language
Every command takes -h for its own usage.
`

// commandUsage is what -h prints for each command.
var commandUsage = map[string]string{
	"run": `usage: loopwise run [-budget SECONDS] [-out DIR] FILE|DIR...
  Evaluate each script (directories are searched for *.lw) and print the
  worked calculation: statements, results and cautions. Stops a file at its
  first error (FILE:LINE:COL, the line and a caret) and exits 1.
` + budgetUsage + outUsage,
	"check": `usage: loopwise check [-tol R] [-budget SECONDS] FILE|DIR...
  Re-evaluate each script and compare every recorded result with the new
  one, numbers within the relative tolerance R (default 1e-9). Exits 1 and
  reports each drifted result when any differs. Writes no files: a plot's
  data is compared, its picture is not drawn to disk.
` + budgetUsage,
	"record": `usage: loopwise record [-budget SECONDS] [-out DIR] FILE|DIR...
  Evaluate each script and write the new results into it, in place and
  atomically: on an error the file is left untouched.
` + budgetUsage + outUsage,
	"report": reportUsage,
	"watch":  watchUsage,
	"version": `usage: loopwise version
  Print the version of this build: module version, source revision and Go
  version.
`,
}

// version describes this build from the information the Go toolchain
// embeds (module version, and the VCS revision when built from a checkout).
func version() string {
	v, rev, dirty := "(devel)", "", ""
	goVersion := ""
	if bi, ok := debug.ReadBuildInfo(); ok {
		goVersion = bi.GoVersion
		if bi.Main.Version != "" {
			v = bi.Main.Version
		}
		for _, s := range bi.Settings {
			switch s.Key {
			case "vcs.revision":
				rev = s.Value
				if len(rev) > 12 {
					rev = rev[:12]
				}
			case "vcs.modified":
				if s.Value == "true" {
					dirty = "+changes"
				}
			}
		}
	}
	out := "loopwise " + v
	if rev != "" {
		out += " " + rev + dirty
	}
	if goVersion != "" {
		out += " (" + goVersion + ")"
	}
	return out
}

// wantsHelp reports whether a command's arguments ask for its usage.
func wantsHelp(args []string) bool {
	for _, a := range args {
		switch a {
		case "-h", "-help", "--help":
			return true
		case "--":
			return false
		}
	}
	return false
}

func newSession() *runtime.Session {
	return runtime.NewSession(builtins.Standard())
}

// run is main without os.Exit, so tests can call it.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		return repl(stdin, stdout, stderr)
	}
	cmd, rest := args[0], args[1:]
	if u, ok := commandUsage[cmd]; ok && wantsHelp(rest) {
		fmt.Fprint(stdout, u)
		return 0
	}
	switch cmd {
	case "version", "-version", "--version":
		fmt.Fprintln(stdout, version())
		return 0
	case "run":
		return runFiles(rest, stdout, stderr)
	case "check":
		return checkFiles(rest, stdout, stderr)
	case "record":
		return recordFiles(rest, stdout, stderr)
	case "report":
		return reportFiles(rest, stdout, stderr)
	case "watch":
		return watchFiles(rest, stdout, stderr)
	case "help", "-h", "-help", "--help":
		fmt.Fprint(stdout, usage)
		return 0
	}
	if strings.HasSuffix(cmd, runtime.ScriptExt) {
		return runFiles(args, stdout, stderr)
	}
	fmt.Fprintf(stderr, "loopwise: unknown command %q\n%s", cmd, usage)
	return 2
}

// expand lists the scripts named by args; on failure it has printed why.
// It returns the exit status to use on failure: 2 for a usage error, 1 for
// a file that cannot be read.
func expand(cmd string, args []string, stderr io.Writer) ([]string, int) {
	if len(args) == 0 {
		fmt.Fprintf(stderr, "loopwise %s: name at least one script file or directory\n", cmd)
		return nil, 2
	}
	files, err := runtime.ExpandPaths(args)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = fmt.Errorf("%s: %v", pe.Path, pe.Err)
		}
		fmt.Fprintf(stderr, "loopwise %s: %v\n", cmd, err)
		return nil, 1
	}
	return files, 0
}

// load reads a script named on the command line (runtime.ReadScript: a
// regular file under the size cap).
func load(path string) (*runtime.Script, error) {
	sc, err := runtime.ReadScript(path)
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = fmt.Errorf("%s: %v", pe.Path, pe.Err)
	}
	return sc, err
}

func runFiles(args []string, stdout, stderr io.Writer) int {
	args, budget, code := takeBudget("run", args, stderr)
	if code != 0 {
		return code
	}
	args, out, code := takeOut("run", args, stderr)
	if code != 0 {
		return code
	}
	files, code := expand("run", args, stderr)
	if code != 0 {
		return code
	}
	status := 0
	for i, f := range files {
		if len(files) > 1 {
			if i > 0 {
				fmt.Fprintln(stdout)
			}
			fmt.Fprintf(stdout, "==> %s <==\n", f)
		}
		sc, err := load(f)
		if err == nil {
			s := scriptSession(budget, stderr)
			s.OutDir = outDirFor(f, out, len(files) > 1)
			s.InDir = filepath.Dir(f)
			err = sc.Run(s, stdout)
		}
		if err != nil {
			fmt.Fprintln(stderr, err)
			status = 1
		}
	}
	return status
}

func checkFiles(args []string, stdout, stderr io.Writer) int {
	args, budget, code := takeBudget("check", args, stderr)
	if code != 0 {
		return code
	}
	fs := flag.NewFlagSet("check", flag.ContinueOnError)
	fs.SetOutput(stderr)
	tol := fs.Float64("tol", runtime.DefaultTolerance, "relative tolerance for numeric results")
	files, err := parseInterleaved(fs, args)
	if err != nil {
		return 2
	}
	if !(*tol >= 0 && *tol < 1) { // also refuses NaN
		fmt.Fprintf(stderr, "loopwise check: -tol must be at least 0 and below 1, got %g\n", *tol)
		return 2
	}
	files, code = expand("check", files, stderr)
	if code != 0 {
		return code
	}
	status := 0
	for _, f := range files {
		sc, err := load(f)
		var rep runtime.CheckReport
		if err == nil {
			s := scriptSession(budget, stderr)
			s.InDir = filepath.Dir(f)
			rep, err = sc.Check(s, *tol)
		}
		if err != nil {
			if len(rep.Drifts) > 0 {
				rep.Write(stdout, f)
			}
			fmt.Fprintln(stderr, err)
			status = 1
			continue
		}
		rep.Write(stdout, f)
		if len(rep.Drifts) > 0 {
			status = 1
		}
	}
	return status
}

func recordFiles(args []string, stdout, stderr io.Writer) int {
	args, budget, code := takeBudget("record", args, stderr)
	if code != 0 {
		return code
	}
	args, out, code := takeOut("record", args, stderr)
	if code != 0 {
		return code
	}
	files, code := expand("record", args, stderr)
	if code != 0 {
		return code
	}
	status := 0
	for _, f := range files {
		sc, err := load(f)
		var data []byte
		if err == nil {
			s := scriptSession(budget, stderr)
			s.OutDir = outDirFor(f, out, len(files) > 1)
			s.InDir = filepath.Dir(f)
			data, err = sc.Record(s)
		}
		if err == nil {
			if werr := runtime.WriteFileAtomic(f, data); werr != nil {
				// the message names f, never the temporary file
				fmt.Fprintf(stderr, "loopwise record: %v\n%s: left unchanged\n", werr, f)
				status = 1
				continue
			}
		}
		if err != nil {
			var le *lang.Error
			var none *runtime.NoStatementsError
			if !errors.As(err, &le) && !errors.As(err, &none) && !strings.HasPrefix(err.Error(), f+": ") {
				err = fmt.Errorf("%s: %w (file left unchanged)", f, err)
			}
			fmt.Fprintln(stderr, err)
			fmt.Fprintf(stderr, "%s: left unchanged\n", f)
			status = 1
			continue
		}
		fmt.Fprintf(stdout, "%s: recorded\n", f)
	}
	return status
}

// parseInterleaved parses fs's flags from args wherever they stand among
// the file names (the flag package alone stops at the first name), and
// returns the names in order.
func parseInterleaved(fs *flag.FlagSet, args []string) ([]string, error) {
	var files []string
	for {
		if err := fs.Parse(args); err != nil {
			return nil, err
		}
		if fs.NArg() == 0 {
			return files, nil
		}
		files = append(files, fs.Arg(0))
		args = fs.Args()[1:]
	}
}
