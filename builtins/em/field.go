package em

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/spatial/r3"
)

// Mu0 is the magnetic constant, CODATA 2018 (N/A^2).
const Mu0 = 1.25663706212e-6

// k0 is μ0/4π, the Biot–Savart prefactor.
const k0 = Mu0 / (4 * math.Pi)

// ErrOnWire is returned when a field point lies on a filament, where the
// field of a thin wire is infinite.
var ErrOnWire = errors.New("the field point lies on a wire")

// onWireRel is the distance from a curved filament (arc, helix), relative
// to its radius, below which a point counts as on the wire.
const onWireRel = 1e-10

// A point counts as on a straight filament when its distance from the line
// is at most segOnWire(n1, n2), n1 and n2 its distances from the ends, and
// its foot lies between them: 1e-13 of the distance to the nearer end (the
// geometry near the point: a wire's field there is that of an infinite wire
// to 1e-13, and a thin-filament answer that close means nothing) plus 64
// roundings of the distance to the farther end (below that the distance
// itself is rounding: the coordinates of the ends and the point carry
// errors of ε·|r|). It does not grow with the segment's length: 35 mm from
// the middle of a segment 2×10⁹ m long is off the wire (1e-4 m is the limit
// there), as it is for a 10 cm segment.
func segOnWire(n1, n2 float64) float64 {
	return 1e-13*math.Min(n1, n2) + 64*0x1p-53*math.Max(n1, n2)
}

// nearLineRel marks points close enough to a segment's line, relative to
// its length, for the field kernel to hand them to SegmentB; it only
// chooses the careful path, SegmentB decides.
const nearLineRel = 1e-10

// SegmentB returns B at x of a straight filament from a to b carrying 1 A
// (closed form; e.g. Hanson & Hirshman, "Compact expressions for the
// Biot–Savart fields of a filamentary segment", Phys. Plasmas 9, 4410,
// 2002):
//
//	B = μ0/4π · (r1 × r2)(|r1| + |r2|) / (|r1||r2|(|r1||r2| + r1·r2)),  ri = end_i − x.
//
// r1 × r2 is computed as r1 × (b − a), and |r1||r2| + r1·r2 as
// |r1 × r2|² / (|r1||r2| − r1·r2) when r1·r2 < 0, so that points close to
// the wire keep their digits.
func SegmentB(a, b, x Vec) (Vec, error) {
	r1 := r3.Sub(a, x)
	r2 := r3.Sub(b, x)
	d := r3.Sub(b, a)
	n1, n2 := r3.Norm(r1), r3.Norm(r2)
	l := r3.Norm(d)
	c := r3.Cross(r1, d)
	nn := n1 * n2
	if r3.Norm(c) <= segOnWire(n1, n2)*l {
		if onSegment(a, b, x, l) {
			return Vec{}, ErrOnWire
		}
		return Vec{}, nil // on the line beyond the ends: B = 0
	}
	s := sumTerm(nn, r3.Dot(r1, r2), r3.Dot(c, c))
	return finiteOrOnWire(r3.Scale(k0*(n1+n2)/(nn*s), c))
}

// sumTerm returns |r1||r2| + r1·r2 without cancellation: when the dot
// product is negative it is |r1 × r2|² / (|r1||r2| − r1·r2).
func sumTerm(nn, dot, cross2 float64) float64 {
	if dot >= 0 {
		return nn + dot
	}
	return cross2 / (nn - dot)
}

// onSegment reports whether x, already known to lie on the line through a
// and b (within segOnWire), lies between them or at an end.
func onSegment(a, b, x Vec, l float64) bool {
	d := r3.Sub(b, a)
	t := r3.Dot(r3.Sub(x, a), d) / (l * l)
	n1, n2 := r3.Norm(r3.Sub(a, x)), r3.Norm(r3.Sub(b, x))
	slack := segOnWire(n1, n2) / l
	return t >= -slack && t <= 1+slack
}

// SegmentA returns the vector potential A at x of a straight filament from a
// to b carrying 1 A:
//
//	A = μ0/4π · ê · ln((R1 + R2 + L)/(R1 + R2 − L)),
//
// with R1 + R2 − L computed as 2(R1R2 + r1·r2)/(R1 + R2 + L) to keep its
// digits near the wire, and the logarithm taken as log1p(2L/(R1 + R2 − L))
// so that far away, where the ratio is 1 + O(L/R), it keeps them too (the
// plain logarithm of the rounded ratio lost ε·R/L of itself: 1e-14 at
// 50 lengths).
func SegmentA(a, b, x Vec) (Vec, error) {
	r1 := r3.Sub(a, x)
	r2 := r3.Sub(b, x)
	n1, n2 := r3.Norm(r1), r3.Norm(r2)
	d := r3.Sub(b, a)
	l := r3.Norm(d)
	sum := n1 + n2
	c := r3.Cross(r1, d)
	small := 2 * sumTerm(n1*n2, r3.Dot(r1, r2), r3.Dot(c, c)) / (sum + l)
	if small <= 0 || (r3.Norm(c) <= segOnWire(n1, n2)*l && onSegment(a, b, x, l)) {
		return Vec{}, ErrOnWire
	}
	return finiteOrOnWire(r3.Scale(k0*math.Log1p(2*l/small)/l, d))
}

// arcLocal holds a field point in the frame of an arc's circle.
type arcLocal struct {
	rho, z   float64
	ex, ey   Vec     // radial and azimuthal unit vectors at the point
	phi1     float64 // arc start angle relative to the point's azimuth, in (-π, π]
	p2, m    float64 // P² = (a+ρ)² + z² and m = 4aρ/P²
	mc       float64 // 1 − m = ((a−ρ)² + z²)/P², computed without cancellation
	distWire float64 // distance from the circle
}

// localArc puts x into the frame of p's circle. The coordinates along U, V
// and N are computed as if in twice the working precision (localCoords):
// near the axis the radial part ρ is tiny against x − C, and forming it as
// (x − C) − ((x − C)·N)N, as it once was, left it an error of ε|x − C|,
// relative ε|x − C|/ρ (1e-8 at ρ = 1e-8 of the radius), which also tipped
// the radial unit vector out of the arc's plane. The radial and azimuthal
// unit vectors are built from U and V with the point's azimuth, so they
// stay in the plane whatever ρ is.
func localArc(p Prim, x Vec) arcLocal {
	wu, wv, z := localCoords(x, p.C, p.U, p.V, p.N)
	rho := math.Hypot(wu, wv)
	var l arcLocal
	l.rho, l.z = rho, z
	cpsi, spsi, psi := 1.0, 0.0, 0.0
	if rho > 0 {
		cpsi, spsi = wu/rho, wv/rho
		psi = math.Atan2(wv, wu)
	}
	l.ex = r3.Add(r3.Scale(cpsi, p.U), r3.Scale(spsi, p.V))
	l.ey = r3.Add(r3.Scale(-spsi, p.U), r3.Scale(cpsi, p.V))
	l.phi1 = math.Remainder(-psi, 2*math.Pi)
	a := p.R
	l.p2 = (a+rho)*(a+rho) + z*z
	l.m = 4 * a * rho / l.p2
	l.mc = ((a-rho)*(a-rho) + z*z) / l.p2
	l.distWire = math.Hypot(rho-a, z)
	return l
}

// localCoords returns (x − c)·u, (x − c)·v and (x − c)·n, each correct to
// a few roundings of itself, not of |x − c|: the difference is split
// exactly into a sum hi + lo (twoSum) and the dot products are summed
// with exact products and exact sums (Ogita, Rump & Oishi, "Accurate sum
// and dot product", SIAM J. Sci. Comput. 26, 2005, algorithm Dot2: as if
// computed in twice the precision, then rounded). u, v, n are taken as
// exact; x and c as given.
func localCoords(x, c, u, v, n Vec) (wu, wv, wn float64) {
	dx, ex := twoSum(x.X, -c.X)
	dy, ey := twoSum(x.Y, -c.Y)
	dz, ez := twoSum(x.Z, -c.Z)
	dot := func(e Vec) float64 {
		p, s := twoProd(dx, e.X)
		h, q := twoProd(dy, e.Y)
		p, r := twoSum(p, h)
		s += q + r
		h, q = twoProd(dz, e.Z)
		p, r = twoSum(p, h)
		s += q + r
		// the low parts of the difference: products of size ε|x − c|,
		// whose own roundings are ε² of it
		s += ex*e.X + ey*e.Y + ez*e.Z
		return p + s
	}
	return dot(u), dot(v), dot(n)
}

// twoSum returns a + b rounded and its rounding error, exactly (Knuth, The
// Art of Computer Programming, vol. 2, 4.2.2, theorem B).
func twoSum(a, b float64) (s, e float64) {
	s = a + b
	bb := s - a
	e = (a - (s - bb)) + (b - bb)
	return s, e
}

// twoProd returns a·b rounded and its rounding error, exactly (by a fused
// multiply-add; math.FMA is exact in software where the CPU has none).
func twoProd(a, b float64) (p, e float64) {
	p = a * b
	return p, math.FMA(a, b, -p)
}

// ellipticSet holds F, D = ∫ sin²/Δ, H = ∫ sin²/Δ³ and G = ∫ 1/Δ³ from 0
// to θ, Δ = √(1 − m sin²θ), for any real θ.
type ellipticSet struct{ F, D, H, G float64 }

// completes holds K(m) and D(m) = ∫0^{π/2} sin²/Δ.
type completes struct{ K, D float64 }

// completeOf returns K(m) and D(m) = (K − E)/m. Near m = 1 (points close
// to the circle) it uses the expansions in mc = 1 − m (Abramowitz &
// Stegun, Handbook of Mathematical Functions, 1964, 17.3.26 and 17.3.36),
// since gonum's functions see only the rounded 1 − m.
func completeOf(m, mc float64) completes {
	if mc < 1e-8 {
		l := math.Log(4 / math.Sqrt(mc))
		k := l + mc/4*(l-1)
		e := 1 + mc/2*(l-0.5)
		return completes{k, (k - e) / m}
	}
	return completes{mathext.CompleteK(m), mathext.CompleteD(m)}
}

// ellipticAt evaluates the set at θ using Carlson's forms (gonum mathext):
// F = s·RF(c², Δ², 1), D = (s³/3)·RD(c², Δ², 1) for |θ| ≤ π/2, extended by
// quasi-periodicity; then, from d/dθ(s·c/Δ) = (1−2s²)/Δ + m s² c²/Δ³,
//
//	H = (F − D − s c/Δ)/(1 − m),   G = F + m·H,
//
// which stay accurate as m → 0 (points near the axis).
func ellipticAt(theta, m float64, cm completes) ellipticSet {
	k := math.Round(theta / math.Pi)
	tr := theta - k*math.Pi
	s, c := math.Sincos(tr)
	delta2 := 1 - m*s*s
	f := s*mathext.EllipticRF(c*c, delta2, 1) + 2*k*cm.K
	dd := s*s*s/3*mathext.EllipticRD(c*c, delta2, 1) + 2*k*cm.D
	st, ct := math.Sincos(theta)
	scd := st * ct / math.Sqrt(1-m*st*st)
	h := (f - dd - scd) / (1 - m)
	return ellipticSet{F: f, D: dd, H: h, G: f + m*h}
}

// closeToCircle is 1 − m below which an arc (not a whole circle) is
// integrated numerically: the closed form's 1/(1 − m) cancellation would
// cost more than two digits.
const closeToCircle = 0.01

// arcIntegrals returns, over the arc, with R² = ρ² + a² + z² − 2aρ cos φ:
// I3 = ∫dφ/R³, C3 = ∫cos φ/R³, S3 = ∫sin φ/R³, I1 = ∫dφ/R, C1 = ∫cos φ/R,
// S1 = ∫sin φ/R, by the substitution φ = π − 2θ, R² = P²(1 − m sin²θ).
func arcIntegrals(p Prim, l arcLocal) (i3, c3, s3, c1, s1 float64) {
	a := p.R
	P := math.Sqrt(l.p2)
	if p.IsCircle() {
		cm := completeOf(l.m, l.mc)
		fF := 2 * cm.K
		fD := 2 * cm.D
		fH := (fF - fD) / l.mc
		fG := fF + l.m*fH
		i3 = 2 / (P * P * P) * fG
		c3 = 2 / (P * P * P) * (2*fH - fG)
		if s, ok := circleC3Series(a, l.rho, l.z); ok {
			c3 = s
		}
		c1 = circleC1(a, l.rho, l.z)
		return i3, c3, 0, c1, 0
	}
	if beta := 2 * a * l.rho / (l.rho*l.rho + a*a + l.z*l.z); beta < arcSeriesBeta {
		return arcSeries(p, l, beta)
	}
	cm := completeOf(l.m, l.mc)
	phi1 := l.phi1
	phi2 := phi1 + p.Span
	th1 := (math.Pi - phi1) / 2
	th2 := th1 - p.Span/2
	e1 := ellipticAt(th1, l.m, cm)
	e2 := ellipticAt(th2, l.m, cm)
	dF, dD, dH, dG := e1.F-e2.F, e1.D-e2.D, e1.H-e2.H, e1.G-e2.G
	i3 = 2 / (P * P * P) * dG
	c3 = 2 / (P * P * P) * (2*dH - dG)
	c1 = 2 / P * (2*dD - dF)
	base := l.rho*l.rho + a*a + l.z*l.z
	cos1, cos2 := math.Cos(phi1), math.Cos(phi2)
	r1 := math.Sqrt(math.Max(base-2*a*l.rho*cos1, 0))
	r2 := math.Sqrt(math.Max(base-2*a*l.rho*cos2, 0))
	s3 = 2 * (cos1 - cos2) / (r1 * r2 * (r1 + r2))
	s1 = 2 * (cos1 - cos2) / (r1 + r2)
	return
}

// arcSeries returns arcIntegrals' five integrals of an arc (not a whole
// circle) by their series in β = 2aρ/S², S² = ρ² + a² + z², for
// β < arcSeriesBeta.
//
// The closed forms are differences of incomplete elliptic integrals at the
// arc's ends, of O(1) each; near the axis and far away (β small) C1 and C3
// are O(β) or less for some arcs (a nearly whole circle, an arc symmetric
// about the point's azimuth), and the differences kept about ε/β of them
// (3e-14 of A at β = 0.005 for a circle less 1e-6 rad). Without
// cancellation, by the binomial series
//
//	1/R = S⁻¹ Σn c_n βⁿ cosⁿφ,   c_n = c_(n−1)(2n − 1)/(2n),
//	1/R³ = S⁻³ Σn d_n βⁿ cosⁿφ,  d_n = d_(n−1)(2n + 1)/(2n),  c_0 = d_0 = 1,
//
// integrated term by term over the arc (φ1 … φ2 = φ1 + span) with
// J_n = ∫cosⁿφ dφ and K_n = ∫cosⁿφ sin φ dφ:
//
//	I3 = S⁻³ Σ d_n βⁿ J_n,  C3 = S⁻³ Σ d_n βⁿ J_(n+1),  S3 = S⁻³ Σ d_n βⁿ K_n,
//	C1 = S⁻¹ Σ c_n βⁿ J_(n+1),  S1 = S⁻¹ Σ c_n βⁿ K_n,
//
// J_0 = span, J_n = [cos^(n−1)φ sin φ]/n + (n − 1)/n · J_(n−2) (a
// recurrence whose errors shrink by (n − 1)/n a step), and
// K_n = [−cos^(n+1)φ]/(n + 1). The two that may be small against their
// ends' values are formed as products: J_1 = sin φ2 − sin φ1 =
// 2 cos(φ1 + span/2) sin(span/2) and K_0 = cos φ1 − cos φ2 =
// 2 sin(φ1 + span/2) sin(span/2); every later term carries a factor β
// and an absolute error of a few ε, so each integral is right to a few ε
// of Σ|its terms|, which for C1 and C3 is within O(1) of the result. The
// terms fall at least like βⁿ√n (|J_n|, |K_n| ≤ span, c_n ≤ 1, d_n ≤
// 2√n): below β = 1/4 at most about 30 of them reach 2^-60; they are
// summed until the bound d_n βⁿ span on every term falls below 2^-60 of
// the largest partial sums.
func arcSeries(p Prim, l arcLocal, beta float64) (i3, c3, s3, c1, s1 float64) {
	phi1 := l.phi1
	phi2 := phi1 + p.Span
	s1a, c1a := math.Sincos(phi1)
	s2a, c2a := math.Sincos(phi2)
	sm, cm := math.Sincos(phi1 + p.Span/2)
	sh := math.Sin(p.Span / 2)
	jPrev, jCur := p.Span, 2*cm*sh // J_0, J_1
	k0n := 2 * sm * sh             // K_0
	// cos^n at both ends, for the boundary terms
	pw1, pw2 := 1.0, 1.0
	cn, dn, bn := 1.0, 1.0, 1.0
	var sI3, sC3, sS3, sC1, sS1, absC, absI float64
	for n := 0; n < len(recip)-2; n++ {
		fn := float64(n)
		if n > 0 {
			r := 0.5 * recip[n] // 1/(2n)
			cn *= (2*fn - 1) * r
			dn *= (2*fn + 1) * r
			bn *= beta
		}
		// J_n = jPrev, J_(n+1) = jCur; K_n from cos^(n+1) at the ends
		pn1, pn2 := pw1*c1a, pw2*c2a // cos^(n+1)
		var kn float64
		if n == 0 {
			kn = k0n
		} else {
			kn = (pn1 - pn2) * recip[n+1]
		}
		tI3, tC3, tS3 := dn*bn*jPrev, dn*bn*jCur, dn*bn*kn
		tC1, tS1 := cn*bn*jCur, cn*bn*kn
		sI3 += tI3
		sC3 += tC3
		sS3 += tS3
		sC1 += tC1
		sS1 += tS1
		absC = math.Max(absC, math.Max(math.Abs(sC1), math.Abs(sC3)))
		absI = math.Max(absI, math.Max(math.Abs(sI3), math.Max(math.Abs(sS1), math.Abs(sS3))))
		if n > 1 && dn*bn*p.Span < 0x1p-60*math.Max(absC, absI) {
			break
		}
		// J_(n+2) = [cos^(n+1)φ sin φ]/(n + 2) + (n + 1)/(n + 2) · J_n
		jNext := ((pn2*s2a - pn1*s1a) + (fn+1)*jPrev) * recip[n+2]
		jPrev, jCur = jCur, jNext
		pw1, pw2 = pn1, pn2
	}
	s := math.Sqrt(l.rho*l.rho + p.R*p.R + l.z*l.z)
	s3cube := s * s * s
	return sI3 / s3cube, sC3 / s3cube, sS3 / s3cube, sC1 / s, sS1 / s
}

// arcSeriesBeta is β below which arcIntegrals takes arcSeries for an arc:
// above it the closed form's ε/β is a few ε (TestNearlyFullArc: 5.4e-15
// at β = 0.27). The series needs about 30 terms at β = 1/4 and costs
// up to about twice the closed form there, less far away
// (BenchmarkArcFieldBeta); at β = 1/2 it would cost about four.
const arcSeriesBeta = 0.25

// recip holds 1/k, so that arcSeries divides by none (its loop stops long
// before 200 terms: about 30 at β = 1/4).
var recip = func() (r [200]float64) {
	for k := 1; k < len(r); k++ {
		r[k] = 1 / float64(k)
	}
	return r
}()

// circleC1 returns C1 = ∫0^2π cos φ dφ/R of a whole circle of radius a,
// R² = ρ² + a² + z² − 2aρ cos φ, so that A_φ = μ0 I a/4π · C1.
//
// In complete elliptic integrals of m = 4aρ/P² (as arcIntegrals has it for
// arcs) C1 = (4/P)(2D(m) − K(m)) = (4/(P m))·[(2 − m)K − 2E], and
// (2 − m)K − 2E is O(m²) while its terms are O(1): near the axis
// (m ≈ 4ρa/(a² + z²)) that form kept a relative accuracy of only about
// 1e-16·a/ρ. Two forms without cancellation:
//
// Near the axis, the series. With S² = a² + z² + ρ² and β = 2aρ/S² < 1,
//
//	1/R = S⁻¹(1 − β cos φ)^(−1/2) = S⁻¹ Σn c_n βⁿ cosⁿφ,  c_n = C(2n, n)/4ⁿ,
//
// and ∫0^2π cos^(n+1)φ dφ = 2π c_(j+1) when n + 1 = 2(j + 1), else 0, so
//
//	C1 = (π a ρ/S³) · Σj t_j β^(2j),  t_j = 4 c_(2j+1) c_(j+1):
//	t_0 = 1, t_1 = 15/32, t_2 = 315/1024, …
//
// i.e. A_φ = μ0 I a² ρ/(4 S³) · (1 + 15β²/32 + 315β⁴/1024 + …). In ρ
// (S and β expanded to ρ²) this is μ0 I a² ρ/(4(a² + z²)^(3/2)) ·
// (1 + 3ρ²(a² − 4z²)/(8(a² + z²)²) + O(ρ⁴)), the next term asked of the
// familiar leading one. The two terms are used while the first omitted
// one, 315β⁴/1024, is below 1e-16: β² < √(1e-16·1024/315) = 1.80e-8.
//
// Elsewhere, Landen's transformation (Abramowitz & Stegun, Handbook of
// Mathematical Functions, 1964, 17.5: with k' = √(1 − m) and
// k1 = (1 − k')/(1 + k'), K(m) = (1 + k1)K(k1²) and
// E(m) = (1 + k')E(k1²) − k'K(m)). Since 2 − m + 2k' = (1 + k')² and
// 1 + k1 = 2/(1 + k'),
//
//	(2 − m)K(m) − 2E(m) = 2(1 + k')(K(k1²) − E(k1²)) = 2(1 + k')k1² D(k1²),
//
// D(m) = (K − E)/m (gonum's CompleteD, Carlson's RD: no cancellation). With
// r1 = √((a − ρ)² + z²) and r2 = P = √((a + ρ)² + z²) the nearest and
// farthest distances, k' = r1/r2, k1 = (r2 − r1)/(r2 + r1) = 4aρ/(r1 + r2)²
// and k1²/m = k1/(1 + k')², P(1 + k') = r1 + r2, which gives
//
//	C1 = 8 k1 D(k1²)/(r1 + r2) = 32 a ρ D(k1²)/(r1 + r2)³,
//
// every factor positive and formed without a difference of near-equal
// numbers. On the axis both give C1 = πaρ/S³ to first order.
func circleC1(a, rho, z float64) float64 {
	s2 := a*a + z*z + rho*rho
	beta := 2 * a * rho / s2
	if beta*beta < circleSeriesBeta2 {
		return math.Pi * a * rho / (s2 * math.Sqrt(s2)) * (1 + 15.0/32*beta*beta)
	}
	r1 := math.Hypot(a-rho, z)
	r2 := math.Hypot(a+rho, z)
	q := r1 + r2
	k1 := 4 * a * rho / (q * q)
	return 32 * a * rho * mathext.CompleteD(k1*k1) / (q * q * q)
}

// circleSeriesBeta2 is β² below which circleC1 takes its two-term series:
// there the first omitted term, 315β⁴/1024, is below 1e-16.
const circleSeriesBeta2 = 1.80e-8

// circleC3Series returns C3 = ∫0^2π cos φ dφ/R³ of a whole circle of
// radius a, R² = ρ² + a² + z² − 2aρ cos φ, by its series in β where
// β < circleC3Beta (ok false elsewhere). B_ρ = μ0 I a z/4π · C3.
//
// The closed form 2/P³·(2H − G) (arcIntegrals) is a difference of O(1)
// terms equal to O(m), m = 4aρ/P²: near the axis it kept about ε/m of
// itself (B_ρ off by 5e-4 at ρ = 1e-12 a, 5e-15 still at β ≈ 0.02).
// Without cancellation: with S² = a² + z² + ρ², β = 2aρ/S² < 1,
//
//	R⁻³ = S⁻³(1 − β cos φ)^(−3/2) = S⁻³ Σn d_n βⁿ cosⁿφ,
//	d_n = (3/2)(5/2)…((2n+1)/2)/n!,  d_n = d_(n−1)(2n + 1)/(2n),
//
// (the binomial series), and ∫0^2π cos^(n+1)φ dφ = 2π c_(j+1) when
// n + 1 = 2(j + 1), else 0, c_k = C(2k, k)/4^k = c_(k−1)(2k − 1)/(2k)
// (Wallis), so only odd n = 2j + 1 remain:
//
//	C3 = (2π/S³) Σj d_(2j+1) c_(j+1) β^(2j+1) = (3π a ρ/S⁵) Σj u_j β^(2j),
//	u_0 = 1,  u_j = u_(j−1) · (4j+1)(4j+3)/((4j)(4j+2)) · (2j+1)/(2j+2),
//	u_1 = 35/32, u_2 = 1155/1024, …
//
// so B_ρ = 3μ0 I a² z ρ/(4S⁵) · (1 + 35β²/32 + 1155β⁴/1024 + …), whose
// leading term is the familiar near-axis 3μ0 I a² z ρ/(4(a² + z²)^(5/2)).
// u_j grows like √j at most (d_n ~ √n, c_k ~ 1/√k), so below
// β = circleC3Beta = 1/2 the terms fall by about β² = 1/4 each and about
// 30 of them reach 1e-17 of the sum; they are summed until a term is below
// 2^-60 of the sum (their rounding: a few ε). At β ≥ 1/2 the closed form's
// ε/m is a few ε.
func circleC3Series(a, rho, z float64) (float64, bool) {
	s2 := a*a + z*z + rho*rho
	beta := 2 * a * rho / s2
	if !(beta < circleC3Beta) {
		return 0, false
	}
	b2 := beta * beta
	sum, term := 1.0, 1.0
	for j := 1; j < 80; j++ {
		fj := float64(j)
		term *= b2 * (4*fj + 1) * (4*fj + 3) / ((4 * fj) * (4*fj + 2)) * (2*fj + 1) / (2*fj + 2)
		sum += term
		if term < 0x1p-60*sum {
			break
		}
	}
	s := math.Sqrt(s2)
	return 3 * math.Pi * a * rho / (s2 * s2 * s) * sum, true
}

// circleC3Beta is β below which circleC3Series replaces the closed form.
const circleC3Beta = 0.5

// nearArc reports whether x (in local form l) is on the arc itself.
func nearArc(p Prim, l arcLocal) bool {
	if l.distWire > onWireRel*p.R {
		return false
	}
	if p.IsCircle() {
		return true
	}
	// the point's azimuth relative to the arc start is -phi1
	ang := math.Mod(-l.phi1+2*math.Pi, 2*math.Pi)
	return ang <= p.Span+1e-12
}

// ArcB returns B at x of an arc (or circle) carrying 1 A:
//
//	B = μ0 a/4π · (z·C3, z·S3, a·I3 − ρ·C3)
//
// in the point's cylindrical frame (radial, azimuthal, axial). For a whole
// circle this is the classical complete-elliptic-integral field of a loop.
func ArcB(p Prim, x Vec) (Vec, error) {
	l := localArc(p, x)
	if nearArc(p, l) {
		return Vec{}, ErrOnWire
	}
	if !p.IsCircle() && l.mc < closeToCircle {
		return numericB(p, x, nil)
	}
	i3, c3, s3, _, _ := arcIntegrals(p, l)
	f := k0 * p.R
	br := f * l.z * c3
	bphi := f * l.z * s3
	bz := f * (p.R*i3 - l.rho*c3)
	return finiteOrOnWire(r3.Add(r3.Add(r3.Scale(br, l.ex), r3.Scale(bphi, l.ey)), r3.Scale(bz, p.N)))
}

// finiteOrOnWire passes a finite field; a point so close to a filament that
// the closed form overflows counts as on the wire.
func finiteOrOnWire(v Vec) (Vec, error) {
	for _, c := range []float64{v.X, v.Y, v.Z} {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return Vec{}, ErrOnWire
		}
	}
	return v, nil
}

// ArcA returns the vector potential at x of an arc (or circle) carrying
// 1 A: A = μ0 a/4π · (−S1, C1, 0) in the point's cylindrical frame.
func ArcA(p Prim, x Vec) (Vec, error) {
	l := localArc(p, x)
	if nearArc(p, l) {
		return Vec{}, ErrOnWire
	}
	if !p.IsCircle() && l.mc < closeToCircle {
		return numericA(p, x, nil)
	}
	_, _, _, c1, s1 := arcIntegrals(p, l)
	f := k0 * p.R
	return finiteOrOnWire(r3.Add(r3.Scale(-f*s1, l.ex), r3.Scale(f*c1, l.ey)))
}

// fieldTol is the accuracy asked of numerical field integrals: relative
// 1e-12 of the result, or an absolute floor far below any field of interest.
var fieldTol = Tol{Rel: 1e-12, Abs: 1e-30}

// numericB integrates Biot–Savart along the exact primitive; stop, if not
// nil, may end the integral early with its error.
func numericB(p Prim, x Vec, stop func() error) (Vec, error) {
	return numericAlong(p, x, biotKernel(p), stop)
}

// biotKernel is the integrand of B along p: μ0/4π · dl × r/|r|³.
func biotKernel(p Prim) func(r Vec, n, t float64) Vec {
	return func(r Vec, n float64, t float64) Vec {
		return r3.Scale(k0/(n*n*n), r3.Cross(p.Tangent(t), r))
	}
}

// potKernel is the integrand of A along p: μ0/4π · dl/|r|.
func potKernel(p Prim) func(r Vec, n, t float64) Vec {
	return func(r Vec, n float64, t float64) Vec {
		return r3.Scale(k0/n, p.Tangent(t))
	}
}

// numericA integrates μ0/4π ∫ dl/|x − r'| along the exact primitive.
func numericA(p Prim, x Vec, stop func() error) (Vec, error) {
	return numericAlong(p, x, potKernel(p), stop)
}

// numericAlong integrates kernel(x − r(t), |x − r(t)|, t) over the
// primitive by adaptive quadrature per quarter turn; a sample on the wire
// itself means the point is on the wire.
func numericAlong(p Prim, x Vec, kernel func(r Vec, n, t float64) Vec, stop func() error) (Vec, error) {
	v, _, err := numericAlongEst(p, x, kernel, stop)
	return v, err
}

// numericAlongEst is numericAlong with the quadrature's error estimate.
func numericAlongEst(p Prim, x Vec, kernel func(r Vec, n, t float64) Vec, stop func() error) (Vec, float64, error) {
	var bad bool
	f := func(t float64) Vec {
		r := r3.Sub(x, p.Point(t))
		// the plain root of the sum of squares: r3.Norm's scaled form
		// (against overflow beyond 1e154 m, which no geometry reaches)
		// took a third of the time of a helix's inductance
		n := math.Sqrt(r.X*r.X + r.Y*r.Y + r.Z*r.Z)
		if n == 0 {
			bad = true
			return Vec{}
		}
		return kernel(r, n, t)
	}
	tol := fieldTol
	tol.Stop = stop
	v, est, err := IntegrateVecBreaks(f, primBreaks(p), tol)
	if bad {
		return Vec{}, 0, ErrOnWire
	}
	if err = acceptLoose(err); err != nil {
		return Vec{}, 0, err
	}
	return v, est, nil
}

// primBreaks splits an arc or helix into quarter turns for quadrature.
func primBreaks(p Prim) []float64 {
	n := int(math.Ceil(math.Abs(p.Span) / (math.Pi / 2)))
	n = max(1, n)
	pts := make([]float64, n+1)
	for i := range pts {
		pts[i] = float64(i) / float64(n)
	}
	return pts
}

// PrimB returns B at x of one primitive carrying 1 A.
func PrimB(p Prim, x Vec) (Vec, error) { return primB(p, x, nil) }

// PrimA returns A at x of one primitive carrying 1 A.
func PrimA(p Prim, x Vec) (Vec, error) { return primA(p, x, nil) }

// primB is PrimB whose numerical integral (of a helix) polls stop.
func primB(p Prim, x Vec, stop func() error) (Vec, error) {
	switch p.Kind {
	case Segment:
		return SegmentB(p.A, p.B, x)
	case Arc:
		return ArcB(p, x)
	default:
		if helixOnWire(p, x) {
			return Vec{}, ErrOnWire
		}
		return numericB(p, x, stop)
	}
}

// primA is PrimA whose numerical integral (of a helix) polls stop.
func primA(p Prim, x Vec, stop func() error) (Vec, error) {
	switch p.Kind {
	case Segment:
		return SegmentA(p.A, p.B, x)
	case Arc:
		return ArcA(p, x)
	default:
		if helixOnWire(p, x) {
			return Vec{}, ErrOnWire
		}
		return numericA(p, x, stop)
	}
}

// helixOnWire checks whether x lies on the helix: it must be on its
// cylinder, within its length, at the height the helix has at x's azimuth.
func helixOnWire(p Prim, x Vec) bool {
	d := r3.Sub(x, p.C)
	z := r3.Dot(d, p.N)
	w := r3.Sub(d, r3.Scale(z, p.N))
	tol := onWireRel * p.R
	if math.Abs(r3.Norm(w)-p.R) > tol {
		return false
	}
	psi := math.Atan2(r3.Dot(w, p.V), r3.Dot(w, p.U))
	if psi < 0 {
		psi += 2 * math.Pi
	}
	turn := 2 * math.Pi * p.Pitch
	for phi := psi; phi <= p.Span+1e-12; phi += 2 * math.Pi {
		if math.Abs(z-p.Pitch*phi) <= tol+1e-12*math.Abs(turn) {
			return true
		}
	}
	return false
}

// PathB returns B at x of a path carrying 1 A.
func PathB(path Path, x Vec) (Vec, error) {
	var sum Vec
	for _, p := range path.Prims {
		b, err := PrimB(p, x)
		if err != nil {
			return Vec{}, err
		}
		sum = r3.Add(sum, b)
	}
	return sum, nil
}

// PathA returns A at x of a path carrying 1 A.
func PathA(path Path, x Vec) (Vec, error) {
	var sum Vec
	for _, p := range path.Prims {
		a, err := PrimA(p, x)
		if err != nil {
			return Vec{}, err
		}
		sum = r3.Add(sum, a)
	}
	return sum, nil
}
