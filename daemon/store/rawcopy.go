package store

import (
	"encoding/binary"
	"math"
	"unsafe"
)

// littleEndianHost is true where float64 columns in memory already have
// the stored byte order, so raw columns copy as one memmove instead of a
// loop of 8-byte conversions (the bulk of reading a long test).
var littleEndianHost = func() bool {
	x := uint16(1)
	return *(*byte)(unsafe.Pointer(&x)) == 1
}()

func float64Bytes(v []float64) []byte {
	if len(v) == 0 {
		return nil
	}
	return unsafe.Slice((*byte)(unsafe.Pointer(&v[0])), 8*len(v))
}

// putRaw writes v into dst (len 8*len(v)) as little-endian bit patterns.
func putRaw(dst []byte, v []float64) {
	if littleEndianHost {
		copy(dst, float64Bytes(v))
		return
	}
	for i, x := range v {
		binary.LittleEndian.PutUint64(dst[8*i:], math.Float64bits(x))
	}
}

// getRaw reads len(out) little-endian bit patterns from src.
func getRaw(out []float64, src []byte) {
	if littleEndianHost {
		copy(float64Bytes(out), src)
		return
	}
	for i := range out {
		out[i] = math.Float64frombits(binary.LittleEndian.Uint64(src[8*i:]))
	}
}
