package builtins

import (
	"math"
	"math/cmplx"
	"strings"

	"loopwise/runtime"
)

const refSolve = "Brent's method: R. P. Brent, Algorithms for Minimization without Derivatives (Prentice-Hall, 1973), ch. 4"

// funcArg reads argument i as a function of one argument.
func funcArg(fn string, args []runtime.Value, i int) (*runtime.Func, error) {
	f, ok := args[i].(*runtime.Func)
	if !ok {
		return nil, errorf("%s: the %s argument must be a function of one quantity, such as V(N) = ..., not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	if f.MinArgs > 1 || (f.MaxArgs >= 0 && f.MaxArgs < 1) {
		return nil, errorf("%s: the function %s must take exactly one argument", fn, f.Signature())
	}
	return f, nil
}

// scalarCall evaluates f at x (in SI units of dimension d) and returns a
// quantity.
func scalarCall(env runtime.Env, fn string, f *runtime.Func, x float64, d runtime.Dim) (runtime.Quantity, error) {
	v, err := f.Invoke(env, []runtime.Value{runtime.Quantity{V: x, D: d}})
	if err != nil {
		return runtime.Quantity{}, err
	}
	q, ok := v.(runtime.Quantity)
	if !ok {
		return runtime.Quantity{}, errorf("%s: %s must return a quantity, not %s", fn, f.Signature(), runtime.TypeName(v))
	}
	return q, nil
}

func solveFuncs() []*runtime.Func {
	return []*runtime.Func{
		{
			Name: "solve", Params: []string{"f", "target", "lo", "hi"}, MinArgs: 4, MaxArgs: 4,
			CallEnv: solveBuiltin,
			Help: &runtime.Help{
				Signature: "solve(f: function of one quantity, target: unit of f, lo, hi: unit of f's argument) -> unit of lo",
				Summary:   "The x between lo and hi where f(x) = target. f(lo) − target and f(hi) − target must have opposite signs (the root is bracketed).",
				Method:    "Brent's method (bisection, secant and inverse quadratic steps); stops on an exact zero or when the root is bracketed within 1e-12·|x| (plus 1e-24 of the larger end of [lo, hi], for a root at or near zero). The final bracket's width is the result's numerical error estimate (shown when it reaches the digits shown, or always after :numerr on): the root of the computed function lies inside it",
				Example:   "V(N) = N * 2*pi*50 Hz * 1 cm^2 * 1 mT\nsolve(V, 0.1 V, 1, 10000)",
				Reference: refSolve,
			},
		},
		{
			Name: "sweep2", Params: []string{"f", "x_from", "x_to", "nx", "y_from", "y_to", "ny"}, MinArgs: 7, MaxArgs: 7,
			CallEnv: sweep2Builtin,
			Help: &runtime.Help{
				Signature: "sweep2(f: function of two quantities, x_from, x_to: unit of f's first argument, nx: whole number, y_from, y_to: unit of f's second argument, ny: whole number) -> table",
				Summary:   "f on a grid of nx × ny points, as a table with a column for each argument (named after f's parameters) and one for a quantity result or four for a vector; the first argument varies fastest. At most 100 000 points.",
				Method:    "f at every pair of evenly spaced values, as sweep takes them; every value must be finite; the whole grid's work is estimated from the first call and refused beyond the work budget (:budget)",
				Example:   "k(d, r) = maxwell_mutual(20 mm, r, d) / (1 uH)\nsweep2(k, 0 mm, 10 mm, 3, 5 mm, 15 mm, 3)",
				Reference: "evaluation on a rectangular grid of evenly spaced points",
			},
		},
		{
			Name: "sweep_log", Params: []string{"f", "from", "to", "n"}, MinArgs: 4, MaxArgs: 4,
			CallEnv: sweepLogBuiltin,
			Help: &runtime.Help{
				Signature: "sweep_log(f: function of one quantity, from, to: unit of f's argument, both above zero, n: whole number) -> table",
				Summary:   "As sweep, at n values evenly spaced in logarithm (from·(to/from)^s): for frequency responses over decades.",
				Method:    "f at from·(to/from)^s for s = 0, 1/(n−1), …, 1; otherwise as sweep",
				Example:   "Z(f) = 2 ohm + 2j*pi*f*10 uH\nsweep_log(Z, 1 kHz, 1 MHz, 4)",
				Reference: "evaluation at logarithmically spaced points",
			},
		},
		{
			Name: "sweep", Params: []string{"f", "from", "to", "n"}, MinArgs: 4, MaxArgs: 4,
			CallEnv: sweepBuiltin,
			Help: &runtime.Help{
				Signature: "sweep(f: function of one quantity, from, to: unit of f's argument, n: whole number) -> table",
				Summary:   "f at n evenly spaced values from from to to, as a table (one column for the argument, one for a quantity result, four for a vector: x, y, z, norm, and four for a complex result: re, im, magnitude, angle).",
				Method:    "f at (1 − s)·from + s·to for s = 0, 1/(n−1), …, 1; every value must be finite (an infinity or NaN is an error naming its argument); the whole sweep's work is estimated from the first call and refused beyond the work budget (:budget)",
				Example:   "k(d) = maxwell_mutual(20 mm, 15 mm, d) / (1 uH)\nsweep(k, 0 mm, 20 mm, 5)",
				Reference: "evaluation at evenly spaced points",
			},
		},
	}
}

func solveBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "solve"
	f, err := funcArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	target, err := quantity(fn, args, 1)
	if err != nil {
		return nil, err
	}
	lo, err := quantity(fn, args, 2)
	if err != nil {
		return nil, err
	}
	hi, err := quantity(fn, args, 3)
	if err != nil {
		return nil, err
	}
	if lo.D != hi.D {
		return nil, errorf("%s: lo and hi must have one unit; got %s and %s", fn, lo.D.Describe(), hi.D.Describe())
	}
	if lo.V == hi.V {
		return nil, errorf("%s: lo and hi are equal; give an interval that brackets the solution", fn)
	}
	g := func(x float64) (float64, error) {
		q, err := scalarCall(env, fn, f, x, lo.D)
		if err != nil {
			return 0, err
		}
		if q.D != target.D {
			return 0, errorf("%s: %s returns %s but the target is %s", fn, f.Signature(), q.D.Describe(), target.D.Describe())
		}
		return q.V - target.V, nil
	}
	fa, err := g(lo.V)
	if err != nil {
		return nil, err
	}
	fb, err := g(hi.V)
	if err != nil {
		return nil, err
	}
	if fa == 0 {
		return lo, nil
	}
	if fb == 0 {
		return hi, nil
	}
	if (fa > 0) == (fb > 0) {
		return nil, errorf("%s: no solution is bracketed: f(lo) − target = %s and f(hi) − target = %s have the same sign; widen or move [lo, hi]", fn,
			runtime.Format(runtime.Quantity{V: fa, D: target.D}, 4), runtime.Format(runtime.Quantity{V: fb, D: target.D}, 4))
	}
	x, width, err := brent(g, lo.V, hi.V, fa, fb)
	if err != nil {
		return nil, err
	}
	if env != nil {
		// the root of the computed function lies in the final bracket
		env.NumericalError(width)
	}
	return runtime.Quantity{V: x, D: lo.D}, nil
}

// solveRel is the relative accuracy in x that solve promises; solveFloor,
// times the larger end of the starting bracket, the absolute accuracy it
// falls back on for a root at or very near zero, where no relative
// accuracy can be reached.
const solveRel, solveFloor = 1e-12, 1e-24

// brent finds a zero of g in [a, b] given g(a) and g(b) of opposite signs
// (Brent 1973, ch. 4, the algorithm "zero"): it keeps a bracket, takes
// inverse quadratic or secant steps when they stay inside and shrink fast
// enough, and bisects otherwise, so it converges at least as surely as
// bisection. It stops on an exact zero or when the bracket [b, c] around
// the root is at most solveRel·|b| + solveFloor·max(|a|, |b|) wide, so
// the returned b is that close to the root. (Brent's own test is half
// the bracket against 2ε|b| + tol/2 with a fixed tol; here tol follows
// the current estimate, and solveRel far above 4ε keeps the steps
// representable.)
func brent(g func(float64) (float64, error), a, b, fa, fb float64) (x, width float64, err error) {
	// at least two of the smallest float64 steps, so that a bracket near
	// the underflow limit still moves
	floor := math.Max(solveFloor*math.Max(math.Abs(a), math.Abs(b)), 2*math.SmallestNonzeroFloat64)
	c, fc := a, fa
	d := b - a
	e := d
	for iter := 0; iter < 300; iter++ {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol1 := 0.5 * (solveRel*math.Abs(b) + floor)
		m := 0.5 * (c - b)
		if fb == 0 {
			return b, 0, nil
		}
		if math.Abs(m) <= tol1 {
			return b, 2 * math.Abs(m), nil // the root is between b and c
		}
		if math.Abs(e) >= tol1 && math.Abs(fa) > math.Abs(fb) {
			s := fb / fa
			var p, q float64
			if a == c {
				p = 2 * m * s // secant
				q = 1 - s
			} else { // inverse quadratic interpolation
				qq := fa / fc
				r := fb / fc
				p = s * (2*m*qq*(qq-r) - (b-a)*(r-1))
				q = (qq - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < math.Min(3*m*q-math.Abs(tol1*q), math.Abs(e*q)) {
				e = d
				d = p / q
			} else {
				d, e = m, m
			}
		} else {
			d, e = m, m
		}
		a, fa = b, fb
		if math.Abs(d) > tol1 {
			b += d
		} else {
			b += math.Copysign(tol1, m)
		}
		var err error
		if fb, err = g(b); err != nil {
			return 0, 0, err
		}
	}
	return 0, 0, errorf("solve: no convergence in 300 steps (is the function continuous on the interval?)")
}

// sweepAxis is one parameter of a sweep: n evenly spaced values from
// from to to.
type sweepAxis struct {
	name     string
	from, to runtime.Quantity
	n        int
	log      bool // geometric spacing (sweep_log)
}

// at is the axis's i-th value: (1−s)·from + s·to stays finite for finite
// ends (to − from may not).
func (a sweepAxis) at(i int) runtime.Quantity {
	s := float64(i) / float64(a.n-1)
	if a.log {
		// from·(to/from)^s, exact at both ends
		v := a.from.V * math.Pow(a.to.V/a.from.V, s)
		if i == a.n-1 {
			v = a.to.V
		}
		return runtime.Quantity{V: v, D: a.from.D, Cyc: a.from.Cyc && a.to.Cyc}
	}
	return runtime.Quantity{V: (1-s)*a.from.V + s*a.to.V, D: a.from.D, Cyc: a.from.Cyc && a.to.Cyc}
}

// readAxis reads the from, to and n of an axis at args[i:i+3].
// (named prefix+"from" and prefix+"to" in messages, as in the signature).
func readAxis(fn string, args []runtime.Value, i int, name, prefix string, maxN int) (sweepAxis, error) {
	from, err := quantity(fn, args, i)
	if err != nil {
		return sweepAxis{}, err
	}
	to, err := quantity(fn, args, i+1)
	if err != nil {
		return sweepAxis{}, err
	}
	if from.D != to.D {
		return sweepAxis{}, errorf("%s: %sfrom and %sto must have one unit; got %s and %s", fn, prefix, prefix, from.D.Describe(), to.D.Describe())
	}
	n, err := count(fn, args, i+2, 2, maxN)
	if err != nil {
		return sweepAxis{}, err
	}
	return sweepAxis{name: name, from: from, to: to, n: n}, nil
}

// paramNames are the names of f's parameters for a table's columns, or
// the given defaults.
func paramNames(f *runtime.Func, defaults ...string) []string {
	if len(f.Params) == len(defaults) {
		return f.Params
	}
	return defaults
}

const maxSweep = 100000 // rows of a sweep

func sweepBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "sweep"
	f, err := funcArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	names := paramNames(f, "x")
	x, err := readAxis(fn, args, 1, names[0], "", maxSweep)
	if err != nil {
		return nil, err
	}
	return gridSweep(env, fn, f, []sweepAxis{x})
}

func sweepLogBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "sweep_log"
	f, err := funcArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	names := paramNames(f, "x")
	x, err := readAxis(fn, args, 1, names[0], "", maxSweep)
	if err != nil {
		return nil, err
	}
	if !(x.from.V > 0 && x.to.V > 0) {
		return nil, errorf("%s: from and to must both be above zero for evenly spaced logarithms, not %s and %s", fn, runtime.Format(x.from, 6), runtime.Format(x.to, 6))
	}
	x.log = true
	return gridSweep(env, fn, f, []sweepAxis{x})
}

func sweep2Builtin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "sweep2"
	f, ok := args[0].(*runtime.Func)
	if !ok {
		return nil, errorf("%s: the first argument must be a function of two quantities, such as k(d, r) = ..., not %s", fn, runtime.TypeName(args[0]))
	}
	if f.MinArgs > 2 || (f.MaxArgs >= 0 && f.MaxArgs < 2) {
		return nil, errorf("%s: the function %s must take exactly two arguments", fn, f.Signature())
	}
	names := paramNames(f, "x", "y")
	if names[0] == names[1] {
		names = []string{"x", "y"}
	}
	x, err := readAxis(fn, args, 1, names[0], "x_", maxSweep)
	if err != nil {
		return nil, err
	}
	y, err := readAxis(fn, args, 4, names[1], "y_", maxSweep)
	if err != nil {
		return nil, err
	}
	if x.n*y.n > maxSweep {
		return nil, errorf("%s: %d × %d points is more than the limit of %d", fn, x.n, y.n, maxSweep)
	}
	return gridSweep(env, fn, f, []sweepAxis{x, y})
}

// gridSweep evaluates f at every point of the grid of the axes, the first
// axis varying fastest, into a table: one column per axis, then one for a
// quantity result or four for a vector (x, y, z, norm). The whole work is
// estimated from the first call and refused beyond the budget.
func gridSweep(env runtime.Env, fn string, f *runtime.Func, axes []sweepAxis) (runtime.Value, error) {
	total := 1
	for _, a := range axes {
		total *= a.n
	}
	tab := &Table{}
	spent := 0.0
	if env != nil {
		spent = env.Spent()
	}
	in := make([]runtime.Value, len(axes))
	idx := make([]int, len(axes))
	for i := 0; i < total; i++ {
		rest := i
		for k, a := range axes {
			idx[k] = rest % a.n
			rest /= a.n
			in[k] = a.at(idx[k])
		}
		if env != nil {
			if err := env.Err(); err != nil {
				return nil, err
			}
		}
		v, err := f.Invoke(env, append([]runtime.Value{}, in...))
		if err != nil {
			return nil, err
		}
		if i == 0 && env != nil {
			// the rest will cost about total − 1 times the first (counted
			// as they run); refuse now what would not fit
			per := math.Max(env.Spent()-spent, runtime.CallEvals)
			if err := env.Afford(fn, per*float64(total-1)); err != nil {
				return nil, err
			}
		}
		if err := finiteRow(fn, f, axes, in, v); err != nil {
			return nil, err
		}
		if i == 0 {
			for k, a := range axes {
				q := in[k].(runtime.Quantity)
				tab.Cols = append(tab.Cols, a.name)
				tab.Dims = append(tab.Dims, q.D)
				tab.Cyc = append(tab.Cyc, q.Cyc)
			}
			switch r := v.(type) {
			case runtime.Quantity:
				tab.Cols = append(tab.Cols, f.Name)
				tab.Dims = append(tab.Dims, r.D)
				tab.Cyc = append(tab.Cyc, r.Cyc)
			case runtime.Vector:
				tab.Cols = append(tab.Cols, f.Name+".x", f.Name+".y", f.Name+".z", "|"+f.Name+"|")
				tab.Dims = append(tab.Dims, r.D, r.D, r.D, r.D)
			case runtime.Complex:
				tab.Cols = append(tab.Cols, "re "+f.Name, "im "+f.Name, "|"+f.Name+"|", "arg "+f.Name)
				tab.Dims = append(tab.Dims, r.D, r.D, r.D, dimAngle)
			default:
				return nil, errorf("%s: %s must return a quantity or a vector, not %s", fn, f.Signature(), runtime.TypeName(v))
			}
		}
		row := make([]float64, 0, len(tab.Cols))
		for k := range axes {
			row = append(row, in[k].(runtime.Quantity).V)
		}
		out := len(tab.Cols) - len(axes)
		switch r := v.(type) {
		case runtime.Quantity:
			if r.D != tab.Dims[len(axes)] || out != 1 {
				return nil, errorf("%s: %s changed its unit during the sweep", fn, f.Signature())
			}
			row = append(row, r.V)
		case runtime.Vector:
			if r.D != tab.Dims[len(axes)] || out != 4 {
				return nil, errorf("%s: %s changed its unit during the sweep", fn, f.Signature())
			}
			c := runtime.CleanComponents(r.V)
			row = append(row, c[0], c[1], c[2], r.Norm().V)
		case runtime.Complex:
			if r.D != tab.Dims[len(axes)] || out != 4 {
				return nil, errorf("%s: %s changed its unit during the sweep", fn, f.Signature())
			}
			ph := 0.0
			if r.V != 0 {
				ph = cmplx.Phase(r.V)
			}
			row = append(row, real(r.V), imag(r.V), cmplx.Abs(r.V), ph)
		default:
			return nil, errorf("%s: %s must return a quantity or a vector, not %s", fn, f.Signature(), runtime.TypeName(v))
		}
		tab.Rows = append(tab.Rows, row)
		if env != nil {
			env.Progress(fn, i+1, total)
		}
	}
	return tab, nil
}

// finiteRow refuses a sweep row with a number that is not finite (a table
// obeys the same guard as a quantity), naming the argument of the row.
func finiteRow(fn string, f *runtime.Func, axes []sweepAxis, in []runtime.Value, v runtime.Value) error {
	bad := ""
	switch r := v.(type) {
	case runtime.Quantity:
		if math.IsNaN(r.V) || math.IsInf(r.V, 0) {
			bad = runtime.FormatNumber(r.V, 6)
		}
	case runtime.Vector:
		for _, c := range r.V {
			if math.IsNaN(c) || math.IsInf(c, 0) {
				bad = runtime.FormatNumber(c, 6)
			}
		}
	case runtime.Complex:
		if cmplx.IsNaN(r.V) || cmplx.IsInf(r.V) {
			bad = "a number that is not finite"
		}
	}
	if bad == "" {
		return nil
	}
	at := make([]string, len(axes))
	for k, a := range axes {
		at[k] = a.name + " = " + runtime.Format(in[k], 6)
	}
	return errorf("%s: %s gives %s at %s; a table holds only finite numbers (narrow the range)", fn, f.Signature(), bad, strings.Join(at, ", "))
}
