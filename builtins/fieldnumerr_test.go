package builtins_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/runtime"
)

// TestFieldCancellationReported: outside a toroidal winding the turns'
// fields cancel (Ampère's law: no current threads a loop around the core
// from outside, and the N-fold symmetry of N meridian turns leaves only
// multipoles of order N or more, below (r_out/d)^200 of a turn's field
// here: e.g. Jackson, Classical Electrodynamics, 3rd ed., 1999, §5.3 and
// §5.6), so the field of the winding there is zero to far below rounding
// and everything b_at returns is rounding of the turns' fields. The bound
// it reports must cover the whole value in every component (the actual
// error against the known cancellation) and be shown. The error against a
// 300-bit sum of the pieces is checked in builtins/em
// (TestFieldErrorBoundToroid). A single ring, where nothing cancels,
// carries a bound below fieldRounding of its value, which is not reported
// (as for integrals), and b_at inside a function then says nothing.
func TestFieldCancellationReported(t *testing.T) {
	for _, c := range []struct{ path, point string }{
		{"toroid_rect([0, 0, 0] m, [0, 0, 1], 20 mm, 30 mm, 10 mm, 200)", "[0, 0, 60] mm"},
		{"toroid_rect([0, 0, 0] m, [0, 0, 1], 20 mm, 30 mm, 10 mm, 200)", "[150, 40, 100] mm"},
		{"toroid_round([0, 0, 0] m, [0, 0, 1], 25 mm, 5 mm, 200)", "[80, 0, 30] mm"},
	} {
		r := numRun(t, "tor = "+c.path, "b_at(source(tor, 1 A), "+c.point+")")
		v, ok := r.Value.(runtime.Vector)
		if !ok {
			t.Fatalf("%T", r.Value)
		}
		if r.NumErr == nil {
			t.Fatalf("%s at %s: no numerical error reported for %v", c.path, c.point, v.V)
		}
		for i, x := range v.V {
			if math.Abs(x) > r.NumErr[i] {
				t.Errorf("%s at %s: component %d is %.3g T, beyond the bound %.3g T", c.path, c.point, i, x, r.NumErr[i])
			}
		}
		if !strings.Contains(r.Text, "numerical error") {
			t.Errorf("the bound is not shown: %q", r.Text)
		}
		t.Logf("%s at %s: %s", c.path, c.point, r.Text)
	}
	r := numRun(t, "ring = circle([0, 0, 0] m, [0, 0, 1], 25 mm)", "b_at(source(ring, 2 A), [10, 0, 30] mm)")
	if r.NumErr != nil {
		t.Errorf("a single ring reported %v", r.NumErr)
	}
	r = numRun(t, "ring = circle([0, 0, 0] m, [0, 0, 1], 25 mm)", "f(z) = b_at(source(ring, 2 A), [0 m, 0 m, z]).z", "f(3 mm)")
	if r.NumErr != nil || strings.Contains(r.Note, "not carried") {
		t.Errorf("a single ring inside a function: bound %v, note %q", r.NumErr, r.Note)
	}
}
