package runtime_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/runtime"
)

// Dimension rules: quantities of different dimension cannot be added,
// subtracted or compared; products and quotients multiply and divide units
// ([SI] §5.4.6 on products and quotients of units, from memory). The wording
// of messages is a project convention (README.md tour: "cannot add length (m)
// and magnetic flux density (T)").

func vec(t *testing.T, x, y, z float64, unit string) runtime.Vector {
	t.Helper()
	var d runtime.Dim
	if unit != "" {
		d = unitDim(t, unit)
	}
	return runtime.Vector{V: [3]float64{x, y, z}, D: d}
}

// wantDimError checks that err is a *DimError whose message contains every
// part (each dimension in words and units).
func wantDimError(t *testing.T, what string, err error, parts ...string) {
	t.Helper()
	var de *runtime.DimError
	if !errors.As(err, &de) {
		t.Errorf("%s: error %v (%T), want *DimError", what, err, err)
		return
	}
	for _, p := range parts {
		if !strings.Contains(de.Msg, p) {
			t.Errorf("%s: message %q does not contain %q", what, de.Msg, p)
		}
	}
}

// wantEvalError checks that err is an *EvalError with the given message
// text in it.
func wantEvalError(t *testing.T, what string, err error, part string) {
	t.Helper()
	var ee *runtime.EvalError
	if !errors.As(err, &ee) {
		t.Errorf("%s: error %v (%T), want *EvalError", what, err, err)
		return
	}
	if !strings.Contains(ee.Msg, part) {
		t.Errorf("%s: message %q does not contain %q", what, ee.Msg, part)
	}
}

func wantQuantity(t *testing.T, what string, v runtime.Value, err error, want runtime.Quantity, tol float64) {
	t.Helper()
	if err != nil {
		t.Errorf("%s: %v", what, err)
		return
	}
	got, ok := v.(runtime.Quantity)
	if !ok {
		t.Errorf("%s = %#v, want a Quantity", what, v)
		return
	}
	if got.D != want.D || !scalar.EqualWithinAbsOrRel(got.V, want.V, 0, tol) {
		t.Errorf("%s = %v %v, want %v %v (rel tol %g)", what, got.V, got.D, want.V, want.D, tol)
	}
}

func wantVector(t *testing.T, what string, v runtime.Value, err error, want runtime.Vector) {
	t.Helper()
	if err != nil {
		t.Errorf("%s: %v", what, err)
		return
	}
	if got, ok := v.(runtime.Vector); !ok || got != want {
		t.Errorf("%s = %#v, want %#v", what, v, want)
	}
}

// TestAddSub checks sums and differences. Small integers and sums of
// decimals are checked with a tolerance of one rounding (2^-53 relative)
// plus one for the reference where they are not exact.
func TestAddSub(t *testing.T) {
	v, err := runtime.Add(q(t, 2, "m"), q(t, 3, "m"))
	wantQuantity(t, "2 m + 3 m", v, err, q(t, 5, "m"), 0) // exact: small integers
	v, err = runtime.Sub(q(t, 2, "m"), q(t, 3, "m"))
	wantQuantity(t, "2 m - 3 m", v, err, q(t, -1, "m"), 0)
	v, err = runtime.Add(q(t, 0.1, "T"), q(t, 0.2, "T"))
	wantQuantity(t, "0.1 T + 0.2 T", v, err, q(t, 0.3, "T"), 2*unitRoundoff) // one rounding in the sum, one in 0.3
	v, err = runtime.Add(2.0, runtime.Num(3))                                // Go float64 is a number
	wantQuantity(t, "2.0 + 3", v, err, runtime.Num(5), 0)
	v, err = runtime.Add(2, runtime.Num(3)) // Go int is a number
	wantQuantity(t, "int 2 + 3", v, err, runtime.Num(5), 0)

	_, err = runtime.Add(q(t, 2, "m"), q(t, 3, "T"))
	var de *runtime.DimError
	if !errors.As(err, &de) || de.Msg != "cannot add length (m) and magnetic flux density (T)" {
		t.Errorf("2 m + 3 T: %v, want *DimError \"cannot add length (m) and magnetic flux density (T)\" (README.md)", err)
	}
	_, err = runtime.Sub(q(t, 2, "Wb"), q(t, 3, "V"))
	wantDimError(t, "2 Wb - 3 V", err, "subtract", "magnetic flux (Wb)", "voltage (V)")
	_, err = runtime.Add(q(t, 2, "m"), runtime.Num(1))
	wantDimError(t, "2 m + 1", err, "length (m)", "dimensionless")
	_, err = runtime.Add(q(t, 2, "m"), vec(t, 1, 2, 3, "m"))
	wantDimError(t, "2 m + vector", err, "length (m)", "vector")
	_, err = runtime.Add(true, runtime.Num(1))
	wantDimError(t, "true + 1", err, "true/false")
}

// TestOverflowIsAnError checks that results beyond float64 (max about
// 1.797e308, IEEE 754 binary64) are errors, not infinities shown to the
// user.
func TestOverflowIsAnError(t *testing.T) {
	big := q(t, 1e308, "m")
	_, err := runtime.Add(big, big)
	wantEvalError(t, "1e308 m + 1e308 m", err, "infinity")
	_, err = runtime.Mul(big, big)
	wantEvalError(t, "1e308 m * 1e308 m", err, "infinity")
	_, err = runtime.Div(big, q(t, 1e-10, "s"))
	wantEvalError(t, "1e308 m / 1e-10 s", err, "infinity")
	_, err = runtime.Pow(runtime.Num(10), runtime.Num(400))
	wantEvalError(t, "10^400", err, "infinity")

	// Vectors follow the same rule as quantities.
	bigVec := vec(t, 1e308, 0, 0, "m")
	if v, err := runtime.Mul(bigVec, runtime.Num(10)); !isEvalError(err) {
		t.Errorf("[1e308, 0, 0] m * 10 = %v, %v; want *EvalError (overflow, like quantities)", v, err)
	}
	if v, err := runtime.Add(bigVec, bigVec); !isEvalError(err) {
		t.Errorf("[1e308, 0, 0] m + itself = %v, %v; want *EvalError (overflow, like quantities)", v, err)
	}
	if v, err := runtime.Div(bigVec, q(t, 1e-10, "s")); !isEvalError(err) {
		t.Errorf("[1e308, 0, 0] m / 1e-10 s = %v, %v; want *EvalError (overflow, like quantities)", v, err)
	}
}

func isEvalError(err error) bool {
	var ee *runtime.EvalError
	return errors.As(err, &ee)
}

// TestMulDiv checks products and quotients: values and dimensions.
func TestMulDiv(t *testing.T) {
	tests := []struct {
		name string
		op   func(a, b runtime.Value) (runtime.Value, error)
		a, b runtime.Quantity
		want runtime.Quantity
		tol  float64
		src  string
	}{
		// [SI] Table 4: Wb = V s, T = Wb/m^2, H = Wb/A, W = V A, Ω = V/A, C = A s.
		{"2 V * 3 s", runtime.Mul, q(t, 2, "V"), q(t, 3, "s"), q(t, 6, "Wb"), 0, "[SI] Table 4 Wb = V s"},
		{"6 Wb / 3 m^2", runtime.Div, q(t, 6, "Wb"), q(t, 3, "m^2"), q(t, 2, "T"), 0, "[SI] Table 4 T = Wb/m^2"},
		{"6 Wb / 2 A", runtime.Div, q(t, 6, "Wb"), q(t, 2, "A"), q(t, 3, "H"), 0, "[SI] Table 4 H = Wb/A"},
		{"230 V * 2 A", runtime.Mul, q(t, 230, "V"), q(t, 2, "A"), q(t, 460, "W"), 0, "[SI] Table 4 W = V A"},
		{"12 V / 4 A", runtime.Div, q(t, 12, "V"), q(t, 4, "A"), q(t, 3, "ohm"), 0, "[SI] Table 4 Ω = V/A"},
		{"2 A * 5 s", runtime.Mul, q(t, 2, "A"), q(t, 5, "s"), q(t, 10, "C"), 0, "[SI] Table 4 C = A s"},
		{"3 T * 2 m^2", runtime.Mul, q(t, 3, "T"), q(t, 2, "m^2"), q(t, 6, "Wb"), 0, "[SI] Table 4"},
		{"1 m / 1 m", runtime.Div, q(t, 1, "m"), q(t, 1, "m"), runtime.Num(1), 0, "a ratio is a number"},
		// 1/3: one correct rounding on each side (Go rounds the constant
		// 1.0/3 once; Div rounds once): tolerance 2^-53 plus one.
		{"1 V / 3 A", runtime.Div, q(t, 1, "V"), q(t, 3, "A"), q(t, 1.0/3, "ohm"), 2 * unitRoundoff, "[SI] Table 4"},
		{"2 * 3 H", runtime.Mul, runtime.Num(2), q(t, 3, "H"), q(t, 6, "H"), 0, "a number scales"},
	}
	for _, tt := range tests {
		v, err := tt.op(tt.a, tt.b)
		wantQuantity(t, tt.name+" ("+tt.src+")", v, err, tt.want, tt.tol)
	}

	// Vectors scaled by quantities.
	v, err := runtime.Mul(vec(t, 1, 2, 3, "m"), q(t, 2, "T"))
	wantVector(t, "[1,2,3] m * 2 T", v, err, vec(t, 2, 4, 6, "T*m"))
	v, err = runtime.Mul(q(t, 2, "A"), vec(t, 1, 0, -1, "m^2"))
	wantVector(t, "2 A * [1,0,-1] m^2", v, err, vec(t, 2, 0, -2, "A*m^2"))
	v, err = runtime.Div(vec(t, 2, 4, 6, "m"), q(t, 2, "s"))
	wantVector(t, "[2,4,6] m / 2 s", v, err, vec(t, 1, 2, 3, "m/s"))

	_, err = runtime.Mul(vec(t, 1, 2, 3, "m"), vec(t, 1, 2, 3, "m"))
	wantDimError(t, "vector * vector", err, "dot", "cross")
	_, err = runtime.Div(q(t, 1, "m"), vec(t, 1, 2, 3, "m"))
	wantDimError(t, "1 m / vector", err, "length (m)", "vector")
	_, err = runtime.Mul(true, q(t, 1, "m"))
	wantDimError(t, "true * 1 m", err, "true/false", "length (m)")
}

// TestDivisionByZero checks that dividing by zero is an *EvalError, for
// quantities, vectors and remainders.
func TestDivisionByZero(t *testing.T) {
	_, err := runtime.Div(q(t, 1, "V"), q(t, 0, "A"))
	wantEvalError(t, "1 V / 0 A", err, "division by zero")
	_, err = runtime.Div(vec(t, 1, 0, 0, "m"), q(t, 0, "s"))
	wantEvalError(t, "vector / 0 s", err, "division by zero")
	_, err = runtime.Div(runtime.Num(1), math.Copysign(0, -1))
	wantEvalError(t, "1 / -0", err, "division by zero")
	_, err = runtime.Mod(q(t, 1, "m"), q(t, 0, "m"))
	wantEvalError(t, "1 m % 0 m", err, "remainder by zero")
	_, err = runtime.Pow(q(t, 0, "m"), runtime.Num(-1))
	wantEvalError(t, "(0 m)^-1", err, "zero")
}

// TestPow checks powers: the exponent is a number, and a quantity with a
// unit may be raised only to a power that leaves whole exponents.
func TestPow(t *testing.T) {
	tests := []struct {
		name string
		a    runtime.Quantity
		b    float64
		want runtime.Quantity
		tol  float64
	}{
		{"(3 m)^2", q(t, 3, "m"), 2, q(t, 9, "m^2"), 0},
		{"(2 s)^-1", q(t, 2, "s"), -1, q(t, 0.5, "Hz"), 0},
		{"(4 m^2)^0.5", q(t, 4, "m^2"), 0.5, q(t, 2, "m"), 0}, // sqrt of 4 is exact (IEEE 754 requires a correctly rounded sqrt)
		{"(9 m^2*s^-4)^0.5", q(t, 9, "m^2/s^4"), 0.5, q(t, 3, "m/s^2"), 0},
		{"(5 m)^0", q(t, 5, "m"), 0, runtime.Num(1), 0},
		{"(16 m^4)^0.25", q(t, 16, "m^4"), 0.25, q(t, 2, "m"), 0}, // 16^0.25 = 2; 0.25 is exact
		// (8 m^3)^(1/3): the exponent 1/3 is off by δ ≈ 1.85e-17, which
		// moves the result by ln 8·δ ≈ 3.9e-17 relative; math.Pow adds
		// up to about 1 ulp (from memory; Go does not promise correct
		// rounding): tolerance 4·2^-53 ≈ 4.4e-16.
		{"(8 m^3)^(1/3)", q(t, 8, "m^3"), 1.0 / 3, q(t, 2, "m"), 4 * unitRoundoff},
		{"2^10", runtime.Num(2), 10, runtime.Num(1024), 0},
		{"2^0.5", runtime.Num(2), 0.5, runtime.Num(math.Sqrt2), unitRoundoff}, // one rounding each side
	}
	for _, tt := range tests {
		v, err := runtime.Pow(tt.a, runtime.Num(tt.b))
		wantQuantity(t, tt.name, v, err, tt.want, tt.tol)
	}

	_, err := runtime.Pow(q(t, 2, "m"), runtime.Num(0.5))
	wantDimError(t, "(2 m)^0.5", err, "length (m)", "0.5", "fractional")
	_, err = runtime.Pow(q(t, 2, "T"), runtime.Num(1.5))
	wantDimError(t, "(2 T)^1.5", err, "magnetic flux density (T)", "1.5")
	_, err = runtime.Pow(q(t, 2, "m"), q(t, 2, "m"))
	wantDimError(t, "(2 m)^(2 m)", err, "dimensionless", "length (m)")
	_, err = runtime.Pow(q(t, 2, "m"), runtime.Num(128))
	wantDimError(t, "(2 m)^128", err) // m^128 cannot be held (int8 exponents)
	_, err = runtime.Pow(vec(t, 1, 2, 3, "m"), runtime.Num(2))
	wantDimError(t, "vector^2", err, "vector")
	_, err = runtime.Pow(runtime.Num(-8), runtime.Num(1.0/3))
	wantEvalError(t, "(-8)^(1/3)", err, "NaN")
}

// TestDimensionOverflow checks that a product whose exponents leave the
// range a Dim can hold (int8) is an error rather than a wrapped dimension:
// m^100 · m^100 = m^200.
func TestDimensionOverflow(t *testing.T) {
	m100, err := runtime.Pow(q(t, 1, "m"), runtime.Num(100))
	if err != nil {
		t.Fatalf("(1 m)^100: %v", err)
	}
	v, err := runtime.Mul(m100, m100)
	var de *runtime.DimError
	var ee *runtime.EvalError
	if !errors.As(err, &de) && !errors.As(err, &ee) {
		t.Errorf("m^100 * m^100 = %v, %v; want *DimError or *EvalError (m^200 does not fit)", v, err)
	}
	v, err = runtime.Div(runtime.Num(1), m100)
	wantQuantity(t, "1 / m^100", v, err, runtime.Quantity{V: 1, D: runtime.Dim{-100, 0, 0, 0, 0, 0, 0}}, 0)
	if err == nil {
		v, err = runtime.Div(v, m100)
		if !errors.As(err, &de) && !errors.As(err, &ee) {
			t.Errorf("m^-100 / m^100 = %v, %v; want *DimError or *EvalError (m^-200 does not fit)", v, err)
		}
	}
}

// TestNeg checks negation of quantities and vectors.
func TestNeg(t *testing.T) {
	v, err := runtime.Neg(q(t, 2, "T"))
	wantQuantity(t, "-(2 T)", v, err, q(t, -2, "T"), 0)
	v, err = runtime.Neg(3.0)
	wantQuantity(t, "-(3.0)", v, err, runtime.Num(-3), 0)
	v, err = runtime.Neg(vec(t, 1, -2, 3, "A/m"))
	wantVector(t, "-[1,-2,3] A/m", v, err, vec(t, -1, 2, -3, "A/m"))
	_, err = runtime.Neg(true)
	wantDimError(t, "-true", err, "true/false")
}

// TestMod checks the remainder. Its sign follows the dividend, as in C's
// fmod and Go's math.Mod (Go documentation of math.Mod, from memory).
func TestMod(t *testing.T) {
	v, err := runtime.Mod(q(t, 7, "m"), q(t, 3, "m"))
	wantQuantity(t, "7 m % 3 m", v, err, q(t, 1, "m"), 0)
	v, err = runtime.Mod(q(t, -7, "m"), q(t, 3, "m"))
	wantQuantity(t, "-7 m % 3 m", v, err, q(t, -1, "m"), 0)
	v, err = runtime.Mod(q(t, 370, "s"), q(t, 60, "s"))
	wantQuantity(t, "370 s % 60 s", v, err, q(t, 10, "s"), 0)
	_, err = runtime.Mod(q(t, 7, "m"), q(t, 3, "s"))
	wantDimError(t, "7 m % 3 s", err, "length (m)", "time (s)")
	_, err = runtime.Mod(vec(t, 1, 2, 3, "m"), q(t, 3, "m"))
	wantDimError(t, "vector % 3 m", err, "vector")
}

// TestCompare checks comparisons: the six operators on quantities of one
// dimension, == and != on vectors and true/false values, and errors.
func TestCompare(t *testing.T) {
	one, two := q(t, 1, "T"), q(t, 2, "T")
	for _, tt := range []struct {
		op   string
		a, b runtime.Quantity
		want bool
	}{
		{"==", one, one, true}, {"==", one, two, false},
		{"!=", one, two, true}, {"!=", one, one, false},
		{"<", one, two, true}, {"<", two, one, false}, {"<", one, one, false},
		{"<=", one, one, true}, {"<=", two, one, false},
		{">", two, one, true}, {">", one, one, false},
		{">=", one, one, true}, {">=", one, two, false},
	} {
		got, err := runtime.Compare(tt.op, tt.a, tt.b)
		if err != nil || got != tt.want {
			t.Errorf("%v %s %v = %v, %v; want %v", tt.a.V, tt.op, tt.b.V, got, err, tt.want)
		}
	}

	// 1 m == 100 cm exactly: the literal 100 cm is built from "100e-2"
	// ([SI] Table 7 centi), so it is exactly 1.
	cm, err := runtime.LiteralValue("100", mustParse(t, "cm"))
	if err != nil {
		t.Fatal(err)
	}
	if got, err := runtime.Compare("==", q(t, 1, "m"), q(t, cm, "m")); err != nil || got != true {
		t.Errorf("1 m == 100 cm: %v, %v; want true", got, err)
	}

	a, b := vec(t, 1, 2, 3, "m"), vec(t, 1, 2, 4, "m")
	for _, tt := range []struct {
		op   string
		x, y runtime.Vector
		want bool
	}{
		{"==", a, a, true}, {"==", a, b, false}, {"!=", a, b, true}, {"!=", a, a, false},
	} {
		got, err := runtime.Compare(tt.op, tt.x, tt.y)
		if err != nil || got != tt.want {
			t.Errorf("vector %s vector = %v, %v; want %v", tt.op, got, err, tt.want)
		}
	}
	if got, err := runtime.Compare("==", true, true); err != nil || got != true {
		t.Errorf("true == true: %v, %v", got, err)
	}
	if got, err := runtime.Compare("!=", true, false); err != nil || got != true {
		t.Errorf("true != false: %v, %v", got, err)
	}

	_, err = runtime.Compare("<", q(t, 1, "m"), q(t, 1, "T"))
	wantDimError(t, "1 m < 1 T", err, "length (m)", "magnetic flux density (T)")
	_, err = runtime.Compare("==", a, vec(t, 1, 2, 3, "T"))
	wantDimError(t, "vector m == vector T", err, "length (m)", "magnetic flux density (T)")
	_, err = runtime.Compare("<", a, b)
	wantDimError(t, "vector < vector", err, "<")
	_, err = runtime.Compare("<", true, false)
	wantDimError(t, "true < false", err, "<")
	_, err = runtime.Compare("==", q(t, 1, "m"), true)
	wantDimError(t, "1 m == true", err, "length (m)", "true/false")
}

// TestMakeVector checks building vectors from three quantities.
func TestMakeVector(t *testing.T) {
	v, err := runtime.MakeVector([]runtime.Value{q(t, 0, "m"), q(t, 0, "m"), q(t, 0.005, "m")})
	wantVector(t, "[0, 0, 5 mm]", v, err, vec(t, 0, 0, 0.005, "m"))
	v, err = runtime.MakeVector([]runtime.Value{1.0, 2, runtime.Num(3)})
	wantVector(t, "[1.0, 2, 3]", v, err, vec(t, 1, 2, 3, ""))

	_, err = runtime.MakeVector([]runtime.Value{q(t, 1, "m"), q(t, 2, "m")})
	wantEvalError(t, "two components", err, "got 2")
	_, err = runtime.MakeVector([]runtime.Value{q(t, 1, "m"), q(t, 2, "m"), q(t, 3, "m"), q(t, 4, "m")})
	wantEvalError(t, "four components", err, "got 4")
	_, err = runtime.MakeVector([]runtime.Value{q(t, 1, "m"), q(t, 2, "m"), q(t, 3, "T")})
	wantDimError(t, "[1 m, 2 m, 3 T]", err, "length (m)", "magnetic flux density (T)", "component 3")
	_, err = runtime.MakeVector([]runtime.Value{q(t, 1, "m"), vec(t, 1, 2, 3, "m"), q(t, 3, "m")})
	wantDimError(t, "vector inside a vector", err, "component 2")
}

// TestVectorAddSub checks sums of vectors and their dimension rule.
func TestVectorAddSub(t *testing.T) {
	v, err := runtime.Add(vec(t, 1, 2, 3, "m"), vec(t, 10, 20, 30, "m"))
	wantVector(t, "vector + vector", v, err, vec(t, 11, 22, 33, "m"))
	v, err = runtime.Sub(vec(t, 1, 2, 3, "T"), vec(t, 1, 1, 1, "T"))
	wantVector(t, "vector - vector", v, err, vec(t, 0, 1, 2, "T"))
	_, err = runtime.Add(vec(t, 1, 2, 3, "m"), vec(t, 1, 2, 3, "T"))
	wantDimError(t, "vector m + vector T", err, "length (m)", "magnetic flux density (T)")
	_, err = runtime.Sub(vec(t, 1, 2, 3, "m"), q(t, 1, "m"))
	wantDimError(t, "vector - 1 m", err, "vector", "length (m)")
}

// TestComponent checks .x, .y, .z.
func TestComponent(t *testing.T) {
	a := vec(t, 1, 2, 3, "A/m")
	for i, want := range []float64{1, 2, 3} {
		v, err := runtime.Component(a, i)
		wantQuantity(t, "component", v, err, q(t, want, "A/m"), 0)
	}
	_, err := runtime.Component(q(t, 1, "m"), 0)
	wantDimError(t, "(1 m).x", err, "length (m)")
}

// TestVectorPlainZero: a plain zero component takes the dimension of the
// others (project convention: 0 is 0 in any unit), any other mismatch is an
// error.
func TestVectorPlainZero(t *testing.T) {
	m := runtime.Quantity{V: 2, D: runtime.Dim{1}}
	v, err := runtime.MakeVector([]runtime.Value{runtime.Num(0), m, runtime.Num(0)})
	if err != nil || v.(runtime.Vector).D != m.D || v.(runtime.Vector).V != [3]float64{0, 2, 0} {
		t.Errorf("[0, 2 m, 0] = %v, %v; want [0, 2, 0] m", v, err)
	}
	if _, err := runtime.MakeVector([]runtime.Value{runtime.Num(1), m, runtime.Num(0)}); err == nil {
		t.Error("[1, 2 m, 0] accepted; a non-zero plain number does not fit a length")
	}
	z, err := runtime.MakeVector([]runtime.Value{runtime.Num(0), runtime.Num(0), runtime.Num(0)})
	if err != nil || !z.(runtime.Vector).D.IsZero() {
		t.Errorf("[0, 0, 0] = %v, %v; want a dimensionless zero vector", z, err)
	}
}
