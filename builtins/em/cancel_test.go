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
// √N for 200 rounded terms; seen up to 4e-15).
func TestToroidCancellation(t *testing.T) {
	const n, rIn, rOut, h = 200, 0.02, 0.03, 0.01
	rect := akToroid(t, n, rIn, rOut, h)
	// the round winding: circles of radius 5 mm on a 25 mm ring
	var round Path
	for k := range n {
		s, c := math.Sincos(2 * math.Pi * float64(k) / float64(n))
		q, err := NewCircle(Vec{X: 0.025 * c, Y: 0.025 * s}, Vec{X: -s, Y: c}, 0.005)
		if err != nil {
			t.Fatal(err)
		}
		round.Prims = append(round.Prims, q)
	}
	for _, w := range []struct {
		p   Path
		per int
	}{{rect, 4}, {round, 1}} {
		worst := cancelRatio(t, w.p, w.per, n, rOut)
		if worst > 1e-14 {
			t.Errorf("largest |ΣB|/Σ|B| = %.3g; the help says about 1e-16 of the turns' fields", worst)
		}
	}
}

func cancelRatio(t *testing.T, p Path, per, n int, rOut float64) float64 {
	worst := 0.0
	for _, d := range []float64{2, 5, 20} {
		for _, x := range []Vec{{Z: d * rOut}, {X: d * rOut}, {X: d * rOut * 0.6, Y: d * rOut * 0.3, Z: d * rOut * 0.7}} {
			var sum Vec
			abs := 0.0
			for k := range n {
				turn := Path{Prims: p.Prims[per*k : per*k+per]}
				b, err := PathB(turn, x)
				if err != nil {
					t.Fatal(err)
				}
				sum = Vec{X: sum.X + b.X, Y: sum.Y + b.Y, Z: sum.Z + b.Z}
				abs += math.Sqrt(b.X*b.X + b.Y*b.Y + b.Z*b.Z)
			}
			r := math.Sqrt(sum.X*sum.X+sum.Y*sum.Y+sum.Z*sum.Z) / abs
			t.Logf("%d pieces a turn, at %v: |ΣB|/Σ|B| = %.3g", per, x, r)
			worst = math.Max(worst, r)
		}
	}
	return worst
}
