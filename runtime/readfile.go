package runtime

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
)

// MaxScriptBytes is the largest script file Loopwise reads (16 MiB): far
// more than any hand-written calculation, and small enough that naming a
// huge file by mistake cannot exhaust the memory.
const MaxScriptBytes = 16 << 20

// ReadScript reads and parses the script file at path. It is the one way
// scripts are read (run, check, record and :load): only a regular file (or
// a symbolic link to one) of at most MaxScriptBytes is read; a directory,
// a device such as /dev/zero, a named pipe or a socket is refused before
// it is opened, so that reading can neither block nor run without end.
func ReadScript(path string) (*Script, error) {
	data, err := readScriptFile(path)
	if err != nil {
		return nil, err
	}
	return ParseScript(path, data)
}

func readScriptFile(path string) ([]byte, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if err := checkScriptFile(path, fi); err != nil {
		return nil, err
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	// the file may have been replaced between Stat and Open
	if fi, err = f.Stat(); err != nil {
		return nil, err
	}
	if err := checkScriptFile(path, fi); err != nil {
		return nil, err
	}
	data, err := io.ReadAll(io.LimitReader(f, MaxScriptBytes+1))
	if err != nil {
		return nil, err
	}
	if len(data) > MaxScriptBytes {
		return nil, tooBig(path, -1) // it grew while being read
	}
	return data, nil
}

// checkScriptFile refuses what is not a regular file of a readable size.
func checkScriptFile(path string, fi fs.FileInfo) error {
	m := fi.Mode()
	what := ""
	switch {
	case m.IsRegular():
		if fi.Size() > MaxScriptBytes {
			return tooBig(path, fi.Size())
		}
		return nil
	case m.IsDir():
		what = "a directory"
	case m&fs.ModeNamedPipe != 0:
		what = "a named pipe"
	case m&fs.ModeSocket != 0:
		what = "a socket"
	case m&fs.ModeDevice != 0:
		what = "a device"
	default:
		what = "a special file"
	}
	return fmt.Errorf("%s: is %s, not a script file; Loopwise reads scripts only from regular files", path, what)
}

func tooBig(path string, size int64) error {
	if size < 0 {
		return fmt.Errorf("%s: the file is larger than the %s a script may have", path, mib(MaxScriptBytes))
	}
	return fmt.Errorf("%s: the file is larger (%s) than the %s a script may have", path, mib(size), mib(MaxScriptBytes))
}

// mib writes a size in bytes as MiB.
func mib(n int64) string {
	if n%(1<<20) == 0 {
		return fmt.Sprintf("%d MiB", n>>20)
	}
	return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
}

// hideTempName rewrites an error of writing path through a temporary file
// so that it names path: the temporary name is ours, not the user's.
func hideTempName(path string, err error) error {
	var pe *fs.PathError
	var le *os.LinkError
	switch {
	case err == nil:
		return nil
	case errors.As(err, &pe):
		return &fs.PathError{Op: "write", Path: path, Err: pe.Err}
	case errors.As(err, &le):
		return &fs.PathError{Op: "write", Path: path, Err: le.Err}
	}
	return err
}
