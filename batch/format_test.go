package batch

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"slipfront/scenarios"
)

func sampleResult() *Result {
	return &Result{
		Case: 2, Realization: 41, CaseDigest: "abc123", NetworkDigest: "net-9",
		FinalArea: 12345.5, FractureArea: 6789.25, Events: 3, MaxMagnitude: -1.25,
		PeakPressure: 41.5e6, InjectedVolume: 31.8, SeismicMoment: 2.5e11, AseismicMoment: 1.25e13, RetainedGain: 2.25,
		Interval: 300,
		Area:     []float64{0, 10.5, 200.25, 12345.5},
		Cells:    []int{3, 17, 18, 400},
		Warnings: []Warning{{Kind: "bhp_above_shmin", Message: "stage W1:1: bottom-hole pressure exceeded Shmin"},
			{Kind: "volume_not_reached", Message: "stage W2:1: pumped 10 of 30 m³"}},
	}
}

func encodeResult(t testing.TB, res *Result) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := WriteResult(&b, res); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func sameResult(a, b *Result) bool {
	x, y := *a, *b
	if math.IsNaN(x.MaxMagnitude) && math.IsNaN(y.MaxMagnitude) {
		x.MaxMagnitude, y.MaxMagnitude = 0, 0
	}
	if math.IsNaN(x.RetainedGain) && math.IsNaN(y.RetainedGain) {
		x.RetainedGain, y.RetainedGain = 0, 0
	}
	return reflect.DeepEqual(x, y)
}

func TestResultRoundTrip(t *testing.T) {
	for _, res := range []*Result{sampleResult(), func() *Result {
		r := sampleResult()
		r.Events, r.MaxMagnitude, r.Cells, r.Warnings, r.RetainedGain = 0, math.NaN(), nil, nil, math.NaN()
		return r
	}()} {
		got, err := ReadResult(bytes.NewReader(encodeResult(t, res)))
		if err != nil {
			t.Fatal(err)
		}
		if res.Cells == nil {
			res.Cells = []int{}
		}
		if res.Warnings == nil {
			res.Warnings = []Warning{}
		}
		if !sameResult(got, res) {
			t.Errorf("round trip: got %+v, want %+v", got, res)
		}
	}
}

func TestResultRejectsDamage(t *testing.T) {
	good := encodeResult(t, sampleResult())
	// Every cut is io.ErrUnexpectedEOF, including the empty file.
	for n := 0; n < len(good); n++ {
		if _, err := ReadResult(bytes.NewReader(good[:n])); !errors.Is(err, io.ErrUnexpectedEOF) {
			t.Fatalf("cut to %d of %d bytes: err = %v, want io.ErrUnexpectedEOF", n, len(good), err)
		}
	}
	damage := func(name string, edit func(b []byte) []byte, want error) {
		b := edit(bytes.Clone(good))
		_, err := ReadResult(bytes.NewReader(b))
		if !errors.Is(err, want) {
			t.Errorf("%s: err = %v, want %v", name, err, want)
		}
	}
	damage("magic", func(b []byte) []byte { b[0] = 'X'; return b }, ErrFormat)
	damage("flipped payload bit", func(b []byte) []byte { b[len(b)-5] ^= 0x10; return b }, ErrFormat)
	damage("flags", func(b []byte) []byte { b[10] = 1; return b }, ErrFormat)
	damage("trailing byte", func(b []byte) []byte { return append(b, 0) }, ErrFormat)
	damage("huge length", func(b []byte) []byte { binary.LittleEndian.PutUint64(b[12:], 1<<40); return b }, ErrFormat)
	var unsupported *UnsupportedError
	b := bytes.Clone(good)
	binary.LittleEndian.PutUint16(b[8:], ResultVersion+1)
	if _, err := ReadResult(bytes.NewReader(b)); !errors.As(err, &unsupported) || unsupported.Version != ResultVersion+1 {
		t.Errorf("version %d: err = %v, want UnsupportedError", ResultVersion+1, err)
	}
	// Versions 1 and 2 did not record warnings or moments: refused with a
	// message that says why and what to do, as a format error (a resumed
	// batch redoes them).
	for _, v := range []uint16{1, 2} {
		binary.LittleEndian.PutUint16(b[8:], v)
		var fe *FormatError
		if _, err := ReadResult(bytes.NewReader(b)); !errors.As(err, &fe) || !strings.Contains(err.Error(), "earlier slipfront") || !strings.Contains(err.Error(), "--resume") {
			t.Errorf("version %d: err = %v, want a FormatError naming the earlier program and --resume", v, err)
		}
	}
}

// Values the format does not allow are refused by the writer and, had they
// been written, by the reader.
func TestResultRejectsBadValues(t *testing.T) {
	for _, tc := range []struct {
		name string
		edit func(r *Result)
	}{
		{"negative area", func(r *Result) { r.FinalArea = -1 }},
		{"infinite pressure", func(r *Result) { r.PeakPressure = math.Inf(1) }},
		{"negative seismic moment", func(r *Result) { r.SeismicMoment = -1 }},
		{"zero retained gain", func(r *Result) { r.RetainedGain = 0 }},
		{"magnitude without events", func(r *Result) { r.Events = 0 }},
		{"events without magnitude", func(r *Result) { r.MaxMagnitude = math.NaN() }},
		{"cells out of order", func(r *Result) { r.Cells = []int{5, 3} }},
		{"repeated cell", func(r *Result) { r.Cells = []int{5, 5} }},
		{"no digest", func(r *Result) { r.CaseDigest = "" }},
		{"no interval", func(r *Result) { r.Interval = 0 }},
		{"empty curve", func(r *Result) { r.Area = nil }},
		{"warning without kind", func(r *Result) { r.Warnings[0].Kind = "" }},
		{"warning kind with a comma", func(r *Result) { r.Warnings[0].Kind = "a,b" }},
		{"warning message on two lines", func(r *Result) { r.Warnings[1].Message = "a\nb" }},
	} {
		r := sampleResult()
		tc.edit(r)
		if err := WriteResult(io.Discard, r); err == nil {
			t.Errorf("%s: written", tc.name)
		}
	}
	// A payload with an unknown key is refused.
	body := []byte(`{"case":0,"realization":0,"case_digest":"a","network_digest":"","final_area_m2":0,"fracture_area_m2":0,"events":0,"max_magnitude_mw":null,"peak_bhp_pa":0,"injected_volume_m3":0,"seismic_moment_nm":0,"aseismic_moment_nm":0,"retained_permeability_gain":null,"interval_s":1,"area_m2":[0],"cells":[],"warnings":[],"extra":1}`)
	if _, err := decodeResultJSON(body); !errors.Is(err, ErrFormat) {
		t.Errorf("unknown key: err = %v", err)
	}
	body = bytes.Replace(body, []byte(`,"extra":1`), nil, 1)
	if _, err := decodeResultJSON(body); err != nil {
		t.Errorf("the same payload without the unknown key: %v", err)
	}
	// warnings is required since version 2.
	if _, err := decodeResultJSON(bytes.Replace(body, []byte(`,"warnings":[]`), nil, 1)); !errors.Is(err, ErrFormat) {
		t.Errorf("no warnings key: err = %v", err)
	}
}

func FuzzReadResult(f *testing.F) {
	good := encodeResult(f, sampleResult())
	f.Add(good)
	f.Add(good[:30])
	noEvents := sampleResult()
	noEvents.Events, noEvents.MaxMagnitude = 0, math.NaN()
	f.Add(encodeResult(f, noEvents))
	f.Fuzz(func(t *testing.T, data []byte) {
		res, err := ReadResult(bytes.NewReader(data))
		if err != nil {
			if !errors.Is(err, ErrFormat) && !errors.Is(err, io.ErrUnexpectedEOF) {
				t.Fatalf("error neither ErrFormat nor ErrUnexpectedEOF: %v", err)
			}
			return
		}
		again, err := ReadResult(bytes.NewReader(encodeResult(t, res)))
		if err != nil || !sameResult(res, again) {
			t.Fatalf("round trip: %v\n%+v\n%+v", err, res, again)
		}
	})
}

func sampleGrid() *ProbabilityGrid {
	return &ProbabilityGrid{
		Case: 1, Label: "fluids.slickwater.viscosity=20 cP", Realizations: 3,
		Grid:  Grid{Grid: scenarios.Grid{XMin: -150, YMin: -100, CellSize: 10, Cols: 30, Rows: 20}, CRS: "EPSG:32614", OriginEasting: 5e5, OriginNorthing: 35e5},
		Cells: []CellCount{{Index: 0, Count: 3}, {Index: 31, Count: 1}, {Index: 599, Count: 2}},
	}
}

// gridManifest is a manifest whose case 1 has sampleGrid's grid, label
// and realization count: what ReadProbabilityGrid takes them from.
func gridManifest(p *ProbabilityGrid) *Manifest {
	m := &Manifest{Realizations: p.Realizations, Cases: make([]ManifestCase, p.Case+1)}
	m.Cases[p.Case] = ManifestCase{Index: p.Case, Label: p.Label, Grid: p.Grid}
	return m
}

func TestProbabilityGridRoundTrip(t *testing.T) {
	p := sampleGrid()
	var b bytes.Buffer
	if err := WriteProbabilityGrid(&b, p); err != nil {
		t.Fatal(err)
	}
	// Plain CSV: the header row first, no comment lines.
	if !strings.HasPrefix(b.String(), "col,row,x_center_m,y_center_m,stimulated_realizations,stimulation_probability\n") ||
		strings.Contains(b.String(), "#") {
		t.Errorf("not a plain CSV with the header first:\n%s", b.String())
	}
	// Cell 31 is column 1, row 1: centre (−150 + 15, −100 + 15); 1 of 3.
	if !strings.Contains(b.String(), "\n1,1,-135,-85,1,0.3333333333333333\n") {
		t.Errorf("row of cell 31 missing:\n%s", b.String())
	}
	got, err := ReadProbabilityGrid(bytes.NewReader(b.Bytes()), gridManifest(p), p.Case)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got, p) {
		t.Errorf("round trip: got %+v, want %+v", got, p)
	}
	d := got.Dense()
	if len(d) != 600 || d[0] != 1 || d[1] != 0 {
		t.Errorf("Dense: len %d, d[0] = %g, d[1] = %g; want 600, 1, 0", len(d), d[0], d[1])
	}
	// An empty CRS (undefined local frame) survives.
	p.Grid.CRS = ""
	b.Reset()
	WriteProbabilityGrid(&b, p)
	if got, err := ReadProbabilityGrid(&b, gridManifest(p), p.Case); err != nil || got.Grid.CRS != "" {
		t.Errorf("empty CRS: %v, %+v", err, got)
	}
}

func TestProbabilityGridRejects(t *testing.T) {
	var b bytes.Buffer
	p := sampleGrid()
	WriteProbabilityGrid(&b, p)
	good := b.String()
	m := gridManifest(p)
	for _, tc := range []struct{ name, old, new string }{
		{"other header", "stimulation_probability\n", "probability\n"},
		{"comment line", "col,row", "# a comment\ncol,row"},
		{"count above realizations", "0,0,-145,-95,3,1", "0,0,-145,-95,4,1.3333333333333333"},
		{"wrong probability", "0,0,-145,-95,3,1", "0,0,-145,-95,3,0.9"},
		{"wrong centre", "0,0,-145,-95,", "0,0,-140,-95,"},
		{"off the grid", "29,19,145,95,", "30,19,155,95,"},
		{"out of order", "1,1,-135,-85,1", "0,0,-145,-95,1"},
		{"short row", ",1,0.3333333333333333", ",1"},
	} {
		bad := strings.Replace(good, tc.old, tc.new, 1)
		if bad == good {
			t.Fatalf("%s: edit did not apply", tc.name)
		}
		if _, err := ReadProbabilityGrid(strings.NewReader(bad), m, p.Case); !errors.Is(err, ErrFormat) {
			t.Errorf("%s: err = %v, want ErrFormat", tc.name, err)
		}
	}
	long := strings.Replace(good, "\n1,1,", "\n"+strings.Repeat("1", maxGridLine)+",1,", 1)
	if _, err := ReadProbabilityGrid(strings.NewReader(long), m, p.Case); !errors.Is(err, ErrFormat) || !strings.Contains(err.Error(), "line 3") {
		t.Errorf("over-long line: err = %v, want ErrFormat at line 3", err)
	}
	if _, err := ReadProbabilityGrid(strings.NewReader(""), m, p.Case); !errors.Is(err, io.ErrUnexpectedEOF) {
		t.Errorf("empty file: err = %v, want io.ErrUnexpectedEOF", err)
	}
	if _, err := ReadProbabilityGrid(strings.NewReader(good), m, 2); err == nil {
		t.Error("a case the manifest does not have was read")
	}
}

func FuzzReadProbabilityGrid(f *testing.F) {
	var b bytes.Buffer
	p := sampleGrid()
	WriteProbabilityGrid(&b, p)
	m := gridManifest(p)
	f.Add(b.String())
	f.Add(b.String()[:120])
	f.Add(strings.Replace(b.String(), "\n1,1,", "\n99999999999,1,", 1))
	f.Fuzz(func(t *testing.T, text string) {
		p, err := ReadProbabilityGrid(strings.NewReader(text), m, 1)
		if err != nil {
			if !errors.Is(err, ErrFormat) && !errors.Is(err, io.ErrUnexpectedEOF) {
				t.Fatalf("unexpected error kind: %v", err)
			}
			return
		}
		var out bytes.Buffer
		if err := WriteProbabilityGrid(&out, p); err != nil {
			t.Fatalf("a grid that reads does not write: %v", err)
		}
		again, err := ReadProbabilityGrid(&out, m, 1)
		if err != nil || !reflect.DeepEqual(p, again) {
			t.Fatalf("round trip: %v\n%+v\n%+v", err, p, again)
		}
	})
}

func TestManifestReadRejects(t *testing.T) {
	out := t.TempDir()
	o := testOptions(t, out)
	o.Realizations = 1
	runBatch(t, o)
	good, err := os.ReadFile(filepath.Join(out, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := ReadManifest(bytes.NewReader(good)); err != nil {
		t.Fatalf("reading a written manifest: %v", err)
	}
	for _, tc := range []struct{ name, old, new string }{
		{"newer format", "manifest/2", "manifest/7"},
		{"older format", "manifest/2", "manifest/1"},
		{"other file", "slipfront-batch-manifest/2", "something"},
		{"reference not a value", `"reference": "1 cP"`, `"reference": "2 cP"`},
		{"no reference", `"reference": "1 cP"`, `"reference": ""`},
		{"unknown key", `"realizations"`, `"realisations"`},
		{"zero realizations", `"realizations": 1`, `"realizations": 0`},
		{"a billion realizations", `"realizations": 1`, `"realizations": 1000000000`},
		{"case label", `"label": "fluids.slickwater.viscosity=1 cP, schedule.rate=8 bbl/min"`, `"label": "x"`},
		{"bad shard", `"index": 0,
    "count": 1`, `"index": 2,
    "count": 1`},
	} {
		bad := strings.Replace(string(good), tc.old, tc.new, 1)
		if bad == string(good) {
			t.Fatalf("%s: edit did not apply", tc.name)
		}
		if _, err := ReadManifest(strings.NewReader(bad)); !errors.Is(err, ErrFormat) {
			t.Errorf("%s: err = %v, want ErrFormat", tc.name, err)
		}
	}
}

// FuzzDecodeResultJSON fuzzes the payload behind the checksum, which
// FuzzReadResult rarely reaches.
func FuzzDecodeResultJSON(f *testing.F) {
	f.Add([]byte(`{"case":0,"realization":3,"case_digest":"a","network_digest":"n","final_area_m2":5,"fracture_area_m2":2,"events":1,"max_magnitude_mw":-1.5,"peak_bhp_pa":3e7,"injected_volume_m3":30,"seismic_moment_nm":2e11,"aseismic_moment_nm":3e12,"retained_permeability_gain":1.5,"interval_s":60,"area_m2":[0,5],"cells":[1,4],"warnings":[{"kind":"bhp_above_shmin","message":"stage 1: BHP above Shmin"}]}`))
	f.Add([]byte(`{"case":0,"realization":0,"case_digest":"a","network_digest":"","final_area_m2":0,"fracture_area_m2":0,"events":0,"max_magnitude_mw":null,"peak_bhp_pa":0,"injected_volume_m3":0,"seismic_moment_nm":0,"aseismic_moment_nm":0,"retained_permeability_gain":null,"interval_s":1,"area_m2":[0],"cells":[],"warnings":[]}`))
	f.Add([]byte(`{"case":-1}`))
	f.Fuzz(func(t *testing.T, body []byte) {
		res, err := decodeResultJSON(body)
		if err != nil {
			if !errors.Is(err, ErrFormat) {
				t.Fatalf("error is not ErrFormat: %v", err)
			}
			return
		}
		again, err := ReadResult(bytes.NewReader(encodeResult(t, res)))
		if err != nil || !sameResult(res, again) {
			t.Fatalf("round trip: %v\n%+v\n%+v", err, res, again)
		}
	})
}

func FuzzReadManifest(f *testing.F) {
	out := f.TempDir()
	o := testOptions(f, out)
	o.Realizations = 1
	runBatch(f, o)
	good, err := os.ReadFile(filepath.Join(out, ManifestName))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(good)
	f.Add(bytes.Replace(good, []byte("manifest/2"), []byte("manifest/1"), 1))
	f.Add([]byte(`{"format":"slipfront-batch-manifest/2"}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		m, err := ReadManifest(bytes.NewReader(data))
		if err != nil {
			if !errors.Is(err, ErrFormat) {
				t.Fatalf("error is not ErrFormat: %v", err)
			}
			return
		}
		var b bytes.Buffer
		if err := WriteManifest(&b, m); err != nil {
			t.Fatal(err)
		}
		again, err := ReadManifest(&b)
		if err != nil || !reflect.DeepEqual(m, again) {
			t.Fatalf("round trip: %v\n%+v\n%+v", err, m, again)
		}
	})
}
