package builtins_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func tableCols(t *testing.T, v runtime.Value) (map[string]int, [][]float64) {
	t.Helper()
	tab, ok := v.(runtime.Tabular)
	if !ok {
		t.Fatalf("not a table: %s", runtime.TypeName(v))
	}
	cols, _, rows := tab.Tabulate()
	m := map[string]int{}
	for j, c := range cols {
		m[c] = j
	}
	return m, rows
}

// TestTransientClosedForms: an RL circuit switched onto a DC source,
// i(t) = V/R·(1 − e^{−Rt/L}), and a charged capacitor discharging through
// a series R and L, i(t) = V0/(ωd·L)·e^{−αt}·sin(ωd·t) (underdamped),
// V0·t·e^{−αt}/L (critically damped) and V0/(L(s1 − s2))·(e^{s1 t} − e^{s2 t})
// (overdamped), α = R/2L, ω0² = 1/LC, ωd² = ω0² − α², s1,2 = −α ± √(α² − ω0²)
// (J. W. Nilsson and S. A. Riedel, Electric Circuits, 10th ed. 2015, §7.3
// and §8.3, from memory; any circuits text). Tolerance 1e-7 of the peak
// current: the integrator runs at relative 1e-8.
func TestTransientClosedForms(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	// the table's numerical error bound must cover the actual error in
	// every row (a case of the same rule as TestNumericalErrorBounds)
	var numErr []float64
	check := func(what string, rows [][]float64, col int, sign float64, want func(t float64) float64) {
		t.Helper()
		if numErr == nil {
			t.Fatalf("%s: the table carries no numerical error", what)
		}
		for _, r := range rows {
			if d := math.Abs(sign*r[col] - want(r[0])); d > numErr[col] {
				t.Errorf("%s at t = %g s: error %.3g exceeds the table's numerical error bound %.3g", what, r[0], d, numErr[col])
				break
			}
		}
		peak := 0.0
		for _, r := range rows {
			peak = math.Max(peak, math.Abs(want(r[0])))
		}
		worst := 0.0
		defer func() { t.Logf("%s: worst error %.2g of the peak", what, worst) }()
		for _, r := range rows {
			worst = math.Max(worst, math.Abs(sign*r[col]-want(r[0]))/peak)
			if d := math.Abs(sign*r[col] - want(r[0])); d > 1e-7*peak {
				t.Errorf("%s at t = %g s: %g A, closed form %g A", what, r[0], sign*r[col], want(r[0]))
				return
			}
		}
	}
	// RL step: 12 V onto 3 ohm and 6 mH (τ = 2 ms), over 5τ
	v := eval(t, s, `transient(circuit(voltage_source("V1", "a", "0", 12 V), resistor("R1", "a", "b", 3 ohm), inductor("L1", "b", "0", 6 mH)), 10 ms, 101)`)
	numErr = v.(*builtins.Table).NumErr
	cols, rows := tableCols(t, v)
	check("RL step", rows, cols["I L1"], 1, func(t float64) float64 { return 4 * (1 - math.Exp(-t/2e-3)) })

	// series RLC discharge, C = 100 uF charged to 50 V, L = 200 uH
	L, C, V0 := 200e-6, 100e-6, 50.0
	w0 := 1 / math.Sqrt(L*C)
	for _, c := range []struct {
		name string
		R    string
		r    float64
	}{{"underdamped", "0.5 ohm", 0.5}, {"critically damped", "2.82842712474619 ohm", 2 * math.Sqrt(L/C)}, {"overdamped", "6 ohm", 6}} {
		a := c.r / (2 * L)
		var want func(t float64) float64
		switch {
		case c.name == "underdamped":
			wd := math.Sqrt(w0*w0 - a*a)
			want = func(t float64) float64 { return V0 / (wd * L) * math.Exp(-a*t) * math.Sin(wd*t) }
		case c.name == "critically damped":
			want = func(t float64) float64 { return V0 * t * math.Exp(-a*t) / L }
		default:
			d := math.Sqrt(a*a - w0*w0)
			s1, s2 := -a+d, -a-d
			want = func(t float64) float64 { return V0 / (L * (s1 - s2)) * (math.Exp(s1*t) - math.Exp(s2*t)) }
		}
		v := eval(t, s, `transient(circuit(capacitor("C1", "a", "0", 100 uF, 50 V), resistor("R1", "a", "b", `+c.R+`), inductor("L1", "b", "0", 200 uH)), 3 ms, 151)`)
		numErr = v.(*builtins.Table).NumErr
		cols, rows := tableCols(t, v)
		// the current leaves the capacitor's + plate into R1: I R1 > 0
		check(c.name, rows, cols["I R1"], 1, want)
	}
}

// TestTransientEnergyBalance: the energy first stored in the capacitor
// equals what remains in C and L plus what R has turned into heat,
// ∫R·i² dt (conservation of energy; Tellegen's theorem). The integral is
// taken by Simpson's rule on 4001 samples of the dense output (error
// below 1e-9 of the energy for this smooth current). Tolerance 1e-7.
func TestTransientEnergyBalance(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	cols, rows := tableCols(t, eval(t, s, `transient(circuit(capacitor("C1", "a", "0", 100 uF, 50 V), resistor("R1", "a", "b", 0.5 ohm), inductor("L1", "b", "0", 200 uH), inductor("L2", "c", "0", 150 uH), resistor("R2", "c", "0", 0.2 ohm), coupled("L1", "L2", 0.6)), 2 ms, 4001)`))
	w0 := 0.5 * 100e-6 * 50 * 50
	h := rows[1][0] - rows[0][0]
	heat := 0.0
	for i, r := range rows {
		p := 0.5*r[cols["I R1"]]*r[cols["I R1"]] + 0.2*r[cols["I R2"]]*r[cols["I R2"]]
		wgt := 2.0
		switch {
		case i == 0 || i == len(rows)-1:
			wgt = 1
		case i%2 == 1:
			wgt = 4
		}
		heat += wgt * p * h / 3
	}
	last := rows[len(rows)-1]
	i1, i2, vc := last[cols["I L1"]], last[cols["I L2"]], last[cols["V C1"]]
	m := 0.6 * math.Sqrt(200e-6*150e-6)
	stored := 0.5*100e-6*vc*vc + 0.5*200e-6*i1*i1 + 0.5*150e-6*i2*i2 + m*i1*i2
	t.Logf("energy balance: off by %.2g of the stored energy", math.Abs(stored+heat-w0)/w0)
	if d := math.Abs(stored + heat - w0); d > 1e-7*w0 {
		t.Errorf("energy: stored %g J + heat %g J = %g J, initially %g J (off by %.2g)", stored, heat, stored+heat, w0, d/w0)
	}
}

// TestTransientRefusals: sources and circuits that cannot be followed in
// time are refused with a reason.
func TestTransientRefusals(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	for _, c := range []struct{ in, want string }{
		{`transient(circuit(voltage_source("V1", "a", "0", polar(1 V, 10 deg)), resistor("R1", "a", "0", 1 ohm)), 1 ms)`, "is a phasor"},
		{`transient(circuit(voltage_source("V1", "a", "0", 1 V), resistor("R1", "a", "0", 1 ohm)), 0 s)`, "above zero"},
		{`transient(circuit(voltage_source("V1", "a", "0", 1 V), capacitor("C1", "a", "0", 1 uF)), 1 ms)`, "in the time domain"},
	} {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.in, err, c.want)
		}
	}
}
