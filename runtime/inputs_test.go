package runtime

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReadInput: a file inside the input directory is read; one larger
// than MaxDataBytes (a sparse file, so the test writes little), a
// directory, a name leaving the directory (by .., by an absolute name, by
// a symbolic link) and a session without an input directory are refused.
func TestReadInput(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in")
	if err := os.Mkdir(in, 0o755); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(in, "ok.csv"), []byte("x [m], y [m], z [m]\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "out.csv"), []byte("secret"), 0o644)
	os.Symlink(filepath.Join(dir, "out.csv"), filepath.Join(in, "link.csv"))
	os.Symlink("ok.csv", filepath.Join(in, "inner-link.csv"))
	f, err := os.Create(filepath.Join(in, "huge.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if err := f.Truncate(MaxDataBytes + 1); err != nil {
		t.Fatal(err)
	}
	f.Close()
	os.Mkdir(filepath.Join(in, "sub"), 0o755)

	s := &Session{InDir: in}
	for _, name := range []string{"ok.csv", "./ok.csv", "sub/../ok.csv", "inner-link.csv"} {
		if data, err := s.ReadInput(name); err != nil || !strings.HasPrefix(string(data), "x [m]") {
			t.Errorf("%s: %q, %v", name, data, err)
		}
	}
	for name, msg := range map[string]string{
		"huge.csv":                    "is larger (16.0 MiB) than the 16 MiB a data file may have",
		"sub":                         "sub is not a regular file",
		"../out.csv":                  "leaves the script's directory",
		"sub/../../out.csv":           "leaves the script's directory",
		filepath.Join(dir, "out.csv"): "leaves the script's directory",
		"link.csv":                    "leaves the script's directory",
		"":                            "leaves the script's directory",
		"missing.csv":                 "cannot read missing.csv: no such file or directory",
	} {
		if _, err := s.ReadInput(name); err == nil || !strings.Contains(err.Error(), msg) {
			t.Errorf("%q: error %v, want %q", name, err, msg)
		}
	}
	if _, err := (&Session{}).ReadInput("ok.csv"); !errors.Is(err, ErrNoInput) {
		t.Errorf("no input directory: %v", err)
	}
}
