package draw

import (
	"errors"
	"math"
	"sort"
)

// Field lines of a field's in-plane part, traced on the map's grid.
//
// gonum.org/v1/plot has no streamline plotter, so this file is ours. The
// lines are a function of the grid's data alone (positions and in-plane
// components), so the picture follows what a script records:
//
//   - the field between grid points is the bilinear interpolation of the
//     in-plane components of the cell's four corners;
//   - a line follows the unit direction F/|F| by the classical fourth-order
//     Runge–Kutta method with a step of a fifth of the smaller cell side
//     (and at most a fifth of the line spacing), forward along F and
//     backward from its seed;
//   - it stops at the rectangle's edge (the last step is cut there), where
//     |F| falls below zeroFrac of the largest |F| at the cell's corners (a
//     null of the in-plane field) or below zeroMap of the largest on the
//     whole map, where the four Runge–Kutta stages disagree by more than a
//     right angle (a jump across a null or a source), after maxSteps, or
//     when it comes closer than half the line spacing to another line, or
//     to a part of itself more than selfGap line spacings back along it
//     (then the line is closed onto that point: a loop around a wire
//     closes);
//   - lines are spaced after B. Jobard and W. Lefer, "Creating
//     evenly-spaced streamlines of arbitrary density", Visualization in
//     Scientific Computing '97 (1997): the traced points are kept in a grid
//     of cells of the line spacing d; a new seed is taken at distance d on
//     either side of the points of the lines already drawn, oldest line
//     first, and only where no point lies nearer than d; a line continues
//     while no point of another line lies nearer than d/2. The first seed
//     is the rectangle's centre; where the seeds beside lines do not reach
//     (a part of the map cut off by nulls), a lattice of spacing d in
//     reading order supplies more. Lines shorter than d are dropped.
//
// Everything is done in a fixed order without randomness or goroutines,
// so the same data give the same lines.

const (
	// zeroFrac: an interpolated |F| below this fraction of the largest
	// corner value of its cell means components cancel there (a null).
	zeroFrac = 1e-3
	// zeroMap: below this fraction of the map's largest in-plane |F| the
	// in-plane part is taken as zero (rounding of a field normal to the
	// plane).
	zeroMap = 1e-12
	// selfGap: how far back along a line (in line spacings) its own
	// points count as "another line" for the spacing test; nearer points
	// are the line's own neighbourhood.
	selfGap = 3
	// stepsPerCell: steps per smaller cell side.
	stepsPerCell = 5
	// maxLinePoints bounds the points of all lines of one map together.
	maxLinePoints = 400000
)

// LineDensity is the number of line spacings across the longer side of
// the rectangle (common practice: lines a few millimetres apart on a
// printed map).
const LineDensity = 24

// planeField gives the in-plane field at (x, y); ok is false outside
// the rectangle.
type planeField interface {
	at(x, y float64) (fx, fy float64, ok bool)
	// small reports whether the field at (x, y), of magnitude m, is taken
	// as zero.
	small(x, y, m float64) bool
	bounds() (x0, y0, x1, y1 float64)
}

// gridField is a field given at the nodes of a grid, bilinear between
// them. u, v are increasing; fu, fv hold n1·n2 values, u running fastest.
type gridField struct {
	u, v   []float64
	fu, fv []float64
	mag    []float64
	big    float64
}

func newGridField(u, v, fu, fv []float64) (*gridField, error) {
	n1, n2 := len(u), len(v)
	if n1 < 2 || n2 < 2 || len(fu) != n1*n2 || len(fv) != n1*n2 {
		return nil, errors.New("field lines need at least 2 × 2 points and in-plane components at every point")
	}
	for _, s := range [][]float64{u, v} {
		for i := 1; i < len(s); i++ {
			if !(s[i] > s[i-1]) {
				return nil, errors.New("field lines need grid positions in increasing order")
			}
		}
	}
	g := &gridField{u: u, v: v, fu: fu, fv: fv, mag: make([]float64, n1*n2)}
	for i := range fu {
		g.mag[i] = math.Hypot(fu[i], fv[i])
		g.big = math.Max(g.big, g.mag[i])
	}
	return g, nil
}

func (g *gridField) bounds() (x0, y0, x1, y1 float64) {
	return g.u[0], g.v[0], g.u[len(g.u)-1], g.v[len(g.v)-1]
}

// cell finds the cell holding (x, y) and the position in it (s, t in
// [0, 1]).
func (g *gridField) cell(x, y float64) (i, j int, s, t float64, ok bool) {
	n1, n2 := len(g.u), len(g.v)
	if !(x >= g.u[0] && x <= g.u[n1-1] && y >= g.v[0] && y <= g.v[n2-1]) {
		return 0, 0, 0, 0, false
	}
	i = min(max(sort.SearchFloat64s(g.u, x)-1, 0), n1-2)
	j = min(max(sort.SearchFloat64s(g.v, y)-1, 0), n2-2)
	s = (x - g.u[i]) / (g.u[i+1] - g.u[i])
	t = (y - g.v[j]) / (g.v[j+1] - g.v[j])
	return i, j, s, t, true
}

func (g *gridField) at(x, y float64) (fx, fy float64, ok bool) {
	i, j, s, t, ok := g.cell(x, y)
	if !ok {
		return 0, 0, false
	}
	n1 := len(g.u)
	k := j*n1 + i
	w00, w10, w01, w11 := (1-s)*(1-t), s*(1-t), (1-s)*t, s*t
	fx = w00*g.fu[k] + w10*g.fu[k+1] + w01*g.fu[k+n1] + w11*g.fu[k+n1+1]
	fy = w00*g.fv[k] + w10*g.fv[k+1] + w01*g.fv[k+n1] + w11*g.fv[k+n1+1]
	return fx, fy, true
}

func (g *gridField) small(x, y, m float64) bool {
	if m <= zeroMap*g.big || g.big == 0 {
		return true
	}
	i, j, _, _, ok := g.cell(x, y)
	if !ok {
		return true
	}
	n1 := len(g.u)
	k := j*n1 + i
	corner := math.Max(math.Max(g.mag[k], g.mag[k+1]), math.Max(g.mag[k+n1], g.mag[k+n1+1]))
	return m < zeroFrac*corner
}

// minCell is the smaller side of the smallest cell.
func (g *gridField) minCell() float64 {
	h := math.Inf(1)
	for _, s := range [][]float64{g.u, g.v} {
		for i := 1; i < len(s); i++ {
			h = math.Min(h, s[i]-s[i-1])
		}
	}
	return h
}

// FieldLines traces evenly spaced field lines of the in-plane field
// (fu, fv) given on the grid u × v (u running fastest), LineDensity
// spacings across the longer side. Each line is a polyline in (u, v)
// running along the field.
func FieldLines(u, v, fu, fv []float64) ([][][2]float64, error) {
	g, err := newGridField(u, v, fu, fv)
	if err != nil {
		return nil, err
	}
	x0, y0, x1, y1 := g.bounds()
	d := math.Max(x1-x0, y1-y0) / LineDensity
	h := math.Min(g.minCell(), d) / stepsPerCell
	return traceLines(g, d, h), nil
}

// tracer holds the state of one set of lines.
type tracer struct {
	f              planeField
	d, dtest, h    float64
	x0, y0, x1, y1 float64
	nx, ny         int
	cells          [][]mark
	lines          [][][2]float64
	points         int
	maxSteps       int
	touched        []int // the spacing cells the current line has marked
}

// mark is a traced point in the spacing grid: its line and its arc
// length along the line from the seed (negative backward).
type mark struct {
	x, y float64
	line int
	s    float64
}

func newTracer(f planeField, d, h float64) *tracer {
	t := &tracer{f: f, d: d, dtest: d / 2, h: h}
	t.x0, t.y0, t.x1, t.y1 = f.bounds()
	t.nx = int(math.Ceil((t.x1-t.x0)/d)) + 1
	t.ny = int(math.Ceil((t.y1-t.y0)/d)) + 1
	t.cells = make([][]mark, t.nx*t.ny)
	// a line may run around the rectangle a few times before it meets
	// itself: four perimeters in steps
	t.maxSteps = int(8*((t.x1-t.x0)+(t.y1-t.y0))/h) + 100
	return t
}

func (t *tracer) cellOf(x, y float64) (int, int) {
	cx := min(max(int((x-t.x0)/t.d), 0), t.nx-1)
	cy := min(max(int((y-t.y0)/t.d), 0), t.ny-1)
	return cx, cy
}

func (t *tracer) add(m mark) {
	cx, cy := t.cellOf(m.x, m.y)
	k := cy*t.nx + cx
	t.cells[k] = append(t.cells[k], m)
	t.touched = append(t.touched, k)
}

// near returns a point closer than r to (x, y) that belongs to another
// line, or to line more than selfGap spacings from arc length s.
func (t *tracer) near(x, y, r float64, line int, s float64) (mark, bool) {
	cx, cy := t.cellOf(x, y)
	best, found := mark{}, false
	bestD := r
	for j := max(cy-1, 0); j <= min(cy+1, t.ny-1); j++ {
		for i := max(cx-1, 0); i <= min(cx+1, t.nx-1); i++ {
			for _, m := range t.cells[j*t.nx+i] {
				if m.line == line && math.Abs(m.s-s) <= selfGap*t.d {
					continue
				}
				if dd := math.Hypot(m.x-x, m.y-y); dd < bestD {
					best, bestD, found = m, dd, true
				}
			}
		}
	}
	return best, found
}

// dir is the unit direction of the field at (x, y) times sign, or false
// outside or where the field is taken as zero.
func (t *tracer) dir(x, y, sign float64) (float64, float64, bool) {
	fx, fy, ok := t.f.at(x, y)
	if !ok {
		return 0, 0, false
	}
	m := math.Hypot(fx, fy)
	if t.f.small(x, y, m) {
		return 0, 0, false
	}
	return sign * fx / m, sign * fy / m, true
}

func (t *tracer) inside(x, y float64) bool {
	return x >= t.x0 && x <= t.x1 && y >= t.y0 && y <= t.y1
}

// toEdge is where the ray from (x, y) along (ex, ey) leaves the
// rectangle.
func (t *tracer) toEdge(x, y, ex, ey float64) (float64, float64) {
	k := math.Inf(1)
	if ex > 0 {
		k = math.Min(k, (t.x1-x)/ex)
	} else if ex < 0 {
		k = math.Min(k, (t.x0-x)/ex)
	}
	if ey > 0 {
		k = math.Min(k, (t.y1-y)/ey)
	} else if ey < 0 {
		k = math.Min(k, (t.y0-y)/ey)
	}
	k = math.Max(k, 0)
	ex2, ey2 := x+k*ex, y+k*ey
	// rounding may leave the point a hair outside
	return math.Min(math.Max(ex2, t.x0), t.x1), math.Min(math.Max(ey2, t.y0), t.y1)
}

// half traces from the seed in one direction (sign +1 along the field,
// −1 against it): the points after the seed, and whether the line closed
// onto itself.
func (t *tracer) half(x, y, sign float64, line int) (out [][2]float64, closed bool) {
	h := t.h
	s := 0.0
	for step := 0; step < t.maxSteps && t.points < maxLinePoints; step++ {
		k1x, k1y, ok1 := t.dir(x, y, sign)
		if !ok1 {
			break
		}
		k2x, k2y, ok2 := t.dir(x+h/2*k1x, y+h/2*k1y, sign)
		k3x, k3y, ok3 := t.dir(x+h/2*k2x, y+h/2*k2y, sign)
		k4x, k4y, ok4 := t.dir(x+h*k3x, y+h*k3y, sign)
		if !(ok2 && ok3 && ok4) {
			// a stage left the rectangle, or met a null: end at the edge
			// if the line is heading out, else here
			if _, _, in := t.f.at(x+h*k1x, y+h*k1y); !in {
				ex, ey := t.toEdge(x, y, k1x, k1y)
				out = append(out, [2]float64{ex, ey})
				t.points++
			}
			break
		}
		if k1x*k4x+k1y*k4y < 0 {
			break // the direction turned over within one step
		}
		nx := x + h/6*(k1x+2*k2x+2*k3x+k4x)
		ny := y + h/6*(k1y+2*k2y+2*k3y+k4y)
		if !t.inside(nx, ny) {
			ex, ey := t.toEdge(x, y, nx-x, ny-y)
			out = append(out, [2]float64{ex, ey})
			t.points++
			break
		}
		s += h
		if m, hit := t.near(nx, ny, t.dtest, line, sign*s); hit {
			if m.line == line { // closes onto itself
				out = append(out, [2]float64{m.x, m.y})
				t.points++
				closed = true
			}
			break
		}
		x, y = nx, ny
		out = append(out, [2]float64{x, y})
		t.points++
		t.add(mark{x: x, y: y, line: line, s: sign * s})
	}
	return out, closed
}

// trace draws one line from a seed; false if it is too short to keep.
func (t *tracer) trace(x, y float64) bool {
	line := len(t.lines)
	t.touched = t.touched[:0]
	t.add(mark{x: x, y: y, line: line})
	fwd, closed := t.half(x, y, 1, line)
	var back [][2]float64
	if !closed { // a closed line needs no second half
		back, _ = t.half(x, y, -1, line)
	}
	pts := make([][2]float64, 0, len(fwd)+len(back)+1)
	for i := len(back) - 1; i >= 0; i-- {
		pts = append(pts, back[i])
	}
	pts = append(pts, [2]float64{x, y})
	pts = append(pts, fwd...)
	length := 0.0
	for i := 1; i < len(pts); i++ {
		length += math.Hypot(pts[i][0]-pts[i-1][0], pts[i][1]-pts[i-1][1])
	}
	if length < t.d {
		t.forget(line)
		return false
	}
	t.lines = append(t.lines, pts)
	return true
}

// forget removes a dropped line's points from the spacing grid.
func (t *tracer) forget(line int) {
	for _, k := range t.touched {
		c := t.cells[k]
		kept := c[:0]
		for _, m := range c {
			if m.line != line {
				kept = append(kept, m)
			}
		}
		t.cells[k] = kept
	}
}

// seedOK reports whether a line may start at (x, y).
func (t *tracer) seedOK(x, y float64) bool {
	if !t.inside(x, y) {
		return false
	}
	if _, _, ok := t.dir(x, y, 1); !ok {
		return false
	}
	_, hit := t.near(x, y, t.d, -1, 0)
	return !hit
}

func traceLines(f planeField, d, h float64) [][][2]float64 {
	t := newTracer(f, d, h)
	next := 0 // the oldest line whose neighbours are not yet seeded
	spread := func() {
		for ; next < len(t.lines) && t.points < maxLinePoints; next++ {
			ln := t.lines[next]
			for i, p := range ln {
				// a seed beside every point spaced about d/2 apart along
				// the line is enough to find every gap
				if i%max(1, int(t.dtest/t.h)) != 0 {
					continue
				}
				a, b := ln[max(i-1, 0)], ln[min(i+1, len(ln)-1)]
				tx, ty := b[0]-a[0], b[1]-a[1]
				n := math.Hypot(tx, ty)
				if n == 0 {
					continue
				}
				for _, side := range []float64{1, -1} {
					sx, sy := p[0]-side*t.d*ty/n, p[1]+side*t.d*tx/n
					if t.seedOK(sx, sy) {
						t.trace(sx, sy)
					}
				}
			}
		}
	}
	cx, cy := (t.x0+t.x1)/2, (t.y0+t.y1)/2
	if t.seedOK(cx, cy) {
		t.trace(cx, cy)
	}
	spread()
	for j := 0; j < t.ny; j++ {
		for i := 0; i < t.nx; i++ {
			x, y := t.x0+(float64(i)+0.5)*t.d, t.y0+(float64(j)+0.5)*t.d
			if t.points < maxLinePoints && t.seedOK(x, y) && t.trace(x, y) {
				spread()
			}
		}
	}
	return t.lines
}
