package em

import (
	"bytes"
	"math"
	"math/bits"
	"sort"
	"unsafe"
)

// flatSeg is one straight segment prepared for the vector-potential loop:
// its ends, its unit direction and length, and μ0/4π times its current,
// so that the loop reads one record per segment and computes no norm of
// the segment itself.
type flatSeg struct {
	ax, ay, az float64 // start
	bx, by, bz float64 // end
	ex, ey, ez float64 // unit direction (b − a)/l
	l          float64 // length
	i          float64 // current (A)
	ki         float64 // μ0/4π · current
}

func newFlatSeg(a, b Vec, current float64) flatSeg {
	dx, dy, dz := b.X-a.X, b.Y-a.Y, b.Z-a.Z
	l := math.Sqrt(dx*dx + dy*dy + dz*dz)
	return flatSeg{
		ax: a.X, ay: a.Y, az: a.Z,
		bx: b.X, by: b.Y, bz: b.Z,
		ex: dx / l, ey: dy / l, ez: dz / l,
		l: l, i: current, ki: k0 * current,
	}
}

// nearLineA bounds, relative to the sum of a point's distances from a
// segment's ends, the distance from the segment's line below which
// segmentsA hands the segment to SegmentA. It is twice the largest value
// of segOnWire(n1, n2)/(n1 + n2), so that every point SegmentA could call
// on the wire goes there, whatever the last bits of the distance.
const nearLineA = 2 * (1e-13 + 64*0x1p-53)

// segmentsAHook, when set (by this package's tests and benchmarks only),
// replaces segmentsA, so that the per-segment route can be timed and
// compared through the whole inductance code.
var segmentsAHook func(c *compiledSources, x Vec, skip []bool) (float64, float64, float64, error)

// segmentsA sums the vector potential at x of the straight segments of c,
// without those whose primitive number is set in skip (nil skips none), in
// the segments' order. It is SegmentA's closed form,
//
//	A = μ0/4π · I ê · ln((R1 + R2 + L)/(R1 + R2 − L)),
//	R1 + R2 − L = 2(R1R2 + r1·r2)/(R1 + R2 + L),
//	ln(…) = log1p(L(R1 + R2 + L)/(R1R2 + r1·r2)),
//
// with R1R2 + r1·r2 taken as |r1 × r2|²/(R1R2 − r1·r2) when r1·r2 < 0 (no
// cancellation near the wire), written out on flat records: two square
// roots and one logarithm (log1p) per segment. It is written by hand rather than
// with r3's vector functions because r3.Norm goes through math.Hypot, and
// the norm and the logarithm are nearly all the time inductance takes.
// Points on or very near a segment's line (distance below nearLineA of
// R1 + R2) go to SegmentA, which decides whether they are on the wire
// (ErrOnWire) and otherwise gives the same closed form.
func (c *compiledSources) segmentsA(x Vec, skip []bool) (float64, float64, float64, error) {
	if segmentsAHook != nil {
		return segmentsAHook(c, x, skip)
	}
	if k := aVector; k != nil && len(c.flatSegs()) > 0 {
		return c.segmentsAVec(k, x, skip)
	}
	return c.segmentsAScalar(x, skip)
}

// segmentsAScalar is segmentsA one segment at a time: the fallback where
// no vector kernel runs, and the reference the vector kernels are tested
// against.
func (c *compiledSources) segmentsAScalar(x Vec, skip []bool) (float64, float64, float64, error) {
	var sx, sy, sz float64
	flat := c.flatSegs()
	for k := range flat {
		if skip != nil && skip[c.segIdx[k]] {
			continue
		}
		s := &flat[k]
		r1x, r1y, r1z := s.ax-x.X, s.ay-x.Y, s.az-x.Z
		r2x, r2y, r2z := s.bx-x.X, s.by-x.Y, s.bz-x.Z
		n1 := math.Sqrt(r1x*r1x + r1y*r1y + r1z*r1z)
		n2 := math.Sqrt(r2x*r2x + r2y*r2y + r2z*r2z)
		// r1 × ê: its norm is the distance of x from the segment's line
		cx, cy, cz := r1y*s.ez-r1z*s.ey, r1z*s.ex-r1x*s.ez, r1x*s.ey-r1y*s.ex
		h2 := cx*cx + cy*cy + cz*cz
		sum := n1 + n2
		if g := nearLineA * sum; h2 <= g*g {
			v, err := SegmentA(Vec{X: s.ax, Y: s.ay, Z: s.az}, Vec{X: s.bx, Y: s.by, Z: s.bz}, x)
			if err != nil {
				return 0, 0, 0, err
			}
			sx, sy, sz = sx+s.i*v.X, sy+s.i*v.Y, sz+s.i*v.Z
			continue
		}
		nn := n1 * n2
		dot := r1x*r2x + r1y*r2y + r1z*r2z
		var t float64 // R1R2 + r1·r2 (sumTerm), with |r1 × r2|² = L²|r1 × ê|²
		if dot >= 0 {
			t = nn + dot
		} else {
			t = s.l * s.l * h2 / (nn - dot)
		}
		// ln((R1 + R2 + L)/(R1 + R2 − L)) = log1p(2L/(R1 + R2 − L)) =
		// log1p(L(R1 + R2 + L)/t): far away the ratio is 1 + O(L/R), and
		// the plain logarithm of the rounded ratio lost ε·R/L of itself
		// (1e-10 at 10⁶ lengths); the argument of log1p carries a few ε
		// relative, and log1p(x) is no worse conditioned than x.
		w := s.ki * math.Log1p(s.l*(sum+s.l)/t)
		sx += w * s.ex
		sy += w * s.ey
		sz += w * s.ez
	}
	if bad(sx) || bad(sy) || bad(sz) {
		return 0, 0, 0, ErrOnWire
	}
	return sx, sy, sz, nil
}

// bad reports a NaN or an infinity.
func bad(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }

// The vector kernels (akernel_amd64.s) compute segmentsA for eight or four
// segments at a time. They are written by hand in assembly because Go has
// no vector types or intrinsics, its compiler does not vectorise loops,
// and neither its standard library nor gonum has a vector logarithm; the
// square roots, the divisions and the logarithm are nearly all the time
// inductance takes.
//
// They read the segments in blocks of aLanes, each block holding aRows
// rows of aLanes values (ax, ay, az, bx, by, bz, ex, ey, ez, l, μ0/4π·I),
// so that one row of a block is one vector load.
const (
	aLanes = 8
	aRows  = 11
	aBlock = aLanes * aRows
)

// aKernel is one vector kernel. run sums, over the nb blocks starting at
// p, the terms of the segments numbered lo ≤ k < hi (the first block's
// first segment is numbered first), skipping those near their line. It
// stops after the first block that holds such a segment and returns the
// number of blocks done and that block's mask of near-line segments (bit
// j for its segment j; 0 if none).
type aKernel struct {
	name  string
	lanes int
	run   func(p *float64, nb int, lo, hi, first, x, y, z float64) (sx, sy, sz float64, done int, flags uint64)
}

// aVector is the kernel segmentsA uses, the best of aKernels the CPU has
// (nil: none, the scalar loop). Tests and benchmarks switch it.
var aVector = bestAKernel()

func bestAKernel() *aKernel {
	if len(aKernels) == 0 {
		return nil
	}
	return aKernels[len(aKernels)-1]
}

// aBlocks lays the flat records out in blocks for the vector kernels. The
// lanes after the last segment are zero; the kernels never add them.
func aBlocks(flat []flatSeg) []float64 {
	nb := (len(flat) + aLanes - 1) / aLanes
	out := make([]float64, nb*aBlock)
	for k, s := range flat {
		b := out[(k/aLanes)*aBlock+k%aLanes:]
		for r, v := range [aRows]float64{s.ax, s.ay, s.az, s.bx, s.by, s.bz, s.ex, s.ey, s.ez, s.l, s.ki} {
			b[r*aLanes] = v
		}
	}
	return out
}

// segmentsAVec is segmentsA by the vector kernel k. The skip mask cuts the
// segments into runs (a mask usually sets a few pieces: those that touch
// the one being integrated along); segments near their line are handed to
// SegmentA as in the scalar loop. The lanes are summed separately and
// then together, so the sum differs from the scalar loop's in rounding
// only (TestSegmentsAVector). A sum that is not finite is done again by
// the scalar loop, so that refusals (ErrOnWire) are the scalar loop's.
func (c *compiledSources) segmentsAVec(k *aKernel, x Vec, skip []bool) (float64, float64, float64, error) {
	var acc [3]float64
	n := len(c.flatSegs())
	lo := 0
	if skip != nil {
		// a []bool holds one byte 0 or 1 per element
		mask := unsafe.Slice((*byte)(unsafe.Pointer(unsafe.SliceData(skip))), len(skip))
		for j := 0; lo < n; j++ {
			d := bytes.IndexByte(mask[j:], 1)
			if d < 0 {
				break
			}
			j += d
			// segIdx is increasing: is primitive j the segment numbered lo + i?
			i := sort.SearchInts(c.segIdx[lo:], j)
			if lo+i < n && c.segIdx[lo+i] == j {
				if err := c.aRun(k, lo, lo+i, x, &acc); err != nil {
					return 0, 0, 0, err
				}
				lo += i + 1
			}
		}
	}
	if err := c.aRun(k, lo, n, x, &acc); err != nil {
		return 0, 0, 0, err
	}
	if bad(acc[0]) || bad(acc[1]) || bad(acc[2]) {
		return c.segmentsAScalar(x, skip)
	}
	return acc[0], acc[1], acc[2], nil
}

// aRun adds to acc the terms of the segments lo ≤ k < hi by the kernel,
// those near their line by SegmentA.
func (c *compiledSources) aRun(k *aKernel, lo, hi int, x Vec, acc *[3]float64) error {
	for lo < hi {
		b0 := lo / aLanes
		nb := (hi-1)/aLanes - b0 + 1
		sx, sy, sz, done, flags := k.run(&c.ablk[b0*aBlock], nb, float64(lo), float64(hi), float64(b0*aLanes), x.X, x.Y, x.Z)
		acc[0] += sx
		acc[1] += sy
		acc[2] += sz
		if flags == 0 {
			return nil
		}
		b := b0 + done - 1
		for ; flags != 0; flags &= flags - 1 {
			s := &c.flat[b*aLanes+bits.TrailingZeros64(flags)]
			v, err := SegmentA(Vec{X: s.ax, Y: s.ay, Z: s.az}, Vec{X: s.bx, Y: s.by, Z: s.bz}, x)
			if err != nil {
				return err
			}
			acc[0] += s.i * v.X
			acc[1] += s.i * v.Y
			acc[2] += s.i * v.Z
		}
		lo = (b + 1) * aLanes
	}
	return nil
}

// aNearLine is nearLineA for the vector kernels, which read it from here.
var aNearLine = nearLineA
