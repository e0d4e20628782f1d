package snapshot

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
)

// Frame is the state of every element at one time.
type Frame struct {
	// Time since the start of the schedule, s.
	Time float64
	// Stage is the index of the stage being pumped, -1 for none.
	Stage int32
	// Fields holds one array per Header.Fields entry, in that order, each
	// with one value per element, in the field's unit.
	Fields [][]float32
	// Flags holds the state byte of each element (FlagSlipping, …).
	Flags []byte
}

// Writer writes a snapshot to an io.Writer. The snapshot starts where the
// io.Writer is when NewWriter is called; a reader needs it to start at
// offset 0 of what it reads. A Writer is not safe for concurrent use.
type Writer struct {
	w       io.Writer
	ae      *arrayEncoder
	nElem   int
	nFields int
	buf     []byte      // the block being written, reused
	index   []FrameInfo // frames written so far
	offset  int64       // bytes written so far
	err     error       // sticky write error
	closed  bool
}

var errClosed = errors.New("snapshot: writer is closed")

// NewWriter validates h and writes the preamble and the header block to w.
func NewWriter(w io.Writer, h Header) (*Writer, error) {
	if err := h.validate(); err != nil {
		return nil, fmt.Errorf("snapshot: header: %w", err)
	}
	ae, err := newArrayEncoder()
	if err != nil {
		return nil, fmt.Errorf("snapshot: zstd encoder: %w", err)
	}
	sw := &Writer{w: w, ae: ae, nElem: len(h.Elements), nFields: len(h.Fields)}
	buf := make([]byte, preambleSize+blockHeaderSize, 1<<12)
	copy(buf, Magic)
	binary.LittleEndian.PutUint32(buf[8:12], Version)
	binary.LittleEndian.PutUint32(buf[12:16], checksum(buf[0:12]))
	buf = appendHeader(buf, &h, ae)
	putBlockHeader(buf[preambleSize:], tagHeader, buf[preambleSize+blockHeaderSize:])
	sw.buf = buf
	if err := sw.write(buf, "the header", -1); err != nil {
		return nil, err
	}
	return sw, nil
}

// WriteFrame appends one frame. The frame reaches the underlying io.Writer
// in a single Write call before WriteFrame returns; call Sync to make it
// durable. Times must be finite and non-decreasing. A frame that does not
// match the header is rejected without writing anything; after a write
// error every call returns that error.
func (w *Writer) WriteFrame(f Frame) error {
	if err := w.usable(); err != nil {
		return err
	}
	if err := w.checkFrame(&f); err != nil {
		return err
	}
	buf := w.buf[:blockHeaderSize]
	buf = binary.LittleEndian.AppendUint32(buf, uint32(len(w.index)))
	buf = appendF64(buf, f.Time)
	buf = binary.LittleEndian.AppendUint32(buf, uint32(f.Stage))
	for _, v := range f.Fields {
		buf = w.ae.appendFloat32(buf, v)
	}
	buf = w.ae.appendRaw(buf, f.Flags)
	putBlockHeader(buf, tagFrame, buf[blockHeaderSize:])
	w.buf = buf
	info := FrameInfo{Time: f.Time, Stage: f.Stage, Offset: w.offset, Size: int64(len(buf))}
	if err := w.write(buf, "frame", len(w.index)); err != nil {
		return err
	}
	w.index = append(w.index, info)
	return nil
}

func (w *Writer) checkFrame(f *Frame) error {
	if len(f.Fields) != w.nFields {
		return fmt.Errorf("snapshot: frame has %d fields, the header names %d", len(f.Fields), w.nFields)
	}
	for k, v := range f.Fields {
		if len(v) != w.nElem {
			return fmt.Errorf("snapshot: frame field %d has %d values for %d elements", k, len(v), w.nElem)
		}
	}
	if len(f.Flags) != w.nElem {
		return fmt.Errorf("snapshot: frame has %d flags for %d elements", len(f.Flags), w.nElem)
	}
	if math.IsNaN(f.Time) || math.IsInf(f.Time, 0) {
		return fmt.Errorf("snapshot: frame time = %v s: must be finite", f.Time)
	}
	if n := len(w.index); n > 0 && f.Time < w.index[n-1].Time {
		return fmt.Errorf("snapshot: frame time %v s is before the previous frame's %v s: times must not decrease", f.Time, w.index[n-1].Time)
	}
	if uint64(len(w.index)) >= math.MaxUint32 {
		return fmt.Errorf("snapshot: too many frames (at most %d)", uint32(math.MaxUint32))
	}
	return nil
}

// Sync commits what was written to stable storage when the underlying
// io.Writer has a Sync method (as *os.File has); otherwise it does nothing.
func (w *Writer) Sync() error {
	if err := w.usable(); err != nil {
		return err
	}
	if s, ok := w.w.(interface{ Sync() error }); ok {
		return s.Sync()
	}
	return nil
}

// Close writes the frame index and the footer. It does not close the
// underlying io.Writer.
func (w *Writer) Close() error {
	if err := w.usable(); err != nil {
		return err
	}
	w.closed = true
	buf := w.buf[:blockHeaderSize]
	buf = binary.LittleEndian.AppendUint32(buf, uint32(len(w.index)))
	for _, e := range w.index {
		buf = binary.LittleEndian.AppendUint64(buf, uint64(e.Offset))
		buf = binary.LittleEndian.AppendUint64(buf, uint64(e.Size))
		buf = appendF64(buf, e.Time)
		buf = binary.LittleEndian.AppendUint32(buf, uint32(e.Stage))
	}
	putBlockHeader(buf, tagIndex, buf[blockHeaderSize:])
	foot := len(buf)
	buf = binary.LittleEndian.AppendUint64(buf, uint64(w.offset))
	buf = binary.LittleEndian.AppendUint32(buf, uint32(len(w.index)))
	buf = binary.LittleEndian.AppendUint32(buf, checksum(buf[foot:foot+12]))
	buf = append(buf, FooterMagic...)
	w.buf = buf
	return w.write(buf, "the index", -1)
}

func (w *Writer) usable() error {
	if w.err != nil {
		return w.err
	}
	if w.closed {
		return errClosed
	}
	return nil
}

// write hands b to the underlying writer in one call; a failure is sticky.
// what names the block, with its number when num ≥ 0.
func (w *Writer) write(b []byte, what string, num int) error {
	n, err := w.w.Write(b)
	w.offset += int64(n)
	if err == nil && n < len(b) {
		err = io.ErrShortWrite
	}
	if err != nil {
		if num >= 0 {
			what = fmt.Sprintf("%s %d", what, num)
		}
		w.err = fmt.Errorf("snapshot: writing %s: %w", what, err)
	}
	return w.err
}
