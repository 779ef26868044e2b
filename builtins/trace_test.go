package builtins_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
	"unicode/utf8"

	"loopwise/builtins"
	"loopwise/builtins/em"
	"loopwise/lang"
	"loopwise/runtime"
)

// tracedPath evaluates the statements and returns the path the last one
// gives.
func tracedPath(t *testing.T, s *runtime.Session, lines ...string) *builtins.Path {
	t.Helper()
	var v runtime.Value
	for _, l := range lines {
		v = eval(t, s, l)
	}
	p, ok := v.(*builtins.Path)
	if !ok {
		t.Fatalf("%s gave %s, not a path", lines[len(lines)-1], runtime.TypeName(v))
	}
	return p
}

// TestParametricCircleLength: a circle traced in n equal steps of its
// angle is the inscribed regular n-gon, whose perimeter is 2nR·sin(π/n)
// (elementary geometry: each side subtends 2π/n at the centre).
// Tolerance 1e-12 relative: n ≤ 1000 sides, each a square root of
// coordinates rounded once in cos and sin (a few 1e-16 each), summed.
func TestParametricCircleLength(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "ring(u) = [25 mm * cos(u), 25 mm * sin(u), 0 mm]")
	const R = 0.025
	for _, n := range []int{3, 4, 7, 64, 1000} {
		for _, closure := range []string{"", `, "closed"`} {
			p := tracedPath(t, s, fmt.Sprintf("parametric_path(ring, 0 rad, 1 rev, %d%s)", n, closure))
			if len(p.P.Prims) != n {
				t.Errorf("n = %d: %d pieces", n, len(p.P.Prims))
			}
			if !p.P.Closed() {
				t.Errorf("n = %d%s: the path is not closed", n, closure)
			}
			want := 2 * float64(n) * R * math.Sin(math.Pi/float64(n))
			if got := p.P.Length(); math.Abs(got-want) > 1e-12*want {
				t.Errorf("n = %d%s: length %.16g, want 2nR·sin(π/n) = %.16g", n, closure, got, want)
			}
		}
	}
	// "closed" puts the last point exactly on the first
	p := tracedPath(t, s, `parametric_path(ring, 0 rad, 1 rev, 5, "closed")`)
	if last := p.P.Prims[4].B; last != p.P.Prims[0].A {
		t.Errorf("closed: last point %v, first %v", last, p.P.Prims[0].A)
	}
	// the parameter may be a plain number, read by cos and sin as radians,
	// and may run backwards: the same polygon traversed the other way
	q := tracedPath(t, s, "parametric_path(ring, 2*pi, 0, 7)")
	if want := 14 * R * math.Sin(math.Pi/7); math.Abs(q.P.Length()-want) > 1e-12*want || q.P.Prims[0].B.Y >= 0 {
		t.Errorf("backwards: length %g (want %g), second point %v", q.P.Length(), want, q.P.Prims[0].B)
	}
}

// helixDistance is the distance from point x to the segment a–b, written
// apart from the builtin's: the component of x − a across the line by a
// cross product, or the distance to the nearer end when x projects beyond
// the segment.
func helixDistance(x, a, b em.Vec) float64 {
	d := [3]float64{b.X - a.X, b.Y - a.Y, b.Z - a.Z}
	w := [3]float64{x.X - a.X, x.Y - a.Y, x.Z - a.Z}
	ld := math.Sqrt(d[0]*d[0] + d[1]*d[1] + d[2]*d[2])
	along := (w[0]*d[0] + w[1]*d[1] + w[2]*d[2]) / ld
	switch {
	case along < 0:
		return math.Sqrt(w[0]*w[0] + w[1]*w[1] + w[2]*w[2])
	case along > ld:
		e := [3]float64{x.X - b.X, x.Y - b.Y, x.Z - b.Z}
		return math.Sqrt(e[0]*e[0] + e[1]*e[1] + e[2]*e[2])
	}
	c := [3]float64{w[1]*d[2] - w[2]*d[1], w[2]*d[0] - w[0]*d[2], w[0]*d[1] - w[1]*d[0]}
	return math.Sqrt(c[0]*c[0]+c[1]*c[1]+c[2]*c[2]) / ld
}

// TestParametricHelixTolerance traces a helix of radius R and pitch p
// (N turns) to chord tolerances δ and checks, independently of the
// builtin: the exact helix (x, y, z) = (R cos u, R sin u, p·u/2π) at the
// middle of each piece's parameter range, and at eight more points along
// it, lies within δ of the piece; the polyline's length is the sum of the
// exact chords, √((2R sin(Δ/2))² + (pΔ/2π)²) for a piece spanning the
// angle Δ (1e-12 relative: rounding of the sums); and it converges to the
// helix's length 2πN·√(R² + (p/2π)²) (the arc length of a helix,
// elementary differential geometry), from below and within
// δ/(3ρ) relative, where ρ = (R² + c²)/R is the helix's radius of
// curvature and c = p/2π. That bound: a chord of a curve of curvature κ
// over arc ℓ has sagitta s = κℓ²/8 and falls short of the arc by
// κ²ℓ³/24 = ℓ·sκ/3 to leading order (Taylor expansion of the curve about
// the chord's middle), and every piece has s ≤ δ; the next order is
// (κℓ)² ≈ 8δ/ρ below 1e-3 of it here, so 1 % slack.
func TestParametricHelixTolerance(t *testing.T) {
	const (
		R = 0.010
		p = 0.004
		N = 5
	)
	c := p / (2 * math.Pi)
	rho := (R*R + c*c) / R
	exact := 2 * math.Pi * N * math.Hypot(R, c)
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "h(u) = [10 mm * cos(u), 10 mm * sin(u), 4 mm * u / (1 rev)]")
	at := func(u float64) em.Vec { return em.Vec{X: R * math.Cos(u), Y: R * math.Sin(u), Z: c * u} }
	prev := math.Inf(1)
	for _, delta := range []float64{1e-4, 1e-5, 1e-6, 1e-7} {
		path := tracedPath(t, s, fmt.Sprintf("parametric_path(h, 0 rad, %d rev, %g m)", N, delta))
		chords, worst := 0.0, 0.0
		for i, q := range path.P.Prims {
			ua, ub := q.A.Z/c, q.B.Z/c // the angle from the height
			for k := 1; k <= 9; k++ {
				x := at(ua + (ub-ua)*float64(k)/10)
				d := helixDistance(x, q.A, q.B)
				worst = math.Max(worst, d)
				if d > delta*(1+1e-9) {
					t.Errorf("δ = %g: piece %d: the helix at %d/10 of it is %g from the piece", delta, i+1, k, d)
				}
			}
			dd := ub - ua
			chords += math.Hypot(2*R*math.Sin(dd/2), c*dd)
		}
		got := path.P.Length()
		if math.Abs(got-chords) > 1e-12*chords {
			t.Errorf("δ = %g: length %.15g, the exact chords sum to %.15g", delta, got, chords)
		}
		short := (exact - got) / exact
		if !(short > 0 && short <= delta/(3*rho)*1.01) || !(short < prev) {
			t.Errorf("δ = %g: the polyline falls short of the helix's length by %.3g relative; want above 0, below δ/(3ρ) = %.3g and below the coarser tolerance's %.3g", delta, short, delta/(3*rho), prev)
		}
		prev = short
		t.Logf("δ = %g: %d pieces, largest distance %.3g, length short by %.3g (bound %.3g)", delta, len(path.P.Prims), worst, short, delta/(3*rho))
	}
}

// TestParametricWholeTurns: a helix of 32 turns starts from 8 steps of 4
// turns each, whose middles (after 2 turns) fall on the chord; the guard
// point must still find the turns.
func TestParametricWholeTurns(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	path := tracedPath(t, s, "h(u) = [10 mm * cos(u), 10 mm * sin(u), 1 mm * u / (1 rev)]", "parametric_path(h, 0 rad, 32 rev, 0.1 mm)")
	// a chord of a circle of 10 mm within 0.1 mm of its arc spans at most
	// 2·acos(0.99) = 0.2838 rad (sagitta R(1 − cos(Δ/2))), so 32 turns
	// need at least 32·2π/0.2838 = 709 pieces
	if n := len(path.P.Prims); n < 709 {
		t.Errorf("%d pieces; the turns were missed", n)
	}
}

// TestCentreFieldTracedCircle: the field at the centre of a circle of
// current I and radius R is μ0I/2R (Jackson, Classical Electrodynamics,
// 3rd ed., 1999, §5.5, eq. 5.40 at the centre). A circle traced in n
// pieces is the regular n-gon inscribed in it; each side, at distance
// R·cos(π/n) from the centre and seen under ±π/n, gives
// μ0I·2sin(π/n)/(4πR·cos(π/n)) (Biot–Savart for a finite straight wire,
// Griffiths, Introduction to Electrodynamics, 4th ed., 2013, Ex. 5.9), so
// the polygon's centre field is exactly μ0 I n tan(π/n)/(2πR): 1 + x²/3 +
// 2x⁴/15 + … times the circle's, x = π/n (the series of tan x/x). For
// n = 2000 the polygon exceeds the circle by π²/(3n²) = 8.2e-7, and the
// next term adds 8e-13. Checks: against the n-gon's closed form within
// 1e-12 (2000 segment terms each rounded to a few 1e-16), and against the
// circle's μ0I/2R with x²/3 < B/B_circle − 1 ≤ x²/3 + x⁴/5 (the series'
// terms after x²/3 are positive and sum to less than x⁴/5 for x < 0.5).
func TestCentreFieldTracedCircle(t *testing.T) {
	const (
		R  = 0.025
		I  = 1.0
		n  = 2000
		mu = 1.25663706212e-6 // μ0, CODATA 2018 (NIST)
	)
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "ring(u) = [25 mm * cos(u), 25 mm * sin(u), 0 mm]")
	eval(t, s, fmt.Sprintf("loop = parametric_path(ring, 0 rad, 1 rev, %d, \"closed\")", n))
	v, ok := eval(t, s, "b_at(source(loop, 1 A), [0, 0, 0] m)").(runtime.Vector)
	if !ok {
		t.Fatal("b_at did not give a vector")
	}
	b := v.V[2]
	x := math.Pi / n
	polygon := mu * I * n * math.Tan(x) / (2 * math.Pi * R)
	if math.Abs(b-polygon) > 1e-12*polygon {
		t.Errorf("Bz = %.16g T, the n-gon's closed form %.16g T", b, polygon)
	}
	circle := mu * I / (2 * R)
	excess := b/circle - 1
	if !(excess > x*x/3 && excess <= x*x/3+x*x*x*x/5) {
		t.Errorf("Bz/(μ0I/2R) − 1 = %.10g, want in (x²/3, x²/3 + x⁴/5] = (%.10g, %.10g]", excess, x*x/3, x*x/3+x*x*x*x/5)
	}
	if math.Abs(v.V[0]) > 1e-12*b || math.Abs(v.V[1]) > 1e-12*b {
		t.Errorf("in-plane components %g, %g at the centre", v.V[0], v.V[1])
	}
}

// TestParametricErrors: bad input gives a clear message naming the
// builtin, never a panic.
func TestParametricErrors(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for _, l := range []string{
		"ring(u) = [25 mm * cos(u), 25 mm * sin(u), 0 mm]",
		"field(u) = [1, 2, 3] T",
		"still(u) = [0, 0, 0] m",
		"single(u) = 2 m",
		"blow(x) = [1 m / x, 0 m, 0 m]",
		"two(a, b) = a",
	} {
		eval(t, s, l)
	}
	cases := []struct{ in, want string }{
		{"parametric_path(ring, 0 rad, 0 rad, 5)", "parametric_path: u0 and u1 are both 0 rad; the parameter must run over a range"},
		{"parametric_path(ring, 0 rad, 1 m, 5)", "parametric_path: u1 must have the unit of u0 (plane angle (rad)), not length (m)"},
		{"parametric_path(ring, 0 rad, 1 rev, 5 T)", "parametric_path: the fourth argument is a number of pieces (a whole number) or a chord tolerance (a length), not magnetic flux density (T)"},
		{"parametric_path(ring, 0 rad, 1 rev, 2.5)", "parametric_path: the fourth argument must be a whole number from 1 to 200000, not 2.5"},
		{"parametric_path(ring, 0 rad, 1 rev, 0 mm)", "parametric_path: the fourth argument must be a positive length, not 0 m"},
		{"parametric_path(ring, 0 rad, 1 rev, 300000)", "parametric_path: the fourth argument must be a whole number from 1 to 200000, not 300000"},
		{`parametric_path(ring, 0 rad, 1 rev, 5, "open")`, `parametric_path: the fifth argument can only be "closed", not "open"`},
		{`parametric_path(ring, 0 rad, 1 rev, 2, "closed")`, "parametric_path: a closed path needs at least 3 pieces, not 2"},
		{`parametric_path(ring, 0 rad, 0.5 rev, 10 um, "closed")`, `parametric_path: the curve does not come back to its start: the point at u = 3.14159 rad is 50 mm from the one at 0 rad, more than 10 µm; trace the whole loop, or leave out "closed"`},
		// the gap is 2R·sin(0.5°) = 436.327 µm; 1e-6 of the 64 points' box
		// (nearly 50 mm square) is the limit with a piece count
		{`parametric_path(ring, 0 rad, 359 deg, 64, "closed")`, `parametric_path: the curve does not come back to its start: the point at u = 6.26573 rad is 436.327 µm from the one at 0 rad, more than 70.7083 nm; trace the whole loop, or leave out "closed"`},
		{"parametric_path(field, 0, 1, 5)", "parametric_path: field(u) must give a position (a vector of lengths, such as [x, y, z] mm), but at u = 0 it gives a vector of magnetic flux density (T)"},
		{"parametric_path(single, 0, 1, 5)", "parametric_path: single(u) must give a position (a vector of lengths, such as [x, y, z] mm), but at u = 0 it gives length (m)"},
		{"parametric_path(still, 0, 1, 5)", "parametric_path: still(u) gives the same point at u = 0 and at u = 0.2, so a piece would have no length; trace a range over which the curve moves"},
		{"parametric_path(still, 0, 1, 1 mm)", "parametric_path: still(u) gives the same point at u = 0 and at u = 0.125, so a piece would have no length; trace a range over which the curve moves"},
		{"parametric_path(ring, 1e16, 1e16 + 16, 1 mm)", "parametric_path: near u = 1e+16 the parameter cannot be cut finer in floating point, and the curve is not yet within 1 mm of a straight piece; give the parameter a range of smaller numbers (nearer zero)"},
		{"parametric_path(ring, 0 rad, 1 rev, 1 fm)", "parametric_path: following the curve within 1 fm needs more than 200000 pieces, the most a path may have; ask for a larger tolerance or trace a shorter range"},
		{"parametric_path(5 m, 0, 1, 3)", "parametric_path: the first argument must be a function of one quantity, such as V(N) = ..., not length (m)"},
		{"parametric_path(two, 0, 1, 3)", "parametric_path: the function two(a, b) must take exactly one argument"},
		{"parametric_path(ring, 0 rad, 1 rev)", "parametric_path takes 4 to 5 arguments, got 3"},
	}
	for _, c := range cases {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("%s: got %v, want a positioned error", c.in, err)
			continue
		}
		if le.Msg != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.in, le.Msg, c.want)
		}
	}
	// a point that is not finite: 1 m / 0 is refused by the language
	// itself or by the builtin, with a message either way
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "parametric_path(blow, -1, 1, 2)"); err == nil {
		t.Error("a curve through an infinite point was accepted")
	}
}

// TestParametricBudget: the calls are counted against the work budget
// before they are made.
func TestParametricBudget(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "ring(u) = [25 mm * cos(u), 25 mm * sin(u), 0 mm]")
	if err := s.SetBudget(0.001); err != nil { // 1e5 evaluations, about 660 calls
		t.Fatal(err)
	}
	_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "parametric_path(ring, 0 rad, 1 rev, 100000)")
	if !errors.Is(err, runtime.ErrBudget) || !strings.Contains(err.Error(), "parametric_path: this needs about") {
		t.Errorf("100000 pieces on a budget of 1 ms: %v", err)
	}
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "parametric_path(ring, 0 rad, 1 rev, 100)"); err != nil {
		t.Errorf("100 pieces: %v", err)
	}
}

// TestLongLineErrors: a statement of many literal points is refused with a
// message of ordinary length; the line is shown as a window around the
// caret, not whole (lang.ShowWidth characters and the marks of what is
// left out).
func TestLongLineErrors(t *testing.T) {
	points := func(n int) string {
		parts := make([]string, n)
		for i := range parts {
			parts[i] = fmt.Sprintf("[%d, 2, 3] mm", i%10)
		}
		return "p = polyline(" + strings.Join(parts, ", ") + ")"
	}
	checkShort := func(what string, err error, wantMsg string) {
		t.Helper()
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Fatalf("%s: got %v, want a positioned error", what, err)
		}
		if !strings.HasPrefix(le.Msg, wantMsg) {
			t.Errorf("%s: message %q", what, le.Msg)
		}
		lines := strings.Split(err.Error(), "\n")
		if len(lines) != 3 {
			t.Fatalf("%s: %d lines in\n%s", what, len(lines), err)
		}
		shown, caret := strings.TrimPrefix(lines[1], "    "), strings.TrimPrefix(lines[2], "    ")
		if n := utf8.RuneCountInString(shown); n > lang.ShowWidth+2 || !strings.HasPrefix(shown, lang.Ellipsis) {
			t.Errorf("%s: the line is shown in %d characters: %q", what, n, shown)
		}
		if !strings.HasSuffix(caret, "^") || utf8.RuneCountInString(caret) > utf8.RuneCountInString(shown) {
			t.Errorf("%s: caret line %q under %q", what, caret, shown)
		}
		if n := len(err.Error()); n > 600 {
			t.Errorf("%s: the message is %d bytes long", what, n)
		}
	}
	// 6500 points in 91 000 characters: within the length limit, over the
	// engine's 10 000 parts
	s := runtime.NewSession(builtins.Standard())
	line := points(6500)
	if len(line) >= lang.MaxStatementLen {
		t.Fatalf("the line is %d characters", len(line))
	}
	_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line)
	checkShort("6500 points", err, fmt.Sprintf("this expression has more than %d parts", runtime.MaxExprNodes))
	// half a megabyte on one line of a script
	line = points(36000)
	if len(line) < 500_000 {
		t.Fatalf("the line is %d characters", len(line))
	}
	sc, err := runtime.ParseScript("big.lw", []byte("# points\n\n```lw\n"+line+"\n```\n"))
	if err == nil {
		err = sc.Run(runtime.NewSession(builtins.Standard()), &strings.Builder{})
	}
	checkShort("half a megabyte", err, "this statement is longer than 100 000 characters")
}
