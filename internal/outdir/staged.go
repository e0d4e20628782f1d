package outdir

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"slipfront/internal/badinput"
	"slipfront/internal/plural"
)

// PartialSuffix names the sibling folder a staged output is written into
// until it is complete: a run into "out" writes "out.partial" and renames
// it to "out" at the end, so that "out" only ever holds a complete set of
// files. A process killed part way leaves "out.partial" with what it
// wrote.
const PartialSuffix = ".partial"

// ErrPartialExists is matched by the error of Begin when a partial folder
// of an earlier, stopped write is in the way and force is not set.
var ErrPartialExists = errors.New("a stopped run's partial folder exists")

// Staged is an output folder being written through its partial sibling.
type Staged struct {
	// Final is the folder the files end up in; Dir the partial folder they
	// are written into meanwhile.
	Final, Dir string
}

// Begin checks that final may be written (absent, an empty folder, or with
// force a folder that holds only files for which ours reports true: force
// replaces the whole folder, so it must not hold anything else), clears a
// partial folder left by an earlier stopped write (only with force:
// without it that is an error, so that its recovered files are not lost by
// accident) and creates the partial folder to write into. Problems with
// the user's choice of folder match badinput.Err.
func Begin(final string, force bool, ours func(name string) bool) (*Staged, error) {
	if err := Check(final, force, ours); err != nil {
		return nil, err
	}
	st := &Staged{Final: final, Dir: final + PartialSuffix}
	if err := os.RemoveAll(st.Dir); err != nil { // Check allowed it: force
		return nil, fmt.Errorf("clearing %s: %w", st.Dir, err)
	}
	if err := os.MkdirAll(st.Dir, 0o755); err != nil {
		return nil, badinput.Errorf("creating output folder: %w", err)
	}
	return st, nil
}

// Check makes the checks of Begin without touching anything.
func Check(final string, force bool, ours func(name string) bool) error {
	if final == "" {
		return badinput.Errorf("no output folder given")
	}
	info, err := os.Stat(final)
	switch {
	case err == nil && !info.IsDir():
		return badinput.Errorf("%w: %s is a file, not a folder", ErrExists, final)
	case err == nil && !force:
		if entries, rerr := os.ReadDir(final); rerr != nil || len(entries) > 0 {
			return badinput.Errorf("%w: %s holds %s; use --force to replace it (it is replaced only when the new output is complete)",
				ErrExists, final, plural.Count(len(entries), "entry", "entries"))
		}
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return badinput.Errorf("output folder %s: %w", final, err)
	case err == nil:
		if err := onlyOurs(final, ours); err != nil {
			return err
		}
	}
	partial := final + PartialSuffix
	if _, err := os.Lstat(partial); err == nil && !force {
		return badinput.Errorf("%w: %s holds the files of a stopped run (inspect or export them, or move them away); use --force to discard them",
			ErrPartialExists, partial)
	}
	return nil
}

// onlyOurs refuses a folder that holds a folder, or a file for which ours
// reports false.
func onlyOurs(dir string, ours func(string) bool) error {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return badinput.Errorf("output folder %s: %w", dir, err)
	}
	for _, e := range entries {
		if !e.Type().IsRegular() || !ours(e.Name()) {
			return badinput.Errorf("%w: %s holds %s, which slipfront did not write there; --force replaces the whole folder, so choose another one",
				ErrExists, dir, e.Name())
		}
	}
	return nil
}

// Commit puts the complete partial folder in the place of the final one:
// an existing final folder (allowed by Begin) is moved aside first and
// removed after.
func (s *Staged) Commit() error {
	old := ""
	if _, err := os.Stat(s.Final); err == nil {
		old = s.Final + ".old"
		if err := os.RemoveAll(old); err != nil {
			return fmt.Errorf("finishing %s: %w", s.Final, err)
		}
		if err := os.Rename(s.Final, old); err != nil {
			return fmt.Errorf("finishing %s: %w", s.Final, err)
		}
	}
	if err := os.Rename(s.Dir, s.Final); err != nil {
		if old != "" {
			os.Rename(old, s.Final) // put the old output back
		}
		return fmt.Errorf("finishing %s: %w", s.Final, err)
	}
	if old != "" {
		return os.RemoveAll(old)
	}
	return nil
}

// Abandon removes the partial folder: nothing in it is worth keeping (the
// input was refused before any result).
func (s *Staged) Abandon() error { return os.RemoveAll(s.Dir) }

// IsPartial reports whether dir is the partial folder of a staged output.
func IsPartial(dir string) bool {
	return filepath.Ext(filepath.Clean(dir)) == PartialSuffix
}
