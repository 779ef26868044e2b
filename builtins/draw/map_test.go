package draw

import (
	"math"
	"slices"
	"strings"
	"testing"
)

// wireMap is |B| of a long straight wire through (0, 0) along the normal
// of the plane, B = μ0 I/(2π r) (Ampère's law) with μ0 I/(2π) = 2e-7 T·m
// for I = 1 A, and its direction (−v, u)/r; the wire's section is drawn as
// a small square path. Only drawn here, not checked as numbers.
func wireMap(n int) *Map {
	m := &Map{Title: "|B| around a wire", U: Column{Name: "u", Unit: "m"}, V: Column{Name: "v", Unit: "m"}, Mag: Column{Name: "|B|", Unit: "T"}, Arrows: true}
	for i := 0; i < n; i++ {
		x := -0.05 + 0.1*float64(i)/float64(n-1) + 0.0013 // off the wire
		m.U.Values = append(m.U.Values, x)
		m.V.Values = append(m.V.Values, x)
	}
	for _, v := range m.V.Values {
		for _, u := range m.U.Values {
			r := math.Hypot(u, v)
			m.Mag.Values = append(m.Mag.Values, 2e-7/r)
			m.FieldU = append(m.FieldU, -v/r)
			m.FieldV = append(m.FieldV, u/r)
		}
	}
	m.Paths = [][][2]float64{{{-0.002, -0.002}, {0.002, -0.002}, {0.002, 0.002}, {-0.002, 0.002}, {-0.002, -0.002}}}
	return m
}

func TestMapSVG(t *testing.T) {
	doc, err := wireMap(9).SVG()
	if err != nil {
		t.Fatal(err)
	}
	texts, paths := svgParts(t, doc)
	all := strings.Join(texts, "|")
	// the largest |B| is 2e-7/(0.0013·√2) ≈ 1.1e-4 T: shown in µT
	for _, want := range []string{"u [mm]", "v [mm]", "|B| [µT]", "|B| around a wire"} {
		if !strings.Contains(all, want) {
			t.Errorf("no text %q in the SVG; texts: %s", want, all)
		}
	}
	// 81 cells, 81 arrows of two strokes, the path: many more than 81 paths
	if len(paths) < 81*3 {
		t.Errorf("only %d paths drawn", len(paths))
	}
	// a log colour scale labels the bar with the values at powers of ten:
	// |B| runs from 2e-7/(0.05·√2) ≈ 2.8 µT to about 110 µT
	m := wireMap(9)
	m.LogColor = true
	doc, err = m.SVG()
	if err != nil {
		t.Fatal(err)
	}
	texts, _ = svgParts(t, doc)
	if !slices.Contains(texts, "10") || !slices.Contains(texts, "100") {
		t.Errorf("log colour bar not labelled at 10 and 100 µT: %q", texts)
	}
}

func TestMapRefuses(t *testing.T) {
	m := wireMap(3)
	m.Mag.Values = m.Mag.Values[:4]
	if _, err := m.SVG(); err == nil {
		t.Error("short grid accepted")
	}
	m = wireMap(3)
	m.V.Unit = "T"
	if _, err := m.SVG(); err == nil {
		t.Error("sides of different units accepted")
	}
	m = wireMap(3)
	m.Mag.Values[0] = math.Inf(1)
	if _, err := m.SVG(); err == nil {
		t.Error("an infinite value accepted")
	}
	// a uniform map still draws (one colour)
	m = wireMap(3)
	for i := range m.Mag.Values {
		m.Mag.Values[i] = 1e-3
	}
	if _, err := m.SVG(); err != nil {
		t.Errorf("uniform map: %v", err)
	}
	m.Mag.Values[2] = 0
	m.LogColor = true
	if _, err := m.SVG(); err == nil {
		t.Error("log colour of a zero accepted")
	}
}

// TestPowerTicks: the colour bar of a log map is labelled with values at
// powers of ten, every n-th one over many decades.
func TestPowerTicks(t *testing.T) {
	var got []string
	for _, tk := range (powerTicks{}).Ticks(-9, 3) {
		if tk.Label != "" {
			got = append(got, tk.Label)
		}
	}
	if strings.Join(got, " ") != "1e-09 1e-08 1e-07 1e-06 1e-05 0.0001 0.001 0.01 0.1 1 10 100 1000" {
		t.Errorf("12 decades: %q", got)
	}
	got = nil
	for _, tk := range (powerTicks{}).Ticks(-30, 30) {
		if tk.Label != "" {
			got = append(got, tk.Label)
		}
	}
	if len(got) != 13 { // every 5th power: ceil(60/12) = 5
		t.Errorf("60 decades: %q", got)
	}
}
