package runtime_test

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"loopwise/runtime"
)

// The shape of a shown value follows [SI] §5.4.3 (from memory): the number
// comes first, one space separates it from the unit symbol, and a prefix
// symbol is attached to the unit symbol without a space ([SI] §3). The choice
// of unit and of prefix steps of 10^3 (engineering prefixes) is a project
// convention (README.md: "0.00123 T shows as 1.23 mT, a Wb/s as V").

// TestFormatQuantity checks the unit and prefix chosen for a quantity.
func TestFormatQuantity(t *testing.T) {
	tests := []struct {
		v      float64 // in coherent SI units
		unit   string  // names the dimension
		digits int
		want   string
		src    string
	}{
		{0.00123, "T", 6, "1.23 mT", "README.md; [SI] Table 7 milli"},
		{468.923444621e-6, "T", 6, "468.923 \u00b5T", "README.md tour; [SI] Table 7 micro (shown with U+00B5)"},
		{0.0299199, "T", 6, "29.9199 mT", "README.md tour"},
		{2, "Wb/s", 6, "2 V", "README.md: Wb/s shows as V; [SI] Table 4 V = Wb/s"},
		{3, "kg*m^2/s^2", 6, "3 J", "[SI] Table 4: J = kg m^2 s^-2"},
		{1, "kg", 6, "1 kg", "[SI] Table 2 (kg is the base unit)"},
		{0.005, "kg", 6, "5 g", "[SI] §3 prefixes on the gram"},
		{2.5e-9, "kg", 6, "2.5 \u00b5g", "[SI] §3"},
		{15e-6, "m^2", 6, "15 mm^2", "[SI] §3: the prefix is raised with the unit"},
		{1.5e-4, "m^2", 6, "150 mm^2", "project convention: engineering steps only (no cm^2)"},
		{2e-9, "m^3", 6, "2 mm^3", "[SI] §3"},
		{0.05, "m", 6, "50 mm", "project convention: engineering steps only (no cm)"},
		{2500, "m", 6, "2.5 km", "[SI] Table 7 kilo"},
		{2.5e6, "m", 6, "2500 km", "project convention: lengths go up to km"},
		{7200, "s", 6, "7200 s", "project convention: no prefixes above s"},
		{2.5e-3, "s", 6, "2.5 ms", "[SI] Table 7 milli"},
		{2500, "A/m", 6, "2.5 kA/m", "[SI] Table 5 magnetic field strength A/m"},
		{0.03, "V/m", 6, "30 mV/m", "[SI] Table 6 electric field strength V/m"},
		{12, "T/s", 6, "12 T/s", "project convention (dimNames)"},
		{0.5, "T/s", 6, "500 mT/s", "project convention (dimNames)"},
		{4e5, "A/s", 6, "400 kA/s", "project convention (dimNames)"},
		{1.25663706212e-6, "H/m", 6, "1.25664 \u00b5H/m", "[SI] Table 6 permeability H/m"},
		{8.8541878128e-12, "F/m", 6, "8.85419 pF/m", "[SI] Table 6 permittivity F/m"},
		{1.7e-8, "ohm*m", 6, "17 n\u03a9*m", "project convention (dimNames resistivity)"},
		{2.2e-3, "ohm", 6, "2.2 m\u03a9", "[SI] Table 4 Ω"},
		{4.7e-6, "H", 6, "4.7 \u00b5H", "[SI] Table 4 H"},
		{1.5e-7, "Wb", 6, "150 nWb", "[SI] Table 4 Wb"},
		{50, "1/s", 6, "50 s^-1", "[SI] Table 4 note: Hz only for periodic phenomena, so a rate not known to count cycles is s^-1 (TestCycleDisplay)"},
		{1.5, "rad", 6, "1.5 rad", "[SI] Table 4 radian"},
		{1e-3, "rad", 6, "1 mrad", "[SI] Table 7 milli on the radian"},
		{2, "sr", 6, "2 sr", "[SI] Table 4 steradian (rad^2)"},
		{314.159, "rad/s", 6, "314.159 rad/s", "[SI] Table 6 angular velocity"},
		{3, "rad/s^2", 6, "3 rad/s^2", "[SI] Table 6 angular acceleration"},
		{2, "V*rad", 6, "2 V*rad", "project convention: the radian is appended to the display of the rest"},
		{2, "N*m/rad", 6, "2 J/rad", "project convention: N m and J share a dimension and J comes first; per radian appended"},
		{2.5e4, "kg/(m*s^2)", 6, "25 kPa", "[SI] Table 4 Pa"},
		{3.3e-3, "A*s", 6, "3.3 mC", "[SI] Table 4 C = A s"},

		// Rounding at prefix boundaries: the prefix is chosen after
		// rounding to the shown digits, so no "1000 µT" appears.
		{0.9999999, "T", 6, "1 T", "project convention"},
		{999.9996e-6, "T", 6, "1 mT", "project convention"},
		{999.9994e-6, "T", 6, "999.999 \u00b5T", "project convention (stays below the boundary)"},
		{999.6e-6, "T", 3, "1 mT", "project convention, 3 digits"},
		{999.6e-6, "T", 6, "999.6 \u00b5T", "project convention"},
		{0.9999999, "m^2", 6, "1 m^2", "project convention (square steps 10^6)"},
		{1e-3, "T", 6, "1 mT", "exact power of ten"},
		{1e-6, "T", 6, "1 \u00b5T", "exact power of ten"},
		{1e3, "A", 6, "1 kA", "exact power of ten"},

		// Digits.
		{1.23456789e-3, "T", 3, "1.23 mT", "3 significant digits"},
		{1.23456789e-3, "T", 9, "1.23456789 mT", "9 significant digits"},
		{0.1 + 0.2, "V", 6, "300 mV", "rounding hides binary noise; engineering step milli"},

		// Zero and negative values.
		{0, "T", 6, "0 T", "project convention: zero in the unprefixed unit"},
		{-0.00123, "T", 6, "-1.23 mT", "sign before the number"},
		{-2500, "A/m", 6, "-2.5 kA/m", "sign before the number"},
		{-0.9999999, "T", 6, "-1 T", "boundary, negative"},

		// Dimensionless numbers.
		{0.5, "", 6, "0.5", "plain number"},
		{400, "", 6, "400", "plain number"},
		{1234.5678, "", 6, "1234.57", "6 significant digits"},
		{0, "", 6, "0", "zero"},
		{-3, "", 6, "-3", "negative"},
	}
	for _, tt := range tests {
		got := runtime.Format(q(t, tt.v, tt.unit), tt.digits)
		if got != tt.want {
			t.Errorf("Format(%v %s, %d) = %q, want %q (%s)", tt.v, tt.unit, tt.digits, got, tt.want, tt.src)
		}
	}
}

// TestFormatNegativeZero checks that a zero produced by negation is not
// shown as "-0" (project convention: a sign on zero carries no meaning for a
// reader, and IEEE 754 negative zero is an artefact of the arithmetic).
func TestFormatNegativeZero(t *testing.T) {
	negZero := math.Copysign(0, -1)
	if got := runtime.Format(q(t, negZero, "T"), 6); got != "0 T" {
		t.Errorf("Format(-0 T) = %q, want \"0 T\"", got)
	}
	if got := runtime.Format(runtime.Num(negZero), 6); got != "0" {
		t.Errorf("Format(-0) = %q, want \"0\"", got)
	}
	v, err := runtime.Neg(runtime.Vector{V: [3]float64{0, 0, 0.005}, D: unitDim(t, "m")})
	if err != nil {
		t.Fatal(err)
	}
	if got := runtime.Format(v, 6); got != "[0, 0, -5] mm" {
		t.Errorf("Format(-[0, 0, 5] mm) = %q, want \"[0, 0, -5] mm\"", got)
	}
}

// TestFormatVector checks vectors: one prefix for all components, chosen
// by the largest magnitude (project convention).
func TestFormatVector(t *testing.T) {
	tests := []struct {
		v      [3]float64
		unit   string
		digits int
		want   string
	}{
		{[3]float64{0, 0, 0.005}, "m", 6, "[0, 0, 5] mm"},
		{[3]float64{0.001, -0.002, 0}, "T", 6, "[1, -2, 0] mT"},
		{[3]float64{1, 0.001, 0}, "m", 6, "[1, 0.001, 0] m"},
		{[3]float64{0, -2500, 0}, "A/m", 6, "[0, -2.5, 0] kA/m"},
		{[3]float64{1, 2, 3}, "", 6, "[1, 2, 3]"},
		{[3]float64{0, 0, 0}, "T", 6, "[0, 0, 0] T"},
		{[3]float64{1.23456e-3, 0, 0}, "Wb", 3, "[1.23, 0, 0] mWb"},
		{[3]float64{0.9999999, 0, 0}, "T", 6, "[1, 0, 0] T"},
	}
	for _, tt := range tests {
		var d runtime.Dim
		if tt.unit != "" {
			d = unitDim(t, tt.unit)
		}
		got := runtime.Format(runtime.Vector{V: tt.v, D: d}, tt.digits)
		if got != tt.want {
			t.Errorf("Format(%v %s) = %q, want %q", tt.v, tt.unit, got, tt.want)
		}
	}
}

// TestFormatNumber checks plain numbers.
func TestFormatNumber(t *testing.T) {
	for _, tt := range []struct {
		x      float64
		digits int
		want   string
	}{
		{1234.5678, 6, "1234.57"},
		{0.000123456, 3, "0.000123"},
		{0.96, 1, "1"},
		{2.5, 6, "2.5"},
		{123456789, 6, "123457000"},
		{-0.5, 6, "-0.5"},
		{0.1 + 0.2, 6, "0.3"},
	} {
		if got := runtime.FormatNumber(tt.x, tt.digits); got != tt.want {
			t.Errorf("FormatNumber(%v, %d) = %q, want %q", tt.x, tt.digits, got, tt.want)
		}
	}
	// Whatever notation is used, the text must read back as x rounded to
	// the given digits, which strconv.FormatFloat(x, 'e', digits-1) gives
	// (correctly rounded by the Go standard library).
	for _, x := range []float64{1e-5, 1.5e-5, 1.5e9, 6.02214076e23, -3.3e-12, 299792458, 1.602176634e-19, 1e-4, 9.99999e8} {
		for _, digits := range []int{1, 3, 6, 12} {
			s := runtime.FormatNumber(x, digits)
			got, err := strconv.ParseFloat(s, 64)
			want, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'e', digits-1, 64), 64)
			if err != nil || got != want {
				t.Errorf("FormatNumber(%v, %d) = %q, reads back as %v (%v), want %v", x, digits, s, got, err, want)
			}
		}
	}
}

// TestDisplayUnitOf checks the unit each dimension is shown in against the
// forms the SI Brochure prints for it ([SI] Tables 4, 5, 6), and the
// project's own names.
func TestDisplayUnitOf(t *testing.T) {
	tests := []struct {
		unit string   // names the dimension
		want []string // accepted displays
		src  string
	}{
		{"T", []string{"T"}, "[SI] Table 4"},
		{"Wb", []string{"Wb"}, "[SI] Table 4"},
		{"V*s", []string{"Wb"}, "[SI] Table 4: Wb = V s"},
		{"H", []string{"H"}, "[SI] Table 4"},
		{"V", []string{"V"}, "[SI] Table 4"},
		{"ohm", []string{"\u03a9"}, "[SI] Table 4 symbol Ω"},
		{"S", []string{"S"}, "[SI] Table 4"},
		{"F", []string{"F"}, "[SI] Table 4"},
		{"C", []string{"C"}, "[SI] Table 4"},
		{"N", []string{"N"}, "[SI] Table 4"},
		{"J", []string{"J"}, "[SI] Table 4"},
		{"W", []string{"W"}, "[SI] Table 4"},
		{"Pa", []string{"Pa"}, "[SI] Table 4"},
		{"Hz", []string{"s^-1"}, "[SI] Table 4 note: Hz only for cycles (Quantity.Cyc); the dimension alone is s^-1"},
		{"rad", []string{"rad"}, "[SI] Table 4"},
		{"sr", []string{"sr"}, "[SI] Table 4"},
		{"rad/s", []string{"rad/s"}, "[SI] Table 6 angular velocity"},
		{"rpm", []string{"rad/s"}, "[SI] Table 6 angular velocity"},
		{"m", []string{"m"}, "[SI] Table 2"},
		{"kg", []string{"kg"}, "[SI] Table 2"},
		{"s", []string{"s"}, "[SI] Table 2"},
		{"A", []string{"A"}, "[SI] Table 2"},
		{"K", []string{"K"}, "[SI] Table 2"},
		{"m^2", []string{"m^2"}, "[SI] Table 5 area"},
		{"m^3", []string{"m^3"}, "[SI] Table 5 volume"},
		{"m/s", []string{"m/s"}, "[SI] Table 5 speed; the hertz is only for periodic phenomena ([SI] Table 4 note)"},
		{"m/s^2", []string{"m/s^2"}, "[SI] Table 5 acceleration"},
		{"1/m", []string{"1/m", "m^-1"}, "[SI] Table 5 wavenumber m^-1"},
		{"kg/m^3", []string{"kg/m^3"}, "[SI] Table 5 mass density"},
		{"A/m^2", []string{"A/m^2"}, "[SI] Table 5 current density"},
		{"A/m", []string{"A/m"}, "[SI] Table 5 magnetic field strength"},
		{"1/H", []string{"A/Wb", "H^-1"}, "reluctance, as magnetic-circuit texts write it (common practice)"},
		{"V/m", []string{"V/m"}, "[SI] Table 6 electric field strength"},
		{"C/m^2", []string{"C/m^2"}, "[SI] Table 6 surface charge density"},
		{"F/m", []string{"F/m"}, "[SI] Table 6 permittivity"},
		{"H/m", []string{"H/m"}, "[SI] Table 6 permeability"},
		{"W/m^2", []string{"W/m^2"}, "[SI] Table 6 heat flux density"},
		{"J/K", []string{"J/K"}, "[SI] Table 6 heat capacity"},
		{"T/s", []string{"T/s"}, "project convention (dimNames)"},
		{"A/s", []string{"A/s"}, "project convention (dimNames)"},
		{"W/m^3", []string{"W/m^3"}, "project convention (dimNames)"},
		{"ohm*m", []string{"\u03a9*m"}, "project convention (dimNames)"},
		{"A*m^2", []string{"A*m^2"}, "project convention (dimNames)"},
	}
	for _, tt := range tests {
		d := unitDim(t, tt.unit)
		got := runtime.DisplayUnitOf(d)
		ok := false
		for _, w := range tt.want {
			ok = ok || got == w
		}
		if !ok {
			t.Errorf("DisplayUnitOf(%s) = %q, want %q (%s)", tt.unit, got, strings.Join(tt.want, `" or "`), tt.src)
		}
	}
	if got := runtime.DisplayUnitOf(runtime.Dimensionless); got != "1" {
		t.Errorf("DisplayUnitOf(dimensionless) = %q, want \"1\"", got)
	}
}

// TestDisplayUnitIsCoherent checks that the unit DisplayUnitOf names is the
// coherent SI unit of the dimension (size 1, [SI] §2.3.4), as its doc says
// ("the unprefixed unit") and as callers assume when they print a value in
// coherent SI units beside it (cmd/loopwise/help.go siSize). The kilogram,
// not the gram, is the coherent unit of mass.
func TestDisplayUnitIsCoherent(t *testing.T) {
	for _, unit := range []string{
		"T", "kg", "m/s", "1/m", "kg/m^3", "kg/s", "kg*m^2", "kg/m", "N/m", "W/(m*K)",
		"A/m", "V/m", "H/m", "m^-2", "1/s^2", "kg*m/s^3", "1/H", "mol/m^3",
		"1/s", "rad", "sr", "rad/s", "rad/s^2", "V*rad", "N*m/rad", "1/rad", "W/sr", "m*rad^3",
	} {
		d := unitDim(t, unit)
		shown := runtime.DisplayUnitOf(d)
		u, err := runtime.ParseUnit(shown)
		if err != nil {
			t.Errorf("DisplayUnitOf(%s) = %q does not parse: %v", unit, shown, err)
			continue
		}
		if u.Dim != d || u.Scale() != 1 {
			t.Errorf("DisplayUnitOf(%s) = %q, which has size %v and Dim %v; want the coherent unit (size 1, Dim %v)", unit, shown, u.Scale(), u.Dim, d)
		}
	}
}

// TestDisplayUnitNoHertzOutsideFrequency checks that the hertz appears only
// for the dimension s^-1: [SI] Table 4, note on the hertz (from memory):
// "The hertz shall only be used for periodic phenomena".
func TestDisplayUnitNoHertzOutsideFrequency(t *testing.T) {
	for _, unit := range []string{"m/s", "kg/s", "A*m/s", "m^2/s", "m^3/s"} {
		if got := runtime.DisplayUnitOf(unitDim(t, unit)); strings.Contains(got, "Hz") {
			t.Errorf("DisplayUnitOf(%s) = %q, want a unit without Hz", unit, got)
		}
	}
}

// TestDescribe checks dimension names in words and units, as used in error
// messages (project convention; README.md shows "length (m)" and "magnetic
// flux density (T)").
func TestDescribe(t *testing.T) {
	for _, tt := range []struct{ unit, want string }{
		{"m", "length (m)"},
		{"T", "magnetic flux density (T)"},
		{"Wb", "magnetic flux (Wb)"},
		{"H", "inductance (H)"},
		{"V", "voltage (V)"},
		{"A/m", "magnetic field strength (A/m)"},
		{"V/m", "electric field (V/m)"},
		{"ohm", "resistance (\u03a9)"},
		{"kg", "mass (kg)"},
		{"m/s", "speed (m/s)"},
		{"1", "dimensionless"},
		{"W/(m*K)", "a quantity in kg*m/(s^3*K)"}, // no name: SI base units, as Dim.BaseUnits documents
	} {
		var d runtime.Dim
		if tt.unit != "1" {
			d = unitDim(t, tt.unit)
		}
		if got := d.Describe(); got != tt.want {
			t.Errorf("Describe(%s) = %q, want %q", tt.unit, got, tt.want)
		}
	}
}

// TestFormatIn checks showing values in a chosen unit. Reference factors:
// [811] App. B and [SI] Tables 7, 8.
func TestFormatIn(t *testing.T) {
	tests := []struct {
		v      runtime.Value
		unit   string
		digits int
		want   string
		src    string
	}{
		{q(t, 0.0254, "m"), "inch", 6, "1 inch", "[811] 1 in = 0.0254 m"},
		{q(t, 0.3048, "m"), "ft", 6, "1 ft", "[811] 1 ft = 0.3048 m"},
		{q(t, 2.54e-5, "m"), "mil", 6, "1 mil", "[811] 1 mil = 2.54e-5 m"},
		{q(t, 0.0299199, "T"), "gauss", 6, "299.199 gauss", "[811] 1 G = 1e-4 T; README.md tour"},
		{q(t, 1e-8, "Wb"), "Mx", 6, "1 Mx", "[811] 1 Mx = 1e-8 Wb"},
		{q(t, 314.15926535897932, "rad/s"), "rpm", 6, "3000 rpm", "[811] App. B: 1 r/min = 0.1047198 rad/s"},
		{q(t, 50, "1/s"), "Hz", 6, "50 Hz", "[SI] Table 4 Hz = s^-1"},
		{q(t, 293.15, "K"), "°C", 6, "20 °C", "[SI] §2.3.1: t/°C = T/K − 273.15"},
		{q(t, 0, "K"), "degC", 6, "-273.15 degC", "[SI] §2.3.1"},
		{q(t, 3600, "s"), "h", 6, "1 h", "[SI] Table 8"},
		{q(t, 0.00123, "T"), "uT", 6, "1230 uT", "[SI] Table 7"},
		{q(t, 0.00123, "T"), "T", 6, "0.00123 T", "no prefix chosen: the given unit is kept"},
		{q(t, 1.602176634e-19, "J"), "eV", 6, "1 eV", "[SI] Table 8"},
		{q(t, 1e-6, "m^3"), "mL", 6, "1 mL", "[SI] Table 8 litre"},
		{q(t, 1, "Wb/s"), "V", 6, "1 V", "[SI] Table 4"},
		{q(t, math.Pi, "rad"), "deg", 6, "180 deg", "[SI] Table 8: π rad = 180°"},
		{q(t, 2*math.Pi, "rad"), "rev", 6, "1 rev", "[811] App. B: 1 r = 2π rad"},
		{q(t, 1234.5678, "m"), "m", 3, "1230 m", "3 digits"},
		{runtime.Vector{V: [3]float64{0, 0, 0.005}, D: unitDim(t, "m")}, "mm", 6, "[0, 0, 5] mm", "[SI] Table 7"},
	}
	for _, tt := range tests {
		got, err := runtime.FormatIn(tt.v, tt.unit, tt.digits)
		if err != nil || got != tt.want {
			t.Errorf("FormatIn(%v, %q) = %q, %v; want %q (%s)", tt.v, tt.unit, got, err, tt.want, tt.src)
		}
	}
}

// TestFormatInErrors checks dimension mismatches (*DimError naming both
// dimensions) and bad units (*UnitError).
func TestFormatInErrors(t *testing.T) {
	_, err := runtime.FormatIn(q(t, 1, "T"), "m", 6)
	var de *runtime.DimError
	if !errors.As(err, &de) {
		t.Fatalf("FormatIn(1 T, m): %v (%T), want *DimError", err, err)
	}
	for _, part := range []string{"magnetic flux density (T)", "length (m)"} {
		if !strings.Contains(de.Msg, part) {
			t.Errorf("FormatIn(1 T, m): message %q does not name %q", de.Msg, part)
		}
	}

	vec := runtime.Vector{V: [3]float64{1, 2, 3}, D: unitDim(t, "A/m")}
	if _, err := runtime.FormatIn(vec, "T", 6); !errors.As(err, &de) {
		t.Errorf("FormatIn(vector A/m, T): %v (%T), want *DimError", err, err)
	} else if !strings.Contains(de.Msg, "magnetic field strength (A/m)") || !strings.Contains(de.Msg, "magnetic flux density (T)") {
		t.Errorf("FormatIn(vector A/m, T): message %q does not name both dimensions", de.Msg)
	}

	if _, err := runtime.FormatIn(true, "m", 6); !errors.As(err, &de) {
		t.Errorf("FormatIn(true, m): %v (%T), want *DimError", err, err)
	}

	var ue *runtime.UnitError
	if _, err := runtime.FormatIn(q(t, 1, "m"), "furlong", 6); !errors.As(err, &ue) {
		t.Errorf("FormatIn(1 m, furlong): %v (%T), want *UnitError", err, err)
	}
}
