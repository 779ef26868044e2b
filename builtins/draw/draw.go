package draw

import (
	"bytes"
	"errors"
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"
	"unicode"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Column is one named quantity: its values in the coherent SI unit Unit
// ("" for a plain number).
type Column struct {
	Name   string
	Unit   string
	Values []float64
	// Units, when set, chooses how to show values whose largest magnitude
	// is big: the unit's text and its size in Unit (for "mT" from "T",
	// 0.001).
	Units func(big float64) (unit string, size float64)
}

// Line is a plot of one or several series Ys against X. All Ys share one
// unit, taken from the first.
type Line struct {
	Title      string
	X          Column
	Ys         []Column
	LogX, LogY bool
}

// Size of the drawn page.
const (
	Width  = 16 * vg.Centimeter
	Height = 10 * vg.Centimeter
)

// SVG draws l as an SVG document.
func (l *Line) SVG() ([]byte, error) { return l.render(vgsvg.New(Width, Height)) }

// PNG draws l as a PNG image at 144 dots per inch.
func (l *Line) PNG() ([]byte, error) {
	return l.render(vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(Width, Height), vgimg.UseDPI(144))})
}

type canvas interface {
	vg.CanvasWriterTo
}

func (l *Line) render(c canvas) ([]byte, error) {
	dc := draw.New(c)
	p, err := l.layout(dc)
	if err != nil {
		return nil, err
	}
	p.Draw(dc)
	return writeOut(c)
}

// layout makes the plot for the drawing area dc, with its legend placed.
func (l *Line) layout(dc draw.Canvas) (*plot.Plot, error) {
	p, series, err := l.plot()
	if err != nil {
		return nil, err
	}
	if len(l.Ys) > 1 {
		placeLegend(p, dc, series)
	}
	return p, nil
}

// writeOut writes the canvas. An SVG canvas of gonum.org/v1/plot v0.17.0
// writes an embedded image (a large map's cells) as <image> with the
// default preserveAspectRatio, under which a viewer keeps the image's own
// proportions and shrinks it inside its rectangle; and it labels the PNG
// data "data:image/jpg". Both are corrected here: the image fills its
// rectangle exactly, its pixels are drawn as squares where the viewer
// supports it (image-rendering: pixelated), and the data are labelled
// PNG so that viewers that trust the label show it.
//
// SVG text names its font (font-family in each <text>'s style) and does
// not embed it: gonum's vgsvg embeds fonts only when asked (EmbedFonts),
// and each embedded face would add hundreds of kB to every plot. A viewer
// without the named font draws the text in a font of its own.
func writeOut(c canvas) ([]byte, error) {
	var b bytes.Buffer
	if _, err := c.WriteTo(&b); err != nil {
		return nil, err
	}
	out := b.Bytes()
	if _, ok := c.(*vgsvg.Canvas); ok {
		out = bytes.ReplaceAll(out, []byte(`xlink:href="data:image/jpg;base64,`), []byte(`xlink:href="data:image/png;base64,`))
		out = bytes.ReplaceAll(out, []byte("<image x="), []byte(`<image preserveAspectRatio="none" style="image-rendering:pixelated" x=`))
	}
	return out, nil
}

// seriesColors holds the series colours: distinct in hue and lightness, so they
// stay apart in grey print too (common practice).
var seriesColors = []color.Color{
	color.RGBA{R: 0x1f, G: 0x4e, B: 0x99, A: 0xff},
	color.RGBA{R: 0xd9, G: 0x5f, B: 0x02, A: 0xff},
	color.RGBA{R: 0x1b, G: 0x9e, B: 0x77, A: 0xff},
	color.RGBA{R: 0x7a, G: 0x1f, B: 0x6e, A: 0xff},
	color.RGBA{R: 0x66, G: 0x66, B: 0x66, A: 0xff},
}

// plot makes the plot and gives the drawn series in the plot's units.
func (l *Line) plot() (*plot.Plot, []plotter.XYs, error) {
	if len(l.Ys) == 0 {
		return nil, nil, errors.New("nothing to draw: no series")
	}
	n := len(l.X.Values)
	if n < 2 {
		return nil, nil, errors.New("nothing to draw: a line needs at least two points")
	}
	for _, y := range l.Ys {
		if len(y.Values) != n {
			return nil, nil, fmt.Errorf("the series %s has %d values, the axis %s %d", y.Name, len(y.Values), l.X.Name, n)
		}
		if y.Unit != l.Ys[0].Unit {
			return nil, nil, fmt.Errorf("the series %s [%s] and %s [%s] have different units; draw them on separate plots", l.Ys[0].Name, l.Ys[0].Unit, y.Name, y.Unit)
		}
	}
	if err := checkValues(l.X, l.LogX); err != nil {
		return nil, nil, err
	}
	for _, y := range l.Ys {
		if err := checkValues(y, l.LogY); err != nil {
			return nil, nil, err
		}
	}
	xUnit, xSize := Scale(l.X)
	yUnit, ySize := Scale(l.Ys...)
	p := plot.New()
	p.X.Tick.Marker, p.Y.Tick.Marker = plainTicks{}, plainTicks{}
	p.Title.Text = l.Title
	p.X.Label.Text = Label([]string{l.X.Name}, xUnit)
	names := make([]string, len(l.Ys))
	for i, y := range l.Ys {
		names[i] = y.Name
	}
	p.Y.Label.Text = Label(names, yUnit)
	if l.LogX {
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = logTicks{}
	}
	if l.LogY {
		p.Y.Scale = plot.LogScale{}
		p.Y.Tick.Marker = logTicks{}
	}
	p.Add(plotter.NewGrid())
	var series []plotter.XYs
	for i, y := range l.Ys {
		xy := make(plotter.XYs, n)
		for j := range xy {
			xy[j].X = l.X.Values[j] / xSize
			xy[j].Y = y.Values[j] / ySize
		}
		series = append(series, xy)
		ln, err := plotter.NewLine(xy)
		if err != nil {
			return nil, nil, err
		}
		ln.Color = seriesColors[i%len(seriesColors)]
		ln.Width = vg.Points(1.5)
		if i >= len(seriesColors) {
			ln.Dashes = []vg.Length{vg.Points(4), vg.Points(2)}
		}
		p.Add(ln)
		if len(l.Ys) > 1 {
			p.Legend.Add(y.Name, ln)
		}
	}
	p.Legend.Top = true
	if !l.LogY { // a little room above and below the lines
		pad := 0.04 * (p.Y.Max - p.Y.Min)
		p.Y.Min, p.Y.Max = p.Y.Min-pad, p.Y.Max+pad
	}
	return p, series, nil
}

func checkValues(c Column, log bool) error {
	for _, v := range c.Values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%s holds %v; only finite numbers can be drawn", c.Name, v)
		}
		if log && v <= 0 {
			return fmt.Errorf("%s holds %v; a log axis needs every value above zero", c.Name, v)
		}
	}
	return nil
}

// Label is an axis label: the names, then the unit in brackets ("B [mT]",
// "Bx, By [mT]"); a plain number has no brackets.
func Label(names []string, unit string) string {
	s := strings.Join(names, ", ")
	if unit != "" {
		s += " [" + unit + "]"
	}
	return s
}

// Scale chooses the unit shown for the columns (which share one unit) and
// its size in their unit: by the first column's chooser if it has one,
// else by an engineering prefix for a unit of letters only.
func Scale(cols ...Column) (unit string, size float64) {
	big := 0.0
	for _, c := range cols {
		for _, v := range c.Values {
			if !math.IsNaN(v) && !math.IsInf(v, 0) {
				big = math.Max(big, math.Abs(v))
			}
		}
	}
	if len(cols) == 0 {
		return "", 1
	}
	if cols[0].Units != nil {
		return cols[0].Units(big)
	}
	return Prefixed(cols[0].Unit, big)
}

// prefixes are the SI prefixes from femto to tera by powers of 1000 (SI
// Brochure, 9th edition, 2019, table 7).
var prefixes = map[int]string{-5: "f", -4: "p", -3: "n", -2: "µ", -1: "m", 0: "", 1: "k", 2: "M", 3: "G", 4: "T"}

// Prefixed gives unit with the prefix that brings big into [1, 1000), and
// the prefixed unit's size in unit. A unit that is not letters only (a
// power, a product, a quotient), "kg", or a plain number is left alone.
func Prefixed(unit string, big float64) (string, float64) {
	if unit == "" || unit == "kg" || big == 0 || math.IsNaN(big) || math.IsInf(big, 0) {
		return unit, 1
	}
	for _, r := range unit {
		if !unicode.IsLetter(r) {
			return unit, 1
		}
	}
	k := int(math.Floor(math.Log10(big) / 3))
	if big/math.Pow10(3*k) >= 1000 { // log10 rounding at exact powers
		k++
	} else if big/math.Pow10(3*k) < 1 {
		k--
	}
	k = max(-5, min(4, k))
	return prefixes[k] + unit, math.Pow10(3 * k)
}

// plainTicks are gonum's default ticks with labels written without
// trailing zeros ("-250", not "-250.00"), so that an axis reads like the
// numbers in results.
type plainTicks struct{}

func (plainTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo, hi)
	for i, t := range ts {
		if t.Label != "" {
			ts[i].Label = plainLabel(t.Value)
		}
	}
	return ts
}

// plainLabel writes x with at most 10 significant digits and no trailing
// zeros (the tick values are sums of steps and carry rounding).
func plainLabel(x float64) string {
	v, err := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 10, 64), 64)
	if err != nil {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	if v == 0 {
		v = 0 // no "-0"
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// logTicks marks a log axis: every power of ten labelled, with the 2×
// and 5× steps labelled too when fewer than two powers fall in the range,
// and unlabelled minor ticks at the other steps. Over more than a dozen
// decades only every n-th power is marked, so that labels do not collide.
type logTicks struct{}

func (logTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0) || !(hi > lo) {
		return plot.DefaultTicks{}.Ticks(lo, hi)
	}
	kLo, kHi := math.Floor(math.Log10(lo)), math.Ceil(math.Log10(hi))
	powers := 0
	for k := math.Ceil(math.Log10(lo)); k <= math.Floor(math.Log10(hi)); k++ {
		powers++
	}
	step := math.Max(1, math.Ceil((kHi-kLo)/12))
	var ts []plot.Tick
	for k := kLo; k <= kHi; k++ {
		if math.Mod(k, step) != 0 {
			continue
		}
		for m := 1; m <= 9; m++ {
			if step > 1 && m > 1 {
				break
			}
			x := float64(m) * math.Pow(10, k)
			if x < lo*(1-1e-12) || x > hi*(1+1e-12) {
				continue
			}
			t := plot.Tick{Value: x}
			if m == 1 || (powers < 2 && (m == 2 || m == 5)) {
				t.Label = strconv.FormatFloat(x, 'g', 6, 64)
			}
			ts = append(ts, t)
		}
	}
	return ts
}
