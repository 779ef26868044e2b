package builtins

import (
	"math"
	"math/cmplx"

	"loopwise/runtime"
)

// Derivative rules (runtime.TangentRule) of the math and vector builtins,
// by which exact derivatives of user functions flow through them (see
// runtime/tangent.go). The derivatives of the elementary functions are
// those of Abramowitz & Stegun, Handbook of Mathematical Functions, 1964,
// 4.1.47 (ln), 4.2.54 (exp), 4.3.105–4.3.107 (sin, cos, tan), 4.4.52–4.4.54
// (asin, acos, atan), 4.5.76–4.5.78 (sinh, cosh, tanh); the second
// derivatives serve the rounding bound only (how an error in the argument
// moves the derivative). Each rule computes the value by the builtin's own
// Call, so values and messages are those of ordinary evaluation.

const u = 0x1p-53

// libAllow: the error allowed for a library function, in u of its result
// (as runtime's).
const libAllow = 8

// smooth is the rule of a function of one real quantity with derivative
// df and second derivative d2f; bad (may be nil) says where the slope is
// infinite.
func smooth(fn *runtime.Func, df, d2f func(x float64) float64, bad func(x float64) bool) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		v, err := fn.Call([]runtime.Value{args[0].V})
		if err != nil {
			return runtime.Dual{}, err
		}
		if len(args) != 1 {
			return runtime.Dual{}, runtime.NoTangent("%s", fn.Name)
		}
		q, ok := args[0].V.(runtime.Quantity)
		r, ok2 := v.(runtime.Quantity)
		if !ok || !ok2 {
			return runtime.Dual{}, runtime.NoTangent("%s of %s", fn.Name, runtime.TypeName(args[0].V))
		}
		x, xt := q.V, real(args[0].T[0])
		if xt == 0 && args[0].Var && bad != nil && bad(x) {
			// an infinite slope times a zero one: sqrt(x²) at 0 has a kink
			return runtime.Dual{}, runtime.NoTangentWhy("%s at %s, where its slope is infinite, of a value whose slope is 0 (infinity times 0)", fn.Name, runtime.FormatNumber(x, 6))
		}
		if xt == 0 {
			return runtime.Dual{V: v, EV: args[0].EV*math.Abs(df(x)) + libAllow*u*math.Abs(r.V)}, nil
		}
		if bad != nil && bad(x) {
			return runtime.Dual{}, &runtime.InfiniteSlopeError{What: fn.Name + " at " + runtime.FormatNumber(x, 6)}
		}
		d1 := df(x)
		t := d1 * xt
		d := runtime.Dual{V: v, T: [3]complex128{complex(t, 0)}}
		d.EV = math.Abs(d1)*args[0].EV + libAllow*u*math.Abs(r.V)
		d.ET = math.Abs(d1)*args[0].ET + math.Abs(d2f(x))*args[0].EV*math.Abs(xt) + libAllow*u*math.Abs(t) + u*math.Abs(t)
		return d, nil
	}
}

// complexToo extends a real rule to a complex argument with the complex
// derivative df (exp, sqrt).
func complexToo(fn *runtime.Func, real1 runtime.TangentRule, df func(z complex128) complex128) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		z, ok := args[0].V.(runtime.Complex)
		if !ok {
			return real1(args, side)
		}
		v, err := fn.Call([]runtime.Value{z})
		if err != nil {
			return runtime.Dual{}, err
		}
		w, ok := v.(runtime.Complex)
		if !ok {
			return runtime.Dual{}, runtime.NoTangent("%s of a complex number", fn.Name)
		}
		if args[0].IsConst() {
			return runtime.Dual{V: v, EV: libAllow * 4 * u * cmplx.Abs(w.V)}, nil
		}
		if z.V == 0 {
			return runtime.Dual{}, runtime.NoTangent("%s at 0", fn.Name)
		}
		d1 := df(z.V)
		t := d1 * args[0].T[0]
		d := runtime.Dual{V: v, T: [3]complex128{t}}
		// a complex argument's error moves d1 by about |d1/z| of it (true
		// of exp for |z| ≥ 1 and of sqrt everywhere); allowed twice that
		d.EV = cmplx.Abs(d1)*args[0].EV + libAllow*4*u*cmplx.Abs(w.V)
		d.ET = cmplx.Abs(d1)*args[0].ET + 2*cmplx.Abs(d1)*(1+1/cmplx.Abs(z.V))*args[0].EV*cmplx.Abs(args[0].T[0]) + libAllow*4*u*cmplx.Abs(t)
		return d, nil
	}
}

// steps is the rule of a function constant between jumps (floor, ceil,
// round): its tangent is 0; at a jump (jumpAt) with a moving argument the
// value just before or after is the function of the neighbouring float.
func steps(fn *runtime.Func, jumpAt func(x float64) bool) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		v, err := fn.Call([]runtime.Value{args[0].V})
		if err != nil {
			return runtime.Dual{}, err
		}
		q, ok := args[0].V.(runtime.Quantity)
		xt := real(args[0].T[0])
		if ok && xt == 0 && args[0].Var && jumpAt(q.V) {
			// at a jump, moving with zero slope: which side it goes to is
			// a question of higher order (floor(-x^2) at 0)
			return runtime.Dual{}, runtime.NoTangentWhy("%s at a jump, of a value whose slope is 0", fn.Name)
		}
		if !ok || xt == 0 || !jumpAt(q.V) {
			return runtime.Dual{V: v}, nil
		}
		if side == 0 {
			return runtime.Dual{}, runtime.ErrOneSided
		}
		q.V = math.Nextafter(q.V, math.Copysign(math.Inf(1), float64(side)*xt))
		v, err = fn.Call([]runtime.Value{q})
		return runtime.Dual{V: v}, err
	}
}

// absRule: sign(x)·x' off 0; at 0 one-sided, |x'| after and −|x'| before.
// Of a complex number or vector, Re(conj(z)·z')/|z|.
func absRule(fn *runtime.Func) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		v, err := fn.Call([]runtime.Value{args[0].V})
		if err != nil {
			return runtime.Dual{}, err
		}
		a := args[0]
		n, ok := runtime.NumbersOf(a.V)
		if !ok {
			return runtime.Dual{}, runtime.NoTangent("abs of %s", runtime.TypeName(a.V))
		}
		m := runtime.Norm3(n)
		d := runtime.Dual{V: v, EV: a.EV + 4*u*m}
		if a.IsConst() {
			return d, nil
		}
		if m == 0 {
			if side == 0 {
				return runtime.Dual{}, runtime.ErrOneSided
			}
			t := float64(side) * runtime.Norm3(a.T)
			d.T[0] = complex(t, 0)
			d.ET = a.ET + u*math.Abs(t)
			return d, nil
		}
		var dot float64
		for i := range n {
			dot += real(cmplx.Conj(n[i]) * a.T[i])
		}
		t := dot / m
		d.T[0] = complex(t, 0)
		// the unit direction n/|n| moves by at most 2·EV/|n|
		d.ET = a.ET + 2*a.EV/m*runtime.Norm3(a.T) + 8*u*runtime.Norm3(a.T)
		return d, nil
	}
}

// pickRule is min or max: the tangent of the argument chosen; where equal
// arguments with different tangents tie, one-sided (before and after, the
// one that becomes the smallest or largest).
func pickRule(fn *runtime.Func, sign float64) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		vals := make([]runtime.Value, len(args))
		for i, a := range args {
			vals[i] = a.V
		}
		v, err := fn.Call(vals)
		if err != nil {
			return runtime.Dual{}, err
		}
		r := v.(runtime.Quantity)
		best := -1
		tie := false
		for i, a := range args {
			q := a.V.(runtime.Quantity)
			if q.V != r.V {
				continue
			}
			switch {
			case best < 0:
				best = i
			case args[i].T[0] != args[best].T[0]:
				tie = true
				if side != 0 && sign*float64(side)*real(args[i].T[0]) < sign*float64(side)*real(args[best].T[0]) {
					best = i
				}
			}
		}
		if best < 0 {
			return runtime.Dual{}, runtime.NoTangent("%s", fn.Name)
		}
		if tie && side == 0 {
			return runtime.Dual{}, runtime.ErrOneSided
		}
		b := args[best]
		return runtime.Dual{V: v, T: b.T, EV: b.EV, ET: b.ET}, nil
	}
}

// atan2Rule: (x·y' − y·x')/(x² + y²); the cut along the negative x axis
// (y = 0, x < 0) is a jump of 2π when y moves.
func atan2Rule(fn *runtime.Func) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		v, err := fn.Call([]runtime.Value{args[0].V, args[1].V})
		if err != nil {
			return runtime.Dual{}, err
		}
		y, x := args[0].V.(runtime.Quantity).V, args[1].V.(runtime.Quantity).V
		yt, xt := real(args[0].T[0]), real(args[1].T[0])
		r2 := x*x + y*y
		if args[0].IsConst() && args[1].IsConst() {
			return runtime.Dual{V: v}, nil
		}
		if r2 == 0 {
			return runtime.Dual{}, runtime.NoTangent("atan2 at the origin")
		}
		q := v.(runtime.Quantity)
		if y == 0 && x < 0 && yt != 0 {
			if side == 0 {
				return runtime.Dual{}, runtime.ErrOneSided
			}
			q.V = math.Atan2(math.Copysign(0, float64(side)*yt), x)
		}
		t := (x*yt - y*xt) / r2
		rr := math.Sqrt(r2)
		ev := (args[0].EV + args[1].EV) / rr
		return runtime.Dual{V: q, T: [3]complex128{complex(t, 0)}, EV: ev + libAllow*u*math.Abs(q.V),
			ET: (args[0].ET+args[1].ET)/rr + 2*ev*math.Hypot(xt, yt)/rr + 6*u*math.Abs(t) + 4*u*math.Hypot(xt, yt)/rr}, nil
	}
}

// hypotRule: (a·a' + b·b')/h; at (0, 0) one-sided: ±√(a'² + b'²).
func hypotRule(fn *runtime.Func) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		v, err := fn.Call([]runtime.Value{args[0].V, args[1].V})
		if err != nil {
			return runtime.Dual{}, err
		}
		vec := runtime.Dual{T: [3]complex128{args[0].T[0], args[1].T[0]}, EV: math.Hypot(args[0].EV, args[1].EV), ET: math.Hypot(args[0].ET, args[1].ET), Var: args[0].Var || args[1].Var}
		vec.V = runtime.Vector{V: [3]float64{args[0].V.(runtime.Quantity).V, args[1].V.(runtime.Quantity).V}}
		d, err := absRule(&runtime.Func{Name: "hypot", Call: func(a []runtime.Value) (runtime.Value, error) { return v, nil }})([]runtime.Dual{vec}, side)
		if err != nil {
			return runtime.Dual{}, err
		}
		d.V = v
		return d, nil
	}
}

// bilinearRule makes the rule of dot and cross (bilinear: f(a', b) + f(a, b')),
// from the builtin's own Call applied to the tangents as vectors.
func bilinearRule(fn *runtime.Func) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		if len(args) != 2 {
			return runtime.Dual{}, runtime.NoTangent("%s", fn.Name)
		}
		v, err := fn.Call([]runtime.Value{args[0].V, args[1].V})
		if err != nil {
			return runtime.Dual{}, err
		}
		a, ok1 := args[0].V.(runtime.Vector)
		b, ok2 := args[1].V.(runtime.Vector)
		if !ok1 || !ok2 {
			return runtime.Dual{}, runtime.NoTangent("%s", fn.Name)
		}
		re := func(t [3]complex128) [3]float64 { return [3]float64{real(t[0]), real(t[1]), real(t[2])} }
		at := runtime.Vector{V: re(args[0].T)}
		bt := runtime.Vector{V: re(args[1].T)}
		p1, err := fn.Call([]runtime.Value{at, runtime.Vector{V: b.V}})
		if err != nil {
			return runtime.Dual{}, err
		}
		p2, err := fn.Call([]runtime.Value{runtime.Vector{V: a.V}, bt})
		if err != nil {
			return runtime.Dual{}, err
		}
		n1, _ := runtime.NumbersOf(p1)
		n2, _ := runtime.NumbersOf(p2)
		nv, _ := runtime.NumbersOf(v)
		d := runtime.Dual{V: v}
		for i := range d.T {
			d.T[i] = n1[i] + n2[i]
		}
		na, nb := runtime.Norm3(complex3(a.V)), runtime.Norm3(complex3(b.V))
		nat, nbt := runtime.Norm3(args[0].T), runtime.Norm3(args[1].T)
		// each component is a sum of 3 (dot) or 2 (cross) products:
		// at most 3u of the sum of their magnitudes, |a||b| by Cauchy–Schwarz
		d.EV = args[0].EV*nb + na*args[1].EV + 4*u*na*nb + u*runtime.Norm3(nv)
		d.ET = args[0].ET*nb + nat*args[1].EV + args[0].EV*nbt + na*args[1].ET + 8*u*(nat*nb+na*nbt)
		return d, nil
	}
}

func complex3(v [3]float64) [3]complex128 {
	return [3]complex128{complex(v[0], 0), complex(v[1], 0), complex(v[2], 0)}
}

// directionRule: (v' − n(n·v'))/|v| with n = v/|v|.
func directionRule(fn *runtime.Func) runtime.TangentRule {
	return func(args []runtime.Dual, side int) (runtime.Dual, error) {
		v, err := fn.Call([]runtime.Value{args[0].V})
		if err != nil {
			return runtime.Dual{}, err
		}
		a, ok := args[0].V.(runtime.Vector)
		if !ok {
			return runtime.Dual{}, runtime.NoTangent("direction of %s", runtime.TypeName(args[0].V))
		}
		if args[0].IsConst() {
			return runtime.Dual{V: v, EV: 8 * u}, nil
		}
		n := v.(runtime.Vector).V
		m := math.Sqrt(a.V[0]*a.V[0] + a.V[1]*a.V[1] + a.V[2]*a.V[2])
		var nd float64
		for i := range n {
			nd += n[i] * real(args[0].T[i])
		}
		d := runtime.Dual{V: v}
		for i := range n {
			d.T[i] = complex((real(args[0].T[i])-n[i]*nd)/m, 0)
		}
		nt := runtime.Norm3(args[0].T)
		d.EV = 2*args[0].EV/m + 8*u
		d.ET = 2*args[0].ET/m + 6*args[0].EV*nt/(m*m) + 16*u*nt/m
		return d, nil
	}
}

// withTangents sets the rules of the builtins in fs that have one.
func withTangents(fs []*runtime.Func) []*runtime.Func {
	sec2 := func(x float64) float64 { c := math.Cos(x); return 1 / (c * c) }
	near1 := func(x float64) bool { return math.Abs(x) >= 1 }
	for _, f := range fs {
		switch f.Name {
		case "sin":
			f.Tangent = smooth(f, math.Cos, func(x float64) float64 { return -math.Sin(x) }, nil)
		case "cos":
			f.Tangent = smooth(f, func(x float64) float64 { return -math.Sin(x) }, func(x float64) float64 { return -math.Cos(x) }, nil)
		case "tan":
			f.Tangent = smooth(f, sec2, func(x float64) float64 { return 2 * math.Tan(x) * sec2(x) }, nil)
		case "asin":
			f.Tangent = smooth(f, func(x float64) float64 { return 1 / math.Sqrt(1-x*x) },
				func(x float64) float64 { return x / math.Pow(1-x*x, 1.5) }, near1)
		case "acos":
			f.Tangent = smooth(f, func(x float64) float64 { return -1 / math.Sqrt(1-x*x) },
				func(x float64) float64 { return -x / math.Pow(1-x*x, 1.5) }, near1)
		case "atan":
			f.Tangent = smooth(f, func(x float64) float64 { return 1 / (1 + x*x) },
				func(x float64) float64 { return -2 * x / ((1 + x*x) * (1 + x*x)) }, nil)
		case "sinh":
			f.Tangent = smooth(f, math.Cosh, math.Sinh, nil)
		case "cosh":
			f.Tangent = smooth(f, math.Sinh, math.Cosh, nil)
		case "tanh":
			f.Tangent = smooth(f, func(x float64) float64 { t := math.Tanh(x); return 1 - t*t },
				func(x float64) float64 { t := math.Tanh(x); return -2 * t * (1 - t*t) }, nil)
		case "exp":
			f.Tangent = complexToo(f, smooth(f, math.Exp, math.Exp, nil), cmplx.Exp)
		case "ln":
			f.Tangent = smooth(f, func(x float64) float64 { return 1 / x }, func(x float64) float64 { return -1 / (x * x) }, nil)
		case "log10":
			f.Tangent = smooth(f, func(x float64) float64 { return 1 / (x * math.Ln10) }, func(x float64) float64 { return -1 / (x * x * math.Ln10) }, nil)
		case "sqrt":
			f.Tangent = complexToo(f, smooth(f, func(x float64) float64 { return 0.5 / math.Sqrt(x) },
				func(x float64) float64 { return -0.25 / (x * math.Sqrt(x)) }, func(x float64) bool { return x == 0 }),
				func(z complex128) complex128 { return 0.5 / cmplx.Sqrt(z) })
		case "floor", "ceil":
			f.Tangent = steps(f, func(x float64) bool { return x == math.Trunc(x) })
		case "round":
			f.Tangent = steps(f, func(x float64) bool { return math.Abs(x-math.Trunc(x)) == 0.5 })
		case "abs", "norm":
			f.Tangent = absRule(f)
		case "min":
			f.Tangent = pickRule(f, 1)
		case "max":
			f.Tangent = pickRule(f, -1)
		case "atan2":
			f.Tangent = atan2Rule(f)
		case "hypot":
			f.Tangent = hypotRule(f)
		case "dot", "cross":
			f.Tangent = bilinearRule(f)
		case "direction":
			f.Tangent = directionRule(f)
		}
	}
	return fs
}
