package em

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/spatial/r3"
)

// vecClose compares vectors relative to the larger norm (or abs floor).
func vecClose(a, b Vec, rel, abs float64) bool {
	d := r3.Norm(r3.Sub(a, b))
	return d <= abs || d <= rel*math.Max(r3.Norm(a), r3.Norm(b))
}

// bruteB integrates Biot–Savart along a primitive with gonum's fixed
// high-order Gauss–Legendre rule on many pieces: an independent route to
// the same integral (no closed forms, no adaptive code of ours).
func bruteB(p Prim, x Vec, pieces int) Vec {
	var sum Vec
	for k := 0; k < pieces; k++ {
		t0, t1 := float64(k)/float64(pieces), float64(k+1)/float64(pieces)
		for c := 0; c < 3; c++ {
			f := func(t float64) float64 {
				r := r3.Sub(x, p.Point(t))
				n := r3.Norm(r)
				b := r3.Scale(k0/(n*n*n), r3.Cross(p.Tangent(t), r))
				return [3]float64{b.X, b.Y, b.Z}[c]
			}
			v := quad.Fixed(f, t0, t1, 40, quad.Legendre{}, 0)
			switch c {
			case 0:
				sum.X += v
			case 1:
				sum.Y += v
			default:
				sum.Z += v
			}
		}
	}
	return sum
}

func bruteA(p Prim, x Vec, pieces int) Vec {
	var sum Vec
	for k := 0; k < pieces; k++ {
		t0, t1 := float64(k)/float64(pieces), float64(k+1)/float64(pieces)
		for c := 0; c < 3; c++ {
			f := func(t float64) float64 {
				n := r3.Norm(r3.Sub(x, p.Point(t)))
				a := r3.Scale(k0/n, p.Tangent(t))
				return [3]float64{a.X, a.Y, a.Z}[c]
			}
			v := quad.Fixed(f, t0, t1, 40, quad.Legendre{}, 0)
			switch c {
			case 0:
				sum.X += v
			case 1:
				sum.Y += v
			default:
				sum.Z += v
			}
		}
	}
	return sum
}

// TestLoopOnAxis: B on the axis of a circular loop, μ0 I a² / (2 (a² + z²)^{3/2})
// (Griffiths, Introduction to Electrodynamics, 4th ed., 2017, Example 5.6).
// Tolerance 1e-13 relative: closed forms with a handful of roundings.
func TestLoopOnAxis(t *testing.T) {
	a := 0.05
	loop, err := NewCircle(Vec{}, Vec{Z: 1}, a)
	if err != nil {
		t.Fatal(err)
	}
	for _, z := range []float64{0, 0.01, -0.03, 0.2, 5} {
		b, err := ArcB(loop, Vec{Z: z})
		if err != nil {
			t.Fatal(err)
		}
		want := Mu0 * a * a / (2 * math.Pow(a*a+z*z, 1.5))
		if !scalar.EqualWithinAbsOrRel(b.Z, want, 0, 1e-13) || math.Hypot(b.X, b.Y) > 1e-13*want {
			t.Errorf("z=%g: B = %v, want (0, 0, %g)", z, b, want)
		}
	}
}

// simpsonLoop is the off-axis field of a circular loop (radius a, 1 A, in
// the z=0 plane) in the form of Simpson, Lane, Immer & Youngquist, "Simple
// analytic expressions for the magnetic field of a circular current loop",
// NASA Technical Memorandum (2001), eqs. for Bρ and Bz (from memory):
//
//	α² = a²+r²−2aρ, β² = a²+r²+2aρ, k² = 1 − α²/β², C = μ0/π, r² = ρ²+z²
//	Bρ = C z /(2α²βρ) [(a²+r²)E(k²) − α²K(k²)]
//	Bz = C /(2α²β)   [(a²−r²)E(k²) + α²K(k²)]
func simpsonLoop(a, rho, z float64) (br, bz float64) {
	r2 := rho*rho + z*z
	al2 := a*a + r2 - 2*a*rho
	be2 := a*a + r2 + 2*a*rho
	be := math.Sqrt(be2)
	m := 1 - al2/be2
	K, E := mathext.CompleteK(m), mathext.CompleteE(m)
	C := Mu0 / math.Pi
	if rho != 0 {
		br = C * z / (2 * al2 * be * rho) * ((a*a+r2)*E - al2*K)
	}
	bz = C / (2 * al2 * be) * ((a*a-r2)*E + al2*K)
	return
}

// TestLoopOffAxis compares the loop field with Simpson et al. (2001) at
// points inside, outside, near the wire and far away. Tolerance 1e-11
// relative to |B|: both sides are closed forms in K and E (Fukushima's
// rational approximations in gonum, ~1e-15) but the near-wire points lose
// digits in α² = (a−ρ)² + z² to cancellation in Simpson's own form.
func TestLoopOffAxis(t *testing.T) {
	a := 0.1
	loop, _ := NewCircle(Vec{}, Vec{Z: 1}, a)
	for _, pt := range [][2]float64{{0.02, 0.01}, {0.05, 0}, {0.099, 0.001}, {0.15, -0.05}, {0.3, 0.4}, {2, 1}, {0.1, 0.01}} {
		rho, z := pt[0], pt[1]
		for _, ang := range []float64{0, 1.1, -2.5} {
			x := Vec{X: rho * math.Cos(ang), Y: rho * math.Sin(ang), Z: z}
			b, err := ArcB(loop, x)
			if err != nil {
				t.Fatal(err)
			}
			br, bz := simpsonLoop(a, rho, z)
			want := Vec{X: br * math.Cos(ang), Y: br * math.Sin(ang), Z: bz}
			if !vecClose(b, want, 1e-11, 0) {
				t.Errorf("ρ=%g z=%g φ=%g: B = %v, Simpson %v", rho, z, ang, b, want)
			}
		}
	}
}

// TestArcAgainstQuadrature checks the incomplete-elliptic closed forms of an
// arc's B and A against brute-force Gauss–Legendre quadrature (gonum) of
// the Biot–Savart integrals along the same exact arc. 40-point rules on 64
// pieces converge to ~1e-14 for points at least 1% of the radius away;
// tolerance 1e-10 relative (1e-20 T absolute for cancelling components).
func TestArcAgainstQuadrature(t *testing.T) {
	c := Vec{X: 0.01, Y: -0.02, Z: 0.03}
	axis := Vec{X: 0.3, Y: -0.2, Z: 1}
	n := r3.Unit(axis)
	u, _, _, _ := frame(n, Vec{X: 1})
	start := r3.Add(c, r3.Scale(0.04, u))
	points := []Vec{
		{X: 0, Y: 0, Z: 0}, {X: 0.05, Y: 0.02, Z: 0.03}, {X: -0.03, Y: 0.01, Z: 0.05},
		{X: 0.2, Y: 0.3, Z: -0.1}, c, r3.Add(c, r3.Scale(0.02, n)),
	}
	for _, span := range []float64{0.3, 1.5, math.Pi, 4, 2*math.Pi - 0.1, -2.2} {
		arc, err := NewArc(c, axis, start, span)
		if err != nil {
			t.Fatal(err)
		}
		for _, x := range points {
			b, err := ArcB(arc, x)
			if err != nil {
				t.Fatal(err)
			}
			if want := bruteB(arc, x, 64); !vecClose(b, want, 1e-10, 1e-20) {
				t.Errorf("span %g at %v: B = %v, quadrature %v", span, x, b, want)
			}
			a, err := ArcA(arc, x)
			if err != nil {
				t.Fatal(err)
			}
			if want := bruteA(arc, x, 64); !vecClose(a, want, 1e-10, 1e-22) {
				t.Errorf("span %g at %v: A = %v, quadrature %v", span, x, a, want)
			}
		}
	}
}

// TestArcNearItsCircle: a point close to the circle of an arc but beyond
// the arc's ends takes the numerical route; it must still agree with
// brute-force quadrature (tolerance as above).
func TestArcNearItsCircle(t *testing.T) {
	arc, _ := NewArc(Vec{}, Vec{Z: 1}, Vec{X: 0.1}, math.Pi/2)
	x := Vec{X: -0.1001, Y: 0.0001, Z: 0.0002} // near the circle, opposite the arc
	b, err := ArcB(arc, x)
	if err != nil {
		t.Fatal(err)
	}
	if want := bruteB(arc, x, 64); !vecClose(b, want, 1e-10, 0) {
		t.Errorf("B = %v, quadrature %v", b, want)
	}
}

// TestSegment: finite straight wire, B = μ0 I/(4π d) (cos θ1 − cos θ2)
// (Griffiths, 4th ed., 2017, Example 5.5, eq. 5.37), direction by the
// right-hand rule; and A against quadrature of μ0/4π ∫ dl/|r|.
func TestSegment(t *testing.T) {
	a, b := Vec{Z: -0.3}, Vec{Z: 0.5}
	for _, x := range []Vec{{X: 0.1}, {X: 0.02, Z: 0.7}, {Y: -0.05, Z: -0.4}, {X: 1e-4, Z: 0.1}} {
		got, err := SegmentB(a, b, x)
		if err != nil {
			t.Fatal(err)
		}
		d := math.Hypot(x.X, x.Y)
		cos1 := (x.Z - a.Z) / math.Hypot(d, x.Z-a.Z) // angle from the wire's start, seen from x
		cos2 := (x.Z - b.Z) / math.Hypot(d, x.Z-b.Z)
		mag := Mu0 / (4 * math.Pi * d) * (cos1 - cos2)
		dir := r3.Unit(r3.Cross(Vec{Z: 1}, Vec{X: x.X, Y: x.Y})) // ẑ × ρ̂ = φ̂
		want := r3.Scale(mag, dir)
		if !vecClose(got, want, 1e-13, 0) {
			t.Errorf("B at %v = %v, want %v", x, got, want)
		}
		// A_z = μ0/4π ∫ dz'/√(d² + (z' − z)²) = μ0/4π [asinh((z_b − z)/d) − asinh((z_a − z)/d)]
		// (elementary integral; a different form from the code's log)
		av, err := SegmentA(a, b, x)
		if err != nil {
			t.Fatal(err)
		}
		wantA := Vec{Z: k0 * (math.Asinh((b.Z-x.Z)/d) - math.Asinh((a.Z-x.Z)/d))}
		if !vecClose(av, wantA, 1e-13, 0) {
			t.Errorf("A at %v = %v, want %v", x, av, wantA)
		}
	}
}

// TestOnWire: points on a filament are errors; points on the line of a
// segment beyond its ends are not (B is zero there by symmetry).
func TestOnWire(t *testing.T) {
	if _, err := SegmentB(Vec{}, Vec{X: 1}, Vec{X: 0.5}); !errors.Is(err, ErrOnWire) {
		t.Errorf("segment midpoint: %v, want ErrOnWire", err)
	}
	if b, err := SegmentB(Vec{}, Vec{X: 1}, Vec{X: 2}); err != nil || r3.Norm(b) != 0 {
		t.Errorf("on the line beyond the end: %v, %v; want 0", b, err)
	}
	loop, _ := NewCircle(Vec{}, Vec{Z: 1}, 0.1)
	if _, err := ArcB(loop, Vec{Y: 0.1}); !errors.Is(err, ErrOnWire) {
		t.Errorf("on the loop: %v, want ErrOnWire", err)
	}
	h, _ := NewHelix(Vec{}, Vec{Z: 1}, 0.01, 0.02, 4)
	if _, err := PrimB(h, h.Point(0.37)); !errors.Is(err, ErrOnWire) {
		t.Errorf("on the helix: %v, want ErrOnWire", err)
	}
}

// TestHelixAgainstQuadrature: the adaptive helix field against brute
// force on many pieces (tolerance 1e-10 relative).
func TestHelixAgainstQuadrature(t *testing.T) {
	h, _ := NewHelix(Vec{X: 0.001}, Vec{X: 0.1, Z: 1}, 0.01, 0.03, 5.5)
	for _, x := range []Vec{{}, {X: 0.02, Z: 0.01}, {Y: 0.005, Z: 0.05}} {
		b, err := PrimB(h, x)
		if err != nil {
			t.Fatal(err)
		}
		if want := bruteB(h, x, 256); !vecClose(b, want, 1e-10, 0) {
			t.Errorf("B at %v = %v, quadrature %v", x, b, want)
		}
	}
}

// TestReversal: reversing a path reverses its field.
func TestReversal(t *testing.T) {
	arc, _ := NewArc(Vec{}, Vec{Z: 1}, Vec{X: 0.1}, 2)
	x := Vec{X: 0.03, Y: 0.07, Z: 0.02}
	b1, _ := ArcB(arc, x)
	b2, _ := ArcB(arc.Reversed(), x)
	if !vecClose(b1, r3.Scale(-1, b2), 1e-13, 0) {
		t.Errorf("reversed arc: %v vs %v", b1, b2)
	}
	h, _ := NewHelix(Vec{}, Vec{Z: 1}, 0.01, 0.02, 2.3)
	hb1, _ := PrimB(h, x)
	hr := h.Reversed()
	if !vecClose(hr.Start(), h.End(), 1e-14, 1e-16) || !vecClose(hr.End(), h.Start(), 1e-14, 1e-16) {
		t.Fatalf("reversed helix ends: %v %v vs %v %v", hr.Start(), hr.End(), h.End(), h.Start())
	}
	hb2, _ := PrimB(hr, x)
	if !vecClose(hb1, r3.Scale(-1, hb2), 1e-11, 0) {
		t.Errorf("reversed helix: %v vs %v", hb1, hb2)
	}
}

// TestOnWireLocal: whether a point lies on a straight wire is judged by the
// geometry near the point, not by the segment's length. Off the wire, B of
// a segment on its perpendicular bisector at distance ρ is
// μ0I/(4πρ)·2h/√(h² + ρ²) and A is μ0I/(4π)·2·asinh(h/ρ), h the half-length
// (Griffiths, Introduction to Electrodynamics, 4th ed., 2017, Ex. 5.5 and
// Prob. 5.25 type; from memory). Tolerance: the coordinates of ends 10⁹ m
// from the origin carry rounding of 1.1e-16·1e9 ≈ 1.1e-7 m, 3e-6 of a 35 mm
// distance, so 1e-5 for the huge segment; 1e-12 for the others (the
// closed form's own rounding near the wire, as in TestSegmentClosedForm).
// Points genuinely on a wire (the midpoint, a point a + t(b − a), an end)
// still give ErrOnWire, through SegmentB, SegmentA and the field kernel.
func TestOnWireLocal(t *testing.T) {
	cases := []struct {
		name string
		a, b Vec
		h    float64 // half-length
		x    Vec     // on the perpendicular bisector at distance rho
		rho  float64
		rel  float64
	}{
		{"huge segment, 35 mm off", Vec{}, Vec{X: 2e9}, 1e9, Vec{X: 1e9, Y: 0.035}, 0.035, 1e-5},
		{"huge segment, 1 mm off", Vec{X: -1e9}, Vec{X: 1e9}, 1e9, Vec{Z: 1e-3}, 1e-3, 1e-5},
		{"tiny segment, 1 fm off", Vec{X: -1e-9}, Vec{X: 1e-9}, 1e-9, Vec{Y: 1e-15}, 1e-15, 1e-12},
		{"1 m segment, 1 nm off", Vec{X: -0.5}, Vec{X: 0.5}, 0.5, Vec{Y: 1e-9}, 1e-9, 1e-12},
	}
	for _, c := range cases {
		b, err := SegmentB(c.a, c.b, c.x)
		if err != nil {
			t.Errorf("%s: SegmentB: %v", c.name, err)
			continue
		}
		want := k0 / c.rho * 2 * c.h / math.Hypot(c.h, c.rho)
		if math.Abs(r3.Norm(b)-want) > c.rel*want {
			t.Errorf("%s: |B| = %.12g T, want %.12g", c.name, r3.Norm(b), want)
		}
		av, err := SegmentA(c.a, c.b, c.x)
		if wantA := k0 * 2 * math.Asinh(c.h/c.rho); err != nil || math.Abs(r3.Norm(av)-wantA) > c.rel*wantA {
			t.Errorf("%s: |A| = %.12g, %v; want %.12g", c.name, r3.Norm(av), err, wantA)
		}
		kb, err := FieldAt(FieldB, []Source{{Path: Path{Prims: []Prim{mustSeg(t, c.a, c.b)}}, I: 1}}, c.x)
		if err != nil || math.Abs(r3.Norm(kb)-want) > c.rel*want {
			t.Errorf("%s: kernel |B| = %.12g, %v; want %.12g", c.name, r3.Norm(kb), err, want)
		}
	}
	on := []struct {
		name string
		a, b Vec
		x    Vec
	}{
		{"huge segment, midpoint", Vec{}, Vec{X: 2e9}, Vec{X: 1e9}},
		{"huge oblique segment, a + 0.3(b − a)", Vec{X: 1, Y: 2, Z: 3}, Vec{X: 2e9, Y: -7e8, Z: 3e8}, Vec{}},
		{"huge segment, an end", Vec{}, Vec{X: 2e9}, Vec{X: 2e9}},
		{"tiny segment, midpoint", Vec{X: -1e-9}, Vec{X: 1e-9}, Vec{}},
		{"tiny oblique segment, a + 0.3(b − a)", Vec{X: 1e-9, Y: 2e-9}, Vec{X: -3e-9, Y: 5e-9, Z: 1e-9}, Vec{}},
	}
	for _, c := range on {
		x := c.x
		if x == (Vec{}) {
			x = r3.Add(c.a, r3.Scale(0.3, r3.Sub(c.b, c.a)))
		}
		if _, err := SegmentB(c.a, c.b, x); !errors.Is(err, ErrOnWire) {
			t.Errorf("%s: SegmentB: %v, want ErrOnWire", c.name, err)
		}
		if _, err := SegmentA(c.a, c.b, x); !errors.Is(err, ErrOnWire) {
			t.Errorf("%s: SegmentA: %v, want ErrOnWire", c.name, err)
		}
		if _, err := FieldAt(FieldB, []Source{{Path: Path{Prims: []Prim{mustSeg(t, c.a, c.b)}}, I: 1}}, x); !errors.Is(err, ErrOnWire) {
			t.Errorf("%s: kernel: %v, want ErrOnWire", c.name, err)
		}
	}
}

func mustSeg(t *testing.T, a, b Vec) Prim {
	t.Helper()
	p, err := NewSegment(a, b)
	if err != nil {
		t.Fatal(err)
	}
	return p
}
