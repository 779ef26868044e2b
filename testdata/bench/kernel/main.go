// Command kernel times Loopwise's Biot–Savart kernel (builtins/em.Fields) on
// segments and points read from binary files, for compare_numpy.py.
//
//	kernel SEGMENTS POINTS OUT REPEATS
//
// SEGMENTS holds n×6 little-endian float64 (ax ay az bx by bz, metres),
// POINTS m×3, and OUT receives m×3 (B in tesla for 1 A in every segment).
// It prints the best wall time in seconds of REPEATS runs.
package main

import (
	"encoding/binary"
	"fmt"
	"math"
	"os"
	"strconv"
	"time"

	"loopwise/builtins/em"
)

func read(path string, width int) [][]float64 {
	data, err := os.ReadFile(path)
	if err != nil {
		fail(err)
	}
	n := len(data) / 8 / width
	out := make([][]float64, n)
	for i := range out {
		out[i] = make([]float64, width)
		for j := range out[i] {
			out[i][j] = math.Float64frombits(binary.LittleEndian.Uint64(data[8*(i*width+j):]))
		}
	}
	return out
}

func fail(err error) {
	fmt.Fprintln(os.Stderr, "kernel:", err)
	os.Exit(1)
}

func main() {
	if len(os.Args) != 5 {
		fail(fmt.Errorf("usage: kernel SEGMENTS POINTS OUT REPEATS"))
	}
	segs := read(os.Args[1], 6)
	ptsRaw := read(os.Args[2], 3)
	repeats, err := strconv.Atoi(os.Args[4])
	if err != nil {
		fail(err)
	}
	prims := make([]em.Prim, len(segs))
	for i, s := range segs {
		p, err := em.NewSegment(em.Vec{X: s[0], Y: s[1], Z: s[2]}, em.Vec{X: s[3], Y: s[4], Z: s[5]})
		if err != nil {
			fail(err)
		}
		prims[i] = p
	}
	pts := make([]em.Vec, len(ptsRaw))
	for i, p := range ptsRaw {
		pts[i] = em.Vec{X: p[0], Y: p[1], Z: p[2]}
	}
	srcs := []em.Source{{Path: em.Path{Prims: prims}, I: 1}}
	out := make([]em.Vec, len(pts))
	best := math.Inf(1)
	for r := 0; r < repeats; r++ {
		start := time.Now()
		if err := em.Fields(em.FieldB, srcs, pts, out, 0, nil, nil); err != nil {
			fail(err)
		}
		best = math.Min(best, time.Since(start).Seconds())
	}
	buf := make([]byte, 0, 24*len(out))
	for _, v := range out {
		for _, x := range []float64{v.X, v.Y, v.Z} {
			buf = binary.LittleEndian.AppendUint64(buf, math.Float64bits(x))
		}
	}
	if err := os.WriteFile(os.Args[3], buf, 0o644); err != nil {
		fail(err)
	}
	fmt.Println(best)
}
