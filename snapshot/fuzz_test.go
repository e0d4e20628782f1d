package snapshot

import (
	"bytes"
	"errors"
	"flag"
	"io"
	"math"
	"os"
	"path/filepath"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the snapshot files in testdata/")

// testdataFiles builds the small files committed under testdata/, which
// seed FuzzReader. recovered says whether reading them needs a scan.
func testdataFiles(t testing.TB) []struct {
	name      string
	file      []byte
	header    Header
	frames    []Frame // frames a reader must return
	recovered bool
} {
	h := testHeader(4)
	frames := testFrames(&h, 3)
	for i := range frames[1].Fields[0] {
		frames[1].Fields[0][i] = math.Float32frombits(specialFloat32[i])
	}
	closed := encode(t, h, frames, true)
	unclosed := encode(t, h, frames, false)
	r := open(t, closed)
	last := r.Frames()[2]
	cut := unclosed[:last.Offset+last.Size/2]
	empty := Header{}
	return []struct {
		name      string
		file      []byte
		header    Header
		frames    []Frame
		recovered bool
	}{
		{"small.snap", closed, h, frames, false},
		{"unclosed.snap", unclosed, h, frames, true},
		{"cut.snap", cut, h, frames[:2], true},
		{"empty.snap", encode(t, empty, nil, true), empty, nil, false},
	}
}

// TestTestdata checks that the committed files read back as built; run
// with -update to rewrite them.
func TestTestdata(t *testing.T) {
	for _, tc := range testdataFiles(t) {
		path := filepath.Join("testdata", tc.name)
		if *update {
			if err := os.WriteFile(path, tc.file, 0o644); err != nil {
				t.Fatal(err)
			}
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%v (run go test -run TestTestdata -update to create it)", err)
		}
		r := open(t, b)
		got := r.Header()
		if d := sameHeader(&got, &tc.header); d != "" {
			t.Errorf("%s: header differs: %s", tc.name, d)
		}
		if r.Recovered() != tc.recovered {
			t.Errorf("%s: Recovered() = %v, want %v", tc.name, r.Recovered(), tc.recovered)
		}
		if len(r.Frames()) != len(tc.frames) {
			t.Fatalf("%s: %d frames, want %d", tc.name, len(r.Frames()), len(tc.frames))
		}
		for i := range tc.frames {
			f, err := r.ReadFrame(i)
			if err != nil {
				t.Fatalf("%s: %v", tc.name, err)
			}
			if d := sameFrame(&f, &tc.frames[i]); d != "" {
				t.Errorf("%s: frame %d differs: %s", tc.name, i, d)
			}
		}
	}
}

// FuzzReader feeds arbitrary bytes to the reader. Whatever it accepts must
// write back through the Writer and read again unchanged.
func FuzzReader(f *testing.F) {
	paths, err := filepath.Glob(filepath.Join("testdata", "*.snap"))
	if err != nil || len(paths) == 0 {
		f.Fatalf("no seed files in testdata (%v): run go test -run TestTestdata -update", err)
	}
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		r, err := NewReader(bytes.NewReader(b), int64(len(b)))
		if err != nil {
			var u *UnsupportedError
			if !errors.Is(err, ErrFormat) && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.As(err, &u) {
				t.Fatalf("error of an unexpected kind: %v", err)
			}
			return
		}
		defer r.Close()
		var frames []Frame
		for i := range r.Frames() {
			fr, err := r.ReadFrame(i)
			if err != nil {
				if !errors.Is(err, ErrFormat) {
					t.Fatalf("frame %d: error of an unexpected kind: %v", i, err)
				}
				continue
			}
			frames = append(frames, fr)
		}
		if err := Describe(io.Discard, r); err != nil {
			t.Fatal(err)
		}
		if len(frames) > 0 {
			_ = WriteFrameCSV(io.Discard, r, frames[0].Time) // may lack fields
			if err := DescribeFrame(io.Discard, r, frames[0].Time); err != nil {
				t.Fatal(err)
			}
		}
		h := r.Header()
		again := open(t, encode(t, h, frames, true))
		h2 := again.Header()
		if d := sameHeader(&h2, &h); d != "" {
			t.Fatalf("header changed in a round trip: %s", d)
		}
		for i := range frames {
			fr, err := again.ReadFrame(i)
			if err != nil {
				t.Fatal(err)
			}
			if d := sameFrame(&fr, &frames[i]); d != "" {
				t.Fatalf("frame %d changed in a round trip: %s", i, d)
			}
		}
	})
}
