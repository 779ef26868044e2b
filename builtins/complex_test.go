package builtins_test

import (
	"math"
	"math/cmplx"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestComplexBuiltins compares re, im, conj, arg, polar, abs, sqrt and exp
// with closed forms from outside the project. Tolerance: a few ulps (one
// libm call and one product or division each).
func TestComplexBuiltins(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	r3 := math.Sqrt(3)
	cases := []struct {
		in   string
		want complex128
		src  string
	}{
		// Euler's formula e^{jθ} = cos θ + j sin θ at θ = π/3
		{"exp(j*pi/3)", complex(0.5, r3/2), "Euler's formula; cos 60° = 1/2, sin 60° = √3/2"},
		// principal root of 1 + j: Abramowitz and Stegun (1964) 3.7.27,
		// √z = √((|z|+x)/2) + j·sgn(y)·√((|z|−x)/2)
		{"sqrt(1 + 1j)", complex(math.Sqrt((math.Sqrt2+1)/2), math.Sqrt((math.Sqrt2-1)/2)), "A&S 3.7.27"},
		{"sqrt(-4 + 0j)", complex(0, 2), "A&S 3.7.27 with x = -4, y = 0"},
		{"polar(2, 60 deg)", complex(1, r3), "2(cos 60° + j sin 60°)"},
		{"conj(3 - 4j)", complex(3, 4), "definition of the conjugate"},
	}
	for _, c := range cases {
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		if err != nil {
			t.Errorf("%s: %v", c.in, err)
			continue
		}
		z, ok := res.Value.(runtime.Complex)
		if !ok {
			t.Errorf("%s: %s, want a complex number", c.in, runtime.TypeName(res.Value))
			continue
		}
		if cmplx.Abs(z.V-c.want) > 4e-16*cmplx.Abs(c.want) {
			t.Errorf("%s = %v, want %v (%s)", c.in, z.V, c.want, c.src)
		}
	}
	reals := []struct {
		in   string
		want float64
		src  string
	}{
		{"abs((3 + 4j) ohm) / 1 ohm", 5, "3-4-5 right triangle"},
		{"re((3 + 4j) ohm) / 1 ohm", 3, "definition"},
		{"im((3 + 4j) ohm) / 1 ohm", 4, "definition"},
		{"arg(1 + 1j) / 1 rad", math.Pi / 4, "atan2(1, 1) = π/4"},
		{"arg(-1 + 0j) / 1 rad", math.Pi, "the principal argument of −1 is π"},
		{"arg(polar(3 V, -120 deg)) / 1 deg", -120, "the angle given, in (−180°, 180°]"},
	}
	for _, c := range reals {
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.in)
		if err != nil {
			t.Errorf("%s: %v", c.in, err)
			continue
		}
		q, ok := res.Value.(runtime.Quantity)
		if !ok || !q.D.IsZero() || math.Abs(q.V-c.want) > 4e-16*math.Abs(c.want) {
			t.Errorf("%s = %v, want %v (%s)", c.in, res.Value, c.want, c.src)
		}
	}
}

// TestImaginaryUnitShadowed: j may be assigned (a loop or node name); the
// literal 4j keeps its meaning.
func TestImaginaryUnitShadowed(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "j = 5")
	if err != nil {
		t.Fatalf("j cannot be assigned: %v", err)
	}
	if res.Note == "" {
		t.Errorf("assigning j gives no note that it hides the imaginary unit")
	}
	res, err = s.Eval(lang.Pos{Line: 1, Col: 1}, "2j + j")
	if err != nil {
		t.Fatal(err)
	}
	if z, ok := res.Value.(runtime.Complex); !ok || z.V != complex(5, 2) {
		t.Errorf("2j + j with j = 5 is %v, want 5 + 2j", res.Value)
	}
}
