package runtime_test

import (
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"loopwise/runtime"
)

// TestWriteFileNoOverwrite: without overwrite a new file is written and an
// existing one, or a symbolic link to a missing file, is left alone with
// ErrExists or a clear message.
func TestWriteFileNoOverwrite(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "new.lw")
	if err := runtime.WriteFile(path, []byte("one"), false); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(path); string(b) != "one" {
		t.Fatalf("wrote %q", b)
	}
	err := runtime.WriteFile(path, []byte("two"), false)
	if !errors.Is(err, runtime.ErrExists) {
		t.Errorf("second write without overwrite: %v, want ErrExists", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "one" {
		t.Errorf("the existing file changed to %q", b)
	}
	dangling := filepath.Join(dir, "dangling.lw")
	if err := os.Symlink("missing.lw", dangling); err == nil {
		err := runtime.WriteFile(dangling, []byte("x"), true)
		if err == nil || !strings.Contains(err.Error(), "symbolic link to a missing file") {
			t.Errorf("dangling link: %v", err)
		}
	}
	assertNoTemps(t, dir)
}

// TestWriteFileRefusesReadOnly: a file without write permission is refused
// and unchanged, also for root (which the permission bits do not stop).
func TestWriteFileRefusesReadOnly(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "ro.lw")
	if err := os.WriteFile(path, []byte("keep"), 0o444); err != nil {
		t.Fatal(err)
	}
	err := runtime.WriteFileAtomic(path, []byte("lost"))
	if err == nil || err.Error() != "cannot write "+path+": the file is read-only (make it writable first if it should change)" {
		t.Errorf("read-only: %v", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "keep" {
		t.Errorf("read-only file rewritten to %q", b)
	}
	assertNoTemps(t, dir)
}

// TestWriteFileRefusesHardLink: a rename would leave the other name with the
// old text, so a file with two hard links is refused and both stay one file.
func TestWriteFileRefusesHardLink(t *testing.T) {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "a.lw"), filepath.Join(dir, "b.lw")
	if err := os.WriteFile(a, []byte("shared"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Link(a, b); err != nil {
		t.Skip("no hard links here:", err)
	}
	err := runtime.WriteFileAtomic(a, []byte("new"))
	if err == nil || !strings.Contains(err.Error(), "has 2 hard links") {
		t.Errorf("hard link: %v", err)
	}
	fa, _ := os.Stat(a)
	fb, _ := os.Stat(b)
	if !os.SameFile(fa, fb) {
		t.Errorf("the two names are no longer one file")
	}
	assertNoTemps(t, dir)
}

// TestWriteFileRemovesStaleTemps: a temporary file left by a killed writer
// (its process gone) is removed at the next write of the same target; one
// of a running process is kept.
func TestWriteFileRemovesStaleTemps(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "c.lw")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	// A process that has ended: start one and wait for it.
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	if err := cmd.Run(); err != nil {
		t.Skip("cannot start a process:", err)
	}
	dead := cmd.Process.Pid
	if runtime.ProcessAlive(dead) {
		t.Skip("the ended process's id is in use again")
	}
	stale := filepath.Join(dir, ".c.lw.lwtmp-"+strconv.Itoa(dead)+"-123")
	live := filepath.Join(dir, ".c.lw.lwtmp-"+strconv.Itoa(os.Getppid())+"-456")
	other := filepath.Join(dir, ".d.lw.lwtmp-"+strconv.Itoa(dead)+"-789")
	for _, f := range []string{stale, live, other} {
		if err := os.WriteFile(f, []byte("half"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := runtime.WriteFileAtomic(path, []byte("new")); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(stale); err == nil {
		t.Errorf("the stale temporary file of a dead process is still there")
	}
	if _, err := os.Stat(live); err != nil {
		t.Errorf("the temporary file of a running process was removed")
	}
	if _, err := os.Stat(other); err != nil {
		t.Errorf("the temporary file of another target was removed")
	}
}

// TestWriteFileErrorNamesTarget: an error names the file asked for, never
// the temporary file.
func TestWriteFileErrorNamesTarget(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "missing-dir", "x.lw")
	err := runtime.WriteFileAtomic(path, []byte("x"))
	if err == nil {
		t.Fatal("wrote into a missing directory")
	}
	if want := "cannot write " + path + ": no such file or directory"; err.Error() != want {
		t.Errorf("error %q, want %q", err, want)
	}
}

func assertNoTemps(t *testing.T, dir string) {
	t.Helper()
	ents, _ := os.ReadDir(dir)
	for _, e := range ents {
		if strings.Contains(e.Name(), ".lwtmp-") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}
