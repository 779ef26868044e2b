package ode_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"

	"loopwise/builtins/ode"
)

// Random stiff linear systems y' = A y against y(t) = exp(At) y0 from
// gonum's matrix exponential (mat.Dense.Exp, a Padé approximation with
// scaling and squaring), a route that shares no code with the
// integrator. A = −S D Sᵀ + K with S orthogonal-ish (from a QR), D
// diagonal with entries spread over four decades (1 … 1e4 s⁻¹: stiff) and
// K skew-symmetric (oscillation). The symmetric part of A is negative
// definite, so ‖y(t)‖₂ ≤ ‖y0‖₂ and every component stays within ‖y0‖₂.
//
// Tolerance: 1.5·√n·estBound per component (the reasoning of denseFactor
// in linear_test.go, with √n for the RMS norm over n components).
func TestLinearSystemsAgainstExpm(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 12; trial++ {
		n := 1 + trial%8
		g := mat.NewDense(n, n, nil)
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				g.Set(i, j, rng.NormFloat64())
			}
		}
		var qr mat.QR
		qr.Factorize(g)
		var q mat.Dense
		qr.QTo(&q)
		d := mat.NewDiagDense(n, nil)
		for i := 0; i < n; i++ {
			d.SetDiag(i, math.Pow(10, 4*rng.Float64()))
		}
		var a mat.Dense
		a.Product(&q, d, q.T())
		a.Scale(-1, &a)
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				k := 50 * rng.NormFloat64()
				a.Set(i, j, a.At(i, j)+k)
				a.Set(j, i, a.At(j, i)-k)
			}
		}
		y0 := make([]float64, n)
		for i := range y0 {
			y0[i] = rng.NormFloat64()
		}
		raw := a.RawMatrix()
		f := func(_ float64, y, dy []float64) error {
			for i := 0; i < n; i++ {
				var s float64
				for j := 0; j < n; j++ {
					s += raw.Data[i*raw.Stride+j] * y[j]
				}
				dy[i] = s
			}
			return nil
		}
		const t1 = 0.5
		sol, err := ode.Solve(f, 0, t1, y0, ode.Options{})
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		norm0 := mat.Norm(mat.NewVecDense(n, y0), 2)
		bound := 1.5 * math.Sqrt(float64(n)) * estBound(ode.DefaultRelTol, ode.DefaultAbsTol, norm0)
		y := make([]float64, n)
		var worst float64
		for k := 0; k <= 50; k++ {
			tt := t1 * float64(k) / 50
			var at, e mat.Dense
			at.Scale(tt, &a)
			e.Exp(&at)
			var want mat.VecDense
			want.MulVec(&e, mat.NewVecDense(n, y0))
			sol.At(tt, y)
			for i := range y {
				worst = math.Max(worst, math.Abs(y[i]-want.AtVec(i)))
			}
		}
		if worst > bound {
			t.Errorf("trial %d (n = %d): largest error %.3g exceeds %.3g", trial, n, worst, bound)
		} else {
			st := sol.Stats()
			t.Logf("trial %d (n = %d): largest error %.3g (bound %.3g), %d steps, %d rejected", trial, n, worst, bound, st.Steps, st.Rejected)
		}
	}
}
