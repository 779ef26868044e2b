//go:build !unix

package runtime

import (
	"io/fs"
	"os"
)

func linkCount(fs.FileInfo) uint64 { return 1 }

func keepOwner(string, fs.FileInfo) {}

// ProcessAlive reports whether a process with this id runs.
func ProcessAlive(pid int) bool {
	p, err := os.FindProcess(pid)
	if err != nil {
		return false
	}
	p.Release()
	return true
}
