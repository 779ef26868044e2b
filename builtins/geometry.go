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
	return &Path{em.Path{Prims: prims}}, nil
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
			Method:    "each turn is four straight pieces; the winding's one-turn circumferential advance is not modelled",
			Example:   "toroid_rect([0, 0, 0] m, [0, 0, 1], 20 mm, 30 mm, 10 mm, 200)",
			Reference: refGeom,
		}, toroidRect),
		fnc("toroid_round", []string{"center", "axis", "major_radius", "minor_radius", "turns"}, 5, 5, &runtime.Help{
			Signature: "toroid_round(center: position [m], axis: vector, major_radius: length, minor_radius: length, turns: whole number) -> path",
			Summary:   "A toroidal winding, placed by its centre, of turns circular loops of minor_radius on a ring core of major_radius, evenly spaced, in meridian planes.",
			Method:    "each turn is an exact circle",
			Example:   "toroid_round([0, 0, 0] m, [0, 0, 1], 25 mm, 5 mm, 200)",
			Reference: refGeom,
		}, toroidRound),
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
			return &Path{p.Reversed()}, nil
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
	return &Path{em.Path{Prims: out}}
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
