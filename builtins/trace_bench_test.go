package builtins_test

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"testing"
	"time"

	"loopwise/builtins"
	"loopwise/builtins/em"
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

// The end-to-end pair: the field of a helix of 10 000 straight pieces on a
// grid of 100 × 100 points, (a) by the kernel alone on points and pieces
// made in Go, (b) through a session as a user writes it. Run together
// (go test ./builtins -run '^$' -bench EndToEnd) and compare: the
// language's share is the difference.
const (
	e2ePieces = 10_000
	e2eSide   = 100
)

var e2eStatements = []string{
	"h(u) = [10 mm * cos(u), 10 mm * sin(u), 4 mm * u / (1 rev)]",
	fmt.Sprintf("coil = parametric_path(h, 0 rad, 10 rev, %d)", e2ePieces),
	fmt.Sprintf("map = sample_plane(b_field(source(coil, 1 A)), [-30, -30, 50] mm, [60, 0, 0] mm, [0, 60, 0] mm, %d, %d)", e2eSide, e2eSide),
}

// e2eKernelInput is the same helix and grid in Go.
func e2eKernelInput() ([]em.Source, []em.Vec) {
	at := func(k int) em.Vec {
		u := 2 * math.Pi * 10 * float64(k) / e2ePieces
		return em.Vec{X: 0.010 * math.Cos(u), Y: 0.010 * math.Sin(u), Z: 0.004 * u / (2 * math.Pi)}
	}
	prims := make([]em.Prim, e2ePieces)
	for k := range prims {
		s, err := em.NewSegment(at(k), at(k+1))
		if err != nil {
			panic(err)
		}
		prims[k] = s
	}
	pts := make([]em.Vec, 0, e2eSide*e2eSide)
	for j := 0; j < e2eSide; j++ {
		for i := 0; i < e2eSide; i++ {
			u, v := float64(i)/(e2eSide-1), float64(j)/(e2eSide-1)
			pts = append(pts, em.Vec{X: -0.030 + 0.060*u, Y: -0.030 + 0.060*v, Z: 0.050})
		}
	}
	return []em.Source{{Path: em.Path{Prims: prims}, I: 1}}, pts
}

// BenchmarkEndToEnd times (a) and (b) apart, then "interleaved" runs one
// of each in turn and reports the median of their ratios (b)/(a): on a
// shared machine whose load changes from second to second, the ratio of
// neighbouring runs is steadier than the ratio of two separate timings.
func BenchmarkEndToEnd(b *testing.B) {
	b.Run("kernel", func(b *testing.B) {
		srcs, pts := e2eKernelInput()
		out := make([]em.Vec, len(pts))
		for b.Loop() {
			if err := em.Fields(em.FieldB, srcs, pts, out, 0, nil, nil); err != nil {
				b.Fatal(err)
			}
		}
	})
	session := func(b *testing.B, s *runtime.Session) {
		for i, l := range e2eStatements {
			if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, l); err != nil {
				b.Fatal(err)
			}
		}
	}
	b.Run("session", func(b *testing.B) {
		s := runtime.NewSession(builtins.Standard())
		for b.Loop() {
			session(b, s)
		}
	})
	b.Run("interleaved", func(b *testing.B) {
		srcs, pts := e2eKernelInput()
		out := make([]em.Vec, len(pts))
		s := runtime.NewSession(builtins.Standard())
		var ratios []float64
		for b.Loop() {
			t0 := time.Now()
			if err := em.Fields(em.FieldB, srcs, pts, out, 0, nil, nil); err != nil {
				b.Fatal(err)
			}
			t1 := time.Now()
			session(b, s)
			ratios = append(ratios, float64(time.Since(t1))/float64(t1.Sub(t0)))
		}
		sort.Float64s(ratios)
		b.ReportMetric(ratios[len(ratios)/2], "session/kernel")
	})
}

// TestEndToEndSameWork: the two sides of BenchmarkEndToEnd do the same
// work: the session's path has the kernel input's 10 000 pieces and its
// table the same 10 000 points, and the fields agree. Tolerance 1e-9
// relative to the largest |B|: the two helices are computed apart (1 rev
// in the language, 2π in Go), so their points differ by rounding.
func TestEndToEndSameWork(t *testing.T) {
	if testing.Short() {
		t.Skip("a second of field work")
	}
	s := runtime.NewSession(builtins.Standard())
	for i, l := range e2eStatements {
		if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, l); err != nil {
			t.Fatal(err)
		}
	}
	coil, _ := s.Lookup("coil")
	tv, _ := s.Lookup("map")
	tab, ok := tv.(*builtins.Table)
	if !ok || coil.(*builtins.Path) == nil {
		t.Fatalf("coil %v, map %v", coil, tv)
	}
	srcs, pts := e2eKernelInput()
	if n := len(coil.(*builtins.Path).P.Prims); n != len(srcs[0].Path.Prims) {
		t.Fatalf("%d pieces in the session, %d in the kernel input", n, len(srcs[0].Path.Prims))
	}
	if len(tab.Rows) != len(pts) {
		t.Fatalf("%d rows, %d points", len(tab.Rows), len(pts))
	}
	out := make([]em.Vec, len(pts))
	if err := em.Fields(em.FieldB, srcs, pts, out, 0, nil, nil); err != nil {
		t.Fatal(err)
	}
	big := 0.0
	for _, r := range tab.Rows {
		big = math.Max(big, r[8])
	}
	for i, r := range tab.Rows {
		if d := math.Abs(r[7] - out[i].Z); d > 1e-9*big || math.Abs(r[4]-pts[i].Z) > 1e-15 {
			t.Fatalf("point %d: Bz %g in the session, %g from the kernel", i+1, r[7], out[i].Z)
		}
	}
}
