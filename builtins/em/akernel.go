package em

import "math"

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
//
// with R1R2 + r1·r2 taken as |r1 × r2|²/(R1R2 − r1·r2) when r1·r2 < 0 (no
// cancellation near the wire), written out on flat records: two square
// roots and one logarithm per segment. It is written by hand rather than
// with r3's vector functions because r3.Norm goes through math.Hypot, and
// the norm and the logarithm are nearly all the time inductance takes.
// Points on or very near a segment's line (distance below nearLineA of
// R1 + R2) go to SegmentA, which decides whether they are on the wire
// (ErrOnWire) and otherwise gives the same closed form.
func (c *compiledSources) segmentsA(x Vec, skip []bool) (float64, float64, float64, error) {
	if segmentsAHook != nil {
		return segmentsAHook(c, x, skip)
	}
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
		sl := sum + s.l
		small := 2 * t / sl
		w := s.ki * math.Log(sl/small)
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
