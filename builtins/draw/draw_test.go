package draw

import (
	"bytes"
	"encoding/xml"
	"math"
	"slices"
	"strings"
	"testing"
)

// TestPrefixed: the prefix brings the largest magnitude into [1, 1000).
// The prefixes and their powers are the SI Brochure's (9th edition, 2019,
// table 7).
func TestPrefixed(t *testing.T) {
	for _, c := range []struct {
		unit string
		big  float64
		want string
		size float64
	}{
		{"T", 0.0021, "mT", 1e-3},
		{"T", 2.1e-6, "µT", 1e-6},
		{"V", 1, "V", 1},
		{"V", 999, "V", 1},
		{"V", 1000, "kV", 1e3},
		{"Hz", 5e4, "kHz", 1e3},
		{"m", 1e-3, "mm", 1e-3},
		{"m^2", 1e-6, "m^2", 1}, // a power is left alone
		{"kg", 1e-3, "kg", 1},
		{"", 1e-3, "", 1},
		{"T", 0, "T", 1},
		{"T", 1e-30, "fT", 1e-15}, // clamped at femto
	} {
		u, s := Prefixed(c.unit, c.big)
		if u != c.want || math.Abs(s-c.size) > 1e-12*c.size {
			t.Errorf("Prefixed(%q, %g) = %q, %g; want %q, %g", c.unit, c.big, u, s, c.want, c.size)
		}
	}
}

// svgTexts returns the text content of every <text> element and the d
// attribute of every <path> element of an SVG document.
func svgParts(t *testing.T, doc []byte) (texts, paths []string) {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(doc))
	inText := false
	var cur strings.Builder
	for {
		tok, err := d.Token()
		if err != nil {
			break
		}
		switch e := tok.(type) {
		case xml.StartElement:
			switch e.Name.Local {
			case "text":
				inText = true
				cur.Reset()
			case "path":
				for _, a := range e.Attr {
					if a.Name.Local == "d" {
						paths = append(paths, a.Value)
					}
				}
			}
		case xml.CharData:
			if inText {
				cur.Write(e)
			}
		case xml.EndElement:
			if e.Name.Local == "text" {
				inText = false
				texts = append(texts, cur.String())
			}
		}
	}
	return texts, paths
}

func field() *Line {
	// B on the axis of a loop of radius a, B(z) = B0 a³/(a²+z²)^(3/2):
	// only a smooth curve to draw here, its values are not checked.
	var z, b []float64
	for i := 0; i <= 20; i++ {
		zi := -0.05 + 0.005*float64(i)
		z = append(z, zi)
		b = append(b, 2e-3*math.Pow(0.025*0.025/(0.025*0.025+zi*zi), 1.5))
	}
	return &Line{
		Title: "on the axis",
		X:     Column{Name: "z", Unit: "m", Values: z},
		Ys:    []Column{{Name: "B", Unit: "T", Values: b}},
	}
}

func TestLineSVG(t *testing.T) {
	doc, err := field().SVG()
	if err != nil {
		t.Fatal(err)
	}
	texts, paths := svgParts(t, doc)
	all := strings.Join(texts, "|")
	for _, want := range []string{"z [mm]", "B [mT]", "on the axis"} {
		if !strings.Contains(all, want) {
			t.Errorf("no text %q in the SVG; texts: %s", want, all)
		}
	}
	// the data line: a path through 21 points has at least 21 coordinates
	long := 0
	for _, p := range paths {
		if n := strings.Count(p, "L"); n >= 20 {
			long++
		}
	}
	if long == 0 {
		t.Errorf("no path of 21 points among %d paths", len(paths))
	}
	// the mm axis runs from -50 to 50: its tick labels show it
	if !strings.Contains(all, "-50") || !strings.Contains(all, "50") {
		t.Errorf("tick labels not in mm: %s", all)
	}
}

func TestLineSeveralAndLog(t *testing.T) {
	l := field()
	half := make([]float64, len(l.Ys[0].Values))
	for i, v := range l.Ys[0].Values {
		half[i] = v / 2
	}
	l.Ys = append(l.Ys, Column{Name: "B/2", Unit: "T", Values: half})
	l.LogY = true
	doc, err := l.SVG()
	if err != nil {
		t.Fatal(err)
	}
	texts, _ := svgParts(t, doc)
	all := strings.Join(texts, "|")
	for _, want := range []string{"B, B/2 [mT]", "B/2"} {
		if !strings.Contains(all, want) {
			t.Errorf("no text %q in the SVG; texts: %s", want, all)
		}
	}
	l.LogX = true // z runs through zero and below
	if _, err := l.SVG(); err == nil || !strings.Contains(err.Error(), "above zero") {
		t.Errorf("log axis over negative values: %v", err)
	}
}

func TestLineRefuses(t *testing.T) {
	l := field()
	l.Ys = append(l.Ys, Column{Name: "U", Unit: "V", Values: l.X.Values})
	if _, err := l.SVG(); err == nil || !strings.Contains(err.Error(), "different units") {
		t.Errorf("mixed units: %v", err)
	}
	l = field()
	l.Ys[0].Values = l.Ys[0].Values[:3]
	if _, err := l.SVG(); err == nil {
		t.Error("short series accepted")
	}
	l = field()
	l.Ys[0].Values[4] = math.NaN()
	if _, err := l.SVG(); err == nil {
		t.Error("NaN accepted")
	}
}

func TestLinePNG(t *testing.T) {
	b, err := field().PNG()
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(b, []byte("\x89PNG\r\n\x1a\n")) {
		t.Errorf("not a PNG: % x", b[:8])
	}
}

// TestLogTicks: powers of ten are labelled; within less than two powers
// the 2× and 5× steps are labelled too, so an axis never has fewer than
// two labels over a range of more than 2.5×.
func TestLogTicks(t *testing.T) {
	labels := func(lo, hi float64) []string {
		var out []string
		for _, tk := range (logTicks{}).Ticks(lo, hi) {
			if tk.Label != "" {
				out = append(out, tk.Label)
			}
		}
		return out
	}
	for _, c := range []struct {
		lo, hi float64
		want   string
	}{
		{6.5, 29, "10 20"},
		{1e-3, 1, "0.001 0.01 0.1 1"},
		{1.5, 9, "2 5"},
		// 60 decades: every 5th power (ceil(60/12) = 5), from 1e-30 to 1e30
		{1e-30, 1e30, "1e-30 1e-25 1e-20 1e-15 1e-10 1e-05 1 100000 1e+10 1e+15 1e+20 1e+25 1e+30"},
	} {
		if got := strings.Join(labels(c.lo, c.hi), " "); got != c.want {
			t.Errorf("labels on [%g, %g]: %q, want %q", c.lo, c.hi, got, c.want)
		}
	}
}

// TestPlainTicks: linear axes are labelled like numbers in results, with
// no trailing zeros and no rounding residue.
func TestPlainTicks(t *testing.T) {
	for _, c := range []struct {
		lo, hi float64
		want   []string
	}{
		{-250, 250, []string{"-250", "0", "250"}},
		{0, 0.3, []string{"0", "0.15", "0.3"}},
	} {
		var got []string
		for _, tk := range (plainTicks{}).Ticks(c.lo, c.hi) {
			if tk.Label != "" {
				got = append(got, tk.Label)
			}
		}
		for _, w := range c.want {
			if !slices.Contains(got, w) {
				t.Errorf("ticks of [%g, %g]: %q, want %q among them", c.lo, c.hi, got, w)
			}
		}
		for _, g := range got {
			if strings.Contains(g, ".") && strings.HasSuffix(g, "0") {
				t.Errorf("ticks of [%g, %g]: label %q has trailing zeros", c.lo, c.hi, g)
			}
		}
	}
}
