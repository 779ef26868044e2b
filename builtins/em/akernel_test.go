package em

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// refSegmentsA is the per-segment route the flat loop replaced: SegmentA
// (r3 vectors, norms through math.Hypot) for each segment, in order. Tests
// compare segmentsA with it, and benchmarks time it through segmentsAHook.
func refSegmentsA(c *compiledSources, x Vec, skip []bool) (float64, float64, float64, error) {
	var sx, sy, sz float64
	for i := range c.a {
		if skip != nil && skip[c.segIdx[i]] {
			continue
		}
		v, err := SegmentA(c.a[i], c.b[i], x)
		if err != nil {
			return 0, 0, 0, err
		}
		sx, sy, sz = sx+c.segI[i]*v.X, sy+c.segI[i]*v.Y, sz+c.segI[i]*v.Z
	}
	return sx, sy, sz, nil
}

// withPerSegmentA runs f with the per-segment route in place of the flat
// loop (not for parallel tests: it sets a package variable).
func withPerSegmentA(f func()) {
	segmentsAHook = refSegmentsA
	defer func() { segmentsAHook = nil }()
	f()
}

func akUnit(rng *rand.Rand) Vec {
	for {
		v := Vec{X: 2*rng.Float64() - 1, Y: 2*rng.Float64() - 1, Z: 2*rng.Float64() - 1}
		if n := r3.Norm(v); n > 0.1 && n <= 1 {
			return r3.Scale(1/n, v)
		}
	}
}

// akSources is a random set of sources: two paths with different currents
// (negative ones too), segments of lengths over three decades at an offset
// from the origin, and an arc among them so that segments are not numbered
// consecutively among the primitives.
func akSources(t *testing.T, rng *rand.Rand) []Source {
	t.Helper()
	scale := math.Pow(10, -3+4*rng.Float64())
	centre := r3.Scale(10*scale*rng.Float64(), akUnit(rng))
	var srcs []Source
	for range 2 {
		var p Path
		n := 1 + rng.IntN(20)
		for k := range n {
			a := r3.Add(centre, r3.Scale(scale*rng.Float64(), akUnit(rng)))
			b := r3.Add(a, r3.Scale(scale*math.Pow(10, -2*rng.Float64()), akUnit(rng)))
			p.Prims = append(p.Prims, cpMust(t)(NewSegment(a, b)))
			if k == n/2 {
				n, u := akUnit(rng), akUnit(rng)
				u = r3.Unit(r3.Sub(u, r3.Scale(r3.Dot(u, n), n)))
				p.Prims = append(p.Prims, cpMust(t)(NewArc(centre, n, r3.Add(centre, r3.Scale(scale, u)), 1)))
			}
		}
		srcs = append(srcs, Source{Path: p, I: 6*rng.Float64() - 3})
	}
	return srcs
}

// akPoint picks a test point for the segments of c: anywhere near them,
// near an end of one, near its line beside it, on its line beyond an end,
// or on it.
func akPoint(rng *rand.Rand, c *compiledSources) Vec {
	k := rng.IntN(len(c.a))
	a, b := c.a[k], c.b[k]
	d := r3.Sub(b, a)
	l := r3.Norm(d)
	switch rng.IntN(5) {
	case 0:
		return r3.Add(a, r3.Scale(3*l*rng.Float64(), akUnit(rng)))
	case 1: // 1e-12 … 1e-1 of the length from an end
		end := a
		if rng.IntN(2) == 1 {
			end = b
		}
		return r3.Add(end, r3.Scale(l*math.Pow(10, -12+11*rng.Float64()), akUnit(rng)))
	case 2: // 1e-13 … 1e-3 of the length from the line, its foot inside
		u := akUnit(rng)
		perp := r3.Unit(r3.Sub(u, r3.Scale(r3.Dot(u, d)/(l*l), d)))
		foot := r3.Add(a, r3.Scale(0.05+0.9*rng.Float64(), d))
		return r3.Add(foot, r3.Scale(l*math.Pow(10, -13+10*rng.Float64()), perp))
	case 3: // on the line, beyond the start by 1e-6 … 1 lengths
		return r3.Sub(a, r3.Scale(math.Pow(10, -6+6*rng.Float64()), d))
	default: // on the segment (up to rounding)
		return r3.Add(a, r3.Scale(rng.Float64(), d))
	}
}

// akScale is μ0/4π · Σ |I|·(1 + |ln q| + [r1·r2 < 0]·(R1 + R2)/h) over the
// segments not skipped, q the argument of the logarithm (|ln q| = |A|/(μ0/4π)
// from SegmentA), R1, R2 the distances from the ends and h from the line.
// The two routes round differently in the last bits of q (an absolute
// error of a few ε in ln q), of ê against d/L and of the product by μ0/4π
// (a few ε of the term), and, where the foot of x lies inside the segment,
// in |r1 × r2|²: a cross product of vectors of length about R1 + R2 whose
// result has length about h·L, so each route carries its own error of
// about ε(R1 + R2)/h relative in it, and so in q (the conditioning of
// r1 = a − x, shared by both routes, not a fault of either). Their
// difference is a few ε times this sum, plus the rounding of the running
// sums (at most n ε of Σ|terms| for n terms; in practice far less).
func akScale(c *compiledSources, x Vec, skip []bool) (float64, int) {
	var s float64
	n := 0
	for i := range c.a {
		if skip != nil && skip[c.segIdx[i]] {
			continue
		}
		v, _ := SegmentA(c.a[i], c.b[i], x)
		r1, r2, d := r3.Sub(c.a[i], x), r3.Sub(c.b[i], x), r3.Sub(c.b[i], c.a[i])
		term := k0 + r3.Norm(v)
		if r3.Dot(r1, r2) < 0 {
			h := r3.Norm(r3.Cross(r1, d)) / r3.Norm(d)
			term += k0 * (r3.Norm(r1) + r3.Norm(r2)) / h
		}
		s += math.Abs(c.segI[i]) * term
		n++
	}
	return s, n
}

// TestSegmentsAFlat: the flat loop (segmentsAScalar, called directly, so
// that it is tested on every machine, vector kernels or not) against the per-segment closed form
// (SegmentA, the code it replaced) at 20 000 random points, a fifth each
// anywhere, near a segment's end, near its line, on its line beyond an end
// and on the segment, with and without a skip mask. Both must refuse the
// same points (ErrOnWire), and elsewhere agree per component within
// (16 + n)·ε·S, S from akScale, n the number of terms: the rounding
// analysis there, not a fitted figure. The largest difference seen is
// logged in units of ε·S.
func TestSegmentsAFlat(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 1))
	const eps = 0x1p-52
	var worst float64
	onWire, checked := 0, 0
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
			}
			fx, fy, fz, ferr := c.segmentsAScalar(x, skip)
			rx, ry, rz, rerr := refSegmentsA(c, x, skip)
			if (ferr != nil) != (rerr != nil) {
				t.Fatalf("trial %d point %v: flat error %v, per-segment error %v", trial, x, ferr, rerr)
			}
			if rerr != nil {
				if !errors.Is(ferr, ErrOnWire) || !errors.Is(rerr, ErrOnWire) {
					t.Fatalf("trial %d: errors %v and %v, want the on-wire error", trial, ferr, rerr)
				}
				onWire++
				continue
			}
			s, n := akScale(c, x, skip)
			tol := float64(16+n) * eps * s
			for _, p := range [][2]float64{{fx, rx}, {fy, ry}, {fz, rz}} {
				d := math.Abs(p[0] - p[1])
				if d > tol {
					t.Fatalf("trial %d point %v: flat %.17g, per-segment %.17g, diff %.3g > %.3g", trial, x, p[0], p[1], d, tol)
				}
				if s > 0 {
					worst = math.Max(worst, d/(eps*s))
				}
			}
			checked++
		}
	}
	if onWire == 0 || checked < 10000 {
		t.Fatalf("the points did not cover both cases: %d on a wire, %d compared", onWire, checked)
	}
	t.Logf("%d points compared, %d on a wire refused by both; largest difference %.3g ε·S", checked, onWire, worst)
}

// TestSegmentsASkip: segments skipped by the mask add nothing to the
// scalar loop, exactly (the vector kernels' masks are checked against it
// in TestSegmentsAVector): the
// masked sum equals, bit for bit, the sum over sources built without those
// segments (the same terms in the same order), and a point on a skipped
// segment is no longer on a wire.
func TestSegmentsASkip(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 2))
	mids := 0
	for trial := range 200 {
		srcs := akSources(t, rng)
		c := compile(srcs)
		var skip []bool
		var kept []Source
		for _, s := range srcs {
			var p Path
			for _, q := range s.Path.Prims {
				sk := q.Kind == Segment && rng.IntN(3) == 0
				skip = append(skip, sk)
				if !sk {
					p.Prims = append(p.Prims, q)
				}
			}
			kept = append(kept, Source{Path: p, I: s.I})
		}
		ck := compile(kept)
		for range 20 {
			x := akPoint(rng, c)
			fx, fy, fz, ferr := c.segmentsAScalar(x, skip)
			kx, ky, kz, kerr := ck.segmentsAScalar(x, nil)
			if (ferr == nil) != (kerr == nil) || fx != kx || fy != ky || fz != kz {
				t.Fatalf("trial %d: masked (%v %v %v, %v), without the pieces (%v %v %v, %v)", trial, fx, fy, fz, ferr, kx, ky, kz, kerr)
			}
		}
		// the middle of a skipped segment, where that segment alone
		// refuses the point and the kept ones do not, is not refused
		for k, i := range c.segIdx {
			if !skip[i] {
				continue
			}
			mid := r3.Scale(0.5, r3.Add(c.a[k], c.b[k]))
			if _, err := SegmentA(c.a[k], c.b[k], mid); !errors.Is(err, ErrOnWire) {
				continue // rounding took the middle off the wire
			}
			if _, _, _, err := ck.segmentsAScalar(mid, nil); err != nil {
				continue // a kept segment passes through it too
			}
			if _, _, _, err := c.segmentsAScalar(mid, nil); !errors.Is(err, ErrOnWire) {
				t.Fatalf("trial %d: the middle of segment %d is not refused without the mask: %v", trial, i, err)
			}
			if _, _, _, err := c.segmentsAScalar(mid, skip); err != nil {
				t.Fatalf("trial %d: segment %d is masked but still refuses its middle: %v", trial, i, err)
			}
			mids++
		}
	}
	if mids < 50 {
		t.Fatalf("only %d middles of masked segments were tried", mids)
	}
	t.Logf("%d middles of masked segments tried", mids)
}

// TestInductanceRoutes: self-inductance of a 40-turn rectangular toroidal
// winding and the mutual inductance of two 200-segment coils, by the flat
// loop and by the per-segment route. The integrands differ by a few ε
// (TestSegmentsAFlat), so the adaptive quadratures may at most refine
// differently: the results must agree within the requested relative
// accuracy, DefaultTol.Rel = 1e-10 (a guard against drift between the two
// routes; the values themselves are checked against outside references by
// the other inductance tests, e.g. TestToroid).
func TestInductanceRoutes(t *testing.T) {
	tor := akToroid(t, 40, 0.02, 0.03, 0.01)
	c1 := cpPolyCoil(t, 0.02, 0, 0.02, 4, 50)
	c2 := cpPolyCoil(t, 0.015, 0.03, 0.02, 4, 50)
	run := func() (l, m float64) {
		var err error
		if l, err = SelfInductance(tor, 0.25e-3, DefaultTol); err != nil {
			t.Fatal(err)
		}
		if m, err = Mutual(c1, c2, MutualOptions{NoFastPath: true}); err != nil {
			t.Fatal(err)
		}
		return l, m
	}
	lf, mf := run()
	var lr, mr float64
	withPerSegmentA(func() { lr, mr = run() })
	for _, c := range []struct {
		name      string
		flat, ref float64
	}{{"toroid self-inductance", lf, lr}, {"mutual inductance", mf, mr}} {
		rel := math.Abs(c.flat-c.ref) / math.Abs(c.ref)
		if rel > DefaultTol.Rel {
			t.Errorf("%s: flat %.17g H, per-segment %.17g H (rel %.2g > %.2g)", c.name, c.flat, c.ref, rel, DefaultTol.Rel)
		}
		t.Logf("%s: %.15g H, routes differ by %.2g relative", c.name, c.flat, rel)
	}
}
