//go:build !unix

package fileout

// No external source applies: these are the project's own file rules (README "Files").

import "testing"

// specialFiles makes no named pipe or device where the system has none.
func specialFiles(t *testing.T, dir string) map[string]string { return nil }
