package em

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// withAKernel runs f with segmentsA using the vector kernel k (nil: the
// scalar loop). Not for parallel tests: it sets a package variable.
func withAKernel(k *aKernel, f func()) {
	old := aVector
	aVector = k
	defer func() { aVector = old }()
	f()
}

// forAKernels runs f for each vector kernel, each a subtest skipped when
// the CPU lacks it.
func forAKernels(t *testing.T, f func(t *testing.T, k *aKernel)) {
	for _, name := range []string{"avx2", "avx512"} {
		t.Run(name, func(t *testing.T) {
			for _, k := range aKernels {
				if k.name == name {
					f(t, k)
					return
				}
			}
			t.Skipf("no %s kernel on this machine", name)
		})
	}
}

// akTermSum is Σ|terms| of segmentsA at x: Σ |I|·μ0/4π·(1 + |ln q|) over
// the segments not skipped, q = 1 + x the ratio whose logarithm is taken
// (|SegmentA| = μ0/4π·|ln q|). The kernels compute R1, R2, r1·r2,
// |r1 × ê|² and so t with the same operations as the scalar loop; they
// differ in forming x (one division instead of two: a few ε relative in
// x, no more in log1p x), in log1p (≤ 4 ulp, TestVectorLog1p), in FMA for w·ê, and
// in the order of summation (lanes apart, then together: at most n ε of
// the sum of |terms| for n terms).
func akTermSum(c *compiledSources, x Vec, skip []bool) float64 {
	var s float64
	for i := range c.a {
		if skip != nil && skip[c.segIdx[i]] {
			continue
		}
		v, _ := SegmentA(c.a[i], c.b[i], x)
		s += math.Abs(c.segI[i]) * (k0 + r3.Norm(v))
	}
	return s
}

// akVecTol is the agreement asked of the vector kernels with the scalar
// loop, relative to akTermSum: 1e-13, far above the rounding analysis
// there (about 40 ε ≈ 1e-14 for the 40 terms of these tests), so a wrong
// lane, mask or coefficient fails it while rounding cannot.
const akVecTol = 1e-13

// TestSegmentsAVector: each vector kernel against the scalar loop at
// 20 000 random points (akPoint: anywhere, near a segment's end, near its
// line, on its line beyond an end, on it), half of them with a skip mask,
// for 2 to 40 segments (fewer than a block's lanes and not a multiple of
// them), then for every count from 1 to 19 segments of a polygon coil.
// Both must refuse the same points (ErrOnWire), and elsewhere agree per
// component within akVecTol·akTermSum. The largest difference seen, in
// units of that sum, is logged: 4.5e-16 (AVX2 and AVX-512 alike).
func TestSegmentsAVector(t *testing.T) {
	forAKernels(t, func(t *testing.T, k *aKernel) {
		rng := rand.New(rand.NewPCG(12, 3))
		var worst float64
		onWire, checked, flagged := 0, 0, 0
		compare := func(c *compiledSources, x Vec, skip []bool) {
			t.Helper()
			vx, vy, vz, verr := c.segmentsAVec(k, x, skip)
			sx, sy, sz, serr := c.segmentsAScalar(x, skip)
			if (verr != nil) != (serr != nil) {
				t.Fatalf("point %v: %s error %v, scalar error %v", x, k.name, verr, serr)
			}
			if serr != nil {
				if !errors.Is(verr, ErrOnWire) || !errors.Is(serr, ErrOnWire) {
					t.Fatalf("point %v: errors %v and %v, want the on-wire error", x, verr, serr)
				}
				onWire++
				return
			}
			s := akTermSum(c, x, skip)
			for _, p := range [][2]float64{{vx, sx}, {vy, sy}, {vz, sz}} {
				d := math.Abs(p[0] - p[1])
				if d > akVecTol*s {
					t.Fatalf("point %v: %s %.17g, scalar %.17g, diff %.3g > %.3g", x, k.name, p[0], p[1], d, akVecTol*s)
				}
				if s > 0 {
					worst = math.Max(worst, d/s)
				}
			}
			for i, f := range c.flatSegs() {
				if skip != nil && skip[c.segIdx[i]] {
					continue
				}
				// the near-line test of segmentsAScalar
				r1, r2 := r3.Sub(Vec{X: f.ax, Y: f.ay, Z: f.az}, x), r3.Sub(Vec{X: f.bx, Y: f.by, Z: f.bz}, x)
				h := r3.Norm(r3.Cross(r1, Vec{X: f.ex, Y: f.ey, Z: f.ez}))
				if h <= 1.01*nearLineA*(r3.Norm(r1)+r3.Norm(r2)) {
					flagged++ // a segment handed to SegmentA, the point not on it
					break
				}
			}
			checked++
		}
		for trial := range 400 {
			srcs := akSources(t, rng)
			c := compile(srcs)
			nPrims := len(srcs[0].Path.Prims) + len(srcs[1].Path.Prims)
			for j := range 50 {
				x := akPoint(rng, c)
				var skip []bool
				if j%2 == 1 {
					skip = make([]bool, nPrims)
					for i := range skip {
						skip[i] = rng.IntN(3) == 0
					}
					if trial%10 == 0 { // all, or all but one, skipped
						for i := range skip {
							skip[i] = i != j%nPrims || trial%20 == 0
						}
					}
				}
				compare(c, x, skip)
			}
		}
		for n := 1; n < 20; n++ {
			c := compile([]Source{{Path: cpPolyCoil(t, 0.02, 0, 0.01, 1, n), I: 1.3}})
			for range 50 {
				compare(c, akPoint(rng, c), nil)
			}
		}
		if onWire == 0 || flagged < 100 || checked < 10000 {
			t.Fatalf("the points did not cover all cases: %d on a wire, %d beside a line, %d compared", onWire, flagged, checked)
		}
		t.Logf("%d points compared (%d beside a segment's line), %d on a wire refused by both; largest difference %.3g of Σ|terms|", checked, flagged, onWire, worst)
	})
}

// TestAKernelsParallel: with each vector kernel, Fields gives the vector
// potential of a 1000-segment coil bit for bit the same for 1, 2 and 7
// workers (each point is summed by one goroutine in a fixed order).
func TestAKernelsParallel(t *testing.T) {
	coil := cpPolyCoil(t, 0.02, 0, 0.02, 10, 100)
	rng := rand.New(rand.NewPCG(3, 4))
	pts := make([]Vec, 500)
	for i := range pts {
		pts[i] = Vec{X: 0.06*rng.Float64() - 0.03, Y: 0.06*rng.Float64() - 0.03, Z: 0.06 * rng.Float64()}
	}
	forAKernels(t, func(t *testing.T, k *aKernel) {
		withAKernel(k, func() {
			var ref []Vec
			for _, workers := range []int{1, 2, 7} {
				out := make([]Vec, len(pts))
				if err := Fields(FieldA, []Source{{Path: coil, I: 1}}, pts, out, workers, nil, nil); err != nil {
					t.Fatal(err)
				}
				if ref == nil {
					ref = out
					continue
				}
				for i := range out {
					if out[i] != ref[i] {
						t.Fatalf("workers=%d point %d: %v, with 1 worker %v", workers, i, out[i], ref[i])
					}
				}
			}
		})
	})
}

// TestInductanceAKernels: the self-inductance of a 40-turn rectangular
// toroidal winding and the mutual inductance of two 200-segment coils
// (as TestInductanceRoutes) with each vector kernel and with the scalar
// loop. The integrands agree within akVecTol (TestSegmentsAVector), so the
// adaptive quadratures may at most refine differently: the results must
// agree within the requested relative accuracy, DefaultTol.Rel = 1e-10 (a
// guard against drift; the values are checked against outside references
// by the other inductance tests, which run with the best kernel).
func TestInductanceAKernels(t *testing.T) {
	tor := akToroid(t, 40, 0.02, 0.03, 0.01)
	c1 := cpPolyCoil(t, 0.02, 0, 0.02, 4, 50)
	c2 := cpPolyCoil(t, 0.015, 0.03, 0.02, 4, 50)
	run := func(k *aKernel) (l, m float64) {
		withAKernel(k, func() {
			var err error
			if l, err = SelfInductance(tor, 0.25e-3, DefaultTol); err != nil {
				t.Fatal(err)
			}
			if m, err = Mutual(c1, c2, MutualOptions{NoFastPath: true}); err != nil {
				t.Fatal(err)
			}
		})
		return l, m
	}
	ls, ms := run(nil)
	forAKernels(t, func(t *testing.T, k *aKernel) {
		lv, mv := run(k)
		for _, c := range []struct {
			name        string
			vec, scalar float64
		}{{"toroid self-inductance", lv, ls}, {"mutual inductance", mv, ms}} {
			rel := math.Abs(c.vec-c.scalar) / math.Abs(c.scalar)
			if rel > DefaultTol.Rel {
				t.Errorf("%s: %s %.17g H, scalar %.17g H (rel %.2g > %.2g)", c.name, k.name, c.vec, c.scalar, rel, DefaultTol.Rel)
			}
			t.Logf("%s: %.15g H, %s and scalar differ by %.2g relative", c.name, c.vec, k.name, rel)
		}
	})
}

// TestAKernelsNearLine: the kernels flag exactly the segments the scalar
// loop hands to SegmentA (its test, h² ≤ (nearLineA·(R1 + R2))², written
// out here as there) at random points, many beside a segment's line and
// half within 1% of the test's threshold there, on either side. The
// kernels use the same operations in the same order, without fused
// multiply-adds (Go fuses none either with the default GOAMD64=v1), so
// the flags should agree bit for bit; this test cannot see a change in
// the last bit of h², though: there h² itself carries an error of about
// ε·L/h ≈ 1e-3 relative (r1 × ê cancels), so a point within an ulp of
// the threshold is too rare to place. It checks the masks, lanes and
// blocks.
func TestAKernelsNearLine(t *testing.T) {
	forAKernels(t, func(t *testing.T, k *aKernel) {
		rng := rand.New(rand.NewPCG(12, 4))
		near := 0
		for range 400 {
			c := compile(akSources(t, rng))
			n := len(c.flatSegs())
			for j := range 50 {
				x := akPoint(rng, c)
				if j%2 == 1 {
					// near the test's threshold, h ≈ nearLineA·(R1 + R2),
					// beside a segment (R1 + R2 ≈ L there)
					i := rng.IntN(n)
					a, b := c.a[i], c.b[i]
					d := r3.Sub(b, a)
					u := akUnit(rng)
					perp := r3.Unit(r3.Sub(u, r3.Scale(r3.Dot(u, d)/r3.Norm2(d), d)))
					foot := r3.Add(a, r3.Scale(0.05+0.9*rng.Float64(), d))
					x = r3.Add(foot, r3.Scale(nearLineA*r3.Norm(d)*(1+0.01*(2*rng.Float64()-1)), perp))
				}
				var want, got []int
				for i := range c.flatSegs() {
					s := &c.flatSegs()[i]
					r1x, r1y, r1z := s.ax-x.X, s.ay-x.Y, s.az-x.Z
					r2x, r2y, r2z := s.bx-x.X, s.by-x.Y, s.bz-x.Z
					n1 := math.Sqrt(r1x*r1x + r1y*r1y + r1z*r1z)
					n2 := math.Sqrt(r2x*r2x + r2y*r2y + r2z*r2z)
					cx, cy, cz := r1y*s.ez-r1z*s.ey, r1z*s.ex-r1x*s.ez, r1x*s.ey-r1y*s.ex
					h2 := cx*cx + cy*cy + cz*cz
					if g := nearLineA * (n1 + n2); h2 <= g*g {
						want = append(want, i)
					}
				}
				for lo := 0; lo < n; {
					b0 := lo / aLanes
					_, _, _, done, flags := k.run(&c.ablk[b0*aBlock], (n-1)/aLanes-b0+1, float64(lo), float64(n), float64(b0*aLanes), x.X, x.Y, x.Z)
					if flags == 0 {
						break
					}
					b := b0 + done - 1
					for j := range aLanes {
						if flags&(1<<j) != 0 {
							got = append(got, b*aLanes+j)
						}
					}
					lo = (b + 1) * aLanes
				}
				if len(got) != len(want) {
					t.Fatalf("point %v: %s flags segments %v, the scalar test %v", x, k.name, got, want)
				}
				for i := range got {
					if got[i] != want[i] {
						t.Fatalf("point %v: %s flags segments %v, the scalar test %v", x, k.name, got, want)
					}
				}
				near += len(want)
			}
		}
		if near < 1000 {
			t.Fatalf("only %d segments near a point's line", near)
		}
		t.Logf("%d segments flagged by both", near)
	})
}
