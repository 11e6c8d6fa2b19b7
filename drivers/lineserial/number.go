package lineserial

import (
	"math"
	"strconv"
	"unsafe"
)

// numKind says what parseNumber found.
type numKind uint8

const (
	numBad numKind = iota
	numOK
	numNaN
)

// parseNumber reads a decimal integer (the fast path: raw counts) or a
// decimal float, and recognises the NaN texts firmware prints for a
// missing reading ("nan", "NaN", "NAN", "ovf" is not one: it is garbled).
func parseNumber(b []byte) (float64, numKind) {
	if len(b) == 0 {
		return 0, numBad
	}
	i := 0
	neg := false
	if b[0] == '-' || b[0] == '+' {
		neg = b[0] == '-'
		i = 1
	}
	if len(b)-i == 3 && (b[i]|0x20) == 'n' && (b[i+1]|0x20) == 'a' && (b[i+2]|0x20) == 'n' {
		return math.NaN(), numNaN
	}
	if i == len(b) || len(b)-i > 18 {
		return parseFloat(b)
	}
	var v int64
	for ; i < len(b); i++ {
		c := b[i] - '0'
		if c > 9 {
			return parseFloat(b)
		}
		v = v*10 + int64(c)
	}
	if neg {
		v = -v
	}
	return float64(v), numOK
}

// parseFloat is the slow path for "12.5", "1e3" and long integers. The
// unsafe string view avoids a copy per field; strconv clones the text
// into any error it builds, and the error is dropped here anyway.
func parseFloat(b []byte) (float64, numKind) {
	for _, c := range b {
		// strconv also accepts "inf", "0x1p3" and '_' separators, which no
		// board prints; refuse them as garbled.
		if !(c >= '0' && c <= '9' || c == '.' || c == 'e' || c == 'E' || c == '-' || c == '+') {
			return 0, numBad
		}
	}
	v, err := strconv.ParseFloat(unsafe.String(unsafe.SliceData(b), len(b)), 64)
	if err != nil {
		if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange {
			return v, numOK // ±Inf or 0: the range check decides
		}
		return 0, numBad
	}
	return v, numOK
}

// parseUint reads an unsigned decimal board counter.
func parseUint(b []byte) (uint64, bool) {
	if len(b) == 0 || len(b) > 20 {
		return 0, false
	}
	var v uint64
	for _, c := range b {
		d := c - '0'
		if d > 9 {
			return 0, false
		}
		if v > (math.MaxUint64-uint64(d))/10 {
			return 0, false
		}
		v = v*10 + uint64(d)
	}
	return v, true
}
