package builtins

import (
	"math"
	"math/cmplx"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

// Phasor results. A source whose currents are complex (peak phasors,
// polar(2 A, 30 deg)) stands for currents Iₖ·cos(ωt + φₖ) at one
// frequency; fields and fluxes are linear in the currents, so the flux
// phasor is Σ Φₖ·Iₖ with Φₖ the flux per ampere of term k, and the EMF
// phasor is −jω times it (Faraday's law for e^{jωt} time dependence).

// hasPhasor reports whether some current of s is a phasor.
func (s *Source) hasPhasor() bool {
	for _, t := range s.terms {
		if _, ok := t.current.(runtime.Complex); ok {
			return true
		}
	}
	return false
}

// phasorOf reads a term's current as a peak phasor: a complex current as
// it is, a constant real one with phase 0.
func phasorOf(fn string, cur runtime.Value) (complex128, error) {
	switch c := cur.(type) {
	case runtime.Complex:
		return c.V, nil
	case runtime.Quantity:
		return complex(c.V, 0), nil
	case *runtime.Func:
		return 0, errorf("%s: the current %s is a function of time, which has no single phasor; for a phasor result give each current as a peak phasor, such as polar(2 A, 30 deg), or for the instantaneous value give a time (s) instead of a frequency", fn, c.Signature())
	}
	return 0, errorf("%s: a current must be in A", fn)
}

// angularFrequency reads argument i as a frequency: a cycle frequency
// (Hz, s^-1) gives ω = 2πf; an angular velocity in rad/s is ω itself.
// ok is false (and err nil) when the argument is not a frequency.
func angularFrequency(fn string, args []runtime.Value, i int) (omega float64, ok bool, err error) {
	if len(args) <= i {
		return 0, false, nil
	}
	q, isQ := args[i].(runtime.Quantity)
	if !isQ {
		return 0, false, nil
	}
	switch q.D {
	case dimHertz:
		omega = 2 * math.Pi * q.V
	case dimAngle.Div(dimTime):
		omega = q.V
	default:
		return 0, false, nil
	}
	if !(omega > 0) {
		return 0, true, errorf("%s: the frequency must be above zero, not %s", fn, runtime.Format(q, 6))
	}
	return omega, true, nil
}

// fluxPhasor is Σ Φₖ·Iₖ over the terms of a phasor source, through a
// closed path or a surface.
//
// It also returns a bound on the phasor's numerical error (its modulus,
// so on each part): each term's quadrature estimate and rounding times
// the term's |I|.
func fluxPhasor(env runtime.Env, fn string, src *Source, target runtime.Value) (complex128, float64, error) {
	if len(src.uniform) > 0 {
		return 0, 0, errorf("%s: a uniform field is static, so it has no part in a phasor at a frequency; leave it out of this source", fn)
	}
	var sum complex128
	var bound float64
	for _, term := range src.terms {
		i, err := phasorOf(fn, term.current)
		if err != nil {
			return 0, 0, err
		}
		if i == 0 {
			continue
		}
		var est float64
		phi1, err := fluxOfEst(env, fn, []em.Source{term.em(1)}, em.Vec{}, target, &est)
		if err != nil {
			return 0, 0, err
		}
		sum += complex(phi1, 0) * i
		bound += withFieldRounding(est, phi1) * cmplx.Abs(i)
	}
	return sum, bound, nil
}

// fieldPhasor is Σ Fₖ·Iₖ at one point over the terms of a phasor source,
// Fₖ the field (B or A) per ampere of term k.
func fieldPhasor(env runtime.Env, fn string, which em.Which, src *Source, x em.Vec) ([3]complex128, error) {
	var sum [3]complex128
	if len(src.uniform) > 0 {
		return sum, errorf("%s: a uniform field is static, so it has no part in a phasor at a frequency; leave it out of this source", fn)
	}
	unit := runtime.Quantity{V: 1, D: dimCurrent}
	for _, term := range src.terms {
		i, err := phasorOf(fn, term.current)
		if err != nil {
			return sum, err
		}
		if i == 0 {
			continue
		}
		one1 := term
		one1.current = unit
		one := &Source{terms: []sourceTerm{one1}}
		out, err := fieldsOf(env, fn, which, one, []em.Vec{x}, 0, false)
		if err != nil {
			return sum, err
		}
		f := out[0]
		sum[0] += complex(f.X, 0) * i
		sum[1] += complex(f.Y, 0) * i
		sum[2] += complex(f.Z, 0) * i
	}
	return sum, nil
}

// pointPhasor is b_at or a_at of a phasor source (no time), and e_at of
// one at a frequency: E = −jωA.
func pointPhasor(env runtime.Env, fn string, which em.Which, src *Source, args []runtime.Value) (runtime.Value, error) {
	r := readArgs(fn, args)
	x := r.point(1)
	if r.err != nil {
		return nil, r.err
	}
	d := dimTesla
	if which == em.FieldA {
		d = dimVpot
	}
	var omega float64
	if fn == "e_at" {
		w, ok, err := angularFrequency(fn, args, 2)
		if err != nil {
			return nil, err
		}
		if !ok {
			return nil, errorf("%s: the source's currents are phasors; give the frequency (Hz or rad/s) as the last argument for the phasor of E = −jωA", fn)
		}
		omega, which, d = w, em.FieldA, dimEfield
	} else if len(args) > 2 {
		return nil, errorf("%s: the source's currents are phasors, so the field is a phasor too and takes no time; leave the time out", fn)
	}
	v, err := fieldPhasor(env, fn, which, src, x)
	if err != nil {
		return nil, err
	}
	if fn == "e_at" {
		for k := range v {
			v[k] *= complex(0, -omega)
		}
	}
	return runtime.CVector{V: v, D: d}, nil
}
