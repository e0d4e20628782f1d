package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// --force means the same for every command that writes a folder: it
// replaces an existing folder only when slipfront wrote it. A folder
// holding someone's file is refused with exit 2, and the file is kept.
func TestForceReplacesOnlyOurFolders(t *testing.T) {
	dir := t.TempDir()
	mine := filepath.Join(dir, "mine")
	notes := filepath.Join(mine, "notes.txt")
	if err := os.MkdirAll(mine, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(notes, []byte("field notes"), 0o644); err != nil {
		t.Fatal(err)
	}
	quick := []string{"--set", "numerics.element_length=40 m"}
	commands := []struct {
		name string
		args []string
		want string
	}{
		{"generate", append([]string{"generate", "single-fracture"}, quick...), "which slipfront did not write"},
		{"screen", append([]string{"screen", "single-fracture"}, quick...), "which slipfront did not write"},
		{"run", append([]string{"run", "single-fracture"}, quick...), "which slipfront did not write"},
		{"batch", append([]string{"batch", "single-fracture", "-n", "1"}, quick...), "--force replaces only a batch folder"},
		{"scenario show", []string{"scenario", "show", "zipper-pad"}, "which slipfront did not write"},
	}
	for _, tc := range commands {
		t.Run(tc.name, func(t *testing.T) {
			code, _, stderr := runCLI(t, append(tc.args, "--out", mine, "--force")...)
			if code != exitBadInput || !strings.Contains(stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want exit 2 and %q", code, stderr, tc.want)
			}
			entries, err := os.ReadDir(mine)
			if err != nil {
				t.Fatal(err)
			}
			if b, err := os.ReadFile(notes); err != nil || string(b) != "field notes" || len(entries) != 1 {
				t.Errorf("the folder changed: %d entries, notes %q (%v)", len(entries), b, err)
			}
			if _, err := os.Stat(mine + ".partial"); !os.IsNotExist(err) {
				t.Errorf("a partial folder was left behind (%v)", err)
			}
		})
	}
}
