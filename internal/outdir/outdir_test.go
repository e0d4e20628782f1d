package outdir

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"testing"
)

func TestPrepare(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := Prepare(dir, false); err != nil {
		t.Fatal(err)
	}
	if err := Prepare(dir, false); err != nil {
		t.Fatalf("empty folder refused: %v", err)
	}
	if err := os.WriteFile(filepath.Join(dir, "a.csv"), []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Prepare(dir, false); !errors.Is(err, ErrExists) {
		t.Fatalf("non-empty folder without force: %v, want ErrExists", err)
	}
	if err := Prepare(dir, true); err != nil {
		t.Fatalf("force refused: %v", err)
	}
}

func TestWriteFileAtomic(t *testing.T) {
	dir := t.TempDir()
	if err := WriteFile(dir, "a.txt", func(w io.Writer) error {
		_, err := io.WriteString(w, "complete")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	// A failing writer leaves the earlier file and no temporary behind.
	boom := errors.New("boom")
	err := WriteFile(dir, "a.txt", func(w io.Writer) error {
		io.WriteString(w, "partial")
		return boom
	})
	if !errors.Is(err, boom) {
		t.Fatalf("error %v, want boom", err)
	}
	got, _ := os.ReadFile(filepath.Join(dir, "a.txt"))
	if string(got) != "complete" {
		t.Errorf("file holds %q after a failed rewrite", got)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("%d entries left, want only a.txt", len(entries))
	}
}

func TestCheckNewFile(t *testing.T) {
	p := filepath.Join(t.TempDir(), "f.tif")
	if err := CheckNewFile(p, false); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(p, nil, 0o644)
	if err := CheckNewFile(p, false); !errors.Is(err, ErrExists) {
		t.Fatalf("got %v", err)
	}
	if err := CheckNewFile(p, true); err != nil {
		t.Fatal(err)
	}
}
