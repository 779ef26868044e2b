package runtime

import (
	"fmt"
	"math"
	"strings"
	"unicode/utf8"

	"loopwise/lang"
)

// Sensitivity is the table "which tolerance matters" for one result: each
// uncertain input it reads, its estimate and standard uncertainty, the
// sensitivity coefficient c_i = ∂y/∂x_i (the central difference over
// x_i ± u_i, see uncertain.go), the contribution c_i·u_i and its share of
// the variance, (c_i·u_i)²/u(y)² (GUM §5.1.3, eqs. (10), (11a)).
type Sensitivity struct {
	Target string   // the expression
	Y      Quantity // its estimate
	U      float64  // its combined standard uncertainty
	Rows   []Contribution
	// Corr is the correlation terms' part of u(y)², Σ_{i≠j} c_i·u_i·c_j·u_j·r_ij
	// (GUM §5.2.2, eq. (16)); 0 for independent inputs.
	Corr float64
}

func (t *Sensitivity) Kind() string { return "a sensitivity table" }

// Summary is the one line recorded for the table (its rows follow).
func (t *Sensitivity) Summary(digits int) string {
	y, _ := FormatUncertain(t.Y, []float64{t.U}, "", digits, false)
	return fmt.Sprintf("sensitivity of %s = %s: %d input%s", t.Target, y, len(t.Rows), plural(len(t.Rows)))
}

// Show lays the table out for people, largest share first as entered.
func (t *Sensitivity) Show(digits int) string {
	cells := [][]string{{"input", "estimate ± u", "sensitivity c", "c·u", "share"}}
	for _, r := range t.Rows {
		in := r.Input
		est, _ := FormatUncertain(in.Value, []float64{in.U}, "", digits, false)
		c := "—"
		if in.U > 0 {
			c = Format(Quantity{V: r.CU[0] / in.U, D: t.Y.D.Div(in.Value.D)}, min(digits, 4))
		}
		cells = append(cells, []string{in.Label, est, c, Format(Quantity{V: r.CU[0], D: t.Y.D}, min(digits, 3)), t.share(r)})
	}
	if t.Corr != 0 && t.U > 0 {
		// the correlation terms' share, so that the shares add up to
		// 100 %; negative where correlation lowers u(y)
		cells = append(cells, []string{"(correlations)", "", "", "", FormatNumber(100*t.Corr/(t.U*t.U), 3) + " %"})
	}
	width := make([]int, len(cells[0]))
	for _, row := range cells {
		for j, c := range row {
			width[j] = max(width[j], utf8.RuneCountInString(c))
		}
	}
	var b strings.Builder
	b.WriteString(t.Summary(digits) + "\n")
	for i, row := range cells {
		for j, c := range row {
			if j > 0 {
				b.WriteString("  ")
			}
			b.WriteString(c + strings.Repeat(" ", width[j]-utf8.RuneCountInString(c)))
		}
		if i < len(cells)-1 {
			b.WriteString("\n")
		}
	}
	lines := strings.Split(b.String(), "\n")
	for i := range lines {
		lines[i] = strings.TrimRight(lines[i], " ")
	}
	return strings.Join(lines, "\n")
}

func (t *Sensitivity) share(r Contribution) string {
	if t.U == 0 {
		return "—"
	}
	return FormatNumber(100*r.CU[0]*r.CU[0]/(t.U*t.U), 3) + " %"
}

// Tabulate gives the recorded columns: each input's contribution c·u (in
// the result's unit) and share of the variance (percent).
func (t *Sensitivity) Tabulate() ([]string, []Dim, [][]float64) {
	rows := make([][]float64, len(t.Rows))
	for i, r := range t.Rows {
		share := 0.0
		if t.U > 0 {
			share = 100 * r.CU[0] * r.CU[0] / (t.U * t.U)
		}
		rows[i] = []float64{r.CU[0], share}
	}
	return []string{"c·u", "share %"}, []Dim{t.Y.D, Dimensionless}, rows
}

// RowLabels names the rows by input.
func (t *Sensitivity) RowLabels() []string {
	out := make([]string, len(t.Rows))
	for i, r := range t.Rows {
		out[i] = r.Input.Label
	}
	return out
}

// LabelHeading heads the row names.
func (t *Sensitivity) LabelHeading() string { return "input" }

// sensitivityOf handles "sensitivity(expr)": expr is evaluated as a
// statement of its own and its contributions become the table.
func (s *Session) sensitivityOf(st *lang.Statement) (*Result, bool, error) {
	call, ok := s.matchForm(st, "sensitivity")
	if !ok {
		return nil, false, nil
	}
	whole := call.errorf
	if len(call.args) != 1 {
		return nil, true, whole("sensitivity takes one expression: sensitivity(M)")
	}
	inner := call.sub(call.args[0])
	if strings.TrimSpace(inner.Expr) == "" {
		return nil, true, whole("sensitivity takes one expression: sensitivity(M)")
	}
	res, err := s.Exec(inner)
	if err != nil {
		return nil, true, err
	}
	s.Transcript = s.Transcript[:len(s.Transcript)-1] // the table stands for it
	q, ok := res.Value.(Quantity)
	if !ok {
		return nil, true, whole("sensitivity needs a number; %s is %s (for a vector take a component, such as .z; for a complex value abs() or re())", strings.TrimSpace(inner.Expr), TypeName(res.Value))
	}
	if len(res.Contributions) == 0 {
		return nil, true, whole("%s reads no uncertain value (enter one as 12 mm ± 0.1 mm)", strings.TrimSpace(inner.Expr))
	}
	u := s.combined(res.Contributions)[0]
	if math.IsNaN(u) {
		u = 0
	}
	var own float64
	for _, c := range res.Contributions {
		own += c.CU[0] * c.CU[0]
	}
	t := &Sensitivity{Target: strings.TrimSpace(inner.Expr), Y: q, U: u, Rows: res.Contributions, Corr: u*u - own}
	if math.Abs(t.Corr) <= 1e-12*own {
		t.Corr = 0 // rounding of independent inputs' sum
	}
	return &Result{Stmt: st, Value: t}, true, nil
}

// finishTable completes the result of a statement whose value is a table
// made by the session itself (not by the expression engine).
func (s *Session) finishTable(st *lang.Statement, v Shower) (*Result, error) {
	text := v.Show(s.Digits)
	if st.Kind == lang.Assign {
		if err := s.assign(st, v); err != nil {
			return nil, err
		}
		s.setWorlds(st.Name, nil)
		text = v.Summary(s.Digits) // shown in full by typing its name
	}
	res := &Result{Stmt: st, Value: v, Text: text, Record: v.Summary(max(RecordDigits, s.Digits))}
	s.Transcript = append(s.Transcript, Entry{Line: st.Text, Record: res.Record, more: func() []string { return moreLines(res) }})
	return res, nil
}

// sessionFuncs are the builtins the session provides itself: they work on
// a whole statement, not on values.
func sessionFuncs() []*Func {
	whole := func(name string) func([]Value) (Value, error) {
		return func([]Value) (Value, error) {
			return nil, fmt.Errorf("%s(...) must be the whole statement, as in %s(M)", name, name)
		}
	}
	return []*Func{
		{Name: "sensitivity", Params: []string{"expression"}, MinArgs: 1, MaxArgs: 1, Call: whole("sensitivity"), Help: &Help{
			Family:    "uncertainty",
			Signature: "sensitivity(expression: a number that reads uncertain values) -> table",
			Summary:   "Which tolerance matters: for each uncertain input (a value entered as 12 mm ± 0.1 mm) the expression reads, directly or through names, paths and functions, its estimate ± u, the sensitivity coefficient c = ∂y/∂x, the contribution c·u and its share of the variance (c·u)²/u(y)²; with correlated inputs (correlate) a last row gives the correlation terms' share, so that the shares add up to 100 %. Write it as a statement of its own.",
			Method:    "Every statement that reads uncertain inputs is also evaluated with each input moved to x − u and x + u, the others at their estimates; c·u = (y(x + u) − y(x − u))/2, a central difference of the actual computation (exact for a result linear or quadratic in x, otherwise within (u²/6)·|y‴/y′| of the derivative at x), and u(y) = √Σ(c·u)² for independent inputs (with correlate, plus the terms 2·c_i·u_i·c_j·u_j·r_ij). One input read twice is one input, so x − x has no uncertainty. Each input costs two more evaluations of every statement that reads it.",
			Example:   "I = 2 A ± 2 %\nR = 5 ohm ± 0.05 ohm\nP = I^2 * R\nsensitivity(P)",
			Reference: "JCGM 100:2008 (GUM) §5.1.2 eq. (10), §5.1.3; central differences with the step u as in J. Kragten, Analyst 119 (1994) 2161",
		}},
		{Name: "correlate", Params: []string{"a", "b", "r"}, MinArgs: 3, MaxArgs: 3, Call: whole("correlate"), Help: &Help{
			Family:    "uncertainty",
			Signature: "correlate(a: name of an uncertain input, b: another, r: plain number from -1 to 1)",
			Summary:   "Gives two uncertain inputs (names assigned a ± value) the correlation coefficient r, as when both were measured with one instrument. First order then adds 2·c_a·u_a·c_b·u_b·r to u², and Monte Carlo draws the inputs jointly. Correlate inputs before using them. Write it as a statement of its own.",
			Method:    "u(y)² = Σ_ij c_i·u_i·c_j·u_j·r_ij; Monte Carlo draws z' = L·z with L the Cholesky factor of the correlation matrix (gonum), which must be positive definite: inconsistent coefficients are refused.",
			Example:   "V = 5 V ± 0.01 V\nI = 20 mA ± 0.02 mA\ncorrelate(V, I, 0.5)\nV / I",
			Reference: "JCGM 100:2008 (GUM) §5.2, eq. (16), annex H.2; JCGM 101:2008 §6.4.8",
		}},
		{Name: "monte_carlo", Params: []string{"expression", "trials", "seed"}, MinArgs: 2, MaxArgs: 3, Call: whole("monte_carlo"), Help: &Help{
			Family:    "uncertainty",
			Signature: "monte_carlo(expression: a number that reads uncertain values, trials: 1000 to 1000000 or \"adaptive\"[, seed: whole number, default 1]) -> table",
			Summary:   "The distribution of a result when the inputs are drawn at random: its mean ± standard deviation, the 95 % coverage interval, and whether the first-order result (y ± u) agrees with it — where it does not, the result is too far from linear over the inputs' spread and the Monte Carlo interval is the one to use. The table is a histogram of the middle 99.8 % (y, count, and the count the first-order Gaussian expects): plot(table, \"y\", \"count\", \"normal\") draws it. Write it as a statement of its own.",
			Method:    "Each input gets the Gaussian distribution of its estimate and standard uncertainty; a trial draws all of them (PCG generator seeded by seed and the trial number, so replay is exact) and re-runs the assignments made since the first uncertain input, then the expression. The interval is the probabilistically symmetric one from the sorted results. First order agrees when both ends of y ± 1.96u are within the tolerance of the Monte Carlo ends: half a unit in u's second significant digit, or twice the ends' own Monte Carlo standard error (from ten batches) when the trials cannot resolve that. With \"adaptive\", batches of 10⁴ trials run until twice the standard deviation of the batch values of the mean, u and both interval ends (over √h for h batches) is within half a unit in u's second significant digit, at least two batches and at most 10⁶ trials (the result says whether it got there). Every trial costs a re-run of those statements: the work budget applies.",
			Example:   "x = 1 ± 0.5\nmonte_carlo(exp(x), 2000)\nmonte_carlo(exp(x), \"adaptive\")",
			Reference: "JCGM 101:2008 (GUM Supplement 1) §6.4.7, §7.7, §7.9, §8",
		}},
	}
}
