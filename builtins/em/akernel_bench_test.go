package em

import (
	"math"
	"testing"
)

// akToroid is a toroidal winding of n rectangular turns of straight pieces
// on the core rIn..rOut, −hgt/2..hgt/2 about +z, as toroid_rect builds it.
func akToroid(tb testing.TB, n int, rIn, rOut, hgt float64) Path {
	tb.Helper()
	prims := make([]Prim, 0, 4*n)
	for k := range n {
		s, c := math.Sincos(2 * math.Pi * float64(k) / float64(n))
		at := func(r, z float64) Vec { return Vec{X: r * c, Y: r * s, Z: z} }
		pts := []Vec{at(rIn, -hgt/2), at(rIn, hgt/2), at(rOut, hgt/2), at(rOut, -hgt/2)}
		for i := range pts {
			prims = append(prims, cpMust(tb)(NewSegment(pts[i], pts[(i+1)%4])))
		}
	}
	return Path{Prims: prims}
}

// akRoutes runs a benchmark for the per-segment route (SegmentA for each
// segment, as before the flat loop), the flat scalar loop and each vector
// kernel the CPU has, in the same run, so that their ratios are measured
// on the same machine at the same time.
func akRoutes(b *testing.B, f func(b *testing.B)) {
	b.Run("per-segment", func(b *testing.B) { withPerSegmentA(func() { f(b) }) })
	b.Run("scalar", func(b *testing.B) { withAKernel(nil, func() { f(b) }) })
	for _, k := range aKernels {
		b.Run(k.name, func(b *testing.B) { withAKernel(k, func() { f(b) }) })
	}
}

// BenchmarkSegmentAKernel: the vector potential of a 1000-segment coil at
// 100 points off it, reported per segment–point interaction (time and
// rate).
func BenchmarkSegmentAKernel(b *testing.B) {
	coil := cpPolyCoil(b, 0.02, 0, 0.02, 10, 100)
	c := compile([]Source{{Path: coil, I: 1}})
	pts := make([]Vec, 100)
	for i := range pts {
		phi := 0.37 * float64(i)
		pts[i] = Vec{X: 0.015 * math.Cos(phi), Y: 0.015 * math.Sin(phi), Z: 0.03 * float64(i) / float64(len(pts))}
	}
	akRoutes(b, func(b *testing.B) {
		var sink float64
		for b.Loop() {
			for _, x := range pts {
				v, err := c.atMasked(FieldA, x, nil)
				if err != nil {
					b.Fatal(err)
				}
				sink += v.X
			}
		}
		n := float64(b.N * len(pts) * len(c.a))
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/n, "ns/interaction")
		b.ReportMetric(n/b.Elapsed().Seconds(), "interactions/s")
		if math.IsNaN(sink) {
			b.Fatal("NaN")
		}
	})
}

// BenchmarkToroid200Inductance: self-inductance of a 200-turn rectangular
// toroidal winding of straight pieces (800 pieces; core 20–30 mm, 10 mm
// high, wire radius 0.25 mm).
func BenchmarkToroid200Inductance(b *testing.B) {
	path := akToroid(b, 200, 0.02, 0.03, 0.01)
	akRoutes(b, func(b *testing.B) {
		for b.Loop() {
			if _, err := SelfInductance(path, 0.25e-3, DefaultTol); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// BenchmarkMutual1000: mutual inductance of two 1000-segment coils by the
// general route (∮A·dl), as BenchmarkNeumann1000.
func BenchmarkMutual1000(b *testing.B) {
	c1 := cpPolyCoil(b, 0.02, 0, 0.02, 10, 100)
	c2 := cpPolyCoil(b, 0.015, 0.03, 0.02, 10, 100)
	akRoutes(b, func(b *testing.B) {
		for b.Loop() {
			if _, err := Mutual(c1, c2, MutualOptions{NoFastPath: true}); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// BenchmarkSegmentAGoSum times, per segment, what the other split of the
// work between assembly and Go would leave to Go: reading the skip mask
// and adding w·ê for weights w the assembly would have written to a
// buffer (here given). segmentsAVec instead adds w·ê in the kernels and
// cuts the segments into runs at the skipped ones; this figure against
// BenchmarkSegmentAKernel's per-interaction time is why.
func BenchmarkSegmentAGoSum(b *testing.B) {
	coil := cpPolyCoil(b, 0.02, 0, 0.02, 10, 100)
	c := compile([]Source{{Path: coil, I: 1}})
	w := make([]float64, len(c.flatSegs()))
	for i := range w {
		w[i] = 1 + float64(i%7)
	}
	skip := make([]bool, len(coil.Prims))
	skip[3], skip[4], skip[5] = true, true, true
	var sink float64
	for b.Loop() {
		var sx, sy, sz float64
		for k := range c.flatSegs() {
			if skip[c.segIdx[k]] {
				continue
			}
			s := &c.flatSegs()[k]
			sx += w[k] * s.ex
			sy += w[k] * s.ey
			sz += w[k] * s.ez
		}
		sink += sx + sy + sz
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(c.flatSegs())), "ns/interaction")
	if math.IsNaN(sink) {
		b.Fatal("NaN")
	}
}

// BenchmarkHelixLayersInductance times the inductance of four coaxial
// helices of five turns, 0.5 mm apart in radius (a small multilayer
// winding): the helices' potentials are integrals along them, so this is
// the numerical-integral route of a winding.
func BenchmarkHelixLayersInductance(b *testing.B) {
	var prims []Prim
	for k := 0; k < 4; k++ {
		h, err := NewHelix(Vec{Z: -0.0025}, Vec{Z: 1}, 0.01+0.0005*float64(k), 0.0025, 5)
		if err != nil {
			b.Fatal(err)
		}
		prims = append(prims, h)
	}
	p := Path{Prims: prims}
	b.ResetTimer()
	for range b.N {
		if _, err := SelfInductance(p, 0.0002, Tol{}); err != nil {
			b.Fatal(err)
		}
	}
}
