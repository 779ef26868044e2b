package builtins

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"

	"gonum.org/v1/gonum/spatial/r3"

	"loopwise/builtins/draw"
	"loopwise/builtins/em"
	"loopwise/lang"
	"loopwise/runtime"
)

const refPlots = "drawn with gonum.org/v1/plot; axis units with SI prefixes by powers of 1000 (SI Brochure, 9th edition, 2019, table 7)"

// Plot is a drawn plot: its data (what replay records and compares), the
// picture, and the file it was written to.
type Plot struct {
	pic  picture
	what string // what is drawn, for the summary: "k against d"
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

// picture is what the draw package draws: a line plot or a map.
type picture interface {
	SVG() ([]byte, error)
	PNG() ([]byte, error)
}

// SVG implements runtime.Picture.
func (p *Plot) SVG() ([]byte, error) { return p.pic.SVG() }

// Summary is the one line a script records: the file's name and what is
// drawn, the same whether or not the session writes files.
func (p *Plot) Summary(digits int) string {
	return fmt.Sprintf("%s: %s", p.File, p.what)
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
		fieldMapFunc(names),
		{
			Name: "plot", Params: []string{"table", "x", "y", "file"}, MinArgs: 3, MaxArgs: -1,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return plotTableBuiltin(env, names, "plot", "", 0, args)
			},
			Help: &runtime.Help{
				Signature: `plot(table, x: column name, y: column name[, more y columns…][, file: "NAME.svg" or "NAME.png"][, "title: TEXT"]) -> plot`,
				Summary:   `Draws columns y (one or several, of one unit) of a table against its column x, and writes the picture to the output directory (plot-1.svg, plot-2.svg… unless a file is named). The plot is a value: a script records and checks its data, not the picture.`,
				Method:    "straight lines between the table's rows; each axis in the SI prefix that puts its largest magnitude between 1 and 1000",
				Example:   "k(d) = maxwell_mutual(20 mm, 15 mm, d)\nplot(sweep(k, 1 mm, 20 mm, 5), \"d\", \"k\")",
				Reference: refPlots,
			},
		},
		{
			Name: "plot_log", Params: []string{"table", "axes", "x", "y", "file"}, MinArgs: 4, MaxArgs: -1,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				axes, ok := args[1].(string)
				if !ok || (axes != "x" && axes != "y" && axes != "xy") {
					return nil, errorf("plot_log: the second argument names the log axes: \"x\", \"y\" or \"xy\", not %s", describeArg(args[1]))
				}
				rest := append([]runtime.Value{args[0]}, args[2:]...)
				return plotTableBuiltin(env, names, "plot_log", axes, 0, rest)
			},
			Help: &runtime.Help{
				Signature: `plot_log(table, axes: "x", "y" or "xy", x: column name, y: column name[, more y columns…][, file][, "title: TEXT"]) -> plot`,
				Summary:   "plot with logarithmic axes: every value on a log axis must be above zero.",
				Method:    "as plot; ticks at powers of ten (and at 2× and 5× within less than two decades)",
				Example:   "f(d) = maxwell_mutual(20 mm, 15 mm, d)\nplot_log(sweep(f, 1 mm, 100 mm, 12), \"y\", \"d\", \"f\")",
				Reference: refPlots,
			},
		},
		{
			Name: "plot_fn", Params: []string{"f", "from", "to", "n", "file", "title"}, MinArgs: 3, MaxArgs: 6,
			CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
				return plotFnBuiltin(env, names, args)
			},
			Help: &runtime.Help{
				Signature: `plot_fn(f: function of one quantity, from, to: unit of f's argument[, n: whole number (default 51)][, file][, "title: TEXT"]) -> plot`,
				Summary:   "Draws f from from to to at n evenly spaced points (a quantity result as one line, a vector as its x, y, z components and norm).",
				Method:    "sweep(f, from, to, n), then plot; the work is that of the sweep",
				Example:   "V(t) = 2 V * sin(2*pi*50 Hz * t)\nplot_fn(V, 0 ms, 20 ms)",
				Reference: refPlots,
			},
		},
	}
}

func fieldMapFunc(names *plotNamer) *runtime.Func {
	return &runtime.Func{
		Name: "field_map", Params: []string{"field", "origin", "side1", "side2", "n1", "n2", "t", "options"}, MinArgs: 6, MaxArgs: -1,
		CallEnv: func(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
			return fieldMapBuiltin(env, names, args)
		},
		Help: &runtime.Help{
			Signature: `field_map(field, origin: position [m], side1, side2: perpendicular vectors [m], n1, n2: whole numbers[, t: s][, "arrows"][, "lines"][, "log"][, file][, "title: TEXT"]) -> plot`,
			Summary:   `A field's magnitude on an n1 × n2 grid over the rectangle origin + u·side1 + v·side2, drawn as colour with a colour bar; "arrows" adds the direction of the field's part in the plane at every point, "lines" draws evenly spaced field lines of that part with an arrowhead along the field, "log" colours by the logarithm (a field falling off from a wire spans decades). The paths of the field's source are drawn on top, projected onto the plane. The title is "|B| in the plane" unless "title: TEXT" sets it ("title:" alone leaves none). Over 1600 cells an SVG holds the colour cells as one embedded image.`,
			Method:    "sample_plane on the grid (its work and limits), then a heat map; the recorded data are the grid's coordinates (x, y or z for a side along that axis, else u and v from origin), the magnitude, and with arrows or lines the in-plane components. Field lines are traced on the recorded grid: bilinear interpolation of the in-plane components, fourth-order Runge–Kutta along the field's direction with a step of a fifth of a cell, stopping at the rectangle's edge, at a null and near another line; spaced after Jobard and Lefer (1997), 24 spacings across the longer side. Lines follow the grid's field: features smaller than a cell (the field near a wire) are not resolved",
			Example:   "field_map(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [-50, 0, -50] mm, [100, 0, 0] mm, [0, 0, 100] mm, 4, 4, \"arrows\", \"title: one loop, 2 A\")",
			Reference: refPlots + "; field lines spaced after B. Jobard and W. Lefer, \"Creating evenly-spaced streamlines of arbitrary density\", Visualization in Scientific Computing '97 (1997)",
		},
	}
}

// fieldMapBuiltin samples a field on a rectangle and draws it as a map.
func fieldMapBuiltin(env runtime.Env, names *plotNamer, args []runtime.Value) (runtime.Value, error) {
	const fn = "field_map"
	args, opts, err := plotOptions(fn, args, "arrows", "lines", "log")
	if err != nil {
		return nil, err
	}
	file := opts.file
	arrows, lines, logColor := opts.flags["arrows"], opts.flags["lines"], opts.flags["log"]
	if len(args) < 6 || len(args) > 7 {
		return nil, errorf("%s takes a field, origin, side1, side2, n1, n2[, t], then options; got %d arguments before the options", fn, len(args))
	}
	f, err := fieldArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	r := readArgs(fn, args)
	o, s1, s2 := r.point(1), r.point(2), r.point(3)
	if r.err != nil {
		return nil, r.err
	}
	l1, l2 := r3.Norm(s1), r3.Norm(s2)
	if l1 == 0 || l2 == 0 {
		return nil, errorf("%s: side1 and side2 must have a length", fn)
	}
	e1, e2 := r3.Scale(1/l1, s1), r3.Scale(1/l2, s2)
	// perpendicular within rounding of the components as typed (common
	// practice: a relative 1e-9 is far below any drawn difference)
	if math.Abs(r3.Dot(e1, e2)) > 1e-9 {
		return nil, errorf("%s: side1 and side2 must be perpendicular (the map is a rectangle); use sample_plane for a parallelogram", fn)
	}
	v, err := samplePlane(env, args)
	if err != nil {
		if e := new(argError); errors.As(err, &e) {
			return nil, errorf("%s", strings.Replace(e.msg, "sample_plane", fn, 1))
		}
		return nil, err
	}
	tab := v.(*Table)
	n1, n2 := r.count(4, 2, maxPoints), r.count(5, 2, maxPoints)
	sym := f.sym
	mag := "|" + sym + "|"
	unit := runtime.DisplayUnitOf(f.dim)
	m := &draw.Map{
		U:        draw.Column{Name: "u", Unit: "m", Units: bestUnits(dimLength)},
		V:        draw.Column{Name: "v", Unit: "m", Units: bestUnits(dimLength)},
		Mag:      draw.Column{Name: mag, Unit: unit, Units: bestUnits(f.dim)},
		LogColor: logColor,
		Arrows:   arrows,
		Lines:    lines,
	}
	// a side along a coordinate axis is labelled and numbered by it
	u0, v0 := 0.0, 0.0
	if name, at, ok := alongAxis(o, e1); ok {
		m.U.Name, u0 = name, at
	}
	if name, at, ok := alongAxis(o, e2); ok {
		m.V.Name, v0 = name, at
	}
	for i := 0; i < n1; i++ {
		m.U.Values = append(m.U.Values, u0+l1*float64(i)/float64(n1-1))
	}
	for j := 0; j < n2; j++ {
		m.V.Values = append(m.V.Values, v0+l2*float64(j)/float64(n2-1))
	}
	p := &Plot{pic: m, cols: []string{m.U.Name, m.V.Name, mag}, dims: []runtime.Dim{dimLength, dimLength, f.dim}}
	inPlane := arrows || lines
	if inPlane {
		p.cols = append(p.cols, sym+"u", sym+"v")
		p.dims = append(p.dims, f.dim, f.dim)
	}
	for _, row := range tab.Rows { // u, v, x, y, z, Fx, Fy, Fz, |F|
		m.Mag.Values = append(m.Mag.Values, row[8])
		rec := []float64{u0 + row[0], v0 + row[1], row[8]}
		if inPlane {
			fv := em.Vec{X: row[5], Y: row[6], Z: row[7]}
			fu, fw := r3.Dot(fv, e1), r3.Dot(fv, e2)
			m.FieldU, m.FieldV = append(m.FieldU, fu), append(m.FieldV, fw)
			rec = append(rec, fu, fw)
		}
		p.rows = append(p.rows, rec)
	}
	if f.of != nil {
		for _, t := range f.of.terms {
			m.Paths = append(m.Paths, projectPath(t.path, o, e1, e2, u0, v0)...)
		}
	}
	p.what = fmt.Sprintf("%s on %d × %d points", mag, n1, n2)
	if logColor {
		p.what += ", log colour"
	}
	if arrows {
		p.what += ", arrows"
	}
	if lines {
		p.what += ", field lines"
	}
	m.Title = mag + " in the plane"
	if opts.titled {
		m.Title = opts.title
	}
	return writePlot(env, names, fn, file, p)
}

// alongAxis reports whether the unit vector e is the x, y or z axis
// itself, and gives the axis's name and o's coordinate on it.
func alongAxis(o, e em.Vec) (string, float64, bool) {
	switch e {
	case em.Vec{X: 1}:
		return "x", o.X, true
	case em.Vec{Y: 1}:
		return "y", o.Y, true
	case em.Vec{Z: 1}:
		return "z", o.Z, true
	}
	return "", 0, false
}

// bestUnits is the unit chooser of a column of dimension d.
func bestUnits(d runtime.Dim) func(float64) (string, float64) {
	return func(big float64) (string, float64) { return runtime.BestUnit(d, big, 4) }
}

// projectPath gives a path's runs of joined primitives as polylines in
// the plane's coordinates (u along e1, v along e2 from o).
func projectPath(p em.Path, o, e1, e2 em.Vec, u0, v0 float64) [][][2]float64 {
	const perPrim = 24 // points per primitive: smooth arcs at drawing size
	const most = 20000 // points per path: a long helix stays drawable
	var out [][][2]float64
	total := 0
	for _, run := range p.Loops() {
		var line [][2]float64
		for _, q := range p.Prims[run[0]:run[1]] {
			for k := 0; k <= perPrim && total < most; k++ {
				x := r3.Sub(q.Point(float64(k)/perPrim), o)
				line = append(line, [2]float64{u0 + r3.Dot(x, e1), v0 + r3.Dot(x, e2)})
				total++
			}
		}
		out = append(out, line)
	}
	return out
}

func describeArg(v runtime.Value) string {
	if s, ok := v.(string); ok {
		return fmt.Sprintf("%q", s)
	}
	return runtime.TypeName(v)
}

// plotOpts are the text options that end a plot's arguments.
type plotOpts struct {
	file   string // a file name ending in .svg or .png
	title  string // the text of "title: TEXT"
	titled bool   // whether "title: …" was given ("title:" alone: no title)
	flags  map[string]bool
}

// maxTitle is the longest title accepted, in characters: about what fits
// across the 16 cm page at the title's 12 pt (common practice: half an em
// a character).
const maxTitle = 80

// plotOptions splits off the trailing text options of a plot builtin, in
// any order: a file name ending in .svg or .png, "title: TEXT", and the
// builtin's own flags. Without flags, the first other text ends the
// options (it is a column name); with flags, it is an unknown option.
func plotOptions(fn string, args []runtime.Value, flags ...string) ([]runtime.Value, plotOpts, error) {
	o := plotOpts{flags: map[string]bool{}}
	for len(args) > 0 {
		s, ok := args[len(args)-1].(string)
		if !ok {
			break
		}
		ext := strings.ToLower(filepath.Ext(s))
		switch {
		case strings.HasPrefix(s, "title:"):
			if o.titled {
				return nil, o, errorf("%s: the title is given twice", fn)
			}
			text := strings.TrimSpace(strings.TrimPrefix(s, "title:"))
			if n := utf8.RuneCountInString(text); n > maxTitle {
				return nil, o, errorf("%s: the title has %d characters; at most %d fit across the picture", fn, n, maxTitle)
			}
			for _, r := range text {
				if unicode.IsControl(r) {
					return nil, o, errorf("%s: the title must be one line of text without control characters", fn)
				}
			}
			o.title, o.titled = text, true
		case ext == ".svg" || ext == ".png":
			if o.file != "" {
				return nil, o, errorf("%s: two file names, %q and %q; give one", fn, lang.Abbrev(s, 40), lang.Abbrev(o.file, 40))
			}
			o.file = s
		case slices.Contains(flags, s):
			o.flags[s] = true
		case len(flags) > 0:
			return nil, o, errorf("%s: unknown option %q; the options are %s, \"title: TEXT\" and a file name ending in .svg or .png", fn, lang.Abbrev(s, 40), quoteAll(flags))
		default:
			return args, o, nil
		}
		args = args[:len(args)-1]
	}
	return args, o, nil
}

// plotTableBuiltin draws a table; off counts the arguments before the
// table (for messages).
func plotTableBuiltin(env runtime.Env, names *plotNamer, fn, logAxes string, off int, args []runtime.Value) (runtime.Value, error) {
	args, opts, err := plotOptions(fn, args)
	if err != nil {
		return nil, err
	}
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
	return makePlot(env, names, fn, opts, logAxes, cols, dims, cyc, rows, pick)
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
	args, opts, err := plotOptions(fn, args)
	if err != nil {
		return nil, err
	}
	if len(args) < 3 || len(args) > 4 {
		return nil, errorf("%s takes a function, from, to[, n][, file][, \"title: TEXT\"]; got %d arguments before the file and title", fn, len(args))
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
	return makePlot(env, names, fn, opts, "", tab.Cols, tab.Dims, cyc, tab.Rows, pick)
}

// makePlot draws columns pick (x first) of rows and writes the file.
func makePlot(env runtime.Env, names *plotNamer, fn string, opts plotOpts, logAxes string, cols []string, dims []runtime.Dim, cyc map[int]bool, rows [][]float64, pick []int) (*Plot, error) {
	if len(rows) < 2 {
		return nil, errorf("%s: the table has %d rows; a line needs at least two", fn, len(rows))
	}
	line := &draw.Line{LogX: strings.Contains(logAxes, "x"), LogY: strings.Contains(logAxes, "y"), Title: opts.title}
	p := &Plot{pic: line}
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
	line.X = column(pick[0])
	var ys []string
	for _, j := range pick[1:] {
		line.Ys = append(line.Ys, column(j))
		ys = append(ys, cols[j])
	}
	p.what = fmt.Sprintf("%s against %s, %d points", strings.Join(ys, ", "), cols[pick[0]], len(rows))
	switch logAxes {
	case "xy":
		p.what += ", log x and y"
	case "x", "y":
		p.what += ", log " + logAxes
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
	return writePlot(env, names, fn, opts.file, p)
}

// writePlot draws p and writes it to file in the output directory (a
// numbered name when file is "").
func writePlot(env runtime.Env, names *plotNamer, fn, file string, p *Plot) (*Plot, error) {
	if file != "" && !filepath.IsLocal(filepath.FromSlash(file)) {
		// refused here, not only by the session, so that a script checked
		// without an output directory is refused as well
		return nil, errorf("%s: the file name %q leaves the output directory; give a plain name such as field.svg", fn, file)
	}
	var data []byte
	var err error
	if strings.EqualFold(filepath.Ext(file), ".png") {
		data, err = p.pic.PNG()
	} else {
		data, err = p.pic.SVG()
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
