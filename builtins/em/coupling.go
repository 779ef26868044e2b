package em

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/spatial/r3"
)

// DefaultTol is the accuracy of coupling integrals unless the caller asks
// for another: relative 1e-10.
var DefaultTol = Tol{Rel: 1e-10}

// lineIntegral integrates f(x)·dl along a path, primitive by primitive,
// splitting arcs and helices into quarter turns; the absolute floor of the
// tolerance is scaled by the path's length so that a zero integral
// terminates.
func lineIntegral(path Path, f func(x Vec) (Vec, error), tol Tol, scale float64) (float64, error) {
	var sum float64
	var ferr error
	total, done := 0, 0 // quarter turns (or straight pieces), for progress
	if tol.Progress != nil {
		for _, p := range path.Prims {
			total += len(primBreaks(p)) - 1
		}
	}
	for _, p := range path.Prims {
		p := p
		if err := tol.stopped(); err != nil {
			return 0, err
		}
		g := func(t float64) float64 {
			if ferr != nil {
				return 0
			}
			v, err := f(p.Point(t))
			if err != nil {
				ferr = err
				return 0
			}
			return r3.Dot(v, p.Tangent(t))
		}
		pieceTol := tol
		pieceTol.Abs = math.Max(tol.Abs, tol.Rel*scale*p.Length()/math.Max(path.Length(), 1e-300)*1e-3)
		br := primBreaks(p)
		for k := 0; k+1 < len(br); k++ {
			v, e, err := Integrate(g, br[k], br[k+1], pieceTol)
			if ferr != nil {
				return 0, ferr
			}
			if err = acceptLoose(err); err != nil {
				return 0, err
			}
			sum += v
			if tol.Est != nil {
				*tol.Est += e
			}
			if done++; tol.Progress != nil {
				tol.Progress(done, total)
			}
		}
	}
	return sum, nil
}

// LineIntegral integrates f(x)·dl along a path (open or closed) by
// adaptive Gauss–Kronrod quadrature per piece (arcs and helices per quarter
// turn). scale is the expected size of the result, used for an absolute
// floor of the tolerance so that a zero integral terminates.
func LineIntegral(path Path, f func(x Vec) (Vec, error), tol Tol, scale float64) (float64, error) {
	return lineIntegral(path, f, tol, scale)
}

// SurfaceIntegral integrates f(x)·dA over a surface by adaptive 2-D
// quadrature; scale is the expected size of the result.
func SurfaceIntegral(surf Surface, f func(x Vec) (Vec, error), tol Tol, scale float64) (float64, error) {
	var ferr error
	g := func(u, v float64) float64 {
		if ferr != nil {
			return 0
		}
		b, err := f(surf.Point(u, v))
		if err != nil {
			ferr = err
			return 0
		}
		return r3.Dot(b, surf.Normal(u, v))
	}
	t := tol
	t.Abs = math.Max(tol.Abs, tol.Rel*scale*1e-3)
	v, e, err := Integrate2(g, 0, 1, 0, 1, t)
	if ferr != nil {
		return 0, ferr
	}
	if err = acceptLoose(err); err != nil {
		return 0, err
	}
	tol.addEst(e)
	return v, nil
}

// FluxThroughLoop returns the flux of the sources through a closed path,
// as the circulation of the vector potential: Φ = ∮ A·dl (Stokes). The
// loop must be closed.
func FluxThroughLoop(srcs []Source, loop Path, tol Tol) (float64, error) {
	if len(loop.Prims) == 0 || !loop.Closed() {
		return 0, ErrOpenPath
	}
	c := compile(srcs)
	c.stop = tol.Stop
	// scale: flux of the largest current through a loop of this size
	var imax float64
	for _, s := range srcs {
		imax = math.Max(imax, math.Abs(s.I))
	}
	scale := Mu0 * imax * loop.Size()
	v, err := lineIntegral(loop, func(x Vec) (Vec, error) { return c.at(FieldA, x) }, tol, scale)
	if err == nil && tol.Est != nil {
		r, err := integrandRounding(FieldA, srcs, loop, tol.Stop)
		if err != nil {
			return 0, err
		}
		tol.addEst(r)
	}
	return v, err
}

// ErrOpenPath is returned where a closed path is needed.
var ErrOpenPath = errors.New("the path is not closed (its end is not its start)")

// Surface is a flat or curved surface parametrised over [0,1]², with its
// oriented area element.
type Surface struct {
	Kind   string // "disk", "rectangle", "spanned"
	Point  func(u, v float64) Vec
	Normal func(u, v float64) Vec // ∂r/∂u × ∂r/∂v (not unit: carries the area element)
	Area   float64
	Size   float64
}

// NewDisk makes a disk of radius r around the axis through c; its normal
// is along axis.
func NewDisk(c, axis Vec, r float64) (Surface, error) {
	if !(r > 0) {
		return Surface{}, errors.New("the radius must be positive")
	}
	u, v, n, err := frame(axis, Vec{})
	if err != nil {
		return Surface{}, err
	}
	return Surface{
		Kind: "disk",
		Point: func(s, t float64) Vec {
			sn, cs := math.Sincos(2 * math.Pi * t)
			return r3.Add(c, r3.Add(r3.Scale(r*s*cs, u), r3.Scale(r*s*sn, v)))
		},
		Normal: func(s, t float64) Vec { return r3.Scale(2*math.Pi*r*r*s, n) },
		Area:   math.Pi * r * r,
		Size:   r,
	}, nil
}

// NewRectSurface makes the parallelogram corner + u·s1 + v·s2; its normal
// is s1 × s2.
func NewRectSurface(corner, s1, s2 Vec) (Surface, error) {
	n := r3.Cross(s1, s2)
	if r3.Norm(n) == 0 {
		return Surface{}, errors.New("the two sides are parallel or zero: the rectangle has no area")
	}
	return Surface{
		Kind:   "rectangle",
		Point:  func(u, v float64) Vec { return r3.Add(corner, r3.Add(r3.Scale(u, s1), r3.Scale(v, s2))) },
		Normal: func(u, v float64) Vec { return n },
		Area:   r3.Norm(n),
		Size:   math.Max(r3.Norm(s1), r3.Norm(s2)),
	}, nil
}

// NewSpanned makes the flat surface spanned by a closed planar path, as a
// fan from the path's centroid: x(u, s) = c + u(γ(s) − c). The area
// element is signed, so regions the fan covers twice with opposite
// orientation cancel and any closed planar curve is handled. The normal
// follows the path's circulation (right-hand rule).
func NewSpanned(path Path) (Surface, error) {
	if len(path.Prims) == 0 || !path.Closed() {
		return Surface{}, ErrOpenPath
	}
	if len(path.Loops()) != 1 {
		return Surface{}, errors.New("the path is made of several loops; a spanned surface needs a single closed loop")
	}
	// parametrise the whole path by s in [0,1] over primitives by length
	total := path.Length()
	cum := make([]float64, len(path.Prims)+1)
	for i, p := range path.Prims {
		cum[i+1] = cum[i] + p.Length()/total
	}
	locate := func(s float64) (Prim, float64, float64) {
		i := 0
		for i+1 < len(path.Prims) && s > cum[i+1] {
			i++
		}
		w := cum[i+1] - cum[i]
		return path.Prims[i], (s - cum[i]) / w, 1 / w
	}
	// centroid of sample points and the plane's normal (Newell's method)
	var c, n Vec
	const samples = 256
	pts := make([]Vec, samples)
	for k := range pts {
		p, t, _ := locate(float64(k) / samples)
		pts[k] = p.Point(t)
		c = r3.Add(c, pts[k])
	}
	c = r3.Scale(1.0/samples, c)
	for k := range pts {
		a, b := r3.Sub(pts[k], c), r3.Sub(pts[(k+1)%samples], c)
		n = r3.Add(n, r3.Cross(a, b))
	}
	if r3.Norm(n) == 0 {
		return Surface{}, errors.New("the path encloses no area")
	}
	nu := r3.Unit(n)
	size := path.Size()
	for k := range pts {
		if math.Abs(r3.Dot(r3.Sub(pts[k], c), nu)) > 1e-9*size {
			return Surface{}, errors.New("the path is not planar; a spanned surface needs a flat loop")
		}
	}
	area := r3.Norm(n) / 2
	return Surface{
		Kind: "spanned",
		Point: func(u, s float64) Vec {
			p, t, _ := locate(s)
			return r3.Add(c, r3.Scale(u, r3.Sub(p.Point(t), c)))
		},
		Normal: func(u, s float64) Vec {
			p, t, dt := locate(s)
			g := r3.Sub(p.Point(t), c)
			dg := r3.Scale(dt, p.Tangent(t))
			return r3.Scale(u, r3.Cross(g, dg))
		},
		Area: area,
		Size: size,
	}, nil
}

// FluxThroughSurface integrates B·dA over the surface by adaptive 2-D
// quadrature.
func FluxThroughSurface(srcs []Source, surf Surface, tol Tol) (float64, error) {
	c := compile(srcs)
	c.stop = tol.Stop
	var ferr error
	f := func(u, v float64) float64 {
		if ferr != nil {
			return 0
		}
		b, err := c.at(FieldB, surf.Point(u, v))
		if err != nil {
			ferr = err
			return 0
		}
		return r3.Dot(b, surf.Normal(u, v))
	}
	var imax float64
	for _, s := range srcs {
		imax = math.Max(imax, math.Abs(s.I))
	}
	t := tol
	t.Abs = math.Max(tol.Abs, tol.Rel*Mu0*imax*surf.Size*1e-3)
	v, e, err := Integrate2(f, 0, 1, 0, 1, t)
	if ferr != nil {
		return 0, ferr
	}
	if tol.Est != nil {
		*tol.Est += e
	}
	return v, err
}

// FluxUniform is the flux of a uniform field through a surface.
func FluxUniform(b Vec, surf Surface, tol Tol) (float64, error) {
	f := func(u, v float64) float64 { return r3.Dot(b, surf.Normal(u, v)) }
	v, e, err := Integrate2(f, 0, 1, 0, 1, tol.with(tol.Rel, tol.Rel*r3.Norm(b)*surf.Area*1e-3))
	if tol.Est != nil {
		*tol.Est += e
	}
	return v, err
}

// MaxwellMutual is the mutual inductance of two coaxial circles of radii a
// and b whose planes are d apart (J. C. Maxwell, A Treatise on Electricity
// and Magnetism, 1873, §701; F. W. Grover, Inductance Calculations, 1946):
//
//	M = μ0 √(ab) [(2/k − k) K(k²) − (2/k) E(k²)],  k² = 4ab / ((a+b)² + d²).
//
// The bracket equals k·(D(m) − B(m)) with Fukushima's associate integrals,
// m = k²; for m < 0.5 it is summed as Σ cₙ² n/(n+1) (π/2) mⁿ, cₙ =
// (2n)!/(4ⁿ n!²), which keeps full precision for circles far apart.
func MaxwellMutual(a, b, d float64) float64 {
	den := (a+b)*(a+b) + d*d
	m := 4 * a * b / den
	mc := ((a-b)*(a-b) + d*d) / den // 1 − m without cancellation
	k := math.Sqrt(m)
	var f float64
	if mc < 1e-8 {
		// circles almost touching: K and E from their expansions in
		// k'² = mc (Abramowitz & Stegun, Handbook of Mathematical Functions,
		// 1964, 17.3.26 and 17.3.36, leading terms; the next terms are
		// O(mc² ln mc), below 1e-15 here), since gonum's K(m) and E(m)
		// would see only 1 − m rounded
		l := math.Log(4 / math.Sqrt(mc))
		kk := l + mc/4*(l-1)
		ee := 1 + mc/2*(l-0.5)
		f = 2*(kk-ee)/m - kk
	} else if m < 0.5 {
		cn, mn := 1.0, 1.0
		for n := 1; n < 200; n++ {
			cn *= float64(2*n-1) / float64(2*n)
			mn *= m
			term := cn * cn * float64(n) / float64(n+1) * mn
			f += term
			if term < 1e-17*f {
				break
			}
		}
		f *= math.Pi / 2
	} else {
		f = mathext.CompleteD(m) - mathext.CompleteB(m)
	}
	return Mu0 * math.Sqrt(a*b) * k * f
}

// MaxwellMutualDd is dM/dd of MaxwellMutual(a, b, d): the axial force
// between coaxial circles per unit of the product of their currents.
// Differentiating Maxwell's formula, with dK/dk = E/(k·k'²) − K/k and
// dE/dk = (E − K)/k (Abramowitz & Stegun 17.3.43 and 17.3.44 in the
// modulus k) and dk/dd = −k·d/D, D = (a+b)² + d², gives
//
//	dM/dd = −μ0·d/(2√D) · [(2 − k²)·E/(1 − k²) − 2K],  k² = 4ab/D,
//
// negative for d > 0 (aiding circles pull together). K and E are the
// complete integrals of parameter m = k²; 1 − k² is formed without
// cancellation.
//
// For m < 1/2 (circles apart by more than about their radii) the bracket
// is 3πm²/16 + O(m³) out of terms of O(1), and kept only ε/m² of itself
// (the sign was lost beyond about 10⁴ radii). There the derivative comes
// from MaxwellMutual's series instead, M = μ0√(ab)·√m·f(m),
// f = (π/2) Σn≥1 c_n² n/(n+1) mⁿ, c_n = (2n − 1)!!/(2n)!!, and
// dm/dd = −2m d/D:
//
//	dM/dd = μ0√(ab) (f/2 + m f′)/√m · dm/dd
//	      = −(2μ0 a b d/D^(3/2)) · (π/2) Σn≥1 c_n² n(2n + 1)/(n + 1) mⁿ,
//
// every term positive (its first, 3m/8·π/2·…, gives the same 3πm²/16 as
// the bracket). The terms fall like mⁿ (c_n² ~ 1/(πn)); they are summed
// until one is below 1e-17 of the sum.
func MaxwellMutualDd(a, b, d float64) float64 {
	den := (a+b)*(a+b) + d*d
	m := 4 * a * b / den
	mc := ((a-b)*(a-b) + d*d) / den
	if mc == 0 {
		return 0 // touching circles: the field is singular; callers keep them apart
	}
	if m < 0.5 {
		cn, mn, g := 1.0, m, 0.0
		for n := 1; n < 200; n++ {
			fn := float64(n)
			cn *= (2*fn - 1) / (2 * fn)
			term := cn * cn * fn * (2*fn + 1) / (fn + 1) * mn
			g += term
			if term < 1e-17*g {
				break
			}
			mn *= m
		}
		return -2 * Mu0 * a * b * d / (den * math.Sqrt(den)) * math.Pi / 2 * g
	}
	kk := mathext.CompleteK(m)
	ee := mathext.CompleteE(m)
	return -Mu0 * d / (2 * math.Sqrt(den)) * ((2-m)*ee/mc - 2*kk)
}

// coaxialCircles reports whether p and q are whole circles on one axis,
// and their radii and plane separation.
func coaxialCircles(p, q Prim) (a, b, d float64, ok bool) {
	if !p.IsCircle() || !q.IsCircle() {
		return 0, 0, 0, false
	}
	s, _, along, ok := coaxialHelical(p, q)
	if !ok {
		return 0, 0, 0, false
	}
	return p.R, q.R * s, math.Abs(along), true
}

// CoaxialCircles reports whether p and q are full circles on one axis.
func CoaxialCircles(p, q Prim) bool {
	_, _, _, ok := coaxialCircles(p, q)
	return ok
}

// MutualOptions tunes Mutual.
type MutualOptions struct {
	Tol Tol
	// NoFastPath forces the general Neumann route even for coaxial circles
	// (for tests and cross-checks).
	NoFastPath bool
}

// Mutual returns the mutual inductance of two closed paths by Neumann's
// formula M = μ0/4π ∮∮ dl1·dl2/|r1 − r2|, evaluated as the circulation of
// path 1's closed-form vector potential along path 2, ∮ A1·dl2 per ampere,
// with adaptive quadrature. Pairs of coaxial circles use Maxwell's formula.
//
// Open paths (a coil without its leads) give the partial mutual inductance
// (Ruehli, "Inductance calculations in a complex integrated circuit
// environment", IBM J. Res. Dev. 16, 1972): the part of the circuits'
// mutual inductance owed to these pieces.
func Mutual(p1, p2 Path, opt MutualOptions) (float64, error) {
	if len(p1.Prims) == 0 || len(p2.Prims) == 0 {
		return 0, errors.New("a path is empty")
	}
	tol := opt.Tol
	if tol.Rel == 0 {
		tol = tol.with(DefaultTol.Rel, DefaultTol.Abs)
	}
	var sum float64
	var rest []Prim
	// pieces of path 2 coaxial with some pieces of path 1: those pairs by
	// single integrals (coaxhelix.go), the rest of path 1's potential
	// along them with those pieces masked
	type maskedPiece struct {
		q    Prim
		skip []bool
	}
	var masked []maskedPiece
	touch := errors.New("the two paths touch: their mutual inductance is infinite for thin wires")
	for _, q := range p2.Prims {
		if !opt.NoFastPath && len(p1.Prims) == 1 {
			if a, b, d, ok := coaxialCircles(p1.Prims[0], q); ok {
				if d == 0 && a == math.Abs(b) {
					return 0, touch
				}
				sum += math.Copysign(MaxwellMutual(a, math.Abs(b), d), b)
				continue
			}
		}
		if opt.NoFastPath || (len(p1.Prims) > MaxCoaxialPieces && !q.IsCircle()) || q.Kind == Segment {
			rest = append(rest, q)
			continue
		}
		var skip []bool
		for i, p := range p1.Prims {
			if !CoaxialHelical(p, q) {
				continue
			}
			m, _, err := coaxialHelicalWith([]Prim{p}, q, tol)
			if errors.Is(err, ErrOnWire) {
				return 0, touch
			}
			if err != nil {
				return 0, err
			}
			sum += m
			if skip == nil {
				skip = make([]bool, len(p1.Prims))
			}
			skip[i] = true
		}
		switch {
		case skip == nil:
			rest = append(rest, q)
		case !slices.Contains(skip, false):
			// all of path 1 taken pair by pair
		default:
			masked = append(masked, maskedPiece{q, skip})
		}
	}
	if len(rest) == 0 && len(masked) == 0 {
		return sum, nil
	}
	c := compile([]Source{{Path: p1, I: 1}})
	c.stop = tol.Stop
	scale := Mu0 * math.Min(p1.Size(), p2.Size())
	wrap := func(err error) error {
		if errors.Is(err, ErrOnWire) {
			return touch
		}
		return err
	}
	if len(rest) > 0 {
		v, err := lineIntegral(Path{Prims: rest}, func(x Vec) (Vec, error) { return c.at(FieldA, x) }, tol, scale)
		if err != nil {
			return 0, wrap(err)
		}
		sum += v
		if tol.Est != nil {
			r, err := integrandRounding(FieldA, []Source{{Path: p1, I: 1}}, Path{Prims: rest}, tol.Stop)
			if err != nil {
				return 0, err
			}
			tol.addEst(r)
		}
	}
	for _, mp := range masked {
		v, err := lineIntegral(Path{Prims: []Prim{mp.q}}, func(x Vec) (Vec, error) { return c.atMasked(FieldA, x, mp.skip) }, tol, scale)
		if err != nil {
			return 0, wrap(err)
		}
		sum += v
		if tol.Est != nil {
			var others []Prim
			for i, p := range p1.Prims {
				if !mp.skip[i] {
					others = append(others, p)
				}
			}
			r, err := integrandRounding(FieldA, []Source{{Path: Path{Prims: others}, I: 1}}, Path{Prims: []Prim{mp.q}}, tol.Stop)
			if err != nil {
				return 0, err
			}
			tol.addEst(r)
		}
	}
	return sum, nil
}

// Force returns the force on path 2 carrying i2 in the field of the
// sources: F = i2 ∮ dl2 × B (Lorentz force on a current element), by
// adaptive quadrature along path 2.
func Force(srcs []Source, p2 Path, i2 float64, tol Tol) (Vec, error) {
	c := compile(srcs)
	c.stop = tol.Stop
	var sum Vec
	var ferr error
	for k, p := range p2.Prims {
		p := p
		f := func(t float64) Vec {
			if ferr != nil {
				return Vec{}
			}
			b, err := c.at(FieldB, p.Point(t))
			if err != nil {
				ferr = err
				return Vec{}
			}
			return r3.Cross(p.Tangent(t), b)
		}
		v, e, err := IntegrateVecBreaks(f, primBreaks(p), tol)
		if ferr != nil {
			return Vec{}, ferr
		}
		if err = acceptLoose(err); err != nil {
			return Vec{}, err
		}
		sum = r3.Add(sum, v)
		if tol.Est != nil {
			// the quadrature's estimate, and the rounding of the field's
			// closed forms on the size of the piece's terms, |dl|·|B| at
			// its ends and middle (terms cancel within a loop in a
			// uniform field, where the result is near zero)
			var bmax float64
			for _, t := range []float64{0, 0.5, 1} {
				if b, err := c.at(FieldB, p.Point(t)); err == nil {
					bmax = math.Max(bmax, r3.Norm(b))
				}
			}
			tol.addEst(math.Abs(i2) * (e + fieldRoundingRel*p.Length()*bmax))
		}
		if tol.Progress != nil {
			tol.Progress(k+1, len(p2.Prims))
		}
	}
	return r3.Scale(i2, sum), nil
}

// MotionalEMF returns ∮ (v × B)·dl along a path whose points move with
// velocity v(x) (uniform for a path in translation, ω × (x − c) for one
// rotating about c) through the static field bfield (a function of
// position); errors of v or bfield are passed on.
func MotionalEMF(loop Path, v, bfield func(x Vec) (Vec, error), tol Tol, scale float64) (float64, error) {
	return lineIntegral(loop, func(x Vec) (Vec, error) {
		b, err := bfield(x)
		if err != nil {
			return Vec{}, err
		}
		vx, err := v(x)
		if err != nil {
			return Vec{}, err
		}
		return r3.Cross(vx, b), nil
	}, tol, scale)
}

// SelfOptions tunes SelfInductanceWith.
type SelfOptions struct {
	Tol Tol
	// Current is how the current spreads over the wire's section: uniform
	// (low frequency, the default) or on its surface (high frequency).
	Current WireCurrent
}

// SelfInductance is SelfInductanceWith for uniform current (the
// low-frequency inductance, internal inductance included).
func SelfInductance(path Path, a float64, tol Tol) (float64, error) {
	return SelfInductanceWith(path, a, SelfOptions{Tol: tol})
}

// SelfInductanceWith returns the self-inductance of a path of round wire
// of radius a, with the current uniform over the wire's section or on its
// surface (opt.Current). It is a sum over the path's pieces:
//
//   - a straight piece with itself: exactly (StraightWireInductance: the
//     volume integral, internal inductance included for uniform current);
//   - a whole circle with itself: the expansion of LoopSelfInductance;
//   - an arc or helix with itself: Neumann's integral with the reduced
//     kernel 1/√(|r − r'|² + a²) (the thin-wire approximation of antenna
//     theory) within half a turn (the double integral depends only on the
//     parameter difference and is one adaptive integral), the exact
//     filament kernel between its turns, plus the internal inductance
//     μ0ℓ/8π of a round wire with uniform current (e.g. Grover, Inductance
//     Calculations, 1946; none for surface current);
//   - two straight pieces that meet: the kernel averaged over the wire's
//     section (wireKernel), exact for two pieces in line (there from
//     StraightWireInductance, so that a straight wire cut in two keeps its
//     inductance), by adaptive 2-D quadrature at an angle;
//   - other pieces that meet: the reduced kernel (adaptive 2-D quadrature);
//   - all other pairs: the exact kernel through the closed-form vector
//     potential, or Maxwell's formula for coaxial circles.
//
// Straight paths are exact; bends are accurate when the wire is thin
// compared with the path's radius of curvature and the spacing of its
// turns (error of order (a/R)²); a corner between straight pieces adds a
// local error of order a. An open path (a coil without its leads) gives
// its partial self-inductance.
func SelfInductanceWith(path Path, a float64, opt SelfOptions) (float64, error) {
	tol := opt.Tol
	mode := opt.Current
	if !(a > 0) {
		return 0, errors.New("the wire radius must be positive")
	}
	if len(path.Prims) == 0 {
		return 0, errors.New("the path is empty")
	}
	if tol.Rel == 0 {
		tol = tol.with(DefaultTol.Rel, DefaultTol.Abs)
	}
	for _, p := range path.Prims {
		switch {
		case p.Kind != Segment && a >= p.R:
			return 0, fmt.Errorf("the wire radius (%.4g m) is not smaller than the loop radius (%.4g m)", a, p.R)
		case p.Kind == Segment && a >= p.Length()/2:
			return 0, fmt.Errorf("the wire radius (%.4g m) is not small compared with a straight piece %.4g m long", a, p.Length())
		case p.Kind == Helix && 2*math.Pi*math.Abs(p.Pitch) < 2*a:
			return 0, fmt.Errorf("the turns overlap: the pitch (%.4g m) is less than the wire diameter (%.4g m)", 2*math.Pi*math.Abs(p.Pitch), 2*a)
		}
	}
	n := len(path.Prims)
	scale := path.scale()
	nb := touchingPairs(path.Prims, scale)
	all := compile([]Source{{Path: path, I: 1}})
	all.stop = tol.Stop
	progress := tol.Progress
	tol.Progress = nil // the pieces report here, not their line integrals
	rowTol := tol
	rowTol.Progress = progress
	tol.Est = nil // each row adds to its own slot (sumRows)
	return sumRows(n, rowTol, func() func(i int, est *float64) (float64, error) {
		skip := make([]bool, n)
		return func(i int, est *float64) (float64, error) {
			t := tol
			t.Est = est
			return selfInductanceTerm(path.Prims, i, nb[i], a, mode, t, all, skip)
		}
	})
}

// fieldRoundingRel is the relative rounding charged for field values
// under an integral, on the size of their terms: the kernels' tests find
// 1e-15 to 1e-14 of Σ|terms|; 1e-12 as in the builtins' fieldRounding.
const fieldRoundingRel = 1e-12

// closedFormRounding bounds the relative rounding error of one closed-form
// term (a straight wire's inductance, Maxwell's formula, the ring's
// expansion): their tests find them within 1e-15 to 1e-14 of independent
// references; 1e-13 leaves a margin. It is charged per term, so that
// terms which cancel (a bifilar winding) keep their rounding in the bound.
const closedFormRounding = 1e-13

// addEst adds e to tol.Est when it is set.
func (tol Tol) addEst(e float64) {
	if tol.Est != nil {
		*tol.Est += math.Abs(e)
	}
}

// selfInductanceTerm is piece i's share of the inductance: its self term,
// the terms with the pieces it touches, Maxwell's formula with the circles
// coaxial with it, and the circulation along it of the vector potential of
// all other pieces.
func selfInductanceTerm(prims []Prim, i int, touch []int, a float64, mode WireCurrent, tol Tol, all *compiledSources, skip []bool) (float64, error) {
	p := prims[i]
	sum, err := selfTerm(p, a, mode, tol)
	if err != nil {
		return 0, err
	}
	tol.addEst(closedFormRounding * sum)
	for j := range skip {
		skip[j] = false
	}
	skip[i] = true
	for _, j := range touch {
		m, err := jointPair(p, prims[j], a, mode, tol)
		if err != nil {
			return 0, err
		}
		sum += m
		skip[j] = true
	}
	rest := 0
	for j, q := range prims {
		if skip[j] {
			continue
		}
		if ca, cb, d, ok := coaxialCircles(p, q); ok && d > 0 {
			m := math.Copysign(MaxwellMutual(ca, math.Abs(cb), d), cb)
			sum += m
			tol.addEst(closedFormRounding * m)
			skip[j] = true
			continue
		}
		// coaxial helices and arcs (the layers of a winding): one integral
		// each (coaxhelix.go) in place of the circulation of a numerically
		// integrated potential
		if m, ok, err := CoaxialHelicalMutual(p, q, tol); ok {
			if errors.Is(err, ErrOnWire) {
				return 0, errors.New("two pieces of the path cross or overlap; self-inductance needs a path that does not touch itself")
			}
			if err != nil {
				return 0, err
			}
			sum += m
			skip[j] = true
			continue
		}
		// a helix's potential is itself an integral along it; with a
		// piece whose potential is in closed form, Neumann's symmetry
		// lets the circulation run along the helix instead (one
		// integral in place of one inside another)
		if q.Kind == Helix && p.Kind != Helix {
			pa := Path{Prims: []Prim{p}}
			one := compile([]Source{{Path: pa, I: 1}})
			one.stop = tol.Stop
			m, err := lineIntegral(Path{Prims: []Prim{q}}, func(x Vec) (Vec, error) { return one.at(FieldA, x) }, tol, Mu0*q.Length())
			if errors.Is(err, ErrOnWire) {
				return 0, errors.New("two pieces of the path cross or overlap; self-inductance needs a path that does not touch itself")
			}
			if err != nil {
				return 0, err
			}
			tol.addEst(closedFormRounding * m)
			sum += m
			skip[j] = true
			continue
		}
		rest++
	}
	if rest == 0 {
		return sum, nil
	}
	fieldScale := Mu0 * p.Length()
	v, err := lineIntegral(Path{Prims: []Prim{p}}, func(x Vec) (Vec, error) { return all.atMasked(FieldA, x, skip) }, tol, fieldScale)
	if errors.Is(err, ErrOnWire) {
		return 0, errors.New("two pieces of the path cross or overlap; self-inductance needs a path that does not touch itself")
	}
	if err != nil {
		return 0, err
	}
	tol.addEst(closedFormRounding * v) // the closed-form potentials under the integral
	return sum + v, nil
}

// touchingPairs lists, for each primitive, the others it shares an end
// point with, using a grid of end points (linear in the number of pieces).
func touchingPairs(prims []Prim, scale float64) [][]int {
	cell := 10 * joinTol * scale
	key := func(x Vec) [3]int64 {
		return [3]int64{int64(math.Floor(x.X / cell)), int64(math.Floor(x.Y / cell)), int64(math.Floor(x.Z / cell))}
	}
	grid := map[[3]int64][]int{}
	for i, p := range prims {
		for _, x := range []Vec{p.Start(), p.End()} {
			k := key(x)
			if l := grid[k]; len(l) == 0 || l[len(l)-1] != i {
				grid[k] = append(grid[k], i)
			}
		}
	}
	out := make([][]int, len(prims))
	for i, p := range prims {
		seen := map[int]bool{i: true}
		for _, x := range []Vec{p.Start(), p.End()} {
			k := key(x)
			for dx := int64(-1); dx <= 1; dx++ {
				for dy := int64(-1); dy <= 1; dy++ {
					for dz := int64(-1); dz <= 1; dz++ {
						for _, j := range grid[[3]int64{k[0] + dx, k[1] + dy, k[2] + dz}] {
							if !seen[j] && touching(p, prims[j], scale) {
								seen[j] = true
								out[i] = append(out[i], j)
							}
						}
					}
				}
			}
		}
		sort.Ints(out[i])
	}
	return out
}

// touching reports whether two primitives share an end point.
func touching(p, q Prim, scale float64) bool {
	for _, x := range []Vec{p.Start(), p.End()} {
		for _, y := range []Vec{q.Start(), q.End()} {
			if near(x, y, scale) {
				return true
			}
		}
	}
	return false
}

// jointPair is the mutual term of two pieces that meet: for two straight
// pieces in line, exactly from StraightWireInductance (the whole less its
// parts, halved); for other straight pieces, the kernel averaged over the
// section (wireKernel) by adaptive 2-D quadrature; otherwise reducedPair.
func jointPair(p, q Prim, a float64, mode WireCurrent, tol Tol) (float64, error) {
	if p.Kind != Segment || q.Kind != Segment {
		return reducedPair(p, q, a, nil, tol)
	}
	lp, lq := p.Length(), q.Length()
	dp, dq := r3.Sub(p.B, p.A), r3.Sub(q.B, q.A)
	scale := math.Max(lp, lq)
	if r3.Norm(r3.Cross(dp, dq)) <= 1e-12*lp*lq && r3.Dot(dp, dq) > 0 &&
		(near(p.B, q.A, scale) || near(q.B, p.A, scale)) {
		whole := StraightWireInductance(lp+lq, a, mode)
		tol.addEst(closedFormRounding * whole) // the three terms are of its size or less; the difference cancels
		return (whole - StraightWireInductance(lp, a, mode) - StraightWireInductance(lq, a, mode)) / 2, nil
	}
	return reducedPair(p, q, a, func(d2 float64) float64 { return wireKernel(mode, a, d2) }, tol)
}

// reducedPair is μ0/4π ∫_q ∫_p dl_p·dl_q·k(|r − r'|²) for two pieces that
// meet, by adaptive 2-D quadrature (each piece split into quarter turns so
// the peak at the joint sits at a corner of the domain). The kernel k is
// the reduced kernel 1/√(d² + a²) when kern is nil.
func reducedPair(p, q Prim, a float64, kern func(d2 float64) float64, tol Tol) (float64, error) {
	if kern == nil {
		kern = func(d2 float64) float64 { return 1 / math.Sqrt(d2+a*a) }
	}
	bp, bq := primBreaks(p), primBreaks(q)
	var sum float64
	for i := 0; i+1 < len(bp); i++ {
		for j := 0; j+1 < len(bq); j++ {
			f := func(u, v float64) float64 {
				d := r3.Sub(p.Point(u), q.Point(v))
				return r3.Dot(p.Tangent(u), q.Tangent(v)) * kern(r3.Dot(d, d))
			}
			scale := p.Length() * q.Length() / math.Max(p.Length()+q.Length(), 1e-300)
			v, e, err := Integrate2(f, bp[i], bp[i+1], bq[j], bq[j+1], tol.with(tol.Rel, tol.Rel*scale*1e-3))
			if err = acceptLoose(err); err != nil {
				return 0, err
			}
			sum += v
			tol.addEst(k0 * e)
		}
	}
	return k0 * sum, nil
}

// looseRel is the accuracy accepted from a quadrature that stopped short of
// its tolerance (rounding or the evaluation budget): still far below the
// O((a/R)²) error of the thin-wire model it serves.
const looseRel = 1e-7

// acceptLoose passes a non-converged quadrature whose error estimate is
// within looseRel of its value, and reports any other.
func acceptLoose(err error) error {
	var qe *QuadError
	if errors.As(err, &qe) && qe.Estimate <= looseRel*math.Max(math.Abs(qe.Value), r3.Norm(qe.Vec)) {
		return nil
	}
	return err
}

// selfTerm is the inductance of one primitive with itself: exact for a
// straight piece, the expansion in a/R for a whole circle, and otherwise
// μ0/4π ∫∫ dl·dl'/√(|r − r'|² + a²) plus the internal inductance.
func selfTerm(p Prim, a float64, mode WireCurrent, tol Tol) (float64, error) {
	if p.Kind == Segment {
		return StraightWireInductance(p.Length(), a, mode), nil
	}
	if p.IsCircle() {
		tol.addEst(LoopSelfTruncation(p.R, a, mode))
		return LoopSelfInductance(p.R, a, mode), nil
	}
	internal := 0.0
	if mode == UniformCurrent {
		internal = Mu0 * p.Length() / (8 * math.Pi)
	}
	// arc or helix: with ψ = φ − φ', dl·dl' = (R² cos ψ + c²) dφ dφ' and
	// |r − r'|² = 4R² sin²(ψ/2) + c²ψ², c the pitch per radian; the double
	// integral over [0,Φ]² is 2 ∫0^Φ (Φ − ψ) k(ψ) dψ.
	// The reduced kernel stands for the wire's own cross-section, so it is
	// used within half a turn (|ψ| < π); farther along, the points lie on
	// other turns, whose coupling is the exact filament kernel 1/|r − r'|
	// (with the reduced kernel, close-wound turns would lose a few tenths
	// of a percent). At ψ = π the two kernels differ by O(a²/8R²).
	R, c, phi := p.R, p.Pitch, math.Abs(p.Span)
	kern := func(psi float64) float64 {
		s := math.Sin(psi / 2)
		d2 := 4*R*R*s*s + c*c*psi*psi
		if psi < math.Pi {
			d2 += a * a
		}
		return 2 * (phi - psi) * (R*R*math.Cos(psi) + c*c) / math.Sqrt(d2)
	}
	// break at the peak (ψ = 0, width a/R) and at each full turn, where
	// neighbouring turns come closest
	pts := []float64{0, math.Min(phi, 4*a/R)}
	if phi > math.Pi && pts[1] < math.Pi {
		pts = append(pts, math.Pi) // where the kernel changes
	}
	for t := 2 * math.Pi; t < phi; t += 2 * math.Pi {
		if t > pts[len(pts)-1] {
			pts = append(pts, t)
		}
	}
	if pts[len(pts)-1] < phi {
		pts = append(pts, phi)
	}
	var sum float64
	for i := 0; i+1 < len(pts); i++ {
		v, e, err := Integrate(kern, pts[i], pts[i+1], tol.with(tol.Rel, tol.Rel*R*1e-3))
		if err = acceptLoose(err); err != nil {
			return 0, err
		}
		sum += v
		tol.addEst(k0 * e)
	}
	return k0*sum + internal, nil
}
