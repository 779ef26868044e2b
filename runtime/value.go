package runtime

import (
	"errors"
	"fmt"
	"math"
)

// A Value is what an expression evaluates to: Quantity, Complex, Vector,
// *Func or bool (from comparisons).
type Value = any

// Quantity is a float64 magnitude in coherent SI units with its dimension.
// Dimensionless numbers are quantities with a zero Dim.
type Quantity struct {
	V float64
	D Dim
	// Cyc marks a quantity of dimension s^-1 known to count cycles per
	// second, so that it is shown in Hz: set by a literal in Hz, by
	// "as Hz" and by a name declared in Hz; kept by +, - (when both sides
	// have it), unary minus, abs, min and max; dropped by every product,
	// quotient and power (2*pi*50 Hz is 314.159 s^-1, not 314.159 Hz).
	Cyc bool
}

// Num makes a dimensionless quantity.
func Num(v float64) Quantity { return Quantity{V: v} }

// Vector is a 3-vector whose three components share one dimension.
type Vector struct {
	V [3]float64
	D Dim
}

// Norm returns the Euclidean length of v.
func (v Vector) Norm() Quantity {
	return Quantity{V: math.Sqrt(v.V[0]*v.V[0] + v.V[1]*v.V[1] + v.V[2]*v.V[2]), D: v.D}
}

// Shower is implemented by values that builtins define (paths, sources,
// tables): they show themselves, name their kind for messages, and give a
// one-line text for recorded results.
type Shower interface {
	Show(digits int) string
	Kind() string
	Summary(digits int) string
}

// Tabular is implemented by table values (sweeps, sampled fields): named
// columns, each of one dimension, and rows of numbers in coherent SI units.
// Scripts record a table's rows under its result and compare every cell.
type Tabular interface {
	Shower
	Tabulate() (cols []string, dims []Dim, rows [][]float64)
}

// RowLabeller is implemented by tables whose rows are named (the elements
// of a circuit): the report shows the names in a first column under the
// heading. Scripts record the rows in order, without the names.
type RowLabeller interface {
	RowLabels() []string
	LabelHeading() string
}

// CycleColumns is implemented by tables whose columns may hold cycle
// frequencies (see Quantity.Cyc): such a column is shown in Hz. The slice
// may be shorter than the columns.
type CycleColumns interface {
	CycleColumns() []bool
}

// ColumnUnit picks the unit column j of t is shown in, for its largest
// magnitude big: BestUnit, or Hz for a column of cycle frequencies.
func ColumnUnit(t Tabular, j int, d Dim, big float64, digits int) (string, float64) {
	if c, ok := t.(CycleColumns); ok {
		if cyc := c.CycleColumns(); j < len(cyc) && cyc[j] {
			return BestCycleUnit(d, big, digits)
		}
	}
	return BestUnit(d, big, digits)
}

// Picture is implemented by values that draw themselves (plots): the
// report inlines the SVG; replay compares their data through Tabular.
type Picture interface {
	Tabular
	SVG() ([]byte, error)
}

// Adder is implemented by builtin values that can be added with + (sources
// superpose).
type Adder interface {
	Plus(other Value) (Value, error)
}

// Env is what a builtin may ask of the session that calls it.
type Env interface {
	// Progress reports work done on a long computation; the prompt shows
	// it when the work takes more than a second.
	Progress(label string, done, total int)
	// Err is nil while the running statement may go on, and
	// ErrInterrupted once it has been interrupted (Session.Interrupt, the
	// prompt's Ctrl-C). Long work polls it and returns the error it gives.
	Err() error
	// Charge counts work the builtin is about to do, in elementary
	// evaluations (see EvalsPerSecond), against the statement's work
	// budget; it refuses (with a *BudgetError naming label) work that
	// would not fit, and then charges nothing.
	Charge(label string, evals float64) error
	// Afford is Charge without charging: for an estimate whose work will
	// be counted as it happens (a sweep of a user function).
	Afford(label string, evals float64) error
	// Spent is the work charged so far in the running statement.
	Spent() float64
	// OutputPath gives the path where a builtin may write the file name:
	// inside the session's output directory, created on first use. A name
	// that would leave the directory is refused; with no output directory
	// (check, piped input), ErrNoOutput.
	OutputPath(name string) (string, error)
	// NumericalError reports the error estimate of the value the builtin
	// returns: an absolute bound per component (one for a number, three
	// for a vector, re and im for a complex number), in SI units, from
	// the method's own estimate (an adaptive integral's, a root's
	// bracket, a derivative's extrapolation). Call it once per value.
	NumericalError(err ...float64)
}

// ErrNoOutput is OutputPath's error when the session writes no files.
var ErrNoOutput = errors.New("this session writes no files")

// ErrInterrupted is the error of work stopped by Session.Interrupt.
var ErrInterrupted = errors.New("interrupted")

// Func is a callable value: a builtin or a user-defined function. Functions
// are first-class: they can be passed to builtins that integrate or
// differentiate them.
type Func struct {
	Name   string
	Params []string // parameter names (user functions) or documented names
	Body   string   // source text of a user function's body
	// MinArgs and MaxArgs bound the argument count; MaxArgs < 0 means any.
	MinArgs, MaxArgs int
	// Call evaluates the function. Arguments are already counted.
	Call func(args []Value) (Value, error)
	// CallEnv, when set, is used instead of Call and receives the session.
	CallEnv func(env Env, args []Value) (Value, error)
	// Real, when set on a builtin of one quantity, is its form on plain
	// numbers, for fast evaluation of user functions (see Fast).
	Real *RealFunc
	// Tangent, when set on a builtin, is its rule on Duals, by which
	// exact derivatives flow through it (tangent.go).
	Tangent TangentRule
	// Help is set for builtins.
	Help *Help
	// body is a user function's compiled body and its session, for Fast.
	body *fastBody
}

// Help documents a builtin for the REPL's help command and the README.
type Help struct {
	Family    string // the group it is listed under, e.g. "geometry"
	Signature string // with units, e.g. "sqrt(x: any unit with even powers) -> unit^(1/2)"
	Summary   string
	Method    string // method and accuracy, when numerical
	Example   string // statements, one per line, that run when pasted at the prompt
	Reference string // outside source for the behaviour
}

// Invoke checks the argument count and calls f.
func (f *Func) Invoke(env Env, args []Value) (Value, error) {
	if len(args) < f.MinArgs || (f.MaxArgs >= 0 && len(args) > f.MaxArgs) {
		return nil, fmt.Errorf("%s takes %s, got %d", f.Name, argCount(f.MinArgs, f.MaxArgs), len(args))
	}
	if f.CallEnv != nil {
		return f.CallEnv(env, args)
	}
	return f.Call(args)
}

func argCount(lo, hi int) string {
	plural := func(n int) string {
		if n == 1 {
			return "1 argument"
		}
		return fmt.Sprintf("%d arguments", n)
	}
	switch {
	case lo == hi:
		return plural(lo)
	case hi < 0:
		return "at least " + plural(lo)
	default:
		return fmt.Sprintf("%d to %d arguments", lo, hi)
	}
}

// Signature returns "name(p1, p2)".
func (f *Func) Signature() string {
	s := f.Name + "("
	for i, p := range f.Params {
		if i > 0 {
			s += ", "
		}
		s += p
	}
	return s + ")"
}

// TypeName names the kind of a value for messages.
func TypeName(v Value) string {
	switch x := v.(type) {
	case Quantity:
		if x.D.IsZero() {
			return "a plain number"
		}
		return x.D.Describe()
	case Vector:
		if x.D.IsZero() {
			return "a vector of plain numbers"
		}
		return "a vector of " + x.D.Describe()
	case Complex:
		if x.D.IsZero() {
			return "a complex number"
		}
		return "a complex " + x.D.Describe()
	case CVector:
		if x.D.IsZero() {
			return "a complex vector of plain numbers"
		}
		return "a complex vector of " + x.D.Describe()
	case *Func:
		return "the function " + x.Name
	case Shower:
		return x.Kind()
	case bool:
		return "a true/false value"
	case string:
		return "text"
	case nil:
		return "nothing"
	default:
		return fmt.Sprintf("%T", v)
	}
}
