package builtins_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// loopAxisB is the field on the axis of a circular loop of radius r
// carrying current i, at distance z from its centre:
// B = µ0 I R² / (2 (R² + z²)^(3/2)) (Griffiths, Introduction to
// Electrodynamics, 4th ed., 2017, Example 5.6, Eq. 5.41). Written here
// from the formula, sharing no code with the field kernel it checks.
func loopAxisB(i, r, z float64) float64 {
	return builtins.VacuumPermeability * i * r * r / (2 * math.Pow(r*r+z*z, 1.5))
}

func quantityOf(t *testing.T, v runtime.Value) runtime.Quantity {
	t.Helper()
	q, ok := v.(runtime.Quantity)
	if !ok {
		t.Fatalf("not a quantity: %v", v)
	}
	return q
}

func tableOf(t *testing.T, v runtime.Value) *builtins.Table {
	t.Helper()
	tab, ok := v.(*builtins.Table)
	if !ok {
		t.Fatalf("not a table: %v", v)
	}
	return tab
}

// TestTableAxisField samples a loop's axis field and checks the table
// operations against the closed-form axis formula.
func TestTableAxisField(t *testing.T) {
	const I, R = 2.0, 0.025
	// 1001 samples from −50 mm to 50 mm: spacing h = 0.1 mm, z = 0 is row 501
	ev, fail := evalIn(t, "axis = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 1001)")

	// the largest Bz is at the centre, a sample point: the closed form
	// B(0) = µ0 I / 2R (Griffiths Eq. 5.41 at z = 0); the kernel's elliptic
	// closed form agrees to rounding (1e-12 allows a few hundred ulps)
	b0 := loopAxisB(I, R, 0)
	if q := quantityOf(t, ev(`max_of(axis, "Bz")`)); math.Abs(q.V-b0) > 1e-12*b0 {
		t.Errorf("max_of Bz = %g, want %g (Griffiths Ex. 5.6)", q.V, b0)
	}
	if q := quantityOf(t, ev(`where_max(axis, "Bz", "z")`)); q.V != 0 {
		t.Errorf("where_max Bz at z = %g, want 0 (the field is largest at the centre)", q.V)
	}
	// the smallest is at an end, ±50 mm (the first row holds −50 mm)
	if q := quantityOf(t, ev(`where_min(axis, "Bz", "z")`)); math.Abs(q.V+0.05) > 1e-15 {
		t.Errorf("where_min Bz at z = %g, want -0.05", q.V)
	}
	if q := quantityOf(t, ev(`min_of(axis, "Bz")`)); math.Abs(q.V-loopAxisB(I, R, 0.05)) > 1e-12*b0 {
		t.Errorf("min_of Bz = %g, want %g", q.V, loopAxisB(I, R, 0.05))
	}

	// interpolation between samples: linear interpolation errs by at most
	// h²/8 · max|B''| (Burden & Faires, Numerical Analysis, 9th ed., 2011,
	// Theorem 3.3, n = 1). On the axis |B''| ≤ 3 B(0)/R² (its largest,
	// at z = 0, from differentiating Eq. 5.41 twice), so the bound is
	// 3 h² B(0) / (8 R²) = 6e-6 B(0); the check allows that plus rounding.
	h := 1e-4
	bound := 3*h*h*b0/(8*R*R) + 1e-12*b0
	for _, z := range []float64{0.01234, -0.0333, 0.00005, 0.049999} {
		got := quantityOf(t, ev(`interpolate(axis, "z", `+runtime.FormatNumber(z*1000, 12)+` mm, "Bz")`)).V
		if want := loopAxisB(I, R, z); math.Abs(got-want) > bound {
			t.Errorf("interpolate Bz at z = %g: %g, want %g ± %g (Griffiths Eq. 5.41)", z, got, want, bound)
		}
	}
	// at the ends, which are computed samples (from + s·(to − from)) and
	// may lie an ulp beyond the value asked for
	for _, z := range []float64{-0.05, 0.05} {
		got := quantityOf(t, ev(`interpolate(axis, "z", `+runtime.FormatNumber(z*1000, 12)+` mm, "Bz")`)).V
		if want := loopAxisB(I, R, z); math.Abs(got-want) > 1e-12*b0 {
			t.Errorf("interpolate Bz at the end z = %g: %g, want %g", z, got, want)
		}
	}
	// at a sample point interpolation returns the sample itself
	if q := quantityOf(t, ev(`interpolate(axis, "z", 0 mm, "Bz")`)); math.Abs(q.V-b0) > 1e-12*b0 {
		t.Errorf("interpolate at a sample: %g, want %g", q.V, b0)
	}

	// the filter keeps the rows from −1 mm to 1 mm: 21 samples
	w := tableOf(t, ev(`rows_where(axis, "z", -1 mm, 1 mm)`))
	if len(w.Rows) != 21 || len(w.Cols) != 8 {
		t.Fatalf("rows_where: %d rows of %d columns, want 21 of 8", len(w.Rows), len(w.Cols))
	}
	for _, r := range w.Rows {
		if r[3] < -0.001-1e-15 || r[3] > 0.001+1e-15 {
			t.Errorf("rows_where kept z = %g", r[3])
		}
	}

	// a computed column: H = B/µ0 at the centre is I/2R = 40 A/m
	// (Griffiths Eq. 5.41 with B = µ0 H in vacuum)
	ev("H(Bz) = Bz / mu0")
	hc := quantityOf(t, ev(`cell(with_column(axis, "H", H), "H", 501)`))
	if math.Abs(hc.V-I/(2*R)) > 1e-12*I/(2*R) {
		t.Errorf("H at the centre = %v, want %g A/m", hc, I/(2*R))
	}
	if got := runtime.Format(hc, 6); got != "40 A/m" {
		t.Errorf("H at the centre shows %q, want 40 A/m", got)
	}

	// one column and one row keep their units
	c := tableOf(t, ev(`column(axis, "Bz")`))
	if len(c.Cols) != 1 || c.Cols[0] != "Bz" || len(c.Rows) != 1001 || c.Rows[500][0] != quantityOf(t, ev(`cell(axis, "Bz", 501)`)).V {
		t.Errorf("column: %v, %d rows", c.Cols, len(c.Rows))
	}
	r := tableOf(t, ev(`row(axis, 501)`))
	if len(r.Rows) != 1 || r.Rows[0][3] != 0 {
		t.Errorf("row 501: %v", r.Rows)
	}

	// errors name the builtin, the argument and the unit
	for _, c := range []struct{ in, want string }{
		{`interpolate(axis, "z", 60 mm, "Bz")`, `interpolate: 60 mm is outside column "z"'s range, -50 mm to 50 mm; interpolate does not extrapolate`},
		{`interpolate(axis, "z", 1 s, "Bz")`, `interpolate: the third argument must have the unit of column "z" (length (m)), not time (s)`},
		{`interpolate(axis, "Bz", 10 uT, "z")`, `interpolate: column "Bz" must rise or fall strictly from row to row`},
		{`max_of(axis, "bz")`, `max_of: the table has no column "bz"; did you mean "Bz"?`},
		{`max_of(axis, Bz)`, `unknown name "Bz"`},
		{`max_of(axis, 3)`, `max_of: the second argument must name a column in quotes, such as "|B|", not a plain number`},
		{`cell(axis, "Bz", 1002)`, `cell: the third argument must be a row number from 1 to 1001 (rows count from 1), not 1002`},
		{`rows_where(axis, "z", 60 mm, 70 mm)`, `rows_where: no row has "z" from 60 mm to 70 mm`},
		{`rows_where(axis, "z", 1 mm, -1 mm)`, `rows_where: lo (1 mm) is above hi (-1 mm)`},
		{`with_column(axis, "Bz", H)`, `with_column: the table already has a column "Bz"`},
		{`with_column(axis, "G", G)`, `unknown name "G"`},
		{`column(3 mm, "z")`, `column: the first argument must be a table (from sweep, sample_line, ...), not length (m)`},
	} {
		err := fail(c.in)
		if le, ok := lang.AsError(err); !ok || le.Pos.Line != 20 || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v\nwant a positioned error on line 20 containing %s", c.in, err, c.want)
		}
	}
	ev("G(Bz, q) = Bz")
	if err := fail(`with_column(axis, "G", G)`); !strings.Contains(err.Error(), `with_column: G(Bz, q)'s parameter "q" names no column of the table`) {
		t.Errorf("with_column with an unknown parameter: %v", err)
	}
	ev("U(z) = z > 0 m ? 1 m : 1 s")
	if err := fail(`with_column(axis, "U", U)`); !strings.Contains(err.Error(), "with_column: U(z) returns time (s) in row 1 but length (m) in row 502; a column has one unit") {
		t.Errorf("with_column with a changing unit: %v", err)
	}
}

// TestTableSweepInterpolate: interpolation in a sweep of a linear
// function is exact (the interpolating line is the function: Burden &
// Faires 2011, Theorem 3.3, the error term vanishes when the second derivative is 0), also
// in a column that falls.
func TestTableSweepInterpolate(t *testing.T) {
	ev, _ := evalIn(t, "f(x) = 3 V/m * x + 2 V", "tab = sweep(f, 1 m, -1 m, 9)")
	for _, x := range []float64{-0.9, 0.3, 0.77} {
		got := quantityOf(t, ev(`interpolate(tab, "x", `+runtime.FormatNumber(x, 12)+` m, "f")`))
		if want := 3*x + 2; math.Abs(got.V-want) > 1e-15*8 {
			t.Errorf("f at %g: %g, want %g", x, got.V, want)
		}
	}
	// and backwards: x where f = 4 V is 2/3 m
	if got := quantityOf(t, ev(`interpolate(tab, "f", 4 V, "x")`)); math.Abs(got.V-2.0/3) > 1e-15 {
		t.Errorf("x where f = 4 V: %g, want 2/3", got.V)
	}
}

// TestSweep2AxisField: a grid over distance and loop radius of the axis
// field, row by row against the closed form (Griffiths, Introduction to
// Electrodynamics, 4th ed., 2017, Eq. 5.41); the kernel's elliptic closed
// form agrees with it to rounding (1e-12 relative allows a few hundred
// ulps). The first argument varies fastest.
func TestSweep2AxisField(t *testing.T) {
	ev, fail := evalIn(t, "B(z, R) = b_at(source(circle([0, 0, 0] m, [0, 0, 1], R), 2 A), [0, 0, 1] * z).z")
	tab := tableOf(t, ev("sweep2(B, -20 mm, 20 mm, 5, 10 mm, 30 mm, 3)"))
	if strings.Join(tab.Cols, ",") != "z,R,B" || len(tab.Rows) != 15 {
		t.Fatalf("sweep2: columns %v, %d rows; want z,R,B and 15", tab.Cols, len(tab.Rows))
	}
	for i, r := range tab.Rows {
		z, R := -0.02+0.01*float64(i%5), 0.01+0.01*float64(i/5)
		if math.Abs(r[0]-z) > 1e-17 || math.Abs(r[1]-R) > 1e-17 {
			t.Errorf("row %d at z = %g, R = %g; want %g, %g", i+1, r[0], r[1], z, R)
		}
		if want := loopAxisB(2, R, z); math.Abs(r[2]-want) > 1e-12*want {
			t.Errorf("row %d: B = %g, want %g (Griffiths Eq. 5.41)", i+1, r[2], want)
		}
	}
	// a vector result takes four columns, named after the function;
	// |h| at (1 m, 1 m) is √2 m (Pythagoras)
	ev("h(a, b) = [a, b, 0 m]")
	vt := tableOf(t, ev("sweep2(h, 0 m, 1 m, 2, 0 m, 1 m, 2)"))
	if strings.Join(vt.Cols, ",") != "a,b,h.x,h.y,h.z,|h|" || len(vt.Rows) != 4 || math.Abs(vt.Rows[3][5]-math.Sqrt2) > 1e-15 {
		t.Errorf("sweep2 of a vector: %v %v", vt.Cols, vt.Rows)
	}
	for _, c := range []struct{ in, want string }{
		{"sweep2(B, 0 mm, 1 s, 2, 1 mm, 2 mm, 2)", "sweep2: x_from and x_to must have one unit; got length (m) and time (s)"},
		{"sweep2(B, 0 mm, 1 mm, 2, 1 mm, 2 mm, 1)", "sweep2: the seventh argument must be a whole number from 2 to 100000, not 1"},
		{"sweep2(B, 0 mm, 1 mm, 1000, 1 mm, 2 mm, 1000)", "sweep2: 1000 × 1000 points is more than the limit of 100000"},
		{"sweep2(sin, 0 mm, 1 mm, 2, 1 mm, 2 mm, 2)", "sweep2: the function sin(x) must take exactly two arguments"},
	} {
		if err := fail(c.in); !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v\nwant %s", c.in, err, c.want)
		}
	}
}

// TestSweep2Budget: the grid's work is estimated from its first call and
// refused before it runs when it would not fit the budget (the estimate,
// 100 000 calls of a user function at runtime.CallEvals or more each, is
// at least 1.5e7 evaluations, beyond a budget of 1e6).
func TestSweep2Budget(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	s.Budget = 0.01
	eval(t, s, "f(x, y) = x * y")
	_, err := s.Eval(lang.Pos{Line: 2, Col: 1}, "sweep2(f, 0 m, 1 m, 1000, 0 m, 1 m, 100)")
	if !errors.Is(err, runtime.ErrBudget) || !strings.Contains(err.Error(), "sweep2: this needs about") {
		t.Errorf("a grid over the budget: %v", err)
	}
}
