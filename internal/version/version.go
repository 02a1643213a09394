// Package version tells which build of pasval is running; records and JSON
// output carry it so a result can be traced to the code that produced it.
package version

import (
	"fmt"
	"runtime"
	"runtime/debug"
)

// Version is the release number; a release build may set it with
// -ldflags "-X pasval/internal/version.Version=1.2.3".
var Version = "0.2.1"

// Build describes the build: Go version, and the VCS revision when known.
func Build() string {
	s := fmt.Sprintf("go %s %s/%s", runtime.Version(), runtime.GOOS, runtime.GOARCH)
	if bi, ok := debug.ReadBuildInfo(); ok {
		var rev, dirty string
		for _, kv := range bi.Settings {
			switch kv.Key {
			case "vcs.revision":
				rev = kv.Value
			case "vcs.modified":
				if kv.Value == "true" {
					dirty = "+modified"
				}
			}
		}
		if len(rev) > 12 {
			rev = rev[:12]
		}
		if rev != "" {
			s += ", revision " + rev + dirty
		}
	}
	return s
}
