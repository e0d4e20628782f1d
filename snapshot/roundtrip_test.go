package snapshot

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"math"
	"strings"
	"testing"
)

// specialFloat32 lists bit patterns a round trip must keep exactly
// (IEEE 754-2008 binary32 encodings).
var specialFloat32 = []uint32{
	0x7fc00000, // quiet NaN
	0x7fc00001, // quiet NaN with a payload
	0x7f800001, // signalling NaN
	0xffc12345, // negative NaN with a payload
	0x7f800000, // +Inf
	0xff800000, // -Inf
	0x00000001, // smallest subnormal
	0x807fffff, // largest negative subnormal
	0x00800000, // smallest normal
	0x7f7fffff, // largest finite
	0x80000000, // -0
	0x00000000, // +0
	0x3f800000, // 1
}

func TestRoundTripSpecialValues(t *testing.T) {
	h := testHeader(len(specialFloat32) * 3)
	frames := testFrames(&h, 4)
	for k := range frames[1].Fields {
		for i := range frames[1].Fields[k] {
			frames[1].Fields[k][i] = math.Float32frombits(specialFloat32[(i+k)%len(specialFloat32)])
		}
	}
	frames[2].Time = frames[1].Time // equal times are allowed
	r := open(t, encode(t, h, frames, true))
	if r.Recovered() || r.Note() != "" {
		t.Errorf("closed file: Recovered() = %v, Note() = %q; want false, \"\"", r.Recovered(), r.Note())
	}
	got := r.Header()
	if d := sameHeader(&got, &h); d != "" {
		t.Errorf("header differs: %s", d)
	}
	if len(r.Frames()) != len(frames) {
		t.Fatalf("%d frames, want %d", len(r.Frames()), len(frames))
	}
	var f Frame
	for i := range frames {
		if err := r.ReadFrameInto(&f, i); err != nil {
			t.Fatal(err)
		}
		if d := sameFrame(&f, &frames[i]); d != "" {
			t.Errorf("frame %d differs: %s", i, d)
		}
	}
}

func TestRoundTripEmpty(t *testing.T) {
	for _, tc := range []struct {
		name   string
		h      Header
		frames int
	}{
		{"no elements, no fields, no frames", Header{}, 0},
		{"no elements, two frames", Header{Fields: []Field{{"pressure", "Pa"}}}, 2},
		{"one element, no fields", Header{Elements: []Element{{Fracture: -7, X1: 1, Height: 1, Length: 1}}}, 3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			frames := testFrames(&tc.h, tc.frames)
			r := open(t, encode(t, tc.h, frames, true))
			got := r.Header()
			if d := sameHeader(&got, &tc.h); d != "" {
				t.Errorf("header differs: %s", d)
			}
			if len(r.Frames()) != tc.frames {
				t.Fatalf("%d frames, want %d", len(r.Frames()), tc.frames)
			}
			for i := range frames {
				f, err := r.ReadFrame(i)
				if err != nil {
					t.Fatal(err)
				}
				if d := sameFrame(&f, &frames[i]); d != "" {
					t.Errorf("frame %d differs: %s", i, d)
				}
			}
		})
	}
}

// TestRoundTripLargeArray covers arrays larger than the zstd window the
// writer uses (8 MiB), which zstd then splits with a window descriptor.
func TestRoundTripLargeArray(t *testing.T) {
	n := encoderWindow/4 + 1000
	h := Header{Elements: make([]Element, n), Fields: []Field{{FieldSlip, "m"}}}
	f := Frame{Time: 1, Fields: [][]float32{make([]float32, n)}, Flags: make([]byte, n)}
	for i := range n {
		f.Fields[0][i] = float32(math.Sin(float64(i) * 1e-3))
		f.Flags[i] = byte(i >> 12)
	}
	r := open(t, encode(t, h, []Frame{f}, true))
	got, err := r.ReadFrame(0)
	if err != nil {
		t.Fatal(err)
	}
	if d := sameFrame(&got, &f); d != "" {
		t.Errorf("frame differs: %s", d)
	}
}

func TestDeterministic(t *testing.T) {
	h := testHeader(200)
	frames := testFrames(&h, 3)
	a, b := encode(t, h, frames, true), encode(t, h, frames, true)
	if !bytes.Equal(a, b) {
		t.Error("two writes of the same content differ")
	}
}

func TestSearch(t *testing.T) {
	h := testHeader(5)
	frames := testFrames(&h, 4) // times 0, 60, 120, 180 s
	frames[2].Time = 60         // times 0, 60, 60, 180 s
	r := open(t, encode(t, h, frames, true))
	for _, tc := range []struct {
		t    float64
		want int // -1: error
	}{
		{-1, -1}, {math.NaN(), -1}, {0, 0}, {59.9, 0}, {60, 2}, {179, 2}, {180, 3}, {1e9, 3},
	} {
		i, err := r.Search(tc.t)
		switch {
		case tc.want < 0 && err == nil:
			t.Errorf("Search(%v) = %d, want an error", tc.t, i)
		case tc.want < 0 && !strings.Contains(err.Error(), "from 0 s to 180 s"):
			t.Errorf("Search(%v) error %q does not name the time range", tc.t, err)
		case tc.want >= 0 && (err != nil || i != tc.want):
			t.Errorf("Search(%v) = %d, %v; want %d", tc.t, i, err, tc.want)
		}
	}
	f, err := r.FrameAt(100)
	if err != nil || f.Stage != frames[2].Stage {
		t.Errorf("FrameAt(100) stage = %d, %v; want %d", f.Stage, err, frames[2].Stage)
	}
	empty := open(t, encode(t, h, nil, true))
	if _, err := empty.Search(0); err == nil {
		t.Error("Search on a snapshot without frames: no error")
	}
	if _, err := r.ReadFrame(4); err == nil {
		t.Error("ReadFrame(4) of 4 frames: no error")
	}
}

func TestWriterRejects(t *testing.T) {
	good := testHeader(4)
	headers := []struct {
		name string
		edit func(h *Header)
	}{
		{"negative realization", func(h *Header) { h.Realization = -1 }},
		{"NaN origin", func(h *Header) { h.OriginEasting = math.NaN() }},
		{"infinite depth", func(h *Header) { h.LayerDepth = math.Inf(1) }},
		{"NaN geometry", func(h *Header) { h.Elements[2].Y1 = math.NaN() }},
		{"negative height", func(h *Header) { h.Elements[1].Height = -1 }},
		{"empty field name", func(h *Header) { h.Fields[1].Name = "" }},
		{"duplicate field", func(h *Header) { h.Fields[2].Name = FieldPressure }},
		{"static named like a field", func(h *Header) { h.Static[0].Name = FieldSlip }},
		{"short static values", func(h *Header) { h.Static[0].Values = h.Static[0].Values[:2] }},
		{"empty metadata key", func(h *Header) { h.Metadata = map[string]string{"": "x"} }},
		{"control character in CRS", func(h *Header) { h.CRS = "EPSG:\n1" }},
		{"invalid UTF-8 unit", func(h *Header) { h.Fields[0].Unit = "\xff" }},
		{"too many fields", func(h *Header) { h.Fields = make([]Field, MaxFields+1) }},
		{"string too long", func(h *Header) { h.Digest = strings.Repeat("a", MaxStringLen+1) }},
	}
	for _, tc := range headers {
		h := testHeader(4)
		tc.edit(&h)
		if _, err := NewWriter(io.Discard, h); err == nil {
			t.Errorf("%s: NewWriter accepted the header", tc.name)
		}
	}
	rng := newTestRand()
	frames := []struct {
		name string
		edit func(f *Frame)
	}{
		{"missing field", func(f *Frame) { f.Fields = f.Fields[:2] }},
		{"short field", func(f *Frame) { f.Fields[1] = f.Fields[1][:3] }},
		{"long flags", func(f *Frame) { f.Flags = append(f.Flags, 0) }},
		{"NaN time", func(f *Frame) { f.Time = math.NaN() }},
		{"time going back", func(f *Frame) { f.Time = 59 }},
	}
	for _, tc := range frames {
		var buf bytes.Buffer
		w, err := NewWriter(&buf, good)
		if err != nil {
			t.Fatal(err)
		}
		if err := w.WriteFrame(testFrame(rng, &good, 60, 0)); err != nil {
			t.Fatal(err)
		}
		size := buf.Len()
		f := testFrame(rng, &good, 120, 0)
		tc.edit(&f)
		if err := w.WriteFrame(f); err == nil {
			t.Errorf("%s: WriteFrame accepted the frame", tc.name)
		}
		if buf.Len() != size {
			t.Errorf("%s: a rejected frame wrote %d bytes", tc.name, buf.Len()-size)
		}
		if err := w.Close(); err != nil {
			t.Errorf("%s: Close after a rejected frame: %v", tc.name, err)
		}
	}
}

// failingWriter accepts limit bytes, then fails.
type failingWriter struct{ limit int }

var errDiskFull = errors.New("disk full")

func (w *failingWriter) Write(p []byte) (int, error) {
	if len(p) > w.limit {
		n := w.limit
		w.limit = 0
		return n, errDiskFull
	}
	w.limit -= len(p)
	return len(p), nil
}

func TestWriterStickyError(t *testing.T) {
	h := testHeader(50)
	var probe bytes.Buffer
	w, err := NewWriter(&probe, h)
	if err != nil {
		t.Fatal(err)
	}
	fw := &failingWriter{limit: probe.Len() + 10}
	w, err = NewWriter(fw, h)
	if err != nil {
		t.Fatal(err)
	}
	f := testFrames(&h, 2)
	if err := w.WriteFrame(f[0]); !errors.Is(err, errDiskFull) {
		t.Errorf("WriteFrame on a full disk: %v, want %v", err, errDiskFull)
	}
	if err := w.WriteFrame(f[1]); !errors.Is(err, errDiskFull) {
		t.Errorf("second WriteFrame: %v, want the sticky %v", err, errDiskFull)
	}
	if err := w.Close(); !errors.Is(err, errDiskFull) {
		t.Errorf("Close: %v, want the sticky %v", err, errDiskFull)
	}
	good, err := NewWriter(io.Discard, h)
	if err != nil {
		t.Fatal(err)
	}
	if err := good.Close(); err != nil {
		t.Fatal(err)
	}
	if err := good.Close(); err == nil {
		t.Error("second Close: no error")
	}
	if err := good.WriteFrame(f[0]); err == nil {
		t.Error("WriteFrame after Close: no error")
	}
}

// syncRecorder counts Sync calls.
type syncRecorder struct {
	bytes.Buffer
	syncs int
}

func (s *syncRecorder) Sync() error { s.syncs++; return nil }

func TestSync(t *testing.T) {
	h := testHeader(3)
	var s syncRecorder
	w, err := NewWriter(&s, h)
	if err != nil {
		t.Fatal(err)
	}
	if err := w.Sync(); err != nil || s.syncs != 1 {
		t.Errorf("Sync: %v, %d calls; want nil, 1", err, s.syncs)
	}
	plain, err := NewWriter(io.Discard, h)
	if err != nil {
		t.Fatal(err)
	}
	if err := plain.Sync(); err != nil {
		t.Errorf("Sync without a Sync method: %v", err)
	}
}

// TestWriteFrameSingleWrite checks that each frame reaches the io.Writer
// in one Write call, so a crash never leaves half a frame from an
// interleaving of calls.
func TestWriteFrameSingleWrite(t *testing.T) {
	h := testHeader(300)
	var c countingWriter
	w, err := NewWriter(&c, h)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range testFrames(&h, 3) {
		before := c.calls
		if err := w.WriteFrame(f); err != nil {
			t.Fatal(err)
		}
		if c.calls != before+1 {
			t.Errorf("WriteFrame made %d Write calls, want 1", c.calls-before)
		}
	}
}

type countingWriter struct{ calls int }

func (c *countingWriter) Write(p []byte) (int, error) { c.calls++; return len(p), nil }

// TestChecksumVectors checks that the CRC in use is CRC-32C (Castagnoli)
// and not the IEEE CRC-32 of zip and PNG.
func TestChecksumVectors(t *testing.T) {
	ones := bytes.Repeat([]byte{0xff}, 32)
	for _, tc := range []struct {
		name string
		in   []byte
		want uint32
	}{
		// Check value of CRC-32C over "123456789": Cook, G., Catalogue of
		// parametrised CRC algorithms (CRC RevEng), entry CRC-32/ISCSI;
		// from memory.
		{"123456789", []byte("123456789"), 0xe3069283},
		// RFC 3720 Appendix B.4: 32 bytes of zeros give the bytes aa 36 91 8a
		// and 32 bytes of 0xff give 43 ab a8 62, little-endian as sent.
		{"32 zeros", make([]byte, 32), 0x8a9136aa},
		{"32 ones", ones, 0x62a8ab43},
	} {
		if got := checksum(tc.in); got != tc.want {
			t.Errorf("CRC-32C(%s) = %#08x, want %#08x", tc.name, got, tc.want)
		}
	}
}

func TestShuffleLayout(t *testing.T) {
	// Byte j of value i lands at j·n + i (package documentation).
	v := []float32{math.Float32frombits(0x04030201), math.Float32frombits(0x14131211)}
	raw := make([]byte, 8)
	shuffleFloat32(raw, v)
	want := []byte{0x01, 0x11, 0x02, 0x12, 0x03, 0x13, 0x04, 0x14}
	if !bytes.Equal(raw, want) {
		t.Errorf("shuffled bytes % x, want % x", raw, want)
	}
	d := []float64{math.Float64frombits(0x0807060504030201)}
	raw8 := make([]byte, 8)
	shuffleFloat64(raw8, d)
	back := make([]float64, 1)
	unshuffleFloat64(back, raw8)
	if !sameBits(back[0], d[0]) {
		t.Errorf("float64 shuffle round trip: %x, want %x", math.Float64bits(back[0]), math.Float64bits(d[0]))
	}
}

// TestLayout checks the fixed parts of a file against the byte layout in
// the package documentation.
func TestLayout(t *testing.T) {
	h := testHeader(3)
	b := encode(t, h, testFrames(&h, 2), true)
	if got, want := b[:8], []byte{0x89, 0x53, 0x46, 0x53, 0x4e, 0x50, 0x0d, 0x0a}; !bytes.Equal(got, want) {
		t.Errorf("magic % x, want % x", got, want)
	}
	if v := binary.LittleEndian.Uint32(b[8:]); v != Version {
		t.Errorf("version %d, want %d", v, Version)
	}
	if got := string(b[16:20]); got != tagHeader {
		t.Errorf("first block tag %q, want %q", got, tagHeader)
	}
	foot := b[len(b)-footerSize:]
	if got, want := foot[16:], []byte{0x89, 0x53, 0x46, 0x45, 0x4e, 0x44, 0x0d, 0x0a}; !bytes.Equal(got, want) {
		t.Errorf("end magic % x, want % x", got, want)
	}
	at := binary.LittleEndian.Uint64(foot)
	if got := string(b[at : at+4]); got != tagIndex {
		t.Errorf("footer points at tag %q, want %q", got, tagIndex)
	}
	if n := binary.LittleEndian.Uint32(foot[8:]); n != 2 {
		t.Errorf("footer frame count %d, want 2", n)
	}
	headerLen := binary.LittleEndian.Uint64(b[20:])
	first := preambleSize + blockHeaderSize + int(headerLen)
	if got := string(b[first : first+4]); got != tagFrame {
		t.Errorf("block after the header has tag %q, want %q", got, tagFrame)
	}
	if seq := binary.LittleEndian.Uint32(b[first+blockHeaderSize:]); seq != 0 {
		t.Errorf("first frame sequence number %d, want 0", seq)
	}
}
