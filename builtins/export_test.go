package builtins_test

import (
	"encoding/csv"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestExportCSV writes a sampled axis field and reads the file back with
// an RFC 4180 reader (Go's encoding/csv; RFC 4180, Y. Shafranovich, 2005):
// the header names each column with its unit, the units parse back to
// their SI size, and the numbers are the table's own, in SI, exactly; the
// centre's field is the closed form µ0 I / 2R (Griffiths, Introduction to
// Electrodynamics, 4th ed., 2017, Eq. 5.41 at z = 0) to rounding.
func TestExportCSV(t *testing.T) {
	dir := t.TempDir()
	s := runtime.NewSession(builtins.Standard())
	s.OutDir = filepath.Join(dir, "out")
	eval(t, s, "axis = sample_line(b_field(source(circle([0, 0, 0] m, [0, 0, 1], 25 mm), 2 A)), [0, 0, -50] mm, [0, 0, 50] mm, 11)")
	eval(t, s, "H(Bz) = Bz / mu0")
	w, ok := eval(t, s, `export_csv(with_column(axis, "H", H), "axis.csv")`).(*builtins.Written)
	if !ok || w.Show(6) != "wrote axis.csv: 11 rows of 9 columns" {
		t.Fatalf("export_csv result: %v", w)
	}
	tab := tableOf(t, eval(t, s, `with_column(axis, "H", H)`))
	recs := readCSV(t, filepath.Join(s.OutDir, "axis.csv"))
	if len(recs) != 12 {
		t.Fatalf("%d records, want a header and 11 rows", len(recs))
	}
	wantHead := "s [m],x [m],y [m],z [m],Bx [T],By [T],Bz [T],|B| [T],H [A/m]"
	if got := strings.Join(recs[0], ","); got != wantHead {
		t.Errorf("header %q, want %q", got, wantHead)
	}
	for _, h := range recs[0] {
		unit := h[strings.Index(h, "[")+1 : len(h)-1]
		u, err := runtime.ParseUnit(unit)
		if err != nil || u.Factor*math.Pow10(u.Exp10) != 1 {
			t.Errorf("header unit %q is not a coherent SI unit: %+v, %v", unit, u, err)
		}
	}
	for i, r := range recs[1:] {
		for j, c := range r {
			x, err := strconv.ParseFloat(c, 64)
			if err != nil || x != tab.Rows[i][j] {
				t.Errorf("row %d column %d: %q, want %v exactly", i+1, j+1, c, tab.Rows[i][j])
			}
		}
	}
	bz, _ := strconv.ParseFloat(recs[6][6], 64)
	if want := loopAxisB(2, 0.025, 0); math.Abs(bz-want) > 1e-12*want {
		t.Errorf("Bz at the centre in the file: %g, want %g", bz, want)
	}

	// in the units shown: µT and mm, the same numbers scaled
	eval(t, s, `export_csv(axis, "plots/axis_shown.csv", "shown")`)
	recs = readCSV(t, filepath.Join(s.OutDir, "plots", "axis_shown.csv"))
	if got := strings.Join(recs[0], ","); got != "s [mm],x [m],y [m],z [mm],Bx [T],By [T],Bz [µT],|B| [µT]" {
		t.Errorf("shown header %q", got)
	}
	bz, _ = strconv.ParseFloat(recs[6][6], 64)
	if want := loopAxisB(2, 0.025, 0) * 1e6; math.Abs(bz-want) > 1e-12*want {
		t.Errorf("Bz at the centre in µT: %g, want %g", bz, want)
	}

	for _, c := range []struct{ in, want string }{
		{`export_csv(axis, "../axis.csv")`, `export_csv: the file name "../axis.csv" leaves the output directory`},
		{`export_csv(axis, "axis.txt")`, `export_csv: the file's name must end in .csv, such as "axis.csv", not "axis.txt"`},
		{`export_csv(axis, "axis.csv", "cgs")`, `export_csv: the units must be "SI" or "shown", not "cgs"`},
		{`export_csv(3 mm, "axis.csv")`, `export_csv: the first argument must be a table`},
	} {
		_, err := s.Eval(lang.Pos{Line: 5, Col: 1}, c.in)
		var le *lang.Error
		if !errors.As(err, &le) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v\nwant %s", c.in, err, c.want)
		}
	}
	if _, err := os.Stat(filepath.Join(dir, "axis.csv")); err == nil {
		t.Error("a name leaving the output directory was written")
	}

	// a session without an output directory writes nothing and says so
	s2 := runtime.NewSession(builtins.Standard())
	eval(t, s2, "f(x) = x")
	_, err := s2.Eval(lang.Pos{Line: 1, Col: 1}, `export_csv(sweep(f, 0 m, 1 m, 2), "f.csv")`)
	if err == nil || !strings.Contains(err.Error(), "export_csv: this session has no output directory, so it writes no files and the table was not exported to f.csv") {
		t.Errorf("export without an output directory: %v", err)
	}
}

// TestExportCSVCycles: a sweep over cycle frequencies keeps Hz in the
// header (SI Brochure, 9th ed., 2019, Table 4: the hertz for periodic
// phenomena), and a plain-number column has no unit.
func TestExportCSVCycles(t *testing.T) {
	s := runtime.NewSession(builtins.Standard())
	s.OutDir = t.TempDir()
	eval(t, s, "g(f) = f / (1 kHz)")
	eval(t, s, `export_csv(sweep(g, 50 Hz, 1 kHz, 3), "g.csv")`)
	recs := readCSV(t, filepath.Join(s.OutDir, "g.csv"))
	if got := strings.Join(recs[0], ","); got != "f [Hz],g" {
		t.Errorf("header %q, want f [Hz],g", got)
	}
	if got := strings.Join(recs[3], ","); got != "1000,1" {
		t.Errorf("last row %q, want 1000,1", got)
	}
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return recs
}
