package main

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"time"
	"unicode"

	"github.com/peterh/liner"
	"golang.org/x/term"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

const (
	prompt = "lw> "
	// morePrompt asks for the next line of a statement whose bracket is
	// still open.
	morePrompt = "..  "
)

// console evaluates what a user types; it knows nothing of terminals, so
// tests feed it lines from any reader.
type console struct {
	s      *runtime.Session
	out    io.Writer
	errOut io.Writer
	n      int  // lines read so far
	failed bool // some line gave an error
	// pending holds the lines of a statement whose bracket is still open;
	// start is the number of its first line.
	pending []string
	start   int
	// width is the terminal's width in columns for wrapping help text,
	// 0 when the output is not a terminal (then lines are not wrapped).
	width int
}

func newConsole(out, errOut io.Writer) *console {
	s := newSession()
	s.InDir = "." // data files are read from the working directory
	return &console{s: s, out: out, errOut: errOut}
}

// more reports whether a statement waits for its next line.
func (c *console) more() bool { return len(c.pending) > 0 }

// prompt is what to ask the next line with.
func (c *console) prompt() string {
	if c.more() {
		return morePrompt
	}
	return prompt
}

// drop forgets a statement still waiting for lines (Ctrl-C).
func (c *console) drop() { c.pending = nil }

// finish evaluates a statement left open at the end of the input, which
// reports its unclosed bracket.
func (c *console) finish() {
	if c.more() {
		c.eval(strings.Join(c.pending, "\n"))
		c.pending = nil
	}
}

// line handles one input line; it reports whether the user asked to quit.
// A statement continues over the following lines while a bracket is open.
func (c *console) line(text string) (quit bool) {
	c.n++
	if !c.more() {
		c.start = c.n
		if strings.HasPrefix(strings.TrimSpace(text), ":") {
			return c.eval(text) // commands take one line
		}
	}
	c.pending = append(c.pending, text)
	joined := strings.Join(c.pending, "\n")
	if lang.NeedsMore(joined) {
		return false
	}
	c.pending = nil
	return c.eval(joined)
}

// eval handles one whole statement.
func (c *console) eval(text string) (quit bool) {
	st, err := lang.ParseStatement(lang.Pos{Line: c.start, Col: 1}, text)
	if err != nil {
		c.fail(err)
		return false
	}
	if st.Kind == lang.Command {
		switch st.Cmd {
		case "quit", "exit":
			return true
		case "help":
			c.help(st)
			return false
		case "vars":
			c.vars()
			return false
		case "units":
			c.units(st.Args)
			return false
		case "save":
			c.save(st)
			return false
		case "load":
			c.load(st)
			return false
		}
	}
	res, err := c.s.Exec(st)
	if errors.Is(err, runtime.ErrNotSessionCommand) {
		c.fail(st.Errorf(0, len([]rune(strings.TrimSpace(st.Text))), "unknown command :%s; type :help for the list", st.Cmd))
		return false
	}
	if err != nil {
		c.fail(err)
		return false
	}
	switch {
	case st.Kind == lang.Empty:
	case st.Kind == lang.Assign:
		fmt.Fprintf(c.out, "%s = %s\n", st.Name, res.Text)
		if p, ok := res.Value.(*builtins.Plot); ok {
			fmt.Fprintln(c.out, p.Where()) // a named plot also says where it went
		}
	default:
		fmt.Fprintln(c.out, res.Text)
	}
	if res.Note != "" {
		fmt.Fprintln(c.errOut, res.Note)
	}
	return false
}

func (c *console) fail(err error) {
	c.failed = true
	fmt.Fprintln(c.errOut, err)
}

func (c *console) vars() {
	vs := c.s.Variables()
	if len(vs) == 0 {
		fmt.Fprintln(c.out, "no variables yet; assign one with: gap = 4 mm")
		return
	}
	w := 0
	for _, v := range vs {
		w = max(w, len(v.Name))
	}
	for _, v := range vs {
		if f, ok := v.Value.(*runtime.Func); ok {
			fmt.Fprintf(c.out, "%-*s  %s\n", w, v.Name, runtime.Format(f, c.s.Digits))
			continue
		}
		fmt.Fprintf(c.out, "%-*s  %s\n", w, v.Name, v.Text)
	}
}

func (c *console) units(filter string) {
	fmt.Fprintln(c.out, "symbol   name                      size in SI units                  defined by")
	for _, u := range runtime.Catalogue() {
		if filter != "" && !strings.Contains(u.Sym+" "+u.Name, filter) {
			continue
		}
		size := runtime.Format(runtime.Quantity{V: u.Factor * pow10(u.Exp10), D: u.Dim}, 12)
		if u.Dim.IsZero() {
			size = runtime.FormatNumber(u.Factor*pow10(u.Exp10), 12) + " (dimensionless)"
		}
		if u.Offset != 0 {
			size += ", 0 " + u.Sym + " = " + runtime.FormatNumber(u.Offset, 12) + " K"
		}
		pre := ""
		if u.Prefix {
			pre = " *"
		}
		fmt.Fprintf(c.out, "%-8s %-25s %-33s %s\n", u.Sym+pre, u.Name, size, u.Defined)
	}
	fmt.Fprintf(c.out, "* takes SI prefixes: %s (u is micro, like µ)\n", strings.Join(runtime.PrefixSymbols(), " "))
	fmt.Fprintln(c.out, "compound units need no spaces: 3 A/ms, 2 kg*m^2/s^2, 1.5 W/(m*K)")
}

func pow10(n int) float64 {
	x := 1.0
	for ; n > 0; n-- {
		x *= 10
	}
	for ; n < 0; n++ {
		x /= 10
	}
	return x
}

// save writes the session as a script. ":save FILE" writes a new file and
// refuses one that exists; ":save! FILE" replaces it. The name may be
// quoted, may start with ~ for the home directory, and gets .lw when it has
// no extension; a directory is refused.
func (c *console) save(st *lang.Statement) {
	overwrite := strings.HasPrefix(strings.TrimSpace(st.Text), ":save!")
	arg := st.Args
	if overwrite {
		arg = strings.TrimSpace(strings.TrimPrefix(arg, "!"))
	}
	path, err := fileArg(arg)
	if err != nil {
		c.fail(st.Errorf(0, 5, "%v", err))
		return
	}
	if path == "" {
		c.fail(st.Errorf(0, 5, ":save needs a file name, as in :save coil.lw"))
		return
	}
	if fi, err := os.Stat(path); (err == nil && fi.IsDir()) || strings.HasSuffix(path, "/") || strings.HasSuffix(path, string(filepath.Separator)) {
		c.fail(st.Errorf(0, 5, "cannot save: %s is a directory; name a file in it, as in :save %s", path, filepath.Join(path, "session"+runtime.ScriptExt)))
		return
	}
	if filepath.Ext(path) == "" {
		path += runtime.ScriptExt
	}
	title := "Loopwise session of " + time.Now().Format("2006-01-02 15:04")
	err = runtime.WriteFile(path, runtime.SessionScript(title, c.s.Transcript), overwrite)
	if errors.Is(err, runtime.ErrExists) {
		c.fail(st.Errorf(0, 5, "cannot save: %s exists; :save! %s replaces it", path, quoteArg(path)))
		return
	}
	if err != nil {
		c.fail(st.Errorf(0, 5, "cannot save: %v", errors.Unwrap(err)))
		return
	}
	fmt.Fprintf(c.out, "saved %d statement%s to %s\n", len(c.s.Transcript), plural(len(c.s.Transcript)), path)
}

// fileArg reads the file name given to :save or :load: quotes around it
// are removed and a leading ~ is the home directory.
func fileArg(arg string) (string, error) {
	arg = strings.TrimSpace(arg)
	if n := len(arg); n >= 2 && (arg[0] == '"' || arg[0] == '\'') && arg[n-1] == arg[0] {
		arg = arg[1 : n-1]
	} else if n >= 1 && (arg[0] == '"' || arg[0] == '\'') {
		return "", fmt.Errorf("the file name's quote %c is not closed", arg[0])
	}
	if arg == "~" || strings.HasPrefix(arg, "~/") || strings.HasPrefix(arg, "~"+string(filepath.Separator)) {
		home, err := os.UserHomeDir()
		if err != nil {
			return "", fmt.Errorf("cannot find the home directory for ~: %v", err)
		}
		arg = filepath.Join(home, arg[1:])
	}
	return arg, nil
}

// quoteArg quotes a file name that holds a space, as :save and :load read it.
func quoteArg(path string) string {
	if strings.ContainsAny(path, " \t") {
		return `"` + path + `"`
	}
	return path
}

func (c *console) load(st *lang.Statement) {
	path, err := fileArg(st.Args)
	if err != nil {
		c.fail(st.Errorf(0, 5, "%v", err))
		return
	}
	if path == "" {
		c.fail(st.Errorf(0, 5, ":load needs a file name, as in :load coil.lw"))
		return
	}
	sc, err := load(path)
	if _, positioned := lang.AsError(err); err != nil && !positioned {
		c.fail(st.Errorf(0, 5, "cannot load: %v", err))
		return
	}
	if err == nil {
		err = sc.Run(c.s, c.out)
	}
	var none *runtime.NoStatementsError
	switch {
	case errors.As(err, &none):
		c.fail(err)
	case err != nil:
		c.fail(err)
		fmt.Fprintln(c.errOut, "(statements before the error are kept)")
	}
}

// repl runs the interactive prompt, or reads statements line by line when
// stdin is not a terminal.
func repl(stdin io.Reader, stdout, stderr io.Writer) int {
	c := newConsole(stdout, stderr)
	if f, ok := stdin.(*os.File); ok && isTerminal(f) && liner.TerminalSupported() {
		c.s.OutDir = promptOut // piped input writes no files
		if w, _, err := term.GetSize(int(os.Stdout.Fd())); err == nil && w >= 40 {
			c.width = w
		}
		return terminalLoop(c)
	}
	c.s.SetProgress(progressPrinter(stderr))
	lr := newLineReader(stdin)
	quit := false
	for !quit {
		text, tooLong, err := lr.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			fmt.Fprintf(stderr, "loopwise: reading input: %v\n", err)
			return 1
		}
		if tooLong {
			c.tooLong(text)
			continue
		}
		quit = c.line(text)
	}
	if !quit {
		c.finish()
	}
	if c.failed {
		return 1
	}
	return 0
}

// lineReader reads input lines of any length without holding more than
// lang.MaxLineBytes of one: a longer line cannot be a statement, and is
// reported and skipped. A byte-order mark before the first line is
// skipped; a line's ending (LF or CR LF) is removed.
type lineReader struct {
	r    *bufio.Reader
	read bool // a line has been read
}

func newLineReader(r io.Reader) *lineReader {
	return &lineReader{r: bufio.NewReaderSize(r, 64*1024)}
}

// next returns the next line, whether it was too long (then line holds
// its first lang.MaxLineBytes bytes), or io.EOF after the last line.
func (lr *lineReader) next() (line string, tooLong bool, err error) {
	var buf []byte
	any := false
	for {
		frag, err := lr.r.ReadSlice('\n')
		any = any || len(frag) > 0
		if !tooLong {
			if len(buf)+len(frag) > lang.MaxLineBytes+2 { // +2: the line ending
				frag = frag[:max(0, lang.MaxLineBytes-len(buf))]
				tooLong = true
			}
			buf = append(buf, frag...)
		}
		if err == bufio.ErrBufferFull {
			continue
		}
		if err != nil && (err != io.EOF || !any) {
			return "", false, err
		}
		break
	}
	if !tooLong {
		buf = bytes.TrimSuffix(buf, []byte("\n"))
		buf = bytes.TrimSuffix(buf, []byte("\r"))
	}
	if !lr.read {
		buf = bytes.TrimPrefix(buf, []byte(runtime.ByteOrderMark))
		lr.read = true
	}
	return string(buf), tooLong, nil
}

// tooLong reports an input line longer than a statement may be; the line
// is skipped, and a statement it continued is dropped with it.
func (c *console) tooLong(text string) {
	c.finish() // a statement left open reports its own error first
	c.n++
	e := lang.TooLongError(lang.Pos{Line: c.n, Col: 1}, text)
	e.Msg += "; the line was skipped"
	c.fail(e)
}

// isTerminal asks the terminal driver (golang.org/x/term), not the file
// mode: /dev/null is a character device but not a terminal.
func isTerminal(f *os.File) bool {
	return term.IsTerminal(int(f.Fd()))
}

// progressPrinter shows, on w, the progress of work that has run for more
// than a second: on a terminal one line rewritten in place at most five
// times a second and cleared when the work ends; elsewhere (a pipe, a log,
// CI) a plain line at most every ten seconds. Reports may come from
// several goroutines.
func progressPrinter(w io.Writer) runtime.ProgressFunc {
	f, ok := w.(*os.File)
	return progressPrinterOn(w, ok && isTerminal(f), time.Now)
}

func progressPrinterOn(w io.Writer, tty bool, clock func() time.Time) runtime.ProgressFunc {
	every := 10 * time.Second
	if tty {
		every = 200 * time.Millisecond
	}
	var (
		mu          sync.Mutex
		start, last time.Time
		label       string
		shown       bool
	)
	return func(l string, done, total int) {
		mu.Lock()
		defer mu.Unlock()
		now := clock()
		if total < 0 { // the statement ended: clear a line left standing
			if shown && tty {
				fmt.Fprintf(w, "\r%s\r", strings.Repeat(" ", 60))
			}
			label, start, shown = "", time.Time{}, false
			return
		}
		if l != label || done <= 0 || start.IsZero() {
			label, start, last, shown = l, now, time.Time{}, false
		}
		if now.Sub(start) < time.Second {
			return
		}
		if done >= total {
			if shown && tty {
				fmt.Fprintf(w, "\r%s\r", strings.Repeat(" ", 60))
			}
			start = time.Time{}
			return
		}
		if !last.IsZero() && now.Sub(last) < every {
			return
		}
		last, shown = now, true
		pct := 100 * done / max(total, 1)
		if tty {
			fmt.Fprintf(w, "\r%s: %d%% (%d of %d)", label, pct, done, total)
		} else {
			fmt.Fprintf(w, "%s: %d%% (%d of %d) after %.0f s\n", label, pct, done, total, now.Sub(start).Seconds())
		}
	}
}

// complete offers names, units and commands for the word before pos.
func complete(s *runtime.Session, line string, pos int) (string, []string, string) {
	r := []rune(line)
	if pos > len(r) {
		pos = len(r)
	}
	start := pos
	for start > 0 && (unicode.IsLetter(r[start-1]) || unicode.IsDigit(r[start-1]) || r[start-1] == '_' || r[start-1] == ':' || r[start-1] == 'µ') {
		start--
	}
	word := string(r[start:pos])
	if word == "" {
		return line[:len(string(r[:pos]))], nil, string(r[pos:])
	}
	var cands []string
	if strings.HasPrefix(word, ":") {
		for _, cmd := range commandNames {
			if strings.HasPrefix(cmd, word) {
				cands = append(cands, cmd)
			}
		}
	} else {
		seen := map[string]bool{}
		add := func(n string) {
			if strings.HasPrefix(n, word) && !seen[n] {
				seen[n] = true
				cands = append(cands, n)
			}
		}
		for _, n := range s.Names() {
			add(n)
		}
		for _, u := range runtime.Catalogue() {
			add(u.Sym)
		}
		sort.Strings(cands)
	}
	return string(r[:start]), cands, string(r[pos:])
}

var commandNames = []string{":help", ":vars", ":units", ":save", ":load", ":digits", ":numerr", ":budget", ":quit"}
