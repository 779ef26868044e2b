package builtins

import (
	"math"
	"strings"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/lang"
	"loopwise/runtime"
)

// Multilayer windings: the exact wire path of a coil wound in layers
// (winding), and the inductance of thick coils from their rectangular
// cross-section (thick_coil_inductance, thick_coil_mutual; the numerics are
// in builtins/em/thick.go).

const (
	refThick = "Maxwell's formula for coaxial circles integrated over the rectangular sections (Maxwell, A Treatise on Electricity and Magnetism, 1873, §701), the singular part by Maxwell's geometric mean distance of a rectangle (ibid. §692; Rosa & Grover, Bull. Bureau of Standards 8, 1912); checked against the Brooks coil (Brooks & Turner, 1912), Wheeler's multilayer formula (Proc. IRE 16, 1928), Nagaoka's current sheet and sums over the exact wire path"
	// thickEvals is the work charged for one thick-coil integral: about
	// 1e5 evaluations of Maxwell's formula (20 elementary evaluations
	// each) for the self-inductance; pathological aspect ratios take a few
	// times more.
	thickEvals = 3e6 // with the lower-order rule of the error estimate
	// maxWindingLayers bounds the layers of one winding.
	maxWindingLayers = 10_000
)

func windingFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("winding", []string{"center", "axis", "inner_radius", "wire_diameter", "turns_per_layer", "layers", "pitch", "layer_pitch", "options"}, 6, 10, &runtime.Help{
			Signature: "winding(center: position [m], axis: vector, inner_radius: length, wire_diameter: length, turns_per_layer: whole number, layers: whole number[, pitch: length[, layer_pitch: length]][, \"rings\"][, \"left\"]) -> path",
			Summary: "A multilayer coil placed by its centre: layers of turns_per_layer turns on a former of inner_radius, wire_diameter over the insulation. " +
				"Turns lie pitch apart along the axis and layers layer_pitch apart in radius (both default to wire_diameter, close wound; a larger layer_pitch adds insulation between layers). " +
				"The winding occupies the section from inner_radius to inner_radius + layers·layer_pitch over the length turns_per_layer·pitch, each wire at the middle of its share, so its section is the one thick_coil_inductance takes. " +
				"Each layer is a helix over the whole length, the next wound back over it in the same sense of rotation, joined by a short radial piece (one path, without leads); \"rings\" gives closed coaxial rings instead. The current circulates right-handed about axis, or left-handed with \"left\".",
			Method:    "exact helices, circles and straight joins (see helix and rings)",
			Example:   "w = winding([0, 0, 0] m, [0, 0, 1], 10 mm, 0.5 mm, 20, 4)\nlength(w) as m",
			Reference: refGeom,
		}, windingBuiltin),
		fncEnv("thick_coil_inductance", []string{"inner_radius", "outer_radius", "length", "turns"}, 4, 4, &runtime.Help{
			Signature: "thick_coil_inductance(inner_radius: length, outer_radius: length, length: length, turns) -> H",
			Summary:   "Low-frequency self-inductance of an air-core coil of turns spread evenly over a rectangular cross-section (inner_radius to outer_radius, length): a multilayer coil as a uniform current density. A coil of round wire has a little more (the wire's own section; Rosa's correction, of order μ0·r·N·(ln(pitch/bare diameter) + 0.155), from memory).",
			Method:    "Maxwell's formula for coaxial circles integrated over the section twice by Gauss–Legendre product rules on panels graded towards the coincident circles; the logarithmic singular part in closed form by Maxwell's geometric mean distance of the rectangle. The tests find it within 1e-9 of a rule of twice the order and depth (5e-9 for a section 800 times longer than thick), within 1e-5 of the Brooks coil's published constant and within 0.1% of Nagaoka's current sheet for a thin layer; the result carries its numerical error, estimated as the change from a rule of two points fewer per panel (the tests find it above the actual error in every case, by 10 to 1000 times); about 7 ms",
			Example:   "thick_coil_inductance(10 mm, 20 mm, 10 mm, 500)",
			Reference: refThick,
		}, thickInductanceBuiltin),
		fncEnv("thick_coil_mutual", []string{"inner_radius1", "outer_radius1", "length1", "turns1", "inner_radius2", "outer_radius2", "length2", "turns2", "distance"}, 9, 9, &runtime.Help{
			Signature: "thick_coil_mutual(inner_radius1: length, outer_radius1: length, length1: length, turns1, inner_radius2: length, outer_radius2: length, length2: length, turns2, distance: length) -> H",
			Summary:   "Mutual inductance of two coaxial air-core coils, each of turns spread evenly over a rectangular cross-section (as thick_coil_inductance), their centres distance apart along the common axis. Both are taken wound in the same sense (reverse one for a negative M). Windings that overlap are refused; nested or stacked windings may touch.",
			Method:    "Maxwell's formula for coaxial circles integrated over both sections by Gauss–Legendre product rules on panels graded towards where the sections come closest (the radial ranges cut at each other's ends); the tests find it within 1e-9 of a rule of twice the order and depth, and within 1e-6 of the sum over the exact rings of two windings extrapolated to fine wire; the result carries its numerical error, estimated as for thick_coil_inductance",
			Example:   "thick_coil_mutual(10 mm, 15 mm, 20 mm, 200, 16 mm, 20 mm, 10 mm, 100, 5 mm)",
			Reference: refThick,
		}, thickMutualBuiltin),
	}
}

func windingBuiltin(args []runtime.Value) (runtime.Value, error) {
	const fn = "winding"
	// trailing text options
	rings, left := false, false
	for len(args) > 6 {
		s, ok := args[len(args)-1].(string)
		if !ok {
			break
		}
		switch strings.ToLower(strings.TrimSpace(s)) {
		case "rings":
			if rings {
				return nil, errorf("%s: the option \"rings\" is given twice", fn)
			}
			rings = true
		case "left":
			if left {
				return nil, errorf("%s: the option \"left\" is given twice", fn)
			}
			left = true
		default:
			return nil, errorf("%s: unknown option %q; the options are \"rings\" and \"left\"", fn, lang.Abbrev(s, 40))
		}
		args = args[:len(args)-1]
	}
	if len(args) > 8 {
		return nil, errorf("%s takes center, axis, inner_radius, wire_diameter, turns_per_layer, layers, then optionally pitch and layer_pitch, then the options \"rings\" and \"left\"", fn)
	}
	r := readArgs(fn, args)
	c, ax, rin, d := r.point(0), r.axis(1), r.positiveLength(2), r.positiveLength(3)
	nt, nl := r.count(4, 1, maxTurns), r.count(5, 1, maxWindingLayers)
	pitch, lpitch := d, d
	if len(args) > 6 {
		pitch = r.positiveLength(6)
	}
	if len(args) > 7 {
		lpitch = r.positiveLength(7)
	}
	if r.err != nil {
		return nil, r.err
	}
	switch {
	case pitch < d*(1-1e-12):
		return nil, errorf("%s: the pitch (%s) is less than the wire diameter (%s); the turns would overlap", fn, showLength(pitch), showLength(d))
	case lpitch < d*(1-1e-12):
		return nil, errorf("%s: the layer pitch (%s) is less than the wire diameter (%s); the layers would overlap", fn, showLength(lpitch), showLength(d))
	case nt*nl > maxTurns:
		return nil, errorf("%s: %d turns in all is more than the limit of %d", fn, nt*nl, maxTurns)
	}
	pieces := 2*nl - 1
	if rings {
		pieces = nt * nl
	}
	if err := checkPrims(fn, pieces); err != nil {
		return nil, err
	}
	n := r3.Unit(ax)
	circ := n // the sense of circulation
	if left {
		circ = r3.Scale(-1, n)
	}
	length := float64(nt) * pitch
	radius := func(k int) float64 { return rin + (float64(k)+0.5)*lpitch }
	at := func(z float64) em.Vec { return r3.Add(c, r3.Scale(z, n)) }
	prims := make([]em.Prim, 0, pieces)
	if rings {
		for k := 0; k < nl; k++ {
			for j := 0; j < nt; j++ {
				p, err := em.NewCircle(at(-length/2+(float64(j)+0.5)*pitch), circ, radius(k))
				if err != nil {
					return nil, geomErr(fn, err)
				}
				prims = append(prims, p)
			}
		}
		return pathResult(fn, prims)
	}
	for k := 0; k < nl; k++ {
		// even layers wind from −length/2 to +length/2, odd layers back;
		// every layer turns the same way about the axis
		up := k%2 == 0
		start := -length / 2
		if !up {
			start = length / 2
		}
		h, err := em.NewHelix(at(start), circ, radius(k), length, float64(nt))
		if err != nil {
			return nil, geomErr(fn, err)
		}
		// NewHelix advances along circ; the layer advances along +n
		// when it goes up
		if up != (circ == n) {
			h.Pitch = -h.Pitch
		}
		if k > 0 {
			j, err := em.NewSegment(prims[len(prims)-1].End(), h.Start())
			if err != nil {
				return nil, geomErr(fn, err)
			}
			prims = append(prims, j)
		}
		prims = append(prims, h)
	}
	return pathResult(fn, prims)
}

func showLength(x float64) string {
	return runtime.Format(runtime.Quantity{V: x, D: dimLength}, 6)
}

// thickSection reads inner radius, outer radius, length and turns from
// args[i:i+4]; suffix names the coil in messages.
func thickSection(fn string, args []runtime.Value, i int, suffix string) (rin, rout, l, n float64, err error) {
	var ls [3]float64
	for k, name := range []string{"inner radius", "outer radius", "length"} {
		if ls[k], err = fmPositive(fn, name+suffix, args, i+k, dimLength); err != nil {
			return 0, 0, 0, 0, err
		}
	}
	rin, rout, l = ls[0], ls[1], ls[2]
	if rout <= rin {
		return 0, 0, 0, 0, errorf("%s: the outer radius%s (%s) must be larger than the inner radius (%s)", fn, suffix, showLength(rout), showLength(rin))
	}
	n, err = fmTurns(fn, args, i+3)
	return rin, rout, l, n, err
}

func thickInductanceBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "thick_coil_inductance"
	rin, rout, l, n, err := thickSection(fn, args, 0, "")
	if err != nil {
		return nil, err
	}
	if err := charge(env, fn, thickEvals); err != nil {
		return nil, err
	}
	v, est, err := em.ThickCoilSelfEst(rin, rout, l)
	if err != nil {
		return nil, errorf("%s: %v", fn, err)
	}
	if env != nil {
		env.NumericalError(est * n * n)
	}
	return runtime.Quantity{V: v * n * n, D: dimHenry}, nil
}

func thickMutualBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "thick_coil_mutual"
	a1, b1, l1, n1, err := thickSection(fn, args, 0, " of coil 1")
	if err != nil {
		return nil, err
	}
	a2, b2, l2, n2, err := thickSection(fn, args, 4, " of coil 2")
	if err != nil {
		return nil, err
	}
	r := readArgs(fn, args)
	d := math.Abs(r.ofDim(8, dimLength))
	if r.err != nil {
		return nil, r.err
	}
	if math.IsInf(d, 0) {
		return nil, errorf("%s: the distance must be finite", fn)
	}
	if err := charge(env, fn, 4*thickEvals); err != nil {
		return nil, err
	}
	m, est, err := em.ThickCoilMutualEst(em.Section{Rin: a1, Rout: b1, Z0: -l1 / 2, Z1: l1 / 2}, em.Section{Rin: a2, Rout: b2, Z0: d - l2/2, Z1: d + l2/2})
	if err != nil {
		return nil, errorf("%s: %v", fn, err)
	}
	if env != nil {
		env.NumericalError(est * n1 * n2)
	}
	return runtime.Quantity{V: m * n1 * n2, D: dimHenry}, nil
}
