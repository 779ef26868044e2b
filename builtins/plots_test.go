package builtins_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// plotScript draws the mutual inductance of two coaxial loops against
// their gap; the numbers are only guarded against drift here (the formula
// is tested in induction_test.go).
const plotScript = "# gap\n\n```lw\nr2 = 15 mm\nk(d) = maxwell_mutual(20 mm, r2, d)\nt = sweep(k, 1 mm, 20 mm, 6)\nplot(t, \"d\", \"k\")\nplot_fn(k, 1 mm, 5 mm, 3, \"fn.svg\")\nfield_map(b_field(source(circle([0, 0, 0] m, [0, 0, 1], r2), 1 A)), [-40, 0, -40] mm, [80, 0, 0] mm, [0, 0, 80] mm, 4, 4)\n```\n"

// TestPlotRecordCheck: a plot writes its SVG into the output directory when
// recording, a check without an output directory matches the recorded
// data, and a change of the data is reported as drift.
func TestPlotRecordCheck(t *testing.T) {
	dir := t.TempDir()
	sc, err := runtime.ParseScript("gap.lw", []byte(plotScript))
	if err != nil {
		t.Fatal(err)
	}
	s := runtime.NewSession(builtins.Standard())
	s.OutDir = dir
	rec, err := sc.Record(s)
	if err != nil {
		t.Fatal(err)
	}
	text := string(rec)
	for _, want := range []string{"plot-1.svg: k against d, 6 points", "fn.svg: k against d, 3 points", "d [mm]", "plot-2.svg: |B| on 4 × 4 points", "x [mm]"} {
		if !strings.Contains(text, want) {
			t.Errorf("recorded script lacks %q:\n%s", want, text)
		}
	}
	for _, f := range []string{"plot-1.svg", "fn.svg", "plot-2.svg"} {
		svg, err := os.ReadFile(filepath.Join(dir, f))
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(string(svg), "[mm]") || !strings.Contains(string(svg), "<path") {
			t.Errorf("%s lacks its axis labels or its lines", f)
		}
	}
	again, err := runtime.ParseScript("gap.lw", rec)
	if err != nil {
		t.Fatal(err)
	}
	rep, err := again.Check(runtime.NewSession(builtins.Standard()), 1e-9)
	if err != nil || len(rep.Drifts) != 0 {
		t.Fatalf("check of the recorded script: %v %+v", err, rep.Drifts)
	}
	// the same script with a larger second loop: the plotted data drift
	changed, err := runtime.ParseScript("gap.lw", []byte(strings.Replace(string(rec), "r2 = 15 mm", "r2 = 16 mm", 1)))
	if err != nil {
		t.Fatal(err)
	}
	rep, err = changed.Check(runtime.NewSession(builtins.Standard()), 1e-9)
	if err != nil {
		t.Fatal(err)
	}
	var plotRows, mapRows int
	for _, d := range rep.Drifts {
		if strings.HasPrefix(d.Stmt, "plot") && strings.Contains(d.What, "k [nH]") {
			plotRows++
		}
		if strings.HasPrefix(d.Stmt, "field_map") && strings.Contains(d.What, "|B|") {
			mapRows++
		}
	}
	if plotRows == 0 || mapRows == 0 {
		t.Errorf("drift of the plotted data not reported (plot %d, map %d): %+v", plotRows, mapRows, rep.Drifts)
	}
}

// TestPlotNames: file names that leave the output directory are refused,
// with or without one; without one the plot is a value that says it was
// not written.
func TestPlotNames(t *testing.T) {
	for _, out := range []string{"", t.TempDir()} {
		s := runtime.NewSession(builtins.Standard())
		s.OutDir = out
		eval(t, s, "k(d) = maxwell_mutual(20 mm, 15 mm, d)")
		eval(t, s, "t = sweep(k, 1 mm, 20 mm, 4)")
		for _, bad := range []string{"../x.svg", "/tmp/x.svg", "a/../../x.svg"} {
			_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, `plot(t, "d", "k", "`+bad+`")`)
			if err == nil || !strings.Contains(err.Error(), "leaves the output directory") {
				t.Errorf("OutDir %q, file %q: %v", out, bad, err)
			}
		}
		res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, `plot(t, "d", "k", "sub/ok.svg")`)
		if err != nil {
			t.Fatal(err)
		}
		p := res.Value.(*builtins.Plot)
		if out == "" {
			if p.Path != "" || !strings.Contains(res.Text, "not written: this session writes no files") {
				t.Errorf("no output directory: %q", res.Text)
			}
		} else if want := filepath.Join(out, "sub", "ok.svg"); p.Path != want || !strings.Contains(res.Text, "written to "+want) {
			t.Errorf("written to %q, text %q", p.Path, res.Text)
		}
	}
}

func TestPlotRefuses(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	eval(t, s, "k(d) = maxwell_mutual(20 mm, 15 mm, d)")
	eval(t, s, "t = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 5)")
	eval(t, s, "u = sweep(k, 1 mm, 20 mm, 4)")
	for _, c := range []struct{ stmt, msg string }{
		{`plot(u, "d", "x")`, `plot: the table has no column "x"; its columns are "d", "k"`},
		{`plot(u, "d", 3)`, `plot: the third argument must be a column name in quotes, such as "k", not a plain number`},
		{`plot(t, "z", "Bz", "s")`, `plot: the columns "Bz" (magnetic flux density (T)) and "s" (length (m)) have different units; draw them on separate plots`},
		{`plot(k, "d", "k")`, `plot: the first argument must be a table (from sweep, sample_line…), not the function k`},
		{`plot_log(t, "y", "z", "Bx")`, `a log axis needs every value above zero`},
		{`plot_log(u, "w", "d", "k")`, `plot_log: the second argument names the log axes: "x", "y" or "xy", not "w"`},
		{`plot(u, "d", "k", "a.pdf")`, `plot: the file "a.pdf" must end in .svg or .png`},
	} {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.stmt)
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%s: %v; want %q", c.stmt, err, c.msg)
		}
	}
}

// TestFieldMap: a map of B around a loop records its grid (x and z, as the
// sides run along those axes) and magnitude, writes an SVG labelled with
// both axes and the colour bar's unit, and refuses sides that are not
// perpendicular and unknown options.
func TestFieldMap(t *testing.T) {
	dir := t.TempDir()
	s := runtime.NewSession(builtins.Standard())
	s.OutDir = dir
	eval(t, s, "loop = source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)")
	res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, `field_map(b_field(loop), [-50, 0, -40] mm, [100, 0, 0] mm, [0, 0, 80] mm, 4, 3, "arrows", "map.svg")`)
	if err != nil {
		t.Fatal(err)
	}
	cols, _, rows := res.Value.(runtime.Tabular).Tabulate()
	if strings.Join(cols, " ") != "x z |B| Bu Bv" || len(rows) != 12 {
		t.Fatalf("columns %q, %d rows", cols, len(rows))
	}
	// the grid's corners: x from -50 mm, z from -40 mm to 40 mm
	if rows[0][0] != -0.05 || rows[0][1] != -0.04 || rows[11][1] != 0.04 {
		t.Errorf("grid corners: %v … %v", rows[0], rows[11])
	}
	// on the plane y = 0 the in-plane components carry all of B (By = 0
	// by the loop's symmetry): |B|² = Bu² + Bv² to rounding
	for _, r := range rows {
		if d := r[2]*r[2] - (r[3]*r[3] + r[4]*r[4]); d > 1e-12*r[2]*r[2] || d < -1e-12*r[2]*r[2] {
			t.Errorf("row %v: |B|² − Bu² − Bv² = %g", r, d)
		}
	}
	svg, err := os.ReadFile(filepath.Join(dir, "map.svg"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"x [mm]", "z [mm]", "|B| [µT]"} {
		if !strings.Contains(string(svg), want) {
			t.Errorf("map.svg lacks %q", want)
		}
	}
	// the loop's path is drawn on top: one polyline more than the map of
	// the same field given as a user function, which has no source
	eval(t, s, "F(p) = b_at(loop, p)")
	eval(t, s, `field_map(F, [-50, 0, -40] mm, [100, 0, 0] mm, [0, 0, 80] mm, 4, 3, "arrows", "user.svg")`)
	user, err := os.ReadFile(filepath.Join(dir, "user.svg"))
	if err != nil {
		t.Fatal(err)
	}
	if a, b := strings.Count(string(svg), "<path"), strings.Count(string(user), "<path"); a != b+1 {
		t.Errorf("paths: %d with the source, %d without; want one more", a, b)
	}
	for _, c := range []struct{ stmt, msg string }{
		{`field_map(b_field(loop), [0, 0, 0] mm, [1, 0, 0] mm, [1, 0, 1] mm, 3, 3)`, "side1 and side2 must be perpendicular"},
		{`field_map(b_field(loop), [0, 0, 0] mm, [1, 0, 0] mm, [0, 0, 1] mm, 3, 3, "dots")`, `unknown option "dots"`},
		{`field_map(b_field(loop), [0, 0, 0] mm, [1, 0, 0] mm, [0, 0, 1] mm, 3, 3, "../m.svg")`, "leaves the output directory"},
		{`field_map(b_field(loop), [0, 0, 0] mm, [1, 0, 0] mm, [0, 0, 1] mm, 1, 3)`, "field_map:"},
	} {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.stmt)
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%s: %v; want %q", c.stmt, err, c.msg)
		}
	}
}

// TestPlotTitle: "title: TEXT" sets the title of every kind of plot, in
// either order with the file name; "title:" alone leaves a map without its
// default title; the text is escaped in the SVG; a second title, a title
// too long for the page and a control character are refused.
func TestPlotTitle(t *testing.T) {
	dir := t.TempDir()
	s := runtime.NewSession(builtins.Standard())
	s.OutDir = dir
	eval(t, s, "k(d) = maxwell_mutual(20 mm, 15 mm, d)")
	eval(t, s, "u = sweep(k, 1 mm, 20 mm, 4)")
	eval(t, s, "loop = source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)")
	read := func(name string) string {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	for _, c := range []struct{ stmt, file, want, not string }{
		{`plot(u, "d", "k", "title: Coupling & gap", "a.svg")`, "a.svg", ">Coupling &amp; gap</text>", ""},
		{`plot(u, "d", "k", "b.svg", "title:  Coupling <two loops> ")`, "b.svg", ">Coupling &lt;two loops&gt;</text>", ""},
		{`plot_log(u, "y", "d", "k", "title: log", "c.svg")`, "c.svg", ">log</text>", ""},
		{`plot_fn(k, 1 mm, 5 mm, 3, "title: from a function", "d.svg")`, "d.svg", ">from a function</text>", ""},
		{`field_map(b_field(loop), [-50, 0, -50] mm, [100, 0, 0] mm, [0, 0, 100] mm, 4, 4, "title: Loop, 2 A", "e.svg")`, "e.svg", ">Loop, 2 A</text>", "in the plane"},
		{`field_map(b_field(loop), [-50, 0, -50] mm, [100, 0, 0] mm, [0, 0, 100] mm, 4, 4, "f.svg")`, "f.svg", ">|B| in the plane</text>", ""},
		{`field_map(b_field(loop), [-50, 0, -50] mm, [100, 0, 0] mm, [0, 0, 100] mm, 4, 4, "title:", "log", "g.svg")`, "g.svg", "|B| [µT]", "in the plane"},
		{`plot(u, "d", "k", "h.svg")`, "h.svg", "k [nH]", "Coupling"},
	} {
		if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.stmt); err != nil {
			t.Errorf("%s: %v", c.stmt, err)
			continue
		}
		svg := read(c.file)
		if !strings.Contains(svg, c.want) {
			t.Errorf("%s: the SVG lacks %q", c.stmt, c.want)
		}
		if c.not != "" && strings.Contains(svg, c.not) {
			t.Errorf("%s: the SVG holds %q", c.stmt, c.not)
		}
	}
	for _, c := range []struct{ stmt, msg string }{
		{`plot(u, "d", "k", "title: a", "title: b")`, "plot: the title is given twice"},
		{`plot(u, "d", "k", "title: ` + strings.Repeat("x", 81) + `")`, "plot: the title has 81 characters; at most 80 fit across the picture"},
		{`plot(u, "d", "k", "title: a\tb")`, "plot: the title must be one line of text without control characters"},
		{`plot(u, "d", "k", "a.svg", "b.svg")`, `plot: two file names, "a.svg" and "b.svg"; give one`},
		{`field_map(b_field(loop), [0, 0, 0] mm, [1, 0, 0] mm, [0, 0, 1] mm, 3, 3, "title: x", "dots")`, `field_map: unknown option "dots"; the options are "arrows", "lines", "log", "title: TEXT" and a file name ending in .svg or .png`},
	} {
		_, err := s.Eval(lang.Pos{Line: 1, Col: 1}, c.stmt)
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%s: %v; want %q", c.stmt, err, c.msg)
		}
	}
}

// TestFieldMapLines: "lines" records the in-plane components as "arrows"
// does, says so in the summary, and draws the lines (in their own
// colour) without the arrows; a loop seen edge-on on the plane y = 0 has
// no By (its symmetry), so Bu² + Bv² = |B|² to rounding.
func TestFieldMapLines(t *testing.T) {
	dir := t.TempDir()
	s := runtime.NewSession(builtins.Standard())
	s.OutDir = dir
	eval(t, s, "loop = source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)")
	res, err := s.Eval(lang.Pos{Line: 1, Col: 1}, `field_map(b_field(loop), [-60, 0, -60] mm, [120, 0, 0] mm, [0, 0, 120] mm, 24, 24, "lines", "lines.svg")`)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(res.Text, "lines.svg: |B| on 24 × 24 points, field lines") {
		t.Errorf("summary %q", res.Text)
	}
	cols, _, rows := res.Value.(runtime.Tabular).Tabulate()
	if strings.Join(cols, " ") != "x z |B| Bu Bv" || len(rows) != 24*24 {
		t.Fatalf("columns %q, %d rows", cols, len(rows))
	}
	for _, r := range rows {
		if d := r[2]*r[2] - (r[3]*r[3] + r[4]*r[4]); d > 1e-12*r[2]*r[2] || d < -1e-12*r[2]*r[2] {
			t.Errorf("row %v: |B|² − Bu² − Bv² = %g", r, d)
		}
	}
	svg, err := os.ReadFile(filepath.Join(dir, "lines.svg"))
	if err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(string(svg), "stroke:#6FE08C"); n < 10 {
		t.Errorf("%d field lines drawn", n)
	}
	if strings.Contains(string(svg), "stroke:#1FB4E8;stroke-width:0.8") {
		t.Error("arrows drawn without \"arrows\"")
	}
}
