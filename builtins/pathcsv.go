package builtins

import (
	"bytes"
	"errors"
	"fmt"
	"regexp"
	"strings"
	"unicode/utf8"

	"loopwise/builtins/em"
	"loopwise/runtime"
)

// decimalRe is a plain decimal number, as a literal is written.
var decimalRe = regexp.MustCompile(`^[+-]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?$`)

// maxCSVLine is the longest line path_from_csv reads (a point needs far
// less; a longer line is not a list of points).
const maxCSVLine = 4096

func pathCSVFuncs() []*runtime.Func {
	return []*runtime.Func{
		fncEnv("path_from_csv", []string{"file", "closure"}, 1, 2, &runtime.Help{
			Signature: `path_from_csv(file: text[, closure: "open" or "closed"]) -> path`,
			Summary:   "A path of straight pieces through the points listed in a CSV file beside the script: a header naming the columns x, y, z with their length units in brackets (x [mm], y [mm], z [mm]), then one point a line. Closed when the last point equals the first; \"closed\" closes it back to the first point; \"open\" keeps the points as listed.",
			Method:    "read only, from the script's directory (at the prompt, the working directory; a name leaving it, also through a link, is refused); at most 16 MiB and 200000 points; lines starting with # and empty lines are skipped; numbers are decimal, converted exactly as the literal \"number unit\" would be; a bad line is an error naming the file and line",
			Example:   "p = path_from_csv(\"samples/pickup-outline.csv\")\nlength(p)",
			Reference: "RFC 4180 (comma-separated values), without quoted fields",
		}, pathFromCSV),
	}
}

func pathFromCSV(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "path_from_csv"
	name, ok := args[0].(string)
	if !ok {
		return nil, errorf("%s: the file name is text in quotes, not %s", fn, describeArg(args[0]))
	}
	closure := ""
	if len(args) == 2 {
		c, _ := args[1].(string)
		if c != "open" && c != "closed" {
			return nil, errorf(`%s: the closure is "open" or "closed", not %s`, fn, describeArg(args[1]))
		}
		closure = c
	}
	rd, ok := env.(runtime.InputReader)
	if !ok {
		return nil, errorf("%s: this session reads no data files", fn)
	}
	data, err := rd.ReadInput(name)
	if err != nil {
		if errors.Is(err, runtime.ErrNoInput) {
			return nil, errorf("%s: this session reads no data files", fn)
		}
		return nil, errorf("%s: %v", fn, err)
	}
	pts, lines, err := parsePointsCSV(name, data)
	if err != nil {
		return nil, errorf("%s: %v", fn, err)
	}
	closed := closure == "closed"
	if len(pts) > 2 && closure != "open" && pts[len(pts)-1] == pts[0] {
		pts, lines, closed = pts[:len(pts)-1], lines[:len(lines)-1], true
	}
	if len(pts) < 2 || closed && len(pts) < 3 {
		return nil, errorf("%s: %s has %d distinct points; a path needs at least 2 (a closed one 3)", fn, name, len(pts))
	}
	if err := checkPrims(fn, len(pts)); err != nil {
		return nil, err
	}
	n := len(pts) - 1
	if closed {
		n++
	}
	prims := make([]em.Prim, 0, n)
	for i := 0; i < n; i++ {
		j := (i + 1) % len(pts)
		s, err := em.NewSegment(pts[i], pts[j])
		if err != nil {
			return nil, errorf("%s: %s:%d: the point is the same as the one on line %d", fn, name, lines[j], lines[i])
		}
		prims = append(prims, s)
	}
	return pathResult(fn, prims)
}

// parsePointsCSV reads the header "x [unit], y [unit], z [unit]" (in any
// order) and the points, in metres, with the line of each.
func parsePointsCSV(name string, data []byte) ([]em.Vec, []int, error) {
	if !utf8.Valid(data) {
		return nil, nil, fmt.Errorf("%s is not UTF-8 text", name)
	}
	var (
		cols  [3]int // column of x, y, z
		units [3]runtime.UnitExpr
		pts   []em.Vec
		lines []int
		width int
	)
	header := false
	for ln := 1; len(data) > 0; ln++ {
		var line []byte
		if i := bytes.IndexByte(data, '\n'); i >= 0 {
			line, data = data[:i], data[i+1:]
		} else {
			line, data = data, nil
		}
		if len(line) > maxCSVLine {
			return nil, nil, fmt.Errorf("%s:%d: the line is longer than %d bytes", name, ln, maxCSVLine)
		}
		text := strings.TrimSpace(strings.TrimSuffix(string(line), "\r"))
		if ln == 1 {
			text = strings.TrimPrefix(text, "\ufeff") // a byte order mark
		}
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		fields := strings.Split(text, ",")
		if !header {
			var err error
			if cols, units, err = csvHeader(fields); err != nil {
				return nil, nil, fmt.Errorf("%s:%d: %v", name, ln, err)
			}
			header, width = true, len(fields)
			continue
		}
		if len(fields) != width {
			return nil, nil, fmt.Errorf("%s:%d: %d fields, but the header has %d", name, ln, len(fields), width)
		}
		if len(pts) >= maxPrims {
			return nil, nil, fmt.Errorf("%s: more than %d points", name, maxPrims)
		}
		var v [3]float64
		for k := range 3 {
			f := strings.TrimSpace(fields[cols[k]])
			if !decimalRe.MatchString(f) {
				return nil, nil, fmt.Errorf("%s:%d: %s = %q is not a decimal number", name, ln, "xyz"[k:k+1], abbrevName(f))
			}
			x, err := runtime.LiteralValue(f, units[k])
			if err != nil {
				return nil, nil, fmt.Errorf("%s:%d: %s: %v", name, ln, "xyz"[k:k+1], err)
			}
			v[k] = x
		}
		pts = append(pts, em.Vec{X: v[0], Y: v[1], Z: v[2]})
		lines = append(lines, ln)
	}
	if !header {
		return nil, nil, fmt.Errorf("%s has no header line (x [mm], y [mm], z [mm])", name)
	}
	return pts, lines, nil
}

// csvHeader finds the columns x, y, z and their length units.
func csvHeader(fields []string) (cols [3]int, units [3]runtime.UnitExpr, err error) {
	found := [3]bool{}
	for i, f := range fields {
		f = strings.TrimSpace(f)
		open, close := strings.IndexByte(f, '['), strings.LastIndexByte(f, ']')
		if open < 0 || close < open || strings.TrimSpace(f[close+1:]) != "" {
			return cols, units, fmt.Errorf("the header names each column with its unit in brackets, as x [mm], y [mm], z [mm]; not %q", abbrevName(f))
		}
		col := strings.ToLower(strings.TrimSpace(f[:open]))
		k := strings.Index("xyz", col)
		if len(col) != 1 || k < 0 {
			return cols, units, fmt.Errorf("the columns are x, y and z, not %q", abbrevName(col))
		}
		if found[k] {
			return cols, units, fmt.Errorf("the column %s appears twice", col)
		}
		u, uerr := runtime.ParseUnit(strings.TrimSpace(f[open+1 : close]))
		if uerr != nil {
			return cols, units, fmt.Errorf("column %s: %v", col, uerr)
		}
		if u.Dim != dimLength || u.Offset != 0 {
			return cols, units, fmt.Errorf("column %s: the unit must be a length, such as mm, not %q", col, abbrevName(f[open+1:close]))
		}
		found[k], cols[k], units[k] = true, i, u
	}
	for k, ok := range found {
		if !ok {
			return cols, units, fmt.Errorf("the header has no column %s", "xyz"[k:k+1])
		}
	}
	return cols, units, nil
}
