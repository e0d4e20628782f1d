package batch

import (
	"bytes"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"hash/crc32"
	"io"
	"math"
	"sync"

	"github.com/klauspost/compress/zstd"
)

// Result file layout (all integers little endian):
//
//	offset  size  content
//	0       8     magic "SFBATRES"
//	8       2     format version (ResultVersion)
//	10      2     flags, 0
//	12      8     n, length of the payload in bytes
//	20      4     CRC-32C (Castagnoli) of the payload
//	24      n     payload: one zstd frame (RFC 8878) holding the UTF-8 JSON
//	              object described at resultJSON
//
// Nothing follows the payload.
const (
	resultMagic = "SFBATRES"
	// ResultVersion is the result-file format version this program writes
	// and the only one it reads: version 1 did not record warnings and
	// version 2 not the moments and retained gain, so their results are
	// refused (a resumed batch runs them again).
	ResultVersion    = 3
	resultHeaderSize = 24
	// maxResultPayload caps the compressed payload and maxResultJSON the
	// decompressed JSON, bytes.
	maxResultPayload = 256 << 20
	maxResultJSON    = 1 << 30
)

var castagnoli = crc32.MakeTable(crc32.Castagnoli)

// Result is one finished realization of one case as stored in its result
// file: the Outcome's numbers, its growth curve resampled on the case's
// time grid, and its stimulated cells. Units are SI.
type Result struct {
	// Case and Realization locate the result in the batch.
	Case, Realization int
	// CaseDigest is the digest of the case's scenario.
	CaseDigest string
	// NetworkDigest identifies the fracture network.
	NetworkDigest string
	// FinalArea (map) and FractureArea (fracture surface), m².
	FinalArea, FractureArea float64
	// Events and the largest moment magnitude (NaN when Events is 0).
	Events       int
	MaxMagnitude float64
	// PeakPressure: highest bottom-hole pressure, Pa.
	PeakPressure float64
	// InjectedVolume, m³.
	InjectedVolume float64
	// SeismicMoment and AseismicMoment, N·m.
	SeismicMoment, AseismicMoment float64
	// RetainedGain: permeability gain of the stimulated elements retained
	// at the initial pore pressure (NaN when none was stimulated).
	RetainedGain float64
	// Interval of the time grid, s; Area[k] is the stimulated area at
	// k·Interval, m².
	Interval float64
	Area     []float64
	// Cells: stimulated map cells, ascending and unique.
	Cells []int
	// Warnings of the run, in the order they arose.
	Warnings []Warning
}

// resultJSON is the payload's JSON object. Keys: case, realization,
// case_digest, network_digest, final_area_m2, fracture_area_m2, events,
// max_magnitude_mw (null when there are no events), peak_bhp_pa,
// injected_volume_m3, seismic_moment_nm, aseismic_moment_nm,
// retained_permeability_gain (null when nothing was stimulated; the three
// since version 3), interval_s, area_m2 (array), cells (array of
// integers), warnings (array of objects with kind and message; since
// version 2). All are required; unknown keys are rejected.
type resultJSON struct {
	Case           int           `json:"case"`
	Realization    int           `json:"realization"`
	CaseDigest     string        `json:"case_digest"`
	NetworkDigest  string        `json:"network_digest"`
	FinalArea      float64       `json:"final_area_m2"`
	FractureArea   float64       `json:"fracture_area_m2"`
	Events         int           `json:"events"`
	MaxMagnitude   *float64      `json:"max_magnitude_mw"`
	PeakPressure   float64       `json:"peak_bhp_pa"`
	InjectedVolume float64       `json:"injected_volume_m3"`
	SeismicMoment  float64       `json:"seismic_moment_nm"`
	AseismicMoment float64       `json:"aseismic_moment_nm"`
	RetainedGain   *float64      `json:"retained_permeability_gain"`
	Interval       float64       `json:"interval_s"`
	Area           []float64     `json:"area_m2"`
	Cells          []int         `json:"cells"`
	Warnings       []warningJSON `json:"warnings"`
}

type warningJSON struct {
	Kind    string `json:"kind"`
	Message string `json:"message"`
}

// The encoder and decoder are safe for concurrent EncodeAll/DecodeAll.
var (
	zstdOnce    sync.Once
	zstdEncoder *zstd.Encoder
	zstdDecoder *zstd.Decoder
)

func zstdCodec() (*zstd.Encoder, *zstd.Decoder) {
	zstdOnce.Do(func() {
		var err error
		zstdEncoder, err = zstd.NewWriter(nil, zstd.WithEncoderConcurrency(1), zstd.WithEncoderCRC(true))
		if err != nil {
			panic("batch: zstd encoder: " + err.Error())
		}
		zstdDecoder, err = zstd.NewReader(nil, zstd.WithDecoderConcurrency(1),
			zstd.WithDecoderMaxMemory(maxResultJSON), zstd.WithDecoderMaxWindow(64<<20))
		if err != nil {
			panic("batch: zstd decoder: " + err.Error())
		}
	})
	return zstdEncoder, zstdDecoder
}

// WriteResult writes res in the result-file format. It fails on a result
// that ReadResult would reject.
func WriteResult(w io.Writer, res *Result) error {
	if err := res.check(); err != nil {
		return fmt.Errorf("batch: writing result: %w", err)
	}
	j := resultJSON{
		Case: res.Case, Realization: res.Realization, CaseDigest: res.CaseDigest,
		NetworkDigest: res.NetworkDigest, FinalArea: res.FinalArea, FractureArea: res.FractureArea,
		Events: res.Events, PeakPressure: res.PeakPressure, InjectedVolume: res.InjectedVolume,
		SeismicMoment: res.SeismicMoment, AseismicMoment: res.AseismicMoment,
		Interval: res.Interval, Area: res.Area, Cells: res.Cells,
	}
	if !math.IsNaN(res.RetainedGain) {
		g := res.RetainedGain
		j.RetainedGain = &g
	}
	if j.Area == nil {
		j.Area = []float64{}
	}
	if j.Cells == nil {
		j.Cells = []int{}
	}
	j.Warnings = make([]warningJSON, len(res.Warnings))
	for i, w := range res.Warnings {
		j.Warnings[i] = warningJSON{Kind: w.Kind, Message: w.Message}
	}
	if !math.IsNaN(res.MaxMagnitude) {
		m := res.MaxMagnitude
		j.MaxMagnitude = &m
	}
	body, err := json.Marshal(j)
	if err != nil {
		return fmt.Errorf("batch: writing result: %w", err)
	}
	enc, _ := zstdCodec()
	payload := enc.EncodeAll(body, nil)
	var head [resultHeaderSize]byte
	copy(head[:], resultMagic)
	binary.LittleEndian.PutUint16(head[8:], ResultVersion)
	binary.LittleEndian.PutUint64(head[12:], uint64(len(payload)))
	binary.LittleEndian.PutUint32(head[20:], crc32.Checksum(payload, castagnoli))
	if _, err := w.Write(head[:]); err != nil {
		return err
	}
	_, err = w.Write(payload)
	return err
}

// ReadResult reads one result file. A file cut short returns an error
// wrapping io.ErrUnexpectedEOF; anything else malformed (wrong magic,
// checksum, compressed data, JSON, or values) returns an error matching
// ErrFormat. It never panics.
func ReadResult(r io.Reader) (*Result, error) {
	const what = "result file"
	var head [resultHeaderSize]byte
	if _, err := io.ReadFull(r, head[:]); err != nil {
		if errors.Is(err, io.EOF) {
			err = io.ErrUnexpectedEOF
		}
		return nil, fmt.Errorf("batch: %s header: %w", what, err)
	}
	if string(head[:8]) != resultMagic {
		return nil, &FormatError{What: what, Offset: 0, Msg: fmt.Sprintf("magic %q: not a slipfront batch result", head[:8])}
	}
	switch v := binary.LittleEndian.Uint16(head[8:]); {
	case v > ResultVersion:
		return nil, &UnsupportedError{What: what, Version: int(v), Max: ResultVersion}
	case v == 1 || v == 2:
		return nil, &FormatError{What: what, Offset: 8, Msg: fmt.Sprintf("format version %d, written by an earlier slipfront, does not record all of the run's results and is no longer read: run the realization again (batch --resume does)", v)}
	case v != ResultVersion:
		return nil, &FormatError{What: what, Offset: 8, Msg: fmt.Sprintf("version %d is not valid", v)}
	}
	if f := binary.LittleEndian.Uint16(head[10:]); f != 0 {
		return nil, &FormatError{What: what, Offset: 10, Msg: fmt.Sprintf("flags %#x: must be 0", f)}
	}
	n := binary.LittleEndian.Uint64(head[12:])
	if n > maxResultPayload {
		return nil, &FormatError{What: what, Offset: 12, Msg: fmt.Sprintf("payload length %d exceeds %d", n, maxResultPayload)}
	}
	var payload bytes.Buffer
	if got, err := io.CopyN(&payload, r, int64(n)); err != nil {
		if errors.Is(err, io.EOF) {
			err = io.ErrUnexpectedEOF
		}
		return nil, fmt.Errorf("batch: %s payload: %d of %d bytes: %w", what, got, n, err)
	}
	var extra [1]byte
	if k, _ := io.ReadFull(r, extra[:]); k > 0 {
		return nil, &FormatError{What: what, Offset: resultHeaderSize + int64(n), Msg: "data after the payload"}
	}
	if sum := crc32.Checksum(payload.Bytes(), castagnoli); sum != binary.LittleEndian.Uint32(head[20:]) {
		return nil, &FormatError{What: what, Offset: 20, Msg: fmt.Sprintf("checksum %08x does not match the payload's %08x: the file is damaged", binary.LittleEndian.Uint32(head[20:]), sum)}
	}
	_, dec := zstdCodec()
	body, err := dec.DecodeAll(payload.Bytes(), nil)
	if err != nil {
		return nil, &FormatError{What: what, Offset: resultHeaderSize, Msg: "zstd payload: " + err.Error()}
	}
	return decodeResultJSON(body)
}

func decodeResultJSON(body []byte) (*Result, error) {
	const what = "result file"
	d := json.NewDecoder(bytes.NewReader(body))
	d.DisallowUnknownFields()
	var j resultJSON
	if err := d.Decode(&j); err != nil {
		return nil, &FormatError{What: what, Offset: -1, Msg: "JSON payload: " + err.Error()}
	}
	if d.More() {
		return nil, &FormatError{What: what, Offset: -1, Msg: "JSON payload: data after the object"}
	}
	if j.Area == nil || j.Cells == nil || j.Warnings == nil || j.CaseDigest == "" {
		return nil, &FormatError{What: what, Offset: -1, Msg: "JSON payload: case_digest, area_m2, cells and warnings are required"}
	}
	res := &Result{
		Case: j.Case, Realization: j.Realization, CaseDigest: j.CaseDigest,
		NetworkDigest: j.NetworkDigest, FinalArea: j.FinalArea, FractureArea: j.FractureArea,
		Events: j.Events, MaxMagnitude: math.NaN(), PeakPressure: j.PeakPressure,
		InjectedVolume: j.InjectedVolume, SeismicMoment: j.SeismicMoment, AseismicMoment: j.AseismicMoment,
		RetainedGain: math.NaN(), Interval: j.Interval, Area: j.Area, Cells: j.Cells,
		Warnings: make([]Warning, len(j.Warnings)),
	}
	for i, w := range j.Warnings {
		res.Warnings[i] = Warning{Kind: w.Kind, Message: w.Message}
	}
	if j.MaxMagnitude != nil {
		res.MaxMagnitude = *j.MaxMagnitude
	}
	if j.RetainedGain != nil {
		res.RetainedGain = *j.RetainedGain
	}
	if err := res.check(); err != nil {
		return nil, &FormatError{What: what, Offset: -1, Msg: err.Error()}
	}
	return res, nil
}

// check reports the first value that the format does not allow.
func (res *Result) check() error {
	o := Outcome{
		FinalArea: res.FinalArea, FractureArea: res.FractureArea, Events: res.Events,
		MaxMagnitude: res.MaxMagnitude, PeakPressure: res.PeakPressure, InjectedVolume: res.InjectedVolume,
		SeismicMoment: res.SeismicMoment, AseismicMoment: res.AseismicMoment, RetainedGain: res.RetainedGain,
		Times: make([]float64, len(res.Area)), Areas: res.Area, Warnings: res.Warnings,
	}
	switch {
	case res.Case < 0 || res.Realization < 0:
		return fmt.Errorf("case %d, realization %d: must be ≥ 0", res.Case, res.Realization)
	case res.CaseDigest == "":
		return fmt.Errorf("no case digest")
	case !(res.Interval > 0) || !finite(res.Interval):
		return fmt.Errorf("interval %g s: must be > 0", res.Interval)
	}
	if err := o.check(math.MaxInt); err != nil {
		return err
	}
	for i, c := range res.Cells {
		if c < 0 || i > 0 && c <= res.Cells[i-1] {
			return fmt.Errorf("cells[%d] = %d: cells must be ≥ 0, ascending and unique", i, c)
		}
	}
	return nil
}

// matches reports whether a result read from a file is the one expected
// at (c, r) of a batch whose case has the given digest, grid and time
// grid.
func (res *Result) matches(c, r int, mc *ManifestCase) error {
	switch {
	case res.Case != c || res.Realization != r:
		return fmt.Errorf("holds case %d realization %d, expected case %d realization %d", res.Case, res.Realization, c, r)
	case res.CaseDigest != mc.Digest:
		return fmt.Errorf("case digest %s, expected %s", res.CaseDigest, mc.Digest)
	case res.Interval != mc.TimeGrid.Interval || len(res.Area) != mc.TimeGrid.Points:
		return fmt.Errorf("time grid of %d points %g s apart, expected %d points %g s apart",
			len(res.Area), res.Interval, mc.TimeGrid.Points, mc.TimeGrid.Interval)
	case len(res.Cells) > 0 && res.Cells[len(res.Cells)-1] >= mc.Grid.Cells():
		return fmt.Errorf("cell %d outside the map grid of %d cells", res.Cells[len(res.Cells)-1], mc.Grid.Cells())
	}
	return nil
}
