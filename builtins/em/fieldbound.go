package em

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Rounding carried as numerical error. A field is a sum of the pieces'
// fields; where they cancel (outside a toroidal winding the turns' fields
// cancel by 1e11 and more) the sum keeps the pieces' rounding, not its own
// size: each piece right to 1e-15 of itself can leave the sum with a
// relative error of 1e-3 or of order one. FieldErrorBound states that as
// an absolute bound, from each piece's accuracy as the tests find it and
// the rounding of the sum.

// eps is the unit roundoff of float64, 2^-53.
const eps = 0x1p-53

// closedRel bounds the relative error of one closed-form piece (a
// segment, an arc or circle away from its wire), in units of eps: the
// largest seen against independent references is 54 eps (a segment's B in
// the long differential test, TestFieldsDifferentialLong) and 24 eps for
// arcs and circles near their axis and nearly whole arcs
// (TestNearlyFullArc, TestCircleBNearAxis); the vector kernels agree with
// the scalar loop within 12 eps of Σ|terms| (TestVecKernelsAgree,
// TestSegmentsAVector). 128 eps covers them with a margin of two.
const closedRel = 128

// arcCloseRel is the extra relative error of an arc's closed form (not a
// whole circle's) near its wire, per unit of 1/(1 − m): its
// H = (F − D − s c/Δ)/(1 − m) loses about eps/(1 − m) (the closed form is
// left for quadrature below 1 − m = 0.01, closeToCircle; the long
// differential test sees 2.2e-14 = 100 eps at 1 − m = 0.0103). 4 eps per
// unit of 1/(1 − m) covers it fourfold.
const arcCloseRel = 4

// FieldErrorBound returns a bound on the absolute error of each component
// of the field of srcs at x as Fields computes it (without a uniform
// field), and Σ|field of each piece|:
//
//	bound = Σp (c_p ε |I_p v_p| + |I_p| q_p) + (n − 1) ε Σp |I_p v_p|,
//
// over the n pieces p with current I_p and field per ampere v_p, where
// c_p is closedRel (plus arcCloseRel/(1 − m) for an arc near its wire)
// and q_p is 0 for a closed form, or the quadrature's own estimate for a
// piece integrated numerically (a helix; an arc very near its wire). The
// last term is the rounding of summing n terms in any order (Higham,
// Accuracy and Stability of Numerical Algorithms, 2nd ed., 2002, eq.
// 4.4: |error| ≤ γ(n−1) Σ|x_i|, γ(k) = kε/(1 − kε)). Shapes (magnets,
// ideal solenoids, infinite wires, dipoles) are allowed fieldTol.Rel of
// their field, the accuracy asked of those of their integrals that are
// numerical. The bound is on the vector's norm, so on each component.
//
// It evaluates each piece once more, one at a time (the cost of the field
// at one point); stop, if not nil, is polled between pieces and by the
// numerical integrals.
func FieldErrorBound(which Which, srcs []Source, x Vec, stop func() error) (bound, sum float64, err error) {
	var weighted, quad float64
	n := 0
	for _, s := range srcs {
		if s.I == 0 {
			continue
		}
		ai := math.Abs(s.I)
		for k, p := range s.Path.Prims {
			if stop != nil && k%256 == 255 {
				if err := stop(); err != nil {
					return 0, 0, err
				}
			}
			v, rel, est, err := primFieldEst(which, p, x, stop)
			if err != nil {
				return 0, 0, err
			}
			m := ai * r3.Norm(v)
			sum += m
			weighted += rel * m
			quad += ai * est
			n++
		}
		if s.Shape != nil {
			v, err := s.Shape.Field(which, x, stop)
			if err != nil {
				return 0, 0, err
			}
			m := ai * r3.Norm(v)
			sum += m
			weighted += (closedRel*eps + fieldTol.Rel) * m
			n++
		}
	}
	return weighted + float64(max(n-1, 0))*eps*sum + quad, sum, nil
}

// primFieldEst returns p's field per ampere at x as primB or primA
// computes it, the relative accuracy of a closed form (0 for a numerical
// integral) and the quadrature's estimate (0 for a closed form).
func primFieldEst(which Which, p Prim, x Vec, stop func() error) (v Vec, rel, est float64, err error) {
	kernel := biotKernel(p)
	if which == FieldA {
		kernel = potKernel(p)
	}
	switch p.Kind {
	case Segment:
		v, err = primB(p, x, stop)
		if which == FieldA {
			v, err = primA(p, x, stop)
		}
		return v, closedRel * eps, 0, err
	case Arc:
		l := localArc(p, x)
		if nearArc(p, l) {
			return Vec{}, 0, 0, ErrOnWire
		}
		if !p.IsCircle() && l.mc < closeToCircle {
			v, est, err = numericAlongEst(p, x, kernel, stop)
			return v, closedRel * eps, est, err
		}
		v, err = primB(p, x, stop)
		if which == FieldA {
			v, err = primA(p, x, stop)
		}
		rel = closedRel * eps
		if !p.IsCircle() {
			rel += arcCloseRel * eps / l.mc
		}
		return v, rel, 0, err
	default:
		if helixOnWire(p, x) {
			return Vec{}, 0, 0, ErrOnWire
		}
		v, est, err = numericAlongEst(p, x, kernel, stop)
		return v, closedRel * eps, est, err
	}
}

// integrandRounding estimates the rounding that the field values under a
// line integral along path carry, which the quadrature's own estimate
// cannot see: FieldErrorBound at up to 45 points spread over the path's
// pieces, the largest times the path's length. It matters where the
// sources' pieces cancel along the path (outside a toroidal winding, or
// near a pair of opposed turns), where it can be the whole integral.
func integrandRounding(which Which, srcs []Source, path Path, stop func() error) (float64, error) {
	n := len(path.Prims)
	if n == 0 {
		return 0, nil
	}
	step := max(1, n/15)
	var worst float64
	for i := 0; i < n; i += step {
		p := path.Prims[i]
		for _, t := range []float64{0.1, 0.5, 0.9} {
			b, _, err := FieldErrorBound(which, srcs, p.Point(t), stop)
			if errors.Is(err, ErrOnWire) {
				continue // a sample on a wire of the sources: the integral reports it if it is
			}
			if err != nil {
				return 0, err
			}
			worst = math.Max(worst, b)
		}
	}
	return worst * path.Length(), nil
}
