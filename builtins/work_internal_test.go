package builtins

import (
	"math"
	"strings"
	"testing"

	"loopwise/runtime"
)

// TestFiniteRow: a sweep row with an infinity or NaN (which the session's
// own guards keep out of every value today; this guard stands behind them)
// is refused with the function, the value and the argument of the row.
func TestFiniteRow(t *testing.T) {
	f := &runtime.Func{Name: "f", Params: []string{"d"}, Body: "d", MinArgs: 1, MaxArgs: 1}
	arg := runtime.Quantity{V: 0.002, D: dimLength}
	axes := []sweepAxis{{name: "d"}}
	for _, c := range []struct {
		v    runtime.Value
		want string
	}{
		{runtime.Quantity{V: math.Inf(1), D: dimHenry}, "sweep: f(d) gives +Inf at d = 2 mm"},
		{runtime.Vector{V: [3]float64{0, math.NaN(), 1}, D: dimTesla}, "sweep: f(d) gives NaN at d = 2 mm"},
	} {
		err := finiteRow("sweep", f, axes, []runtime.Value{arg}, c.v)
		if err == nil || !strings.HasPrefix(err.Error(), c.want) {
			t.Errorf("%v: got %v, want %q", c.v, err, c.want)
		}
	}
	if err := finiteRow("sweep", f, axes, []runtime.Value{arg}, runtime.Quantity{V: 1e308, D: dimHenry}); err != nil {
		t.Errorf("a finite row: %v", err)
	}
}
