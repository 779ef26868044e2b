package builtins

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

// Sources that are not thin-wire paths: ideal (infinite) conductors,
// permanent magnets as their equivalent surface currents, point dipoles,
// and images in a permeable plate. They are source values like any other:
// b_at, a_at, e_at, flux, emf, force, motional_emf and the samplers take
// them.

const refMagnets = "a uniformly magnetised body is exactly its surface current K = M × n (J. D. Jackson, Classical Electrodynamics, 3rd ed., 1999, §5.8–5.9); cylinder: N. Derby and S. Olbert, Am. J. Phys. 78, 229 (2010), with Bulirsch's cel (Numer. Math. 13, 305, 1969)"

const refImages = "images in a permeable half space, k = (μr − 1)/(μr + 1): W. R. Smythe, Static and Dynamic Electricity, 3rd ed., 1968, §7.18; J. D. Jackson, Classical Electrodynamics, 3rd ed., 1999, §5.12"

// currentValue checks a current argument: A, a complex A (peak phasor) or a
// function of time.
func currentValue(fn string, v runtime.Value) error {
	switch c := v.(type) {
	case runtime.Quantity:
		if c.D != dimCurrent {
			return errorf("%s: the current must be in A, not %s", fn, c.D.Describe())
		}
	case runtime.Complex:
		if c.D != dimCurrent {
			return errorf("%s: the current must be in A, not %s", fn, c.D.Describe())
		}
	case *runtime.Func:
		if c.MinArgs > 1 || (c.MaxArgs >= 0 && c.MaxArgs < 1) {
			return errorf("%s: a current function must take one argument, the time; %s does not", fn, c.Signature())
		}
	default:
		return errorf("%s: the current must be in A or a function of time, not %s", fn, runtime.TypeName(v))
	}
	return nil
}

func fmtQ(v float64, d runtime.Dim, digits int) string {
	return runtime.Format(runtime.Quantity{V: v, D: d}, digits)
}

func fmtV(v em.Vec, d runtime.Dim, digits int) string {
	return runtime.Format(fromVec(v, d), digits)
}

// remanence reads Br (T) and returns M = Br/μ0 (A/m).
func (r *argReader) remanence(i int) float64 {
	br := r.ofDim(i, dimTesla)
	if r.err == nil && (br == 0 || math.IsInf(br, 0)) {
		r.err = errorf("%s: the remanence must not be zero (give its sign by the axis), not %s", r.fn, fmtQ(br, dimTesla, 6))
	}
	return br / em.Mu0
}

func magnetFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("infinite_wire", []string{"point", "direction", "current", "r_ref"}, 3, 4, &runtime.Help{
			Signature: "infinite_wire(point: position [m], direction: vector, current: A, complex A or function of time[, r_ref: m]) -> source",
			Summary:   "An infinitely long straight wire through the point, its current flowing along the direction. B = μ0I/(2πρ) around it; A = −μ0I/(2π)·ln(ρ/r_ref) along it, zero at r_ref (1 m unless given): think of r_ref as the radius of a coaxial return conductor. Fluxes through closed loops do not depend on r_ref; the induced E along the wire (e_at) does, as it does for any real circuit.",
			Method:    "closed forms (Ampère's law)",
			Example:   "w = infinite_wire([0, 0, 0] m, [0, 0, 1], 10 A)\nb_at(w, [20, 0, 0] mm)",
			Reference: "Ampère's law; e.g. J. D. Jackson, Classical Electrodynamics, 3rd ed., 1999, §5.3",
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "infinite_wire"
			r := readArgs(fn, args)
			p, d := r.point(0), r.axis(1)
			rref := 1.0
			if len(args) > 3 {
				rref = r.positiveLength(3)
			}
			if r.err != nil {
				return nil, r.err
			}
			if err := currentValue(fn, args[2]); err != nil {
				return nil, err
			}
			return &Source{terms: []sourceTerm{{
				current: args[2],
				shape:   em.InfiniteWire{P: p, D: d, RRef: rref},
				desc: func(digits int) string {
					return fmt.Sprintf("infinite wire through %s along %s, A zero at %s", fmtV(p, dimLength, digits), fmtV(d, runtime.Dim{}, digits), fmtQ(rref, dimLength, digits))
				},
			}}}, nil
		}),
		fnc("infinite_solenoid", []string{"center", "axis", "radius", "turns_per_length", "current"}, 5, 5, &runtime.Help{
			Signature: "infinite_solenoid(center: position [m], axis: vector, radius: m, turns_per_length: m^-1, current: A, complex A or function of time) -> source",
			Summary:   "An ideal solenoid: an infinitely long current sheet of the given radius about the line through the centre along the axis, with n turns per metre carrying the current right-handed about the axis. B = μ0·n·I inside, none outside; A_φ = μ0nIρ/2 inside, μ0nIR²/(2ρ) outside, so a loop outside still sees an EMF (e_at, emf).",
			Method:    "closed forms (Ampère's law, Stokes' theorem); B on the sheet itself is refused",
			Example:   "s = infinite_solenoid([0, 0, 0] m, [0, 0, 1], 10 mm, 2000 / (1 m), 0.5 A)\nb_at(s, [0, 2, 0] mm)",
			Reference: "Ampère's law; e.g. E. M. Purcell and D. J. Morin, Electricity and Magnetism, 3rd ed., 2013, §6.5",
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "infinite_solenoid"
			r := readArgs(fn, args)
			c, ax, rad := r.point(0), r.axis(1), r.positiveLength(2)
			n := r.positive(3, dimLength.Pow(-1))
			if r.err != nil {
				return nil, r.err
			}
			if err := currentValue(fn, args[4]); err != nil {
				return nil, err
			}
			return &Source{terms: []sourceTerm{{
				current: args[4],
				shape:   em.IdealSolenoid{C: c, N: ax, R: rad, Turns: n},
				desc: func(digits int) string {
					return fmt.Sprintf("infinite solenoid about %s along %s, radius %s, %s turns per metre", fmtV(c, dimLength, digits), fmtV(ax, runtime.Dim{}, digits), fmtQ(rad, dimLength, digits), runtime.FormatNumber(n, digits))
				},
			}}}, nil
		}),
		fnc("magnet_cylinder", []string{"center", "axis", "radius", "length", "Br"}, 5, 5, &runtime.Help{
			Signature: "magnet_cylinder(center: position [m], axis: vector, radius: m, length: m, Br: T) -> source",
			Summary:   "A cylindrical permanent magnet magnetised uniformly along its axis (the axis points from its south face to its north face), placed by its centre, with remanence Br = μ0·M. It is represented exactly by its equivalent surface current: M·length amperes around its side (K = M × n), so B is right inside the magnet too. A rigid, uniform magnet: no demagnetisation, no recoil, no temperature.",
			Method:    "B: Derby and Olbert's closed form with Bulirsch's generalized complete elliptic integral (rounding-level; the tests find it within 1e-9 of a sum of loop fields); A: the loops' closed-form potential integrated over the length, adaptive Gauss–Kronrod asked for 1e-11; B on the side face itself is refused",
			Example:   "m = magnet_cylinder([0, 0, 0] m, [0, 0, 1], 5 mm, 10 mm, 1.2 T)\nb_at(m, [0, 0, 8] mm)",
			Reference: refMagnets,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "magnet_cylinder"
			r := readArgs(fn, args)
			c, ax, rad, l := r.point(0), r.axis(1), r.positiveLength(2), r.positiveLength(3)
			m := r.remanence(4)
			if r.err != nil {
				return nil, r.err
			}
			return &Source{terms: []sourceTerm{{
				current: runtime.Quantity{V: m * l, D: dimCurrent},
				shape:   em.CylinderSheet{C: c, N: ax, R: rad, L: l},
				whole:   true,
				desc: func(digits int) string {
					return fmt.Sprintf("cylinder magnet at %s along %s, radius %s, length %s, Br %s", fmtV(c, dimLength, digits), fmtV(ax, runtime.Dim{}, digits), fmtQ(rad, dimLength, digits), fmtQ(l, dimLength, digits), fmtQ(m*em.Mu0, dimTesla, digits))
				},
			}}}, nil
		}),
		fnc("magnet_block", []string{"center", "side1", "side2", "side3", "Br"}, 5, 5, &runtime.Help{
			Signature: "magnet_block(center: position [m], side1: vector [m], side2: vector [m], side3: vector [m], Br: T) -> source",
			Summary:   "A rectangular permanent magnet placed by its centre, with edges side1, side2, side3 (at right angles to each other), magnetised uniformly along side3 (it points from the south face to the north face), with remanence Br = μ0·M. Represented exactly by its equivalent surface current on the four faces along side3 (K = M × n). A rigid, uniform magnet: no demagnetisation, no recoil, no temperature.",
			Method:    "the closed-form fields of a rectangular loop integrated over the height, adaptive Gauss–Kronrod asked for 1e-11 (the tests find B on the axis within 1e-9 of the closed form); B on a side face itself is refused",
			Example:   "m = magnet_block([0, 0, 0] m, [20, 0, 0] mm, [0, 10, 0] mm, [0, 0, 5] mm, 1.2 T)\nb_at(m, [0, 0, 5] mm)",
			Reference: refMagnets,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "magnet_block"
			r := readArgs(fn, args)
			c, s1, s2, s3 := r.point(0), r.point(1), r.point(2), r.point(3)
			m := r.remanence(4)
			if r.err != nil {
				return nil, r.err
			}
			l1, l2, l3 := r3.Norm(s1), r3.Norm(s2), r3.Norm(s3)
			if !(l1 > 0 && l2 > 0 && l3 > 0) {
				return nil, errorf("%s: every side must have a length", fn)
			}
			const square = 1e-9
			if math.Abs(r3.Dot(s1, s2)) > square*l1*l2 || math.Abs(r3.Dot(s1, s3)) > square*l1*l3 || math.Abs(r3.Dot(s2, s3)) > square*l2*l3 {
				return nil, errorf("%s: the sides must be at right angles to each other", fn)
			}
			n, u := r3.Scale(1/l3, s3), r3.Scale(1/l1, s1)
			return &Source{terms: []sourceTerm{{
				current: runtime.Quantity{V: m * l3, D: dimCurrent},
				shape:   em.BlockSheet{C: c, N: n, U: u, HU: l1 / 2, HV: l2 / 2, HN: l3 / 2},
				whole:   true,
				desc: func(digits int) string {
					return fmt.Sprintf("block magnet at %s, %s × %s × %s, magnetised along %s, Br %s", fmtV(c, dimLength, digits), fmtQ(l1, dimLength, digits), fmtQ(l2, dimLength, digits), fmtQ(l3, dimLength, digits), fmtV(n, runtime.Dim{}, digits), fmtQ(m*em.Mu0, dimTesla, digits))
				},
			}}}, nil
		}),
		fnc("dipole", []string{"point", "moment"}, 2, 2, &runtime.Help{
			Signature: "dipole(point: position [m], moment: vector [A*m^2]) -> source",
			Summary:   "A point magnetic dipole: the far field of any small loop or magnet (moment = current × vector area, or M × volume = Br·V/μ0). B = μ0/(4π)·(3(m·r̂)r̂ − m)/r³, A = μ0/(4π)·m × r/r³; the field at the point itself is refused.",
			Method:    "closed forms",
			Example:   "d = dipole([0, 0, 0] m, [0, 0, 0.5] A*m^2)\nb_at(d, [0, 0, 10] cm)",
			Reference: "J. D. Jackson, Classical Electrodynamics, 3rd ed., 1999, eqs. 5.55–5.56",
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "dipole"
			r := readArgs(fn, args)
			p := r.point(0)
			if r.err != nil {
				return nil, r.err
			}
			v, err := vector(fn, args, 1)
			if err != nil {
				return nil, err
			}
			if v.D != dimCurrent.Mul(dimArea) {
				return nil, errorf("%s: the moment must be a vector in A*m^2, not %s", fn, v.D.Describe())
			}
			m := toVec(v)
			mag := r3.Norm(m)
			if mag == 0 {
				return nil, errorf("%s: the moment must not be zero", fn)
			}
			return &Source{terms: []sourceTerm{{
				// the term's current is |m| per square metre, its shape the unit moment
				current: runtime.Quantity{V: mag, D: dimCurrent},
				shape:   em.Dipole{P: p, M: r3.Scale(1/mag, m)},
				whole:   true,
				desc: func(digits int) string {
					return fmt.Sprintf("dipole at %s, moment %s", fmtV(p, dimLength, digits), fmtV(m, dimCurrent.Mul(dimArea), digits))
				},
			}}}, nil
		}),
		fnc("mirror", []string{"source", "point", "normal", "mu_r"}, 4, 4, &runtime.Help{
			Signature: "mirror(source, point: position [m], normal: vector, mu_r: dimensionless) -> source",
			Summary:   "The source before a permeable half space (a thick steel plate, a ferrite tile) whose flat face passes through the point, the normal pointing out of the material towards the source: the source with its mirror image in the face, carrying (μr − 1)/(μr + 1) of each current (1 for μr → ∞, 0 for μr = 1). The result is a source like any other; its field holds on the source's side only, and points behind the face are refused. The material is linear, unsaturated, non-conducting (or the frequency low enough that eddy currents do not matter) and infinitely thick and wide: a plate much thicker and wider than the source's distance from it.",
			Method:    "method of images (exact for a linear half space); everything on the source's side must stay in front of the face",
			Example:   "coil = source(circle([0, 0, 5] mm, [0, 0, 1], 20 mm), 1 A)\nb_at(mirror(coil, [0, 0, 0] m, [0, 0, 1], 1000), [0, 0, 5] mm)",
			Reference: refImages,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "mirror"
			r := readArgs(fn, args)
			src, p, n := r.source(0), r.point(1), r.axis(2)
			mur := r.number(3)
			if r.err != nil {
				return nil, r.err
			}
			return mirrorSource(fn, src, p, n, mur)
		}),
		fncEnv("inductance_near_plate", []string{"path", "wire_radius", "point", "normal", "mu_r"}, 5, 5, &runtime.Help{
			Signature: "inductance_near_plate(path, wire_radius: m, point: position [m], normal: vector, mu_r: dimensionless) -> H",
			Summary:   "Self-inductance of a path of round wire in front of a permeable half space (see mirror for the face, the normal and the assumptions): L = L_alone + k·M(path, its image), k = (μr − 1)/(μr + 1).",
			Method:    "inductance() for L_alone, mutual() with the mirrored path for M; each asked for relative error 1e-10",
			Example:   "inductance_near_plate(circle([0, 0, 5] mm, [0, 0, 1], 20 mm), 0.25 mm, [0, 0, 0] m, [0, 0, 1], 1000)",
			Reference: refImages,
		}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			const fn = "inductance_near_plate"
			r := readArgs(fn, args)
			path, a, p, n := r.path(0), r.positiveLength(1), r.point(2), r.axis(3)
			mur := r.number(4)
			if r.err != nil {
				return nil, r.err
			}
			k, err := plateFactor(fn, mur, p, n, path)
			if err != nil {
				return nil, err
			}
			if d := nearest(path, p, n); d < a {
				return nil, errorf("%s: the wire comes within %s of the face, less than its radius %s: it would reach into the material", fn, fmtQ(d, dimLength, 6), fmtQ(a, dimLength, 6))
			}
			img := path.Mirror(p, n)
			if err := charge(env, fn, inductanceCost(path)+mutualCost(path, img)); err != nil {
				return nil, err
			}
			tol := control(env, fn, em.DefaultTol)
			var eL, eM float64
			tol.Est = &eL
			l, err := em.SelfInductance(path, a, tol)
			if err != nil {
				return nil, fieldErr(fn, err)
			}
			if k == 0 {
				reportNumErr(env, withFieldRounding(eL, l))
				return runtime.Quantity{V: l, D: dimHenry}, nil
			}
			tol.Est = &eM
			m, err := em.Mutual(path, img, em.MutualOptions{Tol: tol})
			if err != nil {
				return nil, imageErr(fn, err, "the path touches the face (its image meets it); keep the wire at least its radius away")
			}
			reportNumErr(env, withFieldRounding(eL, l)+math.Abs(k)*withFieldRounding(eM, m))
			return runtime.Quantity{V: l + k*m, D: dimHenry}, nil
		}),
		fncEnv("mutual_near_plate", []string{"path1", "path2", "point", "normal", "mu_r"}, 5, 5, &runtime.Help{
			Signature: "mutual_near_plate(path1, path2, point: position [m], normal: vector, mu_r: dimensionless) -> H",
			Summary:   "Mutual inductance of two paths in front of a permeable half space (see mirror): M = M12 + k·M(path1, image of path2), k = (μr − 1)/(μr + 1).",
			Method:    "mutual() twice, each asked for relative error 1e-10",
			Example:   "mutual_near_plate(circle([0, 0, 5] mm, [0, 0, 1], 20 mm), circle([0, 0, 15] mm, [0, 0, 1], 20 mm), [0, 0, 0] m, [0, 0, 1], 1000)",
			Reference: refImages,
		}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			const fn = "mutual_near_plate"
			r := readArgs(fn, args)
			p1, p2, p, n := r.path(0), r.path(1), r.point(2), r.axis(3)
			mur := r.number(4)
			if r.err != nil {
				return nil, r.err
			}
			k, err := plateFactor(fn, mur, p, n, p1, p2)
			if err != nil {
				return nil, err
			}
			img := p2.Mirror(p, n)
			if err := charge(env, fn, mutualCost(p1, p2)+mutualCost(p1, img)); err != nil {
				return nil, err
			}
			tol := control(env, fn, em.DefaultTol)
			var e1, e2 float64
			tol.Est = &e1
			m, err := em.Mutual(p1, p2, em.MutualOptions{Tol: tol})
			if err != nil {
				return nil, fieldErr(fn, err)
			}
			if k == 0 {
				reportNumErr(env, withFieldRounding(e1, m))
				return runtime.Quantity{V: m, D: dimHenry}, nil
			}
			tol.Est = &e2
			mi, err := em.Mutual(p1, img, em.MutualOptions{Tol: tol})
			if err != nil {
				return nil, imageErr(fn, err, "a path touches the face (the image of path 2 meets path 1); keep the wires off the face")
			}
			reportNumErr(env, withFieldRounding(e1, m)+math.Abs(k)*withFieldRounding(e2, mi))
			return runtime.Quantity{V: m + k*mi, D: dimHenry}, nil
		}),
	}
}

// imageErr words an error of the mutual inductance with an image: a
// path that meets its image touches the face; work stopped or other
// numerical trouble pass through as everywhere else.
func imageErr(fn string, err error, touch string) error {
	if stopping(err) {
		return err
	}
	if strings.Contains(err.Error(), "touch") {
		return errorf("%s: %s", fn, touch)
	}
	return fieldErr(fn, err)
}

// imageFactor is k = (μr − 1)/(μr + 1) for a relative permeability > 0.
func imageFactor(fn string, mur float64) (float64, error) {
	if !(mur > 0) || math.IsInf(mur, 0) {
		return 0, errorf("%s: the relative permeability must be above zero, not %s", fn, runtime.FormatNumber(mur, 6))
	}
	return (mur - 1) / (mur + 1), nil
}

// inFront checks that a path lies on the free side of the face (on it
// is allowed).
func inFront(fn string, path em.Path, p, n em.Vec) error {
	pl := em.Plate{P: p, N: n}
	for _, q := range path.Prims {
		for k := 0; k <= 16; k++ {
			if pl.Behind(q.Point(float64(k) / 16)) {
				return errorf("%s: the path reaches behind the face, into the material; the normal must point from the material towards the currents", fn)
			}
		}
	}
	return nil
}

// nearest is the least distance of a path's points from the face
// (sampled at 65 points a piece, enough for a thin wire beside its bends).
func nearest(path em.Path, p, n em.Vec) float64 {
	d := math.Inf(1)
	for _, q := range path.Prims {
		for k := 0; k <= 64; k++ {
			d = math.Min(d, r3.Dot(r3.Sub(q.Point(float64(k)/64), p), n))
		}
	}
	return d
}

// shapeInFront checks that a shape lies in front of the face.
func shapeInFront(fn string, s em.Shape, p, n em.Vec) error {
	pl := em.Plate{P: p, N: n}
	var pts []em.Vec
	switch v := s.(type) {
	case em.InfiniteWire:
		if math.Abs(r3.Dot(v.D, n)) > 1e-12 {
			return errorf("%s: an infinite wire must run parallel to the face, or it would pass through the material", fn)
		}
		pts = []em.Vec{v.P}
	case em.IdealSolenoid:
		if math.Abs(r3.Dot(v.N, n)) > 1e-12 || r3.Dot(r3.Sub(v.C, p), n) < v.R {
			return errorf("%s: an infinite solenoid must run parallel to the face, with all of it in front", fn)
		}
	case em.Dipole:
		pts = []em.Vec{v.P}
	case em.CylinderSheet:
		u := r3.Unit(r3.Cross(v.N, n))
		if r3.Norm(r3.Cross(v.N, n)) < 1e-12 {
			pts = append(pts, r3.Add(v.C, r3.Scale(v.L/2, v.N)), r3.Sub(v.C, r3.Scale(v.L/2, v.N)))
			break
		}
		// the lowest point of each end circle lies along the in-plane
		// direction farthest from the face
		w := r3.Unit(r3.Cross(v.N, u))
		for _, e := range []float64{-1, 1} {
			end := r3.Add(v.C, r3.Scale(e*v.L/2, v.N))
			pts = append(pts, r3.Add(end, r3.Scale(v.R, w)), r3.Sub(end, r3.Scale(v.R, w)))
		}
	case em.BlockSheet:
		vv := r3.Cross(v.N, v.U)
		for _, a := range []float64{-1, 1} {
			for _, b := range []float64{-1, 1} {
				for _, c := range []float64{-1, 1} {
					pts = append(pts, r3.Add(v.C, r3.Add(r3.Scale(a*v.HU, v.U), r3.Add(r3.Scale(b*v.HV, vv), r3.Scale(c*v.HN, v.N)))))
				}
			}
		}
	}
	for _, x := range pts {
		if pl.Behind(x) {
			return errorf("%s: part of the source lies behind the face, inside the material; the normal must point from the material towards the source", fn)
		}
	}
	return nil
}

// mirrorSource returns the source with its images in the face through p
// with normal n, each carrying k = (μr − 1)/(μr + 1) of its current.
func mirrorSource(fn string, src *Source, p, n em.Vec, mur float64) (*Source, error) {
	k, err := imageFactor(fn, mur)
	if err != nil {
		return nil, err
	}
	if len(src.uniform) > 0 {
		return nil, errorf("%s: a uniform field has no image that would stand for a plate in it; leave it out of the source", fn)
	}
	if src.plate() != nil {
		return nil, errorf("%s: the source is already mirrored in a plate; two plates need images of images without end, which this does not compute", fn)
	}
	if cnt := 2 * len(src.terms); cnt > maxTerms {
		return nil, errorf("%s: the source with its images would have %d currents; a source holds at most %d", fn, cnt, maxTerms)
	}
	pl := &em.Plate{P: p, N: n}
	out := &Source{}
	for _, t := range src.terms {
		if t.shape != nil {
			if err := shapeInFront(fn, t.shape, p, n); err != nil {
				return nil, err
			}
		} else if err := inFront(fn, t.path, p, n); err != nil {
			return nil, err
		}
		t.plate = pl
		out.terms = append(out.terms, t)
	}
	if k == 0 {
		return out, nil
	}
	for _, t := range src.terms {
		img := t
		img.plate = pl
		img.factor = t.gain() * k
		img.path = t.path.Mirror(p, n)
		if t.shape != nil {
			img.shape = t.shape.Mirror(p, n)
		}
		inner := t.desc
		if inner == nil {
			inner = func(digits int) string {
				return (&Path{P: t.path}).Show(digits)[len("path: "):]
			}
		}
		img.desc = func(digits int) string {
			return fmt.Sprintf("image ×%s in the face through %s, normal %s, of %s", runtime.FormatNumber(k, digits), fmtV(p, dimLength, digits), fmtV(n, runtime.Dim{}, digits), inner(digits))
		}
		out.terms = append(out.terms, img)
	}
	return out, nil
}

// plateFactor checks μr and that every path lies in front of the plate's
// face, and returns the image factor (μr − 1)/(μr + 1).
func plateFactor(fn string, mur float64, p, n em.Vec, paths ...em.Path) (float64, error) {
	k, err := imageFactor(fn, mur)
	if err != nil {
		return 0, err
	}
	for _, q := range paths {
		if err := inFront(fn, q, p, n); err != nil {
			return 0, err
		}
	}
	return k, nil
}
