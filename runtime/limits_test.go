package runtime_test

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

// TestNoValueIsAnError: the last guard of Session.Exec. A builtin that
// returns nothing, or a number that is not finite, is a bug in Loopwise; the
// statement reports it as an internal error instead of showing, assigning
// or recording it. The builtins here are broken on purpose.
func TestNoValueIsAnError(t *testing.T) {
	broken := func(name string, v runtime.Value) *runtime.Func {
		return &runtime.Func{Name: name, MinArgs: 0, MaxArgs: 0, Call: func([]runtime.Value) (runtime.Value, error) { return v, nil }}
	}
	s := runtime.NewSession(runtime.Library{Funcs: []*runtime.Func{
		broken("nothing", nil),
		broken("nan", runtime.Quantity{V: math.NaN()}),
		broken("inf_vec", runtime.Vector{V: [3]float64{0, math.Inf(1), 0}}),
	}})
	for in, want := range map[string]string{
		"nothing()":     "internal error (please report): this expression gave no value",
		"x = nothing()": "internal error (please report): this expression gave no value",
		"nan()":         "internal error (please report): this expression gave a number that is not finite",
		"y = inf_vec()": "internal error (please report): this expression gave a vector with a component that is not finite",
	} {
		res, err := s.Eval(lang.Pos{File: "t.lw", Line: 1, Col: 1}, in)
		var le *lang.Error
		if !errors.As(err, &le) {
			t.Errorf("Eval(%q) = %+v, %v; want a positioned error", in, res, err)
			continue
		}
		if le.Msg != want {
			t.Errorf("Eval(%q): %q, want %q", in, le.Msg, want)
		}
	}
	if len(s.Variables()) != 0 || len(s.Transcript) != 0 {
		t.Errorf("a statement without a value left %v and %d transcript entries", s.Variables(), len(s.Transcript))
	}
}

// TestReservedCalls: the names the engine reads as its own list
// operations, derived from the engine. Each really cannot be called (so
// the test fails if the engine stops reserving one), none names a Loopwise
// builtin, and an engine builtin that is not reserved (len) can be defined
// and called.
func TestReservedCalls(t *testing.T) {
	names := runtime.ReservedCalls()
	for _, want := range []string{"sum", "count", "map", "filter", "all", "any", "none", "one"} {
		if !slices.Contains(names, want) {
			t.Errorf("ReservedCalls() = %v lacks %q", names, want)
		}
	}
	lib := builtins.Standard()
	for _, f := range lib.Funcs {
		if slices.Contains(names, f.Name) {
			t.Errorf("the builtin %s could never be called: its name is reserved", f.Name)
		}
	}
	s := newTestSession(t, nil)
	for _, name := range names {
		_, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, name+"(gap, gap)")
		if err == nil || !strings.Contains(err.Error(), name+"(...) is reserved by the expression syntax") {
			t.Errorf("%s(gap, gap): %v; want it refused as reserved syntax", name, err)
		}
		if _, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, name+"(x) = x"); err == nil || !strings.Contains(err.Error(), "cannot name a function") {
			t.Errorf("defining %s(x): %v", name, err)
		}
		// a plain value may have the name
		if _, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, name+" = 3 turns"); err != nil {
			t.Errorf("%s = 3 turns: %v", name, err)
		}
	}
	if _, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, "len(x) = 2*x"); err != nil {
		t.Fatal(err)
	}
	res, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, "len(gap)")
	if err != nil || res.Text != "8 mm" {
		t.Errorf("len(gap) = %v, %v; want 8 mm", res, err)
	}
}

// TestLongUnknownName: the "did you mean" search skips names whose length
// differs by more than the largest edit distance it suggests, and the
// message shortens the name. (The time this takes is measured by
// BenchmarkLongUnknownName, not here.)
func TestLongUnknownName(t *testing.T) {
	s := newTestSession(t, nil)
	name := strings.Repeat("q", lang.MaxStatementLen-10)
	_, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, "x = "+name)
	var le *lang.Error
	if !errors.As(err, &le) {
		t.Fatalf("got %v", err)
	}
	if le.Pos.Col != 5 || !strings.HasPrefix(le.Msg, `unknown name "qqq`) || strings.Contains(le.Msg, "did you mean") {
		t.Errorf("got %v", le)
	}
	if n := utf8.RuneCountInString(err.Error()); n > 400 {
		t.Errorf("the message prints %d characters", n)
	}
	// a near name is still suggested
	_, err = s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, "gapp")
	if err == nil || !strings.Contains(err.Error(), `did you mean "gap"?`) {
		t.Errorf("gapp: %v", err)
	}
}

func BenchmarkLongUnknownName(b *testing.B) {
	s := newTestSession(b, nil)
	line := "x = " + strings.Repeat("q", lang.MaxStatementLen-10)
	for b.Loop() {
		s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, line)
	}
}

// TestLiteralExponent: the decimal exponent of a literal and the unit's
// power of ten are added without wrapping around. Expected values follow
// from IEEE 754 double precision: the largest finite value is about
// 1.8e308, the smallest subnormal about 4.9e-324 (anything smaller rounds
// to 0).
func TestLiteralExponent(t *testing.T) {
	km, _ := runtime.ParseUnit("km")
	for _, tc := range []struct {
		num  string
		want float64
		err  bool
	}{
		{"1e9223372036854775805", 0, true},
		{"1e9223372036854775807", 0, true},
		{"1e99999999999999999999", 0, true},
		{"1e306", 0, true}, // 1e309 m
		{"1e305", 1e308, false},
		{"1e-9223372036854775805", 0, false},
		{"1e-99999999999999999999", 0, false},
		{"0e9223372036854775805", 0, false},
		{"1.5e3", 1.5e6, false},
	} {
		v, err := runtime.LiteralValue(tc.num, km)
		if tc.err {
			if err == nil || !strings.Contains(err.Error(), "too large") {
				t.Errorf("%s km = %g, %v; want too large", tc.num, v, err)
			}
			continue
		}
		if err != nil || v != tc.want {
			t.Errorf("%s km = %g, %v; want %g", tc.num, v, err, tc.want)
		}
	}
}

// TestReadScriptRefuses: the one reader of script files takes only regular
// files up to MaxScriptBytes, and says why it refuses the others.
func TestReadScriptRefuses(t *testing.T) {
	dir := t.TempDir()
	big := filepath.Join(dir, "big.lw")
	f, err := os.Create(big)
	if err != nil {
		t.Fatal(err)
	}
	// a sparse file: its size is what is checked, before any read
	if err := f.Truncate(runtime.MaxScriptBytes + 1); err != nil {
		t.Fatal(err)
	}
	f.Close()
	for path, want := range map[string]string{
		dir: dir + ": is a directory, not a script file; Loopwise reads scripts only from regular files",
		big: big + ": the file is larger (16.0 MiB) than the 16 MiB a script may have",
	} {
		sc, err := runtime.ReadScript(path)
		if err == nil || err.Error() != want {
			t.Errorf("ReadScript(%s) = %v, %v; want %q", path, sc, err, want)
		}
	}
	if _, err := runtime.ReadScript(filepath.Join(dir, "none.lw")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a missing file: %v", err)
	}
	// exactly at the limit is read
	ok := filepath.Join(dir, "ok.lw")
	data := []byte("```lw\nx = 1 m\n```\n")
	data = append(data, make([]byte, runtime.MaxScriptBytes-len(data))...)
	for i := len(data) - 1000; i < len(data); i++ {
		data[i] = '\n'
	}
	if err := os.WriteFile(ok, data, 0o644); err != nil {
		t.Fatal(err)
	}
	if sc, err := runtime.ReadScript(ok); err != nil || len(sc.Stmts) != 1 {
		t.Errorf("ReadScript of %d bytes: %v", len(data), err)
	}
}

// TestByteOrderMark: a byte-order mark before the first line of a script
// is skipped (it once hid a block that opened on the first line), and
// record keeps it.
func TestByteOrderMark(t *testing.T) {
	text := runtime.ByteOrderMark + "```lw\nx = 2 m\n```\n"
	sc, err := runtime.ParseScript("b.lw", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if len(sc.Stmts) != 1 {
		t.Fatalf("found %d statements, want 1", len(sc.Stmts))
	}
	out, err := sc.Record(newTestSession(t, []string{}))
	if err != nil {
		t.Fatal(err)
	}
	if want := runtime.ByteOrderMark + "```lw\nx = 2 m\n↳ 2 m\n```\n"; string(out) != want {
		t.Errorf("Record = %q, want %q", out, want)
	}
}

// TestWriteErrorNamesTheFile: an error of writing a script names the file,
// never the temporary file it is written through.
func TestWriteErrorNamesTheFile(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "adir.lw")
	if err := os.Mkdir(target, 0o755); err != nil {
		t.Fatal(err)
	}
	err := runtime.WriteFileAtomic(target, []byte("x"))
	if err == nil {
		t.Fatal("writing over a directory succeeded")
	}
	if msg := err.Error(); !strings.Contains(msg, target+": ") || strings.Contains(msg, "tmp-") || strings.Contains(msg, ".lwtmp") {
		t.Errorf("error %q, want it to name %s only", msg, target)
	}
	err = runtime.WriteFileAtomic(filepath.Join(dir, "missing", "x.lw"), []byte("x"))
	if err == nil || strings.Contains(err.Error(), "lwtmp") || strings.Contains(err.Error(), "*") {
		t.Errorf("error %v names a temporary file", err)
	}
}

// TestExpressionParts: the engine's node limit (runtime.MaxExprNodes) is
// reported in words, without the engine's wording.
func TestExpressionParts(t *testing.T) {
	s := newTestSession(t, nil)
	_, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, strings.Repeat("1+", runtime.MaxExprNodes)+"1")
	if err == nil || !strings.Contains(err.Error(), "this expression has more than 10000 parts (numbers, names, operators), the most one statement may have") {
		t.Errorf("got %v", err)
	}
	// well below the limit
	res, err := s.Eval(lang.Pos{File: "t.lw", Line: 3, Col: 1}, strings.Repeat("1+", 1000)+"1")
	if err != nil || res.Text != "1001" {
		t.Errorf("a sum of 1001 ones: %v, %v", res, err)
	}
}

// TestParseUnitNesting: the unit parser stops at lang.MaxNesting levels of
// parentheses on its own (it is also called for :help and "as" units).
func TestParseUnitNesting(t *testing.T) {
	deep := func(n int) string { return "m/" + strings.Repeat("(", n) + "s" + strings.Repeat(")", n) }
	if _, err := runtime.ParseUnit(deep(lang.MaxNesting)); err != nil {
		t.Errorf("%d levels: %v", lang.MaxNesting, err)
	}
	_, err := runtime.ParseUnit(deep(2_000_000))
	var ue *runtime.UnitError
	if !errors.As(err, &ue) || ue.Off != 2+lang.MaxNesting || ue.Msg != "parentheses in a unit nest deeper than 200 levels" {
		t.Errorf("2 000 000 levels: %#v", err)
	}
}

// TestOutputPath: builtins write only inside the session's output
// directory; names that would leave it are refused, and a session without
// one writes nothing.
func TestOutputPath(t *testing.T) {
	s := runtime.NewSession(runtime.Library{})
	if _, err := s.OutputPath("a.svg"); err != runtime.ErrNoOutput {
		t.Errorf("no output directory: %v", err)
	}
	dir := t.TempDir()
	s.OutDir = filepath.Join(dir, "coil-out")
	p, err := s.OutputPath("plots/b.svg")
	if err != nil || p != filepath.Join(dir, "coil-out", "plots", "b.svg") {
		t.Errorf("OutputPath = %q, %v", p, err)
	}
	if fi, err := os.Stat(filepath.Join(dir, "coil-out", "plots")); err != nil || !fi.IsDir() {
		t.Errorf("directory not created: %v", err)
	}
	for _, bad := range []string{"../x.svg", "/etc/x.svg", "a/../../x.svg", "..", "", "."} {
		if _, err := s.OutputPath(bad); err == nil {
			t.Errorf("OutputPath(%q) accepted", bad)
		}
	}
}
