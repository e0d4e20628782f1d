package snapshot

import (
	"encoding/binary"
	"math"

	"github.com/klauspost/compress/zstd"
)

// arrayEncoder shuffles and compresses arrays, reusing one scratch buffer.
type arrayEncoder struct {
	enc     *zstd.Encoder
	shuffle []byte
}

func newArrayEncoder() (*arrayEncoder, error) {
	enc, err := zstd.NewWriter(nil,
		zstd.WithEncoderConcurrency(1),
		zstd.WithEncoderCRC(false), // every block has its own CRC-32C
		zstd.WithWindowSize(encoderWindow),
		zstd.WithEncoderLevel(zstd.SpeedDefault),
	)
	if err != nil {
		return nil, err
	}
	return &arrayEncoder{enc: enc}, nil
}

// scratch returns the shuffle buffer resized to n bytes.
func (a *arrayEncoder) scratch(n int) []byte {
	if cap(a.shuffle) < n {
		a.shuffle = make([]byte, n)
	}
	return a.shuffle[:n]
}

// appendRaw appends the array item (stored length, zstd data) for the
// already shuffled bytes raw.
func (a *arrayEncoder) appendRaw(dst, raw []byte) []byte {
	at := len(dst)
	dst = append(dst, 0, 0, 0, 0)
	dst = a.enc.EncodeAll(raw, dst)
	binary.LittleEndian.PutUint32(dst[at:], uint32(len(dst)-at-4))
	return dst
}

func (a *arrayEncoder) appendFloat32(dst []byte, v []float32) []byte {
	raw := a.scratch(4 * len(v))
	shuffleFloat32(raw, v)
	return a.appendRaw(dst, raw)
}

func (a *arrayEncoder) appendInt32(dst []byte, v []int32) []byte {
	raw := a.scratch(4 * len(v))
	shuffleInt32(raw, v)
	return a.appendRaw(dst, raw)
}

func (a *arrayEncoder) appendFloat64(dst []byte, v []float64) []byte {
	raw := a.scratch(8 * len(v))
	shuffleFloat64(raw, v)
	return a.appendRaw(dst, raw)
}

// arrayDecoder decompresses arrays with bounded memory, reusing one buffer.
type arrayDecoder struct {
	dec *zstd.Decoder
	buf []byte
}

// newArrayDecoder returns a decoder that refuses to produce more than
// maxArray bytes per array and windows above the writer's.
func newArrayDecoder(maxArray int) (*arrayDecoder, error) {
	limit := uint64(max(maxArray, zstd.MinWindowSize))
	dec, err := zstd.NewReader(nil,
		zstd.WithDecoderConcurrency(1),
		zstd.WithDecoderLowmem(true),
		zstd.WithDecoderMaxMemory(limit),
		zstd.WithDecoderMaxWindow(encoderWindow),
		zstd.WithDecodeAllCapLimit(true),
	)
	if err != nil {
		return nil, err
	}
	return &arrayDecoder{dec: dec}, nil
}

func (a *arrayDecoder) close() { a.dec.Close() }

// raw reads the next array item from c and decodes it to exactly size
// bytes, still shuffled. The result is valid until the next call. kind and
// name say which array it is, for errors.
func (a *arrayDecoder) raw(c *cursor, size int, kind, name string) []byte {
	start := c.off
	m := c.count("array stored size", math.MaxInt32)
	stored := c.take(m, "array")
	if c.err != nil {
		return nil
	}
	if uint64(size) > uint64(m)*maxZstdExpansion {
		c.off = start
		c.fail("%s%s: %d stored bytes cannot hold %d decoded bytes", kind, name, m, size)
		return nil
	}
	if cap(a.buf) < size {
		a.buf = make([]byte, size)
	}
	out, err := a.dec.DecodeAll(stored, a.buf[:0:size])
	if err != nil {
		c.off = start
		c.fail("%s%s: zstd: %v", kind, name, err)
		return nil
	}
	if len(out) != size {
		c.off = start
		c.fail("%s%s decodes to %d bytes, want %d", kind, name, len(out), size)
		return nil
	}
	return out
}
