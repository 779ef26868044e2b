package em

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/spatial/r3"
)

// Bulirsch's cel against its definition and against K and E. K(k) =
// cel(kc, 1, 1, 1) and E(k) = cel(kc, 1, 1, kc²) with kc² = 1 − k²
// (Bulirsch, Numer. Math. 7, 78, 1965, from memory; it follows from the
// definition). gonum's CompleteK and CompleteE are an outside reference;
// the definition is integrated by gonum's fixed Gauss–Legendre rule (the
// integrand is smooth for kc ≥ 0.1 and p ≥ 0.05, so 200 nodes reach
// rounding). Tolerance 1e-13 relative: both sides are at rounding.
func TestCel(t *testing.T) {
	for _, kc := range []float64{0.1, 0.3, 0.7, 1, 1.5} {
		m := 1 - kc*kc
		if m >= 0 {
			if got, want := Cel(kc, 1, 1, 1), mathext.CompleteK(m); math.Abs(got-want) > 1e-13*want {
				t.Errorf("cel(%g,1,1,1) = %.16g, K = %.16g", kc, got, want)
			}
			if got, want := Cel(kc, 1, 1, kc*kc), mathext.CompleteE(m); math.Abs(got-want) > 1e-13*want {
				t.Errorf("cel(%g,1,1,kc²) = %.16g, E = %.16g", kc, got, want)
			}
		}
		for _, pcs := range [][3]float64{{0.3, 1, 0.5}, {1, -1, 1}, {1, 1, -1}, {0.05, 1, 0.2}, {2.5, 0.4, -0.7}} {
			p, c, s := pcs[0], pcs[1], pcs[2]
			def := func(phi float64) float64 {
				cs, sn := math.Cos(phi), math.Sin(phi)
				c2, s2 := cs*cs, sn*sn
				return (c*c2 + s*s2) / ((c2 + p*s2) * math.Sqrt(c2+kc*kc*s2))
			}
			want := quad.Fixed(def, 0, math.Pi/2, 200, nil, 0)
			got := Cel(kc, p, c, s)
			if math.Abs(got-want) > 1e-13*math.Max(1, math.Abs(want)) {
				t.Errorf("cel(%g, %g, %g, %g) = %.16g, definition %.16g", kc, p, c, s, got, want)
			}
		}
	}
}

// ringSum is the field of a cylindrical sheet as a sum of loops: the
// closed-form loop fields (ArcB/ArcA, tested in field_test.go against
// Simpson et al.) integrated over the length by gonum's fixed
// Gauss–Legendre rule on pieces split at the field point — a route that
// shares no code with the Derby–Olbert form or the sheet's own integral.
func ringSum(t *testing.T, which Which, s CylinderSheet, x Vec) Vec {
	t.Helper()
	z, _ := axialFrame(x, s.C, s.N)
	b := s.L / 2
	cuts := []float64{-b, b}
	if z > -b && z < b {
		cuts = []float64{-b, z, b}
	}
	var sum Vec
	for k := 0; k+1 < len(cuts); k++ {
		for _, comp := range []int{0, 1, 2} {
			f := func(zp float64) float64 {
				ring, err := NewCircle(r3.Add(s.C, r3.Scale(zp, s.N)), s.N, s.R)
				if err != nil {
					t.Fatal(err)
				}
				var v Vec
				if which == FieldB {
					v, err = ArcB(ring, x)
				} else {
					v, err = ArcA(ring, x)
				}
				if err != nil {
					t.Fatal(err)
				}
				return [3]float64{v.X, v.Y, v.Z}[comp] / s.L
			}
			// 40 sub-intervals of 20 nodes, graded towards the cut
			n := 40
			for i := 0; i < n; i++ {
				g := func(u float64) float64 { return u * u }
				lo, hi := cuts[k], cuts[k+1]
				var a, bb float64
				if k == 0 && len(cuts) == 3 { // grade towards hi
					a, bb = hi-(hi-lo)*g(float64(n-i)/float64(n)), hi-(hi-lo)*g(float64(n-i-1)/float64(n))
				} else {
					a, bb = lo+(hi-lo)*g(float64(i)/float64(n)), lo+(hi-lo)*g(float64(i+1)/float64(n))
				}
				v := quad.Fixed(f, a, bb, 20, nil, 0)
				switch comp {
				case 0:
					sum.X += v
				case 1:
					sum.Y += v
				case 2:
					sum.Z += v
				}
			}
		}
	}
	return sum
}

// The sheet's B (Derby and Olbert's closed form) and A (its own integral)
// against the sum of loops, inside, outside, near the side and on the
// axis. Tolerance 1e-9 relative to |field|: the loop sum's graded
// Gauss–Legendre pieces reach about 1e-11 here (doubling the pieces
// changes it by less), the sheet's integral is asked for 1e-11.
func TestCylinderSheetAgainstLoops(t *testing.T) {
	s := CylinderSheet{C: Vec{X: 0.01, Y: -0.02, Z: 0.03}, N: r3.Unit(Vec{X: 1, Y: 2, Z: 2}), R: 0.012, L: 0.02}
	e1 := r3.Unit(r3.Cross(s.N, Vec{Z: 1}))
	at := func(rho, z float64) Vec { return r3.Add(s.C, r3.Add(r3.Scale(rho, e1), r3.Scale(z, s.N))) }
	for _, x := range []Vec{at(0, 0), at(0, 0.03), at(0.005, 0.004), at(0.0119, 0.002), at(0.0125, -0.008), at(0.03, 0.011), at(0.012, 0.0105), at(0.1, 0.05), at(0.002, -0.2)} {
		for _, which := range []Which{FieldB, FieldA} {
			got, err := s.Field(which, x, nil)
			if err != nil {
				t.Fatalf("%v at %v: %v", which, x, err)
			}
			want := ringSum(t, which, s, x)
			// absolute floor 1e-12 of μ0/L·R (A) or μ0/L (B), for components that vanish
			floor := 1e-12 * Mu0 / s.L
			if which == FieldA {
				floor *= s.R
			}
			if !vecClose(got, want, 1e-9, floor) {
				t.Errorf("which %d at %v: sheet %v, loops %v (rel %.2g)", which, x, got, want, r3.Norm(r3.Sub(got, want))/r3.Norm(want))
			}
		}
	}
}

// On the axis of a sheet of n·I = K A/m, half-length b:
// B = (μ0 K/2)[(z+b)/√((z+b)²+a²) − (z−b)/√((z−b)²+a²)] — the finite
// solenoid's axial field (integral of the loop's axial field μ0 I a²/(2(a²+z²)^{3/2});
// e.g. E. M. Purcell and D. J. Morin, Electricity and Magnetism, 3rd ed.,
// 2013, §6.5, from memory). Tolerance 1e-11: both are closed forms, but
// at a distance r the two terms of each cancel to about (L/r)², which
// costs that factor in rounding (400 at the farthest point here).
func TestCylinderSheetOnAxis(t *testing.T) {
	a, L := 0.01, 0.03
	b := L / 2
	s := CylinderSheet{N: Vec{Z: 1}, R: a, L: L}
	for _, z := range []float64{0, 0.005, 0.0149, 0.016, 0.05, -0.2} {
		got, err := s.Field(FieldB, Vec{Z: z}, nil)
		if err != nil {
			t.Fatal(err)
		}
		want := Mu0 / L / 2 * ((z+b)/math.Hypot(z+b, a) - (z-b)/math.Hypot(z-b, a))
		if math.Abs(got.Z-want) > 1e-11*math.Abs(want) || got.X != 0 || got.Y != 0 {
			t.Errorf("z = %g: %v, want Bz %.16g", z, got, want)
		}
	}
}

// Far from the sheet its field is the dipole's, m = I·πa² (Jackson,
// Classical Electrodynamics, 3rd ed., 1999, §5.6). The next term of the
// multipole series (a cylinder has no quadrupole) is smaller by about
// (size/r)²: at r = 100 sizes, 1e-4; tolerance 1e-3.
func TestSheetsFarFieldIsDipole(t *testing.T) {
	n := r3.Unit(Vec{X: 0.3, Y: -0.2, Z: 1})
	cyl := CylinderSheet{C: Vec{X: 0.1}, N: n, R: 0.01, L: 0.015}
	u := r3.Unit(r3.Cross(n, Vec{X: 1}))
	blk := BlockSheet{C: Vec{X: 0.1}, N: n, U: u, HU: 0.01, HV: 0.006, HN: 0.004}
	for _, c := range []struct {
		s    Shape
		m    Vec
		size float64
	}{
		{cyl, r3.Scale(math.Pi*0.01*0.01, n), 0.015},
		{blk, r3.Scale(4*0.01*0.006, n), 0.02},
	} {
		d := Dipole{P: Vec{X: 0.1}, M: c.m}
		for _, dir := range []Vec{{X: 1}, {Y: 1}, r3.Unit(Vec{X: 1, Y: -1, Z: 2}), n} {
			x := r3.Add(Vec{X: 0.1}, r3.Scale(100*c.size, dir))
			for _, which := range []Which{FieldB, FieldA} {
				got, err := c.s.Field(which, x, nil)
				if err != nil {
					t.Fatal(err)
				}
				want, _ := d.Field(which, x, nil)
				// components that vanish by symmetry: floor 1e-6 of the
				// dipole's size k0·m/r³ (B) or k0·m/r² (A)
				r := 100 * c.size
				floor := 1e-6 * k0 * r3.Norm(c.m) / (r * r)
				if which == FieldB {
					floor /= r
				}
				if !vecClose(got, want, 1e-3, floor) {
					t.Errorf("%T %d at %v: %v, dipole %v", c.s, which, x, got, want)
				}
			}
		}
	}
}

// On the axis of a rectangular block (edges 2a, 2b across, faces at
// distances z1 < z2 from the point) magnetised along the axis with
// μ0 M = Br: Bz = (Br/π)[atan(ab/(z1√(a²+b²+z1²))) − atan(ab/(z2√(a²+b²+z2²)))]
// (the integral of a rectangular loop's axial field over the height; a
// formula common in magnet makers' notes, from memory). Tolerance 1e-9:
// the sheet's integral is asked for 1e-11.
func TestBlockSheetOnAxis(t *testing.T) {
	a, b, h := 0.01, 0.005, 0.004
	s := BlockSheet{N: Vec{Z: 1}, U: Vec{X: 1}, HU: a, HV: b, HN: h}
	for _, z := range []float64{0.0041, 0.005, 0.02, 0.3} {
		got, err := s.Field(FieldB, Vec{Z: z}, nil)
		if err != nil {
			t.Fatal(err)
		}
		term := func(d float64) float64 { return math.Atan(a * b / (d * math.Sqrt(a*a+b*b+d*d))) }
		br := Mu0 / (2 * h) // μ0 M for a total current of 1 A
		want := br / math.Pi * (term(z-h) - term(z+h))
		if math.Abs(got.Z-want) > 1e-9*want || math.Hypot(got.X, got.Y) > 1e-9*want {
			t.Errorf("z = %g: %v, want Bz %.16g", z, got, want)
		}
	}
}

// The ideal sources against Ampère's law, ∮B·dl = μ0 I_enclosed, by the
// package's line integral around loops that enclose the current and loops
// that do not; and against long finite versions: a segment of half-length
// h at distance ρ gives B = μ0 I h / (2πρ√(h²+ρ²)) (Biot–Savart), within
// ρ²/(2h²) of the infinite wire; a sheet of length L ≫ R at its middle
// within R²/(2(L/2)²) of the ideal solenoid.
func TestIdealSources(t *testing.T) {
	w := InfiniteWire{P: Vec{X: 0.01, Y: 0.02}, D: r3.Unit(Vec{X: 1, Y: 1, Z: 3}), RRef: 1}
	sol := IdealSolenoid{C: Vec{Y: 0.1}, N: Vec{Z: 1}, R: 0.02, Turns: 1000}
	lineB := func(s Shape, loop Path) float64 {
		v, err := LineIntegral(loop, func(x Vec) (Vec, error) { return s.Field(FieldB, x, nil) }, Tol{Rel: 1e-11}, Mu0*1000)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	around, _ := NewCircle(r3.Add(w.P, r3.Scale(0.3, w.D)), Vec{Z: 1}, 0.05) // tilted to the wire, still encloses it
	beside, _ := NewCircle(Vec{X: 0.3}, Vec{Z: 1}, 0.05)
	if got := lineB(w, Path{Prims: []Prim{around}}); math.Abs(got-Mu0) > 1e-10*Mu0 {
		t.Errorf("wire: ∮B·dl around = %g, want μ0 = %g", got, Mu0)
	}
	if got := lineB(w, Path{Prims: []Prim{beside}}); math.Abs(got) > 1e-10*Mu0 {
		t.Errorf("wire: ∮B·dl beside = %g, want 0", got)
	}
	// a rectangle through the sheet, 5 cm along the axis: μ0 n I ℓ
	rect := func(x0, x1 float64) Path {
		c := []Vec{{X: x0, Y: 0.1, Z: 0}, {X: x1, Y: 0.1, Z: 0}, {X: x1, Y: 0.1, Z: 0.05}, {X: x0, Y: 0.1, Z: 0.05}}
		var p Path
		for i := range c {
			s, _ := NewSegment(c[i], c[(i+1)%4])
			p.Prims = append(p.Prims, s)
		}
		return p
	}
	// the rectangle circulates in the x–z plane; its side inside runs −z
	if got, want := lineB(sol, rect(0.01, 0.05)), -Mu0*1000*0.05; math.Abs(got-want) > 1e-12*math.Abs(want) {
		t.Errorf("solenoid: ∮B·dl through the sheet = %g, want %g", got, want)
	}
	if got := lineB(sol, rect(0.03, 0.05)); got != 0 {
		t.Errorf("solenoid: ∮B·dl outside = %g, want 0", got)
	}
	// long finite versions
	x := r3.Add(w.P, r3.Scale(0.01, r3.Unit(r3.Cross(w.D, Vec{X: 1}))))
	h := 100.0
	seg, _ := NewSegment(r3.Sub(w.P, r3.Scale(h, w.D)), r3.Add(w.P, r3.Scale(h, w.D)))
	bs, _ := SegmentB(seg.A, seg.B, x)
	bw, _ := w.Field(FieldB, x, nil)
	if !vecClose(bw, bs, 0.01*0.01/(2*h*h)*1.01, 0) || r3.Norm(bw) < r3.Norm(bs) {
		t.Errorf("wire %v, segment of ±%g m %v", bw, h, bs)
	}
	if want := Mu0 / (2 * math.Pi * 0.01); math.Abs(r3.Norm(bw)-want) > 1e-14*want {
		t.Errorf("|B| = %g, want μ0/(2π·1 cm) = %g", r3.Norm(bw), want)
	}
	long := CylinderSheet{C: sol.C, N: sol.N, R: sol.R, L: 20}
	for _, p := range []Vec{{X: 0.005, Y: 0.1}, {X: 0.03, Y: 0.1}} {
		for _, which := range []Which{FieldB, FieldA} {
			bi, _ := sol.Field(which, p, nil)
			bl, err := long.Field(which, p, nil)
			if err != nil {
				t.Fatal(err)
			}
			bl = r3.Scale(sol.Turns*long.L, bl) // n·I = total/L
			d := r3.Norm(r3.Sub(bi, bl))
			// the finite sheet's field differs by about (R/b)²/2 of μ0 n
			// (its centre field μ0 n b/√(b²+R²), and the return flux
			// outside); allow twice (R/b)², times R for A
			b := long.L / 2
			allow := 2 * (sol.R / b) * (sol.R / b) * Mu0 * sol.Turns
			if which == FieldA {
				allow *= sol.R
			}
			if d > allow {
				t.Errorf("which %d at %v: ideal %v, long sheet %v (diff %g > %g)", which, p, bi, bl, d, allow)
			}
		}
	}
	if _, err := sol.Field(FieldB, Vec{X: 0.02, Y: 0.1}, nil); !errors.Is(err, ErrOnSheet) {
		t.Errorf("on the sheet: %v", err)
	}
}

// Images in a permeable half space μr (region 2) for currents in air
// (region 1): in region 1 the field is that of the currents plus their
// mirror images times k = (μr−1)/(μr+1); in region 2 it is that of the
// currents times 2μr/(μr+1) (W. R. Smythe, Static and Dynamic Electricity,
// 3rd ed., 1968, §7.18; J. D. Jackson, Classical Electrodynamics, 3rd ed.,
// 1999, problem 5.17 — both from memory). The check is the interface
// condition itself (Jackson §5.4: normal B continuous, tangential H
// continuous): on the plane, B1·n = B2·n and B1t = B2t/μr, for a
// tilted loop, a segment, a magnet and a dipole. Tolerance 1e-12
// relative: fields are closed forms or integrals asked for 1e-11.
func TestImagesInterfaceConditions(t *testing.T) {
	p, n := Vec{X: 0.01, Y: 0, Z: -0.002}, r3.Unit(Vec{X: 0.1, Y: 0.2, Z: 1})
	loop, _ := NewCircle(Vec{X: 0, Y: 0.01, Z: 0.02}, r3.Unit(Vec{X: 1, Y: 0, Z: 2}), 0.015)
	seg, _ := NewSegment(Vec{X: -0.02, Y: 0, Z: 0.01}, Vec{X: 0.03, Y: 0.01, Z: 0.03})
	shapes := []Shape{
		CylinderSheet{C: Vec{Z: 0.015}, N: r3.Unit(Vec{X: 1, Z: 1}), R: 0.005, L: 0.008},
		Dipole{P: Vec{Y: 0.01, Z: 0.01}, M: Vec{X: 0.3, Y: 1, Z: 0.2}},
	}
	type pair struct{ src, img Source }
	var cases []pair
	for _, path := range []Path{{Prims: []Prim{loop}}, {Prims: []Prim{seg}}} {
		cases = append(cases, pair{Source{Path: path, I: 1}, Source{Path: path.Mirror(p, n), I: 1}})
	}
	for _, s := range shapes {
		cases = append(cases, pair{Source{Shape: s, I: 1}, Source{Shape: s.Mirror(p, n), I: 1}})
	}
	on := []Vec{p, r3.Add(p, r3.Unit(r3.Cross(n, Vec{X: 1}))), ReflectPoint(Vec{X: 0.013, Y: -0.01, Z: 0.03}, p, n)}
	on[1] = r3.Add(p, r3.Scale(0.02, r3.Unit(r3.Cross(n, Vec{X: 1}))))
	on[2] = r3.Scale(0.5, r3.Add(on[2], Vec{X: 0.013, Y: -0.01, Z: 0.03})) // the foot of a point on the plane
	for _, mur := range []float64{1, 5, 1000, 1e12} {
		k := (mur - 1) / (mur + 1)
		for ci, c := range cases {
			for _, x := range on {
				bs, err := FieldAt(FieldB, []Source{c.src}, x)
				if err != nil {
					t.Fatal(err)
				}
				bi, err := FieldAt(FieldB, []Source{c.img}, x)
				if err != nil {
					t.Fatal(err)
				}
				b1 := r3.Add(bs, r3.Scale(k, bi))
				b2 := r3.Scale(2*mur/(mur+1), bs)
				n1, n2 := r3.Dot(b1, n), r3.Dot(b2, n)
				t1 := r3.Sub(b1, r3.Scale(n1, n))
				t2 := r3.Scale(1/mur, r3.Sub(b2, r3.Scale(n2, n)))
				scale := r3.Norm(bs)
				if math.Abs(n1-n2) > 1e-12*scale || r3.Norm(r3.Sub(t1, t2)) > 1e-12*scale {
					t.Errorf("μr %g case %d at %v: Bn %g vs %g, Bt %v vs Ht·μ0 %v", mur, ci, x, n1, n2, t1, t2)
				}
			}
		}
	}
}

// A field point behind the plate is refused.
func TestBehindPlate(t *testing.T) {
	loop, _ := NewCircle(Vec{Z: 0.02}, Vec{Z: 1}, 0.01)
	pl := &Plate{N: Vec{Z: 1}}
	src := []Source{{Path: Path{Prims: []Prim{loop}}, I: 1, Plate: pl}}
	if _, err := FieldAt(FieldB, src, Vec{Z: -0.001}); !errors.Is(err, ErrBehindPlate) {
		t.Errorf("behind: %v", err)
	}
	if _, err := FieldAt(FieldB, src, Vec{X: 0.3}); err != nil {
		t.Errorf("on the plate: %v", err)
	}
}
