package snapshot

import "math"

// Byte shuffling: byte j (0 = least significant) of value i of an n-value
// array is stored at position j·n + i (see the package documentation).
// Every function writes into dst, which must have the exact decoded size.

// shuffleFloat32 stores v shuffled into dst (len 4·len(v)).
func shuffleFloat32(dst []byte, v []float32) {
	n := len(v)
	b0, b1, b2, b3 := dst[:n], dst[n:2*n], dst[2*n:3*n], dst[3*n:4*n]
	for i, x := range v {
		u := math.Float32bits(x)
		b0[i] = byte(u)
		b1[i] = byte(u >> 8)
		b2[i] = byte(u >> 16)
		b3[i] = byte(u >> 24)
	}
}

// unshuffleFloat32 is the inverse of shuffleFloat32.
func unshuffleFloat32(v []float32, src []byte) {
	n := len(v)
	b0, b1, b2, b3 := src[:n], src[n:2*n], src[2*n:3*n], src[3*n:4*n]
	for i := range v {
		v[i] = math.Float32frombits(uint32(b0[i]) | uint32(b1[i])<<8 | uint32(b2[i])<<16 | uint32(b3[i])<<24)
	}
}

// shuffleInt32 stores v shuffled into dst (len 4·len(v)).
func shuffleInt32(dst []byte, v []int32) {
	n := len(v)
	b0, b1, b2, b3 := dst[:n], dst[n:2*n], dst[2*n:3*n], dst[3*n:4*n]
	for i, x := range v {
		u := uint32(x)
		b0[i] = byte(u)
		b1[i] = byte(u >> 8)
		b2[i] = byte(u >> 16)
		b3[i] = byte(u >> 24)
	}
}

// unshuffleInt32 is the inverse of shuffleInt32.
func unshuffleInt32(v []int32, src []byte) {
	n := len(v)
	b0, b1, b2, b3 := src[:n], src[n:2*n], src[2*n:3*n], src[3*n:4*n]
	for i := range v {
		v[i] = int32(uint32(b0[i]) | uint32(b1[i])<<8 | uint32(b2[i])<<16 | uint32(b3[i])<<24)
	}
}

// shuffleFloat64 stores v shuffled into dst (len 8·len(v)).
func shuffleFloat64(dst []byte, v []float64) {
	n := len(v)
	for i, x := range v {
		u := math.Float64bits(x)
		for j := range 8 {
			dst[j*n+i] = byte(u >> (8 * j))
		}
	}
}

// unshuffleFloat64 is the inverse of shuffleFloat64.
func unshuffleFloat64(v []float64, src []byte) {
	n := len(v)
	for i := range v {
		var u uint64
		for j := range 8 {
			u |= uint64(src[j*n+i]) << (8 * j)
		}
		v[i] = math.Float64frombits(u)
	}
}
