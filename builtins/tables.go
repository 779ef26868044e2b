package builtins

import (
	"math"
	"sort"
	"strings"

	"loopwise/lang"
	"loopwise/runtime"
)

// Tables as values: columns and rows by name and number, extremes and
// where they occur, linear interpolation, new columns computed from others,
// and filters. Every builtin here takes the table first, then column names,
// then values; a column keeps its unit, and values given for a column must
// have that unit.

const refTables = "linear interpolation between neighbouring samples; comparisons in SI units"

// tableArg returns argument i as a table.
func tableArg(fn string, args []runtime.Value, i int) (*Table, error) {
	t, ok := args[i].(*Table)
	if !ok {
		return nil, errorf("%s: the %s argument must be a table (from sweep, sample_line, ...), not %s", fn, ordinal(i), runtime.TypeName(args[i]))
	}
	return t, nil
}

// columnArg returns argument i as the index of a column of t, named by a
// text such as "Bz".
func columnArg(fn string, t *Table, args []runtime.Value, i int) (int, error) {
	name, ok := args[i].(string)
	if !ok {
		return 0, errorf(`%s: the %s argument must name a column in quotes, such as "%s", not %s`, fn, ordinal(i), t.Cols[len(t.Cols)-1], runtime.TypeName(args[i]))
	}
	for j, c := range t.Cols {
		if c == name {
			return j, nil
		}
	}
	// a column named with another case is a likely slip
	for _, c := range t.Cols {
		if strings.EqualFold(c, name) {
			return 0, errorf(`%s: the table has no column %q; did you mean %q? (its columns: %s)`, fn, lang.Abbrev(name, 40), c, quoteCols(t.Cols))
		}
	}
	return 0, errorf(`%s: the table has no column %q; its columns: %s`, fn, lang.Abbrev(name, 40), quoteCols(t.Cols))
}

func quoteCols(cols []string) string {
	q := make([]string, len(cols))
	for j, c := range cols {
		q[j] = `"` + c + `"`
	}
	return strings.Join(q, ", ")
}

// cellQuantity is the value of column j in row r as a quantity.
func (t *Table) cellQuantity(j int, r []float64) runtime.Quantity {
	return runtime.Quantity{V: r[j], D: t.Dims[j], Cyc: t.cyc(j)}
}

func (t *Table) cyc(j int) bool { return j < len(t.Cyc) && t.Cyc[j] }

// pick is a table of the given columns and rows of t (nil: all rows).
func (t *Table) pick(cols []int, rows []int) *Table {
	out := &Table{Cols: make([]string, len(cols)), Dims: make([]runtime.Dim, len(cols)), Cyc: make([]bool, len(cols))}
	for k, j := range cols {
		out.Cols[k], out.Dims[k], out.Cyc[k] = t.Cols[j], t.Dims[j], t.cyc(j)
	}
	take := func(r []float64) {
		row := make([]float64, len(cols))
		for k, j := range cols {
			row[k] = r[j]
		}
		out.Rows = append(out.Rows, row)
	}
	if rows == nil {
		for _, r := range t.Rows {
			take(r)
		}
	} else {
		for _, i := range rows {
			take(t.Rows[i])
		}
	}
	return out
}

// slackRel is how far, relative to a column's largest magnitude, a value
// may lie outside a range and still count as inside it: sample points are
// computed (from + s·(to − from)) and carry a few roundings, so the sample
// meant to be at 1 mm may be a few ulps beyond it.
const slackRel = 1e-12

// slack is slackRel times column j's largest magnitude.
func (t *Table) slack(j int) float64 {
	m := 0.0
	for _, r := range t.Rows {
		m = math.Max(m, math.Abs(r[j]))
	}
	return slackRel * m
}

// valueFor returns argument i as a quantity of column j's unit.
func valueFor(fn string, t *Table, j int, args []runtime.Value, i int) (float64, error) {
	q, err := quantity(fn, args, i)
	if err != nil {
		return 0, err
	}
	if q.D != t.Dims[j] {
		return 0, errorf("%s: the %s argument must have the unit of column %q (%s), not %s%s", fn, ordinal(i), t.Cols[j], t.Dims[j].Describe(), q.D.Describe(), runtime.AngleNote(q.D, t.Dims[j]))
	}
	return q.V, nil
}

// rowNumber returns argument i as a row number of t, counted from 1.
func rowNumber(fn string, t *Table, args []runtime.Value, i int) (int, error) {
	x, err := number(fn, args, i)
	if err != nil {
		return 0, err
	}
	if x != math.Trunc(x) || x < 1 || x > float64(len(t.Rows)) {
		return 0, errorf("%s: the %s argument must be a row number from 1 to %d (rows count from 1), not %s", fn, ordinal(i), len(t.Rows), runtime.FormatNumber(x, 6))
	}
	return int(x) - 1, nil
}

func tableFuncs() []*runtime.Func {
	return []*runtime.Func{
		{
			Name: "column", Params: []string{"table", "name"}, MinArgs: 2, MaxArgs: 2, Call: columnBuiltin,
			Help: &runtime.Help{
				Signature: `column(table, name: text) -> table`,
				Summary:   `The column of that name, as a table of one column in its own unit. Column names are as the table shows them, without the unit: "Bz", "|B|", "x".`,
				Example:   "axis = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 5)\ncolumn(axis, \"Bz\")",
				Reference: refTables,
			},
		},
		{
			Name: "row", Params: []string{"table", "i"}, MinArgs: 2, MaxArgs: 2, Call: rowBuiltin,
			Help: &runtime.Help{
				Signature: `row(table, i: whole number) -> table`,
				Summary:   "Row i (counted from 1) as a table of one row.",
				Example:   "k(d) = maxwell_mutual(20 mm, 15 mm, d) / (1 uH)\ngaps = sweep(k, 0 mm, 20 mm, 5)\nrow(gaps, 2)",
				Reference: refTables,
			},
		},
		{
			Name: "cell", Params: []string{"table", "name", "i"}, MinArgs: 3, MaxArgs: 3, Call: cellBuiltin,
			Help: &runtime.Help{
				Signature: `cell(table, name: text, i: whole number) -> unit of the column`,
				Summary:   "The value in column name, row i (counted from 1), as a quantity.",
				Example:   "k(d) = maxwell_mutual(20 mm, 15 mm, d) / (1 uH)\ngaps = sweep(k, 0 mm, 20 mm, 5)\ncell(gaps, \"k\", 2)",
				Reference: refTables,
			},
		},
		extremeFunc("max_of", "largest", +1),
		extremeFunc("min_of", "smallest", -1),
		whereFunc("where_max", "largest", +1),
		whereFunc("where_min", "smallest", -1),
		{
			Name: "interpolate", Params: []string{"table", "by", "at", "name"}, MinArgs: 4, MaxArgs: 4, Call: interpolateBuiltin,
			Help: &runtime.Help{
				Signature: `interpolate(table, by: text, at: unit of column by, name: text) -> unit of column name`,
				Summary:   "The value of column name where column by equals at, by a straight line between the two neighbouring rows. Column by must rise or fall strictly from row to row; at must lie within its range (no extrapolation; 1e-12 of the column's largest value beyond an end counts as the end).",
				Method:    "linear interpolation: exact for a quantity that varies linearly between samples; otherwise the error is at most h²/8 times the largest |second derivative| for sample spacing h (sample more finely to reduce it)",
				Example:   "axis = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 101)\ninterpolate(axis, \"z\", 12 mm, \"Bz\")",
				Reference: "linear interpolation and its error bound: Burden & Faires, Numerical Analysis, 9th ed., 2011, Theorem 3.3 with n = 1",
			},
		},
		{
			Name: "rows_where", Params: []string{"table", "name", "lo", "hi"}, MinArgs: 4, MaxArgs: 4, Call: rowsWhereBuiltin,
			Help: &runtime.Help{
				Signature: `rows_where(table, name: text, lo, hi: unit of the column) -> table`,
				Summary:   "The rows whose value in column name lies from lo to hi (both included, to 1e-12 of the column's largest value, so samples meant to fall on lo or hi are kept despite rounding), in their order. An error if no row does.",
				Example:   "axis = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 11)\nrows_where(axis, \"z\", -10 mm, 10 mm)",
				Reference: refTables,
			},
		},
		{
			Name: "with_column", Params: []string{"table", "name", "f"}, MinArgs: 3, MaxArgs: 3, CallEnv: withColumnBuiltin,
			Help: &runtime.Help{
				Signature: `with_column(table, name: text, f: function whose parameters are named after columns) -> table`,
				Summary:   "The table with one more column, name, holding f of each row: f's parameters are matched by name to the table's columns (a parameter Bz takes column \"Bz\"), so the units are checked as f computes. f must return a quantity of one unit in every row.",
				Example:   "axis = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 5)\nH(Bz) = Bz / mu0\nwith_column(axis, \"H\", H)",
				Reference: "the example's H = B/µ0 − M with M = 0 in vacuum: Griffiths, Introduction to Electrodynamics, 4th ed., 2017, Eq. 6.18 (from memory)",
			},
		},
	}
}

func columnBuiltin(args []runtime.Value) (runtime.Value, error) {
	const fn = "column"
	t, err := tableArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	j, err := columnArg(fn, t, args, 1)
	if err != nil {
		return nil, err
	}
	return t.pick([]int{j}, nil), nil
}

func allCols(t *Table) []int {
	c := make([]int, len(t.Cols))
	for j := range c {
		c[j] = j
	}
	return c
}

func rowBuiltin(args []runtime.Value) (runtime.Value, error) {
	const fn = "row"
	t, err := tableArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	i, err := rowNumber(fn, t, args, 1)
	if err != nil {
		return nil, err
	}
	return t.pick(allCols(t), []int{i}), nil
}

func cellBuiltin(args []runtime.Value) (runtime.Value, error) {
	const fn = "cell"
	t, err := tableArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	j, err := columnArg(fn, t, args, 1)
	if err != nil {
		return nil, err
	}
	i, err := rowNumber(fn, t, args, 2)
	if err != nil {
		return nil, err
	}
	return t.cellQuantity(j, t.Rows[i]), nil
}

// extremeRow is the first row where column j is largest (sign +1) or
// smallest (sign −1).
func extremeRow(t *Table, j int, sign float64) int {
	best := 0
	for i, r := range t.Rows {
		if sign*r[j] > sign*t.Rows[best][j] {
			best = i
		}
	}
	return best
}

func extremeFunc(name, word string, sign float64) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"table", "name"}, MinArgs: 2, MaxArgs: 2,
		Help: &runtime.Help{
			Signature: name + `(table, name: text) -> unit of the column`,
			Summary:   "The " + word + " value in column name (signed: use the \"|B|\" column for the strongest field). The sampled value: for the extreme of a function between samples use " + map[bool]string{true: "maximize", false: "minimize"}[sign > 0] + ".",
			Example:   "axis = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 11)\n" + name + "(axis, \"Bz\")",
			Reference: refTables,
		},
		Call: func(args []runtime.Value) (runtime.Value, error) {
			t, err := tableArg(name, args, 0)
			if err != nil {
				return nil, err
			}
			j, err := columnArg(name, t, args, 1)
			if err != nil {
				return nil, err
			}
			if len(t.Rows) == 0 {
				return nil, errorf("%s: the table has no rows", name)
			}
			return t.cellQuantity(j, t.Rows[extremeRow(t, j, sign)]), nil
		},
	}
}

func whereFunc(name, word string, sign float64) *runtime.Func {
	return &runtime.Func{
		Name: name, Params: []string{"table", "name", "other"}, MinArgs: 3, MaxArgs: 3,
		Help: &runtime.Help{
			Signature: name + `(table, name: text, other: text) -> unit of column other`,
			Summary:   "The value of column other in the row where column name is " + word + " (the first such row if several tie).",
			Example:   "k(d) = maxwell_mutual(20 mm, 15 mm, d) / (1 uH)\ngaps = sweep(k, 0 mm, 20 mm, 5)\n" + name + "(gaps, \"k\", \"d\")",
			Reference: refTables,
		},
		Call: func(args []runtime.Value) (runtime.Value, error) {
			t, err := tableArg(name, args, 0)
			if err != nil {
				return nil, err
			}
			j, err := columnArg(name, t, args, 1)
			if err != nil {
				return nil, err
			}
			k, err := columnArg(name, t, args, 2)
			if err != nil {
				return nil, err
			}
			if len(t.Rows) == 0 {
				return nil, errorf("%s: the table has no rows", name)
			}
			return t.cellQuantity(k, t.Rows[extremeRow(t, j, sign)]), nil
		},
	}
}

func interpolateBuiltin(args []runtime.Value) (runtime.Value, error) {
	const fn = "interpolate"
	t, err := tableArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	jx, err := columnArg(fn, t, args, 1)
	if err != nil {
		return nil, err
	}
	x, err := valueFor(fn, t, jx, args, 2)
	if err != nil {
		return nil, err
	}
	jy, err := columnArg(fn, t, args, 3)
	if err != nil {
		return nil, err
	}
	n := len(t.Rows)
	if n < 2 {
		return nil, errorf("%s: interpolation needs at least two rows; the table has %d", fn, n)
	}
	col := func(i int) float64 { return t.Rows[i][jx] }
	rising := col(1) > col(0)
	for i := 1; i < n; i++ {
		if (rising && !(col(i) > col(i-1))) || (!rising && !(col(i) < col(i-1))) {
			return nil, errorf("%s: column %q must rise or fall strictly from row to row, but rows %d and %d hold %s and %s (interpolate by a column that is swept, or filter with rows_where first)", fn, t.Cols[jx], i, i+1,
				runtime.Format(t.cellQuantity(jx, t.Rows[i-1]), 6), runtime.Format(t.cellQuantity(jx, t.Rows[i]), 6))
		}
	}
	lo, hi := math.Min(col(0), col(n-1)), math.Max(col(0), col(n-1))
	if slack := t.slack(jx); x >= lo-slack && x <= hi+slack {
		x = math.Min(math.Max(x, lo), hi)
	}
	if x < lo || x > hi {
		return nil, errorf("%s: %s is outside column %q's range, %s to %s; interpolate does not extrapolate", fn,
			runtime.Format(runtime.Quantity{V: x, D: t.Dims[jx]}, 6), t.Cols[jx],
			runtime.Format(runtime.Quantity{V: lo, D: t.Dims[jx]}, 6), runtime.Format(runtime.Quantity{V: hi, D: t.Dims[jx]}, 6))
	}
	// the first row at or beyond x in the direction of the column
	i := sort.Search(n, func(i int) bool {
		if rising {
			return col(i) >= x
		}
		return col(i) <= x
	})
	y := t.Rows[i][jy]
	if col(i) != x { // strictly between rows i−1 and i
		x0, x1 := col(i-1), col(i)
		y0, y1 := t.Rows[i-1][jy], t.Rows[i][jy]
		s := (x - x0) / (x1 - x0)
		y = (1-s)*y0 + s*y1
	}
	return runtime.Quantity{V: y, D: t.Dims[jy], Cyc: t.cyc(jy)}, nil
}

func rowsWhereBuiltin(args []runtime.Value) (runtime.Value, error) {
	const fn = "rows_where"
	t, err := tableArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	j, err := columnArg(fn, t, args, 1)
	if err != nil {
		return nil, err
	}
	lo, err := valueFor(fn, t, j, args, 2)
	if err != nil {
		return nil, err
	}
	hi, err := valueFor(fn, t, j, args, 3)
	if err != nil {
		return nil, err
	}
	if lo > hi {
		return nil, errorf("%s: lo (%s) is above hi (%s)", fn, runtime.Format(runtime.Quantity{V: lo, D: t.Dims[j]}, 6), runtime.Format(runtime.Quantity{V: hi, D: t.Dims[j]}, 6))
	}
	slack := t.slack(j)
	var rows []int
	for i, r := range t.Rows {
		if r[j] >= lo-slack && r[j] <= hi+slack {
			rows = append(rows, i)
		}
	}
	if len(rows) == 0 {
		return nil, errorf("%s: no row has %q from %s to %s", fn, t.Cols[j], runtime.Format(runtime.Quantity{V: lo, D: t.Dims[j]}, 6), runtime.Format(runtime.Quantity{V: hi, D: t.Dims[j]}, 6))
	}
	return t.pick(allCols(t), rows), nil
}

func withColumnBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "with_column"
	t, err := tableArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	name, ok := args[1].(string)
	if !ok {
		return nil, errorf(`%s: the second argument must be the new column's name in quotes, such as "H", not %s`, fn, runtime.TypeName(args[1]))
	}
	if strings.TrimSpace(name) == "" || strings.ContainsAny(name, "[]\n\r\t,\"") || len([]rune(name)) > 40 {
		return nil, errorf("%s: a column name must be 1 to 40 characters without brackets, commas, quotes or line breaks, not %q", fn, lang.Abbrev(name, 40))
	}
	for _, c := range t.Cols {
		if c == name {
			return nil, errorf("%s: the table already has a column %q; choose another name", fn, name)
		}
	}
	f, ok := args[2].(*runtime.Func)
	if !ok {
		return nil, errorf("%s: the third argument must be a function whose parameters are named after columns, such as H(Bz) = Bz / mu0, not %s", fn, runtime.TypeName(args[2]))
	}
	if f.Help != nil || f.Body == "" {
		return nil, errorf("%s: give a function of your own whose parameters are named after columns, such as H(Bz) = Bz / mu0, not the builtin %s", fn, f.Name)
	}
	cols := make([]int, len(f.Params))
	for k, p := range f.Params {
		found := false
		for j, c := range t.Cols {
			if c == p {
				cols[k], found = j, true
				break
			}
		}
		if !found {
			return nil, errorf("%s: %s's parameter %q names no column of the table; its columns: %s", fn, f.Signature(), p, quoteCols(t.Cols))
		}
	}
	out := t.pick(allCols(t), nil)
	out.Cols = append(out.Cols, name)
	var dim runtime.Dim
	cyc := false
	spent := 0.0
	if env != nil {
		spent = env.Spent()
	}
	for i, r := range t.Rows {
		if env != nil {
			if err := env.Err(); err != nil {
				return nil, err
			}
		}
		in := make([]runtime.Value, len(cols))
		for k, j := range cols {
			in[k] = t.cellQuantity(j, r)
		}
		v, err := f.Invoke(env, in)
		if err != nil {
			return nil, err
		}
		if i == 0 && env != nil {
			per := math.Max(env.Spent()-spent, runtime.CallEvals)
			if err := env.Afford(fn, per*float64(len(t.Rows)-1)); err != nil {
				return nil, err
			}
		}
		q, ok := v.(runtime.Quantity)
		if !ok {
			return nil, errorf("%s: %s must return a quantity, not %s (for a vector, make one column per component)", fn, f.Signature(), runtime.TypeName(v))
		}
		if i == 0 {
			dim, cyc = q.D, q.Cyc
		} else if q.D != dim {
			return nil, errorf("%s: %s returns %s in row 1 but %s in row %d; a column has one unit", fn, f.Signature(), dim.Describe(), q.D.Describe(), i+1)
		}
		if math.IsNaN(q.V) || math.IsInf(q.V, 0) {
			return nil, errorf("%s: %s gives %s in row %d; a table holds only finite numbers", fn, f.Signature(), runtime.FormatNumber(q.V, 6), i+1)
		}
		out.Rows[i] = append(out.Rows[i], q.V)
	}
	out.Dims = append(out.Dims, dim)
	out.Cyc = append(out.Cyc, cyc)
	return out, nil
}
