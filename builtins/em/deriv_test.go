package em

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
)

// TestDerivativeFunctions: Derivative against elementary calculus, on
// scales from 1e-6 to 1e3 (base steps of 1 and of the scale), and kinks.
// Tolerance 1e-8 of the derivative's size (ωA, the slope): the accepted
// plateau agrees to 1e-6 of it and the extrapolated difference is far
// better; at a zero of the derivative the same absolute bound.
func TestDerivativeFunctions(t *testing.T) {
	scalar := func(f func(float64) float64) func(float64) (Vec, error) {
		return func(s float64) (Vec, error) { return Vec{X: f(s)}, nil }
	}
	for _, c := range []struct {
		name       string
		f          func(float64) float64
		at, base   float64
		want, size float64
	}{
		{"sin, 1 MHz", func(s float64) float64 { return math.Sin(2 * math.Pi * 1e6 * s) }, 0.3e-6, 1, 2 * math.Pi * 1e6 * math.Cos(0.6*math.Pi), 2 * math.Pi * 1e6},
		{"sin at its peak, 1 mHz", func(s float64) float64 { return math.Sin(2 * math.Pi * 1e-3 * s) }, 250, 1, 0, 2 * math.Pi * 1e-3},
		{"cubic, base 1 mm", func(s float64) float64 { return s * s * s }, 0.002, 1e-3, 3 * 4e-6, 3 * 4e-6},
		{"constant", func(float64) float64 { return 7 }, 1, 1, 0, 1},
	} {
		got, err := Derivative(scalar(c.f), c.at, c.base, -12, true)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if math.Abs(got.X-c.want) > 1e-8*c.size {
			t.Errorf("%s: %.12g, want %.12g", c.name, got.X, c.want)
		}
	}
	// a corner: |s − 1| + 0.5 s has slopes −0.5 and 1.5 at s = 1
	_, err := Derivative(scalar(func(s float64) float64 { return math.Abs(s-1) + 0.5*s }), 1, 1, -12, true)
	var ke *KinkError
	if !errors.As(err, &ke) || math.Abs(ke.Before.X+0.5) > 1e-9 || math.Abs(ke.After.X-1.5) > 1e-9 {
		t.Errorf("corner: %v, want a kink with slopes -0.5 and 1.5", err)
	}
	// a jump
	if _, err := Derivative(scalar(func(s float64) float64 {
		if s > 0 {
			return 1
		}
		return 0
	}), 0, 1, -12, true); !errors.Is(err, ErrNoPlateau) {
		t.Errorf("jump: %v, want ErrNoPlateau", err)
	}
	// not defined at the point itself: ErrNoPlateau wrapping the cause
	cause := errors.New("undefined at 0")
	if _, err := Derivative(func(s float64) (Vec, error) {
		if s == 0 {
			return Vec{}, cause
		}
		return Vec{X: 1 / s}, nil
	}, 0, 1, -12, true); !errors.Is(err, ErrNoPlateau) || !errors.Is(err, cause) {
		t.Errorf("1/s at 0: %v", err)
	}
}

// TestJacobianFields: the Jacobian of F = (−yz, xz, x²) is
// [[0, z, 2x], [−z, 0, 0], [−y, x, 0]] by rows ∂F_i/∂x_j (hand calculus);
// a polynomial of degree 2, exact but for rounding: 1e-9 of |F|/|x|. A
// field with a kink across the plane x = 0, (|x|, 0, 0), gives an
// *AxisKinkError along x with derivatives −1 and +1.
func TestJacobianFields(t *testing.T) {
	f := func(p Vec) (Vec, error) { return Vec{X: -p.Y * p.Z, Y: p.X * p.Z, Z: p.X * p.X}, nil }
	x := Vec{X: 0.3, Y: -0.7, Z: 1.1}
	j, err := Jacobian(f, x)
	if err != nil {
		t.Fatal(err)
	}
	want := [3]Vec{{X: 0, Y: x.Z, Z: 2 * x.X}, {X: -x.Z, Y: 0, Z: 0}, {X: -x.Y, Y: x.X, Z: 0}}
	for k := range want {
		if r3.Norm(r3.Sub(j[k], want[k])) > 1e-9*2 {
			t.Errorf("column %d: %v, want %v", k, j[k], want[k])
		}
	}
	_, err = Jacobian(func(p Vec) (Vec, error) { return Vec{X: math.Abs(p.X), Y: p.Y}, nil }, Vec{Y: 0.5})
	var ke *AxisKinkError
	if !errors.As(err, &ke) || ke.Axis != 0 || math.Abs(ke.Before.X+1) > 1e-9 || math.Abs(ke.After.X-1) > 1e-9 {
		t.Errorf("kink across x = 0: %v", err)
	}
}
