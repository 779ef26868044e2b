package em

import (
	"math"
	"math/rand/v2"
	"os"
	"sort"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/spatial/r3"
)

// A differential test of B and A: every primitive's field is computed
// again straight from the defining integrals,
//
//	B = μ0 I/4π ∫ dl × (x − r')/|x − r'|³,   A = μ0 I/4π ∫ dl/|x − r'|,
//
// along the primitive parametrised here by its own fields (C, U, V, N, R,
// Span, Pitch; A and B of a segment) — not by Prim.Point or Tangent —
// with an adaptive Gauss–Legendre quadrature written here (nodes from
// gonum's quad.Legendre, a general-purpose library; no code of quad.go or
// field.go), over fixed-seed random geometries and points from 0.01 to
// 100 times the geometry's size.

// diffGL is the order of the Gauss–Legendre rule on each piece.
const diffGL = 20

var diffNodes, diffWeights = func() ([]float64, []float64) {
	x, w := make([]float64, diffGL), make([]float64, diffGL)
	quad.Legendre{}.FixedLocations(x, w, -1, 1)
	return x, w
}()

// integrand returns the value at t and a bound on its rounding error in
// units of ε.
type integrand func(t float64) (Vec, float64)

// glPiece is the diffGL-point Gauss–Legendre rule on [a, b]: of f, and of
// the bound on f's rounding (the size of the rounding in the first).
func glPiece(f integrand, a, b float64) (Vec, float64) {
	h, m := (b-a)/2, (a+b)/2
	var s Vec
	var abs float64
	for i, x := range diffNodes {
		v, e := f(m + h*x)
		s = r3.Add(s, r3.Scale(diffWeights[i]*h, v))
		abs += diffWeights[i] * math.Abs(h) * e
	}
	return s, abs
}

// adaptGL integrates f over [a, b], whole being the rule on all of it, by
// bisection: a piece is accepted when the rule on it and the sum of the
// rule on its halves differ by at most tol·(its share of the length) plus
// 16 times the bound on the rounding of the integral over it (below that
// the difference is rounding noise), and the halves' sum is kept (for an analytic integrand far more
// accurate than that difference). pieces collects the accepted values,
// summed later with compensation; a piece still refused after 30 halvings
// is counted in *bad.
func adaptGL(f integrand, a, b float64, whole Vec, tol, length float64, depth int, pieces *[]Vec, bad *int) {
	m := (a + b) / 2
	l, la := glPiece(f, a, m)
	r, ra := glPiece(f, m, b)
	two := r3.Add(l, r)
	if r3.Norm(r3.Sub(two, whole)) <= tol*(b-a)/length+16*0x1p-53*(la+ra) {
		*pieces = append(*pieces, two)
		return
	}
	if depth >= 30 {
		*bad++
		*pieces = append(*pieces, two)
		return
	}
	adaptGL(f, a, m, l, tol, length, depth+1, pieces, bad)
	adaptGL(f, m, b, r, tol, length, depth+1, pieces, bad)
}

// neumaier sums vectors with Neumaier's compensated summation (Neumaier,
// ZAMM 54, 1974), component by component.
func neumaier(vs []Vec) Vec {
	var s, c [3]float64
	for _, v := range vs {
		for k, x := range [3]float64{v.X, v.Y, v.Z} {
			t := s[k] + x
			if math.Abs(s[k]) >= math.Abs(x) {
				c[k] += (s[k] - t) + x
			} else {
				c[k] += (x - t) + s[k]
			}
			s[k] = t
		}
	}
	return Vec{X: s[0] + c[0], Y: s[1] + c[1], Z: s[2] + c[2]}
}

// refCurve is a primitive as this test reads it: q(t) = r'(t) − O and
// dl/dt, for t in [0, tEnd], with pieces to start the bisection from, and
// its end minus its start formed without cancellation.
type refCurve struct {
	q, dl    func(t float64) Vec
	tEnd     float64
	breaks   int
	endStart Vec
}

func refCurveOf(p Prim, o Vec) refCurve {
	if p.Kind == Segment {
		a := r3.Sub(p.A, o)
		d := r3.Sub(p.B, p.A)
		return refCurve{
			q:  func(t float64) Vec { return r3.Add(a, r3.Scale(t, d)) },
			dl: func(float64) Vec { return d }, tEnd: 1, breaks: 1, endStart: d,
		}
	}
	c := r3.Sub(p.C, o)
	pitch := 0.0
	if p.Kind == Helix {
		pitch = p.Pitch
	}
	q := func(phi float64) Vec {
		s, co := math.Sincos(phi)
		return r3.Add(c, r3.Add(r3.Add(r3.Scale(p.R*co, p.U), r3.Scale(p.R*s, p.V)), r3.Scale(pitch*phi, p.N)))
	}
	dl := func(phi float64) Vec {
		s, co := math.Sincos(phi)
		return r3.Add(r3.Add(r3.Scale(-p.R*s, p.U), r3.Scale(p.R*co, p.V)), r3.Scale(pitch, p.N))
	}
	s, half := math.Sin(p.Span), math.Sin(p.Span/2)
	es := r3.Add(r3.Add(r3.Scale(-2*p.R*half*half, p.U), r3.Scale(p.R*s, p.V)), r3.Scale(pitch*p.Span, p.N))
	return refCurve{q: q, dl: dl, tEnd: p.Span, breaks: max(1, int(math.Ceil(p.Span/(math.Pi/2)))), endStart: es}
}

// refField returns B (wantB) or A per ampere at x of the primitives, each
// integrated as above with O the reference point o. When x is far from o
// (|x − o| > 4 size) the integrand is taken less its value with r' = o,
// whose integral is (end − start)/|d| for A and (end − start) × d/|d|³ for
// B (d = x − o); the difference is formed without cancellation,
//
//	1/|d − q| − 1/|d| = (2d·q − q·q)/(|d||r|(|d| + |r|)),   r = d − q,
//
// so that the far field, a small remainder of the near-monopole terms, keeps
// its digits. The relative tolerance of each integral is 1e-15 of its value
// (or the rounding of ∫|f|); pieces that would not settle are counted in
// *bad.
func refField(prims []Prim, o Vec, size float64, x Vec, wantB bool, bad *int) Vec {
	d := r3.Sub(x, o)
	nd := r3.Norm(d)
	far := nd > 4*size
	var parts []Vec
	for _, p := range prims {
		rc := refCurveOf(p, o)
		f := func(t float64) (Vec, float64) {
			q, dl := rc.q(t), rc.dl(t)
			r := r3.Sub(d, q)
			nr := r3.Norm(r)
			// r = d − q carries an error of a few ε(|d| + |q|): relative
			// (|d| + |q|)/|r| of itself, three times that in 1/|r|³
			amp := 8 + 3*(nd+r3.Norm(q))/nr
			var v Vec
			switch {
			case !far && wantB:
				v = r3.Scale(k0/(nr*nr*nr), r3.Cross(dl, r))
			case !far:
				v = r3.Scale(k0/nr, dl)
			default:
				diff := (2*r3.Dot(d, q) - r3.Dot(q, q)) / (nd + nr) // |d| − |r|
				if !wantB {
					v = r3.Scale(k0*diff/(nd*nr), dl)
					break
				}
				// dl × r/|r|³ − dl × d/|d|³ = dl × d·(1/|r|³ − 1/|d|³) − dl × q/|r|³
				inv3 := diff * (nd*nd + nd*nr + nr*nr) / (nr * nr * nr * nd * nd * nd)
				v = r3.Scale(k0, r3.Sub(r3.Scale(inv3, r3.Cross(dl, d)), r3.Scale(1/(nr*nr*nr), r3.Cross(dl, q))))
			}
			return v, amp * r3.Norm(v)
		}
		if far {
			if wantB {
				parts = append(parts, r3.Scale(k0/(nd*nd*nd), r3.Cross(rc.endStart, d)))
			} else {
				parts = append(parts, r3.Scale(k0/nd, rc.endStart))
			}
		}
		// a rough pass for the scale, then the real one
		var rough []Vec
		n := rc.breaks
		for i := 0; i < n; i++ {
			a, b := rc.tEnd*float64(i)/float64(n), rc.tEnd*float64(i+1)/float64(n)
			w, wa := glPiece(f, a, b)
			adaptGL(f, a, b, w, 1e-6*wa, rc.tEnd, 0, &rough, bad)
		}
		scale := r3.Norm(neumaier(rough))
		var fine []Vec
		for i := 0; i < n; i++ {
			a, b := rc.tEnd*float64(i)/float64(n), rc.tEnd*float64(i+1)/float64(n)
			w, _ := glPiece(f, a, b)
			adaptGL(f, a, b, w, 1e-15*scale, rc.tEnd, 0, &fine, bad)
		}
		parts = append(parts, neumaier(fine))
	}
	return neumaier(parts)
}

// diffGeometry is one random geometry of the test.
type diffGeometry struct {
	kind  string
	prims []Prim
}

func randomUnit(rng *rand.Rand) Vec {
	return r3.Unit(Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()})
}

// randomGeometry makes a geometry of the given kind at a random place and
// scale, in a random orientation.
func randomGeometry(rng *rand.Rand, kind string) diffGeometry {
	s := math.Pow(10, -3+4*rng.Float64()) // size scale, 1 mm to 10 m
	c := r3.Scale(s*3, Vec{X: rng.Float64() - 0.5, Y: rng.Float64() - 0.5, Z: rng.Float64() - 0.5})
	axis := randomUnit(rng)
	must := func(p Prim, err error) Prim {
		if err != nil {
			panic(err)
		}
		return p
	}
	u, v, _, _ := frame(axis, randomUnit(rng))
	switch kind {
	case "arc":
		span := 0.2 + (2*math.Pi-0.2)*rng.Float64()
		if rng.IntN(4) == 0 {
			return diffGeometry{kind, []Prim{must(NewCircle(c, axis, s))}}
		}
		return diffGeometry{kind, []Prim{must(NewArc(c, axis, r3.Add(c, r3.Scale(s, u)), span))}}
	case "helix":
		return diffGeometry{kind, []Prim{must(NewHelix(c, axis, s, s*(0.2+3*rng.Float64()), 0.5+4.5*rng.Float64()))}}
	case "segment":
		return diffGeometry{kind, []Prim{must(NewSegment(c, r3.Add(c, r3.Scale(2*s, axis))))}}
	default: // "path": a closed racetrack of two segments and two half circles
		l := s * (0.5 + 2*rng.Float64())
		p0 := r3.Add(c, r3.Scale(s, v))
		p1 := r3.Add(p0, r3.Scale(l, u))
		c1 := r3.Add(c, r3.Scale(l, u))
		a1 := must(NewArc(c1, axis, p1, math.Pi))
		s1 := must(NewSegment(p0, p1))
		e1 := a1.End()
		e2 := r3.Sub(e1, r3.Scale(l, u))
		s2 := must(NewSegment(e1, e2))
		a2 := must(NewArc(c, axis, e2, math.Pi))
		return diffGeometry{kind, []Prim{s1, a1, s2, a2}}
	}
}

// centreAndSize returns the mean of points along the geometry and the
// largest distance of them from it, and the points (for the distance of a
// field point from the wire).
func centreAndSize(prims []Prim) (Vec, float64, []Vec) {
	var pts []Vec
	for _, p := range prims {
		rc := refCurveOf(p, Vec{})
		for i := 0; i <= 512; i++ {
			pts = append(pts, rc.q(rc.tEnd*float64(i)/512))
		}
	}
	var c Vec
	for _, q := range pts {
		c = r3.Add(c, q)
	}
	c = r3.Scale(1/float64(len(pts)), c)
	size := 0.0
	for _, q := range pts {
		size = math.Max(size, r3.Norm(r3.Sub(q, c)))
	}
	return c, size, pts
}

// diffStats collects relative errors per geometry kind and quantity.
type diffStats map[string][]float64

// report logs median, 90th percentile and largest per key; "/Σ" keys hold
// a path's errors relative to Σ|piece| instead of |sum|.
func (s diffStats) report(t *testing.T) {
	keys := make([]string, 0, len(s))
	for k := range s {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		e := append([]float64(nil), s[k]...)
		sort.Float64s(e)
		t.Logf("%-10s n=%4d  median %.2g  90%% %.2g  max %.2g", k, len(e), e[len(e)/2], e[len(e)*9/10], e[len(e)-1])
	}
}

// diffTol is the relative tolerance per geometry kind, the same for B and
// A, with why:
//   - segment: a closed form, a few dozen roundings: 1e-13.
//   - arc: closed forms in elliptic integrals (gonum's, ~1e-16); a whole
//     circle's far field is a dipole's, about size/distance of the terms
//     of the closed form (a·I3 − ρ·C3, and C3 itself is O(m) of its
//     terms), so at 100 sizes a few roundings become 1e-14 to 1e-13: 2e-13
//     (1.1e-13 seen once in the long run).
//   - helix: integrated by the production adaptive Gauss–Kronrod rule to a
//     requested relative 1e-12 (fieldTol): 1e-11, as its error estimate
//     bounds the error only in practice.
//   - path: the sum of four primitives' fields, which cancels (far away a
//     closed loop's field is a dipole's, about size/distance of each
//     piece's, and a dipole's A vanishes along its axis): each piece is
//     held to 1e-13 of itself, so the sum to 1e-13 of Σ|piece| — the
//     tolerance relative to the sum is 1e-13·Σ|piece|/|sum| (cancelFactor).
var diffTol = map[string]float64{"arc": 2e-13, "segment": 1e-13, "helix": 1e-11, "path": 1e-13}

// cancelFactor returns Σ|field of each piece| / |field of the path|, at
// least 1.
func cancelFactor(prims []Prim, x Vec, sum Vec, wantB bool) float64 {
	total := 0.0
	for _, p := range prims {
		v, _ := PrimA(p, x)
		if wantB {
			v, _ = PrimB(p, x)
		}
		total += r3.Norm(v)
	}
	return math.Max(1, total/r3.Norm(sum))
}

func runDifferential(t *testing.T, seed uint64, perKind, points int) diffStats {
	rng := rand.New(rand.NewPCG(seed, 3))
	stats := diffStats{}
	for _, kind := range []string{"arc", "helix", "segment", "path"} {
		for g := 0; g < perKind; g++ {
			geo := randomGeometry(rng, kind)
			o, size, pts := centreAndSize(geo.prims)
			for k := 0; k < points; k++ {
				var x Vec
				for {
					x = r3.Add(o, r3.Scale(size*math.Pow(10, -2+4*rng.Float64()), randomUnit(rng)))
					near := math.Inf(1)
					for _, q := range pts {
						near = math.Min(near, r3.Norm(r3.Sub(q, x)))
					}
					if near > 1e-2*size { // keep clear of the wire itself
						break
					}
				}
				for _, wantB := range []bool{true, false} {
					got, err := PathB(Path{Prims: geo.prims}, x)
					name := kind + " B"
					if !wantB {
						got, err = PathA(Path{Prims: geo.prims}, x)
						name = kind + " A"
					}
					if err != nil {
						t.Fatalf("%s at %v: %v", name, x, err)
					}
					bad := 0
					want := refField(geo.prims, o, size, x, wantB, &bad)
					if bad > 0 {
						t.Fatalf("%s at %v: the reference quadrature did not settle on %d pieces", name, x, bad)
					}
					rel := r3.Norm(r3.Sub(got, want)) / r3.Norm(want)
					stats[name] = append(stats[name], rel)
					tol := diffTol[kind]
					if len(geo.prims) > 1 {
						cf := cancelFactor(geo.prims, x, want, wantB)
						tol *= cf
						stats[name+" /Σ"] = append(stats[name+" /Σ"], rel/cf)
					}
					if rel > tol {
						t.Errorf("%s (geometry %d, |x − o| = %.3g size): %v, reference %v, relative %.2g",
							name, g, r3.Norm(r3.Sub(x, o))/size, got, want, rel)
					}
				}
			}
		}
	}
	return stats
}

// TestFieldsDifferential is the short set run by go test.
func TestFieldsDifferential(t *testing.T) {
	runDifferential(t, 1, 6, 8).report(t)
}

// TestFieldsDifferentialLong is the long set: set LOOPWISE_DIFF_LONG=1 (it
// takes about a minute).
func TestFieldsDifferentialLong(t *testing.T) {
	if os.Getenv("LOOPWISE_DIFF_LONG") == "" || testing.Short() {
		t.Skip("set LOOPWISE_DIFF_LONG=1 for the long differential run")
	}
	runDifferential(t, 2, 60, 20).report(t)
}
