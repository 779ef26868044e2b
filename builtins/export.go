package builtins

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"

	"loopwise/lang"
	"loopwise/runtime"
)

// Written is the result of a builtin that wrote a file: the name it was
// given (inside the session's output directory) and what it holds. Its
// one-line text is what scripts record, so it names no directory.
type Written struct {
	Name       string
	Rows, Cols int
}

func (w *Written) Kind() string { return "a written file" }

func (w *Written) Show(int) string {
	return fmt.Sprintf("wrote %s: %d rows of %d columns", w.Name, w.Rows, w.Cols)
}

func (w *Written) Summary(digits int) string { return w.Show(digits) }

func exportFuncs() []*runtime.Func {
	return []*runtime.Func{
		{
			Name: "export_csv", Params: []string{"table", "name", "units"}, MinArgs: 2, MaxArgs: 3,
			CallEnv: exportCSVBuiltin,
			Help: &runtime.Help{
				Signature: `export_csv(table, name: text ending in .csv[, units: "SI" or "shown"]) -> written file`,
				Summary:   `Writes the table as comma-separated values into the script's output directory: a header row of the column names with their units in brackets ("Bz [T]"), then one line per row. Numbers are in coherent SI units (T, m, A/m; Hz for cycle frequencies) by default, or in the units the table shows with "shown". Names that leave the output directory are refused; a session without an output directory writes no files and refuses to export. After the example, export_csv(gaps, "gaps.csv") writes gaps.csv.`,
				Method:    "numbers in the shortest form that reads back as the same double (Go's strconv 'g', -1), so SI values are exact; \"shown\" divides by the unit's size first (one rounding)",
				// :help runs examples in a scratch session that writes no
				// files, so the example builds the table the summary exports
				Example:   "k(d) = maxwell_mutual(20 mm, 15 mm, d)\ngaps = sweep(k, 0 mm, 20 mm, 5)",
				Reference: "the CSV format of RFC 4180 (Y. Shafranovich, 2005) as written by Go's encoding/csv",
			},
		},
	}
}

func exportCSVBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "export_csv"
	t, err := tableArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	name, ok := args[1].(string)
	if !ok {
		return nil, errorf(`%s: the second argument must be the file's name in quotes, such as "axis.csv", not %s`, fn, runtime.TypeName(args[1]))
	}
	if !strings.HasSuffix(strings.ToLower(name), ".csv") || len(name) <= len(".csv") {
		return nil, errorf(`%s: the file's name must end in .csv, such as "axis.csv", not %q`, fn, abbrevName(name))
	}
	shown := false
	if len(args) > 2 {
		u, ok := args[2].(string)
		switch {
		case ok && strings.EqualFold(u, "SI"):
		case ok && strings.EqualFold(u, "shown"):
			shown = true
		default:
			what := runtime.TypeName(args[2])
			if ok {
				what = strconv.Quote(abbrevName(u))
			}
			return nil, errorf(`%s: the units must be "SI" or "shown", not %s`, fn, what)
		}
	}
	if env == nil {
		return nil, errorf("%s: this session has no output directory, so it writes no files and the table was not exported", fn)
	}
	path, err := env.OutputPath(name)
	if errors.Is(err, runtime.ErrNoOutput) {
		return nil, errorf("%s: this session has no output directory, so it writes no files and the table was not exported to %s", fn, abbrevName(name))
	}
	if err != nil {
		return nil, errorf("%s: %v", fn, err)
	}
	data := t.csv(shown)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			err = pe.Err // the full path would name the output directory
		}
		return nil, errorf("%s: cannot write %s: %v", fn, abbrevName(name), err)
	}
	return &Written{Name: name, Rows: len(t.Rows), Cols: len(t.Cols)}, nil
}

func abbrevName(s string) string { return lang.Abbrev(s, 40) }

// csv writes the table: a header of names with units, then the rows, in
// coherent SI units or (shown) in the units the table shows.
func (t *Table) csv(shown bool) []byte {
	units := make([]string, len(t.Cols))
	scales := make([]float64, len(t.Cols))
	if shown {
		units, scales = t.columnUnits(runtime.RecordDigits)
	} else {
		for j, d := range t.Dims {
			scales[j] = 1
			switch {
			case d.IsZero():
			case t.cyc(j) && d == dimHertz:
				units[j] = "Hz"
			default:
				units[j] = runtime.DisplayUnitOf(d)
			}
		}
	}
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	head := make([]string, len(t.Cols))
	for j, c := range t.Cols {
		head[j] = c
		if units[j] != "" {
			head[j] += " [" + units[j] + "]"
		}
	}
	w.Write(head)
	rec := make([]string, len(t.Cols))
	for _, r := range t.Rows {
		for j, x := range r {
			rec[j] = strconv.FormatFloat(x/scales[j], 'g', -1, 64)
		}
		w.Write(rec)
	}
	w.Flush()
	return b.Bytes()
}
