//go:build unix

package main

import (
	"os"

	"golang.org/x/sys/unix"
)

// closedOutput reports whether f stands for a standard output that was closed
// when pasval started ('pasval check x >&-'). The Go runtime then opens
// /dev/null for reading and writing in its place (runtime checkfds), so
// writes succeed and vanish; a shell's '>/dev/null' opens it write-only and
// is not taken for closed.
func closedOutput(f *os.File) bool {
	flags, err := unix.FcntlInt(f.Fd(), unix.F_GETFL, 0)
	if err != nil {
		return true // not an open descriptor at all
	}
	if flags&unix.O_ACCMODE != unix.O_RDWR {
		return false
	}
	st, err := f.Stat()
	null, nerr := os.Stat(os.DevNull)
	return err == nil && nerr == nil && os.SameFile(st, null)
}
