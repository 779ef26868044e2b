package builtins

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refSpiral = "centre line of the trace, straight pieces and half circles kept exact (see builtins/em/spiral.go); inner size as in Mohan, del Mar Hershenson, Boyd and Lee, \"Simple accurate expressions for planar spiral inductances\", IEEE J. Solid-State Circuits 34(10), 1999"

const refTrace = "Greenhouse, \"Design of planar rectangular microelectronic inductors\", IEEE Trans. Parts, Hybrids and Packaging 10(2), 1974; Grover, Inductance Calculations (1946); checked against Mohan et al., IEEE J. Solid-State Circuits 34(10), 1999"

// spiralShapes are the spiral builtins: name, sides (0: circle), what the
// outer size measures, and the example.
var spiralShapes = []struct {
	name, shape string
	sides       int
	outer       string
	example     string
}{
	{"spiral_square", "square", 4, "outer edge to outer edge across the flats", "spiral_square([0, 0, 0] m, [0, 0, 1], 30 mm, 0.5 mm, 0.3 mm, 8)"},
	{"spiral_hexagon", "hexagonal", 6, "outer edge to outer edge across the flats", "spiral_hexagon([0, 0, 0] m, [0, 0, 1], 30 mm, 0.5 mm, 0.3 mm, 6)"},
	{"spiral_octagon", "octagonal", 8, "outer edge to outer edge across the flats", "spiral_octagon([0, 0, 0] m, [0, 0, 1], 30 mm, 0.5 mm, 0.3 mm, 6, 2, 1.6 mm)"},
	{"spiral_circle", "circular", 0, "the outer diameter", "spiral_circle([0, 0, 0] m, [0, 0, 1], 30 mm, 0.5 mm, 0.3 mm, 5)"},
}

func spiralFuncs() []*runtime.Func {
	var fs []*runtime.Func
	for _, sh := range spiralShapes {
		sh := sh
		turns := fmt.Sprintf("turns: a multiple of 1/%d", sh.sides)
		inner := "; the inner size (free space inside the innermost turn) is outer − 2·turns·width − 2·(turns − 1)·spacing, and must be positive"
		how := fmt.Sprintf("side k lies on the line parallel to a side of the regular %d-gon at the distance outer/2 − width/2 − ⌊k/%d⌋·(width + spacing) from the centre, so each turn is the polygon one pitch inside the last and steps in on its last side; side 1 runs along the first in-plane direction", sh.sides, sh.sides)
		if sh.sides == 0 {
			turns = "turns: a multiple of 1/2"
			inner = "; the last half circle's inside diameter must be positive"
			how = "half circles whose radius shrinks by half a pitch (width + spacing) each, their centres alternating between the centre and half a pitch off it, so that they meet with a common tangent"
		}
		fs = append(fs, fnc(sh.name, []string{"center", "axis", "outer", "width", "spacing", "turns", "layers", "layer_spacing"}, 6, 8, &runtime.Help{
			Signature: sh.name + "(center: position [m], axis: vector, outer: length, width: length, spacing: length, " + turns + "[, layers: whole number, layer_spacing: length]) -> path",
			Summary:   article(sh.shape) + " " + sh.shape + " planar spiral coil of flat trace (a printed circuit board coil), placed by its centre: the centre line of the trace, from the outer end inwards, turning right-handed about axis; outer is " + sh.outer + ". With layers, copies are stacked along −axis layer_spacing apart (copper to copper; the stack is centred on center), each the mirror image of the one above run the other way, joined by vias (straight pieces along the axis) at alternately the inner and the outer end, so the current turns the same way on every layer. The result is an ordinary path: fields, flux, mutual() and inductance() take it; trace_inductance() gives its inductance from the trace's width and thickness.",
			Method:    how + inner,
			Example:   sh.example,
			Reference: refSpiral,
		}, func(args []runtime.Value) (runtime.Value, error) {
			return spiralBuiltin(sh.name, sh.sides, args)
		}))
	}
	fs = append(fs, fnc("spiral_outer", []string{"inner", "width", "spacing", "turns"}, 4, 4, &runtime.Help{
		Signature: "spiral_outer(inner: length, width: length, spacing: length, turns) -> m",
		Summary:   "The outer size of a polygon spiral with the given inner size (free space inside the innermost turn): inner + 2·turns·width + 2·(turns − 1)·spacing, for whole turns; give it as outer to the spiral builtins.",
		Example:   "spiral_outer(10 mm, 0.5 mm, 0.3 mm, 8) as mm",
		Reference: refSpiral,
	}, func(args []runtime.Value) (runtime.Value, error) {
		r := readArgs("spiral_outer", args)
		in, w, s, n := r.positiveLength(0), r.positiveLength(1), r.positiveLength(2), r.number(3)
		if r.err != nil {
			return nil, r.err
		}
		if !(n >= 1) || n > maxTurns {
			return nil, errorf("spiral_outer: the number of turns must be from 1 to %d", maxTurns)
		}
		return runtime.Quantity{V: in + 2*n*w + 2*(n-1)*s, D: dimLength}, nil
	}))
	fs = append(fs, fncEnv("trace_inductance", []string{"path", "width", "thickness"}, 3, 3, &runtime.Help{
		Signature: "trace_inductance(path, width: length, thickness: length) -> H",
		Summary:   "Low-frequency self-inductance of a path of flat trace of rectangular section width × thickness (uniform current), such as a spiral from spiral_square, spiral_hexagon, spiral_octagon or spiral_circle; for an open path, the partial self-inductance. The mutual inductance of two coils is mutual(path1, path2), between their centre lines.",
		Method:    "Greenhouse's method: the self-inductance of each straight piece by the bar formula μ0/2π·l·[ln(2l/(w+t)) + 0.50049 + (w+t)/3l], of each arc by the GMD method (two filaments along the arc 0.2235(w+t) apart, by adaptive quadrature), plus the mutual inductance of every pair of pieces between their centre lines: the closed form for parallel straight pieces, zero for perpendicular ones, Neumann's integral by adaptive Gauss–Kronrod for the others (relative 1e-8). Against the closed-form fits of Mohan et al. (1999) the tests find square spirals (spacing up to 3 widths) within 10 %, 1.6–2.0 % on average, and hexagonal, octagonal and circular ones with spacing up to one width and fill ratio up to 0.4 within 10 %, 0.9–3.3 % on average; sparser or fuller polygon spirals come out up to 16 % above the fits, where the fits are outside their stated 2–3 % (the sum itself agrees with an independent round-wire Neumann integral within 0.2 %); pieces much shorter than w+t and traces closer than their width are outside the method. The work is estimated before it starts and refused beyond the work budget (:budget)",
		Example:   "coil = spiral_square([0, 0, 0] m, [0, 0, 1], 30 mm, 0.5 mm, 0.3 mm, 8)\ntrace_inductance(coil, 0.5 mm, 35 um)",
		Reference: refTrace,
	}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
		const fn = "trace_inductance"
		r := readArgs(fn, args)
		p, w, t := r.path(0), r.positiveLength(1), r.positiveLength(2)
		if r.err != nil {
			return nil, r.err
		}
		if err := charge(env, fn, traceCost(p)); err != nil {
			return nil, err
		}
		tol := control(env, fn, em.Tol{Rel: 1e-8})
		var est float64
		tol.Est = &est
		l, err := em.TraceInductance(p, w, t, tol)
		if err != nil {
			return nil, fieldErr(fn, err)
		}
		if env != nil {
			env.NumericalError(withFieldRounding(est, l)) // the quadratures' estimates and the closed forms' rounding
		}
		return runtime.Quantity{V: l, D: dimHenry}, nil
	}))
	return fs
}

func spiralBuiltin(fn string, sides int, args []runtime.Value) (runtime.Value, error) {
	r := readArgs(fn, args)
	c, ax := r.point(0), r.axis(1)
	outer, w, s := r.positiveLength(2), r.positiveLength(3), r.positiveLength(4)
	n := r.number(5)
	layers, h := 1, 0.0
	if len(args) == 7 {
		return nil, errorf("%s: give layer_spacing after layers", fn)
	}
	if len(args) > 6 {
		layers = r.count(6, 1, 64)
		h = r.positiveLength(7)
	}
	if r.err != nil {
		return nil, r.err
	}
	if n > maxTurns {
		return nil, errorf("%s: %g turns is more than the limit of %d", fn, n, maxTurns)
	}
	sp := em.Spiral{Center: c, Axis: ax, Sides: sides, Outer: outer, Width: w, Spacing: s, Turns: n, Layers: layers, LayerSpacing: h}
	p, err := sp.Path()
	if err != nil {
		return nil, geomErr(fn, err)
	}
	return pathResult(fn, p.Prims)
}

// Costs of trace_inductance per pair of pieces, in elementary evaluations:
// a closed form for parallel or perpendicular straight pieces; Neumann's
// integral for oblique ones (about 45 nodes of a segment's potential, more
// near joints); for arcs, a nested integral (about 150 × 150 kernel
// calls, more for the close concentric pairs of a spiral).
const (
	traceSegPair = 1
	traceObPair  = 300
	traceArcPair = 50_000
)

// traceCost is about the cost of trace_inductance(p): every pair of pieces
// once, shared among the cores. Straight pieces are grouped by direction
// (up to sign) so that parallel and perpendicular pairs, which take closed
// forms, are counted as such.
func traceCost(p em.Path) float64 {
	type dir struct{ x, y, z int64 }
	groups := map[dir]float64{}
	units := map[dir]r3.Vec{}
	var segs, arcs float64
	for _, q := range p.Prims {
		if q.Kind != em.Segment {
			arcs++
			continue
		}
		segs++
		u := r3.Unit(r3.Sub(q.B, q.A))
		if u.X < 0 || (u.X == 0 && (u.Y < 0 || (u.Y == 0 && u.Z < 0))) {
			u = r3.Scale(-1, u)
		}
		k := dir{int64(math.Round(u.X * 1e6)), int64(math.Round(u.Y * 1e6)), int64(math.Round(u.Z * 1e6))}
		groups[k]++
		units[k] = u
	}
	n := segs + arcs
	if n < 2 {
		return 1
	}
	cheap := 0.0 // parallel and perpendicular straight pairs
	for k, c := range groups {
		cheap += c * (c - 1) / 2
		for k2, c2 := range groups {
			if k != k2 && math.Abs(r3.Dot(units[k], units[k2])) < 1e-6 {
				cheap += c * c2 / 2
			}
		}
	}
	oblique := segs*(segs-1)/2 - cheap
	arcPairs := n*(n-1)/2 - segs*(segs-1)/2
	c := traceSegPair*cheap + traceObPair*oblique + traceArcPair*arcPairs
	return c / min(cores(), n)
}

func article(word string) string {
	if word[0] == 'o' {
		return "An"
	}
	return "A"
}
