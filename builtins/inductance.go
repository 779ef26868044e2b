package builtins

import (
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refInductance = "Neumann's formula; Maxwell, Treatise (1873) §701; Grover, Inductance Calculations (1946); tests in builtins/em"

func inductanceFuncs() []*runtime.Func {
	return []*runtime.Func{
		fncEnv("mutual", []string{"path1", "path2"}, 2, 2, &runtime.Help{
			Signature: "mutual(path1, path2) -> H",
			Summary:   "Mutual inductance of two paths (for open paths, e.g. coils without leads, the partial mutual inductance).",
			Method:    "Neumann's double integral as ∮A₁·dl₂ with path 1's closed-form vector potential, adaptive Gauss–Kronrod asked for relative error 1e-10 (the tests find it within 1e-9 of Maxwell's formula); when path 1 is a single circle, the circles of path 2 coaxial with it take Maxwell's formula itself; pairs of coaxial helices or arcs (the layers of a winding) take one integral each, the integral along one of them in closed form (agreeing with the general route within 4e-14 in the tests; a benchmark of a four-layer winding takes 20 ms against 2.8 s by the general route); the work is estimated before it starts and refused beyond the work budget (:budget)",
			Example:   "mutual(circle([0, 0, 0] m, [0, 0, 1], 25 mm), circle([0, 0, 10] mm, [0, 0, 1], 20 mm))",
			Reference: refInductance,
		}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			r := readArgs("mutual", args)
			p1, p2 := r.path(0), r.path(1)
			if r.err != nil {
				return nil, r.err
			}
			if err := charge(env, "mutual", mutualCost(p1, p2)); err != nil {
				return nil, err
			}
			tol := control(env, "mutual", em.DefaultTol)
			var est float64
			tol.Est = &est
			m, err := em.Mutual(p1, p2, em.MutualOptions{Tol: tol})
			if err != nil {
				return nil, fieldErr("mutual", err)
			}
			if env != nil {
				env.NumericalError(withFieldRounding(est, m)) // ∮A·dl's quadrature estimate (0 where Maxwell's formula serves) and the fields' rounding
			}
			return runtime.Quantity{V: m, D: dimHenry}, nil
		}),
		fnc("maxwell_mutual", []string{"a", "b", "d"}, 3, 3, &runtime.Help{
			Signature: "maxwell_mutual(a: length, b: length, d: length) -> H",
			Summary:   "Mutual inductance of two coaxial circles of radii a and b whose planes are d apart (Maxwell's formula).",
			Method:    "μ0√(ab)[(2/k − k)K − (2/k)E], k² = 4ab/((a+b)² + d²), evaluated without cancellation (series for small k)",
			Example:   "maxwell_mutual(25 mm, 20 mm, 10 mm)",
			Reference: "Maxwell, A Treatise on Electricity and Magnetism (1873) §701; Grover, Inductance Calculations (1946)",
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("maxwell_mutual", args)
			a, b, d := r.positiveLength(0), r.positiveLength(1), r.ofDim(2, dimLength)
			if r.err != nil {
				return nil, r.err
			}
			if d == 0 && a == b {
				return nil, errorf("maxwell_mutual: the circles coincide; their mutual inductance is infinite (use inductance() with a wire radius)")
			}
			return runtime.Quantity{V: em.MaxwellMutual(a, b, math.Abs(d)), D: dimHenry}, nil
		}),
		fncEnv("inductance", []string{"path", "wire_radius", "current"}, 2, 3, &runtime.Help{
			Signature: `inductance(path, wire_radius: length[, current: "uniform" or "surface"]) -> H`,
			Summary:   `Self-inductance of a path of round wire; for an open path, e.g. a coil without its leads, the partial self-inductance. "uniform" (the default): current spread evenly over the wire, the low-frequency value with the internal inductance μ0ℓ/8π; "surface": all current on the wire's surface, the limit when the skin depth is much smaller than the wire radius (no internal inductance). Between the two, take "uniform" and correct the internal part with internal_inductance or ac_factor (wire losses).`,
			Method:    "sum over the path's pieces: a straight piece exactly (Neumann's volume integral as the mean over the wire's section, no thin-wire error; uniform current: μ0ℓ/2π[ln(2ℓ/a) − 3/4 + 128a/45πℓ − …]); a whole circle by its expansion μ0R[(1 + a²/8R²) ln(8R/a) − 7/4 + a²/24R²] (surface current: μ0R[ln(8R/a) − 2]); arcs and helices by the reduced kernel 1/√(|r−r'|² + a²) within half a turn plus μ0ℓ/8π (none for surface current); straight pieces that meet by the section-mean kernel, other pieces that meet by the reduced kernel, all other pairs by the exact kernel (coaxial rings by Maxwell's formula, coaxial helices and arcs by one integral each with the other in closed form). Straight wire: exact to rounding (1e-13 against an independent quadrature); uniform-current ring: within (a/R)⁴ ln(8R/a)/100 (5e-7 μ0R at a/R = 0.1); bends and helices: O((a/R)²); a corner between straight pieces: O(a). Pieces in parallel on all cores; the result carries its numerical error (the quadratures' estimates, the ring series' truncation, the closed forms' rounding; not the thin-wire model's error at bends); the work is estimated before it starts and refused beyond the work budget (:budget)",
			Example:   "inductance(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 0.5 mm)\ninductance(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 0.5 mm, \"surface\")",
			Reference: refInductance + "; straight wire: Rosa, Bull. Bureau of Standards 4 (1908), made exact by the chord-length densities of the section (Kendall & Moran, Geometrical Probability, 1963); ring: Wien (1894), Rosa & Grover, Bull. Bureau of Standards 8 (1912)",
		}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			r := readArgs("inductance", args)
			p, a := r.path(0), r.positiveLength(1)
			if r.err != nil {
				return nil, r.err
			}
			mode := em.UniformCurrent
			if len(args) == 3 {
				m, err := wireCurrent("inductance", args[2])
				if err != nil {
					return nil, err
				}
				mode = m
			}
			if err := charge(env, "inductance", inductanceCost(p)); err != nil {
				return nil, err
			}
			tol := control(env, "inductance", em.DefaultTol)
			var est float64
			tol.Est = &est
			l, err := em.SelfInductanceWith(p, a, em.SelfOptions{Tol: tol, Current: mode})
			if err != nil {
				return nil, fieldErr("inductance", err)
			}
			if env != nil {
				env.NumericalError(withFieldRounding(est, l)) // the quadratures' estimates, the ring series' truncation and the closed forms' rounding
			}
			return runtime.Quantity{V: l, D: dimHenry}, nil
		}),
		fncEnv("coupling", []string{"path1", "path2", "wire_radius1", "wire_radius2"}, 4, 4, &runtime.Help{
			Signature: "coupling(path1, path2, wire_radius1: length, wire_radius2: length) -> dimensionless",
			Summary:   "Coupling coefficient k = M/√(L1·L2) of two paths of round wire.",
			Method:    "mutual() and inductance(); the work is estimated before it starts and refused beyond the work budget (:budget)",
			Example:   "coupling(circle([0, 0, 0] m, [0, 0, 1], 25 mm), circle([0, 0, 10] mm, [0, 0, 1], 20 mm), 0.3 mm, 0.3 mm)",
			Reference: refInductance,
		}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			r := readArgs("coupling", args)
			p1, p2, a1, a2 := r.path(0), r.path(1), r.positiveLength(2), r.positiveLength(3)
			if r.err != nil {
				return nil, r.err
			}
			if err := charge(env, "coupling", mutualCost(p1, p2)+inductanceCost(p1)+inductanceCost(p2)); err != nil {
				return nil, err
			}
			tol := control(env, "coupling", em.DefaultTol)
			var eM, eL1, eL2 float64
			tol.Est = &eM
			m, err := em.Mutual(p1, p2, em.MutualOptions{Tol: tol})
			if err != nil {
				return nil, fieldErr("coupling", err)
			}
			tol.Est = &eL1
			l1, err := em.SelfInductance(p1, a1, tol)
			if err != nil {
				return nil, fieldErr("coupling (path 1)", err)
			}
			tol.Est = &eL2
			l2, err := em.SelfInductance(p2, a2, tol)
			if err != nil {
				return nil, fieldErr("coupling (path 2)", err)
			}
			k := m / math.Sqrt(l1*l2)
			if env != nil {
				// first order in the three estimates: δk = δM/√(L1L2) + |k|(δL1/2L1 + δL2/2L2)
				env.NumericalError(withFieldRounding(eM, m)/math.Sqrt(l1*l2) + math.Abs(k)*(withFieldRounding(eL1, l1)/(2*l1)+withFieldRounding(eL2, l2)/(2*l2)))
			}
			return runtime.Num(k), nil
		}),
		{
			Name: "force", Params: []string{"source", "path", "current", "t"}, MinArgs: 3, MaxArgs: 4,
			CallEnv: forceBuiltin,
			Help: &runtime.Help{
				Signature: "force(source, path, current: A or function of time[, t: s]) -> vector [N]",
				Summary:   "Force on a path carrying current in the source's field: F = I ∮ dl × B (Lorentz force on the wire).",
				Method:    "adaptive Gauss–Kronrod along the path, asked for relative error 1e-10; the work is estimated before it starts and refused beyond the work budget (:budget)",
				Example:   "force(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 10 A), circle([0, 0, 10] mm, [0, 0, 1], 25 mm), 10 A)",
				Reference: "Lorentz force dF = I dl × B; checked against I1·I2·dM/dz from Maxwell's formula",
			},
		},
	}
}

func forceBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "force"
	r := readArgs(fn, args)
	src, p := r.source(0), r.path(1)
	t, hasT := r.time(3)
	if r.err != nil {
		return nil, r.err
	}
	if f, ok := args[2].(*runtime.Func); ok && !hasT {
		return nil, errorf("%s: the path's current %s depends on time; give the time as the last argument", fn, f.Signature())
	}
	i2, err := currentAt(env, fn, args[2], t, hasT)
	if err != nil {
		return nil, err
	}
	if q, ok := args[2].(runtime.Quantity); ok && q.D != dimCurrent {
		return nil, errorf("%s: the current must be in A, not %s", fn, q.D.Describe())
	}
	srcs, err := src.sources(env, fn, t, hasT)
	if err != nil {
		return nil, err
	}
	if err := charge(env, fn, fieldCost(srcs)*nodes(p)); err != nil {
		return nil, err
	}
	tol := control(env, fn, em.DefaultTol)
	var est float64
	tol.Est = &est
	f, err := em.Force(srcs, p, i2, tol)
	if err != nil {
		return nil, fieldErr(fn, err)
	}
	if env != nil {
		// a bound on the vector's size bounds each component
		b := withFieldRounding(est, r3.Norm(f))
		env.NumericalError(b, b, b)
	}
	// a uniform field adds I ∮ dl × B = I (∮dl) × B: zero for a closed path
	if ub := src.uniformB(); ub != (em.Vec{}) {
		var chord em.Vec
		for _, q := range p.Prims {
			chord = r3.Add(chord, r3.Sub(q.End(), q.Start()))
		}
		f = r3.Add(f, r3.Scale(i2, r3.Cross(chord, ub)))
	}
	return fromVec(f, dimNewton), nil
}

// wireCurrent reads how the current spreads over the wire: "uniform" or
// "surface".
func wireCurrent(fn string, v runtime.Value) (em.WireCurrent, error) {
	switch s, _ := v.(string); s {
	case "uniform":
		return em.UniformCurrent, nil
	case "surface":
		return em.SurfaceCurrent, nil
	}
	return 0, errorf(`%s: the current is "uniform" (low frequency) or "surface" (skin depth much smaller than the wire radius), not %s`, fn, describeArg(v))
}
