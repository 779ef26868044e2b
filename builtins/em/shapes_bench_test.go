package em

import (
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// BenchmarkShapeWeights times one field point of each shape, near and
// far, for the costs their Weight methods state (in units of one
// segment's field, about 11 ns on an idle two-core machine; see
// BenchmarkElementaryEval).
func BenchmarkShapeWeights(b *testing.B) {
	cyl := CylinderSheet{N: Vec{Z: 1}, R: 0.005, L: 0.01}
	blk := BlockSheet{N: Vec{Z: 1}, U: Vec{X: 1}, HU: 0.01, HV: 0.005, HN: 0.0025}
	pts := []Vec{{X: 0.003, Z: 0.002}, {X: 0.0055, Z: 0.001}, {X: 0.02, Y: 0.01, Z: 0.03}}
	for _, c := range []struct {
		name  string
		s     Shape
		which Which
	}{{"cylinder/B", cyl, FieldB}, {"cylinder/A", cyl, FieldA}, {"block/B", blk, FieldB}, {"block/A", blk, FieldA},
		{"dipole/B", Dipole{M: Vec{Z: 1}}, FieldB}, {"wire/B", InfiniteWire{D: r3.Unit(Vec{X: 1, Z: 1}), RRef: 1}, FieldB}} {
		b.Run(c.name, func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				for _, x := range pts {
					if _, err := c.s.Field(c.which, x, nil); err != nil {
						b.Fatal(err)
					}
				}
			}
		})
	}
}
