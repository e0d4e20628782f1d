package dfn

import (
	"crypto/sha256"
	"encoding/binary"
	"math/rand/v2"
)

// Purposes of the random streams of a set (see Stream).
const (
	PurposeCount       = "count"
	PurposeSize        = "size"
	PurposeCentre      = "centre"
	PurposeOrientation = "orientation"
)

// streamDomain separates slipfront's dfn streams from any other use of the
// same hash; changing it changes every generated network.
const streamDomain = "slipfront/dfn/v1"

// StreamSeeds returns the two PCG seeds of the stream for (seed,
// realization, set, purpose): the first 16 bytes, as two little-endian
// uint64, of SHA-256(streamDomain ‖ seed ‖ realization ‖ set ‖ purpose),
// with the integers encoded as 8 little-endian bytes each.
func StreamSeeds(seed uint64, realization, set int, purpose string) (hi, lo uint64) {
	var buf [24]byte
	binary.LittleEndian.PutUint64(buf[0:], seed)
	binary.LittleEndian.PutUint64(buf[8:], uint64(int64(realization)))
	binary.LittleEndian.PutUint64(buf[16:], uint64(int64(set)))
	h := sha256.New()
	h.Write([]byte(streamDomain))
	h.Write(buf[:])
	h.Write([]byte(purpose))
	var sum [sha256.Size]byte
	h.Sum(sum[:0])
	return binary.LittleEndian.Uint64(sum[0:]), binary.LittleEndian.Uint64(sum[8:])
}

// Stream returns the random generator of one set and purpose in one
// realization. Streams for different arguments are independent for all
// practical purposes, and a stream never depends on any other.
func Stream(seed uint64, realization, set int, purpose string) *rand.Rand {
	return rand.New(newPCG(seed, realization, set, purpose))
}

func newPCG(seed uint64, realization, set int, purpose string) *rand.PCG {
	hi, lo := StreamSeeds(seed, realization, set, purpose)
	return rand.NewPCG(hi, lo)
}
