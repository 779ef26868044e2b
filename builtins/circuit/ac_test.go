package circuit

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// Tests of the AC solver against closed forms of circuit theory derived
// from Kirchhoff's and Ohm's laws (the formulas are in every circuits
// text; the derivation is given beside each check, so no book is needed).
//
// Tolerances: the solver's relative error is bounded by about
// cond·eps (eps = 2⁻⁵³ ≈ 1.1e-16, cond the condition estimate of the
// equilibrated system, which each test asserts is small), and the closed
// form adds a few roundings. Where cond ≤ 1e3 the bound is ≈ 1e-13, so
// 1e-12 is used; tests with a larger condition say so.

const eps = 0x1p-53

func crel(got, want complex128) float64 {
	return cmplx.Abs(got-want) / cmplx.Abs(want)
}

func mustAC(t *testing.T, c *Circuit, f float64) *ACSolution {
	t.Helper()
	s, err := c.AC(f)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func must[T any](t *testing.T) func(T, error) T {
	return func(v T, err error) T {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
}

func R(name, from, to string, v float64) Element {
	return Element{Name: name, Kind: Resistor, From: from, To: to, Value: v}
}
func L(name, from, to string, v float64) Element {
	return Element{Name: name, Kind: Inductor, From: from, To: to, Value: v}
}
func C(name, from, to string, v float64) Element {
	return Element{Name: name, Kind: Capacitor, From: from, To: to, Value: v}
}
func V(name, from, to string, p complex128) Element {
	return Element{Name: name, Kind: VoltageSource, From: from, To: to, Phasor: p}
}
func I(name, from, to string, p complex128) Element {
	return Element{Name: name, Kind: CurrentSource, From: from, To: to, Phasor: p}
}

func checkCond(t *testing.T, s *ACSolution, limit float64) {
	t.Helper()
	if s.Cond() > limit {
		t.Fatalf("condition estimate %g above the %g the tolerance was derived for", s.Cond(), limit)
	}
}

// A voltage divider: V_out = V·R2/(R1 + R2) (Ohm's law, one loop current).
// The source's phasor carries a phase to check that phasors pass through.
func TestVoltageDivider(t *testing.T) {
	src := cmplx.Rect(10, math.Pi/6) // 10 V peak at 30°
	c := &Circuit{Elements: []Element{
		V("V1", "in", "0", src),
		R("R1", "in", "out", 1500),
		R("R2", "out", "0", 500),
	}}
	s := mustAC(t, c, 50)
	checkCond(t, s, 1e3)
	got := must[complex128](t)(s.Voltage("out"))
	want := src * 500 / 2000
	if r := crel(got, want); r > 1e-12 {
		t.Errorf("V(out) = %v, want %v (rel %g)", got, want, r)
	}
	// The loop current flows out of the source's + terminal, so through
	// the source From→To it is −V/(R1+R2): the source delivers power.
	i := must[complex128](t)(s.Current("V1"))
	if r := crel(i, -src/2000); r > 1e-12 {
		t.Errorf("I(V1) = %v, want %v", i, -src/2000)
	}
	p := must[float64](t)(s.Power("V1"))
	wantP := -0.5 * 100 / 2000 // ½·|V|²/R, delivered
	if math.Abs(p-wantP) > 1e-12*math.Abs(wantP) {
		t.Errorf("P(V1) = %g W, want %g W", p, wantP)
	}
	wantR2 := 0.5 * math.Pow(cmplx.Abs(want), 2) / 500 // ½|V_out|²/R2
	if pr := must[float64](t)(s.Power("R2")); math.Abs(pr-wantR2) > 1e-12*wantR2 {
		t.Errorf("P(R2) = %g W, want %g W", pr, wantR2)
	}
}

// An RC low-pass: H = 1/(1 + jωRC) (series impedance divider), checked
// at the corner (|H| = 1/√2, −45°) and a decade above.
func TestRCLowPass(t *testing.T) {
	const r, cap = 1e3, 100e-9
	fc := 1 / (2 * math.Pi * r * cap)
	for _, f := range []float64{fc, 10 * fc, fc / 10} {
		c := &Circuit{Elements: []Element{V("V", "a", "0", 1), R("R", "a", "b", r), C("C", "b", "0", cap)}}
		s := mustAC(t, c, f)
		checkCond(t, s, 1e3)
		got := must[complex128](t)(s.Voltage("b"))
		want := 1 / complex(1, 2*math.Pi*f*r*cap)
		if rel := crel(got, want); rel > 1e-12 {
			t.Errorf("f = %g Hz: H = %v, want %v (rel %g)", f, got, want, rel)
		}
	}
}

// A series RLC driven at its resonance f0 = 1/(2π√(LC)) presents Z = R
// (the reactances ωL and 1/(ωC) cancel). f0 is rounded, which leaves a
// reactance of about Q·(few eps)·R, so with Q = 20 the tolerance 1e-12
// holds with a margin. Away from resonance Z = R + j(ωL − 1/(ωC)).
func TestSeriesRLCResonance(t *testing.T) {
	const r, l, cap = 5.0, 1e-3, 1e-6
	f0 := 1 / (2 * math.Pi * math.Sqrt(l*cap))
	c := &Circuit{Elements: []Element{
		V("Vs", "1", "0", 2),
		R("R", "1", "2", r),
		L("L", "2", "3", l),
		C("C", "3", "0", cap),
	}}
	s := mustAC(t, c, f0)
	checkCond(t, s, 1e3)
	z := must[complex128](t)(s.InputImpedance("Vs"))
	if crel(z, complex(r, 0)) > 1e-12 {
		t.Errorf("Z at resonance = %v, want %g ohm", z, r)
	}
	for _, f := range []float64{f0 / 3, 2.5 * f0} {
		s := mustAC(t, c, f)
		w := 2 * math.Pi * f
		want := complex(r, w*l-1/(w*cap))
		if z := must[complex128](t)(s.InputImpedance("Vs")); crel(z, want) > 1e-12 {
			t.Errorf("f = %g: Z = %v, want %v", f, z, want)
		}
		// The same from the source's own voltage and current.
		v := must[complex128](t)(s.ElementVoltage("Vs"))
		i := must[complex128](t)(s.Current("Vs"))
		if crel(-v/i, want) > 1e-12 {
			t.Errorf("f = %g: −V/I = %v, want %v", f, -v/i, want)
		}
	}
}

// A current source pushes its phasor into its To node: into R ∥ C it
// gives V = J·R/(1 + jωRC), and the impedance it sees is R/(1 + jωRC).
// A current divider between R1 and R2 gives I_R1 = J·R2/(R1 + R2).
func TestCurrentSource(t *testing.T) {
	const r, cap, f = 200.0, 1e-6, 1000.0
	j := complex(0.01, -0.02)
	c := &Circuit{Elements: []Element{I("J", "0", "n", j), R("R", "n", "0", r), C("C", "n", "0", cap)}}
	s := mustAC(t, c, f)
	zw := complex(r, 0) / complex(1, 2*math.Pi*f*r*cap)
	if v := must[complex128](t)(s.Voltage("n")); crel(v, j*zw) > 1e-12 {
		t.Errorf("V(n) = %v, want %v", v, j*zw)
	}
	if z := must[complex128](t)(s.InputImpedance("J")); crel(z, zw) > 1e-12 {
		t.Errorf("Z seen by J = %v, want %v", z, zw)
	}
	if p := must[float64](t)(s.Power("J")); p >= 0 {
		t.Errorf("P(J) = %g W: a delivering source must absorb negative power", p)
	}
	d := &Circuit{Elements: []Element{I("J", "0", "n", 3), R("R1", "n", "0", 10), R("R2", "n", "0", 30)}}
	sd := mustAC(t, d, 60)
	if i := must[complex128](t)(sd.Current("R1")); crel(i, 3*30.0/40) > 1e-12 {
		t.Errorf("I(R1) = %v, want 2.25 A", i)
	}
}

// Coupled coils in series: aiding (current enters both at their From
// ends, M > 0) the inductance is L1 + L2 + 2M, opposing L1 + L2 − 2M
// (energy ½LI² with the mutual term counted in both coils' flux).
func TestSeriesCoupledInductors(t *testing.T) {
	const l1, l2, m, f = 2e-3, 8e-3, 3e-3, 1e3
	w := 2 * math.Pi * f
	for _, tc := range []struct {
		from2, to2 string
		want       float64
	}{{"b", "0", l1 + l2 + 2*m}, {"0", "b", l1 + l2 - 2*m}} {
		c := &Circuit{
			Elements:  []Element{V("V", "a", "0", 1), L("L1", "a", "b", l1), L("L2", tc.from2, tc.to2, l2)},
			Couplings: []Coupling{{"L1", "L2", m}},
		}
		s := mustAC(t, c, f)
		z := must[complex128](t)(s.InputImpedance("V"))
		if crel(z, complex(0, w*tc.want)) > 1e-12 {
			t.Errorf("L2 %s→%s: Z = %v, want j·%g", tc.from2, tc.to2, z, w*tc.want)
		}
	}
}

// Reflected impedance: a secondary loop L2 + R2 + load seen from the
// primary adds ω²M²/Z2 (ReflectedImpedance's derivation); the solver sees
// the same through InputImpedance, and Tellegen's theorem (the powers of
// all elements sum to zero) holds.
func TestReflectedImpedanceAgainstSolver(t *testing.T) {
	const l1, r1, l2, r2, rl, f = 10e-6, 0.3, 25e-6, 0.5, 7.0, 150e3
	w := 2 * math.Pi * f
	for _, k := range []float64{0.05, 0.3, -0.7, 0.99} {
		m := k * math.Sqrt(l1*l2)
		c := &Circuit{
			Elements: []Element{
				V("V", "p", "0", 5), R("R1", "p", "q", r1), L("L1", "q", "0", l1),
				L("L2", "s", "0", l2), R("R2", "s", "t", r2), R("RL", "t", "0", rl),
			},
			Couplings: []Coupling{{"L1", "L2", m}},
		}
		s := mustAC(t, c, f)
		checkCond(t, s, 1e3)
		want := complex(r1, w*l1) + ReflectedImpedance(w, m, complex(r2+rl, w*l2))
		if z := must[complex128](t)(s.InputImpedance("V")); crel(z, want) > 1e-12 {
			t.Errorf("k = %g: Z = %v, want %v (rel %g)", k, z, want, crel(z, want))
		}
		var sum, scale float64
		for _, e := range c.Elements {
			p := must[float64](t)(s.Power(e.Name))
			sum += p
			scale = math.Max(scale, math.Abs(p))
		}
		if math.Abs(sum) > 1e-12*scale {
			t.Errorf("k = %g: powers sum to %g W (largest %g W)", k, sum, scale)
		}
	}
}

// With other sources present, InputImpedance zeroes them: V1 —R1— n —R2—
// V2 sees R1 + R2 (V2 shorted), whatever V2's phasor.
func TestInputImpedanceZeroesOtherSources(t *testing.T) {
	c := &Circuit{Elements: []Element{
		V("V1", "a", "0", 1), R("R1", "a", "n", 100), R("R2", "n", "b", 50), V("V2", "b", "0", complex(3, 4)),
		I("J", "0", "n", 0.2),
	}}
	s := mustAC(t, c, 10)
	if z := must[complex128](t)(s.InputImpedance("V1")); crel(z, 150) > 1e-12 {
		t.Errorf("Z seen by V1 = %v, want 150 ohm", z)
	}
	// J sees R1 ∥ R2 = 100·50/150 with both voltage sources shorted.
	if z := must[complex128](t)(s.InputImpedance("J")); crel(z, 100.0*50/150) > 1e-12 {
		t.Errorf("Z seen by J = %v, want %g ohm", z, 100.0*50/150)
	}
	// Superposition gives V(n) = (V1/R1 + V2/R2 + J)/(1/R1 + 1/R2).
	want := (1.0/100 + complex(3, 4)/50 + 0.2) / (1.0/100 + 1.0/50)
	if v := must[complex128](t)(s.Voltage("n")); crel(v, want) > 1e-12 {
		t.Errorf("V(n) = %v, want %v", v, want)
	}
	if _, err := s.InputImpedance("R1"); err == nil || !strings.Contains(err.Error(), "not a source") {
		t.Errorf("InputImpedance of a resistor: %v", err)
	}
}

// A 0-ohm resistor is a short whose current the solver reports (an
// ammeter): it carries the whole current of the loop.
func TestZeroOhmShort(t *testing.T) {
	c := &Circuit{Elements: []Element{V("V", "a", "0", 12), R("A", "a", "b", 0), R("R", "b", "0", 4)}}
	s := mustAC(t, c, 50)
	if i := must[complex128](t)(s.Current("A")); crel(i, 3) > 1e-12 {
		t.Errorf("I(short) = %v, want 3 A", i)
	}
}

// Ideal transformer limit: for k → 1 and ωL2 ≫ |Z_L| the primary sees
// Z_L·L1/L2 = n²·Z_L, n = √(L1/L2) the turns ratio (ideal transformer
// impedance transformation). Exactly, Z_in = jωL1 + ω²M²/(jωL2 + Z_L) =
// n²·Z_L·(1 + δ)/(1 + Z_L/(jωL2)) + … with δ of order (1 − k²)·ωL2/|Z_L|,
// so the relative departure is about |Z_L|/(ωL2) + (1 − k²)·ωL2/|Z_L|.
// With ωL2/|Z_L| = 1e5 and 1 − k = 1e-12 that is ≈ 1e-5 + 2e-7; the
// tolerance is 3e-5. The condition estimate grows like ωL2/|Z_L|
// (asserted below 1e8), far from spoiling a 1e-5 check.
func TestIdealTransformerLimit(t *testing.T) {
	const f = 50.0
	w := 2 * math.Pi * f
	zl := complex(8, 3)
	l2 := 1e5 * cmplx.Abs(zl) / w
	for _, n := range []float64{0.25, 1, 10} {
		l1 := n * n * l2
		k := 1 - 1e-12
		c := &Circuit{
			Elements: []Element{
				V("V", "p", "0", 230), L("L1", "p", "0", l1),
				L("L2", "s", "0", l2), R("RL", "s", "x", real(zl)), L("LL", "x", "0", imag(zl)/w),
			},
			Couplings: []Coupling{{"L1", "L2", k * math.Sqrt(l1*l2)}},
		}
		s := mustAC(t, c, f)
		checkCond(t, s, 1e8)
		z := must[complex128](t)(s.InputImpedance("V"))
		if r := crel(z, complex(n*n, 0)*zl); r > 3e-5 {
			t.Errorf("n = %g: Z_in = %v, want n²·Z_L = %v (rel %g)", n, z, complex(n*n, 0)*zl, r)
		}
		// Voltage ratio of the ideal transformer: V2/V1 = 1/n (the
		// secondary's From end is dotted like the primary's).
		v2 := must[complex128](t)(s.Voltage("s"))
		if r := crel(v2, complex(230/n, 0)); r > 3e-5 {
			t.Errorf("n = %g: V2 = %v, want %g (rel %g)", n, v2, 230/n, r)
		}
	}
}

// Singular circuits at a frequency are refused with their likely cause.
func TestACSingular(t *testing.T) {
	const l, cap = 1e-3, 1e-6
	f0 := 1 / (2 * math.Pi * math.Sqrt(l*cap))
	tank := &Circuit{Elements: []Element{I("J", "0", "n", 1), L("L", "n", "0", l), C("C", "n", "0", cap)}}
	_, err := tank.AC(f0)
	if err == nil || !strings.Contains(err.Error(), "resonate at this frequency with no resistance") {
		t.Errorf("lossless tank at resonance: %v", err)
	}
	// Perfectly coupled coils, the primary held by a source and the
	// secondary shorted: the flux would have to be two values at once.
	tight := &Circuit{
		Elements:  []Element{V("V", "a", "0", 1), L("L1", "a", "0", 1e-3), L("L2", "b", "0", 4e-3), R("S", "b", "0", 0)},
		Couplings: []Coupling{{"L1", "L2", 2e-3}},
	}
	_, err = tight.AC(1e3)
	if err == nil || !strings.Contains(err.Error(), "L1 and L2 are coupled with k = 1") {
		t.Errorf("k = 1 with both coils held: %v", err)
	}
	for _, f := range []float64{0, -1, math.Inf(1), math.NaN()} {
		if _, err := tank.AC(f); err == nil || !strings.Contains(err.Error(), "frequency must be finite and > 0 Hz") {
			t.Errorf("f = %g: %v", f, err)
		}
	}
}

func TestACUnknownNames(t *testing.T) {
	c := &Circuit{Elements: []Element{V("V", "a", "0", 1), R("R", "a", "0", 1)}, Ground: ""}
	s := mustAC(t, c, 1)
	if _, err := s.Voltage("zz"); err == nil || err.Error() != `the circuit has no node "zz"` {
		t.Errorf("unknown node: %v", err)
	}
	if _, err := s.Current("Q"); err == nil || err.Error() != `the circuit has no element "Q"` {
		t.Errorf("unknown element: %v", err)
	}
	if v, err := s.Voltage("0"); err != nil || v != 0 {
		t.Errorf("ground: %v %v", v, err)
	}
}

// A caller may name the reference node.
func TestNamedGround(t *testing.T) {
	c := &Circuit{Elements: []Element{V("V", "a", "gnd", 6), R("R1", "a", "b", 1), R("R2", "b", "gnd", 2)}, Ground: "gnd"}
	s := mustAC(t, c, 1)
	if v := must[complex128](t)(s.Voltage("b")); crel(v, 4) > 1e-12 {
		t.Errorf("V(b) = %v, want 4 V", v)
	}
}

// Perfect coupling (k = 1 exactly) is allowed in AC while a resistance
// closes the secondary: Z_in = jωL1 + ω²M²/(jωL2 + Z_L) with M² = L1·L2
// simplifies to jωL1·Z_L/(jωL2 + Z_L) (the reflected-impedance formula,
// derived in ReflectedImpedance, with the mutual term cancelling the
// primary's own ω²L1L2). Written in this second form the check shares no
// arithmetic with the solver. ωL2/|Z_L| = 10 keeps cond modest.
func TestPerfectCouplingExact(t *testing.T) {
	const f, l1, l2, rl = 1e3, 4e-3, 1e-3, 0.6
	w := 2 * math.Pi * f
	c := &Circuit{
		Elements:  []Element{V("V", "p", "0", 1), L("L1", "p", "0", l1), L("L2", "s", "0", l2), R("RL", "s", "0", rl)},
		Couplings: []Coupling{{"L1", "L2", math.Sqrt(l1 * l2)}},
	}
	s := mustAC(t, c, f)
	checkCond(t, s, 1e6)
	tol := math.Max(1e-12, 2*s.Cond()*eps)
	want := complex(0, w*l1) * rl / complex(rl, w*l2)
	if z := must[complex128](t)(s.InputImpedance("V")); crel(z, want) > tol {
		t.Errorf("Z_in = %v, want %v (rel %.2g)", z, want, crel(z, want))
	}
}

// At series resonance the inductor's and the capacitor's voltages are Q
// times the source's, Q = (1/R)·√(L/C) (voltage magnification of a series
// resonant circuit; standard circuit theory, from memory), and nothing in
// the circuit has more. The rounding of f0 leaves a relative error of a
// few eps·Q, inside 1e-12.
func TestLargestVoltageAtResonance(t *testing.T) {
	const r, l, cap, vs = 5.0, 1e-3, 1e-6, 10.0
	c := &Circuit{Elements: []Element{V("Vs", "1", "0", vs), R("R", "1", "2", r), L("L", "2", "3", l), C("C", "3", "0", cap)}}
	s := mustAC(t, c, 1/(2*math.Pi*math.Sqrt(l*cap)))
	checkCond(t, s, 1e3)
	name, peak := s.LargestVoltage()
	q := math.Sqrt(l/cap) / r
	if (name != "L" && name != "C") || math.Abs(peak-q*vs) > 1e-12*q*vs {
		t.Errorf("largest voltage %s %g V, want L or C at Q·V = %g V", name, peak, q*vs)
	}
	if len(s.Elements()) != 4 {
		t.Errorf("Elements() = %v", s.Elements())
	}
}
