package builtins

import (
	"errors"
	"math"
	"strings"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refFields = "Biot–Savart law; closed forms for segments (Hanson & Hirshman, Phys. Plasmas 9, 4410, 2002) and circular loops (Simpson et al., NASA TM, 2001); tests in builtins/em"

// fieldErr turns numeric-core errors into user messages.
func fieldErr(fn string, err error) error {
	var pe *em.PointError
	var qe *em.QuadError
	var ae *argError
	switch {
	case stopping(err):
		return err // interrupted or over the budget: the statement says so
	case errors.As(err, &ae):
		return err // already names the builtin
	case errors.As(err, &qe):
		return errorf("%s: the numerical integral stopped short of its accuracy target (error estimate %.2g, target %.2g) after %d evaluations; the geometry may be extreme (very thin wire, very many turns, pieces nearly touching)", fn, qe.Estimate, qe.Target, qe.Evals)
	case errors.As(err, &pe) && errors.Is(err, em.ErrOnWire):
		return errorf("%s: point %d lies on a wire, where a thin wire's field is infinite; move it off the wire (give the wire a radius with inductance() for energy questions)", fn, pe.Index+1)
	case errors.Is(err, em.ErrOnWire):
		return errorf("%s: the point lies on a wire, where a thin wire's field is infinite; move it off the wire", fn)
	case errors.As(err, &pe) && errors.Is(err, em.ErrOnSheet):
		return errorf("%s: point %d lies on a current sheet (the side of a magnet or an ideal solenoid) or at a dipole, where B jumps or is infinite (and a block magnet's A is not computed); move it off", fn, pe.Index+1)
	case errors.Is(err, em.ErrOnSheet):
		return errorf("%s: a point lies on a current sheet (the side of a magnet or an ideal solenoid) or at a dipole, where B jumps or is infinite (and a block magnet's A is not computed); move it off", fn)
	case errors.As(err, &pe) && errors.Is(err, em.ErrBehindPlate):
		return errorf("%s: point %d lies behind the permeable plate the source was mirrored in, inside the material, where the images do not give the field", fn, pe.Index+1)
	case errors.Is(err, em.ErrBehindPlate):
		return errorf("%s: a point lies behind the permeable plate the source was mirrored in, inside the material, where the images do not give the field", fn)
	case errors.Is(err, em.ErrOpenPath):
		return errorf("%s: %v", fn, err)
	}
	return errorf("%s: %s", fn, strings.TrimPrefix(err.Error(), "em: "))
}

func sourceFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("source", []string{"path", "current"}, 2, 2, &runtime.Help{
			Signature: "source(path, current: A, complex A (peak phasor), or a function of time returning A) -> source",
			Summary:   "A path carrying a current: constant, a function of time giving the instantaneous current (an AC current is written with its peak value: I(t) = I_pk * sin(...)), or a peak phasor such as polar(2 A, 30 deg), for flux and emf phasors at a frequency. Sources add with +: the fields superpose.",
			Example:   "source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)",
			Reference: "superposition of Biot–Savart fields",
		}, func(args []runtime.Value) (runtime.Value, error) {
			p, err := pathArg("source", args, 0)
			if err != nil {
				return nil, err
			}
			switch c := args[1].(type) {
			case runtime.Quantity:
				if c.D != dimCurrent {
					return nil, errorf("source: the current must be in A, not %s", c.D.Describe())
				}
			case runtime.Complex:
				if c.D != dimCurrent {
					return nil, errorf("source: the current must be in A, not %s", c.D.Describe())
				}
			case *runtime.Func:
				if c.MinArgs > 1 || (c.MaxArgs >= 0 && c.MaxArgs < 1) {
					return nil, errorf("source: a current function must take one argument, the time; %s does not", c.Signature())
				}
			default:
				return nil, errorf("source: the current must be in A or a function of time, not %s", runtime.TypeName(args[1]))
			}
			return &Source{terms: []sourceTerm{{path: p, current: args[1]}}}, nil
		}),
		fnc("uniform", []string{"B"}, 1, 1, &runtime.Help{
			Signature: "uniform(B: vector [T]) -> source",
			Summary:   "A uniform magnetic field everywhere, as a source for quick cases (its vector potential is B × r / 2).",
			Example:   "uniform([0, 0, 50] uT)",
			Reference: "uniform field; A = ½ B × r (Coulomb gauge)",
		}, func(args []runtime.Value) (runtime.Value, error) {
			v, err := vector("uniform", args, 0)
			if err != nil {
				return nil, err
			}
			if v.D != dimTesla {
				return nil, errorf("uniform: the field must be a vector in T, not %s", v.D.Describe())
			}
			return &Source{uniform: []em.Vec{toVec(v)}}, nil
		}),
		{
			Name: "b_at", Params: []string{"source", "point", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return pointField(env, "b_at", em.FieldB, args)
			},
			Help: &runtime.Help{
				Signature: "b_at(source, point: position [m][, t: s]) -> vector [T] (complex for phasor currents)",
				Summary:   "Magnetic flux density B of the source at a point (at time t when a current is a function of time). When the currents are peak phasors (polar(2 A, 30 deg)), the phasor of B, a complex vector, peak like the currents.",
				Method:    "closed forms for segments and arcs (elliptic integrals; series near an arc's axis and far away), adaptive quadrature for helices (asked for relative error 1e-12; the tests find it within 1e-10 of a 256-piece Gauss–Legendre sum). Where the pieces' fields cancel (outside a toroidal winding) the result carries their rounding as its numerical error: about 1e-14 of each piece's field plus the sum's rounding and the helices' quadrature estimates, stated when it exceeds 1e-12 of the value",
				Example:   "b_at(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A), [0, 0, 0] m)",
				Reference: refFields,
			},
		},
		{
			Name: "a_at", Params: []string{"source", "point", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return pointField(env, "a_at", em.FieldA, args)
			},
			Help: &runtime.Help{
				Signature: "a_at(source, point: position [m][, t: s]) -> vector [Wb/m] (complex for phasor currents)",
				Summary:   "Magnetic vector potential A of the source at a point (Coulomb gauge); its circulation around a loop is the flux through it.",
				Method:    "closed forms for segments (log form) and arcs (incomplete elliptic integrals; series near an arc's axis and far away), adaptive quadrature for helices. Where the pieces' potentials cancel the result carries their rounding as its numerical error, as b_at's",
				Example:   "a_at(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A), [10, 0, 0] mm)",
				Reference: refFields,
			},
		},
		{
			Name: "sample_line", Params: []string{"field", "from", "to", "n", "t"}, MinArgs: 4, MaxArgs: 5,
			CallEnv: sampleLine,
			Help: &runtime.Help{
				Signature: "sample_line(field, from: position [m], to: position [m], n: whole number[, t: s]) -> table",
				Summary:   "A field (b_field, a_field or e_field of a source or region, or your own F(p)) at n evenly spaced points from one point to another, as a table (s along the line, x, y, z, then the field's components and magnitude: Bx, By, Bz, |B| for B; A… or E…; Fx… for your own).",
				Method:    "B and A of sources: the parallel field kernel, results independent of the number of cores; other fields point by point (at most 20000 points); the work is estimated before it starts and refused beyond the work budget (:budget)",
				Example:   "sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 5)",
				Reference: refFields,
			},
		},
		{
			Name: "sample_plane", Params: []string{"field", "origin", "side1", "side2", "n1", "n2", "t"}, MinArgs: 6, MaxArgs: 7,
			CallEnv: samplePlane,
			Help: &runtime.Help{
				Signature: "sample_plane(field, origin: position [m], side1: vector [m], side2: vector [m], n1, n2: whole numbers[, t: s]) -> table",
				Summary:   "A field (b_field, a_field or e_field, or your own F(p)) on an n1 × n2 grid over the parallelogram origin + u·side1 + v·side2, as a table (u, v, x, y, z, then the field's components and magnitude, e.g. Bx, By, Bz, |B|).",
				Method:    "B and A of sources: the parallel field kernel, results independent of the number of cores; other fields point by point (at most 20000 points); the work is estimated before it starts and refused beyond the work budget (:budget)",
				Example:   "sample_plane(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [-50, 0, -50] mm, [100, 0, 0] mm, [0, 0, 100] mm, 3, 3)",
				Reference: refFields,
			},
		},
	}
}

// fieldsOf evaluates B or A of a source (paths and uniform fields) at points.
func fieldsOf(env runtime.Env, fn string, which em.Which, src *Source, pts []em.Vec, t float64, hasT bool) ([]em.Vec, error) {
	out, _, err := fieldsAndSources(env, fn, which, src, pts, t, hasT)
	return out, err
}

// fieldsAndSources is fieldsOf that also returns the sources at the time.
func fieldsAndSources(env runtime.Env, fn string, which em.Which, src *Source, pts []em.Vec, t float64, hasT bool) ([]em.Vec, []em.Source, error) {
	srcs, err := src.sources(env, fn, t, hasT)
	if err != nil {
		return nil, nil, err
	}
	// the kernel shares the points among all cores
	if err := charge(env, fn, fieldCost(srcs)*float64(len(pts))/min(cores(), float64(len(pts)))); err != nil {
		return nil, nil, err
	}
	out := make([]em.Vec, len(pts))
	var progress func(int)
	var stop func() error
	if env != nil {
		stop = env.Err
		if len(pts) > 1 {
			progress = func(done int) { env.Progress(fn, done, len(pts)) }
		}
	}
	if err := em.Fields(which, srcs, pts, out, 0, progress, stop); err != nil {
		return nil, nil, fieldErr(fn, err)
	}
	ub := src.uniformB()
	if ub != (em.Vec{}) {
		for i, x := range pts {
			if which == em.FieldB {
				out[i] = r3.Add(out[i], ub)
			} else {
				out[i] = r3.Add(out[i], r3.Scale(0.5, r3.Cross(ub, x)))
			}
		}
	}
	return out, srcs, nil
}

func pointField(env runtime.Env, fn string, which em.Which, args []runtime.Value) (runtime.Value, error) {
	if s, ok := args[0].(*Source); ok && s.hasPhasor() {
		return pointPhasor(env, fn, which, s, args)
	}
	r := readArgs(fn, args)
	src, x := r.source(0), r.point(1)
	t, hasT := r.time(2)
	if r.err != nil {
		return nil, r.err
	}
	out, srcs, err := fieldsAndSources(env, fn, which, src, []em.Vec{x}, t, hasT)
	if err != nil {
		return nil, err
	}
	if err := reportCancellation(env, fn, which, src, srcs, x, out[0]); err != nil {
		return nil, err
	}
	d := dimTesla
	if which == em.FieldA {
		d = dimVpot
	}
	return fromVec(out[0], d), nil
}

// reportCancellation reports to the session the rounding a field at one
// point carries: em.FieldErrorBound's bound (each piece's accuracy, the
// quadrature estimates of pieces integrated numerically, and the rounding
// of the sum, all relative to Σ|field of each piece|), plus the uniform
// part's few roundings. Where the pieces' fields cancel (outside a
// toroidal winding) it can be the whole value. It is reported when it
// exceeds fieldRounding of the largest component, the fields' rounding
// that every integral of a field already allows for (calculus.go); below
// that, as there, it is not stated. It costs one more evaluation of the
// field, charged to the budget.
func reportCancellation(env runtime.Env, fn string, which em.Which, src *Source, srcs []em.Source, x, v em.Vec) error {
	if env == nil {
		return nil
	}
	if err := charge(env, fn, fieldCost(srcs)); err != nil {
		return err
	}
	b, _, err := em.FieldErrorBound(which, srcs, x, env.Err)
	if err != nil {
		return fieldErr(fn, err)
	}
	if ub := src.uniformB(); ub != (em.Vec{}) {
		u := ub
		if which == em.FieldA {
			u = r3.Scale(0.5, r3.Cross(ub, x))
		}
		// the uniform part's product and the additions: a few roundings
		b += 4 * 0x1p-53 * (r3.Norm(u) + r3.Norm(v))
	}
	big := math.Max(math.Abs(v.X), math.Max(math.Abs(v.Y), math.Abs(v.Z)))
	if b > fieldRounding*big {
		env.NumericalError(b, b, b)
	}
	return nil
}

// maxSlowPoints bounds the points of a field that has no parallel kernel
// (induced E by volume cubature, your own function), each of which may take
// a large fraction of a second.
const maxSlowPoints = 20_000

// sampleField evaluates a field at points: B and A of sources through the
// parallel kernel, any other field point by point with progress.
func sampleField(env runtime.Env, fn string, f *Field, pts []em.Vec, t float64, hasT bool) ([]em.Vec, error) {
	if f.src != nil {
		return fieldsOf(env, fn, f.which, f.src, pts, t, hasT)
	}
	if len(pts) > maxSlowPoints {
		return nil, errorf("%s: %d points of %s is more than the limit of %d for a field evaluated point by point; sample fewer points", fn, len(pts), f.desc, maxSlowPoints)
	}
	if err := charge(env, fn, f.pointCost*float64(len(pts))); err != nil {
		return nil, err
	}
	eval, err := f.prepare(env, fn, t, hasT)
	if err != nil {
		return nil, err
	}
	out := make([]em.Vec, len(pts))
	spent := 0.0
	if env != nil {
		spent = env.Spent()
	}
	for i, x := range pts {
		if i == 1 && env != nil {
			// a function of yours is counted as it runs; refuse now what
			// the first point says would not fit
			if err := env.Afford(fn, (env.Spent()-spent)*float64(len(pts)-1)); err != nil {
				return nil, err
			}
		}
		if env != nil {
			if err := env.Err(); err != nil {
				return nil, err
			}
		}
		if out[i], err = eval(x); err != nil {
			var pe *em.PointError
			if !errors.As(err, &pe) && (errors.Is(err, em.ErrOnWire) || errors.Is(err, em.ErrOnSheet) || errors.Is(err, em.ErrBehindPlate)) {
				err = &em.PointError{Index: i, Err: err}
			}
			return nil, fieldErr(fn, err)
		}
		if env != nil && len(pts) > 1 {
			env.Progress(fn, i+1, len(pts))
		}
	}
	return out, nil
}

// fieldColumns names a sampled field's columns and gives their dimension.
func fieldColumns(f *Field) ([]string, runtime.Dim) {
	s := f.sym
	return []string{s + "x", s + "y", s + "z", "|" + s + "|"}, f.dim
}

func sampleLine(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "sample_line"
	f, err := fieldArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	r := readArgs(fn, args)
	a, b, n := r.point(1), r.point(2), r.count(3, 2, maxPoints)
	t, hasT := r.time(4)
	if r.err != nil {
		return nil, r.err
	}
	pts := make([]em.Vec, n)
	for i := range pts {
		pts[i] = r3.Add(a, r3.Scale(float64(i)/float64(n-1), r3.Sub(b, a)))
	}
	out, err := sampleField(env, fn, f, pts, t, hasT)
	if err != nil {
		return nil, err
	}
	l := r3.Norm(r3.Sub(b, a))
	cols, d := fieldColumns(f)
	tab := &Table{
		Cols: append([]string{"s", "x", "y", "z"}, cols...),
		Dims: []runtime.Dim{dimLength, dimLength, dimLength, dimLength, d, d, d, d},
	}
	tab.Rows = tableRows(len(pts), len(tab.Cols))
	for i, x := range pts {
		v := cleanVec(out[i])
		copy(tab.Rows[i], []float64{l * float64(i) / float64(n-1), x.X, x.Y, x.Z, v.X, v.Y, v.Z, r3.Norm(v)})
	}
	return tab, nil
}

func samplePlane(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "sample_plane"
	f, err := fieldArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	r := readArgs(fn, args)
	o, s1, s2 := r.point(1), r.point(2), r.point(3)
	n1, n2 := r.count(4, 2, maxPoints), r.count(5, 2, maxPoints)
	t, hasT := r.time(6)
	if r.err != nil {
		return nil, r.err
	}
	if n1*n2 > maxPoints {
		return nil, errorf("%s: %d × %d points is more than the limit of %d", fn, n1, n2, maxPoints)
	}
	pts := make([]em.Vec, 0, n1*n2)
	uv := make([][2]float64, 0, n1*n2)
	for j := 0; j < n2; j++ {
		for i := 0; i < n1; i++ {
			u, v := float64(i)/float64(n1-1), float64(j)/float64(n2-1)
			pts = append(pts, r3.Add(o, r3.Add(r3.Scale(u, s1), r3.Scale(v, s2))))
			uv = append(uv, [2]float64{u * r3.Norm(s1), v * r3.Norm(s2)})
		}
	}
	out, err := sampleField(env, fn, f, pts, t, hasT)
	if err != nil {
		return nil, err
	}
	cols, d := fieldColumns(f)
	tab := &Table{
		Cols: append([]string{"u", "v", "x", "y", "z"}, cols...),
		Dims: []runtime.Dim{dimLength, dimLength, dimLength, dimLength, dimLength, d, d, d, d},
	}
	tab.Rows = tableRows(len(pts), len(tab.Cols))
	for i, x := range pts {
		v := cleanVec(out[i])
		copy(tab.Rows[i], []float64{uv[i][0], uv[i][1], x.X, x.Y, x.Z, v.X, v.Y, v.Z, r3.Norm(v)})
	}
	return tab, nil
}

// tableRows makes n rows of m cells on one backing array: one allocation
// instead of one a row (a sampled plane has up to a million rows).
func tableRows(n, m int) [][]float64 {
	cells := make([]float64, n*m)
	rows := make([][]float64, n)
	for i := range rows {
		rows[i] = cells[i*m : (i+1)*m : (i+1)*m]
	}
	return rows
}

// pathWeight estimates the cost of a path's field at one point, in units of
// one straight segment (an elementary evaluation).
// segWeight is em.SegmentWeight, read once.
var segWeight = em.SegmentWeight()

func pathWeight(p em.Path) float64 {
	w := 0.0
	for _, q := range p.Prims {
		w += primWeight(q)
	}
	return w
}

// primWeight is the cost of one piece's field at one point: an arc's
// elliptic integrals cost about 20 segments, a helix is integrated
// numerically to 1e-12 and costs about 2000 a turn (BenchmarkPrimWeights
// in builtins/em, at points near and far: about 190 ns an arc and 22 µs a
// helix turn, beside about 11 ns a segment in the scalar loop); a segment
// costs less where a vector kernel runs (em.SegmentWeight).
func primWeight(q em.Prim) float64 {
	switch q.Kind {
	case em.Segment:
		return segWeight
	case em.Arc:
		return 20
	}
	return 2000 * math.Max(1, math.Abs(q.Span)/(2*math.Pi))
}

// cleanVec zeroes components that are noise beside the largest (see
// runtime.CleanComponents); tables are for reading and plotting.
func cleanVec(v em.Vec) em.Vec {
	c := runtime.CleanComponents([3]float64{v.X, v.Y, v.Z})
	return em.Vec{X: c[0], Y: c[1], Z: c[2]}
}
