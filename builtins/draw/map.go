package draw

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/palette/moreland"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Map is a quantity on a rectangular grid drawn as colour, with a colour
// bar beside it. U has the n1 grid positions along the first side, V the n2
// along the second; Mag.Values holds n1·n2 values, U running fastest.
// FieldU, FieldV are the in-plane components of the field at every grid
// point (any common unit), needed by Arrows and Lines: Arrows draws the
// direction at every grid point, Lines draws evenly spaced field lines
// traced on the grid (see FieldLines). Paths are polylines in (u, v) drawn
// on top, in U's unit.
type Map struct {
	Title          string
	U, V           Column
	Mag            Column
	FieldU, FieldV []float64
	Arrows, Lines  bool
	Paths          [][][2]float64
	// LogColor colours by the logarithm of Mag (every value must be above
	// zero): a field that falls off from a wire spans decades, and a
	// linear scale shows only its peak.
	LogColor bool
}

// barWidth is the width of the colour bar's column.
const barWidth = 3 * vg.Centimeter

// SVG draws m as an SVG document. The colour cells of a map of more than
// RasterCells cells are one embedded PNG image (see rasterCells).
func (m *Map) SVG() ([]byte, error) { return m.render(vgsvg.New(Width, Height), true) }

// PNG draws m as a PNG image at 144 dots per inch.
func (m *Map) PNG() ([]byte, error) {
	return m.render(vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(Width, Height), vgimg.UseDPI(144))}, false)
}

func (m *Map) render(c canvas, svg bool) ([]byte, error) {
	main, bar, err := m.plots(svg)
	if err != nil {
		return nil, err
	}
	dc := draw.New(c)
	main.Draw(draw.Crop(dc, 0, -barWidth, 0, 0))
	bar.Draw(draw.Crop(dc, Width-barWidth, 0, 0, 0))
	return writeOut(c)
}

// grid adapts the map's values to plotter.GridXYZ, scaled for display.
type grid struct {
	u, v, z    []float64
	su, sv, sz float64
	n1, n2     int
	log        bool // Z is log10 of the value
}

func (g grid) Dims() (c, r int) { return g.n1, g.n2 }
func (g grid) Z(c, r int) float64 {
	z := g.z[r*g.n1+c] / g.sz
	if g.log {
		return math.Log10(z)
	}
	return z
}
func (g grid) X(c int) float64 { return g.u[c] / g.su }
func (g grid) Y(r int) float64 { return g.v[r] / g.sv }

func (m *Map) plots(svg bool) (main, bar *plot.Plot, err error) {
	n1, n2 := len(m.U.Values), len(m.V.Values)
	if n1 < 2 || n2 < 2 {
		return nil, nil, errors.New("a map needs at least 2 × 2 points")
	}
	if len(m.Mag.Values) != n1*n2 {
		return nil, nil, fmt.Errorf("a map of %d × %d points needs %d values, not %d", n1, n2, n1*n2, len(m.Mag.Values))
	}
	if (m.Arrows || m.Lines) && (len(m.FieldU) != n1*n2 || len(m.FieldV) != n1*n2) {
		return nil, nil, errors.New("the in-plane components do not match the grid")
	}
	for _, c := range []Column{m.U, m.V, m.Mag} {
		if err := checkValues(c, m.LogColor && c.Name == m.Mag.Name); err != nil {
			return nil, nil, err
		}
	}
	for _, a := range [][]float64{m.FieldU, m.FieldV} {
		if err := checkValues(Column{Name: "an in-plane component", Values: a}, false); err != nil {
			return nil, nil, err
		}
	}
	if m.U.Unit != m.V.Unit {
		return nil, nil, fmt.Errorf("the map's sides have different units: %s and %s", m.U.Unit, m.V.Unit)
	}
	lenUnit, lenSize := Scale(m.U, m.V)
	magUnit, magSize := Scale(m.Mag)
	g := grid{u: m.U.Values, v: m.V.Values, z: m.Mag.Values, su: lenSize, sv: lenSize, sz: magSize, n1: n1, n2: n2, log: m.LogColor}
	lo, hi := math.Inf(1), math.Inf(-1)
	for r := 0; r < n2; r++ {
		for c := 0; c < n1; c++ {
			lo, hi = math.Min(lo, g.Z(c, r)), math.Max(hi, g.Z(c, r))
		}
	}
	if hi == lo { // a uniform map: one colour, the bar still has a range
		hi = lo + math.Max(1, math.Abs(lo))*1e-6
	}
	cm := moreland.ExtendedBlackBody()
	cm.SetMin(lo)
	cm.SetMax(hi)
	main = plot.New()
	main.X.Tick.Marker, main.Y.Tick.Marker = plainTicks{}, plainTicks{}
	main.Title.Text = m.Title
	main.X.Label.Text = Label([]string{m.U.Name}, lenUnit)
	main.Y.Label.Text = Label([]string{m.V.Name}, lenUnit)
	pal := cm.Palette(256)
	if svg && n1*n2 > RasterCells && uniform(m.U.Values) && uniform(m.V.Values) {
		main.Add(rasterCells(g, pal, lo, hi))
	} else {
		hm := plotter.NewHeatMap(g, pal)
		hm.Min, hm.Max = lo, hi
		main.Add(hm)
	}
	if m.Lines {
		lines, err := FieldLines(m.U.Values, m.V.Values, m.FieldU, m.FieldV)
		if err != nil {
			return nil, nil, err
		}
		for _, ln := range lines {
			for i := range ln {
				ln[i][0] /= lenSize
				ln[i][1] /= lenSize
			}
		}
		main.Add(&fieldLines{lines: lines})
	}
	if m.Arrows {
		main.Add(&arrows{g: g, du: m.FieldU, dv: m.FieldV})
	}
	for _, p := range m.Paths {
		if len(p) < 2 {
			continue
		}
		xy := make(plotter.XYs, len(p))
		for i, q := range p {
			xy[i].X, xy[i].Y = q[0]/lenSize, q[1]/lenSize
		}
		ln, err := plotter.NewLine(xy)
		if err != nil {
			return nil, nil, err
		}
		ln.Color = color.RGBA{R: 0x1f, G: 0xb4, B: 0xe8, A: 0xff}
		ln.Width = vg.Points(1.5)
		main.Add(ln)
	}
	// the grid's cells, not the paths, set the extent
	du, dv := (g.X(n1-1)-g.X(0))/float64(n1-1)/2, (g.Y(n2-1)-g.Y(0))/float64(n2-1)/2
	main.X.Min, main.X.Max = g.X(0)-du, g.X(n1-1)+du
	main.Y.Min, main.Y.Max = g.Y(0)-dv, g.Y(n2-1)+dv
	bar = plot.New()
	bar.HideX()
	bar.Title.Text = Label([]string{m.Mag.Name}, magUnit)
	if m.LogColor {
		bar.Y.Tick.Marker = powerTicks{}
	}
	bar.Add(&colorBar{cm: cm})
	return main, bar, nil
}

// arrows draws a short arrow of one length at every grid point, pointing
// along the in-plane direction; points where the direction is zero get
// none.
type arrows struct {
	g      grid
	du, dv []float64
}

func (a *arrows) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	cellX := math.Abs(float64(tx(a.g.X(1)) - tx(a.g.X(0))))
	cellY := math.Abs(float64(ty(a.g.Y(1)) - ty(a.g.Y(0))))
	l := 0.4 * math.Min(cellX, cellY)
	sty := draw.LineStyle{Color: color.RGBA{R: 0x1f, G: 0xb4, B: 0xe8, A: 0xff}, Width: vg.Points(0.8)}
	for r := 0; r < a.g.n2; r++ {
		for k := 0; k < a.g.n1; k++ {
			i := r*a.g.n1 + k
			n := math.Hypot(a.du[i], a.dv[i])
			if n == 0 {
				continue
			}
			ex, ey := a.du[i]/n, a.dv[i]/n
			x, y := float64(tx(a.g.X(k))), float64(ty(a.g.Y(r)))
			x0, y0, x1, y1 := x-ex*l, y-ey*l, x+ex*l, y+ey*l
			head := 0.35 * l
			c.StrokeLines(sty, []vg.Point{{X: vg.Length(x0), Y: vg.Length(y0)}, {X: vg.Length(x1), Y: vg.Length(y1)}})
			c.StrokeLines(sty, []vg.Point{
				{X: vg.Length(x1 - head*(ex-0.5*ey)), Y: vg.Length(y1 - head*(ey+0.5*ex))},
				{X: vg.Length(x1), Y: vg.Length(y1)},
				{X: vg.Length(x1 - head*(ex+0.5*ey)), Y: vg.Length(y1 - head*(ey-0.5*ex))},
			})
		}
	}
}

// powerTicks marks an axis that holds log10 of values with the values:
// major ticks at powers of ten, minor ones at 2…9 times them; over more
// than a dozen decades only every n-th power.
type powerTicks struct{}

func (powerTicks) Ticks(lo, hi float64) []plot.Tick {
	var ts []plot.Tick
	step := math.Max(1, math.Ceil((math.Ceil(hi)-math.Floor(lo))/12)) // as logTicks
	for k := math.Floor(lo); k <= math.Ceil(hi); k++ {
		if math.Mod(k, step) != 0 {
			continue
		}
		for m := 1; m <= 9; m++ {
			if step > 1 && m > 1 {
				break
			}
			x := k + math.Log10(float64(m))
			if x < lo || x > hi {
				continue
			}
			t := plot.Tick{Value: x}
			if m == 1 {
				t.Label = strconv.FormatFloat(math.Pow(10, k), 'g', -1, 64)
			}
			ts = append(ts, t)
		}
	}
	labelled := 0
	for _, t := range ts {
		if t.Label != "" {
			labelled++
		}
	}
	if labelled >= 2 {
		return ts
	}
	// less than two decades: plain ticks of the values, placed at their
	// logarithms
	var plain []plot.Tick
	for _, t := range (plot.DefaultTicks{}).Ticks(math.Pow(10, lo), math.Pow(10, hi)) {
		if t.Value > 0 {
			t.Value = math.Log10(t.Value)
			plain = append(plain, t)
		}
	}
	return plain
}

// colorBar draws a colour map's range as a column of filled rectangles:
// plain vector shapes, so every SVG viewer shows it (an embedded image is
// not shown by all).
type colorBar struct{ cm palette.ColorMap }

// barSteps is the number of rectangles: finer than the eye tells apart at
// the bar's height (common practice).
const barSteps = 128

func (b *colorBar) DataRange() (xmin, xmax, ymin, ymax float64) {
	return 0, 1, b.cm.Min(), b.cm.Max()
}

func (b *colorBar) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	lo, hi := b.cm.Min(), b.cm.Max()
	for i := 0; i < barSteps; i++ {
		y0 := lo + (hi-lo)*float64(i)/barSteps
		y1 := lo + (hi-lo)*float64(i+1)/barSteps
		col, err := b.cm.At((y0 + y1) / 2)
		if err != nil {
			continue
		}
		// overlap each rectangle a little so no seam shows between them
		top := ty(y1)
		if i < barSteps-1 {
			top += vg.Points(0.5)
		}
		c.FillPolygon(col, []vg.Point{{X: tx(0), Y: ty(y0)}, {X: tx(1), Y: ty(y0)}, {X: tx(1), Y: top}, {X: tx(0), Y: top}})
	}
}

// fieldLineColor draws field lines in a pale green: apart from the cyan
// of the arrows and the source's paths, and visible on every colour of
// the black-body map from black to white-yellow (common practice).
var fieldLineColor = color.RGBA{R: 0x6f, G: 0xe0, B: 0x8c, A: 0xff}

// fieldLines draws traced field lines (in the plot's units) with an
// arrowhead half way along each, pointing along the field.
type fieldLines struct{ lines [][][2]float64 }

func (f *fieldLines) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	sty := draw.LineStyle{Color: fieldLineColor, Width: vg.Points(0.9)}
	for _, ln := range f.lines {
		pts := make([]vg.Point, len(ln))
		for i, q := range ln {
			pts[i] = vg.Point{X: tx(q[0]), Y: ty(q[1])}
		}
		c.StrokeLines(sty, pts)
		// the arrowhead at half the drawn length
		length := 0.0
		for i := 1; i < len(pts); i++ {
			length += math.Hypot(float64(pts[i].X-pts[i-1].X), float64(pts[i].Y-pts[i-1].Y))
		}
		const head = 3.5 // points
		if length < 4*head {
			continue
		}
		at := 0.0
		for i := 1; i < len(pts); i++ {
			seg := math.Hypot(float64(pts[i].X-pts[i-1].X), float64(pts[i].Y-pts[i-1].Y))
			if at+seg >= length/2 && seg > 0 {
				ex, ey := float64(pts[i].X-pts[i-1].X)/seg, float64(pts[i].Y-pts[i-1].Y)/seg
				k := (length/2 - at) / seg
				x := float64(pts[i-1].X) + k*float64(pts[i].X-pts[i-1].X)
				y := float64(pts[i-1].Y) + k*float64(pts[i].Y-pts[i-1].Y)
				c.FillPolygon(fieldLineColor, []vg.Point{
					{X: vg.Length(x + head*ex), Y: vg.Length(y + head*ey)},
					{X: vg.Length(x - head*ex - 0.6*head*ey), Y: vg.Length(y - head*ey + 0.6*head*ex)},
					{X: vg.Length(x - head*ex + 0.6*head*ey), Y: vg.Length(y - head*ey - 0.6*head*ex)},
				})
				break
			}
			at += seg
		}
	}
}
