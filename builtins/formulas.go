package builtins

import (
	"math"
	"strings"

	"gonum.org/v1/gonum/mathext"

	"loopwise/runtime"
)

// Handbook formulas: closed forms that engineers use for quick numbers.
// Each states its assumptions and refuses inputs where its stated accuracy
// does not hold (except eddy_loss, whose validity depends on a permeability
// it is not given). The tests in formulas_test.go compare them with
// published values and with the exact builtins, and show by how much they
// part where the assumptions fail.

const (
	inchMetre = 0.0254 // m, exact (international inch, 1959; NIST SP 811)
	celsius0  = 273.15 // K, 0 °C exactly (SI Brochure, 9th ed., 2.3.1)

	// wheelerMinLR is Wheeler's validity limit: about 1% for l > 0.8 r.
	wheelerMinLR = 0.8
	// nagaokaMinLR is the shortest coil (length/radius) for which K_N is
	// computed to better than about 1e-9 relative: below it k² = 1 − k'²
	// rounds away the digits of k'² that E − k depends on.
	nagaokaMinLR = 1e-3
	// loopMaxAR is the thickest wire (a/R) for loop_inductance: there the
	// neglected terms of order (a/R)² reach about 2%.
	loopMaxAR = 0.25
	// the linear resistivity law is used from −50 °C to 200 °C
	tempMin = celsius0 - 50
	tempMax = celsius0 + 200
)

var (
	dimKelvin     = mustDim("K")
	dimOhm        = mustDim("ohm")
	dimOhmMetre   = mustDim("ohm*m")
	refWheeler    = "H. A. Wheeler, \"Simple inductance formulas for radio coils\", Proc. IRE 16 (1928)"
	refNagaoka    = "H. Nagaoka, \"The inductance coefficients of solenoids\", J. Coll. Sci. Imp. Univ. Tokyo 27 (1909); elliptic integrals by gonum mathext (Fukushima, J. Comput. Appl. Math. 282, 2015)"
	refToroid     = "Ampère's law for a toroidal current sheet (B = μ0NI/2πr inside, 0 outside), flux linkage integrated over the section; e.g. Griffiths, Introduction to Electrodynamics, 4th ed. (2017), Example 5.10"
	refLoop       = "Grover, Inductance Calculations (1946); Jackson, Classical Electrodynamics, 3rd ed. (1999), Problem 5.34 (leading terms, uniform current)"
	refSkin       = "good-conductor skin depth δ = √(2ρ/ωμ) (Jackson, Classical Electrodynamics, 3rd ed., 1999, §8.1)"
	refEddy       = "classical eddy-current loss of a thin lamination (standard result, e.g. R. M. Bozorth, Ferromagnetism, 1951; from memory)"
	refEMF        = "Faraday's law for sinusoidal flux: E_rms = 2πfNAB/√2 (the transformer equation, \"4.44 f N A B\")"
	refResist     = "annealed copper: IEC 60028 (1925), International Annealed Copper Standard: 1/58 Ω·mm²/m = 1.7241e-8 Ω·m, α = 0.00393 /K at 20 °C; aluminium (pure): 2.65e-8 Ω·m, α = 0.00429 /K at 20 °C, as tabulated from the CRC Handbook of Chemistry and Physics (values from memory)"
	refAWG        = "ASTM B258, Standard Specification for Standard Nominal Diameters and Cross-Sectional Areas of AWG Sizes of Solid Round Wires Used as Electrical Conductors: d = 0.005 in × 92^((36 − n)/39)"
	awgNamedSizes = map[string]int{"0": 0, "00": -1, "000": -2, "0000": -3, "1/0": 0, "2/0": -1, "3/0": -2, "4/0": -3}
)

// fmPositive returns argument i as a positive finite quantity of dimension d.
func fmPositive(fn, what string, args []runtime.Value, i int, d runtime.Dim) (float64, error) {
	x, err := ofDim(fn, args, i, d)
	if err != nil {
		return 0, err
	}
	if !(x > 0) || math.IsInf(x, 0) {
		return 0, errorf("%s: the %s (%s argument) must be positive, not %s", fn, what, ordinal(i), runtime.Format(runtime.Quantity{V: x, D: d}, 6))
	}
	return x, nil
}

// fmNonNegative returns argument i as a finite quantity ≥ 0 of dimension d.
func fmNonNegative(fn, what string, args []runtime.Value, i int, d runtime.Dim) (float64, error) {
	x, err := ofDim(fn, args, i, d)
	if err != nil {
		return 0, err
	}
	if !(x >= 0) || math.IsInf(x, 0) {
		return 0, errorf("%s: the %s (%s argument) must not be negative, not %s", fn, what, ordinal(i), runtime.Format(runtime.Quantity{V: x, D: d}, 6))
	}
	return x, nil
}

// fmTurns returns argument i as a positive number of turns (any real:
// formulas do not need whole turns).
func fmTurns(fn string, args []runtime.Value, i int) (float64, error) {
	n, err := number(fn, args, i)
	if err != nil {
		return 0, err
	}
	if !(n > 0) || math.IsInf(n, 0) {
		return 0, errorf("%s: the number of turns (%s argument) must be positive, not %s", fn, ordinal(i), runtime.FormatNumber(n, 6))
	}
	return n, nil
}

// fmLengths reads several positive lengths, named for messages.
func fmLengths(fn string, args []runtime.Value, names ...string) ([]float64, error) {
	out := make([]float64, len(names))
	for i, nm := range names {
		x, err := fmPositive(fn, nm, args, i, dimLength)
		if err != nil {
			return nil, err
		}
		out[i] = x
	}
	return out, nil
}

// nagaokaCoefficient returns Nagaoka's coefficient K_N of a cylindrical
// current sheet of radius r and length l:
//
//	K_N = 4/(3π k′) [ (k′²/k²)(K − E) + E − k ],  k² = 4r²/(4r² + l²), k′² = 1 − k²
//
// with (K − E)/k² taken as Legendre's D(k²) = mathext.CompleteD, so that
// long coils (k → 0) lose no digits. k and k′ are formed from l/2r without
// squaring large numbers.
func nagaokaCoefficient(r, l float64) float64 {
	rho := l / (2 * r)
	s := math.Hypot(1, rho)
	k, kp := 1/s, rho/s
	m, mc := k*k, kp*kp
	return 4 / (3 * math.Pi * kp) * (mc*mathext.CompleteD(m) + mathext.CompleteE(m) - k)
}

// coilArgsRL reads radius, length of a formula coil and checks l/r.
func coilArgsRL(fn string, args []runtime.Value, minLR float64, hint string) (r, l float64, err error) {
	rl, err := fmLengths(fn, args, "radius", "length")
	if err != nil {
		return 0, 0, err
	}
	r, l = rl[0], rl[1]
	if l/r < minLR*(1-1e-12) { // the slack forgives rounding of decimal inputs
		return 0, 0, errorf("%s: length/radius = %s is below %g; %s", fn, runtime.FormatNumber(l/r, 4), minLR, hint)
	}
	return r, l, nil
}

// resistivityOf returns ρ(T) of a named material.
func resistivityOf(fn string, args []runtime.Value, mi, ti int) (float64, error) {
	s, ok := args[mi].(string)
	if !ok {
		return 0, errorf("%s: the %s argument must be the material's name as text, \"copper\" or \"aluminium\", not %s", fn, ordinal(mi), runtime.TypeName(args[mi]))
	}
	var rho20, alpha float64
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "copper", "cu":
		rho20, alpha = 1.7241e-8, 0.00393
	case "aluminium", "aluminum", "al":
		rho20, alpha = 2.65e-8, 0.00429
	default:
		return 0, errorf("%s: unknown material %q; known: \"copper\" (annealed, IEC 60028), \"aluminium\" (or \"aluminum\"; pure)", fn, s)
	}
	t, err := ofDim(fn, args, ti, dimKelvin)
	if err != nil {
		return 0, errorf("%s (write the temperature in kelvin or °C: 20 °C is 293.15 K)", err)
	}
	if !(t >= tempMin && t <= tempMax) {
		return 0, errorf("%s: the temperature %s (%s °C) is outside the linear law's range, 223.15 K to 473.15 K (−50 °C to 200 °C); write an absolute temperature, e.g. 20 °C or 293.15 K",
			fn, runtime.Format(runtime.Quantity{V: t, D: dimKelvin}, 6), runtime.FormatNumber(t-celsius0, 6))
	}
	return rho20 * (1 + alpha*(t-(celsius0+20))), nil
}

func formulaFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("wheeler", []string{"radius", "length", "turns"}, 3, 3, &runtime.Help{
			Signature: "wheeler(radius: length, length: length, turns) -> H",
			Summary:   "Inductance of a single-layer air-core solenoid by Wheeler's formula L[µH] = r²N²/(9r + 10l), r and l in inches (converted exactly: 1 in = 25.4 mm).",
			Method:    "closed form; Wheeler states about 1% accuracy for length > 0.8 × radius (against Nagaoka's current sheet: within 0.6% from l/r = 0.8 to 10, see the tests); shorter coils are refused (use sheet_inductance). A current sheet: a coil of round wire has less inductance by Rosa's correction (computed in the tests for wire 0.9 of the pitch: 1.3–2.3% at a pitch of r/20, l/r from 10 to 1; 0.36% at r/100)",
			Example:   "wheeler(10 mm, 40 mm, 80)",
			Reference: refWheeler,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r, l, err := coilArgsRL("wheeler", args, wheelerMinLR, "Wheeler's ~1% accuracy holds only for length > 0.8 × radius; use sheet_inductance(radius, length, turns) for short coils")
			if err != nil {
				return nil, err
			}
			n, err := fmTurns("wheeler", args, 2)
			if err != nil {
				return nil, err
			}
			// L = 1e-6 H × (r/in)² N² / (9 r/in + 10 l/in)
			return runtime.Quantity{V: 1e-6 / inchMetre * r * r * n * n / (9*r + 10*l), D: dimHenry}, nil
		}),
		fnc("nagaoka", []string{"radius", "length"}, 2, 2, &runtime.Help{
			Signature: "nagaoka(radius: length, length: length) -> dimensionless",
			Summary:   "Nagaoka's coefficient K_N of a cylindrical current sheet: the factor by which a finite solenoid's inductance falls short of the long-solenoid value μ0πr²N²/l (K_N → 1 for length ≫ radius; 0.6884 for length = 2 × radius).",
			Method:    "K_N = 4/(3πk′)[(k′²/k²)(K − E) + E − k], k² = 4r²/(4r² + l²), k′² = 1 − k², with complete elliptic integrals K, E and D = (K − E)/k² (gonum mathext, double precision); the tests find it within 1e-14 relative of a 256-bit evaluation for length ≥ radius, within 4e-9 at the shortest accepted coil, length = 0.001 × radius",
			Example:   "nagaoka(10 mm, 20 mm)",
			Reference: refNagaoka,
		}, func(args []runtime.Value) (runtime.Value, error) {
			r, l, err := coilArgsRL("nagaoka", args, nagaokaMinLR, "double precision cannot resolve so flat a sheet (for a thin ring use loop_inductance)")
			if err != nil {
				return nil, err
			}
			return runtime.Num(nagaokaCoefficient(r, l)), nil
		}),
		fnc("sheet_inductance", []string{"radius", "length", "turns"}, 3, 3, &runtime.Help{
			Signature: "sheet_inductance(radius: length, length: length, turns) -> H",
			Summary:   "Inductance of a single-layer solenoid as a uniform cylindrical current sheet: L = K_N μ0 π r² N² / l with Nagaoka's coefficient K_N.",
			Method:    "exact for a current sheet (see nagaoka); a coil of round wire has less inductance by Rosa's correction, L = L_sheet − μ0 r N (A + B) (computed in the tests for wire 0.9 of the pitch: 1.3–2.3% at a pitch of r/20, l/r from 10 to 1; 0.36% at r/100; inductance(helix(...), wire_radius) computes the wire itself)",
			Example:   "sheet_inductance(10 mm, 40 mm, 80)",
			Reference: refNagaoka + "; Rosa, Bull. Bureau of Standards 2 (1906) for round wire",
		}, func(args []runtime.Value) (runtime.Value, error) {
			r, l, err := coilArgsRL("sheet_inductance", args, nagaokaMinLR, "double precision cannot resolve so flat a sheet (for a thin ring use loop_inductance)")
			if err != nil {
				return nil, err
			}
			n, err := fmTurns("sheet_inductance", args, 2)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: nagaokaCoefficient(r, l) * VacuumPermeability * math.Pi * r * r * n * n / l, D: dimHenry}, nil
		}),
		fnc("toroid_rect_inductance", []string{"r_in", "r_out", "height", "turns"}, 4, 4, &runtime.Help{
			Signature: "toroid_rect_inductance(r_in: length, r_out: length, height: length, turns) -> H",
			Summary:   "Inductance of a toroidal winding on a core of rectangular cross-section (air or any core of μr = 1): L = μ0 N² h ln(r_out/r_in) / 2π.",
			Method:    "exact for a uniform current sheet on the core's surface; a real winding of N round wires adds each wire's local field, about N μ0/2π ∮ [ln(s/2πa) + 1/4] dl over one turn (s the wire spacing, a the wire radius): +18% for 100 turns of 0.1 mm wire on a 20/30/10 mm core, +0.5% for 0.6 mm wire; few turns depart far (×4.8 for 10 turns) — see the tests; times μr for a linear core filling the section",
			Example:   "toroid_rect_inductance(20 mm, 30 mm, 10 mm, 200)",
			Reference: refToroid,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "toroid_rect_inductance"
			v, err := fmLengths(fn, args, "inner radius", "outer radius", "height")
			if err != nil {
				return nil, err
			}
			if v[1] <= v[0] {
				return nil, errorf("%s: the outer radius must be larger than the inner radius", fn)
			}
			n, err := fmTurns(fn, args, 3)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: VacuumPermeability * n * n * v[2] * math.Log1p((v[1]-v[0])/v[0]) / (2 * math.Pi), D: dimHenry}, nil
		}),
		fnc("toroid_round_inductance", []string{"major_radius", "minor_radius", "turns"}, 3, 3, &runtime.Help{
			Signature: "toroid_round_inductance(major_radius: length, minor_radius: length, turns) -> H",
			Summary:   "Inductance of a toroidal winding on a ring core of circular cross-section: L = μ0 N² (R − √(R² − a²)).",
			Method:    "exact for a uniform current sheet on the torus (flux of B = μ0NI/2πr through the circular section); evaluated as μ0N²a²/(R + √(R² − a²)) without cancellation; a real winding adds the wires' local fields as for toroid_rect_inductance (+11% for 100 turns of 0.2 mm wire on R = 25 mm, a = 5 mm)",
			Example:   "toroid_round_inductance(25 mm, 5 mm, 200)",
			Reference: refToroid,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "toroid_round_inductance"
			v, err := fmLengths(fn, args, "major radius", "minor radius")
			if err != nil {
				return nil, err
			}
			R, a := v[0], v[1]
			if a >= R {
				return nil, errorf("%s: the minor radius must be smaller than the major radius", fn)
			}
			n, err := fmTurns(fn, args, 2)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: VacuumPermeability * n * n * a * a / (R + math.Sqrt((R-a)*(R+a))), D: dimHenry}, nil
		}),
		fnc("loop_inductance", []string{"loop_radius", "wire_radius"}, 2, 2, &runtime.Help{
			Signature: "loop_inductance(loop_radius: length, wire_radius: length) -> H",
			Summary:   "Low-frequency self-inductance of a circular loop of round wire: L = μ0 R (ln(8R/a) − 7/4) (uniform current, internal part included).",
			Method:    "the leading terms of the expansion in a/R; the neglected terms, μ0R[(a²/8R²) ln(8R/a) + a²/24R²], are of order (a/R)²: against inductance(circle(...), a), which includes them, 2e-7 at a/R = 0.001, 0.2% at 0.1, 1.0% at 0.2; wire thicker than a quarter of the loop radius is refused",
			Example:   "loop_inductance(50 mm, 0.5 mm)",
			Reference: refLoop,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "loop_inductance"
			v, err := fmLengths(fn, args, "loop radius", "wire radius")
			if err != nil {
				return nil, err
			}
			R, a := v[0], v[1]
			if a > loopMaxAR*R {
				return nil, errorf("%s: wire radius/loop radius = %s is above %g; the formula assumes a thin wire (its error grows as (a/R)²); use inductance(circle(...), wire_radius)", fn, runtime.FormatNumber(a/R, 4), loopMaxAR)
			}
			return runtime.Quantity{V: VacuumPermeability * R * (math.Log(8*R/a) - 1.75), D: dimHenry}, nil
		}),
		fnc("skin_depth", []string{"frequency", "resistivity", "relative_permeability"}, 2, 3, &runtime.Help{
			Signature: "skin_depth(frequency: Hz, resistivity: ohm*m[, relative_permeability: dimensionless]) -> m",
			Summary:   "Skin depth of a good conductor, δ = √(ρ / (π f μ0 μr)): the depth at which a sinusoidal field or current density falls by 1/e.",
			Method:    "closed form; assumes a good conductor (displacement current negligible, ρ·2πf·ε ≪ 1), a linear permeability (default μr = 1) and a plane surface (conductor thicker than a few δ, radius of curvature ≫ δ)",
			Example:   "skin_depth(50 Hz, resistivity(\"copper\", 293.15 K))",
			Reference: refSkin,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "skin_depth"
			f, err := fmPositive(fn, "frequency", args, 0, dimHertz)
			if err != nil {
				return nil, err
			}
			rho, err := fmPositive(fn, "resistivity", args, 1, dimOhmMetre)
			if err != nil {
				return nil, err
			}
			mur := 1.0
			if len(args) > 2 {
				if mur, err = number(fn, args, 2); err != nil {
					return nil, err
				}
				if !(mur > 0) || math.IsInf(mur, 0) {
					return nil, errorf("%s: the relative permeability must be positive, not %s", fn, runtime.FormatNumber(mur, 6))
				}
			}
			return runtime.Quantity{V: math.Sqrt(rho / (math.Pi * f * VacuumPermeability * mur)), D: dimLength}, nil
		}),
		fnc("eddy_loss", []string{"frequency", "B_peak", "thickness", "resistivity"}, 4, 4, &runtime.Help{
			Signature: "eddy_loss(frequency: Hz, B_peak: T, thickness: m, resistivity: ohm*m) -> W/m^3",
			Summary:   "Classical eddy-current loss per unit volume of a thin lamination in a sinusoidal field: P = π² f² B² d² / (6ρ), B the peak of the section's average flux density.",
			Method:    "CAUTION: valid only when the thickness is well below the skin depth (d ≪ δ, δ = skin_depth(f, ρ, μr)), so the flux is uniform across the sheet; the exact one-dimensional solution is this times (3/ξ)(sinh ξ − sin ξ)/(cosh ξ − cos ξ), ξ = d/δ: the formula is high by ξ⁴/630 (1.6e-7 at d = 0.1δ), 2.5% at d = 2δ, 64% at d = 5δ. Ignores hysteresis and excess (domain-wall) loss, which real steels add",
			Example:   "eddy_loss(50 Hz, 1.5 T, 0.35 mm, 0.47 uohm*m)",
			Reference: refEddy,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "eddy_loss"
			f, err := fmNonNegative(fn, "frequency", args, 0, dimHertz)
			if err != nil {
				return nil, err
			}
			b, err := ofDim(fn, args, 1, dimTesla)
			if err != nil {
				return nil, err
			}
			d, err := fmPositive(fn, "thickness", args, 2, dimLength)
			if err != nil {
				return nil, err
			}
			rho, err := fmPositive(fn, "resistivity", args, 3, dimOhmMetre)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: math.Pi * math.Pi * f * f * b * b * d * d / (6 * rho), D: dimPowerDensity}, nil
		}),
		fnc("transformer_emf", []string{"frequency", "turns", "area", "B_peak"}, 4, 4, &runtime.Help{
			Signature: "transformer_emf(frequency: Hz, turns, area: m^2, B_peak: T) -> V (rms)",
			Summary:   "RMS voltage of a winding of N turns around a core of cross-section A carrying sinusoidal flux of peak density B: E = (2π/√2) f N A B ≈ 4.44288 f N A B.",
			Method:    "Faraday's law for sinusoidal flux; assumes the flux density is uniform over A (use the net magnetic area, e.g. the stacking factor times the gross area) and links every turn",
			Example:   "transformer_emf(50 Hz, 100, 10 cm^2, 1.2 T)",
			Reference: refEMF,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "transformer_emf"
			f, err := fmPositive(fn, "frequency", args, 0, dimHertz)
			if err != nil {
				return nil, err
			}
			n, err := fmTurns(fn, args, 1)
			if err != nil {
				return nil, err
			}
			a, err := fmPositive(fn, "area", args, 2, dimArea)
			if err != nil {
				return nil, err
			}
			b, err := fmNonNegative(fn, "peak flux density", args, 3, dimTesla)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: math.Sqrt2 * math.Pi * f * n * a * b, D: dimVolt}, nil
		}),
		fnc("resistivity", []string{"material", "temperature"}, 2, 2, &runtime.Help{
			Signature: "resistivity(material: \"copper\" or \"aluminium\", temperature: K or °C) -> ohm*m",
			Summary:   "Resistivity of annealed copper or pure aluminium at a temperature: ρ(T) = ρ20 (1 + α (T − 293.15 K)). The temperature is absolute, in K or °C: 20 °C is 293.15 K, 70 °C is 343.15 K.",
			Method:    "linear law about 20 °C, accepted from −50 °C to 200 °C (223.15 K to 473.15 K). Copper: 1.7241e-8 ohm*m, α = 0.00393 K^-1; aluminium: 2.65e-8 ohm*m, α = 0.00429 K^-1 (pure metal; conductor-grade aluminium, 61% IACS, is about 2.83e-8 ohm*m)",
			Example:   "resistivity(\"copper\", 70 °C)",
			Reference: refResist,
		}, func(args []runtime.Value) (runtime.Value, error) {
			rho, err := resistivityOf("resistivity", args, 0, 1)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: rho, D: dimOhmMetre}, nil
		}),
		fnc("wire_resistance", []string{"length", "diameter", "material", "temperature"}, 4, 4, &runtime.Help{
			Signature: "wire_resistance(length: m, diameter: m, material: \"copper\" or \"aluminium\", temperature: K or °C) -> ohm",
			Summary:   "DC resistance of a solid round wire: R = ρ(T) · length / (π d²/4), ρ(T) as resistivity().",
			Method:    "direct current (no skin or proximity effect: at frequency f the wire's resistance rises once the diameter approaches 2·skin_depth); absolute temperature in K or °C, −50 °C to 200 °C",
			Example:   "wire_resistance(100 m, awg_diameter(14), \"copper\", 20 °C)",
			Reference: refResist,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "wire_resistance"
			l, err := fmPositive(fn, "length", args, 0, dimLength)
			if err != nil {
				return nil, err
			}
			d, err := fmPositive(fn, "diameter", args, 1, dimLength)
			if err != nil {
				return nil, err
			}
			rho, err := resistivityOf(fn, args, 2, 3)
			if err != nil {
				return nil, err
			}
			return runtime.Quantity{V: rho * l / (math.Pi * d * d / 4), D: dimOhm}, nil
		}),
		fnc("awg_diameter", []string{"gauge"}, 1, 1, &runtime.Help{
			Signature: "awg_diameter(gauge: whole number from -3 to 56, or text \"0000\" … \"0\", \"4/0\" … \"1/0\") -> m",
			Summary:   "Nominal diameter of a solid round wire of American Wire Gauge n: d = 0.005 in × 92^((36 − n)/39); gauge 0000 (4/0) is n = −3, 000 is −2, 00 is −1.",
			Method:    "the defining formula, unrounded (the standard's table rounds to 0.0001 in); 1 in = 25.4 mm exactly",
			Example:   "awg_diameter(24) as mm",
			Reference: refAWG,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "awg_diameter"
			var n int
			if s, ok := args[0].(string); ok {
				g, known := awgNamedSizes[strings.TrimSpace(s)]
				if !known {
					return nil, errorf("awg_diameter: unknown gauge %q; give a whole number from -3 to 56, or \"0000\", \"000\", \"00\", \"0\" (also \"4/0\" … \"1/0\")", s)
				}
				n = g
			} else {
				var err error
				if n, err = count(fn, args, 0, -3, 56); err != nil {
					return nil, err
				}
			}
			return runtime.Quantity{V: 0.005 * inchMetre * math.Pow(92, float64(36-n)/39), D: dimLength}, nil
		}),
	}
}
