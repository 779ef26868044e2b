package wire

import (
	"math"
	"testing"
)

// TestImpedanceReference compares Z/R_dc = (τa/2) I0(τa)/I1(τa) with the
// same expression evaluated by mpmath 1.3.0 (mp.besseli of complex
// argument, 30 digits; a Bessel implementation sharing nothing with ours).
// Tolerance 1e-13 relative: the Kelvin functions' error relative to their
// envelope (TestKelvinReference) over a ratio that is of the size of its
// parts, with the series' cancellation at q = √2 a/δ ≤ 20 (≤ 350 eps).
func TestImpedanceReference(t *testing.T) {
	for _, c := range []struct{ x, r, l float64 }{
		{0.01, 1.0000000002083333333, 0.99999999989583333335},
		{0.1, 1.0000020833298611175, 0.99999895833521411689},
		{0.5, 1.0013007285557945953, 0.99934969216657346706},
		{1, 1.0204923888556225039, 0.98976799312601107616},
		{1.5, 1.0973282460892441103, 0.95167284780307139771},
		{2, 1.2646429062732133774, 0.87048259560419090602},
		{3, 1.7681316525097367123, 0.6506869425280540031},
		{5, 2.7681076007342900832, 0.39627596609133663352},
		{7, 3.7631693235496656106, 0.28445152185808872607},
		{10, 5.2593018575107975116, 0.19958510099575455074},
		{14, 7.256671053004345627, 0.14271026726881129047},
		{20, 10.254679114660353903, 0.099950704761289168753},
		{30, 15.25312258640297979, 0.0666523047107322406},
		{100, 50.250937437410289809, 0.019999621225395389864},
		{1000, 500.25009374993837098, 0.0019999996246247539067},
	} {
		if r := ResistanceRatio(c.x); math.Abs(r/c.r-1) > 1e-13 {
			t.Errorf("R_ac/R_dc(a/δ = %g) = %.17g, want %.17g", c.x, r, c.r)
		}
		if l := InductanceRatio(c.x); math.Abs(l/c.l-1) > 1e-13 {
			t.Errorf("L_i/L_i,dc(a/δ = %g) = %.17g, want %.17g", c.x, l, c.l)
		}
	}
	if ResistanceRatio(0) != 1 || InductanceRatio(0) != 1 {
		t.Error("at DC both ratios must be 1")
	}
}

// TestImpedanceLowFrequency checks the low-frequency expansion
//
//	R_ac/R_dc = 1 + x⁴/48 − x⁸/2880 + …,   L_i/L_i,dc = 1 − x⁴/96 + 13x⁸/69120 − …
//
// (x = a/δ; the coefficients follow from the power series of I0 and I1,
// A&S 9.6.10, by dividing them; the x⁴/48 term is the classical one, e.g.
// Ramo, Whinnery and Van Duzer 1994, §5.6, written there with (√2 a/δ)⁴/192).
// The tolerance is the first omitted term plus rounding; the x⁴ term
// checked is at least 2880/48/x⁴ ≥ 60 times larger, so a wrong
// coefficient fails.
func TestImpedanceLowFrequency(t *testing.T) {
	for _, x := range []float64{1e-3, 0.05, 0.2, 0.5, 1} {
		x4 := x * x * x * x
		if d := math.Abs(ResistanceRatio(x) - (1 + x4/48)); d > x4*x4/2880+1e-15 {
			t.Errorf("a/δ = %g: R_ac/R_dc − (1 + x⁴/48) = %.3g, beyond the next term %.3g", x, d, x4*x4/2880)
		}
		if d := math.Abs(InductanceRatio(x) - (1 - x4/96)); d > 13*x4*x4/69120+1e-15 {
			t.Errorf("a/δ = %g: L_i ratio − (1 − x⁴/96) = %.3g, beyond the next term %.3g", x, d, 13*x4*x4/69120)
		}
	}
}

// TestImpedanceHighFrequency checks the high-frequency expansion
//
//	R_ac/R_dc = x/2 + 1/4 + 3/(32x) − 63/(1024x³) − …
//	L_i/L_i,dc = 2/x − 3/(8x³) − 3/(8x⁴) − …
//
// (from I0/I1 ~ 1 + 1/(2z) + 3/(8z²) + 3/(8z³) + … of A&S 9.7.1 with
// z = (1 + i)x; the first two terms of R are the classical a/2δ + 1/4,
// e.g. Ramo, Whinnery and Van Duzer 1994, §5.6). The tolerance is the first
// omitted term, doubled for the terms after it, plus e^{−2x} for the
// exponentially small part the expansion leaves out. The 3/(32x) term is
// checked too: at x ≥ 5 it is over 20 times the tolerance.
func TestImpedanceHighFrequency(t *testing.T) {
	for _, x := range []float64{5, 8, 15, 30, 200, 1e4, 1e8, 1e9, 1e200} {
		r := x/2 + 0.25 + 3/(32*x)
		tol := 2*63/(1024*x*x*x) + math.Exp(-2*x) + 4e-16*r
		if d := math.Abs(ResistanceRatio(x) - r); d > tol {
			t.Errorf("a/δ = %g: R_ac/R_dc − (x/2 + 1/4 + 3/32x) = %.3g, tolerance %.3g", x, d, tol)
		}
		l := 2/x - 3/(8*x*x*x)
		tolL := 2*3/(8*x*x*x*x) + math.Exp(-2*x) + 4e-16*l
		if d := math.Abs(InductanceRatio(x) - l); d > tolL {
			t.Errorf("a/δ = %g: L_i ratio − (2/x − 3/8x³) = %.3g, tolerance %.3g", x, d, tolL)
		}
	}
}

// TestImpedanceTerman compares R_ac/R_dc with the classic table for an
// isolated round wire in F. E. Terman, Radio Engineers' Handbook (1943),
// indexed by x = √2 a/δ (values from memory, three decimals; the
// tolerance is half a unit in the last place shown).
func TestImpedanceTerman(t *testing.T) {
	for _, c := range []struct{ q, r float64 }{
		{1, 1.005}, {2, 1.078}, {3, 1.318}, {4, 1.678}, {5, 2.043}, {6, 2.394}, {10, 3.799},
	} {
		if r := ResistanceRatio(c.q / math.Sqrt2); math.Abs(r-c.r) > 0.0005 {
			t.Errorf("x = %g: R_ac/R_dc = %.5f, the table gives %.3f", c.q, r, c.r)
		}
	}
}

// TestImpedanceODE solves the diffusion equation for the current density
// in a round wire, J″ + J′/r = (2i/δ²) J (Maxwell's equations in a good
// conductor; Ramo, Whinnery and Van Duzer 1994, §5.6), by classical
// Runge–Kutta from the axis outward, and forms Z/R_dc = πa² J(a) / I with
// I = 2π ∫ r J dr = 2π a J′(a) δ²/(2i): a route that shares no code with
// the Bessel functions. Runge–Kutta's error falls as the step to the
// fourth power; the test runs n and 2n steps, requires them to agree to
// 1e-11, and then the closed form to agree with the finer to 1e-10.
func TestImpedanceODE(t *testing.T) {
	solve := func(x float64, n int) complex128 {
		// δ = 1, a = x; y = (J, v = r J′), J′ = v/r, v′ = k² r J
		k2 := complex(0, 2)
		r0 := x * 1e-6 // start off the axis with the series J = 1 + k²r²/4
		j := 1 + k2*complex(r0*r0/4, 0)
		v := k2 * complex(r0*r0/2, 0)
		h := (x - r0) / float64(n)
		f := func(r float64, j, v complex128) (complex128, complex128) {
			return v / complex(r, 0), k2 * complex(r, 0) * j
		}
		r := r0
		for i := 0; i < n; i++ {
			a1, b1 := f(r, j, v)
			a2, b2 := f(r+h/2, j+complex(h/2, 0)*a1, v+complex(h/2, 0)*b1)
			a3, b3 := f(r+h/2, j+complex(h/2, 0)*a2, v+complex(h/2, 0)*b2)
			a4, b4 := f(r+h, j+complex(h, 0)*a3, v+complex(h, 0)*b3)
			j += complex(h/6, 0) * (a1 + 2*a2 + 2*a3 + a4)
			v += complex(h/6, 0) * (b1 + 2*b2 + 2*b3 + b4)
			r += h
		}
		// I/(2π) = ∫ r J dr = v(a)/k²; Z/R_dc = a² J(a) / (2 v(a)/k²)
		return complex(x*x, 0) * j * k2 / (2 * v)
	}
	for _, x := range []float64{0.3, 1, 2.5, 5} {
		n := 4000
		z1, z2 := solve(x, n), solve(x, 2*n)
		if d := abs(z1 - z2); d > 1e-11*abs(z2) {
			t.Fatalf("a/δ = %g: Runge–Kutta has not converged (%.3g)", x, d)
		}
		z := InternalImpedance(x)
		if d := abs(z - z2); d > 1e-10*abs(z2) {
			t.Errorf("a/δ = %g: Z/R_dc = %v, the differential equation gives %v", x, z, z2)
		}
	}
}

func abs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }

// TestDowellSingleLayer: for one layer the factor is Dowell's skin term
// Δ(sinh 2Δ + sin 2Δ)/(cosh 2Δ − cos 2Δ) (Dowell 1966, m = 1), computed
// here directly from the hyperbolic functions; where cosh 2Δ − cos 2Δ
// cancels (≈ 4Δ² from terms near 1) it loses eps/Δ², so the tolerance is
// 4 eps (1 + 1/Δ²).
func TestDowellSingleLayer(t *testing.T) {
	for _, d := range []float64{0.05, 0.3, 1, 1.7, 3, 8, 20} {
		want := d * (math.Sinh(2*d) + math.Sin(2*d)) / (math.Cosh(2*d) - math.Cos(2*d))
		if got := DowellFactor(1, d); math.Abs(got/want-1) > 4*0x1p-52*(1+1/(d*d)) {
			t.Errorf("Δ = %g: F(1 layer) = %.17g, direct %.17g", d, got, want)
		}
	}
}

// TestDowellLowFrequency checks F = 1 + (5m² − 1)Δ⁴/45 − (85m² − 21)Δ⁸/18900
// + …: with sinh 2Δ + sin 2Δ = 4Δ + 4(2Δ)⁵/5!·… the skin term is
// 1 + 4Δ⁴/45 − 16Δ⁸/4725, and 2Δ(sinh Δ − sin Δ)/(cosh Δ + cos Δ) =
// Δ⁴/3 − 17Δ⁸/1260 (Taylor series of both quotients); with the weight
// (m² − 1)/3 the Δ⁴ terms add to (4 + 5(m² − 1))/45 = (5m² − 1)/45. The
// tolerance is the Δ⁸ term, 5% over for the terms after it (Δ ≤ 0.4), plus
// one rounding of a number near 1 on each side (2 × 2^-52); the
// Δ⁴ term is at least 18900/(85·45·Δ⁴) ≥ 190 times larger.
func TestDowellLowFrequency(t *testing.T) {
	for _, m := range []float64{1, 2, 3, 5, 10} {
		for _, d := range []float64{1e-5, 1e-3, 0.05, 0.2, 0.4} {
			d4 := d * d * d * d
			want := 1 + (5*m*m-1)*d4/45
			tol := 1.05*(85*m*m-21)*d4*d4/18900 + 2*0x1p-52
			if got := DowellFactor(m, d); math.Abs(got-want) > tol {
				t.Errorf("m = %g, Δ = %g: F = %.17g, 1 + (5m² − 1)Δ⁴/45 = %.17g (difference %.3g, tolerance %.3g)", m, d, got, want, math.Abs(got-want), tol)
			}
		}
	}
}

// TestDowellHighFrequency checks the large-Δ asymptote F ≈ Δ(2m² + 1)/3
// (both quotients tend to 1). Their departures are below
// 2e^{−2Δ}(|sin 2Δ| + |cos 2Δ|) + 2e^{−4Δ} ≤ 3.5e^{−2Δ} and
// 2e^{−Δ}(|sin Δ| + |cos Δ|) + 2e^{−2Δ} ≤ 3.5e^{−Δ}; the tolerance on F/Δ
// is their weighted sum, plus rounding. Δ = 800 checks there is no overflow.
func TestDowellHighFrequency(t *testing.T) {
	for _, m := range []float64{1, 2, 4, 12} {
		for _, d := range []float64{6, 12, 30, 800} {
			want := (2*m*m + 1) / 3
			tol := 3.5*math.Exp(-2*d) + 2*(m*m-1)/3*3.5*math.Exp(-d) + 4e-16*want
			if got := DowellFactor(m, d) / d; math.Abs(got-want) > tol {
				t.Errorf("m = %g, Δ = %g: F/Δ = %.17g, (2m² + 1)/3 = %.17g", m, d, got, want)
			}
		}
	}
}

// TestDowellODE builds Dowell's factor from its physics by a route that
// shares no code with the closed form: each layer k of m is a conducting
// foil of thickness Δ (skin depth 1) in a one-dimensional field, with the
// magnetic field H = k − 1 on its inner face and k on its outer face (in
// units of one layer's current per unit breadth; Ampère's law). Inside,
// H″ = 2i H (diffusion in a good conductor). The test finds H′(0) by
// shooting (two Runge–Kutta solutions, the problem being linear), then
// integrates the loss ∫|H′|² dx (J = H′, resistivity 1) by Simpson's rule
// on the Runge–Kutta grid. The DC loss of the same current is 1/Δ, so the
// layer's factor is Δ ∫|H′|²; the winding's is the mean over its layers.
// Both rules err as the fourth power of the step: the test runs n and 2n
// steps, requires them to agree to 1e-10, and the closed form to agree
// with the finer to 1e-9.
func TestDowellODE(t *testing.T) {
	k2 := complex(0, 2)
	// rk integrates (H, H′) from 0 to d in n steps and returns the end
	// values and the Simpson sum of |H′|².
	rk := func(d float64, n int, h0, g0 complex128) (h, g complex128, loss float64) {
		step := d / float64(n)
		hs := complex(step, 0)
		h, g = h0, g0
		sq := func(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }
		loss = sq(g)
		for i := 1; i <= n; i++ {
			a1, b1 := g, k2*h
			a2, b2 := g+hs/2*b1, k2*(h+hs/2*a1)
			a3, b3 := g+hs/2*b2, k2*(h+hs/2*a2)
			a4, b4 := g+hs*b3, k2*(h+hs*a3)
			h += hs / 6 * (a1 + 2*a2 + 2*a3 + a4)
			g += hs / 6 * (b1 + 2*b2 + 2*b3 + b4)
			w := 2.0
			if i == n {
				w = 1
			} else if i%2 == 1 {
				w = 4
			}
			loss += w * sq(g)
		}
		return h, g, loss * step / 3
	}
	factor := func(m int, d float64, n int) float64 {
		sum := 0.0
		for k := 1; k <= m; k++ {
			lo, hi := complex(float64(k-1), 0), complex(float64(k), 0)
			// H(d) = lo·A(d) + s·B(d) with A from (1, 0), B from (0, 1)
			ha, _, _ := rk(d, n, 1, 0)
			hb, _, _ := rk(d, n, 0, 1)
			s := (hi - lo*ha) / hb
			_, _, loss := rk(d, n, lo, s)
			sum += d * loss
		}
		return sum / float64(m)
	}
	for _, m := range []int{1, 2, 3, 6} {
		for _, d := range []float64{0.2, 0.8, 1.5, 3} {
			n := 2000
			f1, f2 := factor(m, d, n), factor(m, d, 2*n)
			if math.Abs(f1/f2-1) > 1e-10 {
				t.Fatalf("m = %d, Δ = %g: Runge–Kutta and Simpson have not converged (%g, %g)", m, d, f1, f2)
			}
			if got := DowellFactor(float64(m), d); math.Abs(got/f2-1) > 1e-9 {
				t.Errorf("m = %d, Δ = %g: Dowell's factor %.12g, the layer-by-layer field solution %.12g", m, d, got, f2)
			}
		}
	}
}

// TestDowellDelta checks the round-wire equivalence against the form in
// which Hurley, Gath and Breslin (IEEE Trans. Power Electron. 15(2), 2000;
// from memory) write it, Δ = (π/4)^{3/4} (d/δ) √(d/p), and that the square
// conductor has the round wire's area (h² = πd²/4). Tolerance: a few
// roundings.
func TestDowellDelta(t *testing.T) {
	for _, c := range []struct{ d, p, delta float64 }{{1e-3, 1.1e-3, 0.21e-3}, {0.2e-3, 0.25e-3, 0.66e-3}, {2e-3, 2e-3, 9.3e-3}} {
		want := math.Pow(math.Pi/4, 0.75) * c.d / c.delta * math.Sqrt(c.d/c.p)
		if got := DowellDelta(c.d, c.p, c.delta); math.Abs(got/want-1) > 1e-15 {
			t.Errorf("d = %g, p = %g, δ = %g: Δ = %.17g, want %.17g", c.d, c.p, c.delta, got, want)
		}
		if h := RoundToSquare * c.d; math.Abs(h*h/(math.Pi*c.d*c.d/4)-1) > 1e-15 {
			t.Errorf("the square of side %g does not have the area of a round wire of diameter %g", h, c.d)
		}
	}
}
