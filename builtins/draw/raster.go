package draw

import (
	"image"
	"image/color"
	"math"

	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/plotter"
)

// RasterCells is the largest map whose colour cells an SVG draws as
// vector rectangles: each rectangle is one <path> of about 90 bytes, so
// a map of 1600 cells (40 × 40) takes some 165 kB and a 100 × 100 map
// 0.9 MB, which a report then inlines. Above it the cells are one
// embedded PNG image, whose size grows with the number of distinct rows
// rather than with every cell. Small maps stay vector shapes, which every
// SVG viewer scales sharply.
const RasterCells = 1600

// rasterPixels is about the side of the embedded image in pixels: each
// cell is k × k pixels with k = ceil(rasterPixels / cells along the
// longer side), so a viewer that smooths the image when scaling it (most
// browsers do) blurs only a thin seam between cells, not the whole cell
// as with one pixel per cell.
const rasterPixels = 1000

// uniform reports whether the positions are evenly spaced (to a
// relative 1e-6 of the whole span: far below a pixel), which an image of
// equal cells needs.
func uniform(x []float64) bool {
	n := len(x)
	if n < 2 {
		return false
	}
	span := x[n-1] - x[0]
	for i := range x {
		want := x[0] + span*float64(i)/float64(n-1)
		if math.Abs(x[i]-want) > 1e-6*math.Abs(span) {
			return false
		}
	}
	return span != 0
}

// cellColor is the palette colour of value z on [lo, hi], chosen as
// gonum's HeatMap chooses it (the nearest of the palette's evenly spaced
// colours), so a raster and a vector map agree cell by cell.
func cellColor(pal []color.Color, lo, hi, z float64) color.Color {
	ps := float64(len(pal)-1) / (hi - lo)
	k := int((z-lo)*ps + 0.5)
	return pal[min(max(k, 0), len(pal)-1)]
}

// rasterCells draws the grid's cells as one image, each cell k × k
// pixels, extending half a cell beyond the outer grid points as the
// vector heat map does.
func rasterCells(g grid, p palette.Palette, lo, hi float64) *plotter.Image {
	pal := p.Colors()
	k := (rasterPixels + max(g.n1, g.n2) - 1) / max(g.n1, g.n2)
	img := image.NewRGBA(image.Rect(0, 0, g.n1*k, g.n2*k))
	for r := 0; r < g.n2; r++ {
		row := g.n2 - 1 - r // image rows run from the top
		for c := 0; c < g.n1; c++ {
			col := color.RGBAModel.Convert(cellColor(pal, lo, hi, g.Z(c, r))).(color.RGBA)
			for y := row * k; y < (row+1)*k; y++ {
				for x := c * k; x < (c+1)*k; x++ {
					img.SetRGBA(x, y, col)
				}
			}
		}
	}
	du := (g.X(g.n1-1) - g.X(0)) / float64(g.n1-1) / 2
	dv := (g.Y(g.n2-1) - g.Y(0)) / float64(g.n2-1) / 2
	return plotter.NewImage(img, g.X(0)-du, g.Y(0)-dv, g.X(g.n1-1)+du, g.Y(g.n2-1)+dv)
}
