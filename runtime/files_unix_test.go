//go:build unix

package runtime_test

import (
	"os"
	"os/exec"
	"path/filepath"
	"syscall"
	"testing"
	"time"

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

// TestProcessAliveZombie: a killed process that its parent has not reaped
// yet (a zombie) counts as gone, so its journal is offered at once; a
// running one counts as alive.
func TestProcessAliveZombie(t *testing.T) {
	if _, err := os.Stat("/proc/self/stat"); err != nil {
		t.Skip("no /proc here")
	}
	cmd := exec.Command("sleep", "30")
	if err := cmd.Start(); err != nil {
		t.Skip("cannot start a process:", err)
	}
	defer cmd.Wait()
	pid := cmd.Process.Pid
	if !runtime.ProcessAlive(pid) {
		t.Fatal("a running process counts as gone")
	}
	cmd.Process.Kill()
	// not reaped yet: wait until the kernel shows it as a zombie
	deadline := time.Now().Add(5 * time.Second)
	for runtime.ProcessAlive(pid) {
		if time.Now().After(deadline) {
			t.Fatal("a killed, unreaped process still counts as alive")
		}
		time.Sleep(10 * time.Millisecond)
	}
}
