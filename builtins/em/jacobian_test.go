package em

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// jacSources are the paths the Jacobian tests use (1 A each): a ring, a
// tilted arc, a helix, and paths of joined segments (an open bent wire
// and a closed non-planar pentagon).
func jacSources(t *testing.T) map[string]Path {
	t.Helper()
	must := func(p Prim, err error) Prim {
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	ring := must(NewCircle(Vec{}, Vec{Z: 1}, 0.025))
	ac, aax := Vec{X: 0.004, Y: -0.003, Z: 0.002}, Vec{X: 0.3, Y: -0.5, Z: 0.8}
	arc := must(NewArc(ac, aax, r3.Add(ac, r3.Scale(0.027, r3.Unit(r3.Cross(aax, Vec{X: 1})))), 2.5))
	helix := must(NewHelix(Vec{Z: -0.015}, Vec{X: 0.1, Y: 0, Z: 1}, 0.012, 0.030, 5))
	pts := []Vec{{X: -0.03, Y: -0.02, Z: 0}, {X: 0.02, Y: -0.025, Z: 0.005}, {X: 0.03, Y: 0.015, Z: -0.004}, {X: 0, Y: 0.03, Z: 0.01}, {X: -0.025, Y: 0.01, Z: 0.003}}
	var closed, open Path
	for i := range pts {
		closed.Prims = append(closed.Prims, must(NewSegment(pts[i], pts[(i+1)%len(pts)])))
		if i < 3 {
			open.Prims = append(open.Prims, must(NewSegment(pts[i], pts[i+1])))
		}
	}
	return map[string]Path{"ring": {Prims: []Prim{ring}}, "tilted arc": {Prims: []Prim{arc}}, "helix": {Prims: []Prim{helix}},
		"open segments": open, "closed pentagon": closed}
}

// jacPoints are n random points in a 120 mm cube around the sources, at
// least 2 mm from every sampled point of the path.
func jacPoints(p Path, n int, seed uint64) []Vec {
	rng := rand.New(rand.NewPCG(seed, 7))
	var out []Vec
	for len(out) < n {
		x := Vec{X: 0.12 * (rng.Float64() - 0.5), Y: 0.12 * (rng.Float64() - 0.5), Z: 0.12 * (rng.Float64() - 0.5)}
		ok := true
		for _, q := range p.Prims {
			for k := 0; k <= 400 && ok; k++ {
				ok = r3.Norm(r3.Sub(x, q.Point(float64(k)/400))) > 0.002
			}
		}
		if ok {
			out = append(out, x)
		}
	}
	return out
}

func curlOf(j [3]Vec) Vec {
	return Vec{X: j[1].Z - j[2].Y, Y: j[2].X - j[0].Z, Z: j[0].Y - j[1].X}
}

func maxAbs(v Vec) float64 { return math.Max(math.Abs(v.X), math.Max(math.Abs(v.Y), math.Abs(v.Z))) }

// oldJacobian is the step-difference route (Jacobian of the field), for
// the before/after figures.
func oldJacobian(t *testing.T, which Which, srcs []Source, x Vec) [3]Vec {
	t.Helper()
	ev := NewEvaluator(which, srcs)
	j, err := Jacobian(ev.At, x)
	if err != nil {
		t.Fatalf("differences at %v: %v", x, err)
	}
	return j
}

// TestCurlAEqualsB: B = ∇ × A (Jackson, Classical Electrodynamics, 3rd
// ed., 1999, eq. 5.27; from memory), with A's Jacobian from FieldJacobian
// and B from the field kernel (closed forms of segments and arcs, the
// helix's Biot–Savart quadrature: a route that shares no code with the
// derivative integrals). Tolerance 1e-12 of |B|: the two partials of each
// component are asked for 1e-13 of the column's scale (μ0/4π ∫|dl|/n²,
// within a factor of about 5 of |B| at these distances) and B's closed
// forms are within 128ε ≈ 3e-14 (fieldbound.go); 1e-12 leaves a factor of
// a few. The reported bound (twice A's, plus B's own FieldErrorBound) must
// cover every component's difference.
func TestCurlAEqualsB(t *testing.T) {
	for name, p := range jacSources(t) {
		srcs := []Source{{Path: p, I: 1.7}}
		var worstNew, worstOld float64
		for _, x := range jacPoints(p, 25, 11) {
			ja, bound, err := FieldJacobian(FieldA, srcs, x, Tol{})
			if err != nil {
				t.Fatalf("%s at %v: %v", name, x, err)
			}
			b, err := FieldAt(FieldB, srcs, x)
			if err != nil {
				t.Fatal(err)
			}
			bb, _, err := FieldErrorBound(FieldB, srcs, x, nil)
			if err != nil {
				t.Fatal(err)
			}
			d := r3.Sub(curlOf(ja), b)
			if maxAbs(d) > 2*bound+bb {
				t.Errorf("%s at %v: curl A − B = %v exceeds the bound %g + %g", name, x, d, 2*bound, bb)
			}
			rel := r3.Norm(d) / r3.Norm(b)
			if rel > 1e-12 {
				t.Errorf("%s at %v: |curl A − B|/|B| = %.3g > 1e-12", name, x, rel)
			}
			worstNew = math.Max(worstNew, rel)
			old := r3.Norm(r3.Sub(curlOf(oldJacobian(t, FieldA, srcs, x)), b)) / r3.Norm(b)
			worstOld = math.Max(worstOld, old)
		}
		t.Logf("%s: |curl A − B|/|B| at most %.2g exact, %.2g by differences", name, worstNew, worstOld)
	}
}

// TestDivCurlB: ∇·B = 0 for any Biot–Savart field, and ∇ × B = 0 away
// from the currents of a closed circuit (Ampère; Jackson 1999, eqs. 5.22
// and 5.26, from memory; an open piece of wire does not conserve current,
// so curl B is tested on closed paths only). The Jacobian's entries are
// each within its bound, so |div B| ≤ 3·bound and each component of
// curl B within 2·bound; and they must be small on the scale of the
// Jacobian itself: 1e-12 of its largest column's norm (each column asked
// for 1e-13 of its scale, a few times that norm).
func TestDivCurlB(t *testing.T) {
	closed := map[string]bool{"ring": true, "closed pentagon": true}
	for name, p := range jacSources(t) {
		srcs := []Source{{Path: p, I: -2.3}}
		var worstDiv, worstCurl, oldDiv, oldCurl float64
		for _, x := range jacPoints(p, 25, 12) {
			j, bound, err := FieldJacobian(FieldB, srcs, x, Tol{})
			if err != nil {
				t.Fatalf("%s at %v: %v", name, x, err)
			}
			scale := math.Max(r3.Norm(j[0]), math.Max(r3.Norm(j[1]), r3.Norm(j[2])))
			div := j[0].X + j[1].Y + j[2].Z
			if math.Abs(div) > 3*bound || math.Abs(div) > 1e-12*scale {
				t.Errorf("%s at %v: div B = %g T/m (bound %g, scale %g)", name, x, div, 3*bound, scale)
			}
			worstDiv = math.Max(worstDiv, math.Abs(div)/scale)
			jo := oldJacobian(t, FieldB, srcs, x)
			oldDiv = math.Max(oldDiv, math.Abs(jo[0].X+jo[1].Y+jo[2].Z)/scale)
			if closed[name] {
				c := curlOf(j)
				if maxAbs(c) > 2*bound || r3.Norm(c) > 1e-12*scale {
					t.Errorf("%s at %v: curl B = %v T/m (bound %g, scale %g)", name, x, c, 2*bound, scale)
				}
				worstCurl = math.Max(worstCurl, r3.Norm(c)/scale)
				oldCurl = math.Max(oldCurl, r3.Norm(curlOf(jo))/scale)
			}
		}
		t.Logf("%s: |div B|/|J| at most %.2g exact, %.2g by differences", name, worstDiv, oldDiv)
		if closed[name] {
			t.Logf("%s: |curl B|/|J| at most %.2g exact, %.2g by differences", name, worstCurl, oldCurl)
		}
	}
}

// TestRingAxisGradient: on the axis of a ring of radius R carrying I,
// Bz = μ0 I R²/(2 (R² + z²)^{3/2}) (Jackson 1999, §5.5; from memory), so
// ∂Bz/∂z = −3 μ0 I R² z/(2 (R² + z²)^{5/2}), worked by hand; by symmetry
// ∂Bx/∂x = ∂By/∂y = −½ ∂Bz/∂z (div B = 0) and the other entries vanish.
// Tolerance 1e-13 of |∂Bz/∂z| plus the bound: the quadrature is asked for
// 1e-13 of its scale, which on the axis is 4/3·(R² + z²)/(R|z|)·|∂Bz/∂z|
// or so, and the bound must cover the difference.
func TestRingAxisGradient(t *testing.T) {
	const R, I = 0.025, 3.0
	ring, err := NewCircle(Vec{}, Vec{Z: 1}, R)
	if err != nil {
		t.Fatal(err)
	}
	srcs := []Source{{Path: Path{Prims: []Prim{ring}}, I: I}}
	for _, z := range []float64{-0.08, -0.01, 0.003, 0.0125, 0.025, 0.2} {
		want := -3 * Mu0 * I * R * R * z / (2 * math.Pow(R*R+z*z, 2.5))
		j, bound, err := FieldJacobian(FieldB, srcs, Vec{Z: z}, Tol{})
		if err != nil {
			t.Fatal(err)
		}
		jo := oldJacobian(t, FieldB, srcs, Vec{Z: z})
		d := math.Abs(j[2].Z - want)
		if d > bound+1e-16*math.Abs(want) {
			t.Errorf("z = %g: ∂Bz/∂z = %.17g, want %.17g: difference %.3g beyond the bound %.3g", z, j[2].Z, want, d, bound)
		}
		if d > 1e-13*math.Abs(want) {
			t.Errorf("z = %g: ∂Bz/∂z = %.17g, want %.17g (rel %.3g)", z, j[2].Z, want, d/math.Abs(want))
		}
		for _, v := range []float64{j[0].X, j[1].Y} {
			if math.Abs(v+want/2) > bound+1e-13*math.Abs(want) {
				t.Errorf("z = %g: transverse ∂B/∂x = %.17g, want %.17g", z, v, -want/2)
			}
		}
		for _, v := range []float64{j[0].Y, j[0].Z, j[1].X, j[1].Z, j[2].X, j[2].Y} {
			if math.Abs(v) > bound+1e-13*math.Abs(want) {
				t.Errorf("z = %g: an off-diagonal entry is %g, want 0 (bound %g)", z, v, bound)
			}
		}
		t.Logf("z = %g m: ∂Bz/∂z relative error %.2g exact (bound %.2g), %.2g by differences", z, d/math.Abs(want), bound/math.Abs(want), math.Abs(jo[2].Z-want)/math.Abs(want))
	}
}

// TestWireGradient: a straight wire of length 2L along z carrying I has,
// in its mid-plane at distance ρ, B_φ = μ0 I/(2πρ) · L/√(L² + ρ²)
// (Griffiths, Introduction to Electrodynamics, 4th ed., 2013, eq. 5.37
// with sin θ2 − sin θ1 = 2L/√(L² + ρ²); from memory), which tends to
// μ0 I/2πρ for a long wire. By hand, dB_φ/dρ = −μ0 I L/(2π) ·
// (1/ρ² + 1/(L² + ρ²))/√(L² + ρ²); at (ρ, 0, 0), B = B_φ ŷ, so
// ∂By/∂x = dB_φ/dρ, ∂Bx/∂y = −B_φ/ρ, and the rest vanish (∂Bz/∂z = 0 in
// the mid-plane by symmetry). The wire is one segment and also 40 joined
// pieces (the sum over pieces). Tolerance 1e-13 relative plus the bound.
func TestWireGradient(t *testing.T) {
	const L, I = 5.0, 10.0
	one, err := NewSegment(Vec{Z: -L}, Vec{Z: L})
	if err != nil {
		t.Fatal(err)
	}
	var many Path
	for k := 0; k < 40; k++ {
		s, err := NewSegment(Vec{Z: -L + 2*L*float64(k)/40}, Vec{Z: -L + 2*L*float64(k+1)/40})
		if err != nil {
			t.Fatal(err)
		}
		many.Prims = append(many.Prims, s)
	}
	for name, p := range map[string]Path{"one segment": {Prims: []Prim{one}}, "40 pieces": many} {
		srcs := []Source{{Path: p, I: I}}
		for _, rho := range []float64{1e-9, 1e-7, 1e-4, 0.003, 0.02, 0.5} {
			s := math.Sqrt(L*L + rho*rho)
			bphi := Mu0 * I / (2 * math.Pi * rho) * L / s
			dB := -Mu0 * I * L / (2 * math.Pi) * (1/(rho*rho) + 1/(L*L+rho*rho)) / s
			x := Vec{X: rho}
			j, bound, err := FieldJacobian(FieldB, srcs, x, Tol{})
			if err != nil {
				t.Fatal(err)
			}
			tol := bound + 1e-13*math.Abs(dB)
			if d := math.Abs(j[0].Y - dB); d > tol {
				t.Errorf("%s, ρ = %g: ∂By/∂x = %.17g, want %.17g (rel %.3g, bound %.3g)", name, rho, j[0].Y, dB, d/math.Abs(dB), bound)
			}
			if d := math.Abs(j[1].X + bphi/rho); d > tol {
				t.Errorf("%s, ρ = %g: ∂Bx/∂y = %.17g, want %.17g", name, rho, j[1].X, -bphi/rho)
			}
			for _, v := range []float64{j[0].X, j[0].Z, j[1].Y, j[1].Z, j[2].X, j[2].Y, j[2].Z} {
				if math.Abs(v) > tol {
					t.Errorf("%s, ρ = %g: an entry is %g, want 0 (tolerance %g)", name, rho, v, tol)
				}
			}
			ev := NewEvaluator(FieldB, srcs)
			old := "differences: "
			if jo, err := Jacobian(ev.At, x); err != nil {
				old += err.Error()
			} else {
				old += fmt.Sprintf("%.2g", math.Abs(jo[0].Y-dB)/math.Abs(dB))
			}
			t.Logf("%s, ρ = %g m: ∂By/∂x relative error %.2g exact (bound %.2g); %s", name, rho, math.Abs(j[0].Y-dB)/math.Abs(dB), bound/math.Abs(dB), old)
		}
	}
}

// TestJacobianNearWire: points 1 µm to 1 nm from a ring's wire, where
// the kernels' peak is far narrower than a quarter turn: curl A against
// the closed-form B (Jackson 1999, eq. 5.27, from memory) within the
// reported bounds (which grow as ε·R/d: the distance vector's rounding),
// and div B within 3 bounds. A helper that missed the narrow peak would
// be off by orders of magnitude.
func TestJacobianNearWire(t *testing.T) {
	const R = 0.025
	ring, err := NewCircle(Vec{}, Vec{Z: 1}, R)
	if err != nil {
		t.Fatal(err)
	}
	srcs := []Source{{Path: Path{Prims: []Prim{ring}}, I: 1}}
	for _, d := range []float64{1e-6, 1e-7, 1e-8, 1e-9} {
		for _, ang := range []float64{0.3, 2, 4.4} {
			s, c := math.Sincos(ang)
			x := Vec{X: (R + 0.6*d) * c, Y: (R + 0.6*d) * s, Z: 0.8 * d}
			ja, ba, err := FieldJacobian(FieldA, srcs, x, Tol{})
			if err != nil {
				t.Fatalf("d = %g: %v", d, err)
			}
			jb, bb, err := FieldJacobian(FieldB, srcs, x, Tol{})
			if err != nil {
				t.Fatalf("d = %g: %v", d, err)
			}
			b, err := FieldAt(FieldB, srcs, x)
			if err != nil {
				t.Fatal(err)
			}
			eb, _, err := FieldErrorBound(FieldB, srcs, x, nil)
			if err != nil {
				t.Fatal(err)
			}
			if diff := r3.Sub(curlOf(ja), b); maxAbs(diff) > 2*ba+eb {
				t.Errorf("d = %g, φ = %g: curl A − B = %v beyond the bounds %g + %g (|B| = %g)", d, ang, diff, 2*ba, eb, r3.Norm(b))
			}
			if div := jb[0].X + jb[1].Y + jb[2].Z; math.Abs(div) > 3*bb {
				t.Errorf("d = %g, φ = %g: div B = %g beyond 3 × %g", d, ang, div, bb)
			}
			if 2*ba > 1e-4*r3.Norm(b) {
				t.Errorf("d = %g: bound %g too loose for |B| = %g", d, 2*ba, r3.Norm(b))
			}
		}
	}
}

// TestFieldJacobianRefusals: a point on a wire is ErrOnWire, as for the
// field; a shape is refused; a point behind a plate is ErrBehindPlate.
func TestFieldJacobianRefusals(t *testing.T) {
	ring, _ := NewCircle(Vec{}, Vec{Z: 1}, 0.025)
	seg, _ := NewSegment(Vec{Z: -1}, Vec{Z: 1})
	for _, c := range []struct {
		p Prim
		x Vec
	}{{ring, Vec{X: 0.025}}, {seg, Vec{Z: 0.3}}} {
		for _, w := range []Which{FieldA, FieldB} {
			if _, _, err := FieldJacobian(w, []Source{{Path: Path{Prims: []Prim{c.p}}, I: 1}}, c.x, Tol{}); !errors.Is(err, ErrOnWire) {
				t.Errorf("on the wire: %v, want ErrOnWire", err)
			}
		}
	}
	dip := []Source{{Shape: Dipole{M: Vec{Z: 1}}, I: 1}}
	if _, _, err := FieldJacobian(FieldB, dip, Vec{X: 1}, Tol{}); !errors.Is(err, ErrShapeJacobian) {
		t.Errorf("shape: %v", err)
	}
	pl := &Plate{P: Vec{Z: -0.5}, N: Vec{Z: 1}}
	if _, _, err := FieldJacobian(FieldB, []Source{{Path: Path{Prims: []Prim{ring}}, I: 1, Plate: pl}}, Vec{Z: -1}, Tol{}); !errors.Is(err, ErrBehindPlate) {
		t.Errorf("behind the plate: %v", err)
	}
}

// TestSegmentJacobianClosed: the closed forms of a straight filament's
// Jacobian (segmentJacobian, derived by hand from A = μ0/4π·ê·ln((N + L)/
// (N − L)) and B in the form of Hanson & Hirshman, Phys. Plasmas 9, 4410,
// 2002) against the quadrature of the differentiated kernels
// (primJacobian), a route that shares no code, at random segments and
// points where the closed form applies (the point sees the segment under
// less than 120°, some of them just under): each entry within the sum of
// the two bounds, and within 1e-13 of the terms' size.
func TestSegmentJacobianClosed(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 9))
	rv := func(s float64) Vec {
		return Vec{X: s * (rng.Float64() - 0.5), Y: s * (rng.Float64() - 0.5), Z: s * (rng.Float64() - 0.5)}
	}
	used, worst := 0, 0.0
	for k := 0; k < 400; k++ {
		a := rv(0.2)
		b := r3.Add(a, rv(0.1*math.Pow(10, 2*rng.Float64())))
		x := rv(0.3)
		if k%4 == 0 {
			// near the 120° boundary: on the circle of points seeing ab at
			// about 119°, off the segment's plane by a random amount
			m := r3.Scale(0.5, r3.Add(a, b))
			l := r3.Norm(r3.Sub(b, a))
			perp := r3.Unit(r3.Cross(r3.Sub(b, a), rv(1)))
			x = r3.Add(m, r3.Scale(0.5*l/math.Tan(119.0/2*math.Pi/180), perp))
		}
		for _, w := range []Which{FieldA, FieldB} {
			cc, terms, ok := segmentJacobian(w, a, b, x)
			if !ok {
				continue
			}
			used++
			p := Prim{Kind: Segment, A: a, B: b}
			cq, est, scale, rho, err := primJacobian(w, p, x, JacobianTol)
			if err != nil {
				t.Fatal(err)
			}
			bound := segmentJacRel*eps*terms + est + rho*scale
			for j := range cc {
				d := maxAbs(r3.Sub(cc[j], cq[j]))
				if d > bound || d > 1e-13*terms {
					t.Errorf("a %v b %v x %v which %d column %d: closed %v, quadrature %v (diff %g, bound %g, terms %g)", a, b, x, w, j, cc[j], cq[j], d, bound, terms)
				}
				worst = math.Max(worst, d/terms)
			}
		}
	}
	if used < 400 {
		t.Errorf("only %d cases took the closed form", used)
	}
	t.Logf("%d cases, closed form against quadrature at most %.2g of the terms' size", used, worst)
}

// TestJacobianLongHelix: a helix of 1000 turns (thousands of breaks) at
// points between its turns, 10 µm to 1 mm inside the winding and outside
// it: curl A against B (Jackson 1999, eq. 5.27, from memory; B by the
// helix's own Biot–Savart quadrature) within the bounds, and inside the
// winding within 1e-11 of |B| (outside, B is that of the axial advance,
// about 3e-3 of the field inside, left from turns that cancel, so only the
// bounds apply there); div B within 3 bounds (Jackson 1999, eq. 5.22).
func TestJacobianLongHelix(t *testing.T) {
	h, err := NewHelix(Vec{Z: -0.1}, Vec{Z: 1}, 0.01, 0.2, 1000)
	if err != nil {
		t.Fatal(err)
	}
	srcs := []Source{{Path: Path{Prims: []Prim{h}}, I: 1}}
	for i, x := range []Vec{{X: 0.00999, Z: 0.0001}, {X: 0.009, Z: 0.0001}, {X: 0.003, Y: 0.002, Z: 0.005}, {X: 0.0102, Y: 0.0003, Z: -0.05}} {
		ja, ba, err := FieldJacobian(FieldA, srcs, x, Tol{})
		if err != nil {
			t.Fatalf("%v: %v", x, err)
		}
		jb, bb, err := FieldJacobian(FieldB, srcs, x, Tol{})
		if err != nil {
			t.Fatalf("%v: %v", x, err)
		}
		b, err := FieldAt(FieldB, srcs, x)
		if err != nil {
			t.Fatal(err)
		}
		eb, _, err := FieldErrorBound(FieldB, srcs, x, nil)
		if err != nil {
			t.Fatal(err)
		}
		d := r3.Sub(curlOf(ja), b)
		if maxAbs(d) > 2*ba+eb || (i < 3 && r3.Norm(d) > 1e-11*r3.Norm(b)) {
			t.Errorf("%v: curl A − B = %v (|B| %g, bounds %g + %g)", x, d, r3.Norm(b), 2*ba, eb)
		}
		if div := jb[0].X + jb[1].Y + jb[2].Z; math.Abs(div) > 3*bb {
			t.Errorf("%v: div B = %g beyond 3 × %g", x, div, bb)
		}
		t.Logf("%v: |curl A − B|/|B| = %.2g, bound %.2g", x, r3.Norm(d)/r3.Norm(b), 2*ba/r3.Norm(b))
	}
}

// TestFieldJacobianRobust: random pieces and points from 1e-12 to 1e6 of
// the piece's size away, on and off its lines and axes: FieldJacobian
// returns finite entries and a finite bound, or an error; never a panic.
// Where it answers, div B must lie within 3 bounds (Jackson 1999, eq.
// 5.22): a wrong answer with a small bound would show there.
func TestFieldJacobianRobust(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 4))
	rv := func() Vec { return r3.Unit(Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}) }
	answered := 0
	for k := 0; k < 300; k++ {
		var p Prim
		var err error
		c := r3.Scale(rng.Float64(), rv())
		switch k % 3 {
		case 0:
			p, err = NewSegment(c, r3.Add(c, r3.Scale(0.01+rng.Float64(), rv())))
		case 1:
			p, err = NewCircle(c, rv(), 0.01+rng.Float64())
		default:
			p, err = NewHelix(c, rv(), 0.01+rng.Float64(), 0.01+rng.Float64(), 0.5+20*rng.Float64())
		}
		if err != nil {
			t.Fatal(err)
		}
		size := p.Length()
		base := p.Point(rng.Float64())
		if k%5 == 0 {
			base = c // the centre, on an axis
		}
		x := r3.Add(base, r3.Scale(size*math.Pow(10, -12+18*rng.Float64()), rv()))
		srcs := []Source{{Path: Path{Prims: []Prim{p}}, I: 1}}
		j, bound, err := FieldJacobian(FieldB, srcs, x, Tol{})
		if err != nil {
			continue
		}
		answered++
		for _, v := range j {
			if math.IsNaN(v.X+v.Y+v.Z) || math.IsInf(v.X+v.Y+v.Z, 0) {
				t.Fatalf("%v at %v: %v", p, x, j)
			}
		}
		if math.IsNaN(bound) || math.IsInf(bound, 0) {
			t.Fatalf("%v at %v: bound %g", p, x, bound)
		}
		if div := j[0].X + j[1].Y + j[2].Z; math.Abs(div) > 3*bound {
			t.Errorf("kind %d at distance %g: div B = %g beyond 3 × %g (|J| %g)", p.Kind, r3.Norm(r3.Sub(x, base)), div, bound, r3.Norm(j[0]))
		}
	}
	t.Logf("%d of 300 answered", answered)
}
