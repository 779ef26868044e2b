package em

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// refPrec is the working precision, in bits, of the references below:
// far more than the 53 of float64, so that their own rounding (and the
// cancellation in a near-axis sum, at most about 40 bits at ρ = 1e-12 a) is
// out of sight.
const refPrec = 300

func bigf(x float64) *big.Float { return new(big.Float).SetPrec(refPrec).SetFloat64(x) }

func bigAdd(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(refPrec).Add(a, b) }
func bigSub(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(refPrec).Sub(a, b) }
func bigMul(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(refPrec).Mul(a, b) }
func bigQuo(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(refPrec).Quo(a, b) }
func bigSqrt(a *big.Float) *big.Float   { return new(big.Float).SetPrec(refPrec).Sqrt(a) }

// bigCircleC1 returns C1 = ∫0^2π cos φ dφ/√(ρ² + a² + z² − 2aρ cos φ) in
// refPrec bits by the trapezoidal rule on n points (n a power of 2, at least
// 4). The integrand is periodic and analytic, so the rule converges
// geometrically, its error about 2·e^(−nη) with cosh η = (a² + ρ² + z²)/(2aρ)
// (Trefethen & Weideman, "The exponentially convergent trapezoidal rule",
// SIAM Review 56, 2014, theorem 3.2). The angles come from cos(π/2) = 0 by
// half-angle formulas and from the rotation by 2π/n repeated; no trig
// function, no closed form, no code of field.go.
func bigCircleC1(a, rho, z float64, n int) *big.Float {
	// cos and sin of 2π/n: from θ = π/2 halve down to 2π/n
	c, s := bigf(0), bigf(1)
	half := bigf(0.5)
	for m := 4; m < n; m *= 2 {
		c, s = bigSqrt(bigMul(half, bigAdd(bigf(1), c))), bigSqrt(bigMul(half, bigSub(bigf(1), c)))
	}
	A, Rho, Z := bigf(a), bigf(rho), bigf(z)
	base := bigAdd(bigAdd(bigMul(A, A), bigMul(Rho, Rho)), bigMul(Z, Z))
	two := bigMul(bigf(2), bigMul(A, Rho))
	sum := bigf(0)
	ck, sk := bigf(1), bigf(0)
	for k := 0; k < n; k++ {
		r := bigSqrt(bigSub(base, bigMul(two, ck)))
		sum = bigAdd(sum, bigQuo(ck, r))
		ck, sk = bigSub(bigMul(ck, c), bigMul(sk, s)), bigAdd(bigMul(sk, c), bigMul(ck, s))
	}
	// each point weighs 2π/n; π to refPrec bits by Machin's formula
	return bigMul(bigQuo(bigMul(bigf(2), bigPi()), bigf(float64(n))), sum)
}

// bigPi is π to refPrec bits by Machin's formula π = 16 atan(1/5) −
// 4 atan(1/239), each arctangent by its Taylor series.
func bigPi() *big.Float {
	atanInv := func(q int64) *big.Float {
		x := bigQuo(bigf(1), bigf(float64(q)))
		x2 := bigMul(x, x)
		sum, term := bigf(0), x
		eps := new(big.Float).SetMantExp(bigf(1), -refPrec-8)
		for k := int64(0); ; k++ {
			t := bigQuo(term, bigf(float64(2*k+1)))
			if k%2 == 0 {
				sum = bigAdd(sum, t)
			} else {
				sum = bigSub(sum, t)
			}
			if t.Cmp(eps) < 0 {
				return sum
			}
			term = bigMul(term, x2)
		}
	}
	return bigSub(bigMul(bigf(16), atanInv(5)), bigMul(bigf(4), atanInv(239)))
}

// refCircleC1 is bigCircleC1 on 128 points, checked against 64 points: the
// two must agree to 1e-30 (far below what is tested), or the reference
// itself is not converged.
func refCircleC1(t *testing.T, a, rho, z float64) float64 {
	t.Helper()
	fine, coarse := bigCircleC1(a, rho, z, 128), bigCircleC1(a, rho, z, 64)
	f, _ := fine.Float64()
	d, _ := bigSub(fine, coarse).Float64()
	if math.Abs(d) > 1e-30*math.Abs(f) {
		t.Fatalf("reference not converged at a=%g ρ=%g z=%g: %g", a, rho, z, d/f)
	}
	return f
}

// circleRhoAtBeta returns the ρ at which circleC1's β = 2aρ/(a² + z² + ρ²)
// equals beta (the smaller root).
func circleRhoAtBeta(a, z, beta float64) float64 {
	s := a*a + z*z
	// β ρ² − 2aρ + β s = 0
	return (2 * a * beta * s) / (2 * a * (a + math.Sqrt(a*a-beta*beta*s)))
}

// TestCircleANearAxis: A_φ of a whole circle near its axis against the
// extended-precision trapezoidal reference of its defining integral
// A = μ0 I/4π ∮ dl/|x − r'| (A_φ = μ0 I a/4π · C1), at ρ/a from 1e-12 to
// 1e-1, at several heights, and on both sides of the switch between the
// near-axis series and the Landen form (at 0.9 and 1.1 of the switching ρ,
// and at 1 ∓ 1e-6 of it). Tolerance 2e-15 relative: on the series side the
// first omitted term is below 1e-16 and the rest is a dozen roundings; on
// the other, gonum's CompleteD (Carlson's RD, relative error a few 1e-16)
// and a dozen roundings. The circle is in its own frame, so the local
// coordinates are exact.
func TestCircleANearAxis(t *testing.T) {
	const tol = 2e-15
	a := 0.05
	loop, err := NewCircle(Vec{}, Vec{Z: 1}, a)
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for _, zr := range []float64{0, 0.3, -1.7, 5} {
		z := zr * a
		rt := circleRhoAtBeta(a, z, math.Sqrt(circleSeriesBeta2))
		rhos := []float64{0.9 * rt, (1 - 1e-6) * rt, (1 + 1e-6) * rt, 1.1 * rt}
		for e := -12.0; e <= -1; e += 0.5 {
			rhos = append(rhos, a*math.Pow(10, e))
		}
		for _, rho := range rhos {
			got, err := ArcA(loop, Vec{X: rho, Z: z})
			if err != nil {
				t.Fatal(err)
			}
			want := k0 * a * refCircleC1(t, a, rho, z)
			// x on the +X axis: A_φ points along +Y
			rel := math.Abs(got.Y-want) / want
			worst = math.Max(worst, rel)
			if rel > tol || got.X != 0 && math.Abs(got.X) > tol*want || got.Z != 0 {
				t.Errorf("z=%g a, ρ=%g a: A = %v, reference A_φ = %.17g (relative %.2g)", zr, rho/a, got, want, rel)
			}
		}
	}
	t.Logf("largest relative error %.2g", worst)
}

// TestCircleSeriesNextTerm checks the near-axis series' second term as a
// formula, apart from the code: at ρ = 1e-3 a the two-term series in ρ
// (μ0 I a² ρ/(4(a² + z²)^(3/2)) · (1 + 3ρ²(a² − 4z²)/(8(a² + z²)²))) must
// match the reference to O(ρ⁴/a⁴) ≈ 1e-12, and the leading term alone
// must not (it misses by O(ρ²) ≈ 1e-6). This is the ρ form of what
// circleC1's comment derives.
func TestCircleSeriesNextTerm(t *testing.T) {
	a := 1.0
	for _, z := range []float64{0, 0.2, 1.3} {
		rho := 1e-3
		want := k0 * a * refCircleC1(t, a, rho, z)
		s := a*a + z*z
		lead := Mu0 * a * a * rho / (4 * s * math.Sqrt(s))
		two := lead * (1 + 3*rho*rho*(a*a-4*z*z)/(8*s*s))
		if rel := math.Abs(two-want) / want; rel > 1e-11 {
			t.Errorf("z=%g: two-term series off by %.2g", z, rel)
		}
		if rel := math.Abs(lead-want) / want; rel < 1e-8 {
			t.Errorf("z=%g: leading term alone within %.2g: the test cannot see the second term", z, rel)
		}
	}
}

// randomArc returns an arc of radius r sweeping span (a whole circle for
// 2π) about a random axis through centre, starting in a random direction.
func randomArc(rng *rand.Rand, r, span float64, centre Vec) Prim {
	axis := Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}
	hint := Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}
	u, _, _, _ := frame(axis, hint)
	if span >= 2*math.Pi {
		p, _ := NewCircle(centre, axis, r)
		return p
	}
	p, err := NewArc(centre, axis, r3.Add(centre, r3.Scale(r, u)), span)
	if err != nil {
		panic(err)
	}
	return p
}

// exactLocal returns (x − C)·U, (x − C)·V, (x − C)·N of p in refPrec bits,
// rounded once to float64: the point in the arc's own frame, with U, V, N
// and x taken as exact.
func exactLocal(p Prim, x Vec) Vec {
	d := [3]*big.Float{bigSub(bigf(x.X), bigf(p.C.X)), bigSub(bigf(x.Y), bigf(p.C.Y)), bigSub(bigf(x.Z), bigf(p.C.Z))}
	dot := func(e Vec) float64 {
		s := bigAdd(bigAdd(bigMul(d[0], bigf(e.X)), bigMul(d[1], bigf(e.Y))), bigMul(d[2], bigf(e.Z)))
		f, _ := s.Float64()
		return f
	}
	return Vec{X: dot(p.U), Y: dot(p.V), Z: dot(p.N)}
}

// inOwnFrame evaluates f for the same arc placed at the origin with
// U, V, N = x̂, ŷ, ẑ at the point's exact local coordinates, and rotates
// the result back with p's U, V, N (a few roundings).
func inOwnFrame(p Prim, x Vec, f func(Prim, Vec) (Vec, error)) (Vec, error) {
	own := Prim{Kind: Arc, U: Vec{X: 1}, V: Vec{Y: 1}, N: Vec{Z: 1}, R: p.R, Span: p.Span}
	v, err := f(own, exactLocal(p, x))
	if err != nil {
		return Vec{}, err
	}
	return r3.Add(r3.Add(r3.Scale(v.X, p.U), r3.Scale(v.Y, p.V)), r3.Scale(v.Z, p.N)), nil
}

// TestTiltedArcNearAxis: B and A of arcs and circles in random tilted
// frames, at points 1e-6 to 1e-9 of the radius off the axis (heights from
// −2 to 2 radii, centres up to 3 radii from the origin), against the same
// arc in its own frame at the point's exact local coordinates, rotated.
// Tolerance 1e-13 relative to the larger norm: the in-frame evaluation and
// the rotation each carry a few roundings (1e-15); the rest is what
// localArc's coordinates may lose. (A circle's A vanishes on its axis,
// A ∝ ρ, so its relative accuracy there needs ρ itself to its last digits:
// the test asks that too.)
func TestTiltedArcNearAxis(t *testing.T) {
	const tol = 1e-13
	rng := rand.New(rand.NewPCG(14, 1))
	worst := map[string]float64{}
	for trial := 0; trial < 60; trial++ {
		r := math.Pow(10, -3+3*rng.Float64())
		span := []float64{0.4, 1.7, math.Pi, 5.5, 2 * math.Pi}[trial%5]
		centre := r3.Scale(3*r, Vec{X: rng.Float64()*2 - 1, Y: rng.Float64()*2 - 1, Z: rng.Float64()*2 - 1})
		p := randomArc(rng, r, span, centre)
		for k := 0; k < 8; k++ {
			rho := r * math.Pow(10, -6-3*rng.Float64())
			z := r * (4*rng.Float64() - 2)
			psi := 2 * math.Pi * rng.Float64()
			x := r3.Add(p.C, r3.Add(r3.Scale(z, p.N), r3.Add(r3.Scale(rho*math.Cos(psi), p.U), r3.Scale(rho*math.Sin(psi), p.V))))
			for _, q := range []struct {
				name string
				f    func(Prim, Vec) (Vec, error)
			}{{"B", ArcB}, {"A", ArcA}} {
				got, err := q.f(p, x)
				if err != nil {
					t.Fatal(err)
				}
				want, err := inOwnFrame(p, x, q.f)
				if err != nil {
					t.Fatal(err)
				}
				rel := r3.Norm(r3.Sub(got, want)) / math.Max(r3.Norm(got), r3.Norm(want))
				key := q.name
				if p.IsCircle() {
					key += " circle"
				}
				worst[key] = math.Max(worst[key], rel)
				if rel > tol {
					t.Errorf("%s of arc span %.3g (R=%.3g) at ρ=%.3g R, z=%.3g R: %v, own frame %v (relative %.2g)",
						q.name, span, r, rho/r, z/r, got, want, rel)
				}
			}
		}
	}
	t.Logf("largest relative differences: %v", worst)
}

// TestTiltedArcUlp: moving the field point by one ulp in any coordinate
// must move B and A of a tilted arc by about as little as the field
// changes over that distance: |δx|·|∇B| ≲ 1e-15 |B| here (the points are
// at least 0.5 radii from the wire). Tolerance 1e-14 relative: that plus
// the closed forms' own roundings at the two points (seen up to 6e-15 on
// a short arc, whose integrals are differences of incomplete ones at its
// two ends). Near the axis the old
// local frame made this 1.6e-8. A whole circle's B is tested the same way;
// its A is not, as A ∝ ρ there and one ulp of x moves ρ itself by
// ε|x − C|/ρ relative (TestTiltedArcNearAxis checks its accuracy).
func TestTiltedArcUlp(t *testing.T) {
	const tol = 1e-14
	rng := rand.New(rand.NewPCG(14, 2))
	worst := 0.0
	for trial := 0; trial < 40; trial++ {
		r := math.Pow(10, -3+3*rng.Float64())
		span := []float64{0.4, 1.7, math.Pi, 5.5, 2 * math.Pi}[trial%5]
		p := randomArc(rng, r, span, r3.Scale(r, Vec{X: rng.Float64(), Y: -rng.Float64(), Z: rng.Float64()}))
		rho := r * math.Pow(10, -6-3*rng.Float64())
		z := r * (rng.Float64() - 0.5)
		x := r3.Add(p.C, r3.Add(r3.Scale(z, p.N), r3.Scale(rho, p.V)))
		fs := []func(Prim, Vec) (Vec, error){ArcB, ArcA}
		if p.IsCircle() {
			fs = fs[:1]
		}
		for fi, f := range fs {
			v0, err := f(p, x)
			if err != nil {
				t.Fatal(err)
			}
			for c := 0; c < 3; c++ {
				for _, dir := range []float64{-math.MaxFloat64, math.MaxFloat64} {
					y := x
					switch c {
					case 0:
						y.X = math.Nextafter(y.X, dir)
					case 1:
						y.Y = math.Nextafter(y.Y, dir)
					default:
						y.Z = math.Nextafter(y.Z, dir)
					}
					v1, err := f(p, y)
					if err != nil {
						t.Fatal(err)
					}
					rel := r3.Norm(r3.Sub(v1, v0)) / r3.Norm(v0)
					worst = math.Max(worst, rel)
					if rel > tol {
						t.Errorf("%s of arc span %.3g at ρ=%.3g R: one ulp in coordinate %d moves it by %.2g relative",
							[]string{"B", "A"}[fi], span, rho/r, c, rel)
					}
				}
			}
		}
	}
	t.Logf("largest relative change %.2g", worst)
}
