package builtins

import (
	"fmt"
	"math"
	"strings"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

// Magnetic circuits: a core of relative permeability μr, mean path length
// l_c through the material and cross-section A_c, cut by an air gap l_g,
// wound with N turns. The lumped model (Hopkinson's law):
//
//	ℛ = l_c/(μ0 μr A_c) + l_g/(μ0 A_c F),  L = N²/ℛ,  Φ = N I/ℛ,  B = Φ/A_c
//
// (e.g. N. Mohan, T. Undeland and W. Robbins, Power Electronics, 3rd ed.,
// 2003, §30-4; from memory). F is the fringing factor
//
//	F = 1 + (l_g/√A_c)·ln(2G/l_g)
//
// with G the length of the window along the gapped leg (C. W. T. McLyman,
// Transformer and Inductor Design Handbook, 3rd ed., 2004, ch. 8; from
// memory). Here F enlarges the gap's area only; McLyman applies it to the
// whole; the two agree when the gap's reluctance dominates.

const refCores = "Hopkinson's law ℛ = l/(μ0μr A), L = N²/ℛ (e.g. Mohan, Undeland and Robbins, Power Electronics, 3rd ed., 2003, §30-4, from memory); fringing factor F = 1 + (l_g/√A_c)·ln(2G/l_g) (McLyman, Transformer and Inductor Design Handbook, 3rd ed., 2004, ch. 8, from memory)"

// core is a gapped core's geometry and material.
type core struct {
	lc, ac, lg, window, mur float64
}

// fringing is McLyman's factor, 1 without a window (or without a gap).
func (c core) fringing() float64 {
	if c.window == 0 || c.lg == 0 {
		return 1
	}
	return 1 + c.lg/math.Sqrt(c.ac)*math.Log(2*c.window/c.lg)
}

// reluctances of the material and of the gap, 1/H.
func (c core) reluctances() (rc, rg float64) {
	return c.lc / (em.Mu0 * c.mur * c.ac), c.lg / (em.Mu0 * c.ac * c.fringing())
}

func (c core) reluctance() float64 {
	rc, rg := c.reluctances()
	return rc + rg
}

// readCore reads path_length, area, gap, window from i on and mu_r at j.
func readCore(r *argReader, i, j int) core {
	c := core{lc: r.positiveLength(i), ac: r.positive(i+1, dimArea), lg: r.nonNegative(i+2, dimLength), window: r.nonNegative(i+3, dimLength)}
	c.mur = r.number(j)
	if r.err != nil {
		return c
	}
	if !(c.mur >= 1) || math.IsInf(c.mur, 0) {
		r.err = errorf("%s: the relative permeability must be 1 or more, not %s", r.fn, runtime.FormatNumber(c.mur, 6))
		return c
	}
	if c.window > 0 && c.lg > 0 && 2*c.window <= c.lg {
		r.err = errorf("%s: the window (%s) must be longer than half the gap (%s) for the fringing factor; give 0 m to leave fringing out", r.fn, fmtQ(c.window, dimLength, 6), fmtQ(c.lg, dimLength, 6))
	}
	return c
}

var dimReluctance = dimHenry.Pow(-1)

// CoreReport is the state of a gapped core at a current.
type CoreReport struct {
	c                 core
	turns, current    float64
	bsat              float64
	l, b, isat, w     float64
	rc, rg, f         float64
	assumptions       []string
	saturated, broken bool
}

func (r *CoreReport) Kind() string { return "a core report" }

func (r *CoreReport) Show(digits int) string {
	q := func(v float64, d runtime.Dim) string { return fmtQ(v, d, digits) }
	var b strings.Builder
	verdict := "below saturation"
	if r.saturated {
		verdict = "SATURATED: the lumped model no longer holds (μr falls, L drops)"
	}
	fmt.Fprintf(&b, "core: B %s of B_sat %s (%s), %s\n", q(r.b, dimTesla), q(r.bsat, dimTesla), runtime.FormatNumber(r.b/r.bsat, digits), verdict)
	fmt.Fprintf(&b, "  L %s, saturates at %s, energy ½LI² %s\n", q(r.l, dimHenry), q(r.isat, dimCurrent), q(r.w, dimJoule))
	fmt.Fprintf(&b, "  reluctance: core %s H^-1, gap %s H^-1, fringing factor %s\n", runtime.FormatNumber(r.rc, digits), runtime.FormatNumber(r.rg, digits), runtime.FormatNumber(r.f, digits))
	b.WriteString("  assumptions: " + strings.Join(r.assumptions, "; "))
	return b.String()
}

func (r *CoreReport) Summary(digits int) string {
	s := fmt.Sprintf("core: B %s of B_sat %s, L %s, saturates at %s", fmtQ(r.b, dimTesla, digits), fmtQ(r.bsat, dimTesla, digits), fmtQ(r.l, dimHenry, digits), fmtQ(r.isat, dimCurrent, digits))
	if r.saturated {
		s += ", SATURATED"
	}
	if r.broken {
		s += ", an assumption fails"
	}
	return s
}

// caution: the stored energy above the hazardous level of the transient
// builtins (storedEnergyThreshold).
func (r *CoreReport) caution() string {
	if r.w > storedEnergyThreshold {
		return fmt.Sprintf("caution: the core stores %s at this current (above %g J); breaking the current makes a high voltage across the winding. %s", fmtQ(r.w, dimJoule, 4), storedEnergyThreshold, deferText)
	}
	return ""
}

// Rules of thumb for the lumped model (common practice): the gap short
// beside the pole face, the material much more permeable than air, the path
// long beside the cross-section.
const (
	gapToPole    = 0.1 // l_g/√A_c below which fringing is a correction
	minMur       = 100 // μr above which the flux stays in the core
	pathToSquare = 3   // l_c/√A_c above which the path is a "circuit"
)

func (c core) assumptions() (out []string, broken bool) {
	check := func(ok bool, yes, no string) {
		if ok {
			out = append(out, yes)
		} else {
			out = append(out, "NOT "+no)
			broken = true
		}
	}
	side := math.Sqrt(c.ac)
	check(c.mur >= minMur, fmt.Sprintf("μr ≫ 1 (%g ≥ %d)", c.mur, minMur), fmt.Sprintf("μr ≫ 1 (%g < %d): flux leaks out of the core", c.mur, minMur))
	check(c.lg <= gapToPole*side, fmt.Sprintf("gap ≪ pole size (l_g/√A_c = %.3g ≤ %g)", c.lg/side, gapToPole), fmt.Sprintf("gap ≪ pole size (l_g/√A_c = %.3g > %g): fringing is more than a correction", c.lg/side, gapToPole))
	check(c.lc >= pathToSquare*side, fmt.Sprintf("lumped path (l_c/√A_c = %.3g ≥ %d)", c.lc/side, pathToSquare), fmt.Sprintf("lumped path (l_c/√A_c = %.3g < %d): the core is too stubby for one mean path", c.lc/side, pathToSquare))
	return out, broken
}

func coreFuncs() []*runtime.Func {
	const geom = "path_length: m (the mean path through the core material, gap not counted), area: m^2 (the core's cross-section), gap: m (0 m for none), window: m (the window's length along the gapped leg, for the fringing factor; 0 m to leave fringing out)"
	return []*runtime.Func{
		fnc("fringing_factor", []string{"gap", "area", "window"}, 3, 3, &runtime.Help{
			Signature: "fringing_factor(gap: m, area: m^2, window: m) -> dimensionless",
			Summary:   "McLyman's fringing factor F = 1 + (l_g/√A_c)·ln(2G/l_g) of an air gap l_g in a core leg of cross-section A_c, with a window of length G along the leg: the gap behaves as if its area were F·A_c. A correction for gaps short beside the pole face (l_g ≪ √A_c).",
			Example:   "fringing_factor(1 mm, 1 cm^2, 20 mm)",
			Reference: refCores,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("fringing_factor", args)
			lg, ac, g := r.positiveLength(0), r.positive(1, dimArea), r.positiveLength(2)
			if r.err != nil {
				return nil, r.err
			}
			if 2*g <= lg {
				return nil, errorf("fringing_factor: the window (%s) must be longer than half the gap (%s)", fmtQ(g, dimLength, 6), fmtQ(lg, dimLength, 6))
			}
			return runtime.Quantity{V: core{lg: lg, ac: ac, window: g}.fringing()}, nil
		}),
		fnc("core_reluctance", []string{"path_length", "area", "gap", "window", "mu_r"}, 5, 5, &runtime.Help{
			Signature: "core_reluctance(" + geom + ", mu_r: dimensionless) -> H^-1 (shown as A/Wb, the same unit)",
			Summary:   "Reluctance of a gapped core: l_c/(μ0μr A_c) + l_g/(μ0 A_c F), F the fringing factor (1 when the window is 0 m). Lumped model: one mean path, μr ≫ 1, gap ≪ pole size (core_check says which hold).",
			Example:   "core_reluctance(80 mm, 1 cm^2, 1 mm, 20 mm, 2000) as H^-1",
			Reference: refCores,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("core_reluctance", args)
			c := readCore(r, 0, 4)
			if r.err != nil {
				return nil, r.err
			}
			return runtime.Quantity{V: c.reluctance(), D: dimReluctance}, nil
		}),
		fnc("core_inductance", []string{"path_length", "area", "gap", "window", "turns", "mu_r"}, 6, 6, &runtime.Help{
			Signature: "core_inductance(" + geom + ", turns: dimensionless, mu_r: dimensionless) -> H",
			Summary:   "Inductance N²/ℛ of a winding on a gapped core (see core_reluctance), below saturation.",
			Example:   "core_inductance(80 mm, 1 cm^2, 1 mm, 20 mm, 100, 2000)",
			Reference: refCores,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("core_inductance", args)
			c := readCore(r, 0, 5)
			n := r.positive(4, runtime.Dim{})
			if r.err != nil {
				return nil, r.err
			}
			return runtime.Quantity{V: n * n / c.reluctance(), D: dimHenry}, nil
		}),
		fnc("core_flux_density", []string{"path_length", "area", "gap", "window", "turns", "current", "mu_r"}, 7, 7, &runtime.Help{
			Signature: "core_flux_density(" + geom + ", turns: dimensionless, current: A, mu_r: dimensionless) -> T",
			Summary:   "Flux density B = N·I/(ℛ·A_c) in the core material of a gapped core at a current (instantaneous or peak in, the same out), below saturation: compare with the material's B_sat, or use core_check.",
			Example:   "core_flux_density(80 mm, 1 cm^2, 1 mm, 20 mm, 100, 2 A, 2000)",
			Reference: refCores,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("core_flux_density", args)
			c := readCore(r, 0, 6)
			n, i := r.positive(4, runtime.Dim{}), r.ofDim(5, dimCurrent)
			if r.err != nil {
				return nil, r.err
			}
			return runtime.Quantity{V: n * i / (c.reluctance() * c.ac), D: dimTesla}, nil
		}),
		fnc("core_check", []string{"path_length", "area", "gap", "window", "turns", "current", "mu_r", "B_sat"}, 8, 8, &runtime.Help{
			Signature: "core_check(" + geom + ", turns: dimensionless, current: A, mu_r: dimensionless, B_sat: T) -> core report",
			Summary:   "A gapped core at a current, checked against the material's saturation flux density: B in the core and its ratio to B_sat, L, the current at which the core saturates, the energy ½LI², the reluctances and fringing factor, and which assumptions of the lumped model hold (μr ≥ 100, l_g ≤ 0.1·√A_c, l_c ≥ 3·√A_c: rules of thumb, common practice). A stored energy above 20 J carries a caution.",
			Example:   "core_check(80 mm, 1 cm^2, 1 mm, 20 mm, 100, 2 A, 2000, 0.3 T)",
			Reference: refCores,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("core_check", args)
			c := readCore(r, 0, 6)
			n, i := r.positive(4, runtime.Dim{}), r.ofDim(5, dimCurrent)
			bsat := r.positive(7, dimTesla)
			if r.err != nil {
				return nil, r.err
			}
			rc, rg := c.reluctances()
			rel := rc + rg
			rep := &CoreReport{c: c, turns: n, current: i, bsat: bsat, rc: rc, rg: rg, f: c.fringing()}
			rep.l = n * n / rel
			rep.b = n * i / (rel * c.ac)
			rep.isat = bsat * c.ac * rel / n
			rep.w = rep.l * i * i / 2
			rep.saturated = math.Abs(rep.b) >= bsat
			rep.assumptions, rep.broken = c.assumptions()
			return rep, nil
		}),
	}
}
