package em

import (
	"math"
	"testing"
)

// TestToroidCancellation measures what the toroid builtins' help states:
// outside a toroidal winding the turns' fields cancel (Ampère's law: no
// current threads a loop around the core from outside; for N meridian
// turns what is left falls off like an N-fold multipole, far below
// rounding at 200 turns). So the computed |ΣB| is rounding of the turns'
// own fields: at points from 2 to 20 outer radii (on the axis, in the
// plane, off both) it is about 1e-16 of Σ|B_turn|, and the relative error
// of such a result is of order one. The help says the result is known to
// about 1e-16 of the turns' fields; tolerance 1e-14 (a few ulps times
// √N for 200 rounded terms; seen up to 1.5e-15).
func TestToroidCancellation(t *testing.T) {
	const n, rIn, rOut, h = 200, 0.02, 0.03, 0.01
	p := akToroid(t, n, rIn, rOut, h)
	worst := 0.0
	for _, d := range []float64{2, 5, 20} {
		for _, x := range []Vec{{Z: d * rOut}, {X: d * rOut}, {X: d * rOut * 0.6, Y: d * rOut * 0.3, Z: d * rOut * 0.7}} {
			var sum Vec
			abs := 0.0
			for k := range n {
				turn := Path{Prims: p.Prims[4*k : 4*k+4]}
				b, err := PathB(turn, x)
				if err != nil {
					t.Fatal(err)
				}
				sum = Vec{X: sum.X + b.X, Y: sum.Y + b.Y, Z: sum.Z + b.Z}
				abs += math.Sqrt(b.X*b.X + b.Y*b.Y + b.Z*b.Z)
			}
			r := math.Sqrt(sum.X*sum.X+sum.Y*sum.Y+sum.Z*sum.Z) / abs
			t.Logf("at %v: |ΣB|/Σ|B| = %.3g", x, r)
			worst = math.Max(worst, r)
		}
	}
	if worst > 1e-14 {
		t.Errorf("largest |ΣB|/Σ|B| = %.3g; the help says about 1e-16 of the turns' fields", worst)
	}
}
