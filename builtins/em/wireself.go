package em

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mathext"
)

// WireCurrent says how the current is spread over a round wire's section.
type WireCurrent int

const (
	// UniformCurrent: uniform density over the section, the low-frequency
	// (skin depth ≫ radius) case. The inductance includes the wire's
	// internal inductance.
	UniformCurrent WireCurrent = iota
	// SurfaceCurrent: all current on the wire's surface, the limit of skin
	// depth ≪ radius. No internal inductance.
	SurfaceCurrent
)

// The self-inductance of a straight round wire, exactly. For a current
// spread over the section with a density that depends only on the
// section (not on z), Neumann's volume integral is
//
//	L = μ0/4π ⟨F(ρ)⟩,  F(ρ) = ∫0^ℓ∫0^ℓ dz dz′/√(ρ² + (z − z′)²)
//	                         = 2[ℓ asinh(ℓ/ρ) − √(ℓ² + ρ²) + ρ],
//
// the mean taken over the distance ρ between two points of the section
// drawn with the current's weight: two points of the disk for uniform
// current, two points of the rim for surface current. The distances have
// the densities (the chord-length distributions of geometric
// probability, e.g. M. G. Kendall and P. A. P. Moran, Geometrical
// Probability, 1963, from memory; with ρ = 2a sin t; the tests compare
// the result with a quadrature over the section itself)
//
//	disk: p dρ = (16/π) sin t cos t (π/2 − t − sin t cos t) dt,
//	rim:  p dρ = (2/π) dt,                       t ∈ [0, π/2].
//
// Splitting F(ρ) = 2[ℓ ln(2ℓ/ρ) − ℓ + ρ] + G(ρ), the first part's mean is
// known in closed form from ⟨ln ρ⟩ (ln a − 1/4 for the disk, its geometric
// mean distance a·e^(−1/4); ln a for the rim) and ⟨ρ⟩ (128a/45π for the
// disk, 4a/π for the rim), and G = O(ρ²/ℓ) is smooth: its mean is taken
// with a fixed Gauss–Legendre rule in t (gonum), whose integrands above
// are smooth on [0, π/2]. For ℓ ≫ a this gives, for uniform current,
//
//	L = μ0ℓ/2π [ln(2ℓ/a) − 3/4 + 128a/(45πℓ) − a²/(4ℓ²) + …],
//
// whose first-order end term 128/45π ≈ 0.905 differs from the 1 of the
// formula with a filament at distance a plus μ0ℓ/8π (E. B. Rosa, "The
// self and mutual inductances of linear conductors", Bull. Bureau of
// Standards 4, 1908).

// xsNodes is the order of the Gauss–Legendre rule for means over the
// section. With the smooth integrands above, 32 nodes give the means of
// smooth functions to rounding (the tests compare with independent
// high-precision quadrature).
const xsNodes = 32

var xsT, xsDisk, xsRim = func() (t, disk, rim []float64) {
	t = make([]float64, xsNodes)
	w := make([]float64, xsNodes)
	quad.Legendre{}.FixedLocations(t, w, 0, math.Pi/2)
	disk = make([]float64, xsNodes)
	rim = make([]float64, xsNodes)
	for i, ti := range t {
		s, c := math.Sincos(ti)
		disk[i] = w[i] * 16 / math.Pi * s * c * (math.Pi/2 - ti - s*c)
		rim[i] = w[i] * 2 / math.Pi
	}
	return t, disk, rim
}()

// xsMean is the mean of g(ρ) over the distance ρ of two points of a
// round wire's section of radius a, weighted by the current.
func xsMean(mode WireCurrent, a float64, g func(rho float64) float64) float64 {
	w := xsDisk
	if mode == SurfaceCurrent {
		w = xsRim
	}
	var sum float64
	for i, t := range xsT {
		sum += w[i] * g(2*a*math.Sin(t))
	}
	return sum
}

// StraightWireInductance is the self-inductance of a straight round wire
// of length l and radius a (current returning at infinity, i.e. its
// partial self-inductance), exactly for the given spread of the current
// (see above).
func StraightWireInductance(l, a float64, mode WireCurrent) float64 {
	lnMean, rhoMean := math.Log(a)-0.25, 128*a/(45*math.Pi)
	if mode == SurfaceCurrent {
		lnMean, rhoMean = math.Log(a), 4*a/math.Pi
	}
	main := 2 * (l*(math.Log(2*l)-lnMean) - l + rhoMean)
	g := func(rho float64) float64 {
		// G = 2ℓ ln((1 + √(1+u))/2) − 2ρ²/(ℓ + √(ℓ² + ρ²)), u = ρ²/ℓ²,
		// written without cancellation
		u := rho * rho / (l * l)
		sq := math.Sqrt(1 + u)
		return 2*l*math.Log1p(u/(1+sq)/2) - 2*rho*rho/(l+l*sq)
	}
	return k0 * (main + xsMean(mode, a, g))
}

// wireKernel is the mean of 1/√(d² + ρ²) over the section, the kernel of
// Neumann's integral between two points of a straight wire's axis d
// apart (d2 = d²). Beyond d = 6a it is the binomial series
// Σ C(−1/2, k) ⟨ρ^2k⟩ d^(−2k−1) (each term at most (2a/d)^2k ≤ 9^−k times
// the first, so xsTerms terms leave below 1e-12); nearer, for surface
// current, a complete elliptic integral, (2/π) ∫0^{π/2} dt/√(d² + 4a² sin²t)
// = (2/π) K(m)/√(d² + 4a²), m = 4a²/(d² + 4a²); for uniform current, the
// Gauss–Legendre mean.
func wireKernel(mode WireCurrent, a, d2 float64) float64 {
	if d2 >= 36*a*a {
		mom := &xsMomDisk
		if mode == SurfaceCurrent {
			mom = &xsMomRim
		}
		// Horner in x = a²/d² of Σ c_k (⟨ρ^2k⟩/a^2k) x^k
		x := a * a / d2
		var sum float64
		for k := xsTerms - 1; k >= 0; k-- {
			sum = sum*x + mom[k]
		}
		return sum / math.Sqrt(d2)
	}
	if mode == SurfaceCurrent {
		q := d2 + 4*a*a
		if d2 == 0 {
			// K diverges like ln(4/√(1 − m)); the mean of 1/ρ over the rim
			// is infinite, but only on a null set of the double integral
			return 0
		}
		return 2 / math.Pi * mathext.CompleteK(4*a*a/q) / math.Sqrt(q)
	}
	return xsMean(mode, a, func(rho float64) float64 { return 1 / math.Sqrt(d2+rho*rho) })
}

// xsTerms is the number of terms of wireKernel's series.
const xsTerms = 14

// xsMomDisk and xsMomRim hold C(−1/2, k)·⟨ρ^2k⟩/a^2k for the disk and the
// rim, the means taken by the Gauss–Legendre rule (exact for these
// trigonometric polynomials to rounding).
var xsMomDisk, xsMomRim = func() (disk, rim [xsTerms]float64) {
	for k := range xsTerms {
		c := 1.0 // C(−1/2, k) = Π_{j<k} (−1/2 − j)/(j + 1)
		for j := 0; j < k; j++ {
			c *= (-0.5 - float64(j)) / float64(j+1)
		}
		pow := func(rho float64) float64 { return math.Pow(rho, float64(2*k)) }
		disk[k] = c * xsMean(UniformCurrent, 1, pow)
		rim[k] = c * xsMean(SurfaceCurrent, 1, pow)
	}
	return disk, rim
}()

// LoopSelfInductance is the self-inductance of a circular ring of radius R
// made of round wire of radius a, by its expansion in a/R. For uniform
// current density over the section:
//
//	L = μ0R[(1 + a²/8R²) ln(8R/a) − 7/4 + a²/24R²] + O((a/R)⁴ ln(8R/a))
//
// (the a²/R² terms as quoted from memory for a ring of round wire after
// W. Wien, Ann. Phys. 1894, and E. B. Rosa and F. W. Grover, "Formulas and
// tables for the calculation of mutual and self-inductance", Bull. Bureau
// of Standards 8, 1912; the constant of the a²/R² term is also met quoted
// as −0.0083, which the independent computation in the tests does not
// support for uniform density: it finds +1/24 to 1e-5). The density of a
// direct current in a ring is in truth ∝ 1/r (r from the axis), which
// lowers L by about 0.35% at a/R = 0.1; uniform density is kept, as for
// the straight pieces. For surface current, the leading terms
// μ0R[ln(8R/a) − 2]; the next, of order (a/R)² ln(8R/a), depend on how
// the current spreads round the surface.
func LoopSelfInductance(R, a float64, mode WireCurrent) float64 {
	x := a / R
	lg := math.Log(8 / x)
	if mode == SurfaceCurrent {
		return Mu0 * R * (lg - 2)
	}
	return Mu0 * R * ((1+x*x/8)*lg - 1.75 + x*x/24)
}

// LoopSelfTruncation bounds the truncation of LoopSelfInductance's series
// for uniform current: μ0R(a/R)⁴ ln(8R/a)/100, which the tests confirm
// against an independent computation of the ring (a/R from 0.05 to 0.2).
// For surface current the omitted terms depend on how the current spreads
// round the surface, a matter of the model rather than of the series, and
// 0 is returned.
func LoopSelfTruncation(R, a float64, mode WireCurrent) float64 {
	if mode == SurfaceCurrent {
		return 0
	}
	x := a / R
	return Mu0 * R * x * x * x * x * math.Log(8/x) / 100
}
