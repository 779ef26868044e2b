//go:build unix

package runtime

import (
	"bytes"
	"errors"
	"io/fs"
	"os"
	"strconv"
	"syscall"
)

func linkCount(fi fs.FileInfo) uint64 {
	if st, ok := fi.Sys().(*syscall.Stat_t); ok {
		return uint64(st.Nlink)
	}
	return 1
}

func keepOwner(name string, fi fs.FileInfo) {
	if st, ok := fi.Sys().(*syscall.Stat_t); ok {
		if os.Chown(name, int(st.Uid), int(st.Gid)) != nil {
			os.Chown(name, -1, int(st.Gid)) // a member of the group may keep it
		}
	}
}

// ProcessAlive reports whether a process with this id runs (signal 0
// checks without sending anything; EPERM means it runs as someone else).
// A killed process its parent has not yet reaped (a zombie, state Z in
// /proc on Linux) no longer runs.
func ProcessAlive(pid int) bool {
	if pid <= 0 {
		return false
	}
	err := syscall.Kill(pid, 0)
	if err != nil && !errors.Is(err, syscall.EPERM) {
		return false
	}
	if stat, err := os.ReadFile("/proc/" + strconv.Itoa(pid) + "/stat"); err == nil {
		// pid (comm) state …: comm may hold spaces and brackets
		if i := bytes.LastIndexByte(stat, ')'); i >= 0 && i+2 < len(stat) && stat[i+2] == 'Z' {
			return false
		}
	}
	return true
}
