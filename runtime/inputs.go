package runtime

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
)

// Reading data files. A builtin may read a file the user names (a list of
// points, say) only from the session's input directory (Session.InDir: the
// script's directory, or the prompt's working directory): the name must be
// relative and must not leave that directory, also not through a symbolic
// link; only a regular file of at most MaxDataBytes is read. Nothing is
// ever written here.

// MaxDataBytes is the largest data file a builtin reads (16 MiB).
const MaxDataBytes = 16 << 20

// ErrNoInput is ReadInput's error when the session reads no files.
var ErrNoInput = errors.New("this session reads no data files")

// InputReader is implemented by a session that lets builtins read data
// files; builtins find it with a type assertion on their Env.
type InputReader interface {
	// ReadInput returns the contents of the file name in the input
	// directory, by the rules above.
	ReadInput(name string) ([]byte, error)
}

// ReadInput implements InputReader.
func (s *Session) ReadInput(name string) ([]byte, error) {
	if s.InDir == "" {
		return nil, ErrNoInput
	}
	clean := filepath.Clean(filepath.FromSlash(name))
	leaves := func() error {
		return fmt.Errorf("the file name %q leaves the script's directory %s; give a name relative to it, such as points.csv", name, s.InDir)
	}
	if name == "" || filepath.IsAbs(clean) || filepath.VolumeName(clean) != "" || clean == ".." || strings.HasPrefix(clean, ".."+string(filepath.Separator)) {
		return nil, leaves()
	}
	dir, err := filepath.EvalSymlinks(s.InDir)
	if err != nil {
		return nil, err
	}
	full, err := filepath.EvalSymlinks(filepath.Join(dir, clean))
	if err != nil {
		return nil, fmt.Errorf("cannot read %s: %w", name, unwrapPath(err))
	}
	if rel, err := filepath.Rel(dir, full); err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return nil, leaves()
	}
	f, err := os.Open(full)
	if err != nil {
		return nil, fmt.Errorf("cannot read %s: %w", name, unwrapPath(err))
	}
	defer f.Close()
	fi, err := f.Stat()
	if err != nil {
		return nil, fmt.Errorf("cannot read %s: %w", name, unwrapPath(err))
	}
	if !fi.Mode().IsRegular() {
		return nil, fmt.Errorf("%s is not a regular file", name)
	}
	if fi.Size() > MaxDataBytes {
		return nil, fmt.Errorf("%s is larger (%s) than the %s a data file may have", name, mib(fi.Size()), mib(MaxDataBytes))
	}
	data, err := io.ReadAll(io.LimitReader(f, MaxDataBytes+1))
	if err != nil {
		return nil, fmt.Errorf("cannot read %s: %w", name, unwrapPath(err))
	}
	if len(data) > MaxDataBytes {
		return nil, fmt.Errorf("%s is larger than the %s a data file may have", name, mib(MaxDataBytes))
	}
	return data, nil
}

// unwrapPath drops the path from an fs.PathError: messages name the file
// as the user wrote it.
func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
