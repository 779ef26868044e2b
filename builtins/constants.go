package builtins

import (
	"math"
	"math/cmplx"

	"loopwise/runtime"
)

// Physical constants. Exact values are exact by the definition of the SI
// (SI Brochure, 9th ed., 2019, Table 1); mu0 and eps0 are the CODATA 2018
// recommended values (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021).
const (
	SpeedOfLight       = 299792458        // m/s, exact
	ElementaryCharge   = 1.602176634e-19  // C, exact
	VacuumPermeability = 1.25663706212e-6 // N/A^2, CODATA 2018, u_r = 1.5e-10
	VacuumPermittivity = 8.8541878128e-12 // F/m, CODATA 2018, u_r = 1.5e-10
)

func mustDim(unit string) runtime.Dim {
	u, err := runtime.ParseUnit(unit)
	if err != nil {
		panic(err)
	}
	return u.Dim
}

func constants() []runtime.Constant {
	return []runtime.Constant{
		{Name: "pi", Value: runtime.Num(math.Pi), Help: &runtime.Help{
			Signature: "pi: dimensionless", Summary: "The ratio of a circle's circumference to its diameter.",
			Example: "2*pi*50 Hz", Reference: "math.Pi (Go standard library)"}},
		{Name: "mu0", Value: runtime.Quantity{V: VacuumPermeability, D: mustDim("N/A^2")}, Help: &runtime.Help{
			Signature: "mu0: H/m", Summary: "Magnetic constant (vacuum permeability), 1.25663706212e-6 N/A^2.",
			Example: "mu0 * 1000 * 2 A / 0.1 m", Reference: "CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021)"}},
		{Name: "eps0", Value: runtime.Quantity{V: VacuumPermittivity, D: mustDim("F/m")}, Help: &runtime.Help{
			Signature: "eps0: F/m", Summary: "Electric constant (vacuum permittivity), 8.8541878128e-12 F/m.",
			Example: "1/sqrt(mu0*eps0)", Reference: "CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021)"}},
		{Name: "c", Value: runtime.Quantity{V: SpeedOfLight, D: mustDim("m/s")}, Help: &runtime.Help{
			Signature: "c: m/s", Summary: "Speed of light in vacuum, 299792458 m/s exactly.",
			Example: "c / 13.56 MHz", Reference: "SI Brochure, 9th ed. (BIPM 2019), Table 1"}},
		{Name: "e", Value: runtime.Quantity{V: ElementaryCharge, D: mustDim("C")}, Help: &runtime.Help{
			Signature: "e: C", Summary: "Elementary charge, 1.602176634e-19 C exactly.",
			Example: "1 V * e as J", Reference: "SI Brochure, 9th ed. (BIPM 2019), Table 1"}},
	}
}

// guardFinite makes a builtin refuse to return an infinite or NaN number:
// extreme sizes overflow double precision, and the user should hear so
// rather than see "+Inf".
func guardFinite(f *runtime.Func) {
	check := func(v runtime.Value, err error) (runtime.Value, error) {
		if err != nil {
			return v, err
		}
		ok := true
		switch x := v.(type) {
		case runtime.Quantity:
			ok = !math.IsNaN(x.V) && !math.IsInf(x.V, 0)
		case runtime.Vector:
			for _, c := range x.V {
				ok = ok && !math.IsNaN(c) && !math.IsInf(c, 0)
			}
		case runtime.Complex:
			ok = !cmplx.IsNaN(x.V) && !cmplx.IsInf(x.V)
		case runtime.CVector:
			for _, c := range x.V {
				ok = ok && !cmplx.IsNaN(c) && !cmplx.IsInf(c)
			}
		}
		if !ok {
			return nil, errorf("%s: the result is not a finite number; the sizes or values are beyond what double precision can hold", f.Name)
		}
		return v, nil
	}
	if call := f.Call; call != nil {
		f.Call = func(args []runtime.Value) (runtime.Value, error) { return check(call(args)) }
	}
	if call := f.CallEnv; call != nil {
		f.CallEnv = func(env runtime.Env, args []runtime.Value) (runtime.Value, error) { return check(call(env, args)) }
	}
}

// Standard returns the library every session starts with.
func Standard() runtime.Library {
	var fs []*runtime.Func
	for _, fam := range []struct {
		name  string
		funcs []*runtime.Func
	}{
		{"math", mathFuncs()},
		{"complex numbers", complexFuncs()},
		{"circuits", append(append(circuitFuncs(), linkFuncs()...), launchFuncs()...)},
		{"vectors", vectorFuncs()},
		{"geometry", append(geometryFuncs(), pathCSVFuncs()...)},
		{"fields", sourceFuncs()},
		{"flux and EMF", fluxFuncs()},
		{"inductance and force", inductanceFuncs()},
		{"windings", windingFuncs()},
		{"printed coils", spiralFuncs()},
		{"field calculus", calculusFuncs()},
		{"solving", append(solveFuncs(), extremumFuncs()...)},
		{"induced E", regionFuncs()},
		{"magnets and ideal sources", magnetFuncs()},
		{"magnetic circuits", coreFuncs()},
		{"safety", cautionFuncs()},
		{"formulas", formulaFuncs()},
		{"wire losses", wireLossFuncs()},
		{"tables", append(tableFuncs(), exportFuncs()...)},
		{"plots", plotFuncs()},
	} {
		for _, f := range fam.funcs {
			f.Help.Family = fam.name
			guardFinite(f)
		}
		fs = append(fs, fam.funcs...)
	}
	return runtime.Library{Funcs: fs, Consts: append(constants(), complexConstants()...), Caution: Caution}
}
