//go:build amd64 && !purego

package em

import (
	"math"
	"math/rand/v2"
	"testing"

	"golang.org/x/sys/cpu"
)

// ulpsOff is |got − want| in units in the last place of want (ulp(x) =
// the gap from |x| to the next float64 away from zero; the measure used by
// J.-M. Muller, Elementary Functions, 3rd ed., 2016, §2.1.3, to within
// the choice at powers of 2). want is math.Log's value: it is correctly
// rounded to within 1 ulp (fdlibm, e_log.c: "error < 1 ulp"), so an
// error of n ulp against it is at most n + 1 against ln x itself.
func ulpsOff(got, want float64) float64 {
	if got == want {
		return 0
	}
	ulp := math.Nextafter(math.Abs(want), math.Inf(1)) - math.Abs(want)
	return math.Abs(got-want) / ulp
}

// logInputs are positive numbers over the whole normal range (1e-300 …
// 1e300 uniform in the exponent), subnormals, numbers within 1e-3 …
// 1e-16 of 1 on either side, the powers of 2 and their neighbours, the
// numbers near √2·2^k where the reduction switches, and the arguments
// the kernel meets (1 … 1e30).
func logInputs() []float64 {
	rng := rand.New(rand.NewPCG(7, 7))
	var xs []float64
	for range 200000 {
		xs = append(xs, math.Pow(10, -300+600*rng.Float64()))
	}
	for range 20000 {
		xs = append(xs, math.Float64frombits(1+rng.Uint64N(1<<52-1))) // subnormal
		d := math.Pow(10, -16+13*rng.Float64())
		xs = append(xs, 1+d, 1-d)
		xs = append(xs, math.Pow(10, 30*rng.Float64()))
	}
	for k := -1074; k <= 1023; k++ {
		p := math.Ldexp(1, k)
		xs = append(xs, p, math.Nextafter(p, 0), math.Nextafter(p, math.Inf(1)))
		r := math.Sqrt2 * p
		xs = append(xs, r, math.Nextafter(r, 0), math.Nextafter(r, math.Inf(1)))
	}
	xs = append(xs, 1, 2, math.E, 10, math.MaxFloat64, math.SmallestNonzeroFloat64)
	return xs
}

// TestVectorLog: the kernels' logarithm (LOG4, LOG8 in akernel_amd64.s)
// against math.Log over logInputs, within 2 ulp of math.Log: both are
// below 1 ulp from ln x (fdlibm's bound for the method; FMA in the
// polynomial changes its roundings, not its bound). The largest
// difference seen is logged: 1 ulp, on AVX2 and AVX-512 alike. Special values as math.Log: +Inf, NaN, −1 → NaN, ±0 →
// −Inf. Subnormals (not met by the kernel, whose arguments are ≥ 1) are
// checked within 2 ulp against a scaled reference.
func TestVectorLog(t *testing.T) {
	xs := logInputs()
	xs = append(xs, math.Inf(1), math.NaN(), -1, 0, math.Copysign(0, -1), -math.SmallestNonzeroFloat64, math.Inf(-1))
	for len(xs)%8 != 0 {
		xs = append(xs, 1)
	}
	for _, c := range []struct {
		name string
		have bool
		log  func(dst, src *float64, n int)
	}{
		{"avx2", cpu.X86.HasAVX2 && cpu.X86.HasFMA, logAVX2},
		{"avx512", cpu.X86.HasAVX512F, logAVX512},
	} {
		t.Run(c.name, func(t *testing.T) {
			if !c.have {
				t.Skip("the CPU lacks", c.name)
			}
			got := make([]float64, len(xs))
			c.log(&got[0], &xs[0], len(xs))
			var worst, worstX float64
			var worstSub float64
			for i, x := range xs {
				want := math.Log(x)
				if x > 0 && x < 0x1p-1022 {
					// math.Log on amd64 is wrong for subnormals (it gives
					// ln of the smallest normal there, about −708.4, for
					// 5e-324): scale into the normal range, exactly, and
					// take 64·ln 2 off in two parts (fdlibm's split of
					// ln 2; 64·ln2hi is exact), within 1.5 ulp of ln x.
					const ln2Hi, ln2Lo = 6.93147180369123816490e-01, 1.90821492927058770002e-10
					ref := (math.Log(x*0x1p64) - 64*ln2Hi) - 64*ln2Lo
					worstSub = math.Max(worstSub, ulpsOff(got[i], ref))
					continue
				}
				if math.IsNaN(want) || math.IsInf(want, 0) {
					if !(math.IsNaN(want) && math.IsNaN(got[i])) && got[i] != want {
						t.Errorf("ln(%g) = %g, want %g", x, got[i], want)
					}
					continue
				}
				if e := ulpsOff(got[i], want); e > worst {
					worst, worstX = e, x
				}
			}
			if worst > 2 {
				t.Errorf("largest error %.3g ulp of math.Log at x = %.17g, want ≤ 2", worst, worstX)
			}
			if worstSub > 2 {
				t.Errorf("subnormals: largest error %.3g ulp, want ≤ 2", worstSub)
			}
			t.Logf("%d values; largest error %.3g ulp of math.Log (at x = %.17g); subnormals %.3g ulp", len(xs), worst, worstX, worstSub)
		})
	}
}

// TestVectorLog1p: the kernels' log1p (LOG1P4, LOG1P8 in akernel_amd64.s)
// against math.Log1p (fdlibm's s_log1p.c, "error < 1 ulp") for
// x = 0, subnormal, 1e-300 … 1e-3 (the far field: x ≈ L/R), 1e-3 … 10 with
// 0.5 … 2 densely (around x = √2 − 1, where the exact f stops),
// 10 … 1e300, and the neighbours of 1. Bound asked: 4 ulp, from the
// logarithm's 1, the rounding of 1 + x above √2 − 1 (at most
// 2^-53/(u ln u) relative, 1.42 ulp of a result in [1/4, 1/2)) and
// math.Log1p's own 1. The largest error is logged: 2 ulp, AVX2 and
// AVX-512 alike.
func TestVectorLog1p(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 8))
	xs := []float64{0, math.SmallestNonzeroFloat64, 0x1p-1022, 1, math.Nextafter(1, 0), math.Nextafter(1, 2), 2, 1e300}
	for range 50000 {
		xs = append(xs,
			math.Pow(10, -300+297*rng.Float64()),
			math.Pow(10, -3+4*rng.Float64()),
			0.5+1.5*rng.Float64(),
			math.Pow(10, 1+299*rng.Float64()))
	}
	for len(xs)%8 != 0 {
		xs = append(xs, 1)
	}
	for _, c := range []struct {
		name  string
		have  bool
		log1p func(dst, src *float64, n int)
	}{
		{"avx2", cpu.X86.HasAVX2 && cpu.X86.HasFMA, log1pAVX2},
		{"avx512", cpu.X86.HasAVX512F, log1pAVX512},
	} {
		t.Run(c.name, func(t *testing.T) {
			if !c.have {
				t.Skip("the CPU lacks", c.name)
			}
			got := make([]float64, len(xs))
			c.log1p(&got[0], &xs[0], len(xs))
			var worst, worstX float64
			for i, x := range xs {
				want := math.Log1p(x)
				if x == 0 {
					if got[i] != 0 {
						t.Errorf("log1p(0) = %g", got[i])
					}
					continue
				}
				if e := ulpsOff(got[i], want); e > worst {
					worst, worstX = e, x
				}
			}
			if worst > 4 {
				t.Errorf("largest error %.3g ulp of math.Log1p at x = %.17g, want ≤ 4", worst, worstX)
			}
			t.Logf("%d values; largest error %.3g ulp of math.Log1p (at x = %.17g)", len(xs), worst, worstX)
		})
	}
}
