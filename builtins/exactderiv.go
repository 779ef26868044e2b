package builtins

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

// Exact derivatives of user functions (runtime.Func.Derivative, forward-
// mode automatic differentiation) for emf's dI/dt, the induced E of
// sources, ddt, deriv, curl and div; step differences (em.DerivativeEst,
// em.Jacobian) remain for what a derivative cannot flow through, and the
// result's note says so.

// tangentOf differentiates f at args along dir of argument i. It returns
// the Dual, or a reason (for the note) when the derivative cannot flow and
// the caller should use differences, or an error: a stop (interrupt,
// budget), a *runtime.KinkError, *runtime.JumpError or
// *runtime.InfiniteSlopeError.
func tangentOf(env runtime.Env, f *runtime.Func, args []runtime.Value, i int, dir [3]float64) (runtime.Dual, string, error) {
	d, err := f.Derivative(env, args, i, dir)
	if err == nil {
		return d, "", nil
	}
	var nt *runtime.NoTangentError
	var ke *runtime.KinkError
	var je *runtime.JumpError
	var ie *runtime.InfiniteSlopeError
	switch {
	case stopping(err), errors.As(err, &ke), errors.As(err, &je), errors.As(err, &ie):
		return runtime.Dual{}, "", err
	case errors.As(err, &nt):
		return runtime.Dual{}, nt.Error(), nil
	}
	// an error on Duals: the differences will meet it again, or show that
	// it was met only on one side
	return runtime.Dual{}, "its evaluation stopped: " + err.Error(), nil
}

// noteDifferences says on the result that a derivative was taken by
// differences.
func noteDifferences(env runtime.Env, fn string, f *runtime.Func, reason string) {
	runtime.AddNote(env, fmt.Sprintf("%s: the derivative of %s is by step differences, not exact (%s); its error estimate is the differences' own", fn, f.Signature(), lineOf(reason)))
}

// lineOf keeps the first line of a message, shortened.
func lineOf(s string) string {
	for i, r := range s {
		if r == '\n' {
			s = s[:i]
			break
		}
	}
	if len([]rune(s)) > 160 {
		s = string([]rune(s)[:160]) + "…"
	}
	return s
}

// realTangent is the tangent of a real quantity or vector as an em.Vec,
// and whether it is a vector; ok is false for other values.
func realTangent(d runtime.Dual) (v [3]float64, dim runtime.Dim, vec, ok bool) {
	switch x := d.V.(type) {
	case runtime.Quantity:
		return [3]float64{real(d.T[0])}, x.D, false, true
	case runtime.Vector:
		return [3]float64{real(d.T[0]), real(d.T[1]), real(d.T[2])}, x.D, true, true
	}
	return v, dim, false, false
}

// exactJacobian fills j (column k: ∂F/∂x_k) by three exact passes, one
// per axis, when the field is a user function the derivative flows
// through; false to use differences (noted).
func exactJacobian(env runtime.Env, fn string, f *Field, args []runtime.Value, j *[3]em.Vec) (bool, error) {
	if f.fn == nil {
		return false, nil
	}
	in := []runtime.Value{args[1]}
	if f.timeDep {
		in = append(in, args[2])
	}
	var worst float64
	for k := 0; k < 3; k++ {
		var dir [3]float64
		dir[k] = 1
		d, reason, err := tangentOf(env, f.fn, in, 0, dir)
		if err != nil {
			return false, fieldDerivErr(fn, f, "xyz"[k:k+1], dimLength, err)
		}
		t, _, vec, ok := realTangent(d)
		if reason != "" || !ok || !vec {
			if reason != "" {
				noteDifferences(env, fn, f.fn, reason)
			}
			return false, nil
		}
		j[k] = em.Vec{X: t[0], Y: t[1], Z: t[2]}
		worst = math.Max(worst, d.ET)
	}
	reportDiffErr(env, fn, worst)
	return true, nil
}

// exactDdt is ∂F/∂t of a user field of position and time by one exact
// pass; ok false to use differences (noted).
func exactDdt(env runtime.Env, fn string, f *Field, x em.Vec, t float64) (runtime.Value, bool, error) {
	if f.fn == nil || !f.timeDep {
		return nil, false, nil
	}
	d, reason, err := tangentOf(env, f.fn, []runtime.Value{fromVec(x, dimLength), runtime.Quantity{V: t, D: dimTime}}, 1, [3]float64{1})
	if err != nil {
		return nil, false, fieldDerivErr(fn, f, "t", dimTime, err)
	}
	v, dim, vec, ok := realTangent(d)
	if reason != "" || !ok || !vec {
		if reason != "" {
			noteDifferences(env, fn, f.fn, reason)
		}
		return nil, false, nil
	}
	if env != nil {
		env.NumericalError(d.ET, d.ET, d.ET)
	}
	return runtime.Vector{V: v, D: dim.Div(dimTime)}, true, nil
}

// fieldDerivErr is the message of a user field without a derivative at
// the point along axis (x, y, z, or t for time).
func fieldDerivErr(fn string, f *Field, axis string, per runtime.Dim, err error) error {
	var ke *runtime.KinkError
	var je *runtime.JumpError
	var ie *runtime.InfiniteSlopeError
	rate := func(d runtime.Dual) string {
		v, e := runtime.TangentValue(d, per)
		if e != nil {
			return "?"
		}
		return runtime.Format(v, 6)
	}
	along := "along " + axis
	if axis == "t" {
		along = "in time"
	}
	switch {
	case errors.As(err, &ke):
		return errorf("%s: the field %s has a kink at this point %s: its derivative %s is %s on the − side and %s on the + side", fn, f.fn.Signature(), along, along, rate(ke.Before), rate(ke.After))
	case errors.As(err, &je):
		return errorf("%s: the field %s jumps at this point %s (%s on the − side, %s on the + side)", fn, f.fn.Signature(), along, runtime.Format(je.Before, 6), runtime.Format(je.After, 6))
	case errors.As(err, &ie):
		return errorf("%s: the field %s has no derivative at this point %s: %s", fn, f.fn.Signature(), along, ie.Error())
	}
	return err
}

// exactSourceDdt is ∂B/∂t or ∂A/∂t of a source's field: Σ (field per
// ampere of each current)·dIₖ/dt with exact rates; ok false to use
// differences (noted) when a rate cannot flow. A kink of a current is a
// kink of the field, reported with the rates before and after.
func exactSourceDdt(env runtime.Env, fn string, f *Field, x em.Vec, t float64) (runtime.Value, bool, error) {
	if f.src == nil || (f.which != em.FieldB && f.which != em.FieldA) {
		return nil, false, nil
	}
	var before, after em.Vec
	var bound float64
	kink := false
	at := runtime.Quantity{V: t, D: dimTime}
	for _, term := range f.src.terms {
		cf, ok := term.current.(*runtime.Func)
		if !ok {
			continue // a constant current (a phasor was refused before)
		}
		per, err := em.NewEvaluator(f.which, []em.Source{term.em(1)}).At(x)
		if err != nil {
			return nil, false, fieldErr(fn, err)
		}
		d, reason, err := tangentOf(env, cf, []runtime.Value{at}, 0, [3]float64{1})
		var ke *runtime.KinkError
		switch {
		case errors.As(err, &ke):
			kink = true
			before = em.Vec{X: before.X + per.X*real(ke.Before.T[0]), Y: before.Y + per.Y*real(ke.Before.T[0]), Z: before.Z + per.Z*real(ke.Before.T[0])}
			after = em.Vec{X: after.X + per.X*real(ke.After.T[0]), Y: after.Y + per.Y*real(ke.After.T[0]), Z: after.Z + per.Z*real(ke.After.T[0])}
			continue
		case err != nil:
			_, _, err = derivativeEst(env, fn, cf, t) // its message for the current
			return nil, false, err
		}
		q, ok := d.V.(runtime.Quantity)
		if reason != "" || !ok || q.D != dimCurrent {
			if reason != "" {
				noteDifferences(env, fn, cf, reason)
			}
			return nil, false, nil
		}
		r := real(d.T[0])
		before = em.Vec{X: before.X + per.X*r, Y: before.Y + per.Y*r, Z: before.Z + per.Z*r}
		after = em.Vec{X: after.X + per.X*r, Y: after.Y + per.Y*r, Z: after.Z + per.Z*r}
		n := math.Sqrt(per.X*per.X + per.Y*per.Y + per.Z*per.Z)
		// the rate's rounding bound, and the fields' closed forms' rounding
		bound += n*d.ET + fieldRounding*n*math.Abs(r)
	}
	d := f.dim.Div(dimTime)
	if kink {
		return nil, false, errorf("%s: the field has a kink in time at t = %s: its rate of change is %s just before and %s just after; take t a little before or after", fn,
			runtime.Format(at, 6), runtime.Format(fromVec(before, d), 6), runtime.Format(fromVec(after, d), 6))
	}
	if env != nil {
		env.NumericalError(bound, bound, bound)
	}
	return fromVec(after, d), true, nil
}

// inducedSource is the source of E = −∂A/∂t made by e_field of a source
// (inducedField: sym "E" with the source in of, no src), or nil.
func inducedSource(f *Field) *Source {
	if f.src == nil && f.sym == "E" && f.of != nil {
		return f.of
	}
	return nil
}

// sourceJacobian fills j (column k: ∂F/∂x_k) for B or A of a source and
// for E = −Σ A_k·dI_k/dt of one: the thin-wire paths exactly
// (em.FieldJacobian: the derivatives of the kernels integrated along each
// piece), a uniform field exactly (B: zero; A = ½B×r: ½B×e_k), and shapes
// (magnets, dipoles, infinite wires, ideal solenoids) by step differences,
// noted. It reports the bound as the numerical error (curl adds two
// partials, div three) when no part was by differences. ok is false for
// fields that are not of a source.
func sourceJacobian(env runtime.Env, fn string, f *Field, args []runtime.Value, x em.Vec, j *[3]em.Vec) (bool, error) {
	src, which := f.src, f.which
	induced := inducedSource(f)
	switch {
	case induced != nil:
		src, which = induced, em.FieldA
	case src == nil || (which != em.FieldB && which != em.FieldA):
		return false, nil
	}
	t, hasT := readArgs(fn, args).time(2)
	// per term: the source carrying the factor its per-ampere field is
	// multiplied by (I at t, or −dI/dt), and that factor's error estimate
	type part struct {
		term    sourceTerm
		k, kErr float64
	}
	var parts []part
	w := 0.0
	for _, term := range src.terms {
		w += em.JacobianWeight(term.path, x)
		if induced == nil {
			i, err := currentAt(env, fn, term.current, t, hasT)
			if err != nil {
				return false, err
			}
			parts = append(parts, part{term: term, k: i})
			continue
		}
		cf, ok := term.current.(*runtime.Func)
		if !ok {
			continue // a constant current induces nothing
		}
		if !hasT {
			return false, errorf("%s: the source's current %s depends on time; give the time as the last argument", fn, cf.Signature())
		}
		didt, est, err := derivativeEst(env, fn, cf, t)
		if err != nil {
			return false, err
		}
		parts = append(parts, part{term: term, k: -didt, kErr: est})
	}
	if err := charge(env, fn, w); err != nil {
		return false, err
	}
	tol := control(env, fn, em.JacobianTol)
	tol.Progress = nil
	var out [3]em.Vec
	var bound float64
	var shapes []em.Source
	var shapeDesc []string
	for _, p := range parts {
		s := p.term.em(1) // per ampere, the term's factor included
		if s.Shape != nil {
			shapes = append(shapes, em.Source{Shape: s.Shape, I: p.k * s.I, Plate: s.Plate})
			d := "a shape"
			if p.term.desc != nil {
				d = p.term.desc(6)
			}
			shapeDesc = append(shapeDesc, d)
			s.Shape = nil
		}
		if len(s.Path.Prims) == 0 || s.I == 0 || p.k == 0 {
			continue
		}
		jp, b, err := em.FieldJacobian(which, []em.Source{s}, x, tol)
		if err != nil {
			return false, err
		}
		var big float64
		for c := range out {
			out[c] = r3.Add(out[c], r3.Scale(p.k, jp[c]))
			big = math.Max(big, r3.Norm(jp[c]))
		}
		// the field's rounding and quadrature, and the factor's estimate
		bound += math.Abs(p.k)*b + p.kErr*big
	}
	if induced == nil {
		if ub := src.uniformB(); which == em.FieldA && ub != (em.Vec{}) {
			axes := [3]em.Vec{{X: 1}, {Y: 1}, {Z: 1}}
			for c := range out {
				out[c] = r3.Add(out[c], r3.Scale(0.5, r3.Cross(ub, axes[c])))
			}
			bound += 0x1p-52 * r3.Norm(ub)
		}
	}
	if len(shapes) > 0 {
		ev := em.NewEvaluator(which, shapes)
		if env != nil {
			ev.SetStop(env.Err)
		}
		js, est, err := em.JacobianEst(ev.At, x)
		if err != nil {
			return false, err
		}
		for c := range out {
			out[c] = r3.Add(out[c], js[c])
		}
		bound += est
		for _, d := range shapeDesc {
			runtime.AddNote(env, fmt.Sprintf("%s: the derivative of the field of %s is by step differences, not exact (a magnet, dipole, infinite wire or ideal solenoid); its error estimate is the differences' own", fn, lineOf(d)))
		}
	}
	reportDiffErr(env, fn, bound)
	*j = out
	return true, nil
}

// reportDiffErr reports the error of curl or div from a bound on each
// entry of the Jacobian: a component of the curl adds two entries, div
// three.
func reportDiffErr(env runtime.Env, fn string, bound float64) {
	if env == nil {
		return
	}
	if fn == "div" {
		env.NumericalError(3 * bound)
	} else {
		env.NumericalError(2*bound, 2*bound, 2*bound)
	}
}
