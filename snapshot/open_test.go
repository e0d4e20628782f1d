package snapshot

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"testing"
)

// Open reads a snapshot file from disk like NewReader does from memory,
// and refuses what is not a regular file.
func TestOpen(t *testing.T) {
	h := testHeader(7)
	frames := testFrames(&h, 3)
	dir := t.TempDir()
	name := filepath.Join(dir, "run.snap")
	if err := os.WriteFile(name, encode(t, h, frames, true), 0o644); err != nil {
		t.Fatal(err)
	}
	rc, err := Open(name)
	if err != nil {
		t.Fatal(err)
	}
	got := rc.Header()
	if d := sameHeader(&got, &h); d != "" {
		t.Errorf("header differs: %s", d)
	}
	if n := len(rc.Frames()); n != len(frames) {
		t.Fatalf("%d frames, want %d", n, len(frames))
	}
	for i := range frames {
		f, err := rc.ReadFrame(i)
		if err != nil {
			t.Fatal(err)
		}
		if d := sameFrame(&f, &frames[i]); d != "" {
			t.Errorf("frame %d differs: %s", i, d)
		}
	}
	if err := rc.Close(); err != nil {
		t.Errorf("Close: %v", err)
	}
	if err := rc.f.Close(); !errors.Is(err, os.ErrClosed) {
		t.Errorf("the file is still open after Close (second close gave %v)", err)
	}

	if _, err := Open(filepath.Join(dir, "missing.snap")); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("missing file: error %v, want fs.ErrNotExist", err)
	}
	if _, err := Open(dir); err == nil {
		t.Errorf("a folder opened as a snapshot")
	}
	notSnap := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(notSnap, []byte("not a snapshot at all"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Open(notSnap); !errors.Is(err, ErrFormat) {
		t.Errorf("text file: error %v, want ErrFormat", err)
	}
}
