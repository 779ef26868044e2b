package builtins

import (
	"fmt"
	"math"

	"loopwise/builtins/circuit"
	"loopwise/runtime"
)

// The two-coil inductive link in closed form: quality factors, tuning
// capacitors, reflected impedance, efficiency and its maximum. Each is
// derived in builtins/circuit/link.go and checked there against the
// general circuit solver.

const refLink = "M. Zargham and P. G. Gulak, IEEE Trans. Biomedical Circuits and Systems 6(3), 2012, and M. Kiani and M. Ghovanloo, IEEE Trans. Circuits and Systems I 59(9), 2012 (from memory); each formula derived from Kirchhoff's laws in builtins/circuit/link.go"

// CoilLink is two coupled coils at one frequency.
type CoilLink struct{ l circuit.Link }

func (c *CoilLink) Kind() string { return "a coil link" }

func (c *CoilLink) Summary(digits int) string {
	eta, _ := c.l.MaxEfficiency()
	u2 := c.l.K * c.l.K * c.l.Q1() * c.l.Q2()
	return fmt.Sprintf("coil link at %s: Q1 = %s, Q2 = %s, k = %s, k²·Q1·Q2 = %s, best efficiency %s",
		runtime.Format(runtime.Quantity{V: c.l.Omega / (2 * math.Pi), D: dimHertz, Cyc: true}, digits),
		runtime.FormatNumber(c.l.Q1(), digits), runtime.FormatNumber(c.l.Q2(), digits),
		runtime.FormatNumber(c.l.K, digits), runtime.FormatNumber(u2, digits), runtime.FormatNumber(eta, digits))
}

func (c *CoilLink) Show(digits int) string {
	s := c.Summary(digits)
	if rl, c2, err := c.l.OptimalLoadSS(); err == nil {
		s += fmt.Sprintf("\n  series load for it: %s with %s in series", runtime.Format(runtime.Quantity{V: rl, D: dimOhm}, digits), runtime.Format(runtime.Quantity{V: c2, D: dimFarad}, digits))
	}
	if rl, c2, err := c.l.OptimalLoadSP(); err == nil {
		s += fmt.Sprintf("\n  parallel load for it: %s with %s across it", runtime.Format(runtime.Quantity{V: rl, D: dimOhm}, digits), runtime.Format(runtime.Quantity{V: c2, D: dimFarad}, digits))
	}
	return s
}

func linkArg(fn string, args []runtime.Value, i int) (*CoilLink, error) {
	l, ok := args[i].(*CoilLink)
	if !ok {
		return nil, errorf("%s: the %s argument must be a coil link (from coil_link(L1, R1, L2, R2, k, f)), not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return l, nil
}

// topologyArg reads "series" or "parallel": how the secondary's tuning
// capacitor meets the load.
func topologyArg(fn string, args []runtime.Value, i int) (bool, error) {
	s, ok := args[i].(string)
	if !ok || (s != "series" && s != "parallel") {
		return false, errorf("%s: the %s argument says how the secondary capacitor meets the load: \"series\" or \"parallel\", not %s", fn, ordinal(i), describeArg(args[i]))
	}
	return s == "parallel", nil
}

func linkFuncs() []*runtime.Func {
	linkEx := "lk = coil_link(24 uH, 0.12 ohm, 11 uH, 0.09 ohm, 0.3, 140 kHz)\n"
	return []*runtime.Func{
		fnc("quality_factor", []string{"L", "R", "f"}, 3, 3, &runtime.Help{
			Signature: "quality_factor(L: H, R: ohm, f: Hz) -> plain number",
			Summary:   "Q = ωL/R of a coil with series resistance R at frequency f (for Q from a coil's geometry and wire, see coil_q).",
			Example:   "quality_factor(24 uH, 0.12 ohm, 140 kHz)",
			Reference: "definition of the quality factor of a series RL branch",
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("quality_factor", args)
			l, res := r.positive(0, dimHenry), r.positive(1, dimOhm)
			f, err := frequencyArg("quality_factor", args, 2)
			r.fail(err)
			if r.err != nil {
				return nil, r.err
			}
			return runtime.Num(circuit.QualityFactor(2*math.Pi*f, l, res)), nil
		}),
		fnc("series_tuning", []string{"L", "f"}, 2, 2, &runtime.Help{
			Signature: "series_tuning(L: H, f: Hz) -> F",
			Summary:   "The capacitor in series with L that resonates at f: C = 1/(ω²L).",
			Example:   "series_tuning(24 uH, 140 kHz)",
			Reference: "series resonance ω²LC = 1",
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("series_tuning", args)
			l := r.positive(0, dimHenry)
			f, err := frequencyArg("series_tuning", args, 1)
			r.fail(err)
			if r.err != nil {
				return nil, r.err
			}
			return runtime.Quantity{V: circuit.SeriesTuning(2*math.Pi*f, l), D: dimFarad}, nil
		}),
		fnc("parallel_tuning", []string{"L", "R", "f"}, 3, 3, &runtime.Help{
			Signature: "parallel_tuning(L: H, R: ohm (the coil's series resistance), f: Hz) -> F",
			Summary:   "The capacitor across a coil (L with series R) that makes the pair's admittance real at f: C = L/(R² + ω²L²), the series value times Q²/(1 + Q²).",
			Example:   "parallel_tuning(24 uH, 0.12 ohm, 140 kHz)",
			Reference: "Im(jωC + 1/(R + jωL)) = 0; derived in builtins/circuit/link.go",
		}, func(args []runtime.Value) (runtime.Value, error) {
			r := readArgs("parallel_tuning", args)
			l, res := r.positive(0, dimHenry), r.nonNegative(1, dimOhm)
			f, err := frequencyArg("parallel_tuning", args, 2)
			r.fail(err)
			if r.err != nil {
				return nil, r.err
			}
			return runtime.Quantity{V: circuit.ParallelTuning(2*math.Pi*f, l, res), D: dimFarad}, nil
		}),
		fnc("reflected_impedance", []string{"M", "Z2", "f"}, 3, 3, &runtime.Help{
			Signature: "reflected_impedance(M: H, Z2: ohm (real or complex, the whole secondary loop), f: Hz) -> complex ohm",
			Summary:   "The impedance a secondary loop of total impedance Z2 (coil, capacitor, load) adds in series with the primary through mutual inductance M: ω²M²/Z2.",
			Example:   "reflected_impedance(4.87 uH, 0.09 ohm + 10 ohm, 140 kHz)",
			Reference: refLink,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "reflected_impedance"
			m, err := ofDim(fn, args, 0, dimHenry)
			if err != nil {
				return nil, err
			}
			z2, ok := runtime.AsComplex(args[1])
			if !ok || z2.D != dimOhm {
				return nil, errorf("%s: the second argument is the secondary loop's impedance in ohm (real or complex), not %s", fn, runtime.TypeName(args[1]))
			}
			if z2.V == 0 {
				return nil, errorf("%s: a secondary loop of zero impedance reflects an infinite impedance; give its resistance", fn)
			}
			f, err := frequencyArg(fn, args, 2)
			if err != nil {
				return nil, err
			}
			return runtime.Complex{V: circuit.ReflectedImpedance(2*math.Pi*f, m, z2.V), D: dimOhm}, nil
		}),
		fnc("coil_link", []string{"L1", "R1", "L2", "R2", "k", "f"}, 6, 6, &runtime.Help{
			Signature: "coil_link(L1: H, R1: ohm, L2: H, R2: ohm, k: plain number, f: Hz) -> coil link",
			Summary:   "Two coupled coils (inductance and series resistance each, coupling coefficient k) at frequency f; shows Q1, Q2, k²·Q1·Q2, the best efficiency any load can reach, and the series and parallel loads that reach it. R1 may include the source's resistance.",
			Method:    "closed forms; the best efficiency k²Q1Q2/(1 + √(1 + k²Q1Q2))²",
			Example:   linkEx + "lk",
			Reference: refLink,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "coil_link"
			r := readArgs(fn, args)
			l := circuit.Link{L1: r.positive(0, dimHenry), R1: r.positive(1, dimOhm), L2: r.positive(2, dimHenry), R2: r.positive(3, dimOhm)}
			if r.err != nil {
				return nil, r.err
			}
			k, err := number(fn, args, 4)
			if err != nil {
				return nil, err
			}
			f, err := frequencyArg(fn, args, 5)
			if err != nil {
				return nil, err
			}
			l.K, l.Omega = k, 2*math.Pi*f
			if err := l.Check(); err != nil {
				return nil, errorf("%s: %v", fn, err)
			}
			return &CoilLink{l}, nil
		}),
		fnc("link_efficiency", []string{"link", "R_load", "C2", "how"}, 4, 4, &runtime.Help{
			Signature: "link_efficiency(link, R_load: ohm, C2: F, how: \"series\" or \"parallel\") -> plain number",
			Summary:   "The power into R_load over the power into the primary's terminals, with the secondary's capacitor C2 in series with the load or across it (the primary's own tuning changes the current, not the efficiency).",
			Example:   linkEx + "link_efficiency(lk, 10 ohm, series_tuning(11 uH, 140 kHz), \"series\")",
			Reference: refLink,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "link_efficiency"
			lk, err := linkArg(fn, args, 0)
			if err != nil {
				return nil, err
			}
			r := readArgs(fn, args)
			rl, c2 := r.positive(1, dimOhm), r.positive(2, dimFarad)
			if r.err != nil {
				return nil, r.err
			}
			par, err := topologyArg(fn, args, 3)
			if err != nil {
				return nil, err
			}
			var eta float64
			if par {
				eta, err = lk.l.EfficiencySP(rl, c2)
			} else {
				eta, err = lk.l.EfficiencySS(rl, c2)
			}
			if err != nil {
				return nil, errorf("%s: %v", fn, err)
			}
			return runtime.Num(eta), nil
		}),
		fnc("max_link_efficiency", []string{"link"}, 1, 1, &runtime.Help{
			Signature: "max_link_efficiency(link) -> plain number",
			Summary:   "The largest efficiency any passive load can reach with these coils: k²Q1Q2/(1 + √(1 + k²Q1Q2))².",
			Example:   linkEx + "max_link_efficiency(lk)",
			Reference: refLink,
		}, func(args []runtime.Value) (runtime.Value, error) {
			lk, err := linkArg("max_link_efficiency", args, 0)
			if err != nil {
				return nil, err
			}
			eta, err := lk.l.MaxEfficiency()
			if err != nil {
				return nil, errorf("max_link_efficiency: %v", err)
			}
			return runtime.Num(eta), nil
		}),
		optimalFunc("optimal_load", "R_load: ohm", "The load resistance that reaches max_link_efficiency: R2·√(1 + k²Q1Q2) in series with its capacitor, or ((R2·s)² + ω²L2²)/(R2·s) with s = √(1 + k²Q1Q2) with the capacitor across it.", linkEx, func(rl, c2 float64) runtime.Value {
			return runtime.Quantity{V: rl, D: dimOhm}
		}),
		optimalFunc("optimal_c2", "C2: F", "The secondary capacitor that goes with optimal_load: 1/(ω²L2) in series, L2/((R2·s)² + ω²L2²) across the load.", linkEx, func(rl, c2 float64) runtime.Value {
			return runtime.Quantity{V: c2, D: dimFarad}
		}),
	}
}

func optimalFunc(fn, result, summary, ex string, pick func(rl, c2 float64) runtime.Value) *runtime.Func {
	return fnc(fn, []string{"link", "how"}, 2, 2, &runtime.Help{
		Signature: fn + "(link, how: \"series\" or \"parallel\") -> " + result,
		Summary:   summary,
		Example:   ex + fn + "(lk, \"parallel\")",
		Reference: refLink,
	}, func(args []runtime.Value) (runtime.Value, error) {
		lk, err := linkArg(fn, args, 0)
		if err != nil {
			return nil, err
		}
		par, err := topologyArg(fn, args, 1)
		if err != nil {
			return nil, err
		}
		var rl, c2 float64
		if par {
			rl, c2, err = lk.l.OptimalLoadSP()
		} else {
			rl, c2, err = lk.l.OptimalLoadSS()
		}
		if err != nil {
			return nil, errorf("%s: %v", fn, err)
		}
		return pick(rl, c2), nil
	})
}
