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
// rounding of the integrand and of the sums, is the error bound. A
// straight segment seen under less than 120° takes closed forms instead
// (segmentJacobian): in a coil of many short segments, all but the few
// near the point.

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
// The bound is, over the pieces p with current I_p (for a segment in
// closed form, est_p + ρ_p S_p is segmentJacRel·ε times its terms' size),
//
//	Σp |I_p| (est_p + ρ_p S_p) + (n − 1) ε Σp |I_p| S_p,
//
// est_p the largest of the three columns' quadrature estimates, S_p the
// integral of the norm bound of the columns' integrand (μ0/4π ∫ 4|dl'|/n³
// for B, ∫ |dl'|/n² for A), and
//
//	ρ_p = 64ε + 32ε(|x0| + |x − o| + |x'(t0) − o|)/dmin
//
// the relative rounding of the integrand: r is formed as x0 − Δ with
// x0 = (x − o) − (x'(t0) − o) at the parameter t0 nearest x, o the
// piece's start or centre, and Δ from t − t0 itself (jacobianStep), so r
// carries about 4ε(|x − o| + |x'(t0) − o|) from x0 and 4ε of
// |Δ| ≤ |x0| + |r| from Δ; the kernels, homogeneous of degree −3 and −2
// in r, change by about 3 to 6 times its relative error (8 taken); 64ε
// for the rest of the integrand. The last sum
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
		for k, p := range s.Path.Prims {
			if k%64 == 0 {
				if err := tol.stopped(); err != nil {
					return J, 0, err
				}
			}
			var cols [3]Vec
			var est, scale, rho float64
			ok := false
			if p.Kind == Segment {
				cols, scale, ok = segmentJacobian(which, p.A, p.B, x)
				est = segmentJacRel * eps * scale
			}
			if !ok {
				cols, est, scale, rho, err = primJacobian(which, p, x, tol)
				if err != nil {
					return J, 0, err
				}
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

// segmentJacRel bounds the relative error of segmentJacobian's entries,
// in units of ε and of the sum of its terms' sizes: a few roundings in
// each of some twenty operations, no cancellation beyond a factor of 2
// where it is used; the tests (TestSegmentJacobianClosed) find at most a
// few ε against the quadrature.
const segmentJacRel = 64

// segmentJacobian is the Jacobian of a straight filament's field per
// ampere at x in closed form, with the sum of its terms' sizes (for the
// rounding bound), when x sees the segment under less than 120°
// (r1·r2 ≥ −½|r1||r2|); ok is false nearer the segment, where the forms
// below cancel and the quadrature takes over. With r1 = x − a,
// r2 = x − b, d = b − a, R_i = |r_i|, û_i = r_i/R_i,
// D = R1R2 + r1·r2 and N = R1 + R2:
//
//	A = μ0/4π · d/L · ln((N + L)/(N − L)),  ∂A/∂x_j = −μ0/4π · d (û1 + û2)_j / D,
//
// since N² − L² = 2D and ∇N = û1 + û2; and from B = μ0/4π · h (d × r1)
// with h = N/(R1R2 D) (the segment's B as in SegmentB),
//
//	∂B/∂x_j = μ0/4π · h [(d × r1) g_j + d × e_j],
//	g = (û1 + û2)(1/N − N/D) − (û1/R1 + û2/R2),
//
// as ∇(R1R2) = R2û1 + R1û2 and ∇D = N(û1 + û2). Derived here by hand
// from the closed forms; TestSegmentJacobianClosed checks them against
// the quadrature of the differentiated kernels, a route sharing no code.
func segmentJacobian(which Which, a, b, x Vec) (cols [3]Vec, terms float64, ok bool) {
	r1, r2, d := r3.Sub(x, a), r3.Sub(x, b), r3.Sub(b, a)
	R1, R2 := r3.Norm(r1), r3.Norm(r2)
	p, dot := R1*R2, r3.Dot(r1, r2)
	if !(dot >= -0.5*p) || p == 0 {
		return cols, 0, false
	}
	D := p + dot
	N := R1 + R2
	u1, u2 := r3.Scale(1/R1, r1), r3.Scale(1/R2, r2)
	gN := r3.Add(u1, u2)
	axes := [3]Vec{{X: 1}, {Y: 1}, {Z: 1}}
	L := r3.Norm(d)
	if which == FieldA {
		f := -k0 / D
		for j := range cols {
			cols[j] = r3.Scale(f*r3.Dot(gN, axes[j]), d)
		}
		return cols, k0 * L * 2 / D, true
	}
	h := k0 * N / (p * D)
	w := r3.Cross(d, r1)
	gP := r3.Add(r3.Scale(1/R1, u1), r3.Scale(1/R2, u2))
	g := r3.Sub(r3.Scale(1/N-N/D, gN), gP)
	for j := range cols {
		cols[j] = r3.Scale(h, r3.Add(r3.Scale(r3.Dot(g, axes[j]), w), r3.Cross(d, axes[j])))
	}
	nw := r3.Norm(w)
	return cols, h * (nw*(r3.Norm(gN)*(1/N+N/D)+r3.Norm(gP)) + L), true
}

// primJacobian is the Jacobian of p's field per ampere at x, the largest
// of the columns' quadrature estimates, the scale S (see FieldJacobian)
// and the relative rounding of the integrand.
func primJacobian(which Which, p Prim, x Vec, tol Tol) (cols [3]Vec, est, scale, rho float64, err error) {
	if onWire(p, x) {
		return cols, 0, 0, 0, ErrOnWire
	}
	br, t0, dmin := jacobianBreaks(p, x)
	// the integrals run over u = t − t0, t0 the parameter nearest x, and
	// r = (x − x'(t0)) − (x'(t0 + u) − x'(t0)) with the second difference
	// formed from u itself (jacobianStep): near the peak r keeps its
	// relative digits, however long the piece or far its place
	// x − x'(t0) as (x − o) − (x'(t0) − o), o the segment's start or the
	// arc's centre: its rounding is that of the piece's size and the
	// distance, not of the piece's place
	o := p.A
	if p.Kind != Segment {
		o = p.C
	}
	xo, p0 := r3.Sub(x, o), jacobianStep(p, 0, t0)
	if p.Kind != Segment {
		p0 = r3.Add(p0, r3.Scale(p.R, p.U)) // jacobianStep is from x'(0) = o + R·U
	}
	x0 := r3.Sub(xo, p0)
	for i := range br {
		br[i] -= t0
	}
	// a long helix has thousands of breaks: allow each piece a few
	// bisections on top of the default budget
	if m := 100 * len(br); tol.MaxEval == 0 && m > quadDefaultMaxEval {
		tol.MaxEval = m
	}
	at := func(u float64) Vec { return r3.Sub(x0, jacobianStep(p, t0, u)) }
	bad := false
	// the norm bound of every column's integrand, divided by μ0/4π
	bnd := func(t float64) float64 {
		r := at(t)
		n := r3.Norm(r)
		if n == 0 {
			bad = true
			return 0
		}
		tl := r3.Norm(p.Tangent(t0 + t))
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
			T := p.Tangent(t0 + t)
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
	rho = 64*eps + 32*eps*(r3.Norm(x0)+r3.Norm(xo)+r3.Norm(p0))/dmin
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

// jacobianStep is p.Point(t0 + u) − p.Point(t0), formed from u so that
// it keeps its relative digits for small u: u·(B − A) on a segment, and
// on an arc or helix R(cos(φ0 + δ) − cos φ0) = −2R sin(φ0 + δ/2) sin(δ/2)
// (and the like for sin), plus the pitch's advance, with δ = u·Span.
func jacobianStep(p Prim, t0, u float64) Vec {
	if p.Kind == Segment {
		return r3.Scale(u, r3.Sub(p.B, p.A))
	}
	d := u * p.Span
	h := math.Sin(d / 2)
	sm, cm := math.Sincos(t0*p.Span + d/2)
	q := r3.Add(r3.Scale(-2*p.R*sm*h, p.U), r3.Scale(2*p.R*cm*h, p.V))
	if p.Kind == Helix {
		q = r3.Add(q, r3.Scale(p.Pitch*d, p.N))
	}
	return q
}

// jacobianBreaks returns p's quarter-turn breaks with the parameters
// nearest x added (the foot of the perpendicular on a segment; the
// azimuths of x on an arc or on each turn of a helix; the ends), each
// with breaks graded geometrically away from it, the one of those
// parameters nearest x, and a lower bound on the distance from x to p
// (half of the least distance at those parameters on a helix, where the
// azimuth is only near the nearest point).
func jacobianBreaks(p Prim, x Vec) (br []float64, t0, dmin float64) {
	br = primBreaks(p)
	q := 1 / float64(len(br)-1) // the quarter turns' width in t
	var cand []float64
	switch p.Kind {
	case Segment:
		d := r3.Sub(p.B, p.A)
		if l2 := r3.Dot(d, d); l2 > 0 {
			cand = append(cand, r3.Dot(r3.Sub(x, p.A), d)/l2)
		}
	default:
		w := r3.Sub(x, p.C)
		psi := math.Atan2(r3.Dot(w, p.V), r3.Dot(w, p.U))
		if p.Span != 0 {
			turns := math.Ceil(math.Abs(p.Span)/(2*math.Pi)) + 1
			for k := -turns; k <= turns; k++ {
				cand = append(cand, (psi+2*math.Pi*k)/p.Span)
			}
		}
	}
	dmin = math.Inf(1)
	cand = append(cand, 0, 1)
	for _, t := range cand {
		if t < 0 || t > 1 {
			continue
		}
		dk := r3.Norm(r3.Sub(x, p.Point(t)))
		if dk < dmin {
			dmin, t0 = dk, t
		}
		br = append(br, t)
		// the kernels' peak at t is about dk/|x'′| wide in t: breaks at
		// t ± w·4^k up to a quarter turn's width, so the rule's nodes see
		// it however narrow it is (a rule whose nodes all lie far from a
		// narrow peak would miss it and report a small error estimate)
		if tl := r3.Norm(p.Tangent(t)); tl > 0 {
			for w := dk / tl; w < q; w *= 4 {
				for _, u := range []float64{t - w, t + w} {
					if u > 0 && u < 1 {
						br = append(br, u)
					}
				}
			}
		}
	}
	slices.Sort(br)
	br = slices.Compact(br)
	if p.Kind != Segment && p.Kind != Arc {
		dmin /= 2
	}
	return br, t0, dmin
}

// JacobianWeight is about the cost of FieldJacobian for path p at x in
// elementary evaluations (10 ns each, runtime.EvalsPerSecond): 10 a
// segment in closed form, 2500 a segment near x (integrated), 4500 a
// quarter turn of an arc or helix. BenchmarkFieldJacobian, one run on a
// two-core machine under load about 1–2: 70–340 ns a segment in closed
// form, 23 µs integrated, 120–180 µs a ring, 65–93 µs an arc of 2.5 rad,
// 0.36–0.41 ms a helix of 5 turns, at one point each.
func JacobianWeight(p Path, x Vec) float64 {
	w := 0.0
	for _, q := range p.Prims {
		switch {
		case q.Kind != Segment:
			w += 4500 * float64(len(primBreaks(q))-1)
		case segmentClosedOK(q.A, q.B, x):
			w += 10
		default:
			w += 2500
		}
	}
	return w
}

// segmentClosedOK is segmentJacobian's test: x sees the segment ab under
// less than 120°.
func segmentClosedOK(a, b, x Vec) bool {
	r1, r2 := r3.Sub(x, a), r3.Sub(x, b)
	p := r3.Norm(r1) * r3.Norm(r2)
	return r3.Dot(r1, r2) >= -0.5*p && p != 0
}
