package draw

import (
	"bytes"
	"encoding/xml"
	"math"
	"strconv"
	"testing"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

// twoSeries is a line plot of two series a and b of x on [0, 1].
func twoSeries(a, b func(x float64) float64) *Line {
	l := &Line{X: Column{Name: "x", Unit: "m"}, Ys: []Column{{Name: "first", Unit: "V"}, {Name: "second", Unit: "V"}}}
	for i := 0; i <= 50; i++ {
		x := float64(i) / 50
		l.X.Values = append(l.X.Values, x)
		l.Ys[0].Values = append(l.Ys[0].Values, a(x))
		l.Ys[1].Values = append(l.Ys[1].Values, b(x))
	}
	return l
}

// hidden counts the drawn points of l's series, sampled every 0.25 pt
// along each segment (a route apart from the clipping in covered), that
// fall inside the legend's rectangle.
func hidden(t *testing.T, l *Line) (n int, top, left bool) {
	t.Helper()
	dc := draw.New(vgsvg.New(Width, Height))
	p, err := l.layout(dc)
	if err != nil {
		t.Fatal(err)
	}
	data := p.DataCanvas(dc)
	r := legendRect(p, data)
	tx, ty := p.Transforms(&data)
	for _, y := range l.Ys {
		ys := Column{Values: y.Values}
		_, ysize := Scale(l.Ys...)
		_, xsize := Scale(l.X)
		for i := 1; i < len(l.X.Values); i++ {
			x0, y0 := tx(l.X.Values[i-1]/xsize), ty(ys.Values[i-1]/ysize)
			x1, y1 := tx(l.X.Values[i]/xsize), ty(ys.Values[i]/ysize)
			steps := int(math.Hypot(float64(x1-x0), float64(y1-y0))/0.25) + 1
			for k := 0; k <= steps; k++ {
				f := vg.Length(float64(k) / float64(steps))
				q := vg.Point{X: x0 + f*(x1-x0), Y: y0 + f*(y1-y0)}
				if q.X >= r.Min.X && q.X <= r.Max.X && q.Y >= r.Min.Y && q.Y <= r.Max.Y {
					n++
				}
			}
		}
	}
	return n, p.Legend.Top, p.Legend.Left
}

// TestLegendAvoidsLines: series that fill the top right corner move the
// legend to a free corner; lines along the top and the bottom, which
// leave no corner free, make room above them.
func TestLegendAvoidsLines(t *testing.T) {
	// both rise to the top right; the top left is empty
	l := twoSeries(func(x float64) float64 { return x }, func(x float64) float64 { return x * x })
	n, top, left := hidden(t, l)
	if n != 0 || !top || !left {
		t.Errorf("rising series: %d points hidden, legend top %v left %v; want none hidden, top left", n, top, left)
	}
	// a falling line and a flat one along the top: both top corners are
	// taken, a bottom corner is free
	l = twoSeries(func(x float64) float64 { return 1 - x }, func(x float64) float64 { return 1 })
	if n, _, _ = hidden(t, l); n != 0 {
		t.Errorf("falling and flat series: %d points hidden", n)
	}
	// along the top and the bottom: every corner is taken at first
	l = twoSeries(func(x float64) float64 { return 1 }, func(x float64) float64 { return 0 })
	if n, _, _ = hidden(t, l); n != 0 {
		t.Errorf("top and bottom lines: %d points hidden", n)
	}
	// the same on a log y axis
	l = twoSeries(func(x float64) float64 { return 100 }, func(x float64) float64 { return 1 })
	l.LogY = true
	if n, _, _ = hidden(t, l); n != 0 {
		t.Errorf("top and bottom lines, log y: %d points hidden", n)
	}
	// a plain sine and cosine fill every corner too
	l = twoSeries(func(x float64) float64 { return math.Sin(2 * math.Pi * x) }, func(x float64) float64 { return math.Cos(2 * math.Pi * x) })
	if n, _, _ = hidden(t, l); n != 0 {
		t.Errorf("sine and cosine: %d points hidden", n)
	}
}

// TestLegendRectMatchesDrawing: the rectangle the placement works with
// holds the legend's text as the SVG draws it, in every corner.
func TestLegendRectMatchesDrawing(t *testing.T) {
	for _, c := range legendCorners {
		l := twoSeries(func(x float64) float64 { return x }, func(x float64) float64 { return 2 * x })
		c := c
		dc := draw.New(vgsvg.New(Width, Height))
		p, _, err := l.plot()
		if err != nil {
			t.Fatal(err)
		}
		p.Legend.Top, p.Legend.Left = c.top, c.left
		r := legendRect(p, p.DataCanvas(dc))
		p.Draw(dc)
		doc, err := writeOut(dc.Canvas.(*vgsvg.Canvas))
		if err != nil {
			t.Fatal(err)
		}
		found := 0
		for _, tx := range svgTextAt(t, doc) {
			if tx.text != "first" && tx.text != "second" {
				continue
			}
			found++
			if tx.x < float64(r.Min.X) || tx.x > float64(r.Max.X) || tx.y < float64(r.Min.Y) || tx.y > float64(r.Max.Y) {
				t.Errorf("top %v left %v: %q drawn at (%g, %g), outside %v", c.top, c.left, tx.text, tx.x, tx.y, r)
			}
		}
		if found != 2 {
			t.Errorf("top %v left %v: %d legend texts found", c.top, c.left, found)
		}
	}
}

type placedText struct {
	text string
	x, y float64 // in the canvas's coordinates, y up
}

// svgTextAt gives every <text> with its position; vgsvg writes y negated
// under a flip (transform="scale(1, -1)").
func svgTextAt(t *testing.T, doc []byte) []placedText {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(doc))
	var out []placedText
	var cur *placedText
	for {
		tok, err := d.Token()
		if err != nil {
			break
		}
		switch e := tok.(type) {
		case xml.StartElement:
			if e.Name.Local == "text" {
				cur = &placedText{}
				for _, a := range e.Attr {
					v, _ := strconv.ParseFloat(a.Value, 64)
					switch a.Name.Local {
					case "x":
						cur.x = v
					case "y":
						cur.y = -v
					}
				}
			}
		case xml.CharData:
			if cur != nil {
				cur.text += string(e)
			}
		case xml.EndElement:
			if e.Name.Local == "text" && cur != nil {
				out = append(out, *cur)
				cur = nil
			}
		}
	}
	return out
}
