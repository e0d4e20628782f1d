package snapshot

import (
	"encoding/binary"
	"errors"
	"fmt"
	"hash/crc32"
	"math"
)

// Magic numbers and the format version. See the package documentation for
// the byte layout.
const (
	// Magic opens every snapshot file.
	Magic = "\x89SFSNP\r\n"
	// FooterMagic closes every complete snapshot file.
	FooterMagic = "\x89SFEND\r\n"
	// Version is the format version this package writes and the newest it
	// reads.
	Version = 1
)

// Limits checked before any allocation while reading (and enforced while
// writing, so that every file written can be read back).
const (
	// MaxElements is the largest element count of a snapshot.
	MaxElements = 1 << 26
	// MaxFields is the largest number of frame fields, and of static
	// fields.
	MaxFields = 64
	// MaxMetadata is the largest number of metadata key/value pairs.
	MaxMetadata = 1024
	// MaxStringLen is the longest string (digest, CRS, name, unit,
	// metadata key or value), bytes.
	MaxStringLen = 1 << 20
)

// Sizes of the fixed parts of the format, bytes.
const (
	preambleSize    = 16
	blockHeaderSize = 20
	footerSize      = 24
	indexEntrySize  = 28
	// frameFixedSize is the sequence number, time and stage that open a
	// frame payload.
	frameFixedSize = 16
)

// Block tags.
const (
	tagHeader = "SHDR"
	tagFrame  = "SFRM"
	tagIndex  = "SIDX"
)

const (
	// maxZstdExpansion bounds decoded/stored size for zstd data: a block
	// holds at most 128 KiB of content and the smallest block (RLE) takes
	// 4 bytes (RFC 8878 §3.1.1.2), so 131072 / 4.
	maxZstdExpansion = 32768
	// encoderWindow is the zstd window the writer uses and the largest
	// window the reader accepts, bytes.
	encoderWindow = 8 << 20
)

// castagnoli is the CRC-32C table (Castagnoli et al. 1993; RFC 3720).
var castagnoli = crc32.MakeTable(crc32.Castagnoli)

func checksum(b []byte) uint32 { return crc32.Checksum(b, castagnoli) }

// ErrFormat is matched (errors.Is) by every error about a malformed or
// damaged snapshot.
var ErrFormat = errors.New("snapshot: malformed or damaged file")

// FormatError describes malformed or damaged snapshot data.
type FormatError struct {
	// Offset is the byte offset in the file where the problem was found.
	Offset int64
	// Problem says what is wrong.
	Problem string
}

func (e *FormatError) Error() string {
	return fmt.Sprintf("snapshot: %s (at byte offset %d)", e.Problem, e.Offset)
}

// Is reports whether target is ErrFormat.
func (e *FormatError) Is(target error) bool { return target == ErrFormat }

// UnsupportedError reports a file written in a newer format version.
type UnsupportedError struct {
	// Version is the format version found in the file.
	Version uint32
}

func (e *UnsupportedError) Error() string {
	return fmt.Sprintf("snapshot: format version %d is newer than this reader (it reads versions 1 to %d); update slipfront", e.Version, Version)
}

func formatErr(off int64, format string, args ...any) error {
	return &FormatError{Offset: off, Problem: fmt.Sprintf(format, args...)}
}

// blockHeader is the decoded fixed part of a block.
type blockHeader struct {
	tag        string
	length     uint64 // payload length, bytes
	payloadCRC uint32
}

// putBlockHeader fills dst[:blockHeaderSize] for a block with the given tag
// and payload.
func putBlockHeader(dst []byte, tag string, payload []byte) {
	copy(dst[0:4], tag)
	binary.LittleEndian.PutUint64(dst[4:12], uint64(len(payload)))
	binary.LittleEndian.PutUint32(dst[12:16], checksum(payload))
	binary.LittleEndian.PutUint32(dst[16:20], checksum(dst[0:16]))
}

// parseBlockHeader decodes b[:blockHeaderSize]; ok is false when the header
// checksum does not match or the tag is unknown.
func parseBlockHeader(b []byte) (h blockHeader, ok bool) {
	if binary.LittleEndian.Uint32(b[16:20]) != checksum(b[0:16]) {
		return h, false
	}
	h.tag = string(b[0:4])
	switch h.tag {
	case tagHeader, tagFrame, tagIndex:
	default:
		return h, false
	}
	h.length = binary.LittleEndian.Uint64(b[4:12])
	h.payloadCRC = binary.LittleEndian.Uint32(b[12:16])
	return h, true
}

// cursor reads a payload held in memory with a sticky error. base is the
// file offset of b[0], for error messages.
type cursor struct {
	b    []byte
	off  int
	base int64
	err  error
}

func (c *cursor) fail(format string, args ...any) {
	if c.err == nil {
		c.err = formatErr(c.base+int64(c.off), format, args...)
	}
}

// take returns the next n bytes, or nil after failing when fewer remain.
func (c *cursor) take(n int, what string) []byte {
	if c.err != nil {
		return nil
	}
	if n < 0 || n > len(c.b)-c.off {
		c.fail("%s needs %d bytes but the block has %d left", what, n, len(c.b)-c.off)
		return nil
	}
	p := c.b[c.off : c.off+n]
	c.off += n
	return p
}

func (c *cursor) u32(what string) uint32 {
	if p := c.take(4, what); p != nil {
		return binary.LittleEndian.Uint32(p)
	}
	return 0
}

func (c *cursor) u64(what string) uint64 {
	if p := c.take(8, what); p != nil {
		return binary.LittleEndian.Uint64(p)
	}
	return 0
}

func (c *cursor) f64(what string) float64 { return math.Float64frombits(c.u64(what)) }

// count reads a uint32 count and checks it against limit.
func (c *cursor) count(what string, limit int) int {
	at := c.off
	n := c.u32(what)
	if c.err == nil && uint64(n) > uint64(limit) {
		c.off = at
		c.fail("%s = %d exceeds the limit %d", what, n, limit)
		return 0
	}
	return int(n)
}

func (c *cursor) str(what string) string {
	n := c.count(what+" length", MaxStringLen)
	return string(c.take(n, what))
}

// end fails unless the payload was consumed exactly.
func (c *cursor) end(what string) {
	if c.err == nil && c.off != len(c.b) {
		c.fail("%d unexpected trailing bytes in %s", len(c.b)-c.off, what)
	}
}

func appendStr(dst []byte, s string) []byte {
	dst = binary.LittleEndian.AppendUint32(dst, uint32(len(s)))
	return append(dst, s...)
}

func appendF64(dst []byte, v float64) []byte {
	return binary.LittleEndian.AppendUint64(dst, math.Float64bits(v))
}

// need fails unless the rest of the payload can hold arrays (length
// prefixes included) that decode to the given total size: a guard against
// allocating for counts the file cannot back.
func (c *cursor) need(arrays int, decoded uint64, what string) {
	if c.err != nil {
		return
	}
	least := 4*uint64(arrays) + decoded/maxZstdExpansion
	if left := uint64(len(c.b) - c.off); least > left {
		c.fail("%s need at least %d more bytes but the block has %d left", what, least, left)
	}
}
