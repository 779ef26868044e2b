package runtime

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// Writing files. Loopwise writes a user's file in two ways, both through
// WriteFile: record rewrites a script in place, and :save writes a new one
// (or replaces one only when asked). The rules:
//
//   - The data goes to a temporary file in the same directory, which is
//     synced, then renamed over the target; the directory is synced after
//     the rename. A reader sees the old file or the new one, never half.
//   - The temporary file is named after the target, the writing process and
//     tempMark (".coil.lw.lwtmp-PID-N"). One left behind by a process that
//     was killed in the write window is removed the next time that target is
//     written (only when its process is gone, so a writer running beside us
//     keeps its own).
//   - A symbolic link is followed and its target written; the link stays.
//   - A file with more than one hard link is refused: a rename would cut it
//     from its other names.
//   - A read-only file (no write permission bit) is refused, even for root.
//   - The permissions stay, and the owner and group where the system allows.
//   - Errors name the target, never the temporary file.

// tempMark is in the name of every temporary file WriteFile makes.
const tempMark = ".lwtmp-"

// ErrExists is returned by WriteFile, without overwrite, for a target that
// exists.
var ErrExists = errors.New("file exists")

// WriteFileAtomic rewrites path with data: WriteFile with overwrite.
func WriteFileAtomic(path string, data []byte) error {
	return WriteFile(path, data, true)
}

// WriteFile writes data to path by the rules above. Without overwrite an
// existing path (or a dangling symbolic link) is refused with ErrExists.
func WriteFile(path string, data []byte, overwrite bool) error {
	shown := path
	fail := func(err error) error {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err // its path may be the temporary file's
		}
		var le *os.LinkError
		if errors.As(err, &le) {
			err = le.Err
		}
		return fmt.Errorf("cannot write %s: %w", shown, err)
	}
	if target, err := filepath.EvalSymlinks(path); err == nil {
		path = target
	} else if _, lerr := os.Lstat(path); lerr == nil {
		// a dangling link: writing would create a file where it points
		return fail(fmt.Errorf("it is a symbolic link to a missing file"))
	}
	mode := fs.FileMode(0o644)
	fi, err := os.Stat(path)
	switch {
	case err == nil && !overwrite:
		return fail(ErrExists)
	case err == nil:
		if !fi.Mode().IsRegular() {
			return fail(fmt.Errorf("not a regular file"))
		}
		if fi.Mode().Perm()&0o222 == 0 {
			return fail(fmt.Errorf("the file is read-only (make it writable first if it should change)"))
		}
		if n := linkCount(fi); n > 1 {
			return fail(fmt.Errorf("the file has %d hard links, and replacing it would cut it from the others (write a copy, or remove the other links first)", n))
		}
		mode = fi.Mode().Perm()
	case !errors.Is(err, fs.ErrNotExist):
		return fail(err)
	}
	dir := filepath.Dir(path)
	removeStaleTemps(dir, filepath.Base(path))
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+tempMark+strconv.Itoa(os.Getpid())+"-*")
	if err != nil {
		return fail(err)
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	if werr == nil {
		werr = tmp.Sync()
	}
	if cerr := tmp.Close(); werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(name, mode)
	}
	if werr == nil && fi != nil {
		keepOwner(name, fi) // best effort: only root may give a file away
	}
	if werr == nil {
		werr = verify(name, data)
	}
	if werr == nil {
		if overwrite {
			werr = os.Rename(name, path)
		} else {
			// Link fails if path appeared meanwhile: no file is ever
			// replaced without overwrite.
			werr = os.Link(name, path)
			if errors.Is(werr, fs.ErrExist) {
				werr = ErrExists
			} else if werr != nil {
				// a file system without hard links: check, then rename
				werr = ErrExists
				if _, err := os.Lstat(path); errors.Is(err, fs.ErrNotExist) {
					werr = os.Rename(name, path)
				}
			}
		}
	}
	if werr != nil || !overwrite {
		os.Remove(name)
	}
	if werr != nil {
		return fail(werr)
	}
	syncDir(dir)
	return nil
}

// verify reads the temporary file back and compares it with data.
func verify(name string, data []byte) error {
	got, err := os.ReadFile(name)
	if err != nil {
		return err
	}
	if !bytes.Equal(got, data) {
		return fmt.Errorf("the data read back differs from what was written")
	}
	return nil
}

// syncDir makes a rename in dir durable; where a directory cannot be
// synced (some systems refuse), there is nothing more to do.
func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}

// removeStaleTemps removes the temporary files for base left in dir by
// processes that no longer run.
func removeStaleTemps(dir, base string) {
	prefix := "." + base + tempMark
	entries, err := os.ReadDir(dir)
	if err != nil {
		return
	}
	for _, e := range entries {
		rest, ok := strings.CutPrefix(e.Name(), prefix)
		if !ok || !e.Type().IsRegular() {
			continue
		}
		pidText, _, ok := strings.Cut(rest, "-")
		pid, err := strconv.Atoi(pidText)
		if !ok || err != nil || pid == os.Getpid() || ProcessAlive(pid) {
			continue
		}
		os.Remove(filepath.Join(dir, e.Name()))
	}
}
