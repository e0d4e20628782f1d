package outdir

import (
	"errors"
	"os"
	"path/filepath"
	"testing"

	"slipfront/internal/badinput"
)

func writeTo(t *testing.T, dir, name, text string) {
	t.Helper()
	if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

func readFrom(t *testing.T, dir, name string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, name))
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// ours accepts the names these tests write.
func ours(name string) bool { return name == "a.csv" || name == "b.csv" || name == "run.snap" }

// A staged folder appears whole or not at all; an old folder is replaced
// only when the new one is complete, and only with force.
func TestStaged(t *testing.T) {
	root := t.TempDir()
	final := filepath.Join(root, "run")

	st, err := Begin(final, false, ours)
	if err != nil {
		t.Fatal(err)
	}
	writeTo(t, st.Dir, "a.csv", "first")
	if _, err := os.Stat(final); !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("the final folder exists before Commit (%v)", err)
	}
	if err := st.Commit(); err != nil {
		t.Fatal(err)
	}
	if got := readFrom(t, final, "a.csv"); got != "first" {
		t.Fatalf("a.csv = %q", got)
	}

	// Without force an existing output is refused as bad input.
	if _, err := Begin(final, false, ours); !errors.Is(err, ErrExists) || !errors.Is(err, badinput.Err) {
		t.Fatalf("existing folder without force: %v", err)
	}
	// With force, the old folder stays until the new one is committed.
	st, err = Begin(final, true, ours)
	if err != nil {
		t.Fatal(err)
	}
	writeTo(t, st.Dir, "b.csv", "second")
	if got := readFrom(t, final, "a.csv"); got != "first" {
		t.Fatalf("the old output changed before Commit: %q", got)
	}
	if err := st.Commit(); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(final, "a.csv")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the old folder's file survived the replacement")
	}
	if got := readFrom(t, final, "b.csv"); got != "second" {
		t.Errorf("b.csv = %q", got)
	}
	if entries, _ := os.ReadDir(root); len(entries) != 1 {
		t.Errorf("%d entries beside the output, want only the output", len(entries))
	}

	// A stopped write leaves its partial folder, which is kept unless force.
	stopped, err := Begin(filepath.Join(root, "killed"), false, ours)
	if err != nil {
		t.Fatal(err)
	}
	writeTo(t, stopped.Dir, "run.snap", "frames")
	if !IsPartial(stopped.Dir) || IsPartial(final) {
		t.Errorf("IsPartial(%s), IsPartial(%s)", stopped.Dir, final)
	}
	if _, err := Begin(filepath.Join(root, "killed"), false, ours); !errors.Is(err, ErrPartialExists) || !errors.Is(err, badinput.Err) {
		t.Fatalf("partial folder in the way without force: %v", err)
	}
	again, err := Begin(filepath.Join(root, "killed"), true, ours)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(again.Dir, "run.snap")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("force kept the stopped run's files")
	}
	if err := again.Abandon(); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(again.Dir); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("Abandon left %s", again.Dir)
	}
}

// Outputs that cannot be folders, or folders holding what we did not
// write, are bad input, also with force.
func TestStagedRefuses(t *testing.T) {
	root := t.TempDir()
	file := filepath.Join(root, "afile")
	writeTo(t, root, "afile", "x")
	home := filepath.Join(root, "home")
	if err := os.MkdirAll(filepath.Join(home, "photos"), 0o755); err != nil {
		t.Fatal(err)
	}
	writeTo(t, home, "a.csv", "ours")
	for _, tc := range []struct{ name, dir string }{{"empty name", ""}, {"a file", file}, {"a folder of other files", home}} {
		if _, err := Begin(tc.dir, true, ours); !errors.Is(err, badinput.Err) {
			t.Errorf("%s: error %v, want bad input", tc.name, err)
		}
	}
	if _, err := os.Stat(filepath.Join(home, "photos")); err != nil {
		t.Errorf("the refused folder lost its content: %v", err)
	}
}
