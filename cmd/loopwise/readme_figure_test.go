package main

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"loopwise/runtime"
)

// The README shows one plot, committed as an SVG file and written by a
// worked sample.
const (
	readmeFigure       = "docs/coupling-vs-gap.svg"
	readmeFigureSample = "samples/coaxial-coil-pair.lw"
)

// TestReadmeFigure checks the plot the README shows: README.md refers to
// the file in a Markdown image; the file is well-formed XML whose root
// element is svg; and the sample writes a plot of the same name whose data
// line has the same points. The data line is the drawing's path with the
// most points; its coordinates (in the picture's points) are compared
// within 0.01 pt, the resolution the SVG writer prints them with, so the
// test fails when the sample's numbers or the drawing's layout change and
// the committed picture would no longer be what the sample draws. It does
// not compare the rest of the picture (labels, ticks, styles).
func TestReadmeFigure(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(readme), "]("+readmeFigure+")") {
		t.Fatalf("README.md has no Markdown image of %s", readmeFigure)
	}
	committed, err := os.ReadFile(filepath.Join("..", "..", readmeFigure))
	if err != nil {
		t.Fatal(err)
	}
	if root, err := svgRoot(committed); err != nil || root != "svg" {
		t.Fatalf("%s: root element %q, error %v; want a well-formed svg document", readmeFigure, root, err)
	}

	data, err := os.ReadFile(filepath.Join("..", "..", readmeFigureSample))
	if err != nil {
		t.Fatal(err)
	}
	sc, err := runtime.ParseScript(readmeFigureSample, data)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	s := newSession()
	s.OutDir = dir
	var out bytes.Buffer
	if err := sc.Run(s, &out); err != nil {
		t.Fatalf("%v\n%s", err, out.String())
	}
	fresh, err := os.ReadFile(filepath.Join(dir, filepath.Base(readmeFigure)))
	if err != nil {
		t.Fatalf("%s no longer writes the README's plot: %v", readmeFigureSample, err)
	}
	want, got := dataLine(committed), dataLine(fresh)
	if len(want) < 20 {
		t.Fatalf("%s: data line has %d numbers; want a plotted series", readmeFigure, len(want))
	}
	redo := "run go run ./cmd/loopwise " + readmeFigureSample + " and copy " +
		strings.TrimSuffix(readmeFigureSample, runtime.ScriptExt) + "-out/" + filepath.Base(readmeFigure) + " to docs/"
	if len(got) != len(want) {
		t.Fatalf("the sample draws %d coordinates, %s holds %d; %s", len(got), readmeFigure, len(want), redo)
	}
	for i := range want {
		if math.Abs(got[i]-want[i]) > 0.01 {
			t.Fatalf("coordinate %d: the sample draws %g, %s holds %g; %s", i, got[i], readmeFigure, want[i], redo)
		}
	}
}

// svgRoot decodes the whole document (so that any XML error is found) and
// returns the name of its root element.
func svgRoot(doc []byte) (string, error) {
	d := xml.NewDecoder(bytes.NewReader(doc))
	root := ""
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			return root, nil
		}
		if err != nil {
			return root, err
		}
		if se, ok := tok.(xml.StartElement); ok && root == "" {
			root = se.Name.Local
		}
	}
}

var (
	pathData = regexp.MustCompile(`<path d="([^"]*)"`)
	number   = regexp.MustCompile(`-?[0-9]+(\.[0-9]+)?([eE][-+]?[0-9]+)?`)
)

// dataLine returns the coordinates of the path with the most points.
func dataLine(doc []byte) []float64 {
	var best []float64
	for _, m := range pathData.FindAllSubmatch(doc, -1) {
		var xs []float64
		for _, n := range number.FindAll(m[1], -1) {
			v, err := strconv.ParseFloat(string(n), 64)
			if err != nil {
				return nil
			}
			xs = append(xs, v)
		}
		if len(xs) > len(best) {
			best = xs
		}
	}
	return best
}
