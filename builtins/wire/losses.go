package wire

import (
	"math"
)

// InternalImpedance returns the internal impedance per unit length of an
// isolated straight round wire of radius a carrying sinusoidal current,
// divided by its DC resistance per unit length, as a function of x = a/δ
// (δ the skin depth √(2ρ/ωμ)):
//
//	Z/R_dc = (τa/2) I0(τa)/I1(τa),  τ = (1 + i)/δ
//
// which is Ramo, Whinnery and Van Duzer's form (Fields and Waves in
// Communication Electronics, 3rd ed., 1994, §5.6) written with modified
// Bessel functions of argument τa = √2 x e^{iπ/4}, i.e. with ber, bei of
// q = √2 a/δ. The real part is R_ac/R_dc; the imaginary part is ωL_i/R_dc,
// which at DC is x²/4 (L_i = μ0/8π per unit length).
func InternalImpedance(x float64) complex128 {
	if x == 0 {
		return 1
	}
	if math.Sqrt2*x <= seriesMax {
		return impedanceSeries(x)
	}
	z := complex(math.Sqrt2*x, 0) * rot45 // = (1 + i) x
	return z / 2 * besselRatio(math.Sqrt2*x)
}

// impedanceSeries returns (z/2) I0(z)/I1(z), z = (1 + i)x, as N/D with
//
//	N = I0(z) = Σ u^k/(k!)²,   D = 2 I1(z)/z = Σ u^k/(k!(k+1)!),   u = z²/4 = i x²/2
//
// (A&S 9.6.10). Forming the quotient from these two sums keeps the small
// imaginary part ωL_i/R_dc ≈ x²/4 accurate to rounding at low frequency,
// where taking it from ber, bei, ber′, bei′ would leave it as the
// difference of numbers near 1.
func impedanceSeries(x float64) complex128 {
	u := complex(0, x*x/2)
	tn, td := complex(1, 0), complex(1, 0)
	n, d := tn, td
	big := 1.0
	for k := 1; k < 500; k++ {
		fk := float64(k)
		tn *= u / complex(fk*fk, 0)
		td *= u / complex(fk*(fk+1), 0)
		n += tn
		d += td
		a := math.Hypot(real(tn), imag(tn))
		big = math.Max(big, a)
		if a < 0x1p-60*big && fk*fk > x*x/2 {
			break
		}
	}
	return n / d
}

// ResistanceRatio returns R_ac/R_dc of an isolated round wire, x = a/δ.
func ResistanceRatio(x float64) float64 { return real(InternalImpedance(x)) }

// InductanceRatio returns the internal inductance of an isolated round wire
// relative to its DC value μ0/8π per unit length, x = a/δ.
func InductanceRatio(x float64) float64 {
	if x < 1e-4 {
		// ωL_i/R_dc = x²/4 − x⁶/384 + …: the ratio is 1 − x⁴/96 to
		// double precision here, and x²/4 would underflow for tiny x
		return 1 - x*x*x*x/96
	}
	if x > 1e8 {
		// 2/x − 3/(8x³) to double precision (next term 3/(8x⁴)), and x²
		// would overflow for huge x
		return 2/x - 3/(8*x*x*x)
	}
	return imag(InternalImpedance(x)) / (x * x / 4)
}

// RoundToSquare is the side of the square conductor of the same cross
// section as a round wire of unit diameter, √π/2: the replacement of round
// conductors by square ones of equal area that Dowell (1966) made (from
// memory).
var RoundToSquare = math.Sqrt(math.Pi) / 2

// DowellDelta returns Dowell's Δ for a layer of round wires of diameter d
// at pitch p (centre to centre along the layer), skin depth δ: the wire is
// replaced by a square conductor of side h = (√π/2) d and the layer by a
// foil of thickness h whose conductivity is scaled by the porosity
// (layer copper factor) η = h/p, so Δ = (h/δ)√η = (π/4)^{3/4} (d/δ) √(d/p)
// (Dowell 1966; the form as written in W. G. Hurley, E. Gath and J. G.
// Breslin, "Optimizing the AC resistance of multilayer transformer windings
// with arbitrary current waveforms", IEEE Trans. Power Electron. 15(2),
// 2000; from memory).
func DowellDelta(d, p, delta float64) float64 {
	h := RoundToSquare * d
	return h / delta * math.Sqrt(h/p)
}

// DowellFactor returns the ratio of AC to DC resistance of a winding of m
// layers in a one-dimensional field (P. L. Dowell, "Effects of eddy currents
// in transformer windings", Proc. IEE 113(8), 1966, pp. 1387–1394):
//
//	F = Δ [ (sinh 2Δ + sin 2Δ)/(cosh 2Δ − cos 2Δ)
//	       + (2(m² − 1)/3) (sinh Δ − sin Δ)/(cosh Δ + cos Δ) ]
//
// the first term the skin effect of each layer, the second the proximity
// effect of the layers below it, averaged over the m layers. Evaluated
// without overflow for large Δ and without cancellation for small Δ.
func DowellFactor(m, d float64) float64 {
	if d < 1e-4 {
		// F = 1 + (5m² − 1)Δ⁴/45 − (85m² − 21)Δ⁸/18900 + …; the Δ⁸ term is
		// below 1e-16 (relative) here for m up to 1e4 (m² Δ⁸ ≤ 1e-24)
		d4 := d * d * d * d
		return 1 + (5*m*m-1)*d4/45
	}
	return d * (skinTerm(d) + 2*(m*m-1)/3*proximityTerm(d))
}

// skinTerm returns (sinh 2Δ + sin 2Δ)/(cosh 2Δ − cos 2Δ), Δ > 0.
func skinTerm(d float64) float64 {
	if d > 1 {
		e2, e4 := math.Exp(-2*d), math.Exp(-4*d)
		return (1 - e4 + 2*e2*math.Sin(2*d)) / (1 + e4 - 2*e2*math.Cos(2*d))
	}
	// cosh 2Δ − cos 2Δ = 2 sinh²Δ + 2 sin²Δ, without cancellation
	sh, s := math.Sinh(d), math.Sin(d)
	return (math.Sinh(2*d) + math.Sin(2*d)) / (2*sh*sh + 2*s*s)
}

// proximityTerm returns (sinh Δ − sin Δ)/(cosh Δ + cos Δ), Δ > 0.
func proximityTerm(d float64) float64 {
	if d > 2 {
		e1, e2 := math.Exp(-d), math.Exp(-2*d)
		return (1 - e2 - 2*e1*math.Sin(d)) / (1 + e2 + 2*e1*math.Cos(d))
	}
	// sinh Δ − sin Δ = 2 Σ_{j≥0} Δ^{4j+3}/(4j+3)!: the terms fall by at
	// least Δ⁴/(4·5·6·7) ≤ 1/52 each for Δ ≤ 2, so 12 terms reach 1e-20
	d4 := d * d * d * d
	t := d * d * d / 6
	sum := 0.0
	for j := 0; j < 12; j++ {
		sum += t
		n := float64(4*j + 3)
		t *= d4 / ((n + 1) * (n + 2) * (n + 3) * (n + 4))
	}
	return 2 * sum / (math.Cosh(d) + math.Cos(d))
}
