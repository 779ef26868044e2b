package em

// Inductance of printed traces: straight bars of rectangular section and
// arcs of the same section, summed by Greenhouse's method — the
// self-inductance of every piece plus the mutual inductance of every pair
// of pieces (H. M. Greenhouse, "Design of planar rectangular
// microelectronic inductors", IEEE Trans. Parts, Hybrids and Packaging
// 10(2), 1974).

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r3"
)

// greenhouseConst is the constant of Greenhouse's bar formula (1974,
// eq. for the self-inductance of a straight conductor of rectangular
// section, after Grover 1946).
const greenhouseConst = 0.50049

// gmdRect is the factor of the common approximation of the geometric mean
// distance of a rectangle of sides w and t from itself, g ≈ 0.2235(w + t)
// (Grover, Inductance Calculations, 1946, table of GMDs of rectangles:
// within about 0.3 % for any ratio of the sides).
const gmdRect = 0.2235

// BarSelf returns the low-frequency self-inductance of a straight bar of
// length l and rectangular section w × t (uniform current):
//
//	L = μ0/2π · l · [ln(2l/(w+t)) + 0.50049 + (w+t)/(3l)]
//
// (Greenhouse 1974, after Grover 1946). The formula assumes l well above
// w + t; it stays positive for any l > 0.
func BarSelf(l, w, t float64) float64 {
	s := w + t
	return Mu0 / (2 * math.Pi) * l * (math.Log(2*l/s) + greenhouseConst + s/(3*l))
}

// BarGMD returns the geometric mean distance of a w × t rectangle from
// itself, 0.2235(w + t).
func BarGMD(w, t float64) float64 { return gmdRect * (w + t) }

// ParallelMutual returns the mutual inductance of two straight filaments
// p and q when they are parallel or antiparallel (ok false otherwise):
// with x along p (0 to l1), q spanning lo to hi along x at a distance d
// from p's line,
//
//	M = ±μ0/4π [G(hi) − G(hi − l1) − G(lo) + G(lo − l1)],
//	G(u) = u·asinh(u/d) − √(u² + d²),
//
// the closed form of Neumann's integral for parallel filaments (Grover,
// Inductance Calculations, 1946, chapter on straight filaments; Campbell's
// form). For collinear filaments (d = 0) that do not overlap, G is
// replaced by its limit u·ln|u|. Overlapping collinear filaments have an
// infinite mutual inductance and return an error.
func ParallelMutual(p, q Prim) (m float64, ok bool, err error) {
	if p.Kind != Segment || q.Kind != Segment {
		return 0, false, nil
	}
	dp, dq := r3.Sub(p.B, p.A), r3.Sub(q.B, q.A)
	l1, l2 := r3.Norm(dp), r3.Norm(dq)
	e := r3.Scale(1/l1, dp)
	c := r3.Dot(e, dq) / l2
	if math.Abs(c) < 1-1e-12 {
		return 0, false, nil
	}
	s1 := r3.Dot(r3.Sub(q.A, p.A), e)
	s2 := r3.Dot(r3.Sub(q.B, p.A), e)
	lo, hi := math.Min(s1, s2), math.Max(s1, s2)
	perp := r3.Sub(r3.Sub(q.A, p.A), r3.Scale(s1, e))
	d := r3.Norm(perp)
	var g func(u float64) float64
	if d <= 1e-12*math.Max(l1, l2) {
		if hi > 0 && lo < l1 {
			return 0, true, errors.New("two straight pieces overlap on one line")
		}
		g = func(u float64) float64 {
			if u == 0 {
				return 0
			}
			return u * math.Log(math.Abs(u))
		}
	} else {
		g = func(u float64) float64 { return u*math.Asinh(u/d) - math.Hypot(u, d) }
	}
	v := g(hi) - g(hi-l1) - g(lo) + g(lo-l1)
	return math.Copysign(k0*v, c), true, nil
}

// arcSelfGMD is the self-inductance of an arc of a trace by the GMD
// method: the mutual inductance of two filaments along the arc a distance
// g (the section's GMD) apart, taken as μ0/4π ∫∫ dl·dl'/√(|r − r'|² + g²)
// over the arc with itself. With ψ = φ − φ' the double integral over
// [0, Φ]² is 2∫₀^Φ (Φ − ψ) R² cos ψ / √(4R² sin²(ψ/2) + g²) dψ; a whole
// circle gives Maxwell's M(R, R, g), the ring of Rosa & Grover's GMD
// method, μ0R[ln(8R/g) − 2] for R ≫ g.
func arcSelfGMD(p Prim, g float64, tol Tol) (float64, error) {
	R, phi := p.R, math.Abs(p.Span)
	kern := func(psi float64) float64 {
		s := math.Sin(psi / 2)
		return 2 * (phi - psi) * R * R * math.Cos(psi) / math.Sqrt(4*R*R*s*s+g*g)
	}
	pts := []float64{0, math.Min(phi, 4*g/R), phi}
	if pts[1] == phi {
		pts = pts[:2]
	}
	var sum float64
	for i := 0; i+1 < len(pts); i++ {
		v, e, err := Integrate(kern, pts[i], pts[i+1], tol.with(tol.Rel, tol.Rel*R*1e-3))
		if err = loose(err); err != nil {
			return 0, err
		}
		sum += v
		tol.addEst(k0 * e)
	}
	return k0 * sum, nil
}

// loose accepts a quadrature that stopped short of its tolerance when its
// error estimate is within 1e-7 of its value, far below the accuracy of
// the trace model.
func loose(err error) error {
	var qe *QuadError
	if errors.As(err, &qe) && qe.Estimate <= 1e-7*math.Abs(qe.Value) {
		return nil
	}
	return err
}

// pairNeumann is μ0/4π ∫_p ∫_q dl_p·dl_q/|r_p − r_q| for two pieces as the
// circulation of q's closed-form vector potential along p, by adaptive
// Gauss–Kronrod per quarter turn. Pieces that meet at an end have a
// logarithmic peak of the integrand there, which the adaptive rule
// bisects towards.
func pairNeumann(p, q Prim, tol Tol) (float64, error) {
	var ferr error
	f := func(t float64) float64 {
		if ferr != nil {
			return 0
		}
		x := p.Point(t)
		a, err := PrimA(q, x)
		if errors.Is(err, ErrOnWire) && atJoint(x, p, q) {
			return 0 // a sample rounded onto the joint: a point of no weight
		}
		if err != nil {
			ferr = err
			return 0
		}
		return r3.Dot(a, p.Tangent(t))
	}
	// innerMax is the largest error estimate of an inner integral (arcs):
	// the inner errors add at most innerMax·(length of the parameter
	// range) to the outer integral
	var innerMax float64
	if q.Kind == Arc {
		inner := tol.with(tol.Rel*0.1, 0)
		inner.Est = nil
		f = func(t float64) float64 {
			if ferr != nil {
				return 0
			}
			var e float64
			in := inner
			if tol.Est != nil {
				in.Est = &e
			}
			v, err := arcAlong(q, p.Point(t), p.Tangent(t), in)
			if err != nil {
				ferr = err
			}
			innerMax = math.Max(innerMax, e)
			return v
		}
	}
	br := primBreaks(p)
	// a joint with q: a mesh graded towards it, where the integrand has
	// a logarithmic peak
	scale := 1e-9 * math.Max(p.Length(), q.Length())
	for k, e := range []Vec{p.Start(), p.End()} {
		if r3.Norm(r3.Sub(e, q.Start())) > scale && r3.Norm(r3.Sub(e, q.End())) > scale {
			continue
		}
		for g := 0.25; g > 1e-12; g /= 4 {
			if k == 0 {
				br = append(br, g)
			} else {
				br = append(br, 1-g)
			}
		}
	}
	slices.Sort(br)
	br = slices.Compact(br)
	// an absolute floor per piece: the relative accuracy of a mutual
	// inductance of order μ0/4π times the shorter length
	abs := tol.Rel * k0 * math.Min(p.Length(), q.Length()) / float64(len(br))
	var sum float64
	for k := 0; k+1 < len(br); k++ {
		v, e, err := Integrate(f, br[k], br[k+1], tol.with(tol.Rel, abs))
		if ferr != nil {
			return 0, ferr
		}
		var qe *QuadError
		if errors.As(err, &qe) && qe.Estimate <= 100*abs {
			err = nil
		}
		if err = loose(err); err != nil {
			return 0, err
		}
		sum += v
		tol.addEst(e)
	}
	// the parameter runs over [0, 1]; the closed-form potentials' rounding
	tol.addEst(innerMax + closedFormRounding*sum)
	return sum, nil
}

// pairMutual is the mutual inductance of two pieces of a trace: the
// closed form for parallel straight pieces, zero for perpendicular ones,
// Neumann's integral otherwise.
func pairMutual(p, q Prim, tol Tol) (float64, error) {
	if m, ok, err := ParallelMutual(p, q); ok || err != nil {
		return m, err
	}
	if p.Kind == Segment && q.Kind == Segment {
		dp, dq := r3.Sub(p.B, p.A), r3.Sub(q.B, q.A)
		if math.Abs(r3.Dot(dp, dq)) <= 1e-12*r3.Norm(dp)*r3.Norm(dq) {
			return 0, nil // dl·dl' = 0 everywhere
		}
	}
	return pairNeumann(p, q, tol)
}

// TraceInductance returns the low-frequency self-inductance of a path of
// flat trace (width w, thickness t, uniform current) by Greenhouse's
// method: the sum of the self-inductances of its pieces — straight pieces
// by Greenhouse's bar formula (BarSelf), arcs by the GMD method with the
// section's GMD 0.2235(w + t) — and of the mutual inductances of every
// pair of pieces, taken between their centre lines: the closed form for
// parallel straight pieces (ParallelMutual), zero for perpendicular ones,
// Neumann's integral for the others (oblique pieces, arcs). An open path
// gives the partial self-inductance. Helices are refused: a trace is
// made of straight pieces and arcs.
//
// The centre-line mutual terms are those of Greenhouse's paper; the
// geometric mean distance of two side-by-side traces differs from their
// centre distance d by a factor exp(−(w/d)²/12 − …), a fraction of a
// percent of the neighbours' mutual terms for spacing s ≥ w/2.
func TraceInductance(path Path, w, t float64, tol Tol) (float64, error) {
	if !(w > 0) || !(t > 0) || math.IsInf(w, 0) || math.IsInf(t, 0) {
		return 0, errors.New("the trace width and thickness must be positive")
	}
	if len(path.Prims) == 0 {
		return 0, errors.New("the path is empty")
	}
	if tol.Rel == 0 {
		tol = tol.with(1e-9, 0)
	}
	g := BarGMD(w, t)
	for _, p := range path.Prims {
		switch {
		case p.Kind == Helix:
			return 0, errors.New("a helix is not a trace: trace inductance takes straight pieces and arcs")
		case p.Kind == Arc && p.R <= w:
			return 0, fmt.Errorf("an arc's radius (%.4g m) is not larger than the trace width (%.4g m)", p.R, w)
		}
	}
	n := len(path.Prims)
	progress := tol.Progress
	tol.Progress = nil
	rowTol := tol
	rowTol.Progress = progress
	// row i holds piece i's self term and its mutual terms with the pieces
	// after it; sumRows adds the rows in a fixed order
	tol.Est = nil // each row adds to its own slot (sumRows)
	return sumRows(n, rowTol, func() func(i int, est *float64) (float64, error) {
		return func(i int, est *float64) (float64, error) {
			rt := tol
			rt.Est = est
			return traceRow(path.Prims, i, w, t, g, rt)
		}
	})
}

// traceRow is piece i's self term plus twice its mutual terms with the
// pieces after it.
func traceRow(prims []Prim, i int, w, t, g float64, tol Tol) (float64, error) {
	p := prims[i]
	var self float64
	if p.Kind == Segment {
		self = BarSelf(p.Length(), w, t)
	} else {
		var err error
		if self, err = arcSelfGMD(p, g, tol); err != nil {
			return 0, err
		}
	}
	tol.addEst(closedFormRounding * self)
	// the mutual terms count twice, and so do their estimates
	var mut, mutEst float64
	mt := tol
	if tol.Est != nil {
		mt.Est = &mutEst
	}
	for j := i + 1; j < len(prims); j++ {
		if j%64 == 0 {
			if err := tol.stopped(); err != nil {
				return 0, err
			}
		}
		m, err := pairMutual(p, prims[j], mt)
		if errors.Is(err, ErrOnWire) {
			return 0, fmt.Errorf("pieces %d and %d of the trace cross or overlap", i+1, j+1)
		}
		if err != nil {
			return 0, err
		}
		mut += m
		mt.addEst(closedFormRounding * m)
	}
	tol.addEst(2 * mutEst)
	return self + 2*mut, nil
}

// arcAlong is μ0/4π ∫_q tan·dl_q/|x − r_q|, the component along tan of
// q's vector potential at x, integrated along the arc q with breaks at the
// point of q's circle nearest x and at a few times its distance around it.
// The closed form of an arc's potential loses digits close to its circle
// (ArcA then integrates numerically at a tighter tolerance and without
// these breaks), and the turns of a trace are all close to each other's
// circles: this integral is written out here so that the peak is found
// at once.
// arcAlong is μ0/4π ∫_q tan·dl_q/|x − r_q|, the component along tan of
// q's vector potential at x, integrated along the arc q with breaks at the
// point of q's circle nearest x and at a few times its distance around it.
// The closed form of an arc's potential loses digits close to its circle
// (ArcA then integrates numerically at a tighter tolerance and without
// these breaks), and the turns of a trace are all close to each other's
// circles: this integral is written out here so that the peak is found
// at once. With x at radius ρ and height z in q's frame and at angle φ0,
// |x − r_q(φ)|² = (ρ − R)² + z² + 4Rρ·sin²((φ − φ0)/2), which keeps its
// digits near the circle.
func arcAlong(q Prim, x, tan Vec, tol Tol) (float64, error) {
	rel := r3.Sub(x, q.C)
	cu, cv, cn := r3.Dot(rel, q.U), r3.Dot(rel, q.V), r3.Dot(rel, q.N)
	tu, tv := r3.Dot(tan, q.U), r3.Dot(tan, q.V)
	R := q.R
	rho := math.Hypot(cu, cv)
	d0 := (rho-R)*(rho-R) + cn*cn
	dist := math.Sqrt(d0)
	span := math.Abs(q.Span)
	phi0 := math.Atan2(cv, cu)
	// φ0 within the arc or nearest to it, so that φ − φ0 is small (and
	// exact) near the peak: (−(2π − span)/2, span + (2π − span)/2]
	if gap := (2*math.Pi - span) / 2; phi0 <= -gap {
		phi0 += 2 * math.Pi
	} else if phi0 > span+gap {
		phi0 -= 2 * math.Pi
	}
	pts := []float64{0, 1}
	for _, b := range primBreaks(q) {
		pts = append(pts, b*span)
	}
	pts[1] = span
	w := dist / R
	for _, c := range []float64{phi0} {
		for _, d := range []float64{0, -w, w, -8 * w, 8 * w} {
			if t := c + d; t > 0 && t < span {
				pts = append(pts, t)
			}
		}
	}
	// near an end of the arc (a joint with the piece x lies on), a mesh
	// graded by the distance from it
	for k, e := range []Vec{q.Start(), q.End()} {
		de := r3.Norm(r3.Sub(x, e)) / R
		for g := de; g < span; g *= 4 {
			if k == 0 {
				pts = append(pts, g)
			} else {
				pts = append(pts, span-g)
			}
		}
	}
	slices.Sort(pts)
	pts = slices.Compact(pts)
	accept := 1e-6
	if math.Min(r3.Norm(r3.Sub(x, q.Start())), r3.Norm(r3.Sub(x, q.End()))) < 1e-6*R {
		accept = 1e-3
	}
	var bad bool
	f := func(phi float64) float64 {
		s, c := math.Sincos(phi)
		h := math.Sin((phi - phi0) / 2)
		d2 := d0 + 4*R*rho*h*h
		if d2 == 0 {
			// x on the arc itself: only where two pieces meet (the
			// outer sample rounded onto the joint) is this a point of
			// no weight; elsewhere the pieces cross
			bad = !atJoint(x, q, q)
			return 0
		}
		return R * (c*tv - s*tu) / math.Sqrt(d2)
	}
	var sum float64
	for i := 0; i+1 < len(pts); i++ {
		if pts[i+1]-pts[i] < 1e-12*span {
			continue // a sliver between breaks that rounding split apart
		}
		// the integral is of order one or more (times R, the scale of
		// tan): an absolute floor of a tenth of the relative accuracy
		v, e, err := Integrate(f, pts[i], pts[i+1], tol.with(tol.Rel, tol.Rel*0.1*R/float64(len(pts))))
		if bad {
			return 0, ErrOnWire
		}
		tol.addEst(k0 * e)
		// a sample of the outer integral close to a joint can stop short
		// of the tolerance, where rounding of φ − φ0 matters; 1e-6 of it
		// (1e-3 within 1e-6·R of the joint, where the outer integral
		// gives the sample a weight below 1e-6) is still far below the
		// model's accuracy
		var qe *QuadError
		if errors.As(err, &qe) && qe.Estimate <= accept*math.Abs(qe.Value) {
			err = nil
		}
		if err != nil {
			return 0, err
		}
		sum += v
	}
	return k0 * sum, nil
}

// atJoint reports whether x is, within rounding, an end point of q that
// p shares.
func atJoint(x Vec, p, q Prim) bool {
	tolD := 1e-9 * math.Max(p.Length(), q.Length())
	for _, e := range []Vec{q.Start(), q.End()} {
		if r3.Norm(r3.Sub(x, e)) <= tolD && (r3.Norm(r3.Sub(p.Start(), e)) <= tolD || r3.Norm(r3.Sub(p.End(), e)) <= tolD) {
			return true
		}
	}
	return false
}
