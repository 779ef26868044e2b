package draw

import (
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// legendCorners are the legend's places inside the data area, in order of
// preference when several cover equally little: top right (where a
// reader looks for it first, and gonum's default), top left, bottom
// right, bottom left.
var legendCorners = []struct{ top, left bool }{{true, false}, {true, true}, {false, false}, {false, true}}

// legendGap is the room kept between the legend and the lines when the y
// range grows to make room for it.
const legendGap = vg.Length(4)

// placeLegend puts p's legend in the corner of the data area where it
// covers the fewest line segments. When every corner covers some, the y
// range grows upward (in the axis's own scale, linear or log) until the
// lines run below the legend in a top corner; the data area can change
// width as tick labels change, so the choice is made again, a few times
// at most. A legend taller than three quarters of the data area stays in
// the corner that covers least.
func placeLegend(p *plot.Plot, dc draw.Canvas, series []plotter.XYs) {
	for try := 0; try < 4; try++ {
		data := p.DataCanvas(dc)
		best, bestN := 0, math.MaxInt
		for k, c := range legendCorners {
			p.Legend.Top, p.Legend.Left = c.top, c.left
			if n := covered(p, data, series, legendRect(p, data)); n < bestN {
				best, bestN = k, n
			}
		}
		p.Legend.Top, p.Legend.Left = legendCorners[best].top, legendCorners[best].left
		if bestN == 0 {
			return
		}
		r := legendRect(p, data)
		free := data.Max.Y - data.Min.Y - (r.Max.Y - r.Min.Y) - legendGap
		if free < (data.Max.Y-data.Min.Y)/4 {
			return
		}
		// the lines, now up to the top of the data area, are to end at
		// free above its bottom
		grow := float64((data.Max.Y - data.Min.Y) / free)
		if _, log := p.Y.Scale.(plot.LogScale); log {
			lo, hi := math.Log10(p.Y.Min), math.Log10(p.Y.Max)
			p.Y.Max = math.Pow(10, lo+(hi-lo)*grow)
		} else {
			p.Y.Max = p.Y.Min + (p.Y.Max-p.Y.Min)*grow
		}
	}
}

// legendRect is where the legend is drawn in the data area c, grown by
// the text's descent and a point on every side (the text of the last
// entry reaches a descent below gonum's rectangle). gonum's
// Legend.Rectangle (v0.17.0) gives the size and the vertical place, but
// puts a legend with Left set at the right, opposite of where
// Legend.Draw draws it; the horizontal place is taken from Draw's rule
// (left edge at c's left with Left, right edge at c's right without).
func legendRect(p *plot.Plot, c draw.Canvas) vg.Rectangle {
	r := p.Legend.Rectangle(c)
	w := r.Max.X - r.Min.X
	if p.Legend.Left {
		r.Min.X, r.Max.X = c.Min.X, c.Min.X+w
	} else {
		r.Min.X, r.Max.X = c.Max.X-w, c.Max.X
	}
	m := p.Legend.TextStyle.FontExtents().Descent + 1
	r.Min.X, r.Min.Y, r.Max.X, r.Max.Y = r.Min.X-m, r.Min.Y-m, r.Max.X+m, r.Max.Y+m
	return r
}

// covered counts the segments of the series that meet r, in the
// coordinates of the data area c.
func covered(p *plot.Plot, c draw.Canvas, series []plotter.XYs, r vg.Rectangle) int {
	tx, ty := p.Transforms(&c)
	n := 0
	for _, xy := range series {
		for i := 1; i < len(xy); i++ {
			a := vg.Point{X: tx(xy[i-1].X), Y: ty(xy[i-1].Y)}
			b := vg.Point{X: tx(xy[i].X), Y: ty(xy[i].Y)}
			if segmentMeets(a, b, r) {
				n++
			}
		}
	}
	return n
}

// segmentMeets reports whether the segment ab meets the rectangle r, by
// clipping the segment's parameter range against each side in turn
// (Liang and Barsky, "A new concept and method for line clipping", ACM
// Transactions on Graphics 3(1), 1984).
func segmentMeets(a, b vg.Point, r vg.Rectangle) bool {
	t0, t1 := 0.0, 1.0
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	for _, e := range [4][2]float64{
		{-dx, float64(a.X - r.Min.X)},
		{dx, float64(r.Max.X - a.X)},
		{-dy, float64(a.Y - r.Min.Y)},
		{dy, float64(r.Max.Y - a.Y)},
	} {
		pp, q := e[0], e[1]
		if pp == 0 {
			if q < 0 {
				return false
			}
			continue
		}
		t := q / pp
		if pp < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		if t0 > t1 {
			return false
		}
	}
	return true
}
