package builtins

import (
	"errors"
	"math"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refMinimize = "Brent's method for minimization: R. P. Brent, Algorithms for Minimization without Derivatives (Prentice-Hall, 1973), ch. 5 (the procedure localmin)"

func extremumFuncs() []*runtime.Func {
	return []*runtime.Func{
		{
			Name: "deriv", Params: []string{"f", "x", "scale"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: derivBuiltin,
			Help: &runtime.Help{
				Signature: "deriv(f: function of one quantity, x: unit of f's argument[, scale: unit of x]) -> unit of f / unit of x",
				Summary:   "The derivative of f at x, for a function of any one quantity (a gap, a radius, a current, a time) returning a quantity or a vector. scale is the largest step tried when differences are used (see Method); it defaults to |x| and must then be given at x = 0.",
				Method:    "exact for a function of yours that the derivative flows through (forward-mode automatic differentiation: arithmetic, powers, conditions, the math and vector builtins, your other functions); the tests find it within 1e-14 of the derivatives of calculus, and its numerical error estimate is a running bound of the rounding (a few ulps). Otherwise (a builtin without a derivative rule, such as solve or maxwell_mutual, given a value that depends on x; the note says so) central differences with one Richardson step (the step search shared with emf and ddt), steps from 1e-12·scale up to scale, the first whose estimate agrees with its neighbours to 1e-6 of the function's rate of change; its estimate adds the change of the extrapolated value to the neighbouring steps and 3δ/h for an error δ in f's values (the noise the smaller steps show, at least 4 ulps); the tests find it 7 to 350 times the actual error. A jump, a kink or an infinite slope at x is an error giving both sides; the estimate is shown when it reaches the digits shown, or always after :numerr on",
				Example:   "B(z) = mu0 * 2 A * (20 mm)^2 / (2 * ((20 mm)^2 + z^2)^1.5)\nderiv(B, 5 mm)",
				Reference: "Burden & Faires, Numerical Analysis, 9th ed., 2011, §4.1 (three-point formulas) and §4.2 (Richardson's extrapolation)",
			},
		},
		extremumFunc("minimize", "smallest", +1),
		extremumFunc("maximize", "largest", -1),
	}
}

func derivBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "deriv"
	f, err := funcArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	x, err := quantity(fn, args, 1)
	if err != nil {
		return nil, err
	}
	scale := math.Abs(x.V)
	if len(args) > 2 {
		s, err := quantity(fn, args, 2)
		if err != nil {
			return nil, err
		}
		if s.D != x.D {
			return nil, errorf("%s: the scale must have the unit of x (%s), not %s%s", fn, x.D.Describe(), s.D.Describe(), runtime.AngleNote(s.D, x.D))
		}
		if !(s.V > 0) {
			return nil, errorf("%s: the scale must be positive, not %s", fn, runtime.Format(s, 6))
		}
		scale = s.V
	}
	at := runtime.Format(x, 6)
	dd, reason, err := tangentOf(env, f, []runtime.Value{x}, 0, [3]float64{1})
	if err != nil {
		return nil, derivErr(fn, f, at, x.D, err)
	}
	if t, d, vec, ok := realTangent(dd); ok && reason == "" {
		if dt, ok := d.Combine(1, x.D, -1); ok {
			if vec {
				if env != nil {
					env.NumericalError(dd.ET, dd.ET, dd.ET) // a bound on the norm bounds each component
				}
				return runtime.Vector{V: t, D: dt}, nil
			}
			if env != nil {
				env.NumericalError(dd.ET)
			}
			return runtime.Quantity{V: t[0], D: dt}, nil
		}
	}
	if scale == 0 {
		// only differences need a step; the exact route did not go through
		return nil, errorf("%s: at x = 0 the step cannot follow x; give the scale over which f changes as a third argument, such as deriv(f, %s, %s)", fn, runtime.Format(x, 6), runtime.Format(runtime.Quantity{V: 1, D: x.D}, 6))
	}
	if reason != "" {
		noteDifferences(env, fn, f, reason)
	}
	var dim runtime.Dim
	vec := false
	first := true
	g := func(s float64) (em.Vec, error) {
		if env != nil {
			if err := env.Err(); err != nil {
				return em.Vec{}, err
			}
		}
		v, err := f.Invoke(env, []runtime.Value{runtime.Quantity{V: s, D: x.D, Cyc: x.Cyc}})
		if err != nil {
			return em.Vec{}, err
		}
		var out em.Vec
		var d runtime.Dim
		isVec := false
		switch r := v.(type) {
		case runtime.Quantity:
			out, d = em.Vec{X: r.V}, r.D
		case runtime.Vector:
			out, d, isVec = toVec(r), r.D, true
		default:
			return em.Vec{}, errorf("%s: %s must return a quantity or a vector, not %s", fn, f.Signature(), runtime.TypeName(v))
		}
		if first {
			dim, vec, first = d, isVec, false
		} else if d != dim || isVec != vec {
			return em.Vec{}, errorf("%s: %s changed its unit near %s", fn, f.Signature(), runtime.Format(x, 6))
		}
		return out, nil
	}
	d, est, err := em.DerivativeEst(g, x.V, scale, -12, true)
	show := func(v em.Vec) string {
		if vec {
			return runtime.Format(fromVec(v, dim.Div(x.D)), 6)
		}
		return runtime.Format(runtime.Quantity{V: v.X, D: dim.Div(x.D)}, 6)
	}
	var ke *em.KinkError
	var ae *argError
	switch {
	case errors.As(err, &ke):
		return nil, errorf("%s: %s has a kink at %s: its slope is %s just before and %s just after, so the derivative is not defined there", fn, f.Signature(), at, show(ke.Before), show(ke.After))
	case errors.As(err, &ae), stopping(err):
		return nil, err
	case errors.Is(err, em.ErrNoPlateau):
		return nil, errorf("%s: %s has no reliable derivative at %s (a jump there, not defined there, or the scale %s too large or too small?)", fn, f.Signature(), at, runtime.Format(runtime.Quantity{V: scale, D: x.D}, 6))
	case err != nil:
		return nil, err
	}
	if env != nil {
		if vec {
			env.NumericalError(est, est, est) // a bound on the norm bounds each component
		} else {
			env.NumericalError(est)
		}
	}
	if vec {
		return fromVec(d, dim.Div(x.D)), nil
	}
	return runtime.Quantity{V: d.X, D: dim.Div(x.D)}, nil
}

// derivErr is the message of an exact derivative that does not exist at
// x (of unit xd): a kink, a jump or an infinite slope of f.
func derivErr(fn string, f *runtime.Func, at string, xd runtime.Dim, err error) error {
	var ke *runtime.KinkError
	var je *runtime.JumpError
	var ie *runtime.InfiniteSlopeError
	slope := func(d runtime.Dual) string {
		v, e := runtime.TangentValue(d, xd)
		if e != nil {
			return "?"
		}
		return runtime.Format(v, 6)
	}
	switch {
	case errors.As(err, &ke):
		return errorf("%s: %s has a kink at %s: its slope is %s just before and %s just after, so the derivative is not defined there", fn, f.Signature(), at, slope(ke.Before), slope(ke.After))
	case errors.As(err, &je):
		return errorf("%s: %s has no derivative at %s: it jumps there (%s just before, %s at the point, %s just after)", fn, f.Signature(), at,
			runtime.Format(je.Before, 6), runtime.Format(je.At, 6), runtime.Format(je.After, 6))
	case errors.As(err, &ie):
		return errorf("%s: %s has no derivative at %s: %s", fn, f.Signature(), at, ie.Error())
	}
	return err
}

func extremumFunc(name, word string, sign float64) *runtime.Func {
	other := map[bool]string{true: "maximize", false: "minimize"}[sign > 0]
	return &runtime.Func{
		Name: name, Params: []string{"f", "lo", "hi"}, MinArgs: 3, MaxArgs: 3,
		CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			return extremum(env, name, sign, args)
		},
		Help: &runtime.Help{
			Signature: name + "(f: function of one quantity, lo, hi: unit of f's argument) -> unit of lo",
			Summary:   "The x between lo and hi where f(x) is " + word + " (the argument, not the value: the value is f(" + name + "(f, lo, hi))). f should have one " + map[bool]string{true: "minimum", false: "maximum"}[sign > 0] + " inside the interval; if it is " + word + " at an end, that is an error saying which end (the extreme lies outside: move the interval). Use " + other + " for the opposite.",
			Method:    "Brent's method (golden-section steps and parabolic interpolation; gonum offers no one-dimensional minimiser); stops when x is within 2·(1.5e-8·|x| + 3.3e-13·(hi − lo)) of the extremum (1.5e-8 is the square root of double precision: a smooth extremum is flat, so its place is known far less well than its value). The result carries a numerical error estimate: the final bracket plus the width around it that rounding leaves flat, √(16ε|f|/f''), with f'' from two more values of f",
			Example:   map[bool]string{true: "minimize(cos, 2, 4)\ncos(minimize(cos, 2, 4))", false: "P(R) = (1 V)^2 * R / (R + 50 ohm)^2\nmaximize(P, 1 ohm, 500 ohm)\nP(maximize(P, 1 ohm, 500 ohm))"}[sign > 0],
			Reference: refMinimize,
		},
	}
}

// minRel is Brent's ε for localmin: the square root of the float64
// precision, the best relative accuracy a smooth minimum's place can have
// (near it f changes only as the square of the distance).
const minRel = 1.4901161193847656e-08 // 2^-26

// extremum finds where f is smallest (sign +1) or largest (sign −1).
func extremum(env runtime.Env, fn string, sign float64, args []runtime.Value) (runtime.Value, error) {
	f, err := funcArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	lo, err := quantity(fn, args, 1)
	if err != nil {
		return nil, err
	}
	hi, err := quantity(fn, args, 2)
	if err != nil {
		return nil, err
	}
	if lo.D != hi.D {
		return nil, errorf("%s: lo and hi must have one unit; got %s and %s", fn, lo.D.Describe(), hi.D.Describe())
	}
	if !(lo.V < hi.V) {
		return nil, errorf("%s: lo (%s) must be below hi (%s)", fn, runtime.Format(lo, 6), runtime.Format(hi, 6))
	}
	cyc := lo.Cyc && hi.Cyc
	var dim runtime.Dim
	first := true
	g := func(x float64) (float64, error) {
		if env != nil {
			if err := env.Err(); err != nil {
				return 0, err
			}
		}
		q, err := scalarCall(env, fn, f, x, lo.D)
		if err != nil {
			return 0, err
		}
		if first {
			dim, first = q.D, false
		} else if q.D != dim {
			return 0, errorf("%s: %s changed its unit between %s and %s", fn, f.Signature(), runtime.Format(lo, 6), runtime.Format(hi, 6))
		}
		if math.IsNaN(q.V) || math.IsInf(q.V, 0) {
			return 0, errorf("%s: %s gives %s at %s; it must be finite on the whole interval", fn, f.Signature(), runtime.FormatNumber(q.V, 6), runtime.Format(runtime.Quantity{V: x, D: lo.D}, 6))
		}
		return sign * q.V, nil
	}
	x, fx, width, err := localMin(g, lo.V, hi.V, 1e-12*(hi.V-lo.V))
	if errors.Is(err, errNoMin) {
		return nil, errorf("%s: %s: %v", fn, f.Signature(), err)
	}
	if err != nil {
		return nil, err
	}
	// localmin never evaluates the ends; an extreme there is not one inside
	for _, end := range []struct {
		name string
		q    runtime.Quantity
	}{{"lo", lo}, {"hi", hi}} {
		fe, err := g(end.q.V)
		if err != nil {
			return nil, err
		}
		if fe < fx {
			word := map[bool]string{true: "smallest", false: "largest"}[sign > 0]
			return nil, errorf("%s: %s is %s at the end %s = %s of the interval (%s there); the %s lies at or beyond that end: move or widen the interval", fn, f.Signature(), word, end.name, runtime.Format(end.q, 6),
				runtime.Format(runtime.Quantity{V: sign * fe, D: dim}, 6), map[bool]string{true: "minimum", false: "maximum"}[sign > 0])
		}
	}
	if env != nil {
		// a minimum of the computed function lies in the final bracket;
		// the true one within the width its rounding leaves flat
		env.NumericalError(width + flatWidth(g, x, fx, lo.V, hi.V))
	}
	return runtime.Quantity{V: x, D: lo.D, Cyc: cyc}, nil
}

var errNoMin = errors.New("no convergence in 500 steps (is the function continuous on the interval?)")

// localMin is Brent's procedure localmin (Brent 1973, ch. 5, section 8):
// a minimum of g in (a, b) by golden-section search, with a parabola
// through the three best points taken whenever it falls inside the
// interval and moves less than half the step before last. It stops when
// the bracket around the best point x is within 2·(minRel·|x| + t/3) of
// x. For a unimodal g it finds the minimum; otherwise a local one.
// (gonum's optimize package minimises in several dimensions only; it has
// no bracketing minimiser in one, so this is written out here.)
func localMin(g func(float64) (float64, error), a, b, t float64) (x, fx, width float64, err error) {
	c := 0.5 * (3 - math.Sqrt(5)) // the golden section, 0.381966…
	v := a + c*(b-a)
	w := v
	x = v
	d, e := 0.0, 0.0
	if fx, err = g(x); err != nil {
		return 0, 0, 0, err
	}
	fv, fw := fx, fx
	for iter := 0; iter < 500; iter++ {
		m := 0.5 * (a + b)
		tol := minRel*math.Abs(x) + t/3
		t2 := 2 * tol
		if math.Abs(x-m) <= t2-0.5*(b-a) {
			return x, fx, math.Max(x-a, b-x), nil
		}
		golden := true
		if math.Abs(e) > tol { // try a parabola through x, v, w
			r := (x - w) * (fx - fv)
			q := (x - v) * (fx - fw)
			p := (x-v)*q - (x-w)*r
			q = 2 * (q - r)
			if q > 0 {
				p = -p
			} else {
				q = -q
			}
			r = e
			e = d
			if math.Abs(p) < math.Abs(0.5*q*r) && p > q*(a-x) && p < q*(b-x) {
				d = p / q
				u := x + d
				// g must not be evaluated too close to a or b
				if u-a < t2 || b-u < t2 {
					d = tol
					if x >= m {
						d = -tol
					}
				}
				golden = false
			}
		}
		if golden {
			if x < m {
				e = b - x
			} else {
				e = a - x
			}
			d = c * e
		}
		// g must not be evaluated too close to x
		u := x + d
		if math.Abs(d) < tol {
			u = x + math.Copysign(tol, d)
		}
		fu, err := g(u)
		if err != nil {
			return 0, 0, 0, err
		}
		if fu <= fx {
			if u < x {
				b = x
			} else {
				a = x
			}
			v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
			continue
		}
		if u < x {
			a = u
		} else {
			b = u
		}
		if fu <= fw || w == x {
			v, fv, w, fw = w, fw, u, fu
		} else if fu <= fv || v == x || v == w {
			v, fv = u, fu
		}
	}
	return 0, 0, 0, errNoMin
}

// flatWidth is how far from x the computed function can stay within its
// rounding of its least value: near a minimum g ≈ g(x) + g”·(u − x)²/2,
// which rounding (8 ulps of |g(x)|) cannot tell from g(x) while
// |u − x| < √(16ε|g(x)|/g”). g” comes from two more values of g at
// x ± h, h = 1e-4 of the interval (far enough that rounding does not
// swamp it); where it is not positive, √ε times the scale.
func flatWidth(g func(float64) (float64, error), x, fx, lo, hi float64) float64 {
	const eps = 0x1p-52
	scale := math.Max(math.Abs(x), hi-lo)
	h := 1e-4 * (hi - lo)
	h = math.Min(h, math.Min(x-lo, hi-x))
	if h > 0 {
		fp, err1 := g(x + h)
		fm, err2 := g(x - h)
		if err1 == nil && err2 == nil {
			if c2 := (fp + fm - 2*fx) / (h * h); c2 > 0 && !math.IsInf(c2, 0) {
				return math.Min(math.Sqrt(16*eps*math.Max(math.Abs(fx), 1e-300)/c2), scale)
			}
		}
	}
	return math.Sqrt(eps) * scale
}
