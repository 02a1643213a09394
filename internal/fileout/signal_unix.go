//go:build unix

package fileout

import "syscall"

// A closed terminal (SIGHUP) ends a write like an interrupt.
func init() { exitStatus[syscall.SIGHUP] = 128 + 1 }
