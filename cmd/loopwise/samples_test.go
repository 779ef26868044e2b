package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"loopwise/runtime"
)

// TestSamples replays every worked sample and compares each recorded result
// (relative tolerance 1e-9, the default of loopwise check). The recorded
// numbers are computed by Loopwise, so this test guards against drift only;
// where a sample compares a result with a formula or a second route, the
// comparison is a statement of the sample (a ratio recorded as 1, say),
// which the replay then holds to 1e-9. On a mismatch it writes the freshly
// recorded script beside the sample and prints the diff command.
func TestSamples(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "..", "samples", "*.lw"))
	if err != nil {
		t.Fatal(err)
	}
	if len(files) == 0 {
		t.Fatal("no samples found")
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			data, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			sc, err := runtime.ParseScript(f, data)
			if err != nil {
				t.Fatal(err)
			}
			rep, err := sc.Check(scriptSession(runtime.ScriptBudget, nil), runtime.DefaultTolerance)
			if err != nil {
				t.Fatal(err)
			}
			if len(rep.Drifts) == 0 {
				return
			}
			var b strings.Builder
			rep.Write(&b, f)
			t.Error(b.String())
			fresh, err := sc.Record(scriptSession(runtime.ScriptBudget, nil))
			if err == nil && !bytes.Equal(fresh, data) {
				out := f + ".new"
				if os.WriteFile(out, fresh, 0o644) == nil {
					t.Logf("wrote the new results to %s; compare with: diff %s %s", out, f, out)
				}
			}
		})
	}
}
