package builtins_test

import (
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
)

// mu0 is the CODATA 2018 value of the magnetic constant (N/A²).
const mu0 = 1.25663706212e-6

// Gapped cores against the closed forms of the lumped magnetic circuit.
// An ungapped ring of material: L = μ0μr N² A/l (e.g. E. M. Purcell and
// D. J. Morin, Electricity and Magnetism, 3rd ed., 2013, §11.7; from
// memory). With a gap and no fringing: Ampère's law around the path with
// B continuous gives B = μ0 N I/(l_g + l_c/μr) and L = μ0 N² A/(l_g +
// l_c/μr) (N. Mohan, T. Undeland and W. Robbins, Power Electronics, 3rd
// ed., 2003, §30-4; from memory). With fringing, McLyman's inductance
// L = μ0 N² A F/(l_g + l_c/μr) (Transformer and Inductor Design Handbook,
// 3rd ed., 2004, ch. 8; from memory) agrees with ours when the gap
// dominates (μr → ∞). Tolerance 1e-12 relative: a few operations each.
func TestCoreClosedForms(t *testing.T) {
	lc, ac, lg, g, n, mur := 0.08, 1e-4, 1e-3, 0.02, 100.0, 2000.0
	f := 1 + lg/math.Sqrt(ac)*math.Log(2*g/lg)
	cases := []struct {
		in   string
		unit string
		want float64
		tol  float64 // relative, 1e-12 unless given
	}{
		{"core_inductance(80 mm, 1 cm^2, 0 m, 0 m, 100, 2000)", "H", mu0 * mur * n * n * ac / lc, 0},
		{"core_inductance(80 mm, 1 cm^2, 1 mm, 0 m, 100, 2000)", "H", mu0 * n * n * ac / (lg + lc/mur), 0},
		{"core_flux_density(80 mm, 1 cm^2, 1 mm, 0 m, 100, 2 A, 2000)", "T", mu0 * n * 2 / (lg + lc/mur), 0},
		{"fringing_factor(1 mm, 1 cm^2, 20 mm)", "1", f, 0},
		// the two fringing models differ by (l_c/μr)(F−1)/l_g ≈ 3e-11 here
		{"core_inductance(80 mm, 1 cm^2, 1 mm, 20 mm, 100, 1e12)", "H", mu0 * n * n * ac * f / (lg + lc/1e12), 1e-10},
		{"core_reluctance(80 mm, 1 cm^2, 1 mm, 20 mm, 2000)", "H^-1", lc/(mu0*mur*ac) + lg/(mu0*ac*f), 0},
	}
	for _, c := range cases {
		got := q(t, run(t, c.in), c.unit)
		tol := c.tol
		if tol == 0 {
			tol = 1e-12
		}
		if math.Abs(got-c.want) > tol*math.Abs(c.want) {
			t.Errorf("%s = %.15g, want %.15g", c.in, got, c.want)
		}
	}
}

// core_check: at the saturation current it reports, the flux density is
// B_sat (a consistency check of two results); the verdict changes on
// either side of it; an assumption outside its rule of thumb is flagged;
// the stored-energy caution appears above 20 J and not below.
func TestCoreCheck(t *testing.T) {
	rep := run(t, "core_check(80 mm, 1 cm^2, 1 mm, 20 mm, 100, 1 A, 2000, 0.3 T)").(*builtins.CoreReport)
	show := rep.Show(12)
	i := strings.Index(show, "saturates at ")
	if i < 0 || strings.Contains(show, "SATURATED") || strings.Contains(show, "NOT") {
		t.Fatalf("report: %s", show)
	}
	isat := strings.Fields(show[i+len("saturates at "):])
	b := q(t, run(t, "core_flux_density(80 mm, 1 cm^2, 1 mm, 20 mm, 100, "+isat[0]+" "+strings.TrimSuffix(isat[1], ",")+", 2000)"), "T")
	if math.Abs(b-0.3) > 1e-10 {
		t.Errorf("B at the saturation current %v = %g T, want 0.3 T", isat[:2], b)
	}
	if s := run(t, "core_check(80 mm, 1 cm^2, 1 mm, 20 mm, 100, 2 A, 2000, 0.3 T)").(*builtins.CoreReport).Show(6); !strings.Contains(s, "SATURATED") {
		t.Errorf("2 A should saturate: %s", s)
	}
	for _, c := range []struct{ in, flag string }{
		{"core_check(80 mm, 1 cm^2, 1 mm, 20 mm, 100, 1 A, 50, 0.3 T)", "NOT μr"},
		{"core_check(80 mm, 1 cm^2, 2 mm, 20 mm, 100, 1 A, 2000, 0.3 T)", "NOT gap"},
		{"core_check(20 mm, 1 cm^2, 1 mm, 20 mm, 100, 1 A, 2000, 0.3 T)", "NOT lumped"},
	} {
		if s := run(t, c.in).(*builtins.CoreReport).Show(6); !strings.Contains(s, c.flag) {
			t.Errorf("%s: want %q in\n%s", c.in, c.flag, s)
		}
	}
	// ½LI² with L = 163 mH (1000 turns): 20 J at about 15.7 A
	lo := run(t, "core_check(80 mm, 1 cm^2, 1 mm, 20 mm, 1000, 15 A, 2000, 100 T)")
	hi := run(t, "core_check(80 mm, 1 cm^2, 1 mm, 20 mm, 1000, 16 A, 2000, 100 T)")
	if builtins.Caution(lo) != "" || !strings.Contains(builtins.Caution(hi), "stores") {
		t.Errorf("cautions: %q / %q", builtins.Caution(lo), builtins.Caution(hi))
	}
}
