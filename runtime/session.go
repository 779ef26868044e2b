package runtime

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync/atomic"
	"unicode/utf8"

	"loopwise/lang"
)

// Constant is a named value provided by a library (pi, mu0, ...).
type Constant struct {
	Name  string
	Value Value
	Help  *Help
	// Shadowable lets a user assign the name (j, the imaginary unit, is a
	// natural loop or node name); the assignment carries a note.
	Shadowable bool
}

// Library is what a session starts with: builtin functions and constants.
// The builtins package provides the standard one; the runtime does not
// import it.
type Library struct {
	Funcs  []*Func
	Consts []Constant
	// Caution, when set, returns a safety caution for a result that can
	// hurt someone (a high voltage, say), shown beside it; "" for none.
	Caution func(v Value) string
}

type nameKind int

const (
	kindVar nameKind = iota + 1
	kindUserFunc
	kindBuiltin
	kindConst
)

// Entry is one evaluated statement kept for saving a session as a script.
type Entry struct {
	Line   string // the statement as typed (continued lines joined by newlines)
	Record string // its recorded result
	// More holds the lines recorded after the result (without indentation):
	// a table's rows and the result's cautions. Statements leave it nil
	// and set more, which makes the lines when they are asked for (a
	// long table's rows are formatted only if the session is saved).
	More []string
	more func() []string
}

// MoreLines returns the lines recorded after the result.
func (e Entry) MoreLines() []string {
	if e.More == nil && e.more != nil {
		return e.more()
	}
	return e.More
}

// Session holds the names a user has defined and evaluates statements.
type Session struct {
	vars     map[string]Value
	kinds    map[string]nameKind
	declared map[string]string // name -> declared unit text
	shownAs  map[string]string // name -> unit text it was last shown "as"
	lib      Library
	help     map[string]*Help
	// Digits is the number of significant digits shown (default 6).
	Digits int
	// Budget is the work budget of one statement, in seconds of work
	// (default DefaultBudget; see EvalsPerSecond).
	Budget float64
	work   float64 // work charged in the running statement
	// Transcript lists the statements evaluated without error.
	Transcript []Entry
	depth      int
	tooDeep    bool // the nesting limit was hit in the current statement
	progress   ProgressFunc
	// interrupted is set by Interrupt (from another goroutine, such as a
	// signal handler) and cleared when the next statement starts.
	interrupted atomic.Bool
	// OutDir is where builtins may write files (plots, exports); empty
	// means the session writes none. The command sets it.
	OutDir string
	unc    uncState // uncertain inputs and the values moved by them
	num    numState // numerical error estimates (numerr.go)
	// InDir is where builtins may read data files (ReadInput): the
	// script's directory, or the prompt's working directory; empty means
	// the session reads none. The command sets it.
	InDir string
	notes []string // remarks builtins made on the running statement (AddNote)
}

// Noter is implemented by the session: a builtin's remark on how it
// computed its value joins the result's note.
type Noter interface{ Note(msg string) }

// Note implements Noter; a remark made twice (a statement run again for
// its uncertainty) is kept once.
func (s *Session) Note(msg string) {
	for _, n := range s.notes {
		if n == msg {
			return
		}
	}
	s.notes = append(s.notes, msg)
}

// AddNote adds a remark to the running statement's note, when env keeps
// notes.
func AddNote(env Env, msg string) {
	if n, ok := env.(Noter); ok {
		n.Note(msg)
	}
}

// OutputPath implements Env: name must be a plain relative path that stays
// inside s.OutDir (no "..", not absolute); the directory is created.
func (s *Session) OutputPath(name string) (string, error) {
	if s.OutDir == "" {
		return "", ErrNoOutput
	}
	clean := filepath.Clean(filepath.FromSlash(name))
	if name == "" || filepath.IsAbs(clean) || clean == "." || clean == ".." || strings.HasPrefix(clean, ".."+string(filepath.Separator)) || filepath.VolumeName(clean) != "" {
		return "", fmt.Errorf("the file name %q leaves the output directory %s; give a plain name such as field.svg", name, s.OutDir)
	}
	full := filepath.Join(s.OutDir, clean)
	if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
		return "", err
	}
	return full, nil
}

// Interrupt asks the running statement to stop: long builtins see it
// through Env.Err and return ErrInterrupted. It is safe to call from any
// goroutine; the next statement starts afresh.
func (s *Session) Interrupt() { s.interrupted.Store(true) }

// Err implements Env.
func (s *Session) Err() error {
	if s.interrupted.Load() {
		return ErrInterrupted
	}
	return nil
}

// NewSession starts a session with the given library.
func NewSession(lib Library) *Session {
	s := &Session{
		vars:     map[string]Value{},
		kinds:    map[string]nameKind{},
		declared: map[string]string{},
		shownAs:  map[string]string{},
		help:     map[string]*Help{},
		lib:      lib,
		Digits:   DefaultDigits,
		Budget:   DefaultBudget,
	}
	s.lib.Funcs = append(append([]*Func{}, lib.Funcs...), sessionFuncs()...)
	for _, f := range s.lib.Funcs {
		s.vars[f.Name] = f
		s.kinds[f.Name] = kindBuiltin
		s.help[f.Name] = f.Help
	}
	for _, c := range lib.Consts {
		s.vars[c.Name] = c.Value
		s.kinds[c.Name] = kindConst
		if c.Shadowable {
			s.kinds[c.Name] = kindBuiltin
		}
		s.help[c.Name] = c.Help
	}
	return s
}

func (s *Session) known(name string) bool {
	_, ok := s.kinds[name]
	return ok
}

// Result is the outcome of one statement.
type Result struct {
	Stmt   *lang.Statement
	Value  Value  // nil for empty lines and commands
	Text   string // what to show, at the session's digits
	Record string // what to record in a script ("" when nothing)
	Note   string // remarks for the prompt, cautions included, or ""
	// Cautions are the safety cautions the library attaches to the value;
	// they are part of the result and recorded in scripts.
	Cautions []string
	// Contributions are the uncertain inputs' parts in the value's
	// standard uncertainty (nil when it reads none; see uncertain.go).
	Contributions []Contribution
	// U is the combined standard uncertainty per component (with the
	// correlations given), nil with no contributions.
	U []float64
	// NumErr bounds the numerical error per component, from the methods'
	// own estimates (numerr.go); nil when none was reported.
	NumErr []float64
}

// shadowNote is the note for a name that hides a builtin.
func (s *Session) shadowNote(name string) string {
	if s.kinds[name] == kindBuiltin {
		if _, f := s.vars[name].(*Func); !f {
			return fmt.Sprintf("note: %s now names your value; the built-in %s is hidden in this session (literals such as 4j keep their meaning)", name, name)
		}
		return fmt.Sprintf("note: %s now names your value; the builtin %s is hidden in this session", name, name)
	}
	return ""
}

// ErrNotSessionCommand is returned by Eval for a command the session does
// not handle itself (the REPL handles help, listing, saving, loading).
var ErrNotSessionCommand = errors.New("not a session command")

// Eval parses and evaluates one line. base is the position of the line's
// first character. Every error it returns is a *lang.Error.
func (s *Session) Eval(base lang.Pos, line string) (res *Result, err error) {
	st, err := lang.ParseStatement(base, line)
	if err != nil {
		return nil, err
	}
	return s.Exec(st)
}

// Exec evaluates a parsed statement.
func (s *Session) Exec(st *lang.Statement) (res *Result, err error) {
	defer func() {
		if r := recover(); r != nil {
			// A panic here is a bug in Loopwise, not bad input; report it
			// against the statement instead of crashing the session.
			res, err = nil, st.Errorf(0, utf8.RuneCountInString(st.Text), "internal error (please report): %v", r)
		}
		if s.progress != nil {
			s.progress("", 0, -1) // the statement has ended
		}
	}()
	s.depth, s.tooDeep, s.work = 0, false, 0
	s.notes = nil
	s.interrupted.Store(false)
	s.unc.stmtPM, s.unc.label, s.unc.cur, s.unc.env = nil, nil, nil, nil
	s.num.calls, s.num.cur, s.num.nested, s.num.replay = nil, -1, false, nil
	switch st.Kind {
	case lang.Empty:
		return &Result{Stmt: st}, nil
	case lang.Command:
		return s.command(st)
	case lang.Define:
		return s.define(st)
	}
	if (st.Kind == lang.Expr || st.Kind == lang.Assign) && st.As == "" {
		if res, ok, err := s.correlateOf(st); ok {
			return res, err
		}
		for _, form := range []func(*lang.Statement) (*Result, bool, error){s.sensitivityOf, s.monteCarloOf} {
			if res, ok, err := form(st); ok {
				if err != nil {
					return nil, err
				}
				return s.finishTable(st, res.Value.(Shower))
			}
		}
	}
	p, err := s.compile(st, st.Expr, st.ExprOff, nil, nil)
	if err != nil {
		return nil, err
	}
	s.unc.label = pmLabeller(st, p.rw)
	v, err := s.run(p)
	if err != nil && s.interrupted.Load() {
		// One short message instead of the chain of calls it stopped in.
		e := st.Errorf(0, utf8.RuneCountInString(st.Text), "interrupted; nothing was changed")
		e.Cause = ErrInterrupted
		return nil, e
	}
	if err != nil {
		return nil, s.stopped(st, err)
	}
	if err := checkResult(st, v); err != nil {
		return nil, err
	}
	v = markCycles(v, st.As)
	unit := st.As
	note := ""
	nb, tracked := s.numericalBound(p, v)
	copies, perr := s.propagate(p, v)
	if perr != nil {
		if s.interrupted.Load() {
			e := st.Errorf(0, utf8.RuneCountInString(st.Text), "interrupted; nothing was changed")
			e.Cause = ErrInterrupted
			return nil, e
		}
		if errors.Is(perr, ErrBudget) {
			e := st.Errorf(0, utf8.RuneCountInString(st.Text), "%s", lang.Abbrev(perr.Error(), 400))
			e.Cause = ErrBudget
			return nil, e
		}
		note = "note: the uncertainty is not carried: " + perr.Error()
		copies = nil
	}
	if st.Kind == lang.Assign {
		note = strings.TrimSpace(s.shadowNote(st.Name) + "\n" + note)
		if unit != "" { // a bad "as" unit must not leave the name assigned
			if _, err := s.show(st, v, unit, s.Digits); err != nil {
				return nil, err
			}
		}
		if err := s.assign(st, v); err != nil {
			return nil, err
		}
		s.setWorlds(st.Name, copies)
		s.setNumErr(st.Name, nb)
		s.recordChain(st, p, v, copies != nil)
		if unit == "" {
			unit = s.declared[st.Name]
		} else {
			s.shownAs[st.Name] = unit
		}
	} else if unit == "" {
		if id := strings.TrimSpace(st.Expr); s.kinds[id] == kindVar {
			unit = s.shownAs[id]
			if unit == "" {
				unit = s.declared[id]
			}
		}
	}
	text, err := s.show(st, v, unit, s.Digits)
	if err != nil {
		return nil, err
	}
	if sh, ok := v.(Shower); ok && st.Kind == lang.Assign {
		text = sh.Summary(s.Digits) // a name for a table; show it by typing its name
	}
	rec, _ := s.show(st, v, unit, max(RecordDigits, s.Digits))
	contribs := s.contributions(v, copies)
	uc := s.combined(contribs)
	if u := uc; u != nil {
		if t, err := FormatUncertain(v, u, unit, s.Digits, false); err == nil {
			text = t
		}
		if t, err := FormatUncertain(v, u, unit, max(RecordDigits, s.Digits), true); err == nil {
			rec = t
		}
	}
	if sh, ok := v.(Shower); ok {
		rec = sh.Summary(max(RecordDigits, s.Digits)) // one line for a script
	}
	if nb != nil {
		if s.num.showAll || numErrVisible(v, nb, s.Digits) {
			text += " " + FormatNumErr(v, nb, unit)
		}
		if numErrVisible(v, nb, RecordDigits-2) {
			rec += " " + FormatNumErr(v, nb, unit)
		}
	}
	for _, n := range s.notes {
		note = strings.TrimSpace(note + "\nnote: " + n)
	}
	if !tracked {
		note = strings.TrimSpace(note + "\nnote: a builtin inside a function or a sweep reported a numerical error estimate that is not carried to this result")
	}
	var cautions []string
	if s.lib.Caution != nil {
		if c := s.lib.Caution(v); c != "" {
			note = strings.TrimSpace(note + "\n" + c)
			cautions = append(cautions, strings.Join(strings.Fields(c), " ")) // one line in a script
		}
	}
	res = &Result{Stmt: st, Value: v, Text: text, Record: rec, Note: note, Cautions: cautions, Contributions: contribs, U: uc, NumErr: nb}
	s.Transcript = append(s.Transcript, Entry{Line: st.Text, Record: rec, more: func() []string { return moreLines(res) }})
	return res, nil
}

// checkResult is the last guard before a value is shown, assigned or
// recorded: a statement gives a value, and a number in it is finite. The
// operators and builtins make sure of both, so failing here is a bug.
func checkResult(st *lang.Statement, v Value) error {
	bad := ""
	switch x := v.(type) {
	case nil:
		bad = "gave no value"
	case Quantity:
		if math.IsNaN(x.V) || math.IsInf(x.V, 0) {
			bad = "gave a number that is not finite"
		}
	case Vector:
		for _, c := range x.V {
			if math.IsNaN(c) || math.IsInf(c, 0) {
				bad = "gave a vector with a component that is not finite"
			}
		}
	case Complex:
		if cmplx.IsNaN(x.V) || cmplx.IsInf(x.V) {
			bad = "gave a complex number that is not finite"
		}
	case CVector:
		for _, c := range x.V {
			if cmplx.IsNaN(c) || cmplx.IsInf(c) {
				bad = "gave a vector with a component that is not finite"
			}
		}
	}
	if bad == "" {
		return nil
	}
	return st.Errorf(st.ExprOff, max(1, utf8.RuneCountInString(st.Expr)), "internal error (please report): this expression %s", bad)
}

// show formats v, in unit when one is given.
func (s *Session) show(st *lang.Statement, v Value, unit string, digits int) (string, error) {
	if unit == "" {
		return Format(v, digits), nil
	}
	what := st.Name
	if st.As != "" {
		what = strings.TrimSpace(st.Expr)
	}
	text, err := FormatInExpr(v, unit, digits, what)
	if err != nil {
		off := st.AsOff
		if st.As == "" {
			off = st.DeclaredOff
		}
		var ue *UnitError
		if errors.As(err, &ue) {
			return "", st.Errorf(off+ue.Off, ue.Width, "%s", ue.Msg)
		}
		return "", st.Errorf(off, utf8.RuneCountInString(unit), "%s", err)
	}
	return text, nil
}

// checkAssignable refuses to rebind constants. Builtins may be shadowed
// (a variable called flux or emf is natural); the result carries a note.
func (s *Session) checkAssignable(st *lang.Statement) error {
	switch s.kinds[st.Name] {
	case kindConst:
		return st.Errorf(0, utf8.RuneCountInString(st.Name), "%s is a constant; choose another name", st.Name)
	}
	return nil
}

func (s *Session) assign(st *lang.Statement, v Value) error {
	name := st.Name
	if err := s.checkAssignable(st); err != nil {
		return err
	}
	if _, ok := v.(*Func); ok && reservedCalls[name] {
		return reservedErr(st)
	}
	decl := st.Declared
	if decl == "" {
		decl = s.declared[name]
	}
	if decl != "" {
		u, err := ParseUnit(decl)
		if err != nil {
			var ue *UnitError
			if errors.As(err, &ue) {
				return st.Errorf(st.DeclaredOff+ue.Off, ue.Width, "%s", ue.Msg)
			}
			return err
		}
		var d Dim
		switch x := v.(type) {
		case Quantity:
			d = x.D
		case Vector:
			d = x.D
		case Complex:
			d = x.D
		case CVector:
			d = x.D
		default:
			return st.Errorf(st.ExprOff, utf8.RuneCountInString(st.Expr), "%s is declared in %s; cannot assign %s", name, decl, TypeName(v))
		}
		if d != u.Dim {
			return st.Errorf(st.ExprOff, utf8.RuneCountInString(st.Expr), "%s is declared in %s, which measures %s; cannot assign %s%s", name, decl, u.Dim.Describe(), d.Describe(), angleNote(d, u.Dim))
		}
		v = markCycles(v, decl)
		if st.Declared != "" {
			s.declared[name] = st.Declared
		}
	}
	s.vars[name] = v
	if f, ok := v.(*Func); ok && f.Body != "" {
		s.kinds[name] = kindUserFunc
	} else {
		s.kinds[name] = kindVar
	}
	return nil
}

// reservedErr refuses a function named like one of the expression syntax's
// list operations (sum, map, count...): sum(...) would never call it.
func reservedErr(st *lang.Statement) error {
	return st.Errorf(0, utf8.RuneCountInString(st.Name), "%s cannot name a function: the expression syntax reserves %s(...) for itself, so it could never be called; choose another name, such as %s_of", st.Name, st.Name, st.Name)
}

// define handles "name(params) = body".
func (s *Session) define(st *lang.Statement) (*Result, error) {
	if err := s.checkAssignable(st); err != nil {
		return nil, err
	}
	if reservedCalls[st.Name] {
		return nil, reservedErr(st)
	}
	note := s.shadowNote(st.Name)
	frame := &frameStack{}
	// The function's own name must be known to compile a recursive body.
	prev, had := s.kinds[st.Name]
	s.kinds[st.Name] = kindUserFunc
	p, err := s.compile(st, st.Expr, st.ExprOff, st.Params, frame)
	if err != nil {
		if had {
			s.kinds[st.Name] = prev
		} else {
			delete(s.kinds, st.Name)
		}
		return nil, err
	}
	if p.rw.PMs > 0 {
		if had {
			s.kinds[st.Name] = prev
		} else {
			delete(s.kinds, st.Name)
		}
		return nil, st.Errorf(st.ExprOff+p.rw.PMOffs[0], 1, "an uncertain value (±) cannot be written inside a function; assign it to a name first (r = 10 mm ± 0.1 mm) and use the name")
	}
	n := len(st.Params)
	f := &Func{Name: st.Name, Params: st.Params, Body: st.Expr, MinArgs: n, MaxArgs: n}
	where := st.Base.String()
	f.body = &fastBody{s: s, p: p}
	f.Call = func(args []Value) (Value, error) {
		frame.frames = append(frame.frames, args)
		defer func() { frame.frames = frame.frames[:len(frame.frames)-1] }()
		v, err := s.run(p)
		if err != nil {
			var le *lang.Error
			if errors.As(err, &le) {
				if (s.tooDeep || le.Cause != nil) && strings.HasPrefix(le.Msg, "in ") {
					return nil, &causedError{le.Msg, le.Cause} // one "in f(x)" is enough
				}
				return nil, &causedError{fmt.Sprintf("in %s (defined at %s, column %d): %s", f.Signature(), where, le.Pos.Col, le.Msg), le.Cause}
			}
			return nil, err
		}
		return v, nil
	}
	s.vars[st.Name] = f
	s.kinds[st.Name] = kindUserFunc
	s.setWorlds(st.Name, nil)
	delete(s.shownAs, st.Name)
	delete(s.declared, st.Name)
	text := "defined " + f.Signature()
	s.Transcript = append(s.Transcript, Entry{Line: st.Text, Record: text})
	return &Result{Stmt: st, Value: f, Text: text, Record: text, Note: note}, nil
}

// command handles the commands that belong to the session itself.
func (s *Session) command(st *lang.Statement) (*Result, error) {
	switch st.Cmd {
	case "budget":
		x, err := strconv.ParseFloat(strings.TrimSuffix(strings.TrimSpace(st.Args), " s"), 64)
		if err == nil {
			err = s.SetBudget(x)
		}
		if err != nil {
			return nil, st.Errorf(0, utf8.RuneCountInString(st.Text), ":budget needs a number of seconds from 0.001 to %g (now %g)", MaxBudget, s.Budget)
		}
		text := fmt.Sprintf("work budget %s a statement (about %s elementary evaluations)", Seconds(x), Count(s.limit()))
		s.Transcript = append(s.Transcript, Entry{Line: st.Text})
		return &Result{Stmt: st, Text: text}, nil
	case "digits":
		n, err := strconv.Atoi(st.Args)
		if err != nil || n < 2 || n > 15 {
			return nil, st.Errorf(0, utf8.RuneCountInString(st.Text), ":digits needs a whole number from 2 to 15")
		}
		s.Digits = n
		text := fmt.Sprintf("showing %d significant digits", n)
		s.Transcript = append(s.Transcript, Entry{Line: st.Text})
		return &Result{Stmt: st, Text: text}, nil
	case "numerr":
		switch strings.TrimSpace(st.Args) {
		case "on":
			s.num.showAll = true
		case "off":
			s.num.showAll = false
		default:
			return nil, st.Errorf(0, utf8.RuneCountInString(st.Text), ":numerr takes on (show every numerical error estimate beside its value) or off (only those that reach the digits shown)")
		}
		text := "numerical error estimates shown only where they reach the digits shown"
		if s.num.showAll {
			text = "numerical error estimates shown beside every value that has one"
		}
		s.Transcript = append(s.Transcript, Entry{Line: st.Text})
		return &Result{Stmt: st, Text: text}, nil
	}
	return nil, ErrNotSessionCommand
}

// ProgressFunc, when set, receives progress reports of long builtins, and
// one call with total < 0 when a statement ends (so that a progress line
// can be cleared before the result or the error is shown).
type ProgressFunc func(label string, done, total int)

// SetProgress installs a progress reporter (the prompt's).
func (s *Session) SetProgress(f ProgressFunc) { s.progress = f }

// Progress implements Env.
func (s *Session) Progress(label string, done, total int) {
	if s.progress != nil {
		s.progress(label, done, total)
	}
}

// Lookup returns the value bound to name.
func (s *Session) Lookup(name string) (Value, bool) {
	v, ok := s.vars[name]
	return v, ok
}

// HelpFor returns the help of a builtin or constant.
func (s *Session) HelpFor(name string) (*Help, bool) {
	h, ok := s.help[name]
	return h, ok && h != nil
}

// Library returns the session's library.
func (s *Session) Library() Library { return s.lib }

// Variable is a user-defined name with its value, for listings.
type Variable struct {
	Name  string
	Value Value
	Text  string
}

// Variables lists user-defined variables and functions in name order.
func (s *Session) Variables() []Variable {
	var out []Variable
	for name, k := range s.kinds {
		if k != kindVar && k != kindUserFunc {
			continue
		}
		v := s.vars[name]
		text := Format(v, s.Digits)
		if u := s.declared[name]; u != "" && k == kindVar {
			if t, err := FormatIn(v, u, s.Digits); err == nil {
				text = t
			}
		}
		if w := s.unc.worlds[name]; w != nil {
			if uc := s.combined(s.contributions(v, w)); uc != nil {
				if t, err := FormatUncertain(v, uc, s.declared[name], s.Digits, false); err == nil {
					text = t
				}
			}
		}
		out = append(out, Variable{Name: name, Value: v, Text: text})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Name < out[j].Name })
	return out
}

// Names lists every name the session knows (for completion).
func (s *Session) Names() []string {
	out := make([]string, 0, len(s.kinds))
	for n := range s.kinds {
		out = append(out, n)
	}
	sort.Strings(out)
	return out
}

// Compiled is an expression compiled once, to be evaluated many times (by
// sweeps, solvers and benchmarks) against the session's current names.
type Compiled struct {
	s *Session
	p *program
}

// CompileExpr compiles the expression text of one line without evaluating
// it. The line must be a bare expression.
func (s *Session) CompileExpr(base lang.Pos, text string) (*Compiled, error) {
	st, err := lang.ParseStatement(base, text)
	if err != nil {
		return nil, err
	}
	if st.Kind != lang.Expr || st.As != "" {
		return nil, st.Errorf(0, utf8.RuneCountInString(text), "only an expression can be compiled here")
	}
	p, err := s.compile(st, st.Expr, st.ExprOff, nil, nil)
	if err != nil {
		return nil, err
	}
	return &Compiled{s: s, p: p}, nil
}

// Eval evaluates the compiled expression, with a work budget of its own
// (as a statement has).
func (c *Compiled) Eval() (Value, error) {
	c.s.depth, c.s.tooDeep, c.s.work = 0, false, 0
	return c.s.run(c.p)
}

// stopped gives an error of the running statement its cause when the
// statement was interrupted or ran over its work budget: the message is
// then "interrupted" (for the whole statement), or the budget's, and the
// positioned error wraps ErrInterrupted or ErrBudget.
func (s *Session) stopped(st *lang.Statement, err error) error {
	le, ok := lang.AsError(err)
	if s.interrupted.Load() || errors.Is(err, ErrInterrupted) {
		e := st.Errorf(st.ExprOff, utf8.RuneCountInString(st.Expr), "interrupted")
		e.Cause = ErrInterrupted
		return e
	}
	if ok && le.Cause == nil && errors.Is(err, ErrBudget) {
		le.Cause = ErrBudget
	}
	return err
}

// markCycles sets Quantity.Cyc on a value of dimension s^-1 shown "as" or
// declared in the hertz (with any prefix): the user says it counts cycles.
func markCycles(v Value, unit string) Value {
	q, ok := v.(Quantity)
	if !ok || unit == "" || q.D != dFreq {
		return v
	}
	if u, err := ParseUnit(unit); err == nil && u.Cyc {
		q.Cyc = true
		return q
	}
	return v
}
