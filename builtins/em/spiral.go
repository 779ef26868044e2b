package em

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Spiral describes a planar spiral coil of flat trace, as drawn on a
// printed circuit board, by the centre line of its trace.
type Spiral struct {
	Center, Axis Vec
	// Sides is 4, 6 or 8 for polygons, 0 for a circular spiral (made of
	// half-circles whose centres alternate so that the radius shrinks by
	// the pitch every turn).
	Sides int
	// Outer is the outer size of the trace: across the flats of a polygon
	// (outer edge to outer edge), the outer diameter of a circle.
	Outer, Width, Spacing float64
	// Turns must be a whole number of sides (a whole number of half turns
	// for a circle).
	Turns float64
	// Layers ≥ 1 copies stacked along the axis, LayerSpacing apart (copper
	// centre to copper centre), joined by vias (straight pieces along the
	// axis). Layer 1 lies on the +axis side; the stack is centred on
	// Center.
	Layers       int
	LayerSpacing float64
}

// MaxSpiralPieces bounds the pieces of one layer of a spiral.
const MaxSpiralPieces = 100_000

// pieces returns the number of sides (half circles) one layer has.
func (s Spiral) pieces() (k, n int, err error) {
	n = s.Sides
	if n == 0 {
		n = 2
	}
	kf := s.Turns * float64(n)
	if !(s.Turns > 0) || math.Abs(kf-math.Round(kf)) > 1e-9*math.Max(1, kf) {
		if s.Sides == 0 {
			return 0, 0, errors.New("the number of turns must be a positive whole number of half turns")
		}
		return 0, 0, fmt.Errorf("the number of turns must be a positive whole number of sides (a multiple of 1/%d)", n)
	}
	if kf > MaxSpiralPieces {
		return 0, 0, fmt.Errorf("%g turns is more than the limit of %d pieces per layer", s.Turns, MaxSpiralPieces)
	}
	return int(math.Round(kf)), n, nil
}

// Inner returns the inner size of the spiral, the free space inside its
// innermost piece: for a polygon across the flats of the innermost turn,
// Outer − 2·Turns·Width − 2·(Turns − 1)·Spacing for whole turns; for a
// circle the inside diameter of the last half circle, which is half a
// pitch inside the turn before it.
func (s Spiral) Inner() float64 {
	k, n, err := s.pieces()
	if err != nil {
		return math.NaN()
	}
	p := s.Width + s.Spacing
	// the innermost centre line: polygons step in once a turn, circles
	// once a half turn (the last half circle is p/2 inside the one before)
	a := (s.Outer - s.Width) / 2
	if s.Sides == 0 {
		return 2*(a-float64(k-1)*p/2) - s.Width
	}
	return 2*(a-float64((k-1)/n)*p) - s.Width
}

// Path builds the spiral's centre line: layer 1 runs inwards, turning
// right-handed about the axis; the next layer, joined by a via at the
// inner end, is its mirror image run outwards, so that the current turns
// the same way round on every layer; and so on, alternately.
func (s Spiral) Path() (Path, error) {
	k, n, err := s.pieces()
	if err != nil {
		return Path{}, err
	}
	switch {
	case s.Sides != 0 && s.Sides != 4 && s.Sides != 6 && s.Sides != 8:
		return Path{}, errors.New("a polygon spiral has 4, 6 or 8 sides")
	case !(s.Width > 0) || !(s.Spacing > 0) || !(s.Outer > 0):
		return Path{}, errors.New("the outer size, width and spacing must be positive")
	case s.Layers < 1:
		return Path{}, errors.New("a spiral has at least one layer")
	case s.Layers > 1 && !(s.LayerSpacing > 0):
		return Path{}, errors.New("the layer spacing must be positive")
	case s.Layers*(k+1) > 2*MaxSpiralPieces:
		return Path{}, fmt.Errorf("the spiral would have %d pieces; the limit is %d", s.Layers*(k+1), 2*MaxSpiralPieces)
	}
	if in := s.Inner(); !(in > 0) {
		return Path{}, fmt.Errorf("the turns do not fit: the inner size would be %.4g m; use fewer turns, a narrower trace or less spacing, or a larger outer size", in)
	}
	u, v, nn, err := frame(s.Axis, Vec{})
	if err != nil {
		return Path{}, err
	}
	top := r3.Add(s.Center, r3.Scale(float64(s.Layers-1)/2*s.LayerSpacing, nn))
	var layer []Prim
	if s.Sides == 0 {
		layer, err = s.circleLayer(top, u, v, nn, k)
	} else {
		layer, err = s.polygonLayer(top, u, v, k, n)
	}
	if err != nil {
		return Path{}, err
	}
	prims := append([]Prim{}, layer...)
	for l := 1; l < s.Layers; l++ {
		end := layer[len(layer)-1].End()
		down := r3.Scale(-s.LayerSpacing, nn)
		via, err := NewSegment(end, r3.Add(end, down))
		if err != nil {
			return Path{}, err
		}
		// mirror in the plane through the axis and the end point, run
		// backwards, one layer down
		e := r3.Sub(end, top)
		e = r3.Sub(e, r3.Scale(r3.Dot(e, nn), nn))
		if r3.Norm(e) == 0 {
			return Path{}, errors.New("the spiral ends on its axis")
		}
		m := r3.Unit(r3.Cross(nn, e))
		next := make([]Prim, len(layer))
		for i, q := range layer {
			next[len(layer)-1-i] = reflectPrim(q, top, m).Reversed()
		}
		top = r3.Add(top, down)
		for i := range next {
			next[i] = next[i].Transform(func(x Vec) Vec { return x }, Vec{}, down)
		}
		prims = append(prims, via)
		prims = append(prims, next...)
		layer = next
	}
	return Path{Prims: prims}, nil
}

// polygonLayer is one inward layer of a polygon spiral: side k lies on
// the line whose outward normal is at −90° + k·360°/n from u (side 0 runs
// along u), at the distance (apothem) a − p·⌊k/n⌋ from the centre, so
// every turn is the polygon one pitch inside the last, stepping in on its
// last side; corners are where consecutive lines meet. The first corner
// is on the outer polygon, the last on the innermost one.
func (s Spiral) polygonLayer(o, u, v Vec, k, n int) ([]Prim, error) {
	p := s.Width + s.Spacing
	a := (s.Outer - s.Width) / 2
	delta := 2 * math.Pi / float64(n)
	apothem := func(j int) float64 { return a - p*math.Floor(float64(j)/float64(n)) }
	ain := apothem(k - 1)
	line := func(j int) (float64, float64, float64) {
		al := -math.Pi/2 + float64(j)*delta
		h := math.Min(a, math.Max(ain, apothem(j)))
		return math.Cos(al), math.Sin(al), h
	}
	sd := math.Sin(delta)
	corner := func(j int) Vec { // where line j−1 meets line j
		c1, s1, h1 := line(j - 1)
		c2, s2, h2 := line(j)
		x := (h1*s2 - h2*s1) / sd
		y := (c1*h2 - c2*h1) / sd
		return r3.Add(o, r3.Add(r3.Scale(x, u), r3.Scale(y, v)))
	}
	prims := make([]Prim, k)
	prev := corner(0)
	for j := 0; j < k; j++ {
		c := corner(j + 1)
		seg, err := NewSegment(prev, c)
		if err != nil {
			return nil, errors.New("the turns do not fit")
		}
		prims[j] = seg
		prev = c
	}
	return prims, nil
}

// circleLayer is one inward layer of a circular spiral: k half circles,
// the j-th of radius a − j·p/2 about o (j even) or about o − (p/2)·u (j
// odd), so that consecutive halves meet on the line through o along u
// with a common tangent, and the radius shrinks by the pitch p a turn.
func (s Spiral) circleLayer(o, u, v, nn Vec, k int) ([]Prim, error) {
	p := s.Width + s.Spacing
	a := (s.Outer - s.Width) / 2
	prims := make([]Prim, k)
	for j := 0; j < k; j++ {
		r := a - float64(j)*p/2
		c := o
		start := r3.Add(o, r3.Scale(r, u))
		if j%2 == 1 {
			c = r3.Sub(o, r3.Scale(p/2, u))
			start = r3.Sub(c, r3.Scale(r, u))
		}
		arc, err := NewArc(c, nn, start, math.Pi)
		if err != nil {
			return nil, err
		}
		prims[j] = arc
	}
	return prims, nil
}

// reflectPrim mirrors a segment or arc in the plane through o with unit
// normal m.
func reflectPrim(q Prim, o, m Vec) Prim {
	pt := func(x Vec) Vec { return r3.Sub(x, r3.Scale(2*r3.Dot(r3.Sub(x, o), m), m)) }
	dir := func(x Vec) Vec { return r3.Sub(x, r3.Scale(2*r3.Dot(x, m), m)) }
	switch q.Kind {
	case Segment:
		q.A, q.B = pt(q.A), pt(q.B)
	default:
		q.C = pt(q.C)
		q.U, q.V = dir(q.U), dir(q.V)
		q.N = r3.Cross(q.U, q.V)
	}
	return q
}
