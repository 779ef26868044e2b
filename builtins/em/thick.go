package em

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/integrate/quad"
)

// Thick coils: windings of many turns spread uniformly over a rectangular
// cross-section (radii Rin to Rout, an axial extent), as a continuum of
// coaxial circular filaments. The self-inductance is
//
//	L = N²/A² ∫∫ M(r1, r2, z1 − z2) dA1 dA2
//
// over the section twice, M Maxwell's formula for two coaxial circles
// (MaxwellMutual), A the section's area; the mutual inductance of two
// coaxial thick coils is N1N2/(A1A2) ∫∫ M over both sections.
//
// Method. The axial integrals depend only on u = z2 − z1, so each pair of
// axial extents becomes one integral over u with the (piecewise linear)
// overlap length as a weight. The remaining integrals are Gauss–Legendre
// product rules (nodes from gonum's quad.Legendre) on panels graded
// geometrically towards the point where two filaments meet, so that the
// logarithmic singularity of M at r1 = r2, u = 0 always sits at a panel
// corner. For the self-inductance the singular part is taken out in
// closed form: near coincidence M = μ0√(r1r2)·ln(1/ρ) + (bounded), ρ the
// distance of the filaments in the meridian plane, and √(r1r2) =
// (r1+r2)/2 − (√r1 − √r2)²/2; the integral of (r1+r2)/2·ln(1/ρ) over the
// rectangle twice is r̄·A²·ln(1/g) exactly (the part odd about the mean
// radius r̄ cancels by the rectangle's symmetry), g the geometric mean
// distance of the rectangle from itself in Maxwell's closed form
// (RectangleGMD). What is left has only a ρ² ln ρ singularity. The two
// radii are written r2 = w, r1 = w + v (v ≥ 0, by symmetry) so that the
// singular line r1 = r2 becomes the edge v = 0.
//
// Mutual inductance: the radial ranges are cut at each other's ends, so
// every pair of pieces is either one and the same interval or two
// intervals that at most touch; each pair is integrated directly, graded
// towards where the pieces come closest. No formula of another author is
// used for the integrals themselves: Lyle's and Stefan's series are
// approximations of the same quantity, and serve as checks.
//
// These are hand-written because gonum has no product or graded rules of
// this kind; only its Gauss–Legendre nodes are used.

// Section is the rectangular cross-section of a coaxial winding in a
// meridian plane: radii Rin to Rout, from Z0 to Z1 along the common axis
// (metres).
type Section struct {
	Rin, Rout, Z0, Z1 float64
}

// ErrSectionsOverlap is returned for two windings that would occupy the
// same space.
var ErrSectionsOverlap = errors.New("the two windings' cross-sections overlap (they would share space); coaxial coils must be apart or at most touch")

// thickOrder is the number of Gauss–Legendre points per panel; the tests
// show it with the grading below within 1e-9 of a rule of order 16 with
// twice the grading depth.
const thickOrder = 8

// gradeRatio is the ratio of neighbouring panels' sizes in a graded
// interval, and gradeFloor the smallest panel relative to the interval
// (at the singular corner itself).
const (
	gradeRatio = 0.2
	gradeFloor = 1e-6
)

// glRule is a Gauss–Legendre rule on [0, 1].
type glRule struct{ x, w []float64 }

func newGL(n int) glRule {
	r := glRule{x: make([]float64, n), w: make([]float64, n)}
	quad.Legendre{}.FixedLocations(r.x, r.w, 0, 1)
	return r
}

var thickGL = newGL(thickOrder)

// thickRule holds the rule and grading used; tests vary them.
type thickRule struct {
	gl    glRule
	ratio float64
	floor float64
}

var defaultThick = thickRule{gl: thickGL, ratio: gradeRatio, floor: gradeFloor}

// coarseThick is the same grading with two points fewer per panel; the
// difference of the two rules is the error estimate (the error of the
// lower order, which bounds that of the higher one where the panels
// resolve the integrand: the tests compare it with the error against a
// rule of twice the order and twice the grading depth).
var coarseThick = thickRule{gl: newGL(thickOrder - 2), ratio: gradeRatio, floor: gradeFloor}

// RectangleGMD returns the geometric mean distance of a rectangle of sides
// x and y from itself (J. C. Maxwell, A Treatise on Electricity and
// Magnetism, 1873, Vol. 2, §692; also E. B. Rosa and F. W. Grover,
// "Formulas and tables for the calculation of mutual and self-inductance",
// Bull. Bureau of Standards 8, 1912):
//
//	ln g = ln √(x²+y²) − (x²/6y²) ln √(1 + y²/x²) − (y²/6x²) ln √(1 + x²/y²)
//	       + (2x/3y) atan(y/x) + (2y/3x) atan(x/y) − 25/12.
//
// A square gives g = 0.44705·x, a thin strip (y → 0) g = x·e^{−3/2}.
func RectangleGMD(x, y float64) float64 {
	if y > x {
		x, y = y, x
	}
	if y == 0 {
		return x * math.Exp(-1.5)
	}
	q := y / x // 0 < q ≤ 1
	// the terms in y²/x² ln(1 + x²/y²) are written with log1p and the
	// ratio ≤ 1, so a thin strip keeps its digits
	lg := math.Log(x) + 0.5*math.Log1p(q*q) -
		math.Log1p(q*q)/(12*q*q) - q*q/12*math.Log1p(1/(q*q)) +
		2/(3*q)*math.Atan(q) + 2*q/3*math.Atan(1/q) - 25.0/12
	return math.Exp(lg)
}

// gradedBreaks returns panel ends on [lo, hi] graded towards s (clamped
// into the interval): the panels next to s are max(near, floor·(hi−lo))
// long and grow by 1/ratio away from it; extra points (kinks of a weight)
// are added.
func (tr thickRule) gradedBreaks(lo, hi, s, near float64, extra ...float64) []float64 {
	if hi <= lo {
		return nil
	}
	s = math.Max(lo, math.Min(hi, s))
	h := math.Max(near, tr.floor*(hi-lo))
	pts := []float64{lo, hi, s}
	for d := h; ; d /= tr.ratio {
		in := false
		if s-d > lo {
			pts = append(pts, s-d)
			in = true
		}
		if s+d < hi {
			pts = append(pts, s+d)
			in = true
		}
		if !in {
			break
		}
	}
	for _, e := range extra {
		if e > lo && e < hi {
			pts = append(pts, e)
		}
	}
	slices.Sort(pts)
	pts = slices.Compact(pts)
	// drop slivers left by an extra point next to a graded one
	out := pts[:1]
	for _, p := range pts[1:] {
		if p-out[len(out)-1] > 1e-14*(hi-lo) {
			out = append(out, p)
		}
	}
	out[len(out)-1] = hi
	return out
}

// nodes expands panel ends into quadrature points and weights.
func (tr thickRule) nodes(br []float64) (x, w []float64) {
	for i := 0; i+1 < len(br); i++ {
		a, h := br[i], br[i+1]-br[i]
		for k := range tr.gl.x {
			x = append(x, a+h*tr.gl.x[k])
			w = append(w, h*tr.gl.w[k])
		}
	}
	return x, w
}

// radialBreaks splits a radial range [lo, hi] (lo > 0) into panels no
// wider than the smaller radius they start at, so M's variation on the
// scale of the radius is resolved in thick coils with a small bore.
func radialBreaks(lo, hi float64) []float64 {
	pts := []float64{lo}
	for x := lo; x < hi; {
		x = math.Min(hi, 2*x)
		if hi-x < 1e-12*hi {
			x = hi
		}
		pts = append(pts, x)
	}
	return pts
}

func checkSection(what string, a, b, l float64) error {
	switch {
	case !(a > 0) || math.IsInf(a, 0):
		return fmt.Errorf("the inner radius%s must be positive", what)
	case !(b > a) || math.IsInf(b, 0):
		return fmt.Errorf("the outer radius%s must be larger than the inner radius", what)
	case !(l > 0) || math.IsInf(l, 0):
		return fmt.Errorf("the length%s must be positive", what)
	}
	return nil
}

// ThickCoilSelf returns the self-inductance per turn squared (H) of a
// winding uniformly spread over the rectangular section from radius a to
// b and of axial length l. The turns are taken as circular filaments
// filling the section evenly (uniform current density), so the result is
// that of the section itself, independent of the wire; a coil of round
// wire differs by a correction of order μ0·r̄·N per turn (Rosa's
// correction for the wire's own section and spacing).
func ThickCoilSelf(a, b, l float64) (float64, error) {
	if err := checkSection("", a, b, l); err != nil {
		return 0, err
	}
	return defaultThick.self(a, b, l), nil
}

// self returns L/N² of the section [a, b] × [0, l].
func (tr thickRule) self(a, b, l float64) float64 {
	t := b - a
	rc := (a + b) / 2
	// the closed-form singular part: μ0 r̄ A² ln(1/g), divided by A²
	sing := Mu0 * rc * -math.Log(RectangleGMD(t, l))
	// the rest: 4 ∫0^t dv ∫0^l du (l − u) ∫a^(b−v) F(w+v, w, u) dw, with
	// F = M − μ0 (r1+r2)/2 · ln(1/ρ), ρ = √(v² + u²)
	h := math.Min(t, l)
	vx, vw := tr.nodes(tr.gradedBreaks(0, t, 0, tr.floor*h))
	ux, uw := tr.nodes(tr.gradedBreaks(0, l, 0, tr.floor*h))
	var sum float64
	for i, v := range vx {
		wx, ww := tr.nodes(radialBreaks(a, b-v))
		var sv float64
		for j, u := range ux {
			lnr := 0.5 * math.Log(v*v+u*u)
			var s float64
			for k, w := range wx {
				r1 := w + v
				s += ww[k] * (MaxwellMutual(r1, w, u) + Mu0*(r1+w)/2*lnr)
			}
			sv += uw[j] * (l - u) * s
		}
		sum += vw[i] * sv
	}
	area := t * l
	return sing + 4*sum/(area*area)
}

// ThickCoilSelfEst is ThickCoilSelf with an error estimate: the change
// from a rule of lower order on the same panels, plus the closed forms'
// rounding. It costs about 40 % more.
func ThickCoilSelfEst(a, b, l float64) (v, est float64, err error) {
	if err := checkSection("", a, b, l); err != nil {
		return 0, 0, err
	}
	v = defaultThick.self(a, b, l)
	return v, math.Abs(v-coarseThick.self(a, b, l)) + closedFormRounding*math.Abs(v), nil
}

// ThickCoilMutualEst is ThickCoilMutual with an error estimate, as
// ThickCoilSelfEst.
func ThickCoilMutualEst(s1, s2 Section) (v, est float64, err error) {
	v, err = ThickCoilMutual(s1, s2)
	if err != nil {
		return 0, 0, err
	}
	return v, math.Abs(v-coarseThick.mutual(s1, s2)) + closedFormRounding*math.Abs(v), nil
}

// ThickCoilMutual returns the mutual inductance per product of turns (H)
// of two coaxial windings spread uniformly over the sections s1 and s2
// (see ThickCoilSelf). Sections that overlap are refused; sections that
// touch are allowed.
func ThickCoilMutual(s1, s2 Section) (float64, error) {
	for i, s := range []Section{s1, s2} {
		if err := checkSection(fmt.Sprintf(" of coil %d", i+1), s.Rin, s.Rout, s.Z1-s.Z0); err != nil {
			return 0, err
		}
	}
	rOver := math.Min(s1.Rout, s2.Rout) - math.Max(s1.Rin, s2.Rin)
	zOver := math.Min(s1.Z1, s2.Z1) - math.Max(s1.Z0, s2.Z0)
	if rOver > 0 && zOver > 0 {
		return 0, ErrSectionsOverlap
	}
	return defaultThick.mutual(s1, s2), nil
}

// mutual returns M/(N1N2) of two sections that do not overlap.
func (tr thickRule) mutual(s1, s2 Section) float64 {
	cuts := []float64{s1.Rin, s1.Rout, s2.Rin, s2.Rout}
	slices.Sort(cuts)
	cuts = slices.Compact(cuts)
	pieces := func(lo, hi float64) [][2]float64 {
		var out [][2]float64
		for i := 0; i+1 < len(cuts); i++ {
			if cuts[i] >= lo && cuts[i+1] <= hi {
				out = append(out, [2]float64{cuts[i], cuts[i+1]})
			}
		}
		return out
	}
	var sum float64
	for _, p := range pieces(s1.Rin, s1.Rout) {
		for _, q := range pieces(s2.Rin, s2.Rout) {
			sum += tr.pair(p, q, s1, s2)
		}
	}
	return sum / ((s1.Rout - s1.Rin) * (s1.Z1 - s1.Z0) * (s2.Rout - s2.Rin) * (s2.Z1 - s2.Z0))
}

// pair returns ∫_P dr1 ∫_Q dr2 ∫∫ M dz1 dz2 for radial pieces p of
// section s1 and q of s2, which are the same interval or at most touch.
func (tr thickRule) pair(p, q [2]float64, s1, s2 Section) float64 {
	// u = z2 − z1 ranges over [ulo, uhi] with weight
	// wt(u) = |[z1a, z1b] ∩ [z2a − u, z2b − u]|, linear between its kinks
	ulo, uhi := s2.Z0-s1.Z1, s2.Z1-s1.Z0
	kinks := []float64{s2.Z0 - s1.Z0, s2.Z1 - s1.Z1}
	wt := func(u float64) float64 {
		return math.Max(0, math.Min(s1.Z1, s2.Z1-u)-math.Max(s1.Z0, s2.Z0-u))
	}
	u0 := math.Max(ulo, math.Min(uhi, 0)) // the u nearest coincidence
	zgap := math.Abs(u0)
	size := math.Max(math.Max(p[1]-p[0], q[1]-q[0]), uhi-ulo)
	if p == q {
		// one radial interval: r1 = w + v, r2 = w and the mirror image;
		// the sections do not overlap, so the axial extents are apart by
		// zgap ≥ 0 and u never crosses 0
		a, b := p[0], p[1]
		t := b - a
		near := math.Max(zgap, tr.floor*size)
		vx, vw := tr.nodes(tr.gradedBreaks(0, t, 0, near))
		ux, uw := tr.nodes(tr.gradedBreaks(ulo, uhi, u0, near, kinks...))
		var sum float64
		for i, v := range vx {
			wx, ww := tr.nodes(radialBreaks(a, b-v))
			var sv float64
			for j, u := range ux {
				var s float64
				for k, w := range wx {
					s += ww[k] * MaxwellMutual(w+v, w, u)
				}
				sv += uw[j] * wt(u) * s
			}
			sum += vw[i] * sv
		}
		return 2 * sum
	}
	// two intervals that at most touch: they come closest at the ends
	// facing each other
	var r1s, r2s, rgap float64
	if p[1] <= q[0] {
		r1s, r2s, rgap = p[1], q[0], q[0]-p[1]
	} else {
		r1s, r2s, rgap = p[0], q[1], p[0]-q[1]
	}
	near := math.Max(math.Hypot(rgap, zgap), tr.floor*size)
	r1x, r1w := tr.nodes(tr.gradedBreaks(p[0], p[1], r1s, near, radialBreaks(p[0], p[1])...))
	r2x, r2w := tr.nodes(tr.gradedBreaks(q[0], q[1], r2s, near, radialBreaks(q[0], q[1])...))
	ux, uw := tr.nodes(tr.gradedBreaks(ulo, uhi, u0, near, kinks...))
	var sum float64
	for i, r1 := range r1x {
		var si float64
		for j, r2 := range r2x {
			var s float64
			for k, u := range ux {
				s += uw[k] * wt(u) * MaxwellMutual(r1, r2, u)
			}
			si += r2w[j] * s
		}
		sum += r1w[i] * si
	}
	return sum
}
