package snapshot

import (
	"bytes"
	"math"
	"math/rand/v2"
	"testing"
)

// Synthetic run used for the compression ratio and the benchmarks. The
// numbers are invented for illustration, not physics checks: a pressure
// increase dp·erfc(r / 2√(D t)) spreading from the origin (the form of the
// Carslaw & Jaeger 1959 constant-pressure solution), aperture growing
// with pressure and slip, slip only where the pressure increase passes a
// threshold, so that most of the slip array is zero.
const (
	synthElementLength = 2.0    // m
	synthPerTrace      = 50     // elements per fracture trace
	synthBox           = 2000.0 // m, side of the square the traces lie in
	synthP0            = 26e6   // initial pore pressure, Pa
	synthDP            = 10e6   // pressure increase at the well, Pa
	synthDiffusivity   = 5.0    // m²/s
	synthSlipDP        = 4e6    // pressure increase that starts slip, Pa
	synthAperture      = 1e-4   // initial aperture, m
)

// synthHeader places n elements on straight traces of synthPerTrace
// elements with random centres and strikes.
func synthHeader(n int) Header {
	rng := rand.New(rand.NewPCG(1, 2))
	h := Header{
		Digest: "synthetic", CRS: "EPSG:32614", LayerDepth: 2600,
		Fields:   []Field{{FieldPressure, "Pa"}, {FieldAperture, "m"}, {FieldSlip, "m"}},
		Elements: make([]Element, n),
	}
	var x, y, dx, dy float64
	for i := range h.Elements {
		if i%synthPerTrace == 0 {
			x, y = (rng.Float64()-0.5)*synthBox, (rng.Float64()-0.5)*synthBox
			a := rng.Float64() * math.Pi
			dx, dy = synthElementLength*math.Cos(a), synthElementLength*math.Sin(a)
		}
		h.Elements[i] = Element{
			Fracture: int32(i / synthPerTrace),
			X0:       x, Y0: y, X1: x + dx, Y1: y + dy,
			Height: 30, Length: synthElementLength,
		}
		x, y = x+dx, y+dy
	}
	return h
}

// synthFrame fills f with the synthetic state at time t, s.
func synthFrame(f *Frame, h *Header, t float64) {
	n := len(h.Elements)
	f.Time, f.Stage = t, 0
	f.Fields = resize(f.Fields, 3)
	for k := range f.Fields {
		f.Fields[k] = resize(f.Fields[k], n)
	}
	f.Flags = resize(f.Flags, n)
	front := 2 * math.Sqrt(synthDiffusivity*t)
	for i, e := range h.Elements {
		r := math.Hypot((e.X0+e.X1)/2, (e.Y0+e.Y1)/2)
		dp := synthDP * math.Erfc(r/front)
		slip := 0.0
		var flags byte
		if dp > synthSlipDP {
			slip = 2e-3 * (dp - synthSlipDP) / (synthDP - synthSlipDP)
			flags = FlagSlipped | FlagStimulated
			if dp > synthSlipDP*1.2 {
				flags |= FlagSlipping
			}
		}
		f.Fields[0][i] = float32(synthP0 + dp)
		f.Fields[1][i] = float32(synthAperture*(1+dp/synthDP) + 0.3*slip)
		f.Fields[2][i] = float32(slip)
		f.Flags[i] = flags
	}
}

// synthRatio writes frames at the given times and returns the raw frame
// array size over the stored frame size.
func synthRatio(t testing.TB, n int, times []float64) float64 {
	h := synthHeader(n)
	frames := make([]Frame, len(times))
	for i, tt := range times {
		synthFrame(&frames[i], &h, tt)
	}
	r := open(t, encode(t, h, frames, true))
	stored := int64(0)
	for _, f := range r.Frames() {
		stored += f.Size
	}
	raw := int64(len(times)) * int64(n) * (3*4 + 1)
	return float64(raw) / float64(stored)
}

// TestCompressionRatio reports the compression of the synthetic run. Each
// element takes 13 raw bytes per frame (three float32, one flags byte);
// even if pressure and aperture did not compress at all, the mostly zero
// slip and flags arrays leave at most 8 of them, so the ratio must exceed
// 13/8.
func TestCompressionRatio(t *testing.T) {
	const lowest = 13.0 / 8
	ratio := synthRatio(t, 20000, []float64{600, 1200, 1800, 2400, 3000, 3600})
	t.Logf("compression ratio of the synthetic run (20000 elements, 6 frames): %.2f", ratio)
	if ratio <= lowest {
		t.Errorf("compression ratio %.2f, want > %.3f", ratio, lowest)
	}
}

func BenchmarkWriteFrame1e4(b *testing.B) { benchmarkWriteFrame(b, 1e4) }
func BenchmarkWriteFrame1e5(b *testing.B) { benchmarkWriteFrame(b, 1e5) }
func BenchmarkReadFrame1e4(b *testing.B)  { benchmarkReadFrame(b, 1e4) }
func BenchmarkReadFrame1e5(b *testing.B)  { benchmarkReadFrame(b, 1e5) }

// countWriter counts bytes and discards them.
type countWriter struct{ n int64 }

func (c *countWriter) Write(p []byte) (int, error) { c.n += int64(len(p)); return len(p), nil }

// benchmarkWriteFrame measures WriteFrame on the synthetic state of n
// elements at 1 h; MB/s counts raw array bytes.
func benchmarkWriteFrame(b *testing.B, n int) {
	h := synthHeader(n)
	var f Frame
	synthFrame(&f, &h, 3600)
	var c countWriter
	w, err := NewWriter(&c, h)
	if err != nil {
		b.Fatal(err)
	}
	start := c.n
	b.SetBytes(int64(n) * 13)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		if err := w.WriteFrame(f); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	perFrame := float64(c.n-start) / float64(len(w.index))
	b.ReportMetric(float64(n*13)/perFrame, "ratio")
}

// benchmarkReadFrame measures ReadFrameInto of the synthetic state of n
// elements at 1 h; MB/s counts raw array bytes.
func benchmarkReadFrame(b *testing.B, n int) {
	h := synthHeader(n)
	var f Frame
	synthFrame(&f, &h, 3600)
	var buf bytes.Buffer
	w, err := NewWriter(&buf, h)
	if err != nil {
		b.Fatal(err)
	}
	if err := w.WriteFrame(f); err != nil {
		b.Fatal(err)
	}
	if err := w.Close(); err != nil {
		b.Fatal(err)
	}
	r, err := NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		b.Fatal(err)
	}
	defer r.Close()
	var got Frame
	b.SetBytes(int64(n) * 13)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		if err := r.ReadFrameInto(&got, 0); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(n*13)/float64(r.Frames()[0].Size), "ratio")
}
