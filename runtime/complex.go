package runtime

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
)

// Complex is a complex quantity: a phasor, an impedance, a complex power.
// Its real and imaginary parts are in coherent SI units and share the
// dimension D. A phasor holds the PEAK amplitude of its sinusoid: the
// phasor A·e^{jφ} stands for A·cos(ωt + φ), and the average power of a
// voltage and current phasor pair is ½·Re(V·I*).
type Complex struct {
	V complex128
	D Dim
}

// Cplx makes a complex quantity from its parts.
func Cplx(re, im float64, d Dim) Complex { return Complex{V: complex(re, im), D: d} }

// AsComplex reads a real quantity or a complex one as a complex quantity.
func AsComplex(v Value) (Complex, bool) {
	switch x := normalize(v).(type) {
	case Quantity:
		return Complex{V: complex(x.V, 0), D: x.D}, true
	case Complex:
		return x, true
	}
	return Complex{}, false
}

// isComplex reports whether either value is complex.
func isComplex(a, b Value) bool {
	_, ca := a.(Complex)
	_, cb := b.(Complex)
	return ca || cb
}

// Abs is the magnitude |z| as a real quantity.
func (z Complex) Abs() Quantity { return Quantity{V: cmplx.Abs(z.V), D: z.D} }

func checkFiniteC(z Complex, what string) (Value, error) {
	if cmplx.IsNaN(z.V) {
		return nil, evalErr("%s is not a number (NaN)", what)
	}
	if cmplx.IsInf(z.V) {
		return nil, evalErr("%s overflows to infinity", what)
	}
	return z, nil
}

// complexArith is +, -, * and / when at least one side is complex.
func complexArith(op string, a, b Value) (Value, error) {
	x, okA := AsComplex(a)
	y, okB := AsComplex(b)
	if !okA || !okB {
		if _, ok := a.(Vector); ok {
			return nil, dimErr("a vector cannot be combined with a complex value: vectors have real components")
		}
		if _, ok := b.(Vector); ok {
			return nil, dimErr("a vector cannot be combined with a complex value: vectors have real components")
		}
		return nil, dimErr("cannot combine %s and %s with %s", TypeName(a), TypeName(b), op)
	}
	switch op {
	case "+", "-":
		if x.D != y.D {
			verb := "add"
			if op == "-" {
				verb = "subtract"
			}
			return nil, dimErr("cannot %s %s and %s%s", verb, x.D.Describe(), y.D.Describe(), angleNote(x.D, y.D))
		}
		if op == "+" {
			return checkFiniteC(Complex{V: x.V + y.V, D: x.D}, "the result of +")
		}
		return checkFiniteC(Complex{V: x.V - y.V, D: x.D}, "the result of -")
	case "*":
		d, ok := x.D.Combine(1, y.D, 1)
		if !ok {
			return nil, dimErr("%s", errExpRange)
		}
		return checkFiniteC(Complex{V: x.V * y.V, D: d}, "the product")
	case "/":
		if y.V == 0 {
			return nil, evalErr("division by zero")
		}
		d, ok := x.D.Combine(1, y.D, -1)
		if !ok {
			return nil, dimErr("%s", errExpRange)
		}
		return checkFiniteC(Complex{V: x.V / y.V, D: d}, "the quotient")
	}
	return nil, dimErr("the operator %s is not defined for complex values", op)
}

// complexPow is a ^ b when a or b is complex. A complex value with a unit
// may be raised to a real power that keeps the unit's exponents whole;
// a complex exponent needs a dimensionless base and exponent. Whole
// powers are formed by repeated multiplication, so (3+4j)^2 is exactly
// -7+24j.
func complexPow(a, b Value) (Value, error) {
	x, okA := AsComplex(a)
	y, okB := AsComplex(b)
	if !okA || !okB {
		return nil, dimErr("cannot raise %s to %s", TypeName(a), TypeName(b))
	}
	if !y.D.IsZero() {
		return nil, dimErr("an exponent must be dimensionless, not %s", y.D.Describe())
	}
	if imag(y.V) != 0 {
		if !x.D.IsZero() {
			return nil, dimErr("a complex exponent needs a dimensionless base, not %s", x.D.Describe())
		}
		if x.V == 0 {
			return nil, evalErr("zero raised to a complex power is not defined")
		}
		return checkFiniteC(Complex{V: cmplx.Pow(x.V, y.V)}, "the power")
	}
	p := real(y.V)
	d, err := powDim(x.D, p)
	if err != nil {
		return nil, err
	}
	if x.V == 0 && p < 0 {
		return nil, evalErr("zero raised to a negative power (division by zero)")
	}
	if n := math.Round(p); n == p && math.Abs(n) <= 1<<20 {
		return checkFiniteC(Complex{V: intPow(x.V, int(n)), D: d}, "the power")
	}
	return checkFiniteC(Complex{V: cmplx.Pow(x.V, complex(p, 0)), D: d}, "the power")
}

// intPow is z^n by binary powering.
func intPow(z complex128, n int) complex128 {
	if n < 0 {
		return 1 / intPow(z, -n)
	}
	r := complex(1, 0)
	for n > 0 {
		if n&1 == 1 {
			r *= z
		}
		z *= z
		n >>= 1
	}
	return r
}

// powDim is the dimension of a quantity of dimension d raised to p: every
// exponent must stay whole.
func powDim(d Dim, p float64) (Dim, error) {
	var out Dim
	if d.IsZero() {
		return out, nil
	}
	for i, e := range d {
		q := float64(e) * p
		r := math.Round(q)
		if math.Abs(q-r) > 1e-9 {
			return out, dimErr("cannot raise %s to the power %s: the unit would need a fractional exponent", d.Describe(), FormatNumber(p, 6))
		}
		if math.Abs(r) > maxExp {
			return out, dimErr("cannot raise %s to the power %s: %s", d.Describe(), FormatNumber(p, 6), errExpRange)
		}
		out[i] = int8(r)
	}
	return out, nil
}

// compareComplex is == and != with a complex side; complex values have
// no order.
func compareComplex(op string, a, b Value) (Value, error) {
	x, okA := AsComplex(a)
	y, okB := AsComplex(b)
	if !okA || !okB {
		return nil, dimErr("cannot compare %s with %s using %s", TypeName(a), TypeName(b), op)
	}
	if op != "==" && op != "!=" {
		return nil, dimErr("complex values have no order, so %s cannot compare them; compare abs(z), re(z) or im(z)", op)
	}
	if x.D != y.D {
		return nil, dimErr("cannot compare %s with %s%s", x.D.Describe(), y.D.Describe(), angleNote(x.D, y.D))
	}
	return (x.V == y.V) == (op == "=="), nil
}

// complexNoise is the relative size below which one part of a complex
// value is shown as 0: as for vector components, it is far below the
// accuracy of any method here, so it is rounding, not information.
const complexNoise = 1e-13

// cleanParts returns the parts of z with a part below complexNoise of the
// other set to zero.
func cleanParts(z complex128) (re, im float64) {
	re, im = real(z), imag(z)
	big := math.Max(math.Abs(re), math.Abs(im))
	if math.Abs(re) < complexNoise*big {
		re = 0
	}
	if math.Abs(im) < complexNoise*big {
		im = 0
	}
	return re, im
}

// rectText writes re + im·j with digits significant digits, the smaller
// part rounded at the same place as the larger ("3 + 4j", "1 - 0.002j").
func rectText(re, im float64, digits int) string {
	big := math.Max(math.Abs(re), math.Abs(im))
	if big > 0 {
		// round both at the last shown digit of the larger part
		q := math.Pow10(int(math.Floor(math.Log10(big))) - digits + 1)
		if math.Abs(re) < big && q > 0 && !math.IsInf(q, 0) {
			re = math.Round(re/q) * q
		}
		if math.Abs(im) < big && q > 0 && !math.IsInf(q, 0) {
			im = math.Round(im/q) * q
		}
	}
	sign := "+"
	if im < 0 || (im == 0 && math.Signbit(im)) {
		sign, im = "-", -im
	}
	return FormatNumber(re, digits) + " " + sign + " " + FormatNumber(im, digits) + "j"
}

// formatComplex shows z in rectangular form in the best SI prefix of its
// unit, chosen for its larger part: "(3 + 4j) Ω", "0.5 - 0.25j".
func formatComplex(z Complex, digits int) string {
	re, im := cleanParts(z.V)
	if z.D.IsZero() {
		return rectText(re, im, digits)
	}
	ds := displayOf(z.D)
	if ds.atom == "" {
		return "(" + rectText(re, im, digits) + ") " + ds.composite
	}
	big := math.Max(math.Abs(re), math.Abs(im)) / ds.scale
	k := ds.chooseK(big, digits)
	s := ds.scale * math.Pow10(3*k*ds.power)
	return "(" + rectText(re/s, im/s, digits) + ") " + ds.unitText(engPrefix[k])
}

// polarText shows z as polar(magnitude, angle in deg), which reads back
// as the same value: the magnitude in unit (best prefix when unit is "").
func polarText(z Complex, unit string, digits int) (string, error) {
	mag := z.Abs()
	ang := 0.0
	if z.V != 0 {
		re, im := cleanParts(z.V)
		ang = math.Atan2(im, re) * 180 / math.Pi
	}
	m := formatQuantity(mag, digits)
	if unit != "" {
		t, err := FormatIn(mag, unit, digits)
		if err != nil {
			return "", err
		}
		m = t
	}
	return "polar(" + m + ", " + FormatNumber(RoundAngle(ang, digits), digits) + " deg)", nil
}

// RoundAngle rounds an angle in degrees (|a| ≤ 180) at the place of the
// digits-th significant digit of 100°, so that rounding noise in a phase
// near 0 (1e-12°, from a solver's last bits) shows as 0 rather than as a
// number of full precision.
func RoundAngle(a float64, digits int) float64 {
	q := math.Pow10(3 - digits)
	r := math.Round(a/q) * q
	switch {
	case r == 0:
		return 0 // no "-0"
	case r <= -180:
		return 180 // the angle range is (-180°, 180°]
	}
	return r
}

// splitPolar separates a trailing word "polar" from an "as" unit text:
// "mV polar" → ("mV", true); "polar" → ("", true).
func splitPolar(unit string) (string, bool) {
	u := strings.TrimSpace(unit)
	if u == "polar" {
		return "", true
	}
	if rest, ok := strings.CutSuffix(u, " polar"); ok {
		return strings.TrimSpace(rest), true
	}
	return u, false
}

// formatComplexIn shows z in the given unit (rectangular), or in polar
// form when polar is set.
func formatComplexIn(z Complex, unit string, polar bool, digits int) (string, error) {
	if polar {
		return polarText(z, unit, digits)
	}
	if unit == "" {
		return formatComplex(z, digits), nil
	}
	u, err := ParseUnit(unit)
	if err != nil {
		return "", err
	}
	if z.D != u.Dim {
		return "", &DimError{Msg: fmt.Sprintf("cannot show a complex %s in %s, which measures %s%s", z.D.Describe(), unit, u.Dim.Describe(), angleNote(z.D, u.Dim))}
	}
	if u.Offset != 0 {
		return "", &DimError{Msg: fmt.Sprintf("a complex value cannot be shown in %s, which has an offset; use K", unit)}
	}
	re, im := cleanParts(z.V)
	return "(" + rectText(re/u.Scale(), im/u.Scale(), digits) + ") " + unit, nil
}

// parseComplexRecorded reads a recorded complex result: "a + bj",
// "(a + bj) unit" or "polar(m unit, d deg)". It returns the value and the
// display form to show the value now in ("unit", "unit polar").
func parseComplexRecorded(text string) (Complex, string, bool) {
	text = strings.TrimSpace(text)
	if inner, ok := strings.CutPrefix(text, "polar("); ok {
		inner, ok = strings.CutSuffix(inner, ")")
		if !ok {
			return Complex{}, "", false
		}
		magText, angText, ok := strings.Cut(inner, ",")
		if !ok {
			return Complex{}, "", false
		}
		mv, unit, ok := parseRecorded(magText)
		if !ok {
			return Complex{}, "", false
		}
		mag, ok := mv.(Quantity)
		if !ok {
			return Complex{}, "", false
		}
		num, deg, _ := strings.Cut(strings.TrimSpace(angText), " ")
		a, err := strconv.ParseFloat(num, 64)
		if err != nil || strings.TrimSpace(deg) != "deg" {
			return Complex{}, "", false
		}
		form := "polar"
		if unit != "" {
			form = unit + " polar"
		}
		return Complex{V: cmplx.Rect(mag.V, a*math.Pi/180), D: mag.D}, form, true
	}
	body, unit := text, ""
	if strings.HasPrefix(text, "(") {
		end := strings.Index(text, ")")
		if end < 0 {
			return Complex{}, "", false
		}
		body, unit = text[1:end], strings.TrimSpace(text[end+1:])
	}
	// body is "a + bj" or "a - bj"
	i := strings.LastIndex(body, " + ")
	sign := 1.0
	if j := strings.LastIndex(body, " - "); j > i {
		i, sign = j, -1
	}
	if i < 0 || !strings.HasSuffix(body, "j") {
		return Complex{}, "", false
	}
	re, err1 := strconv.ParseFloat(strings.TrimSpace(body[:i]), 64)
	im, err2 := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(body[i+3:], "j")), 64)
	if err1 != nil || err2 != nil {
		return Complex{}, "", false
	}
	scale, d := 1.0, Dimensionless
	if unit != "" {
		u, err := ParseUnit(unit)
		if err != nil || u.Offset != 0 {
			return Complex{}, "", false
		}
		scale, d = u.Scale(), u.Dim
	}
	return Complex{V: complex(re*scale, sign*im*scale), D: d}, unit, true
}
