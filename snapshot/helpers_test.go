package snapshot

import (
	"bytes"
	"math"
	"math/rand/v2"
	"testing"
)

// testHeader returns a header of n elements on fractures of 10 elements
// each, with the three standard fields, one static field and metadata.
func testHeader(n int) Header {
	rng := rand.New(rand.NewPCG(1, 2))
	h := Header{
		Digest:         "9f2c4e0b7a1d3c5e9f2c4e0b7a1d3c5e9f2c4e0b7a1d3c5e9f2c4e0b7a1d3c5e",
		Seed:           42,
		Realization:    3,
		CRS:            "EPSG:32614",
		OriginEasting:  612345.5,
		OriginNorthing: 3512345.25,
		LayerDepth:     2600,
		Metadata: map[string]string{
			"program":        "slipfront test",
			"schedule_start": "2030-01-02T03:04:05Z",
			"notes":          "multi-line\nvalue",
		},
		Fields: []Field{{FieldPressure, "Pa"}, {FieldAperture, "m"}, {FieldSlip, "m"}},
		Static: []StaticField{{Field: Field{"cluster", "1"}, Values: make([]int32, n)}},
	}
	h.Elements = make([]Element, n)
	for i := range h.Elements {
		x, y := rng.Float64()*1000-500, rng.Float64()*1000-500
		a := rng.Float64() * math.Pi
		h.Elements[i] = Element{
			Fracture: int32(i / 10),
			X0:       x, Y0: y,
			X1: x + 2*math.Cos(a), Y1: y + 2*math.Sin(a),
			Height: 30, Length: 2,
		}
		h.Static[0].Values[i] = int32(rng.IntN(7)) - 1
	}
	return h
}

// testFrame returns a frame of random values for header h.
func testFrame(rng *rand.Rand, h *Header, t float64, stage int32) Frame {
	n := len(h.Elements)
	f := Frame{Time: t, Stage: stage, Fields: make([][]float32, len(h.Fields)), Flags: make([]byte, n)}
	for k := range f.Fields {
		f.Fields[k] = make([]float32, n)
		for i := range f.Fields[k] {
			f.Fields[k][i] = float32(rng.NormFloat64() * 1e6)
		}
	}
	for i := range f.Flags {
		f.Flags[i] = byte(rng.IntN(16))
	}
	return f
}

// testFrames returns count frames 60 s apart.
func testFrames(h *Header, count int) []Frame {
	rng := rand.New(rand.NewPCG(3, 4))
	frames := make([]Frame, count)
	for i := range frames {
		frames[i] = testFrame(rng, h, 60*float64(i), int32(i/2))
	}
	return frames
}

// encode writes a snapshot to memory; closed selects whether Close is
// called (writing the index and footer).
func encode(t testing.TB, h Header, frames []Frame, closed bool) []byte {
	t.Helper()
	var buf bytes.Buffer
	w, err := NewWriter(&buf, h)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range frames {
		if err := w.WriteFrame(f); err != nil {
			t.Fatal(err)
		}
	}
	if closed {
		if err := w.Close(); err != nil {
			t.Fatal(err)
		}
	}
	return buf.Bytes()
}

func open(t testing.TB, b []byte) *Reader {
	t.Helper()
	r, err := NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { r.Close() })
	return r
}

// sameHeader reports the first difference between two headers, comparing
// floats bit for bit (a round trip must be exact), or "".
func sameHeader(got, want *Header) string {
	switch {
	case got.Digest != want.Digest || got.Seed != want.Seed || got.Realization != want.Realization || got.CRS != want.CRS:
		return "identity (digest, seed, realization, CRS)"
	case !sameBits(got.OriginEasting, want.OriginEasting) || !sameBits(got.OriginNorthing, want.OriginNorthing) ||
		!sameBits(got.LayerDepth, want.LayerDepth):
		return "origin or depth"
	case len(got.Metadata) != len(want.Metadata):
		return "metadata count"
	case len(got.Elements) != len(want.Elements):
		return "element count"
	case len(got.Fields) != len(want.Fields) || len(got.Static) != len(want.Static):
		return "field counts"
	}
	for k, v := range want.Metadata {
		if g, ok := got.Metadata[k]; !ok || g != v {
			return "metadata " + k
		}
	}
	for i, e := range want.Elements {
		g := got.Elements[i]
		if g.Fracture != e.Fracture || !sameBits(g.X0, e.X0) || !sameBits(g.Y0, e.Y0) || !sameBits(g.X1, e.X1) ||
			!sameBits(g.Y1, e.Y1) || !sameBits(g.Height, e.Height) || !sameBits(g.Length, e.Length) {
			return "element geometry"
		}
	}
	for i, f := range want.Fields {
		if got.Fields[i] != f {
			return "field " + f.Name
		}
	}
	for i, s := range want.Static {
		if got.Static[i].Field != s.Field || len(got.Static[i].Values) != len(s.Values) {
			return "static field " + s.Name
		}
		for j, v := range s.Values {
			if got.Static[i].Values[j] != v {
				return "static field values " + s.Name
			}
		}
	}
	return ""
}

// sameFrame reports the first difference between two frames, float32
// values compared bit for bit, or "".
func sameFrame(got, want *Frame) string {
	switch {
	case !sameBits(got.Time, want.Time) || got.Stage != want.Stage:
		return "time or stage"
	case len(got.Fields) != len(want.Fields):
		return "field count"
	case !bytes.Equal(got.Flags, want.Flags):
		return "flags"
	}
	for k, v := range want.Fields {
		if len(got.Fields[k]) != len(v) {
			return "field length"
		}
		for i, x := range v {
			if math.Float32bits(got.Fields[k][i]) != math.Float32bits(x) {
				return "field values"
			}
		}
	}
	return ""
}

func sameBits(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }

func newTestRand() *rand.Rand { return rand.New(rand.NewPCG(1, 2)) }
