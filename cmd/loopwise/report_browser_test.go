package main

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"

	"loopwise/runtime"
)

// findChromium returns the headless browser the page tests drive: Debian's
// chromium package. Without one the tests are skipped, except under CI
// (CI=true), where the browser must be there.
func findChromium(t *testing.T) string {
	t.Helper()
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("CI") == "true" {
		t.Fatal("no chromium found; CI needs it to test the report in a browser (apt-get install chromium)")
	}
	t.Skip("no chromium found: the report is not tested in a browser (install Debian's chromium package to run this test)")
	return ""
}

// browser starts a headless chromium and returns its context.
func browser(t *testing.T) context.Context {
	t.Helper()
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(findChromium(t)),
		chromedp.NoSandbox, // containers run tests as root, where chromium's sandbox will not start
		chromedp.Flag("disable-gpu", true),
	)
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelB := chromedp.NewContext(actx)
	t.Cleanup(func() { cancelB(); cancelA() })
	// the first run starts the browser; it takes no timeout, which would
	// stop the browser with it
	if err := chromedp.Do(ctx); err != nil {
		t.Fatalf("starting chromium: %v", err)
	}
	return ctx
}

// pageFacts is what a test reads from a rendered page.
type pageFacts struct {
	TextLen     int      `json:"textLen"`
	Status      string   `json:"status"`
	Stmts       int      `json:"stmts"`
	Results     []string `json:"results"`
	Rows        int      `json:"rows"`
	Cautions    []string `json:"cautions"`
	CautionsH   []int    `json:"cautionsH"` // rendered heights in CSS px
	Plots       int      `json:"plots"`
	EmptyPlots  int      `json:"emptyPlots"` // plots whose SVG has an empty bounding box
	HiddenLns   int      `json:"hiddenLns"`  // line numbers drawn outside their statement's box
	ScrollWidth int      `json:"scrollWidth"`
	Width       int      `json:"width"`
}

const factsJS = `(() => {
  const all = s => Array.from(document.querySelectorAll(s));
  const svgs = all('figure.plot svg');
  return {
    textLen: document.body.innerText.trim().length,
    status: (document.getElementById('status') || {}).innerText || '',
    stmts: all('.stmt').length,
    results: all('.result output').map(e => e.innerText),
    rows: all('tbody tr').length,
    cautions: all('.caution').map(e => e.innerText),
    cautionsH: all('.caution').map(e => Math.round(e.getBoundingClientRect().height)),
    plots: svgs.length,
    emptyPlots: svgs.filter(s => { const b = s.getBBox(); return !(b.width > 0 && b.height > 0); }).length,
    hiddenLns: all('.stmt .ln').filter(a => { const r = document.createRange(); r.selectNodeContents(a);
      const t = r.getBoundingClientRect(), box = a.parentElement.getBoundingClientRect();
      return !(t.width > 0 && t.left >= box.left && t.right <= box.right); }).length,
    scrollWidth: document.documentElement.scrollWidth,
    width: window.innerWidth,
  };
})()`

// shoot loads a page at a viewport width, reads its facts and saves a
// full-page screenshot as PNG.
func shoot(t *testing.T, ctx context.Context, page, png string, width int) pageFacts {
	t.Helper()
	ctx, cancel := context.WithTimeout(ctx, time.Minute)
	defer cancel()
	err := chromedp.Do(ctx,
		chromedp.EmulateViewport(int64(width), 900),
		chromedp.Navigate("file://"+page),
		chromedp.WaitReady("body"),
	)
	if err != nil {
		t.Fatalf("%s at %d px: %v", page, width, err)
	}
	f, err := chromedp.Run(ctx, chromedp.Evaluate[pageFacts](factsJS))
	if err != nil {
		t.Fatalf("%s at %d px: %v", page, width, err)
	}
	img, err := chromedp.Run(ctx, chromedp.FullScreenshot(100)) // quality 100: PNG
	if err != nil {
		t.Fatalf("%s at %d px: screenshot: %v", page, width, err)
	}
	if err := os.WriteFile(png, img, 0o644); err != nil {
		t.Fatal(err)
	}
	return f
}

// shotDir is where screenshots go: $LOOPWISE_SCREENSHOTS when set (to look
// at them), else a temporary directory.
func shotDir(t *testing.T) string {
	if d := os.Getenv("LOOPWISE_SCREENSHOTS"); d != "" {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
		return d
	}
	return t.TempDir()
}

// TestReportInBrowser renders the test page and every sample's report in
// headless chromium, at a phone's width (390 CSS px) and a desktop's
// (1280): the page is not blank, holds every statement and the expected
// results, tables and cautions, every plot has a non-empty bounding box,
// and nothing makes the page scroll sideways.
func TestReportInBrowser(t *testing.T) {
	ctx := browser(t)
	shots := shotDir(t)
	dir := t.TempDir()

	type page struct {
		name, script string
		stmts        int
		check        func(t *testing.T, f pageFacts)
	}
	pages := []page{{name: "test-page", script: reportScript, stmts: 4, check: func(t *testing.T, f pageFacts) {
		if f.Rows != 5 {
			t.Errorf("%d table rows, want 5", f.Rows)
		}
		if len(f.Results) != 4 || f.Results[3] != "6 m" {
			t.Errorf("results %q", f.Results)
		}
		if f.Status != "1 of 4 recorded results no longer match." {
			t.Errorf("status %q", f.Status)
		}
		if len(f.Cautions) != 1 || !strings.Contains(f.Cautions[0], "51 V is above") {
			t.Errorf("cautions %q", f.Cautions)
		}
	}}}
	samples, err := filepath.Glob(filepath.Join("..", "..", "samples", "*"+runtime.ScriptExt))
	if err != nil || len(samples) == 0 {
		t.Fatalf("no samples: %v", err)
	}
	for _, s := range samples {
		sc, err := runtime.ReadScript(s)
		if err != nil {
			t.Fatal(err)
		}
		// the cautions and results the script records must be on the page
		var cautions int
		var results []string
		for _, st := range sc.Stmts {
			cautions += len(st.Cautions)
			if r := sc.Recorded(st); r != "" {
				results = append(results, r)
			}
		}
		data, err := os.ReadFile(s)
		if err != nil {
			t.Fatal(err)
		}
		pages = append(pages, page{name: strings.TrimSuffix(filepath.Base(s), runtime.ScriptExt), script: string(data), stmts: len(sc.Stmts),
			check: func(t *testing.T, f pageFacts) {
				if !strings.HasPrefix(f.Status, "Every recorded result still matches") {
					t.Errorf("status %q", f.Status)
				}
				if len(f.Cautions) != cautions {
					t.Errorf("%d caution boxes, the script records %d", len(f.Cautions), cautions)
				}
				shown := strings.Join(f.Results, "\n")
				for _, r := range results {
					// results show at the session's 6 digits, recorded
					// ones carry 12: compare the unit and the leading digits
					if !strings.Contains(shown, lead(r)) {
						t.Errorf("result %q not on the page", r)
					}
				}
			}})
	}
	for _, p := range pages {
		t.Run(p.name, func(t *testing.T) {
			src := filepath.Join(dir, p.name+runtime.ScriptExt)
			if err := os.WriteFile(src, []byte(p.script), 0o644); err != nil {
				t.Fatal(err)
			}
			out := filepath.Join(dir, p.name+".html")
			var stdout, stderr strings.Builder
			run([]string{"report", src, "-o", out}, nil, &stdout, &stderr)
			for _, width := range []int{390, 1280} {
				png := filepath.Join(shots, fmt.Sprintf("%s-%d.png", p.name, width))
				f := shoot(t, ctx, out, png, width)
				t.Logf("%d px: %s", width, png)
				if f.TextLen < 100 {
					t.Errorf("%d px: the page is blank (%d characters of text)", width, f.TextLen)
				}
				if f.Stmts != p.stmts {
					t.Errorf("%d px: %d statements shown, want %d", width, f.Stmts, p.stmts)
				}
				for k, h := range f.CautionsH {
					if h < 20 {
						t.Errorf("%d px: caution %d is %d px high: it can be missed", width, k+1, h)
					}
				}
				if f.HiddenLns > 0 {
					t.Errorf("%d px: %d line numbers are drawn outside their statement", width, f.HiddenLns)
				}
				if f.EmptyPlots > 0 {
					t.Errorf("%d px: %d of %d plots have an empty bounding box", width, f.EmptyPlots, f.Plots)
				}
				if f.ScrollWidth > f.Width {
					t.Errorf("%d px: the page scrolls sideways (%d px wide)", width, f.ScrollWidth)
				}
				p.check(t, f)
			}
		})
	}
}

// lead is a recorded result's first word, rounded to 6 significant digits
// as the page shows it and cut to four characters, with the
// rest of its words: "9.9253928432 uH" gives "9.92" and "uH".
func lead(r string) string {
	f := strings.Fields(r)
	if len(f) == 0 {
		return r
	}
	n := f[0]
	// the page rounds to 6 significant digits, which can carry into the
	// leading digits (9.99999991912 shows as 10): round the same way first
	if v, err := strconv.ParseFloat(n, 64); err == nil {
		if g := strconv.FormatFloat(v, 'g', 6, 64); !strings.Contains(g, "e") {
			n = g
		}
	}
	if len(n) > 4 && strings.ContainsAny(n[:1], "0123456789-") {
		n = n[:4]
	}
	return n
}

// TestReportPrints: under print media the line numbers are hidden and the
// caution box keeps its border, so a printed page still sets it apart.
func TestReportPrints(t *testing.T) {
	ctx := browser(t)
	page, _, _ := writeReportFile(t, reportScript)
	ctx, cancel := context.WithTimeout(ctx, time.Minute)
	defer cancel()
	printMedia := chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: "print"})
		return err
	})
	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+page), chromedp.WaitReady("body"), printMedia); err != nil {
		t.Fatal(err)
	}
	type printFacts struct {
		Print        bool   `json:"print"`
		LineNumbers  string `json:"ln"`
		CautionStyle string `json:"caution"`
	}
	f, err := chromedp.Run(ctx, chromedp.Evaluate[printFacts](`({
		print: matchMedia('print').matches,
		ln: getComputedStyle(document.querySelector('.ln')).display,
		caution: getComputedStyle(document.querySelector('.caution')).borderTopStyle,
	})`))
	if err != nil {
		t.Fatal(err)
	}
	if !f.Print || f.LineNumbers != "none" || f.CautionStyle != "solid" {
		t.Errorf("print media %v, line numbers display %q, caution border %q; want true, none, solid", f.Print, f.LineNumbers, f.CautionStyle)
	}
}

// TestReportPlotInBrowser: an inlined plot has a non-empty bounding box
// and, wider than a phone, shrinks to the page instead of widening it.
func TestReportPlotInBrowser(t *testing.T) {
	ctx := browser(t)
	out := filepath.Join(t.TempDir(), "plot.html")
	if err := os.WriteFile(out, []byte(plotPage(t)), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, width := range []int{390, 1280} {
		f := shoot(t, ctx, out, filepath.Join(shotDir(t), fmt.Sprintf("plot-%d.png", width)), width)
		if f.Plots != 1 || f.EmptyPlots != 0 {
			t.Errorf("%d px: %d plots, %d with an empty bounding box", width, f.Plots, f.EmptyPlots)
		}
		if f.ScrollWidth > f.Width {
			t.Errorf("%d px: the page scrolls sideways (%d px wide)", width, f.ScrollWidth)
		}
	}
}

// TestWatchInBrowser: the open page updates by itself when the script is
// saved, and keeps its scroll position.
func TestWatchInBrowser(t *testing.T) {
	ctx := browser(t)
	prose := strings.Repeat("A paragraph of prose that makes the page long enough to scroll.\n\n", 60)
	script := func(n string) string { return "# W\n\n" + prose + "```lw\na = 2 m * " + n + "\n```\n" }
	path, url, stop := startWatch(t, script("3"))
	defer stop()
	ctx, cancel := context.WithTimeout(ctx, time.Minute)
	defer cancel()
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(390, 700), chromedp.Navigate(url+"/"), chromedp.WaitReady("body")); err != nil {
		t.Fatal(err)
	}
	y0, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`window.scrollTo(0, 1500); window.scrollY`))
	if err != nil || y0 != 1500 {
		t.Fatalf("scrolled to %v (%v), want 1500", y0, err)
	}
	if err := os.WriteFile(path, []byte(script("5")), 0o644); err != nil {
		t.Fatal(err)
	}
	type state struct {
		Result string  `json:"result"`
		Y      float64 `json:"y"`
	}
	deadline := time.Now().Add(15 * time.Second)
	for {
		s, err := chromedp.Run(ctx, chromedp.Evaluate[state](`({result: document.querySelector('.result output').innerText, y: window.scrollY})`))
		if err != nil {
			t.Fatal(err)
		}
		if s.Result == "10 m" {
			if s.Y != 1500 {
				t.Errorf("after the update the page is scrolled to %v, want 1500", s.Y)
			}
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("the page still shows %q", s.Result)
		}
		time.Sleep(100 * time.Millisecond)
	}
	img, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err == nil {
		os.WriteFile(filepath.Join(shotDir(t), "watch-390.png"), img, 0o644)
	}
}
