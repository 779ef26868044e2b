package runtime

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
)

// A table recorded in a script is a grid of numbers under a header:
//
//	│ x [mm]        B [µT]
//	│      0  1256.63706144
//	│      5  1190.90012001
//
// Each header cell is a column name with its unit in brackets (none for a
// plain number); columns are right-aligned and separated by at least two
// spaces, so a header splits at runs of two or more spaces and a row at any
// space. A table longer than RecordRows is recorded as labelled rows of
// column statistics under a header whose first cell is "stat".
//
// Cells below 1e-10 of their column's largest magnitude are written as 0,
// as vector components are (vectorNoise): they are rounding noise.
type grid struct {
	cols   []string
	dims   []Dim
	units  []string
	scales []float64   // SI per unit of each column
	labels []string    // statistic names, or nil for plain rows
	cells  [][]float64 // coherent SI units
	text   [][]string  // cell text as recorded (parsed grids only)
	total  int         // rows of the whole table
}

// statNames label the rows that stand for a table longer than RecordRows.
var statNames = []string{"first", "last", "min", "max", "mean", "rms"}

// gridOf builds what a script records of a table.
func gridOf(t Tabular) grid {
	cols, dims, rows := t.Tabulate()
	g := grid{cols: cols, dims: dims, total: len(rows)}
	n := len(cols)
	big := make([]float64, n)
	for _, r := range rows {
		for j := range n {
			if a := math.Abs(r[j]); a > big[j] { // cells are finite (checked when made)
				big[j] = a
			}
		}
	}
	keep := func(x float64, j int) float64 { // cells that are noise beside their column's largest are 0
		if math.Abs(x) >= TableNoise*big[j] {
			return x
		}
		return 0
	}
	g.units, g.scales = make([]string, n), make([]float64, n)
	for j := range n {
		g.units[j], g.scales[j] = ColumnUnit(t, j, dims[j], big[j], RecordDigits)
	}
	if len(rows) <= RecordRows {
		clean := make([][]float64, len(rows))
		cells := make([]float64, len(rows)*n) // one allocation, not one a row
		for i, r := range rows {
			clean[i] = cells[i*n : (i+1)*n : (i+1)*n]
			for j := range n {
				clean[i][j] = keep(r[j], j)
			}
		}
		g.cells = clean
		return g
	}
	// column statistics, straight from the rows (a long table is not
	// copied)
	g.labels = statNames
	g.cells = make([][]float64, len(statNames))
	for k := range g.cells {
		g.cells[k] = make([]float64, n)
	}
	for j := range n {
		lo, hi, sum, sq := math.Inf(1), math.Inf(-1), 0.0, 0.0
		for _, r := range rows {
			x := keep(r[j], j)
			lo, hi = math.Min(lo, x), math.Max(hi, x)
			sum += x
			sq += x * x
		}
		m := float64(len(rows))
		stats := []float64{keep(rows[0][j], j), keep(rows[len(rows)-1][j], j), lo, hi, sum / m, math.Sqrt(sq / m)}
		for k, x := range stats {
			g.cells[k][j] = x
		}
	}
	return g
}

// header returns the header cells: "name [unit]", or the name alone.
func (g grid) header() []string {
	h := make([]string, len(g.cols))
	for j, c := range g.cols {
		h[j] = c
		if g.units[j] != "" {
			h[j] += " [" + g.units[j] + "]"
		}
	}
	return h
}

func (g grid) cellText(i, j int) string {
	if g.text != nil {
		return g.text[i][j]
	}
	return FormatNumber(g.cells[i][j]/g.scales[j], RecordDigits)
}

// lines writes the grid as aligned text lines (without TableMark).
func (g grid) lines() []string {
	rows := make([][]string, 0, len(g.cells)+1)
	head := g.header()
	if g.labels != nil {
		head = append([]string{"stat"}, head...)
	}
	rows = append(rows, head)
	for i := range g.cells {
		var r []string
		if g.labels != nil {
			r = append(r, g.labels[i])
		}
		for j := range g.cols {
			r = append(r, g.cellText(i, j))
		}
		rows = append(rows, r)
	}
	width := make([]int, len(head))
	for _, r := range rows {
		for j, c := range r {
			width[j] = max(width[j], len([]rune(c)))
		}
	}
	out := make([]string, len(rows))
	for i, r := range rows {
		var b strings.Builder
		for j, c := range r {
			pad := strings.Repeat(" ", width[j]-len([]rune(c)))
			if j > 0 {
				b.WriteString("  ")
			}
			if j == 0 && g.labels != nil {
				b.WriteString(c + pad) // labels align left
			} else {
				b.WriteString(pad + c)
			}
		}
		out[i] = strings.TrimRight(b.String(), " ")
	}
	return out
}

var headerSplit = regexp.MustCompile(`\s{2,}`)

// parseGrid reads recorded table lines (without TableMark).
func parseGrid(lines []string) (grid, error) {
	var g grid
	if len(lines) == 0 {
		return g, errors.New("no header")
	}
	head := headerSplit.Split(strings.TrimSpace(lines[0]), -1)
	if len(lines) > 1 && head[0] == "stat" {
		if f := strings.Fields(lines[1]); len(f) > 0 {
			if _, err := strconv.ParseFloat(f[0], 64); err != nil {
				g.labels = []string{}
				head = head[1:]
			}
		}
	}
	units := make([]UnitExpr, len(head))
	for _, h := range head {
		name, unit := h, ""
		if k := strings.LastIndex(h, " ["); k >= 0 && strings.HasSuffix(h, "]") {
			name, unit = h[:k], h[k+2:len(h)-1]
		}
		var d Dim
		if unit != "" {
			u, err := ParseUnit(unit)
			if err != nil {
				return g, fmt.Errorf("column %q: %v", h, err)
			}
			units[len(g.cols)] = u
			d = u.Dim
		}
		g.cols = append(g.cols, name)
		g.units = append(g.units, unit)
		g.dims = append(g.dims, d)
	}
	for n, l := range lines[1:] {
		f := strings.Fields(l)
		if g.labels != nil {
			if len(f) == 0 {
				return g, fmt.Errorf("row %d is empty", n+1)
			}
			g.labels = append(g.labels, f[0])
			f = f[1:]
		}
		if len(f) != len(g.cols) {
			return g, fmt.Errorf("row %d has %d cells for %d columns", n+1, len(f), len(g.cols))
		}
		row := make([]float64, len(f))
		for j, c := range f {
			var x float64
			var err error
			if g.units[j] == "" {
				x, err = strconv.ParseFloat(c, 64)
			} else {
				x, err = LiteralValue(c, units[j])
			}
			if err != nil {
				return g, fmt.Errorf("row %d: %q is not a number", n+1, c)
			}
			row[j] = x
		}
		g.cells = append(g.cells, row)
		g.text = append(g.text, f)
	}
	return g, nil
}
