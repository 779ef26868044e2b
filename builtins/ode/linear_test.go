package ode_test

import (
	"math"
	"testing"

	"loopwise/builtins/ode"
)

// estBound is the size of error the step-size control holds each step's
// error estimate below, for a component whose magnitude reaches ymax: the
// package maps RelTol r to r' = 0.1·r^(2/3) and AbsTol a to r'·a/r (package
// doc). The collocation polynomial's error inside a step is of the same
// order (h⁴) as that estimate, and the order-5 errors at the step ends
// are far smaller, so the error anywhere should be a small multiple of
// this bound; the tests allow denseFactor times it. denseFactor = 3
// covers the RMS norm over n ≤ 4 components (the largest component can be
// √n = 2 times the RMS) with 50 % for the estimate being asymptotic.
func estBound(rtol, atol, ymax float64) float64 {
	r := 0.1 * math.Pow(rtol, 2.0/3.0)
	return r*atol/rtol + r*ymax
}

const denseFactor = 3

// sample compares sol with the closed form want (one function per
// component) at m+1 evenly spaced points of [t0, t1] and returns the
// largest error of each component.
func sample(t *testing.T, sol *ode.Solution, t0, t1 float64, m int, want []func(float64) float64) []float64 {
	t.Helper()
	y := make([]float64, len(want))
	worst := make([]float64, len(want))
	for k := 0; k <= m; k++ {
		tt := t0 + (t1-t0)*float64(k)/float64(m)
		sol.At(tt, y)
		for i, w := range want {
			worst[i] = math.Max(worst[i], math.Abs(y[i]-w(tt)))
		}
	}
	return worst
}

func checkErrors(t *testing.T, name string, worst, ymax []float64, rtol, atol float64) {
	t.Helper()
	for i := range worst {
		b := denseFactor * estBound(rtol, atol, ymax[i])
		if worst[i] > b {
			t.Errorf("%s: component %d: largest error %.3g exceeds %.3g", name, i, worst[i], b)
		} else {
			t.Logf("%s: component %d: largest error %.3g (bound %.3g)", name, i, worst[i], b)
		}
	}
}

// Exponential decay y' = −k y, y = y0 e^(−kt): the linear first-order
// equation (W. E. Boyce and R. C. DiPrima, Elementary Differential
// Equations and Boundary Value Problems, 10th ed., 2012, §2.1; from
// memory), forwards and backwards in time.
func TestExponentialDecay(t *testing.T) {
	const k, y0 = 3.0, 2.0
	f := func(_ float64, y, dy []float64) error { dy[0] = -k * y[0]; return nil }
	exact := func(tt float64) float64 { return y0 * math.Exp(-k*tt) }
	sol, err := ode.Solve(f, 0, 5, []float64{y0}, ode.Options{})
	if err != nil {
		t.Fatal(err)
	}
	worst := sample(t, sol, 0, 5, 500, []func(float64) float64{exact})
	checkErrors(t, "forwards", worst, []float64{y0}, ode.DefaultRelTol, ode.DefaultAbsTol)

	// Backwards from t = 2, where y = y0 e^(−6), to t = 0.
	back, err := ode.Solve(f, 2, 0, []float64{exact(2)}, ode.Options{})
	if err != nil {
		t.Fatal(err)
	}
	ts := back.Times()
	if ts[0] != 2 || ts[len(ts)-1] != 0 {
		t.Errorf("backwards: Times runs from %g to %g, want 2 to 0", ts[0], ts[len(ts)-1])
	}
	for i := 1; i < len(ts); i++ {
		if !(ts[i] < ts[i-1]) {
			t.Fatalf("backwards: Times not decreasing at %d: %g then %g", i, ts[i-1], ts[i])
		}
	}
	worst = sample(t, back, 2, 0, 500, []func(float64) float64{exact})
	checkErrors(t, "backwards", worst, []float64{y0}, ode.DefaultRelTol, ode.DefaultAbsTol)
}

// Harmonic oscillator d²x/dt² = −ω² x at 50 Hz over three periods, x = cos ωt,
// x' = −ω sin ωt (any mechanics or circuits text; e.g. J. W. Nilsson and
// S. A. Riedel, Electric Circuits, 10th ed., 2015, §8.3 with R = 0).
func TestHarmonicOscillator(t *testing.T) {
	w := 2 * math.Pi * 50
	f := func(_ float64, y, dy []float64) error { dy[0] = y[1]; dy[1] = -w * w * y[0]; return nil }
	t1 := 3 / 50.0
	opt := ode.Options{RelTol: 1e-7, AbsTol: 1e-7}
	sol, err := ode.Solve(f, 0, t1, []float64{1, 0}, opt)
	if err != nil {
		t.Fatal(err)
	}
	worst := sample(t, sol, 0, t1, 1000, []func(float64) float64{
		func(tt float64) float64 { return math.Cos(w * tt) },
		func(tt float64) float64 { return -w * math.Sin(w*tt) },
	})
	checkErrors(t, "oscillator", worst, []float64{1, w}, opt.RelTol, opt.AbsTol)
}

// RL circuit switched onto a DC source: L di/dt = V − R i from i = 0,
// i = V/R (1 − e^(−Rt/L)) (Nilsson and Riedel, Electric Circuits, 10th
// ed., 2015, §7.3, step response of an RL circuit; from memory).
func TestRLStep(t *testing.T) {
	const V, R, L = 12.0, 4.0, 20e-3 // 12 V, 4 Ω, 20 mH: τ = 5 ms
	f := func(_ float64, y, dy []float64) error { dy[0] = (V - R*y[0]) / L; return nil }
	sol, err := ode.Solve(f, 0, 30e-3, []float64{0}, ode.Options{})
	if err != nil {
		t.Fatal(err)
	}
	worst := sample(t, sol, 0, 30e-3, 600, []func(float64) float64{
		func(tt float64) float64 { return V / R * (1 - math.Exp(-R*tt/L)) },
	})
	checkErrors(t, "RL step", worst, []float64{V / R}, ode.DefaultRelTol, ode.DefaultAbsTol)
}

// seriesRLC is the natural response of a series RLC circuit whose
// capacitor starts at V0 with no current: states v (capacitor voltage)
// and i (current into the capacitor's positive plate), C dv/dt = i,
// L di/dt = −v − R i.
type seriesRLC struct{ R, L, C, V0 float64 }

func (c seriesRLC) f(_ float64, y, dy []float64) error {
	dy[0] = y[1] / c.C
	dy[1] = (-y[0] - c.R*y[1]) / c.L
	return nil
}

// exact returns v(t) and i(t) = C dv/dt for the three cases of
// Nilsson and Riedel, Electric Circuits, 10th ed., 2015, §8.3 (natural
// response of a series RLC circuit; from memory): with α = R/2L and
// ω0 = 1/√(LC), overdamped v = A1 e^(s1 t) + A2 e^(s2 t), critically damped
// v = (D1 t + D2) e^(−αt), underdamped v = e^(−αt)(B1 cos ωd t + B2 sin ωd t),
// the constants fixed by v(0) = V0, dv/dt(0) = i(0)/C = 0.
func (c seriesRLC) exact() (v, i func(float64) float64, kind string) {
	a := c.R / (2 * c.L)
	w0 := 1 / math.Sqrt(c.L*c.C)
	switch {
	case a > w0*(1+1e-12):
		r := math.Sqrt(a*a - w0*w0)
		s1, s2 := -a+r, -a-r
		a1 := -s2 * c.V0 / (s1 - s2)
		a2 := s1 * c.V0 / (s1 - s2)
		v = func(t float64) float64 { return a1*math.Exp(s1*t) + a2*math.Exp(s2*t) }
		i = func(t float64) float64 { return c.C * (a1*s1*math.Exp(s1*t) + a2*s2*math.Exp(s2*t)) }
		return v, i, "overdamped"
	case a < w0*(1-1e-12):
		wd := math.Sqrt(w0*w0 - a*a)
		b1, b2 := c.V0, a*c.V0/wd
		v = func(t float64) float64 { return math.Exp(-a*t) * (b1*math.Cos(wd*t) + b2*math.Sin(wd*t)) }
		i = func(t float64) float64 {
			e := math.Exp(-a * t)
			return c.C * e * ((-a*b1+wd*b2)*math.Cos(wd*t) + (-a*b2-wd*b1)*math.Sin(wd*t))
		}
		return v, i, "underdamped"
	default:
		d2, d1 := c.V0, a*c.V0
		v = func(t float64) float64 { return (d1*t + d2) * math.Exp(-a*t) }
		i = func(t float64) float64 { return c.C * math.Exp(-a*t) * (d1 - a*(d1*t+d2)) }
		return v, i, "critically damped"
	}
}

// Series RLC discharges, 100 V on 100 µF into 10 mH (ω0 = 1000 rad/s,
// critical resistance 2√(L/C) = 20 Ω), under-, critically and
// overdamped, against the closed forms at 1000 points of dense output.
func TestSeriesRLC(t *testing.T) {
	for _, R := range []float64{2, 20, 100} {
		c := seriesRLC{R: R, L: 10e-3, C: 100e-6, V0: 100}
		v, i, kind := c.exact()
		t1 := 20e-3
		sol, err := ode.Solve(c.f, 0, t1, []float64{c.V0, 0}, ode.Options{})
		if err != nil {
			t.Fatal(err)
		}
		worst := sample(t, sol, 0, t1, 1000, []func(float64) float64{v, i})
		// |i| ≤ V0/√(L/C) = 10 A in every case (energy: ½Li² ≤ ½CV0²).
		checkErrors(t, kind, worst, []float64{c.V0, c.V0 / math.Sqrt(c.L/c.C)}, ode.DefaultRelTol, ode.DefaultAbsTol)
		t.Logf("%s: %+v", kind, sol.Stats())
	}
}

// The error at the step ends should fall with the tolerance as the order
// predicts: the order-3 estimate held at r' = 0.1·r^(2/3) gives steps
// h ∝ r'^(1/4), and an order-5 method a global error ∝ h⁵ ∝ r^(5/6). The
// dense output between step ends has error O(h⁴) ∝ r^(2/3). Checked on
// the underdamped RLC over 20 ms by a least-squares slope of log error
// against log tolerance over RelTol = 1e-4 … 1e-10. The allowed band,
// ±0.15 around each prediction, is for the controller's safety factors
// and the whole numbers of steps, which make the relation asymptotic.
func TestErrorScalesWithTolerance(t *testing.T) {
	c := seriesRLC{R: 2, L: 10e-3, C: 100e-6, V0: 100}
	v, _, _ := c.exact()
	var lx, lend, ldense []float64
	for _, rtol := range []float64{1e-4, 1e-5, 1e-6, 1e-7, 1e-8, 1e-9, 1e-10} {
		sol, err := ode.Solve(c.f, 0, 20e-3, []float64{c.V0, 0}, ode.Options{RelTol: rtol, AbsTol: rtol})
		if err != nil {
			t.Fatal(err)
		}
		y := make([]float64, 2)
		var eEnd float64
		for _, tt := range sol.Times() {
			sol.At(tt, y)
			eEnd = math.Max(eEnd, math.Abs(y[0]-v(tt)))
		}
		eDense := sample(t, sol, 0, 20e-3, 2000, []func(float64) float64{v, func(float64) float64 { return 0 }})[0]
		t.Logf("RelTol %g: step-end error %.3g V, dense error %.3g V, %d steps", rtol, eEnd, eDense, sol.Stats().Steps)
		lx = append(lx, math.Log(rtol))
		lend = append(lend, math.Log(eEnd))
		ldense = append(ldense, math.Log(eDense))
	}
	slope := func(x, y []float64) float64 {
		var mx, my float64
		for i := range x {
			mx += x[i]
			my += y[i]
		}
		mx /= float64(len(x))
		my /= float64(len(x))
		var sxy, sxx float64
		for i := range x {
			sxy += (x[i] - mx) * (y[i] - my)
			sxx += (x[i] - mx) * (x[i] - mx)
		}
		return sxy / sxx
	}
	if s := slope(lx, lend); math.Abs(s-5.0/6) > 0.15 {
		t.Errorf("step-end error ∝ RelTol^%.3f, want about 5/6", s)
	} else {
		t.Logf("step-end error ∝ RelTol^%.3f (predicted 5/6)", s)
	}
	if s := slope(lx, ldense); math.Abs(s-2.0/3) > 0.15 {
		t.Errorf("dense-output error ∝ RelTol^%.3f, want about 2/3", s)
	} else {
		t.Logf("dense-output error ∝ RelTol^%.3f (predicted 2/3)", s)
	}
}
