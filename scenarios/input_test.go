package scenarios

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"slipfront/internal/badinput"
)

// writeScenario writes the minimal scenario, with a known-fracture file
// name, into dir and returns its path.
func writeScenario(t *testing.T, dir, knownFile string) string {
	t.Helper()
	src := minimal
	if knownFile != "" {
		src = strings.Replace(minimal, "[fluids.water]", "[known_fractures]\nfile = \""+knownFile+"\"\n[fluids.water]", 1)
	}
	path := filepath.Join(dir, "s.toml")
	if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// loadWithin loads path and fails the test if that takes more than a few
// seconds (a FIFO would block an open for ever).
func loadWithin(t *testing.T, path string) error {
	t.Helper()
	done := make(chan error, 1)
	go func() {
		_, err := Load(path)
		done <- err
	}()
	select {
	case err := <-done:
		return err
	case <-time.After(10 * time.Second):
		t.Fatalf("Load(%s) blocked", path)
		return nil
	}
}

// Input files must be regular files of bounded size: devices, FIFOs,
// folders and huge files are refused before anything is read.
func TestInputFileKinds(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	huge := filepath.Join(dir, "huge.toml")
	f, err := os.Create(huge)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.Truncate(MaxInputBytes + 1); err != nil { // sparse: no disk used
		t.Fatal(err)
	}
	f.Close()
	zeroLink := filepath.Join(dir, "zero.csv")
	if err := os.Symlink("/dev/zero", zeroLink); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, path, want string
	}{
		{"device", "/dev/zero", "is not a regular file (a device)"},
		{"fifo", fifo, "is not a regular file (a named pipe)"},
		{"folder", dir, "is not a regular file (a folder)"},
		{"huge", huge, "input files may hold at most 64 MB"},
	}
	for _, tc := range tests {
		err := loadWithin(t, tc.path)
		if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want a bad-input error containing %q", tc.name, err, tc.want)
		}
	}
	for _, tc := range []struct{ name, file, want string }{
		{"known file is a symlink to a device", "zero.csv", "known_fractures.file = \"zero.csv\": cannot open: zero.csv is not a regular file (a device)"},
		{"known file is a FIFO", "pipe", "known_fractures.file = \"pipe\": cannot open: pipe is not a regular file (a named pipe)"},
	} {
		err := loadWithin(t, writeScenario(t, dir, tc.file))
		if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.want)
		}
	}
}

// A known-fracture table is checked row by row: repeated names are
// refused, and a file that is not such a table is named without repeating
// its content.
func TestKnownFractureTable(t *testing.T) {
	dir := t.TempDir()
	dup := knownCSV + "F1,10,0,2000,80,90,300,100\n"
	if err := os.WriteFile(filepath.Join(dir, "dup.csv"), []byte(dup), 0o644); err != nil {
		t.Fatal(err)
	}
	err := loadWithin(t, writeScenario(t, dir, "dup.csv"))
	if err == nil || !strings.Contains(err.Error(), `dup.csv:3: name "F1" repeats the name on line 2`) {
		t.Errorf("repeated name: error %v", err)
	}
	secret := "root:x:0:0:a line that must not be echoed\n"
	if err := os.WriteFile(filepath.Join(dir, "other.txt"), []byte(secret), 0o644); err != nil {
		t.Fatal(err)
	}
	err = loadWithin(t, writeScenario(t, dir, "other.txt"))
	if err == nil || !strings.Contains(err.Error(), "names none of the columns") || strings.Contains(err.Error(), "root:x") {
		t.Errorf("foreign file: error %v, want a message that does not repeat the file's content", err)
	}
}

// A deeply nested value gives a short error, not one that repeats it.
func TestDeepValueShortError(t *testing.T) {
	const depth = 100000
	deep := strings.Repeat("[", depth) + strings.Repeat("]", depth)
	_, err := parseText(t, strings.Replace(minimal, `x_min = "-500 m"`, "x_min = "+deep, 1))
	if err == nil {
		t.Fatal("a nested array was accepted as a length")
	}
	if n := len(err.Error()); n > 1000 {
		t.Errorf("error of %d bytes: %.200s…", n, err.Error())
	}
}
