package builtins_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// benchPoints is the number of points of the path-building benchmarks.
const benchPoints = 1000

// helixPoint is the k-th of benchPoints points along a helix of 10 turns,
// written as a literal.
func helixPoint(k int) string {
	return fmt.Sprintf("[%.6f, %.6f, %.6f] mm", 10*cosTurn(k), 10*sinTurn(k), 40*float64(k)/benchPoints)
}

// BenchmarkPathFromLiterals builds a polyline of benchPoints points written
// out as literals, as a user would paste them; it reports µs a point.
func BenchmarkPathFromLiterals(b *testing.B) {
	parts := make([]string, benchPoints)
	for k := range parts {
		parts[k] = helixPoint(k)
	}
	line := "p = polyline(" + strings.Join(parts, ", ") + ")"
	s := runtime.NewSession(builtins.Standard())
	for b.Loop() {
		if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, line); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Microseconds())/float64(b.N*benchPoints), "µs/point")
}

// BenchmarkParametricPath builds the same helix with parametric_path in
// benchPoints−1 pieces; it reports µs a point.
func BenchmarkParametricPath(b *testing.B) {
	s := runtime.NewSession(builtins.Standard())
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "h(u) = [10 mm * cos(u), 10 mm * sin(u), 4 mm * u / (1 rev)]"); err != nil {
		b.Fatal(err)
	}
	line := fmt.Sprintf("p = parametric_path(h, 0 rad, 10 rev, %d)", benchPoints-1)
	for b.Loop() {
		if _, err := s.Eval(lang.Pos{Line: 2, Col: 1}, line); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Microseconds())/float64(b.N*benchPoints), "µs/point")
}

func cosTurn(k int) float64 { return math.Cos(2 * math.Pi * 10 * float64(k) / benchPoints) }
func sinTurn(k int) float64 { return math.Sin(2 * math.Pi * 10 * float64(k) / benchPoints) }
