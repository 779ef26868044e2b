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

// TestRecordRefusesReadOnlyAndHardLink: record leaves a read-only file and
// a file with a second hard link as they were, says why without naming a
// temporary file, and leaves no temporary file behind.
func TestRecordRefusesReadOnlyAndHardLink(t *testing.T) {
	dir := t.TempDir()
	src := "```lw\nN = 10 turns\n```\n"
	ro := filepath.Join(dir, "ro.lw")
	if err := os.WriteFile(ro, []byte(src), 0o444); err != nil {
		t.Fatal(err)
	}
	a, b := filepath.Join(dir, "a.lw"), filepath.Join(dir, "b.lw")
	if err := os.WriteFile(a, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	linked := os.Link(a, b) == nil
	for _, c := range []struct {
		path, why string
	}{
		{ro, "the file is read-only (make it writable first if it should change)"},
		{a, "the file has 2 hard links, and replacing it would cut it from the others (write a copy, or remove the other links first)"},
	} {
		if c.path == a && !linked {
			continue
		}
		var out, errOut bytes.Buffer
		if code := run([]string{"record", c.path}, nil, &out, &errOut); code != 1 {
			t.Errorf("record %s exited %d, want 1", c.path, code)
		}
		want := "loopwise record: cannot write " + c.path + ": " + c.why + "\n" + c.path + ": left unchanged\n"
		if errOut.String() != want {
			t.Errorf("stderr %q\nwant   %q", errOut.String(), want)
		}
		if got, _ := os.ReadFile(c.path); string(got) != src {
			t.Errorf("%s changed to %q", c.path, got)
		}
	}
	if linked {
		fa, _ := os.Stat(a)
		fb, _ := os.Stat(b)
		if !os.SameFile(fa, fb) {
			t.Errorf("the hard link was broken")
		}
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 3 {
		t.Errorf("directory holds %d entries, want the 3 files alone", len(ents))
	}
}
