package runtime_test

import (
	"testing"

	"loopwise/runtime"
)

// TestCheckNumericalFloor: a replayed value that moved by less than the
// numerical error recorded beside it (or shown now) is not drift; one
// that moved by more is.
func TestCheckNumericalFloor(t *testing.T) {
	rec := "12.0000009928845 (numerical error ≤ 0.00011)"
	for _, c := range []struct {
		now  float64
		text string
		ok   bool
	}{
		{12.00005, "12.00005 (numerical error ≤ 0.00011)", true},
		{12.0002, "12.0002 (numerical error ≤ 0.00011)", false},
		{12.00003, "12.00003", true}, // the error is no longer shown: the recorded one still counts
	} {
		ok, _, _ := runtime.Matches(rec, runtime.Num(c.now), c.text, 1e-9)
		if ok != c.ok {
			t.Errorf("recorded %q, now %q: match %v, want %v", rec, c.text, ok, c.ok)
		}
	}
	// with a unit: the bound is read in its unit
	rec = "3.5 µH (numerical error ≤ 2 nH)"
	if ok, _, _ := runtime.Matches(rec, runtime.Quantity{V: 3.5015e-6, D: mustDim(t, "H")}, "3.5015 µH", 1e-9); !ok {
		t.Errorf("1.5 nH within 2 nH reported as drift")
	}
	if ok, _, _ := runtime.Matches(rec, runtime.Quantity{V: 3.503e-6, D: mustDim(t, "H")}, "3.503 µH", 1e-9); ok {
		t.Errorf("3 nH beyond 2 nH not reported")
	}
}

func mustDim(t *testing.T, unit string) runtime.Dim {
	t.Helper()
	u, err := runtime.ParseUnit(unit)
	if err != nil {
		t.Fatal(err)
	}
	return u.Dim
}
