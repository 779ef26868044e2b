package em

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/spatial/r3"
)

// Shape is a current distribution that is not a thin-wire path: a current
// sheet, an ideal (infinite) conductor, a point dipole. Its fields are per
// ampere of the Source's current I; what "one ampere" means is the shape's
// own (the sheet's total current, the wire's current, a dipole of 1 A·m²).
type Shape interface {
	// Field is B (T per A) or A (T·m per A) at x; stop, if not nil, is
	// polled by numerical integrals.
	Field(which Which, x Vec, stop func() error) (Vec, error)
	// Mirror is the shape's image in the plane through p with unit normal
	// n: positions reflected, current elements reflected as polar vectors
	// (so a magnetic moment m becomes −R·m with R the reflection).
	Mirror(p, n Vec) Shape
	// Weight is the cost of one field point in elementary evaluations.
	Weight() float64
}

// ErrOnSheet is returned for a field point on a current sheet (the face of
// a magnet), where B jumps, or at a point dipole.
var ErrOnSheet = errors.New("the field point lies on a current sheet or at a dipole, where the field is not defined")

// ErrBehindPlate is returned for a field point inside the permeable half
// space of a mirrored source, where the images do not give the field.
var ErrBehindPlate = errors.New("the field point lies behind the permeable plane, inside the material, where the images do not give the field")

// Plate is the plane of a permeable half space: a point on it and the unit
// normal pointing into the free side (the side of the currents).
type Plate struct{ P, N Vec }

// Behind reports whether x lies inside the material (beyond a rounding
// allowance relative to the distance from the plate's point).
func (pl Plate) Behind(x Vec) bool {
	d := r3.Dot(r3.Sub(x, pl.P), pl.N)
	return d < -1e-9*r3.Norm(r3.Sub(x, pl.P))
}

// ReflectPoint reflects x in the plane through p with unit normal n.
func ReflectPoint(x, p, n Vec) Vec {
	return r3.Sub(x, r3.Scale(2*r3.Dot(r3.Sub(x, p), n), n))
}

// reflectDir reflects a direction (a polar vector) in a plane of unit
// normal n.
func reflectDir(v, n Vec) Vec { return r3.Sub(v, r3.Scale(2*r3.Dot(v, n), n)) }

// Mirror reflects a primitive in the plane through p with unit normal n,
// traversed in the same order (so each current element is reflected as a
// polar vector). An arc's frame becomes left-handed under a reflection;
// N is set back to U × V and the helix pitch changes sign, which leaves
// every point of the piece where the reflection puts it.
func (p Prim) Mirror(pt, n Vec) Prim {
	switch p.Kind {
	case Segment:
		p.A, p.B = ReflectPoint(p.A, pt, n), ReflectPoint(p.B, pt, n)
	default:
		p.C = ReflectPoint(p.C, pt, n)
		p.U, p.V = reflectDir(p.U, n), reflectDir(p.V, n)
		p.N = r3.Cross(p.U, p.V)
		p.Pitch = -p.Pitch
	}
	return p
}

// Mirror reflects every piece of a path (see Prim.Mirror).
func (p Path) Mirror(pt, n Vec) Path {
	out := make([]Prim, len(p.Prims))
	for i, q := range p.Prims {
		out[i] = q.Mirror(pt, n)
	}
	return Path{Prims: out}
}

// axialFrame splits x − c into the distance along the unit axis n and the
// radial vector.
func axialFrame(x, c, n Vec) (z float64, rho Vec) {
	d := r3.Sub(x, c)
	z = r3.Dot(d, n)
	return z, r3.Sub(d, r3.Scale(z, n))
}

// InfiniteWire is an infinitely long straight current through P along the
// unit vector D. Its vector potential is −μ0/(2π)·ln(ρ/RRef)·D, zero at
// the distance RRef (the radius of a coaxial return conductor; loops'
// fluxes do not depend on it, the induced E along the wire does).
type InfiniteWire struct {
	P, D Vec
	RRef float64
}

func (w InfiniteWire) Field(which Which, x Vec, _ func() error) (Vec, error) {
	_, r := axialFrame(x, w.P, w.D)
	rho := r3.Norm(r)
	if !(rho > onWireRel*math.Max(rho+r3.Norm(r3.Sub(x, w.P)), w.RRef)) {
		return Vec{}, ErrOnWire
	}
	if which == FieldB {
		// Ampère's law: B = μ0 I / (2πρ) in the direction D × ρ̂
		return r3.Scale(Mu0/(2*math.Pi*rho*rho), r3.Cross(w.D, r)), nil
	}
	return r3.Scale(-Mu0/(2*math.Pi)*math.Log(rho/w.RRef), w.D), nil
}

func (w InfiniteWire) Mirror(p, n Vec) Shape {
	return InfiniteWire{P: ReflectPoint(w.P, p, n), D: reflectDir(w.D, n), RRef: w.RRef}
}

func (InfiniteWire) Weight() float64 { return 2 }

// IdealSolenoid is an infinitely long cylindrical current sheet about the
// line through C along the unit N, of radius R, with Turns per metre: per
// ampere, the surface current is Turns A/m circulating right-handed about
// N. Inside B = μ0·n·I·N, outside none; A_φ = μ0 n I ρ/2 inside and
// μ0 n I R²/(2ρ) outside (Ampère's law and Stokes' theorem).
type IdealSolenoid struct {
	C, N  Vec
	R     float64
	Turns float64
}

func (s IdealSolenoid) Field(which Which, x Vec, _ func() error) (Vec, error) {
	_, r := axialFrame(x, s.C, s.N)
	rho := r3.Norm(r)
	k := Mu0 * s.Turns
	if which == FieldB {
		switch {
		case math.Abs(rho-s.R) <= 1e-12*s.R:
			return Vec{}, ErrOnSheet
		case rho < s.R:
			return r3.Scale(k, s.N), nil
		}
		return Vec{}, nil
	}
	// A = A_φ φ̂ with φ̂ = N × ρ̂: A_φ φ̂ = (A_φ/ρ) N × r
	f := k / 2 // inside: A_φ/ρ = μ0 n / 2
	if rho > s.R {
		f = k * s.R * s.R / (2 * rho * rho)
	}
	return r3.Scale(f, r3.Cross(s.N, r)), nil
}

func (s IdealSolenoid) Mirror(p, n Vec) Shape {
	return IdealSolenoid{C: ReflectPoint(s.C, p, n), N: r3.Scale(-1, reflectDir(s.N, n)), R: s.R, Turns: s.Turns}
}

func (IdealSolenoid) Weight() float64 { return 2 }

// Dipole is a point magnetic dipole at P with moment M (A·m² per ampere of
// the source's current):
//
//	B = μ0/(4π) (3(m·r̂)r̂ − m)/r³,  A = μ0/(4π) m × r / r³
//
// (J. D. Jackson, Classical Electrodynamics, 3rd ed., 1999, eqs. 5.55 and
// 5.56), without the delta term at r = 0, where the field is refused.
type Dipole struct{ P, M Vec }

func (d Dipole) Field(which Which, x Vec, _ func() error) (Vec, error) {
	r := r3.Sub(x, d.P)
	rr := r3.Norm(r)
	if !(rr > 0) {
		return Vec{}, ErrOnSheet
	}
	r3i := 1 / (rr * rr * rr)
	if which == FieldB {
		u := r3.Scale(1/rr, r)
		return r3.Scale(k0*r3i, r3.Sub(r3.Scale(3*r3.Dot(d.M, u), u), d.M)), nil
	}
	return r3.Scale(k0*r3i, r3.Cross(d.M, r)), nil
}

func (d Dipole) Mirror(p, n Vec) Shape {
	return Dipole{P: ReflectPoint(d.P, p, n), M: r3.Scale(-1, reflectDir(d.M, n))}
}

func (Dipole) Weight() float64 { return 2 }
