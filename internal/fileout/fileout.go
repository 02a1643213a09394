// Package fileout writes output files atomically: the bytes go to a temporary
// file in the target's folder, which is synced and renamed over the target,
// so a crash or a full disk never leaves a half-written file behind.
package fileout

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

// ErrExists is returned when the target exists and overwriting was not allowed.
var ErrExists = errors.New("file exists")

// Write writes data to path. Without force an existing path is left alone
// and an error wrapping ErrExists is returned.
func Write(path string, data []byte, force bool) error {
	if !force {
		if _, err := os.Lstat(path); err == nil {
			return fmt.Errorf("%s already exists; use --force to overwrite it: %w", path, ErrExists)
		} else if !errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("cannot check %s: %w", path, err)
		}
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("cannot write in %s: %w", dir, err)
	}
	name := tmp.Name()
	ok := false
	defer func() {
		if !ok {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if _, err := tmp.Write(data); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if err := tmp.Sync(); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if err := os.Chmod(name, 0o644); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	if !force {
		// Link fails if the target appeared meanwhile; rename would replace it.
		if err := os.Link(name, path); err != nil {
			if errors.Is(err, fs.ErrExist) {
				return fmt.Errorf("%s already exists; use --force to overwrite it: %w", path, ErrExists)
			}
			if err := os.Rename(name, path); err != nil {
				return fmt.Errorf("cannot write %s: %w", path, err)
			}
			ok = true
			return nil
		}
		os.Remove(name)
		ok = true
		return nil
	}
	if err := os.Rename(name, path); err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	ok = true
	return nil
}
