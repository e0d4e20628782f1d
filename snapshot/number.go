package snapshot

import (
	"math"
	"strconv"
)

// Plain decimal notation is used for magnitudes in [1e-6, 1e15); others
// get an exponent.
const (
	plainMin = 1e-6
	plainMax = 1e15
)

// appendFloat64 appends the shortest decimal that reads back as x.
func appendFloat64(dst []byte, x float64) []byte {
	if a := math.Abs(x); a != 0 && (a < plainMin || a >= plainMax || math.IsNaN(x)) {
		return strconv.AppendFloat(dst, x, 'g', -1, 64)
	}
	return strconv.AppendFloat(dst, x, 'f', -1, 64)
}

// appendFloat32Scaled appends v·scale, where scale is a power of ten,
// with the significant digits of the shortest decimal that reads back as
// the float32 v: the CSV shows the stored precision, neither more nor
// less (0.4 mm, not 0.39999998 mm, for a stored 4e-4 m).
func appendFloat32Scaled(dst []byte, v float32, scale float64) []byte {
	if math.IsNaN(float64(v)) || math.IsInf(float64(v), 0) {
		return strconv.AppendFloat(dst, float64(v), 'g', -1, 32)
	}
	var tmp [32]byte
	sig := significantDigits(strconv.AppendFloat(tmp[:0], float64(v), 'e', -1, 32))
	x := float64(v) * scale
	a := math.Abs(x)
	if a == 0 {
		return strconv.AppendFloat(dst, x, 'f', -1, 64)
	}
	if a < plainMin || a >= plainMax {
		return strconv.AppendFloat(dst, x, 'e', sig-1, 64)
	}
	mag := int(math.Floor(math.Log10(a)))
	start := len(dst)
	dst = strconv.AppendFloat(dst, x, 'f', max(sig-1-mag, 0), 64)
	return trimZeros(dst, start)
}

// significantDigits counts the mantissa digits of a number in 'e' format.
func significantDigits(e []byte) int {
	n := 0
	for _, c := range e {
		if c == 'e' {
			break
		}
		if c >= '0' && c <= '9' {
			n++
		}
	}
	return n
}

// trimZeros removes trailing fractional zeros (and a bare point) from the
// number that starts at dst[start].
func trimZeros(dst []byte, start int) []byte {
	num := dst[start:]
	point := -1
	for i, c := range num {
		if c == '.' {
			point = i
		}
	}
	if point < 0 {
		return dst
	}
	end := len(num)
	for end > point+1 && num[end-1] == '0' {
		end--
	}
	if end == point+1 {
		end = point
	}
	return dst[:start+end]
}
