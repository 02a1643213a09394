// Package fileout writes output files atomically: the bytes go to a temporary
// file in the target's folder, which is synced and renamed over the target,
// so a crash or a full disk never leaves a half-written file behind.
//
//	if err := fileout.Write("line2-record.pdf", pdf, force); err != nil { … }
//
// The rules, the same for every file pasval writes:
//   - Only a regular file is ever replaced, and only with force; a folder, a
//     symbolic link, a named pipe, a device or a socket is refused even with
//     force (Check tells before anything is written).
//   - The temporary is named ".pasval-DIGITS.tmp", whatever the target's name,
//     so any name the file system accepts works (NAME_MAX counts the target's
//     name, not a longer temporary one).
//   - The temporary is created with mode 0666, as any program creates files,
//     so the kernel applies the umask (and a folder's default ACL) and the
//     renamed file keeps that mode. Nothing reads the umask: umask(2)
//     reads it only by changing it, for the whole process, meanwhile.
//   - SIGINT, SIGTERM or (on Unix) SIGHUP during a write removes the
//     temporaries in flight, then ends the process by the same signal, so a
//     shell sees the usual status (130 for SIGINT, 143 for SIGTERM) and a
//     script's loop stops too. Where a process cannot signal itself it exits
//     with that status instead. The first write installs the handler; a
//     signal ignored when pasval started (nohup, a background job) stays
//     ignored.
//   - SIGKILL or a power cut can leave one temporary. The first write of a
//     later run in the same folder removes temporaries of this exact name
//     pattern that are regular files last modified over an hour ago. Age,
//     not a process id in the name, decides: a folder may be shared between
//     machines whose process ids mean nothing to each other, and no write of a
//     record takes an hour.
package fileout

import (
	"errors"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"os/signal"
	"path/filepath"
	"regexp"
	"sync"
	"syscall"
	"time"
)

// ErrExists is matched (errors.Is) by an *ExistsError: the target exists
// and overwriting was not allowed.
var ErrExists = errors.New("file exists")

// ExistsError is a target that exists when overwriting was not allowed; its
// message says what to do, once.
type ExistsError struct{ Path string }

func (e *ExistsError) Error() string { return e.Path + " already exists; use --force to overwrite it" }

// Is makes errors.Is(err, ErrExists) true.
func (e *ExistsError) Is(target error) bool { return target == ErrExists }

// ErrNotRegular is matched (errors.Is) by a *NotRegularError.
var ErrNotRegular = errors.New("not a regular file")

// NotRegularError reports a target that exists and is not a regular file.
type NotRegularError struct {
	Path string
	Mode fs.FileMode // from Lstat: a symbolic link is reported as one
}

func (e *NotRegularError) Error() string {
	return fmt.Sprintf("%s is %s, not a regular file; pasval writes over regular files only, even with --force", e.Path, Kind(e.Mode))
}

// Is makes errors.Is(err, ErrNotRegular) true.
func (e *NotRegularError) Is(target error) bool { return target == ErrNotRegular }

// Kind names the kind of file a mode describes, with its article ("a named pipe").
func Kind(m fs.FileMode) string {
	switch {
	case m.IsRegular():
		return "a regular file"
	case m.IsDir():
		return "a folder"
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0:
		return "a device"
	}
	return "a special file"
}

const (
	tempPrefix = ".pasval-"
	tempSuffix = ".tmp"
	// staleAge: a temporary of ours last modified longer ago than this was
	// left by a run that was killed; a write takes seconds.
	staleAge = time.Hour
)

// tempName matches the temporaries createTemp makes, and nothing else.
var tempName = regexp.MustCompile(`^` + regexp.QuoteMeta(tempPrefix) + `[0-9]{1,10}` + regexp.QuoteMeta(tempSuffix) + `$`)

var (
	// mu guards inflight and swept, and is held while a temporary is created
	// and while one is renamed into place, so that the signal handler, which
	// takes it for good, sees each temporary either in flight or renamed.
	mu       sync.Mutex
	inflight = map[string]struct{}{} // temporaries not yet renamed or removed
	swept    = map[string]bool{}     // folders already cleared of stale temporaries

	handlerOnce sync.Once

	// testHookWritten, when set, runs after the bytes are synced to the
	// temporary and before it is renamed (tests interrupt a write there).
	testHookWritten func(tmp string)
)

// Check returns the error Write(path, _, force) would return before writing
// anything: an error wrapping ErrNotRegular when path exists and is not a
// regular file, one wrapping ErrExists when it exists and force is false.
// Callers writing a set of files check every target first.
func Check(path string, force bool) error {
	st, err := os.Lstat(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return fmt.Errorf("cannot check %s: %w", path, err)
	}
	if !st.Mode().IsRegular() {
		return &NotRegularError{Path: path, Mode: st.Mode()}
	}
	if !force {
		return &ExistsError{Path: path}
	}
	return nil
}

// Write writes data to path. Without force an existing path is left alone
// and an error wrapping ErrExists is returned; a path that is not a regular
// file is never replaced (ErrNotRegular).
func Write(path string, data []byte, force bool) (err error) {
	if err := Check(path, force); err != nil {
		return err
	}
	dir := filepath.Dir(path)
	sweepStale(dir)
	tmp, err := createTemp(dir)
	if err != nil {
		return fmt.Errorf("cannot write in %s: %w", dir, err)
	}
	name := tmp.Name()
	closed, committed := false, false
	defer func() {
		if committed {
			return
		}
		if !closed {
			if cerr := tmp.Close(); cerr != nil {
				err = fmt.Errorf("%w; closing the temporary: %v", err, cerr)
			}
		}
		if rmErr := discard(name); rmErr != nil {
			err = fmt.Errorf("%w; the temporary %s is left: %v", err, name, rmErr)
		}
	}()
	if _, err := tmp.Write(data); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if err := tmp.Sync(); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	closed = true
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if testHookWritten != nil {
		testHookWritten(name)
	}
	if err := commit(name, path, force); err != nil {
		return err
	}
	committed = true
	return nil
}

// createTemp creates a new temporary in dir with mode 0666 (the kernel
// applies the umask) and records it as in flight.
func createTemp(dir string) (*os.File, error) {
	handlerOnce.Do(handleSignals)
	mu.Lock()
	defer mu.Unlock()
	for range 100 {
		name := filepath.Join(dir, fmt.Sprintf("%s%d%s", tempPrefix, rand.Uint32(), tempSuffix))
		f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o666)
		if errors.Is(err, fs.ErrExist) {
			continue
		}
		if err != nil {
			return nil, err
		}
		inflight[name] = struct{}{}
		return f, nil
	}
	return nil, errors.New("no free temporary name after 100 tries")
}

// commit moves the temporary name to path and forgets it. Without force,
// a hard link refuses a target that appeared meanwhile; with force, the
// target is checked again just before the rename.
func commit(name, path string, force bool) error {
	mu.Lock()
	defer mu.Unlock()
	if force {
		if err := Check(path, true); err != nil {
			return err
		}
		if err := os.Rename(name, path); err != nil {
			return fmt.Errorf("cannot write %s: %w", path, err)
		}
		delete(inflight, name)
		return nil
	}
	if err := os.Link(name, path); err != nil {
		if errors.Is(err, fs.ErrExist) {
			// The target appeared meanwhile: refuse as Check does.
			if err := Check(path, false); err != nil {
				return err
			}
			return &ExistsError{Path: path}
		}
		// A file system without hard links: rename instead.
		if err := os.Rename(name, path); err != nil {
			return fmt.Errorf("cannot write %s: %w", path, err)
		}
		delete(inflight, name)
		return nil
	}
	delete(inflight, name)
	if err := os.Remove(name); err != nil {
		return fmt.Errorf("wrote %s, but the temporary %s is left: %w", path, name, err)
	}
	return nil
}

// discard removes a temporary that will not be renamed.
func discard(name string) error {
	mu.Lock()
	defer mu.Unlock()
	delete(inflight, name)
	if err := os.Remove(name); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	return nil
}

// sweepStale removes, once per folder and run, the temporaries that a killed
// run left there (see the package comment). It is best effort: a temporary
// that cannot be removed stays, and the write goes on.
func sweepStale(dir string) {
	mu.Lock()
	done := swept[dir]
	swept[dir] = true
	mu.Unlock()
	if done {
		return
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return // the write that follows reports the folder's problem
	}
	cutoff := time.Now().Add(-staleAge)
	for _, e := range entries {
		if !tempName.MatchString(e.Name()) || !e.Type().IsRegular() {
			continue
		}
		info, err := e.Info()
		if err != nil || !info.ModTime().Before(cutoff) {
			continue
		}
		if err := os.Remove(filepath.Join(dir, e.Name())); err != nil {
			continue // left for a later run; not this write's concern
		}
	}
}

// exitStatus maps each signal handled to the status a shell reports for a
// process it ended: 128 + the signal number (POSIX shells, common practice).
var exitStatus = map[os.Signal]int{os.Interrupt: 128 + 2, syscall.SIGTERM: 128 + 15}

// handleSignals removes the temporaries in flight on SIGINT, SIGTERM or
// SIGHUP, then ends the process by the same signal (its default action). A
// signal ignored when pasval started (a background job, nohup) stays ignored.
func handleSignals() {
	var sigs []os.Signal
	for s := range exitStatus {
		if !signal.Ignored(s) {
			sigs = append(sigs, s)
		}
	}
	if len(sigs) == 0 {
		return
	}
	ch := make(chan os.Signal, 1)
	signal.Notify(ch, sigs...)
	go func() {
		sig := <-ch
		mu.Lock() // waits for a rename in progress; never released
		for name := range inflight {
			if err := os.Remove(name); err != nil {
				fmt.Fprintf(os.Stderr, "pasval: cannot remove the temporary %s: %v\n", name, err)
			}
		}
		signal.Reset(sigs...)
		if p, err := os.FindProcess(os.Getpid()); err == nil && p.Signal(sig) == nil {
			time.Sleep(5 * time.Second) // the signal's default action ends the process first
		}
		os.Exit(exitStatus[sig]) // where a process cannot signal itself
	}()
}
