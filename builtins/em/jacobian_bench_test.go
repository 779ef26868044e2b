package em

import "testing"

// BenchmarkFieldJacobian and BenchmarkJacobianDifferences time one
// Jacobian of B at a point near each test source, exact (FieldJacobian)
// and by the step search (Jacobian of the field), for the cost charged
// to the work budget.
func BenchmarkFieldJacobian(b *testing.B) {
	for name, p := range jacSources(&testing.T{}) {
		srcs := []Source{{Path: p, I: 1}}
		x := jacPoints(p, 1, 5)[0]
		b.Run(name, func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				if _, _, err := FieldJacobian(FieldB, srcs, x, Tol{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkJacobianDifferences(b *testing.B) {
	for name, p := range jacSources(&testing.T{}) {
		srcs := []Source{{Path: p, I: 1}}
		x := jacPoints(p, 1, 5)[0]
		ev := NewEvaluator(FieldB, srcs)
		b.Run(name, func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				if _, err := Jacobian(ev.At, x); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
