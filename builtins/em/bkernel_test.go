package em

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// bkCompiled lays out segments from a[i] to b[i] with currents cur[i] as
// compile does, but keeps zero currents (compile drops a source whose
// current is 0), so that the kernels can be fed such a segment.
func bkCompiled(a, b []Vec, cur []float64) *compiledSources {
	c := &compiledSources{}
	for i := range a {
		c.a = append(c.a, a[i])
		c.b = append(c.b, b[i])
		c.l = append(c.l, r3.Norm(r3.Sub(b[i], a[i])))
		c.segI = append(c.segI, cur[i])
		c.segIdx = append(c.segIdx, i)
	}
	return c
}

// bkKernel returns the kernel called name, skipping the test when this CPU
// does not run it.
func bkKernel(t testing.TB, name string) *bKernel {
	for i := range bKernels {
		if bKernels[i].name == name {
			return &bKernels[i]
		}
	}
	t.Skipf("this CPU (or GOARCH, or the purego tag) has no %s B kernel: only the scalar loop is tested here", name)
	return nil
}

var bkNames = []string{"avx512", "avx2"}

// bkRandomSegs is n segments of random directions and lengths from 1 mm
// to 0.3 m in a 0.4 m box, with currents from −5 to 5 A and segment n/2
// carrying none. Loose: every third one starts where the previous one
// ended. Joined: a polyline (each starts where the previous ended), broken
// once, at segment 2n/3, so that the kernels meet blocks of both kinds.
func bkRandomSegs(rng *rand.Rand, n int, joined bool) (a, b []Vec, cur []float64) {
	rv := func(s float64) Vec {
		return Vec{X: s * (2*rng.Float64() - 1), Y: s * (2*rng.Float64() - 1), Z: s * (2*rng.Float64() - 1)}
	}
	for i := range n {
		start := rv(0.2)
		if i > 0 && ((!joined && i%3 == 1) || (joined && i != 2*n/3)) {
			start = b[i-1]
		}
		l := 1e-3 * math.Pow(300, rng.Float64())
		end := r3.Add(start, r3.Scale(l, r3.Unit(rv(1))))
		a, b = append(a, start), append(b, end)
		cur = append(cur, 10*rng.Float64()-5)
	}
	cur[n/2] = 0
	return a, b, cur
}

// bkPoints is random points in the box, points near the segments' lines
// (at 10⁻⁶ to 10⁻¹³ of the length from the line, beside, before and beyond
// the segment, and at the scalar loop's near-line threshold itself), near
// the ends, and on the lines beyond the ends.
func bkPoints(rng *rand.Rand, a, b []Vec) []Vec {
	var pts []Vec
	for range 100 {
		pts = append(pts, Vec{X: 0.5 * (2*rng.Float64() - 1), Y: 0.5 * (2*rng.Float64() - 1), Z: 0.5 * (2*rng.Float64() - 1)})
	}
	for k := 0; k < 60; k++ {
		j := rng.IntN(len(a))
		d := r3.Sub(b[j], a[j])
		l := r3.Norm(d)
		perp := r3.Unit(r3.Cross(d, Vec{X: 0.3, Y: -0.7, Z: 0.2}))
		for _, u := range []float64{-0.5, 0.01, 0.3, 0.5, 0.99, 1.7} {
			on := r3.Add(a[j], r3.Scale(u, d))
			for e := 6; e <= 13; e++ {
				pts = append(pts, r3.Add(on, r3.Scale(l*math.Pow(10, -float64(e)), perp)))
			}
			if u > 0 && u < 1 { // s = |c|²/(n1n2 − r1·r2) ≈ h²/(2u(1 − u)) against (1e-10 l)²
				h := nearLineRel * l * math.Sqrt(2*u*(1-u))
				for _, f := range []float64{1 - 1e-6, 1 - 1e-12, 1, 1 + 1e-12, 1 + 1e-6} {
					pts = append(pts, r3.Add(on, r3.Scale(h*f, perp)))
				}
			}
		}
		for _, end := range []Vec{a[j], b[j]} {
			pts = append(pts, r3.Add(end, r3.Scale(1e-9*l, r3.Unit(Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}))))
		}
	}
	return pts
}

// bkScale is Σ|I_k B_k(x)|, the sum of the magnitudes of the terms, each
// by SegmentB (the per-segment route, which shares no code with the
// kernels). It is the honest scale of the rounding of a sum whose terms
// cancel.
func bkScale(c *compiledSources, x Vec) float64 {
	var s float64
	for i := range c.a {
		v, _ := SegmentB(c.a[i], c.b[i], x)
		s += math.Abs(c.segI[i]) * r3.Norm(v)
	}
	return s
}

// bkAgreeRel is the bound on |B_vector − B_scalar| relative to Σ|terms|.
// Each lane computes the scalar loop's closed form with the same rounded
// r1, r2, b − a, r1 × (b − a) and r1·r2; the norms and |c|² (fused
// multiply-add), the factor (one division instead of two where r1·r2 < 0)
// and the order of summation (8 or 4 interleaved partial sums) differ, a
// few roundings per term plus about log2(n) per sum: well under 100ε. We
// ask 1e-13 (≈ 450ε). Measured (go test -v -run TestVecKernelsAgree, an
// AMD EPYC with AVX-512): at most 2.5e-15 of Σ|terms| (AVX-512; 2.3e-15
// AVX2), and 2.5e-15 of |B| (2.3e-15) over points where |B| > 0.1 Σ|terms|.
const bkAgreeRel = 1e-13

// TestVecKernelsAgree: every vector kernel this CPU runs gives the scalar
// loop's B (segmentsB, called directly) within bkAgreeRel of Σ|terms|, for
// random segments (one without current) at random points, points near the
// segments' lines and ends (guard taken: SegmentB through the scalar
// loop) and beyond their ends; the same error on the wire; for n segments
// not a multiple of the block, and fewer than a block (vector path off).
func TestVecKernelsAgree(t *testing.T) {
	for _, name := range bkNames {
		t.Run(name, func(t *testing.T) {
			k := bkKernel(t, name)
			rng := rand.New(rand.NewPCG(7, uint64(k.lanes)))
			var worstSum, worstB float64
			chained := 0
			for _, nj := range []struct {
				n      int
				joined bool
			}{{1, true}, {3, false}, {4, true}, {7, false}, {8, false}, {8, true}, {9, true}, {12, false}, {15, true},
				{16, true}, {17, false}, {17, true}, {64, true}, {203, false}, {203, true}} {
				n := nj.n
				a, b, cur := bkRandomSegs(rng, n, nj.joined)
				c := bkCompiled(a, b, cur)
				v := buildVecSegs(c, k)
				if v != nil {
					for _, f := range v.chain {
						chained += int(f)
					}
				}
				if n < vecBlock {
					if v != nil {
						t.Errorf("n=%d: vector layout for fewer segments than a block", n)
					}
					continue
				}
				if v == nil || v.nFull != n/vecBlock*vecBlock {
					t.Fatalf("n=%d: no vector layout, or one of the wrong size", n)
				}
				for _, x := range bkPoints(rng, a, b) {
					wx, wy, wz, werr := c.segmentsB(0, n, x, nil)
					gx, gy, gz, gerr := v.sum(c, x)
					if werr != nil || gerr != nil {
						if !errors.Is(werr, ErrOnWire) || !errors.Is(gerr, ErrOnWire) {
							t.Errorf("n=%d at %v: scalar error %v, vector error %v", n, x, werr, gerr)
						}
						continue
					}
					want, got := Vec{X: wx, Y: wy, Z: wz}, Vec{X: gx, Y: gy, Z: gz}
					d := r3.Norm(r3.Sub(got, want))
					scale := bkScale(c, x)
					if d > bkAgreeRel*scale {
						t.Errorf("n=%d at %v: vector %v, scalar %v (|Δ| %.3g of Σ|terms| %.3g)", n, x, got, want, d/scale, scale)
					}
					worstSum = math.Max(worstSum, d/scale)
					if m := r3.Norm(want); m > 0.1*scale {
						worstB = math.Max(worstB, d/m)
					}
				}
				// on the wire: the middle of a segment in a block and, if
				// any, of one in the remainder; and an end
				for _, j := range []int{0, n - 1, n / 2} {
					for _, x := range []Vec{r3.Scale(0.5, r3.Add(a[j], b[j])), b[j]} {
						_, _, _, werr := c.segmentsB(0, n, x, nil)
						_, _, _, gerr := v.sum(c, x)
						if !errors.Is(werr, ErrOnWire) || !errors.Is(gerr, ErrOnWire) {
							t.Errorf("n=%d on segment %d at %v: scalar %v, vector %v; want ErrOnWire", n, j, x, werr, gerr)
						}
					}
				}
			}
			if chained < 20 {
				t.Errorf("only %d blocks of joined segments: the test misses the shared-end path", chained)
			}
			t.Logf("%s: largest |B_vector − B_scalar| %.2g of Σ|terms|, %.2g of |B| (where |B| > Σ|terms|/10)", name, worstSum, worstB)
		})
	}
}

// TestVecGuardFlags: for 16 segments (joined end to start in the first
// block, or loose), a kernel flags a group whenever the scalar loop would
// hand one of its segments to SegmentB (s ≤ (nearLineRel·l)², written out
// here as segmentsB tests it), including points at that threshold to
// within 10⁻¹²; and it flags no group for points far from the segments
// (else the vector path would be slow, not wrong).
func TestVecGuardFlags(t *testing.T) {
	for _, name := range bkNames {
		t.Run(name, func(t *testing.T) {
			k := bkKernel(t, name)
			rng := rand.New(rand.NewPCG(11, 3))
			nearSeen := 0
			for trial := 0; trial < 40; trial++ {
				a, b, cur := bkRandomSegs(rng, 2*vecBlock, trial%2 == 0)
				c := bkCompiled(a, b, cur)
				v := buildVecSegs(c, k)
				if trial%2 == 0 && v.chain[0] != 1 {
					t.Fatal("joined segments, block not marked")
				}
				for _, x := range bkPoints(rng, a, b) {
					for g := 0; g < 2*vecBlock/k.lanes; g++ {
						near := false
						for i := g * k.lanes; i < (g+1)*k.lanes; i++ {
							r1, r2, d := r3.Sub(a[i], x), r3.Sub(b[i], x), r3.Sub(b[i], a[i])
							cr := r3.Cross(r1, d)
							s := sumTerm(r3.Norm(r1)*r3.Norm(r2), r3.Dot(r1, r2), r3.Dot(cr, cr))
							tl := nearLineRel * c.l[i]
							near = near || s <= tl*tl
						}
						var acc [24]float64
						flagged := k.run(&v.blk[0], &v.chain[0], g, g+1, x.X, x.Y, x.Z, &acc) == g
						if near {
							nearSeen++
							if !flagged {
								t.Errorf("group %d at %v: the scalar loop takes SegmentB but the kernel did not flag it", g, x)
							}
						}
					}
				}
				// far points: at least 0.1 m from every end and line
				for range 20 {
					x := r3.Scale(2+rng.Float64(), r3.Unit(Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}))
					var acc [24]float64
					if g := k.run(&v.blk[0], &v.chain[0], 0, 2*vecBlock/k.lanes, x.X, x.Y, x.Z, &acc); g != 2*vecBlock/k.lanes {
						t.Errorf("far point %v: group %d flagged", x, g)
					}
				}
			}
			if nearSeen < 100 {
				t.Errorf("only %d groups near a line: the test misses the guard", nearSeen)
			}
		})
	}
}

// TestVecRange: sources or points outside vecRange use the scalar loop.
func TestVecRange(t *testing.T) {
	if vecPointOK(Vec{Z: 1e30}) || vecPointOK(Vec{X: math.NaN()}) || !vecPointOK(Vec{X: 1e10}) {
		t.Error("vecPointOK: wrong range")
	}
	a := []Vec{{}, {X: 1}, {X: 2}, {X: 3}, {X: 4}, {X: 5}, {X: 6}, {X: 7}}
	b := []Vec{{X: 1}, {X: 2}, {X: 3}, {X: 4}, {X: 5}, {X: 6}, {X: 7}, {X: 8}}
	cur := []float64{1, 1, 1, 1, 1, 1, 1, 1}
	for _, name := range bkNames {
		k := bkKernel(t, name)
		if buildVecSegs(bkCompiled(a, b, cur), k) == nil {
			t.Errorf("%s: no vector layout for plain segments", name)
		}
		far := append([]Vec(nil), b...)
		far[3].Y = 1e30
		if buildVecSegs(bkCompiled(a, far, cur), k) != nil {
			t.Errorf("%s: vector layout for a segment 1e30 m away", name)
		}
		short := append([]Vec(nil), b...)
		short[2] = Vec{X: 2 + 1e-20}
		if buildVecSegs(bkCompiled(a, short, cur), k) != nil {
			t.Errorf("%s: vector layout for a segment 1e-20 m long", name)
		}
	}
}

// TestSegmentsBPolygon: the scalar loop, called directly, on every machine,
// and each vector kernel where the CPU runs it, at the centre of a regular
// polygon of N = 1003 sides (N is no multiple of 8 or 4) and circumradius
// R carrying I: B = μ0 I N tan(π/N)/(2π R) along the normal, from the
// field of a finite straight wire, B = μ0 I (sin θ2 − sin θ1)/(4π s)
// (Griffiths, Introduction to Electrodynamics, 4th ed., 2017, Eq. 5.37;
// from memory), summed over the sides (s = R cos(π/N), θ = ±π/N). All N
// terms are equal and of one sign: a few roundings each plus (N−1)ε for
// the running sum (Higham, Accuracy and Stability of Numerical Algorithms,
// 2nd ed., 2002, §4.2), so the tolerance is (N + 30)ε relative.
func TestSegmentsBPolygon(t *testing.T) {
	const n, r, cur = 1003, 0.04, 2.5
	centre, normal := Vec{X: 0.01, Y: -0.02, Z: 0.03}, r3.Unit(Vec{X: 1, Y: 2, Z: 2})
	u := r3.Unit(r3.Cross(normal, Vec{X: 1}))
	w := r3.Cross(normal, u)
	vert := func(k int) Vec {
		phi := 2 * math.Pi * float64(k%n) / n
		return r3.Add(centre, r3.Add(r3.Scale(r*math.Cos(phi), u), r3.Scale(r*math.Sin(phi), w)))
	}
	var a, b []Vec
	var cs []float64
	for k := range n {
		a, b, cs = append(a, vert(k)), append(b, vert(k+1)), append(cs, cur)
	}
	c := bkCompiled(a, b, cs)
	want := r3.Scale(Mu0*cur*n*math.Tan(math.Pi/n)/(2*math.Pi*r), normal)
	tol := (n + 30) * cpEps
	check := func(route string, x, y, z float64, err error) {
		if err != nil {
			t.Fatalf("%s: %v", route, err)
		}
		got := Vec{X: x, Y: y, Z: z}
		if e := r3.Norm(r3.Sub(got, want)) / r3.Norm(want); e > tol {
			t.Errorf("%s: B %v, want %v (rel %.2g > %.2g)", route, got, want, e, tol)
		}
	}
	x, y, z, err := c.segmentsB(0, n, centre, nil)
	check("scalar", x, y, z, err)
	for _, name := range bkNames {
		for i := range bKernels {
			if bKernels[i].name == name {
				v := buildVecSegs(c, &bKernels[i])
				x, y, z, err := v.sum(c, centre)
				check(name, x, y, z, err)
			}
		}
	}
}

// TestVecFieldsWorkers: through Fields, each vector kernel gives results
// bit-identical for 1 and 2 workers, within bkAgreeRel of Σ|terms| of the
// scalar loop's, and a point on a wire is reported at its index.
func TestVecFieldsWorkers(t *testing.T) {
	coil := cpPolyCoil(t, 0.02, 0, 0.05, 100, 10)
	coil.Prims = append(coil.Prims, cpMust(t)(NewSegment(Vec{X: 0.02, Z: 0.05}, Vec{X: 0.05, Z: 0.05})),
		cpMust(t)(NewSegment(Vec{X: 0.05, Z: 0.05}, Vec{X: 0.05, Z: -0.01})), cpMust(t)(NewSegment(Vec{X: 0.05, Z: -0.01}, Vec{X: 0.02, Z: 0})))
	srcs := []Source{{Path: coil, I: 3}}
	pts := make([]Vec, 700)
	for i := range pts {
		f := float64(i)
		pts[i] = Vec{X: 0.03 * math.Cos(f), Y: 0.03 * math.Sin(f*1.3), Z: 0.06*f/float64(len(pts)) - 0.005}
	}
	bad := append([]Vec(nil), pts...)
	bad[100] = Vec{X: 0.02} // a vertex of the coil: on the wire
	c := compile(srcs)
	defer func(k *bKernel) { bKernelUse = k }(bKernelUse)
	for _, name := range bkNames {
		t.Run(name, func(t *testing.T) {
			bKernelUse = bkKernel(t, name)
			var outs [2][]Vec
			for w := range 2 {
				outs[w] = make([]Vec, len(pts))
				if err := Fields(FieldB, srcs, pts, outs[w], w+1, nil, nil); err != nil {
					t.Fatal(err)
				}
				err := Fields(FieldB, srcs, bad, make([]Vec, len(bad)), w+1, nil, nil)
				var pe *PointError
				if !errors.As(err, &pe) || pe.Index != 100 || !errors.Is(err, ErrOnWire) {
					t.Fatalf("%d workers: %v, want ErrOnWire at point 101", w+1, err)
				}
			}
			for i := range pts {
				if outs[0][i] != outs[1][i] {
					t.Fatalf("point %d: 1 worker %v, 2 workers %v", i, outs[0][i], outs[1][i])
				}
				sx, sy, sz, err := c.segmentsB(0, len(c.a), pts[i], nil)
				if err != nil {
					t.Fatal(err)
				}
				if d := r3.Norm(r3.Sub(outs[0][i], Vec{X: sx, Y: sy, Z: sz})); d > bkAgreeRel*bkScale(c, pts[i]) {
					t.Errorf("point %d: vector %v, scalar (%g %g %g)", i, outs[0][i], sx, sy, sz)
				}
			}
		})
	}
}

// BenchmarkBKernel times B of a 2000-segment coil at 256 points on one
// core by the scalar loop and each vector kernel this CPU runs, in one
// run, and reports segment–point interactions per second. "joined" is the
// coil as a path (each segment starts where the last ended: one square
// root a segment on the AVX-512 path); "loose" is the same coil with every
// other segment reversed and its current negated (the same field, no
// shared ends: two square roots a segment).
func BenchmarkBKernel(b *testing.B) {
	coil := cpPolyCoil(b, 0.02, 0, 0.05, 200, 10)
	joined := compile([]Source{{Path: coil, I: 1}})
	var a2, b2 []Vec
	var cur []float64
	for i := range joined.a {
		if i%2 == 0 {
			a2, b2, cur = append(a2, joined.a[i]), append(b2, joined.b[i]), append(cur, 1)
		} else {
			a2, b2, cur = append(a2, joined.b[i]), append(b2, joined.a[i]), append(cur, -1)
		}
	}
	loose := bkCompiled(a2, b2, cur)
	pts := make([]Vec, 256)
	for i := range pts {
		f := float64(i)
		pts[i] = Vec{X: 0.05 * math.Cos(f), Y: 0.05 * math.Sin(f), Z: 0.1 * f / float64(len(pts))}
	}
	report := func(b *testing.B, n int) {
		b.ReportMetric(float64(n)*float64(len(pts)*len(joined.a))/b.Elapsed().Seconds(), "interactions/s")
	}
	b.Run("scalar", func(b *testing.B) {
		n := 0
		for b.Loop() {
			for _, x := range pts {
				if _, _, _, err := joined.segmentsB(0, len(joined.a), x, nil); err != nil {
					b.Fatal(err)
				}
			}
			n++
		}
		report(b, n)
	})
	for _, name := range bkNames {
		for _, c := range []struct {
			name string
			c    *compiledSources
		}{{"joined", joined}, {"loose", loose}} {
			b.Run(name+"/"+c.name, func(b *testing.B) {
				v := buildVecSegs(c.c, bkKernel(b, name))
				n := 0
				for b.Loop() {
					for _, x := range pts {
						if _, _, _, err := v.sum(c.c, x); err != nil {
							b.Fatal(err)
						}
					}
					n++
				}
				report(b, n)
			})
		}
	}
}
