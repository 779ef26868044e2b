//go:build unix

package runtime_test

import (
	"os"
	"path/filepath"
	"syscall"
	"testing"

	"loopwise/runtime"
)

// TestWriteFileKeepsOwner: as root, a file owned by someone else keeps its
// owner and group when rewritten.
func TestWriteFileKeepsOwner(t *testing.T) {
	if os.Geteuid() != 0 {
		t.Skip("only root can make a file owned by someone else")
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "o.lw")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Chown(path, 4321, 4322); err != nil {
		t.Skip(err)
	}
	if err := runtime.WriteFileAtomic(path, []byte("new")); err != nil {
		t.Fatal(err)
	}
	fi, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	st, ok := fi.Sys().(*syscall.Stat_t)
	if !ok {
		t.Skip("no owner information here")
	}
	if st.Uid != 4321 || st.Gid != 4322 {
		t.Errorf("owner %d:%d, want 4321:4322", st.Uid, st.Gid)
	}
}
