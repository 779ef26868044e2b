package builtins

import (
	"math"

	"loopwise/runtime"
)

const refGoMath = "Go standard library math package (IEEE 754 double precision)"

// unary makes a builtin of a dimensionless real function.
func unary(name, summary, example string, f func(float64) float64) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"x"}, MinArgs: 1, MaxArgs: 1,
		Call: func(args []runtime.Value) (runtime.Value, error) {
			x, err := number(name, args, 0)
			if err != nil {
				return nil, err
			}
			return finite(name, f(x), runtime.Dimensionless)
		},
		Real: &runtime.RealFunc{Dim: plainDim, F: f},
		Help: &runtime.Help{
			Signature: name + "(x: plain number) -> plain number",
			Summary:   summary,
			Example:   example,
			Reference: refGoMath,
		},
	}
}

// trig makes sin, cos or tan: the argument is an angle (rad, deg, rev) or
// a plain number read as radians, so sin(2*pi*50 Hz*t) and
// sin(3000 rpm*t) both work.
func trig(name, summary, example string, f func(float64) float64) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"x"}, MinArgs: 1, MaxArgs: 1,
		Call: func(args []runtime.Value) (runtime.Value, error) {
			x, err := angle(name, args, 0)
			if err != nil {
				return nil, err
			}
			return finite(name, f(x), runtime.Dimensionless)
		},
		Real: &runtime.RealFunc{Dim: func(d runtime.Dim) (runtime.Dim, bool) {
			return runtime.Dimensionless, d == dimAngle || d.IsZero()
		}, F: f},
		Help: &runtime.Help{
			Signature: name + "(x: rad, or a plain number in radians) -> dimensionless",
			Summary:   summary,
			Example:   example,
			Reference: refGoMath,
		},
	}
}

// inverse makes asin, acos or atan, which return an angle in rad.
func inverse(name, summary, example string, f func(float64) float64) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"x"}, MinArgs: 1, MaxArgs: 1,
		Call: func(args []runtime.Value) (runtime.Value, error) {
			x, err := number(name, args, 0)
			if err != nil {
				return nil, err
			}
			return finite(name, f(x), dimAngle)
		},
		Help: &runtime.Help{
			Signature: name + "(x: dimensionless) -> rad",
			Summary:   summary,
			Example:   example,
			Reference: refGoMath,
		},
	}
}

func mathFuncs() []*runtime.Func {
	fs := []*runtime.Func{
		trig("sin", "Sine of an angle (rad, deg, rev) or of a plain number in radians.", "sin(30 deg)", math.Sin),
		trig("cos", "Cosine of an angle or of a plain number in radians.", "cos(2*pi*50 Hz*5 ms)", math.Cos),
		trig("tan", "Tangent of an angle or of a plain number in radians.", "tan(45 deg)", math.Tan),
		inverse("asin", "Inverse sine, an angle in rad from -pi/2 to pi/2.", "asin(0.5) as deg", math.Asin),
		inverse("acos", "Inverse cosine, an angle in rad from 0 to pi.", "acos(0.5) as deg", math.Acos),
		inverse("atan", "Inverse tangent, an angle in rad from -pi/2 to pi/2.", "atan(1) as deg", math.Atan),
		unary("sinh", "Hyperbolic sine.", "sinh(1)", math.Sinh),
		unary("cosh", "Hyperbolic cosine.", "cosh(1)", math.Cosh),
		unary("tanh", "Hyperbolic tangent.", "tanh(1)", math.Tanh),
		complexable(unary("exp", "Exponential e^x; of a complex plain number, the complex exponential (exp(j*pi) is -1).", "exp(-1 ms/(2 ms))", math.Exp), complexExp),
		unary("ln", "Natural logarithm.", "ln(10)", math.Log),
		unary("log10", "Logarithm to base 10.", "log10(1000)", math.Log10),
		unary("floor", "Largest whole number not above x.", "floor(2.7)", math.Floor),
		unary("ceil", "Smallest whole number not below x.", "ceil(2.1)", math.Ceil),
		unary("round", "Nearest whole number (halves away from zero).", "round(2.5)", math.Round),
		{
			Name: "sqrt", Params: []string{"x"}, MinArgs: 1, MaxArgs: 1,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				if z, ok := args[0].(runtime.Complex); ok {
					return complexSqrt(z)
				}
				q, err := quantity("sqrt", args, 0)
				if err != nil {
					return nil, err
				}
				if q.V < 0 {
					return nil, errorf("sqrt: the argument is negative (%s); for the complex root, make it complex: sqrt(x + 0j)", runtime.Format(q, 6))
				}
				for _, e := range q.D {
					if e%2 != 0 {
						return nil, errorf("sqrt: %s has an odd power of a base unit, so its square root has no SI unit", q.D.Describe())
					}
				}
				return runtime.Quantity{V: math.Sqrt(q.V), D: halfDim(q.D)}, nil
			},
			Real: &runtime.RealFunc{Dim: func(d runtime.Dim) (runtime.Dim, bool) {
				for _, e := range d {
					if e%2 != 0 {
						return d, false
					}
				}
				return halfDim(d), true
			}, F: math.Sqrt}, // a negative argument gives NaN, and the call is made again for its message
			Help: &runtime.Help{
				Signature: "sqrt(x: any unit with even powers, real or complex) -> unit^(1/2)",
				Summary:   "Square root; the unit's powers are halved (sqrt(4 m^2) is 2 m). Of a complex value, the principal root (real part ≥ 0).",
				Example:   "sqrt(2 H * 8 H)",
				Reference: refGoMath,
			},
		},
		{
			Name: "abs", Params: []string{"x"}, MinArgs: 1, MaxArgs: 1,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				if z, ok := args[0].(runtime.Complex); ok {
					return complexAbs(z), nil
				}
				if v, ok := args[0].(runtime.CVector); ok {
					return v.Norm(), nil
				}
				q, err := quantity("abs", args, 0)
				if err != nil {
					return nil, err
				}
				return runtime.Quantity{V: math.Abs(q.V), D: q.D, Cyc: q.Cyc}, nil
			},
			Real: &runtime.RealFunc{Dim: func(d runtime.Dim) (runtime.Dim, bool) { return d, true }, F: math.Abs},
			Help: &runtime.Help{Signature: "abs(x: any unit, real or complex) -> same unit", Summary: "Absolute value; of a complex value, its magnitude; of a complex vector (a field phasor), √(Σ|cᵢ|²), which is √2 times the rms of the field's magnitude.", Example: "abs(-3 mV)", Reference: refGoMath},
		},
		sameDim2("atan2", "Angle of the point (x, y) from the +x axis, in rad, in (-pi, pi].", "atan2(y: unit, x: same unit) -> rad", "atan2(1 mm, -1 mm) as deg",
			func(y, x runtime.Quantity) runtime.Quantity {
				return runtime.Quantity{V: math.Atan2(y.V, x.V), D: dimAngle}
			}),
		sameDim2("hypot", "sqrt(a^2 + b^2) without overflow.", "hypot(a: unit, b: same unit) -> unit", "hypot(3 mm, 4 mm)",
			func(a, b runtime.Quantity) runtime.Quantity { return runtime.Quantity{V: math.Hypot(a.V, b.V), D: a.D} }),
		sameDimN("min", "Smallest of its arguments.", "min(a: unit, b: same unit, ...) -> unit", "min(3 mm, 0.2 inch)", math.Min),
		sameDimN("max", "Largest of its arguments.", "max(a: unit, b: same unit, ...) -> unit", "max(3 mm, 0.2 inch)", math.Max),
	}
	return withTangents(fs)
}

// plainDim is the unit rule of a function of a plain number.
func plainDim(d runtime.Dim) (runtime.Dim, bool) { return runtime.Dimensionless, d.IsZero() }

func halfDim(d runtime.Dim) runtime.Dim {
	for i := range d {
		d[i] /= 2
	}
	return d
}

func sameDim2(name, summary, sig, example string, f func(a, b runtime.Quantity) runtime.Quantity) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"a", "b"}, MinArgs: 2, MaxArgs: 2,
		Call: func(args []runtime.Value) (runtime.Value, error) {
			a, err := quantity(name, args, 0)
			if err != nil {
				return nil, err
			}
			b, err := quantity(name, args, 1)
			if err != nil {
				return nil, err
			}
			if a.D != b.D {
				return nil, errorf("%s: both arguments must have one dimension; got %s and %s", name, a.D.Describe(), b.D.Describe())
			}
			return f(a, b), nil
		},
		Help: &runtime.Help{Signature: sig, Summary: summary, Example: example, Reference: refGoMath},
	}
}

func sameDimN(name, summary, sig, example string, f func(a, b float64) float64) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"a", "b", "..."}, MinArgs: 1, MaxArgs: -1,
		Call: func(args []runtime.Value) (runtime.Value, error) {
			acc, err := quantity(name, args, 0)
			if err != nil {
				return nil, err
			}
			for i := 1; i < len(args); i++ {
				q, err := quantity(name, args, i)
				if err != nil {
					return nil, err
				}
				if q.D != acc.D {
					return nil, errorf("%s: all arguments must have one dimension; the first is %s, the %s is %s", name, acc.D.Describe(), ordinal(i), q.D.Describe())
				}
				acc.V = f(acc.V, q.V)
				acc.Cyc = acc.Cyc && q.Cyc
			}
			return acc, nil
		},
		Help: &runtime.Help{Signature: sig, Summary: summary, Example: example, Reference: refGoMath},
	}
}

// complexable lets a real function of one argument take a complex one too.
func complexable(f *runtime.Func, c func(runtime.Complex) (runtime.Value, error)) *runtime.Func {
	call := f.Call
	f.Call = func(args []runtime.Value) (runtime.Value, error) {
		if z, ok := args[0].(runtime.Complex); ok {
			return c(z)
		}
		return call(args)
	}
	f.Help.Signature = f.Name + "(x: plain number, real or complex) -> plain number"
	return f
}
