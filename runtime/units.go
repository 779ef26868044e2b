package runtime

import (
	"fmt"
	"math"
	"math/big"
	"sort"
	"strconv"
	"strings"
	"sync"
	"unicode"
	"unicode/utf8"

	"loopwise/lang"
)

// UnitDef is one entry of the unit catalogue. The unit's size in SI is
// Factor × 10^Exp10 of the coherent SI unit of Dim; keeping the power of ten
// apart lets literals such as "5 µT" be built from decimal text exactly.
type UnitDef struct {
	Sym     string
	Name    string
	Factor  float64
	Exp10   int
	Dim     Dim
	Prefix  bool   // accepts SI prefixes
	Exact   bool   // the factor is exact by definition
	Defined string // where the factor comes from
	// Offset is the SI value of the scale's zero (273.15 K for °C): a
	// number n in this unit is n×Factor + Offset. A unit with an offset
	// may only stand alone after a number.
	Offset float64
}

func dim(m, kg, s, a, k, mol, cd int8) Dim { return Dim{m, kg, s, a, k, mol, cd, 0} }

var (
	dLength  = dim(1, 0, 0, 0, 0, 0, 0)
	dMass    = dim(0, 1, 0, 0, 0, 0, 0)
	dTime    = dim(0, 0, 1, 0, 0, 0, 0)
	dCurrent = dim(0, 0, 0, 1, 0, 0, 0)
	dFreq    = dim(0, 0, -1, 0, 0, 0, 0)
	dForce   = dim(1, 1, -2, 0, 0, 0, 0)
	dEnergy  = dim(2, 1, -2, 0, 0, 0, 0)
	dPower   = dim(2, 1, -3, 0, 0, 0, 0)
	dCharge  = dim(0, 0, 1, 1, 0, 0, 0)
	dVolt    = dim(2, 1, -3, -1, 0, 0, 0)
	dOhm     = dim(2, 1, -3, -2, 0, 0, 0)
	dTesla   = dim(0, 1, -2, -1, 0, 0, 0)
	dWeber   = dim(2, 1, -2, -1, 0, 0, 0)
	dHenry   = dim(2, 1, -2, -2, 0, 0, 0)
	dFarad   = dim(-2, -1, 4, 2, 0, 0, 0)
	dAngle   = Dim{Angle: 1}
	dTemp    = dim(0, 0, 0, 0, 1, 0, 0)
)

const (
	siBrochure = "SI Brochure, 9th ed. (BIPM 2019)"
	nist811    = "NIST SP 811 (2008), Appendix B"
)

// catalogue lists every unit symbol Loopwise knows.
var catalogue = []UnitDef{
	{Sym: "m", Name: "metre", Factor: 1, Dim: dLength, Prefix: true, Exact: true, Defined: siBrochure + " Table 2"},
	{Sym: "g", Name: "gram", Factor: 1, Exp10: -3, Dim: dMass, Prefix: true, Exact: true, Defined: siBrochure + " Table 2"},
	{Sym: "s", Name: "second", Factor: 1, Dim: dTime, Prefix: true, Exact: true, Defined: siBrochure + " Table 2"},
	{Sym: "A", Name: "ampere", Factor: 1, Dim: dCurrent, Prefix: true, Exact: true, Defined: siBrochure + " Table 2"},
	{Sym: "K", Name: "kelvin", Factor: 1, Dim: dTemp, Prefix: true, Exact: true, Defined: siBrochure + " Table 2"},
	{Sym: "mol", Name: "mole", Factor: 1, Dim: dim(0, 0, 0, 0, 0, 1, 0), Prefix: true, Exact: true, Defined: siBrochure + " Table 2"},
	{Sym: "cd", Name: "candela", Factor: 1, Dim: dim(0, 0, 0, 0, 0, 0, 1), Prefix: true, Exact: true, Defined: siBrochure + " Table 2"},

	// Plane angle is a dimension of its own here (see Dim); the radian is
	// its coherent unit and the steradian is rad^2 (SI Brochure, Table 4:
	// 1 sr = 1 m^2/m^2, the solid angle of area r^2 on a sphere of radius
	// r, which is the square of the radian in this system).
	{Sym: "rad", Name: "radian", Factor: 1, Dim: dAngle, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "sr", Name: "steradian", Factor: 1, Dim: dAngle.Pow(2), Exact: true, Defined: siBrochure + " Table 4 (rad^2)"},
	// The hertz counts cycles per second and carries no angle: 50 Hz is
	// 50 s^-1, not 50 rad/s (SI Brochure, 9th ed., Table 4, note on Hz and
	// rad/s).
	{Sym: "Hz", Name: "hertz", Factor: 1, Dim: dFreq, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "N", Name: "newton", Factor: 1, Dim: dForce, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "Pa", Name: "pascal", Factor: 1, Dim: dim(-1, 1, -2, 0, 0, 0, 0), Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "J", Name: "joule", Factor: 1, Dim: dEnergy, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "W", Name: "watt", Factor: 1, Dim: dPower, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "C", Name: "coulomb", Factor: 1, Dim: dCharge, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "V", Name: "volt", Factor: 1, Dim: dVolt, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "F", Name: "farad", Factor: 1, Dim: dFarad, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "Ω", Name: "ohm", Factor: 1, Dim: dOhm, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "ohm", Name: "ohm", Factor: 1, Dim: dOhm, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "\u2126", Name: "ohm (ohm sign U+2126)", Factor: 1, Dim: dOhm, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "S", Name: "siemens", Factor: 1, Dim: dOhm.Pow(-1), Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "Wb", Name: "weber", Factor: 1, Dim: dWeber, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "T", Name: "tesla", Factor: 1, Dim: dTesla, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},
	{Sym: "H", Name: "henry", Factor: 1, Dim: dHenry, Prefix: true, Exact: true, Defined: siBrochure + " Table 4"},

	{Sym: "L", Name: "litre", Factor: 1, Exp10: -3, Dim: dLength.Pow(3), Prefix: true, Exact: true, Defined: siBrochure + " Table 8"},
	{Sym: "min", Name: "minute", Factor: 60, Dim: dTime, Exact: true, Defined: siBrochure + " Table 8"},
	{Sym: "h", Name: "hour", Factor: 3600, Dim: dTime, Exact: true, Defined: siBrochure + " Table 8"},
	{Sym: "deg", Name: "degree of angle", Factor: math.Pi / 180, Dim: dAngle, Defined: siBrochure + " Table 8 (π/180 rad)"},
	{Sym: "rev", Name: "revolution (full turn)", Factor: 2 * math.Pi, Dim: dAngle, Defined: nist811 + " (1 r = 2π rad)"},
	// °C gives an absolute temperature: 20 °C is 293.15 K (SI Brochure,
	// 9th ed., §2.3.1 and Table 4: t/°C = T/K − 273.15). It has an offset,
	// so it may only follow a number directly; a temperature difference is
	// written in K.
	{Sym: "°C", Name: "degree Celsius", Factor: 1, Dim: dTemp, Exact: true, Offset: 273.15, Defined: siBrochure + " Table 4 (T/K = t/°C + 273.15)"},
	{Sym: "degC", Name: "degree Celsius", Factor: 1, Dim: dTemp, Exact: true, Offset: 273.15, Defined: siBrochure + " Table 4 (T/K = t/°C + 273.15)"},
	{Sym: "eV", Name: "electronvolt", Factor: 1.602176634, Exp10: -19, Dim: dEnergy, Prefix: true, Exact: true, Defined: siBrochure + " Table 8 (e × 1 V)"},
	{Sym: "gauss", Name: "gauss", Factor: 1, Exp10: -4, Dim: dTesla, Prefix: true, Exact: true, Defined: nist811 + " (1 G = 1e-4 T)"},
	{Sym: "maxwell", Name: "maxwell", Factor: 1, Exp10: -8, Dim: dWeber, Exact: true, Defined: nist811 + " (1 Mx = 1e-8 Wb)"},
	{Sym: "Mx", Name: "maxwell", Factor: 1, Exp10: -8, Dim: dWeber, Exact: true, Defined: nist811 + " (1 Mx = 1e-8 Wb)"},
	{Sym: "inch", Name: "inch", Factor: 254, Exp10: -4, Dim: dLength, Exact: true, Defined: nist811 + " (1 in = 0.0254 m)"},
	{Sym: "mil", Name: "mil (thou)", Factor: 254, Exp10: -7, Dim: dLength, Exact: true, Defined: nist811 + " (1 mil = 2.54e-5 m)"},
	{Sym: "ft", Name: "foot", Factor: 3048, Exp10: -4, Dim: dLength, Exact: true, Defined: nist811 + " (1 ft = 0.3048 m)"},
	// rpm is an angular velocity, one revolution a minute: 3000 rpm is
	// 314.159 rad/s (NIST SP 811 lists 1 r/min = 0.1047198 rad/s = 2π/60).
	// Its revolutions per second are (3000 rpm / 1 rev) as Hz.
	{Sym: "rpm", Name: "revolution per minute", Factor: 2 * math.Pi / 60, Dim: dAngle.Div(dTime), Defined: nist811 + " (1 r/min = 2π/60 rad/s ≈ 0.1047198 rad/s)"},
	{Sym: "turns", Name: "turns (a count)", Factor: 1, Exact: true, Defined: "a dimensionless count"},
	{Sym: "turn", Name: "turn (a count)", Factor: 1, Exact: true, Defined: "a dimensionless count"},
}

// siPrefixes lists the accepted SI prefixes, smallest first: the twenty of
// the SI Brochure, 9th ed. (2019), Table 7, and ronna, quetta, ronto and
// quecto added by the 27th CGPM (2022), Resolution 3. "u" is accepted for
// micro beside "µ" (U+00B5) and "μ" (U+03BC). lookupAtom tries "da" before
// "d" and an exact unit symbol before any prefix.
var siPrefixes = []struct {
	Sym   string
	Exp10 int
}{
	{"q", -30}, {"r", -27}, {"y", -24}, {"z", -21}, {"a", -18},
	{"f", -15}, {"p", -12}, {"n", -9}, {"u", -6}, {"µ", -6}, {"μ", -6},
	{"m", -3}, {"c", -2}, {"d", -1}, {"da", 1}, {"h", 2}, {"k", 3}, {"M", 6}, {"G", 9}, {"T", 12},
	{"P", 15}, {"E", 18}, {"Z", 21}, {"Y", 24}, {"R", 27}, {"Q", 30},
}

var unitBySym = func() map[string]*UnitDef {
	m := make(map[string]*UnitDef, len(catalogue))
	for i := range catalogue {
		m[catalogue[i].Sym] = &catalogue[i]
	}
	return m
}()

// Catalogue returns the unit catalogue (read-only).
func Catalogue() []UnitDef { return catalogue }

// UnitExpr is the value of a unit expression: Factor × 10^Exp10 in the
// coherent SI unit of Dim.
type UnitExpr struct {
	Factor float64
	Exp10  int
	Dim    Dim
	// Cyc is set when the unit is the hertz alone (with any prefix): a
	// value written or shown in it counts cycles per second.
	Cyc bool
	// Offset is the SI value of the unit's zero (°C); only a unit written
	// alone has one.
	Offset float64
}

// Scale returns the size of the unit in coherent SI units.
func (u UnitExpr) Scale() float64 {
	return u.Factor * math.Pow10(u.Exp10)
}

func (u UnitExpr) mul(v UnitExpr) (UnitExpr, bool) {
	d, ok := u.Dim.Combine(1, v.Dim, 1)
	return UnitExpr{Factor: u.Factor * v.Factor, Exp10: u.Exp10 + v.Exp10, Dim: d}, ok
}

func (u UnitExpr) pow(n int) (UnitExpr, bool) {
	d, ok := u.Dim.Combine(n, Dimensionless, 0)
	return UnitExpr{Factor: math.Pow(u.Factor, float64(n)), Exp10: u.Exp10 * n, Dim: d}, ok
}

// lookupAtom resolves a unit symbol with an optional SI prefix: an exact
// symbol first, then the longest prefix that leaves a symbol that takes
// prefixes.
func lookupAtom(sym string) (UnitExpr, bool) {
	if d, ok := unitBySym[sym]; ok {
		return atomExpr(d, 0), true
	}
	if lang.Keywords[sym] {
		return UnitExpr{}, false // "as" is a keyword, not an attosecond
	}
	best := -1
	for i, p := range siPrefixes {
		if rest, ok := strings.CutPrefix(sym, p.Sym); ok && rest != "" {
			if d, ok := unitBySym[rest]; ok && d.Prefix && (best < 0 || len(p.Sym) > len(siPrefixes[best].Sym)) {
				best = i
			}
		}
	}
	if best < 0 {
		return UnitExpr{}, false
	}
	p := siPrefixes[best]
	return atomExpr(unitBySym[sym[len(p.Sym):]], p.Exp10), true
}

func atomExpr(d *UnitDef, exp10 int) UnitExpr {
	return UnitExpr{Factor: d.Factor, Exp10: d.Exp10 + exp10, Dim: d.Dim, Cyc: d.Sym == "Hz", Offset: d.Offset}
}

// UnitTable implements lang.UnitNames over the catalogue.
type UnitTable struct{}

// IsUnit reports whether name is a unit symbol, with or without a prefix.
func (UnitTable) IsUnit(name string) bool {
	_, ok := lookupAtom(name)
	return ok
}

// SuggestUnit returns the known unit symbol nearest to name, or "".
func (UnitTable) SuggestUnit(name string) string {
	return nearest(name, allUnitSpellings())
}

// allUnitSpellings lists every unit symbol with every prefix it takes.
var allUnitSpellings = sync.OnceValue(func() []string {
	var out []string
	for _, d := range catalogue {
		out = append(out, d.Sym)
		if d.Prefix {
			for _, p := range siPrefixes {
				out = append(out, p.Sym+d.Sym)
			}
		}
	}
	sort.Strings(out)
	return out
})

// UnitError is a problem in a unit expression at rune offset Off.
type UnitError struct {
	Off, Width int
	Msg        string
}

func (e *UnitError) Error() string { return e.Msg }

// ParseUnit evaluates a unit expression such as "kg*m^2/s^2", "A/ms",
// "uWb" or "1/(ohm*m)". Spaces are not allowed inside.
func ParseUnit(text string) (UnitExpr, error) {
	p := unitParser{r: []rune(text)}
	u, err := p.product()
	if err != nil {
		return UnitExpr{}, err
	}
	if p.i < len(p.r) {
		return UnitExpr{}, &UnitError{p.i, len(p.r) - p.i, fmt.Sprintf("unexpected %q in unit %q", lang.Abbrev(string(p.r[p.i:]), 40), lang.Abbrev(text, 40))}
	}
	return u, nil
}

type unitParser struct {
	r     []rune
	i     int
	depth int // open parentheses, bounded by lang.MaxNesting
}

func (p *unitParser) product() (UnitExpr, error) {
	u, err := p.factor()
	if err != nil {
		return u, err
	}
	for p.i < len(p.r) && (p.r[p.i] == '*' || p.r[p.i] == '/') {
		op := p.r[p.i]
		start := p.i
		p.i++
		v, err := p.factor()
		if err != nil {
			return u, err
		}
		if u.Offset != 0 || v.Offset != 0 {
			return u, offsetErr(p.r, start)
		}
		ok := true
		if op == '/' {
			v, ok = v.pow(-1)
		}
		if ok {
			u, ok = u.mul(v)
		}
		if !ok {
			return u, &UnitError{start, p.i - start, errExpRange}
		}
	}
	return u, nil
}

func (p *unitParser) factor() (UnitExpr, error) {
	var u UnitExpr
	start := p.i
	switch {
	case p.i >= len(p.r):
		return u, &UnitError{p.i, 1, "a unit is missing"}
	case p.r[p.i] == '(':
		if p.depth >= lang.MaxNesting {
			return u, &UnitError{p.i, 1, fmt.Sprintf("parentheses in a unit nest deeper than %d levels", lang.MaxNesting)}
		}
		p.i++
		p.depth++
		v, err := p.product()
		p.depth--
		if err != nil {
			return u, err
		}
		if p.i >= len(p.r) || p.r[p.i] != ')' {
			return u, &UnitError{start, 1, "'(' in a unit is never closed"}
		}
		p.i++
		u = v
	case p.r[p.i] == '1':
		p.i++
		u = UnitExpr{Factor: 1}
	case unicode.IsLetter(p.r[p.i]) || p.r[p.i] == 'µ' || p.r[p.i] == 'Ω' || p.r[p.i] == '°':
		p.i++
		for p.i < len(p.r) && (unicode.IsLetter(p.r[p.i]) || unicode.IsDigit(p.r[p.i]) || p.r[p.i] == '_' || p.r[p.i] == 'µ' || p.r[p.i] == 'Ω') {
			p.i++
		}
		sym := string(p.r[start:p.i])
		v, ok := lookupAtom(sym)
		if !ok {
			msg := fmt.Sprintf("unknown unit %q", lang.Abbrev(sym, 40))
			if s := (UnitTable{}).SuggestUnit(sym); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			}
			return u, &UnitError{start, p.i - start, msg}
		}
		u = v
	default:
		return u, &UnitError{p.i, 1, fmt.Sprintf("unexpected %q in a unit", p.r[p.i])}
	}
	if p.i < len(p.r) && p.r[p.i] == '^' {
		p.i++
		s := p.i
		if p.i < len(p.r) && p.r[p.i] == '-' {
			p.i++
		}
		for p.i < len(p.r) && (unicode.IsDigit(p.r[p.i]) || p.r[p.i] == '.') {
			p.i++
		}
		n, err := strconv.Atoi(string(p.r[s:p.i]))
		if err != nil || n > 12 || n < -12 {
			return u, &UnitError{s - 1, p.i - s + 1, "a unit power must be a whole number from -12 to 12"}
		}
		if u.Offset != 0 {
			return u, offsetErr(p.r, start)
		}
		var ok bool
		if u, ok = u.pow(n); !ok {
			return u, &UnitError{s - 1, p.i - s + 1, errExpRange}
		}
	}
	return u, nil
}

// offsetErr refuses °C inside a compound unit or under a power: with an
// offset, "°C/s" could mean a rate of absolute temperature or of a
// difference, and either reading would hide the 273.15.
func offsetErr(r []rune, at int) error {
	return &UnitError{0, len(r), fmt.Sprintf("°C has an offset (0 °C = 273.15 K), so it can only follow a number on its own; for a temperature difference or inside a compound unit use K (a difference of 1 °C is 1 K), as in %q", strings.ReplaceAll(strings.ReplaceAll(string(r), "°C", "K"), "degC", "K"))}
}

// LiteralValue builds the SI value of "number unit" from the decimal text of
// the number, so that "5 µT" is exactly the float64 nearest 5e-6.
func LiteralValue(number string, u UnitExpr) (float64, error) {
	mant, exp := number, 0
	if i := strings.IndexAny(number, "eE"); i >= 0 {
		mant = number[:i]
		e, err := strconv.Atoi(number[i+1:])
		if err != nil && !isRangeErr(err) {
			return 0, fmt.Errorf("bad exponent in %q", lang.Abbrev(number, 40))
		}
		// Clamp the exponent far beyond any float64 (1e±400 is already
		// out of range) so that adding the unit's power of ten cannot wrap
		// around: 1e9223372036854775805 km is too large, not 0 m.
		exp = max(-maxLiteralExp, min(e, maxLiteralExp))
	}
	v, err := strconv.ParseFloat(fmt.Sprintf("%se%d", mant, exp+u.Exp10), 64)
	if err != nil && !isRangeErr(err) {
		return 0, fmt.Errorf("bad number %q", number)
	}
	if u.Factor != 1 {
		v *= u.Factor
	}
	if u.Offset != 0 {
		v = offsetValue(mant, exp+u.Exp10, u)
	}
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, fmt.Errorf("number %q is too large", lang.Abbrev(number, 40))
	}
	return v, nil
}

// maxLiteralExp bounds the decimal exponent of a literal before the unit's
// power of ten is added; any larger exponent gives the same float64 (zero
// or infinity, or zero when the digits are all zeros).
const maxLiteralExp = 1_000_000

// offsetValue is mant×10^exp × Factor + Offset rounded once, so that
// "20 °C" is exactly the float64 nearest 293.15, as "293.15 K" is.
func offsetValue(mant string, exp int, u UnitExpr) float64 {
	r, ok := new(big.Rat).SetString(fmt.Sprintf("%se%d", mant, exp))
	off, ok2 := new(big.Rat).SetString(strconv.FormatFloat(u.Offset, 'g', -1, 64))
	f := new(big.Rat).SetFloat64(u.Factor)
	if !ok || !ok2 || f == nil {
		v, _ := strconv.ParseFloat(mant, 64)
		return v*math.Pow10(exp)*u.Factor + u.Offset
	}
	v, _ := r.Mul(r, f).Add(r, off).Float64()
	return v
}

func isRangeErr(err error) bool {
	ne, ok := err.(*strconv.NumError)
	return ok && ne.Err == strconv.ErrRange
}

// nearest returns the candidate closest to name by edit distance, if close
// enough to be a plausible misspelling.
func nearest(name string, cands []string) string {
	best, bestD := "", 1<<30
	n := utf8.RuneCountInString(name)
	for _, c := range cands {
		if abs(n-utf8.RuneCountInString(c)) > 2 {
			// the edit distance is at least the difference in length,
			// and no suggestion is further than 2 edits: this keeps the
			// search linear for a huge unknown name
			continue
		}
		d := editDistance(name, c)
		if d < bestD || (d == bestD && sharesFirst(name, c) && !sharesFirst(name, best)) {
			best, bestD = c, d
		}
	}
	limit := 1
	switch n := len([]rune(name)); {
	case n < 2:
		return "" // every one-letter name is one edit from every other
	case n > 3:
		limit = 2
	}
	if bestD <= limit {
		return best
	}
	return ""
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

func sharesFirst(a, b string) bool {
	return a != "" && b != "" && []rune(a)[0] == []rune(b)[0]
}

// PrefixSymbols lists the accepted SI prefix symbols, smallest first.
func PrefixSymbols() []string {
	out := make([]string, len(siPrefixes))
	for i, p := range siPrefixes {
		out[i] = p.Sym
	}
	return out
}
