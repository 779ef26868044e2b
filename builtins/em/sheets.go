package em

import (
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Cel is Bulirsch's generalized complete elliptic integral
//
//	cel(kc, p, c, s) = ∫₀^{π/2} (c cos²φ + s sin²φ) / ((cos²φ + p sin²φ) √(cos²φ + kc² sin²φ)) dφ
//
// by his arithmetic–geometric-mean iteration (R. Bulirsch, "Numerical
// calculation of elliptic integrals and elliptic functions III", Numer.
// Math. 13, 305–315, 1969; the form used by N. Derby and S. Olbert,
// "Cylindrical magnets and ideal solenoids", Am. J. Phys. 78, 229, 2010 —
// written here from memory). Written by hand: gonum has K and E but not
// this integral, and the sheet fields need its p ≠ 1 form. kc must not be
// 0 (that is the logarithmic singularity at a sheet's edge; NaN then).
// The iteration converges quadratically; it stops when the last two means
// agree to 1e-8, which leaves the result at rounding level.
func Cel(kc, p, c, s float64) float64 {
	if kc == 0 {
		return math.NaN()
	}
	const errtol = 1e-8
	k := math.Abs(kc)
	pp, cc, ss := p, c, s
	em := 1.0
	if p > 0 {
		pp = math.Sqrt(p)
		ss = s / pp
	} else {
		f := kc * kc
		q := 1 - f
		g := 1 - pp
		f -= pp
		q *= ss - c*pp
		pp = math.Sqrt(f / g)
		cc = (c - ss) / g
		ss = -q/(g*g*pp) + cc*pp
	}
	f := cc
	cc += ss / pp
	g := k / pp
	ss = 2 * (ss + f*g)
	pp += g
	g = em
	em += k
	kk := k
	for n := 0; math.Abs(g-k) > g*errtol && n < 60; n++ {
		k = 2 * math.Sqrt(kk)
		kk = k * em
		f = cc
		cc += ss / pp
		g = kk / pp
		ss = 2 * (ss + f*g)
		pp += g
		g = em
		em += k
	}
	return math.Pi / 2 * (ss + cc*em) / (em * (em + pp))
}

// sheetTol is the accuracy asked of the sheets' numerical integrals over
// their length.
var sheetTol = Tol{Rel: 1e-11, Abs: 1e-300}

// onFace is the relative distance from a sheet within which a point counts
// as on it.
const onFace = 1e-9

// CylinderSheet is a finite cylindrical current sheet: radius R, length L,
// centred on C, about the unit axis N; per ampere of total current the
// surface current is 1/L A/m, circulating right-handed about N. It is the
// exact equivalent of a cylinder magnetised uniformly along N with
// M = I/L (K = M × n on the side, nothing on the end faces), and of a
// one-layer solenoid of many fine turns.
//
// B is the closed form of Derby and Olbert (Am. J. Phys. 78, 229, 2010,
// eqs. for B_ρ and B_z with Bulirsch's cel; from memory, checked in the
// tests against a sum of loop fields); A is the integral over the length of
// the loop's closed-form A_φ, written with cel as
// A_φ = μ0 I a cel(kc, 1, −1, 1) / (π √((a+ρ)² + z²)) (the loop's
// potential of J. D. Jackson, Classical Electrodynamics, 3rd ed., 1999,
// eq. 5.37, rewritten), by adaptive Gauss–Kronrod.
type CylinderSheet struct {
	C, N Vec
	R, L float64
}

func (s CylinderSheet) Field(which Which, x Vec, stop func() error) (Vec, error) {
	z, r := axialFrame(x, s.C, s.N)
	rho := r3.Norm(r)
	a, b := s.R, s.L/2
	// B jumps across the side; A is continuous there
	if which == FieldB && math.Abs(rho-a) <= onFace*a && math.Abs(z) <= b*(1+onFace) {
		return Vec{}, ErrOnSheet
	}
	if which == FieldB {
		br, bz := doField(a, b, rho, z)
		scale := Mu0 / (math.Pi * s.L)
		v := r3.Scale(scale*bz, s.N)
		if rho > 0 {
			v = r3.Add(v, r3.Scale(scale*br/rho, r))
		}
		return v, nil
	}
	if rho == 0 {
		return Vec{}, nil
	}
	ring := func(zp float64) float64 {
		dz := z - zp
		den := (a+rho)*(a+rho) + dz*dz
		m := 4 * a * rho / den
		kc := math.Sqrt(((a-rho)*(a-rho) + dz*dz) / den)
		return a * loopCel(m, kc) / math.Sqrt(den)
	}
	// absolute floor: 1e-13 of the dipole-like size of the integral
	// (πa²ρL/(4s³) for the loop's A_φ ≈ μ0 I a² ρ / (4 s³)), so that a
	// vanishing integral ends
	sd := math.Sqrt((a+rho)*(a+rho) + z*z + b*b)
	floor := 1e-13 * math.Pi * a * a * rho * s.L / (4 * sd * sd * sd)
	aphi, err := integrateBroken(ring, -b, b, z, floor, stop)
	if err != nil {
		return Vec{}, err
	}
	aphi *= Mu0 / (math.Pi * s.L)
	// A_φ φ̂ = (A_φ/ρ) N × r
	return r3.Scale(aphi/rho, r3.Cross(s.N, r)), nil
}

// loopCel is cel(kc, 1, −1, 1) = (2/m)[(1 − m/2)K(m) − E(m)], m = 1 − kc²,
// the bracket of a loop's A_φ. Near the axis (m < 0.5) the AGM would lose
// it to cancellation (it is about πm/16); there it is summed as
// Σ cₙ² n/(n+1) (π/2) mⁿ with cₙ = (2n)!/(4ⁿ n!²), from the series of K and
// E (M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions,
// 1964, 17.3.11 and 17.3.12), to 1e-17 of its first term.
func loopCel(m, kc float64) float64 {
	if m >= 0.5 {
		return Cel(kc, 1, -1, 1)
	}
	sum, c, mn := 0.0, 1.0, 1.0
	for n := 1; n < 200; n++ {
		c *= float64(2*n-1) / float64(2*n)
		mn *= m
		t := c * c * float64(n) / float64(n+1) * mn
		sum += t
		if t < 1e-17*sum {
			break
		}
	}
	return math.Pi / 2 * sum
}

// doField is the bracketed part of Derby and Olbert's field of a solenoid
// sheet of radius a and half-length b at (ρ, z): B_ρ and B_z in units of
// μ0 n I / π.
func doField(a, b, rho, z float64) (br, bz float64) {
	zp, zm := z+b, z-b
	sp := math.Sqrt(zp*zp + (rho+a)*(rho+a))
	sm := math.Sqrt(zm*zm + (rho+a)*(rho+a))
	alphaP, alphaM := a/sp, a/sm
	betaP, betaM := zp/sp, zm/sm
	gamma := (a - rho) / (a + rho)
	kP := math.Sqrt(zp*zp+(a-rho)*(a-rho)) / sp
	kM := math.Sqrt(zm*zm+(a-rho)*(a-rho)) / sm
	br = alphaP*Cel(kP, 1, 1, -1) - alphaM*Cel(kM, 1, 1, -1)
	bz = a / (a + rho) * (betaP*Cel(kP, gamma*gamma, 1, gamma) - betaM*Cel(kM, gamma*gamma, 1, gamma))
	return br, bz
}

// integrateBroken integrates f over [lo, hi] by adaptive Gauss–Kronrod,
// split at brk when it lies inside (where a sheet's integrand peaks).
func integrateBroken(f func(float64) float64, lo, hi, brk, floor float64, stop func() error) (float64, error) {
	tol := sheetTol
	tol.Abs = math.Max(tol.Abs, floor)
	tol.Stop = stop
	pts := []float64{lo, hi}
	if brk > lo && brk < hi {
		pts = []float64{lo, brk, hi}
	}
	v, _, err := IntegrateVecBreaks(func(t float64) Vec { return Vec{X: f(t)} }, pts, tol)
	if err = acceptLoose(err); err != nil {
		return 0, err
	}
	return v.X, nil
}

func (s CylinderSheet) Mirror(p, n Vec) Shape {
	return CylinderSheet{C: ReflectPoint(s.C, p, n), N: r3.Scale(-1, reflectDir(s.N, n)), R: s.R, L: s.L}
}

// Weight: B is a few cel evaluations (about 140 ns a point in
// BenchmarkShapeWeights), A an adaptive integral of them (about 30 µs);
// the larger is stated, about 3000 segments.
func (CylinderSheet) Weight() float64 { return 3000 }

// BlockSheet is the surface current of a rectangular block magnetised
// uniformly along the unit N: centred on C, with edges 2·HU along the unit
// U, 2·HV along V = N × U and 2·HN along N. Per ampere of total current
// the four side faces carry 1/(2·HN) A/m circulating right-handed about N
// (K = M × n), the end faces nothing. Its field is the integral over the
// height of the closed-form fields of a rectangular loop of four segments,
// by adaptive Gauss–Kronrod.
type BlockSheet struct {
	C, N, U    Vec
	HU, HV, HN float64
}

func (s BlockSheet) v() Vec { return r3.Cross(s.N, s.U) }

func (s BlockSheet) Field(which Which, x Vec, stop func() error) (Vec, error) {
	d := r3.Sub(x, s.C)
	u, v, z := r3.Dot(d, s.U), r3.Dot(d, s.v()), r3.Dot(d, s.N)
	size := math.Max(s.HU, s.HV)
	onU := math.Abs(math.Abs(u)-s.HU) <= onFace*size && math.Abs(v) <= s.HV+onFace*size
	onV := math.Abs(math.Abs(v)-s.HV) <= onFace*size && math.Abs(u) <= s.HU+onFace*size
	// on a face: B jumps; A is continuous, but the loops' segments pass
	// through the point at one height, whose logarithmic singularity the
	// adaptive rule cannot resolve to the segments' on-wire test, so both
	// are refused
	if (onU || onV) && math.Abs(z) <= s.HN*(1+onFace) {
		return Vec{}, ErrOnSheet
	}
	V := s.v()
	corner := func(cu, cv, cz float64) Vec {
		return r3.Add(s.C, r3.Add(r3.Scale(cu, s.U), r3.Add(r3.Scale(cv, V), r3.Scale(cz, s.N))))
	}
	var ferr error
	f := func(t float64) Vec {
		if ferr != nil {
			return Vec{}
		}
		c := [5][2]float64{{s.HU, -s.HV}, {s.HU, s.HV}, {-s.HU, s.HV}, {-s.HU, -s.HV}, {s.HU, -s.HV}}
		var sum Vec
		for k := 0; k < 4; k++ {
			a, b := corner(c[k][0], c[k][1], t), corner(c[k+1][0], c[k+1][1], t)
			var w Vec
			var err error
			if which == FieldB {
				w, err = SegmentB(a, b, x)
			} else {
				w, err = SegmentA(a, b, x)
			}
			if err != nil {
				ferr = err
				return Vec{}
			}
			sum = r3.Add(sum, w)
		}
		return sum
	}
	tol := sheetTol
	tol.Stop = stop
	// absolute floor: 1e-13 of the dipole-like size of the integral, so
	// that a vanishing component ends
	dist := r3.Norm(d) + math.Max(size, s.HN)
	// and 1e-15 of the size of one face's contribution, the rounding
	// level of the segments' closed forms that cancel far away
	floor := 2 * s.HN * k0 * 4 * s.HU * s.HV / (dist * dist)
	face := 2 * s.HN * k0 * 4 * (s.HU + s.HV) / dist
	if which == FieldB {
		floor /= dist
		face /= dist
	} else {
		// a segment's A is k0·ln((r1+r2+l)/(r1+r2−l)), whose rounding
		// is about 1e-16 of k0 at any distance
		face = math.Max(face, 2*s.HN*k0*4*0.1)
	}
	tol.Abs = math.Max(tol.Abs, math.Max(1e-13*floor, 1e-15*face))
	pts := []float64{-s.HN, s.HN}
	if z > -s.HN && z < s.HN {
		pts = []float64{-s.HN, z, s.HN}
	}
	out, _, err := IntegrateVecBreaks(f, pts, tol)
	if ferr != nil {
		return Vec{}, ferr
	}
	if err = acceptLoose(err); err != nil {
		return Vec{}, err
	}
	return r3.Scale(1/(2*s.HN), out), nil
}

func (s BlockSheet) Mirror(p, n Vec) Shape {
	// the image's moment is −R·m: its axis −R·N; keep U reflected, so
	// that V = N × U is the reflection of V up to sign, and the box is the
	// reflected box
	return BlockSheet{C: ReflectPoint(s.C, p, n), N: r3.Scale(-1, reflectDir(s.N, n)), U: reflectDir(s.U, n), HU: s.HU, HV: s.HV, HN: s.HN}
}

// Weight: an adaptive integral of four segments' fields, about 11 µs a
// point for B or A in BenchmarkShapeWeights: about 1500 segments.
func (BlockSheet) Weight() float64 { return 1500 }
