package builtins_test

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestAngleArguments checks that the builtins that take an angle (arc,
// rotate) take it as an angle (rad, deg, rev) or as a plain number in
// radians, with one meaning. The arc length is r·θ (the definition of the
// radian, SI Brochure, 9th ed., 2019, Table 4 note); tolerance 1e-12
// relative, far above the few roundings of r·θ and the arc's own length.
func TestAngleArguments(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	const r = 0.02
	for _, ang := range []string{"90 deg", "pi/2", "0.25 rev", "pi/2 * 1 rad", "1.5707963267948966 rad"} {
		l := eval(t, s, "length(arc([0, 0, 0] m, [0, 0, 1], [20, 0, 0] mm, "+ang+"))").(runtime.Quantity)
		if !scalar.EqualWithinRel(l.V, r*math.Pi/2, 1e-12) {
			t.Errorf("arc of %s: length %v m, want r·π/2 = %v m", ang, l.V, r*math.Pi/2)
		}
	}
	// rotate: a loop turned by a quarter turn, written four ways, gives
	// one mutual inductance with a fixed loop (bit for bit: the angle
	// reaches the rotation as the same float64).
	mut := func(ang string) runtime.Value {
		return eval(t, s, "mutual(rotate(circle([0, 0, 0] m, [0, 0, 1], 25 mm), [1, 0, 0], "+ang+"), circle([0, 0, 30] mm, [0, 0, 1], 20 mm))")
	}
	want := mut("pi/2")
	for _, ang := range []string{"90 deg", "0.25 rev", "pi/2 * 1 rad"} {
		if got := mut(ang); got != want {
			t.Errorf("rotate by %s: mutual %v, by pi/2: %v", ang, got, want)
		}
	}
	for _, line := range []string{
		"arc([0, 0, 0] m, [0, 0, 1], [20, 0, 0] mm, 1 m)",
		"rotate(circle([0, 0, 0] m, [0, 0, 1], 25 mm), [1, 0, 0], 1 Hz)",
	} {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line)
		if err == nil || !strings.Contains(err.Error(), "an angle (rad, deg, rev) or a plain number in radians") {
			t.Errorf("%s: %v, want the angle-argument error", line, err)
		}
	}
}
