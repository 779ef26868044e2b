package builtins

import (
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refGeom = "exact geometry: straight segments, circular arcs and helices are kept as such (see builtins/em)"

func pathResult(fn string, prims []em.Prim) (runtime.Value, error) {
	if err := checkPrims(fn, len(prims)); err != nil {
		return nil, err
	}
	return &Path{P: em.Path{Prims: prims}}, nil
}

func geomErr(fn string, err error) error {
	if err == nil {
		return nil
	}
	return errorf("%s: %v", fn, err)
}

// fnc builds a builtin from its parts.
func fnc(name string, params []string, lo, hi int, help *runtime.Help, call func(args []runtime.Value) (runtime.Value, error)) *runtime.Func {
	return &runtime.Func{Name: name, Params: params, MinArgs: lo, MaxArgs: hi, Call: call, Help: help}
}

func geometryFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("segment", []string{"a", "b"}, 2, 2, &runtime.Help{
			Signature: "segment(a: position [m], b: position [m]) -> path",
			Summary:   "A straight piece of wire from a to b.",
			Example:   "segment([0, 0, 0] m, [0, 0, 1] m)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("segment", args)
			a, b := r.point(0), r.point(1)
			if r.err != nil {
				return nil, r.err
			}
			s, err := em.NewSegment(a, b)
			if err != nil {
				return nil, geomErr("segment", err)
			}
			return pathResult("segment", []em.Prim{s})
		}),
		fnc("polyline", []string{"p1", "p2", "..."}, 2, -1, &runtime.Help{
			Signature: "polyline(p1, p2, ...: positions [m]) -> path",
			Summary:   "Straight pieces through the points in order (open).",
			Example:   "polyline([0, 0, 0] m, [1, 0, 0] m, [1, 1, 0] m)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) { return polyPath("polyline", args, false) }),
		fnc("polygon", []string{"p1", "p2", "p3", "..."}, 3, -1, &runtime.Help{
			Signature: "polygon(p1, p2, p3, ...: positions [m]) -> path",
			Summary:   "Straight pieces through the points, closed back to the first point.",
			Example:   "polygon([0, 0, 0] m, [40, 0, 0] mm, [0, 30, 0] mm)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) { return polyPath("polygon", args, true) }),
		fnc("rectangle", []string{"corner", "side1", "side2"}, 3, 3, &runtime.Help{
			Signature: "rectangle(corner: position [m], side1: vector [m], side2: vector [m]) -> path",
			Summary:   "The closed loop corner → corner+side1 → corner+side1+side2 → corner+side2 → corner (circulating from side1 towards side2).",
			Example:   "rectangle([0, 0, 0] m, [30, 0, 0] mm, [0, 20, 0] mm)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("rectangle", args)
			c, s1, s2 := r.point(0), r.point(1), r.point(2)
			if r.err != nil {
				return nil, r.err
			}
			if r3.Norm(r3.Cross(s1, s2)) == 0 {
				return nil, errorf("rectangle: the sides are parallel or zero; the loop would enclose no area")
			}
			prims, err := loopThrough([]em.Vec{c, r3.Add(c, s1), r3.Add(r3.Add(c, s1), s2), r3.Add(c, s2)})
			if err != nil {
				return nil, geomErr("rectangle", err)
			}
			return pathResult("rectangle", prims)
		}),
		fnc("circle", []string{"center", "axis", "radius"}, 3, 3, &runtime.Help{
			Signature: "circle(center: position [m], axis: vector, radius: length) -> path",
			Summary:   "A circular loop around axis (current circulates right-handed about axis).",
			Method:    "kept exact; fields use complete elliptic integrals",
			Example:   "circle([0, 0, 0] m, [0, 0, 1], 25 mm)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("circle", args)
			c, ax, rad := r.point(0), r.axis(1), r.positiveLength(2)
			if r.err != nil {
				return nil, r.err
			}
			p, err := em.NewCircle(c, ax, rad)
			if err != nil {
				return nil, geomErr("circle", err)
			}
			return pathResult("circle", []em.Prim{p})
		}),
		fnc("arc", []string{"center", "axis", "start", "angle"}, 4, 4, &runtime.Help{
			Signature: "arc(center: position [m], axis: vector, start: position [m], angle: rad (or a plain number in radians)) -> path",
			Summary:   "A circular arc around axis through center, from start, sweeping angle (right-handed about axis; negative sweeps back).",
			Method:    "kept exact; fields use incomplete elliptic integrals, or adaptive quadrature along the arc for points very near its circle",
			Example:   "arc([0, 0, 0] m, [0, 0, 1], [20, 0, 0] mm, 90 deg)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("arc", args)
			c, ax, s, ang := r.point(0), r.axis(1), r.point(2), r.angle(3)
			if r.err != nil {
				return nil, r.err
			}
			p, err := em.NewArc(c, ax, s, ang)
			if err != nil {
				return nil, geomErr("arc", err)
			}
			return pathResult("arc", []em.Prim{p})
		}),
		fnc("helix", []string{"center", "axis", "radius", "length", "turns"}, 5, 5, &runtime.Help{
			Signature: "helix(center: position [m], axis: vector, radius: length, length: length, turns) -> path",
			Summary:   "A helical coil placed by its centre: it starts at radius from the axis point center − length/2·axis, winds right-handed about axis, and advances length over turns (open path; a coil without its leads).",
			Method:    "kept exact; fields and inductance by adaptive quadrature along the helix",
			Example:   "helix([0, 0, 0] m, [0, 0, 1], 10 mm, 40 mm, 25)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			base, ax, r, l, n, err := coilArgs("helix", args)
			if err != nil {
				return nil, err
			}
			if n > maxTurns {
				return nil, errorf("helix: %g turns is more than the limit of %d", n, maxTurns)
			}
			p, err := em.NewHelix(base, ax, r, l, n)
			if err != nil {
				return nil, geomErr("helix", err)
			}
			return pathResult("helix", []em.Prim{p})
		}),
		fnc("rings", []string{"center", "axis", "radius", "length", "turns"}, 5, 5, &runtime.Help{
			Signature: "rings(center: position [m], axis: vector, radius: length, length: length, turns: whole number) -> path",
			Summary:   "A coil placed by its centre, modelled as turns coaxial circles, one at the middle of each turn's share of length (closed loops), spread over length about center.",
			Method:    "each ring exact; inductance() takes Maxwell's formula for each pair of coaxial rings",
			Example:   "rings([0, 0, 0] m, [0, 0, 1], 10 mm, 40 mm, 25)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			base, ax, r, l, n, err := coilArgs("rings", args)
			if err != nil {
				return nil, err
			}
			if n != math.Trunc(n) || n < 1 || n > maxTurns {
				return nil, errorf("rings: the number of turns must be a whole number from 1 to %d", maxTurns)
			}
			nn := r3.Unit(ax)
			prims := make([]em.Prim, int(n))
			for k := range prims {
				c := r3.Add(base, r3.Scale((float64(k)+0.5)*l/n, nn))
				if prims[k], err = em.NewCircle(c, nn, r); err != nil {
					return nil, geomErr("rings", err)
				}
			}
			return pathResult("rings", prims)
		}),
		fnc("toroid_rect", []string{"center", "axis", "r_in", "r_out", "height", "turns"}, 6, 6, &runtime.Help{
			Signature: "toroid_rect(center: position [m], axis: vector, r_in: length, r_out: length, height: length, turns: whole number) -> path",
			Summary:   "A toroidal winding, placed by its centre (on its axis, midway through the height), of turns rectangular loops on a core of rectangular cross-section (r_in to r_out, height), evenly spaced in angle, in meridian planes.",
			Method:    "each turn is four straight pieces; the winding's one-turn circumferential advance is not modelled. Outside the winding the turns' fields cancel (no current threads a loop around the core from outside): a field, potential or flux computed there is the rounding left over from the turns' own fields, about 1e-16 of their sum (the tests see up to 4e-15 at 2 to 20 outer radii for 200 turns), so its relative error can be of order one while its error per turn is at the last digit. b_at and a_at carry that rounding as the result's numerical error (each piece's accuracy and the sum's rounding, relative to the sum of the turns' fields), shown beside the value; flux through a loop and mutual add the same rounding taken at points along the path, other integrals of the field allow only 1e-12 of their value for it. The one-turn advance, left out here, is what gives a real toroid an outside field: model it with a loop around the axis if it matters.",
			Example:   "toroid_rect([0, 0, 0] m, [0, 0, 1], 20 mm, 30 mm, 10 mm, 200)",
			Reference: refGeom,
		}, toroidRect),
		fnc("toroid_round", []string{"center", "axis", "major_radius", "minor_radius", "turns"}, 5, 5, &runtime.Help{
			Signature: "toroid_round(center: position [m], axis: vector, major_radius: length, minor_radius: length, turns: whole number) -> path",
			Summary:   "A toroidal winding, placed by its centre, of turns circular loops of minor_radius on a ring core of major_radius, evenly spaced, in meridian planes.",
			Method:    "each turn is an exact circle; the one-turn circumferential advance is not modelled. Outside the winding the turns' fields cancel (no current threads a loop around the core from outside): a field, potential or flux computed there is the rounding left over from the turns' own fields, about 1e-16 of their sum (the tests see up to 4e-15 at 2 to 20 outer radii for 200 turns), so its relative error can be of order one while its error per turn is at the last digit. b_at and a_at carry that rounding as the result's numerical error (each piece's accuracy and the sum's rounding, relative to the sum of the turns' fields), shown beside the value; flux through a loop and mutual add the same rounding taken at points along the path, other integrals of the field allow only 1e-12 of their value for it. The one-turn advance, left out here, is what gives a real toroid an outside field: model it with a loop around the axis if it matters.",
			Example:   "toroid_round([0, 0, 0] m, [0, 0, 1], 25 mm, 5 mm, 200)",
			Reference: refGeom,
		}, toroidRound),
		fncEnv("parametric_path", []string{"f", "u0", "u1", "pieces", "closure"}, 4, 5, &runtime.Help{
			Signature: `parametric_path(f: function of one quantity returning a position [m], u0, u1: the unit of f's parameter (any: rad, m, s or none), pieces: whole number or chord tolerance [m][, "closed"]) -> path`,
			Summary:   "Straight pieces through points of the curve f(u) as u goes from u0 to u1. A whole number gives that many pieces in equal steps of u; a length is a chord tolerance: pieces are halved until the curve stays within that distance of them. \"closed\" snaps the last point onto the first when they agree within the tolerance (with a piece count, within 1e-6 of the curve's size), making a closed loop; ends further apart are an error.",
			Method:    "the chord tolerance: from 8 equal steps of u, a piece is cut in two at its middle u until the curve's point there, and the point 0.382 of the way along (a guard against a piece that spans whole turns of a periodic curve, whose middle falls back onto the chord), both lie within the tolerance of the piece; at most 200000 pieces. A jump in the curve becomes a straight piece across it. For a smooth curve the largest distance between curve and pieces is then about the tolerance, and the polyline falls short of the curve's length by at most about tolerance/(3·radius of curvature), relative. The result is a polygon: a circle in n pieces gives n·tan(π/n)/π times the circle's field at its centre (1 + π²/(3n²)). A function of arithmetic, vector literals and builtins such as sin, cos and sqrt is evaluated on plain numbers, its units checked once (about 0.4 µs a point); others through the language, a few µs a point.",
			Example:   "ring(u) = [25 mm * cos(u), 25 mm * sin(u), 0 mm]\nparametric_path(ring, 0 rad, 1 rev, 64, \"closed\")",
			Reference: "a curve sampled at values of its parameter; the sagitta of a circular arc of radius ρ over a chord c is ρ − √(ρ² − c²/4) (elementary geometry)",
		}, parametricPath),
		fnc("translate", []string{"path", "shift"}, 2, 2, &runtime.Help{
			Signature: "translate(path, shift: vector [m]) -> path",
			Summary:   "The path moved by shift.",
			Example:   "translate(circle([0, 0, 0] m, [0, 0, 1], 25 mm), [0, 0, 10] mm)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("translate", args)
			p, v := r.path(0), r.point(1)
			if r.err != nil {
				return nil, r.err
			}
			id := func(x em.Vec) em.Vec { return x }
			return transformed(p, id, em.Vec{}, v), nil
		}),
		fnc("rotate", []string{"path", "axis", "angle", "origin"}, 3, 4, &runtime.Help{
			Signature: "rotate(path, axis: vector, angle: rad (or a plain number in radians)[, origin: position [m]]) -> path",
			Summary:   "The path turned by angle about axis (right-handed) through origin (default the coordinate origin).",
			Example:   "rotate(circle([0, 0, 0] m, [0, 0, 1], 25 mm), [1, 0, 0], 90 deg)",
			Reference: "gonum spatial/r3 Rotation (unit quaternion)",
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("rotate", args)
			p, ax, ang := r.path(0), r.axis(1), r.angle(2)
			var origin em.Vec
			if len(args) > 3 {
				origin = r.point(3)
			}
			if r.err != nil {
				return nil, r.err
			}
			rot := r3.NewRotation(ang, r3.Unit(ax))
			return transformed(p, rot.Rotate, origin, em.Vec{}), nil
		}),
		fnc("reverse", []string{"path"}, 1, 1, &runtime.Help{
			Signature: "reverse(path) -> path",
			Summary:   "The path traversed the other way (its current and field change sign).",
			Example:   "reverse(circle([0, 0, 0] m, [0, 0, 1], 25 mm))",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			p, err := pathArg("reverse", args, 0)
			if err != nil {
				return nil, err
			}
			return &Path{P: p.Reversed()}, nil
		}),
		fnc("join", []string{"p1", "p2", "..."}, 2, -1, &runtime.Help{
			Signature: "join(p1, p2, ...: paths) -> path",
			Summary:   "The paths one after another as one path (they carry the same current). Pieces that meet end to start form one loop.",
			Example:   "join(circle([0, 0, 0] m, [0, 0, 1], 25 mm), circle([0, 0, 5] mm, [0, 0, 1], 25 mm))",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			var prims []em.Prim
			for i := range args {
				p, err := pathArg("join", args, i)
				if err != nil {
					return nil, err
				}
				prims = append(prims, p.Prims...)
				if err := checkPrims("join", len(prims)); err != nil {
					return nil, err
				}
			}
			return pathResult("join", prims)
		}),
		fnc("repeat", []string{"path", "n", "step"}, 3, 3, &runtime.Help{
			Signature: "repeat(path, n: whole number, step: vector [m]) -> path",
			Summary:   "n copies of the path, copy k shifted by k·step (k = 0 … n−1): a multi-turn coil from one turn.",
			Example:   "repeat(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 10, [0, 0, 1] mm)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("repeat", args)
			p, n, step := r.path(0), r.count(1, 1, maxPrims), r.point(2)
			if r.err != nil {
				return nil, r.err
			}
			if err := checkPrims("repeat", n*len(p.Prims)); err != nil {
				return nil, err
			}
			prims := make([]em.Prim, 0, n*len(p.Prims))
			id := func(x em.Vec) em.Vec { return x }
			for k := 0; k < n; k++ {
				for _, q := range p.Prims {
					prims = append(prims, q.Transform(id, em.Vec{}, r3.Scale(float64(k), step)))
				}
			}
			return pathResult("repeat", prims)
		}),
		fnc("length", []string{"path"}, 1, 1, &runtime.Help{
			Signature: "length(path) -> m",
			Summary:   "Total length of the path (the wire length).",
			Example:   "length(helix([0, 0, 0] m, [0, 0, 1], 10 mm, 40 mm, 25)) as m",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			p, err := pathArg("length", args, 0)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: p.Length(), D: dimLength}, nil
		}),
		fnc("disk", []string{"center", "axis", "radius"}, 3, 3, &runtime.Help{
			Signature: "disk(center: position [m], axis: vector, radius: length) -> surface",
			Summary:   "A flat disk; its normal (for flux) is along axis.",
			Example:   "disk([0, 0, 0] m, [0, 0, 1], 25 mm)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("disk", args)
			c, ax, rad := r.point(0), r.axis(1), r.positiveLength(2)
			if r.err != nil {
				return nil, r.err
			}
			s, err := em.NewDisk(c, ax, rad)
			if err != nil {
				return nil, geomErr("disk", err)
			}
			return &Surface{s}, nil
		}),
		fnc("rectangle_surface", []string{"corner", "side1", "side2"}, 3, 3, &runtime.Help{
			Signature: "rectangle_surface(corner: position [m], side1: vector [m], side2: vector [m]) -> surface",
			Summary:   "The flat parallelogram spanned by side1 and side2 from corner; its normal is side1 × side2.",
			Example:   "rectangle_surface([0, 0, 0] m, [30, 0, 0] mm, [0, 20, 0] mm)",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("rectangle_surface", args)
			c, s1, s2 := r.point(0), r.point(1), r.point(2)
			if r.err != nil {
				return nil, r.err
			}
			s, err := em.NewRectSurface(c, s1, s2)
			if err != nil {
				return nil, geomErr("rectangle_surface", err)
			}
			return &Surface{s}, nil
		}),
		fnc("spanned", []string{"loop"}, 1, 1, &runtime.Help{
			Signature: "spanned(loop: closed flat path) -> surface",
			Summary:   "The flat surface a closed planar loop bounds; its normal follows the loop's circulation (right-hand rule).",
			Method:    "a fan from the loop's centroid with signed area element, so any closed planar loop works",
			Example:   "spanned(polygon([0, 0, 0] m, [40, 0, 0] mm, [0, 30, 0] mm))",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			p, err := pathArg("spanned", args, 0)
			if err != nil {
				return nil, err
			}
			s, err := em.NewSpanned(p)
			if err != nil {
				return nil, geomErr("spanned", err)
			}
			return &Surface{s}, nil
		}),
		fnc("area", []string{"surface"}, 1, 1, &runtime.Help{
			Signature: "area(surface) -> m^2",
			Summary:   "Area of a surface.",
			Example:   "area(disk([0, 0, 0] m, [0, 0, 1], 25 mm))",
			Reference: refGeom,
		}, func(args []runtime.Value) (runtime.Value, error) {
			s, ok := args[0].(*Surface)
			if !ok {
				return nil, errorf("area: the argument must be a surface, not %s", runtime.TypeName(args[0]))
			}
			return runtime.Quantity{V: s.S.Area, D: dimArea}, nil
		}),
	}
}

func transformed(p em.Path, rot func(em.Vec) em.Vec, origin, shift em.Vec) *Path {
	out := make([]em.Prim, len(p.Prims))
	for i, q := range p.Prims {
		out[i] = q.Transform(rot, origin, shift)
	}
	return &Path{P: em.Path{Prims: out}}
}

func loopThrough(pts []em.Vec) ([]em.Prim, error) {
	prims := make([]em.Prim, len(pts))
	for i := range pts {
		s, err := em.NewSegment(pts[i], pts[(i+1)%len(pts)])
		if err != nil {
			return nil, err
		}
		prims[i] = s
	}
	return prims, nil
}

func polyPath(fn string, args []runtime.Value, closed bool) (runtime.Value, error) {
	if err := checkPrims(fn, len(args)); err != nil {
		return nil, err
	}
	pts := make([]em.Vec, len(args))
	for i := range args {
		p, err := point(fn, args, i)
		if err != nil {
			return nil, err
		}
		pts[i] = p
	}
	var prims []em.Prim
	if closed {
		var err error
		if prims, err = loopThrough(pts); err != nil {
			return nil, errorf("%s: two consecutive points are the same: %v", fn, err)
		}
	} else {
		for i := 0; i+1 < len(pts); i++ {
			s, err := em.NewSegment(pts[i], pts[i+1])
			if err != nil {
				return nil, errorf("%s: points %d and %d are the same: %v", fn, i+1, i+2, err)
			}
			prims = append(prims, s)
		}
	}
	return pathResult(fn, prims)
}

// coilArgs reads (base, axis, radius, length, turns) of a coil.
// coilArgs reads (center, axis, radius, length, turns) and returns the
// coil's base: every coil-like builtin is placed by its centre.
func coilArgs(fn string, args []runtime.Value) (base, ax em.Vec, rad, l, n float64, err error) {
	r := readArgs(fn, args)
	center, ax, rad, l, n := r.point(0), r.axis(1), r.positiveLength(2), r.ofDim(3, dimLength), r.number(4)
	base = baseOf(center, ax, l)
	switch {
	case r.err != nil:
		err = r.err
	case l < 0:
		err = errorf("%s: the length must not be negative", fn)
	case !(n > 0) || math.IsInf(n, 0):
		err = errorf("%s: the number of turns must be positive", fn)
	}
	return
}

// baseOf returns the end point of a coil's axis from its centre: the
// centre less half the length along the axis.
func baseOf(center, ax em.Vec, length float64) em.Vec {
	return r3.Sub(center, r3.Scale(length/2, r3.Unit(ax)))
}

// toroidFrame returns the unit axis and an in-plane basis.
func toroidFrame(ax em.Vec) (n, u, v em.Vec) {
	n = r3.Unit(ax)
	h := em.Vec{X: 1}
	if math.Abs(n.X) > 0.6 {
		h = em.Vec{Y: 1}
	}
	u = r3.Unit(r3.Sub(h, r3.Scale(r3.Dot(h, n), n)))
	v = r3.Cross(n, u)
	return
}

func toroidRect(args []runtime.Value) (runtime.Value, error) {
	const fn = "toroid_rect"
	r := readArgs(fn, args)
	c, ax, rin, rout, h, n := r.point(0), r.axis(1), r.positiveLength(2), r.positiveLength(3), r.positiveLength(4), r.count(5, 1, maxTurns)
	if r.err != nil {
		return nil, r.err
	}
	if rout <= rin {
		return nil, errorf("%s: the outer radius must be larger than the inner radius", fn)
	}
	if err := checkPrims(fn, 4*n); err != nil {
		return nil, err
	}
	nz, u, v := toroidFrame(ax)
	prims := make([]em.Prim, 0, 4*n)
	for k := 0; k < n; k++ {
		phi := 2 * math.Pi * float64(k) / float64(n)
		s, co := math.Sincos(phi)
		e := r3.Add(r3.Scale(co, u), r3.Scale(s, v)) // radial direction of this turn
		at := func(r, z float64) em.Vec { return r3.Add(c, r3.Add(r3.Scale(r, e), r3.Scale(z, nz))) }
		// inner leg up, top out, outer leg down, bottom in: the turn's
		// normal is ẑ × ê = +φ, so a positive current drives the field in
		// the core along +φ (right-handed about the axis)
		quad, err := loopThrough([]em.Vec{at(rin, -h/2), at(rin, h/2), at(rout, h/2), at(rout, -h/2)})
		if err != nil {
			return nil, geomErr(fn, err)
		}
		prims = append(prims, quad...)
	}
	return pathResult(fn, prims)
}

func toroidRound(args []runtime.Value) (runtime.Value, error) {
	const fn = "toroid_round"
	r := readArgs(fn, args)
	c, ax, big, small, n := r.point(0), r.axis(1), r.positiveLength(2), r.positiveLength(3), r.count(4, 1, maxTurns)
	if r.err != nil {
		return nil, r.err
	}
	if small >= big {
		return nil, errorf("%s: the minor radius must be smaller than the major radius", fn)
	}
	nz, u, v := toroidFrame(ax)
	prims := make([]em.Prim, n)
	for k := range prims {
		phi := 2 * math.Pi * float64(k) / float64(n)
		s, co := math.Sincos(phi)
		e := r3.Add(r3.Scale(co, u), r3.Scale(s, v))
		tangent := r3.Cross(nz, e) // +φ direction: each turn's axis
		var err error
		if prims[k], err = em.NewCircle(r3.Add(c, r3.Scale(big, e)), tangent, small); err != nil {
			return nil, geomErr(fn, err)
		}
	}
	return pathResult(fn, prims)
}

// Tracing a curve given as a function of a parameter.
const (
	// traceStart is the number of equal steps the chord-tolerance
	// refinement starts from.
	traceStart = 8
	// traceGuard is where along a piece (as a fraction of its parameter
	// step) the second test point lies: (3 − √5)/2, irrational, so that a
	// piece spanning whole periods of a periodic curve cannot have both its
	// middle and this point fall back onto its chord.
	traceGuard = 0.3819660112501051
	// closeRel is how near, relative to the curve's size, the ends must
	// be for "closed" when a piece count is given (no tolerance).
	closeRel = 1e-6
)

// curve evaluates a user's function of one parameter as a position.
type curve struct {
	env   runtime.Env
	fn    string
	f     *runtime.Func
	d     runtime.Dim
	cyc   bool
	param string
	args  []runtime.Value
	// fast evaluates the function on plain numbers when its body allows
	// (runtime.Fast: no unit wrapping a point); nil otherwise
	fast  *runtime.FastFunc
	calls int
}

func (c *curve) showU(u float64) string {
	return runtime.Format(runtime.Quantity{V: u, D: c.d, Cyc: c.cyc}, 6)
}

// checkEvery is how often a point found on plain numbers (runtime.Fast)
// is found again through the language and compared, besides the first.
const checkEvery = 1024

func (c *curve) at(u float64) (em.Vec, error) {
	if c.env != nil {
		if err := c.env.Err(); err != nil {
			return em.Vec{}, err
		}
	}
	c.calls++
	if c.fast != nil {
		v, ok := c.fast.At(u)
		if ok && c.calls != 1 && c.calls%checkEvery != 0 {
			return em.Vec{X: v[0], Y: v[1], Z: v[2]}, nil
		}
		// the first call, every checkEvery-th, and any whose numbers went
		// non-finite go through the language too; should the two differ
		// in a single bit, the rest do as well
		p, err := c.slow(u)
		if err == nil && (!ok || p != (em.Vec{X: v[0], Y: v[1], Z: v[2]})) {
			c.fast = nil
		}
		return p, err
	}
	return c.slow(u)
}

// slow evaluates the function through the language.
func (c *curve) slow(u float64) (em.Vec, error) {
	// one argument slice for every call: a call's frame is gone when it
	// returns, and values are copied, never shared
	if c.args == nil {
		c.args = make([]runtime.Value, 1)
	}
	c.args[0] = runtime.Quantity{V: u, D: c.d, Cyc: c.cyc}
	v, err := c.f.Invoke(c.env, c.args)
	if err != nil {
		return em.Vec{}, err
	}
	p, ok := v.(runtime.Vector)
	if !ok || p.D != dimLength {
		return em.Vec{}, errorf("%s: %s must give a position (a vector of lengths, such as [x, y, z] mm), but at %s = %s it gives %s", c.fn, c.f.Signature(), c.param, c.showU(u), runtime.TypeName(v))
	}
	for _, x := range p.V {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return em.Vec{}, errorf("%s: %s at %s = %s gives a point that is not finite", c.fn, c.f.Signature(), c.param, c.showU(u))
		}
	}
	return toVec(p), nil
}

// budget counts m calls of the function against the statement's budget:
// each call is charged runtime.CallEvals now, and what the calls it makes
// charge as they run (nested, measured on the first call) is checked to
// fit.
func (c *curve) budget(m int, nested float64) error {
	if c.env == nil {
		return nil
	}
	if err := c.env.Charge(c.fn, runtime.CallEvals*float64(m)); err != nil {
		return err
	}
	return c.env.Afford(c.fn, nested*float64(m))
}

func parametricPath(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "parametric_path"
	f, err := funcArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	u0, err := quantity(fn, args, 1)
	if err != nil {
		return nil, err
	}
	u1, err := quantity(fn, args, 2)
	if err != nil {
		return nil, err
	}
	if u1.D != u0.D {
		return nil, errorf("%s: u1 must have the unit of u0 (%s), not %s%s", fn, u0.D.Describe(), u1.D.Describe(), runtime.AngleNote(u1.D, u0.D))
	}
	if u1.V == u0.V {
		return nil, errorf("%s: u0 and u1 are both %s; the parameter must run over a range", fn, runtime.Format(u0, 6))
	}
	pq, err := quantity(fn, args, 3)
	if err != nil {
		return nil, err
	}
	n, tol := 0, 0.0
	switch {
	case pq.D.IsZero():
		if n, err = count(fn, args, 3, 1, maxPrims); err != nil {
			return nil, err
		}
	case pq.D == dimLength:
		if tol, err = positiveLength(fn, args, 3); err != nil {
			return nil, err
		}
	default:
		return nil, errorf("%s: the fourth argument is a number of pieces (a whole number) or a chord tolerance (a length), not %s", fn, pq.D.Describe())
	}
	closed := false
	if len(args) == 5 {
		if s, _ := args[4].(string); s != "closed" {
			return nil, errorf(`%s: the fifth argument can only be "closed", not %s`, fn, describeArg(args[4]))
		}
		closed = true
		if n > 0 && n < 3 {
			return nil, errorf("%s: a closed path needs at least 3 pieces, not %d", fn, n)
		}
	}
	c := &curve{env: env, fn: fn, f: f, d: u0.D, cyc: u0.Cyc && u1.Cyc, param: "u"}
	if len(f.Params) > 0 && f.Body != "" {
		c.param = f.Params[0]
	}
	if fast := f.Fast(u0.D); fast != nil && fast.Vec && fast.D == dimLength {
		c.fast = fast
	}
	var us []float64
	var pts []em.Vec
	if n > 0 {
		us, pts, err = traceSteps(c, u0.V, u1.V, n)
	} else {
		us, pts, err = traceTolerance(c, u0.V, u1.V, tol)
	}
	if err != nil {
		return nil, err
	}
	if closed {
		last := len(pts) - 1
		lim := tol
		if n > 0 {
			lim = closeRel * boxSize(pts)
		}
		if gap := r3.Norm(r3.Sub(pts[last], pts[0])); gap > lim {
			return nil, errorf("%s: the curve does not come back to its start: the point at %s = %s is %s from the one at %s, more than %s; trace the whole loop, or leave out \"closed\"", fn,
				c.param, c.showU(us[last]), runtime.Format(runtime.Quantity{V: gap, D: dimLength}, 6), c.showU(us[0]), runtime.Format(runtime.Quantity{V: lim, D: dimLength}, 6))
		}
		pts[last] = pts[0]
	}
	prims := make([]em.Prim, len(pts)-1)
	for i := range prims {
		s, err := em.NewSegment(pts[i], pts[i+1])
		if err != nil {
			return nil, errorf("%s: %s gives the same point at %s = %s and at %s = %s, so a piece would have no length; trace a range over which the curve moves", fn,
				f.Signature(), c.param, c.showU(us[i]), c.param, c.showU(us[i+1]))
		}
		prims[i] = s
	}
	return pathResult(fn, prims)
}

// traceSteps evaluates the curve at n+1 equal steps from u0 to u1.
func traceSteps(c *curve, u0, u1 float64, n int) ([]float64, []em.Vec, error) {
	us := make([]float64, n+1)
	for k := range us {
		us[k] = u0 + (u1-u0)*float64(k)/float64(n)
		if k > 0 && us[k] == us[k-1] {
			return nil, nil, errorf("%s: %d steps from %s to %s are too small to tell apart in floating point; ask for fewer pieces", c.fn, n, c.showU(u0), c.showU(u1))
		}
	}
	us[n] = u1
	if err := c.budget(1, 0); err != nil {
		return nil, nil, err
	}
	pts := make([]em.Vec, n+1)
	spent := 0.0
	if c.env != nil {
		spent = c.env.Spent()
	}
	var err error
	for k, u := range us {
		if pts[k], err = c.at(u); err != nil {
			return nil, nil, err
		}
		if k == 0 {
			nested := 0.0
			if c.env != nil {
				nested = c.env.Spent() - spent
			}
			if err := c.budget(n, nested); err != nil {
				return nil, nil, err
			}
		}
		if c.env != nil && n > 1000 && k%1000 == 0 {
			c.env.Progress(c.fn, k, n+1)
		}
	}
	return us, pts, nil
}

// tracePiece is a piece of a curve being refined: its parameter range and
// end points, and whether it follows the curve closely enough.
type tracePiece struct {
	ua, ub float64
	a, b   em.Vec
	done   bool
}

// traceTolerance refines equal steps by bisection until the curve's point
// in the middle of every piece (and at traceGuard along it) is within tol
// of the piece. The refinement goes level by level, so that each level's
// work is counted against the budget before it starts.
func traceTolerance(c *curve, u0, u1, tol float64) ([]float64, []em.Vec, error) {
	us, pts, err := traceSteps(c, u0, u1, traceStart)
	if err != nil {
		return nil, nil, err
	}
	pieces := make([]tracePiece, traceStart)
	for k := range pieces {
		pieces[k] = tracePiece{ua: us[k], ub: us[k+1], a: pts[k], b: pts[k+1]}
	}
	for {
		pending := 0
		for _, p := range pieces {
			if !p.done {
				pending++
			}
		}
		if pending == 0 {
			break
		}
		// at most two calls a piece; what they call is counted as it runs
		if err := c.budget(2*pending, 0); err != nil {
			return nil, nil, err
		}
		next := make([]tracePiece, 0, len(pieces)+pending)
		for _, p := range pieces {
			if p.done {
				next = append(next, p)
				continue
			}
			um := p.ua + (p.ub-p.ua)/2
			if um == p.ua || um == p.ub {
				return nil, nil, errorf("%s: near %s = %s the parameter cannot be cut finer in floating point, and the curve is not yet within %s of a straight piece; give the parameter a range of smaller numbers (nearer zero)", c.fn,
					c.param, c.showU(um), runtime.Format(runtime.Quantity{V: tol, D: dimLength}, 6))
			}
			pm, err := c.at(um)
			if err != nil {
				return nil, nil, err
			}
			if distToSegment(pm, p.a, p.b) <= tol {
				pg, err := c.at(p.ua + traceGuard*(p.ub-p.ua))
				if err != nil {
					return nil, nil, err
				}
				if distToSegment(pg, p.a, p.b) <= tol {
					p.done = true
					next = append(next, p)
					continue
				}
			}
			next = append(next, tracePiece{ua: p.ua, ub: um, a: p.a, b: pm}, tracePiece{ua: um, ub: p.ub, a: pm, b: p.b})
			if len(next) > maxPrims {
				return nil, nil, errorf("%s: following the curve within %s needs more than %d pieces, the most a path may have; ask for a larger tolerance or trace a shorter range", c.fn,
					runtime.Format(runtime.Quantity{V: tol, D: dimLength}, 6), maxPrims)
			}
		}
		pieces = next
		if c.env != nil {
			c.env.Progress(c.fn, len(pieces)-pending, len(pieces))
		}
	}
	us = make([]float64, len(pieces)+1)
	pts = make([]em.Vec, len(pieces)+1)
	us[0], pts[0] = pieces[0].ua, pieces[0].a
	for k, p := range pieces {
		us[k+1], pts[k+1] = p.ub, p.b
	}
	return us, pts, nil
}

// distToSegment is the distance from p to the segment from a to b (to a
// when they coincide).
func distToSegment(p, a, b em.Vec) float64 {
	ab, ap := r3.Sub(b, a), r3.Sub(p, a)
	l2 := r3.Dot(ab, ab)
	if l2 == 0 {
		return r3.Norm(ap)
	}
	t := math.Min(1, math.Max(0, r3.Dot(ap, ab)/l2))
	return r3.Norm(r3.Sub(ap, r3.Scale(t, ab)))
}

// boxSize is the diagonal of the box around the points.
func boxSize(pts []em.Vec) float64 {
	lo, hi := pts[0], pts[0]
	for _, p := range pts[1:] {
		lo = em.Vec{X: math.Min(lo.X, p.X), Y: math.Min(lo.Y, p.Y), Z: math.Min(lo.Z, p.Z)}
		hi = em.Vec{X: math.Max(hi.X, p.X), Y: math.Max(hi.Y, p.Y), Z: math.Max(hi.Z, p.Z)}
	}
	return r3.Norm(r3.Sub(hi, lo))
}
