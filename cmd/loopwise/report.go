package main

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"html/template"
	"io"
	"path/filepath"
	"strings"
	"time"

	"github.com/yuin/goldmark"

	"loopwise/builtins"
	"loopwise/runtime"
)

// reportUsage is what report -h prints.
const reportUsage = `usage: loopwise report [-o OUT.html] [-tol R] [-budget SECONDS] FILE
  Evaluate the script and write it as one self-contained HTML page: the
  prose rendered as Markdown (mathematics between $ signs shown as text in
  its own style), every statement with its result, tables as tables, plots
  inline, cautions in a box of their own, an error at its statement, and
  whether every recorded result still matches (as check, within the
  relative tolerance R, default 1e-9). The page loads nothing from
  anywhere and runs no script. OUT.html defaults to FILE with .html in
  place of .lw. Files that statements write (plots, exports) go to the
  directory beside FILE named after it. The page is written also when a
  statement fails or a result drifted; the exit status is then 1.
` + budgetUsage

// reportRows is the most rows of a table the page shows.
const reportRows = runtime.RecordRows

func reportFiles(args []string, stdout, stderr io.Writer) int {
	args, budget, code := takeBudget("report", args, stderr)
	if code != 0 {
		return code
	}
	fs := flag.NewFlagSet("report", flag.ContinueOnError)
	fs.SetOutput(stderr)
	out := fs.String("o", "", "the HTML file to write")
	tol := fs.Float64("tol", runtime.DefaultTolerance, "relative tolerance for numeric results")
	files, err := parseInterleaved(fs, args)
	if err != nil {
		return 2
	}
	if len(files) != 1 {
		fmt.Fprintf(stderr, "loopwise report: name one script file\n%s", reportUsage)
		return 2
	}
	if !(*tol >= 0 && *tol < 1) {
		fmt.Fprintf(stderr, "loopwise report: -tol must be at least 0 and below 1, got %g\n", *tol)
		return 2
	}
	file := files[0]
	if *out == "" {
		*out = strings.TrimSuffix(file, runtime.ScriptExt) + ".html"
	}
	if filepath.Clean(*out) == filepath.Clean(file) {
		fmt.Fprintf(stderr, "loopwise report: the page would overwrite the script %s; name another file with -o\n", file)
		return 2
	}
	sc, err := load(file)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return 1
	}
	s := scriptSession(budget, stderr)
	s.OutDir = outDirFor(file, "", false)
	s.InDir = filepath.Dir(file)
	results, evalErr := sc.Evaluate(s, *tol)
	var none *runtime.NoStatementsError
	if errors.As(evalErr, &none) {
		fmt.Fprintln(stderr, evalErr)
		return 1
	}
	page, err := renderReport(reportInput{
		Script: sc, Results: results, Err: evalErr, Digits: s.Digits,
		Version: version(), When: time.Now(),
	})
	if err != nil {
		fmt.Fprintf(stderr, "loopwise report: %v\n", err)
		return 1
	}
	if err := runtime.WriteFileAtomic(*out, page); err != nil {
		fmt.Fprintf(stderr, "loopwise report: %v\n", err)
		return 1
	}
	rep := sc.Report(results)
	switch {
	case evalErr != nil:
		fmt.Fprintln(stderr, evalErr)
		fmt.Fprintf(stdout, "%s: report written to %s (evaluation stopped at an error)\n", file, *out)
		return 1
	case rep.Drifted > 0:
		fmt.Fprintf(stdout, "%s: report written to %s (%d of %d results drifted)\n", file, *out, rep.Drifted, rep.Results)
		return 1
	}
	fmt.Fprintf(stdout, "%s: report written to %s\n", file, *out)
	return 0
}

// reportInput is what a report page shows.
type reportInput struct {
	Script  *runtime.Script
	Results []runtime.StatementResult
	Err     error // the error that stopped the evaluation, or nil
	Digits  int
	Version string
	When    time.Time

	// for the live view (watch)
	Live         bool
	Gen          int           // the number of this page
	LoadErr      error         // the script could not be read (Script is nil)
	Path         string        // the script's file, when Script is nil
	LastGood     template.HTML // the article of the last evaluation without an error
	LastGoodWhen time.Time
}

// markdown renders prose: CommonMark with our mathematics extension.
// Raw HTML in the prose is not passed through (goldmark's default), so
// prose cannot bring a script into the page.
var markdown = goldmark.New(goldmark.WithExtensions(mathExtension{}, localImages{}))

// renderReport writes the page.
func renderReport(in reportInput) ([]byte, error) {
	page, _, err := renderReportParts(in)
	return page, err
}

// renderReportParts writes the page, and returns also its article (the
// script's content, without the title and the status box).
func renderReportParts(in reportInput) (page []byte, article template.HTML, err error) {
	if in.Script == nil {
		v := pageView{Title: filepath.Base(in.Path), Script: in.Path, Version: in.Version, When: in.When.UTC().Format("2006-01-02 15:04:05 UTC"),
			Stopped: true, LoadErr: in.LoadErr.Error()}
		return in.finish(v)
	}
	sc := in.Script
	byLine := make(map[int]runtime.StatementResult, len(in.Results))
	for _, r := range in.Results {
		byLine[r.Stmt.Line] = r
	}
	var body bytes.Buffer
	var prose []string
	flush := func() error {
		if len(prose) == 0 {
			return nil
		}
		err := markdown.Convert([]byte(strings.Join(prose, "\n")+"\n"), &body)
		prose = prose[:0]
		return err
	}
	inBlock := false
	for i := 0; i < len(sc.Lines); i++ {
		line := sc.Lines[i]
		if sc.Prose(i) {
			prose = append(prose, line)
			continue
		}
		if err := flush(); err != nil {
			return nil, "", err
		}
		if sc.Fence(i) {
			if inBlock {
				body.WriteString("</section>\n")
			} else {
				body.WriteString(`<section class="block">` + "\n")
			}
			inBlock = !inBlock
			continue
		}
		if r, ok := byLine[i]; ok {
			if err := stmtTmpl.Execute(&body, stmtView(r, in.Digits)); err != nil {
				return nil, "", err
			}
			i = r.Stmt.End
			continue
		}
		if t := strings.TrimSpace(line); t != "" && !isRecordedLine(t) {
			fmt.Fprintf(&body, "<pre class=\"comment\">%s</pre>\n", template.HTMLEscapeString(t))
		}
	}
	if err := flush(); err != nil {
		return nil, "", err
	}
	rep := sc.Report(in.Results)
	// a script that opens with a level-one heading keeps it above the
	// status box: the page reads as the script does
	var heading string
	text := body.String()
	if strings.HasPrefix(text, "<h1") {
		if k := strings.Index(text, "</h1>\n"); k >= 0 {
			heading, text = text[:k+len("</h1>\n")], text[k+len("</h1>\n"):]
		}
	}
	v := pageView{
		Title:   pageTitle(sc),
		Heading: template.HTML(heading),
		Script:  filepath.Base(sc.Path),
		Version: in.Version,
		When:    in.When.UTC().Format("2006-01-02 15:04:05 UTC"),
		Body:    template.HTML(text),
		Checked: rep.Results,
		Drifted: rep.Drifted,
	}
	if in.Err != nil {
		for _, r := range in.Results {
			if r.Err != nil {
				v.ErrorLine = r.Stmt.Line + 1
			}
		}
		v.Stopped = true
	}
	return in.finish(v)
}

// finish adds what the live view shows and writes the page.
func (in reportInput) finish(v pageView) ([]byte, template.HTML, error) {
	v.Script = filepath.Base(v.Script)
	if in.Live {
		v.Live = template.HTML(fmt.Sprintf(liveScript, in.Gen))
		if (in.Err != nil || in.LoadErr != nil) && in.LastGood != "" {
			v.LastGood = in.LastGood
			v.LastGoodWhen = in.LastGoodWhen.UTC().Format("2006-01-02 15:04:05 UTC")
		}
	}
	var page bytes.Buffer
	if err := pageTmpl.Execute(&page, v); err != nil {
		return nil, "", err
	}
	return page.Bytes(), v.Heading + v.Body, nil
}

func isRecordedLine(t string) bool {
	return strings.HasPrefix(t, runtime.ResultMark) || strings.HasPrefix(t, runtime.TableMark)
}

// pageTitle is the script's first level-one heading, else its file name.
func pageTitle(sc *runtime.Script) string {
	for i, l := range sc.Lines {
		if sc.Prose(i) && strings.HasPrefix(l, "# ") {
			return strings.TrimSpace(strings.TrimPrefix(l, "# "))
		}
	}
	return filepath.Base(sc.Path)
}

type pageView struct {
	Title, Script, Version, When string
	Heading, Body                template.HTML
	Checked, Drifted             int
	Stopped                      bool
	ErrorLine                    int
	LoadErr                      string        // the script could not be read
	Live                         template.HTML // the live view's script
	LastGood                     template.HTML
	LastGoodWhen                 string
}

// statementView is one statement as the page shows it.
type statementView struct {
	Line      int // 1-based
	Text      string
	Evaluated bool
	Result    string // the shown result, or ""
	Note      string
	Table     *tableView
	SVG       template.HTML // an inlined plot, or ""
	SVGErr    string
	Cautions  []string
	Drifts    []runtime.Drift
	Error     string
	// ErrorSource is the source line and caret under the error message
	ErrorSource string
	Recorded    string // for a statement not evaluated
}

type tableView struct {
	Head []string
	Rows [][]string
	More int      // rows not shown
	Foot []string // each column's numerical error bound, or nil
}

func stmtView(r runtime.StatementResult, digits int) statementView {
	v := statementView{Line: r.Stmt.Line + 1, Text: r.Text, Evaluated: r.Evaluated(), Drifts: r.Drifts, Recorded: r.Recorded}
	if r.Err != nil {
		// the message wraps; the source line and its caret keep their
		// columns (and scroll on a narrow screen)
		v.Error, v.ErrorSource, _ = strings.Cut(r.Err.Error(), "\n")
	}
	res := r.Result
	if res == nil {
		if !v.Evaluated {
			for _, c := range r.RecordedCautions {
				v.Cautions = append(v.Cautions, cautionBody(c))
			}
		}
		return v
	}
	v.Result = res.Text
	if res.NumErr != nil && !strings.Contains(v.Result, "(numerical error ≤") {
		// the page shows every estimate, even one below the digits shown
		v.Result += " " + runtime.FormatNumErr(res.Value, res.NumErr, res.Stmt.As)
	}
	for _, c := range res.Cautions {
		v.Cautions = append(v.Cautions, cautionBody(c))
	}
	if len(res.Cautions) == 0 {
		v.Note = res.Note
	}
	if t, ok := res.Value.(runtime.Tabular); ok {
		v.Result = t.Summary(digits)
		v.Table = tableOf(t, digits)
	}
	if p, ok := res.Value.(runtime.Picture); ok {
		svg, err := p.SVG()
		if err != nil {
			v.SVGErr = err.Error()
		} else {
			v.SVG = inlineSVG(svg)
		}
	}
	return v
}

// tableOf shows a table: each column in the unit that reads best for its
// largest magnitude, at most reportRows rows.
func tableOf(t runtime.Tabular, digits int) *tableView {
	cols, dims, rows := t.Tabulate()
	tv := &tableView{}
	var labels []string
	if l, ok := t.(runtime.RowLabeller); ok {
		if labels = l.RowLabels(); len(labels) == len(rows) {
			tv.Head = append(tv.Head, l.LabelHeading())
		} else {
			labels = nil
		}
	}
	scales := make([]float64, len(cols))
	bigs := make([]float64, len(cols))
	for j, c := range cols {
		big := 0.0
		for _, r := range rows {
			big = max(big, abs(r[j]))
		}
		unit, scale := runtime.ColumnUnit(t, j, dims[j], big, digits)
		scales[j], bigs[j] = scale, big
		if unit != "" {
			c += " [" + unit + "]"
		}
		tv.Head = append(tv.Head, c)
	}
	for i, r := range rows {
		if i == reportRows {
			tv.More = len(rows) - reportRows
			break
		}
		var cells []string
		if labels != nil {
			cells = append(cells, labels[i])
		}
		for j, x := range r {
			if abs(x) < runtime.TableNoise*bigs[j] {
				x = 0 // rounding noise, as scripts record it
			}
			cells = append(cells, runtime.FormatNumber(x/scales[j], digits))
		}
		tv.Rows = append(tv.Rows, cells)
	}
	if ne, ok := t.(interface{ ColumnNumErr() []float64 }); ok && len(ne.ColumnNumErr()) == len(cols) {
		// the columns' numerical error bounds, as the prompt shows them
		var cells []string
		if labels != nil {
			cells = append(cells, "")
		}
		for j, e := range ne.ColumnNumErr() {
			c := ""
			if e > 0 {
				c = "≤ " + runtime.FormatNumber(builtins.RoundUp2(e/scales[j]), 2)
			}
			if j == 0 && c == "" {
				c = "num. error"
			}
			cells = append(cells, c)
		}
		tv.Foot = cells
	}
	return tv
}

// cautionBody drops the word "caution:" a caution starts with: the box
// says it.
func cautionBody(c string) string {
	if k := len("caution:"); len(c) > k && strings.EqualFold(c[:k], "caution:") {
		return strings.TrimSpace(c[k:])
	}
	return c
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// inlineSVG drops what comes before the <svg element (an XML declaration,
// a doctype, comments), which has no place inside HTML. Plots are drawn by
// our own code from numbers and labels; the labels are escaped by the SVG
// writer.
func inlineSVG(svg []byte) template.HTML {
	s := string(svg)
	if k := strings.Index(s, "<svg"); k >= 0 {
		s = s[k:]
	}
	return template.HTML(s)
}

func relPercent(rel float64) string {
	if rel != rel { // NaN: no number to compare
		return ""
	}
	if rel > 1e300 || rel < -1e300 {
		return "from 0"
	}
	return fmt.Sprintf("by %+.3g%%", 100*rel)
}

var funcs = template.FuncMap{"rel": relPercent}

var stmtTmpl = template.Must(template.New("stmt").Funcs(funcs).Parse(`<div class="stmt{{if .Error}} failed{{else if .Drifts}} drifted{{else if not .Evaluated}} skipped{{end}}" id="L{{.Line}}">
<pre class="code"><a class="ln" href="#L{{.Line}}">{{.Line}}</a><code>{{.Text}}</code></pre>
{{- if .Error}}
<div class="error" role="alert"><strong>Error at line {{.Line}}</strong><p class="msg">{{.Error}}</p>{{if .ErrorSource}}<pre>{{.ErrorSource}}</pre>{{end}}</div>
{{- else if not .Evaluated}}
<div class="skipped-note">Not evaluated: the evaluation stopped at an error above.{{if .Recorded}} Recorded result: <span class="rec">{{.Recorded}}</span>{{end}}</div>
{{- else}}
{{- if .Result}}
<div class="result"><span class="mark" aria-hidden="true">↳</span> <output>{{.Result}}</output></div>
{{- end}}
{{- if .SVG}}
<figure class="plot">{{.SVG}}</figure>
{{- end}}
{{- if .SVGErr}}
<div class="error"><strong>The plot could not be drawn</strong><pre>{{.SVGErr}}</pre></div>
{{- end}}
{{- with .Table}}
{{- if $.SVG}}<details><summary>Data</summary>{{end}}
<div class="table-wrap"><table>
<thead><tr>{{range .Head}}<th scope="col">{{.}}</th>{{end}}</tr></thead>
<tbody>
{{- range .Rows}}
<tr>{{range .}}<td>{{.}}</td>{{end}}</tr>
{{- end}}
</tbody>
{{- with .Foot}}<tfoot><tr>{{range .}}<td>{{.}}</td>{{end}}</tr></tfoot>{{end}}
</table></div>
{{- if .More}}<p class="more">and {{.More}} more rows</p>{{end}}
{{- if $.SVG}}</details>{{end}}
{{- end}}
{{- if .Note}}
<div class="note">{{.Note}}</div>
{{- end}}
{{- end}}
{{- range .Cautions}}
<aside class="caution" role="note"><strong>⚠ Caution</strong> <span>{{.}}</span></aside>
{{- end}}
{{- if .Drifts}}
<div class="drift" role="alert"><strong>No longer matches the recorded result</strong>
<ul>{{range .Drifts}}<li>{{.What}} (line {{.Line}}){{if .Why}}: {{.Why}}{{else}} drifted {{rel .Rel}}{{end}}{{if .Recorded}}<br>recorded: <span class="rec">{{.Recorded}}</span>{{end}}{{if .Now}}<br>now: <span class="now">{{.Now}}</span>{{end}}</li>{{end}}</ul></div>
{{- end}}
</div>
`))

var pageTmpl = template.Must(template.New("page").Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="{{.Version}}">
<title>{{.Title}}</title>
<style>
:root { --fg: #1b1f24; --muted: #5b636e; --bg: #fff; --code: #f4f5f7; --line: #d6d9de;
  --ok: #1a7f37; --bad: #b42318; --warn-bg: #fff4d6; --warn: #8a5a00; }
* { box-sizing: border-box; }
html { -webkit-text-size-adjust: 100%; }
body { margin: 0; color: var(--fg); background: var(--bg);
  font: 16px/1.55 system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", sans-serif; }
main { max-width: 52rem; margin: 0 auto; padding: 1rem; }
h1, h2, h3 { line-height: 1.25; }
h1 { font-size: 1.6rem; } h2 { font-size: 1.3rem; margin-top: 2rem; }
a { color: #0b57d0; }
code, pre, output, .math { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, "DejaVu Sans Mono", monospace; font-size: .9em; }
:not(pre) > code { background: var(--code); padding: .1em .3em; border-radius: 3px; }
pre { overflow-x: auto; }
pre code { font-size: 1em; }
.meta { border: 1px solid var(--line); border-radius: 6px; padding: .6rem .9rem; margin-bottom: 1.2rem; font-size: .9rem; color: var(--muted); }
.meta dl { display: grid; grid-template-columns: max-content 1fr; gap: .1rem .8rem; margin: .4rem 0 0; }
.meta dt { font-weight: 600; } .meta dd { margin: 0; overflow-wrap: anywhere; }
.status { margin: 0; font-weight: 600; font-size: 1rem; }
.status.ok { color: var(--ok); } .status.bad { color: var(--bad); }
.block { border-left: 3px solid var(--line); margin: 1rem 0; padding-left: .6rem; }
.stmt { margin: .5rem 0 .9rem; }
.stmt .code { margin: 0; padding: .4rem .6rem .4rem 2.8em; text-indent: -2.2em; background: var(--code); border-radius: 4px; white-space: pre-wrap; overflow-wrap: anywhere; }
.ln { display: inline-block; min-width: 2.2em; text-indent: 0; color: var(--muted); text-decoration: none; user-select: none; }
.result { padding: .2rem .6rem; overflow-wrap: anywhere; }
.result output { font-weight: 600; white-space: pre-wrap; }
.mark { color: var(--muted); }
.comment { margin: .3rem 0; color: var(--muted); white-space: pre-wrap; }
.note { color: var(--muted); font-size: .9rem; padding: 0 .6rem; white-space: pre-wrap; }
.caution { margin: .4rem 0; padding: .5rem .7rem; background: var(--warn-bg); border: 2px solid #e0a800; border-left-width: 6px; border-radius: 4px; color: #3d2b00; }
.caution strong { color: var(--warn); margin-right: .3rem; }
.error, .drift { margin: .4rem 0; padding: .5rem .7rem; border: 2px solid var(--bad); border-left-width: 6px; border-radius: 4px; background: #fdecea; }
.error pre { margin: .3rem 0 0; white-space: pre; }
.error .msg { margin: .3rem 0 0; overflow-wrap: anywhere; font-family: ui-monospace, Menlo, Consolas, monospace; font-size: .9em; }
.drift ul { margin: .3rem 0 0; padding-left: 1.2rem; }
.rec, .now { font-family: ui-monospace, Menlo, Consolas, monospace; }
.skipped .code { opacity: .6; }
.skipped-note { color: var(--muted); font-size: .9rem; padding: .2rem .6rem; }
.table-wrap { overflow-x: auto; margin: .3rem 0; }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; font-size: .9rem; }
th, td { border: 1px solid var(--line); padding: .2rem .5rem; text-align: right; white-space: nowrap; }
thead th { background: var(--code); }
.more { color: var(--muted); font-size: .9rem; }
figure.plot { margin: .5rem 0; }
figure.plot svg { max-width: 100%; height: auto; }
.math { background: #f3f0ff; padding: 0 .25em; border-radius: 3px; white-space: pre-wrap; }
.math.display { display: block; text-align: center; padding: .5rem; margin: .6rem 0; overflow-x: auto; }
img { max-width: 100%; }
.last-good { margin-top: 2rem; border-top: 3px dashed var(--line); opacity: .75; }
.last-good-note { font-weight: 600; color: var(--muted); }
@media (max-width: 480px) {
  main { padding: .6rem; } body { font-size: 15px; }
  .block { padding-left: .4rem; }
}
@media print {
  body { font-size: 10.5pt; } main { max-width: none; padding: 0; }
  a { color: inherit; text-decoration: none; }
  .ln { display: none; }
  .stmt, .caution, .error, .drift, figure, tr { break-inside: avoid; }
  h1, h2, h3 { break-after: avoid; }
  .caution, .error, .drift, .math, .stmt .code, thead th { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  .table-wrap, pre { overflow: visible; }
  details > * { display: block; }
}
</style>
</head>
<body>
<main>
{{.Heading}}<header class="meta">
{{- if .LoadErr}}
<p class="status bad" id="status">The script cannot be read.</p>
<div class="error" role="alert"><pre>{{.LoadErr}}</pre></div>
{{- else if .Stopped}}
<p class="status bad" id="status">The evaluation stopped at an error{{if .ErrorLine}} at <a href="#L{{.ErrorLine}}">line {{.ErrorLine}}</a>{{end}}; the results after it are not shown.{{if .LastGood}} The last results evaluated without an error are <a href="#last-good">below</a>.{{end}}</p>
{{- else if .Drifted}}
<p class="status bad" id="status">{{.Drifted}} of {{.Checked}} recorded results no longer match.</p>
{{- else}}
<p class="status ok" id="status">Every recorded result still matches ({{.Checked}} checked).</p>
{{- end}}
<dl>
<dt>Script</dt><dd>{{.Script}}</dd>
<dt>Evaluated</dt><dd>{{.When}}</dd>
<dt>By</dt><dd>{{.Version}}</dd>
</dl>
</header>
<article>
{{.Body}}
</article>
{{- if .LastGood}}
<section class="last-good" id="last-good">
<p class="last-good-note">The last results evaluated without an error ({{.LastGoodWhen}}):</p>
{{.LastGood}}
</section>
{{- end}}
</main>
{{- .Live}}
</body>
</html>
`))
