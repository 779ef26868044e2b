package builtins_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// Tests of the wire-loss builtins (wirelosses.go) against closed-form
// limits, handbook formulas and each other. The numerics themselves
// (Kelvin functions, the exact impedance, Dowell's factor) are checked in
// builtins/wire against mpmath, series, Terman's table and direct
// solutions of the field equations.

// rhoCu20 is annealed copper at 20 °C: IEC 60028 (1925), 1/58 ohm*mm²/m.
const rhoCu20 = 1.7241e-8

// skinDepthCu is δ = √(ρ/(π f μ0)) for copper at 20 °C (Jackson,
// Classical Electrodynamics, 3rd ed., 1999, §8.1), written here apart from
// the code under test.
func skinDepthCu(f float64) float64 { return math.Sqrt(rhoCu20 / (math.Pi * f * fmMu0)) }

// TestACFactorCopper1mm: 1 mm copper wire at 50 Hz, 10 kHz and 1 MHz
// against the closed-form limits of the exact solution (Ramo, Whinnery and
// Van Duzer, Fields and Waves in Communication Electronics, 3rd ed., 1994,
// §5.6; the terms past the classical ones from the power and asymptotic
// series of I0/I1, A&S 9.6.10 and 9.7.1):
//
//	low frequency  R_ac/R_dc = 1 + x⁴/48 − x⁸/2880 …   (x = a/δ)
//	high frequency R_ac/R_dc = x/2 + 1/4 + 3/(32x) − 63/(1024x³) …
//
// each with the first omitted term (doubled) as tolerance. At 50 Hz
// x = 0.053 (δ = 9.3 mm), at 10 kHz x = 0.76 (δ = 0.66 mm), at 1 MHz
// x = 7.6 (δ = 66 µm).
func TestACFactorCopper1mm(t *testing.T) {
	for _, c := range []struct {
		f    string
		hz   float64
		high bool
	}{{"50 Hz", 50, false}, {"10 kHz", 1e4, false}, {"1 MHz", 1e6, true}} {
		got := fmVal(t, "1", fmt.Sprintf(`ac_factor(1 mm, %s, "copper")`, c.f))
		x := 0.5e-3 / skinDepthCu(c.hz)
		var want, tol float64
		if c.high {
			want = x/2 + 0.25 + 3/(32*x)
			tol = 2 * 63 / (1024 * x * x * x)
		} else {
			want = 1 + x*x*x*x/48
			tol = 2*math.Pow(x, 8)/2880 + 1e-15
		}
		if math.Abs(got-want) > tol {
			t.Errorf("ac_factor(1 mm, %s, copper) = %.10g, the closed-form limit gives %.10g (tolerance %.2g)", c.f, got, want, tol)
		}
	}
	// the DC resistance of a 1 mm copper wire is 21.95 mΩ/m (ρ/(π/4 · 1 mm²),
	// IEC 60028); at 1 MHz ac_resistance is it times the factor
	r := fmVal(t, "ohm", `ac_resistance(1 m, 1 mm, 1 MHz, "copper")`)
	x := 0.5e-3 / skinDepthCu(1e6)
	want := rhoCu20 / (math.Pi * 0.25e-6) * (x/2 + 0.25 + 3/(32*x))
	if fmRel(r, want) > 2*63/(1024*x*x*x)/(x/2) {
		t.Errorf("ac_resistance(1 m, 1 mm, 1 MHz) = %.6g ohm, want %.6g", r, want)
	}
}

// TestACResistanceConsistent: at 0 Hz ac_resistance is the DC resistance
// of wire_resistance; a named material without a temperature is at 20 °C;
// a resistivity given as a number is used as given (copper's IEC value
// gives the same result as "copper" at 20 °C). Equal to rounding.
func TestACResistanceConsistent(t *testing.T) {
	dc := fmVal(t, "ohm", `wire_resistance(3 m, 0.8 mm, "copper", 20 °C)`)
	for _, in := range []string{
		`ac_resistance(3 m, 0.8 mm, 0 Hz, "copper")`,
		`ac_resistance(3 m, 0.8 mm, 0 Hz, "copper", 20 °C)`,
		`ac_resistance(3 m, 0.8 mm, 0 Hz, 1.7241e-8 ohm*m)`,
	} {
		if r := fmVal(t, "ohm", in); fmRel(r, dc) > 1e-15 {
			t.Errorf("%s = %.17g, wire_resistance gives %.17g", in, r, dc)
		}
	}
	a := fmVal(t, "ohm", `ac_resistance(3 m, 0.8 mm, 200 kHz, "aluminium", 70 °C)`)
	b := fmVal(t, "ohm", `ac_resistance(3 m, 0.8 mm, 200 kHz, resistivity("aluminium", 70 °C))`)
	if fmRel(a, b) > 1e-15 {
		t.Errorf("aluminium at 70 °C by name %.17g, by resistivity %.17g", a, b)
	}
	// hotter copper has a larger skin depth, so a smaller factor, but a
	// larger resistance (R_ac ∝ √ρ at high frequency)
	f20 := fmVal(t, "1", `ac_factor(2 mm, 1 MHz, "copper", 20 °C)`)
	f100 := fmVal(t, "1", `ac_factor(2 mm, 1 MHz, "copper", 100 °C)`)
	r20 := fmVal(t, "ohm", `ac_resistance(1 m, 2 mm, 1 MHz, "copper", 20 °C)`)
	r100 := fmVal(t, "ohm", `ac_resistance(1 m, 2 mm, 1 MHz, "copper", 100 °C)`)
	if !(f100 < f20 && r100 > r20) {
		t.Errorf("copper at 100 °C: factor %g (20 °C: %g), resistance %g (20 °C: %g)", f100, f20, r100, r20)
	}
}

// TestInternalInductance: at low frequency the internal inductance of a
// straight round wire is μ0/8π per metre = 50 nH/m (uniform current; e.g.
// Ramo, Whinnery and Van Duzer 1994, §5.6); at high frequency it falls as
// (2δ/a)(1 − 3δ²/(16a²)) times that (the expansion in
// builtins/wire's tests), whose next term 3δ⁴/(8a⁴) is the tolerance.
func TestInternalInductance(t *testing.T) {
	l0 := fmVal(t, "H", `internal_inductance(2 m, 1 mm, 0 Hz, "copper")`)
	if fmRel(l0, 2*fmMu0/(8*math.Pi)) > 1e-15 {
		t.Errorf("internal inductance at DC = %.17g H, want μ0·2 m/8π = %.17g H", l0, 2*fmMu0/(8*math.Pi))
	}
	l := fmVal(t, "H", `internal_inductance(1 m, 2 mm, 10 MHz, "copper")`)
	x := 1e-3 / skinDepthCu(1e7)
	want := fmMu0 / (8 * math.Pi) * (2/x - 3/(8*x*x*x))
	if math.Abs(l-want) > fmMu0/(8*math.Pi)*2*3/(8*x*x*x*x) {
		t.Errorf("internal inductance at 10 MHz = %.10g H, the expansion gives %.10g H", l, want)
	}
}

// dowellDeltaCu is Δ for round copper wire at 20 °C written out as Hurley,
// Gath and Breslin (IEEE Trans. Power Electron. 15(2), 2000; from memory)
// give it: (π/4)^{3/4} (d/δ) √(d/p).
func dowellDeltaCu(d, p, f float64) float64 {
	return math.Pow(math.Pi/4, 0.75) * d / skinDepthCu(f) * math.Sqrt(d/p)
}

// TestDowellFactorBuiltin: the one-layer case is Dowell's skin term
// Δ(sinh 2Δ + sin 2Δ)/(cosh 2Δ − cos 2Δ) (Dowell 1966), computed here from
// math.Sinh etc. (tolerance: the cancellation of cosh 2Δ − cos 2Δ, 4 eps/Δ²);
// at low frequency the m-layer factor is 1 + (5m² − 1)Δ⁴/45 within the next
// term (85m² − 21)Δ⁸/18900 (Taylor series of Dowell's expression, derived in
// builtins/wire's tests); at high frequency it tends to Δ(2m² + 1)/3
// within 2(m² − 1)/3 · 3.5 e^{−Δ} Δ.
func TestDowellFactorBuiltin(t *testing.T) {
	// one layer of 0.5 mm wire at 0.55 mm pitch, 100 kHz: Δ ≈ 1.07
	d := dowellDeltaCu(0.5e-3, 0.55e-3, 1e5)
	want := d * (math.Sinh(2*d) + math.Sin(2*d)) / (math.Cosh(2*d) - math.Cos(2*d))
	if got := fmVal(t, "1", `dowell_factor(1, 0.5 mm, 0.55 mm, 100 kHz, "copper")`); fmRel(got, want) > 4*0x1p-52*(1+1/(d*d))+1e-15 {
		t.Errorf("one layer: %.17g, Dowell's skin term %.17g", got, want)
	}
	// six layers of 0.2 mm wire at 0.22 mm pitch, 5 kHz: Δ ≈ 0.098
	d = dowellDeltaCu(0.2e-3, 0.22e-3, 5e3)
	d4 := d * d * d * d
	want = 1 + (5*36-1)*d4/45
	if got := fmVal(t, "1", `dowell_factor(6, 0.2 mm, 0.22 mm, 5 kHz, "copper")`); math.Abs(got-want) > (85*36-21)*d4*d4/18900+4e-16 {
		t.Errorf("six layers, low frequency: %.17g, 1 + (5m² − 1)Δ⁴/45 = %.17g", got, want)
	}
	// three layers of 2 mm wire at 2.1 mm pitch, 10 MHz: Δ ≈ 28
	d = dowellDeltaCu(2e-3, 2.1e-3, 1e7)
	want = d * (2*9 + 1) / 3
	if got := fmVal(t, "1", `dowell_factor(3, 2 mm, 2.1 mm, 10 MHz, "copper")`); math.Abs(got-want) > d*(2*8.0/3*3.5*math.Exp(-d))+1e-15*want {
		t.Errorf("three layers, high frequency: %.17g, Δ(2m² + 1)/3 = %.17g", got, want)
	}
	// proximity: more layers, more loss, for the same wire and frequency
	f1 := fmVal(t, "1", `dowell_factor(1, 0.5 mm, 0.55 mm, 200 kHz, "copper")`)
	f4 := fmVal(t, "1", `dowell_factor(4, 0.5 mm, 0.55 mm, 200 kHz, "copper")`)
	if !(f4 > 3*f1) {
		t.Errorf("four layers %g, one layer %g: the proximity effect should dominate at Δ ≈ 1.5", f4, f1)
	}
}

// TestCoilQLoop checks coil_q on a circular loop of round wire against an
// independent computation: L from the thin-ring formula μ0R(ln(8R/a) − 2)
// for the external part (Grover, Inductance Calculations, 1946; Jackson,
// Classical Electrodynamics, 3rd ed., Problem 5.34) plus the internal part
// (μ0/8π per metre times 2/x − 3/(8x³), x = a/δ, the high-frequency
// expansion of the exact ratio), and R = ρ·2πR/(πa²) times the
// high-frequency expansion x/2 + 1/4 + 3/(32x) − 63/(1024x³) of the exact
// factor. Tolerance: the ring formula's neglected terms of order (a/R)²,
// 3e-5 at a/R = 0.01 when scaled from the 0.3% that loop_inductance's help
// states at a/R = 0.1, doubled; plus the expansions' next terms, 27/(256x⁴)
// on R (2e-6 relative at x = 7.6) and 3/(8x⁴) on the internal part, which is
// under 2% of L (5e-6 relative), each doubled.
func TestCoilQLoop(t *testing.T) {
	const R, a, f = 50e-3, 0.5e-3, 1e6
	x := a / skinDepthCu(f)
	lExt := fmMu0 * R * (math.Log(8*R/a) - 2)
	lInt := fmMu0 / (8 * math.Pi) * 2 * math.Pi * R * (2/x - 3/(8*x*x*x))
	fac := x/2 + 0.25 + 3/(32*x) - 63/(1024*x*x*x)
	rac := rhoCu20 * 2 * math.Pi * R / (math.Pi * a * a) * fac
	want := 2 * math.Pi * f * (lExt + lInt) / rac
	x4 := x * x * x * x
	tol := 2*3e-5 + 2*27/(256*x4)/fac + 2*(fmMu0/(8*math.Pi)*2*math.Pi*R*3/(8*x4))/(lExt+lInt)
	got := fmVal(t, "1", `coil_q(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 1 mm, 1 MHz, "copper")`)
	if fmRel(got, want) > tol {
		t.Errorf("coil_q of a 50 mm loop of 1 mm copper at 1 MHz = %.8g, the ring formula gives %.8g", got, want)
	}
	// with one layer, coil_q_layers divides by Dowell's factor instead
	ql := fmVal(t, "1", `coil_q_layers(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 1 mm, 1, 1 mm, 1 MHz, "copper")`)
	fd := fmVal(t, "1", `dowell_factor(1, 1 mm, 1 mm, 1 MHz, "copper")`)
	fa := fmVal(t, "1", `ac_factor(1 mm, 1 MHz, "copper")`)
	if fmRel(ql, got*fa/fd) > 1e-12 {
		t.Errorf("coil_q_layers = %.15g, coil_q × ac_factor/dowell_factor = %.15g", ql, got*fa/fd)
	}
}

// TestWireLossErrors: bad arguments give positioned errors naming the
// builtin and the problem.
func TestWireLossErrors(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{`ac_factor(0 mm, 1 kHz, "copper")`, "diameter"},
		{`ac_factor(1 mm, -1 kHz, "copper")`, "negative"},
		{`ac_factor(1 mm, 1 kHz, "gold")`, "unknown material"},
		{`ac_factor(1 mm, 1 kHz, 3 ohm)`, "resistivity in ohm*m"},
		{`ac_factor(1 mm, 1 kHz, -3 ohm*m)`, "positive"},
		{`ac_factor(1 mm, 1 kHz, 1e-8 ohm*m, 20 °C)`, "temperature applies"},
		{`ac_factor(1 mm, 1 kHz, "copper", 500 K)`, "200 °C"},
		{`ac_resistance(1 m, 1 mm, 1 s, "copper")`, "Hz"},
		{`internal_inductance(-1 m, 1 mm, 1 kHz, "copper")`, "length"},
		{`dowell_factor(0, 1 mm, 1.1 mm, 1 kHz, "copper")`, "whole number"},
		{`dowell_factor(2.5, 1 mm, 1.1 mm, 1 kHz, "copper")`, "whole number"},
		{`dowell_factor(2, 1 mm, 0.9 mm, 1 kHz, "copper")`, "overlap"},
		{`coil_q(3, 1 mm, 1 kHz, "copper")`, "path"},
		{`coil_q(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 1 mm, 0 Hz, "copper")`, "positive"},
		{`coil_q_layers(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 1 mm, 2, 0.5 mm, 1 kHz, "copper")`, "overlap"},
	} {
		s := runtime.NewSession(builtins.Standard())
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("%s: got %v, want a positioned error", c.in, err)
			continue
		}
		name := c.in[:strings.IndexByte(c.in, '(')]
		if msg := err.Error(); !strings.Contains(msg, name) || !strings.Contains(msg, c.want) {
			t.Errorf("%s: error %q should name %s and mention %q", c.in, msg, name, c.want)
		}
	}
}

// TestACFactorTerman: for 1 mm copper at the frequencies where
// √2·a/δ = 2, 5 and 10, ac_factor against the classic round-wire table in
// F. E. Terman, Radio Engineers' Handbook (1943), which is indexed by that
// parameter: 1.078, 2.043, 3.799 (from memory; three decimals, so the
// tolerance is half a unit in the last place, 5e-4, plus 1e-6 for the
// rounding of the frequency written as text).
func TestACFactorTerman(t *testing.T) {
	for _, c := range []struct{ q, r float64 }{{2, 1.078}, {5, 2.043}, {10, 3.799}} {
		delta := math.Sqrt2 * 0.5e-3 / c.q
		f := rhoCu20 / (math.Pi * fmMu0 * delta * delta)
		got := fmVal(t, "1", fmt.Sprintf(`ac_factor(1 mm, %.12g Hz, "copper")`, f))
		if math.Abs(got-c.r) > 5e-4+1e-6 {
			t.Errorf("√2 a/δ = %g (f = %.6g Hz): ac_factor = %.5f, Terman's table %.3f", c.q, f, got, c.r)
		}
	}
}
