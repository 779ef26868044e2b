package ode_test

import (
	"math"
	"testing"

	"loopwise/builtins/ode"
)

// discharge is a capacitor bank C, charged to V0, discharged through R1
// into a coil L1 that is coupled (mutual inductance M = k√(L1 L2)) to a
// secondary L2 closed through R2 — the circuit of a ring launcher or an
// induction pulse. States: capacitor voltage v, primary current i1,
// secondary current i2, and w, the energy dissipated in R1 and R2 so far
// (w' = R1 i1² + R2 i2²). Kirchhoff's voltage law in each loop:
//
//	L1 i1' + M i2' = v − R1 i1,   M i1' + L2 i2' = −R2 i2,   C v' = −i1.
type discharge struct{ C, V0, R1, L1, L2, R2, k float64 }

func (d discharge) m() float64 { return d.k * math.Sqrt(d.L1*d.L2) }

func (d discharge) f(_ float64, y, dy []float64) error {
	v, i1, i2 := y[0], y[1], y[2]
	m := d.m()
	det := d.L1*d.L2 - m*m
	e1 := v - d.R1*i1 // right-hand sides of the two loop equations
	e2 := -d.R2 * i2
	dy[0] = -i1 / d.C
	dy[1] = (d.L2*e1 - m*e2) / det
	dy[2] = (d.L1*e2 - m*e1) / det
	dy[3] = d.R1*i1*i1 + d.R2*i2*i2
	return nil
}

// stored is the energy in the capacitor and the coupled coils,
// ½Cv² + ½L1 i1² + ½L2 i2² + M i1 i2 (J. W. Nilsson and S. A. Riedel,
// Electric Circuits, 10th ed., 2015, §6.5, energy of magnetically coupled
// coils; from memory).
func (d discharge) stored(y []float64) float64 {
	return 0.5*d.C*y[0]*y[0] + 0.5*d.L1*y[1]*y[1] + 0.5*d.L2*y[2]*y[2] + d.m()*y[1]*y[2]
}

// The stored energy plus the energy dissipated so far equals the initial
// ½CV0² at every time: the circuit has no other sink or source. Checked
// at 2000 points of dense output, for a plain series RLC (k = 0) and for
// a coupled secondary whose time constant L2/R2 is far shorter than the
// primary's ring-down (a stiff pair).
//
// Tolerance: each state carries an error of at most e_x = denseFactor ·
// estBound (see linear_test.go) for its largest magnitude, and the energy
// is a quadratic form in them, so its error is at most
// C|v|e_v + (L1|i1| + M|i2|)e_i1 + (L2|i2| + M|i1|)e_i2 + e_w to first order,
// with the magnitudes at their largest over the run.
func TestDischargeEnergyBalance(t *testing.T) {
	for _, tc := range []struct {
		name string
		d    discharge
		t1   float64
	}{
		// 100 V on 100 µF into 10 mH and 2 Ω, underdamped, no secondary.
		{"series RLC", discharge{C: 100e-6, V0: 100, R1: 2, L1: 10e-3, L2: 1e-6, R2: 1, k: 0}, 40e-3},
		// 400 V on 1 mF into 50 µH and 20 mΩ, coupled (k = 0.6) to a
		// 0.2 µH ring of 2 mΩ: τ2 = 0.1 ms against a primary period of
		// about 1.4 ms.
		{"coupled ring", discharge{C: 1e-3, V0: 400, R1: 20e-3, L1: 50e-6, L2: 0.2e-6, R2: 2e-3, k: 0.6}, 10e-3},
	} {
		d := tc.d
		y0 := []float64{d.V0, 0, 0, 0}
		opt := ode.Options{}
		sol, err := ode.Solve(d.f, 0, tc.t1, y0, opt)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		e0 := 0.5 * d.C * d.V0 * d.V0
		y := make([]float64, 4)
		var ymax [4]float64
		var worst float64
		const m = 2000
		for k := 0; k <= m; k++ {
			sol.At(tc.t1*float64(k)/m, y)
			for i := range y {
				ymax[i] = math.Max(ymax[i], math.Abs(y[i]))
			}
			worst = math.Max(worst, math.Abs(d.stored(y)+y[3]-e0))
		}
		e := func(i int) float64 { return denseFactor * estBound(ode.DefaultRelTol, ode.DefaultAbsTol, ymax[i]) }
		mm := d.m()
		bound := d.C*ymax[0]*e(0) + (d.L1*ymax[1]+mm*ymax[2])*e(1) + (d.L2*ymax[2]+mm*ymax[1])*e(2) + e(3)
		if worst > bound {
			t.Errorf("%s: energy balance off by %.3g J of %.4g J, more than %.3g J", tc.name, worst, e0, bound)
		} else {
			t.Logf("%s: energy balance off by at most %.3g J of %.4g J (bound %.3g J); peaks %.4g V, %.4g A, %.4g A; %+v",
				tc.name, worst, e0, bound, ymax[0], ymax[1], ymax[2], sol.Stats())
		}
	}
}

// BenchmarkCircuit integrates the coupled ring discharge above over 10 ms
// at the default tolerances, with the Jacobian by finite differences.
func BenchmarkCircuit(b *testing.B) {
	d := discharge{C: 1e-3, V0: 400, R1: 20e-3, L1: 50e-6, L2: 0.2e-6, R2: 2e-3, k: 0.6}
	y0 := []float64{d.V0, 0, 0, 0}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ode.Solve(d.f, 0, 10e-3, y0, ode.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
