package snapshot

import (
	"bytes"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"
)

func TestDescribe(t *testing.T) {
	b, h, _, info := smallFile(t)
	var out bytes.Buffer
	if err := Describe(&out, open(t, b)); err != nil {
		t.Fatal(err)
	}
	text := squeeze(out.String())
	for _, want := range []string{
		h.Digest, "EPSG:32614", "seed 42", "realization 3",
		"easting 612345.5 m, northing 3512345.25 m", "2600 m",
		"6 on 1 fracture", "pressure [Pa], aperture [m], slip [m]", "cluster [1]",
		`metadata notes "multi-line\nvalue"`, "frames 5, time 0 s to 240 s",
		"frame time_s stage stored_bytes check", "compression:",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("Describe output lacks %q:\n%s", want, text)
		}
	}
	if strings.Contains(text, "recovered") {
		t.Errorf("Describe of a closed file mentions recovery:\n%s", text)
	}
	// One table row per frame: index, time, stage, stored size, check.
	last := info[4]
	rows := lines(out.String())
	row := squeeze(rows[len(rows)-2])
	if want := fmt.Sprintf("4 240 2 %d ok", last.Size); row != want {
		t.Errorf("last frame row %q, want %q", row, want)
	}
	// A flipped byte inside frame 2's arrays is found by its checksum.
	damaged := bytes.Clone(b)
	damaged[info[2].Offset+info[2].Size-3] ^= 0xff
	out.Reset()
	if err := Describe(&out, open(t, damaged)); err != nil {
		t.Fatal(err)
	}
	rows = lines(squeeze(out.String()))
	if want := fmt.Sprintf("2 120 1 %d DAMAGED", info[2].Size); !slices.Contains(rows, want) {
		t.Errorf("Describe of a file with a damaged frame 2 lacks the row %q:\n%s", want, out.String())
	}
	if n := strings.Count(out.String(), "DAMAGED"); n != 1 {
		t.Errorf("%d frames marked damaged, want 1", n)
	}
	out.Reset()
	if err := Describe(&out, open(t, b[:last.Offset+10])); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(squeeze(out.String()), "recovered yes: no footer") {
		t.Errorf("Describe of a cut file does not report the recovery:\n%s", out.String())
	}
}

func lines(s string) []string { return strings.Split(strings.TrimRight(s, "\n"), "\n") }

// squeeze collapses runs of blanks to one space.
func squeeze(s string) string {
	out := lines(s)
	for i, l := range out {
		out[i] = strings.Join(strings.Fields(l), " ")
	}
	return strings.Join(out, "\n")
}

// csvHeader returns a 2-element header with the given units of pressure
// and length.
func csvHeader(pUnit, lUnit string) Header {
	return Header{
		Elements: []Element{
			{Fracture: 7, X0: -1.5, Y0: 2, X1: 0.5, Y1: 2, Height: 20, Length: 2},
			{Fracture: 8, X0: 10, Y0: -3.25, X1: 10, Y1: -1.25, Height: 20, Length: 2},
		},
		Fields: []Field{{FieldSlip, lUnit}, {FieldPressure, pUnit}, {FieldAperture, lUnit}},
	}
}

func TestWriteFrameCSV(t *testing.T) {
	// Unit conversions are exact SI prefixes (BIPM 2019, The International
	// System of Units, 9th ed., Table 7): 1 MPa = 1e6 Pa = 1e3 kPa,
	// 1 m = 1e3 mm.
	want := CSVHeader + "\n" +
		"0,7,-1.5,2,0.5,2,26,0.15,0,,2\n" +
		"1,8,10,-3.25,10,-1.25,31.5,0.4,2.5,,11\n"
	for _, tc := range []struct {
		pUnit, lUnit string
		p, e, s      [2]float32 // pressure, aperture, slip in those units
	}{
		{"Pa", "m", [2]float32{26e6, 31.5e6}, [2]float32{1.5e-4, 4e-4}, [2]float32{0, 2.5e-3}},
		{"kPa", "mm", [2]float32{26e3, 31.5e3}, [2]float32{0.15, 0.4}, [2]float32{0, 2.5}},
		{"MPa", "mm", [2]float32{26, 31.5}, [2]float32{0.15, 0.4}, [2]float32{0, 2.5}},
	} {
		h := csvHeader(tc.pUnit, tc.lUnit)
		f := Frame{
			Time:   600,
			Fields: [][]float32{tc.s[:], tc.p[:], tc.e[:]},
			Flags:  []byte{FlagSlipped, FlagSlipping | FlagSlipped | FlagStimulated},
		}
		early := Frame{Time: 0, Fields: [][]float32{{0, 0}, {0, 0}, {0, 0}}, Flags: []byte{0, 0}}
		r := open(t, encode(t, h, []Frame{early, f}, true))
		var out bytes.Buffer
		if err := WriteFrameCSV(&out, r, 700); err != nil {
			t.Fatal(err)
		}
		if out.String() != want {
			t.Errorf("units %s, %s: CSV\n%s\nwant\n%s", tc.pUnit, tc.lUnit, out.String(), want)
		}
	}
}

// A recorded Coulomb stress change fills its column in MPa (an exact SI
// prefix, as above).
func TestWriteFrameCSVCoulomb(t *testing.T) {
	h := csvHeader("Pa", "m")
	h.Fields = append(h.Fields, Field{FieldCoulombChange, "Pa"})
	f := Frame{Time: 60, Fields: [][]float32{{0, 0}, {0, 0}, {0, 0}, {-1.25e6, 3e5}}, Flags: []byte{0, 0}}
	r := open(t, encode(t, h, []Frame{f}, true))
	var out bytes.Buffer
	if err := WriteFrameCSV(&out, r, 60); err != nil {
		t.Fatal(err)
	}
	got := lines(out.String())
	if len(got) != 3 || !strings.HasSuffix(got[1], ",-1.25,0") || !strings.HasSuffix(got[2], ",0.3,0") {
		t.Errorf("CSV\n%s\nwant coulomb_change_MPa -1.25 and 0.3", out.String())
	}
}

func TestWriteFrameCSVErrors(t *testing.T) {
	frame := Frame{Time: 60, Fields: [][]float32{{0, 0}, {0, 0}, {0, 0}}, Flags: []byte{0, 0}}
	for _, tc := range []struct {
		name  string
		h     Header
		time  float64
		words string
	}{
		{"unknown unit", csvHeader("psi", "m"), 60, `unit "psi"`},
		{"missing field", func() Header {
			h := csvHeader("Pa", "m")
			h.Fields[0].Name = "shear_stress"
			return h
		}(), 60, `no "slip" field`},
		{"time before the first frame", csvHeader("Pa", "m"), 10, "from 60 s to 60 s"},
	} {
		r := open(t, encode(t, tc.h, []Frame{frame}, true))
		err := WriteFrameCSV(&bytes.Buffer{}, r, tc.time)
		if err == nil || !strings.Contains(err.Error(), tc.words) {
			t.Errorf("%s: error %v, want one saying %q", tc.name, err, tc.words)
		}
	}
}

func TestAppendFloat32Scaled(t *testing.T) {
	for _, tc := range []struct {
		v     float32
		scale float64
		want  string
	}{
		{4e-4, 1e3, "0.4"}, // float32(4e-4)·1e3 is 0.39999998989… in binary
		{26e6, 1e-6, "26"},
		{-1.5e-3, 1e3, "-1.5"},
		{123456789, 1e-6, "123.45679"}, // float32 keeps 8 digits: 1.2345679e8
		{1e-30, 1e3, "1e-27"},
		{3e38, 1e3, "3e+41"},
		{0, 1e3, "0"},
		{float32(math.NaN()), 1e3, "NaN"},
		{float32(math.Inf(-1)), 1e-6, "-Inf"},
	} {
		if got := string(appendFloat32Scaled(nil, tc.v, tc.scale)); got != tc.want {
			t.Errorf("appendFloat32Scaled(%v, %v) = %q, want %q", tc.v, tc.scale, got, tc.want)
		}
	}
	for _, tc := range []struct {
		x    float64
		want string
	}{
		{3512345.25, "3512345.25"}, {-0.125, "-0.125"}, {1e20, "1e+20"}, {0, "0"},
	} {
		if got := string(appendFloat64(nil, tc.x)); got != tc.want {
			t.Errorf("appendFloat64(%v) = %q, want %q", tc.x, got, tc.want)
		}
	}
}

// DescribeFrame shows the fields in the units of the CSV (MPa, mm; exact
// SI prefixes, BIPM 2019, Table 7) and the stage by name when the header
// records the names, by index otherwise.
func TestDescribeFrame(t *testing.T) {
	f := Frame{
		Time:  600,
		Stage: 2,
		Fields: [][]float32{
			{0, 2.5e-3},                    // slip, m
			{26e6, float32(math.NaN())},    // pressure, Pa
			{1.5e-4, float32(math.Inf(1))}, // aperture, m
		},
		Flags: []byte{FlagSlipped, FlagSlipping | FlagSlipped | FlagStimulated},
	}
	named := csvHeader("Pa", "m")
	named.Metadata = map[string]string{MetaStageNames: `["W1:1","W2:1","W1:2"]`}
	for _, tc := range []struct {
		name  string
		h     Header
		stage string
	}{
		{"no stage names", csvHeader("Pa", "m"), "stage 2"},
		{"stage names", named, "stage W1:2"},
	} {
		var out bytes.Buffer
		if err := DescribeFrame(&out, open(t, encode(t, tc.h, []Frame{f}, true)), 600); err != nil {
			t.Fatal(err)
		}
		text := squeeze(out.String())
		for _, want := range []string{
			"frame 0 of 1: time 600 s, " + tc.stage + "\n",
			"slip mm 0 2.5 1.25 0",
			"pressure MPa 26 26 26 1",
			"aperture mm 0.15 0.15 0.15 1",
			"elements flagged: slipping 1, slipped 2, open 0, stimulated 1, intact 0 (of 2)",
		} {
			if !strings.Contains(text, want) {
				t.Errorf("%s: DescribeFrame output lacks %q:\n%s", tc.name, want, text)
			}
		}
	}
}
