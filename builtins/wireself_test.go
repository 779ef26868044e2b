package builtins_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestInductanceCurrentOption: inductance(…, "uniform") less
// inductance(…, "surface") of a straight wire is its internal inductance
// μ0ℓ/8π (Grover, Inductance Calculations, 1946: the low-frequency
// internal inductance of a round wire), up to the end term
// (μ0/2π)(128/45π − 4/π)·a, of relative size below 2a/ℓ: tolerance 2a/ℓ.
// The default is "uniform". A circle's difference is μ0R/4, the same
// internal part for its length 2πR (tolerance (a/R)² ln(8R/a) in units of
// μ0R, four times that relative to μ0R/4: the
// surface-current expansion stops at the leading terms).
func TestInductanceCurrentOption(t *testing.T) {
	const mu0 = 1.25663706212e-6 // CODATA 2018
	s := runtime.NewSession(builtins.Standard())
	val := func(line string) float64 {
		t.Helper()
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line)
		if err != nil {
			t.Fatalf("%s: %v", line, err)
		}
		return res.Value.(runtime.Quantity).V
	}
	const l, a = 1.0, 1e-3
	seg := `segment([0, 0, 0] m, [1, 0, 0] m)`
	lu := val(`inductance(` + seg + `, 1 mm, "uniform")`)
	ls := val(`inductance(` + seg + `, 1 mm, "surface")`)
	if ld := val(`inductance(` + seg + `, 1 mm)`); ld != lu {
		t.Errorf("default %.17g H, uniform %.17g H", ld, lu)
	}
	want := mu0 * l / (8 * math.Pi)
	if e := math.Abs((lu-ls)/want - 1); e > 2*a/l {
		t.Errorf("segment: uniform − surface = %.6g H, μ0ℓ/8π = %.6g H (rel %.2g)", lu-ls, want, e)
	}
	const R = 0.05
	cu := val(`inductance(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 1 mm)`)
	cs := val(`inductance(circle([0, 0, 0] m, [0, 0, 1], 50 mm), 1 mm, "surface")`)
	x := a / R
	if e := math.Abs((cu-cs)/(mu0*R/4) - 1); e > x*x*math.Log(8/x)*4 {
		t.Errorf("circle: uniform − surface = %.6g H, μ0R/4 = %.6g H (rel %.2g)", cu-cs, mu0*R/4, e)
	}
	_, err := s.Eval(lang.Pos{Line: 3, Col: 1}, `inductance(`+seg+`, 1 mm, "ac")`)
	var le *lang.Error
	if !errors.As(err, &le) || !strings.Contains(err.Error(), `inductance: the current is "uniform" (low frequency) or "surface" (skin depth much smaller than the wire radius), not "ac"`) {
		t.Errorf("bad option: %v", err)
	}
}
