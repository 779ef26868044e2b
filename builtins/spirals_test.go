package builtins_test

import (
	"errors"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestSpiralErrors pins the messages of bad spiral and trace input: each
// is a positioned error naming the builtin, never a panic.
func TestSpiralErrors(t *testing.T) {
	cases := []struct{ in, want string }{
		{"spiral_square([0,0,0] m, [0,0,1], 30 mm, 0.5 mm, 0.3 mm, 8.3)", "spiral_square: the number of turns must be a positive whole number of sides (a multiple of 1/4)"},
		{"spiral_circle([0,0,0] m, [0,0,1], 30 mm, 0.5 mm, 0.3 mm, 2.25)", "spiral_circle: the number of turns must be a positive whole number of half turns"},
		{"spiral_square([0,0,0] m, [0,0,1], 10 mm, 0.5 mm, 0.3 mm, 8)", "spiral_square: the turns do not fit: the inner size would be -0.0022 m; use fewer turns, a narrower trace or less spacing, or a larger outer size"},
		{"spiral_hexagon([0,0,0] m, [0,0,1], 30 mm, 0.5 mm, 0.3 mm, 4, 2)", "spiral_hexagon: give layer_spacing after layers"},
		{"spiral_octagon([0,0,0] m, [0,0,0], 30 mm, 0.5 mm, 0.3 mm, 4)", "spiral_octagon"},
		{"spiral_square([0,0,0] m, [0,0,1], 30 mm, 0.5 mm, 0.3 mm, 1e9)", "spiral_square: 1e+09 turns is more than the limit of 100000"},
		{"trace_inductance(helix([0,0,0] m, [0,0,1], 10 mm, 40 mm, 5), 1 mm, 35 um)", "trace_inductance: a helix is not a trace: trace inductance takes straight pieces and arcs"},
		{"trace_inductance(circle([0,0,0] m, [0,0,1], 1 mm), 1 mm, 35 um)", "trace_inductance: an arc's radius (0.001 m) is not larger than the trace width (0.001 m)"},
		{"trace_inductance(join(segment([0,0,0] m, [1,0,0] m), segment([0.5,0,0] m, [2,0,0] m)), 1 mm, 35 um)", "trace_inductance: two straight pieces overlap on one line"},
	}
	for _, c := range cases {
		s := runtime.NewSession(builtins.Standard())
		_, err := s.Eval(lang.Pos{File: "s.lw", Line: 1, Col: 1}, c.in)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("%s: got %v; want a positioned error", c.in, err)
			continue
		}
		if got := le.Msg; len(got) < len(c.want) || got[:len(c.want)] != c.want {
			t.Errorf("%s:\n got %q\nwant %q", c.in, got, c.want)
		}
	}
}
