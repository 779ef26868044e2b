package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"golang.org/x/net/html"

	"loopwise/runtime"
)

// reportScript exercises the page: mathematics in the prose, a table, a
// caution, and one recorded result that no longer matches (2 m * 3 is 6 m,
// recorded as 6.5 m on purpose).
const reportScript = "# Test page\n\n" +
	"Flux $\\Phi = \\mu_0 N I A / l$ costs $5 and $6.\n\n" +
	"$$\n\\varepsilon = -\\frac{d\\Phi}{dt}\n$$\n\n" +
	"```lw\n" +
	"f(x) = x^2\n↳ defined f(x)\n" +
	"sweep(f, 0 m, 2 m, 5)\n↳ table of 5 rows: x [m], f [m^2]\n" +
	"│ x [m]  f [m^2]\n│     0        0\n│   0.5     0.25\n│     1        1\n│   1.5     2.25\n│     2        4\n" +
	"v = 51 V\n↳ 51 V\n" +
	"↳ ⚠ caution: 51 V is above the AC extra-low-voltage limit (50 V rms; IEC 61140, from memory) if it is an AC value. Treat it as hazardous: follow local electrical codes, exposure rules and licensed practice.\n" +
	"p = 2 m * 3\n↳ 6.5 m\n" +
	"```\n"

// writeReport writes script to a temporary directory, runs loopwise report
// on it and returns the page and the exit status.
func writeReport(t *testing.T, script string) (string, int, string) {
	t.Helper()
	out, code, msg := writeReportFile(t, script)
	page, err := os.ReadFile(out)
	if err != nil {
		t.Fatalf("no page written: %v (%s)", err, msg)
	}
	return string(page), code, msg
}

// writeReportFile is writeReport returning the page's file name.
func writeReportFile(t *testing.T, script string) (string, int, string) {
	t.Helper()
	dir := t.TempDir()
	path := filepath.Join(dir, "t.lw")
	if err := os.WriteFile(path, []byte(script), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "t.html")
	var stdout, stderr bytes.Buffer
	code := run([]string{"report", path, "-o", out}, nil, &stdout, &stderr)
	return out, code, stdout.String() + stderr.String()
}

// node helpers over golang.org/x/net/html

func parsePage(t *testing.T, page string) *html.Node {
	t.Helper()
	doc, err := html.Parse(strings.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	return doc
}

func walk(n *html.Node, fn func(*html.Node)) {
	fn(n)
	for c := n.FirstChild; c != nil; c = c.NextSibling {
		walk(c, fn)
	}
}

func attr(n *html.Node, key string) (string, bool) {
	for _, a := range n.Attr {
		if a.Key == key {
			return a.Val, true
		}
	}
	return "", false
}

func hasClass(n *html.Node, class string) bool {
	c, _ := attr(n, "class")
	for _, f := range strings.Fields(c) {
		if f == class {
			return true
		}
	}
	return false
}

func textOf(n *html.Node) string {
	var b strings.Builder
	walk(n, func(m *html.Node) {
		if m.Type == html.TextNode {
			b.WriteString(m.Data)
		}
	})
	return b.String()
}

// byClass returns the text of every element with the class.
func byClass(doc *html.Node, class string) []string {
	var out []string
	walk(doc, func(n *html.Node) {
		if n.Type == html.ElementNode && hasClass(n, class) {
			out = append(out, textOf(n))
		}
	})
	return out
}

// selfContained fails on a <script>, <link>, <iframe>, <object> or
// <embed>, on an event handler attribute, and on any src or href that is
// not an in-page anchor.
func selfContained(t *testing.T, doc *html.Node) {
	t.Helper()
	walk(doc, func(n *html.Node) {
		if n.Type != html.ElementNode {
			return
		}
		switch n.Data {
		case "script", "link", "iframe", "object", "embed":
			t.Errorf("the page holds a <%s>", n.Data)
		}
		for _, a := range n.Attr {
			if strings.HasPrefix(a.Key, "on") {
				t.Errorf("<%s> has an event handler %s", n.Data, a.Key)
			}
			if (a.Key == "src" || a.Key == "href") && !strings.HasPrefix(a.Val, "#") {
				t.Errorf("<%s %s=%q> points outside the page", n.Data, a.Key, a.Val)
			}
		}
	})
}

func TestReportPage(t *testing.T) {
	page, code, msg := writeReport(t, reportScript)
	if code != 1 || !strings.Contains(msg, "1 of 4 results drifted") {
		t.Errorf("exit %d, output %q; want 1 and one drifted result", code, msg)
	}
	doc := parsePage(t, page)
	selfContained(t, doc)
	for _, want := range []string{
		`<meta name="viewport" content="width=device-width, initial-scale=1">`,
		"@media print", "@media (max-width: 480px)",
		"<dt>Script</dt><dd>t.lw</dd>",
		"<title>Test page</title>",
	} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	var dd []string
	walk(doc, func(n *html.Node) {
		if n.Type == html.ElementNode && n.Data == "dd" {
			dd = append(dd, textOf(n))
		}
	})
	if len(dd) != 3 || dd[0] != "t.lw" || dd[2] != version() || !strings.HasSuffix(dd[1], " UTC") {
		t.Errorf("script, time and version %q", dd)
	}
	status := byClass(doc, "status")
	if len(status) != 1 || status[0] != "1 of 4 recorded results no longer match." {
		t.Errorf("status %q", status)
	}
	if got := byClass(doc, "code"); len(got) != 4 || got[1] != "12sweep(f, 0 m, 2 m, 5)" {
		t.Errorf("statements %q", got)
	}
	results := byClass(doc, "result")
	want := []string{"↳ defined f(x)", "↳ table of 5 rows: x [m], f [m^2]", "↳ 51 V", "↳ 6 m"}
	if strings.Join(results, "|") != strings.Join(want, "|") {
		t.Errorf("results %q, want %q", results, want)
	}
	// the table: header with units, rows as computed (x from 0 to 2 m in
	// four steps, f = x^2)
	var cells []string
	walk(doc, func(n *html.Node) {
		if n.Type == html.ElementNode && (n.Data == "th" || n.Data == "td") {
			cells = append(cells, textOf(n))
		}
	})
	if got := strings.Join(cells, " "); got != "x [m] f [m^2] 0 0 0.5 0.25 1 1 1.5 2.25 2 4" {
		t.Errorf("table cells %q", got)
	}
	cautions := byClass(doc, "caution")
	if len(cautions) != 1 || !strings.HasPrefix(cautions[0], "⚠ Caution 51 V is above") {
		t.Errorf("cautions %q", cautions)
	}
	drifts := byClass(doc, "drift")
	if len(drifts) != 1 || !strings.Contains(drifts[0], "recorded: 6.5 m") || !strings.Contains(drifts[0], "now: 6 m") {
		t.Errorf("drifts %q", drifts)
	}
	// mathematics as text, never blank; "$5 and $6" stays prose
	math := byClass(doc, "math")
	if len(math) != 2 || math[0] != "Φ = μ₀ N I A / l" || math[1] != "ε = -(dΦ)/(dt)" {
		t.Errorf("mathematics %q", math)
	}
	if !strings.Contains(page, "costs $5 and $6.") {
		t.Error("dollar amounts were taken for mathematics")
	}
}

// TestReportError: an error is shown at its statement, with its position;
// the statements after it are shown as not evaluated; the exit status is 1.
func TestReportError(t *testing.T) {
	script := "# E\n\n```lw\na = 2 m\n↳ 2 m\nb = a + 1 s\nc = 3\n↳ 3\n```\n"
	page, code, msg := writeReport(t, script)
	if code != 1 || !strings.Contains(msg, "t.lw:6:") {
		t.Errorf("exit %d, output %q", code, msg)
	}
	doc := parsePage(t, page)
	selfContained(t, doc)
	errs := byClass(doc, "error")
	if len(errs) != 1 || !strings.Contains(errs[0], "Error at line 6") || !strings.Contains(errs[0], "t.lw:6:") {
		t.Errorf("errors %q", errs)
	}
	if s := byClass(doc, "status"); len(s) != 1 || !strings.Contains(s[0], "stopped at an error at line 6") {
		t.Errorf("status %q", s)
	}
	if s := byClass(doc, "skipped-note"); len(s) != 1 || !strings.Contains(s[0], "Recorded result: 3") {
		t.Errorf("skipped %q", s)
	}
}

// TestReportRawHTML: HTML written in the prose is not passed into the page.
func TestReportRawHTML(t *testing.T) {
	script := "# R\n\n<script>alert(1)</script>\n\n<img src=\"http://example.invalid/x.png\">\n\n![a plot](http://example.invalid/p.png)\n\n```lw\na = 1\n↳ 1\n```\n"
	page, _, _ := writeReport(t, script)
	if strings.Contains(page, "alert(1)") || strings.Contains(page, "<img") {
		t.Errorf("raw HTML reached the page:\n%s", page)
	}
	if !strings.Contains(page, "[image: a plot]") {
		t.Error("a Markdown image is not shown as a link")
	}
}

// TestMathText: TeX becomes readable text; what is not known stays as
// written, never blank.
func TestMathText(t *testing.T) {
	cases := []struct{ in, want string }{
		{`\mu_0 I / (2 \pi r)`, "μ₀ I / (2 π r)"},
		{`R^2 + z^{-3}`, "R² + z⁻³"},
		{`\frac{d\Phi}{dt}`, "(dΦ)/(dt)"},
		{`\mathcal{E}`, `\mathcal{E}`},
		{`\left( a \right)`, "( a )"},
		{`\mathrm{}`, `\mathrm{}`},
		{`\mathrm{d}t \cdot \vec{B}`, "dt · B"},
	}
	for _, c := range cases {
		if got := mathText(c.in); got != c.want {
			t.Errorf("mathText(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// TestMathDollars: which dollars open mathematics (pandoc's rules).
func TestMathDollars(t *testing.T) {
	cases := []struct{ in, want string }{
		{"a $x$ b", `<p>a <span class="math" title="x">x</span> b</p>`},
		{"costs $5 and $6", "<p>costs $5 and $6</p>"},
		{"$ x$ and $x $", "<p>$ x$ and $x $</p>"},
		{"$$\na\n$$", `<p><span class="math display" title="a">a</span></p>`},
		{"$$ never closed", "<p>$$ never closed</p>"},
		{"`$x$` in code", "<p><code>$x$</code> in code</p>"},
	}
	for _, c := range cases {
		var b bytes.Buffer
		if err := markdown.Convert([]byte(c.in), &b); err != nil {
			t.Fatal(err)
		}
		if got := strings.TrimSpace(b.String()); got != c.want {
			t.Errorf("%q renders as %q, want %q", c.in, got, c.want)
		}
	}
}

// fakePlot stands in for a plot value: the drawing package is not part of
// the report, which needs only runtime.Picture. Its SVG has the shape
// gonum.org/v1/plot's vgsvg writes (an XML declaration and a comment
// before the <svg> element, sizes in points with a viewBox), 400 pt wide,
// wider than a phone.
type fakePlot struct{}

func (fakePlot) Show(int) string    { return "plot" }
func (fakePlot) Kind() string       { return "plot" }
func (fakePlot) Summary(int) string { return "plot: 1 series of 2 points" }
func (fakePlot) Tabulate() ([]string, []runtime.Dim, [][]float64) {
	return []string{"x", "y"}, []runtime.Dim{{}, {}}, [][]float64{{0, 0}, {1, 1}}
}
func (fakePlot) SVG() ([]byte, error) {
	return []byte(`<?xml version="1.0"?>
<!-- Generated by a drawing library -->
<svg width="400pt" height="200pt" viewBox="0 0 400 200"
	xmlns="http://www.w3.org/2000/svg">
<path d="M20,180L380,20" style="fill:none;stroke:#000000;stroke-width:2" />
</svg>
`), nil
}

// plotPage renders a one-statement script whose value is replaced by
// fakePlot.
func plotPage(t *testing.T) string {
	t.Helper()
	sc, err := runtime.ParseScript("plot.lw", []byte("# Plot\n\n```lw\nq = 1\n↳ 1\n```\n"))
	if err != nil {
		t.Fatal(err)
	}
	results, err := sc.Evaluate(newSession(), runtime.DefaultTolerance)
	if err != nil {
		t.Fatal(err)
	}
	results[0].Result.Value = fakePlot{}
	page, err := renderReport(reportInput{Script: sc, Results: results, Digits: 6, Version: "v", When: time.Unix(0, 0)})
	if err != nil {
		t.Fatal(err)
	}
	return string(page)
}

// TestReportPlot: a plot is inlined as its <svg> element (without what
// comes before it), its data in a table below it.
func TestReportPlot(t *testing.T) {
	page := plotPage(t)
	doc := parsePage(t, page)
	selfContained(t, doc)
	if strings.Contains(page, "<?xml") || strings.Contains(page, "Generated by") {
		t.Error("the XML declaration or comment before <svg> reached the page")
	}
	var svgs int
	walk(doc, func(n *html.Node) {
		if n.Type == html.ElementNode && n.Data == "svg" && n.Parent != nil && hasClass(n.Parent, "plot") {
			svgs++
		}
	})
	if svgs != 1 {
		t.Errorf("%d inline plots, want 1", svgs)
	}
	if !strings.Contains(page, "<details><summary>Data</summary>") || !strings.Contains(page, "<td>1</td>") {
		t.Error("the plot's data is not in a table under it")
	}
}

// TestReportNamedRows: an AC solution's table in the report names each
// row by its element.
func TestReportNamedRows(t *testing.T) {
	c := newConsole(&bytes.Buffer{}, &bytes.Buffer{})
	c.line(`sol = ac_solve(circuit(voltage_source("V1", "a", "0", 10 V), resistor("R1", "a", "b", 3 ohm), inductor("L1", "b", "0", 1 mH)), 1 kHz)`)
	v, ok := c.s.Lookup("sol")
	if !ok {
		t.Fatal("sol was not assigned")
	}
	tv := tableOf(v.(runtime.Tabular), 6)
	if tv.Head[0] != "element" || len(tv.Rows) != 3 || tv.Rows[0][0] != "V1" || tv.Rows[2][0] != "L1" {
		t.Fatalf("head %q, rows %q", tv.Head, tv.Rows)
	}
}

// noisyTable has a cell that is rounding noise against its column.
type noisyTable struct{}

func (noisyTable) Kind() string       { return "a table" }
func (noisyTable) Show(int) string    { return "" }
func (noisyTable) Summary(int) string { return "" }
func (noisyTable) Tabulate() ([]string, []runtime.Dim, [][]float64) {
	return []string{"x"}, []runtime.Dim{{}}, [][]float64{{53.5}, {-2.2e-12}, {1e-3}}
}

// TestReportNoiseCells: a cell below runtime.TableNoise of its column's
// largest magnitude shows as 0 in the report, as scripts record it; a
// small value above it stays.
func TestReportNoiseCells(t *testing.T) {
	tv := tableOf(noisyTable{}, 6)
	if got := []string{tv.Rows[1][0], tv.Rows[2][0]}; got[0] != "0" || got[1] != "0.001" {
		t.Errorf("cells %q, want 0 and 0.001", got)
	}
}

// TestReportNumericalError: the page shows a result's numerical error
// estimate even when it is below the digits shown.
func TestReportNumericalError(t *testing.T) {
	page, _, _ := writeReport(t, "# N\n\n```lw\ng(x) = cos(x) - x\nsolve(g, 0, 0, 1)\n```\n")
	if !strings.Contains(page, "0.739085 (numerical error ≤ 3.7e-13)") {
		t.Errorf("page lacks the estimate:\n%s", page)
	}
}

// TestReportTableNumericalError: a transient's table carries each
// column's numerical error bound to the page, as its last row.
func TestReportTableNumericalError(t *testing.T) {
	page, _, _ := writeReport(t, "# N\n\n```lw\ntransient(circuit(voltage_source(\"V1\", \"a\", \"0\", 12 V), resistor(\"R1\", \"a\", \"b\", 3 ohm), inductor(\"L1\", \"b\", \"0\", 6 mH)), 10 ms, 5)\n```\n")
	if !strings.Contains(page, "<tfoot><tr><td>num. error</td><td>≤ ") {
		t.Errorf("page lacks the table's numerical error row:\n%s", page)
	}
}
