// Package outdir writes a command's output folder safely: an existing,
// non-empty folder is used only when the caller says so (--force), and
// every file is written under a temporary name and renamed when complete,
// so a crash never leaves a half-written file under its final name.
package outdir

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"

	"slipfront/internal/badinput"
	"slipfront/internal/plural"
)

// ErrExists is matched by the error returned when an output folder holds
// files, or an output file exists, and force is not set; that error also
// matches badinput.Err.
var ErrExists = errors.New("output already exists")

// Prepare creates dir, or checks that an existing dir may be written to:
// an empty one always, a non-empty one only with force.
func Prepare(dir string, force bool) error {
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return fmt.Errorf("creating output folder: %w", err)
		}
		return nil
	case err != nil:
		return fmt.Errorf("output folder %s: %w", dir, err)
	case len(entries) > 0 && !force:
		return badinput.Errorf("%w: %s holds %s; use --force to write into it (files of the same name are replaced)", ErrExists, dir, plural.Count(len(entries), "entry", "entries"))
	}
	return nil
}

// WriteFile writes dir/name atomically: write is called with a temporary
// file in dir, which is synced and renamed to name only if write succeeds.
func WriteFile(dir, name string, write func(w io.Writer) error) error {
	tmp, err := os.CreateTemp(dir, "."+name+".tmp-*")
	if err != nil {
		return fmt.Errorf("writing %s: %w", name, err)
	}
	defer os.Remove(tmp.Name()) // no-op after a successful rename
	if err := write(tmp); err != nil {
		tmp.Close()
		return fmt.Errorf("writing %s: %w", name, err)
	}
	if err := tmp.Chmod(0o644); err != nil {
		tmp.Close()
		return fmt.Errorf("writing %s: %w", name, err)
	}
	if err := tmp.Sync(); err != nil {
		tmp.Close()
		return fmt.Errorf("writing %s: %w", name, err)
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("writing %s: %w", name, err)
	}
	return Commit(tmp.Name(), filepath.Join(dir, name))
}

// TempPath returns an unused temporary path beside final, for writers that
// need a path rather than an io.Writer (SQLite). Pass it to Commit when the
// file is complete, or remove it.
func TempPath(final string) (string, error) {
	f, err := os.CreateTemp(filepath.Dir(final), "."+filepath.Base(final)+".tmp-*")
	if err != nil {
		return "", err
	}
	name := f.Name()
	f.Close()
	return name, os.Remove(name)
}

// Commit renames a completed temporary file to its final name.
func Commit(tmp, final string) error {
	if err := os.Rename(tmp, final); err != nil {
		return fmt.Errorf("finishing %s: %w", filepath.Base(final), err)
	}
	return nil
}

// CheckNewFile returns an error when path exists and force is not set;
// for commands that write one file rather than a folder.
func CheckNewFile(path string, force bool) error {
	if _, err := os.Stat(path); err == nil && !force {
		return badinput.Errorf("%w: %s exists; use --force to replace it", ErrExists, path)
	}
	return nil
}
