package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// TestRecordFileHandling runs loopwise record end to end on a CR LF file
// with unusual permissions, reached through a symbolic link: the line
// endings (new result lines included) and the permissions stay, and the
// link stays a link while its target is rewritten.
func TestRecordFileHandling(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "coil.lw")
	src := "# Coil\r\n\r\n```lw\r\nN = 10 turns\r\nL = [1 mm,\r\n  2 mm, 2 mm]\r\n```\r\n"
	if err := os.WriteFile(target, []byte(src), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(target, 0o604); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.lw")
	if err := os.Symlink("coil.lw", link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	var out, errOut bytes.Buffer
	if code := run([]string{"record", link}, nil, &out, &errOut); code != 0 {
		t.Fatalf("record exited %d: %s", code, errOut.String())
	}
	want := "# Coil\r\n\r\n```lw\r\nN = 10 turns\r\n↳ 10\r\nL = [1 mm,\r\n  2 mm, 2 mm]\r\n↳ [1, 2, 2] mm\r\n```\r\n"
	got, err := os.ReadFile(target)
	if err != nil {
		t.Fatal(err)
	}
	if string(got) != want {
		t.Errorf("recorded %q\nwant     %q", got, want)
	}
	if fi, err := os.Lstat(link); err != nil || fi.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the link is no longer a link (%v)", err)
	}
	if fi, err := os.Stat(target); err != nil || fi.Mode().Perm() != 0o604 {
		t.Errorf("permissions %v, want 0604 (%v)", fi.Mode().Perm(), err)
	}
	if code := run([]string{"check", link}, nil, &out, &errOut); code != 0 {
		t.Errorf("check after record exited %d: %s%s", code, out.String(), errOut.String())
	}
}
