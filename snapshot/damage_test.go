package snapshot

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"strings"
	"testing"
)

// smallFile is a closed snapshot of 6 elements and 5 frames, with the
// frames' block extents.
func smallFile(t testing.TB) (b []byte, h Header, frames []Frame, info []FrameInfo) {
	h = testHeader(6)
	frames = testFrames(&h, 5)
	b = encode(t, h, frames, true)
	r := open(t, b)
	return b, h, frames, r.Frames()
}

// checkFrames reads every frame r lists and checks that each equals one of
// want, in order; it returns how many frames read back without error.
func checkFrames(t *testing.T, r *Reader, want []Frame) int {
	t.Helper()
	j, ok := 0, 0
	for i := range r.Frames() {
		f, err := r.ReadFrame(i)
		if err != nil {
			if !errors.Is(err, ErrFormat) {
				t.Errorf("frame %d: error %v does not match ErrFormat", i, err)
			}
			continue
		}
		for j < len(want) && sameFrame(&f, &want[j]) != "" {
			j++
		}
		if j == len(want) {
			t.Fatalf("frame %d (t = %v s) read back with values that were never written", i, f.Time)
		}
		j++
		ok++
	}
	return ok
}

func TestCutEverywhere(t *testing.T) {
	b, h, frames, info := smallFile(t)
	headerEnd := info[0].Offset
	for cut := 0; cut < len(b); cut++ {
		r, err := NewReader(bytes.NewReader(b[:cut]), int64(cut))
		if cut < int(headerEnd) {
			if !errors.Is(err, io.ErrUnexpectedEOF) {
				t.Fatalf("cut at %d (inside the header): error %v, want io.ErrUnexpectedEOF", cut, err)
			}
			continue
		}
		if err != nil {
			t.Fatalf("cut at %d: %v", cut, err)
		}
		complete := 0 // frames entirely before the cut
		for _, f := range info {
			if f.Offset+f.Size <= int64(cut) {
				complete++
			}
		}
		if !r.Recovered() || r.Note() == "" {
			t.Errorf("cut at %d: Recovered() = %v, Note() = %q; want a recovery note", cut, r.Recovered(), r.Note())
		}
		if n := len(r.Frames()); n != complete {
			t.Fatalf("cut at %d: %d frames recovered, want the %d complete ones (note: %s)", cut, n, complete, r.Note())
		}
		inFrame := complete < len(info) && int64(cut) > info[complete].Offset
		if inFrame && !strings.Contains(r.Note(), "file ends inside the frame") && !strings.Contains(r.Note(), "into a block header") {
			t.Errorf("cut at %d inside frame %d: note %q does not say the file ends inside it", cut, complete, r.Note())
		}
		checkFrames(t, r, frames[:complete])
		hh := r.Header()
		if d := sameHeader(&hh, &h); d != "" {
			t.Fatalf("cut at %d: header differs: %s", cut, d)
		}
		r.Close()
	}
}

func TestNoIndexRecovery(t *testing.T) {
	b, _, frames, info := smallFile(t)
	end := info[len(info)-1].Offset + info[len(info)-1].Size
	for _, tc := range []struct {
		name  string
		file  []byte
		words string // expected in the note
	}{
		{"writer never closed", b[:end], "no footer"},
		{"footer cut", b[:len(b)-3], "no footer"},
		{"index and footer cut", b[:end+30], "no footer"},
		{"footer damaged", flip(b, len(b)-footerSize+1), "footer damaged"},
		{"index damaged", flip(b, int(end)+blockHeaderSize+5), "index damaged"},
		{"index entry inconsistent", rewriteIndexEntry(t, b, end), "index damaged"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := open(t, tc.file)
			if !r.Recovered() || !strings.Contains(r.Note(), tc.words) || !strings.Contains(r.Note(), "recovered 5 complete frames") {
				t.Errorf("Recovered() = %v, Note() = %q; want recovery of 5 frames, saying %q", r.Recovered(), r.Note(), tc.words)
			}
			if n := checkFrames(t, r, frames); n != len(frames) {
				t.Errorf("%d frames, want %d", n, len(frames))
			}
		})
	}
}

// rewriteIndexEntry returns b with the index's first entry pointing one
// byte off; the index checksum is damaged too, so recovery must scan.
func rewriteIndexEntry(t *testing.T, b []byte, indexAt int64) []byte {
	c := bytes.Clone(b)
	e := c[indexAt+blockHeaderSize+4:]
	binary.LittleEndian.PutUint64(e, binary.LittleEndian.Uint64(e)+1)
	return c
}

func flip(b []byte, i int) []byte {
	c := bytes.Clone(b)
	c[i] ^= 0x10
	return c
}

// TestDamagedFrameSkipped damages one frame's payload and, separately, one
// frame's block header, in a file without an index: recovery keeps every
// other frame and says which bytes it skipped.
func TestDamagedFrameSkipped(t *testing.T) {
	b, _, frames, info := smallFile(t)
	end := info[len(info)-1].Offset + info[len(info)-1].Size
	unclosed := b[:end] // as if the writer had crashed after the last frame
	for _, tc := range []struct {
		name  string
		at    int64
		words string
	}{
		{"payload", info[2].Offset + blockHeaderSize + 30, "checksum mismatch"},
		{"block header", info[2].Offset + 6, "damaged bytes at offsets"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r, err := NewReader(bytes.NewReader(flip(unclosed, int(tc.at))), int64(len(unclosed)))
			if err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(r.Note(), tc.words) || !strings.Contains(r.Note(), "frame sequence jumps from 2 to 3") {
				t.Errorf("note %q does not say %q and that frame 2 is lost", r.Note(), tc.words)
			}
			want := append(append([]Frame(nil), frames[:2]...), frames[3:]...)
			if n := checkFrames(t, r, want); n != 4 {
				t.Errorf("%d frames recovered, want 4", n)
			}
		})
	}
	// With the index intact, the damaged frame is reported when read.
	r := open(t, flip(b, int(info[2].Offset+blockHeaderSize+30)))
	if _, err := r.ReadFrame(2); !errors.Is(err, ErrFormat) || !strings.Contains(err.Error(), "checksum") {
		t.Errorf("ReadFrame of a damaged frame: %v, want a checksum ErrFormat", err)
	}
	if _, err := r.ReadFrame(3); err != nil {
		t.Errorf("ReadFrame of the next, intact frame: %v", err)
	}
}

// TestFlipEveryBit flips each bit of a small file in turn, with and
// without its index. Every damaged file must give an error, or a recovery,
// or frames that read back exactly as written: never a panic and never
// wrong values.
func TestFlipEveryBit(t *testing.T) {
	b, h, frames, info := smallFile(t)
	last := info[len(info)-1]
	for _, file := range [][]byte{b, b[:last.Offset+last.Size]} {
		c := bytes.Clone(file)
		for i := range c {
			for bit := range 8 {
				c[i] ^= 1 << bit
				flipped(t, c, &h, frames, i, bit)
				c[i] ^= 1 << bit
			}
		}
	}
}

func flipped(t *testing.T, c []byte, h *Header, frames []Frame, i, bit int) {
	r, err := NewReader(bytes.NewReader(c), int64(len(c)))
	if err != nil {
		var unsupported *UnsupportedError
		if !errors.Is(err, ErrFormat) && !errors.As(err, &unsupported) {
			t.Fatalf("byte %d bit %d: error %v is neither ErrFormat nor UnsupportedError", i, bit, err)
		}
		return
	}
	defer r.Close()
	hh := r.Header()
	if d := sameHeader(&hh, h); d != "" {
		t.Fatalf("byte %d bit %d: header accepted with a different %s", i, bit, d)
	}
	if n := checkFrames(t, r, frames); n < len(frames)-1 {
		t.Errorf("byte %d bit %d: only %d of %d frames left after one flipped bit (note: %s)", i, bit, n, len(frames), r.Note())
	}
}

func TestNotASnapshot(t *testing.T) {
	b, _, _, _ := smallFile(t)
	newer := bytes.Clone(b)
	binary.LittleEndian.PutUint32(newer[8:], Version+1)
	binary.LittleEndian.PutUint32(newer[12:], checksum(newer[:12]))
	for _, tc := range []struct {
		name string
		file []byte
		is   func(error) bool
	}{
		{"empty", nil, func(err error) bool { return errors.Is(err, io.ErrUnexpectedEOF) }},
		{"magic only", []byte(Magic[:5]), func(err error) bool { return errors.Is(err, io.ErrUnexpectedEOF) }},
		{"text file", []byte("time_s,stage\n0,1\n"), func(err error) bool { return errors.Is(err, ErrFormat) }},
		{"newer version", newer, func(err error) bool {
			var u *UnsupportedError
			return errors.As(err, &u) && u.Version == Version+1
		}},
	} {
		_, err := NewReader(bytes.NewReader(tc.file), int64(len(tc.file)))
		if err == nil || !tc.is(err) {
			t.Errorf("%s: error %v is not the expected kind", tc.name, err)
		}
	}
}

// TestCountsBoundedByFileSize checks that a header claiming many elements
// in a small file is refused before anything that size is allocated.
func TestCountsBoundedByFileSize(t *testing.T) {
	h := Header{Elements: make([]Element, 3)}
	b := encode(t, h, nil, false)
	// The element count follows digest, seed, realization, CRS, origin,
	// depth and the metadata count (package documentation).
	at := preambleSize + blockHeaderSize + 4 + 8 + 8 + 4 + 3*8 + 4
	if got := binary.LittleEndian.Uint32(b[at:]); got != 3 {
		t.Fatalf("element count at offset %d reads %d, want 3", at, got)
	}
	binary.LittleEndian.PutUint32(b[at:], MaxElements)
	putBlockHeader(b[preambleSize:], tagHeader, b[preambleSize+blockHeaderSize:])
	_, err := NewReader(bytes.NewReader(b), int64(len(b)))
	if !errors.Is(err, ErrFormat) || !strings.Contains(err.Error(), "need at least") {
		t.Errorf("huge element count in a small file: %v, want an ErrFormat saying more bytes are needed", err)
	}
	binary.LittleEndian.PutUint32(b[at:], MaxElements+1)
	putBlockHeader(b[preambleSize:], tagHeader, b[preambleSize+blockHeaderSize:])
	_, err = NewReader(bytes.NewReader(b), int64(len(b)))
	if !errors.Is(err, ErrFormat) || !strings.Contains(err.Error(), "exceeds the limit") {
		t.Errorf("element count above MaxElements: %v, want an ErrFormat naming the limit", err)
	}
}
