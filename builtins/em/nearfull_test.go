package em

import (
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// bigCircleVec returns, for a circle of radius a about the z axis through
// the origin carrying 1 A, A and B at (x, y, z) in refPrec bits, rounded
// once, by the trapezoidal rule on n points of the periodic integrals
//
//	A = μ0 a/4π ∫0^2π (−sin t, cos t, 0) dt/R,
//	B = μ0 a/4π ∫0^2π (z cos t, z sin t, a − x cos t − y sin t) dt/R³,
//	R² = x² + y² + z² + a² − 2a(x cos t + y sin t)
//
// (Biot–Savart and the vector potential's integral with r' = a(cos t,
// sin t, 0)); geometric convergence as bigCircleC1's, checked by the
// caller against n/2.
func bigCircleVec(a, x, y, z float64, n int) (av, bv [3]*big.Float) {
	c, s := bigf(0), bigf(1)
	half := bigf(0.5)
	for m := 4; m < n; m *= 2 {
		c, s = bigSqrt(bigMul(half, bigAdd(bigf(1), c))), bigSqrt(bigMul(half, bigSub(bigf(1), c)))
	}
	A, X, Y, Z := bigf(a), bigf(x), bigf(y), bigf(z)
	base := bigAdd(bigAdd(bigAdd(bigMul(X, X), bigMul(Y, Y)), bigMul(Z, Z)), bigMul(A, A))
	twoA := bigMul(bigf(2), A)
	for i := range av {
		av[i], bv[i] = bigf(0), bigf(0)
	}
	ck, sk := bigf(1), bigf(0)
	for k := 0; k < n; k++ {
		proj := bigAdd(bigMul(X, ck), bigMul(Y, sk))
		r2 := bigSub(base, bigMul(twoA, proj))
		r := bigSqrt(r2)
		inv1 := bigQuo(bigf(1), r)
		inv3 := bigQuo(inv1, r2)
		av[0] = bigSub(av[0], bigMul(sk, inv1))
		av[1] = bigAdd(av[1], bigMul(ck, inv1))
		bv[0] = bigAdd(bv[0], bigMul(bigMul(Z, ck), inv3))
		bv[1] = bigAdd(bv[1], bigMul(bigMul(Z, sk), inv3))
		bv[2] = bigAdd(bv[2], bigMul(bigSub(A, proj), inv3))
		ck, sk = bigSub(bigMul(ck, c), bigMul(sk, s)), bigAdd(bigMul(sk, c), bigMul(ck, s))
	}
	w := bigMul(bigf(k0*a), bigQuo(bigMul(bigf(2), bigPi()), bigf(float64(n))))
	for i := range av {
		av[i], bv[i] = bigMul(w, av[i]), bigMul(w, bv[i])
	}
	return av, bv
}

// gapVec is A and B of the arc of the same circle from angle t0 over span
// (small) by the 20-point Gauss–Legendre rule (nodes from gonum's
// quad.Legendre, as the differential test): on a span of at most 1e-3 rad
// at points at least 0.2 a from the wire the integrand is a polynomial of
// low degree to far below ε, and the result is right to a few ε of itself.
func gapVec(a, x, y, z, t0, span float64) (av, bv Vec) {
	h, m := span/2, t0+span/2
	for i, u := range diffNodes {
		t := m + h*u
		st, ct := math.Sincos(t)
		dx, dy := x-a*ct, y-a*st
		r2 := dx*dx + dy*dy + z*z
		r := math.Sqrt(r2)
		w := diffWeights[i] * h * k0 * a
		av = r3.Add(av, r3.Scale(w/r, Vec{X: -st, Y: ct}))
		bv = r3.Add(bv, r3.Scale(w/(r*r2), Vec{X: z * ct, Y: z * st, Z: a - x*ct - y*st}))
	}
	return av, bv
}

// TestNearlyFullArc: B and A of arcs of span 2π − δ, δ from 1e-3 to
// 1e-12, at points 0.01 to 30 radii from the centre and 0.2 radii or more from the wire in random directions
// (near the axis and far away included), against the whole circle in
// refPrec bits (bigCircleVec, 512 points checked against 256) less the
// gap by Gauss–Legendre, and against Loopwise's own whole circle less its
// small arc. The arc lies in its own frame (centre 0, axis z, starting at
// angle t0), so the point's local coordinates are exact. Before the
// series (arcSeries) A lost about ε/β of itself (2.5e-13 here, B 2.2e-14).
// Tolerance 6e-15 relative to |A| and |B|: the series' few ε of Σ|terms|
// (within O(1) of the result), the circle reference's rounding once and
// the gap's few ε of a part no larger than the whole; above β = 1/4 the
// closed form, whose elliptic integrals and differences gave up to 5.4e-15
// (4.5e-15 for B at β = 0.69, where Loopwise's whole circle less its gap
// is off by 2.1e-15 too). Largest errors are logged.
func TestNearlyFullArc(t *testing.T) {
	const tol = 6e-15
	rng := rand.New(rand.NewPCG(5, 9))
	const a = 0.05
	var worstA, worstB, worstCA, worstCB float64
	for _, e := range []float64{-3, -4, -6, -8, -10, -12} {
		delta := math.Pow(10, e)
		for range 12 {
			t0 := 2 * math.Pi * rng.Float64()
			st, ct := math.Sincos(t0)
			arc, err := NewArc(Vec{}, Vec{Z: 1}, Vec{X: a * ct, Y: a * st}, 2*math.Pi-delta)
			if err != nil {
				t.Fatal(err)
			}
			circ, _ := NewCircle(Vec{}, Vec{Z: 1}, a)
			// the gap is 2π less the arc's span as stored: 2π − fl(2π) is
			// 2.449e-16, and fl(2π) − span is exact (Sterbenz), so the gap is
			// right to ε² where δ rounded would be off by up to 7e-16 rad
			// (1e-14 of A at β = 0.02)
			gapSpan := (2*math.Pi - arc.Span) + 2.4492935982947064e-16
			gap, err := NewArc(Vec{}, Vec{Z: 1}, arc.End(), gapSpan)
			if err != nil {
				t.Fatal(err)
			}
			var x Vec
			for {
				x = r3.Scale(a*math.Pow(10, -2+3.5*rng.Float64()), randomUnit(rng))
				if math.Hypot(math.Hypot(x.X, x.Y)-a, x.Z) > 0.2*a {
					break
				}
			}
			avF, bvF := bigCircleVec(a, x.X, x.Y, x.Z, 512)
			avC, bvC := bigCircleVec(a, x.X, x.Y, x.Z, 256)
			var refA, refB Vec
			for i, p := range []*float64{&refA.X, &refA.Y, &refA.Z} {
				*p = f64(avF[i])
				if d := f64(bigSub(avF[i], avC[i])); math.Abs(d) > 1e-30*a*k0 {
					t.Fatalf("reference not converged at %v", x)
				}
			}
			for i, p := range []*float64{&refB.X, &refB.Y, &refB.Z} {
				*p = f64(bvF[i])
				if d := f64(bigSub(bvF[i], bvC[i])); math.Abs(d) > 1e-30*k0/a {
					t.Fatalf("reference not converged at %v", x)
				}
			}
			ga, gb := gapVec(a, x.X, x.Y, x.Z, t0+arc.Span, gapSpan)
			refA, refB = r3.Sub(refA, ga), r3.Sub(refB, gb)
			gotA, err1 := ArcA(arc, x)
			gotB, err2 := ArcB(arc, x)
			cA, _ := ArcA(circ, x)
			cB, _ := ArcB(circ, x)
			gA, _ := ArcA(gap, x)
			gB, _ := ArcB(gap, x)
			if err1 != nil || err2 != nil {
				t.Fatal(err1, err2)
			}
			eA := r3.Norm(r3.Sub(gotA, refA)) / r3.Norm(refA)
			eB := r3.Norm(r3.Sub(gotB, refB)) / r3.Norm(refB)
			eCA := r3.Norm(r3.Sub(r3.Sub(cA, gA), refA)) / r3.Norm(refA)
			eCB := r3.Norm(r3.Sub(r3.Sub(cB, gB), refB)) / r3.Norm(refB)
			worstA, worstB = math.Max(worstA, eA), math.Max(worstB, eB)
			worstCA, worstCB = math.Max(worstCA, eCA), math.Max(worstCB, eCB)
			if eA > tol || eB > tol {
				l := localArc(arc, x)
				t.Errorf("δ=%g at %v (β = %.2g): A off by %.2g, B by %.2g (circle − gap: %.2g, %.2g)",
					delta, x, 2*a*l.rho/(a*a+l.rho*l.rho+l.z*l.z), eA, eB, eCA, eCB)
			}
		}
	}
	t.Logf("largest relative error: A %.2g, B %.2g; Loopwise's circle less its gap: A %.2g, B %.2g", worstA, worstB, worstCA, worstCB)
}

// BenchmarkArcFieldBeta: B of a half-turn arc at points of β = 0.01 and
// 0.24 (the series, up to its switch) and 0.3 and 0.7 (the closed form),
// to compare the series' cost with the closed form's.
func BenchmarkArcFieldBeta(b *testing.B) {
	const a = 0.05
	arc, err := NewArc(Vec{}, Vec{Z: 1}, Vec{X: a}, math.Pi)
	if err != nil {
		b.Fatal(err)
	}
	for _, beta := range []float64{0.01, 0.24, 0.3, 0.7} {
		z := 0.5 * a
		rho := circleRhoAtBeta(a, z, beta)
		x := Vec{X: rho * math.Cos(0.3), Y: rho * math.Sin(0.3), Z: z}
		b.Run(fmt.Sprintf("beta=%g", beta), func(b *testing.B) {
			for b.Loop() {
				if _, err := ArcB(arc, x); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
