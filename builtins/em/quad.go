package em

// Adaptive quadrature: globally adaptive Gauss–Kronrod (G7–K15) in one
// dimension and a G7–K15 tensor-product rule with global subdivision on
// rectangles in two dimensions.
//
// The algorithm follows the QAG scheme of QUADPACK (R. Piessens,
// E. de Doncker-Kapenga, C. W. Überhuber, D. K. Kahaner, "QUADPACK: A
// Subroutine Package for Automatic Integration", Springer, 1983, routines
// QAG/QK15): every sub-interval carries a Kronrod estimate of its integral and
// an error estimate derived from the Gauss–Kronrod difference; the interval
// with the largest error estimate is bisected until the summed error estimate
// meets the tolerance or the evaluation budget is used up. No extrapolation
// (epsilon algorithm) is applied.

import (
	"container/heap"
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r3"
)

// Tol is a requested accuracy: the result is accepted when the error estimate
// is <= max(Abs, Rel*|result|) (for vectors, |.| is the Euclidean norm).
//
// Rel and Abs must be finite and non-negative and at least one of them must be
// positive. A relative tolerance below about 50 machine epsilons (≈1e-14)
// usually cannot be met, because every error estimate is floored at the
// rounding level 50·eps·∫|f|; such requests end early (after a few
// bisections that fail to reduce the estimate) with ErrNoConvergence.
//
// MaxEval bounds the number of integrand calls; 0 means the default of
// 200000. A negative MaxEval is an error. The budget is checked before each
// bisection, so the count never exceeds MaxEval except that the initial rule
// applications (15 calls per initial interval in one dimension, 225 per
// rectangle in two) are always made.
//
// Stop and Progress are the caller's controls of long work; the zero value
// has neither. Stop, when set, is polled before every bisection and between
// the pieces of the line, surface and inductance loops; once it returns an
// error the work ends and returns that error unchanged (a caller's
// cancellation). Progress, when set, receives the pieces done and their
// total from the loops over the pieces of a path (LineIntegral,
// SelfInductance, Mutual); the quadratures themselves do not report.
type Tol struct {
	Rel, Abs float64
	MaxEval  int
	Stop     func() error
	Progress func(done, total int)
	// Est, if not nil, receives (adds up) the quadratures' own error
	// estimates, where a routine supports it (LineIntegral,
	// FluxThroughLoop, FluxThroughSurface, FluxUniform).
	Est *float64
}

// stopped polls tol.Stop.
func (tol Tol) stopped() error {
	if tol.Stop == nil {
		return nil
	}
	return tol.Stop()
}

// with returns tol with other accuracy settings and the same controls.
func (tol Tol) with(rel, abs float64) Tol {
	tol.Rel, tol.Abs = rel, abs
	return tol
}

// quadDefaultMaxEval is the integrand-call budget used when Tol.MaxEval is 0.
const quadDefaultMaxEval = 200000

// ErrNoConvergence is returned, wrapped in a *QuadError carrying the best
// value and its error estimate, when the evaluation budget (Tol.MaxEval) is
// used up before the tolerance is met, when the sub-interval with the largest
// error can no longer be bisected in floating point, or when repeated
// bisections stop reducing the error estimate because of rounding (QUADPACK's
// roundoff test; typically a tolerance below the rounding level).
var ErrNoConvergence = errors.New("em: quadrature did not reach the requested tolerance")

// QuadError reports a quadrature that stopped before meeting its tolerance.
// The returned value and error estimate of the failing call are the best
// available and are repeated here. errors.Is(err, ErrNoConvergence) holds.
type QuadError struct {
	// Value is the best scalar result (Integrate, Integrate2); zero for
	// vector integrands.
	Value float64
	// Vec is the best vector result (IntegrateVec, IntegrateVecBreaks);
	// zero for scalar integrands.
	Vec r3.Vec
	// Estimate is the error estimate of the best result.
	Estimate float64
	// Target is the accuracy that was requested, max(Abs, Rel*|result|).
	Target float64
	// Evals is the number of integrand calls made.
	Evals int
}

// Error implements the error interface.
func (e *QuadError) Error() string {
	return fmt.Sprintf("%v: error estimate %.3g > target %.3g after %d integrand calls",
		ErrNoConvergence, e.Estimate, e.Target, e.Evals)
}

// Unwrap returns ErrNoConvergence.
func (e *QuadError) Unwrap() error { return ErrNoConvergence }

// Gauss–Kronrod 7–15 nodes and weights on [-1, 1], copied from QUADPACK
// routine DQK15 (Piessens et al., 1983; netlib.org/quadpack/dqk15.f). Only the
// non-negative half is listed; the rule is symmetric. gkX15[1], gkX15[3],
// gkX15[5] and gkX15[7] are the 7-point Gauss–Legendre nodes with weights
// gkWG7. quad_test.go checks the tables independently: the Kronrod rule must
// integrate x^k exactly for k <= 22 (= 3·7+1) and the Gauss rule for k <= 13.
var (
	gkX15 = [8]float64{
		0.991455371120812639206854697526329,
		0.949107912342758524526189684047851,
		0.864864423359769072789712788640926,
		0.741531185599394439863864773280788,
		0.586087235467691130294144845693013,
		0.405845151377397166906606412076961,
		0.207784955007898467600689403773245,
		0.000000000000000000000000000000000,
	}
	gkW15 = [8]float64{
		0.022935322010529224963732008058970,
		0.063092092629978553290700663189204,
		0.104790010322250183839876322541518,
		0.140653259715525918745189590510238,
		0.169004726639267902826583426598550,
		0.190350578064785409913256402421014,
		0.204432940075298892414161999234649,
		0.209482141084727828012999174891714,
	}
	gkWG7 = [4]float64{
		0.129484966168869693270611432679082,
		0.279705391489276667901467771423780,
		0.381830050505118944950369775488975,
		0.417959183673469387755102040816327,
	}
)

// gkNodes, gkKW and gkGW are the full 15-point tables on [-1, 1] in increasing node
// order; gkGW is zero at nodes that are not Gauss nodes.
var gkNodes, gkKW, gkGW = gkFullTables()

func gkFullTables() (x, k, g [15]float64) {
	for i := 0; i < 8; i++ {
		x[i], x[14-i] = -gkX15[i], gkX15[i]
		k[i], k[14-i] = gkW15[i], gkW15[i]
		if i%2 == 1 {
			g[i], g[14-i] = gkWG7[i/2], gkWG7[i/2]
		}
	}
	return
}

const (
	quadEps   = 0x1p-52   // float64 machine epsilon
	quadUflow = 0x1p-1022 // smallest normal float64
)

// quadScaleErr turns the raw Gauss–Kronrod difference into QUADPACK's error
// estimate: resasc·min(1, (200·raw/resasc)^1.5), floored at the rounding level
// 50·eps·resabs (QK15, Piessens et al., 1983). sat reports that the estimate
// is the saturated value resasc, i.e. the rule does not resolve f at all.
func quadScaleErr(raw, resabs, resasc float64) (e float64, sat bool) {
	e = raw
	if resasc != 0 && e != 0 {
		e = resasc * math.Min(1, math.Pow(200*e/resasc, 1.5))
	}
	if resabs > quadUflow/(50*quadEps) {
		e = math.Max(50*quadEps*resabs, e)
	}
	return e, resasc != 0 && e == resasc
}

func quadAbsVec(v r3.Vec) r3.Vec { return r3.Vec{X: math.Abs(v.X), Y: math.Abs(v.Y), Z: math.Abs(v.Z)} }

func quadFiniteVec(v r3.Vec) bool { return quadFinite(v.X) && quadFinite(v.Y) && quadFinite(v.Z) }

func quadFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// quadSeg is a sub-interval of a one-dimensional integral.
type quadSeg struct {
	a, b float64
	val  r3.Vec
	err  float64
	sat  bool // some component's estimate is saturated (see quadScaleErr)
}

func (s quadSeg) estimate() float64 { return s.err }
func (s quadSeg) saturated() bool   { return s.sat }
func (s quadSeg) value() r3.Vec     { return s.val }

// gkRule applies the 15-point Kronrod rule to f on [a, b] with a < b.
func gkRule(f func(float64) r3.Vec, a, b float64) (quadSeg, error) {
	c := 0.5*a + 0.5*b
	h := 0.5*b - 0.5*a
	var fv [15]r3.Vec
	var resk, resg, resabs r3.Vec
	for i := range fv {
		v := f(c + h*gkNodes[i])
		fv[i] = v
		resk = r3.Add(resk, r3.Scale(gkKW[i], v))
		resg = r3.Add(resg, r3.Scale(gkGW[i], v))
		resabs = r3.Add(resabs, r3.Scale(gkKW[i], quadAbsVec(v)))
	}
	if !quadFiniteVec(resabs) || !quadFiniteVec(resk) {
		for i, v := range fv {
			if !quadFiniteVec(v) {
				return quadSeg{}, fmt.Errorf("em: integrand is not finite at t=%g: %v", c+h*gkNodes[i], v)
			}
		}
		return quadSeg{}, fmt.Errorf("em: integral overflows on [%g, %g]", a, b)
	}
	mean := r3.Scale(0.5, resk)
	var resasc r3.Vec
	for i, v := range fv {
		resasc = r3.Add(resasc, r3.Scale(gkKW[i], quadAbsVec(r3.Sub(v, mean))))
	}
	raw := quadAbsVec(r3.Scale(h, r3.Sub(resk, resg)))
	resabs = r3.Scale(h, resabs)
	resasc = r3.Scale(h, resasc)
	var e r3.Vec
	var sx, sy, sz bool
	e.X, sx = quadScaleErr(raw.X, resabs.X, resasc.X)
	e.Y, sy = quadScaleErr(raw.Y, resabs.Y, resasc.Y)
	e.Z, sz = quadScaleErr(raw.Z, resabs.Z, resasc.Z)
	return quadSeg{a: a, b: b, val: r3.Scale(h, resk), err: r3.Norm(e), sat: sx || sy || sz}, nil
}

// quadSplittable reports whether [a, b] can still be bisected meaningfully: the
// midpoint must lie strictly inside and the width must exceed the rounding
// level of the endpoints.
func quadSplittable(a, b float64) bool {
	m := 0.5*a + 0.5*b
	return a < m && m < b && b-a > 100*quadEps*math.Max(math.Abs(a), math.Abs(b))
}

// quadPiece is a region held in the adaptive heap.
type quadPiece interface {
	estimate() float64
	value() r3.Vec
	saturated() bool
}

// quadHeap is a max-heap on the error estimate for container/heap.
type quadHeap[T quadPiece] []T

func (h quadHeap[T]) Len() int           { return len(h) }
func (h quadHeap[T]) Less(i, j int) bool { return h[i].estimate() > h[j].estimate() }
func (h quadHeap[T]) Swap(i, j int)      { h[i], h[j] = h[j], h[i] }
func (h *quadHeap[T]) Push(x any)        { *h = append(*h, x.(T)) }
func (h *quadHeap[T]) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}

// push appends x and restores the heap order without boxing x in an
// interface (heap.Push would allocate once per bisection).
func (h *quadHeap[T]) push(x T) {
	*h = append(*h, x)
	heap.Fix(h, len(*h)-1)
}

// quadSums returns the compensated (Neumaier) sums of values and error estimates.
// Callers sort the pieces by position first so the order is independent of the
// heap layout.
func quadSums[T quadPiece](ps []T) (r3.Vec, float64) {
	var s, c [4]float64
	add := func(k int, x float64) {
		t := s[k] + x
		if math.Abs(s[k]) >= math.Abs(x) {
			c[k] += (s[k] - t) + x
		} else {
			c[k] += (x - t) + s[k]
		}
		s[k] = t
	}
	for _, p := range ps {
		v := p.value()
		add(0, v.X)
		add(1, v.Y)
		add(2, v.Z)
		add(3, p.estimate())
	}
	return r3.Vec{X: s[0] + c[0], Y: s[1] + c[1], Z: s[2] + c[2]}, s[3] + c[3]
}

// quadRoundoffLimit is how many bisections that neither reduce the error
// estimate (by 1% or more) nor change the value (by 1e-5 relative or more) are
// tolerated before the loop concludes that rounding error prevents progress
// (QUADPACK QAG's "iroff1 >= 6" test, Piessens et al., 1983).
const quadRoundoffLimit = 6

// quadRecompute is how many bisections may pass before the running sums are
// replaced by exact sums (they drift when large estimates are subtracted).
const quadRecompute = 64

// quadAdapt runs the globally adaptive loop. split bisects the worst piece (ok is
// false when it cannot be bisected) at a cost of splitCost integrand calls;
// less orders pieces by position for the final deterministic summation. The
// loop stops when the tolerance is met, the budget is spent, the worst piece
// cannot be split, or rounding prevents progress (quadRoundoffLimit).
func quadAdapt[T quadPiece](h quadHeap[T], evals, maxEval, splitCost int, tol Tol,
	split func(T) (T, T, bool, error), less func(x, y T) int) (r3.Vec, float64, int, float64, error) {
	target := func(v r3.Vec) float64 { return math.Max(tol.Abs, tol.Rel*r3.Norm(v)) }
	// the sums are always taken in position order (less), so the result
	// does not depend on the heap's order; pieces given in that order that
	// meet the tolerance at once (most integrals along a path's pieces)
	// need neither the heap nor a sort
	if slices.IsSortedFunc(h, less) {
		val, est := quadSums(h)
		if t := target(val); est <= t {
			return val, est, evals, t, nil
		}
	}
	heap.Init(&h)
	val, est := quadSums(h)
	roundoff := 0
	for iter := 1; ; iter++ {
		if err := tol.stopped(); err != nil {
			return r3.Vec{}, 0, evals, 0, err
		}
		if est <= target(val) || iter%quadRecompute == 0 {
			slices.SortFunc(h, less)
			val, est = quadSums(h)
			if t := target(val); est <= t {
				return val, est, evals, t, nil
			}
			heap.Init(&h)
		}
		if evals+splitCost > maxEval {
			break
		}
		worst := h[0]
		l, r, ok, err := split(worst)
		if err != nil {
			return r3.Vec{}, 0, evals, 0, err
		}
		if !ok {
			break
		}
		evals += splitCost
		v12 := r3.Add(l.value(), r.value())
		if !l.saturated() && !r.saturated() &&
			l.estimate()+r.estimate() >= 0.99*worst.estimate() &&
			r3.Norm(r3.Sub(v12, worst.value())) <= 1e-5*r3.Norm(v12) {
			roundoff++
		}
		val = r3.Add(val, r3.Sub(v12, worst.value()))
		est += l.estimate() + r.estimate() - worst.estimate()
		h[0] = l
		heap.Fix(&h, 0)
		h.push(r)
		if roundoff >= quadRoundoffLimit {
			break
		}
	}
	slices.SortFunc(h, less)
	val, est = quadSums(h)
	t := target(val)
	if est <= t {
		return val, est, evals, t, nil
	}
	return val, est, evals, t, ErrNoConvergence
}

func quadCheckTol(tol Tol) (int, error) {
	if !quadFinite(tol.Rel) || !quadFinite(tol.Abs) || tol.Rel < 0 || tol.Abs < 0 {
		return 0, fmt.Errorf("em: tolerance must be finite and non-negative, got Rel=%g Abs=%g", tol.Rel, tol.Abs)
	}
	if tol.Rel == 0 && tol.Abs == 0 {
		return 0, errors.New("em: tolerance Rel and Abs are both zero")
	}
	if tol.MaxEval < 0 {
		return 0, fmt.Errorf("em: negative MaxEval %d", tol.MaxEval)
	}
	if tol.MaxEval == 0 {
		return quadDefaultMaxEval, nil
	}
	return tol.MaxEval, nil
}

// quadIntegrate1 integrates f over the pieces pts[0..1], pts[1..2], ... with
// nondecreasing, finite pts.
func quadIntegrate1(f func(float64) r3.Vec, pts []float64, tol Tol) (r3.Vec, float64, int, float64, error) {
	maxEval, err := quadCheckTol(tol)
	if err != nil {
		return r3.Vec{}, 0, 0, 0, err
	}
	h := make(quadHeap[quadSeg], 0, 64)
	evals := 0
	for i := 1; i < len(pts); i++ {
		if pts[i] == pts[i-1] {
			continue
		}
		if err := tol.stopped(); err != nil {
			return r3.Vec{}, 0, evals, 0, err
		}
		s, err := gkRule(f, pts[i-1], pts[i])
		if err != nil {
			return r3.Vec{}, 0, evals, 0, err
		}
		evals += 15
		h = append(h, s)
	}
	if len(h) == 0 {
		return r3.Vec{}, 0, 0, 0, nil
	}
	split := func(s quadSeg) (quadSeg, quadSeg, bool, error) {
		if !quadSplittable(s.a, s.b) {
			return s, s, false, nil
		}
		m := 0.5*s.a + 0.5*s.b
		l, err := gkRule(f, s.a, m)
		if err != nil {
			return l, l, false, err
		}
		r, err := gkRule(f, m, s.b)
		return l, r, true, err
	}
	less := func(x, y quadSeg) int {
		switch {
		case x.a < y.a:
			return -1
		case x.a > y.a:
			return 1
		}
		return 0
	}
	return quadAdapt(h, evals, maxEval, 30, tol, split, less)
}

func quadCheckBounds(a, b float64) error {
	if !quadFinite(a) || !quadFinite(b) {
		return fmt.Errorf("em: integration bounds must be finite, got [%g, %g]", a, b)
	}
	return nil
}

// Integrate returns ∫_a^b f(t) dt and an error estimate.
//
// Method: globally adaptive Gauss–Kronrod G7–K15 (QUADPACK QAG scheme,
// Piessens et al., 1983). The interval with the largest error estimate is
// bisected until the summed estimate is <= max(tol.Abs, tol.Rel*|val|) or the
// budget tol.MaxEval is exhausted. Integrable endpoint singularities (such as
// x^-1/2 or ln x) converge because f is never evaluated at an endpoint;
// interior singularities or kinks should be given to IntegrateVecBreaks or
// split by the caller. Results are deterministic (bit-identical for identical
// inputs).
//
// If a > b the result is -∫_b^a f; a == b gives 0. Non-finite bounds, an
// invalid Tol or a nil f give a plain error; an integrand value that is NaN or
// ±Inf gives an error naming the point. If the tolerance is not met, the best
// value and estimate are returned together with a *QuadError wrapping
// ErrNoConvergence.
func Integrate(f func(t float64) float64, a, b float64, tol Tol) (val, errEst float64, err error) {
	if f == nil {
		return 0, 0, errors.New("em: nil integrand")
	}
	g := func(t float64) r3.Vec { return r3.Vec{X: f(t)} }
	v, e, err := IntegrateVec(g, a, b, tol)
	if qe, ok := err.(*QuadError); ok {
		qe.Value, qe.Vec = qe.Vec.X, r3.Vec{}
	}
	return v.X, e, err
}

// IntegrateVec returns ∫_a^b f(t) dt for a vector-valued integrand and an error
// estimate of the Euclidean norm of the error. Method, limits and error
// handling are those of Integrate; the three components share the sampling
// points, each component gets the QUADPACK error estimate and the interval
// estimate is their Euclidean norm.
func IntegrateVec(f func(t float64) r3.Vec, a, b float64, tol Tol) (val r3.Vec, errEst float64, err error) {
	if f == nil {
		return r3.Vec{}, 0, errors.New("em: nil integrand")
	}
	if err := quadCheckBounds(a, b); err != nil {
		return r3.Vec{}, 0, err
	}
	if a > b {
		v, e, err := IntegrateVec(f, b, a, tol)
		v = r3.Scale(-1, v)
		if qe, ok := err.(*QuadError); ok {
			qe.Vec = v
		}
		return v, e, err
	}
	return quadFinish1(quadIntegrate1(f, []float64{a, b}, tol))
}

func quadFinish1(v r3.Vec, e float64, evals int, target float64, err error) (r3.Vec, float64, error) {
	if errors.Is(err, ErrNoConvergence) {
		return v, e, &QuadError{Vec: v, Estimate: e, Target: target, Evals: evals}
	}
	return v, e, err
}

// IntegrateVecBreaks integrates a vector-valued f over [pts[0], pts[len-1]],
// first splitting the range at every interior point of pts. Use it when f has
// known kinks, jumps or near-singular points, such as the corners of a
// polyline: each piece then starts with its own G7–K15 estimate and the
// adaptive loop (as in IntegrateVec) refines all pieces in one global heap.
//
// pts must hold at least two finite values in nondecreasing order; repeated
// points are allowed and skipped. The initial rules cost 15 integrand calls
// per non-empty piece, even if that exceeds tol.MaxEval.
func IntegrateVecBreaks(f func(t float64) r3.Vec, pts []float64, tol Tol) (r3.Vec, float64, error) {
	if f == nil {
		return r3.Vec{}, 0, errors.New("em: nil integrand")
	}
	if len(pts) < 2 {
		return r3.Vec{}, 0, fmt.Errorf("em: need at least two break points, got %d", len(pts))
	}
	for i, p := range pts {
		if !quadFinite(p) {
			return r3.Vec{}, 0, fmt.Errorf("em: break point %d is not finite: %g", i, p)
		}
		if i > 0 && p < pts[i-1] {
			return r3.Vec{}, 0, fmt.Errorf("em: break points not sorted: pts[%d]=%g < pts[%d]=%g", i, p, i-1, pts[i-1])
		}
	}
	return quadFinish1(quadIntegrate1(f, pts, tol))
}

// quadRect is a sub-rectangle of a two-dimensional integral.
type quadRect struct {
	a0, b0, a1, b1 float64
	val, err       float64
	splitU         bool // bisect along u (else along v)
	sat            bool // an estimate is saturated (see quadScaleErr)
}

func (r quadRect) estimate() float64 { return r.err }
func (r quadRect) saturated() bool   { return r.sat }
func (r quadRect) value() r3.Vec     { return r3.Vec{X: r.val} }

// gkRule2 applies the tensor product of the 15-point Kronrod rule with itself
// on the rectangle. The error estimate for each direction comes from replacing
// the Kronrod rule by the embedded Gauss rule in that direction only; each is
// scaled as in QUADPACK's QK15, the rectangle's estimate is their sum, and the
// rectangle is marked to be bisected along the direction with the larger one.
func gkRule2(f func(u, v float64) float64, a0, b0, a1, b1 float64) (quadRect, error) {
	cu, hu := 0.5*a0+0.5*b0, 0.5*b0-0.5*a0
	cv, hv := 0.5*a1+0.5*b1, 0.5*b1-0.5*a1
	var fv [15][15]float64
	var rowK, rowG [15]float64
	var kk, gk, kg, abs float64
	for i := range fv {
		u := cu + hu*gkNodes[i]
		var rk, rg, ra float64
		for j := range fv[i] {
			y := f(u, cv+hv*gkNodes[j])
			fv[i][j] = y
			rk += gkKW[j] * y
			rg += gkGW[j] * y
			ra += gkKW[j] * math.Abs(y)
		}
		rowK[i], rowG[i] = rk, rg
		kk += gkKW[i] * rk
		gk += gkGW[i] * rk
		kg += gkKW[i] * rg
		abs += gkKW[i] * ra
	}
	if !quadFinite(abs) || !quadFinite(kk) {
		for i := range fv {
			for j, y := range fv[i] {
				if !quadFinite(y) {
					return quadRect{}, fmt.Errorf("em: integrand is not finite at (u, v)=(%g, %g): %g",
						cu+hu*gkNodes[i], cv+hv*gkNodes[j], y)
				}
			}
		}
		return quadRect{}, fmt.Errorf("em: integral overflows on [%g, %g]x[%g, %g]", a0, b0, a1, b1)
	}
	mean := kk / 4 // the reference square [-1,1]² has area 4
	var asc float64
	for i := range fv {
		var ra float64
		for j, y := range fv[i] {
			ra += gkKW[j] * math.Abs(y-mean)
		}
		asc += gkKW[i] * ra
	}
	s := hu * hv
	eu, su := quadScaleErr(math.Abs(kk-gk)*s, abs*s, asc*s)
	ev, sv := quadScaleErr(math.Abs(kk-kg)*s, abs*s, asc*s)
	splitU := eu > ev || (eu == ev && b0-a0 >= b1-a1)
	return quadRect{a0: a0, b0: b0, a1: a1, b1: b1, val: kk * s, err: eu + ev, splitU: splitU, sat: su || sv}, nil
}

// Integrate2 returns ∫_{a0}^{b0} ∫_{a1}^{b1} f(u, v) dv du over a rectangle and
// an error estimate.
//
// Method: a two-dimensional tensor-product G7–K15 rule (225 integrand calls
// per rectangle) with global subdivision: the rectangle with the largest error
// estimate is bisected along the direction whose Gauss-for-Kronrod
// substitution changes the result most, until the summed estimate is
// <= max(tol.Abs, tol.Rel*|val|) or tol.MaxEval is exhausted. It suits smooth
// integrands and integrable singularities on the boundary or at corners (for
// example 1/r at a corner); singular lines inside the rectangle should be put
// on a boundary by splitting the domain. Each bisection costs 450 calls, so
// the default budget allows about 440 bisections.
//
// A reversed range in either variable flips the sign. Validation and errors are
// as in Integrate.
func Integrate2(f func(u, v float64) float64, a0, b0, a1, b1 float64, tol Tol) (val, errEst float64, err error) {
	if f == nil {
		return 0, 0, errors.New("em: nil integrand")
	}
	if err := quadCheckBounds(a0, b0); err != nil {
		return 0, 0, err
	}
	if err := quadCheckBounds(a1, b1); err != nil {
		return 0, 0, err
	}
	maxEval, err := quadCheckTol(tol)
	if err != nil {
		return 0, 0, err
	}
	if a0 == b0 || a1 == b1 {
		return 0, 0, nil
	}
	sign := 1.0
	if a0 > b0 {
		a0, b0, sign = b0, a0, -sign
	}
	if a1 > b1 {
		a1, b1, sign = b1, a1, -sign
	}
	r0, err := gkRule2(f, a0, b0, a1, b1)
	if err != nil {
		return 0, 0, err
	}
	split := func(r quadRect) (quadRect, quadRect, bool, error) {
		if r.splitU {
			if !quadSplittable(r.a0, r.b0) {
				return r, r, false, nil
			}
			m := 0.5*r.a0 + 0.5*r.b0
			l, err := gkRule2(f, r.a0, m, r.a1, r.b1)
			if err != nil {
				return l, l, false, err
			}
			h, err := gkRule2(f, m, r.b0, r.a1, r.b1)
			return l, h, true, err
		}
		if !quadSplittable(r.a1, r.b1) {
			return r, r, false, nil
		}
		m := 0.5*r.a1 + 0.5*r.b1
		l, err := gkRule2(f, r.a0, r.b0, r.a1, m)
		if err != nil {
			return l, l, false, err
		}
		h, err := gkRule2(f, r.a0, r.b0, m, r.b1)
		return l, h, true, err
	}
	less := func(x, y quadRect) int {
		switch {
		case x.a0 < y.a0:
			return -1
		case x.a0 > y.a0:
			return 1
		case x.a1 < y.a1:
			return -1
		case x.a1 > y.a1:
			return 1
		}
		return 0
	}
	h := make(quadHeap[quadRect], 1, 64)
	h[0] = r0
	v, e, evals, target, err := quadAdapt(h, 225, maxEval, 450, tol, split, less)
	v.X *= sign
	if errors.Is(err, ErrNoConvergence) {
		return v.X, e, &QuadError{Value: v.X, Estimate: e, Target: target, Evals: evals}
	}
	return v.X, e, err
}

// quadCell is a box of a three-dimensional integral.
type quadCell struct {
	lo, hi [3]float64
	val    r3.Vec
	err    float64
	dir    int  // direction (0, 1, 2 for u, v, w) to bisect
	sat    bool // an estimate is saturated (see quadScaleErr)
}

func (c quadCell) estimate() float64 { return c.err }
func (c quadCell) saturated() bool   { return c.sat }
func (c quadCell) value() r3.Vec     { return c.val }

// quadCellPoints is the number of integrand calls of one 3-D rule.
const quadCellPoints = 15 * 15 * 15

// gkRule3 applies the tensor product of the 15-point Kronrod rule in each of
// the three directions on the box [lo, hi]. For each direction d the rule with
// the embedded 7-point Gauss rule in direction d only (Kronrod in the other
// two) is formed from the same 3375 values; the Kronrod–Gauss difference is
// scaled per component as in QUADPACK's QK15 (with resabs and resasc of the
// product rule), the components are combined in the Euclidean norm, and the
// box's estimate is the sum over the three directions. The box is marked to be
// bisected along the direction with the largest estimate (ties: the longest
// side). buf is scratch space for the values (needed for resasc).
func gkRule3(f func(u, v, w float64) r3.Vec, lo, hi [3]float64, buf *[quadCellPoints]r3.Vec) (quadCell, error) {
	var x [3][15]float64
	var h [3]float64
	for d := 0; d < 3; d++ {
		c := 0.5*lo[d] + 0.5*hi[d]
		h[d] = 0.5*hi[d] - 0.5*lo[d]
		for i := range x[d] {
			x[d][i] = c + h[d]*gkNodes[i]
		}
	}
	var kkk, gkk, kgk, kkg, abs r3.Vec
	n := 0
	for i := 0; i < 15; i++ {
		var jK, jGv, jGw, jA r3.Vec
		for j := 0; j < 15; j++ {
			var sK, sG, sA r3.Vec
			for k := 0; k < 15; k++ {
				y := f(x[0][i], x[1][j], x[2][k])
				buf[n] = y
				n++
				sK = r3.Add(sK, r3.Scale(gkKW[k], y))
				sG = r3.Add(sG, r3.Scale(gkGW[k], y))
				sA = r3.Add(sA, r3.Scale(gkKW[k], quadAbsVec(y)))
			}
			jK = r3.Add(jK, r3.Scale(gkKW[j], sK))
			jGv = r3.Add(jGv, r3.Scale(gkGW[j], sK))
			jGw = r3.Add(jGw, r3.Scale(gkKW[j], sG))
			jA = r3.Add(jA, r3.Scale(gkKW[j], sA))
		}
		kkk = r3.Add(kkk, r3.Scale(gkKW[i], jK))
		gkk = r3.Add(gkk, r3.Scale(gkGW[i], jK))
		kgk = r3.Add(kgk, r3.Scale(gkKW[i], jGv))
		kkg = r3.Add(kkg, r3.Scale(gkKW[i], jGw))
		abs = r3.Add(abs, r3.Scale(gkKW[i], jA))
	}
	if !quadFiniteVec(abs) || !quadFiniteVec(kkk) {
		n = 0
		for i := 0; i < 15; i++ {
			for j := 0; j < 15; j++ {
				for k := 0; k < 15; k++ {
					if y := buf[n]; !quadFiniteVec(y) {
						return quadCell{}, fmt.Errorf("em: integrand is not finite at (u, v, w)=(%g, %g, %g): %v",
							x[0][i], x[1][j], x[2][k], y)
					}
					n++
				}
			}
		}
		return quadCell{}, fmt.Errorf("em: integral overflows on [%g, %g]x[%g, %g]x[%g, %g]",
			lo[0], hi[0], lo[1], hi[1], lo[2], hi[2])
	}
	mean := r3.Scale(0.125, kkk) // the reference cube [-1,1]³ has volume 8
	var asc r3.Vec
	n = 0
	for i := 0; i < 15; i++ {
		var ja r3.Vec
		for j := 0; j < 15; j++ {
			var sa r3.Vec
			for k := 0; k < 15; k++ {
				sa = r3.Add(sa, r3.Scale(gkKW[k], quadAbsVec(r3.Sub(buf[n], mean))))
				n++
			}
			ja = r3.Add(ja, r3.Scale(gkKW[j], sa))
		}
		asc = r3.Add(asc, r3.Scale(gkKW[i], ja))
	}
	s := h[0] * h[1] * h[2]
	abs, asc = r3.Scale(s, abs), r3.Scale(s, asc)
	var e [3]float64
	sat := false
	for d, alt := range [3]r3.Vec{gkk, kgk, kkg} {
		raw := quadAbsVec(r3.Scale(s, r3.Sub(kkk, alt)))
		var c r3.Vec
		var sx, sy, sz bool
		c.X, sx = quadScaleErr(raw.X, abs.X, asc.X)
		c.Y, sy = quadScaleErr(raw.Y, abs.Y, asc.Y)
		c.Z, sz = quadScaleErr(raw.Z, abs.Z, asc.Z)
		e[d] = r3.Norm(c)
		sat = sat || sx || sy || sz
	}
	dir := 0
	for d := 1; d < 3; d++ {
		if e[d] > e[dir] || (e[d] == e[dir] && hi[d]-lo[d] > hi[dir]-lo[dir]) {
			dir = d
		}
	}
	return quadCell{lo: lo, hi: hi, val: r3.Scale(s, kkk), err: e[0] + e[1] + e[2], dir: dir, sat: sat}, nil
}

// quadIntegrate3 integrates f over the union of the given boxes (each with
// lo < hi in every direction) in one global adaptive heap.
func quadIntegrate3(f func(u, v, w float64) r3.Vec, boxes [][2][3]float64, tol Tol) (r3.Vec, float64, int, float64, error) {
	maxEval, err := quadCheckTol(tol)
	if err != nil {
		return r3.Vec{}, 0, 0, 0, err
	}
	buf := new([quadCellPoints]r3.Vec)
	h := make(quadHeap[quadCell], 0, 64)
	evals := 0
	for _, b := range boxes {
		if err := tol.stopped(); err != nil {
			return r3.Vec{}, 0, evals, 0, err
		}
		c, err := gkRule3(f, b[0], b[1], buf)
		if err != nil {
			return r3.Vec{}, 0, evals, 0, err
		}
		evals += quadCellPoints
		h = append(h, c)
	}
	if len(h) == 0 {
		return r3.Vec{}, 0, 0, 0, nil
	}
	split := func(c quadCell) (quadCell, quadCell, bool, error) {
		d := c.dir
		if !quadSplittable(c.lo[d], c.hi[d]) {
			return c, c, false, nil
		}
		m := 0.5*c.lo[d] + 0.5*c.hi[d]
		hiL, loR := c.hi, c.lo
		hiL[d], loR[d] = m, m
		l, err := gkRule3(f, c.lo, hiL, buf)
		if err != nil {
			return l, l, false, err
		}
		r, err := gkRule3(f, loR, c.hi, buf)
		return l, r, true, err
	}
	less := func(x, y quadCell) int {
		for d := 0; d < 3; d++ {
			switch {
			case x.lo[d] < y.lo[d]:
				return -1
			case x.lo[d] > y.lo[d]:
				return 1
			}
		}
		return 0
	}
	return quadAdapt(h, evals, maxEval, 2*quadCellPoints, tol, split, less)
}

// Integrate3 returns ∫_{a0}^{b0} ∫_{a1}^{b1} ∫_{a2}^{b2} f(u, v, w) dw dv du
// over a box and an error estimate.
//
// Method: the three-dimensional tensor product of the G7–K15 rule (3375
// integrand calls per box) with global subdivision, as Integrate2 does in two
// dimensions: each box's estimate is the sum over the three directions of the
// scaled difference made by substituting the 7-point Gauss rule for the
// Kronrod rule in that direction, and the box with the largest estimate is
// bisected along the direction whose substitution changes the result most,
// until the summed estimate is <= max(tol.Abs, tol.Rel*|val|) or tol.MaxEval
// is exhausted. Each bisection costs 6750 calls, so the default budget of
// 200000 allows only about 28 bisections; integrands with singular corners or
// edges usually need a larger tol.MaxEval (a corner 1/r² singularity at
// relative 1e-6 takes a few hundred thousand to a few million calls). It suits
// smooth integrands and integrable singularities on the boundary, best at a
// corner; singular points inside the box should be put at a corner by
// splitting the domain. The rule integrates products of polynomials of degree
// <= 22 in each variable exactly (error estimates are then at the rounding
// level wherever the degree is also <= 13). Results are deterministic.
//
// A reversed range in any variable flips the sign; a range of zero width gives
// 0. Validation and errors are as in Integrate: the initial rule (3375 calls)
// is always applied, and if the tolerance is not met the best value is
// returned with a *QuadError wrapping ErrNoConvergence.
func Integrate3(f func(u, v, w float64) float64, a0, b0, a1, b1, a2, b2 float64, tol Tol) (val, errEst float64, err error) {
	if f == nil {
		return 0, 0, errors.New("em: nil integrand")
	}
	g := func(u, v, w float64) r3.Vec { return r3.Vec{X: f(u, v, w)} }
	v, e, err := IntegrateVec3(g, a0, b0, a1, b1, a2, b2, tol)
	if qe, ok := err.(*QuadError); ok {
		qe.Value, qe.Vec = qe.Vec.X, r3.Vec{}
	}
	return v.X, e, err
}

// IntegrateVec3 returns the integral of a vector-valued f over a box and an
// estimate of the Euclidean norm of its error. The three components share the
// sampling points; method, limits and error handling are those of Integrate3,
// with each direction's estimate the Euclidean norm of the per-component
// QUADPACK estimates.
func IntegrateVec3(f func(u, v, w float64) r3.Vec, a0, b0, a1, b1, a2, b2 float64, tol Tol) (val r3.Vec, errEst float64, err error) {
	if f == nil {
		return r3.Vec{}, 0, errors.New("em: nil integrand")
	}
	lo, hi := [3]float64{a0, a1, a2}, [3]float64{b0, b1, b2}
	for d := 0; d < 3; d++ {
		if err := quadCheckBounds(lo[d], hi[d]); err != nil {
			return r3.Vec{}, 0, err
		}
	}
	if _, err := quadCheckTol(tol); err != nil {
		return r3.Vec{}, 0, err
	}
	sign := 1.0
	for d := 0; d < 3; d++ {
		if lo[d] == hi[d] {
			return r3.Vec{}, 0, nil
		}
		if lo[d] > hi[d] {
			lo[d], hi[d], sign = hi[d], lo[d], -sign
		}
	}
	v, e, evals, target, err := quadIntegrate3(f, [][2][3]float64{{lo, hi}}, tol)
	v = r3.Scale(sign, v)
	if errors.Is(err, ErrNoConvergence) {
		return v, e, &QuadError{Vec: v, Estimate: e, Target: target, Evals: evals}
	}
	return v, e, err
}
