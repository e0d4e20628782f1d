package snapshot

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
)

// FrameInfo locates one frame in the file.
type FrameInfo struct {
	// Time since the start of the schedule, s.
	Time float64
	// Stage is the stage index of the frame.
	Stage int32
	// Offset is the byte offset of the frame block.
	Offset int64
	// Size is the frame block's size on disk, block header included, bytes.
	Size int64
}

// Reader reads a snapshot through an io.ReaderAt. A Reader is not safe for
// concurrent use.
type Reader struct {
	r         io.ReaderAt
	size      int64
	version   uint32
	header    Header
	headerEnd int64 // offset of the first frame block
	frames    []FrameInfo
	recovered bool
	notes     []string
	ad        *arrayDecoder
	buf       []byte // block scratch, reused
}

// NewReader reads the header and the frame index of the snapshot of size
// bytes held by r. When the footer or the index is missing or damaged it
// recovers the frames by scanning the file; Recovered and Note report it.
// Errors match ErrFormat, are *UnsupportedError, or wrap
// io.ErrUnexpectedEOF when the file ends inside its header.
func NewReader(r io.ReaderAt, size int64) (*Reader, error) {
	if size < 0 {
		return nil, fmt.Errorf("snapshot: negative file size %d", size)
	}
	sr := &Reader{r: r, size: size}
	if err := sr.readPreamble(); err != nil {
		return nil, err
	}
	if err := sr.readHeader(); err != nil {
		if sr.ad != nil {
			sr.ad.close()
		}
		return nil, err
	}
	frames, problem := sr.readIndex()
	if problem == "" {
		sr.frames = frames
	} else {
		sr.scan(problem)
	}
	return sr, nil
}

// Close releases the decoder. It does not close the underlying reader.
func (r *Reader) Close() error {
	r.ad.close()
	return nil
}

// Header returns the snapshot header. Its slices and map belong to the
// Reader and must not be modified.
func (r *Reader) Header() Header { return r.header }

// Version returns the format version of the file.
func (r *Reader) Version() int { return int(r.version) }

// Frames returns the location, time and stage of every readable frame.
func (r *Reader) Frames() []FrameInfo { return append([]FrameInfo(nil), r.frames...) }

// Recovered reports whether the frames were found by scanning the file
// because the footer or the index was missing or damaged.
func (r *Reader) Recovered() bool { return r.recovered }

// Note explains what recovery did (which frames were kept, what was
// skipped, where the file ends); it is "" when the index was used.
func (r *Reader) Note() string { return strings.Join(r.notes, "; ") }

func (r *Reader) note(format string, args ...any) {
	r.notes = append(r.notes, fmt.Sprintf(format, args...))
}

// readAt reads n bytes at off into the reused block buffer. A range beyond
// the end of the file gives io.ErrUnexpectedEOF.
func (r *Reader) readAt(off int64, n int64) ([]byte, error) {
	if off < 0 || n < 0 || off > r.size || n > r.size-off {
		return nil, io.ErrUnexpectedEOF
	}
	if int64(cap(r.buf)) < n {
		r.buf = make([]byte, n)
	}
	b := r.buf[:n]
	got, err := r.r.ReadAt(b, off)
	if got == len(b) {
		return b, nil
	}
	if err == nil || errors.Is(err, io.EOF) {
		err = io.ErrUnexpectedEOF
	}
	return nil, err
}

func (r *Reader) readPreamble() error {
	have := min(r.size, preambleSize)
	b, err := r.readAt(0, have)
	if err != nil {
		return fmt.Errorf("snapshot: reading the preamble: %w", err)
	}
	if m := min(len(b), len(Magic)); string(b[:m]) != Magic[:m] {
		return formatErr(0, "not a snapshot file (the file does not start with the snapshot magic %q)", Magic)
	}
	if have < preambleSize {
		return fmt.Errorf("snapshot: the file ends inside the preamble after %d bytes: %w", have, io.ErrUnexpectedEOF)
	}
	if binary.LittleEndian.Uint32(b[12:16]) != checksum(b[0:12]) {
		return formatErr(8, "preamble checksum mismatch (damaged version field)")
	}
	r.version = binary.LittleEndian.Uint32(b[8:12])
	switch {
	case r.version == 0:
		return formatErr(8, "format version 0 is not valid")
	case r.version > Version:
		return &UnsupportedError{Version: r.version}
	}
	return nil
}

func (r *Reader) readHeader() error {
	const at = preambleSize
	hb, err := r.readAt(at, blockHeaderSize)
	if err != nil {
		return fmt.Errorf("snapshot: the file ends inside the header block: %w", err)
	}
	h, ok := parseBlockHeader(hb)
	if !ok || h.tag != tagHeader {
		return formatErr(at, "header block is damaged (block header checksum mismatch or wrong tag)")
	}
	if h.length > uint64(r.size-at-blockHeaderSize) {
		return fmt.Errorf("snapshot: the file ends inside the header block (%d bytes needed, %d present): %w",
			h.length, r.size-at-blockHeaderSize, io.ErrUnexpectedEOF)
	}
	payload, err := r.readAt(at+blockHeaderSize, int64(h.length))
	if err != nil {
		return fmt.Errorf("snapshot: reading the header block: %w", err)
	}
	if checksum(payload) != h.payloadCRC {
		return formatErr(at, "header block is damaged (payload checksum mismatch)")
	}
	// The payload lives in r.buf, which the array decoder does not touch.
	c := &cursor{b: payload, base: at + blockHeaderSize}
	n := decodeHeaderFixed(c, &r.header)
	if c.err != nil {
		return c.err
	}
	if r.ad, err = newArrayDecoder(8 * n); err != nil {
		return fmt.Errorf("snapshot: zstd decoder: %w", err)
	}
	decodeHeaderArrays(c, &r.header, n, r.ad)
	c.end("header block")
	if c.err != nil {
		return c.err
	}
	if err := r.header.validate(); err != nil {
		return formatErr(at, "header: %v", err)
	}
	r.headerEnd = at + blockHeaderSize + int64(h.length)
	return nil
}

// readIndex reads the footer and the index; problem says why they cannot
// be used.
func (r *Reader) readIndex() (frames []FrameInfo, problem string) {
	if r.size-r.headerEnd < footerSize {
		return nil, "no footer (the writer was not closed: the run stopped or crashed)"
	}
	foot, err := r.readAt(r.size-footerSize, footerSize)
	if err != nil {
		return nil, "footer unreadable: " + err.Error()
	}
	if string(foot[16:24]) != FooterMagic {
		return nil, "no footer (the writer was not closed: the run stopped or crashed)"
	}
	if binary.LittleEndian.Uint32(foot[12:16]) != checksum(foot[0:12]) {
		return nil, "footer damaged (checksum mismatch)"
	}
	at := binary.LittleEndian.Uint64(foot[0:8])
	count := uint64(binary.LittleEndian.Uint32(foot[8:12]))
	end := uint64(r.size - footerSize)
	if at < uint64(r.headerEnd) || at > end || end-at != blockHeaderSize+4+indexEntrySize*count {
		return nil, "footer damaged (index location does not fit the file)"
	}
	b, err := r.readAt(int64(at), int64(end-at))
	if err != nil {
		return nil, "index unreadable: " + err.Error()
	}
	h, ok := parseBlockHeader(b)
	payload := b[blockHeaderSize:]
	switch {
	case !ok || h.tag != tagIndex || h.length != uint64(len(payload)):
		return nil, "index damaged (block header)"
	case checksum(payload) != h.payloadCRC:
		return nil, "index damaged (checksum mismatch)"
	case uint64(binary.LittleEndian.Uint32(payload)) != count:
		return nil, "index frame count differs from the footer's"
	}
	frames = make([]FrameInfo, count)
	next := r.headerEnd
	for i := range frames {
		e := payload[4+i*indexEntrySize:]
		f := FrameInfo{
			Offset: int64(binary.LittleEndian.Uint64(e[0:8])),
			Size:   int64(binary.LittleEndian.Uint64(e[8:16])),
			Time:   math.Float64frombits(binary.LittleEndian.Uint64(e[16:24])),
			Stage:  int32(binary.LittleEndian.Uint32(e[24:28])),
		}
		if f.Offset != next || f.Size < blockHeaderSize+frameFixedSize || f.Size > int64(at)-next || !validTime(f.Time, frames[:i]) {
			return nil, fmt.Sprintf("index entry %d does not fit the file layout", i)
		}
		frames[i] = f
		next += f.Size
	}
	if next != int64(at) {
		return nil, "index does not cover the frames up to the index block"
	}
	return frames, ""
}

// validTime reports whether t is finite and not before the last frame.
func validTime(t float64, before []FrameInfo) bool {
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return false
	}
	return len(before) == 0 || t >= before[len(before)-1].Time
}

// ReadFrame reads and checks frame i (0-based, in the order of Frames).
func (r *Reader) ReadFrame(i int) (Frame, error) {
	var f Frame
	err := r.ReadFrameInto(&f, i)
	return f, err
}

// ReadFrameInto reads frame i into dst, reusing the capacity of its slices.
func (r *Reader) ReadFrameInto(dst *Frame, i int) error {
	payload, err := r.framePayload(i)
	if err != nil {
		return err
	}
	info := r.frames[i]
	c := &cursor{b: payload, base: info.Offset + blockHeaderSize}
	c.u32("sequence number")
	t, stage := c.f64("time"), int32(c.u32("stage"))
	if c.err == nil && (math.Float64bits(t) != math.Float64bits(info.Time) || stage != info.Stage) {
		return formatErr(info.Offset, "frame %d: time %v s, stage %d differ from the index's %v s, stage %d", i, t, stage, info.Time, info.Stage)
	}
	r.decodeFrameArrays(c, dst)
	c.end("the frame")
	if c.err != nil {
		return c.err
	}
	dst.Time, dst.Stage = t, stage
	return nil
}

// CheckFrame reads frame i's block and checks its header and checksum
// without decoding the arrays: nil for an intact frame, an error matching
// ErrFormat (or an I/O error) otherwise.
func (r *Reader) CheckFrame(i int) error {
	_, err := r.framePayload(i)
	return err
}

// framePayload reads the block of frame i and returns its checked payload.
func (r *Reader) framePayload(i int) ([]byte, error) {
	if i < 0 || i >= len(r.frames) {
		return nil, fmt.Errorf("snapshot: frame %d does not exist (the snapshot holds frames 0 to %d)", i, len(r.frames)-1)
	}
	info := r.frames[i]
	b, err := r.readAt(info.Offset, info.Size)
	if err != nil {
		return nil, fmt.Errorf("snapshot: reading frame %d: %w", i, err)
	}
	h, ok := parseBlockHeader(b)
	payload := b[blockHeaderSize:]
	if !ok || h.tag != tagFrame || h.length != uint64(len(payload)) {
		return nil, formatErr(info.Offset, "frame %d is damaged (block header)", i)
	}
	if checksum(payload) != h.payloadCRC {
		return nil, formatErr(info.Offset, "frame %d is damaged (checksum mismatch)", i)
	}
	return payload, nil
}

func (r *Reader) decodeFrameArrays(c *cursor, dst *Frame) {
	n, fields := len(r.header.Elements), r.header.Fields
	c.need(len(fields)+1, uint64(n)*uint64(4*len(fields)+1), "frame arrays")
	if c.err != nil {
		return
	}
	dst.Fields = resize(dst.Fields, len(fields))
	for k, f := range fields {
		raw := r.ad.raw(c, 4*n, "field ", f.Name)
		if c.err != nil {
			return
		}
		dst.Fields[k] = resize(dst.Fields[k], n)
		unshuffleFloat32(dst.Fields[k], raw)
	}
	raw := r.ad.raw(c, n, "flags", "")
	if c.err != nil {
		return
	}
	dst.Flags = append(resize(dst.Flags, n)[:0], raw...)
}

// resize returns s with length n, reusing its capacity.
func resize[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n)
	}
	return s[:n]
}

// Search returns the index of the last frame at or before time t, s.
func (r *Reader) Search(t float64) (int, error) {
	if len(r.frames) == 0 {
		return 0, errors.New("snapshot: the snapshot holds no frames")
	}
	first, last := r.frames[0].Time, r.frames[len(r.frames)-1].Time
	if math.IsNaN(t) || t < first {
		return 0, fmt.Errorf("snapshot: no frame at or before time %v s: the snapshot holds %d frames from %v s to %v s",
			t, len(r.frames), first, last)
	}
	return sort.Search(len(r.frames), func(i int) bool { return r.frames[i].Time > t }) - 1, nil
}

// FrameAt reads the last frame at or before time t, s.
func (r *Reader) FrameAt(t float64) (Frame, error) {
	i, err := r.Search(t)
	if err != nil {
		return Frame{}, err
	}
	return r.ReadFrame(i)
}
