package wire

import (
	"math"
	"math/cmplx"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

// envelope is the size of the Kelvin functions at x, e^{x/√2}/√(2πx),
// floored at 1: errors are judged against it, because ber and bei
// oscillate inside it and have zeros where a relative error means nothing.
func envelope(x float64) float64 {
	if x < 1 {
		return 1
	}
	return math.Max(1, math.Exp(x/math.Sqrt2)/math.Sqrt(2*math.Pi*x))
}

// kelvinTol is the error allowed at x, relative to the envelope: the power
// series loses the factor e^{(1−1/√2)x} (its largest term, ≈ I0(x), over
// the envelope) to cancellation, times a few roundings per term; the
// asymptotic series (x > 20) holds to a few roundings. 32 eps covers the
// roundings of the up to ~30 significant terms.
func kelvinTol(x float64) float64 {
	return 32 * 0x1p-52 * math.Exp((1-1/math.Sqrt2)*math.Min(x, seriesMax))
}

// TestKelvinReference compares ber, bei, ber′, bei′ with values computed
// by mpmath 1.3.0 (F. Johansson et al., mpmath: a Python library for
// arbitrary-precision floating-point arithmetic), mp.ber(0, x) and
// mp.bei(0, x) and their derivatives by mp.diff, at 30 significant digits.
// The digits at x = 1, 2, 5 and 10 also agree with Abramowitz and Stegun,
// Handbook of Mathematical Functions (1964), Table 9.12, as far as shown
// there (ber 1 = 0.98438 178, bei 1 = 0.24956 604, ber 10 = 138.84047,
// bei 10 = 56.37046; from memory).
func TestKelvinReference(t *testing.T) {
	for _, c := range []struct{ x, ber, bei, dber, dbei float64 }{
		{0.5, 0.99902346399083825555, 0.06249321838219945865, -0.0078120761475077336011, 0.24991862111621022199},
		{1, 0.98438178121308688397, 0.24956604003665972142, -0.062445752179030960236, 0.49739651146809732686},
		{2, 0.75173418271380822855, 0.9722916273066612061, -0.49306712470943912175, 0.91701361338403627153},
		{3, -0.22138024959869388887, 1.9375867852660427669, -1.5698466322294041768, 0.88048232405786145306},
		{5, -6.2300824786663577332, 0.1160343815502003781, -3.8453394732621545237, -4.3541405148431109225},
		{8, 20.97395561073025607, -35.016725164881512426, 38.311325700898018583, -7.6603184136498265087},
		{10, 138.84046594163264721, 56.370458553906638233, 51.195258393599611382, 135.30930171596461358},
		{15, -2967.2545346351292112, -2952.7078873441172756, 91.05533316976338726, -4087.7552368464164126},
		{20, 47489.370265061760145, 114775.19736006622162, -48803.197847170976459, 111855.02522349712378},
		{25, 9797.7169497354902811, -3808789.9114440356868, 2700522.3179499552562, -2609578.7488822996074},
		{30, -46117602.577984999506, 109955713.1825060993, -109598679.07444193027, 43292237.219370731665},
		{40, -112596696872.07407499, 45628130285.641257762, -110470788109.8525011, -47933243273.888905089},
		{50, -117623968512357.44233, -50192646254462.213707, -46498923792942.996901, -118164845285864.86235},
	} {
		b, i, db, di := Kelvin(c.x)
		tol := kelvinTol(c.x) * envelope(c.x)
		for _, v := range []struct {
			name      string
			got, want float64
		}{{"ber", b, c.ber}, {"bei", i, c.bei}, {"ber'", db, c.dber}, {"bei'", di, c.dbei}} {
			if math.Abs(v.got-v.want) > tol {
				t.Errorf("%s(%g) = %.17g, want %.17g (error %.2g, tolerance %.2g)", v.name, c.x, v.got, v.want, math.Abs(v.got-v.want), tol)
			}
		}
		// symmetry: ber, bei even; ber′, bei′ odd
		nb, ni, ndb, ndi := Kelvin(-c.x)
		if nb != b || ni != i || ndb != -db || ndi != -di {
			t.Errorf("Kelvin(-%g) is not the mirror of Kelvin(%g)", c.x, c.x)
		}
	}
}

// TestKelvinSmall checks the functions at small x against the first two
// terms of their power series, which are exact (A&S 9.9.10):
//
//	ber x = 1 − x⁴/64 + x⁸/147456 − …     bei x = x²/4 − x⁶/2304 + …
//	ber′ x = −x³/16 + x⁷/18432 − …         bei′ x = x/2 − x⁵/384 + …
//
// The tolerance is the next term (x¹²/2.1e9, x¹⁰/1.5e7 and their
// derivatives) plus one rounding.
func TestKelvinSmall(t *testing.T) {
	for _, x := range []float64{1e-3, 0.01, 0.1, 0.3, 0.6} {
		b, i, db, di := Kelvin(x)
		x2 := x * x
		x4 := x2 * x2
		eps := 0x1p-52
		checks := []struct {
			name           string
			got, want, tol float64
		}{
			{"ber", b, 1 - x4/64 + x4*x4/147456, math.Pow(x, 12)/2123366400 + eps},
			{"bei", i, x2/4 - x4*x2/2304, math.Pow(x, 10)/14745600 + eps*x2},
			{"ber'", db, -x2*x/16 + x4*x2*x/18432, 12*math.Pow(x, 11)/2123366400 + eps*x2*x},
			{"bei'", di, x/2 - x4*x/384, 10*math.Pow(x, 9)/14745600 + eps*x},
		}
		for _, c := range checks {
			if math.Abs(c.got-c.want) > c.tol {
				t.Errorf("%s(%g) = %.17g, series %.17g (difference %.2g, tolerance %.2g)", c.name, x, c.got, c.want, math.Abs(c.got-c.want), c.tol)
			}
		}
	}
	if b, i, db, di := Kelvin(0); b != 1 || i != 0 || db != 0 || di != 0 {
		t.Errorf("Kelvin(0) = %g %g %g %g, want 1 0 0 0", b, i, db, di)
	}
}

// TestKelvinMethodsAgree compares the power series with the asymptotic
// expansion where both hold. The series' error is kelvinTol (cancellation);
// the asymptotic expansion's is about its smallest term, ≈ e^{−2x}
// (A&S 9.10, error bounded by the first omitted term), so they must agree
// to the sum of the two.
func TestKelvinMethodsAgree(t *testing.T) {
	for _, x := range []float64{12, 14, 16, 18, 20, 22, 25} {
		ws, dws := kelvinSeries(x)
		wa, dwa := kelvinAsymptotic(x)
		tol := (kelvinTol(x) + 4*math.Exp(-2*x)) * envelope(x)
		if d := cmplx.Abs(ws - wa); d > tol {
			t.Errorf("x = %g: series and asymptotic ber + i bei differ by %.2g (tolerance %.2g)", x, d, tol)
		}
		if d := cmplx.Abs(dws - dwa); d > tol {
			t.Errorf("x = %g: series and asymptotic ber′ + i bei′ differ by %.2g (tolerance %.2g)", x, d, tol)
		}
	}
}

// TestKelvinIntegrals checks the derivatives against the functions by the
// integrals that follow from Kelvin's equation (x w′)′ = i x w
// (A&S 9.9.4 with 9.9.1):
//
//	∫₀^X x bei x dx = −X ber′ X,   ∫₀^X x ber x dx = X bei′ X
//
// by Gauss–Legendre quadrature (gonum quad.Fixed, 200 nodes: the integrand
// is entire and varies on a scale of 1, so the rule is exact to rounding
// for X ≤ 30). Tolerance: the functions' own error (kelvinTol) times X and
// the envelope.
func TestKelvinIntegrals(t *testing.T) {
	for _, X := range []float64{2, 7, 15, 24, 30} {
		ib := quad.Fixed(func(x float64) float64 { _, bei, _, _ := Kelvin(x); return x * bei }, 0, X, 200, nil, 0)
		ir := quad.Fixed(func(x float64) float64 { ber, _, _, _ := Kelvin(x); return x * ber }, 0, X, 200, nil, 0)
		_, _, db, di := Kelvin(X)
		tol := 4 * X * kelvinTol(X) * envelope(X)
		if d := math.Abs(ib + X*db); d > tol {
			t.Errorf("∫₀^%g x bei = %.15g, −X ber′ X = %.15g (difference %.2g, tolerance %.2g)", X, ib, -X*db, d, tol)
		}
		if d := math.Abs(ir - X*di); d > tol {
			t.Errorf("∫₀^%g x ber = %.15g, X bei′ X = %.15g (difference %.2g, tolerance %.2g)", X, ir, X*di, d, tol)
		}
	}
}
