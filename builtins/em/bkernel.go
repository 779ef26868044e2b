package em

import "math"

// The vector B kernel for straight segments.
//
// compiledSources.vecB copies the segments once more into blocks of
// vecBlock segments, structure of arrays inside each block (vecFields rows
// of vecBlock lanes: ax ay az bx by bz dx dy dz w t, with d = b − a as
// segmentsB rounds it, w = μ0/4π·I and t the near-line threshold below),
// so that a vector kernel loads each quantity of 8 (or 4) segments with
// one instruction. The kernels (bkernel_amd64.s) compute, per lane, the
// scalar loop's closed form (segmentsB):
//
//	B += w (n1 + n2)/(n1 n2 s) · r1 × (b − a),  s = n1 n2 + r1·r2  (r1·r2 ≥ 0)
//	                                              s = |r1 × (b − a)|²/(n1 n2 − r1·r2)  (r1·r2 < 0)
//
// without a second division: where r1·r2 < 0 the factor is written
// w (n1 + n2)(n1 n2 − r1·r2)/(n1 n2 |r1 × (b − a)|²). r1, r2, b − a, the
// cross product and r1·r2 are rounded exactly as in segmentsB (no fused
// multiply-add there), so every lane takes the same branch of sumTerm as
// the scalar loop; the norms, |c|², and the sum use FMA.
//
// Guards. A lane is flagged when its denominator (n1 n2 + r1·r2 or
// |r1 × (b − a)|²) is at most t·num + 2^-200 (one fused multiply-add;
// num = 1 or n1 n2 − r1·r2), with t = (nearLineRel·l)² enlarged by 2^-30. The enlargement is far more than the few roundings
// by which the vector and scalar forms of the test can differ, so every
// lane that the scalar loop would hand to SegmentB is flagged (a few more
// may be, which does no harm). A kernel stops at the first group of lanes
// with a flag and returns its number; the Go side then sums that group with
// segmentsB itself (exact guard, SegmentB, ErrOnWire) and lets the kernel
// go on with the next group. The floor 2^-200, together with the range
// the vector path accepts (coordinates and |w| at most 2^60, lengths at
// least 2^-60; vecRange), bounds n1 n2 s from below in unflagged lanes (by
// 2^-401), so their factor is finite in both forms: the scalar loop's
// non-finite-factor error (ErrOnWire) cannot arise in a lane the kernel
// keeps, and no per-lane finiteness test is needed. Sources or points
// outside that range use segmentsB.
//
// Shared ends. When every segment of a block ends bit for bit where the
// next begins (chain), the AVX-512 kernel takes r2 = x − b and n2 of lane
// j from r1 and n1 of lane j+1 (of the next block for the last lane): one
// square root a segment instead of two, with the same rounded values.
//
// Order. Lane j of every group is summed in accumulator lane j; flagged
// groups, the remainder (the last len mod 8 segments, by segmentsB) and
// the accumulator lanes are added in a fixed order. The result depends
// only on the sources and the point, never on the worker count.
const (
	vecBlock  = 8  // segments in a block
	vecFields = 11 // rows of a block: ax ay az bx by bz dx dy dz w t
	// vecRange bounds the coordinates and |w| the vector path accepts,
	// and its inverse the segment lengths.
	vecRange = 0x1p60
	// vecMargin enlarges the near-line threshold (see above).
	vecMargin = 1 + 0x1p-30
)

// bKernel is one vector kernel. Its run method (per architecture) sums
// the groups g to n−1 (group k is segments k·lanes to k·lanes + lanes − 1)
// into acc (x lanes at 0, y at 8, z at 16; kept between calls) and
// returns the number of the first group it flagged, or n. chain[k] is 1 when every segment of block k ends
// exactly (bit for bit) where the next begins, the last one where block
// k+1 begins (see vecSegs); a kernel may then take n2 from the next
// segment's n1.
type bKernel struct {
	name  string
	lanes int
	id    int // which assembly function run calls
}

// bKernelUse is the kernel compile prepares for: the widest this CPU runs
// (bKernels, per architecture), or nil for the scalar loop alone.
var bKernelUse = widestKernel()

func widestKernel() *bKernel {
	if len(bKernels) == 0 {
		return nil
	}
	return &bKernels[0]
}

// vecSegs is the segments of a compiledSources in blocks for kernel k:
// nFull/vecBlock blocks, then one more whose starts (rows ax ay az) are
// all the end of segment nFull−1, so that a kernel may read the starts of
// the block after any block; chain marks the blocks whose segments are
// joined end to start.
type vecSegs struct {
	k     *bKernel
	blk   []float64
	chain []uint8
	nFull int // segments in whole blocks; the rest go to segmentsB
}

func newVecSegs(c *compiledSources) *vecSegs {
	if bKernelUse == nil {
		return nil
	}
	return buildVecSegs(c, bKernelUse)
}

// buildVecSegs lays out the segments of c for k, or returns nil when they
// fill no block or lie outside vecRange.
func buildVecSegs(c *compiledSources, k *bKernel) *vecSegs {
	nFull := len(c.a) / vecBlock * vecBlock
	if nFull == 0 {
		return nil
	}
	for i := range c.a {
		w := c.segI[i] * k0
		if !inVecRange(c.a[i]) || !inVecRange(c.b[i]) || !(math.Abs(w) <= vecRange) || !(c.l[i] >= 1/vecRange) {
			return nil
		}
	}
	nb := nFull / vecBlock
	v := &vecSegs{k: k, nFull: nFull, blk: make([]float64, (nb+1)*vecBlock*vecFields), chain: make([]uint8, nb)}
	last := v.blk[nb*vecBlock*vecFields:]
	for j := range vecBlock {
		last[j], last[vecBlock+j], last[2*vecBlock+j] = c.b[nFull-1].X, c.b[nFull-1].Y, c.b[nFull-1].Z
	}
	same := func(p, q Vec) bool {
		return math.Float64bits(p.X) == math.Float64bits(q.X) && math.Float64bits(p.Y) == math.Float64bits(q.Y) &&
			math.Float64bits(p.Z) == math.Float64bits(q.Z)
	}
	for k := range nb {
		v.chain[k] = 1
		for i := k * vecBlock; i < (k+1)*vecBlock && i+1 < nFull; i++ {
			if !same(c.b[i], c.a[i+1]) {
				v.chain[k] = 0
			}
		}
	}
	for i := 0; i < nFull; i++ {
		row := v.blk[i/vecBlock*vecBlock*vecFields+i%vecBlock:]
		tl := nearLineRel * c.l[i]
		for f, q := range [vecFields]float64{
			c.a[i].X, c.a[i].Y, c.a[i].Z, c.b[i].X, c.b[i].Y, c.b[i].Z,
			c.b[i].X - c.a[i].X, c.b[i].Y - c.a[i].Y, c.b[i].Z - c.a[i].Z, // as segmentsB rounds b − a
			c.segI[i] * k0, tl * tl * vecMargin,
		} {
			row[f*vecBlock] = q
		}
	}
	return v
}

func inVecRange(x Vec) bool {
	return math.Abs(x.X) <= vecRange && math.Abs(x.Y) <= vecRange && math.Abs(x.Z) <= vecRange
}

// vecPointOK reports whether the vector path may take the point x.
func vecPointOK(x Vec) bool { return inVecRange(x) }

// sum is B at x of all the segments of c (1 A scaled by their currents),
// as segmentsB(0, len(c.a), x, nil) computes it, by the vector kernel.
func (v *vecSegs) sum(c *compiledSources, x Vec) (float64, float64, float64, error) {
	var acc [24]float64
	var fx, fy, fz float64 // flagged groups
	lanes := v.k.lanes
	n := v.nFull / lanes
	for g := 0; ; g++ {
		g = v.k.run(&v.blk[0], &v.chain[0], g, n, x.X, x.Y, x.Z, &acc) // acc stays on the stack
		if g >= n {
			break
		}
		gx, gy, gz, err := c.segmentsB(g*lanes, (g+1)*lanes, x, nil)
		if err != nil {
			return 0, 0, 0, err
		}
		fx, fy, fz = fx+gx, fy+gy, fz+gz
	}
	rx, ry, rz, err := c.segmentsB(v.nFull, len(c.a), x, nil)
	if err != nil {
		return 0, 0, 0, err
	}
	var sx, sy, sz float64
	for j := range vecBlock {
		sx, sy, sz = sx+acc[j], sy+acc[8+j], sz+acc[16+j]
	}
	return sx + fx + rx, sy + fy + ry, sz + fz + rz, nil
}
