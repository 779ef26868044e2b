package em

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// bigLog1p returns ln(1 + x), x ≥ 0, in refPrec bits by the series
// ln(1 + x) = 2 atanh s = 2(s + s³/3 + s⁵/5 + …), s = x/(2 + x) < 1
// (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, 4.1.27),
// summed until a term falls below 2^-(refPrec+8) of the sum.
func bigLog1p(x *big.Float) *big.Float {
	s := bigQuo(x, bigAdd(bigf(2), x))
	s2 := bigMul(s, s)
	sum := bigf(0)
	pow := new(big.Float).SetPrec(refPrec).Set(s)
	for k := 0; ; k++ {
		term := bigQuo(pow, bigf(float64(2*k+1)))
		sum = bigAdd(sum, term)
		if term.Sign() == 0 || term.MantExp(nil)-sum.MantExp(nil) < -(refPrec+8) {
			break
		}
		pow = bigMul(pow, s2)
	}
	return bigMul(bigf(2), sum)
}

// bigSegmentA is a straight filament's A per ampere at x in refPrec bits,
// μ0/4π · ê · ln((R1 + R2 + L)/(R1 + R2 − L)) with every quantity formed
// from the float64 inputs in 300 bits (the cancellation in R1 + R2 − L far
// away, about log2(R/L) bits, is far below that), rounded once.
// Closed form: e.g. Hanson & Hirshman, Phys. Plasmas 9, 4410 (2002); the
// logarithm is the integral of 1/|x − r'| along the segment.
func bigSegmentA(a, b, x Vec) Vec {
	norm := func(p, q Vec) (*big.Float, [3]*big.Float) {
		d := [3]*big.Float{bigSub(bigf(p.X), bigf(q.X)), bigSub(bigf(p.Y), bigf(q.Y)), bigSub(bigf(p.Z), bigf(q.Z))}
		return bigSqrt(bigAdd(bigAdd(bigMul(d[0], d[0]), bigMul(d[1], d[1])), bigMul(d[2], d[2]))), d
	}
	n1, _ := norm(a, x)
	n2, _ := norm(b, x)
	l, d := norm(b, a)
	sum := bigAdd(n1, n2)
	// ratio − 1 = 2L/(R1 + R2 − L)
	lg := bigLog1p(bigQuo(bigMul(bigf(2), l), bigSub(sum, l)))
	w := bigQuo(bigMul(bigf(k0), lg), l)
	var out [3]float64
	for i := range out {
		out[i], _ = bigMul(w, d[i]).Float64()
	}
	return Vec{X: out[0], Y: out[1], Z: out[2]}
}

// akFarTol is the relative agreement asked of segmentsA with bigSegmentA
// far from a segment: log1p within 1 ulp (fdlibm), its argument
// L(R1 + R2 + L)/t a few roundings (two square roots, the sums, t, the
// product and the quotient: about 8ε, and log1p(x) has condition number
// x/((1 + x)log1p x) ≤ 1), μ0/4π·I times it and times ê a few more: 12ε
// ≈ 2.7e-15. Before log1p, ln of the rounded ratio lost about ε·R/L
// (1e-10 relative at 10⁶ lengths).
const akFarTol = 12 * 0x1p-53

// TestSegmentsAFar: the vector potential of single segments at points 1e2
// to 1e6 lengths away, in random directions (on the segment's axis too),
// by the scalar loop and each vector kernel, against the 300-bit
// reference. The largest relative error is logged.
func TestSegmentsAFar(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 4))
	type trial struct {
		c    *compiledSources
		x    Vec
		want Vec
	}
	var trials []trial
	for range 400 {
		l := math.Pow(10, -3+3*rng.Float64())
		a := r3.Scale(l*rng.Float64(), akUnit(rng))
		b := r3.Add(a, r3.Scale(l, akUnit(rng)))
		dir := akUnit(rng)
		if rng.IntN(8) == 0 { // along the segment's line, beyond an end
			dir = r3.Unit(r3.Sub(b, a))
		}
		x := r3.Add(b, r3.Scale(l*math.Pow(10, 2+4*rng.Float64()), dir))
		seg, err := NewSegment(a, b)
		if err != nil {
			t.Fatal(err)
		}
		trials = append(trials, trial{compile([]Source{{Path: Path{Prims: []Prim{seg}}, I: 1}}), x, bigSegmentA(a, b, x)})
	}
	check := func(t *testing.T, name string, f func(c *compiledSources, x Vec) (float64, float64, float64, error)) {
		worst := 0.0
		for _, tr := range trials {
			ax, ay, az, err := f(tr.c, tr.x)
			if err != nil {
				t.Fatal(err)
			}
			rel := r3.Norm(r3.Sub(Vec{X: ax, Y: ay, Z: az}, tr.want)) / r3.Norm(tr.want)
			if rel > akFarTol {
				t.Errorf("%s: segment %v–%v at %v: A = %v, reference %v, relative %.3g > %.3g",
					name, tr.c.a[0], tr.c.b[0], tr.x, Vec{X: ax, Y: ay, Z: az}, tr.want, rel, akFarTol)
			}
			worst = math.Max(worst, rel)
		}
		t.Logf("%s: %d segments at 1e2…1e6 lengths: largest relative error %.3g (%.1f ε)", name, len(trials), worst, worst/0x1p-53)
	}
	t.Run("scalar", func(t *testing.T) {
		check(t, "scalar", func(c *compiledSources, x Vec) (float64, float64, float64, error) {
			return c.segmentsAScalar(x, nil)
		})
	})
	t.Run("SegmentA", func(t *testing.T) {
		check(t, "SegmentA", func(c *compiledSources, x Vec) (float64, float64, float64, error) {
			v, err := SegmentA(c.a[0], c.b[0], x)
			return v.X, v.Y, v.Z, err
		})
	})
	forAKernels(t, func(t *testing.T, k *aKernel) {
		check(t, k.name, func(c *compiledSources, x Vec) (float64, float64, float64, error) {
			return c.segmentsAVec(k, x, nil)
		})
	})
}
