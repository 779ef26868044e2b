package em

import (
	"errors"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r3"
)

// Mutual inductance of two coaxial helical pieces (helices or arcs on one
// axis, such as the layers of a winding) as a single integral.
//
// In the frame of piece p (centre C_p, in-plane U_p, V_p, axis N_p), p's
// point at angle φ is at radius R_p, angle φ, height c_p·φ; q's point at
// its own angle ψ is at radius R_q, angle θ = α + sψ and height z0 + s·c_q·ψ,
// where s = N_p·N_q = ±1, α is the angle of U_q in p's frame and z0 the
// height of C_q. Neumann's integrand is then
//
//	dl_p·dl_q/|r_p − r_q| = s(R_pR_q cos u + c_p c_q) / √(D(u) + (b(u) + kψ)²)
//
// with u = φ − θ, D(u) = R_p² + R_q² − 2R_pR_q cos u, b(u) = c_p(u + α) − z0
// and k = s(c_p − c_q). In the variables (u, ψ) (unit Jacobian) the
// numerator depends on u alone, so the integral over ψ is in closed form,
//
//	∫ dψ/√(D + (b + kψ)²) = [asinh((b + kψ)/√D)]/k   (k ≠ 0),
//	                      = Δψ/√(D + b²)            (k = 0),
//
// over the ψ for which φ = u + α + sψ stays on p, and what is left is one
// integral over u, by adaptive Gauss–Kronrod with breaks at every whole
// turn of u (where the turns come closest) and at the corners of the
// domain. This replaces a double integral whose inner part is itself a
// numerical integral along a helix (the general route), and it shares no
// code with that route, which the tests compare it with.

// coaxialHelical reports whether p and q are arcs or helices on one axis,
// and returns s = N_p·N_q (±1), the angle α of q's U in p's frame and the
// height z0 of q's centre along p's axis.
func coaxialHelical(p, q Prim) (s, alpha, z0 float64, ok bool) {
	if p.Kind == Segment || q.Kind == Segment {
		return 0, 0, 0, false
	}
	if r3.Norm(r3.Cross(p.N, q.N)) > 1e-12 {
		return 0, 0, 0, false
	}
	off := r3.Sub(q.C, p.C)
	z0 = r3.Dot(off, p.N)
	if r3.Norm(r3.Sub(off, r3.Scale(z0, p.N))) > 1e-12*math.Max(p.R, q.R) {
		return 0, 0, 0, false
	}
	s = math.Copysign(1, r3.Dot(p.N, q.N))
	alpha = math.Atan2(r3.Dot(q.U, p.V), r3.Dot(q.U, p.U))
	return s, alpha, z0, true
}

// asinhDiff returns (asinh(x2) − asinh(x1))/d for d = x2 − x1 given
// separately (d may be tiny or zero): without cancellation when x1 and x2
// have one sign, from sinh(A − B) = x2√(1+x1²) − x1√(1+x2²) =
// d(x1 + x2)/(x2√(1+x1²) + x1√(1+x2²)).
func asinhDiff(x1, x2, d float64) float64 {
	if x1*x2 <= 0 {
		if d == 0 {
			return 1 / math.Sqrt(1+x1*x1)
		}
		return (math.Asinh(x2) - math.Asinh(x1)) / d
	}
	w := (x1 + x2) / (x2*math.Sqrt(1+x1*x1) + x1*math.Sqrt(1+x2*x2)) // y/d
	y := d * w
	if y == 0 {
		return w
	}
	return w * math.Asinh(y) / y
}

// CoaxialHelicalMutual returns Neumann's mutual inductance of two arcs or
// helices on one axis that do not touch; ok false when they are not such
// a pair.
func CoaxialHelicalMutual(p, q Prim, tol Tol) (m float64, ok bool, err error) {
	s, alpha, z0, ok := coaxialHelical(p, q)
	if !ok {
		return 0, false, nil
	}
	cp, cq := 0.0, 0.0
	if p.Kind == Helix {
		cp = p.Pitch
	}
	if q.Kind == Helix {
		cq = q.Pitch
	}
	Rp, Rq := p.R, q.R
	pLo, pHi := math.Min(0, p.Span), math.Max(0, p.Span)
	qLo, qHi := math.Min(0, q.Span), math.Max(0, q.Span)
	k := s * (cp - cq)
	// u = φ − α − sψ over the domain: sψ spans [sLo, sHi]
	sLo, sHi := s*qLo, s*qHi
	if sLo > sHi {
		sLo, sHi = sHi, sLo
	}
	uLo, uHi := pLo-alpha-sHi, pHi-alpha-sLo
	// ψ with φ = u + α + sψ in [pLo, pHi]: sψ in [pLo − u − α, pHi − u − α]
	psiRange := func(u float64) (float64, float64) {
		a, b := pLo-u-alpha, pHi-u-alpha
		if s < 0 {
			a, b = -b, -a
		}
		return math.Max(a, qLo), math.Min(b, qHi)
	}
	scale := Rp*Rp + Rq*Rq
	var bad bool
	f := func(u float64) float64 {
		lo, hi := psiRange(u)
		if !(hi > lo) {
			return 0
		}
		D := Rp*Rp + Rq*Rq - 2*Rp*Rq*math.Cos(u)
		if Rp == Rq {
			sh := math.Sin(u / 2)
			D = 4 * Rp * Rq * sh * sh // without cancellation near whole turns
		}
		b := cp*(u+alpha) - z0
		num := s * (Rp*Rq*math.Cos(u) + cp*cq)
		if D <= 1e-300*scale {
			// the turns' circles meet in projection: ∫ dψ/|b + kψ|
			e1, e2 := b+k*lo, b+k*hi
			if e1*e2 <= 0 {
				bad = true // the pieces cross
				return 0
			}
			if k == 0 {
				return num * (hi - lo) / math.Abs(b)
			}
			return num * math.Log(e2/e1) / k * math.Copysign(1, e1)
		}
		sd := math.Sqrt(D)
		x1, x2 := (b+k*lo)/sd, (b+k*hi)/sd
		// ∫ = (asinh(x2) − asinh(x1))/k = (hi − lo)/sd · asinhDiff
		return num * (hi - lo) / sd * asinhDiff(x1, x2, k*(hi-lo)/sd)
	}
	// breaks: the domain's corners (where the ψ range changes form) and
	// every whole turn of u (closest approach of the turns)
	pts := []float64{uLo, uHi}
	for _, c := range []float64{pLo - alpha - sLo, pHi - alpha - sHi} {
		if c > uLo && c < uHi {
			pts = append(pts, c)
		}
	}
	for n := math.Ceil(uLo / (2 * math.Pi)); 2*math.Pi*n < uHi; n++ {
		if u := 2 * math.Pi * n; u > uLo {
			pts = append(pts, u)
		}
	}
	// quarter turns between, so the adaptive rule starts from the scale of
	// the turns
	for n := math.Ceil(uLo / (math.Pi / 2)); math.Pi/2*n < uHi; n++ {
		if u := math.Pi / 2 * n; u > uLo {
			pts = append(pts, u)
		}
	}
	slices.Sort(pts)
	pts = slices.Compact(pts)
	// the integrand's cos u changes sign every half turn, so over many
	// turns the integral is far smaller than the integral of its size
	// (by 10⁵ for layers of a hundred turns a few wire diameters apart):
	// the accuracy asked is relative to that size, found first roughly
	size, _, err := IntegrateVecBreaks(func(u float64) Vec { return Vec{X: math.Abs(f(u))} }, pts, tol.with(1e-3, 0))
	if bad {
		return 0, true, ErrOnWire
	}
	if err = acceptLoose(err); err != nil {
		var qe *QuadError
		if !errors.As(err, &qe) {
			return 0, true, err
		}
		size = qe.Vec // a rough size is all that is needed
	}
	abs := math.Max(tol.Rel*size.X, tol.Rel*math.Sqrt(scale)*1e-3)
	// piece by piece, each to its share of the tolerance: one global
	// adaptive run over hundreds of turns stops early on its rounding
	// test (pieces whose bisection no longer lowers their estimate,
	// counted over all of them)
	piece := tol.with(tol.Rel, abs/float64(len(pts)-1))
	var v, e float64
	for i := 0; i+1 < len(pts); i++ {
		if i%64 == 63 {
			if err := tol.stopped(); err != nil {
				return 0, true, err
			}
		}
		pv, pe, err := Integrate(f, pts[i], pts[i+1], piece)
		if bad {
			return 0, true, ErrOnWire
		}
		if err = acceptLoose(err); err != nil {
			return 0, true, err
		}
		v += pv
		e += pe
	}
	sg := math.Copysign(1, p.Span) * math.Copysign(1, q.Span)
	m = k0 * sg * v
	tol.addEst(k0*e + closedFormRounding*m)
	return m, true, nil
}

// MaxCoaxialPieces bounds the pieces of path 1 for which Mutual takes the
// single integrals pair by pair (each costs about 10⁴ evaluations per
// turn): beyond it the general route's vector kernels are cheaper, except
// for a circle of path 2, whose coaxial circles take Maxwell's formula.
const MaxCoaxialPieces = 64

// coaxialHelicalWith is the mutual inductance of q with all of ps when q
// is an arc or helix coaxial with every one of them (circles with circles
// by Maxwell's formula); ok false otherwise.
func coaxialHelicalWith(ps []Prim, q Prim, tol Tol) (float64, bool, error) {
	for _, p := range ps {
		if _, _, _, ok := coaxialHelical(p, q); !ok {
			return 0, false, nil
		}
	}
	var sum float64
	for _, p := range ps {
		if a, b, d, ok := coaxialCircles(p, q); ok {
			if d == 0 && a == math.Abs(b) {
				return 0, true, ErrOnWire
			}
			m := math.Copysign(MaxwellMutual(a, math.Abs(b), d), b)
			tol.addEst(closedFormRounding * m)
			sum += m
			continue
		}
		m, _, err := CoaxialHelicalMutual(p, q, tol)
		if err != nil {
			return 0, true, err
		}
		sum += m
	}
	return sum, true, nil
}

// CoaxialHelical reports whether p and q are arcs or helices on one axis.
func CoaxialHelical(p, q Prim) bool {
	_, _, _, ok := coaxialHelical(p, q)
	return ok
}
