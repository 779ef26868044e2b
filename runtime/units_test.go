package runtime_test

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/lang"
	"loopwise/runtime"
)

// Sources cited below:
//
//	[SI]  BIPM, The International System of Units (SI Brochure), 9th edition, 2019.
//	[811] NIST Special Publication 811, Guide for the Use of the International
//	      System of Units (SI), 2008 edition, Appendix B.
//
// All values were typed from memory of these documents (no copy was at hand
// while writing); each is a defined value, exact or a simple fraction, that
// both documents print. Dimensions are written as
// runtime.Dim{m, kg, s, A, K, mol, cd}, the order
// of the base quantities in [SI] Table 2 as the Dim type documents it.

// unitRoundoff is the unit roundoff of float64, 2^-53: one correctly rounded
// operation (or one decimal-to-binary conversion) is off by at most this
// relative amount (IEEE 754-2008 §4.3, from memory).
const unitRoundoff = 0x1p-53

// mustParse parses a unit expression or stops the test.
func mustParse(t *testing.T, text string) runtime.UnitExpr {
	t.Helper()
	u, err := runtime.ParseUnit(text)
	if err != nil {
		t.Fatalf("ParseUnit(%q): %v", text, err)
	}
	return u
}

// decimal returns the float64 nearest to the decimal text s; it is how a
// reference value typed from a standard becomes a float64 (strconv.ParseFloat
// rounds correctly).
func decimal(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("bad reference %q: %v", s, err)
	}
	return v
}

// asDecimal returns the float64 nearest to Factor × 10^Exp10 taken as a
// decimal (the shortest text of Factor followed by the power of ten). This is
// the value a literal "1 unit" stands for, with no binary rounding of the
// power of ten on the way.
func asDecimal(t *testing.T, factor float64, exp10 int) float64 {
	t.Helper()
	return decimal(t, strconv.FormatFloat(factor, 'g', -1, 64)+"e"+strconv.Itoa(exp10))
}

// catalogueRefs holds the size of every catalogue unit in coherent SI units,
// typed from the standard named beside it, and its dimension.
var catalogueRefs = []struct {
	sym  string
	size string // decimal text, as printed in the standard
	dim  runtime.Dim
	src  string
}{
	// SI base units: [SI] Table 2. The kilogram is the base unit of mass;
	// multiples are formed on the gram, 1 g = 10^-3 kg ([SI] §3, from memory).
	{"m", "1", runtime.Dim{1, 0, 0, 0, 0, 0, 0}, "[SI] Table 2"},
	{"g", "1e-3", runtime.Dim{0, 1, 0, 0, 0, 0, 0}, "[SI] §3: 1 g = 10^-3 kg"},
	{"s", "1", runtime.Dim{0, 0, 1, 0, 0, 0, 0}, "[SI] Table 2"},
	{"A", "1", runtime.Dim{0, 0, 0, 1, 0, 0, 0}, "[SI] Table 2"},
	{"K", "1", runtime.Dim{0, 0, 0, 0, 1, 0, 0}, "[SI] Table 2"},
	{"mol", "1", runtime.Dim{0, 0, 0, 0, 0, 1, 0}, "[SI] Table 2"},
	{"cd", "1", runtime.Dim{0, 0, 0, 0, 0, 0, 1}, "[SI] Table 2"},

	// Coherent derived units with special names: [SI] Table 4, column
	// "expressed in terms of SI base units".
	// Plane angle is a dimension of its own in Loopwise (runtime.Angle):
	// the radian is its coherent unit, the steradian its square ([SI]
	// Table 4 gives rad = m/m and sr = m^2/m^2 = rad^2).
	{"rad", "1", runtime.Dim{runtime.Angle: 1}, "[SI] Table 4: rad = m/m, kept as the unit of angle"},
	{"sr", "1", runtime.Dim{runtime.Angle: 2}, "[SI] Table 4: sr = m^2/m^2 = rad^2"},
	{"Hz", "1", runtime.Dim{0, 0, -1, 0, 0, 0, 0}, "[SI] Table 4: Hz = s^-1"},
	{"N", "1", runtime.Dim{1, 1, -2, 0, 0, 0, 0}, "[SI] Table 4: N = kg m s^-2"},
	{"Pa", "1", runtime.Dim{-1, 1, -2, 0, 0, 0, 0}, "[SI] Table 4: Pa = kg m^-1 s^-2"},
	{"J", "1", runtime.Dim{2, 1, -2, 0, 0, 0, 0}, "[SI] Table 4: J = kg m^2 s^-2"},
	{"W", "1", runtime.Dim{2, 1, -3, 0, 0, 0, 0}, "[SI] Table 4: W = kg m^2 s^-3"},
	{"C", "1", runtime.Dim{0, 0, 1, 1, 0, 0, 0}, "[SI] Table 4: C = A s"},
	{"V", "1", runtime.Dim{2, 1, -3, -1, 0, 0, 0}, "[SI] Table 4: V = kg m^2 s^-3 A^-1"},
	{"F", "1", runtime.Dim{-2, -1, 4, 2, 0, 0, 0}, "[SI] Table 4: F = kg^-1 m^-2 s^4 A^2"},
	{"\u03a9", "1", runtime.Dim{2, 1, -3, -2, 0, 0, 0}, "[SI] Table 4: Ω = kg m^2 s^-3 A^-2"},
	{"ohm", "1", runtime.Dim{2, 1, -3, -2, 0, 0, 0}, "[SI] Table 4: Ω = kg m^2 s^-3 A^-2 (spelled out)"},
	{"\u2126", "1", runtime.Dim{2, 1, -3, -2, 0, 0, 0}, "[SI] Table 4: Ω written with the ohm sign U+2126 (Unicode canonically equivalent to U+03A9)"},
	{"S", "1", runtime.Dim{-2, -1, 3, 2, 0, 0, 0}, "[SI] Table 4: S = kg^-1 m^-2 s^3 A^2"},
	{"Wb", "1", runtime.Dim{2, 1, -2, -1, 0, 0, 0}, "[SI] Table 4: Wb = kg m^2 s^-2 A^-1"},
	{"T", "1", runtime.Dim{0, 1, -2, -1, 0, 0, 0}, "[SI] Table 4: T = kg s^-2 A^-1"},
	{"H", "1", runtime.Dim{2, 1, -2, -2, 0, 0, 0}, "[SI] Table 4: H = kg m^2 s^-2 A^-2"},

	// Non-SI units accepted for use with the SI: [SI] Table 8.
	{"L", "1e-3", runtime.Dim{3, 0, 0, 0, 0, 0, 0}, "[SI] Table 8: 1 L = 1 dm^3 = 10^-3 m^3"},
	{"min", "60", runtime.Dim{0, 0, 1, 0, 0, 0, 0}, "[SI] Table 8: 1 min = 60 s"},
	{"h", "3600", runtime.Dim{0, 0, 1, 0, 0, 0, 0}, "[SI] Table 8: 1 h = 60 min = 3600 s"},
	// π/180 to 35 digits, from memory, checked with bc -l (4*a(1)/180).
	{"deg", "0.017453292519943295769236907684886127", runtime.Dim{runtime.Angle: 1}, "[SI] Table 8: 1° = (π/180) rad"},
	{"eV", "1.602176634e-19", runtime.Dim{2, 1, -2, 0, 0, 0, 0}, "[SI] Table 8: 1 eV = 1.602 176 634 × 10^-19 J"},

	// Other units: [811] Appendix B.
	{"gauss", "1e-4", runtime.Dim{0, 1, -2, -1, 0, 0, 0}, "[811] App. B: gauss to tesla 1.0 E-04"},
	{"maxwell", "1e-8", runtime.Dim{2, 1, -2, -1, 0, 0, 0}, "[811] App. B: maxwell to weber 1.0 E-08"},
	{"Mx", "1e-8", runtime.Dim{2, 1, -2, -1, 0, 0, 0}, "[811] App. B: maxwell (Mx) to weber 1.0 E-08"},
	{"inch", "0.0254", runtime.Dim{1, 0, 0, 0, 0, 0, 0}, "[811] App. B: inch to metre 2.54 E-02 (exact)"},
	{"mil", "2.54e-5", runtime.Dim{1, 0, 0, 0, 0, 0, 0}, "[811] App. B: mil (0.001 in) to metre 2.54 E-05 (exact)"},
	{"ft", "0.3048", runtime.Dim{1, 0, 0, 0, 0, 0, 0}, "[811] App. B: foot to metre 3.048 E-01 (exact)"},
	// 2π and 2π/60 to 35 digits, from memory (π = 3.14159265358979323846
	// 26433832795028841971…), multiplied out with Python's decimal module.
	// [811] App. B lists "revolution per minute (rpm) (r/min) to radian per
	// second 1.047198 E-01"; TestAngleUnitsNIST checks that figure too.
	{"rev", "6.2831853071795864769252867665590058", runtime.Dim{runtime.Angle: 1}, "[811] App. B: revolution (r) = 2π rad"},
	{"rpm", "0.10471975511965977461542144610931676", runtime.Dim{runtime.Time: -1, runtime.Angle: 1}, "[811] App. B: r/min = 2π/60 rad/s"},

	// Celsius: the size of the degree is the kelvin; the offset 273.15 K
	// is checked in TestCelsius ([SI] §2.3.1, Table 4).
	{"°C", "1", runtime.Dim{runtime.Temperature: 1}, "[SI] Table 4: 1 °C = 1 K as an interval"},
	{"degC", "1", runtime.Dim{runtime.Temperature: 1}, "[SI] Table 4 (ASCII spelling, project convention)"},

	// Project convention: a number of turns is a dimensionless count.
	{"turns", "1", runtime.Dim{}, "project convention"},
	{"turn", "1", runtime.Dim{}, "project convention"},
}

// TestCatalogueFactors checks every catalogue unit against its standard:
// the decimal value Factor × 10^Exp10, the dimension, ParseUnit and
// LiteralValue of "1 unit", and Scale.
func TestCatalogueFactors(t *testing.T) {
	cat := runtime.Catalogue()
	bySym := make(map[string]runtime.UnitDef, len(cat))
	for _, d := range cat {
		if _, dup := bySym[d.Sym]; dup {
			t.Errorf("catalogue lists %q twice", d.Sym)
		}
		bySym[d.Sym] = d
	}
	checked := make(map[string]bool)
	for _, ref := range catalogueRefs {
		t.Run(ref.sym, func(t *testing.T) {
			checked[ref.sym] = true
			def, ok := bySym[ref.sym]
			if !ok {
				t.Fatalf("%q is not in the catalogue (%s)", ref.sym, ref.src)
			}
			want := decimal(t, ref.size)

			// The catalogue keeps the factor as decimal text in effect
			// (Factor × 10^Exp10); read as a decimal it must round to
			// the same float64 as the standard's value. Tolerance 0:
			// both sides are one correct rounding of the same number
			// when the catalogue is right (for deg and rpm, whose
			// values do not terminate, Factor must be the float64
			// nearest to the value).
			if got := asDecimal(t, def.Factor, def.Exp10); got != want {
				t.Errorf("%s: catalogue gives %ge%d = %v, want %s (%s)", ref.sym, def.Factor, def.Exp10, got, ref.size, ref.src)
			}
			if def.Dim != ref.dim {
				t.Errorf("%s: dimension %v, want %v (%s)", ref.sym, def.Dim, ref.dim, ref.src)
			}
			if def.Defined == "" {
				t.Errorf("%s: no source recorded in Defined", ref.sym)
			}

			u := mustParse(t, ref.sym)
			if u.Factor != def.Factor || u.Exp10 != def.Exp10 || u.Dim != def.Dim {
				t.Errorf("ParseUnit(%q) = %+v, catalogue entry %+v", ref.sym, u, def)
			}

			// LiteralValue("1", u) = ParseFloat("1e<Exp10>") × Factor.
			// When Factor is 1 or Exp10 is 0 only one rounding happens
			// and the result must be the nearest float64: tolerance 0.
			// Otherwise there are two correct roundings (10^Exp10, then
			// the product), total relative error < 2·2^-53, which is
			// less than 1 ulp of the result plus the 0.5 ulp of the
			// reference's own rounding: tolerance 1 ulp.
			lit, err := runtime.LiteralValue("1", u)
			if err != nil {
				t.Fatalf("LiteralValue(1 %s): %v", ref.sym, err)
			}
			lit -= def.Offset // 1 °C is 274.15 K: TestCelsius checks the offset
			var ulps uint
			if def.Factor != 1 && def.Exp10 != 0 {
				ulps = 1
			}
			if !scalar.EqualWithinULP(lit, want, ulps) {
				t.Errorf("LiteralValue(1 %s) = %v, want %s within %d ulp (%s)", ref.sym, lit, ref.size, ulps, ref.src)
			}

			// Scale = Factor × math.Pow10(Exp10): the Factor from
			// decimal, 10^Exp10 and the product are each one rounding
			// (≤ 2^-53 relative), plus one for the reference: 4·2^-53.
			if got := u.Scale(); !scalar.EqualWithinAbsOrRel(got, want, 0, 4*unitRoundoff) {
				t.Errorf("ParseUnit(%q).Scale() = %v, want %s (%s)", ref.sym, got, ref.size, ref.src)
			}
		})
	}
	for _, d := range cat {
		if !checked[d.Sym] {
			t.Errorf("catalogue unit %q (%s) has no reference value in this test", d.Sym, d.Defined)
		}
	}
}

// TestExactFlag checks that units whose factor is exact by definition and
// representable as a decimal are marked Exact.
func TestExactFlag(t *testing.T) {
	// Exact by definition: [SI] Tables 2, 4, 8 (the eV since the 2019
	// redefinition fixed e exactly); [811] App. B marks inch, foot and mil
	// as exact; gauss and maxwell are defined by powers of ten.
	exact := []string{"m", "g", "s", "A", "K", "mol", "cd", "rad", "sr", "Hz", "N", "Pa", "J", "W",
		"C", "V", "F", "\u03a9", "ohm", "S", "Wb", "T", "H", "L", "min", "h", "eV",
		"gauss", "maxwell", "Mx", "inch", "mil", "ft"}
	bySym := make(map[string]runtime.UnitDef)
	for _, d := range runtime.Catalogue() {
		bySym[d.Sym] = d
	}
	for _, s := range exact {
		if d, ok := bySym[s]; !ok || !d.Exact {
			t.Errorf("%q: Exact = false or missing, want an exact factor", s)
		}
	}
}

// publishedPrefixes are the SI prefixes with their powers of ten, typed
// from [SI] Table 7 (twenty prefixes, yocto to yotta) and from Resolution 3
// of the 27th CGPM (2022), which added ronna (R, 10^27), quetta (Q, 10^30),
// ronto (r, 10^-27) and quecto (q, 10^-30). "u" is the project's ASCII
// spelling of micro; U+00B5 (micro sign) and U+03BC (Greek small mu) are
// both accepted for the symbol μ.
var publishedPrefixes = map[string]struct {
	exp int
	src string
}{
	"q":      {-30, "27th CGPM (2022) Res. 3: quecto 10^-30"},
	"r":      {-27, "27th CGPM (2022) Res. 3: ronto 10^-27"},
	"y":      {-24, "[SI] Table 7: yocto 10^-24"},
	"z":      {-21, "[SI] Table 7: zepto 10^-21"},
	"a":      {-18, "[SI] Table 7: atto 10^-18"},
	"f":      {-15, "[SI] Table 7: femto 10^-15"},
	"p":      {-12, "[SI] Table 7: pico 10^-12"},
	"n":      {-9, "[SI] Table 7: nano 10^-9"},
	"u":      {-6, "project convention: u for micro 10^-6"},
	"\u00b5": {-6, "[SI] Table 7: micro 10^-6 (micro sign)"},
	"\u03bc": {-6, "[SI] Table 7: micro 10^-6 (Greek mu)"},
	"m":      {-3, "[SI] Table 7: milli 10^-3"},
	"c":      {-2, "[SI] Table 7: centi 10^-2"},
	"d":      {-1, "[SI] Table 7: deci 10^-1"},
	"da":     {1, "[SI] Table 7: deca 10^1"},
	"h":      {2, "[SI] Table 7: hecto 10^2"},
	"k":      {3, "[SI] Table 7: kilo 10^3"},
	"M":      {6, "[SI] Table 7: mega 10^6"},
	"G":      {9, "[SI] Table 7: giga 10^9"},
	"T":      {12, "[SI] Table 7: tera 10^12"},
	"P":      {15, "[SI] Table 7: peta 10^15"},
	"E":      {18, "[SI] Table 7: exa 10^18"},
	"Z":      {21, "[SI] Table 7: zetta 10^21"},
	"Y":      {24, "[SI] Table 7: yotta 10^24"},
	"R":      {27, "27th CGPM (2022) Res. 3: ronna 10^27"},
	"Q":      {30, "27th CGPM (2022) Res. 3: quetta 10^30"},
}

// TestSIPrefixes takes the prefixes the catalogue accepts
// (runtime.PrefixSymbols) and checks each against its published power of
// ten on every unit that takes prefixes, and that every published prefix is
// accepted. A prefixed literal "1 <prefix><unit>" with a unit of Factor 1
// is built from the decimal text "1e<n>", so it must equal the float64
// nearest 10^n exactly; with another Factor it must be within 1 ulp (two
// roundings, as in TestCatalogueFactors).
func TestSIPrefixes(t *testing.T) {
	accepted := runtime.PrefixSymbols()
	seen := map[string]bool{}
	for _, p := range accepted {
		seen[p] = true
		if _, ok := publishedPrefixes[p]; !ok {
			t.Errorf("the catalogue accepts the prefix %q, which is not an SI prefix", p)
		}
	}
	for p, ref := range publishedPrefixes {
		if !seen[p] {
			t.Errorf("the SI prefix %q (%s) is not accepted", p, ref.src)
		}
	}
	for _, def := range runtime.Catalogue() {
		if !def.Prefix {
			continue
		}
		base := mustParse(t, def.Sym)
		for _, p := range accepted {
			ref := publishedPrefixes[p]
			sym := p + def.Sym
			if lang.Keywords[sym] {
				continue // "as": see TestUnitSymbolsDoNotCollide
			}
			u, err := runtime.ParseUnit(sym)
			if err != nil {
				t.Errorf("ParseUnit(%q): %v (%s)", sym, err, ref.src)
				continue
			}
			if u.Dim != base.Dim || u.Factor != base.Factor || u.Exp10 != base.Exp10+ref.exp {
				t.Errorf("ParseUnit(%q) = %+v, want Factor %v, Exp10 %d, Dim %v (%s)", sym, u, base.Factor, base.Exp10+ref.exp, base.Dim, ref.src)
			}
			want := decimal(t, fmt.Sprintf("%se%d", strconv.FormatFloat(def.Factor, 'g', -1, 64), base.Exp10+ref.exp))
			var ulps uint
			if def.Factor != 1 {
				ulps = 1
			}
			if got, err := runtime.LiteralValue("1", u); err != nil || !scalar.EqualWithinULP(got, want, ulps) {
				t.Errorf("LiteralValue(1 %s) = %v, %v; want %v within %d ulp (%s)", sym, got, err, want, ulps, ref.src)
			}
			if !(runtime.UnitTable{}).IsUnit(sym) {
				t.Errorf("IsUnit(%q) = false", sym)
			}
		}
	}
}

// TestMicroSpellings checks that the three spellings of micro are one unit
// and that literals with them are exact.
func TestMicroSpellings(t *testing.T) {
	ascii := mustParse(t, "uT")
	for _, sym := range []string{"\u00b5T", "\u03bcT"} {
		if u := mustParse(t, sym); u != ascii {
			t.Errorf("ParseUnit(%q) = %+v, ParseUnit(\"uT\") = %+v; want the same", sym, u, ascii)
		}
	}
	// "5 µT" must be the float64 nearest 5e-6, i.e. what
	// strconv.ParseFloat("5e-6") gives ([SI] Table 7: micro = 10^-6).
	want := decimal(t, "5e-6")
	for _, sym := range []string{"uT", "\u00b5T", "\u03bcT"} {
		got, err := runtime.LiteralValue("5", mustParse(t, sym))
		if err != nil || got != want {
			t.Errorf("LiteralValue(5 %s) = %v, %v; want %v exactly", sym, got, err, want)
		}
	}
}

// TestLiteralValue checks that literals are built from their decimal text:
// each result must be the float64 nearest to the decimal value (tolerance
// 0), which a product such as 5 × 1e-6 in binary would not always give.
func TestLiteralValue(t *testing.T) {
	tests := []struct {
		number, unit string
		want         string // the literal's value in coherent SI units, as decimal text
		src          string
	}{
		{"5", "\u00b5T", "5e-6", "[SI] Table 7: micro"},
		{"1.2e-3", "mWb", "1.2e-6", "[SI] Table 7: milli"},
		{"1.2E-3", "mWb", "1.2e-6", "[SI] Table 7: milli (capital E)"},
		{"12.5", "mm", "0.0125", "[SI] Table 7: milli"},
		{"0.1", "mm", "1e-4", "[SI] Table 7: milli"},
		{"0.3", "uH", "3e-7", "[SI] Table 7: micro"},
		{"2.5", "kA", "2500", "[SI] Table 7: kilo"},
		{"3", "A/ms", "3000", "[SI] Table 7: milli, in the denominator"},
		{"7", "g", "0.007", "[SI] §3: 1 g = 10^-3 kg"},
		{"1", "kg", "1", "[SI] Table 2"},
		{"1", "L", "0.001", "[SI] Table 8"},
		{"100", "cm^2", "0.01", "[SI] Table 7: centi, squared"},
		{"-4", "nH", "-4e-9", "[SI] Table 7: nano"},
		{"1e3", "pF", "1e-9", "[SI] Table 7: pico"},
		{"1e+2", "MHz", "1e8", "[SI] Table 7: mega"},
		{".5", "GW", "5e8", "[SI] Table 7: giga"},
		{"299.199", "gauss", "0.0299199", "[811] App. B: 1 G = 1e-4 T"},
		{"3", "maxwell", "3e-8", "[811] App. B: 1 Mx = 1e-8 Wb"},
		{"0", "T", "0", "zero"},
	}
	for _, tt := range tests {
		got, err := runtime.LiteralValue(tt.number, mustParse(t, tt.unit))
		if err != nil {
			t.Errorf("LiteralValue(%s %s): %v", tt.number, tt.unit, err)
			continue
		}
		if want := decimal(t, tt.want); got != want {
			t.Errorf("LiteralValue(%s %s) = %v, want %v exactly (%s)", tt.number, tt.unit, got, want, tt.src)
		}
	}
}

// TestLiteralValueErrors checks that malformed or overflowing numbers are
// rejected rather than turned into 0 or Inf, and that large values that
// still fit are accepted. The largest float64 is about 1.797e308 (IEEE 754
// binary64, from memory).
func TestLiteralValueErrors(t *testing.T) {
	for _, tt := range []struct{ number, unit string }{
		{"1e", "m"},      // no exponent digits
		{"1e3.5", "m"},   // fractional exponent
		{"abc", "m"},     // not a number
		{"1e400", "m"},   // beyond float64
		{"1e306", "TW"},  // 1e318 W once the prefix is applied
		{"9e307", "min"}, // 5.4e309 s: overflows only through the factor 60
	} {
		if v, err := runtime.LiteralValue(tt.number, mustParse(t, tt.unit)); err == nil {
			t.Errorf("LiteralValue(%s %s) = %v, want an error", tt.number, tt.unit, v)
		}
	}
	for _, tt := range []struct{ number, unit string }{
		{"1e308", "ft"},  // 3.048e307 m
		{"1e296", "TW"},  // 1e308 W
		{"1e-300", "fm"}, // 1e-315 m, subnormal but representable
	} {
		if v, err := runtime.LiteralValue(tt.number, mustParse(t, tt.unit)); err != nil || math.IsInf(v, 0) || v == 0 {
			t.Errorf("LiteralValue(%s %s) = %v, %v; want a finite nonzero value", tt.number, tt.unit, v, err)
		}
	}
}

// TestDerivedUnitDimensions checks each named derived unit against its
// expressions in [SI] Table 4: in other SI units and in base units. All three
// must have one dimension and size 1 (the units are coherent).
func TestDerivedUnitDimensions(t *testing.T) {
	tests := []struct {
		sym, other, base string
	}{
		// [SI] Table 4, columns "in terms of other SI units" and "in
		// terms of SI base units" (base units written with * and /).
		{"Hz", "1/s", "s^-1"},
		{"N", "kg*m/s^2", "kg*m*s^-2"},
		{"Pa", "N/m^2", "kg/(m*s^2)"},
		{"J", "N*m", "kg*m^2/s^2"},
		{"W", "J/s", "kg*m^2/s^3"},
		{"C", "A*s", "s*A"},
		{"V", "W/A", "kg*m^2/(s^3*A)"},
		{"F", "C/V", "s^4*A^2/(kg*m^2)"},
		{"\u03a9", "V/A", "kg*m^2/(s^3*A^2)"},
		{"ohm", "V/A", "kg*m^2*s^-3*A^-2"},
		{"S", "A/V", "s^3*A^2/(kg*m^2)"},
		{"Wb", "V*s", "kg*m^2/(s^2*A)"},
		{"T", "Wb/m^2", "kg/(s^2*A)"},
		{"H", "Wb/A", "kg*m^2/(s^2*A^2)"},
	}
	for _, tt := range tests {
		u, o, b := mustParse(t, tt.sym), mustParse(t, tt.other), mustParse(t, tt.base)
		if u.Dim != o.Dim || u.Dim != b.Dim {
			t.Errorf("%s: Dim %v, %s gives %v, %s gives %v; want all equal ([SI] Table 4)", tt.sym, u.Dim, tt.other, o.Dim, tt.base, b.Dim)
		}
		for _, x := range []runtime.UnitExpr{u, o, b} {
			if x.Scale() != 1 {
				t.Errorf("%s: size %v, want 1 (coherent unit, [SI] §2.3.4)", tt.sym, x.Scale())
			}
		}
		// Dim.BaseUnits writes the dimension back as text that parses to
		// the same dimension (its documented contract).
		if back := mustParse(t, u.Dim.BaseUnits()); back.Dim != u.Dim || back.Scale() != 1 {
			t.Errorf("%s: BaseUnits() = %q parses to %+v", tt.sym, u.Dim.BaseUnits(), back)
		}
	}
}

// TestUnitAlgebra checks products, quotients, powers, parentheses and
// negative powers. Sizes are typed from the standards; tol counts the
// roundings on the way (each ≤ 2^-53 relative): the factors' own roundings,
// math.Pow10, the product in Scale, and one for the reference.
func TestUnitAlgebra(t *testing.T) {
	tests := []struct {
		expr string
		size string // SI size, decimal text
		dim  runtime.Dim
		tol  float64
		src  string
	}{
		{"kg*m^2/s^2", "1", runtime.Dim{2, 1, -2, 0, 0, 0, 0}, 0, "[SI] Table 4: J; exact (k on g gives 10^0)"},
		{"m/s*s", "1", runtime.Dim{1, 0, 0, 0, 0, 0, 0}, 0, "left to right: (m/s)*s = m"},
		{"J/kg/K", "1", runtime.Dim{2, 0, -2, 0, -1, 0, 0}, 0, "left to right: J/(kg*K), [SI] Table 6 specific heat capacity"},
		{"1/(ohm*m)", "1", runtime.Dim{-3, -1, 3, 2, 0, 0, 0}, 0, "[SI] Table 4: S/m"},
		{"m^-1", "1", runtime.Dim{-1, 0, 0, 0, 0, 0, 0}, 0, "[SI] Table 5 wavenumber"},
		{"1/m", "1", runtime.Dim{-1, 0, 0, 0, 0, 0, 0}, 0, "[SI] Table 5 wavenumber"},
		{"A/m", "1", runtime.Dim{-1, 0, 0, 1, 0, 0, 0}, 0, "[SI] Table 5 magnetic field strength"},
		{"(m)", "1", runtime.Dim{1, 0, 0, 0, 0, 0, 0}, 0, "parentheses"},
		{"((m*s))/s", "1", runtime.Dim{1, 0, 0, 0, 0, 0, 0}, 0, "nested parentheses"},
		{"mm^2", "1e-6", runtime.Dim{2, 0, 0, 0, 0, 0, 0}, 2 * unitRoundoff, "[SI] §3: the prefix is raised with the unit, 1 mm^2 = 10^-6 m^2"},
		{"(mm)^2", "1e-6", runtime.Dim{2, 0, 0, 0, 0, 0, 0}, 2 * unitRoundoff, "[SI] §3"},
		{"cm^3", "1e-6", runtime.Dim{3, 0, 0, 0, 0, 0, 0}, 2 * unitRoundoff, "[SI] §3: 1 cm^3 = 10^-6 m^3"},
		{"mL", "1e-6", runtime.Dim{3, 0, 0, 0, 0, 0, 0}, 2 * unitRoundoff, "[SI] Table 8: 1 mL = 1 cm^3"},
		{"A/ms", "1e3", runtime.Dim{0, 0, -1, 1, 0, 0, 0}, 2 * unitRoundoff, "[SI] Table 7 milli"},
		{"uWb", "1e-6", runtime.Dim{2, 1, -2, -1, 0, 0, 0}, 2 * unitRoundoff, "[SI] Table 7 micro"},
		{"kA/m", "1e3", runtime.Dim{-1, 0, 0, 1, 0, 0, 0}, 2 * unitRoundoff, "[SI] Table 7 kilo"},
		{"mT/ms", "1", runtime.Dim{0, 1, -3, -1, 0, 0, 0}, 2 * unitRoundoff, "[SI] Table 7: 10^-3/10^-3"},
		{"s^-2", "1", runtime.Dim{0, 0, -2, 0, 0, 0, 0}, 0, "negative power"},
		{"ms^-1", "1e3", runtime.Dim{0, 0, -1, 0, 0, 0, 0}, 2 * unitRoundoff, "(ms)^-1: [SI] §3, the prefix belongs to the unit"},
		{"km/h", "0.2777777777777777777778", runtime.Dim{1, 0, -1, 0, 0, 0, 0}, 4 * unitRoundoff, "[SI] Table 8: 1000 m / 3600 s = 1/3.6 m/s"},
		{"min^-1", "0.01666666666666666666667", runtime.Dim{0, 0, -1, 0, 0, 0, 0}, 3 * unitRoundoff, "[SI] Table 8: 1/(60 s)"},
		{"inch^2", "6.4516e-4", runtime.Dim{2, 0, 0, 0, 0, 0, 0}, 3 * unitRoundoff, "[811] App. B: square inch to square metre 6.4516 E-04 (exact)"},
		{"ft^3", "0.028316846592", runtime.Dim{3, 0, 0, 0, 0, 0, 0}, 3 * unitRoundoff, "[811] App. B: 0.3048^3 m^3 exactly (listed as 2.831685 E-02, from memory)"},
		{"gauss*cm^2", "1e-8", runtime.Dim{2, 1, -2, -1, 0, 0, 0}, 3 * unitRoundoff, "[811] App. B: 1e-4 T × 1e-4 m^2 = 1e-8 Wb = 1 Mx"},
		{"keV", "1.602176634e-16", runtime.Dim{2, 1, -2, 0, 0, 0, 0}, 4 * unitRoundoff, "[SI] Table 8 eV with kilo"},
		{"rpm*min", "6.2831853071795864769252867665590058", runtime.Dim{runtime.Angle: 1}, 4 * unitRoundoff, "[811] App. B r/min × [SI] Table 8 min = 1 r = 2π rad"},
		{"rad/s", "1", runtime.Dim{runtime.Time: -1, runtime.Angle: 1}, 0, "[SI] Table 6 angular velocity"},
		{"rad/s^2", "1", runtime.Dim{runtime.Time: -2, runtime.Angle: 1}, 0, "[SI] Table 6 angular acceleration"},
		{"W/sr", "1", runtime.Dim{2, 1, -3, 0, 0, 0, 0, -2}, 0, "[SI] Table 6 radiant intensity"},
		{"deg/s", "0.017453292519943295769236907684886127", runtime.Dim{runtime.Time: -1, runtime.Angle: 1}, 2 * unitRoundoff, "[SI] Table 8 degree per second"},
		{"turns*A", "1", runtime.Dim{0, 0, 0, 1, 0, 0, 0}, 0, "project convention: turns are a count"},
		{"V*s/turn", "1", runtime.Dim{2, 1, -2, -1, 0, 0, 0}, 0, "[SI] Table 4: V s = Wb"},
	}
	for _, tt := range tests {
		u, err := runtime.ParseUnit(tt.expr)
		if err != nil {
			t.Errorf("ParseUnit(%q): %v", tt.expr, err)
			continue
		}
		if u.Dim != tt.dim {
			t.Errorf("ParseUnit(%q).Dim = %v, want %v (%s)", tt.expr, u.Dim, tt.dim, tt.src)
		}
		want := decimal(t, tt.size)
		if got := u.Scale(); !scalar.EqualWithinAbsOrRel(got, want, 0, tt.tol) {
			t.Errorf("ParseUnit(%q).Scale() = %v, want %s within %g relative (%s)", tt.expr, got, tt.size, tt.tol, tt.src)
		}
	}
}

// TestUnitErrors checks that bad unit expressions give *UnitError at the
// right rune offset. Messages are project conventions.
func TestUnitErrors(t *testing.T) {
	tests := []struct {
		text       string
		off, width int
		msg        string // full message; "" checks only the prefix below
		prefix     string
	}{
		{"", 0, 1, "a unit is missing", ""},
		{"m*", 2, 1, "a unit is missing", ""},
		{"m/", 2, 1, "a unit is missing", ""},
		{"(m", 0, 1, "'(' in a unit is never closed", ""},
		{"m)", 1, 1, `unexpected ")" in unit "m)"`, ""},
		{"kg m", 2, 2, `unexpected " m" in unit "kg m"`, ""},
		{"2", 0, 1, "unexpected '2' in a unit", ""},
		{"m^", 1, 1, "a unit power must be a whole number from -12 to 12", ""},
		{"m^13", 1, 3, "a unit power must be a whole number from -12 to 12", ""},
		{"m^-13", 1, 4, "a unit power must be a whole number from -12 to 12", ""},
		{"m^1.5", 1, 4, "a unit power must be a whole number from -12 to 12", ""}, // like m^13: the whole power is marked
		{"gaus", 0, 4, `unknown unit "gaus"; did you mean "gauss"?`, ""},
		// Offsets count runes, not bytes: "µ" is two bytes in UTF-8.
		{"\u00b5T*xyzzy", 3, 5, "", `unknown unit "xyzzy"`},
		{"\u03a9/xyzzy", 2, 5, "", `unknown unit "xyzzy"`},
		// min and h take no prefix (project convention; [SI] Table 8).
		{"kmin", 0, 4, "", `unknown unit "kmin"`},
		{"A/kh", 2, 2, "", `unknown unit "kh"`},
		{"mMx", 0, 3, "", `unknown unit "mMx"`},
	}
	for _, tt := range tests {
		_, err := runtime.ParseUnit(tt.text)
		var ue *runtime.UnitError
		if !errors.As(err, &ue) {
			t.Errorf("ParseUnit(%q): error %v (%T), want *UnitError", tt.text, err, err)
			continue
		}
		if ue.Off != tt.off || ue.Width != tt.width {
			t.Errorf("ParseUnit(%q): offset %d width %d, want %d %d (%s)", tt.text, ue.Off, ue.Width, tt.off, tt.width, ue.Msg)
		}
		if tt.msg != "" && ue.Error() != tt.msg {
			t.Errorf("ParseUnit(%q): message %q, want %q", tt.text, ue.Error(), tt.msg)
		}
		if tt.prefix != "" && !strings.HasPrefix(ue.Error(), tt.prefix) {
			t.Errorf("ParseUnit(%q): message %q, want it to start %q", tt.text, ue.Error(), tt.prefix)
		}
	}
}

// TestUnitPowerOverflow checks that a power that cannot be held in a Dim
// (int8 exponents) is an error, not a silently wrapped dimension: m^12
// raised to 12 is m^144, beyond int8's 127.
func TestUnitPowerOverflow(t *testing.T) {
	for _, text := range []string{"(m^12)^12", "(s^-12)^11", "((m^12)^10)*m^12"} {
		u, err := runtime.ParseUnit(text)
		var ue *runtime.UnitError
		if !errors.As(err, &ue) {
			t.Errorf("ParseUnit(%q) = Dim %v, error %v; want a *UnitError (exponent beyond ±127)", text, u.Dim, err)
		}
	}
	// Up to 127 still works: (m^12)^10 * m^7 = m^127.
	if u, err := runtime.ParseUnit("(m^12)^10*m^7"); err != nil || u.Dim != (runtime.Dim{127, 0, 0, 0, 0, 0, 0}) {
		t.Errorf("ParseUnit(\"(m^12)^10*m^7\") = %v, %v; want m^127", u.Dim, err)
	}
}

// TestUnitSymbolsDoNotCollide checks the rule in DEVELOPERS.md ("Adding a
// unit"): no catalogue symbol is also a prefix plus another prefixable
// symbol, and no spelling of a unit is an expression keyword.
func TestUnitSymbolsDoNotCollide(t *testing.T) {
	cat := runtime.Catalogue()
	prefixable := make(map[string]bool)
	for _, d := range cat {
		if d.Prefix {
			prefixable[d.Sym] = true
		}
	}
	for _, d := range cat {
		if lang.Keywords[d.Sym] {
			t.Errorf("unit %q is an expression keyword", d.Sym)
		}
		for _, p := range runtime.PrefixSymbols() {
			if rest, ok := strings.CutPrefix(d.Sym, p); ok && prefixable[rest] {
				t.Errorf("unit %q is also %s + %s", d.Sym, p, rest)
			}
			// "as" (atto + second) is the keyword of "expr as unit":
			// such a spelling must not be taken as a unit.
			if d.Prefix && lang.Keywords[p+d.Sym] && (runtime.UnitTable{}).IsUnit(p+d.Sym) {
				t.Errorf("prefixed unit %q is an expression keyword and is still taken as a unit", p+d.Sym)
			}
		}
	}
}

// TestIsUnit checks the lang.UnitNames side of the catalogue.
func TestIsUnit(t *testing.T) {
	var table runtime.UnitTable
	for name, want := range map[string]bool{
		"mT": true, "kg": true, "\u00b5Wb": true, "k\u03a9": true, "kohm": true, "MHz": true,
		"turns": true, "eV": true, "MeV": true,
		"xyz": false, "kmin": false, "": false, "m^2": false, "Tesla": false,
	} {
		if got := table.IsUnit(name); got != want {
			t.Errorf("IsUnit(%q) = %v, want %v", name, got, want)
		}
	}
	if got := table.SuggestUnit("Wbb"); got != "Wb" {
		t.Errorf("SuggestUnit(\"Wbb\") = %q, want \"Wb\" (one deletion away)", got)
	}
	if got := table.SuggestUnit("qqqqqq"); got != "" {
		t.Errorf("SuggestUnit(\"qqqqqq\") = %q, want no suggestion", got)
	}
}

// unitDim returns the dimension of a unit expression (for the other test
// files).
func unitDim(t *testing.T, text string) runtime.Dim {
	t.Helper()
	return mustParse(t, text).Dim
}

// q builds a quantity from a value in coherent SI units and a unit
// expression naming its dimension.
func q(t *testing.T, v float64, unit string) runtime.Quantity {
	t.Helper()
	if unit == "" || unit == "1" {
		return runtime.Num(v)
	}
	return runtime.Quantity{V: v, D: unitDim(t, unit)}
}
