package builtins

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"loopwise/builtins/draw"
	"loopwise/runtime"
)

const refPlots = "drawn with gonum.org/v1/plot; axis units with SI prefixes by powers of 1000 (SI Brochure, 9th edition, 2019, table 7)"

// Plot is a drawn plot: its data (what replay records and compares), the
// picture, and the file it was written to.
type Plot struct {
	line draw.Line
	cols []string
	dims []runtime.Dim
	rows [][]float64
	// File is the plot's file name in the output directory; Path is where
	// it was written ("" when not), and Why says why not.
	File, Path, Why string
}

func (p *Plot) Kind() string { return "a plot" }

// Tabulate implements runtime.Tabular: the plotted data, x first.
func (p *Plot) Tabulate() ([]string, []runtime.Dim, [][]float64) { return p.cols, p.dims, p.rows }

// SVG implements runtime.Picture.
func (p *Plot) SVG() ([]byte, error) { return p.line.SVG() }

// Summary is the one line a script records: the file's name and what is
// drawn, the same whether or not the session writes files.
func (p *Plot) Summary(digits int) string {
	ys := make([]string, len(p.line.Ys))
	for i, y := range p.line.Ys {
		ys[i] = y.Name
	}
	log := ""
	switch {
	case p.line.LogX && p.line.LogY:
		log = ", log x and y"
	case p.line.LogX:
		log = ", log x"
	case p.line.LogY:
		log = ", log y"
	}
	return fmt.Sprintf("%s: %s against %s, %d points%s", p.File, strings.Join(ys, ", "), p.line.X.Name, len(p.rows), log)
}

// Show adds where the file went.
func (p *Plot) Show(digits int) string { return p.Summary(digits) + "\n" + p.Where() }

// Where says where the file was written, or why it was not.
func (p *Plot) Where() string {
	if p.Path != "" {
		return "written to " + p.Path
	}
	return "not written: " + p.Why
}

// plotNamer numbers the plots of one session (plot-1.svg, plot-2.svg…):
// Standard makes one per library, and every session has its own library.
type plotNamer struct{ n int }

func plotFuncs() []*runtime.Func {
	names := &plotNamer{}
	return []*runtime.Func{
		{
			Name: "plot", Params: []string{"table", "x", "y", "file"}, MinArgs: 3, MaxArgs: -1,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return plotTableBuiltin(env, names, "plot", "", 0, args)
			},
			Help: &runtime.Help{
				Signature: `plot(table, x: column name, y: column name[, more y columns…][, file: "NAME.svg" or "NAME.png"]) -> plot`,
				Summary:   `Draws columns y (one or several, of one unit) of a table against its column x, and writes the picture to the output directory (plot-1.svg, plot-2.svg… unless a file is named). The plot is a value: a script records and checks its data, not the picture.`,
				Method:    "straight lines between the table's rows; each axis in the SI prefix that puts its largest magnitude between 1 and 1000",
				Example:   "k(d) = maxwell_mutual(20 mm, 15 mm, d)\nplot(sweep(k, 1 mm, 20 mm, 5), \"d\", \"k\")",
				Reference: refPlots,
			},
		},
		{
			Name: "plot_log", Params: []string{"axes", "table", "x", "y", "file"}, MinArgs: 4, MaxArgs: -1,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				if len(args) == 0 {
					return nil, errorf("plot_log: give the log axes first: \"x\", \"y\" or \"xy\"")
				}
				axes, ok := args[0].(string)
				if !ok || (axes != "x" && axes != "y" && axes != "xy") {
					return nil, errorf("plot_log: the first argument names the log axes: \"x\", \"y\" or \"xy\", not %s", describeArg(args[0]))
				}
				return plotTableBuiltin(env, names, "plot_log", axes, 1, args[1:])
			},
			Help: &runtime.Help{
				Signature: `plot_log(axes: "x", "y" or "xy", table, x: column name, y: column name[, more y columns…][, file]) -> plot`,
				Summary:   "plot with logarithmic axes: every value on a log axis must be above zero.",
				Method:    "as plot; ticks at powers of ten",
				Example:   "f(d) = maxwell_mutual(20 mm, 15 mm, d)\nplot_log(\"y\", sweep(f, 1 mm, 100 mm, 12), \"d\", \"f\")",
				Reference: refPlots,
			},
		},
		{
			Name: "plot_fn", Params: []string{"f", "from", "to", "n", "file"}, MinArgs: 3, MaxArgs: 5,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return plotFnBuiltin(env, names, args)
			},
			Help: &runtime.Help{
				Signature: `plot_fn(f: function of one quantity, from, to: unit of f's argument[, n: whole number (default 51)][, file]) -> plot`,
				Summary:   "Draws f from from to to at n evenly spaced points (a quantity result as one line, a vector as its x, y, z components and norm).",
				Method:    "sweep(f, from, to, n), then plot; the work is that of the sweep",
				Example:   "V(t) = 2 V * sin(2*pi*50 Hz * t)\nplot_fn(V, 0 ms, 20 ms)",
				Reference: refPlots,
			},
		},
	}
}

func describeArg(v runtime.Value) string {
	if s, ok := v.(string); ok {
		return fmt.Sprintf("%q", s)
	}
	return runtime.TypeName(v)
}

// fileArg splits off a last text argument naming the file (ending in .svg
// or .png).
func fileArg(args []runtime.Value) ([]runtime.Value, string) {
	if len(args) > 0 {
		if s, ok := args[len(args)-1].(string); ok {
			ext := strings.ToLower(filepath.Ext(s))
			if ext == ".svg" || ext == ".png" {
				return args[:len(args)-1], s
			}
		}
	}
	return args, ""
}

// plotTableBuiltin draws a table; off counts the arguments before the
// table (for messages).
func plotTableBuiltin(env runtime.Env, names *plotNamer, fn, logAxes string, off int, args []runtime.Value) (runtime.Value, error) {
	args, file := fileArg(args)
	if len(args) < 3 {
		return nil, errorf("%s: give a table, the x column and at least one y column", fn)
	}
	tab, ok := args[0].(runtime.Tabular)
	if !ok {
		return nil, errorf("%s: the %s argument must be a table (from sweep, sample_line…), not %s", fn, ordinal(off), runtime.TypeName(args[0]))
	}
	cols, dims, rows := tab.Tabulate()
	var pick []int
	for i, a := range args[1:] {
		name, ok := a.(string)
		if !ok {
			return nil, errorf("%s: the %s argument must be a column name in quotes, such as \"%s\", not %s", fn, ordinal(off+i+1), cols[min(i, len(cols)-1)], describeArg(a))
		}
		j := -1
		for k, c := range cols {
			if c == name {
				j = k
			}
		}
		if j < 0 {
			if ext := filepath.Ext(name); ext != "" && i == len(args)-2 {
				return nil, errorf("%s: the file %q must end in .svg or .png", fn, name)
			}
			return nil, errorf("%s: the table has no column %q; its columns are %s", fn, name, quoteAll(cols))
		}
		if len(pick) > 1 && dims[j] != dims[pick[1]] {
			return nil, errorf("%s: the columns %q (%s) and %q (%s) have different units; draw them on separate plots", fn, cols[pick[1]], dims[pick[1]].Describe(), name, dims[j].Describe())
		}
		pick = append(pick, j)
	}
	cyc := map[int]bool{}
	if t, ok := tab.(*Table); ok {
		for j, c := range t.Cyc {
			cyc[j] = c
		}
	}
	return makePlot(env, names, fn, file, logAxes, cols, dims, cyc, rows, pick)
}

func quoteAll(cols []string) string {
	q := make([]string, len(cols))
	for i, c := range cols {
		q[i] = fmt.Sprintf("%q", c)
	}
	return strings.Join(q, ", ")
}

func plotFnBuiltin(env runtime.Env, names *plotNamer, args []runtime.Value) (runtime.Value, error) {
	const fn = "plot_fn"
	args, file := fileArg(args)
	if len(args) < 3 || len(args) > 4 {
		return nil, errorf("%s takes a function, from, to[, n][, file]; got %d arguments", fn, len(args))
	}
	if len(args) == 3 {
		args = append(args, runtime.Num(51))
	}
	v, err := sweepBuiltin(env, args)
	if err != nil {
		if e := new(argError); errors.As(err, &e) {
			return nil, errorf("%s", strings.Replace(e.msg, "sweep", fn, 1))
		}
		return nil, err
	}
	tab := v.(*Table)
	pick := make([]int, len(tab.Cols))
	for j := range pick {
		pick[j] = j
	}
	cyc := map[int]bool{}
	for j, c := range tab.Cyc {
		cyc[j] = c
	}
	return makePlot(env, names, fn, file, "", tab.Cols, tab.Dims, cyc, tab.Rows, pick)
}

// makePlot draws columns pick (x first) of rows and writes the file.
func makePlot(env runtime.Env, names *plotNamer, fn, file, logAxes string, cols []string, dims []runtime.Dim, cyc map[int]bool, rows [][]float64, pick []int) (*Plot, error) {
	if len(rows) < 2 {
		return nil, errorf("%s: the table has %d rows; a line needs at least two", fn, len(rows))
	}
	if file != "" && !filepath.IsLocal(filepath.FromSlash(file)) {
		// refused here, not only by the session, so that a script checked
		// without an output directory is refused as well
		return nil, errorf("%s: the file name %q leaves the output directory; give a plain name such as field.svg", fn, file)
	}
	p := &Plot{line: draw.Line{LogX: strings.Contains(logAxes, "x"), LogY: strings.Contains(logAxes, "y")}}
	column := func(j int) draw.Column {
		c := draw.Column{Name: cols[j], Unit: runtime.DisplayUnitOf(dims[j]), Values: make([]float64, len(rows))}
		if dims[j].IsZero() {
			c.Unit = ""
		}
		for i, r := range rows {
			c.Values[i] = r[j]
		}
		d, hz := dims[j], cyc[j]
		c.Units = func(big float64) (string, float64) {
			if hz {
				return runtime.BestCycleUnit(d, big, 4)
			}
			return runtime.BestUnit(d, big, 4)
		}
		return c
	}
	p.line.X = column(pick[0])
	for _, j := range pick[1:] {
		p.line.Ys = append(p.line.Ys, column(j))
	}
	for _, j := range pick {
		p.cols = append(p.cols, cols[j])
		p.dims = append(p.dims, dims[j])
	}
	p.rows = make([][]float64, len(rows))
	for i, r := range rows {
		p.rows[i] = make([]float64, len(pick))
		for k, j := range pick {
			p.rows[i][k] = r[j]
		}
	}
	var data []byte
	var err error
	if strings.EqualFold(filepath.Ext(file), ".png") {
		data, err = p.line.PNG()
	} else {
		data, err = p.line.SVG()
	}
	if err != nil {
		return nil, errorf("%s: %v", fn, err)
	}
	if file == "" {
		names.n++
		file = fmt.Sprintf("plot-%d.svg", names.n)
	}
	p.File = file
	if env == nil {
		p.Why = "no session to write it"
		return p, nil
	}
	path, err := env.OutputPath(file)
	switch {
	case errors.Is(err, runtime.ErrNoOutput):
		p.Why = "this session writes no files"
		return p, nil
	case err != nil:
		return nil, errorf("%s: %v", fn, err)
	}
	if err := os.WriteFile(path, data, 0o644); err != nil {
		return nil, errorf("%s: cannot write %s: %v", fn, path, err)
	}
	p.Path = path
	return p, nil
}

var _ runtime.Picture = (*Plot)(nil)
