package em

import (
	"fmt"
	"math"
	"runtime"
	"sync"
	"sync/atomic"

	"gonum.org/v1/gonum/spatial/r3"
)

// Source is a path carrying a current in amperes, or a Shape (a sheet,
// an ideal conductor, a dipole) whose per-ampere field I scales. Plate, if
// set, is the permeable half space the source was mirrored in: its field is
// refused behind the plate.
type Source struct {
	Path  Path
	I     float64
	Shape Shape
	Plate *Plate
}

// Which selects the field a kernel computes.
type Which int

const (
	// FieldB is the magnetic flux density (T).
	FieldB Which = iota
	// FieldA is the vector potential (T·m).
	FieldA
)

// PointError tells which point failed.
type PointError struct {
	Index int
	Point Vec
	Err   error
}

func (e *PointError) Error() string {
	return fmt.Sprintf("point %d (%.6g, %.6g, %.6g) m: %v", e.Index+1, e.Point.X, e.Point.Y, e.Point.Z, e.Err)
}

func (e *PointError) Unwrap() error { return e.Err }

// compiledSources flattens sources: straight segments into arrays for the
// hot loop, everything else kept as primitives.
type compiledSources struct {
	a, b []Vec     // segment ends
	l    []float64 // segment lengths
	segI []float64 // segment currents
	// flat holds the segments again for the vector-potential loop
	// (segmentsA), one record each, in the same order as a and b, and
	// ablk the same in blocks for the vector kernels (aBlocks); both made
	// at the first A evaluation (flatSegs).
	flat     []flatSeg
	ablk     []float64
	flatOnce sync.Once
	others   []Prim
	othersI  []float64
	// segIdx and othIdx number each entry by its place among all the
	// primitives of all the sources, for masking (see atMasked).
	segIdx, othIdx []int
	// shapes and their currents, after the primitives
	shapes  []Shape
	shapesI []float64
	plates  []Plate
	// vb holds the segments again, in groups for the vector B kernel
	// (bkernel.go), made at the first B evaluation (vecB); nil when no
	// vector kernel runs on this CPU or the segments are outside its
	// range.
	vb     *vecSegs
	vbOnce sync.Once
	// stop, if not nil, is polled by the numerical integrals of helices.
	stop func() error
}

func compile(srcs []Source) *compiledSources {
	c := &compiledSources{}
	n := 0
	for _, s := range srcs {
		if s.I != 0 {
			for _, p := range s.Path.Prims {
				if p.Kind == Segment {
					n++
				}
			}
		}
	}
	c.a, c.b, c.l, c.segI = make([]Vec, 0, n), make([]Vec, 0, n), make([]float64, 0, n), make([]float64, 0, n)
	c.segIdx = make([]int, 0, n)
	k := 0
	for _, s := range srcs {
		if s.Plate != nil {
			c.plates = append(c.plates, *s.Plate)
		}
		if s.Shape != nil && s.I != 0 {
			c.shapes = append(c.shapes, s.Shape)
			c.shapesI = append(c.shapesI, s.I)
		}
		for _, p := range s.Path.Prims {
			k++
			if s.I == 0 {
				continue
			}
			if p.Kind == Segment {
				c.a = append(c.a, p.A)
				c.b = append(c.b, p.B)
				c.l = append(c.l, r3.Norm(r3.Sub(p.B, p.A)))
				c.segI = append(c.segI, s.I)
				c.segIdx = append(c.segIdx, k-1)
			} else {
				c.others = append(c.others, p)
				c.othersI = append(c.othersI, s.I)
				c.othIdx = append(c.othIdx, k-1)
			}
		}
	}
	return c
}

// flatSegs returns the segments as records for segmentsA, making them at
// the first call (safe for concurrent callers).
func (c *compiledSources) flatSegs() []flatSeg {
	c.flatOnce.Do(func() {
		c.flat = make([]flatSeg, len(c.a))
		for i := range c.a {
			c.flat[i] = newFlatSeg(c.a[i], c.b[i], c.segI[i])
		}
		c.ablk = aBlocks(c.flat)
	})
	return c.flat
}

// vecB returns the segments laid out for the vector B kernel, making them
// at the first call (safe for concurrent callers).
func (c *compiledSources) vecB() *vecSegs {
	c.vbOnce.Do(func() { c.vb = newVecSegs(c) })
	return c.vb
}

// at computes the field at one point: segments first in their order, then
// the other primitives in theirs; always the same order, so the result is
// bit-identical however the points are shared among workers.
func (c *compiledSources) at(which Which, x Vec) (Vec, error) {
	return c.atMasked(which, x, nil)
}

// atMasked is at without the primitives whose number is set in skip (nil
// skips none).
func (c *compiledSources) atMasked(which Which, x Vec, skip []bool) (Vec, error) {
	for _, pl := range c.plates {
		if pl.Behind(x) {
			return Vec{}, ErrBehindPlate
		}
	}
	var sx, sy, sz float64
	if which == FieldB {
		var vb *vecSegs
		if skip == nil && vecPointOK(x) {
			vb = c.vecB()
		}
		var err error
		if vb != nil {
			sx, sy, sz, err = vb.sum(c, x)
		} else {
			sx, sy, sz, err = c.segmentsB(0, len(c.a), x, skip)
		}
		if err != nil {
			return Vec{}, err
		}
	} else {
		ax, ay, az, err := c.segmentsA(x, skip)
		if err != nil {
			return Vec{}, err
		}
		sx, sy, sz = ax, ay, az
	}
	for i, p := range c.others {
		if skip != nil && skip[c.othIdx[i]] {
			continue
		}
		var v Vec
		var err error
		if which == FieldB {
			v, err = primB(p, x, c.stop)
		} else {
			v, err = primA(p, x, c.stop)
		}
		if err != nil {
			return Vec{}, err
		}
		sx, sy, sz = sx+c.othersI[i]*v.X, sy+c.othersI[i]*v.Y, sz+c.othersI[i]*v.Z
	}
	for i, s := range c.shapes {
		v, err := s.Field(which, x, c.stop)
		if err != nil {
			return Vec{}, err
		}
		sx, sy, sz = sx+c.shapesI[i]*v.X, sy+c.shapesI[i]*v.Y, sz+c.shapesI[i]*v.Z
	}
	return Vec{X: sx, Y: sy, Z: sz}, nil
}

// segmentsB sums B at x of the straight segments lo to hi−1 of c, without
// those whose primitive number is set in skip (nil skips none), in their
// order. It is the scalar loop: the reference for the vector kernels
// (bkernel.go), which also hand it every group of segments they flag.
func (c *compiledSources) segmentsB(lo, hi int, x Vec, skip []bool) (float64, float64, float64, error) {
	var sx, sy, sz float64
	for i := lo; i < hi; i++ {
		if skip != nil && skip[c.segIdx[i]] {
			continue
		}
		r1x, r1y, r1z := c.a[i].X-x.X, c.a[i].Y-x.Y, c.a[i].Z-x.Z
		r2x, r2y, r2z := c.b[i].X-x.X, c.b[i].Y-x.Y, c.b[i].Z-x.Z
		n1 := math.Sqrt(r1x*r1x + r1y*r1y + r1z*r1z)
		n2 := math.Sqrt(r2x*r2x + r2y*r2y + r2z*r2z)
		dx, dy, dz := c.b[i].X-c.a[i].X, c.b[i].Y-c.a[i].Y, c.b[i].Z-c.a[i].Z
		cx, cy, cz := r1y*dz-r1z*dy, r1z*dx-r1x*dz, r1x*dy-r1y*dx // r1 × (b − a)
		nn := n1 * n2
		s := sumTerm(nn, r1x*r2x+r1y*r2y+r1z*r2z, cx*cx+cy*cy+cz*cz)
		tl := nearLineRel * c.l[i]
		if s <= tl*tl {
			b, err := SegmentB(c.a[i], c.b[i], x) // rare: on or near the line
			if err != nil {
				return 0, 0, 0, err
			}
			sx, sy, sz = sx+c.segI[i]*b.X, sy+c.segI[i]*b.Y, sz+c.segI[i]*b.Z
			continue
		}
		f := c.segI[i] * k0 * (n1 + n2) / (nn * s)
		if math.IsInf(f, 0) || math.IsNaN(f) {
			return 0, 0, 0, ErrOnWire
		}
		sx += f * cx
		sy += f * cy
		sz += f * cz
	}
	return sx, sy, sz, nil
}

// chunk is the number of points a worker takes at a time.
const chunk = 32

// Fields computes B or A of the sources at every point into out (len(out)
// must equal len(pts)). It uses workers goroutines (0: one per CPU),
// sharing the points in chunks; each point is summed by one goroutine in a
// fixed order, so results do not depend on the number of workers. If any
// point fails, the error of the lowest-numbered failing point is returned.
// progress, if not nil, is called now and then with the number of points
// done (from one goroutine at a time). stop, if not nil, is polled by every
// worker before each chunk of points; once it returns an error all workers
// end after their current chunk and Fields returns that error.
func Fields(which Which, srcs []Source, pts, out []Vec, workers int, progress func(done int), stop func() error) error {
	if len(out) != len(pts) {
		return fmt.Errorf("em.Fields: %d points but %d outputs", len(pts), len(out))
	}
	c := compile(srcs)
	c.stop = stop
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	nChunks := (len(pts) + chunk - 1) / chunk
	workers = max(1, min(workers, nChunks))
	var next, done atomic.Int64
	var mu sync.Mutex
	firstErr := &PointError{Index: -1}
	var stopErr atomic.Pointer[error]
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				if stopErr.Load() != nil {
					return
				}
				if stop != nil {
					if err := stop(); err != nil {
						stopErr.CompareAndSwap(nil, &err)
						return
					}
				}
				k := int(next.Add(1)) - 1
				if k >= nChunks {
					return
				}
				lo, hi := k*chunk, min((k+1)*chunk, len(pts))
				for i := lo; i < hi; i++ {
					if stop != nil && i > lo {
						if err := stop(); err != nil {
							stopErr.CompareAndSwap(nil, &err)
							return
						}
					}
					v, err := c.at(which, pts[i])
					if err != nil {
						mu.Lock()
						if firstErr.Index < 0 || i < firstErr.Index {
							firstErr = &PointError{Index: i, Point: pts[i], Err: err}
						}
						mu.Unlock()
						break
					}
					out[i] = v
				}
				d := done.Add(int64(hi - lo))
				if progress != nil {
					mu.Lock()
					progress(int(d))
					mu.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	if e := stopErr.Load(); e != nil {
		return *e
	}
	if firstErr.Index >= 0 {
		return firstErr
	}
	return nil
}

// FieldAt is the field of the sources at one point.
func FieldAt(which Which, srcs []Source, x Vec) (Vec, error) {
	return compile(srcs).at(which, x)
}

// Evaluator computes one field of fixed sources at points, with the
// sources flattened once.
type Evaluator struct {
	which Which
	c     *compiledSources
}

// NewEvaluator prepares sources for repeated single-point evaluation.
func NewEvaluator(which Which, srcs []Source) *Evaluator {
	return &Evaluator{which: which, c: compile(srcs)}
}

// SetStop makes the numerical integrals of the evaluator's helices poll
// stop and end with its error.
func (e *Evaluator) SetStop(stop func() error) { e.c.stop = stop }

// At returns the field at x.
func (e *Evaluator) At(x Vec) (Vec, error) { return e.c.at(e.which, x) }

// SegmentWeight is the cost of one straight segment's field (B or A) at
// one point, in units of the scalar B loop's (about 11 ns, the unit the
// work budget counts in): the slower of the vector-potential and B
// kernels this machine runs, so that an estimate stays an upper bound for
// either field. Measured (BenchmarkSegmentAKernel, BenchmarkBKernel, one
// run): A about 2 ns with AVX-512 and 5 ns with AVX2, B about 0.7 and
// 1.7 ns; hence 0.25 and 0.5, with room for a loaded machine. Without a
// vector kernel it is 1.
func SegmentWeight() float64 {
	if aVector == nil || bKernelUse == nil {
		return 1
	}
	if aVector.lanes >= 8 && bKernelUse.lanes >= 8 {
		return 0.25
	}
	return 0.5
}
