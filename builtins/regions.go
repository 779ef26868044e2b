package builtins

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

const refRegions = "E(r) = −(1/4π) ∫ (∂B/∂t)(r') × (r − r')/|r − r'|³ dV' (the Biot–Savart analogy of Faraday's law); checked against the long-solenoid and thin-toroid closed forms and against E = −∂A/∂t of a matching winding (builtins/em/induced_test.go)"

// regionTol is the accuracy of the induced-field volume integral: 1e-6
// relative, within RegionE's default budget of integrand calls. A point
// inside a region needs many more calls than one outside
// (BenchmarkInducedRegion in builtins/em times both).
var regionTol = em.Tol{Rel: 1e-6}

// Region is a volume where ∂B/∂t is given directly.
type Region struct{ R em.Region }

func (r *Region) Kind() string { return "a changing-field region" }

func (r *Region) Show(digits int) string {
	s := fmt.Sprintf("region: %s, volume %s", r.R.Kind, runtime.Format(runtime.Quantity{V: r.R.Volume, D: dimVolume}, digits))
	if math.IsInf(r.R.Volume, 0) {
		s = fmt.Sprintf("region: %s (infinitely long)", r.R.Kind)
	}
	if r.R.FluxRate != 0 {
		s += ", dΦ/dt " + runtime.Format(runtime.Quantity{V: r.R.FluxRate, D: dimVolt}, digits)
	}
	return s
}

func (r *Region) Summary(digits int) string { return r.Show(digits) }

// regionField makes E of a region as a field.
func regionField(r *Region) *Field {
	return &Field{
		pointCost: r.R.PointCost(),
		desc:      "E of " + r.Show(6),
		sym:       "E",
		dim:       dimEfield,
		prepare: func(env runtime.Env, fn string, t float64, hasT bool) (func(x em.Vec) (em.Vec, error), error) {
			tol := control(env, fn, regionTol)
			tol.Progress = nil // one point: no progress of its own
			return func(x em.Vec) (em.Vec, error) { return em.RegionE(r.R, x, tol) }, nil
		},
	}
}

// dbdtArg reads a rate of change of B: a vector in T/s (uniform) or a
// function of position returning one.
func dbdtArg(env runtime.Env, fn string, args []runtime.Value, i int) (func(x em.Vec) (em.Vec, error), error) {
	switch v := args[i].(type) {
	case runtime.Vector:
		if v.D != dimRate {
			return nil, errorf("%s: ∂B/∂t must be a vector in T/s, not %s", fn, v.D.Describe())
		}
		c := toVec(v)
		return func(em.Vec) (em.Vec, error) { return c, nil }, nil
	case *runtime.Func:
		if v.MinArgs > 1 || (v.MaxArgs >= 0 && v.MaxArgs < 1) {
			return nil, errorf("%s: a ∂B/∂t function takes one argument, the position; %s does not", fn, v.Signature())
		}
		return func(x em.Vec) (em.Vec, error) {
			out, err := v.Invoke(env, []runtime.Value{fromVec(x, dimLength)})
			if err != nil {
				return em.Vec{}, err
			}
			vv, ok := out.(runtime.Vector)
			if !ok || vv.D != dimRate {
				return em.Vec{}, errorf("%s: %s must return a vector in T/s, not %s", fn, v.Signature(), runtime.TypeName(out))
			}
			return toVec(vv), nil
		}, nil
	}
	return nil, errorf("%s: ∂B/∂t must be a vector in T/s or a function of position, not %s", fn, runtime.TypeName(args[i]))
}

func regionFuncs() []*runtime.Func {
	return []*runtime.Func{
		fnc("dbdt_solenoid", []string{"center", "axis", "radius", "length", "dBdt"}, 5, 5, &runtime.Help{
			Signature: "dbdt_solenoid(center: position [m], axis: vector, radius: length, length: length, dBdt: T/s) -> region",
			Summary:   "A cylinder (a long solenoid's interior), placed by its centre, where B along axis changes uniformly at dBdt.",
			Method:    "E by the volume integral with its part along the axis in closed form and the cross-section by adaptive 2-D Gauss–Kronrod, relative 1e-6; right at any length (tested from 1 mm to 1000 km against Maxwell's coaxial-circle formula, and tending to dbdt_ideal_solenoid)",
			Example:   "dbdt_solenoid([0, 0, 0] m, [0, 0, 1], 20 mm, 2 m, 100 T/s)",
			Reference: refRegions,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "dbdt_solenoid"
			r := readArgs(fn, args)
			center, ax, rad, l, rate := r.point(0), r.axis(1), r.positiveLength(2), r.positiveLength(3), r.ofDim(4, dimRate)
			if r.err != nil {
				return nil, r.err
			}
			reg, err := em.NewSolenoidRegion(baseOf(center, ax, l), ax, rad, l, rate)
			if err != nil {
				return nil, geomErr(fn, err)
			}
			return &Region{reg}, nil
		}),
		fnc("dbdt_ideal_solenoid", []string{"center", "axis", "radius", "dBdt"}, 4, 4, &runtime.Help{
			Signature: "dbdt_ideal_solenoid(center: position [m], axis: vector, radius: length, dBdt: T/s) -> region",
			Summary:   "The core of an infinitely long solenoid through center along axis, where B along axis changes uniformly at dBdt; its E is exact.",
			Method:    "closed form: E is azimuthal (right-handed about axis), −(r/2)·dBdt inside and −(R²/(2r))·dBdt outside, r the distance from the axis",
			Example:   "e_at(dbdt_ideal_solenoid([0, 0, 0] m, [0, 0, 1], 25 mm, 3 T/s), [10, 0, 0] mm)",
			Reference: "Faraday's law on a circle about the axis, E azimuthal by symmetry: 2πr·E = −dΦ/dt (Griffiths, Introduction to Electrodynamics, 4th ed., 2017, §7.2); a long dbdt_solenoid tends to it (builtins/em/induced_test.go)",
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "dbdt_ideal_solenoid"
			r := readArgs(fn, args)
			c, ax, rad, rate := r.point(0), r.axis(1), r.positiveLength(2), r.ofDim(3, dimRate)
			if r.err != nil {
				return nil, r.err
			}
			reg, err := em.NewIdealSolenoidRegion(c, ax, rad, rate)
			if err != nil {
				return nil, geomErr(fn, err)
			}
			return &Region{reg}, nil
		}),
		fnc("dfluxdt_toroid", []string{"center", "axis", "r_in", "r_out", "height", "dPhi_dt"}, 6, 6, &runtime.Help{
			Signature: "dfluxdt_toroid(center: position [m], axis: vector, r_in: length, r_out: length, height: length, dPhi_dt: Wb/s) -> region",
			Summary:   "A toroidal core of rectangular section, placed by its centre (on its axis, midway through the height), whose flux changes at dPhi_dt (B ∝ 1/r across the section, along +φ right-handed about axis).",
			Example:   "dfluxdt_toroid([0, 0, 0] m, [0, 0, 1], 20 mm, 30 mm, 10 mm, 5 V)",
			Reference: refRegions,
		}, func(args []runtime.Value) (runtime.Value, error) {
			const fn = "dfluxdt_toroid"
			r := readArgs(fn, args)
			c, ax, rin, rout, h, rate := r.point(0), r.axis(1), r.positiveLength(2), r.positiveLength(3), r.positiveLength(4), r.ofDim(5, dimVolt)
			if r.err != nil {
				return nil, r.err
			}
			reg, err := em.NewToroidRegion(c, ax, rin, rout, h, rate)
			if err != nil {
				return nil, geomErr(fn, err)
			}
			return &Region{reg}, nil
		}),
		{
			Name: "dbdt_cylinder", Params: []string{"center", "axis", "radius", "length", "dBdt"}, MinArgs: 5, MaxArgs: 5,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				const fn = "dbdt_cylinder"
				r := readArgs(fn, args)
				center, ax, rad, l := r.point(0), r.axis(1), r.positiveLength(2), r.positiveLength(3)
				if r.err != nil {
					return nil, r.err
				}
				f, err := dbdtArg(env, fn, args, 4)
				if err != nil {
					return nil, err
				}
				reg, err := em.NewCylinderRegion(baseOf(center, ax, l), ax, rad, l, f)
				if err != nil {
					return nil, geomErr(fn, err)
				}
				return &Region{reg}, nil
			},
			Help: &runtime.Help{
				Signature: "dbdt_cylinder(center: position [m], axis: vector, radius: length, length: length, dBdt: vector [T/s] or function of position) -> region",
				Summary:   "A cylinder, placed by its centre, in which ∂B/∂t is given: a constant vector or your function of position.",
				Example:   "dbdt_cylinder([0, 0, 10] mm, [0, 0, 1], 10 mm, 20 mm, [0, 0, 50] T/s)",
				Reference: refRegions,
			},
		},
		{
			Name: "dbdt_box", Params: []string{"corner", "side1", "side2", "side3", "dBdt"}, MinArgs: 5, MaxArgs: 5,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				const fn = "dbdt_box"
				r := readArgs(fn, args)
				c, s := r.point(0), [3]em.Vec{r.point(1), r.point(2), r.point(3)}
				if r.err != nil {
					return nil, r.err
				}
				f, err := dbdtArg(env, fn, args, 4)
				if err != nil {
					return nil, err
				}
				reg, err := em.NewBoxRegion(c, s[0], s[1], s[2], f)
				if err != nil {
					return nil, geomErr(fn, err)
				}
				return &Region{reg}, nil
			},
			Help: &runtime.Help{
				Signature: "dbdt_box(corner: position [m], side1, side2, side3: vectors [m], dBdt: vector [T/s] or function of position) -> region",
				Summary:   "A box (parallelepiped) in which ∂B/∂t is given.",
				Example:   "dbdt_box([0, 0, 0] m, [10, 0, 0] mm, [0, 10, 0] mm, [0, 0, 10] mm, [0, 0, 50] T/s)",
				Reference: refRegions,
			},
		},
		{
			Name: "e_at", Params: []string{"source_or_region", "point", "t"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: efieldBuiltin,
			Help: &runtime.Help{
				Signature: "e_at(source or region, point: position [m][, t: s or f: Hz]) -> vector [V/m]",
				Summary:   "The induced electric field at a point: of a source with changing currents (E = −∂A/∂t, give t) or of a region where B changes. Of a source whose currents are peak phasors, give the frequency: the phasor −jωA, a complex vector.",
				Method:    "sources: closed-form A per ampere times dI/dt; regions: adaptive 3-D cubature of the volume integral to relative 1e-6, split at the point, with cells graded along the axis of long cylinders, and an error rather than a wrong number where it cannot meet the tolerance; solenoid regions integrate along the axis in closed form, the ideal solenoid is a closed form; a point inside a region costs many more integrand evaluations than one outside (the integrand is singular there; go test ./builtins/em -bench Induced times both)",
				Example:   "e_at(dbdt_solenoid([0, 0, 0] m, [0, 0, 1], 20 mm, 2 m, 100 T/s), [10, 0, 0] mm)",
				Reference: refRegions,
			},
		},
	}
}

func efieldBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "e_at"
	var f *Field
	switch v := args[0].(type) {
	case *Source:
		if v.hasPhasor() {
			return pointPhasor(env, fn, em.FieldA, v, args)
		}
		f = inducedField(v)
	case *Region:
		// the point directly, so that the cubature's error estimate
		// reaches the session
		r := readArgs(fn, args)
		x := r.point(1)
		r.time(2) // checked as for sources; a region's ∂B/∂t does not change
		if r.err != nil {
			return nil, r.err
		}
		tol := control(env, fn, regionTol)
		tol.Progress = nil
		var est float64
		tol.Est = &est
		e, err := em.RegionE(v.R, x, tol)
		if err != nil {
			return nil, fieldErr(fn, err)
		}
		if env != nil {
			b := withFieldRounding(est, r3.Norm(e)) // a bound on the vector's size bounds each component
			env.NumericalError(b, b, b)
		}
		return fromVec(e, dimEfield), nil
	default:
		return nil, errorf("%s: the first argument must be a source or a region, not %s", fn, runtime.TypeName(args[0]))
	}
	_, _, e, err := evalAtPoint(env, fn, f, args)
	if err != nil {
		return nil, err
	}
	return fromVec(e, f.dim), nil
}
