//go:build unix

package runtime_test

import (
	"net"
	"path/filepath"
	"syscall"
	"testing"

	"loopwise/runtime"
)

// TestReadScriptSpecialFiles: a device that never ends and a named pipe
// (whose open would wait for a writer) and a socket are refused before
// they are opened.
func TestReadScriptSpecialFiles(t *testing.T) {
	fifo := filepath.Join(t.TempDir(), "pipe.lw")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Skipf("cannot make a named pipe: %v", err)
	}
	sock := filepath.Join(filepath.Dir(fifo), "sock.lw")
	l, err := net.Listen("unix", sock)
	if err != nil {
		t.Skipf("cannot make a socket: %v", err)
	}
	defer l.Close()
	for path, want := range map[string]string{
		"/dev/zero": "/dev/zero: is a device, not a script file; Loopwise reads scripts only from regular files",
		fifo:        fifo + ": is a named pipe, not a script file; Loopwise reads scripts only from regular files",
		sock:        sock + ": is a socket, not a script file; Loopwise reads scripts only from regular files",
	} {
		sc, err := runtime.ReadScript(path)
		if err == nil || err.Error() != want {
			t.Errorf("ReadScript(%s) = %v, %v; want %q", path, sc, err, want)
		}
	}
}
