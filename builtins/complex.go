package builtins

import (
	"math"
	"math/cmplx"

	"loopwise/runtime"
)

const refComplex = "Go standard library math/cmplx (IEEE 754 double precision); phasor convention A·e^{jφ} ↔ A·cos(ωt + φ), peak amplitude (IEEE Std 100, 'phasor', from memory)"

// complexArg returns argument i as a complex quantity (a real one is read
// as complex with zero imaginary part).
func complexArg(fn string, args []runtime.Value, i int) (runtime.Complex, error) {
	z, ok := runtime.AsComplex(args[i])
	if !ok {
		return z, errorf("%s: the %s argument must be a number or quantity (real or complex), not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return z, nil
}

func complexFuncs() []*runtime.Func {
	part := func(name, summary, example string, f func(complex128) float64) *runtime.Func {
		return &runtime.Func{
			Name: name, Params: []string{"z"}, MinArgs: 1, MaxArgs: 1,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				if v, ok := args[0].(runtime.CVector); ok {
					return runtime.Vector{V: [3]float64{f(v.V[0]), f(v.V[1]), f(v.V[2])}, D: v.D}, nil
				}
				z, err := complexArg(name, args, 0)
				if err != nil {
					return nil, err
				}
				return runtime.Quantity{V: f(z.V), D: z.D}, nil
			},
			Help: &runtime.Help{
				Signature: name + "(z: complex, any unit) -> same unit (real); of a complex vector, a real vector",
				Summary:   summary, Example: example, Reference: refComplex,
			},
		}
	}
	return []*runtime.Func{
		part("re", "Real part of a complex quantity (of a real one, itself); of a field phasor, the field at ωt = 0.", "re((3 + 4j) ohm)", func(z complex128) float64 { return real(z) }),
		part("im", "Imaginary part of a complex quantity, as a real quantity of the same unit (0 for a real one); of a field phasor, minus the field at ωt = 90°.", "im((3 + 4j) ohm)", func(z complex128) float64 { return imag(z) }),
		{
			Name: "conj", Params: []string{"z"}, MinArgs: 1, MaxArgs: 1,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				if v, ok := args[0].(runtime.CVector); ok {
					return runtime.CVector{V: [3]complex128{cmplx.Conj(v.V[0]), cmplx.Conj(v.V[1]), cmplx.Conj(v.V[2])}, D: v.D}, nil
				}
				z, err := complexArg("conj", args, 0)
				if err != nil {
					return nil, err
				}
				return runtime.Complex{V: cmplx.Conj(z.V), D: z.D}, nil
			},
			Help: &runtime.Help{
				Signature: "conj(z: complex, any unit) -> complex, same unit",
				Summary:   "Complex conjugate: the sign of the imaginary part flipped. The average power of peak phasors V and I is re(V*conj(I))/2.",
				Example:   "conj((3 + 4j) ohm)", Reference: refComplex,
			},
		},
		{
			Name: "arg", Params: []string{"z"}, MinArgs: 1, MaxArgs: 1,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				z, err := complexArg("arg", args, 0)
				if err != nil {
					return nil, err
				}
				if z.V == 0 {
					return nil, errorf("arg: zero has no angle")
				}
				return runtime.Quantity{V: cmplx.Phase(z.V), D: dimAngle}, nil
			},
			Help: &runtime.Help{
				Signature: "arg(z: complex, any unit) -> rad, in (-pi, pi]",
				Summary:   "Angle (phase) of a complex quantity from the positive real axis; shown in degrees with \"as deg\". Zero has no angle and is refused.",
				Example:   "arg((1 + 1j) V) as deg", Reference: refComplex,
			},
		},
		{
			Name: "polar", Params: []string{"magnitude", "angle"}, MinArgs: 2, MaxArgs: 2,
			Call: func(args []runtime.Value) (runtime.Value, error) {
				m, err := quantity("polar", args, 0)
				if err != nil {
					return nil, err
				}
				a, err := angle("polar", args, 1)
				if err != nil {
					return nil, err
				}
				if q := args[1].(runtime.Quantity); q.D.IsZero() && q.V != 0 {
					return nil, errorf("polar: the angle needs its unit (30 deg, 0.5 rad): a plain number would be read as radians, which is a common slip with phases")
				}
				return runtime.Complex{V: cmplx.Rect(m.V, a), D: m.D}, nil
			},
			Help: &runtime.Help{
				Signature: "polar(magnitude: any unit, angle: deg or rad) -> complex, same unit",
				Summary:   "A complex quantity from its magnitude and angle: the phasor of magnitude·cos(ωt + angle). The angle must carry its unit. \"as polar\" (or \"as V polar\") shows any complex result in this form, which reads back as the same value.",
				Example:   "polar(10 V, 30 deg)\npolar(10 V, 30 deg) as polar", Reference: refComplex,
			},
		},
	}
}

// complexConstants are j, the imaginary unit of electrical engineering; a
// user may assign j (a loop index, say) and shadow it, while literals such
// as 4j keep their meaning.
func complexConstants() []runtime.Constant {
	return []runtime.Constant{
		{Name: "j", Value: runtime.Complex{V: complex(0, 1)}, Help: &runtime.Help{
			Signature: "j: dimensionless complex",
			Summary:   "The imaginary unit, j^2 = -1 (the electrical engineers' letter). A number with j glued to it is imaginary: 4j, 2.5j ohm, so 3 ohm + 4j ohm or (3 + 4j) ohm is an impedance. Assigning j shadows this name; 4j still means 4 times the imaginary unit.",
			Example:   "j*j\n(3 + 4j) ohm", Reference: refComplex,
		}, Shadowable: true},
	}
}

// complexAbs, complexSqrt and complexExp extend abs, sqrt and exp.
func complexAbs(z runtime.Complex) runtime.Value { return z.Abs() }

func complexSqrt(z runtime.Complex) (runtime.Value, error) {
	for _, e := range z.D {
		if e%2 != 0 {
			return nil, errorf("sqrt: %s has an odd power of a base unit, so its square root has no SI unit", z.D.Describe())
		}
	}
	return runtime.Complex{V: cmplx.Sqrt(z.V), D: halfDim(z.D)}, nil
}

func complexExp(z runtime.Complex) (runtime.Value, error) {
	if !z.D.IsZero() {
		return nil, errorf("exp: the argument must be a plain number, not %s", z.D.Describe())
	}
	r := cmplx.Exp(z.V)
	if cmplx.IsInf(r) || cmplx.IsNaN(r) || math.IsInf(real(r), 0) {
		return nil, errorf("exp: the result is infinite")
	}
	return runtime.Complex{V: r}, nil
}
