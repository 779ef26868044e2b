package builtins

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/builtins/ode"
	"loopwise/runtime"
)

// The ring launcher: a capacitor bank discharged into a coil throws a
// conducting ring off the coil's end. Two circuits coupled by M(z), the
// mutual inductance of the coil and the ring at the ring's height z, and
// the ring's motion:
//
//	L1·i1' + M·i2' = v_C − R1·i1 − M'(z)·v·i2      (coil and bank)
//	M·i1' + L2·i2' = −R2·i2 − M'(z)·v·i1           (ring)
//	C·v_C' = −i1,  z' = v,  m·v' = i1·i2·M'(z) − m·g
//
// from Faraday's law for each circuit's flux linkage (L1·i1 + M·i2 and
// L2·i2 + M·i1, both changing as the ring moves) and the force on a
// circuit at constant currents, F = i1·i2·dM/dz. M(z) and dM/dz come
// from the exact geometry: the coil's turns and the ring are coaxial
// circles, for which Maxwell's formula and its derivative are closed forms
// (em.MaxwellMutual, em.MaxwellMutualDd). The coil's axis points up;
// gravity pulls along −axis, and the ring rests on its start (a support)
// until the force lifts it. Energy: ½C·v_C² + ½L1·i1² + ½L2·i2² + M·i1·i2
// + heat + ½m·v² + m·g·z is constant; the heat of each circuit is
// integrated as two more states.

const refLaunch = "Faraday's law for coupled circuits with motion (flux linkages L·i + M(z)·i'), force i1·i2·dM/dz; M(z) by Maxwell's formula for coaxial circles (J. C. Maxwell, A Treatise on Electricity and Magnetism, 1873, §701) and its closed-form derivative; integrated by Radau IIA of order 5"

// standardGravity is g_n = 9.80665 m/s² (exact by definition, 3rd CGPM,
// 1901; ISO 80000-3).
const standardGravity = 9.80665

// projectileEnergy is the kinetic energy above which a launched ring is
// treated as a projectile that can injure (an eye above all): 1 J, a rule
// of thumb (common practice).
const projectileEnergy = 1.0

// launchGeometry is the coil's turns as coaxial circles and the ring.
type launchGeometry struct {
	radii, at []float64 // each turn's radius and axial position
	signs     []float64 // +1 for a turn wound the ring's way round, −1 against
	b         float64   // ring radius
	z0        float64   // ring's start, axial position
}

// m and dm are M and dM/dz with the ring raised by z from its start.
func (g *launchGeometry) m(z float64) (m, dm float64) {
	for i, a := range g.radii {
		d := g.z0 + z - g.at[i]
		m += g.signs[i] * em.MaxwellMutual(a, g.b, math.Abs(d))
		dm += g.signs[i] * math.Copysign(1, d) * em.MaxwellMutualDd(a, g.b, math.Abs(d))
	}
	return m, dm
}

// circleAxis is a whole circle's axis, oriented by its direction of
// circulation (right-hand rule).
func circleAxis(p em.Prim) em.Vec {
	return r3.Scale(math.Copysign(1, p.Span), p.N)
}

func newLaunchGeometry(fn string, coil, ring em.Path) (*launchGeometry, error) {
	if len(ring.Prims) != 1 || !ring.Prims[0].IsCircle() {
		return nil, errorf("%s: the ring must be one circle (circle(centre, axis, radius))", fn)
	}
	rp := ring.Prims[0]
	axis := circleAxis(rp)
	g := &launchGeometry{b: rp.R}
	if len(coil.Prims) == 0 {
		return nil, errorf("%s: the coil has no turns", fn)
	}
	if len(coil.Prims) > maxTurns {
		return nil, errorf("%s: the coil has %d turns; the limit is %d", fn, len(coil.Prims), maxTurns)
	}
	origin := coil.Prims[0].C
	for _, p := range coil.Prims {
		if !p.IsCircle() {
			return nil, errorf("%s: the coil must be made of whole circles on one axis (rings(...)); a helix or other pieces are not supported here", fn)
		}
		n := circleAxis(p)
		if r3.Norm(r3.Cross(n, axis)) > 1e-9 {
			return nil, errorf("%s: the ring and the coil's turns must share one axis", fn)
		}
		off := r3.Sub(p.C, origin)
		along := r3.Dot(off, axis)
		if r3.Norm(r3.Sub(off, r3.Scale(along, axis))) > 1e-9*math.Max(p.R, rp.R) {
			return nil, errorf("%s: the ring and the coil's turns must share one axis (a turn is off it)", fn)
		}
		g.radii = append(g.radii, p.R)
		g.at = append(g.at, along)
		g.signs = append(g.signs, math.Copysign(1, r3.Dot(n, axis)))
	}
	off := r3.Sub(rp.C, origin)
	g.z0 = r3.Dot(off, axis)
	if r3.Norm(r3.Sub(off, r3.Scale(g.z0, axis))) > 1e-9*rp.R {
		return nil, errorf("%s: the ring's centre must lie on the coil's axis", fn)
	}
	for i, a := range g.radii {
		if math.Abs(a-g.b) < 1e-9*g.b && math.Abs(g.z0-g.at[i]) < 1e-9*g.b {
			return nil, errorf("%s: the ring lies on a turn of the coil", fn)
		}
	}
	return g, nil
}

func ringLaunchBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "ring_launch"
	r := readArgs(fn, args)
	coil, ring := r.path(0), r.path(1)
	l1, r1 := r.positive(2, dimHenry), r.nonNegative(3, dimOhm)
	l2, r2 := r.positive(4, dimHenry), r.positive(5, dimOhm)
	c, v0 := r.positive(6, dimFarad), r.ofDim(7, dimVolt)
	mass := r.positive(8, mustDim("kg"))
	tEnd := r.positive(9, dimTime)
	if r.err != nil {
		return nil, r.err
	}
	samples := defaultSamples
	if len(args) > 10 {
		var err error
		if samples, err = count(fn, args, 10, 2, maxSweep); err != nil {
			return nil, err
		}
	}
	g, err := newLaunchGeometry(fn, coil, ring)
	if err != nil {
		return nil, err
	}
	m0, _ := g.m(0)
	if m0*m0 >= l1*l2 {
		return nil, errorf("%s: the coil and ring's mutual inductance at the start (%s) is not below √(L1·L2) (%s): give self-inductances that include the same turns (inductance(coil, wire radius))", fn,
			runtime.Format(runtime.Quantity{V: m0, D: dimHenry}, 6), runtime.Format(runtime.Quantity{V: math.Sqrt(l1 * l2), D: dimHenry}, 6))
	}
	// y = v_C, i1, i2, z, v, heat in coil, heat in ring
	cost := 60 * float64(len(g.radii))
	var geomErr error
	f := func(t float64, y, dy []float64) error {
		vc, i1, i2, z, v := y[0], y[1], y[2], y[3], y[4]
		m, dm := g.m(z)
		det := l1*l2 - m*m
		if !(det > 0) {
			geomErr = errorf("%s: at t = %s the ring reaches a height where the mutual inductance is not below √(L1·L2); the self-inductances are too small for this geometry", fn, runtime.Format(runtime.Quantity{V: t, D: dimTime}, 6))
			return geomErr
		}
		e1 := vc - r1*i1 - dm*v*i2
		e2 := -r2*i2 - dm*v*i1
		dy[0] = -i1 / c
		dy[1] = (l2*e1 - m*e2) / det
		dy[2] = (l1*e2 - m*e1) / det
		dy[3] = v
		acc := i1*i2*dm/mass - standardGravity
		if z <= 0 && v <= 0 && acc < 0 {
			acc = 0 // resting on its support
		}
		dy[4] = acc
		dy[5] = r1 * i1 * i1
		dy[6] = r2 * i2 * i2
		return charge(env, fn, cost)
	}
	y0 := []float64{v0, 0, 0, 0, 0, 0, 0}
	var sols [2]*ode.Solution
	// the result, and the same at a hundred times tighter tolerances for
	// its error estimate (as transient's)
	for k, scale := range []float64{1, 0.01} {
		sol, err := ode.Solve(f, 0, tEnd, y0, ode.Options{RelTol: transientRelTol * scale, AbsTol: transientAbsTol * scale, Check: checkFunc(env)})
		if err != nil {
			if geomErr != nil {
				return nil, geomErr
			}
			return nil, odeErr(fn, err)
		}
		sols[k] = sol
	}
	sol := sols[0]
	tab := &Table{Title: "ring launch (z: the ring's rise from its start, along the coil's axis)"}
	for _, c := range []struct {
		name string
		d    runtime.Dim
	}{{"t", dimTime}, {"I coil", dimCurrent}, {"I ring", dimCurrent}, {"V bank", dimVolt}, {"z", dimLength}, {"v", dimSpeed}, {"F", dimNewton}, {"heat coil", dimJoule}, {"heat ring", dimJoule}} {
		tab.Cols = append(tab.Cols, c.name)
		tab.Dims = append(tab.Dims, c.d)
	}
	y := make([]float64, 7)
	rowOf := func(s *ode.Solution, t float64) []float64 {
		s.At(t, y)
		_, dm := g.m(y[3])
		return []float64{t, y[1], y[2], y[0], y[3], y[4], y[1] * y[2] * dm, y[5], y[6]}
	}
	tab.NumErr = make([]float64, len(tab.Cols))
	maxKE, lifted := 0.0, false
	for k := 0; k < samples; k++ {
		t := tEnd * float64(k) / float64(samples-1)
		row := rowOf(sol, t)
		if row[4] > 0 {
			lifted = true
		} else if lifted && row[4] < 0 {
			break // back down on its support: the model ends at the landing
		}
		maxKE = math.Max(maxKE, 0.5*mass*row[5]*row[5])
		tab.Rows = append(tab.Rows, row)
		ref := rowOf(sols[1], t)
		for j := 1; j < len(row); j++ {
			tab.NumErr[j] = math.Max(tab.NumErr[j], 2*math.Abs(row[j]-ref[j])+1e-13*math.Abs(row[j]))
		}
	}
	w := 0.5 * c * v0 * v0
	var notes []string
	if w > storedEnergyThreshold || math.Abs(v0) > elvDC {
		notes = append(notes, fmt.Sprintf("the bank holds %s at %s: above %g J (the hazardous energy level of IEC 60950-1, from memory) or 120 V DC it can burn, shock or kill, and stays dangerous after the power is off",
			runtime.Format(runtime.Quantity{V: w, D: dimJoule}, 4), runtime.Format(runtime.Quantity{V: v0, D: dimVolt}, 4), storedEnergyThreshold))
	}
	if maxKE > projectileEnergy {
		notes = append(notes, fmt.Sprintf("the ring leaves with up to %s of kinetic energy, above %g J (rule of thumb, common practice): it is a projectile that can injure, above all an eye; shield the launch path and keep people out of it", runtime.Format(runtime.Quantity{V: maxKE, D: dimJoule}, 4), projectileEnergy))
	}
	if len(notes) > 0 {
		tab.Caution = "caution: " + joinSentences(notes) + ". " + deferText
	}
	return tab, nil
}

func joinSentences(s []string) string {
	out := s[0]
	for _, x := range s[1:] {
		out += "; " + x
	}
	return out
}

func launchFuncs() []*runtime.Func {
	return []*runtime.Func{
		fncEnv("ring_launch", []string{"coil", "ring", "L_coil", "R_coil", "L_ring", "R_ring", "C", "V0", "mass", "t_end", "n"}, 10, 11, &runtime.Help{
			Signature: "ring_launch(coil: rings on one axis, ring: circle on that axis, L_coil: H, R_coil: ohm, L_ring: H, R_ring: ohm, C: F, V0: V, mass: kg, t_end: s[, n: whole number, default 201]) -> table",
			Summary:   "A capacitor bank C charged to V0 discharged into a coil (inductance L_coil, resistance R_coil, bank and leads included) throws a conducting ring (L_ring, R_ring, mass) off the coil along its axis, which points up (gravity 9.80665 m/s² pulls down; the ring rests on its start until the force lifts it). Table: t, the currents (coil and ring, each in its path's direction), the bank's voltage, the ring's rise z and speed v, the force F, and the heat in coil and ring so far; it ends at t_end or when the ring lands back. L_coil and L_ring come from inductance(path, wire radius); M(z) comes from the geometry. Cautions for stored energy and for the ring's kinetic energy.",
			Method:    "the coupled circuit equations with motion and the ring's equation of motion, M(z) and dM/dz by Maxwell's formula for coaxial circles and its closed-form derivative (within 1e-8 of the Lorentz force in the tests), integrated by Radau IIA of order 5 (relative 1e-8); the tests find the energy balance within 1e-6 of the bank's energy and the first instants within 1e-6 of the locked-ring circuit. The last row, num. error, bounds each column's numerical error as for transient (the tests find the energy balance within the bound carried from it)",
			Example:   "coil = rings([0, 0, 0] m, [0, 0, 1], 15 mm, 20 mm, 40)\nring = circle([0, 0, 14] mm, [0, 0, 1], 18 mm)\nshot = ring_launch(coil, ring, inductance(coil, 0.5 mm), 0.05 ohm, inductance(ring, 1.5 mm), 0.4 mohm, 1 mF, 100 V, 4 g, 3 ms, 4)\nshot",
			Reference: refLaunch,
		}, ringLaunchBuiltin),
	}
}
