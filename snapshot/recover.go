package snapshot

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"math"
	"slices"
)

// scan finds the frames by walking the blocks from the end of the header,
// keeping every complete frame whose checksums match. problem says why the
// index was not used.
func (r *Reader) scan(problem string) {
	r.recovered = true
	r.note("%s", problem)
	var seq uint32 // sequence number expected next
	pos := r.headerEnd
	for pos < r.size {
		if r.size-pos < blockHeaderSize {
			r.note("the file ends %d bytes into a block header at offset %d: the frame being written there was cut", r.size-pos, pos)
			break
		}
		hb, err := r.readAt(pos, blockHeaderSize)
		if err != nil {
			r.note("reading at offset %d failed: %v", pos, err)
			break
		}
		h, ok := parseBlockHeader(hb)
		if !ok || h.tag == tagHeader {
			next := r.resync(pos + 1)
			if next < 0 {
				r.note("damaged bytes from offset %d to the end of the file were skipped", pos)
				break
			}
			r.note("damaged bytes at offsets %d to %d were skipped", pos, next-1)
			pos = next
			continue
		}
		if h.tag == tagIndex {
			break // the index follows the last frame
		}
		left := uint64(r.size - pos - blockHeaderSize)
		if h.length > left {
			r.note("the file ends inside the frame at offset %d (%d of its %d bytes present): the run stopped while writing it",
				pos, left+blockHeaderSize, h.length+blockHeaderSize)
			break
		}
		info, fseq, why := r.scanFrame(pos, h)
		switch {
		case why != "":
			r.note("the frame at offset %d was skipped: %s", pos, why)
		case fseq != seq:
			r.note("frame sequence jumps from %d to %d: frames lost", seq, fseq)
			fallthrough
		default:
			r.frames = append(r.frames, info)
			seq = fseq + 1
		}
		pos += blockHeaderSize + int64(h.length)
	}
	r.notes = slices.Insert(r.notes, 1, r.recoveredSummary())
}

func (r *Reader) recoveredSummary() string {
	if len(r.frames) == 1 {
		return "recovered 1 complete frame by scanning the file"
	}
	return fmt.Sprintf("recovered %d complete frames by scanning the file", len(r.frames))
}

// scanFrame checks the frame block at pos; why is "" when it is usable.
func (r *Reader) scanFrame(pos int64, h blockHeader) (info FrameInfo, seq uint32, why string) {
	payload, err := r.readAt(pos+blockHeaderSize, int64(h.length))
	switch {
	case err != nil:
		return info, 0, err.Error()
	case checksum(payload) != h.payloadCRC:
		return info, 0, "checksum mismatch (damaged data)"
	case len(payload) < frameFixedSize:
		return info, 0, "too short"
	}
	seq = binary.LittleEndian.Uint32(payload[0:4])
	info = FrameInfo{
		Time:   math.Float64frombits(binary.LittleEndian.Uint64(payload[4:12])),
		Stage:  int32(binary.LittleEndian.Uint32(payload[12:16])),
		Offset: pos,
		Size:   blockHeaderSize + int64(h.length),
	}
	if !validTime(info.Time, r.frames) {
		return info, seq, "its time is not finite or is before the previous frame's"
	}
	return info, seq, ""
}

// resync returns the offset of the next intact frame block header at or
// after from, or -1.
func (r *Reader) resync(from int64) int64 {
	const chunk = 1 << 16
	buf := make([]byte, chunk+blockHeaderSize)
	for at := from; at < r.size; at += chunk {
		n := min(int64(len(buf)), r.size-at)
		got, _ := r.r.ReadAt(buf[:n], at)
		b := buf[:got]
		for i := 0; ; {
			j := bytes.Index(b[i:], []byte(tagFrame))
			if j < 0 || i+j >= chunk {
				break
			}
			i += j
			if i+blockHeaderSize <= len(b) {
				if h, ok := parseBlockHeader(b[i:]); ok && h.tag == tagFrame {
					return at + int64(i)
				}
			}
			i++
		}
		if int64(got) < n {
			break
		}
	}
	return -1
}
