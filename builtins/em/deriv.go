package em

// Derivatives by step search, for the language's emf, induced E, ddt, curl
// and div.

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Derivatives by step search: one algorithm for time derivatives (emf, the
// induced E of sources, ddt) and for partial derivatives in space (curl,
// div).
//
// For steps h = base·10^e, e = lowest … 0, the central difference
// D(h) = (g(s+h) − g(s−h))/2h is improved by one Richardson step,
// D1(h) = (4·D(h/2) − D(h))/3, whose truncation error falls like h⁴
// (Burden & Faires, Numerical Analysis, 9th ed., 2011, §4.1 for the
// three-point formulas and §4.2 for Richardson's extrapolation; from
// memory). Rounding of the values makes D1 wander like
// 1/h for small steps, truncation like h⁴ for large ones; between them the
// estimates of neighbouring steps agree. Their disagreement
// diff(h) = |D1(h·10) − D1(h)| + |D1(h) − D1(h/10)| is the error estimate.
//
// Which step: in time (firstAgree) the first step, going up from the
// smallest, whose diff is within 1e-6 of the derivative's scale (so that a
// periodic signal sampled at whole periods, which looks constant at large
// steps, cannot fool it); in space the step with the smallest diff (the
// balance of truncation and rounding). The derivative's scale is the larger
// of |D1| and the steepest chord |g(s±h) − g(s)|/h seen at the chosen step
// and up to four decades above it: the rate at which the function really
// changes near s.
// Measuring against |D1| alone would refuse every derivative that is zero
// (the top of a sine, the centre of a symmetric coil), whose estimates are
// pure rounding. An estimate is accepted when diff ≤ 1e-3 of that scale.
//
// Kinks: at a corner with slopes a (before) and b (after), D(h) is exactly
// (a+b)/2 at every step, so the estimates agree and the plateau alone would
// return the average. The one-sided second-order differences at step h/2,
//
//	D+ = (−3g(s) + 4g(s+h/2) − g(s+h))/h,  D− = (3g(s) − 4g(s−h/2) + g(s−h))/h,
//
// both equal g'(s) − (h²/12)g'''(s) + O(h³) for a smooth g, so their gap
// |D+ − D−| = (h³/16)|g''''(s)| + O(h⁵) falls a thousandfold per decade of
// step (Taylor expansion, as for the formulas of Burden & Faires §4.1), and
// rounding makes it grow tenfold per decade going down; at a kink it stays
// |b − a| at every step below the kink's neighbourhood. A kink is reported
// when, on three consecutive steps where the central estimates have
// converged, the gap stays within a factor 3 (a smooth function changes it
// by at least 10 per decade), is above the rounding bound
// 16·δ/h (each one-sided difference weighs the values by 3 + 4 + 1 over h,
// δ the values' error: 1e-13 of their size, allowing a few hundred
// roundings, or what the smaller steps showed, whichever is larger) and is
// above 1e-8 of the derivative's scale.

// ErrNoPlateau is returned when no step gives agreeing estimates (a jump,
// a function not defined at the point, or one too rough to differentiate).
var ErrNoPlateau = errors.New("em: no step gives agreeing derivative estimates")

// KinkError reports a corner at the point of differentiation: the one-sided
// derivatives before and after differ.
type KinkError struct{ Before, After Vec }

func (e *KinkError) Error() string {
	return fmt.Sprintf("em: kink: the one-sided derivatives are %v before and %v after", e.Before, e.After)
}

// AxisKinkError is a kink of a field along one coordinate axis (0, 1, 2).
type AxisKinkError struct {
	Axis int
	*KinkError
}

// valueNoise is the relative error assumed for a function's values when
// bounding rounding in the kink test (a few hundred roundings of 1.1e-16).
const valueNoise = 1e-13

type derivStep struct {
	h           float64
	d1          Vec     // Richardson-extrapolated central difference
	gap         float64 // |D+ − D−| at step h/2
	plus, minus Vec     // one-sided differences at step h/2
	chord, m    float64 // steepest chord from s at steps h, h/2; largest |g|
}

// Derivative estimates dg/ds at s with steps base·10^e, e = lowest … 0 (see
// the comment above); it returns the estimate, an error wrapping
// ErrNoPlateau (and g's error if g fails at s itself), a *KinkError, or g's
// own error if it fails at the smallest step.
func Derivative(g func(s float64) (Vec, error), s, base float64, lowest int, firstAgree bool) (Vec, error) {
	d, _, err := DerivativeEst(g, s, base, lowest, firstAgree)
	return d, err
}

// DerivativeEst is Derivative with an error estimate: the change of the
// extrapolated estimate to the neighbouring steps on both sides of the
// chosen one, |D(h·10) − D(h)| + |D(h) − D(h/10)| (the plateau's own
// test), which the tests find above the actual error in every case.
func DerivativeEst(g func(s float64) (Vec, error), s, base float64, lowest int, firstAgree bool) (Vec, float64, error) {
	st, err := newDerivLadder(g, s, base, lowest)
	if err != nil {
		return Vec{}, 0, err
	}
	p, err := st.plateau(firstAgree, 0)
	if err != nil {
		return Vec{}, 0, err
	}
	return p.est, st.errorEstimate(p), st.kink(p, 0)
}

// errorEstimate bounds the error of the chosen estimate: the truncation
// part by the plateau's change to the neighbouring steps, and the
// rounding part by 3δ/h, the most an error δ in each value of g can move
// the extrapolated difference (4·D(h/2) − D(h))/3 at step h, with δ the
// larger of the noise the smaller steps showed (as in kink) and 4 ulps
// of the largest |g| seen.
func (st derivLadder) errorEstimate(p derivPlateau) float64 {
	var noise float64
	for i := 0; i < p.best; i++ {
		noise = math.Max(noise, r3.Norm(r3.Sub(st[i].d1, p.est))*st[i].h/3)
	}
	b := st[p.best]
	delta := math.Max(noise, 4*0x1p-52*b.m)
	return p.diff + 3*delta/b.h
}

// derivLadder holds the estimates of every step, smallest first.
type derivLadder []derivStep

// newDerivLadder evaluates g at s and at s ± h, s ± h/2 for every step.
func newDerivLadder(g func(s float64) (Vec, error), s, base float64, lowest int) (derivLadder, error) {
	var g0 Vec
	var st derivLadder
	for e := lowest; e <= 0; e++ {
		h := base * math.Pow10(e)
		var v [4]Vec
		var err error
		for k, x := range [4]float64{s + h, s - h, s + h/2, s - h/2} {
			if v[k], err = g(x); err != nil {
				break
			}
		}
		if err != nil {
			// the function fails far from s (an exponential overflowing,
			// say): keep the steps gathered so far
			if len(st) >= 3 {
				break
			}
			return nil, err
		}
		if e == lowest {
			// g near s works; at s itself it may not (1/t at t = 0)
			if g0, err = g(s); err != nil {
				return nil, fmt.Errorf("%w: %w", ErrNoPlateau, err)
			}
		}
		n0 := r3.Norm(g0)
		d := r3.Scale(1/(2*h), r3.Sub(v[0], v[1]))
		dh := r3.Scale(1/h, r3.Sub(v[2], v[3]))
		plus := r3.Scale(1/h, r3.Add(r3.Scale(-3, g0), r3.Sub(r3.Scale(4, v[2]), v[0])))
		minus := r3.Scale(1/h, r3.Add(r3.Scale(3, g0), r3.Sub(v[1], r3.Scale(4, v[3]))))
		ds := derivStep{h: h, d1: r3.Scale(1.0/3, r3.Sub(r3.Scale(4, dh), d)), plus: plus, minus: minus,
			gap: r3.Norm(r3.Sub(plus, minus)), m: n0}
		for k, x := range v {
			ds.m = math.Max(ds.m, r3.Norm(x))
			step := h
			if k >= 2 {
				step = h / 2
			}
			ds.chord = math.Max(ds.chord, r3.Norm(r3.Sub(x, g0))/step)
		}
		if !finiteVec(ds.d1) || !quadFinite(ds.chord) {
			if len(st) >= 3 {
				break
			}
			return nil, ErrNoPlateau
		}
		st = append(st, ds)
	}
	if len(st) < 3 {
		return nil, ErrNoPlateau
	}
	return st, nil
}

// derivPlateau is the chosen step of a ladder.
type derivPlateau struct {
	best  int
	diff  float64 // |D(best+1) − D(best)| + |D(best) − D(best−1)|
	est   Vec
	scale float64 // the derivative's scale: max(|D1|, steepest chord at steps ≥ best)
}

// plateau chooses the step; floor is a scale the caller knows the
// derivative has (the other partial derivatives of a field; 0 if none).
func (st derivLadder) plateau(firstAgree bool, floor float64) (derivPlateau, error) {
	// scale[i]: the derivative's scale judged from steps i to i+4 (four
	// decades up: far enough to see a zero derivative's neighbourhood, not
	// so far that a function that grows fast, an exponential, swamps it)
	scale := make([]float64, len(st))
	for i := range st {
		scale[i] = floor
		for k := i; k < len(st) && k <= i+4; k++ {
			scale[i] = math.Max(scale[i], st[k].chord)
		}
	}
	diff := func(i int) float64 {
		return r3.Norm(r3.Sub(st[i+1].d1, st[i].d1)) + r3.Norm(r3.Sub(st[i].d1, st[i-1].d1))
	}
	sc := func(i int) float64 { return math.Max(r3.Norm(st[i].d1), scale[i]) }
	best, bestDiff := -1, math.Inf(1)
	for i := 1; i+1 < len(st); i++ {
		di := diff(i)
		if firstAgree && di <= 1e-6*sc(i) {
			best, bestDiff = i, di
			break
		}
		if di < bestDiff {
			best, bestDiff = i, di
		}
	}
	if best < 0 || !(bestDiff <= 1e-3*sc(best)) {
		return derivPlateau{}, ErrNoPlateau
	}
	return derivPlateau{best: best, diff: bestDiff, est: st[best].d1, scale: sc(best)}, nil
}

// kink tests for a corner at s (see the comment above); floor as for
// plateau.
func (st derivLadder) kink(p derivPlateau, floor float64) error {
	best, est, S := p.best, p.est, math.Max(p.scale, floor)
	// the run of steps around best whose estimates have converged to est
	conv := func(i int) bool { return r3.Norm(r3.Sub(st[i].d1, est)) <= 1e-3*S }
	lo, hi := best, best
	for lo > 0 && conv(lo-1) {
		lo--
	}
	for hi+1 < len(st) && conv(hi+1) {
		hi++
	}
	// the noise the smaller steps showed, as an error of the values
	var noise float64
	for i := 0; i < best; i++ {
		noise = math.Max(noise, r3.Norm(r3.Sub(st[i].d1, est))*st[i].h/3)
	}
	above := func(i int) bool {
		delta := math.Max(valueNoise*st[i].m, noise)
		return st[i].gap > 16*delta/st[i].h && st[i].gap > 1e-8*S
	}
	for i := lo; i+2 <= hi; i++ {
		if !above(i) || !above(i+1) || !above(i+2) {
			continue
		}
		g1, g2, g3 := st[i].gap, st[i+1].gap, st[i+2].gap
		if g1 <= 3*g2 && g2 <= 3*g1 && g2 <= 3*g3 && g3 <= 3*g2 {
			// report the slopes at the largest step whose gap still equals
			// the triple's middle one to 1e-6 (the least rounding, before
			// the pieces' own curvature or another corner shows), else at
			// the triple's top
			k := i + 2
			for k+1 <= hi && math.Abs(st[k+1].gap-g2) <= 1e-6*g2 {
				k++
			}
			return &KinkError{Before: st[k].minus, After: st[k].plus}
		}
	}
	return nil
}

// Jacobian returns J[j] = ∂F/∂x_j (column j holds the derivatives along
// axis j) at x, with steps from 1 nm to 1 m. Each partial derivative is
// judged against the largest scale of the three (a column that is zero by
// symmetry is then not mistaken for noise). Errors: ErrNoPlateau (wrapped),
// *AxisKinkError, or eval's own.
func Jacobian(eval func(Vec) (Vec, error), x Vec) ([3]Vec, error) {
	cols, _, err := JacobianEst(eval, x)
	return cols, err
}

// JacobianEst is Jacobian with an error estimate: the largest over the
// columns of the extrapolation's change to the neighbouring steps plus the
// rounding of the field's values over the step (as DerivativeEst), a bound
// on each entry.
func JacobianEst(eval func(Vec) (Vec, error), x Vec) ([3]Vec, float64, error) {
	var cols [3]Vec
	var lads [3]derivLadder
	var plats [3]derivPlateau
	axes := [3]Vec{{X: 1}, {Y: 1}, {Z: 1}}
	for j := 0; j < 3; j++ {
		var err error
		lads[j], err = newDerivLadder(func(s float64) (Vec, error) {
			return eval(r3.Add(x, r3.Scale(s, axes[j])))
		}, 0, 1, -9)
		if err != nil {
			return cols, 0, err
		}
	}
	// the largest scale of the columns that have a plateau on their own
	var floor float64
	for j := 0; j < 3; j++ {
		if p, err := lads[j].plateau(false, 0); err == nil {
			floor = math.Max(floor, p.scale)
		}
	}
	for j := 0; j < 3; j++ {
		var err error
		if plats[j], err = lads[j].plateau(false, floor); err != nil {
			return cols, 0, err
		}
	}
	for j := 0; j < 3; j++ {
		var ke *KinkError
		if errors.As(lads[j].kink(plats[j], floor), &ke) {
			return cols, 0, &AxisKinkError{Axis: j, KinkError: ke}
		}
		cols[j] = plats[j].est
	}
	var est float64
	for j := 0; j < 3; j++ {
		est = math.Max(est, lads[j].errorEstimate(plats[j]))
	}
	return cols, est, nil
}
