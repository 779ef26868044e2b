package runtime

import (
	"errors"
	"fmt"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/expr-lang/expr"
	"github.com/expr-lang/expr/ast"
	"github.com/expr-lang/expr/builtin"
	"github.com/expr-lang/expr/file"
	"github.com/expr-lang/expr/vm"

	"loopwise/lang"
)

// Names of the engine functions the patcher calls. They start with "__",
// which users cannot write.
const (
	fnCall = "__call"
	fnArg  = "__arg"
	fnVec  = "__vec"
	fnComp = "__comp"
	fnBool = "__bool"
	fnCond = "__cond"
)

// engineNames are the function names the patcher inserts; no other name
// starting with "__" may reach the engine.
var engineNames = func() map[string]bool {
	m := map[string]bool{fnCall: true, fnArg: true, fnVec: true, fnComp: true, fnBool: true, fnCond: true, "__neg": true, lang.PMFunc: true, lang.PMRelFunc: true}
	for _, fn := range binaryOps {
		m[fn] = true
	}
	return m
}()

// reservedCalls are the names the expression engine's parser reads as its
// own list operations whenever they are followed by "(" (sum(...),
// map(...), count(...)...), even with its builtins disabled. A function of
// such a name could never be called, so none may be defined. The list
// comes from the engine itself: its builtins that take a predicate.
var reservedCalls = func() map[string]bool {
	m := map[string]bool{}
	for _, f := range builtin.Builtins {
		if f.Predicate {
			m[f.Name] = true
		}
	}
	return m
}()

// reservedCallAt finds a reserved name followed by "(" in rewritten text.
var reservedCallAt = func() *regexp.Regexp {
	return regexp.MustCompile(`(^|[^\p{L}\p{N}_.])(` + strings.Join(ReservedCalls(), "|") + `)\s*\(`)
}()

// reservedCall reports the first call of a reserved name in the program's
// text, or nil.
func (p *program) reservedCall() *lang.Error {
	m := reservedCallAt.FindStringSubmatchIndex(p.rw.Src)
	if m == nil {
		return nil
	}
	name := p.rw.Src[m[4]:m[5]]
	from := utf8.RuneCountInString(p.rw.Src[:m[4]])
	return p.errorAt(file.Location{From: from, To: from + len(name)}, fmt.Sprintf("%s(...) is reserved by the expression syntax and cannot be called here", name))
}

// ReservedCalls lists, sorted, the names that cannot name a function
// because the expression syntax reserves name(...) for itself.
func ReservedCalls() []string {
	out := make([]string, 0, len(reservedCalls))
	for n := range reservedCalls {
		out = append(out, n)
	}
	sort.Strings(out)
	return out
}

var binaryOps = map[string]string{
	"+": "__add", "-": "__sub", "*": "__mul", "/": "__div", "%": "__mod",
	"**": "__pow", "^": "__pow",
	"==": "__eq", "!=": "__ne", "<": "__lt", "<=": "__le", ">": "__gt", ">=": "__ge",
}

func wrap2(f func(a, b Value) (Value, error)) func(...any) (any, error) {
	return func(p ...any) (any, error) { return f(p[0], p[1]) }
}

func cmp(op string) func(...any) (any, error) {
	return func(p ...any) (any, error) { return Compare(op, p[0], p[1]) }
}

// opOptions registers the operator dispatcher with the engine.
var opOptions = []expr.Option{
	expr.Function("__add", wrap2(Add)),
	expr.Function("__sub", wrap2(Sub)),
	expr.Function("__mul", wrap2(Mul)),
	expr.Function("__div", wrap2(Div)),
	expr.Function("__mod", wrap2(Mod)),
	expr.Function("__pow", wrap2(Pow)),
	expr.Function("__neg", func(p ...any) (any, error) { return Neg(p[0]) }),
	expr.Function("__eq", cmp("==")),
	expr.Function("__ne", cmp("!=")),
	expr.Function("__lt", cmp("<")),
	expr.Function("__le", cmp("<=")),
	expr.Function("__gt", cmp(">")),
	expr.Function("__ge", cmp(">=")),
	expr.Function(fnVec, func(p ...any) (any, error) { return MakeVector(p) }),
	expr.Function(fnComp, func(p ...any) (any, error) { return Component(p[0], p[1].(int)) }),
	expr.Function(fnBool, func(p ...any) (any, error) {
		if b, ok := p[0].(bool); ok {
			return b, nil
		}
		return nil, dimErr("and, or and not need true/false values (from a comparison), not %s", TypeName(normalize(p[0])))
	}),
	expr.Function(fnCond, func(p ...any) (any, error) {
		if b, ok := p[0].(bool); ok {
			return b, nil
		}
		return nil, dimErr("the condition before \"?\" must be true or false, not %s", TypeName(normalize(p[0])))
	}),
	expr.Env(map[string]any{}),
	expr.AllowUndefinedVariables(),
	expr.DisableAllBuiltins(),
	expr.MaxNodes(MaxExprNodes),
}

// MaxExprNodes is the most parts (numbers, names, operators, calls) one
// expression may have; the engine counts them as it parses.
const MaxExprNodes = 10_000

// program is a compiled expression with what is needed to report errors
// against the statement it came from.
type program struct {
	prog *vm.Program
	st   *lang.Statement
	rw   *lang.Rewritten
	off  int // rune offset of the expression in the statement's line
	// idle holds machines of the engine that ran this program and may run
	// it again: a function called many times (by parametric_path, sweep or
	// a sampler) then allocates no machine and no stack a call. A machine
	// is taken for each run and given back after, so a function that
	// calls itself gets one per level.
	idle []*vm.VM
}

// errorAt maps a rune offset in the rewritten expression to the statement's
// line. It is the one place where engine positions become user positions.
func (p *program) errorAt(loc file.Location, msg string) *lang.Error {
	from := p.rw.Orig(loc.From)
	width := 1
	if loc.To > loc.From {
		width = p.rw.Orig(loc.To-1) - from + 1
	}
	return p.st.Errorf(p.off+from, width, "%s", msg)
}

// patcher rewrites the parsed expression so that every operator calls the
// dispatcher, every number is a Quantity and every call goes through
// __call. It records the first problem it meets.
type patcher struct {
	lits   map[string]Value
	negs   map[string]Quantity // offset literals (°C): the value of -number
	negOf  map[*ast.ConstantNode]Quantity
	params map[string]int
	known  func(name string) bool
	names  func() []string
	err    *lang.Error
	p      *program
}

func (v *patcher) fail(n ast.Node, format string, args ...any) {
	if v.err == nil {
		v.err = v.p.errorAt(n.Location(), fmt.Sprintf(format, args...))
	}
}

func call(name string, args ...ast.Node) *ast.CallNode {
	return &ast.CallNode{Callee: &ast.IdentifierNode{Value: name}, Arguments: args}
}

// wrapCall returns name(n) located where n is, so that an error of the call
// points at n.
func wrapCall(name string, n ast.Node) ast.Node {
	c := call(name, n)
	c.SetLocation(n.Location())
	return c
}

func (v *patcher) Visit(node *ast.Node) {
	switch n := (*node).(type) {
	case *ast.IdentifierNode:
		if q, ok := v.lits[n.Value]; ok {
			c := &ast.ConstantNode{Value: q}
			if neg, ok := v.negs[n.Value]; ok {
				v.negOf[c] = neg
			}
			ast.Patch(node, c)
			return
		}
		if strings.HasPrefix(n.Value, "__") {
			if !engineNames[n.Value] {
				v.fail(n, "internal error (please report): a unit literal was not understood here")
			}
			return // engine function names
		}
		if i, ok := v.params[n.Value]; ok {
			ast.Patch(node, call(fnArg, &ast.ConstantNode{Value: i}))
			return
		}
		if !v.known(n.Value) {
			v.fail(n, "%s", unknownNameMsg(n.Value, v))
		}
	case *ast.IntegerNode:
		ast.Patch(node, &ast.ConstantNode{Value: Num(float64(n.Value))})
	case *ast.FloatNode:
		ast.Patch(node, &ast.ConstantNode{Value: Num(n.Value)})
	case *ast.BinaryNode:
		if fn, ok := binaryOps[n.Operator]; ok {
			ast.Patch(node, call(fn, n.Left, n.Right))
			return
		}
		switch n.Operator {
		case "and", "&&", "or", "||":
			// keep the engine's short-circuit; make both sides prove they
			// are true/false values
			n.Left = wrapCall(fnBool, n.Left)
			n.Right = wrapCall(fnBool, n.Right)
		default:
			v.fail(n, "the operator %q is not part of the Loopwise language", n.Operator)
		}
	case *ast.UnaryNode:
		switch n.Operator {
		case "-":
			if c, ok := n.Node.(*ast.ConstantNode); ok {
				if neg, ok := v.negOf[c]; ok {
					// -10 °C is 263.15 K, not -(283.15 K)
					ast.Patch(node, &ast.ConstantNode{Value: neg})
					return
				}
			}
			ast.Patch(node, call("__neg", n.Node))
		case "+":
			ast.Patch(node, n.Node)
		case "not", "!":
			n.Node = wrapCall(fnBool, n.Node)
		default:
			v.fail(n, "the operator %q is not part of the Loopwise language", n.Operator)
		}
	case *ast.ConditionalNode:
		n.Cond = wrapCall(fnCond, n.Cond)
	case *ast.ArrayNode:
		if len(n.Nodes) != 3 {
			v.fail(n, "a vector needs exactly 3 components, got %d", len(n.Nodes))
			return
		}
		ast.Patch(node, call(fnVec, n.Nodes...))
	case *ast.CallNode:
		if id, ok := n.Callee.(*ast.IdentifierNode); ok && strings.HasPrefix(id.Value, "__") {
			if !engineNames[id.Value] {
				v.fail(n, "internal error (please report): a unit literal was not understood here")
			}
			return
		}
		args := append([]ast.Node{n.Callee}, n.Arguments...)
		ast.Patch(node, call(fnCall, args...))
	case *ast.MemberNode:
		prop, ok := n.Property.(*ast.StringNode)
		idx := map[string]int{"x": 0, "y": 1, "z": 2}
		if !ok || n.Method {
			v.fail(n, "only .x, .y and .z may follow a value")
			return
		}
		i, ok := idx[prop.Value]
		if !ok {
			v.fail(n, "a vector has components .x, .y and .z, not .%s", prop.Value)
			return
		}
		ast.Patch(node, call(fnComp, n.Node, &ast.ConstantNode{Value: i}))
	case *ast.ConstantNode, *ast.BoolNode, *ast.StringNode:
	case *ast.BuiltinNode:
		// the cause of any error met in its arguments (a predicate's
		// closure, say), so it replaces that error
		v.err = nil
		v.fail(n, "%s(...) is reserved by the expression syntax and cannot be called here", n.Name)
	default:
		v.fail(*node, "this syntax is not part of the Loopwise language")
	}
}

func unknownNameMsg(name string, v *patcher) string {
	msg := fmt.Sprintf("unknown name %q", lang.Abbrev(name, 40))
	if (UnitTable{}).IsUnit(name) {
		return msg + fmt.Sprintf(" (%s is a unit: write a number before it, as in 1 %s)", name, name)
	}
	if v.names != nil {
		if near := nearest(name, v.names()); near != "" {
			return msg + fmt.Sprintf("; did you mean %q?", near)
		}
	}
	return msg
}

// sessionUnits is the unit table as the pre-lexer sees it in a session: a
// word after a number that is one of the session's names gets no unit
// suggestion, so the message can say how to multiply instead.
type sessionUnits struct{ s *Session }

func (u sessionUnits) IsUnit(name string) bool { return UnitTable{}.IsUnit(name) }

func (u sessionUnits) SuggestUnit(name string) string {
	if u.s.known(name) {
		return ""
	}
	return UnitTable{}.SuggestUnit(name)
}

// compile turns expression text into a program. params are the parameter
// names of a function body being compiled; frame supplies their values.
func (s *Session) compile(st *lang.Statement, src string, off int, params []string, frame *frameStack) (*program, error) {
	rw, err := lang.Rewrite(st, src, off, sessionUnits{s})
	if err != nil {
		return nil, err
	}
	p := &program{st: st, rw: rw, off: off}
	lits := make(map[string]Value, len(rw.Lits))
	negs := map[string]Quantity{}
	for _, l := range rw.Lits {
		if l.Imag {
			z, err := imagLiteral(l)
			if err != nil {
				return nil, st.Errorf(off+l.Off, max(1, l.UnitOff-l.Off+utf8.RuneCountInString(l.Unit)), "%s", err)
			}
			lits[l.Placeholder] = z
			continue
		}
		u, err := ParseUnit(l.Unit)
		if err != nil {
			var ue *UnitError
			if errors.As(err, &ue) {
				return nil, st.Errorf(off+l.UnitOff+ue.Off, ue.Width, "%s", ue.Msg)
			}
			return nil, st.Errorf(off+l.UnitOff, utf8.RuneCountInString(l.Unit), "%s", err)
		}
		if l.Number == "" {
			if u.Offset != 0 {
				return nil, st.Errorf(off+l.UnitOff, utf8.RuneCountInString(l.Unit), "°C has an offset (0 °C = 273.15 K), so it must follow a number directly, as in 20 °C; to scale an expression that is a temperature difference, use K")
			}
			lits[l.Placeholder] = Quantity{V: u.Scale(), D: u.Dim, Cyc: u.Cyc}
			continue
		}
		val, err := LiteralValue(l.Number, u)
		if err != nil {
			return nil, st.Errorf(off+l.Off, l.UnitOff-l.Off+utf8.RuneCountInString(l.Unit), "%s", err)
		}
		lits[l.Placeholder] = Quantity{V: val, D: u.Dim, Cyc: u.Cyc}
		if u.Offset != 0 {
			neg, err := LiteralValue("-"+l.Number, u)
			if err != nil {
				return nil, st.Errorf(off+l.Off, l.UnitOff-l.Off+utf8.RuneCountInString(l.Unit), "%s", err)
			}
			negs[l.Placeholder] = Quantity{V: neg, D: u.Dim}
		}
	}
	pm := make(map[string]int, len(params))
	for i, name := range params {
		pm[name] = i
	}
	pt := &patcher{lits: lits, negs: negs, negOf: map[*ast.ConstantNode]Quantity{}, params: pm, known: s.known, names: s.Names, p: p}
	opts := append([]expr.Option{}, opOptions...)
	opts = append(opts, expr.Patch(pt), expr.Function(fnCall, s.callFunc),
		expr.Function(lang.PMFunc, s.pmFunc(false)), expr.Function(lang.PMRelFunc, s.pmFunc(true)))
	if frame != nil {
		opts = append(opts, expr.Function(fnArg, func(a ...any) (any, error) { return frame.arg(a[0].(int)), nil }))
	}
	prog, err := expr.Compile(rw.Src, opts...)
	if pt.err != nil {
		return nil, pt.err
	}
	if err != nil {
		if e := p.reservedCall(); e != nil {
			return nil, e // the parser's own complaint about sum(...) would puzzle
		}
		return nil, p.engineError(err, true)
	}
	p.prog = prog
	return p, nil
}

// engineError turns an error of the expression engine into a positioned
// error of ours.
func (p *program) engineError(err error, compile bool) error {
	var le *lang.Error
	if errors.As(err, &le) {
		return le
	}
	var fe *file.Error
	if !errors.As(err, &fe) {
		e := p.st.Errorf(p.off, 1, "%s", err)
		e.Cause = causeOf(err)
		return e
	}
	msg := fe.Message
	if fe.Prev != nil {
		msg = fe.Prev.Error()
	} else if compile {
		msg = tidySyntax(msg)
	}
	e := p.errorAt(fe.Location, p.publicNames(msg))
	e.Cause = causeOf(err)
	return e
}

// placeholderName matches an identifier the pre-lexer or the patcher made.
var placeholderName = regexp.MustCompile(`__[A-Za-z0-9_]*`)

// publicNames rewrites names of our own making in an engine message: a
// unit literal's placeholder becomes the literal as written ("2 m"); any
// other such name is an internal one and is left out.
func (p *program) publicNames(msg string) string {
	if !strings.Contains(msg, "__") {
		return msg
	}
	return placeholderName.ReplaceAllStringFunc(msg, func(m string) string {
		for _, l := range p.rw.Lits {
			if strings.TrimSpace(l.Placeholder) == m {
				return strings.TrimSpace(l.Number + " " + l.Unit)
			}
		}
		return "…"
	})
}

// tidySyntax rewrites a syntax error of the engine: its token names become
// plain words.
func tidySyntax(msg string) string {
	if strings.Contains(msg, "exceeds maximum allowed nodes") {
		return fmt.Sprintf("this expression has more than %d parts (numbers, names, operators), the most one statement may have; split it into several statements", MaxExprNodes)
	}
	if strings.Contains(msg, "invalid float literal") {
		// the engine's number scanner met a malformed number ("0...0.")
		return "syntax error: a malformed number; write numbers as 12, 0.5 or 1.5e-3"
	}
	msg = strings.ReplaceAll(msg, "unexpected token EOF", "the expression ends too early")
	msg = strings.ReplaceAll(msg, "unexpected token ", "unexpected ")
	msg = tokenName.ReplaceAllStringFunc(msg, func(m string) string {
		sub := tokenName.FindStringSubmatch(m)
		kind := map[string]string{"Identifier": "name"}[sub[1]]
		if kind == "" {
			kind = strings.ToLower(sub[1])
		}
		if strings.HasPrefix(sub[2], lang.PlaceholderPrefix) {
			return "\"" + sub[2] + "\"" // publicNames writes the literal
		}
		return kind + " " + strconv.Quote(lang.Abbrev(sub[2], 40))
	})
	return "syntax error: " + msg
}

// tokenName matches the engine's token notation, such as Bracket(")").
var tokenName = regexp.MustCompile(`(Operator|Bracket|Identifier|Number|String)\("((?:[^"\\]|\\.)*)"\)`)

// run evaluates a compiled program against the session's names.
func (s *Session) run(p *program) (Value, error) {
	return s.runEnv(p, s.current())
}

// runEnv runs p with the names in env, on a machine of p's idle ones (the
// engine's machines are reused rather than allocated on every call).
func (s *Session) runEnv(p *program, env map[string]Value) (Value, error) {
	var m *vm.VM
	if k := len(p.idle); k > 0 {
		m, p.idle = p.idle[k-1], p.idle[:k-1]
	} else {
		m = &vm.VM{}
	}
	out, err := m.Run(p.prog, env)
	p.idle = append(p.idle, m)
	if err != nil {
		return nil, p.engineError(err, false)
	}
	if out == nil {
		// every operator, literal and builtin makes a value; nil means a
		// name reached the engine unchecked
		return nil, p.st.Errorf(p.off, max(1, utf8.RuneCountInString(p.st.Expr)), "internal error (please report): this expression gave no value")
	}
	return normalize(out), nil
}

// causeOf keeps the reason a statement stopped (ErrInterrupted,
// ErrBudget) on its positioned error; nil for anything else.
func causeOf(err error) error {
	switch {
	case errors.Is(err, ErrInterrupted):
		return ErrInterrupted
	case errors.Is(err, ErrBudget):
		return ErrBudget
	}
	return nil
}

// frameStack holds the argument lists of the active calls of one user
// function (more than one when it recurses).
type frameStack struct{ frames [][]Value }

func (f *frameStack) arg(i int) Value { return f.frames[len(f.frames)-1][i] }

// maxDepth bounds nested calls of user functions.
const maxDepth = 200

// callFunc is __call(f, args...): it calls a builtin or a user function.
func (s *Session) callFunc(p ...any) (any, error) {
	f, ok := p[0].(*Func)
	if !ok {
		return nil, dimErr("%s is not a function and cannot be called", TypeName(p[0]))
	}
	args := make([]Value, len(p)-1)
	for i, a := range p[1:] {
		args[i] = normalize(a)
	}
	if err := s.Err(); err != nil {
		return nil, err
	}
	if f.Body != "" {
		if err := s.chargeCall(f.Name); err != nil {
			return nil, err
		}
	}
	if s.depth == 0 && s.num.replay != nil {
		if v, ok, err := s.replayCall(f, args); ok {
			return v, err // a replay for the numerical error (numerr.go)
		}
	}
	s.depth++
	defer func() { s.depth-- }()
	if s.depth > maxDepth {
		s.tooDeep = true
		return nil, evalErr("calls nest deeper than %d (a function that calls itself without end?)", maxDepth)
	}
	if s.depth == 1 && s.unc.cur == nil && s.num.replay == nil {
		// a direct call of the statement: recorded for the numerical error
		k := len(s.num.calls)
		s.num.calls = append(s.num.calls, numCall{f: f, args: args})
		prev := s.num.cur
		s.num.cur = k
		v, err := f.Invoke(s, args)
		s.num.cur = prev
		s.num.calls[k].val = v
		return v, err
	}
	return f.Invoke(s, args)
}

// imagLiteral is the value of an imaginary literal: "4j" or "4j ohm".
func imagLiteral(l lang.Literal) (Complex, error) {
	if l.Unit == "" {
		x, err := strconv.ParseFloat(l.Number, 64)
		if err != nil {
			return Complex{}, fmt.Errorf("number %q is too large", lang.Abbrev(l.Number, 40))
		}
		return Complex{V: complex(0, x)}, nil
	}
	u, err := ParseUnit(l.Unit)
	if err != nil {
		return Complex{}, err
	}
	if u.Offset != 0 {
		return Complex{}, fmt.Errorf("an imaginary value cannot be in %s, which has an offset; use K", l.Unit)
	}
	x, err := LiteralValue(l.Number, u)
	if err != nil {
		return Complex{}, err
	}
	return Complex{V: complex(0, x), D: u.Dim}, nil
}
