package draw

import (
	"bytes"
	"math"
	"reflect"
	"strings"
	"testing"
)

// wireField is the in-plane direction field of a long straight wire
// through the origin along the plane's normal, B ∝ (−v, u)/r² (Ampère's
// law: B = μ0 I/(2π r) around the wire), given exactly, not on a grid.
type wireField struct{ half float64 }

func (w wireField) at(x, y float64) (float64, float64, bool) {
	if math.Abs(x) > w.half || math.Abs(y) > w.half {
		return 0, 0, false
	}
	r2 := x*x + y*y
	return -y / r2, x / r2, true
}
func (w wireField) small(x, y, m float64) bool { return m == 0 || math.IsInf(m, 0) }
func (w wireField) bounds() (float64, float64, float64, float64) {
	return -w.half, -w.half, w.half, w.half
}

// gridOf samples f(x, y) on an n × n grid over [-half, half]².
func gridOf(n int, half float64, f func(x, y float64) (float64, float64)) (u, v, fu, fv []float64) {
	for i := 0; i < n; i++ {
		u = append(u, -half+2*half*float64(i)/float64(n-1))
	}
	v = append(v, u...)
	for _, y := range v {
		for _, x := range u {
			a, b := f(x, y)
			fu, fv = append(fu, a), append(fv, b)
		}
	}
	return u, v, fu, fv
}

// wireOnGrid is the wire's field sampled on the grid, offset by a third
// of a cell so that no grid point sits on the wire.
func wireOnGrid(n int, half float64) (u, v, fu, fv []float64) {
	off := 2 * half / float64(n-1) / 3
	return gridOf(n, half, func(x, y float64) (float64, float64) {
		x, y = x-off, y-off
		r2 := x*x + y*y
		return -y / r2, x / r2
	})
}

// TestLineUniform: in a uniform field a field line is straight and runs
// from edge to edge. The bilinear interpolation of a constant is the
// constant and every Runge–Kutta stage has the same direction, so the
// points lie on the line through the seed to rounding: 1e-12 of the
// rectangle's side allows 1e4 steps of a few ulps each.
func TestLineUniform(t *testing.T) {
	const half = 0.05
	u, v, fu, fv := gridOf(11, half, func(x, y float64) (float64, float64) { return 3e-3, 1.5e-3 })
	g, err := newGridField(u, v, fu, fv)
	if err != nil {
		t.Fatal(err)
	}
	tr := newTracer(g, 0.01, 0.002)
	sx, sy := 0.01, -0.003
	if !tr.trace(sx, sy) {
		t.Fatal("no line traced")
	}
	ln := tr.lines[0]
	ex, ey := 2/math.Sqrt(5), 1/math.Sqrt(5)
	for _, p := range ln {
		if d := math.Abs((p[0]-sx)*ey - (p[1]-sy)*ex); d > 1e-12*half {
			t.Fatalf("point %v is %g off the straight line", p, d)
		}
	}
	// it starts on the left edge (x = -half, heading against the field)
	// and ends on the right edge (the line rises 1 in 2 from the seed)
	first, last := ln[0], ln[len(ln)-1]
	if math.Abs(first[0]+half) > 1e-12*half || math.Abs(last[0]-half) > 1e-12*half {
		t.Errorf("ends %v … %v; want x = ∓%g", first, last, half)
	}
	// and it runs along the field: x increases point by point
	for i := 1; i < len(ln); i++ {
		if !(ln[i][0] > ln[i-1][0]) {
			t.Fatalf("point %d does not follow the field: %v after %v", i, ln[i], ln[i-1])
		}
	}
}

// TestLineCircleExact: traced in the exact field of a straight wire, a
// field line is a circle. The radius's drift bounds the integrator's
// error: the classical Runge–Kutta method has a local error of order
// h⁵κ⁴ for a path of curvature κ = 1/R (Hairer, Nørsett and Wanner,
// "Solving Ordinary Differential Equations I", 2nd ed., 1993, sec.
// II.3), so after one turn of 2πR/h steps the radius is off by at most
// about 2π R (h/R)⁴ (error constant taken as 1); with h = R/20 that is
// 3.9e-5 R. The line closes on itself after one turn.
func TestLineCircleExact(t *testing.T) {
	const R = 0.02
	h := R / 20
	tr := newTracer(wireField{half: 0.05}, 0.005, h)
	if !tr.trace(R, 0) {
		t.Fatal("no line traced")
	}
	ln := tr.lines[0]
	tol := 2 * math.Pi * R * math.Pow(h/R, 4)
	worst := 0.0
	defer func() { t.Logf("radius off by at most %.3g m (tolerance %.3g m)", worst, tol) }()
	turned := 0.0
	for i, p := range ln {
		d := math.Abs(math.Hypot(p[0], p[1]) - R)
		worst = math.Max(worst, d)
		if d > tol {
			t.Fatalf("point %d at radius %g; off by %g > %g", i, math.Hypot(p[0], p[1]), d, tol)
		}
		if i > 0 {
			a := math.Atan2(p[1], p[0]) - math.Atan2(ln[i-1][1], ln[i-1][0])
			turned += math.Remainder(a, 2*math.Pi)
		}
	}
	// counterclockwise, as B = μ0 I/(2π r) φ̂ for a current along +normal
	// (right-hand rule), and closed: the line ends on its seed, so the
	// angle is 2π to rounding (1e-9 rad allows a thousand steps' worth)
	if math.Abs(turned-2*math.Pi) > 1e-9 {
		t.Errorf("the line turns by %g rad; want one counterclockwise turn, 2π", turned)
	}
}

// TestLineCircleGrid: the wire's field sampled on a grid, traced through
// the bilinear interpolation. Each component of (−v, u)/r² is harmonic
// with second derivatives of at most 2/r³, so bilinear interpolation on
// cells of side c errs by at most c²/(2 r³) per component (the bound of
// linear interpolation, c²/8 times the largest second derivative, in
// each direction), which turns the direction by at most ε = c²/(√2 r²)
// at distance r from the wire; over a turn of 2πR the radius drifts by at
// most 2πR ε, with r no nearer than R − c√2 − that drift. The
// integrator's own error (TestLineCircleExact) is far smaller. The bound
// is loose: the errors largely cancel over a turn.
func TestLineCircleGrid(t *testing.T) {
	const half, n = 0.05, 41
	u, v, fu, fv := wireOnGrid(n, half)
	c := 2 * half / (n - 1)
	off := c / 3
	g, err := newGridField(u, v, fu, fv)
	if err != nil {
		t.Fatal(err)
	}
	for _, R := range []float64{0.015, 0.03} {
		tr := newTracer(g, 0.005, c/stepsPerCell)
		if !tr.trace(off+R, off) {
			t.Fatal("no line traced")
		}
		rmin := R - c*math.Sqrt2
		eps := c * c / (math.Sqrt2 * rmin * rmin)
		tol := 2 * math.Pi * R * eps
		rmin -= tol
		eps = c * c / (math.Sqrt2 * rmin * rmin)
		tol = 2 * math.Pi * R * eps
		worst := 0.0
		for _, p := range tr.lines[0] {
			worst = math.Max(worst, math.Abs(math.Hypot(p[0]-off, p[1]-off)-R))
		}
		if worst > tol {
			t.Errorf("R = %g: radius off by up to %g > %g", R, worst, tol)
		}
		t.Logf("R = %g m: radius off by at most %.3g m (tolerance %.3g m)", R, worst, tol)
	}
}

// TestFieldLinesWire: all lines of the wire's map stay in the rectangle;
// each one either closes around the wire or runs from edge to edge (a
// circle cut by the rectangle); points of different lines keep the
// spacing test's distance d/2 (Jobard and Lefer 1997), less one step for
// the point a line ends with at the edge; the result does not change
// from run to run.
func TestFieldLinesWire(t *testing.T) {
	const half, n = 0.05, 41
	u, v, fu, fv := wireOnGrid(n, half)
	lines, err := FieldLines(u, v, fu, fv)
	if err != nil {
		t.Fatal(err)
	}
	if len(lines) < 10 {
		t.Fatalf("only %d lines", len(lines))
	}
	d := 2 * half / LineDensity
	h := math.Min(2*half/(n-1), d) / stepsPerCell
	onEdge := func(p [2]float64) bool {
		return math.Abs(math.Abs(p[0])-half) < 1e-12 || math.Abs(math.Abs(p[1])-half) < 1e-12
	}
	closed := 0
	for k, ln := range lines {
		for _, p := range ln {
			if math.Abs(p[0]) > half || math.Abs(p[1]) > half {
				t.Fatalf("line %d leaves the rectangle at %v", k, p)
			}
		}
		first, last := ln[0], ln[len(ln)-1]
		switch {
		case onEdge(first) && onEdge(last):
		case math.Hypot(first[0]-last[0], first[1]-last[1]) <= d/2:
			closed++
		default:
			// a line that ended near another line may end anywhere; it
			// must then be near one
			if !nearOther(lines, k, last, d/2+h) && !nearOther(lines, k, first, d/2+h) {
				t.Errorf("line %d ends at %v and %v, neither at the edge, closed nor near another line", k, first, last)
			}
		}
	}
	if closed < 3 {
		t.Errorf("%d closed lines around the wire; want several", closed)
	}
	for a := range lines {
		for b := a + 1; b < len(lines); b++ {
			for _, p := range lines[a] {
				for _, q := range lines[b] {
					if dd := math.Hypot(p[0]-q[0], p[1]-q[1]); dd < d/2-h {
						t.Fatalf("lines %d and %d come %g apart; the spacing test keeps %g", a, b, dd, d/2-h)
					}
				}
			}
		}
	}
	again, err := FieldLines(u, v, fu, fv)
	if err != nil || !reflect.DeepEqual(again, lines) {
		t.Error("a second tracing differs from the first")
	}
}

func nearOther(lines [][][2]float64, k int, p [2]float64, r float64) bool {
	for j, ln := range lines {
		if j == k {
			continue
		}
		for _, q := range ln {
			if math.Hypot(p[0]-q[0], p[1]-q[1]) <= r {
				return true
			}
		}
	}
	return false
}

// TestFieldLinesRefuse: too small a grid, components that do not match
// it, and positions out of order are refused with a message.
func TestFieldLinesRefuse(t *testing.T) {
	u, v, fu, fv := wireOnGrid(5, 0.05)
	if _, err := FieldLines(u[:1], v, fu[:5], fv[:5]); err == nil {
		t.Error("a grid one point wide accepted")
	}
	if _, err := FieldLines(u, v, fu[:3], fv); err == nil {
		t.Error("short components accepted")
	}
	u[1], u[2] = u[2], u[1]
	if _, err := FieldLines(u, v, fu, fv); err == nil || !strings.Contains(err.Error(), "increasing") {
		t.Errorf("positions out of order: %v", err)
	}
	// a zero field has no lines, and no error
	zero := make([]float64, 25)
	u, v, _, _ = wireOnGrid(5, 0.05)
	lines, err := FieldLines(u, v, zero, zero)
	if err != nil || len(lines) != 0 {
		t.Errorf("zero field: %d lines, %v", len(lines), err)
	}
}

// TestMapLinesSVG: a map with field lines draws them in their own
// colour, one stroke and one arrowhead a line, and the same data give
// the same document.
func TestMapLinesSVG(t *testing.T) {
	m := wireMap(21)
	m.Arrows = false
	plain, err := m.SVG()
	if err != nil {
		t.Fatal(err)
	}
	m.Lines = true
	doc, err := m.SVG()
	if err != nil {
		t.Fatal(err)
	}
	const stroke = "stroke:#6FE08C"
	if strings.Contains(string(plain), stroke) || !strings.Contains(string(doc), stroke) {
		t.Fatalf("the field lines' colour: %v without lines, %v with", strings.Contains(string(plain), stroke), strings.Contains(string(doc), stroke))
	}
	lines, err := FieldLines(m.U.Values, m.V.Values, m.FieldU, m.FieldV)
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Count(string(doc), stroke); got != len(lines) {
		t.Errorf("%d strokes in the line colour, %d lines", got, len(lines))
	}
	again, _ := m.SVG()
	if !bytes.Equal(doc, again) {
		t.Error("the same map drew two different documents")
	}
	// lines need the in-plane components
	m.FieldU, m.FieldV = nil, nil
	if _, err := m.SVG(); err == nil {
		t.Error("lines without in-plane components accepted")
	}
}
