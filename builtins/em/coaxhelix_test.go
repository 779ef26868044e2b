package em

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestCoaxialHelicalMaxwell: two coaxial circles, given as arcs of a whole
// turn whose frames are turned and flipped, against Maxwell's formula with
// gonum's K and E (cpMaxwellKE: Maxwell, Treatise, 1873, §701), where that
// form is well conditioned (its amplification of K's and E's errors below
// 50). The arcs stop 2π·1e-11 short of a whole turn (a whole circle would
// take Maxwell's formula itself), which changes M by about 1e-11 of
// itself: tolerance 1e-9.
func TestCoaxialHelicalMaxwell(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	worst := 0.0
	defer func() { t.Logf("worst relative difference %.2g", worst) }()
	for i := 0; i < 40; i++ {
		a, b := 0.01+0.03*rng.Float64(), 0.01+0.03*rng.Float64()
		d := 0.001 + 0.02*rng.Float64()
		want, amp := cpMaxwellKE(a, b, d)
		if amp > 50 {
			continue
		}
		// q's frame turned by a random angle about the axis, and half the
		// time flipped (its current then runs the other way)
		th := 2 * math.Pi * rng.Float64()
		p, err := NewArc(Vec{}, Vec{Z: 1}, Vec{X: a}, 2*math.Pi)
		if err != nil {
			t.Fatal(err)
		}
		axis, sign := Vec{Z: 1}, 1.0
		if i%2 == 1 {
			axis, sign = Vec{Z: -1}, -1
		}
		q, err := NewArc(Vec{Z: d}, axis, Vec{X: b * math.Cos(th), Y: b * math.Sin(th), Z: d}, 2*math.Pi)
		if err != nil {
			t.Fatal(err)
		}
		p.Span, q.Span = 2*math.Pi*(1-1e-11), 2*math.Pi*(1-1e-11) // arcs, not circles: no Maxwell shortcut
		m, ok, err := CoaxialHelicalMutual(p, q, Tol{Rel: 1e-13})
		if !ok || err != nil {
			t.Fatalf("ok %v err %v", ok, err)
		}
		want *= sign * (1 - 1e-11) * (1 - 1e-11) // the arcs' missing sliver, to first order
		e := math.Abs(m/want - 1)
		worst = math.Max(worst, e)
		if e > 1e-9 {
			t.Errorf("a %g b %g d %g flip %v: %.15g vs Maxwell %.15g (rel %.2g)", a, b, d, i%2 == 1, m, want, e)
		}
	}
}

// TestCoaxialHelicalGeneral: pairs of coaxial helices (equal and unequal
// pitches, wound either way, frames turned) and helix–arc pairs against
// the general route (Mutual with NoFastPath: the circulation of the
// numerically integrated vector potential), which shares no code with the
// single integral. Tolerance 1e-8 relative: both are asked for 1e-10.
func TestCoaxialHelicalGeneral(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	for i := 0; i < 12; i++ {
		r1, r2 := 0.01+0.01*rng.Float64(), 0.01+0.01*rng.Float64()
		n1, n2 := 1+rng.IntN(4), 1+rng.IntN(4)
		l1, l2 := 0.002*float64(n1)*(0.5+rng.Float64()), 0.002*float64(n2)*(0.5+rng.Float64())
		p, err := NewHelix(Vec{}, Vec{Z: 1}, r1, l1, float64(n1))
		if err != nil {
			t.Fatal(err)
		}
		axis := Vec{Z: 1}
		if i%3 == 1 {
			axis = Vec{Z: -1}
		}
		var q Prim
		if i%4 == 3 {
			q, err = NewArc(Vec{Z: 0.004}, axis, Vec{X: r2 * 0.6, Y: r2 * 0.8, Z: 0.004}, 4.0)
		} else {
			q, err = NewHelix(Vec{Z: l1 + 0.001 + 0.003*rng.Float64()}, axis, r2, l2, float64(n2))
		}
		if i%5 == 2 {
			q, err = NewHelix(Vec{Z: 0.0005}, Vec{Z: 1}, r1+0.0006, l1, float64(n1)) // a layer over p
		}
		if err != nil {
			t.Fatal(err)
		}
		m, ok, err := CoaxialHelicalMutual(p, q, Tol{Rel: 1e-12})
		if !ok || err != nil {
			t.Fatalf("case %d: ok %v err %v", i, ok, err)
		}
		want, err := Mutual(Path{Prims: []Prim{p}}, Path{Prims: []Prim{q}}, MutualOptions{Tol: Tol{Rel: 1e-11}, NoFastPath: true})
		if err != nil {
			t.Fatal(err)
		}
		if e := math.Abs(m/want - 1); e > 1e-8 {
			t.Errorf("case %d: %.15g vs general route %.15g (rel %.2g)", i, m, want, e)
		} else {
			t.Logf("case %d: rel %.2g", i, e)
		}
	}
}

// TestCoaxialHelicalMixed: Mutual of two small windings (two coaxial
// helices, one wound back over the other, and a radial segment), where
// the helices' pairs take the single integral and the segments the
// potential of the rest with those pairs masked, against the general route
// (NoFastPath) for the whole. Tolerance 1e-8 relative, both asked for
// 1e-10.
func TestCoaxialHelicalMixed(t *testing.T) {
	build := func(z float64) Path {
		h1, err := NewHelix(Vec{Z: z}, Vec{Z: 1}, 0.01, 0.006, 3)
		if err != nil {
			t.Fatal(err)
		}
		h2, err := NewHelix(Vec{Z: z + 0.006}, Vec{Z: -1}, 0.0106, 0.006, 3)
		if err != nil {
			t.Fatal(err)
		}
		sg, err := NewSegment(Vec{X: 0.01, Z: z + 0.006}, Vec{X: 0.0106, Z: z + 0.006})
		if err != nil {
			t.Fatal(err)
		}
		return Path{Prims: []Prim{h1, sg, h2}}
	}
	p1, p2 := build(0), build(0.009)
	fast, err := Mutual(p1, p2, MutualOptions{Tol: Tol{Rel: 1e-11}})
	if err != nil {
		t.Fatal(err)
	}
	slow, err := Mutual(p1, p2, MutualOptions{Tol: Tol{Rel: 1e-11}, NoFastPath: true})
	if err != nil {
		t.Fatal(err)
	}
	if e := math.Abs(fast/slow - 1); e > 1e-8 {
		t.Errorf("%.15g vs general route %.15g (rel %.2g)", fast, slow, e)
	} else {
		t.Logf("rel %.2g", e)
	}
}

// TestCoaxialHelicalManyTurns: two layers of 30 turns wound against each
// other, 1.5 mm apart in radius (at 100 turns, one adaptive run over all
// the turns stopped early on this pair; the integral now goes piece by
// piece), against the general route. Tolerance 1e-8
// relative, both asked for 1e-10.
func TestCoaxialHelicalManyTurns(t *testing.T) {
	c := 0.0005 / (2 * math.Pi)
	p, err := NewHelix(Vec{Z: 0.0075}, Vec{Z: 1}, 0.01275, 0.015, 30)
	if err != nil {
		t.Fatal(err)
	}
	p.Pitch = -c // wound downwards from z = 7.5 mm
	q, err := NewHelix(Vec{Z: -0.0075}, Vec{Z: 1}, 0.01425, 0.015, 30)
	if err != nil {
		t.Fatal(err)
	}
	m, ok, err := CoaxialHelicalMutual(p, q, Tol{Rel: 1e-10})
	if !ok || err != nil {
		t.Fatalf("ok %v err %v", ok, err)
	}
	want, err := Mutual(Path{Prims: []Prim{p}}, Path{Prims: []Prim{q}}, MutualOptions{Tol: Tol{Rel: 1e-10}, NoFastPath: true})
	if err != nil {
		t.Fatal(err)
	}
	if e := math.Abs(m/want - 1); e > 1e-8 {
		t.Errorf("%.15g vs general route %.15g (rel %.2g)", m, want, e)
	} else {
		t.Logf("rel %.2g", e)
	}
}

// TestHelixPieceSymmetry: in a path of a helix and a straight piece that
// do not touch, the self-inductance takes their mutual term as the
// circulation along the helix of the straight piece's potential; it must
// equal L_helix + L_piece + 2M with M the other way round (the helix's
// numerically integrated potential along the piece: Neumann's integral is
// symmetric). Tolerance 1e-9 of M, each asked for 1e-11.
func TestHelixPieceSymmetry(t *testing.T) {
	h, err := NewHelix(Vec{}, Vec{Z: 1}, 0.01, 0.01, 8)
	if err != nil {
		t.Fatal(err)
	}
	s, err := NewSegment(Vec{X: 0.013, Z: -0.002}, Vec{X: 0.02, Y: 0.004, Z: 0.012})
	if err != nil {
		t.Fatal(err)
	}
	tol := Tol{Rel: 1e-11}
	a := 0.0002
	both, err := SelfInductance(Path{Prims: []Prim{h, s}}, a, tol)
	if err != nil {
		t.Fatal(err)
	}
	lh, err := SelfInductance(Path{Prims: []Prim{h}}, a, tol)
	if err != nil {
		t.Fatal(err)
	}
	ls, err := SelfInductance(Path{Prims: []Prim{s}}, a, tol)
	if err != nil {
		t.Fatal(err)
	}
	m, err := Mutual(Path{Prims: []Prim{h}}, Path{Prims: []Prim{s}}, MutualOptions{Tol: tol})
	if err != nil {
		t.Fatal(err)
	}
	// the mutual term the path's inductance holds, against M: the
	// difference of nearly equal sums costs about |L|/|M|·1e-16
	got := (both - lh - ls) / 2
	if e := math.Abs(got/m - 1); e > 1e-9 {
		t.Errorf("mutual term %.15g, M the other way %.15g (rel %.2g)", got, m, e)
	} else {
		t.Logf("mutual term %.12g, rel %.2g", got, e)
	}
}
