package builtins

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refFlux = "Stokes' theorem Φ = ∮A·dl = ∬B·dA; Faraday's law EMF = −dΦ/dt; motional EMF ∮(v×B)·dl"

func fluxFuncs() []*runtime.Func {
	return []*runtime.Func{
		{
			Name: "flux", Params: []string{"source", "target", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				src, err := sourceArg("flux", args, 0)
				if err != nil {
					return nil, err
				}
				if src.hasPhasor() {
					if len(args) > 2 {
						return nil, errorf("flux: the source's currents are phasors, so its flux is a phasor too and takes no time; leave the time out")
					}
					phi, bound, err := fluxPhasor(env, "flux", src, args[1])
					if err != nil {
						return nil, err
					}
					if env != nil {
						env.NumericalError(bound, bound) // real and imaginary parts
					}
					return runtime.Complex{V: phi, D: dimWeber}, nil
				}
				t, hasT, err := timeArg("flux", args, 2)
				if err != nil {
					return nil, err
				}
				srcs, err := src.sources(env, "flux", t, hasT)
				if err != nil {
					return nil, err
				}
				var est float64
				phi, err := fluxOfEst(env, "flux", srcs, src.uniformB(), args[1], &est)
				if err != nil {
					return nil, err
				}
				if env != nil {
					env.NumericalError(withFieldRounding(est, phi)) // the quadrature's estimate and the fields' rounding
				}
				return runtime.Quantity{V: phi, D: dimWeber}, nil
			},
			Help: &runtime.Help{
				Signature: "flux(source, target: closed path or surface[, t: s]) -> Wb (complex for phasor currents)",
				Summary:   "Magnetic flux of the source through a closed loop (oriented by its circulation, right-hand rule) or a surface (oriented by its normal). When the source's currents are phasors (polar(2 A, 30 deg)), the result is the flux phasor, peak like the currents.",
				Method:    "loop: ∮A·dl with the closed-form vector potential, adaptive Gauss–Kronrod asked for relative error 1e-10; surface: ∬B·dA by adaptive 2-D Gauss–Kronrod, the same; the tests find the two within 2e-9 of each other and within 1e-9 of Maxwell's formula for coaxial circles; the work is estimated before it starts and refused beyond the work budget (:budget)",
				Example:   "flux(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A), circle([0, 0, 10] mm, [0, 0, 1], 20 mm))",
				Reference: refFlux,
			},
		},
		{
			Name: "emf", Params: []string{"source", "loop", "t"}, MinArgs: 3, MaxArgs: 3,
			CallEnv: emfBuiltin,
			Help: &runtime.Help{
				Signature: "emf(source, loop: closed path, t: s) -> V; emf(source, loop, f: Hz or rad/s) -> complex V (peak phasor)",
				Summary:   "EMF induced around the loop (in its circulation direction) by the source's changing currents: −dΦ/dt at time t. Given a frequency instead of a time, the EMF phasor −jωΦ at that frequency, each current read as a peak phasor (polar(2 A, 30 deg); a real current has phase 0); the result is peak like the currents (divide by sqrt(2) for rms).",
				Method:    "Φ = Σ Φₖ·Iₖ(t) with Φₖ the flux per ampere of each current (∮A·dl, asked for relative error 1e-10); dIₖ/dt exact (forward-mode automatic differentiation of your current function: the tests ask the EMF of a ring through a coaxial loop to agree with −M·dI/dt (Maxwell's M) within 1e-13 and see under 1e-15, for sines at 50 Hz and 1 MHz and a ramp) wherever the derivative flows through the function (arithmetic, powers, conditions, the math builtins, other functions of yours); where it cannot (a function that calls solve, integrate, a table …) by central differences with one Richardson step, the step going up in decades from 1 ps, the first whose estimate agrees with both neighbours to 1e-6 of the current's rate of change (so periodic currents are not aliased), and the result's note says so. A jump, a kink (one-sided slopes that differ, as for |t| or a triangle wave at its peak) or an infinite slope at t is an error, with both sides in the message. At a time t the result carries a numerical error estimate: the flux's quadrature estimate (plus 1e-12 of it) times |dI/dt|, plus |Φ| times the rate's (the exact rate's rounding bound, or the differences' estimate), per current",
				Example:   "I(t) = 2 A * sin(2*pi*50 Hz*t)\nemf(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), I), circle([0, 0, 10] mm, [0, 0, 1], 20 mm), 0 s)\nemf(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), polar(2 A, -90 deg)), circle([0, 0, 10] mm, [0, 0, 1], 20 mm), 50 Hz) as polar",
				Reference: refFlux,
			},
		},
		{
			Name: "motional_emf", Params: []string{"source", "loop", "velocity", "t"}, MinArgs: 3, MaxArgs: 4,
			CallEnv: motionalEMF,
			Help: &runtime.Help{
				Signature: "motional_emf(source, loop: path, velocity: vector [m/s] or function of position [m/s][, t: s]) -> V",
				Summary:   "EMF ∮(v × B)·dl along a path whose points move with the given velocity through the source's field, taken as it is at t: a uniform velocity for a path in translation, or your function v(p) for one that turns (v(p) = cross(omega, p - centre), with omega in rad/s or s^-1: its m*rad/s is read as m/s); for an open path, the EMF from its start to its end.",
				Method:    "adaptive Gauss–Kronrod along the path, asked for relative error 1e-10",
				Example:   "v(p) = cross([0, 0, 120] / (1 s), p)\nmotional_emf(uniform([0, 0, 0.8] T), segment([0, 0, 0] m, [0.15, 0, 0] m), v)",
				Reference: refFlux + "; a rod turning about one end in a uniform field: ½BωR² (Faraday disc)",
			},
		},
	}
}

// fluxOf computes the flux of sources (plus a uniform field) through a
// closed path or a surface.
func fluxOf(env runtime.Env, fn string, srcs []em.Source, ub em.Vec, target runtime.Value) (float64, error) {
	return fluxOfEst(env, fn, srcs, ub, target, nil)
}

// fluxOfEst is fluxOf that adds the quadrature's error estimate to est.
func fluxOfEst(env runtime.Env, fn string, srcs []em.Source, ub em.Vec, target runtime.Value, est *float64) (float64, error) {
	tol := control(env, fn, em.DefaultTol)
	tol.Est = est
	switch x := target.(type) {
	case *Path:
		if !x.P.Closed() {
			return 0, errorf("%s: the loop is not closed (its end is not its start); flux needs a closed loop or a surface (for a coil, model it with rings(), or join the helix to its leads)", fn)
		}
		if err := charge(env, fn, fieldCost(srcs)*nodes(x.P)); err != nil {
			return 0, err
		}
		phi, err := em.FluxThroughLoop(srcs, x.P, tol)
		if err != nil {
			return 0, touchErr(fn, err)
		}
		if ub != (em.Vec{}) {
			// A of a uniform field is ½ B × r; its circulation is B·(½∮r × dl)
			phi += r3.Dot(ub, areaVector(x.P))
		}
		return phi, nil
	case *Surface:
		if err := charge(env, fn, fieldCost(srcs)*surfaceNodes); err != nil {
			return 0, err
		}
		phi, err := em.FluxThroughSurface(srcs, x.S, tol)
		if errors.Is(err, em.ErrOnWire) {
			return 0, errorf("%s: a wire of the source touches or lies in the surface, where a thin wire's field is infinite; move the surface off the wire", fn)
		}
		if err != nil {
			return 0, fieldErr(fn, err)
		}
		if ub != (em.Vec{}) {
			ut := em.DefaultTol
			ut.Est = est
			u, err := em.FluxUniform(ub, x.S, ut)
			if err != nil {
				return 0, fieldErr(fn, err)
			}
			phi += u
		}
		return phi, nil
	}
	return 0, errorf("%s: the target must be a closed path or a surface, not %s", fn, runtime.TypeName(target))
}

// touchErr explains a loop that runs along a source wire.
func touchErr(fn string, err error) error {
	if errors.Is(err, em.ErrOnWire) {
		return errorf("%s: the loop touches a wire of the source; the flux of a thin wire through a loop on it is infinite (for a coil's own flux use inductance() with a wire radius)", fn)
	}
	return fieldErr(fn, err)
}

// areaVector returns ½∮ r × dl of a closed path (its vector area), by
// Gauss–Legendre quadrature on each piece (exact for segments, and for
// arcs to rounding since the integrand is a trigonometric polynomial).
func areaVector(p em.Path) em.Vec {
	// 8-point Gauss–Legendre on [0, 1] per quarter turn
	var sum em.Vec
	for _, q := range p.Prims {
		n := 1
		if q.Kind != em.Segment {
			n = max(1, int(math.Ceil(math.Abs(q.Span)/(math.Pi/2))))
		}
		for k := 0; k < n; k++ {
			for i, x := range gl8x {
				t := (float64(k) + x) / float64(n)
				w := gl8w[i] / float64(n)
				sum = r3.Add(sum, r3.Scale(0.5*w, r3.Cross(q.Point(t), q.Tangent(t))))
			}
		}
	}
	return sum
}

// gl8x, gl8w: 8-point Gauss–Legendre nodes and weights mapped to [0, 1]
// (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, Table 25.4).
var gl8x, gl8w = func() ([8]float64, [8]float64) {
	xs := [4]float64{0.183434642495649805, 0.525532409916328986, 0.796666477413626740, 0.960289856497536232}
	ws := [4]float64{0.362683783378361983, 0.313706645877887287, 0.222381034453374471, 0.101228536290376259}
	var x, w [8]float64
	for i := 0; i < 4; i++ {
		x[3-i], w[3-i] = (1-xs[i])/2, ws[i]/2
		x[4+i], w[4+i] = (1+xs[i])/2, ws[i]/2
	}
	return x, w
}()

// derivative estimates dI/dt of a current function at t by em.Derivative
// (steps 1 ps to 1 s, the first plateau going up); a jump or a kink at t is
// an error naming t (and for a kink both slopes).
func derivative(env runtime.Env, fn string, f *runtime.Func, t float64) (float64, error) {
	d, _, err := derivativeEst(env, fn, f, t)
	return d, err
}

// derivativeEst is derivative with an error estimate: exact (forward-mode
// automatic differentiation, the estimate the rounding bound of the
// tangent) when the derivative flows through f, else em.DerivativeEst's
// (and the result's note says so).
func derivativeEst(env runtime.Env, fn string, f *runtime.Func, t float64) (float64, float64, error) {
	at := runtime.Format(runtime.Quantity{V: t, D: dimTime}, 6)
	rate := dimCurrent.Div(dimTime)
	dd, reason, err := tangentOf(env, f, []runtime.Value{runtime.Quantity{V: t, D: dimTime}}, 0, [3]float64{1})
	var ke *runtime.KinkError
	var je *runtime.JumpError
	var ie *runtime.InfiniteSlopeError
	switch {
	case errors.As(err, &ke):
		return 0, 0, errorf("%s: the current function %s has a kink at t = %s: its slope is %s just before and %s just after, so dI/dt is not defined there; take t a little before or after", fn, f.Signature(), at,
			runtime.Format(runtime.Quantity{V: real(ke.Before.T[0]), D: rate}, 6), runtime.Format(runtime.Quantity{V: real(ke.After.T[0]), D: rate}, 6))
	case errors.As(err, &je):
		return 0, 0, errorf("%s: the current function %s has no derivative at t = %s: it jumps there (%s just before, %s at t, %s just after); take t a little before or after", fn, f.Signature(), at,
			runtime.Format(je.Before, 6), runtime.Format(je.At, 6), runtime.Format(je.After, 6))
	case errors.As(err, &ie):
		return 0, 0, errorf("%s: the current function %s has no derivative at t = %s: %s", fn, f.Signature(), at, ie.Error())
	case err != nil:
		return 0, 0, err
	}
	if q, ok := dd.V.(runtime.Quantity); ok && reason == "" && q.D == dimCurrent {
		return real(dd.T[0]), dd.ET, nil
	}
	if reason != "" {
		noteDifferences(env, fn, f, reason)
	}
	d, est, err := em.DerivativeEst(func(x float64) (em.Vec, error) {
		i, err := currentAt(env, fn, f, x, true)
		return em.Vec{X: i}, err
	}, t, 1, -12, true)
	var fke *em.KinkError
	var ae *argError
	switch {
	case errors.As(err, &fke):
		return 0, 0, errorf("%s: the current function %s has a kink at t = %s: its slope is %s just before and %s just after, so dI/dt is not defined there; take t a little before or after", fn, f.Signature(), at,
			runtime.Format(runtime.Quantity{V: fke.Before.X, D: rate}, 6), runtime.Format(runtime.Quantity{V: fke.After.X, D: rate}, 6))
	case errors.As(err, &ae):
		return 0, 0, err
	case errors.Is(err, em.ErrNoPlateau):
		return 0, 0, errorf("%s: the current function %s has no reliable derivative at t = %s (a jump there, or not defined there?); take t a little before or after", fn, f.Signature(), at)
	case err != nil:
		return 0, 0, err
	}
	return d.X, est, nil
}

func emfBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "emf"
	r := readArgs(fn, args)
	src, loop := r.source(0), r.path(1)
	if r.err != nil {
		return nil, r.err
	}
	omega, phasor, err := angularFrequency(fn, args, 2)
	r.fail(err)
	var t float64
	if !phasor {
		t = r.ofDim(2, dimTime)
		if r.err != nil && len(args) > 2 {
			if _, ok := args[2].(runtime.Quantity); ok {
				r.err = errorf("%s: the third argument must be a time (s), for the instantaneous EMF, or a frequency (Hz, rad/s), for the EMF phasor; not %s", fn, runtime.TypeName(args[2]))
			}
		}
	}
	if r.err != nil {
		return nil, r.err
	}
	if !loop.Closed() {
		return nil, errorf("%s: the loop is not closed (its end is not its start); for a coil model it with rings() or join the helix to its leads; for an open wire moving in a field use motional_emf", fn)
	}
	if phasor {
		phi, bound, err := fluxPhasor(env, fn, src, &Path{P: loop})
		if err != nil {
			return nil, err
		}
		if env != nil {
			env.NumericalError(omega*bound, omega*bound) // real and imaginary parts
		}
		// e^{jωt} time dependence: EMF = −dΦ/dt = −jωΦ
		return runtime.Complex{V: complex(0, -omega) * phi, D: dimVolt}, nil
	}
	var e, bound float64
	for _, term := range src.terms {
		if _, ok := term.current.(runtime.Complex); ok {
			return nil, errorf("%s: the source's currents are phasors; give the frequency (Hz) instead of a time for the EMF phasor", fn)
		}
		f, ok := term.current.(*runtime.Func)
		if !ok {
			continue // a constant current induces nothing
		}
		didt, dEst, err := derivativeEst(env, fn, f, t)
		if err != nil {
			return nil, err
		}
		if didt == 0 {
			continue
		}
		if err := charge(env, fn, term.weight()*nodes(loop)); err != nil {
			return nil, err
		}
		tol := control(env, fn, em.DefaultTol)
		var fEst float64
		tol.Est = &fEst
		phi1, err := em.FluxThroughLoop([]em.Source{term.em(1)}, loop, tol)
		if err != nil {
			return nil, touchErr(fn, err)
		}
		e -= phi1 * didt
		// first order in both errors: the flux's (quadrature and rounding)
		// times the rate, and the rate's times the flux
		bound += withFieldRounding(fEst, phi1)*math.Abs(didt) + math.Abs(phi1)*dEst
	}
	if env != nil {
		env.NumericalError(bound)
	}
	return runtime.Quantity{V: e, D: dimVolt}, nil
}

func motionalEMF(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "motional_emf"
	r := readArgs(fn, args)
	src, loop := r.source(0), r.path(1)
	var vel func(x em.Vec) (em.Vec, error)
	if r.err == nil {
		var err error
		vel, err = velocityArg(env, fn, args, 2)
		r.fail(err)
	}
	t, hasT := r.time(3)
	if r.err != nil {
		return nil, r.err
	}
	srcs, err := src.sources(env, fn, t, hasT)
	if err != nil {
		return nil, err
	}
	ub := src.uniformB()
	bf := func(x em.Vec) (em.Vec, error) {
		b, err := em.FieldAt(em.FieldB, srcs, x)
		return r3.Add(b, ub), err
	}
	var imax, vmax float64
	for _, s := range srcs {
		imax = math.Max(imax, math.Abs(s.I))
	}
	for _, p := range pathSamples(loop) {
		v, err := vel(p)
		if err != nil {
			return nil, err
		}
		vmax = math.Max(vmax, r3.Norm(v))
	}
	if err := charge(env, fn, fieldCost(srcs)*nodes(loop)); err != nil {
		return nil, err
	}
	size := math.Max(loop.Size(), loop.Length())
	scale := vmax * (em.Mu0*imax/math.Max(size, 1e-300) + r3.Norm(ub)) * size
	tol := control(env, fn, em.DefaultTol)
	var est float64
	tol.Est = &est
	e, err := em.MotionalEMF(loop, vel, bf, tol, scale)
	if err == nil && env != nil {
		env.NumericalError(withFieldRounding(est, math.Max(math.Abs(e), scale))) // the quadrature's estimate and the fields' rounding on the integral's scale
	}
	if err != nil {
		var ae *argError
		if errors.As(err, &ae) {
			return nil, err
		}
		if errors.Is(err, em.ErrOnWire) {
			return nil, errorf("%s: the moving path touches a wire of the source", fn)
		}
		return nil, fieldErr(fn, err)
	}
	return runtime.Quantity{V: e, D: dimVolt}, nil
}

// dimTangential is the unit of ω × r written with an angular velocity in
// rad/s: m*rad/s. Its radian is the one of the arc length s = r·θ, so it
// is read as a velocity in m/s.
var dimTangential = dimSpeed.Mul(dimAngle)

// isVelocity accepts m/s and the m*rad/s of ω × r.
func isVelocity(d runtime.Dim) bool { return d == dimSpeed || d == dimTangential }

// velocityArg reads a velocity: a vector in m/s (the same everywhere) or a
// function of position returning one; m*rad/s, the unit of ω × r with ω in
// rad/s, is taken as m/s.
func velocityArg(env runtime.Env, fn string, args []runtime.Value, i int) (func(x em.Vec) (em.Vec, error), error) {
	switch v := args[i].(type) {
	case runtime.Vector:
		if !isVelocity(v.D) {
			return nil, errorf("%s: the velocity must be a vector in m/s, not %s", fn, v.D.Describe())
		}
		c := toVec(v)
		return func(em.Vec) (em.Vec, error) { return c, nil }, nil
	case *runtime.Func:
		if v.MinArgs > 1 || (v.MaxArgs >= 0 && v.MaxArgs < 1) {
			return nil, errorf("%s: a velocity function takes one argument, the position; %s does not", fn, v.Signature())
		}
		return func(x em.Vec) (em.Vec, error) {
			out, err := v.Invoke(env, []runtime.Value{fromVec(x, dimLength)})
			if err != nil {
				return em.Vec{}, err
			}
			vv, ok := out.(runtime.Vector)
			if !ok || !isVelocity(vv.D) {
				what := runtime.TypeName(out)
				if ok {
					what = "a vector in " + vv.D.Describe()
				}
				return em.Vec{}, errorf("%s: the velocity function %s must return a vector in m/s, not %s", fn, v.Signature(), what)
			}
			return toVec(vv), nil
		}, nil
	}
	return nil, errorf("%s: the %s argument, the velocity, must be a vector in m/s or a function of position, not %s", fn, ordinal(i), runtime.TypeName(args[i]))
}
