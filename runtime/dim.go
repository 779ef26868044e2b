package runtime

import (
	"fmt"
	"strings"
)

// Dim is a dimension: exponents of the seven SI base quantities in the
// order length, mass, time, electric current, temperature, amount of
// substance, luminous intensity (SI Brochure, 9th ed., 2019, §2.3.3), and
// an eighth for plane angle. The SI treats the radian as the coherent unit
// of plane angle with dimension one (Table 4 and its notes); Loopwise keeps
// angle as a dimension of its own, shown as rad, so that an angular
// velocity (rad/s) and a frequency (Hz = s^-1) cannot be confused and a
// missing or extra factor 2π is caught (see Mohr and Phillips, "Dimensionless
// units in the SI", Metrologia 52 (2015) 40–47, on tracking angle).
type Dim [8]int8

// Base dimension indices.
const (
	Length = iota
	Mass
	Time
	Current
	Temperature
	Amount
	Luminous
	Angle
)

// baseSymbols are the SI base unit symbols in Dim order, then the radian.
var baseSymbols = [8]string{"m", "kg", "s", "A", "K", "mol", "cd", "rad"}

// Dimensionless is the dimension of pure numbers.
var Dimensionless Dim

func (d Dim) Mul(e Dim) Dim {
	for i := range d {
		d[i] += e[i]
	}
	return d
}

func (d Dim) Div(e Dim) Dim {
	for i := range d {
		d[i] -= e[i]
	}
	return d
}

func (d Dim) Pow(n int) Dim {
	for i := range d {
		d[i] *= int8(n)
	}
	return d
}

// maxExp bounds every base-unit exponent (Dim holds int8).
const maxExp = 127

// Combine returns d^p · e^q, and false when an exponent leaves the range a
// Dim can hold.
func (d Dim) Combine(p int, e Dim, q int) (Dim, bool) {
	var out Dim
	for i := range d {
		x := int(d[i])*p + int(e[i])*q
		if x > maxExp || x < -maxExp {
			return d, false
		}
		out[i] = int8(x)
	}
	return out, true
}

var errExpRange = "the unit's exponents grow beyond ±127"

// IsZero reports whether d is dimensionless.
func (d Dim) IsZero() bool { return d == Dimensionless }

// BaseUnits writes d in SI base units, such as "kg*m^2/(s^3*A)"; the text
// parses back as a unit expression.
func (d Dim) BaseUnits() string {
	if d.IsZero() {
		return "1"
	}
	var num, den []string
	order := []int{Mass, Length, Time, Current, Temperature, Amount, Luminous, Angle}
	for _, i := range order {
		p := d[i]
		switch {
		case p > 0:
			num = append(num, powStr(baseSymbols[i], int(p)))
		case p < 0:
			den = append(den, powStr(baseSymbols[i], int(-p)))
		}
	}
	s := strings.Join(num, "*")
	if s == "" {
		s = "1"
	}
	switch len(den) {
	case 0:
	case 1:
		s += "/" + den[0]
	default:
		s += "/(" + strings.Join(den, "*") + ")"
	}
	return s
}

func powStr(sym string, p int) string {
	if p == 1 {
		return sym
	}
	return fmt.Sprintf("%s^%d", sym, p)
}

// dimNames names the dimensions practitioners speak of, in words.
var dimNames = []struct {
	name string
	unit string
}{
	{"dimensionless", ""},
	{"length", "m"},
	{"mass", "kg"},
	{"time", "s"},
	{"electric current", "A"},
	{"temperature", "K"},
	{"amount of substance", "mol"},
	{"luminous intensity", "cd"},
	{"area", "m^2"},
	{"volume", "m^3"},
	{"speed", "m/s"},
	{"acceleration", "m/s^2"},
	{"frequency", "s^-1"},
	{"plane angle", "rad"},
	{"solid angle", "sr"},
	{"angular velocity", "rad/s"},
	{"angular acceleration", "rad/s^2"},
	{"force", "N"},
	{"energy", "J"},
	{"power", "W"},
	{"pressure", "Pa"},
	{"electric charge", "C"},
	{"voltage", "V"},
	{"resistance", "ohm"},
	{"conductance", "S"},
	{"capacitance", "F"},
	{"inductance", "H"},
	{"magnetic flux", "Wb"},
	{"magnetic flux density", "T"},
	{"magnetic field strength", "A/m"},
	{"current density", "A/m^2"},
	{"electric field", "V/m"},
	{"permeability", "H/m"},
	{"permittivity", "F/m"},
	{"resistivity", "ohm*m"},
	{"rate of change of flux density", "T/s"},
	{"rate of change of current", "A/s"},
	{"power density", "W/m^3"},
	{"magnetic moment", "A*m^2"},
	{"torque or energy", "N*m"},
}

var dimNameOf = buildDimNames()

func buildDimNames() map[Dim]string {
	dimNameOf := make(map[Dim]string, len(dimNames))
	for _, dn := range dimNames {
		d := Dimensionless
		if dn.unit != "" {
			u, err := ParseUnit(dn.unit)
			if err != nil {
				panic("dimNames: " + err.Error())
			}
			d = u.Dim
		}
		if _, dup := dimNameOf[d]; !dup {
			dimNameOf[d] = dn.name
		}
	}
	return dimNameOf
}

// Describe names d in words and units, such as "magnetic flux density (T)"
// or "kg*m/s^3" when it has no common name.
func (d Dim) Describe() string {
	unit := DisplayUnitOf(d)
	if d == dFreq {
		unit = "Hz or s^-1" // shown in Hz when it counts cycles
	}
	if n, ok := dimNameOf[d]; ok {
		if d.IsZero() {
			return n
		}
		return fmt.Sprintf("%s (%s)", n, unit)
	}
	return fmt.Sprintf("a quantity in %s", unit)
}
