package runtime

import (
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"regexp"
	"strconv"
	"strings"
)

// Checking a script: each recorded result against what the program gives
// now, within a tolerance, and the report of what drifted.

// maxCellDrifts is how many drifted cells of one table are reported.
const maxCellDrifts = 5

// tableNoise is the fraction of a column's largest magnitude below which a
// cell is taken as rounding noise when a table is checked: far below the
// accuracy of any method here (the finest asks for 1e-12).
const tableNoise = 1e-12

// numberRE matches a decimal number in text, as results write them.
var numberRE = regexp.MustCompile(`[-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?`)

// numErrRE matches the numerical-error note a result may end with.
var numErrRE = regexp.MustCompile(` \(numerical error ≤ ([^ )]+)(?: ([^)]*))?\)$`)

// Drift is one recorded result that no longer matches.
type Drift struct {
	StmtLine int    // 1-based line of the statement's first line
	Stmt     string // the statement's text
	Line     int    // 1-based line of the result (or statement) line
	What     string // which part drifted: "result", "caution", "row 3, Bz [µT]"...
	Recorded string
	Now      string
	// Rel is the relative change of the number that moved most, (now −
	// recorded)/|recorded|; NaN when no number can be compared.
	Rel float64
	Why string // for a result that appeared or vanished
}

// CheckReport is the outcome of checking a script.
type CheckReport struct {
	Drifts []Drift
	// Statements counts the statements checked; Results those with a result
	// recorded or now; Drifted those among them with at least one drift.
	Statements, Results, Drifted int
}

// Check re-evaluates the script in s and compares every recorded result
// with relative tolerance tol: values, every cell of a table, the numbers
// in text, and the cautions. An error stops the check.
func (sc *Script) Check(s *Session, tol float64) (CheckReport, error) {
	results, err := sc.Evaluate(s, tol)
	return checkReport(len(sc.Stmts), results), err
}

// checkReport sums up the evaluated statements of a check.
func checkReport(statements int, results []StatementResult) CheckReport {
	rep := CheckReport{Statements: statements}
	for _, r := range results {
		if r.Result == nil {
			continue
		}
		if r.Result.Record != "" || r.Stmt.Result >= 0 {
			rep.Results++
		}
		if len(r.Drifts) > 0 {
			rep.Drifted++
			rep.Drifts = append(rep.Drifts, r.Drifts...)
		}
	}
	return rep
}

// Report sums up the results of Evaluate as Check does.
func (sc *Script) Report(results []StatementResult) CheckReport {
	return checkReport(len(sc.Stmts), results)
}

// checkStmt compares one statement's recorded lines with its result now.
func (sc *Script) checkStmt(st ScriptStmt, res *Result, tol float64) []Drift {
	base := Drift{StmtLine: st.Line + 1, Stmt: sc.Text(st), Line: st.Line + 1, What: "result", Rel: math.NaN()}
	add := func(ds *[]Drift, d Drift) { *ds = append(*ds, d) }
	var ds []Drift
	switch {
	case res.Record == "" && st.Result >= 0:
		d := base
		d.Line, d.Recorded, d.Why = st.Result+1, sc.Recorded(st), "this statement has no result now"
		add(&ds, d)
	case res.Record != "" && st.Result < 0:
		d := base
		d.Now, d.Why = res.Record, "no result is recorded for this statement"
		add(&ds, d)
	case res.Record != "":
		rec := sc.Recorded(st)
		if ok, now, rel := Matches(rec, res.Value, res.Record, tol); !ok {
			d := base
			d.Line, d.Recorded, d.Now, d.Rel = st.Result+1, rec, now, rel
			add(&ds, d)
		}
	}
	if t, ok := res.Value.(Tabular); ok && res.Record != "" && st.Result >= 0 {
		ds = append(ds, sc.checkTable(base, st, t, tol)...)
	}
	// cautions, in order
	for k := 0; k < max(len(res.Cautions), len(st.Cautions)); k++ {
		d := base
		d.What = "caution"
		switch {
		case k >= len(st.Cautions):
			d.Now, d.Why = res.Cautions[k], "a caution appeared"
			if st.Result >= 0 {
				d.Line = st.Result + 1
			}
		case k >= len(res.Cautions):
			d.Line, d.Recorded, d.Why = st.Cautions[k]+1, cautionText(sc.Lines[st.Cautions[k]]), "a caution disappeared"
		default:
			rec := cautionText(sc.Lines[st.Cautions[k]])
			ok, rel := matchText(rec, res.Cautions[k], tol)
			if ok {
				continue
			}
			d.Line, d.Recorded, d.Now, d.Rel = st.Cautions[k]+1, rec, res.Cautions[k], rel
		}
		add(&ds, d)
	}
	return ds
}

func cautionText(line string) string {
	return strings.TrimSpace(strings.TrimPrefix(recordedText(line), CautionMark))
}

// checkTable compares a table's recorded rows with its rows now.
func (sc *Script) checkTable(base Drift, st ScriptStmt, t Tabular, tol float64) []Drift {
	now := gridOf(t)
	var recLines []string
	for _, i := range st.Table {
		recLines = append(recLines, strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(sc.Lines[i]), TableMark)))
	}
	d := base
	d.Line = st.Result + 1
	if len(st.Table) > 0 {
		d.Line = st.Table[0] + 1
	}
	if len(recLines) == 0 {
		d.Why, d.What = "the table's rows are not recorded", "table"
		return []Drift{d}
	}
	rec, err := parseGrid(recLines)
	if err != nil {
		d.Why, d.What = "the recorded table cannot be read: "+err.Error(), "table"
		return []Drift{d}
	}
	if !sameColumns(rec, now) {
		d.What, d.Recorded, d.Now = "table columns", strings.Join(rec.header(), ", "), strings.Join(now.header(), ", ")
		return []Drift{d}
	}
	if len(rec.cells) != len(now.cells) || (rec.labels == nil) != (now.labels == nil) {
		d.What, d.Recorded, d.Now = "table rows", fmt.Sprintf("%d rows", len(rec.cells)), fmt.Sprintf("%d rows", len(now.cells))
		if now.labels != nil {
			d.Now = fmt.Sprintf("%d rows (more than %d: column statistics)", now.total, RecordRows)
		}
		return []Drift{d}
	}
	var ds []Drift
	more := 0
	// A cell below tableNoise of its column's largest magnitude is rounding
	// noise (the imaginary part of a voltage in phase, a power that is zero
	// in exact arithmetic): two such cells match.
	floor := make([]float64, len(rec.cols))
	for _, g := range []grid{rec, now} {
		for i := range g.cells {
			for j, x := range g.cells[i] {
				if j < len(floor) {
					floor[j] = math.Max(floor[j], tableNoise*math.Abs(x))
				}
			}
		}
	}
	for i := range rec.cells {
		if rec.labels != nil && rec.labels[i] != now.labels[i] {
			d := d
			d.What, d.Recorded, d.Now = "table row", rec.labels[i], now.labels[i]
			return []Drift{d}
		}
		for j := range rec.cells[i] {
			a, b := rec.cells[i][j], now.cells[i][j]
			if closeEnough(a, b, math.Max(math.Abs(a), math.Abs(b)), tol) {
				continue
			}
			if j < len(floor) && math.Abs(a) <= floor[j] && math.Abs(b) <= floor[j] {
				continue
			}
			if len(ds) == maxCellDrifts {
				more++
				continue
			}
			c := d
			c.Line = st.Table[min(i+1, len(st.Table)-1)] + 1
			row := fmt.Sprintf("row %d", i+1)
			if rec.labels != nil {
				row = rec.labels[i]
			}
			c.What = fmt.Sprintf("%s, %s", row, now.header()[j])
			c.Recorded = strings.TrimSpace(rec.text[i][j] + " " + rec.units[j])
			c.Now = strings.TrimSpace(now.cellText(i, j) + " " + now.units[j])
			c.Rel = relChange(a, b)
			ds = append(ds, c)
		}
	}
	if more > 0 {
		c := d
		c.What, c.Why = "table", fmt.Sprintf("and %d more cells drifted", more)
		ds = append(ds, c)
	}
	return ds
}

// sameColumns reports whether two grids have the same column names and
// dimensions (units may differ: cells are compared in SI units).
func sameColumns(a, b grid) bool {
	if len(a.cols) != len(b.cols) {
		return false
	}
	for j := range a.cols {
		if a.cols[j] != b.cols[j] || a.dims[j] != b.dims[j] {
			return false
		}
	}
	return true
}

func relChange(rec, now float64) float64 {
	if rec == 0 {
		if now == 0 {
			return 0
		}
		return math.Inf(int(math.Copysign(1, now)))
	}
	return (now - rec) / math.Abs(rec)
}

// Matches compares a recorded result text with a value now. Quantities and
// vectors written as "number unit" are compared numerically with relative
// tolerance tol (|a-b| <= tol*max(|a|,|b|), vectors against the larger
// norm); any other text is compared as words and numbers: the words must be
// equal and each number within tol. now is the value shown in the recorded
// unit when that is possible; rel is the relative change of the number
// that moved most (NaN when the texts cannot be compared number by number).
func Matches(recorded string, v Value, nowText string, tol float64) (ok bool, now string, rel float64) {
	if recorded == nowText {
		return true, nowText, 0
	}
	recBody, recErr := splitNumErr(recorded)
	nowBody, nowErr := splitNumErr(nowText)
	if floor := math.Max(recErr, nowErr); floor > 0 {
		// a change within the recorded or present numerical error is not
		// drift: the value is compared with that floor
		ok, now, rel = Matches(recBody, v, nowBody, tol)
		if ok {
			return ok, nowText, rel
		}
		rv, _, parsed := parseRecorded(recBody)
		if !parsed {
			return ok, nowText, rel
		}
		switch x := v.(type) {
		case Quantity:
			if r, isQ := rv.(Quantity); isQ && r.D == x.D && math.Abs(r.V-x.V) <= floor {
				return true, nowText, rel
			}
		case Vector:
			if r, isV := rv.(Vector); isV && r.D == x.D {
				within := true
				for i := range 3 {
					within = within && math.Abs(r.V[i]-x.V[i]) <= floor
				}
				if within {
					return true, nowText, rel
				}
			}
		}
		return false, nowText, rel
	}
	if rv, unit, ok := parseCVectorRecorded(recorded); ok {
		x, isV := v.(CVector)
		now = nowText
		if unit != "" {
			if t, err := FormatIn(v, unit, RecordDigits); err == nil {
				now = t
			}
		}
		if !isV || x.D != rv.D {
			return false, now, math.NaN()
		}
		var d CVector
		for i := range 3 {
			d.V[i] = x.V[i] - rv.V[i]
		}
		scale := math.Max(rv.Norm().V, x.Norm().V)
		rel = math.Inf(1)
		if n := rv.Norm().V; n > 0 {
			rel = d.Norm().V / n
		} else if d.Norm().V == 0 {
			rel = 0
		}
		return d.Norm().V <= tol*scale, now, rel
	}
	if z, form, ok := parseComplexRecorded(recorded); ok {
		// a complex result is compared as a point in the plane:
		// |z_now - z_recorded| within tol of the larger magnitude
		x, isC := v.(Complex)
		now = nowText
		if t, err := FormatIn(v, form, RecordDigits); err == nil {
			now = t
		}
		if !isC || x.D != z.D {
			return false, now, math.NaN()
		}
		scale := math.Max(cmplx.Abs(z.V), cmplx.Abs(x.V))
		diff := cmplx.Abs(x.V - z.V)
		rel = math.Inf(1)
		if a := cmplx.Abs(z.V); a > 0 {
			rel = diff / a
		} else if diff == 0 {
			rel = 0
		}
		return diff <= tol*scale, now, rel
	}
	rv, unit, parsed := parseRecorded(recorded)
	if !parsed {
		ok, rel := matchText(recorded, nowText, tol)
		return ok, nowText, rel
	}
	now = nowText
	if unit != "" {
		if t, err := FormatIn(v, unit, RecordDigits); err == nil {
			now = t
		}
	}
	switch x := v.(type) {
	case Quantity:
		r, ok := rv.(Quantity)
		if !ok || r.D != x.D {
			return false, now, math.NaN()
		}
		return closeEnough(r.V, x.V, math.Max(math.Abs(r.V), math.Abs(x.V)), tol), now, relChange(r.V, x.V)
	case Vector:
		r, ok := rv.(Vector)
		if !ok || r.D != x.D {
			return false, now, math.NaN()
		}
		scale := math.Max(r.Norm().V, x.Norm().V)
		ok = true
		var diff [3]float64
		for i := range 3 {
			diff[i] = x.V[i] - r.V[i]
			ok = ok && closeEnough(r.V[i], x.V[i], scale, tol)
		}
		rel = relChange(r.Norm().V, r.Norm().V+Vector{V: diff}.Norm().V)
		return ok, now, rel
	}
	return false, now, math.NaN()
}

func closeEnough(a, b, scale, tol float64) bool {
	return math.Abs(a-b) <= tol*scale
}

// matchText compares two texts as words and numbers: the text between the
// numbers must be equal, and the numbers as many and each within relative
// tolerance tol. rel is the relative change of the number that moved most,
// NaN when the words differ.
func matchText(rec, now string, tol float64) (bool, float64) {
	rw, rn := splitNumbers(rec)
	nw, nn := splitNumbers(now)
	if len(rn) != len(nn) || strings.Join(rw, "\x00") != strings.Join(nw, "\x00") {
		return false, math.NaN()
	}
	ok, rel := true, 0.0
	for i := range rn {
		if !closeEnough(rn[i], nn[i], math.Max(math.Abs(rn[i]), math.Abs(nn[i])), tol) {
			ok = false
		}
		if r := relChange(rn[i], nn[i]); math.Abs(r) > math.Abs(rel) {
			rel = r
		}
	}
	return ok, rel
}

// splitNumbers returns the words between the numbers of text, and the
// numbers.
func splitNumbers(text string) ([]string, []float64) {
	var words []string
	var nums []float64
	at := 0
	for _, m := range numberRE.FindAllStringIndex(text, -1) {
		x, err := strconv.ParseFloat(text[m[0]:m[1]], 64)
		if err != nil {
			continue // out of range: compared as a word
		}
		words = append(words, text[at:m[0]])
		nums = append(nums, x)
		at = m[1]
	}
	return append(words, text[at:]), nums
}

// parseRecorded reads "number [unit]" or "[a, b, c] [unit]".
func parseRecorded(text string) (Value, string, bool) {
	text = strings.TrimSpace(text)
	if strings.HasPrefix(text, "[") {
		end := strings.Index(text, "]")
		if end < 0 {
			return nil, "", false
		}
		parts := strings.Split(text[1:end], ",")
		if len(parts) != 3 {
			return nil, "", false
		}
		unit := strings.TrimSpace(text[end+1:])
		scale, d := 1.0, Dimensionless
		if unit != "" {
			u, err := ParseUnit(unit)
			if err != nil {
				return nil, "", false
			}
			scale, d = u.Scale(), u.Dim
		}
		var v Vector
		v.D = d
		for i, p := range parts {
			x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
			if err != nil {
				return nil, "", false
			}
			v.V[i] = x * scale
		}
		return v, unit, true
	}
	num, unit, _ := strings.Cut(text, " ")
	x, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return nil, "", false
	}
	unit = strings.TrimSpace(unit)
	if unit == "" {
		return Num(x), "", true
	}
	u, err := ParseUnit(unit)
	if err != nil {
		return nil, "", false
	}
	v, err := LiteralValue(num, u)
	if err != nil {
		return nil, "", false
	}
	return Quantity{V: v, D: u.Dim, Cyc: u.Cyc}, unit, true
}

// Write reports the drifts of a check of the script at path: each
// statement once (its FILE:LINE and text), then for each drift what moved,
// on which line, by how much relatively, and the recorded and new text. It
// ends with the count of drifted results, or "ok" when none drifted.
func (rep CheckReport) Write(w io.Writer, path string) {
	if len(rep.Drifts) == 0 {
		fmt.Fprintf(w, "%s: ok (%d statement%s)\n", path, rep.Statements, plural(rep.Statements))
		return
	}
	last := -1
	for _, d := range rep.Drifts {
		if d.StmtLine != last {
			fmt.Fprintf(w, "%s:%d: %s\n", path, d.StmtLine, strings.Join(strings.Fields(d.Stmt), " "))
			last = d.StmtLine
		}
		switch {
		case d.Why != "":
			fmt.Fprintf(w, "    %s (line %d): %s\n", d.What, d.Line, d.Why)
		default:
			fmt.Fprintf(w, "    %s (line %d) drifted%s\n", d.What, d.Line, relText(d.Rel))
		}
		if d.Recorded != "" {
			fmt.Fprintf(w, "    recorded: %s\n", d.Recorded)
		}
		if d.Now != "" {
			fmt.Fprintf(w, "    now:      %s\n", d.Now)
		}
	}
	fmt.Fprintf(w, "%s: %d of %d result%s drifted\n", path, rep.Drifted, rep.Results, plural(rep.Results))
}

// relText shows a relative change as a signed percentage.
func relText(rel float64) string {
	switch {
	case math.IsNaN(rel):
		return ""
	case math.IsInf(rel, 0):
		return " from 0"
	}
	return fmt.Sprintf(" by %+.3g%%", 100*rel)
}

// splitNumErr splits off a result's numerical-error note, returning the
// rest and the bound in SI units (0 when there is none).
func splitNumErr(text string) (string, float64) {
	m := numErrRE.FindStringSubmatchIndex(text)
	if m == nil {
		return text, 0
	}
	x, err := strconv.ParseFloat(text[m[2]:m[3]], 64)
	if err != nil {
		return text, 0
	}
	if m[4] >= 0 {
		u, err := ParseUnit(text[m[4]:m[5]])
		if err != nil {
			return text, 0
		}
		x *= u.Scale()
	}
	return text[:m[0]], x
}
