package draw

import (
	"bytes"
	"encoding/base64"
	"encoding/xml"
	"image"
	"image/color"
	"image/png"
	"math"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot/palette/moreland"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

// slopeMap is an n1 × n2 map whose value rises along u three times as
// fast as along v, so that a cell's colour tells which corner it is in.
func slopeMap(n1, n2 int) *Map {
	m := &Map{U: Column{Name: "u", Unit: "m"}, V: Column{Name: "v", Unit: "m"}, Mag: Column{Name: "|B|", Unit: "T"}}
	for i := 0; i < n1; i++ {
		m.U.Values = append(m.U.Values, 0.1*float64(i)/float64(n1-1))
	}
	for j := 0; j < n2; j++ {
		m.V.Values = append(m.V.Values, 0.05*float64(j)/float64(n2-1))
	}
	for j := 0; j < n2; j++ {
		for i := 0; i < n1; i++ {
			m.Mag.Values = append(m.Mag.Values, 1e-3*(3*float64(i)/float64(n1-1)+float64(j)/float64(n2-1)))
		}
	}
	return m
}

type svgImage struct {
	x, y, w, h float64 // in the canvas's coordinates, y up
	img        image.Image
	attrs      map[string]string
}

// svgImages decodes every <image> of an SVG document.
func svgImages(t *testing.T, doc []byte) []svgImage {
	t.Helper()
	var out []svgImage
	d := xml.NewDecoder(bytes.NewReader(doc))
	for {
		tok, err := d.Token()
		if err != nil {
			break
		}
		e, ok := tok.(xml.StartElement)
		if !ok || e.Name.Local != "image" {
			continue
		}
		im := svgImage{attrs: map[string]string{}}
		for _, a := range e.Attr {
			im.attrs[a.Name.Local] = a.Value
			v, _ := strconv.ParseFloat(a.Value, 64)
			switch a.Name.Local {
			case "x":
				im.x = v
			case "y":
				im.y = v
			case "width":
				im.w = v
			case "height":
				im.h = v
			}
		}
		// drawn under scale(1, -1): y is the negated top edge
		im.y = -im.y - im.h
		const prefix = "data:image/png;base64,"
		href := im.attrs["href"]
		if !strings.HasPrefix(href, prefix) {
			t.Fatalf("image data %.40q… not labelled PNG", href)
		}
		raw, err := base64.StdEncoding.DecodeString(href[len(prefix):])
		if err != nil {
			t.Fatal(err)
		}
		if im.img, err = png.Decode(bytes.NewReader(raw)); err != nil {
			t.Fatal(err)
		}
		out = append(out, im)
	}
	return out
}

// TestRasterMap: the SVG of a 120 × 120 map holds its cells as one
// image and stays below 100 kB (the vector form of the same map takes
// about 1.3 MB: some 90 bytes a cell); the image fills the data area;
// every cell is a block of equal pixels in the colour gonum's palette
// gives its value, the first row of cells at the bottom; a map of
// RasterCells cells stays vector.
func TestRasterMap(t *testing.T) {
	const n1, n2 = 120, 120
	m := slopeMap(n1, n2)
	doc, err := m.SVG()
	if err != nil {
		t.Fatal(err)
	}
	if len(doc) > 100_000 {
		t.Errorf("the SVG of %d × %d cells takes %d bytes", n1, n2, len(doc))
	}
	ims := svgImages(t, doc)
	if len(ims) != 1 {
		t.Fatalf("%d images", len(ims))
	}
	im := ims[0]
	if im.attrs["preserveAspectRatio"] != "none" {
		t.Errorf("preserveAspectRatio %q: a viewer would keep the image's proportions", im.attrs["preserveAspectRatio"])
	}
	// the image fills the data area, whose axes run from the outer
	// cells' outer edges (to 0.01 pt, the SVG's rounding)
	main, _, err := m.plots(true)
	if err != nil {
		t.Fatal(err)
	}
	data := main.DataCanvas(draw.Crop(draw.New(vgsvg.New(Width, Height)), 0, -barWidth, 0, 0))
	x0, y0, x1, y1 := float64(data.Min.X), float64(data.Min.Y), float64(data.Max.X), float64(data.Max.Y)
	for _, c := range [][2]float64{{im.x, x0}, {im.y, y0}, {im.x + im.w, x1}, {im.y + im.h, y1}} {
		if math.Abs(c[0]-c[1]) > 0.01 {
			t.Errorf("image spans (%g, %g)–(%g, %g), the data area (%g, %g)–(%g, %g)", im.x, im.y, im.x+im.w, im.y+im.h, x0, y0, x1, y1)
			break
		}
	}
	// colours: the value's palette entry, from gonum's ExtendedBlackBody
	// palette of 256 colours over the map's range; the nearest entry or
	// its neighbour below (rounding of the scaled value)
	lo, hi := 0.0, 4.0 // mT: the values run from 0 to 4e-3 T, drawn in mT
	cm := moreland.ExtendedBlackBody()
	cm.SetMin(lo)
	cm.SetMax(hi)
	pal := cm.Palette(256).Colors()
	b := im.img.Bounds()
	kx, ky := b.Dx()/n1, b.Dy()/n2
	if kx*n1 != b.Dx() || ky*n2 != b.Dy() || kx < 2 {
		t.Fatalf("image %v for %d × %d cells: not whole blocks of pixels", b, n1, n2)
	}
	for _, c := range [][2]int{{0, 0}, {n1 - 1, 0}, {0, n2 - 1}, {n1 - 1, n2 - 1}, {37, 90}} {
		i, j := c[0], c[1]
		z := 3*float64(i)/float64(n1-1) + float64(j)/float64(n2-1)
		k := (z - lo) / (hi - lo) * 255
		want := []color.Color{pal[int(math.Floor(k))], pal[int(math.Ceil(k))]}
		// the cell's block: columns from the left, rows from the top
		for _, px := range [][2]int{{i * kx, (n2 - 1 - j) * ky}, {(i+1)*kx - 1, (n2-j)*ky - 1}} {
			got := color.RGBAModel.Convert(im.img.At(b.Min.X+px[0], b.Min.Y+px[1]))
			if !sameColor(got, want[0]) && !sameColor(got, want[1]) {
				t.Errorf("cell (%d, %d), pixel %v: %v; want %v or %v", i, j, px, got, want[0], want[1])
			}
		}
	}
	// at the limit the cells stay vector shapes
	small := slopeMap(40, RasterCells/40)
	doc, err = small.SVG()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(doc), "<image") {
		t.Errorf("a map of %d cells drawn as an image", RasterCells)
	}
}

func sameColor(a, b color.Color) bool {
	r1, g1, b1, a1 := a.RGBA()
	r2, g2, b2, a2 := b.RGBA()
	return r1>>8 == r2>>8 && g1>>8 == g2>>8 && b1>>8 == b2>>8 && a1>>8 == a2>>8
}
