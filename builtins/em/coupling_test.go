package em

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/spatial/r3"
)

// Tests of the coupling layer (flux, mutual and self inductance, EMF,
// force) and of the multi-source field kernel against published closed
// forms. Every check names its source and derives its tolerance.

// cpEps is the float64 unit roundoff (2⁻⁵²).
const cpEps = 0x1p-52

// cpRel is |got − want| / |want|.
func cpRel(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// cpMust returns a checker for a constructor's (Prim, error) result:
// cpMust(t)(NewSegment(a, b)).
func cpMust(t testing.TB) func(Prim, error) Prim {
	return func(p Prim, err error) Prim {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
}

// cpPolygon is the closed polygon through pts (straight segments, the last
// joining back to the first).
func cpPolygon(t testing.TB, pts ...Vec) Path {
	t.Helper()
	var p Path
	for i := range pts {
		p.Prims = append(p.Prims, cpMust(t)(NewSegment(pts[i], pts[(i+1)%len(pts)])))
	}
	return p
}

// cpRect is the closed parallelogram corner → +s1 → +s1+s2 → +s2: it
// circulates right-handed about s1 × s2, the normal of
// NewRectSurface(corner, s1, s2).
func cpRect(t testing.TB, corner, s1, s2 Vec) Path {
	t.Helper()
	return cpPolygon(t, corner, r3.Add(corner, s1), r3.Add(corner, r3.Add(s1, s2)), r3.Add(corner, s2))
}

// cpRotation is the rotation by angle about axis (Rodrigues' formula).
func cpRotation(axis Vec, angle float64) func(Vec) Vec {
	k := r3.Unit(axis)
	s, c := math.Sincos(angle)
	return func(v Vec) Vec {
		return r3.Add(r3.Add(r3.Scale(c, v), r3.Scale(s, r3.Cross(k, v))), r3.Scale(r3.Dot(k, v)*(1-c), k))
	}
}

// cpMove rotates and shifts every primitive of a path.
func cpMove(p Path, rot func(Vec) Vec, origin, shift Vec) Path {
	out := Path{Prims: make([]Prim, len(p.Prims))}
	for i, q := range p.Prims {
		out.Prims[i] = q.Transform(rot, origin, shift)
	}
	return out
}

// cpQuarterArcs is a circle made of four quarter arcs (so that no code
// path can treat it as a whole circle).
func cpQuarterArcs(t testing.TB, c, axis Vec, r float64) Path {
	t.Helper()
	u, _, _, err := frame(axis, Vec{})
	if err != nil {
		t.Fatal(err)
	}
	rot := cpRotation(axis, math.Pi/2)
	start := r3.Scale(r, u)
	var p Path
	for range 4 {
		p.Prims = append(p.Prims, cpMust(t)(NewArc(c, axis, r3.Add(c, start), math.Pi/2)))
		start = rot(start)
	}
	return p
}

// cpMaxwellKE is Maxwell's mutual inductance of coaxial circles in its
// textbook form, with gonum's K and E (parameter m = k²):
//
//	M = μ0 √(ab) [(2/k − k) K(k²) − (2/k) E(k²)],  k² = 4ab/((a+b)² + d²)
//
// (J. C. Maxwell, A Treatise on Electricity and Magnetism, 1873, §701;
// F. W. Grover, Inductance Calculations, 1946). It also returns the
// cancellation factor (|2/k − k| K + (2/k) E) / |bracket|, by which the
// relative errors of K and E are amplified.
func cpMaxwellKE(a, b, d float64) (m, amplification float64) {
	k2 := 4 * a * b / ((a+b)*(a+b) + d*d)
	k := math.Sqrt(k2)
	K, E := mathext.CompleteK(k2), mathext.CompleteE(k2)
	t1, t2 := (2/k-k)*K, 2/k*E
	br := t1 - t2
	return Mu0 * math.Sqrt(a*b) * br, (math.Abs(t1) + t2) / math.Abs(br)
}

// TestMaxwellMutualClosedForm checks MaxwellMutual (series / Fukushima's
// associate integrals) against the K–E form above where that form is well
// conditioned (k² ≥ 0.1). Tolerance: gonum's K and E (Fukushima, J. Comput.
// Appl. Math. 282, 2015) are good to a few ε; their errors are amplified by
// the cancellation factor A in the bracket, so |ΔM/M| ≤ 8ε·A + 16ε (the
// second term for the rounding inside MaxwellMutual itself).
func TestMaxwellMutualClosedForm(t *testing.T) {
	cases := [][3]float64{
		{0.1, 0.1, 0.001}, {0.1, 0.1, 0.02}, {0.1, 0.05, 0.03}, {0.2, 0.05, 0.1},
		{0.05, 0.3, 0.2}, {1, 1, 1}, {0.1, 0.1, 0.3}, {1, 0.9, 0.01},
	}
	for _, c := range cases {
		a, b, d := c[0], c[1], c[2]
		if k2 := 4 * a * b / ((a+b)*(a+b) + d*d); k2 < 0.1 {
			t.Fatalf("case %v: k² = %g is outside the well-conditioned range", c, k2)
		}
		got := MaxwellMutual(a, b, d)
		want, amp := cpMaxwellKE(a, b, d)
		tol := 8*cpEps*amp + 16*cpEps
		if e := cpRel(got, want); e > tol {
			t.Errorf("a=%g b=%g d=%g: MaxwellMutual %.16g, K–E form %.16g (rel %.2g > %.2g)", a, b, d, got, want, e, tol)
		}
		// symmetry in the two radii (the formula is symmetric; tolerance as above)
		if e := cpRel(MaxwellMutual(b, a, d), got); e > 16*cpEps {
			t.Errorf("a=%g b=%g d=%g: M(a,b) ≠ M(b,a) (rel %.2g)", a, b, d, e)
		}
	}
}

// TestMaxwellMutualDipoleLimit: far apart, two coaxial loops couple as
// magnetic dipoles, M → μ0 π a² b² / (2 d³) (e.g. Jackson, Classical
// Electrodynamics, 3rd ed., 1999, §5.6 dipole field on its axis; from
// memory). Expanding Maxwell's series Σ cₙ² n/(n+1) mⁿ in 1/d (done here
// by computer algebra; not a quoted result) gives
//
//	M = M_dip [1 − (3/2)(a²+b²)/d² + (15/8)(a⁴ + 3a²b² + b⁴)/d⁴ − …].
//
// Check 1: the relative deviation from M_dip equals the first correction
// within 2× the d⁻⁴ term. Check 2: with the first two corrections, within
// 2× the d⁻⁶ term (35a⁶ + 210a⁴b² + 210a²b⁴ + 35b⁶)/(16 d⁶) of the same
// expansion. For d ≥ 10 max(a, b) each neglected term is below 4% of the
// one before, so 2× the first neglected term bounds the remainder.
func TestMaxwellMutualDipoleLimit(t *testing.T) {
	for _, c := range [][3]float64{{0.1, 0.1, 1}, {0.1, 0.05, 2}, {0.02, 0.1, 1.5}, {0.1, 0.1, 10}, {0.01, 0.03, 3}} {
		a, b, d := c[0], c[1], c[2]
		a2, b2, d2 := a*a, b*b, d*d
		m := MaxwellMutual(a, b, d)
		dip := Mu0 * math.Pi * a2 * b2 / (2 * d * d2)
		c1 := -1.5 * (a2 + b2) / d2
		c2 := 15.0 / 8 * (a2*a2 + 3*a2*b2 + b2*b2) / (d2 * d2)
		c3 := (35*a2*a2*a2 + 210*a2*a2*b2 + 210*a2*b2*b2 + 35*b2*b2*b2) / (16 * d2 * d2 * d2)
		dev := m/dip - 1
		if e := math.Abs(dev - c1); e > 2*c2+1e-15 {
			t.Errorf("a=%g b=%g d=%g: M/M_dip − 1 = %.6g, first correction %.6g (diff %.2g > %.2g)", a, b, d, dev, c1, e, 2*c2)
		}
		if e := math.Abs(dev - c1 - c2); e > 2*c3+1e-15 {
			t.Errorf("a=%g b=%g d=%g: M/M_dip − 1 = %.10g, two corrections %.10g (diff %.2g > %.2g)", a, b, d, dev, c1+c2, e, 2*c3)
		}
		t.Logf("a=%g b=%g d=%g: M/M_dip − 1 = %.4g (first correction %.4g, residual after two %.2g)", a, b, d, dev, c1, dev-c1-c2)
	}
}

// TestMutualNeumannVsMaxwell: the general route (Neumann's double integral
// as ∮A₁·dl₂ with adaptive quadrature, NoFastPath) must reproduce
// Maxwell's formula for coaxial circles, whether circle 1 is one whole
// circle (complete-elliptic A) or four quarter arcs (incomplete-elliptic
// or numerical A), for close and far pairs, and for copies of each pair
// rotated and moved together (M is invariant). Tolerance 1e-9 relative:
// the quadrature is asked for 1e-10 (DefaultTol), the closed forms are good
// to ~1e-13; a factor 10 covers the error estimate being optimistic.
func TestMutualNeumannVsMaxwell(t *testing.T) {
	cases := [][3]float64{
		{0.1, 0.1, 0.001}, // close: 1 mm apart, k² ≈ 1 − 2.5e-5
		{0.1, 0.1, 0.02},
		{0.1, 0.2, 0.05},
		{0.3, 0.01, 0.1},
		{0.1, 0.05, 2}, // far: dipole regime
	}
	rot := cpRotation(Vec{X: 1, Y: 2, Z: -0.5}, 0.7)
	origin, shift := Vec{X: 0.03, Y: -0.01, Z: 0.02}, Vec{X: -0.4, Y: 0.25, Z: 1.1}
	opt := MutualOptions{NoFastPath: true}
	for _, c := range cases {
		a, b, d := c[0], c[1], c[2]
		want := MaxwellMutual(a, b, d)
		z := Vec{Z: 1}
		c1 := Path{Prims: []Prim{cpMust(t)(NewCircle(Vec{}, z, a))}}
		c2 := Path{Prims: []Prim{cpMust(t)(NewCircle(Vec{Z: d}, z, b))}}
		arcs1 := cpQuarterArcs(t, Vec{}, z, a)
		for _, v := range []struct {
			name   string
			p1, p2 Path
		}{
			{"circles", c1, c2},
			{"tilted circles", cpMove(c1, rot, origin, shift), cpMove(c2, rot, origin, shift)},
			{"quarter arcs", arcs1, c2},
			{"tilted quarter arcs", cpMove(arcs1, rot, origin, shift), cpMove(c2, rot, origin, shift)},
		} {
			got, err := Mutual(v.p1, v.p2, opt)
			if err != nil {
				t.Errorf("a=%g b=%g d=%g %s: %v", a, b, d, v.name, err)
				continue
			}
			if e := cpRel(got, want); e > 1e-9 {
				t.Errorf("a=%g b=%g d=%g %s: Neumann %.15g, Maxwell %.15g (rel %.2g > 1e-9)", a, b, d, v.name, got, want, e)
			} else {
				t.Logf("a=%g b=%g d=%g %s: rel %.2g", a, b, d, v.name, e)
			}
		}
		// the fast path must recognise the tilted pair as coaxial (result =
		// Maxwell up to the rounding of the recovered distance, ~1e-15 relative;
		// tolerance 1e-12) and give −M when one circle is reversed.
		t1, t2 := cpMove(c1, rot, origin, shift), cpMove(c2, rot, origin, shift)
		fast, err := Mutual(t1, t2, MutualOptions{})
		if err != nil || cpRel(fast, want) > 1e-12 {
			t.Errorf("a=%g b=%g d=%g tilted, fast path: %.15g, %v; Maxwell %.15g", a, b, d, fast, err, want)
		}
		rev, err := Mutual(t1, t2.Reversed(), MutualOptions{})
		if err != nil || cpRel(rev, -want) > 1e-12 {
			t.Errorf("a=%g b=%g d=%g tilted, one reversed: %.15g, %v; want %.15g", a, b, d, rev, err, -want)
		}
	}
}

// TestFluxBothWays: Stokes' theorem, ∮A·dl = ∫B·dS, for several sources
// and receiving loops; the two sides share no code beyond the source's
// closed forms (A and B are different formulas; the line and surface
// quadratures are different routines). Also reciprocity M12 = M21
// (Neumann's formula is symmetric; e.g. Jackson, 3rd ed., 1999, §5.17,
// from memory). Tolerance 2e-9 relative: each of the two values is asked
// for 1e-10; a factor 10 on each for optimistic error estimates.
func TestFluxBothWays(t *testing.T) {
	z := Vec{Z: 1}
	square := cpPolygon(t, Vec{X: -0.1, Y: -0.1}, Vec{X: 0.1, Y: -0.1}, Vec{X: 0.1, Y: 0.1}, Vec{X: -0.1, Y: 0.1})
	circle := Path{Prims: []Prim{cpMust(t)(NewCircle(Vec{X: 0.01}, Vec{X: 0.1, Z: 1}, 0.1))}}
	helix := Path{Prims: []Prim{cpMust(t)(NewHelix(Vec{Z: -0.05}, z, 0.02, 0.1, 5))}}

	// receiving loops: a tilted circle, a tilted rectangle and an
	// L-shaped (non-convex) hexagon; none is crossed by a source wire.
	recvC, recvAxis, recvR := Vec{X: 0.02, Y: 0.01, Z: 0.09}, Vec{X: 0.2, Y: -0.1, Z: 1}, 0.05
	circleLoop := Path{Prims: []Prim{cpMust(t)(NewCircle(recvC, recvAxis, recvR))}}
	disk, err := NewDisk(recvC, recvAxis, recvR)
	if err != nil {
		t.Fatal(err)
	}
	rc, rs1, rs2 := Vec{X: -0.05, Y: -0.03, Z: 0.12}, Vec{X: 0.15, Z: 0.02}, Vec{Y: 0.08, Z: -0.01}
	rectLoop := cpRect(t, rc, rs1, rs2)
	rect, err := NewRectSurface(rc, rs1, rs2)
	if err != nil {
		t.Fatal(err)
	}
	// L shape in the plane z = 0.1 (sides 2,1,1,1,1,2 × 0.04 m)
	u := 0.04
	lz := 0.1
	lLoop := cpPolygon(t, Vec{X: -u, Y: -u, Z: lz}, Vec{X: u, Y: -u, Z: lz}, Vec{X: u, Y: 0, Z: lz},
		Vec{X: 0, Y: 0, Z: lz}, Vec{X: 0, Y: u, Z: lz}, Vec{X: -u, Y: u, Z: lz})
	lSurf, err := NewSpanned(lLoop)
	if err != nil {
		t.Fatal(err)
	}
	tol := Tol{Rel: 1e-10}
	for _, src := range []struct {
		name string
		p    Path
	}{{"square", square}, {"circle", circle}, {"helix", helix}} {
		for _, rcv := range []struct {
			name string
			loop Path
			surf Surface
		}{{"circle/disk", circleLoop, disk}, {"rectangle", rectLoop, rect}, {"L-hexagon/spanned", lLoop, lSurf}} {
			srcs := []Source{{Path: src.p, I: 2.5}}
			fl, err := FluxThroughLoop(srcs, rcv.loop, tol)
			if err != nil {
				t.Errorf("%s → %s: loop: %v", src.name, rcv.name, err)
				continue
			}
			fs, err := FluxThroughSurface(srcs, rcv.surf, tol)
			if err != nil {
				t.Errorf("%s → %s: surface: %v", src.name, rcv.name, err)
				continue
			}
			if e := cpRel(fs, fl); e > 2e-9 {
				t.Errorf("%s → %s: ∮A·dl = %.15g, ∫B·dS = %.15g (rel %.2g > 2e-9)", src.name, rcv.name, fl, fs, e)
			} else {
				t.Logf("%s → %s: Φ = %.6g Wb, rel %.2g", src.name, rcv.name, fl, e)
			}
			m12, err1 := Mutual(src.p, rcv.loop, MutualOptions{Tol: tol})
			m21, err2 := Mutual(rcv.loop, src.p, MutualOptions{Tol: tol})
			if err1 != nil || err2 != nil {
				t.Errorf("%s ↔ %s: %v %v", src.name, rcv.name, err1, err2)
				continue
			}
			if e := cpRel(m12, m21); e > 2e-9 {
				t.Errorf("%s ↔ %s: M12 = %.15g, M21 = %.15g (rel %.2g > 2e-9)", src.name, rcv.name, m12, m21, e)
			}
			// and M = Φ/I (FluxThroughLoop and Mutual are the same integral;
			// tolerance as above)
			if e := cpRel(m12, fl/2.5); e > 2e-9 {
				t.Errorf("%s → %s: M = %.15g, Φ/I = %.15g", src.name, rcv.name, m12, fl/2.5)
			}
		}
	}
}

// TestSolenoidInterior: the field at the centre of a finite solenoid of
// length L, radius R, n turns per metre is μ0 n I · L/√(L² + 4R²) (the
// on-axis current-sheet formula, e.g. Griffiths, Introduction to
// Electrodynamics, 4th ed., 2017, Problem 5.11 (problem number from
// memory); → μ0 n I, Example 5.9, as L/R → ∞). On the axis only the azimuthally averaged current counts
// toward B_z, and the averaged current of a helix of N whole turns is
// exactly the uniform sheet n I, so the helix must agree to quadrature
// accuracy: tolerance 1e-10 (field integral asked 1e-12; ×100 margin for
// the sum over 4000 quarter-turn pieces). N coaxial rings at the
// mid-points of N equal slices are the midpoint rule of the sheet: by
// Euler–Maclaurin the error is ≈ (p/24)·2|f′(L/2)| ≈ 2p²R²/L⁴ relative
// (f the single-ring axial field), 2e-10 here; tolerance 1e-9.
// Off axis (ρ = R/2) the reference is still the on-axis value: the ends'
// leakage field changes across the bore by (2R²/L²)(6ρ²/L²) ≈ 3e-8, and the
// discreteness ripple falls off as 2 exp(−2π(R − ρ)/p) ≈ 5e-14; tolerance
// 3 × their sum.
func TestSolenoidInterior(t *testing.T) {
	const (
		R  = 0.01
		L  = 1.0 // L/R = 100
		N  = 1000
		I  = 1.5
		n  = N / L
		p  = L / N
		cz = L / 2
	)
	want := Mu0 * n * I * L / math.Sqrt(L*L+4*R*R)
	t.Logf("finite-length factor L/√(L²+4R²) − 1 = %.3g (the infinite-solenoid μ0nI is off by this)", want/(Mu0*n*I)-1)
	helix := Path{Prims: []Prim{cpMust(t)(NewHelix(Vec{}, Vec{Z: 1}, R, L, N))}}
	var rings Path
	for i := range N {
		rings.Prims = append(rings.Prims, cpMust(t)(NewCircle(Vec{Z: (float64(i) + 0.5) * p}, Vec{Z: 1}, R)))
	}
	rho := R / 2
	offTol := 3 * ((2*R*R/(L*L))*(6*rho*rho/(L*L)) + 2*math.Exp(-2*math.Pi*(R-rho)/p))
	for _, c := range []struct {
		name          string
		p             Path
		onTol, offTol float64
	}{{"helix", helix, 1e-10, offTol + 1e-10}, {"rings", rings, 1e-9, offTol + 1e-9}} {
		srcs := []Source{{Path: c.p, I: I}}
		b, err := FieldAt(FieldB, srcs, Vec{Z: cz})
		if err != nil {
			t.Fatal(err)
		}
		if e := cpRel(b.Z, want); e > c.onTol {
			t.Errorf("%s: B_z at the centre %.15g T, sheet formula %.15g (rel %.2g > %.2g)", c.name, b.Z, want, e, c.onTol)
		}
		t.Logf("%s: centre rel %.2g; transverse |B⊥|/B_z = %.2g", c.name, cpRel(b.Z, want), math.Hypot(b.X, b.Y)/b.Z)
		bo, err := FieldAt(FieldB, srcs, Vec{X: rho * math.Cos(0.3), Y: rho * math.Sin(0.3), Z: cz})
		if err != nil {
			t.Fatal(err)
		}
		if e := cpRel(bo.Z, want); e > c.offTol {
			t.Errorf("%s: B_z at ρ=R/2 %.15g T, formula %.15g (rel %.2g > %.2g)", c.name, bo.Z, want, e, c.offTol)
		}
		t.Logf("%s: ρ=R/2 rel %.2g", c.name, cpRel(bo.Z, want))
	}
}

// TestToroid: N rectangular turns in meridian planes on a core r1 < r < r2,
// |z| < h/2 give B = μ0 N I/(2π r) φ̂ inside and 0 outside (Griffiths, 4th
// ed., 2017, Example 5.10). Tolerance: on each face of the core the winding
// is a comb of wires, whose current is the uniform sheet plus harmonics of
// relative amplitude 2 (Fourier series of a comb) in N φ; the harmonic's
// field decays away from the face as the matching harmonic solution of
// Laplace's equation: (r_<⁄r_>)^N from the cylindrical faces r1, r2 (2-D
// in the r–φ plane) and, in the planar approximation, exp(−N|z − z_face|/r)
// from the flat faces. Bound: the sum of 2× these four factors, relative to
// μ0NI/2πr inside and to the largest interior field μ0NI/2πr1 outside;
// plus 1e-12 for rounding over 4N closed-form segment fields.
func TestToroid(t *testing.T) {
	const (
		N  = 120
		r1 = 0.05
		r2 = 0.08
		h  = 0.03
		I  = 2.0
	)
	var coil Path
	for i := range N {
		phi := 2 * math.Pi * float64(i) / N
		er := Vec{X: math.Cos(phi), Y: math.Sin(phi)}
		at := func(r, z float64) Vec { return r3.Add(r3.Scale(r, er), Vec{Z: z}) }
		// up the inner face, out along the top, down the outer face, back
		// along the bottom: the turn's normal is +φ̂.
		coil.Prims = append(coil.Prims, cpPolygon(t, at(r1, -h/2), at(r1, h/2), at(r2, h/2), at(r2, -h/2)).Prims...)
	}
	srcs := []Source{{Path: coil, I: I}}
	ripple := func(r, z float64) float64 {
		cyl := func(rf float64) float64 { return math.Pow(math.Min(r, rf)/math.Max(r, rf), N) }
		e := 2*cyl(r1) + 2*cyl(r2)
		e += 2 * math.Exp(-N*math.Abs(h/2-z)/r)
		e += 2 * math.Exp(-N*math.Abs(h/2+z)/r)
		return e
	}
	inside := [][3]float64{ // r, z, φ
		{0.065, 0, 0}, {0.065, 0, math.Pi / N}, {0.06, 0.004, 1}, {0.07, -0.005, 2.5}, {0.057, 0.003, 4},
	}
	for _, q := range inside {
		r, z, phi := q[0], q[1], q[2]
		x := Vec{X: r * math.Cos(phi), Y: r * math.Sin(phi), Z: z}
		b, err := FieldAt(FieldB, srcs, x)
		if err != nil {
			t.Fatal(err)
		}
		mag := Mu0 * N * I / (2 * math.Pi * r)
		want := r3.Scale(mag, Vec{X: -math.Sin(phi), Y: math.Cos(phi)})
		tol := ripple(r, z) + 1e-12
		if e := r3.Norm(r3.Sub(b, want)) / mag; e > tol {
			t.Errorf("inside r=%g z=%g φ=%g: B = %v, want %v (rel %.2g > %.2g)", r, z, phi, b, want, e, tol)
		} else {
			t.Logf("inside r=%g z=%g φ=%g: rel %.2g (bound %.2g)", r, z, phi, e, tol)
		}
	}
	bRef := Mu0 * N * I / (2 * math.Pi * r1) // the largest interior field
	outside := [][3]float64{{0, 0, 0}, {0.03, 0, 0.2}, {0.065, 0.04, 1}, {0.11, -0.01, 3}, {0.5, 0.3, 2}}
	for _, q := range outside {
		r, z, phi := q[0], q[1], q[2]
		x := Vec{X: r * math.Cos(phi), Y: r * math.Sin(phi), Z: z}
		b, err := FieldAt(FieldB, srcs, x)
		if err != nil {
			t.Fatal(err)
		}
		tol := ripple(r, z) + 1e-12
		if e := r3.Norm(b) / bRef; e > tol {
			t.Errorf("outside r=%g z=%g: |B| = %.3g T = %.2g of the interior field (> %.2g)", r, z, r3.Norm(b), e, tol)
		} else {
			t.Logf("outside r=%g z=%g: |B|/B_in = %.2g", r, z, e)
		}
	}
}

// TestLoopSelfInductance: a circular loop of round wire (radius a, uniform
// current) has L = μ0 R (ln(8R/a) − 7/4) to leading order (Grover,
// Inductance Calculations, 1946; Jackson, 3rd ed., 1999, Problem 5.34;
// from memory). The next terms, μ0R[(a²/8R²) ln(8R/a) + a²/24R²] (checked
// against an independent quadrature in TestRingUniformCurrent), are below
// (a/R)²(ln(8R/a) + 1) in units of μ0R; tolerance that divided by the
// leading value, plus 1e-9.
func TestLoopSelfInductance(t *testing.T) {
	const R = 0.1
	for _, ar := range []float64{1e-2, 1e-3, 1e-4} {
		a := ar * R
		loop := Path{Prims: []Prim{cpMust(t)(NewCircle(Vec{X: 0.3}, Vec{X: 1, Y: 1}, R))}}
		got, err := SelfInductance(loop, a, Tol{})
		if err != nil {
			t.Fatal(err)
		}
		lg := math.Log(8 * R / a)
		want := Mu0 * R * (lg - 1.75)
		tol := ar*ar*(lg+1)/(lg-1.75) + 1e-9
		if e := cpRel(got, want); e > tol {
			t.Errorf("a/R=%g: L = %.12g H, formula %.12g (rel %.2g > %.2g)", ar, got, want, e, tol)
		} else {
			t.Logf("a/R=%g: L = %.6g H, rel %.2g (bound %.2g)", ar, got, e, tol)
		}
	}
}

// TestSelfInductanceSplitLoop: cutting a path into more pieces must not
// change its inductance. SelfInductance uses the reduced kernel
// 1/√(d² + a²) within an arc and between arcs that meet, the kernel
// averaged over the wire's section between straight pieces that meet (in
// line: exactly), and the exact 1/d between pieces that do not; so the
// split and whole paths differ only in pairs of points on non-touching
// pieces, at distances d ≥ ℓ/2 or so (ℓ the radius or side), where the
// kernels differ by the factor
// 1 − √(1 + a²/d²)⁻¹ ≤ a²/2d² ≤ 2(a/ℓ)². Tolerance 2(a/ℓ)² relative, plus
// 2e-9 for the quadratures (asked 1e-10). Cases: a circle as four quarter
// arcs; a square with one side split into two collinear halves; a regular
// hexagon (120° corners) with every side split in two.
func TestSelfInductanceSplitLoop(t *testing.T) {
	const R, side = 0.1, 0.1
	circle := Path{Prims: []Prim{cpMust(t)(NewCircle(Vec{}, Vec{Z: 1}, R))}}
	square := cpPolygon(t, Vec{}, Vec{X: side}, Vec{X: side, Y: side}, Vec{Y: side})
	squareSplit := cpPolygon(t, Vec{}, Vec{X: side / 2}, Vec{X: side}, Vec{X: side, Y: side}, Vec{Y: side})
	var hex, hexSplit []Vec
	for k := range 6 {
		s0, c0 := math.Sincos(float64(k) * math.Pi / 3)
		s1, c1 := math.Sincos(float64(k+1) * math.Pi / 3)
		v0 := Vec{X: side * c0, Y: side * s0}
		hex = append(hex, v0)
		hexSplit = append(hexSplit, v0, r3.Scale(0.5, r3.Add(v0, Vec{X: side * c1, Y: side * s1})))
	}
	for _, ar := range []float64{1e-2, 1e-3} {
		for _, k := range []struct {
			name         string
			whole, split Path
			ell          float64
		}{
			{"circle as 4 arcs", circle, cpQuarterArcs(t, Vec{}, Vec{Z: 1}, R), R},
			{"square, one side in 2", square, squareSplit, side},
			{"hexagon, sides in 2", cpPolygon(t, hex...), cpPolygon(t, hexSplit...), side},
		} {
			a := ar * k.ell
			lw, err := SelfInductance(k.whole, a, Tol{})
			if err != nil {
				t.Errorf("%s a/ℓ=%g: whole: %v", k.name, ar, err)
				continue
			}
			ls, err := SelfInductance(k.split, a, Tol{})
			if err != nil {
				t.Errorf("%s a/ℓ=%g: split: %v (L of the whole path: %.6g H)", k.name, ar, err, lw)
				continue
			}
			tol := 2*ar*ar + 2e-9
			if e := cpRel(ls, lw); e > tol {
				t.Errorf("%s a/ℓ=%g: L(split) = %.12g H, L(whole) = %.12g H (rel %.2g > %.2g)", k.name, ar, ls, lw, e, tol)
			} else {
				t.Logf("%s a/ℓ=%g: L = %.6g H, split rel %.2g (bound %.2g)", k.name, ar, lw, e, tol)
			}
		}
	}
}

// cpNagaoka is Nagaoka's coefficient of a current sheet of radius r and
// length l (H. Nagaoka, "The inductance coefficients of solenoids",
// J. Coll. Sci. Tokyo 27, 1909; from memory):
//
//	K_N = 4/(3π k′) [ (k′²/k²)(K − E) + E − k ],  k² = 4r²/(4r² + l²)
//
// with L_sheet = K_N μ0 π r² N² / l.
func cpNagaoka(r, l float64) float64 {
	k2 := 4 * r * r / (4*r*r + l*l)
	k, kp2 := math.Sqrt(k2), 1-k2
	K, E := mathext.CompleteK(k2), mathext.CompleteE(k2)
	return 4 / (3 * math.Pi * math.Sqrt(kp2)) * (kp2/k2*(K-E) + E - k)
}

// cpWheeler is Wheeler's formula L = r²N²/(9r + 10l) µH with r, l in
// inches (H. A. Wheeler, "Simple inductance formulas for radio coils",
// Proc. IRE 16, 1928), here in SI units.
func cpWheeler(r, l float64, n int) float64 {
	const inch = 0.0254
	ri, li := r/inch, l/inch
	return 1e-6 * ri * ri * float64(n*n) / (9*ri + 10*li)
}

// cpRosa is Rosa's correction from a current sheet to a single-layer coil
// of N turns of round wire of diameter dw at pitch p (E. B. Rosa,
// "Calculation of the self-inductance of single-layer coils", Bull.
// Bureau of Standards 2, 1906; from memory): L = L_sheet − μ0 r N (A + B),
// computed here from the definitions rather than Rosa's tables:
// A = 5/4 − ln(2p/dw) is the self-inductance difference of a turn of round
// wire (geometric mean distance (dw/2)e^{−1/4}) and a strip of width p
// (GMD p·e^{−3/2}); B = (2/N) Σⱼ (N − j) ln(j p / gⱼ) is the mutual
// difference of filaments j pitches apart and strips, gⱼ the GMD of two
// coplanar strips of width p whose centres are j p apart:
// ln(gⱼ/p) = ½[(j+1)² ln(j+1) − 2j² ln j + (j−1)² ln(j−1)] − 3/2.
func cpRosa(r, p, dw float64, n int) float64 {
	xl := func(x float64) float64 {
		if x == 0 {
			return 0
		}
		return x * x * math.Log(x)
	}
	A := 1.25 - math.Log(2*p/dw)
	var B float64
	for j := 1; j < n; j++ {
		fj := float64(j)
		lg := 0.5*(xl(fj+1)-2*xl(fj)+xl(fj-1)) - 1.5
		B += float64(n-j) * (math.Log(fj) - lg)
	}
	B *= 2 / float64(n)
	return Mu0 * r * float64(n) * (A + B)
}

// TestNagaokaCoefficient checks cpNagaoka itself: K_N → 1 − 8r/(3π l) for
// l ≫ r (expanding the formula: K − E ≈ (π/4)k², E ≈ π/2 − (π/8)k²; the
// next term is O((r/l)²), so tolerance 2(r/l)²), and K_N = 0.6884 at l = 2r
// (Nagaoka's table, from memory; 4 digits given: tolerance 1e-4).
func TestNagaokaCoefficient(t *testing.T) {
	for _, lr := range []float64{100, 1e3, 1e4} {
		kn := cpNagaoka(1, lr)
		want := 1 - 8/(3*math.Pi*lr)
		if e := math.Abs(kn - want); e > 2/(lr*lr) {
			t.Errorf("l/r=%g: K_N = %.10g, long-coil limit %.10g", lr, kn, want)
		}
	}
	if kn := cpNagaoka(1, 2); math.Abs(kn-0.6884) > 1e-4 {
		t.Errorf("l = 2r: K_N = %.6g, table 0.6884", kn)
	}
}

// TestHelixInductance: SelfInductance of single-layer helical coils
// (r = 1 cm, pitch p = 0.5 mm, N = 50, 100, 200 so l/r = 2.5, 5, 10) against
//
//   - Nagaoka's sheet with Rosa's correction, L_ref = K_N μ0π r²N²/l −
//     μ0 r N (A + B). Neglected by the reference: the helix's axial current
//     (≈ the inductance of a tube of length l, bounded by μ0 l/2π · ln(2l/r))
//     and the remainder of Rosa's ring-by-ring approximation (close-ring
//     mutual inductances, relative corrections (jp/r)² on ln(gⱼ/jp) ≈
//     1/12j², summing to ≲ μ0 l/6). Tolerance: the sum of these over L_ref,
//     plus 1e-9 for the quadrature.
//   - Wheeler's formula, which approximates the sheet to about 1% for
//     l > 0.8 r (Wheeler 1928): the helix's sheet-equivalent
//     L + μ0 r N (A + B) must agree to 1% plus the tolerance above.
//
// Two wire sizes: d_w = 0.2 p (well spaced) and d_w = 0.9 p (close-wound).
func TestHelixInductance(t *testing.T) {
	const (
		r = 0.01
		p = 0.5e-3
	)
	for _, n := range []int{50, 100, 200} {
		l := float64(n) * p
		helix := Path{Prims: []Prim{cpMust(t)(NewHelix(Vec{}, Vec{Z: 1}, r, l, float64(n)))}}
		sheet := cpNagaoka(r, l) * Mu0 * math.Pi * r * r * float64(n*n) / l
		wh := cpWheeler(r, l, n)
		t.Logf("N=%d l/r=%g: Wheeler/Nagaoka − 1 = %.3g%%", n, l/r, 100*(wh/sheet-1))
		if e := cpRel(wh, sheet); e > 0.01 {
			t.Errorf("N=%d: Wheeler %.6g H vs Nagaoka sheet %.6g H (%.2g > 1%%)", n, wh, sheet, e)
		}
		for _, ratio := range []float64{0.2, 0.9} {
			dw := ratio * p
			got, err := SelfInductance(helix, dw/2, Tol{})
			if err != nil {
				t.Fatal(err)
			}
			rosa := cpRosa(r, p, dw, n)
			ref := sheet - rosa
			tol := (Mu0*l/(2*math.Pi)*math.Log(2*l/r)+Mu0*l/6)/ref + 1e-9
			e := cpRel(got, ref)
			// for diagnosis only: a reduced kernel 1/√(d² + a²) applied
			// between turns j pitches apart would lower each mutual by about
			// (μ0 r/2) ln(1 + a²/(jp)²) below the exact round-wire value
			// (that of filaments on the wire axes, as d ≥ 2a).
			var deficit float64
			for j := 1; j < n; j++ {
				x := dw / 2 / (float64(j) * p)
				deficit += float64(n-j) * math.Log1p(x*x)
			}
			deficit *= Mu0 * r
			if e > tol {
				t.Errorf("N=%d d_w/p=%g: L = %.6g H, Nagaoka−Rosa %.6g H (rel %+.3g%% > %.2g%%); "+
					"a reduced kernel between turns would account for −%.3g%% (residual after it %+.2g%%)",
					n, ratio, got, ref, 100*(got/ref-1), 100*tol, 100*deficit/ref, 100*((got+deficit)/ref-1))
			} else {
				t.Logf("N=%d d_w/p=%g: L = %.6g H, Nagaoka−Rosa %.6g H (Rosa term μ0rN(A+B) = %.3g%% of the sheet): rel %+.3g%% (bound %.2g%%)",
					n, ratio, got, ref, 100*rosa/sheet, 100*(got/ref-1), 100*tol)
			}
			sheetEq := got + rosa
			if e := cpRel(sheetEq, wh); e > 0.01+tol {
				t.Errorf("N=%d d_w/p=%g: helix sheet-equivalent %.6g H vs Wheeler %.6g H (%.2g%%)", n, ratio, sheetEq, wh, 100*e)
			} else {
				t.Logf("N=%d d_w/p=%g: Wheeler vs helix sheet-equivalent %+.3g%% (vs the helix itself %+.3g%%)",
					n, ratio, 100*(wh/sheetEq-1), 100*(wh/got-1))
			}
		}
	}
}

// TestWireRampEMF: a w × h rectangle in the plane of a long straight wire,
// its near side s from the wire, links Φ = (μ0 I h/2π) ln((s + w)/s)
// (the standard log formula for an infinite wire, e.g. Griffiths, 4th ed.,
// 2017, Problem 7.7-type), so a current ramping at dI/dt induces
// EMF = −(dI/dt) μ0 h/(2π) ln((s + w)/s). The wire is a segment 1000× the
// loop; its field is short of the infinite wire's by the factor
// ½[(Λ−z)/√((Λ−z)²+x²) + (Λ+z)/√((Λ+z)²+x²)] ≥ 1 − x²/(2(Λ−h/2)²) (Λ the
// half-length; Griffiths eq. 5.37), so the tolerance against the log
// formula is (s+w)²/(2(Λ−h/2)²) plus 2e-9 for quadrature. Against the exact
// flux of the finite segment (A_z = μ0/4π [asinh((Λ−z)/x) + asinh((Λ+z)/x)]
// integrated in closed form, ∫asinh(u/x)du = u asinh(u/x) − √(u²+x²)) the
// tolerance is quadrature only, 2e-9.
func TestWireRampEMF(t *testing.T) {
	const (
		w, h, s = 0.1, 0.2, 0.05
		dIdt    = 50.0 // A/s
	)
	span := 1000 * math.Max(h, s+w)
	lam := span / 2
	wire := Path{Prims: []Prim{cpMust(t)(NewSegment(Vec{Z: -lam}, Vec{Z: lam}))}}
	// normal ẑ × x̂ = +ŷ, the direction of the wire's B at y = 0, x > 0
	loop := cpRect(t, Vec{X: s, Z: -h / 2}, Vec{Z: h}, Vec{X: w})
	tol := Tol{Rel: 1e-10}
	m, err := FluxThroughLoop([]Source{{Path: wire, I: 1}}, loop, tol)
	if err != nil {
		t.Fatal(err)
	}
	emf := -dIdt * m
	ideal := -dIdt * Mu0 * h / (2 * math.Pi) * math.Log((s+w)/s)
	finTol := (s+w)*(s+w)/(2*(lam-h/2)*(lam-h/2)) + 2e-9
	if e := cpRel(emf, ideal); e > finTol {
		t.Errorf("EMF %.12g V, infinite-wire formula %.12g V (rel %.2g > %.2g)", emf, ideal, e, finTol)
	}
	G := func(u, x float64) float64 { return u*math.Asinh(u/x) - math.Hypot(u, x) }
	F := func(x float64) float64 { return 2 * (G(lam+h/2, x) - G(lam-h/2, x)) }
	exact := Mu0 / (4 * math.Pi) * (F(s) - F(s+w))
	if e := cpRel(m, exact); e > 2e-9 {
		t.Errorf("finite wire: flux per ampere %.15g, closed form %.15g (rel %.2g)", m, exact, e)
	}
	t.Logf("EMF = %.6g V at %g A/s; vs infinite wire rel %.2g (finite-length bound %.2g); vs exact finite segment rel %.2g",
		emf, dIdt, cpRel(emf, ideal), finTol, cpRel(m, exact))
	if emf >= 0 {
		t.Errorf("rising current along +z must drive the EMF against the +ŷ circulation: got %g", emf)
	}
}

// cpRichardson differentiates by central differences D(h) = (f(x+h) −
// f(x−h))/2h with one Richardson step, R(h) = (4D(h) − D(2h))/3, whose
// error is O(h⁴); it returns R(h) and the error estimate |R(h) − R(2h)|/15
// (the O(h⁴) terms of R(h) and R(2h) differ by the factor 16).
func cpRichardson(D func(h float64) float64, h float64) (val, errEst float64) {
	d1, d2, d4 := D(h), D(2*h), D(4*h)
	r1, r2 := (4*d1-d2)/3, (4*d2-d4)/3
	return r1, math.Abs(r1-r2) / 15
}

// TestForceCoaxialLoops: the axial force on loop 2 (radius b, plane z = d)
// from loop 1 (radius a, z = 0), currents I1, I2, is F_z = I1 I2 ∂M/∂d
// (virtual work at constant currents; e.g. Jackson, 3rd ed., 1999, §5.16,
// from memory), with M from Maxwell's formula; ∂M/∂d < 0, so parallel
// currents attract. ∂M/∂d by central differences with one Richardson
// step (cpRichardson), h = 1e-3 √((a−b)² + d²); tolerance twice its O(h⁴)
// error estimate, plus the rounding of M (≤ 4ε M each) amplified to
// (4·4εM/h + 4εM/2h)/3 ≤ 8ε M/h, plus 1e-9 for the force quadrature
// (asked 1e-11).
func TestForceCoaxialLoops(t *testing.T) {
	for _, c := range [][3]float64{{0.1, 0.1, 0.02}, {0.1, 0.05, 0.1}, {0.05, 0.2, 0.3}, {0.1, 0.1, 0.002}} {
		a, b, d := c[0], c[1], c[2]
		for _, cur := range [][2]float64{{3, 2}, {3, -2}} {
			i1, i2 := cur[0], cur[1]
			rot := cpRotation(Vec{X: 0.3, Y: 1}, 0.4)
			axis := rot(Vec{Z: 1})
			l1 := Path{Prims: []Prim{cpMust(t)(NewCircle(Vec{}, axis, a))}}
			l2 := Path{Prims: []Prim{cpMust(t)(NewCircle(r3.Scale(d, axis), axis, b))}}
			f, err := Force([]Source{{Path: l1, I: i1}}, l2, i2, Tol{Rel: 1e-11})
			if err != nil {
				t.Fatal(err)
			}
			hh := 1e-3 * math.Hypot(a-b, d)
			D := func(h float64) float64 { return (MaxwellMutual(a, b, d+h) - MaxwellMutual(a, b, d-h)) / (2 * h) }
			dm, dmErr := cpRichardson(D, hh)
			fz := r3.Dot(f, axis)
			want := i1 * i2 * dm
			tol := 2*dmErr/math.Abs(dm) + 8*cpEps*MaxwellMutual(a, b, d)/hh/math.Abs(dm) + 1e-9
			if e := cpRel(fz, want); e > tol {
				t.Errorf("a=%g b=%g d=%g I=%v: F_axial = %.12g N, I1I2 dM/dd = %.12g N (rel %.2g > %.2g)", a, b, d, cur, fz, want, e, tol)
			} else {
				t.Logf("a=%g b=%g d=%g I=%v: F = %.6g N, rel %.2g (bound %.2g)", a, b, d, cur, fz, e, tol)
			}
			if perp := r3.Norm(r3.Sub(f, r3.Scale(fz, axis))); perp > 1e-9*math.Abs(fz) {
				t.Errorf("a=%g b=%g d=%g: transverse force %.3g N (axial %.3g)", a, b, d, perp, fz)
			}
			if attract := fz < 0; attract != (i1*i2 > 0) {
				t.Errorf("a=%g b=%g d=%g I=%v: F_axial = %g: parallel currents must attract, antiparallel repel", a, b, d, cur, fz)
			}
		}
	}
}

// TestSuperpositionAndParallel: B of two sources together is the sum of
// their separate fields (tolerance 64ε times the sum of the magnitudes of
// the per-primitive terms: only the order of summation differs); Fields
// gives bit-identical results for 1, 2 and 7 workers and agrees bit for bit
// with FieldAt; a point on a wire is reported as a *PointError wrapping
// ErrOnWire with the lowest failing index.
func TestSuperpositionAndParallel(t *testing.T) {
	z := Vec{Z: 1}
	square := cpPolygon(t, Vec{X: -0.1, Y: -0.1}, Vec{X: 0.1, Y: -0.1}, Vec{X: 0.1, Y: 0.1}, Vec{X: -0.1, Y: 0.1})
	var other Path
	other.Prims = append(other.Prims, cpMust(t)(NewCircle(Vec{Z: 0.05}, Vec{X: 0.2, Z: 1}, 0.07)))
	other.Prims = append(other.Prims, cpMust(t)(NewHelix(Vec{Z: -0.1}, z, 0.03, 0.04, 2)))
	other.Prims = append(other.Prims, cpMust(t)(NewArc(Vec{Z: 0.2}, Vec{Y: 1}, Vec{X: 0.05, Z: 0.2}, 2)))
	s1 := Source{Path: square, I: 1.7}
	s2 := Source{Path: other, I: -0.6}
	rng := rand.New(rand.NewPCG(1, 2))
	pts := make([]Vec, 3000)
	for i := range pts {
		pts[i] = Vec{X: 0.6*rng.Float64() - 0.3, Y: 0.6*rng.Float64() - 0.3, Z: 0.6*rng.Float64() - 0.3}
	}
	for _, which := range []Which{FieldB, FieldA} {
		prim := PrimB
		if which == FieldA {
			prim = PrimA
		}
		for _, x := range pts[:50] {
			both, err := FieldAt(which, []Source{s1, s2}, x)
			if err != nil {
				t.Fatal(err)
			}
			f1, _ := FieldAt(which, []Source{s1}, x)
			f2, _ := FieldAt(which, []Source{s2}, x)
			var mag float64
			for _, s := range []Source{s1, s2} {
				for _, p := range s.Path.Prims {
					v, _ := prim(p, x)
					mag += math.Abs(s.I) * r3.Norm(v)
				}
			}
			if d := r3.Norm(r3.Sub(both, r3.Add(f1, f2))); d > 64*cpEps*mag {
				t.Errorf("which=%d at %v: together %v, sum %v", which, x, both, r3.Add(f1, f2))
			}
		}
		var ref []Vec
		for _, workers := range []int{1, 2, 7} {
			out := make([]Vec, len(pts))
			if err := Fields(which, []Source{s1, s2}, pts, out, workers, nil, nil); err != nil {
				t.Fatal(err)
			}
			if ref == nil {
				ref = out
				for _, i := range []int{0, 17, 1234, 2999} {
					v, _ := FieldAt(which, []Source{s1, s2}, pts[i])
					if v != out[i] {
						t.Errorf("which=%d point %d: Fields %v, FieldAt %v", which, i, out[i], v)
					}
				}
				continue
			}
			for i := range out {
				if out[i] != ref[i] {
					t.Errorf("which=%d workers=%d point %d: %v, with 1 worker %v", which, workers, i, out[i], ref[i])
					break
				}
			}
		}
	}
	// points on wires at 1234 (a side of the square) and 2500 (the circle)
	bad := append([]Vec(nil), pts...)
	bad[2500] = other.Prims[0].Point(0.3)
	bad[1234] = Vec{X: 0.1, Y: 0.02}
	for _, workers := range []int{1, 2, 7} {
		out := make([]Vec, len(bad))
		err := Fields(FieldB, []Source{s1, s2}, bad, out, workers, nil, nil)
		var pe *PointError
		if !errors.As(err, &pe) || !errors.Is(err, ErrOnWire) || pe.Index != 1234 || pe.Point != bad[1234] {
			t.Errorf("workers=%d: error %v; want a PointError at index 1234 wrapping ErrOnWire", workers, err)
		}
	}
}

// TestMotionalEMF: ∮(v × B)·dl around a rigid loop moving through a
// static field (Griffiths, 4th ed., 2017, §7.1.3, the flux rule; from
// memory).
//
//   - Uniform B: zero for any closed loop (the integrand is constant on
//     each side and the sides sum to zero; tolerance 1e-13 of vBh).
//   - B = B0 ẑ only for x < 0, a w × h loop in z = 0 straddling x = 0,
//     circulating counter-clockwise seen from +z (normal +ẑ): v × B =
//     −vB0ŷ acts only on the left side, traversed along −ŷ, so the EMF is
//     +B0 h v for v = +v x̂ (the loop leaving the field: flux decreasing,
//     EMF = −dΦ/dt > 0) and −B0 h v for v = −v x̂ (entering). The integrand
//     is constant on each side: tolerance 1e-13.
//   - In the field of a circular loop, the motional EMF equals −dΦ/dt of
//     the translating loop, Φ by FluxThroughLoop at displaced positions
//     with central differences of step τ and one Richardson step
//     (cpRichardson): tolerance twice its O(τ⁴) error estimate, plus the
//     flux quadrature error (asked 1e-12, allowed 1e-10) amplified by
//     Φ/(τ·EMF), plus 1e-9 for the EMF quadrature (asked 1e-11).
func TestMotionalEMF(t *testing.T) {
	const (
		w, h = 0.3, 0.2
		B0   = 0.8
		v    = 2.5
	)
	loop := cpRect(t, Vec{X: -w / 2}, Vec{X: w}, Vec{Y: h})
	uniform := func(Vec) (Vec, error) { return Vec{X: 0.1, Y: -0.3, Z: B0}, nil }
	scale := v * B0 * h
	for _, vel := range []Vec{{X: v}, {X: 0.3, Y: -v, Z: 1}} {
		e, err := MotionalEMF(loop, constVel(vel), uniform, Tol{Rel: 1e-12}, scale)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(e) > 1e-13*scale {
			t.Errorf("uniform field, v=%v: EMF %.3g V, want 0", vel, e)
		}
	}
	half := func(x Vec) (Vec, error) {
		if x.X < 0 {
			return Vec{Z: B0}, nil
		}
		return Vec{}, nil
	}
	for _, c := range []struct {
		vx, want float64
	}{{v, B0 * h * v}, {-v, -B0 * h * v}} {
		e, err := MotionalEMF(loop, constVel(Vec{X: c.vx}), half, Tol{Rel: 1e-12}, scale)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(e-c.want) > 1e-13*scale {
			t.Errorf("half-space field, v_x=%g: EMF %.15g V, want %.15g", c.vx, e, c.want)
		}
	}

	src := []Source{{Path: Path{Prims: []Prim{cpMust(t)(NewCircle(Vec{}, Vec{Z: 1}, 0.1))}}, I: 3}}
	x0, s1, s2 := Vec{X: 0.12, Y: 0.03, Z: 0.05}, Vec{X: 0.05, Z: 0.01}, Vec{Y: 0.04, Z: -0.02}
	vel := Vec{X: 0.7, Y: -0.2, Z: 0.4}
	bf := func(x Vec) (Vec, error) { return FieldAt(FieldB, src, x) }
	emf, err := MotionalEMF(cpRect(t, x0, s1, s2), constVel(vel), bf, Tol{Rel: 1e-11}, 1e-6)
	if err != nil {
		t.Fatal(err)
	}
	flux := func(tau float64) float64 {
		f, err := FluxThroughLoop(src, cpRect(t, r3.Add(x0, r3.Scale(tau, vel)), s1, s2), Tol{Rel: 1e-12})
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	tau := 1e-3
	D := func(tt float64) float64 { return -(flux(tt) - flux(-tt)) / (2 * tt) }
	d1, dErr := cpRichardson(D, tau)
	tol := 2*dErr/math.Abs(d1) + 1e-10*math.Abs(flux(0))/tau/math.Abs(d1) + 1e-9
	if e := cpRel(emf, d1); e > tol {
		t.Errorf("loop moving in a circle's field: ∮(v×B)·dl = %.12g V, −dΦ/dt = %.12g V (rel %.2g > %.2g)", emf, d1, e, tol)
	} else {
		t.Logf("moving loop: EMF %.6g V, −dΦ/dt rel %.2g (bound %.2g)", emf, e, tol)
	}
}

// BenchmarkSegmentsPoints: 10⁴ straight segments (a 1000-turn polygonal coil,
// 10 segments a turn) at 10⁴ points through the parallel kernel.
func BenchmarkSegmentsPoints(b *testing.B) {
	const turns, per = 1000, 10
	var coil Path
	for i := range turns * per {
		p := func(k int) Vec {
			phi := 2 * math.Pi * float64(k) / per
			return Vec{X: 0.02 * math.Cos(phi), Y: 0.02 * math.Sin(phi), Z: 1e-4 * float64(k) / per}
		}
		coil.Prims = append(coil.Prims, cpMust(b)(NewSegment(p(i), p(i+1))))
	}
	pts := make([]Vec, 10000)
	for i := range pts {
		pts[i] = Vec{X: 0.05 * math.Cos(float64(i)), Y: 0.05 * math.Sin(float64(i)), Z: 0.2 * float64(i) / float64(len(pts))}
	}
	out := make([]Vec, len(pts))
	srcs := []Source{{Path: coil, I: 1}}
	for b.Loop() {
		if err := Fields(FieldB, srcs, pts, out, 0, nil, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// cpPolyCoil is a coil of turns × per straight segments on a helix.
func cpPolyCoil(tb testing.TB, r, z0, length float64, turns, per int) Path {
	var coil Path
	p := func(k int) Vec {
		phi := 2 * math.Pi * float64(k) / float64(per)
		return Vec{X: r * math.Cos(phi), Y: r * math.Sin(phi), Z: z0 + length*float64(k)/float64(turns*per)}
	}
	for i := range turns * per {
		coil.Prims = append(coil.Prims, cpMust(tb)(NewSegment(p(i), p(i+1))))
	}
	return coil
}

// BenchmarkNeumann1000: mutual inductance of two 1000-segment coils by the
// general Neumann route.
func BenchmarkNeumann1000(b *testing.B) {
	c1 := cpPolyCoil(b, 0.02, 0, 0.02, 10, 100)
	c2 := cpPolyCoil(b, 0.015, 0.03, 0.02, 10, 100)
	for b.Loop() {
		if _, err := Mutual(c1, c2, MutualOptions{NoFastPath: true}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkMaxwellFast: Maxwell's coaxial-circle formula over both of its
// branches (series for k² < 0.5, associate integrals above).
func BenchmarkMaxwellFast(b *testing.B) {
	var sink float64
	for b.Loop() {
		sink += MaxwellMutual(0.1, 0.08, 0.01) + MaxwellMutual(0.1, 0.05, 0.5)
	}
	if math.IsNaN(sink) {
		b.Fatal("NaN")
	}
}

func constVel(v Vec) func(Vec) (Vec, error) { return func(Vec) (Vec, error) { return v, nil } }

// TestMotionalEMFRotating: paths rotating with angular velocity ω about an
// axis through the origin, v(x) = ω × x, in a uniform field.
//
//   - A radial rod from r1 to r2 turning about ẑ in B ẑ (the Faraday disc,
//     Griffiths, Introduction to Electrodynamics, 4th ed., 2017, Ex. 7.4;
//     from memory): EMF = ½Bω(r2² − r1²) from the inner end
//     to the outer, ½BωR² for a rod from the axis to R.
//   - A rectangle of area A (N = 1 and N = 3 turns) with one side along ẑ,
//     turning about ẑ in B x̂, at angle θ between its first side and x̂:
//     its normal s1 × s2 makes Φ = NBA sin θ, so the EMF around it is
//     −dΦ/dt = −NBAω cos θ, peak NBAω (the AC generator; the flux rule of
//     Griffiths, 4th ed., 2017, §7.1.3; from memory).
//
// The integrand (ω × x) × B is linear along each straight piece, which
// the 15-point Kronrod rule integrates exactly: tolerance 1e-13 relative.
func TestMotionalEMFRotating(t *testing.T) {
	const B, omega = 0.8, 120.0
	w := Vec{Z: omega}
	spin := func(x Vec) (Vec, error) { return r3.Cross(w, x), nil }
	uniformZ := func(Vec) (Vec, error) { return Vec{Z: B}, nil }
	for _, c := range []struct{ r1, r2, ang float64 }{{0, 0.15, 0}, {0.02, 0.15, 0.7}, {0.05, 0.3, -2}} {
		s, co := math.Sincos(c.ang)
		rod := Path{Prims: []Prim{cpMust(t)(NewSegment(Vec{X: c.r1 * co, Y: c.r1 * s, Z: 0.01}, Vec{X: c.r2 * co, Y: c.r2 * s, Z: 0.01}))}}
		want := 0.5 * B * omega * (c.r2*c.r2 - c.r1*c.r1)
		e, err := MotionalEMF(rod, spin, uniformZ, Tol{Rel: 1e-12}, want)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(e-want) > 1e-13*want {
			t.Errorf("rod %g..%g m: EMF %.15g V, want ½Bω(r2²−r1²) = %.15g V", c.r1, c.r2, e, want)
		}
	}
	const a, b = 0.04, 0.03
	uniformX := func(Vec) (Vec, error) { return Vec{X: B}, nil }
	for _, n := range []int{1, 3} {
		for _, th := range []float64{0, 0.5, math.Pi / 2, 2.5} {
			s, co := math.Sincos(th)
			s1, s2 := Vec{X: a * co, Y: a * s}, Vec{Z: b}
			x0 := r3.Scale(-0.5, r3.Add(s1, s2))
			one := cpRect(t, x0, s1, s2)
			var loop Path
			for k := 0; k < n; k++ {
				loop.Prims = append(loop.Prims, one.Prims...)
			}
			peak := float64(n) * B * a * b * omega
			want := -peak * co
			e, err := MotionalEMF(loop, spin, uniformX, Tol{Rel: 1e-12}, peak)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(e-want) > 1e-13*peak {
				t.Errorf("N=%d rectangle at θ=%g: EMF %.15g V, want −NBAω cos θ = %.15g V", n, th, e, want)
			}
		}
	}
}

// TestMaxwellMutualDd: the closed-form derivative of Maxwell's formula
// against (1) a central difference of MaxwellMutual itself, with a step
// of 1e-4 of the separation (truncation ~h²·M”'/6, rounding ~eps·M/h:
// both below 1e-7 relative), and (2) the Lorentz force on the second
// circle in the first's field (em.Force, by quadrature of I·dl × B, a
// route that shares no code with the elliptic-integral formula), whose
// axial part is I1·I2·dM/dd (the force on circuit 2 is ∇(M)·I1·I2 at
// constant currents; e.g. Jackson, Classical Electrodynamics, 3rd ed.
// 1999, §5.16). Tolerance 1e-7 for (1), 1e-8 for (2): Force integrates to
// 1e-10.
func TestMaxwellMutualDd(t *testing.T) {
	for _, c := range []struct{ a, b, d float64 }{
		{0.025, 0.02, 0.01}, {0.04, 0.03, 0.002}, {0.01, 0.05, 0.08}, {0.03, 0.03, 0.001}, {0.02, 0.021, 0.3},
	} {
		got := MaxwellMutualDd(c.a, c.b, c.d)
		h := 1e-4 * c.d
		fd := (MaxwellMutual(c.a, c.b, c.d+h) - MaxwellMutual(c.a, c.b, c.d-h)) / (2 * h)
		if math.Abs(got-fd) > 1e-7*math.Abs(fd) {
			t.Errorf("a=%g b=%g d=%g: dM/dd %g, central difference %g", c.a, c.b, c.d, got, fd)
		}
		p1, err := NewCircle(Vec{}, Vec{Z: 1}, c.a)
		if err != nil {
			t.Fatal(err)
		}
		p2, err := NewCircle(Vec{Z: c.d}, Vec{Z: 1}, c.b)
		if err != nil {
			t.Fatal(err)
		}
		f, err := Force([]Source{{Path: Path{Prims: []Prim{p1}}, I: 1}}, Path{Prims: []Prim{p2}}, 1, DefaultTol)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(f.Z-got) > 1e-8*math.Abs(got) {
			t.Errorf("a=%g b=%g d=%g: dM/dd %g, Lorentz force per A² %g", c.a, c.b, c.d, got, f.Z)
		}
	}
}
