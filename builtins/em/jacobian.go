package em

import (
	"errors"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r3"
)

// Exact spatial derivatives of the fields of thin-wire paths.
//
// B and A of a path are line integrals of kernels that are smooth in the
// field point x away from the wire, so their derivatives are the integrals
// of the kernels' derivatives (differentiation under the integral sign):
// with r = x − x'(t), n = |r| and dl' = x'′(t) dt,
//
//	∂/∂x_j [dl' × r/n³] = dl' × e_j/n³ − 3 (dl' × r) r_j/n⁵,
//	∂/∂x_j [dl'/n]      = −dl' r_j/n³,
//
// times μ0I/4π. Each column of the Jacobian is integrated along each piece
// with the adaptive Gauss–Kronrod rule of quad.go, the piece split at its
// quarter turns (primBreaks) and at the parameters nearest x, so a close
// point's peak sits at a break. The quadrature's own estimate, plus the
// rounding of the integrand and of the sums, is the error bound.

// JacobianTol is the accuracy FieldJacobian asks of each column of each
// piece: relative 1e-13 of the integral of the column's integrand's norm
// (a bound on the column, so columns that vanish by symmetry converge
// too). The rule's rounding floor is 50ε ≈ 1.1e-14 of that (quadScaleErr).
var JacobianTol = Tol{Rel: 1e-13}

// ErrShapeJacobian is FieldJacobian's refusal of a source with a shape
// (magnet, dipole, infinite wire, ideal solenoid): differentiate those
// with Jacobian.
var ErrShapeJacobian = errors.New("em: FieldJacobian takes thin-wire paths only; a shape's field is differentiated by Jacobian")

// FieldJacobian returns J[j] = ∂F/∂x_j at x (the layout of Jacobian) of B
// or A of the paths of srcs, and a bound on the absolute error of every
// entry of J. Sources with a Shape are refused (ErrShapeJacobian); a point
// on a wire is ErrOnWire, as for the field, and behind a plate
// ErrBehindPlate. tol gives the relative accuracy (JacobianTol.Rel if
// zero), the evaluation budget per quadrature and the stop control.
//
// The bound is, over the pieces p with current I_p,
//
//	Σp |I_p| (est_p + ρ_p S_p) + (n − 1) ε Σp |I_p| S_p,
//
// est_p the largest of the three columns' quadrature estimates, S_p the
// integral of the norm bound of the columns' integrand (μ0/4π ∫ 4|dl'|/n³
// for B, ∫ |dl'|/n² for A), and ρ_p = 64ε + 32ε(|x − o| + |x' − o|max)/dmin
// the relative rounding of the integrand: r = (x − o) − (x' − o), o the
// piece's start or centre, carries about 4ε(|x − o| + |x' − o|) of
// absolute error and the kernels, homogeneous of degree
// −3 and −2 in r, change by about 3 to 5 times its relative error (8
// taken); the last sum
// is the rounding of adding n terms (Higham, Accuracy and Stability of
// Numerical Algorithms, 2nd ed., 2002, eq. 4.4).
func FieldJacobian(which Which, srcs []Source, x Vec, tol Tol) (J [3]Vec, bound float64, err error) {
	if tol.Rel <= 0 {
		tol.Rel = JacobianTol.Rel
	}
	var sum, own float64
	n := 0
	for _, s := range srcs {
		if s.Plate != nil && s.Plate.Behind(x) {
			return J, 0, ErrBehindPlate
		}
		if s.I == 0 {
			continue
		}
		if s.Shape != nil {
			return J, 0, ErrShapeJacobian
		}
		ai := math.Abs(s.I)
		for _, p := range s.Path.Prims {
			if err := tol.stopped(); err != nil {
				return J, 0, err
			}
			cols, est, scale, rho, err := primJacobian(which, p, x, tol)
			if err != nil {
				return J, 0, err
			}
			for j := range J {
				J[j] = r3.Add(J[j], r3.Scale(s.I, cols[j]))
			}
			own += ai * (est + rho*scale)
			sum += ai * scale
			n++
		}
	}
	return J, own + float64(max(n-1, 0))*eps*sum, nil
}

// primJacobian is the Jacobian of p's field per ampere at x, the largest
// of the columns' quadrature estimates, the scale S (see FieldJacobian)
// and the relative rounding of the integrand.
func primJacobian(which Which, p Prim, x Vec, tol Tol) (cols [3]Vec, est, scale, rho float64, err error) {
	if onWire(p, x) {
		return cols, 0, 0, 0, ErrOnWire
	}
	br, dmin, reach := jacobianBreaks(p, x)
	// r = (x − o) − (x'(t) − o) with o the piece's own origin (a
	// segment's start, an arc's centre), so that its rounding is that of
	// the piece's size and the point's distance, not of their place
	o := p.A
	if p.Kind != Segment {
		o = p.C
	}
	xo := r3.Sub(x, o)
	at := func(t float64) Vec { return r3.Sub(xo, offsetPoint(p, t)) }
	bad := false
	// the norm bound of every column's integrand, divided by μ0/4π
	bnd := func(t float64) float64 {
		r := at(t)
		n := r3.Norm(r)
		if n == 0 {
			bad = true
			return 0
		}
		tl := r3.Norm(p.Tangent(t))
		if which == FieldB {
			return 4 * tl / (n * n * n)
		}
		return tl / (n * n)
	}
	scaleTol := tol.with(1e-3, 0)
	s, _, err := IntegrateVecBreaks(func(t float64) Vec { return Vec{X: bnd(t)} }, br, scaleTol)
	if bad {
		return cols, 0, 0, 0, ErrOnWire
	}
	var qe *QuadError
	if errors.As(err, &qe) {
		s, err = qe.Vec, nil // a scale only: its own accuracy matters little
	}
	if err != nil {
		return cols, 0, 0, 0, err
	}
	// 1.01: the scale is itself a quadrature asked for 1e-3
	scale = 1.01 * k0 * s.X
	if scale == 0 {
		return cols, 0, 0, 0, nil
	}
	axes := [3]Vec{{X: 1}, {Y: 1}, {Z: 1}}
	for j := range cols {
		e := axes[j]
		f := func(t float64) Vec {
			r := at(t)
			n := r3.Norm(r)
			if n == 0 {
				bad = true
				return Vec{}
			}
			T := p.Tangent(t)
			rj := r3.Dot(r, e)
			if which == FieldB {
				n3 := n * n * n
				a := r3.Scale(k0/n3, r3.Cross(T, e))
				return r3.Sub(a, r3.Scale(3*k0*rj/(n3*n*n), r3.Cross(T, r)))
			}
			return r3.Scale(-k0*rj/(n*n*n), T)
		}
		v, e2, err := IntegrateVecBreaks(f, br, tol.with(tol.Rel, tol.Rel*scale))
		if bad {
			return cols, 0, 0, 0, ErrOnWire
		}
		if errors.As(err, &qe) && qe.Estimate <= looseRel*scale {
			err = nil // reported in the bound
		}
		if err != nil {
			return cols, 0, 0, 0, err
		}
		cols[j] = v
		est = math.Max(est, e2)
	}
	rho = 64*eps + 32*eps*(r3.Norm(xo)+reach)/dmin
	return cols, est, scale, rho, nil
}

// onWire applies the field's own test of a point on the wire.
func onWire(p Prim, x Vec) bool {
	var err error
	switch p.Kind {
	case Segment:
		_, err = SegmentB(p.A, p.B, x)
	case Arc:
		_, err = ArcB(p, x)
	default:
		return helixOnWire(p, x)
	}
	return errors.Is(err, ErrOnWire)
}

// offsetPoint is p.Point(t) − o, o the segment's start or the arc's or
// helix's centre, computed without o.
func offsetPoint(p Prim, t float64) Vec {
	if p.Kind == Segment {
		return r3.Scale(t, r3.Sub(p.B, p.A))
	}
	phi := t * p.Span
	s, c := math.Sincos(phi)
	q := r3.Add(r3.Scale(p.R*c, p.U), r3.Scale(p.R*s, p.V))
	if p.Kind == Helix {
		q = r3.Add(q, r3.Scale(p.Pitch*phi, p.N))
	}
	return q
}

// jacobianBreaks returns p's quarter-turn breaks with the parameters
// nearest x added (the foot of the perpendicular on a segment; the
// azimuths of x on an arc or on each turn of a helix), a lower bound on
// the distance from x to p (half of the least distance at those
// parameters and the ends: on a helix the azimuth is only near the
// nearest point), and the largest |x' − o| over p's points (o as in
// offsetPoint), for the rounding of r.
func jacobianBreaks(p Prim, x Vec) (br []float64, dmin, reach float64) {
	br = primBreaks(p)
	var cand []float64
	switch p.Kind {
	case Segment:
		d := r3.Sub(p.B, p.A)
		if l2 := r3.Dot(d, d); l2 > 0 {
			cand = append(cand, r3.Dot(r3.Sub(x, p.A), d)/l2)
		}
		reach = r3.Norm(d)
	default:
		w := r3.Sub(x, p.C)
		psi := math.Atan2(r3.Dot(w, p.V), r3.Dot(w, p.U))
		if p.Span != 0 {
			turns := math.Ceil(math.Abs(p.Span)/(2*math.Pi)) + 1
			for k := -turns; k <= turns; k++ {
				cand = append(cand, (psi+2*math.Pi*k)/p.Span)
			}
		}
		reach = p.R + math.Abs(p.Pitch*p.Span)
	}
	dmin = math.Min(r3.Norm(r3.Sub(x, p.Start())), r3.Norm(r3.Sub(x, p.End())))
	for _, t := range cand {
		if t > 0 && t < 1 {
			br = append(br, t)
			dmin = math.Min(dmin, r3.Norm(r3.Sub(x, p.Point(t))))
		}
	}
	slices.Sort(br)
	br = slices.Compact(br)
	if p.Kind != Segment && p.Kind != Arc {
		dmin /= 2
	}
	return br, dmin, reach
}

// JacobianWeight is about the cost of FieldJacobian for path p in
// elementary evaluations (10 ns each, runtime.EvalsPerSecond): 2500 a
// segment and 3000 a quarter turn of an arc or helix. BenchmarkFieldJacobian,
// one run on a loaded two-core machine (load about 5): 25–43 µs a segment,
// 100 µs a ring, 62 µs an arc of 2.5 rad, 320 µs a helix of 5 turns.
func JacobianWeight(p Path) float64 {
	w := 0.0
	for _, q := range p.Prims {
		if q.Kind == Segment {
			w += 2500
		} else {
			w += 3000 * float64(len(primBreaks(q))-1)
		}
	}
	return w
}
