package builtins_test

import (
	"math"
	"math/cmplx"
	"strconv"
	"testing"

	"loopwise/builtins"
	"loopwise/runtime"
)

// TestEMFPhasor: the EMF phasor of two coaxial circles at a frequency is
// −jωM·I (Faraday's law for e^{jωt} time dependence) with M from Maxwell's
// formula for coaxial circles (J. C. Maxwell, A Treatise on Electricity
// and Magnetism, 1873, Art. 701; in Loopwise maxwell_mutual, which uses
// elliptic integrals and shares no code with the flux integral ∮A·dl that
// emf uses). Tolerance 1e-9: the flux integral is asked for 1e-10 and
// Maxwell's formula is good to rounding.
func TestEMFPhasor(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for _, line := range []string{
		"c1 = circle([0, 0, 0] m, [0, 0, 1], 25 mm)",
		"c2 = circle([0, 0, 10] mm, [0, 0, 1], 20 mm)",
		"I1 = polar(2 A, 30 deg)",
	} {
		eval(t, s, line)
	}
	M := eval(t, s, "maxwell_mutual(25 mm, 20 mm, 10 mm)").(runtime.Quantity).V
	I := cmplx.Rect(2, math.Pi/6)
	for _, f := range []float64{50, 13.56e6} {
		got := eval(t, s, "emf(source(c1, I1), c2, "+runtime.FormatNumber(f, 12)+" Hz)")
		z, ok := got.(runtime.Complex)
		if !ok || z.D != mustUnitDim(t, "V") {
			t.Fatalf("emf phasor is %s, want a complex voltage", runtime.TypeName(got))
		}
		want := complex(0, -2*math.Pi*f*M) * I
		if cmplx.Abs(z.V-want) > 1e-9*cmplx.Abs(want) {
			t.Errorf("f = %g Hz: emf phasor %v, want −jωM·I = %v", f, z.V, want)
		}
	}
	// The same EMF as an angular frequency in rad/s.
	w := eval(t, s, "emf(source(c1, I1), c2, 314.159 rad/s)").(runtime.Complex)
	if want := complex(0, -314.159*M) * I; cmplx.Abs(w.V-want) > 1e-9*cmplx.Abs(want) {
		t.Errorf("ω = 314.159 rad/s: emf phasor %v, want %v", w.V, want)
	}
	// The flux phasor is M·I.
	phi := eval(t, s, "flux(source(c1, I1), c2)").(runtime.Complex)
	if want := complex(M, 0) * I; cmplx.Abs(phi.V-want) > 1e-9*cmplx.Abs(want) {
		t.Errorf("flux phasor %v, want M·I = %v", phi.V, want)
	}
}

// TestEMFPhasorMatchesTime: the phasor E stands for e(t) = Re(E·e^{jωt});
// at several instants it agrees with the instantaneous EMF of the same
// current written as a function of time, whose derivative Loopwise takes
// by finite differences (a different route to d/dt; both share the flux
// per ampere). Tolerance 1e-6 of the amplitude: the step-based derivative
// is good to about 1e-7 of the rate (its help).
func TestEMFPhasorMatchesTime(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for _, line := range []string{
		"c1 = circle([0, 0, 0] m, [0, 0, 1], 25 mm)",
		"c2 = circle([3, 0, 8] mm, [0, 0.6, 0.8], 20 mm)",
		"I(t) = 2 A * cos(2*pi*50 Hz*t + pi/6)",
	} {
		eval(t, s, line)
	}
	E := eval(t, s, "emf(source(c1, polar(2 A, 30 deg)), c2, 50 Hz)").(runtime.Complex).V
	for _, ms := range []string{"0", "1.3", "5", "12.7"} {
		tt, _ := strconv.ParseFloat(ms, 64)
		e := eval(t, s, "emf(source(c1, I), c2, "+ms+" ms)").(runtime.Quantity).V
		want := real(E * cmplx.Exp(complex(0, 2*math.Pi*50*tt*1e-3)))
		if math.Abs(e-want) > 1e-6*cmplx.Abs(E) {
			t.Errorf("t = %s ms: emf %g V, phasor gives %g V", ms, e, want)
		}
	}
}

func mustUnitDim(t *testing.T, unit string) runtime.Dim {
	t.Helper()
	u, err := runtime.ParseUnit(unit)
	if err != nil {
		t.Fatal(err)
	}
	return u.Dim
}

// TestFieldPhasors: B at the centre of a circular loop is μ0·I/(2R) along
// its axis (D. J. Griffiths, Introduction to Electrodynamics, 4th ed. 2017,
// Ex. 5.6 at z = 0), so for a peak phasor current I the B phasor is
// μ0·I/(2R)·ẑ; tolerance 1e-13 (closed-form kernel, a few roundings). The
// E phasor −jωA is compared with the instantaneous E of the same current
// as a function of time, Re(E·e^{jωt}), at several instants (a different
// route to d/dt; tolerance 1e-6 of |E|, the finite-difference derivative's
// accuracy from its help).
func TestFieldPhasors(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "c1 = circle([0, 0, 0] m, [0, 0, 1], 25 mm)")
	eval(t, s, "src = source(c1, polar(2 A, 30 deg))")
	b, ok := eval(t, s, "b_at(src, [0, 0, 0] m)").(runtime.CVector)
	if !ok || b.D != mustUnitDim(t, "T") {
		t.Fatalf("b_at of a phasor source is not a complex vector in T")
	}
	want := complex(builtins.VacuumPermeability*1/(2*0.025), 0) * cmplx.Rect(2, math.Pi/6)
	if cmplx.Abs(b.V[2]-want) > 1e-13*cmplx.Abs(want) || b.V[0] != 0 && cmplx.Abs(b.V[0]) > 1e-13*cmplx.Abs(want) {
		t.Errorf("B phasor at the centre %v, want [0, 0, %v]", b.V, want)
	}
	eval(t, s, "I(t) = 2 A * cos(2*pi*50 Hz*t + pi/6)")
	eval(t, s, "srcT = source(c1, I)")
	E := eval(t, s, "e_at(src, [12, 5, 3] mm, 50 Hz)").(runtime.CVector)
	for _, ms := range []float64{0, 2.1, 7.7} {
		e := eval(t, s, "e_at(srcT, [12, 5, 3] mm, "+strconv.FormatFloat(ms, 'g', -1, 64)+" ms)").(runtime.Vector)
		ph := cmplx.Exp(complex(0, 2*math.Pi*50*ms*1e-3))
		for k := range 3 {
			if w := real(E.V[k] * ph); math.Abs(e.V[k]-w) > 1e-6*E.Norm().V {
				t.Errorf("t = %g ms, component %d: e_at %g V/m, phasor gives %g V/m", ms, k, e.V[k], w)
			}
		}
	}
}
