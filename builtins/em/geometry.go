package em

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Vec is a point or direction in metres (or a field vector).
type Vec = r3.Vec

// Kind is the kind of a path primitive.
type Kind int

const (
	// Segment is a straight piece from A to B.
	Segment Kind = iota
	// Arc is a circular arc: centre C, radius R, in the plane spanned by
	// the orthonormal U and V, from angle 0 (C + R·U) through Span
	// radians (positive: towards V). A circle has Span = 2π.
	Arc
	// Helix is a helical piece: like Arc, but advancing Pitch metres along
	// N = U×V per radian of turn.
	Helix
)

// Prim is one piece of a path.
type Prim struct {
	Kind    Kind
	A, B    Vec     // Segment end points
	C       Vec     // Arc and Helix centre (of the start of the helix)
	U, V, N Vec     // Arc and Helix frame: U, V in-plane, N = U × V
	R       float64 // Arc and Helix radius
	Span    float64 // Arc and Helix angle swept, radians (may be negative)
	Pitch   float64 // Helix advance along N per radian
}

// Point returns the position at parameter t in [0, 1].
func (p Prim) Point(t float64) Vec {
	switch p.Kind {
	case Segment:
		return r3.Add(p.A, r3.Scale(t, r3.Sub(p.B, p.A)))
	default:
		phi := t * p.Span
		s, c := math.Sincos(phi)
		q := r3.Add(p.C, r3.Add(r3.Scale(p.R*c, p.U), r3.Scale(p.R*s, p.V)))
		if p.Kind == Helix {
			q = r3.Add(q, r3.Scale(p.Pitch*phi, p.N))
		}
		return q
	}
}

// Tangent returns dPoint/dt at t (its length is the primitive's length for
// segments and arcs).
func (p Prim) Tangent(t float64) Vec {
	switch p.Kind {
	case Segment:
		return r3.Sub(p.B, p.A)
	default:
		phi := t * p.Span
		s, c := math.Sincos(phi)
		d := r3.Add(r3.Scale(-p.R*s*p.Span, p.U), r3.Scale(p.R*c*p.Span, p.V))
		if p.Kind == Helix {
			d = r3.Add(d, r3.Scale(p.Pitch*p.Span, p.N))
		}
		return d
	}
}

// Length returns the length of the primitive.
func (p Prim) Length() float64 {
	switch p.Kind {
	case Segment:
		return r3.Norm(r3.Sub(p.B, p.A))
	case Arc:
		return math.Abs(p.Span) * p.R
	default:
		return math.Abs(p.Span) * math.Hypot(p.R, p.Pitch)
	}
}

// Start and End return the end points.
func (p Prim) Start() Vec { return p.Point(0) }
func (p Prim) End() Vec   { return p.Point(1) }

// IsCircle reports whether p is a whole circle.
func (p Prim) IsCircle() bool {
	return p.Kind == Arc && math.Abs(math.Abs(p.Span)-2*math.Pi) < 1e-12
}

// Path is a current path: primitives joined end to end.
type Path struct {
	Prims []Prim
}

// Length returns the total length.
func (p Path) Length() float64 {
	var l float64
	for _, q := range p.Prims {
		l += q.Length()
	}
	return l
}

// Size returns a length scale of the path: the largest distance of a point
// from the first point, sampled at the primitives' ends and middles.
func (p Path) Size() float64 {
	if len(p.Prims) == 0 {
		return 0
	}
	o := p.Prims[0].Start()
	var s, s2 float64
	for _, q := range p.Prims {
		if q.Kind == Segment {
			// the distance from o is convex along a straight piece, so its
			// largest is at an end: the middles add nothing but time (a
			// path of 10^4 pieces is shown, and its loops found, often);
			// squares compared, one root taken
			if d := dist2(q.A, o); d > s2 {
				s2 = d
			}
			if d := dist2(q.B, o); d > s2 {
				s2 = d
			}
			continue
		}
		for _, t := range [...]float64{0, 0.25, 0.5, 0.75, 1} {
			s = math.Max(s, r3.Norm(r3.Sub(q.Point(t), o)))
		}
	}
	if math.IsInf(s2, 0) { // beyond the squares' range
		for _, q := range p.Prims {
			if q.Kind == Segment {
				s = math.Max(s, math.Max(r3.Norm(r3.Sub(q.A, o)), r3.Norm(r3.Sub(q.B, o))))
			}
		}
		return s
	}
	return math.Max(s, math.Sqrt(s2))
}

// dist2 is the square of the distance between a and b.
func dist2(a, b Vec) float64 {
	x, y, z := a.X-b.X, a.Y-b.Y, a.Z-b.Z
	return x*x + y*y + z*z
}

// Closed reports whether the path ends where it starts (each primitive
// starting where the previous ended is not required: a path may be a set of
// closed loops, such as the turns of a coil).
func (p Path) Closed() bool {
	_, closed := p.LoopsClosed()
	return closed
}

// LoopsClosed is Loops, and Closed, finding the path's size once.
func (p Path) LoopsClosed() ([][2]int, bool) {
	scale := p.scale()
	loops := p.loops(scale)
	return loops, len(loops) > 0 && p.openGap(loops, scale) == 0
}

// Loops splits the path into runs of primitives joined end to start, and
// returns the index ranges [from, to) of the runs.
func (p Path) Loops() [][2]int { return p.loops(p.scale()) }

func (p Path) loops(scale float64) [][2]int {
	var out [][2]int
	start := 0
	for i := 1; i <= len(p.Prims); i++ {
		if i == len(p.Prims) || !near(p.Prims[i-1].End(), p.Prims[i].Start(), scale) {
			out = append(out, [2]int{start, i})
			start = i
		}
	}
	return out
}

// openGap returns the number of the runs (from Loops) that do not close on
// themselves.
func (p Path) openGap(loops [][2]int, scale float64) int {
	n := 0
	for _, r := range loops {
		if !near(p.Prims[r[1]-1].End(), p.Prims[r[0]].Start(), scale) {
			n++
		}
	}
	return n
}

func (p Path) scale() float64 {
	return math.Max(p.Size(), 1e-300)
}

// joinTol is the relative distance under which two points are taken as the
// same when joining primitives.
const joinTol = 1e-9

func near(a, b Vec, scale float64) bool {
	t := joinTol * scale
	if d2 := dist2(a, b); t > 1e-150 && t < 1e150 && !math.IsInf(d2, 0) {
		return d2 <= t*t // squares compared: no root a joint
	}
	return r3.Norm(r3.Sub(a, b)) <= t // beyond the squares' range
}

// ErrZeroLength is returned for a primitive of zero length.
var ErrZeroLength = errors.New("a piece of the path has zero length")

// NewSegment makes a straight segment.
func NewSegment(a, b Vec) (Prim, error) {
	if r3.Norm(r3.Sub(b, a)) == 0 {
		return Prim{}, ErrZeroLength
	}
	return Prim{Kind: Segment, A: a, B: b}, nil
}

// frame returns an orthonormal U, V with U×V along n, U along hint when
// hint is not parallel to n.
func frame(n, hint Vec) (u, v, nn Vec, err error) {
	ln := r3.Norm(n)
	if ln == 0 {
		return u, v, nn, errors.New("the axis is the zero vector")
	}
	nn = r3.Scale(1/ln, n)
	h := r3.Sub(hint, r3.Scale(r3.Dot(hint, nn), nn))
	if r3.Norm(h) < 1e-12*math.Max(r3.Norm(hint), 1e-300) || r3.Norm(hint) == 0 {
		// pick the coordinate axis least aligned with n
		ax := Vec{X: 1}
		if math.Abs(nn.X) > 0.6 {
			ax = Vec{Y: 1}
		}
		h = r3.Sub(ax, r3.Scale(r3.Dot(ax, nn), nn))
	}
	u = r3.Unit(h)
	v = r3.Cross(nn, u)
	return u, v, nn, nil
}

// NewArc makes a circular arc around the axis through centre c, starting
// at point start (which fixes the radius), sweeping span radians in the
// right-hand sense about axis.
func NewArc(c, axis, start Vec, span float64) (Prim, error) {
	rv := r3.Sub(start, c)
	an := r3.Norm(axis)
	if an == 0 {
		return Prim{}, errors.New("the axis is the zero vector")
	}
	n := r3.Scale(1/an, axis)
	if off := r3.Dot(rv, n); math.Abs(off) > 1e-9*r3.Norm(rv) {
		return Prim{}, fmt.Errorf("the start point is not in the plane through the centre perpendicular to the axis (it is %.3g m off)", off)
	}
	r := r3.Norm(rv)
	if r == 0 {
		return Prim{}, errors.New("the start point is the centre: the radius is zero")
	}
	if span == 0 || math.IsNaN(span) || math.IsInf(span, 0) {
		return Prim{}, ErrZeroLength
	}
	if math.Abs(span) > 2*math.Pi*(1+1e-12) {
		return Prim{}, errors.New("an arc sweeps at most one full turn; use a helix or repeat for more")
	}
	u, v, nn, _ := frame(n, rv)
	return Prim{Kind: Arc, C: c, U: u, V: v, N: nn, R: r, Span: span}.normalized(), nil
}

// NewCircle makes a whole circle of radius r around axis through c.
func NewCircle(c, axis Vec, r float64) (Prim, error) {
	if !(r > 0) || math.IsInf(r, 0) {
		return Prim{}, errors.New("the radius must be positive")
	}
	u, v, n, err := frame(axis, Vec{})
	if err != nil {
		return Prim{}, err
	}
	return Prim{Kind: Arc, C: c, U: u, V: v, N: n, R: r, Span: 2 * math.Pi}, nil
}

// NewHelix makes a helix of the given radius around axis, starting in the
// plane through c, advancing length along the axis over turns turns
// (right-handed about axis).
func NewHelix(c, axis Vec, r, length, turns float64) (Prim, error) {
	if !(r > 0) {
		return Prim{}, errors.New("the radius must be positive")
	}
	if !(turns > 0) {
		return Prim{}, errors.New("the number of turns must be positive")
	}
	if !(length >= 0) {
		return Prim{}, errors.New("the length must not be negative")
	}
	u, v, n, err := frame(axis, Vec{})
	if err != nil {
		return Prim{}, err
	}
	span := 2 * math.Pi * turns
	return Prim{Kind: Helix, C: c, U: u, V: v, N: n, R: r, Span: span, Pitch: length / span}, nil
}

// Transform applies x -> Rot(x - origin) + origin + shift to a primitive,
// where rot is a rotation (orthonormal, determinant +1).
func (p Prim) Transform(rot func(Vec) Vec, origin, shift Vec) Prim {
	pt := func(x Vec) Vec { return r3.Add(r3.Add(rot(r3.Sub(x, origin)), origin), shift) }
	switch p.Kind {
	case Segment:
		p.A, p.B = pt(p.A), pt(p.B)
	default:
		p.C = pt(p.C)
		p.U, p.V, p.N = rot(p.U), rot(p.V), rot(p.N)
	}
	return p
}

// Reversed returns the primitive traversed the other way.
func (p Prim) Reversed() Prim {
	switch p.Kind {
	case Segment:
		p.A, p.B = p.B, p.A
	default:
		end := p.End()
		phi := p.Span
		// new frame: start at the old end, sweep back
		s, c := math.Sincos(phi)
		u := r3.Add(r3.Scale(c, p.U), r3.Scale(s, p.V))
		v := r3.Add(r3.Scale(-s, p.U), r3.Scale(c, p.V))
		if p.Kind == Helix {
			p.C = r3.Sub(end, r3.Scale(p.R, u))
		}
		p.U, p.V = u, v
		p.Span = -phi
		p = p.normalized()
	}
	return p
}

// normalized returns the same arc or helix with a non-negative Span (the
// frame's V and N flipped when needed).
func (p Prim) normalized() Prim {
	if p.Kind != Segment && p.Span < 0 {
		p.Span = -p.Span
		p.V = r3.Scale(-1, p.V)
		p.N = r3.Scale(-1, p.N)
	}
	return p
}

// Reversed returns the path traversed the other way.
func (p Path) Reversed() Path {
	out := make([]Prim, len(p.Prims))
	for i, q := range p.Prims {
		out[len(p.Prims)-1-i] = q.Reversed()
	}
	return Path{Prims: out}
}
