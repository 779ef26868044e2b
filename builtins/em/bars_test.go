package em

import (
	"math"
	"testing"
)

// filamentPair is the mutual inductance of two parallel filaments of
// equal length l, side by side at distance d (Rosa, "The self and mutual
// inductances of linear conductors", Bull. Bureau of Standards 4, 1908;
// Grover, Inductance Calculations, 1946, same formula):
// M = μ0/2π [l·asinh(l/d) − √(l² + d²) + d]. Written here from the
// published form, sharing no code with ParallelMutual.
func filamentPair(l, d float64) float64 {
	return Mu0 / (2 * math.Pi) * (l*math.Asinh(l/d) - math.Sqrt(l*l+d*d) + d)
}

func seg(t *testing.T, a, b Vec) Prim {
	t.Helper()
	s, err := NewSegment(a, b)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func relDiff(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(a), math.Abs(b)) }

// TestBarSelfLimits checks Greenhouse's bar formula against the GMD
// method (Maxwell: the self-inductance of a straight conductor is the
// mutual inductance of two filaments its geometric mean distance g
// apart, filamentPair(l, g)) with the GMDs of sections whose GMD is known
// exactly or from tables:
//   - a thin strip of width w: g = w·e^(−3/2) exactly (Maxwell, Treatise,
//     1873, §692; Grover 1946);
//   - a square of side a: g = 0.44705·a (Grover 1946, from memory);
//   - a round wire of radius a (uniform current): g = a·e^(−1/4), so the
//     bar with 0.2235(w + t) = a·e^(−1/4) should match the round wire's
//     μ0/2π·l·[ln(2l/a) − 3/4] (Grover 1946; Rosa 1908).
//
// For l = 1000(w + t) the three routes differ only by the constant of the
// bracket (0.50049 against 0.5 and 0.49826, at most 0.0023 out of a
// bracket of about 8.1) and terms of order (w + t)/l: the tolerance is
// 5e-4.
func TestBarSelfLimits(t *testing.T) {
	const tol = 5e-4
	l := 1.0
	w := l / 1000
	if got, want := BarSelf(l, w, 1e-12*w), filamentPair(l, w*math.Exp(-1.5)); relDiff(got, want) > tol {
		t.Errorf("thin strip: bar %.6g H, GMD route %.6g H (rel %.2g)", got, want, relDiff(got, want))
	}
	a := l / 2000
	if got, want := BarSelf(l, a, a), filamentPair(l, 0.44705*a); relDiff(got, want) > tol {
		t.Errorf("square bar: bar %.6g H, GMD route %.6g H (rel %.2g)", got, want, relDiff(got, want))
	}
	wt, th := 0.7e-3, 0.3e-3
	r := BarGMD(wt, th) * math.Exp(0.25)
	round := Mu0 / (2 * math.Pi) * l * (math.Log(2*l/r) - 0.75)
	if got := BarSelf(l, wt, th); relDiff(got, round) > tol {
		t.Errorf("round-wire limit: bar %.6g H, round wire %.6g H (rel %.2g)", got, round, relDiff(got, round))
	}
	// the same through the Neumann route for round wire (reduced kernel
	// plus internal inductance), which shares no code with BarSelf
	neu, err := SelfInductance(Path{Prims: []Prim{seg(t, Vec{}, Vec{X: l})}}, r, Tol{Rel: 1e-10})
	if err != nil {
		t.Fatal(err)
	}
	if got := BarSelf(l, wt, th); relDiff(got, neu) > tol {
		t.Errorf("round wire by Neumann: bar %.6g H, Neumann %.6g H (rel %.2g)", got, neu, relDiff(got, neu))
	}
}

// TestParallelMutualRosa checks the closed form for parallel pieces
// against Rosa's formula for equal filaments side by side (1908) and,
// for offset, unequal, antiparallel and out-of-plane pairs, against
// Neumann's integral through the vector potential (Mutual), which shares
// no code with it. Rosa's formula is the same function written
// differently: agreement to rounding (1e-12 for d/l ≥ 0.01). The Neumann
// route is asked for 1e-11 relative: tolerance 1e-9.
func TestParallelMutualRosa(t *testing.T) {
	for _, c := range []struct{ l, d float64 }{{1, 0.1}, {1, 0.01}, {0.03, 0.002}, {1, 3}} {
		m, ok, err := ParallelMutual(seg(t, Vec{}, Vec{X: c.l}), seg(t, Vec{Y: c.d}, Vec{X: c.l, Y: c.d}))
		if !ok || err != nil {
			t.Fatal(ok, err)
		}
		if want := filamentPair(c.l, c.d); relDiff(m, want) > 1e-12 {
			t.Errorf("l=%g d=%g: %.15g, Rosa %.15g", c.l, c.d, m, want)
		}
	}
	pairs := [][2]Prim{
		{seg(t, Vec{}, Vec{X: 0.02}), seg(t, Vec{X: 0.005, Y: 0.001}, Vec{X: 0.035, Y: 0.001})},
		{seg(t, Vec{}, Vec{X: 0.02}), seg(t, Vec{X: 0.03, Y: 0.002}, Vec{X: 0.01, Y: 0.002})},
		{seg(t, Vec{}, Vec{X: 0.02}), seg(t, Vec{X: 0.025, Y: 0.001, Z: 0.0016}, Vec{X: 0.04, Y: 0.001, Z: 0.0016})},
		{seg(t, Vec{}, Vec{X: 0.02}), seg(t, Vec{X: 0.03}, Vec{X: 0.05})}, // collinear, apart
	}
	for i, pq := range pairs {
		m, ok, err := ParallelMutual(pq[0], pq[1])
		if !ok || err != nil {
			t.Fatal(i, ok, err)
		}
		want, err := Mutual(Path{Prims: []Prim{pq[0]}}, Path{Prims: []Prim{pq[1]}}, MutualOptions{Tol: Tol{Rel: 1e-11}})
		if err != nil {
			t.Fatal(err)
		}
		if relDiff(m, want) > 1e-9 {
			t.Errorf("pair %d: closed form %.12g, Neumann %.12g", i, m, want)
		}
	}
	if _, _, err := ParallelMutual(seg(t, Vec{}, Vec{X: 1}), seg(t, Vec{X: 0.5}, Vec{X: 2})); err == nil {
		t.Error("overlapping collinear pieces: no error")
	}
}

// TestMeetingFilaments checks the Neumann integral of two straight
// pieces meeting at a point (the corners of hexagonal and octagonal
// spirals, with the logarithmic peak at the joint) against Grover's closed
// form (Inductance Calculations, 1946, filaments meeting at a point; from
// memory): with both pieces directed away from the joint, lengths l and m
// at angle ε and R the distance of their far ends,
// M = μ0/2π·cos ε·[l·atanh(m/(l + R)) + m·atanh(l/(m + R))].
// Asked for 1e-10 relative; tolerance 1e-8 for the peak at the joint.
func TestMeetingFilaments(t *testing.T) {
	for _, c := range []struct{ l, m, deg float64 }{{1, 1, 45}, {0.02, 0.013, 60}, {0.01, 0.03, 120}, {1, 2, 135}} {
		e := c.deg * math.Pi / 180
		p := seg(t, Vec{}, Vec{X: c.l})
		q := seg(t, Vec{}, Vec{X: c.m * math.Cos(e), Y: c.m * math.Sin(e)})
		R := math.Sqrt(c.l*c.l + c.m*c.m - 2*c.l*c.m*math.Cos(e))
		want := Mu0 / (2 * math.Pi) * math.Cos(e) * (c.l*math.Atanh(c.m/(c.l+R)) + c.m*math.Atanh(c.l/(c.m+R)))
		// as in a path: p run towards the joint, then q away from it
		got, err := pairMutual(p.Reversed(), q, Tol{Rel: 1e-10})
		if err != nil {
			t.Fatal(err)
		}
		if relDiff(-got, want) > 1e-8 {
			t.Errorf("%g°: Neumann %.12g, Grover %.12g (rel %.2g)", c.deg, -got, want, relDiff(-got, want))
		}
	}
}

// TestRingByHalves checks the arc terms: a ring of flat trace made of
// two half circles (two GMD self terms and the centre-line mutual of the
// halves) against the GMD method for the whole ring, μ0R[ln(8R/g) − 2]
// (Rosa & Grover, "Formulas and tables for the calculation of mutual and
// self-inductance", Bull. Bureau of Standards 8, 1912; Grover 1946), with
// g = 0.2235(w + t). Splitting the ring replaces the GMD kernel by the
// filament kernel across the two joints, an error of order g/(πR) of the
// bracket's size: with g/R ≈ 0.012 the tolerance is 0.5 %.
func TestRingByHalves(t *testing.T) {
	R, w, th := 0.01, 0.5e-3, 35e-6
	a1, err := NewArc(Vec{}, Vec{Z: 1}, Vec{X: R}, math.Pi)
	if err != nil {
		t.Fatal(err)
	}
	a2, err := NewArc(Vec{}, Vec{Z: 1}, Vec{X: -R}, math.Pi)
	if err != nil {
		t.Fatal(err)
	}
	got, err := TraceInductance(Path{Prims: []Prim{a1, a2}}, w, th, Tol{Rel: 1e-9})
	if err != nil {
		t.Fatal(err)
	}
	g := BarGMD(w, th)
	want := Mu0 * R * (math.Log(8*R/g) - 2)
	if relDiff(got, want) > 5e-3 {
		t.Errorf("ring by halves %.6g H, GMD ring %.6g H (rel %.2g)", got, want, relDiff(got, want))
	}
	t.Logf("ring by halves %.6g H, GMD ring %.6g H (rel %.2g)", got, want, relDiff(got, want))
}

// TestSquareLoopGMD checks a closed square of flat trace (four bar terms,
// and the opposite sides' antiparallel closed forms; the adjacent sides
// are perpendicular) against the GMD method written out with Rosa's
// filament formula (1908): each side the mutual inductance of two
// filaments the section's GMD apart, each opposite pair −filamentPair(a, a)
// twice. The two differ only in the bar terms' constant and their (w+t)/3l
// term (Greenhouse's arithmetic-mean-distance correction against the
// filament formula's g/l), of order (w+t)/a ≈ 0.03 of one bracket unit in
// a bracket of about 4: tolerance 1 %.
func TestSquareLoopGMD(t *testing.T) {
	a, w, th := 0.03, 0.8e-3, 35e-6
	pts := []Vec{{}, {X: a}, {X: a, Y: a}, {Y: a}}
	var prims []Prim
	for i := range pts {
		prims = append(prims, seg(t, pts[i], pts[(i+1)%4]))
	}
	got, err := TraceInductance(Path{Prims: prims}, w, th, Tol{})
	if err != nil {
		t.Fatal(err)
	}
	g := BarGMD(w, th)
	want := 4*filamentPair(a, g) - 4*filamentPair(a, a)
	if relDiff(got, want) > 1e-2 {
		t.Errorf("square loop %.6g H, GMD filament sum %.6g H (rel %.2g)", got, want, relDiff(got, want))
	}
	t.Logf("square loop %.6g H, GMD filament sum %.6g H (rel %.2g)", got, want, relDiff(got, want))
}
