package builtins

import (
	"math"

	"loopwise/builtins/em"
	"loopwise/builtins/wire"
	"loopwise/runtime"
)

// Wire losses at alternating current: the skin effect of an isolated round
// wire (exact, with Kelvin functions), the proximity effect of a multilayer
// winding (Dowell), and a coil's quality factor from its computed
// inductance. Numerics in builtins/wire; tests in wirelosses_test.go and
// builtins/wire.

const (
	refSkinWire = "exact internal impedance of a round wire, Z = (τa/2) I0(τa)/I1(τa) with ber, bei (Ramo, Whinnery and Van Duzer, Fields and Waves in Communication Electronics, 3rd ed., 1994, §5.6); Kelvin functions by their power series and asymptotic expansion (Abramowitz and Stegun, Handbook of Mathematical Functions, 1964, §9.9–9.10)"
	refDowell   = "P. L. Dowell, \"Effects of eddy currents in transformer windings\", Proc. IEE 113(8), 1966; round wire as the square of equal area, porosity as written by W. G. Hurley, E. Gath and J. G. Breslin, IEEE Trans. Power Electron. 15(2), 2000 (from memory)"
	// roomTemp is the temperature a named material is taken at when none
	// is given: 20 °C, the reference temperature of the resistivity table.
	roomTemp = celsius0 + 20
	// maxLayers bounds dowell_factor's layer count (a sanity limit, far
	// beyond any practical winding).
	maxLayers = 10_000
)

// conductor reads the conductor of a wire-loss builtin: a material's name
// at argument mi with an optional temperature at mi+1 (20 °C when absent),
// or a resistivity in ohm*m (then no temperature).
func conductor(fn string, args []runtime.Value, mi int) (float64, error) {
	if q, ok := args[mi].(runtime.Quantity); ok {
		if q.D != dimOhmMetre {
			return 0, errorf("%s: the %s argument must be a material's name (\"copper\", \"aluminium\") or a resistivity in ohm*m, not %s", fn, ordinal(mi), q.D.Describe())
		}
		if !(q.V > 0) || math.IsInf(q.V, 0) {
			return 0, errorf("%s: the resistivity (%s argument) must be positive, not %s", fn, ordinal(mi), runtime.Format(q, 6))
		}
		if len(args) > mi+1 {
			return 0, errorf("%s: a temperature applies to a material's name only; a resistivity is taken as given (write resistivity(\"copper\", 70 °C) for copper at 70 °C)", fn)
		}
		return q.V, nil
	}
	if len(args) > mi+1 {
		return resistivityOf(fn, args, mi, mi+1)
	}
	withT := append(append([]runtime.Value(nil), args...), runtime.Quantity{V: roomTemp, D: dimKelvin})
	return resistivityOf(fn, withT, mi, mi+1)
}

// skinX returns a/δ for a wire of diameter d at frequency f in a
// non-magnetic conductor of resistivity rho: δ = √(ρ/(π f μ0)).
func skinX(d, f, rho float64) float64 {
	if f == 0 {
		return 0
	}
	return d / 2 / math.Sqrt(rho/(math.Pi*f*VacuumPermeability))
}

// dowellArgs reads the layers, wire diameter and pitch at li, di, pi.
func dowellArgs(fn string, args []runtime.Value, li, di, pi int) (m, d, p float64, err error) {
	if d, err = fmPositive(fn, "wire diameter", args, di, dimLength); err != nil {
		return 0, 0, 0, err
	}
	n, err := count(fn, args, li, 1, maxLayers)
	if err != nil {
		return 0, 0, 0, err
	}
	if p, err = fmPositive(fn, "pitch", args, pi, dimLength); err != nil {
		return 0, 0, 0, err
	}
	if p < d*(1-1e-12) { // the slack forgives rounding of decimal inputs
		return 0, 0, 0, errorf("%s: the pitch (%s, centre to centre along a layer) is less than the wire diameter (%s); the turns would overlap",
			fn, runtime.Format(runtime.Quantity{V: p, D: dimLength}, 6), runtime.Format(runtime.Quantity{V: d, D: dimLength}, 6))
	}
	return float64(n), d, p, nil
}

// coilQ computes ωL/R for a coil of wire diameter d along path p at
// frequency f; factor returns R_ac/R_dc for the skin depth δ.
func coilQ(env runtime.Env, fn string, p em.Path, d, f, rho float64, factor func(delta float64) float64) (runtime.Value, error) {
	if err := charge(env, fn, inductanceCost(p)); err != nil {
		return nil, err
	}
	tol := control(env, fn, em.DefaultTol)
	var est float64
	tol.Est = &est
	l, err := em.SelfInductance(p, d/2, tol)
	if err != nil {
		return nil, fieldErr(fn, err)
	}
	length := p.Length()
	// inductance() includes the internal inductance at DC, μ0ℓ/8π; at f
	// the skin effect lowers it by the exact round-wire ratio
	delta := math.Sqrt(rho / (math.Pi * f * VacuumPermeability))
	lInt := VacuumPermeability * length / (8 * math.Pi)
	l -= lInt * (1 - wire.InductanceRatio(d/2/delta))
	rdc := rho * length / (math.Pi * d * d / 4)
	// Q is proportional to L: L's bound carries over in proportion
	q := 2 * math.Pi * f * l / (rdc * factor(delta))
	reportNumErr(env, math.Abs(q)*withFieldRounding(est, l)/math.Abs(l))
	return runtime.Num(q), nil
}

func wireLossFuncs() []*runtime.Func {
	const material = `material: "copper", "aluminium" or ohm*m[, temperature: K or °C]`
	return []*runtime.Func{
		fnc("ac_factor", []string{"diameter", "frequency", "material", "temperature"}, 3, 4, &runtime.Help{
			Signature: "ac_factor(diameter: m, frequency: Hz, " + material + ") -> dimensionless",
			Summary:   "R_ac/R_dc of an isolated straight round wire carrying sinusoidal current: the skin effect alone. A named material is taken at 20 °C unless a temperature follows; a resistivity is taken as given (non-magnetic conductor).",
			Method:    "exact solution for the round wire with Kelvin functions of √2·a/δ (a the radius, δ = skin_depth(f, ρ)); the tests find it within 1e-13 of an independent 30-digit evaluation. Low frequency: 1 + (a/δ)^4/48; high: a/2δ + 1/4 + 3δ/32a. Excludes the proximity effect of neighbouring wires and turns, which in a coil often adds more loss than the skin effect itself (see dowell_factor); a bend radius ≫ a is assumed",
			Example:   "ac_factor(1 mm, 100 kHz, \"copper\")",
			Reference: refSkinWire,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "ac_factor"
			d, err := fmPositive(fn, "diameter", args, 0, dimLength)
			if err != nil {
				return nil, err
			}
			f, err := fmNonNegative(fn, "frequency", args, 1, dimHertz)
			if err != nil {
				return nil, err
			}
			rho, err := conductor(fn, args, 2)
			if err != nil {
				return nil, err
			}
			return runtime.Num(wire.ResistanceRatio(skinX(d, f, rho))), nil
		}),
		fnc("ac_resistance", []string{"length", "diameter", "frequency", "material", "temperature"}, 4, 5, &runtime.Help{
			Signature: "ac_resistance(length: m, diameter: m, frequency: Hz, " + material + ") -> ohm",
			Summary:   "Resistance of an isolated straight round wire to sinusoidal current: the DC resistance (as wire_resistance) times ac_factor. A resistance, so neither peak nor rms: loss = I_rms² R = I_peak² R / 2.",
			Method:    "as ac_factor (exact skin effect of an isolated round wire, no proximity effect); a named material at 20 °C unless a temperature follows",
			Example:   "ac_resistance(10 m, 1 mm, 1 MHz, \"copper\", 20 °C)",
			Reference: refSkinWire + "; " + refResist,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "ac_resistance"
			l, d, f, rho, err := wireArgs(fn, args)
			if err != nil {
				return nil, err
			}
			rdc := rho * l / (math.Pi * d * d / 4)
			return runtime.Quantity{V: rdc * wire.ResistanceRatio(skinX(d, f, rho)), D: dimOhm}, nil
		}),
		fnc("internal_inductance", []string{"length", "diameter", "frequency", "material", "temperature"}, 4, 5, &runtime.Help{
			Signature: "internal_inductance(length: m, diameter: m, frequency: Hz, " + material + ") -> H",
			Summary:   "Inductance due to the magnetic field inside an isolated straight round wire at a frequency: μ0·length/8π at DC (the part inductance() includes), falling as the current crowds to the surface (about 2δ/a times that at high frequency).",
			Method:    "imaginary part of the exact internal impedance (see ac_factor), within 1e-13 of an independent 30-digit evaluation; low frequency 1 − (a/δ)^4/96 times the DC value",
			Example:   "internal_inductance(1 m, 1 mm, 1 MHz, \"copper\") as nH",
			Reference: refSkinWire,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "internal_inductance"
			l, d, f, rho, err := wireArgs(fn, args)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: VacuumPermeability * l / (8 * math.Pi) * wire.InductanceRatio(skinX(d, f, rho)), D: dimHenry}, nil
		}),
		fnc("dowell_factor", []string{"layers", "diameter", "pitch", "frequency", "material", "temperature"}, 5, 6, &runtime.Help{
			Signature: "dowell_factor(layers: whole number, diameter: m, pitch: m, frequency: Hz, " + material + ") -> dimensionless",
			Summary:   "R_ac/R_dc of a winding of round wire in layers, by Dowell's method: skin and proximity effect. pitch is the distance between turn centres along a layer (at least the diameter). Multiply the winding's DC resistance by it.",
			Method:    "Dowell's one-dimensional solution F = Δ[(sinh 2Δ + sin 2Δ)/(cosh 2Δ − cos 2Δ) + (2(m² − 1)/3)(sinh Δ − sin Δ)/(cosh Δ + cos Δ)] for m layers, the wire replaced by the square of equal area and the layer by a foil of porosity η = (√π/2)d/pitch: Δ = (π/4)^(3/4) (d/δ) √(d/pitch). Low frequency: 1 + (5m² − 1)Δ^4/45. VALID only for a one-dimensional field: layers that fill the winding window's breadth (a long solenoid, a winding between core legs), many turns per layer, all layers in series with the same current, and a pitch near the diameter; the round-wire equivalence is approximate, and least trustworthy for widely spaced turns (pitch well above the diameter) and large Δ (from memory: check such designs another way). Ignores the field at the ends of layers, gaps and fringing",
			Example:   "dowell_factor(4, 0.5 mm, 0.55 mm, 100 kHz, \"copper\")",
			Reference: refDowell,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "dowell_factor"
			m, d, p, err := dowellArgs(fn, args, 0, 1, 2)
			if err != nil {
				return nil, err
			}
			f, err := fmNonNegative(fn, "frequency", args, 3, dimHertz)
			if err != nil {
				return nil, err
			}
			rho, err := conductor(fn, args, 4)
			if err != nil {
				return nil, err
			}
			if f == 0 {
				return runtime.Num(1), nil
			}
			delta := math.Sqrt(rho / (math.Pi * f * VacuumPermeability))
			return runtime.Num(wire.DowellFactor(m, wire.DowellDelta(d, p, delta))), nil
		}),
		fncEnv("coil_q", []string{"path", "wire_diameter", "frequency", "material", "temperature"}, 4, 5, &runtime.Help{
			Signature: "coil_q(path, wire_diameter: m, frequency: Hz, " + material + ") -> dimensionless",
			Summary:   "Quality factor ωL/R of a coil of round wire along a path, counting only the skin effect of the wire itself: an UPPER estimate. L is inductance(path, wire_diameter/2) with its internal part taken at the frequency; R is the wire's ac_resistance over the path's length.",
			Method:    "inductance as inductance() (Neumann's integral, work budget applies); resistance by the exact isolated-wire skin effect. Leaves out the proximity effect of neighbouring turns (in a close-wound coil often the larger loss: coil_q_layers), self-capacitance (Q falls to 0 at self-resonance), core, dielectric and radiation losses, and leads not in the path",
			Example:   "coil_q(rings([0, 0, 0] m, [0, 0, 1], 10 mm, 20 mm, 10), 0.5 mm, 1 MHz, \"copper\")",
			Reference: refSkinWire + "; " + refInductance,
		}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			const fn = "coil_q"
			p, err := pathArg(fn, args, 0)
			if err != nil {
				return nil, err
			}
			d, err := fmPositive(fn, "wire diameter", args, 1, dimLength)
			if err != nil {
				return nil, err
			}
			f, err := fmPositive(fn, "frequency", args, 2, dimHertz)
			if err != nil {
				return nil, err
			}
			rho, err := conductor(fn, args, 3)
			if err != nil {
				return nil, err
			}
			return coilQ(env, fn, p, d, f, rho, func(delta float64) float64 { return wire.ResistanceRatio(d / 2 / delta) })
		}),
		fncEnv("coil_q_layers", []string{"path", "wire_diameter", "layers", "pitch", "frequency", "material", "temperature"}, 6, 7, &runtime.Help{
			Signature: "coil_q_layers(path, wire_diameter: m, layers: whole number, pitch: m, frequency: Hz, " + material + ") -> dimensionless",
			Summary:   "Quality factor ωL/R of a coil wound in layers along a path, its resistance raised by Dowell's factor (skin and proximity effect; see dowell_factor for where it holds). pitch is the distance between turn centres along a layer.",
			Method:    "L as coil_q (inductance() with the internal part at the frequency); R = DC resistance of the path's length × dowell_factor(layers, wire_diameter, pitch, frequency, material). The path should be the coil the layers describe (e.g. rings or helices of the layers joined); Dowell's one-dimensional field assumption and the round-wire equivalence limit the accuracy (see dowell_factor); self-capacitance, core and dielectric losses are left out",
			Example:   "coil_q_layers(rings([0, 0, 0] m, [0, 0, 1], 10 mm, 5.5 mm, 10), 0.5 mm, 1, 0.55 mm, 1 MHz, \"copper\")",
			Reference: refDowell + "; " + refInductance,
		}, func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			const fn = "coil_q_layers"
			p, err := pathArg(fn, args, 0)
			if err != nil {
				return nil, err
			}
			m, d, pitch, err := dowellArgs(fn, args, 2, 1, 3)
			if err != nil {
				return nil, err
			}
			f, err := fmPositive(fn, "frequency", args, 4, dimHertz)
			if err != nil {
				return nil, err
			}
			rho, err := conductor(fn, args, 5)
			if err != nil {
				return nil, err
			}
			return coilQ(env, fn, p, d, f, rho, func(delta float64) float64 { return wire.DowellFactor(m, wire.DowellDelta(d, pitch, delta)) })
		}),
	}
}

// wireArgs reads the arguments ac_resistance and internal_inductance share:
// length, diameter, frequency, then the material (and its temperature).
func wireArgs(fn string, args []runtime.Value) (l, d, f, rho float64, err error) {
	if l, err = fmPositive(fn, "length", args, 0, dimLength); err != nil {
		return
	}
	if d, err = fmPositive(fn, "diameter", args, 1, dimLength); err != nil {
		return
	}
	if f, err = fmNonNegative(fn, "frequency", args, 2, dimHertz); err != nil {
		return
	}
	rho, err = conductor(fn, args, 3)
	return
}
