package em

// Induced electric field of a region where ∂B/∂t is prescribed.
//
// Faraday's law ∇×E = −∂B/∂t, with ∇·E = 0 and E → 0 far away, has the same
// form as Ampère's law ∇×B = μ0 J, ∇·B = 0 for steady currents, so E follows
// from −∂B/∂t by the Biot–Savart integral with μ0 J replaced by −∂B/∂t
// (Griffiths, Introduction to Electrodynamics, 4th ed., 2017, §7.2.2, the
// analogy stated with eq. 7.19 — cited from memory):
//
//	E(r) = −(1/4π) ∫ (∂B/∂t)(r') × (r − r') / |r − r'|³ dV'.
//
// A whole winding (a solenoid, a toroid) is thereby replaced by the rate of
// change of the field inside its core; outside the core the result is the
// transformer-type field −∂A/∂t of the winding. The integral is the curl of
// (1/4π)∫ (∂B/∂t)/|r − r'| dV'; when the prescribed ∂B/∂t is not
// divergence-free (a uniform field ending at the flat ends of a finite
// cylinder), E is that of the divergence-free part of ∂B/∂t, i.e. the
// prescribed field's ends act like the pole faces of a uniformly magnetised
// bar.

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Region is a volume where ∂B/∂t (T/s) is given. It is parametrised over
// [0,1]³ (u, v, w) with its Jacobian, and can map a point back to its
// parameters so that integration cells can be split at a field point inside
// the region (the integrand is singular like 1/|r−r'|² there, integrable).
//
// Regions made by the constructors below have a periodic angular parameter v
// (cylinders and toroids); RegionE then integrates v over the period centred
// on the field point's angle, so that the seam v = 0 ≡ 1 never lies next to
// the field point. Point, Jac and DBdt of those regions accept any v.
type Region struct {
	Kind  string                        // "solenoid", "toroid", "cylinder", "box"
	Point func(u, v, w float64) Vec     // the point with parameters (u, v, w)
	Jac   func(u, v, w float64) float64 // dV = Jac du dv dw (≥ 0)
	DBdt  func(x Vec) (Vec, error)      // ∂B/∂t at a point of the region
	// Param returns the parameters of x; inside reports whether they lie in
	// [0,1]³ (the surface included, to rounding). It may be nil, in which
	// case RegionE cannot split at the field point.
	Param  func(x Vec) (u, v, w float64, inside bool)
	Volume float64 // m³
	Size   float64 // a length scale (m): the radius of a sphere about the region's centre that holds it
	// Flux rate through the region's natural cross-section, dΦ/dt in
	// Wb/s, where meaningful (solenoid: πR²·dB/dt; toroid: the given
	// dΦ/dt); 0 otherwise.
	FluxRate float64

	periodicV bool // v is an angle with period 1 (set by the constructors)
	// axialScale is the cross-section's radius in units of w (radius/length)
	// for cylinders, 0 for other regions: RegionE grades its cells along w
	// from the field point in steps of this size, doubling.
	axialScale float64
	// axialE, when set, computes E with the integral along the axis done in
	// closed form (uniform ∂B/∂t along the axis of a cylinder); RegionE
	// calls it with its tolerance (absolute floor included).
	axialE func(x Vec, tol Tol) (Vec, error)
	// closedE, when set, is the region's E in closed form (the ideal
	// solenoid); RegionE returns it and Point, Jac, DBdt and Param are nil.
	closedE func(x Vec) Vec
}

// paramSlack is how far outside [0,1] (in parameter units) a point still
// counts as inside: rounding of points on the surface.
const paramSlack = 1e-12

func inUnit(t float64) bool { return t >= -paramSlack && t <= 1+paramSlack }

func finiteVec(v Vec) bool { return quadFiniteVec(v) }

// positive reports whether x is a positive finite number.
func positive(x float64) bool { return x > 0 && !math.IsInf(x, 0) }

// cylinderFrame is the common part of the solenoid and cylinder regions:
// base + w·L·n + R·u·(cos 2πv e1 + sin 2πv e2), dV = 2π R² L u du dv dw.
func cylinderFrame(kind string, base, axis Vec, radius, length float64) (Region, Vec, error) {
	if !finiteVec(base) || !finiteVec(axis) {
		return Region{}, Vec{}, fmt.Errorf("%s region: the base point and the axis must be finite", kind)
	}
	if !positive(radius) {
		return Region{}, Vec{}, fmt.Errorf("%s region: the radius must be positive and finite, got %g", kind, radius)
	}
	if !positive(length) {
		return Region{}, Vec{}, fmt.Errorf("%s region: the length must be positive and finite, got %g", kind, length)
	}
	e1, e2, n, err := frame(axis, Vec{})
	if err != nil {
		return Region{}, Vec{}, fmt.Errorf("%s region: %v", kind, err)
	}
	jac := 2 * math.Pi * radius * radius * length
	r := Region{
		Kind: kind,
		Point: func(u, v, w float64) Vec {
			s, c := math.Sincos(2 * math.Pi * v)
			ru := radius * u
			return Vec{
				X: base.X + w*length*n.X + ru*(c*e1.X+s*e2.X),
				Y: base.Y + w*length*n.Y + ru*(c*e1.Y+s*e2.Y),
				Z: base.Z + w*length*n.Z + ru*(c*e1.Z+s*e2.Z),
			}
		},
		Jac: func(u, v, w float64) float64 { return jac * u },
		Param: func(x Vec) (u, v, w float64, inside bool) {
			d := r3.Sub(x, base)
			z := r3.Dot(d, n)
			p1, p2 := r3.Dot(d, e1), r3.Dot(d, e2)
			u = math.Hypot(p1, p2) / radius
			v = math.Atan2(p2, p1) / (2 * math.Pi)
			if v < 0 {
				v++
			}
			w = z / length
			return u, v, w, u <= 1+paramSlack && inUnit(w)
		},
		Volume:     math.Pi * radius * radius * length,
		Size:       math.Hypot(radius, length/2),
		periodicV:  true,
		axialScale: radius / length,
	}
	return r, n, nil
}

// NewSolenoidRegion returns the core of a solenoid: the cylinder of the given
// radius from base along axis over length, with uniform ∂B/∂t = dBdt·axiŝ
// (DBdt returns that value wherever it is asked). FluxRate is πR²·dBdt.
func NewSolenoidRegion(base, axis Vec, radius, length, dBdt float64) (Region, error) {
	if math.IsNaN(dBdt) || math.IsInf(dBdt, 0) {
		return Region{}, fmt.Errorf("solenoid region: dB/dt must be finite, got %g", dBdt)
	}
	r, n, err := cylinderFrame("solenoid", base, axis, radius, length)
	if err != nil {
		return Region{}, err
	}
	b := r3.Scale(dBdt, n)
	r.DBdt = func(Vec) (Vec, error) { return b, nil }
	r.FluxRate = math.Pi * radius * radius * dBdt
	e1, e2, _, _ := frame(axis, Vec{})
	r.axialE = func(x Vec, tol Tol) (Vec, error) {
		return solenoidAxialE(base, e1, e2, n, radius, length, dBdt, x, tol)
	}
	return r, nil
}

// solenoidAxialE is the E of a uniform ∂B/∂t = ḃ n̂ in the cylinder
// base + ζn̂ + ρ, 0 ≤ ζ ≤ L, |ρ| ≤ R, with the integral along the axis done
// in closed form: with x = base + z n̂ + ρ_x and d = ρ_x − ρ the transverse
// separation, n̂ × (x − r') = n̂ × d, and (elementary)
//
//	∫_0^L dζ / (d² + (z − ζ)²)^{3/2} = [q(L − z) + q(z)] / d²,  q(a) = a/√(d² + a²),
//
// so E(x) = −(ḃ/4π) ∫∫_{|ρ|≤R} (n̂ × d)/d² · [q(L − z) + q(z)] dA. As d → 0
// the bracket tends to B0 = sgn(L − z) + sgn(z) (2 beside the core, 0 beyond
// its ends); that part is the two-dimensional field of a uniform disk,
// ∫∫ d/d² dA = π ρ_x inside (|ρ_x| ≤ R) and π R² ρ_x/|ρ_x|² outside
// (Gauss's law in two dimensions), which gives the ideal solenoid's field
// times B0/2. The rest,
//
//	q(a) − sgn(a) = −sgn(a)·d² / (s(s + |a|)),  s = √(d² + a²),
//
// cancels the 1/d² exactly, so what is left to integrate numerically,
// (n̂ × d)·[−sgn(L − z)/(s₁(s₁ + |L − z|)) − sgn(z)/(s₂(s₂ + |z|))], is
// bounded; it varies on the scale of |z| or |L − z| near the ends, so the
// cross-section (u = |ρ|/R, v = angle in turns) is still split at x's
// parameters, with the angle's period centred on x's. Each transverse
// component is integrated by Integrate2. For long cores the rest vanishes
// like R²/L² and E tends to the ideal solenoid's, however long the core.
func solenoidAxialE(base, e1, e2, n Vec, R, L, bdot float64, x Vec, tol Tol) (Vec, error) {
	dx := r3.Sub(x, base)
	z := r3.Dot(dx, n)
	px, py := r3.Dot(dx, e1), r3.Dot(dx, e2)
	r2 := px*px + py*py
	u0 := math.Sqrt(r2) / R
	v0 := math.Atan2(py, px) / (2 * math.Pi)
	sgn := func(a float64) float64 {
		switch {
		case a > 0:
			return 1
		case a < 0:
			return -1
		}
		return 0
	}
	b0 := sgn(L-z) + sgn(z)
	// the disk's part: −(ḃ/4π)·B0·n̂ × (π ρ_x or π R² ρ_x/r²)
	k0 := -bdot / (4 * math.Pi) * b0 * math.Pi
	if r2 > R*R {
		k0 *= R * R / r2
	}
	out := [2]float64{-k0 * py, k0 * px} // n̂ × ρ_x = (−p_y, p_x) in the (e1, e2) frame
	rest := func(a, d2 float64) float64 {
		if a == 0 {
			return 0
		}
		s := math.Sqrt(d2 + a*a)
		return -sgn(a) / (s * (s + math.Abs(a)))
	}
	f := func(u, v float64, comp int) float64 {
		s, c := math.Sincos(2 * math.Pi * v)
		ddx, ddy := px-R*u*c, py-R*u*s // d in the (e1, e2) frame
		d2 := ddx*ddx + ddy*ddy
		k := -bdot / (4 * math.Pi) * (rest(L-z, d2) + rest(z, d2)) * 2 * math.Pi * R * R * u // dA = 2πR² u du dv
		if comp == 0 {
			return -k * ddy
		}
		return k * ddx
	}
	us := []float64{0, 1}
	if u0 > 0 && u0 < 1 {
		us = []float64{0, u0, 1}
	}
	vs := []float64{v0 - 0.5, v0, v0 + 0.5}
	pieces := float64((len(us) - 1) * 2 * 2)
	t := tol.with(tol.Rel, tol.Abs/pieces)
	for comp := 0; comp < 2; comp++ {
		for i := 1; i < len(us); i++ {
			for j := 1; j < len(vs); j++ {
				val, e, err := Integrate2(func(u, v float64) float64 { return f(u, v, comp) }, us[i-1], us[i], vs[j-1], vs[j], t)
				if err != nil {
					return Vec{}, err
				}
				out[comp] += val
				tol.addEst(e) // summed over both components: a bound on each
			}
		}
	}
	return r3.Add(r3.Scale(out[0], e1), r3.Scale(out[1], e2)), nil
}

// NewIdealSolenoidRegion returns the core of an infinitely long solenoid of
// the given radius about the line through center along axis, with uniform
// ∂B/∂t = dBdt·axiŝ inside. Its E is in closed form: Faraday's law on a
// circle of radius r about the axis, with E azimuthal and depending on r
// alone by symmetry (no part along the axis or radial: Griffiths,
// Introduction to Electrodynamics, 4th ed., 2017, §7.2, from memory),
// gives 2πr·E_φ = −dΦ/dt, so
//
//	E_φ = −(r/2)·dBdt inside (r ≤ R),  E_φ = −(R²/(2r))·dBdt outside,
//
// φ̂ right-handed about axis. Volume and Size are +Inf; FluxRate is πR²·dBdt.
func NewIdealSolenoidRegion(center, axis Vec, radius, dBdt float64) (Region, error) {
	if !finiteVec(center) || !finiteVec(axis) {
		return Region{}, errors.New("ideal solenoid region: the centre and the axis must be finite")
	}
	if !positive(radius) {
		return Region{}, fmt.Errorf("ideal solenoid region: the radius must be positive and finite, got %g", radius)
	}
	if math.IsNaN(dBdt) || math.IsInf(dBdt, 0) {
		return Region{}, fmt.Errorf("ideal solenoid region: dB/dt must be finite, got %g", dBdt)
	}
	_, _, n, err := frame(axis, Vec{})
	if err != nil {
		return Region{}, fmt.Errorf("ideal solenoid region: %v", err)
	}
	r2 := radius * radius
	return Region{
		Kind: "ideal solenoid",
		closedE: func(x Vec) Vec {
			d := r3.Sub(x, center)
			rho := r3.Sub(d, r3.Scale(r3.Dot(d, n), n)) // from the axis
			q := r3.Dot(rho, rho)
			// E = E_φ φ̂ with φ̂ = n × ρ/r: inside −(dBdt/2)·n × ρ,
			// outside −(R² dBdt/(2r²))·n × ρ
			k := -dBdt / 2
			if q > r2 {
				k *= r2 / q
			}
			return r3.Scale(k, r3.Cross(n, rho))
		},
		Volume:   math.Inf(1),
		Size:     math.Inf(1),
		FluxRate: math.Pi * r2 * dBdt,
	}, nil
}

// NewCylinderRegion returns the cylinder of the given radius from base along
// axis over length with ∂B/∂t given by dBdt (called only at points of the
// cylinder; its errors are passed on unchanged). u is the radial fraction, v
// the angle (turns, right-handed about axis) and w the axial fraction.
func NewCylinderRegion(base, axis Vec, radius, length float64, dBdt func(x Vec) (Vec, error)) (Region, error) {
	if dBdt == nil {
		return Region{}, errors.New("cylinder region: dB/dt function is nil")
	}
	r, _, err := cylinderFrame("cylinder", base, axis, radius, length)
	if err != nil {
		return Region{}, err
	}
	r.DBdt = dBdt
	return r, nil
}

// NewToroidRegion returns the core of a toroidal winding: the ring of
// rectangular cross-section between radii rIn and rOut about axis through
// center, extending height/2 on either side of the plane through center, with
//
//	∂B/∂t = dPhidt / (height·ln(rOut/rIn)·r) φ̂,
//
// the 1/r law of a toroidal winding's field, φ̂ right-handed about axis and r
// the distance from the axis, so that the flux rate through a meridian
// cross-section is dPhidt (= FluxRate). DBdt returns this law wherever it is
// asked (zero on the axis). u runs from rIn to rOut, v is the angle in turns
// and w runs from −height/2 to height/2.
func NewToroidRegion(center, axis Vec, rIn, rOut, height, dPhidt float64) (Region, error) {
	if !finiteVec(center) || !finiteVec(axis) {
		return Region{}, errors.New("toroid region: the centre and the axis must be finite")
	}
	if !positive(rIn) || !positive(rOut) || !positive(height) {
		return Region{}, fmt.Errorf("toroid region: the radii and the height must be positive and finite, got r_in=%g, r_out=%g, height=%g", rIn, rOut, height)
	}
	if !(rIn < rOut) {
		return Region{}, fmt.Errorf("toroid region: the inner radius %g must be smaller than the outer radius %g", rIn, rOut)
	}
	if math.IsNaN(dPhidt) || math.IsInf(dPhidt, 0) {
		return Region{}, fmt.Errorf("toroid region: dΦ/dt must be finite, got %g", dPhidt)
	}
	e1, e2, n, err := frame(axis, Vec{})
	if err != nil {
		return Region{}, fmt.Errorf("toroid region: %v", err)
	}
	k := dPhidt / (height * math.Log(rOut/rIn))
	dr := rOut - rIn
	jac := 2 * math.Pi * dr * height
	return Region{
		Kind: "toroid",
		Point: func(u, v, w float64) Vec {
			s, c := math.Sincos(2 * math.Pi * v)
			r := rIn + u*dr
			z := (w - 0.5) * height
			return Vec{
				X: center.X + z*n.X + r*(c*e1.X+s*e2.X),
				Y: center.Y + z*n.Y + r*(c*e1.Y+s*e2.Y),
				Z: center.Z + z*n.Z + r*(c*e1.Z+s*e2.Z),
			}
		},
		Jac: func(u, v, w float64) float64 { return jac * (rIn + u*dr) },
		DBdt: func(x Vec) (Vec, error) {
			d := r3.Sub(x, center)
			rho := r3.Sub(d, r3.Scale(r3.Dot(d, n), n))
			r2 := r3.Dot(rho, rho)
			if r2 == 0 {
				return Vec{}, nil
			}
			return r3.Scale(k/r2, r3.Cross(n, rho)), nil
		},
		Param: func(x Vec) (u, v, w float64, inside bool) {
			d := r3.Sub(x, center)
			p1, p2 := r3.Dot(d, e1), r3.Dot(d, e2)
			u = (math.Hypot(p1, p2) - rIn) / dr
			v = math.Atan2(p2, p1) / (2 * math.Pi)
			if v < 0 {
				v++
			}
			w = r3.Dot(d, n)/height + 0.5
			return u, v, w, inUnit(u) && inUnit(w)
		},
		Volume:    math.Pi * (rOut*rOut - rIn*rIn) * height,
		Size:      math.Hypot(rOut, height/2),
		FluxRate:  dPhidt,
		periodicV: true,
	}, nil
}

// NewBoxRegion returns the parallelepiped corner + u·s1 + v·s2 + w·s3,
// (u, v, w) in [0,1]³, with ∂B/∂t given by dBdt (called only at points of the
// box; its errors are passed on unchanged). The edges must span a volume:
// |s1·(s2×s3)| > 1e-12·|s1||s2||s3|.
func NewBoxRegion(corner, s1, s2, s3 Vec, dBdt func(x Vec) (Vec, error)) (Region, error) {
	if dBdt == nil {
		return Region{}, errors.New("box region: dB/dt function is nil")
	}
	if !finiteVec(corner) || !finiteVec(s1) || !finiteVec(s2) || !finiteVec(s3) {
		return Region{}, errors.New("box region: the corner and the edges must be finite")
	}
	n1, n2, n3 := r3.Norm(s1), r3.Norm(s2), r3.Norm(s3)
	c23, c31, c12 := r3.Cross(s2, s3), r3.Cross(s3, s1), r3.Cross(s1, s2)
	t := r3.Dot(s1, c23)
	if n1 == 0 || n2 == 0 || n3 == 0 || !(math.Abs(t) > 1e-12*n1*n2*n3) {
		return Region{}, errors.New("box region: the three edges are zero or do not span a volume")
	}
	vol := math.Abs(t)
	var size float64
	for _, sg := range [4][2]float64{{1, 1}, {1, -1}, {-1, 1}, {-1, -1}} {
		diag := r3.Add(s1, r3.Add(r3.Scale(sg[0], s2), r3.Scale(sg[1], s3)))
		size = math.Max(size, r3.Norm(diag)/2)
	}
	return Region{
		Kind: "box",
		Point: func(u, v, w float64) Vec {
			return Vec{
				X: corner.X + u*s1.X + v*s2.X + w*s3.X,
				Y: corner.Y + u*s1.Y + v*s2.Y + w*s3.Y,
				Z: corner.Z + u*s1.Z + v*s2.Z + w*s3.Z,
			}
		},
		Jac:  func(u, v, w float64) float64 { return vol },
		DBdt: dBdt,
		Param: func(x Vec) (u, v, w float64, inside bool) {
			d := r3.Sub(x, corner)
			u, v, w = r3.Dot(d, c23)/t, r3.Dot(d, c31)/t, r3.Dot(d, c12)/t
			return u, v, w, inUnit(u) && inUnit(v) && inUnit(w)
		},
		Volume: vol,
		Size:   size,
	}, nil
}

// regionDefaultMaxEval is RegionE's integrand-call budget when tol.MaxEval is
// 0 (several seconds of work for the slowest integrands, a few tenths of a
// second for the built-in regions at relative 1e-6).
const regionDefaultMaxEval = 20_000_000

// RegionE returns the induced electric field (V/m) at x of the region r,
//
//	E(x) = −(1/4π) ∫ (∂B/∂t)(r') × (x − r') / |x − r'|³ dV',
//
// by adaptive 3-D Gauss–Kronrod quadrature over the parameter box (as in
// IntegrateVec3, all pieces in one global heap).
//
// Splitting: when r.Param is set, the parameter box is split at x's
// parameters, clamped to [0,1]³ (for a periodic angle, the period is centred
// on x's angle instead), into up to 8 sub-boxes, so that for x inside or on
// the surface the singular point sits at a corner of every sub-box, and for x
// just outside the nearly singular point lies on their common edges or
// corners. For x on the axis of a cylinder the singularity is a whole edge
// u = 0 of the sub-boxes, which converges more slowly. Cylinders longer than
// 16 radii are also cut along the axis into cells that double in length
// away from x (gradedEdges), so that no cell is long compared with its
// distance from x.
//
// Solenoid regions (uniform ∂B/∂t along the axis) take another route: the
// integral along the axis in closed form and the cross-section by adaptive
// 2-D quadrature (solenoidAxialE), right at any length. The ideal solenoid's
// E is in closed form.
//
// Tolerance: the result is accepted when the error estimate (Euclidean norm)
// is <= max(tol.Abs, tol.Rel·max(|E|, Escale)), with
//
//	Escale = ∫|∂B/∂t| dV / (4π (Size² + d²)),
//
// d the distance of x from the region's centroid (both integrals from a
// 343-point Gauss rule over the parameter box); Escale is about the field a
// concentrated region of the same total |∂B/∂t| would make at x, so that
// points where E vanishes by symmetry terminate. Far from a region whose field
// falls faster than 1/d² (a toroid's falls like 1/d³) the accuracy relative to
// |E| degrades in proportion to d/Size. tol.MaxEval = 0 means a budget of
// 20 000 000 integrand calls; if the tolerance is not met the best value is
// returned with a *QuadError wrapping ErrNoConvergence.
//
// Errors: invalid regions (nil functions, Size not positive), a non-finite x
// or an invalid tol give plain errors; an error from r.DBdt is returned
// unchanged.
func RegionE(r Region, x Vec, tol Tol) (Vec, error) {
	if r.closedE != nil {
		if !finiteVec(x) {
			return Vec{}, fmt.Errorf("em: field point is not finite: %v", x)
		}
		return r.closedE(x), nil
	}
	if r.Point == nil || r.Jac == nil || r.DBdt == nil {
		return Vec{}, errors.New("em: region without Point, Jac or DBdt function")
	}
	if !positive(r.Size) {
		return Vec{}, fmt.Errorf("em: region size must be positive and finite, got %g", r.Size)
	}
	if !finiteVec(x) {
		return Vec{}, fmt.Errorf("em: field point is not finite: %v", x)
	}
	if _, err := quadCheckTol(tol); err != nil {
		return Vec{}, err
	}
	if tol.MaxEval == 0 {
		tol.MaxEval = regionDefaultMaxEval
	}

	// Parameter box and split points.
	lo, hi := [3]float64{0, 0, 0}, [3]float64{1, 1, 1}
	var cuts [3]float64
	var hasCut [3]bool
	if r.Param != nil {
		u, v, w, _ := r.Param(x)
		p := [3]float64{u, v, w}
		for d := 0; d < 3; d++ {
			if !quadFinite(p[d]) {
				continue
			}
			if d == 1 && r.periodicV {
				v0 := p[d] - math.Floor(p[d])
				lo[1], hi[1] = v0-0.5, v0+0.5
				cuts[1], hasCut[1] = v0, true
				continue
			}
			if c := math.Max(0, math.Min(1, p[d])); c > 0 && c < 1 {
				cuts[d], hasCut[d] = c, true
			}
		}
	}

	// Centroid and Escale from the 7³-point Gauss rule on [0,1]³.
	var vol, mass float64
	var cen Vec
	for i := 1; i < 15; i += 2 {
		u := 0.5 + 0.5*gkNodes[i]
		for j := 1; j < 15; j += 2 {
			v := lo[1] + 0.5 + 0.5*gkNodes[j]
			for k := 1; k < 15; k += 2 {
				w := 0.5 + 0.5*gkNodes[k]
				wt := gkGW[i] * gkGW[j] * gkGW[k] / 8 * r.Jac(u, v, w)
				p := r.Point(u, v, w)
				b, err := r.DBdt(p)
				if err != nil {
					return Vec{}, err
				}
				vol += wt
				cen = r3.Add(cen, r3.Scale(wt, p))
				mass += wt * r3.Norm(b)
			}
		}
	}
	if !(vol > 0) || !quadFinite(vol) || !quadFinite(mass) || !finiteVec(cen) {
		return Vec{}, fmt.Errorf("em: region has no volume or a non-finite ∂B/∂t (∫dV = %g, ∫|∂B/∂t| dV = %g)", vol, mass)
	}
	cen = r3.Scale(1/vol, cen)
	dc := r3.Norm(r3.Sub(x, cen))
	escale := mass / (4 * math.Pi * (r.Size*r.Size + dc*dc))
	tol.Abs = math.Max(tol.Abs, tol.Rel*escale)
	if r.axialE != nil {
		return r.axialE(x, tol)
	}

	// Sub-boxes.
	var edges [3][]float64
	for d := 0; d < 3; d++ {
		edges[d] = []float64{lo[d], hi[d]}
		if hasCut[d] {
			edges[d] = []float64{lo[d], cuts[d], hi[d]}
		}
	}
	if r.axialScale > 0 && r.Param != nil {
		edges[2] = gradedEdges(r, x)
	}
	boxes := make([][2][3]float64, 0, 8)
	for i := 1; i < len(edges[0]); i++ {
		for j := 1; j < len(edges[1]); j++ {
			for k := 1; k < len(edges[2]); k++ {
				boxes = append(boxes, [2][3]float64{
					{edges[0][i-1], edges[1][j-1], edges[2][k-1]},
					{edges[0][i], edges[1][j], edges[2][k]},
				})
			}
		}
	}

	var userErr error
	nan := Vec{X: math.NaN()}
	f := func(u, v, w float64) Vec {
		if userErr != nil {
			return nan
		}
		p := r.Point(u, v, w)
		d := Vec{X: x.X - p.X, Y: x.Y - p.Y, Z: x.Z - p.Z}
		n2 := d.X*d.X + d.Y*d.Y + d.Z*d.Z
		if n2 == 0 {
			return Vec{}
		}
		b, err := r.DBdt(p)
		if err != nil {
			userErr = err
			return nan // stops the quadrature at once
		}
		s := -r.Jac(u, v, w) / (4 * math.Pi * n2 * math.Sqrt(n2))
		return Vec{
			X: s * (b.Y*d.Z - b.Z*d.Y),
			Y: s * (b.Z*d.X - b.X*d.Z),
			Z: s * (b.X*d.Y - b.Y*d.X),
		}
	}
	e, est, evals, target, err := quadIntegrate3(f, boxes, tol)
	if userErr != nil {
		return Vec{}, userErr
	}
	if errors.Is(err, ErrNoConvergence) {
		return e, &QuadError{Vec: e, Estimate: est, Target: target, Evals: evals}
	}
	if err == nil {
		tol.addEst(est)
	}
	return e, err
}

// gradedEdges returns the cell edges along w (the axis) of a cylinder for
// the field point x: from the point's w (clamped to [0,1]) outwards, cells
// of the larger of the radius and the point's distance from the axis,
// doubling in size at every step. Without them a long cylinder's box is a
// few cells whose Gauss–Kronrod nodes lie far from the point compared with
// the radius, where the integrand is all but zero: both rules agree on a
// wrong value (a 30 km core gave 1e-10 V/m instead of 4e-3 V/m). With them
// every cell is about as long as its distance from the point, as for a
// short cylinder.
func gradedEdges(r Region, x Vec) []float64 {
	u, _, w, _ := r.Param(x)
	g := r.axialScale * math.Max(1, u)
	c := math.Max(0, math.Min(1, w))
	if !quadFinite(c) || !(g > 0) || g >= 1.0/16 {
		// short cylinders (length < 16 radii) keep the plain split, which
		// their cells resolve
		if c > 0 && c < 1 {
			return []float64{0, c, 1}
		}
		return []float64{0, 1}
	}
	var below, above []float64
	for s := g; c-s > 0; s *= 2 {
		below = append(below, c-s)
	}
	for s := g; c+s < 1; s *= 2 {
		above = append(above, c+s)
	}
	edges := []float64{0}
	for i := len(below) - 1; i >= 0; i-- {
		edges = append(edges, below[i])
	}
	if c > 0 && c < 1 {
		edges = append(edges, c)
	}
	edges = append(edges, above...)
	return append(edges, 1)
}

// PointCost is about the work of RegionE at one point, in units of one
// straight segment's field (about 11 ns): closed forms cost nothing, the
// solenoid's 2-D route about 1e4, the volume cubature about 1e6 (10 ms;
// BenchmarkInducedRegion measures about 0.1 ms at a point of a solenoid
// and 0.4 s inside a toroid; points outside a region cost less, about
// 5 ms around a toroid's core).
func (r Region) PointCost() float64 {
	switch {
	case r.closedE != nil:
		return 1
	case r.axialE != nil:
		return 1e4
	}
	return 1e6
}
