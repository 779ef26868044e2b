package builtins

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refCalculus = "vector calculus: line and surface integrals by adaptive Gauss–Kronrod; derivatives by Richardson-extrapolated central differences"

// Field is a vector field value: a function of position, and maybe of time.
type Field struct {
	desc string
	sym  string // "B", "A", "E", or "F" for a user function (table columns)
	// src and which are set for B and A of a source, which the parallel
	// kernel samples at many points at once.
	src   *Source
	which em.Which
	// of is the source of a field of a source (B, A or E), whose paths a
	// field map draws.
	of      *Source
	dim     runtime.Dim // zero and user == true: found on first evaluation
	user    bool
	timeDep bool
	// pointCost is about the cost of the field at one point, in
	// elementary evaluations, besides the calls of user functions (which
	// are counted as they happen).
	pointCost float64
	// prepare returns an evaluator for time t (hasT says whether t was
	// given).
	prepare func(env runtime.Env, fn string, t float64, hasT bool) (func(x em.Vec) (em.Vec, error), error)
	// fn is the user function of a field made from one (for exact
	// derivatives), or nil.
	fn *runtime.Func
}

func (f *Field) Kind() string { return "a vector field" }

func (f *Field) Show(digits int) string {
	if f.user {
		return "field: " + f.desc
	}
	return fmt.Sprintf("field: %s, in %s", f.desc, runtime.DisplayUnitOf(f.dim))
}

func (f *Field) Summary(digits int) string { return f.Show(digits) }

// userField wraps a function of position (and optionally time) returning a
// vector.
func userField(fn string, uf *runtime.Func) (*Field, error) {
	if uf.MinArgs > 2 || (uf.MaxArgs >= 0 && uf.MaxArgs < 1) {
		return nil, errorf("%s: a field function takes a position (and optionally a time); %s does not", fn, uf.Signature())
	}
	withT := uf.MaxArgs < 0 || uf.MaxArgs >= 2
	if uf.MinArgs == 1 && uf.MaxArgs == 1 {
		withT = false
	}
	f := &Field{desc: uf.Signature(), sym: "F", user: true, timeDep: withT, fn: uf}
	f.prepare = func(env runtime.Env, name string, t float64, hasT bool) (func(x em.Vec) (em.Vec, error), error) {
		if withT && !hasT {
			return nil, errorf("%s: the field %s depends on time; give the time as the last argument", name, uf.Signature())
		}
		var dim runtime.Dim
		seen := false
		return func(x em.Vec) (em.Vec, error) {
			args := []runtime.Value{fromVec(x, dimLength)}
			if withT {
				args = append(args, runtime.Quantity{V: t, D: dimTime})
			}
			v, err := uf.Invoke(env, args)
			if err != nil {
				return em.Vec{}, err
			}
			vv, ok := v.(runtime.Vector)
			if !ok {
				return em.Vec{}, errorf("%s: the field function %s must return a vector, not %s", name, uf.Signature(), runtime.TypeName(v))
			}
			if !seen {
				dim, seen = vv.D, true
				f.dim = dim
			} else if vv.D != dim {
				return em.Vec{}, errorf("%s: the field function %s returned %s at one point and %s at another", name, uf.Signature(), dim.Describe(), vv.D.Describe())
			}
			return toVec(vv), nil
		}, nil
	}
	return f, nil
}

// fieldArg reads argument i as a vector field: a field value or a function
// of position.
func fieldArg(fn string, args []runtime.Value, i int) (*Field, error) {
	switch f := args[i].(type) {
	case *Field:
		return f, nil
	case *runtime.Func:
		return userField(fn, f)
	case *Source:
		return nil, errorf("%s: the %s argument must be a vector field; make one from the source with b_field(...), a_field(...) or e_field(...)", fn, ordinal(i))
	}
	return nil, errorf("%s: the %s argument must be a vector field or a function of position, not %s", fn, ordinal(i), runtime.TypeName(args[i]))
}

// sourceField makes B or A of a source as a field.
func sourceField(which em.Which, src *Source) *Field {
	d, name := dimTesla, "B"
	if which == em.FieldA {
		d, name = dimVpot, "A"
	}
	w := 0.0
	for _, t := range src.terms {
		w += t.weight()
	}
	return &Field{
		pointCost: w,
		desc:      name + " of " + src.Show(6),
		sym:       name,
		src:       src,
		of:        src,
		which:     which,
		dim:       d,
		timeDep:   src.timeDependent(),
		prepare: func(env runtime.Env, fn string, t float64, hasT bool) (func(x em.Vec) (em.Vec, error), error) {
			srcs, err := src.sources(env, fn, t, hasT)
			if err != nil {
				return nil, err
			}
			ev := em.NewEvaluator(which, srcs)
			if env != nil {
				ev.SetStop(env.Err)
			}
			ub := src.uniformB()
			return func(x em.Vec) (em.Vec, error) {
				v, err := ev.At(x)
				if err != nil {
					return em.Vec{}, err
				}
				if which == em.FieldB {
					return r3.Add(v, ub), nil
				}
				return r3.Add(v, r3.Scale(0.5, r3.Cross(ub, x))), nil
			}, nil
		},
	}
}

// inducedField makes E = −∂A/∂t = −Σ Aₖ(per ampere)·dIₖ/dt of a source.
func inducedField(src *Source) *Field {
	w := 0.0
	for _, t := range src.terms {
		w += t.weight()
	}
	return &Field{
		pointCost: w,
		desc:      "E of " + src.Show(6),
		of:        src,
		sym:       "E",
		dim:       dimEfield,
		timeDep:   src.timeDependent(),
		prepare: func(env runtime.Env, fn string, t float64, hasT bool) (func(x em.Vec) (em.Vec, error), error) {
			var rates []em.Source
			for _, term := range src.terms {
				f, ok := term.current.(*runtime.Func)
				if !ok {
					continue
				}
				if !hasT {
					return nil, errorf("%s: the source's current %s depends on time; give the time as the last argument", fn, f.Signature())
				}
				didt, err := derivative(env, fn, f, t)
				if err != nil {
					return nil, err
				}
				rates = append(rates, term.em(-didt))
			}
			ev := em.NewEvaluator(em.FieldA, rates)
			if env != nil {
				ev.SetStop(env.Err)
			}
			return ev.At, nil
		},
	}
}

// scaleOf samples a field along points to find the size of its values.
func scaleOf(eval func(em.Vec) (em.Vec, error), pts []em.Vec) float64 {
	s := 0.0
	for _, p := range pts {
		if v, err := eval(p); err == nil {
			s = math.Max(s, r3.Norm(v))
		}
	}
	return s
}

// pathSamples returns a few points along a path.
func pathSamples(p em.Path) []em.Vec {
	var pts []em.Vec
	for _, q := range p.Prims {
		for _, t := range []float64{0.1, 0.5, 0.9} {
			pts = append(pts, q.Point(t))
		}
		if len(pts) > 60 {
			break
		}
	}
	return pts
}

// lineIntegralOf integrates a field along a path at time t.
// The second result is the quadrature's own error estimate (same unit).
func lineIntegralOf(env runtime.Env, fn string, f *Field, p em.Path, t float64, hasT bool) (runtime.Quantity, float64, error) {
	eval, err := f.prepare(env, fn, t, hasT)
	if err != nil {
		return runtime.Quantity{}, 0, err
	}
	pts := pathSamples(p)
	if _, err := eval(pts[0]); err != nil {
		return runtime.Quantity{}, 0, fieldErr(fn, err)
	}
	if err := charge(env, fn, f.pointCost*nodes(p)); err != nil {
		return runtime.Quantity{}, 0, err
	}
	scale := scaleOf(eval, pts) * math.Max(p.Length(), p.Size())
	tol := control(env, fn, em.DefaultTol)
	var est float64
	tol.Est = &est
	v, err := em.LineIntegral(p, eval, tol, scale)
	if err != nil {
		return runtime.Quantity{}, 0, fieldErr(fn, err)
	}
	// the rounding of the field's values is charged on the integral's
	// scale, so that a result near zero from cancellation keeps it
	return runtime.Quantity{V: v, D: f.dim.Mul(dimLength)}, withFieldRounding(est, math.Max(math.Abs(v), scale)), nil
}

func calculusFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("b_field", []string{"source"}, 1, 1, &runtime.Help{
			Signature: "b_field(source) -> field [T]",
			Summary:   "The magnetic flux density of a source as a vector field, for line integrals, flux, curl and divergence.",
			Example:   "b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A))",
			Reference: refFields,
		}, func(args []runtime.Value) (runtime.Value, error) {
			src, err := sourceArg("b_field", args, 0)
			if err != nil {
				return nil, err
			}
			return sourceField(em.FieldB, src), nil
		}),
		fnc("e_field", []string{"source"}, 1, 1, &runtime.Help{
			Signature: "e_field(source or region) -> field [V/m]",
			Summary:   "The induced electric field: E = −∂A/∂t of a source whose currents change in time (give t when using it), or of a region where B changes (see e_at).",
			Method:    "E = −Σ Aₖ·dIₖ/dt with each path's closed-form vector potential per ampere and dI/dt as in emf()",
			Example:   "I(t) = 2 A * sin(2*pi*50 Hz*t)\nE = e_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), I))\ncirculation(E, circle([0, 0, 10] mm, [0, 0, 1], 20 mm), 0 s)",
			Reference: "E = −∂A/∂t (Coulomb gauge, no charges); Faraday's law",
		}, func(args []runtime.Value) (runtime.Value, error) {
			if r, ok := args[0].(*Region); ok {
				return regionField(r), nil
			}
			src, err := sourceArg("e_field", args, 0)
			if err != nil {
				return nil, errorf("e_field: the argument must be a source or a region, not %s", runtime.TypeName(args[0]))
			}
			return inducedField(src), nil
		}),
		fnc("a_field", []string{"source"}, 1, 1, &runtime.Help{
			Signature: "a_field(source) -> field [Wb/m]",
			Summary:   "The vector potential of a source as a vector field.",
			Example:   "a_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A))",
			Reference: refFields,
		}, func(args []runtime.Value) (runtime.Value, error) {
			src, err := sourceArg("a_field", args, 0)
			if err != nil {
				return nil, err
			}
			return sourceField(em.FieldA, src), nil
		}),
		{
			Name: "line_integral", Params: []string{"field", "path", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return reportEst(env)(lineIntegralBuiltin(env, "line_integral", args, false))
			},
			Help: &runtime.Help{
				Signature: "line_integral(field, path[, t: s]) -> field unit*m",
				Summary:   "∫ F·dl along a path, open or closed, in the path's direction.",
				Method:    "adaptive Gauss–Kronrod per piece (quarter turns for arcs and helices), asked for relative error 1e-10; the sum of the pieces' error estimates plus 1e-12 of the result (for the rounding of the fields' closed forms) is the result's numerical error estimate (shown when it reaches the digits shown, or always after :numerr on); the work is estimated before it starts and refused beyond the work budget (:budget)",
				Example:   "line_integral(b_field(source(segment([0, 0, -5] m, [0, 0, 5] m), 10 A)), circle([0, 0, 0] m, [0, 0, 1], 20 mm)) / mu0",
				Reference: refCalculus + "; Ampère: ∮B·dl = μ0 I",
			},
		},
		{
			Name: "circulation", Params: []string{"field", "loop", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return reportEst(env)(lineIntegralBuiltin(env, "circulation", args, true))
			},
			Help: &runtime.Help{
				Signature: "circulation(field, loop: closed path[, t: s]) -> field unit*m",
				Summary:   "∮ F·dl around a closed loop (for an electric field, the EMF around the loop).",
				Method:    "as line_integral; the loop must be closed",
				Example:   "circulation(b_field(source(segment([0, 0, -5] m, [0, 0, 5] m), 10 A)), circle([0, 0, 0] m, [0, 0, 1], 20 mm)) / mu0",
				Reference: refCalculus,
			},
		},
		{
			Name: "surface_flux", Params: []string{"field", "surface", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: surfaceFluxBuiltin,
			Help: &runtime.Help{
				Signature: "surface_flux(field, surface[, t: s]) -> field unit*m^2",
				Summary:   "∬ F·dA over a surface, oriented by its normal.",
				Method:    "adaptive 2-D Gauss–Kronrod, asked for relative error 1e-10; the tests find ∬B·dA and ∮A·dl within 2e-9 of each other; the work is estimated before it starts and refused beyond the work budget (:budget)",
				Example:   "surface_flux(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), disk([0, 0, 10] mm, [0, 0, 1], 20 mm))",
				Reference: refCalculus,
			},
		},
		{
			Name: "curl", Params: []string{"field", "point", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return diffBuiltin(env, "curl", args)
			},
			Help: &runtime.Help{
				Signature: "curl(field, point: position [m][, t: s]) -> vector [field unit/m]",
				Summary:   "∇ × F at a point. (For B of a wire that is not a closed circuit the curl is not zero off the wire: an open piece of wire does not conserve current.)",
				Method:    "for a field that is a function of yours, each partial derivative exact (forward-mode automatic differentiation, one pass per axis; within 1e-14 of the hand curl in the tests), with a rounding bound as its numerical error estimate; for B, A and E of sources, each partial derivative is the derivative of the Biot–Savart or vector-potential kernel integrated along every wire piece (adaptive Gauss–Kronrod asked for 1e-13 of the integral of the kernel derivative's size, split at quarter turns and at the point nearest the field point; a straight piece seen from the point under less than 120° by the closed form of that derivative; a uniform field exactly; E as −Σ (∂A/∂x per ampere)·dI/dt with dI/dt as in emf), with the quadratures' estimates and a rounding bound as the numerical error estimate: in the tests curl A agrees with B within 3e-15 of |B|, div B and curl B off the wires are within 2e-15 of the derivatives' size (differences gave 4e-12 to 5e-11), and the gradients of a ring on its axis and of a straight wire beside it are within 1e-13 of the derivatives worked by hand; for regions, magnets, dipoles, infinite wires and ideal solenoids (and functions the derivative cannot flow through; the note names them) central differences with one Richardson step: of the steps 1 nm, 10 nm, … 1 m the one whose estimate agrees best with its neighbours is used, judged against the field's own rate of change (so a curl that is zero, as curl B off the wires, is an answer: below 1e-8 of |B|/distance near a 12-ring coil in the tests), with the change to the neighbouring steps plus the values' rounding over the step as its numerical error estimate (it covers curl and div of a magnet's B, zero outside it, by 360× and more in the tests); a kink at the point (a region's boundary) is an error giving both one-sided derivatives; refuses on or very near wires",
				Example:   "F(p) = [-p.y, p.x, 0] * 1 T/m\ncurl(F, [1, 2, 3] m)",
				Reference: refCalculus,
			},
		},
		{
			Name: "div", Params: []string{"field", "point", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return diffBuiltin(env, "div", args)
			},
			Help: &runtime.Help{
				Signature: "div(field, point: position [m][, t: s]) -> field unit/m",
				Summary:   "∇ · F at a point (for B it is zero: a check of a field's consistency).",
				Method:    "as curl",
				Example:   "div(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [10, 5, 3] mm)",
				Reference: refCalculus,
			},
		},
		{
			Name: "ddt", Params: []string{"field", "point", "t"}, MinArgs: 3, MaxArgs: 3,
			CallEnv: ddtBuiltin,
			Help: &runtime.Help{
				Signature: "ddt(field, point: position [m], t: s) -> vector [field unit/s]",
				Summary:   "∂F/∂t at a point and time, for fields of time-varying sources or functions of time.",
				Method:    "exact for a field that is a function of yours of position and time, and for B and A of a source (the fields per ampere times each current's exact dI/dt, as in emf), with a rounding bound as the numerical error estimate; otherwise (E fields, regions, functions the derivative cannot flow through: the note says so) central differences in time with one Richardson step, step searched from 1 ps up to 1 s (as emf); a jump or a kink at t is an error giving the rates just before and after",
				Example:   "I(t) = 2 A * sin(2*pi*50 Hz*t)\nddt(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), I)), [0, 0, 0] m, 0 s)",
				Reference: refCalculus,
			},
		},
		{
			Name: "work_per_turn", Params: []string{"charge", "E", "loop", "t"}, MinArgs: 3, MaxArgs: 4,
			CallEnv: workBuiltin,
			Help: &runtime.Help{
				Signature: "work_per_turn(charge: C, E: field [V/m], loop: closed path[, t: s]) -> J",
				Summary:   "Work W = q∮E·dl the induced electric field does on a charge carried once around the loop; not zero, because an induced E is not conservative.",
				Method:    "circulation of the field",
				Example:   "I(t) = 200 A * sin(2*pi*50 Hz*t)\nwork_per_turn(e, e_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), I)), circle([0, 0, 10] mm, [0, 0, 1], 20 mm), 0 s) as eV",
				Reference: refCalculus + "; Faraday: ∮E·dl = −dΦ/dt",
			},
		},
	}
}

func lineIntegralBuiltin(env runtime.Env, fn string, args []runtime.Value, closed bool) (runtime.Value, float64, error) {
	f, err := fieldArg(fn, args, 0)
	if err != nil {
		return nil, 0, err
	}
	r := readArgs(fn, args)
	p := r.path(1)
	t, hasT := r.time(2)
	if r.err != nil {
		return nil, 0, r.err
	}
	if closed && !p.Closed() {
		return nil, 0, errorf("%s: the loop is not closed (its end is not its start); use line_integral for an open path", fn)
	}
	return lineIntegralOf(env, fn, f, p, t, hasT)
}

// reportNumErr reports the error bound of a number a builtin returns.
func reportNumErr(env runtime.Env, bound float64) {
	if env != nil {
		env.NumericalError(bound)
	}
}

// reportEst reports a builtin's error estimate to the session and passes
// its value on.
func reportEst(env runtime.Env) func(v runtime.Value, est float64, err error) (runtime.Value, error) {
	return func(v runtime.Value, est float64, err error) (runtime.Value, error) {
		if err == nil && env != nil {
			env.NumericalError(est)
		}
		return v, err
	}
}

func surfaceFluxBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "surface_flux"
	f, err := fieldArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	s, ok := args[1].(*Surface)
	if !ok {
		return nil, errorf("%s: the second argument must be a surface, not %s", fn, runtime.TypeName(args[1]))
	}
	t, hasT, err := timeArg(fn, args, 2)
	if err != nil {
		return nil, err
	}
	if err := charge(env, fn, f.pointCost*surfaceNodes); err != nil {
		return nil, err
	}
	eval, err := f.prepare(env, fn, t, hasT)
	if err != nil {
		return nil, err
	}
	var pts []em.Vec
	for _, u := range []float64{0.2, 0.5, 0.8} {
		for _, v := range []float64{0.2, 0.5, 0.8} {
			pts = append(pts, s.S.Point(u, v))
		}
	}
	if _, err := eval(pts[0]); err != nil {
		return nil, fieldErr(fn, err)
	}
	scale := scaleOf(eval, pts) * s.S.Area
	tol := control(env, fn, em.DefaultTol)
	var est float64
	tol.Est = &est
	v, err := em.SurfaceIntegral(s.S, eval, tol, scale)
	if err != nil {
		return nil, fieldErr(fn, err)
	}
	if env != nil {
		env.NumericalError(withFieldRounding(est, math.Max(math.Abs(v), scale))) // the 2-D quadrature's estimate and the field's rounding on the integral's scale
	}
	return runtime.Quantity{V: v, D: f.dim.Mul(dimArea)}, nil
}

// evalAtPoint reads the point (args[1]) and optional time (args[2]) of a
// builtin, prepares the field for that time and evaluates it at the point.
func evalAtPoint(env runtime.Env, fn string, f *Field, args []runtime.Value) (eval func(em.Vec) (em.Vec, error), x, v em.Vec, err error) {
	r := readArgs(fn, args)
	x = r.point(1)
	t, hasT := r.time(2)
	if r.err != nil {
		return nil, x, v, r.err
	}
	if eval, err = f.prepare(env, fn, t, hasT); err != nil {
		return nil, x, v, err
	}
	if v, err = eval(x); err != nil {
		return nil, x, v, fieldErr(fn, err)
	}
	return eval, x, v, nil
}

func diffBuiltin(env runtime.Env, fn string, args []runtime.Value) (runtime.Value, error) {
	f, err := fieldArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	// the field at the point and at 4 points a step for 10 steps along
	// each axis (em.Jacobian)
	if err := charge(env, fn, f.pointCost*121); err != nil {
		return nil, err
	}
	eval, x, _, err := evalAtPoint(env, fn, f, args)
	if err != nil {
		return nil, err
	}
	var j [3]em.Vec
	exact, err := exactJacobian(env, fn, f, args, &j)
	if err != nil {
		return nil, err
	}
	if !exact {
		// fields of sources: their kernels' derivatives integrated
		exact, err = sourceJacobian(env, fn, f, args, x, &j)
	}
	if err == nil && !exact {
		// differences, with their own error estimate
		var est float64
		j, est, err = em.JacobianEst(eval, x)
		if err == nil {
			reportDiffErr(env, fn, est)
		}
	}
	if err != nil {
		var ke *em.AxisKinkError
		var ae *argError
		switch {
		case errors.As(err, &ke):
			d, axis := f.dim.Div(dimLength), "xyz"[ke.Axis:ke.Axis+1]
			return nil, errorf("%s: the field has a kink at this point along %s (on a region boundary or a wire?): its derivative along %s is %s on the − side and %s on the + side", fn, axis, axis,
				runtime.Format(fromVec(ke.Before, d), 6), runtime.Format(fromVec(ke.After, d), 6))
		case errors.As(err, &ae):
			return nil, err
		case errors.Is(err, em.ErrNoPlateau):
			return nil, errorf("%s: the field is not smooth enough near this point for a derivative (is it on or very near a wire or a region boundary?)", fn)
		}
		return nil, fieldErr(fn, err)
	}
	d := f.dim.Div(dimLength)
	if fn == "div" {
		return runtime.Quantity{V: j[0].X + j[1].Y + j[2].Z, D: d}, nil
	}
	// (∇×F)_x = ∂Fz/∂y − ∂Fy/∂z, ...; column j holds ∂F/∂x_j
	return fromVec(em.Vec{X: j[1].Z - j[2].Y, Y: j[2].X - j[0].Z, Z: j[0].Y - j[1].X}, d), nil
}

func ddtBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "ddt"
	f, err := fieldArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	r := readArgs(fn, args)
	x, t := r.point(1), r.ofDim(2, dimTime)
	if r.err != nil {
		return nil, r.err
	}
	// the field at t and at 4 times a step for 13 steps (em.Derivative)
	if err := charge(env, fn, f.pointCost*54); err != nil {
		return nil, err
	}
	g := func(s float64) (em.Vec, error) {
		eval, err := f.prepare(env, fn, s, true)
		if err != nil {
			return em.Vec{}, err
		}
		return eval(x)
	}
	if _, err := g(t); err != nil {
		return nil, fieldErr(fn, err)
	}
	if v, ok, err := exactDdt(env, fn, f, x, t); ok || err != nil {
		return v, err
	}
	if v, ok, err := exactSourceDdt(env, fn, f, x, t); ok || err != nil {
		return v, err
	}
	v, err := em.Derivative(g, t, 1, -12, true)
	var ke *em.KinkError
	var ae *argError
	switch {
	case errors.As(err, &ke):
		d := f.dim.Div(dimTime)
		return nil, errorf("%s: the field has a kink in time at t = %s: its rate of change is %s just before and %s just after; take t a little before or after", fn,
			runtime.Format(runtime.Quantity{V: t, D: dimTime}, 6), runtime.Format(fromVec(ke.Before, d), 6), runtime.Format(fromVec(ke.After, d), 6))
	case errors.As(err, &ae):
		return nil, err
	case errors.Is(err, em.ErrNoPlateau):
		return nil, errorf("%s: the field has no reliable time derivative at t = %s (a jump there, or not defined there?)", fn, runtime.Format(runtime.Quantity{V: t, D: dimTime}, 6))
	case err != nil:
		return nil, fieldErr(fn, err)
	}
	return fromVec(v, f.dim.Div(dimTime)), nil
}

func workBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "work_per_turn"
	q, err := ofDim(fn, args, 0, dimCharge)
	if err != nil {
		return nil, err
	}
	circ, est, err := lineIntegralBuiltin(env, fn, args[1:], true)
	if err != nil {
		return nil, err
	}
	c := circ.(runtime.Quantity)
	if c.D != dimVolt {
		return nil, errorf("%s: the field must be an electric field (V/m); its circulation is %s", fn, c.D.Describe())
	}
	if env != nil {
		env.NumericalError(math.Abs(q) * est)
	}
	return runtime.Quantity{V: q * c.V, D: dimJoule}, nil
}

// fieldRounding is the relative accuracy allowed for the fields' closed
// forms in an integral's error estimate, which the quadrature's own
// estimate does not see: the differential test of builtins/em finds
// single pieces within 2e-13 of independent quadratures of the defining
// integrals; 1e-12 leaves room for sums of a few pieces.
const fieldRounding = 1e-12

// withFieldRounding is a quadrature estimate plus fieldRounding of the
// value.
func withFieldRounding(est, v float64) float64 { return est + fieldRounding*math.Abs(v) }
