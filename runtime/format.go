package runtime

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
)

// DefaultDigits is the number of significant digits shown by default.
const DefaultDigits = 6

// RecordDigits is the number of significant digits written into scripts as
// recorded results: enough that a replay check at a relative tolerance of
// 1e-9 is not defeated by the rounding of the recorded text (half a unit in
// the 12th digit is at most 5e-12 relative).
const RecordDigits = 12

// display describes how a dimension is shown: the first atom may take an SI
// prefix (scaled by its power), the rest is appended as written.
type display struct {
	atom      string  // "T", "g", "m", or "" for a composite shown without prefix
	power     int     // power of the atom
	rest      string  // e.g. "/s", "*m^2"
	scale     float64 // SI size of the unprefixed atom (1e-3 for g)
	kmin      int     // lowest engineering prefix step (-5 = femto)
	kmax      int     // highest (4 = tera)
	composite string  // full text when atom == ""
}

// named units that dimensions are shown in, most preferred first.
var displayNamed = []struct {
	sym        string
	kmin, kmax int
}{
	{"T", -5, 4}, {"Wb", -5, 4}, {"H", -5, 4}, {"V", -5, 4}, {"A", -5, 4}, {"Ω", -5, 4},
	{"W", -5, 4}, {"J", -5, 4}, {"N", -5, 4}, {"C", -5, 4}, {"F", -5, 4}, {"S", -5, 4},
	{"Pa", -5, 4},
	{"m", -5, 1}, {"s", -5, 0}, {"g", -5, 2}, {"K", -5, 0}, {"mol", -5, 1}, {"cd", -5, 1},
}

// notInComposites are named units shown only for their own dimension: a
// power density is W/m^3, not Pa/s. The hertz is not in displayNamed at
// all: it is for periodic phenomena (SI Brochure, 9th ed., Table 4, note),
// so s^-1 is shown in Hz only for a quantity known to count cycles
// (Quantity.Cyc), and a speed is m/s, never Hz*m.
var notInComposites = map[string]bool{"Pa": true}

// hzDisplay shows a cycle frequency (Quantity.Cyc).
var hzDisplay = display{atom: "Hz", power: 1, scale: 1, kmin: -5, kmax: 4}

// rateText is how s^-1 is shown when it is not known to count cycles: a
// rate, or an angular frequency whose radian was never written. The text
// parses back as a unit.
const rateText = "s^-1"

var displayRest = []string{"m", "m^2", "m^3", "s", "s^2", "A", "K"}

// restCost ranks the simple units: a plain one before a squared or cubed one.
func restCost(r string) int {
	if i := strings.IndexByte(r, '^'); i >= 0 {
		return int(r[i+1] - '0')
	}
	return 1
}

var displayCache sync.Map // Dim -> display

func displayOf(d Dim) display {
	if ds, ok := displayCache.Load(d); ok {
		return ds.(display)
	}
	ds := findDisplay(d)
	displayCache.Store(d, ds)
	return ds
}

func findDisplay(d Dim) display {
	if d == dFreq {
		return display{composite: rateText, scale: 1}
	}
	if d[Angle] != 0 {
		return angleDisplay(d)
	}
	atomDim := func(sym string) Dim {
		u, _ := lookupAtom(sym)
		return u.Dim
	}
	mk := func(i int, power int, rest string) display {
		n := displayNamed[i]
		scale := 1.0
		if n.sym == "g" {
			scale = 1e-3
		}
		return display{atom: n.sym, power: power, rest: rest, scale: scale, kmin: n.kmin, kmax: n.kmax}
	}
	// 1. a named unit, or a single base unit to a power
	for i, n := range displayNamed {
		ad := atomDim(n.sym)
		for p := 1; p <= 3; p++ {
			if p > 1 && notInComposites[n.sym] {
				break // not Hz^2
			}
			if ad.Pow(p) == d {
				return mk(i, p, "")
			}
		}
	}
	// reluctance, 1/H, is shown as magnetic circuits write it: A/Wb (ampere
	// turns per weber), not S/s
	if d == dHenry.Pow(-1) {
		for i, n := range displayNamed {
			if n.sym == "A" {
				return mk(i, 1, "/Wb")
			}
		}
	}
	// 2. a named unit over a simple unit, or times a power of the metre:
	// the simplest such unit wins (a plain unit before a squared one), then
	// the earlier named unit (N/m rather than J/m^2, T/s rather than V/m^2)
	best, bestScore := display{}, 1<<30
	for i, n := range displayNamed {
		if notInComposites[n.sym] {
			continue
		}
		ad := atomDim(n.sym)
		for _, r := range displayRest {
			rd := mustUnit(r).Dim
			if sharesBase(ad, rd) {
				continue // "m/m^2" is "1/m"
			}
			score := 100*restCost(r) + i
			if ad.Div(rd) == d && score < bestScore {
				best, bestScore = mk(i, 1, "/"+r), score
			}
			if strings.HasPrefix(r, "m") && ad.Mul(rd) == d && score < bestScore {
				best, bestScore = mk(i, 1, "*"+r), score
			}
		}
	}
	if bestScore < 1<<30 {
		if best.atom == "g" {
			best.kmin, best.kmax = 1, 1 // kg/m^3, never Mg/m^3
		}
		return best
	}
	// 3. SI base units
	return display{composite: d.BaseUnits(), scale: 1}
}

// angleDisplay shows a dimension with a power of plane angle: rad, sr,
// rad/s, rad/s^2, or the display of the rest with the radian appended
// ("V*rad", "T*m^2/rad").
func angleDisplay(d Dim) display {
	k := int(d[Angle])
	rest := d
	rest[Angle] = 0
	switch {
	case rest.IsZero() && k == 1:
		return display{atom: "rad", power: 1, scale: 1, kmin: -2, kmax: 0}
	case rest.IsZero() && k == 2:
		return display{atom: "sr", power: 1, scale: 1, kmin: 0, kmax: 0}
	case k == 1 && rest == dTime.Pow(-1):
		return display{atom: "rad", power: 1, rest: "/s", scale: 1, kmin: -2, kmax: 0}
	case k == 1 && rest == dTime.Pow(-2):
		return display{atom: "rad", power: 1, rest: "/s^2", scale: 1, kmin: -2, kmax: 0}
	}
	if rest.IsZero() || rest == dFreq {
		return display{composite: d.BaseUnits(), scale: 1}
	}
	rd := findDisplay(rest)
	if rd.atom == "" {
		return display{composite: d.BaseUnits(), scale: 1}
	}
	switch {
	case k == 1:
		rd.rest += "*rad"
	case k > 1:
		rd.rest += "*rad^" + strconv.Itoa(k)
	case k == -1:
		rd.rest += "/rad"
	default:
		rd.rest += "/rad^" + strconv.Itoa(-k)
	}
	return rd
}

// sharesBase reports whether a base unit (a dimension with one nonzero
// exponent) also appears in r.
func sharesBase(a, r Dim) bool {
	n, idx := 0, 0
	for i, e := range a {
		if e != 0 {
			n, idx = n+1, i
		}
	}
	return n == 1 && r[idx] != 0
}

func mustUnit(s string) UnitExpr {
	u, err := ParseUnit(s)
	if err != nil {
		panic(err)
	}
	return u
}

// DisplayUnitOf returns the unprefixed unit a dimension is shown in, such as
// "T", "V/m" or "kg*m/s^3".
func DisplayUnitOf(d Dim) string {
	if d.IsZero() {
		return "1"
	}
	ds := displayOf(d)
	if ds.atom == "" {
		return ds.composite
	}
	if ds.atom == "g" {
		return ds.unitText("k") // the coherent unit of mass is the kilogram
	}
	return ds.unitText("")
}

func (ds display) unitText(prefix string) string {
	s := prefix + ds.atom
	if ds.power != 1 {
		s += "^" + strconv.Itoa(ds.power)
	}
	return s + ds.rest
}

var engPrefix = map[int]string{-5: "f", -4: "p", -3: "n", -2: "µ", -1: "m", 0: "", 1: "k", 2: "M", 3: "G", 4: "T"}

// roundSig rounds x to digits significant digits.
func roundSig(x float64, digits int) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	r, err := strconv.ParseFloat(strconv.FormatFloat(x, 'e', digits-1, 64), 64)
	if err != nil {
		return x
	}
	return r
}

// FormatNumber prints a plain number with digits significant digits.
func FormatNumber(x float64, digits int) string {
	r := roundSig(x, digits)
	if r == 0 {
		r = 0 // no "-0"
	}
	a := math.Abs(r)
	if a != 0 && (a < 1e-4 || a >= 1e9) {
		return strconv.FormatFloat(r, 'g', digits, 64)
	}
	return strconv.FormatFloat(r, 'f', -1, 64)
}

// chooseK picks the engineering prefix step for magnitude x (in the atom's
// unprefixed unit).
func (ds display) chooseK(x float64, digits int) int {
	if x == 0 || ds.atom == "" {
		return 0
	}
	a := math.Abs(roundSig(x, digits))
	k := int(math.Floor(math.Log10(a) / float64(3*ds.power)))
	// guard against log10 rounding at exact powers of ten
	if m := a / math.Pow10(3*k*ds.power); m >= math.Pow10(3*ds.power) {
		k++
	} else if m < 1 {
		k--
	}
	return max(ds.kmin, min(ds.kmax, k))
}

// Format shows a value for people: quantities in the best SI prefix of the
// unit that matches their dimension ("0.00123 T" → "1.23 mT").
func Format(v Value, digits int) string {
	switch x := v.(type) {
	case Quantity:
		return formatQuantity(x, digits)
	case Vector:
		return formatVector(x, digits)
	case Complex:
		return formatComplex(x, digits)
	case CVector:
		return formatCVector(x, digits)
	case *Func:
		if x.Body != "" {
			return x.Signature() + " = " + x.Body
		}
		return "builtin " + x.Name
	case Shower:
		return x.Show(digits)
	case bool:
		return strconv.FormatBool(x)
	case string:
		return strconv.Quote(x)
	default:
		return fmt.Sprint(v)
	}
}

func formatQuantity(q Quantity, digits int) string {
	if q.D.IsZero() {
		return FormatNumber(q.V, digits)
	}
	ds := displayOf(q.D)
	if q.Cyc && q.D == dFreq {
		ds = hzDisplay
	}
	if ds.atom == "" {
		return FormatNumber(q.V, digits) + " " + ds.composite
	}
	x := q.V / ds.scale
	k := ds.chooseK(x, digits)
	m := x / math.Pow10(3*k*ds.power)
	return FormatNumber(m, digits) + " " + ds.unitText(engPrefix[k])
}

// TableNoise is the fraction of a column's largest magnitude below which
// a table cell is written as 0 in scripts and reports: rounding noise, as
// for vector components.
const TableNoise = vectorNoise

// vectorNoise is the relative size below which a vector component is shown
// as 0: smaller than the accuracy of the numerical methods (1e-10), so it is
// rounding or quadrature noise, not information.
const vectorNoise = 1e-10

// CleanComponents returns v with components below vectorNoise of its
// largest component set to zero.
func CleanComponents(c [3]float64) [3]float64 {
	big := math.Max(math.Abs(c[0]), math.Max(math.Abs(c[1]), math.Abs(c[2])))
	for i := range c {
		if math.Abs(c[i]) < vectorNoise*big {
			c[i] = 0
		}
	}
	return c
}

func formatVector(v Vector, digits int) string {
	v.V = CleanComponents(v.V)
	ds := displayOf(v.D)
	scale, unit := 1.0, ""
	if !v.D.IsZero() {
		if ds.atom == "" {
			unit = ds.composite
		} else {
			big := math.Max(math.Abs(v.V[0]), math.Max(math.Abs(v.V[1]), math.Abs(v.V[2])))
			k := ds.chooseK(big/ds.scale, digits)
			scale = ds.scale * math.Pow10(3*k*ds.power)
			unit = ds.unitText(engPrefix[k])
		}
	}
	parts := make([]string, 3)
	for i, c := range v.V {
		parts[i] = FormatNumber(c/scale, digits)
	}
	s := "[" + strings.Join(parts, ", ") + "]"
	if unit != "" {
		s += " " + unit
	}
	return s
}

// FormatIn shows a quantity or vector in the given unit expression; the
// dimensions must match.
func FormatIn(v Value, unit string, digits int) (string, error) {
	return FormatInExpr(v, unit, digits, "")
}

// FormatInExpr is FormatIn; expr, when not empty, is the text of the
// expression being shown, quoted in a hint when only the angle is missing
// or extra (50 Hz as rad/s).
func FormatInExpr(v Value, unit string, digits int, expr string) (string, error) {
	if cv, ok := v.(CVector); ok {
		if _, polar := splitPolar(unit); polar {
			return "", &DimError{Msg: "a complex vector has no polar form; show its components (v.x as polar)"}
		}
		return formatCVectorIn(cv, unit, digits)
	}
	if u, polar := splitPolar(unit); polar || isComplex(v, nil) {
		z, ok := v.(Complex)
		if !ok {
			return "", &DimError{Msg: fmt.Sprintf("only a complex value has a polar form, not %s", TypeName(v))}
		}
		return formatComplexIn(z, u, polar, digits)
	}
	u, err := ParseUnit(unit)
	if err != nil {
		return "", err
	}
	scale := u.Scale()
	switch x := v.(type) {
	case Quantity:
		if x.D != u.Dim {
			return "", &DimError{Msg: fmt.Sprintf("cannot show %s in %s, which measures %s%s", x.D.Describe(), unit, u.Dim.Describe(), asAngleHint(x, u, unit, expr, digits))}
		}
		if u.Offset != 0 {
			return FormatNumber((x.V-u.Offset)/scale, digits) + " " + unit, nil
		}
		return FormatNumber(x.V/scale, digits) + " " + unit, nil
	case Vector:
		if x.D != u.Dim {
			return "", &DimError{Msg: fmt.Sprintf("cannot show a vector of %s in %s, which measures %s%s", x.D.Describe(), unit, u.Dim.Describe(), angleNote(x.D, u.Dim))}
		}
		if u.Offset != 0 {
			return "", &DimError{Msg: fmt.Sprintf("a vector cannot be shown in %s, which has an offset; use K", unit)}
		}
		parts := make([]string, 3)
		for i, c := range CleanComponents(x.V) {
			parts[i] = FormatNumber(c/scale, digits)
		}
		return "[" + strings.Join(parts, ", ") + "] " + unit, nil
	default:
		return "", &DimError{Msg: fmt.Sprintf("only quantities can be shown in a unit, not %s", TypeName(v))}
	}
}

// wrapped reports whether s is one bracketed whole, such as "(a + b)" but
// not "(a) + (b)".
func wrapped(s string) bool {
	if !strings.HasPrefix(s, "(") || !strings.HasSuffix(s, ")") {
		return false
	}
	depth := 0
	for i, c := range s {
		switch c {
		case '(':
			depth++
		case ')':
			depth--
			if depth == 0 && i != len(s)-1 {
				return false
			}
		}
	}
	return true
}

// asAngleHint says how to show x in u when they differ only by a power of
// angle: a frequency is multiplied by 1 rev (a cycle is a revolution, 2π
// rad), a bare rate in s^-1 by 1 rad, an angular velocity shown in Hz is
// divided by 1 rev. The hint quotes the result it would give.
func asAngleHint(x Quantity, u UnitExpr, unit, expr string, digits int) string {
	k := angleGap(x.D, u.Dim)
	if k != 1 && k != -1 {
		return ""
	}
	if expr == "" {
		expr = Format(x, digits)
	}
	if wrapped(expr) {
		expr = expr[1 : len(expr)-1]
	}
	if strings.ContainsAny(strings.TrimPrefix(expr, "-"), "+-?:<>=&|") {
		expr = "(" + expr + ")" // binds looser than *
	}
	try := func(by string, f float64) string {
		op := "*"
		if k < 0 {
			op = "/"
		}
		w := "(" + expr + " " + op + " 1 " + by + ") as " + unit
		y := x
		if k < 0 {
			y.V /= f
		} else {
			y.V *= f
		}
		y.D = u.Dim
		if t, err := FormatIn(y, unit, digits); err == nil {
			w += " (= " + t + ")"
		}
		return w
	}
	switch {
	case k == 1 && x.Cyc:
		return "; a frequency counts cycles and carries no angle: for the angular frequency (one cycle is 2π rad) write " + try("rev", 2*math.Pi)
	case k == 1 && x.D == dFreq:
		return "; this rate in s^-1 carries no angle (2*pi*f gets a radian only when you give it one): if it is an angular frequency in radians per second, write " + try("rad", 1)
	case k == 1 && x.D.IsZero():
		return "; a plain number is not an angle: to read it as radians, write " + try("rad", 1)
	case k == 1:
		return "; the value carries no angle: if it is per radian, write " + try("rad", 1)
	case k == -1 && u.Cyc:
		return "; an angular velocity turns an angle, a frequency counts cycles: for cycles (revolutions) per second write " + try("rev", 2*math.Pi)
	default:
		return "; the value carries an angle the unit does not: to drop it, its value in radians, write " + try("rad", 1)
	}
}

// BestUnit chooses the unit text and its SI size for showing values of
// dimension d whose largest magnitude is big (for table columns and
// vectors): the unit Format would use for big.
func BestUnit(d Dim, big float64, digits int) (string, float64) {
	return bestUnit(d, false, big, digits)
}

// BestCycleUnit is BestUnit for a column of cycle frequencies (see
// Quantity.Cyc): s^-1 is then shown in Hz with a prefix.
func BestCycleUnit(d Dim, big float64, digits int) (string, float64) {
	return bestUnit(d, true, big, digits)
}

func bestUnit(d Dim, cyc bool, big float64, digits int) (string, float64) {
	if d.IsZero() {
		return "", 1
	}
	ds := displayOf(d)
	if cyc && d == dFreq {
		ds = hzDisplay
	}
	if ds.atom == "" {
		return ds.composite, 1
	}
	k := ds.chooseK(math.Abs(big)/ds.scale, digits)
	return ds.unitText(engPrefix[k]), ds.scale * math.Pow10(3*k*ds.power)
}
