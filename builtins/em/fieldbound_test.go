package em

import (
	"math"
	"math/big"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// bigSegmentB is a straight filament's B per ampere at x in refPrec bits,
// μ0/4π · (r1 × r2)(R1 + R2)/(R1R2(R1R2 + r1·r2)) (Hanson & Hirshman,
// Phys. Plasmas 9, 4410, 2002, eq. (6) in this form), every quantity from
// the float64 inputs, unrounded until the end.
func bigSegmentB(a, b, x Vec) [3]*big.Float {
	r := func(p Vec) [3]*big.Float {
		return [3]*big.Float{bigSub(bigf(p.X), bigf(x.X)), bigSub(bigf(p.Y), bigf(x.Y)), bigSub(bigf(p.Z), bigf(x.Z))}
	}
	r1, r2 := r(a), r(b)
	dot := func(u, v [3]*big.Float) *big.Float {
		return bigAdd(bigAdd(bigMul(u[0], v[0]), bigMul(u[1], v[1])), bigMul(u[2], v[2]))
	}
	n1, n2 := bigSqrt(dot(r1, r1)), bigSqrt(dot(r2, r2))
	nn := bigMul(n1, n2)
	f := bigQuo(bigMul(bigf(k0), bigAdd(n1, n2)), bigMul(nn, bigAdd(nn, dot(r1, r2))))
	c := [3]*big.Float{
		bigSub(bigMul(r1[1], r2[2]), bigMul(r1[2], r2[1])),
		bigSub(bigMul(r1[2], r2[0]), bigMul(r1[0], r2[2])),
		bigSub(bigMul(r1[0], r2[1]), bigMul(r1[1], r2[0])),
	}
	return [3]*big.Float{bigMul(f, c[0]), bigMul(f, c[1]), bigMul(f, c[2])}
}

// bigSegmentAExact is bigSegmentA before its rounding.
func bigSegmentAExact(a, b, x Vec) [3]*big.Float {
	norm := func(p, q Vec) (*big.Float, [3]*big.Float) {
		d := [3]*big.Float{bigSub(bigf(p.X), bigf(q.X)), bigSub(bigf(p.Y), bigf(q.Y)), bigSub(bigf(p.Z), bigf(q.Z))}
		return bigSqrt(bigAdd(bigAdd(bigMul(d[0], d[0]), bigMul(d[1], d[1])), bigMul(d[2], d[2]))), d
	}
	n1, _ := norm(a, x)
	n2, _ := norm(b, x)
	l, d := norm(b, a)
	lg := bigLog1p(bigQuo(bigMul(bigf(2), l), bigSub(bigAdd(n1, n2), l)))
	w := bigQuo(bigMul(bigf(k0), lg), l)
	return [3]*big.Float{bigMul(w, d[0]), bigMul(w, d[1]), bigMul(w, d[2])}
}

// bigPathField sums B or A of a path of straight segments carrying 1 A in
// refPrec bits and rounds once.
func bigPathField(p Path, x Vec, wantB bool) Vec {
	s := [3]*big.Float{bigf(0), bigf(0), bigf(0)}
	for _, q := range p.Prims {
		var v [3]*big.Float
		if wantB {
			v = bigSegmentB(q.A, q.B, x)
		} else {
			v = bigSegmentAExact(q.A, q.B, x)
		}
		for i := range s {
			s[i] = bigAdd(s[i], v[i])
		}
	}
	return Vec{X: f64(s[0]), Y: f64(s[1]), Z: f64(s[2])}
}

// TestFieldErrorBoundToroid: outside a toroidal winding of 200 rectangular
// turns (800 straight pieces, as toroid_rect builds them) the turns' B
// cancels to about 1e-16 of Σ|B_turn| (TestToroidCancellation), so the
// computed B is mostly rounding. At 2, 5 and 20 outer radii, B and A by
// Fields (the kernels as b_at runs them) against the sum of the pieces'
// closed forms in refPrec bits (bigSegmentB, bigSegmentAExact): the error
// of every component must be within FieldErrorBound's bound. The ratio
// bound/error is logged (the bound is a worst case: (n − 1)ε Σ for the
// sum, where rounding errors of 800 terms add like √800).
func TestFieldErrorBoundToroid(t *testing.T) {
	const rOut = 0.03
	tor := akToroid(t, 200, 0.02, rOut, 0.01)
	srcs := []Source{{Path: tor, I: 1}}
	minRatio := math.Inf(1)
	for _, d := range []float64{2, 5, 20} {
		for _, x := range []Vec{{Z: d * rOut}, {X: d * rOut}, {X: d * rOut * 0.6, Y: d * rOut * 0.3, Z: d * rOut * 0.7}} {
			for _, wantB := range []bool{true, false} {
				which := FieldB
				if !wantB {
					which = FieldA
				}
				out := make([]Vec, 1)
				if err := Fields(which, srcs, []Vec{x}, out, 1, nil, nil); err != nil {
					t.Fatal(err)
				}
				ref := bigPathField(tor, x, wantB)
				bound, sum, err := FieldErrorBound(which, srcs, x, nil)
				if err != nil {
					t.Fatal(err)
				}
				errv := r3.Sub(out[0], ref)
				worst := math.Max(math.Abs(errv.X), math.Max(math.Abs(errv.Y), math.Abs(errv.Z)))
				if worst > bound {
					t.Errorf("B=%v at %v: error %.3g (value %v, reference %v) beyond the bound %.3g", wantB, x, worst, out[0], ref, bound)
				}
				if worst > 0 {
					minRatio = math.Min(minRatio, bound/worst)
				}
				t.Logf("B=%v at %v: |value| %.3g, Σ|pieces| %.3g, error %.3g (%.2g of |value|), bound %.3g", wantB, x, r3.Norm(out[0]), sum, worst, worst/r3.Norm(ref), bound)
			}
		}
	}
	t.Logf("smallest bound/error: %.3g", minRatio)
}

// TestFieldErrorBoundRing: for a single circle (no cancellation) the bound
// must cover the error of B and A against bigCircleVec's 300-bit
// reference and must not be absurdly large: the largest bound, relative
// to |field|, within 1e4 times the largest error seen, relative to
// |field|, at points 0.2 to 30 radii from the wire (1 − m from about 0.01
// to 1: closedRel plus arcCloseRel/(1 − m) is at most about 530 ε there
// for an arc, 128 ε for a circle).
func TestFieldErrorBoundRing(t *testing.T) {
	const a = 0.05
	ring, err := NewCircle(Vec{}, Vec{Z: 1}, a)
	if err != nil {
		t.Fatal(err)
	}
	srcs := []Source{{Path: Path{Prims: []Prim{ring}}, I: 2.5}}
	for _, wantB := range []bool{true, false} {
		which := FieldB
		if !wantB {
			which = FieldA
		}
		var maxBound, maxErr float64
		for _, x := range []Vec{{X: 0.01 * a, Z: 0.3 * a}, {X: 0.7 * a, Y: 0.1 * a, Z: 0.15 * a}, {X: 2 * a, Z: -a}, {X: 5 * a, Y: 3 * a, Z: 8 * a}, {Y: 0.3 * a, Z: 30 * a}, {X: 1.25 * a}} {
			out := make([]Vec, 1)
			if err := Fields(which, srcs, []Vec{x}, out, 1, nil, nil); err != nil {
				t.Fatal(err)
			}
			av, bv := bigCircleVec(a, x.X, x.Y, x.Z, 512)
			rv := bv
			if !wantB {
				rv = av
			}
			ref := r3.Scale(2.5, Vec{X: f64(rv[0]), Y: f64(rv[1]), Z: f64(rv[2])})
			bound, _, err := FieldErrorBound(which, srcs, x, nil)
			if err != nil {
				t.Fatal(err)
			}
			errv := r3.Sub(out[0], ref)
			worst := math.Max(math.Abs(errv.X), math.Max(math.Abs(errv.Y), math.Abs(errv.Z)))
			if worst > bound {
				t.Errorf("B=%v at %v: error %.3g beyond the bound %.3g", wantB, x, worst, bound)
			}
			n := r3.Norm(ref)
			maxBound, maxErr = math.Max(maxBound, bound/n), math.Max(maxErr, worst/n)
		}
		if maxBound > 1e4*maxErr {
			t.Errorf("B=%v: largest bound %.3g of |field|, largest error %.3g: the bound is more than 1e4 times the error", wantB, maxBound, maxErr)
		}
		t.Logf("B=%v: largest bound %.3g of |field|, largest error %.3g (ratio %.3g)", wantB, maxBound, maxErr, maxBound/maxErr)
	}
}
