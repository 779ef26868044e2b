package builtins_test

import (
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestConstants checks the constants against their sources: c and e are
// exact by the definition of the SI (SI Brochure, 9th ed., 2019, Table 1);
// μ0 and ε0 are the CODATA 2018 recommended values (Tiesinga et al., Rev.
// Mod. Phys. 93, 025010, 2021): μ0 = 1.25663706212(19)e-6 N/A²,
// ε0 = 8.8541878128(13)e-12 F/m. Each is typed here from the source and
// compared exactly (tolerance 0: a literal against a literal), with its
// unit; then ε0·μ0·c² = 1, which CODATA's adjustment imposes, to within the
// rounding of the 11-digit published values (relative 2e-11).
func TestConstants(t *testing.T) {
	cases := []struct {
		name, unit string
		want       float64
	}{
		{"c", "m/s", 299792458},
		{"e", "C", 1.602176634e-19},
		{"mu0", "N/A^2", 1.25663706212e-6},
		{"eps0", "F/m", 8.8541878128e-12},
		{"pi", "1", 3.141592653589793},
	}
	s := runtime.NewSession(builtins.Standard())
	for _, c := range cases {
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.name)
		if err != nil {
			t.Fatal(err)
		}
		q, ok := res.Value.(runtime.Quantity)
		u, _ := runtime.ParseUnit(c.unit)
		if !ok || q.D != u.Dim || q.V != c.want {
			t.Errorf("%s = %v, want %g %s", c.name, res.Value, c.want, c.unit)
		}
	}
	res, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "eps0 * mu0 * c^2")
	if err != nil {
		t.Fatal(err)
	}
	q := res.Value.(runtime.Quantity)
	if !q.D.IsZero() || !scalar.EqualWithinAbsOrRel(q.V, 1, 0, 2e-11) {
		t.Errorf("eps0·mu0·c² = %v, want 1", res.Value)
	}
}
