package runtime

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"
)

// CVector is a vector of three complex components sharing one dimension:
// the phasor of a field (B, A, E) at a frequency, peak like the currents
// it comes from. It is written [1 + 2j, 0, 3j] T and built by a vector
// literal with a complex component.
type CVector struct {
	V [3]complex128
	D Dim
}

// Norm is the length √(Σ|cᵢ|²), a real quantity: for a field phasor, the
// peak of |F(t)| summed over a cycle is not this, but √(½Σ|cᵢ|²) is the rms
// of the field's magnitude.
func (v CVector) Norm() Quantity {
	s := 0.0
	for _, c := range v.V {
		a := cmplx.Abs(c)
		s += a * a
	}
	return Quantity{V: math.Sqrt(s), D: v.D}
}

// asCVector reads a real or complex vector as a complex one.
func asCVector(v Value) (CVector, bool) {
	switch x := v.(type) {
	case Vector:
		return CVector{V: [3]complex128{complex(x.V[0], 0), complex(x.V[1], 0), complex(x.V[2], 0)}, D: x.D}, true
	case CVector:
		return x, true
	}
	return CVector{}, false
}

func isCVector(v Value) bool { _, ok := v.(CVector); return ok }

func checkFiniteCV(v CVector) (Value, error) {
	for _, c := range v.V {
		if _, err := checkFiniteC(Complex{V: c}, "a component of the vector"); err != nil {
			return nil, err
		}
	}
	return v, nil
}

// cvectorArith is +, -, * and / when a complex vector is involved, or a
// complex scalar meets a real vector.
func cvectorArith(op string, a, b Value) (Value, error) {
	va, aVec := asCVector(a)
	vb, bVec := asCVector(b)
	switch {
	case aVec && bVec && (op == "+" || op == "-"):
		if va.D != vb.D {
			return nil, dimErr("cannot %s vectors of %s and of %s", map[string]string{"+": "add", "-": "subtract"}[op], va.D.Describe(), vb.D.Describe())
		}
		var out CVector
		out.D = va.D
		for i := range 3 {
			if op == "+" {
				out.V[i] = va.V[i] + vb.V[i]
			} else {
				out.V[i] = va.V[i] - vb.V[i]
			}
		}
		return checkFiniteCV(out)
	case aVec && bVec && op == "*":
		return nil, dimErr("cannot multiply two vectors with *; use dot(a, b) or cross(a, b)")
	case aVec && bVec:
		return nil, dimErr("cannot divide a vector by a vector")
	}
	if op == "+" || op == "-" {
		return nil, dimErr("cannot %s %s and %s", map[string]string{"+": "add", "-": "subtract"}[op], sumTerm(a), sumTerm(b))
	}
	// a vector and a scalar
	vec, sc, vecFirst := va, b, true
	if !aVec {
		vec, sc, vecFirst = vb, a, false
	}
	z, ok := AsComplex(sc)
	if !ok {
		return nil, dimErr("cannot combine %s and %s with %s", TypeName(a), TypeName(b), op)
	}
	if op == "/" && !vecFirst {
		return nil, dimErr("cannot divide by a vector")
	}
	var d Dim
	var okD bool
	if op == "*" {
		d, okD = vec.D.Combine(1, z.D, 1)
	} else {
		if z.V == 0 {
			return nil, evalErr("division by zero")
		}
		d, okD = vec.D.Combine(1, z.D, -1)
	}
	if !okD {
		return nil, dimErr("%s", errExpRange)
	}
	out := CVector{D: d}
	for i, c := range vec.V {
		if op == "*" {
			out.V[i] = c * z.V
		} else {
			out.V[i] = c / z.V
		}
	}
	return checkFiniteCV(out)
}

// formatCVector writes [a + bj, c + dj, e + fj] unit: one unit and prefix
// for all components, chosen for the largest part; parts below
// complexNoise of it are shown as 0.
func formatCVector(v CVector, digits int) string {
	big := 0.0
	for _, c := range v.V {
		big = math.Max(big, math.Max(math.Abs(real(c)), math.Abs(imag(c))))
	}
	scale, unit := 1.0, ""
	if !v.D.IsZero() {
		ds := displayOf(v.D)
		if ds.atom == "" {
			unit = ds.composite
		} else {
			k := ds.chooseK(big/ds.scale, digits)
			scale = ds.scale * math.Pow10(3*k*ds.power)
			unit = ds.unitText(engPrefix[k])
		}
	}
	return cvectorText(v, scale, unit, big, digits)
}

func cvectorText(v CVector, scale float64, unit string, big float64, digits int) string {
	parts := make([]string, 3)
	for i, c := range v.V {
		re, im := real(c), imag(c)
		if math.Abs(re) < complexNoise*big {
			re = 0
		}
		if math.Abs(im) < complexNoise*big {
			im = 0
		}
		// every part rounded at the last digit of the largest
		if big > 0 {
			q := math.Pow10(int(math.Floor(math.Log10(big/scale))) - digits + 1)
			if q > 0 && !math.IsInf(q, 0) {
				re = math.Round(re/scale/q) * q * scale
				im = math.Round(im/scale/q) * q * scale
			}
		}
		parts[i] = rectText(re/scale, im/scale, digits)
	}
	s := "[" + strings.Join(parts, ", ") + "]"
	if unit != "" {
		s += " " + unit
	}
	return s
}

// formatCVectorIn shows v in the given unit.
func formatCVectorIn(v CVector, unit string, digits int) (string, error) {
	u, err := ParseUnit(unit)
	if err != nil {
		return "", err
	}
	if v.D != u.Dim {
		return "", &DimError{Msg: fmt.Sprintf("cannot show a complex vector of %s in %s, which measures %s%s", v.D.Describe(), unit, u.Dim.Describe(), angleNote(v.D, u.Dim))}
	}
	if u.Offset != 0 {
		return "", &DimError{Msg: fmt.Sprintf("a vector cannot be shown in %s, which has an offset; use K", unit)}
	}
	big := 0.0
	for _, c := range v.V {
		big = math.Max(big, math.Max(math.Abs(real(c)), math.Abs(imag(c))))
	}
	return cvectorText(v, u.Scale(), unit, big, digits), nil
}

// parseCVectorRecorded reads "[a + bj, c + dj, e + fj] unit".
func parseCVectorRecorded(text string) (CVector, string, bool) {
	text = strings.TrimSpace(text)
	if !strings.HasPrefix(text, "[") || !strings.Contains(text, "j") {
		return CVector{}, "", false
	}
	end := strings.Index(text, "]")
	if end < 0 {
		return CVector{}, "", false
	}
	parts := strings.Split(text[1:end], ",")
	if len(parts) != 3 {
		return CVector{}, "", false
	}
	unit := strings.TrimSpace(text[end+1:])
	var v CVector
	for i, p := range parts {
		z, u, ok := parseComplexRecorded(p)
		if !ok || u != "" {
			return CVector{}, "", false
		}
		v.V[i] = z.V
	}
	if unit != "" {
		u, err := ParseUnit(unit)
		if err != nil || u.Offset != 0 {
			return CVector{}, "", false
		}
		v.D = u.Dim
		for i := range v.V {
			v.V[i] *= complex(u.Scale(), 0)
		}
	}
	return v, unit, true
}
