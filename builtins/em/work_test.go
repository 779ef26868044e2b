package em

import (
	"errors"
	"math"
	"sync/atomic"
	"testing"
	"time"
)

// BenchmarkElementaryEval calibrates the work budget
// (runtime.EvalsPerSecond): one straight segment's field at one point, on
// one core. It reports ns/eval.
func BenchmarkElementaryEval(b *testing.B) {
	coil := cpPolyCoil(b, 0.02, 0, 0.02, 100, 10) // 1000 segments
	pts := make([]Vec, 256)
	for i := range pts {
		pts[i] = Vec{X: 0.05 * math.Cos(float64(i)), Y: 0.05 * math.Sin(float64(i)), Z: 0.02 * float64(i) / float64(len(pts))}
	}
	out := make([]Vec, len(pts))
	srcs := []Source{{Path: coil, I: 1}}
	n := 0
	for b.Loop() {
		if err := Fields(FieldB, srcs, pts, out, 1, nil, nil); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(n*len(pts)*len(coil.Prims)), "ns/eval")
}

var errStop = errors.New("stop")

// stopAfter returns a Stop function that starts failing once d has passed.
func stopAfter(d time.Duration) func() error {
	end := time.Now().Add(d)
	return func() error {
		if time.Now().After(end) {
			return errStop
		}
		return nil
	}
}

// TestFieldsStop: the parallel kernel ends all its workers when Stop fails
// and returns Stop's error. The work would take minutes; the bound of 10 s
// is a guard against a hang, not a speed claim.
func TestFieldsStop(t *testing.T) {
	coil := cpPolyCoil(t, 0.02, 0, 0.02, 1000, 10) // 10⁴ segments
	pts := make([]Vec, 1_000_000)                  // 10¹⁰ evaluations
	for i := range pts {
		pts[i] = Vec{X: 0.05, Y: 0, Z: 1e-7 * float64(i)}
	}
	out := make([]Vec, len(pts))
	var polls atomic.Int64
	stop := stopAfter(100 * time.Millisecond)
	start := time.Now()
	err := Fields(FieldB, []Source{{Path: coil, I: 1}}, pts, out, 0, nil, func() error {
		polls.Add(1)
		return stop()
	})
	if !errors.Is(err, errStop) {
		t.Fatalf("Fields with a failing Stop: got %v, want the Stop error", err)
	}
	if el := time.Since(start); el > 10*time.Second {
		t.Fatalf("Fields took %v after Stop failed", el)
	}
	computed := 0
	for _, v := range out {
		if v != (Vec{}) { // every point's field is non-zero (off the coil's axis)
			computed++
		}
	}
	if computed == len(pts) || polls.Load() == 0 {
		t.Fatalf("Fields computed %d of %d points (Stop polled %d times): it did not stop", computed, len(pts), polls.Load())
	}
}

// stopAt returns a Stop function that fails from its n-th call on.
func stopAt(n int) func() error {
	k := 0
	return func() error {
		if k++; k >= n {
			return errStop
		}
		return nil
	}
}

// TestQuadratureStop: the adaptive quadratures in one, two and three
// dimensions end when Tol.Stop fails and return its error. The integrands
// oscillate without end near a corner and are asked for 1e-15 with a huge
// budget: each needs hundreds of bisections, and Stop fails at its tenth
// call; the time bound is a hang guard.
func TestQuadratureStop(t *testing.T) {
	tol := func() Tol { return Tol{Rel: 1e-15, MaxEval: math.MaxInt32, Stop: stopAt(10)} }
	cases := map[string]func() error{
		"1-D": func() error {
			_, _, err := Integrate(func(x float64) float64 { return 1 / math.Sqrt(x) * math.Sin(1/x) }, 0, 1, tol())
			return err
		},
		"2-D": func() error {
			_, _, err := Integrate2(func(u, v float64) float64 { return math.Sin(1/(u+v)) / (u + v) }, 0, 1, 0, 1, tol())
			return err
		},
		"3-D": func() error {
			_, _, err := Integrate3(func(u, v, w float64) float64 { return math.Sin(1/(u+v+w)) / (u + v + w) }, 0, 1, 0, 1, 0, 1, tol())
			return err
		},
	}
	for name, f := range cases {
		start := time.Now()
		err := f()
		if !errors.Is(err, errStop) {
			t.Errorf("%s: got %v, want the Stop error", name, err)
		}
		if el := time.Since(start); el > 10*time.Second {
			t.Errorf("%s: took %v after Stop failed", name, el)
		}
	}
}

// TestSelfInductanceStop: the inductance loop over pieces ends when Stop
// fails (a 2000-ring stack, about 4 million pairs of pieces).
func TestSelfInductanceStop(t *testing.T) {
	var p Path
	for i := range 2000 {
		c, err := NewCircle(Vec{Z: 1e-3 * float64(i)}, Vec{Z: 1}, 0.02)
		if err != nil {
			t.Fatal(err)
		}
		p.Prims = append(p.Prims, c)
	}
	var calls atomic.Int64
	stop := func() error {
		if calls.Add(1) > 20 {
			return errStop
		}
		return nil
	}
	_, err := SelfInductance(p, 1e-4, Tol{Rel: 1e-10, Stop: stop})
	if !errors.Is(err, errStop) {
		t.Fatalf("got %v, want the Stop error", err)
	}
}

// BenchmarkPrimWeights measures the field of one arc (a full circle) and
// of one helix turn at points near and far, in ns per primitive; divided
// by BenchmarkElementaryEval's ns/eval they give the weights of
// builtins.pathWeight.
func BenchmarkPrimWeights(b *testing.B) {
	circle, err := NewCircle(Vec{}, Vec{Z: 1}, 0.01)
	if err != nil {
		b.Fatal(err)
	}
	helix, err := NewHelix(Vec{}, Vec{Z: 1}, 0.01, 0.1, 100)
	if err != nil {
		b.Fatal(err)
	}
	pts := []Vec{{X: 0.005, Z: 0.01}, {X: 0.03, Z: 0.02}, {X: 0.2, Z: 0.5}, {Z: 0.001}}
	for _, c := range []struct {
		name  string
		p     Prim
		units float64
	}{{"arc", circle, 1}, {"helix-turn", helix, 100}} {
		b.Run(c.name, func(b *testing.B) {
			n := 0
			for b.Loop() {
				for _, x := range pts {
					if _, err := PrimB(c.p, x); err != nil {
						b.Fatal(err)
					}
				}
				n++
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/(float64(n*len(pts))*c.units), "ns/piece")
		})
	}
}

// TestHelixFieldStop: the numerical field of a helix polls Stop (a long
// helix's field at one point takes seconds), in the kernel's sources and
// in an Evaluator.
func TestHelixFieldStop(t *testing.T) {
	h, err := NewHelix(Vec{}, Vec{Z: 1}, 0.01, 1, 1000)
	if err != nil {
		t.Fatal(err)
	}
	x := Vec{X: 0.005, Z: 0.1}
	if _, err := primB(h, x, stopAt(10)); !errors.Is(err, errStop) {
		t.Errorf("primB: got %v, want the Stop error", err)
	}
	if _, err := primA(h, x, stopAt(10)); !errors.Is(err, errStop) {
		t.Errorf("primA: got %v, want the Stop error", err)
	}
	ev := NewEvaluator(FieldB, []Source{{Path: Path{Prims: []Prim{h}}, I: 1}})
	ev.SetStop(stopAt(10))
	if _, err := ev.At(x); !errors.Is(err, errStop) {
		t.Errorf("Evaluator.At: got %v, want the Stop error", err)
	}
	// without Stop the same field is computed
	if v, err := PrimB(h, x); err != nil || v == (Vec{}) {
		t.Errorf("PrimB without Stop: %v, %v", v, err)
	}
}
