package draw

import "testing"

// BenchmarkFieldLines traces the lines of a straight wire's field on a
// 300 × 300 grid.
func BenchmarkFieldLines(b *testing.B) {
	u, v, fu, fv := wireOnGrid(300, 0.05)
	for i := 0; i < b.N; i++ {
		if _, err := FieldLines(u, v, fu, fv); err != nil {
			b.Fatal(err)
		}
	}
}
