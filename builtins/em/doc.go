// Package em holds the numerical core of Loopwise's induction builtins:
// current paths made of exact primitives (straight segments, circular arcs
// and helices), their magnetic flux density B and vector potential A by
// the Biot–Savart law, flux, mutual and self inductance, EMF and forces,
// the induced E of regions where ∂B/∂t is given, and numerical derivatives
// of fields and currents.
//
// All quantities are in coherent SI units (m, A, T, Wb, H, N) and all
// fields are for the current carried by the path, given separately. The
// package knows nothing of the Loopwise language; builtins/ wraps it.
//
// # Methods
//
// Straight segments use closed forms for B and A. Circular arcs and
// circles use closed forms in Legendre's incomplete and complete elliptic
// integrals (gonum's mathext), falling back to adaptive quadrature of the
// exact arc where the closed form loses precision (field points very close
// to the circle an arc lies on). Helices are integrated by adaptive
// Gauss–Kronrod quadrature along the exact curve. Nothing round is
// replaced by polygons unless the caller asks.
package em
