package store

import (
	"encoding/binary"
	"fmt"
	"hash/crc32"
	"math"

	"framed/reduce"
)

// A chunk is one stored batch of samples:
//
//	version byte (chunkVersion)
//	uvarint sample count n
//	per column, in the order time, force, extension, crosshead:
//	  mode byte, then
//	    modeAbsent: nothing (the channel was not there)
//	    modeConst:  8 bytes, one float64 bit pattern shared by all n
//	                (typically NaN: no reading)
//	    modeRaw:    n * 8 bytes, float64 bit patterns, little endian
//	    modeDoD:    4-byte byte length, then n zigzag uvarints: the
//	                delta-of-delta of the float64 bit patterns
//	CRC-32C (Castagnoli) of everything before it, little endian
//
// Every mode is lossless, so 24-bit readings and micrometre extensions keep
// all their bits and NaN survives. Raw float64 keeps decoding a tight copy
// loop; delta-of-delta on the time column shrinks a steady clock to one or
// two bytes a sample, exactly.
const (
	chunkVersion = 1

	modeAbsent = 0
	modeConst  = 1
	modeRaw    = 2
	modeDoD    = 3

	numColumns = 4
)

var castagnoli = crc32.MakeTable(crc32.Castagnoli)

func columns(c *reduce.Curve) [numColumns][]float64 {
	return [numColumns][]float64{c.TimeS, c.ForceN, c.ExtensionMM, c.CrossheadMM}
}

// encodeChunk appends the encoding of samples [from, to) of c to dst.
// Columns must be nil or as long as c.TimeS (checked by the caller).
func encodeChunk(dst []byte, c *reduce.Curve, from, to int) []byte {
	n := to - from
	dst = append(dst, chunkVersion)
	dst = binary.AppendUvarint(dst, uint64(n))
	cols := columns(c)
	for k, col := range cols {
		switch {
		case col == nil:
			dst = append(dst, modeAbsent)
		case k == 0:
			dst = append(dst, modeDoD)
			dst = appendDoD(dst, col[from:to])
		case n > 0 && allSameBits(col[from:to]):
			dst = append(dst, modeConst)
			dst = binary.LittleEndian.AppendUint64(dst, math.Float64bits(col[from]))
		default:
			dst = append(dst, modeRaw)
			dst = appendRaw(dst, col[from:to])
		}
	}
	return binary.LittleEndian.AppendUint32(dst, crc32.Checksum(dst, castagnoli))
}

func allSameBits(v []float64) bool {
	b0 := math.Float64bits(v[0])
	for _, x := range v[1:] {
		if math.Float64bits(x) != b0 {
			return false
		}
	}
	return true
}

func appendRaw(dst []byte, v []float64) []byte {
	start := len(dst)
	dst = grow(dst, 8*len(v))
	putRaw(dst[start:], v)
	return dst
}

// appendDoD writes the byte length as a fixed 4-byte prefix (patched after)
// so the column is written in one pass.
func appendDoD(dst []byte, v []float64) []byte {
	lenAt := len(dst)
	dst = append(dst, 0, 0, 0, 0)
	var prev, prevDelta uint64
	for _, x := range v {
		b := math.Float64bits(x)
		delta := b - prev
		dd := int64(delta - prevDelta)
		dst = binary.AppendUvarint(dst, uint64(dd<<1)^uint64(dd>>63))
		prev, prevDelta = b, delta
	}
	binary.LittleEndian.PutUint32(dst[lenAt:], uint32(len(dst)-lenAt-4))
	return dst
}

func grow(b []byte, n int) []byte {
	if cap(b)-len(b) < n {
		nb := make([]byte, len(b), 2*cap(b)+n)
		copy(nb, b)
		b = nb
	}
	return b[:len(b)+n]
}

// chunkCount reads the sample count of a chunk without decoding it.
func chunkCount(src []byte) (int, error) {
	if len(src) < 1+1+4 || src[0] != chunkVersion {
		return 0, fmt.Errorf("%w: chunk header", ErrCorrupt)
	}
	n, k := binary.Uvarint(src[1:])
	// Every sample takes at least one byte of the time column, so a count
	// larger than the chunk is damage (and must not drive an allocation).
	if k <= 0 || n > uint64(len(src)) {
		return 0, fmt.Errorf("%w: chunk sample count", ErrCorrupt)
	}
	return int(n), nil
}

// decodeChunk decodes src into dst[k][off:off+n] for each column k whose
// dst is not nil, and reports which columns the chunk holds (bit k set).
// A column the chunk lacks is filled with NaN. Each dst column must have
// room for off+n values; decodeChunk checks and fails rather than panics.
func decodeChunk(src []byte, dst [numColumns][]float64, off int) (n int, present uint8, err error) {
	if len(src) < 4 {
		return 0, 0, fmt.Errorf("%w: chunk too short", ErrCorrupt)
	}
	body := src[:len(src)-4]
	if crc32.Checksum(body, castagnoli) != binary.LittleEndian.Uint32(src[len(src)-4:]) {
		return 0, 0, fmt.Errorf("%w: chunk checksum mismatch", ErrCorrupt)
	}
	n, err = chunkCount(src)
	if err != nil {
		return 0, 0, err
	}
	_, p := binary.Uvarint(body[1:])
	p++
	for k := 0; k < numColumns; k++ {
		col := dst[k]
		if col != nil && len(col) < off+n {
			return 0, 0, fmt.Errorf("%w: chunk of %d samples overruns column %d", ErrCorrupt, n, k)
		}
		if p >= len(body) {
			return 0, 0, fmt.Errorf("%w: chunk truncated at column %d", ErrCorrupt, k)
		}
		mode := body[p]
		p++
		switch mode {
		case modeAbsent:
			if col != nil {
				fill(col[off:off+n], math.NaN())
			}
		case modeConst:
			if len(body)-p < 8 {
				return 0, 0, fmt.Errorf("%w: chunk truncated at column %d", ErrCorrupt, k)
			}
			if col != nil {
				fill(col[off:off+n], math.Float64frombits(binary.LittleEndian.Uint64(body[p:])))
			}
			p += 8
			present |= 1 << k
		case modeRaw:
			if len(body)-p < 8*n {
				return 0, 0, fmt.Errorf("%w: chunk truncated at column %d", ErrCorrupt, k)
			}
			if col != nil {
				getRaw(col[off:off+n], body[p:p+8*n])
			}
			p += 8 * n
			present |= 1 << k
		case modeDoD:
			if len(body)-p < 4 {
				return 0, 0, fmt.Errorf("%w: chunk truncated at column %d", ErrCorrupt, k)
			}
			size := int(binary.LittleEndian.Uint32(body[p:]))
			p += 4
			if size > len(body)-p {
				return 0, 0, fmt.Errorf("%w: chunk truncated at column %d", ErrCorrupt, k)
			}
			if col != nil {
				if err := decodeDoD(body[p:p+size], col[off:off+n]); err != nil {
					return 0, 0, fmt.Errorf("%w: column %d: %v", ErrCorrupt, k, err)
				}
			}
			p += size
			present |= 1 << k
		default:
			return 0, 0, fmt.Errorf("%w: unknown column mode %d", ErrCorrupt, mode)
		}
	}
	if p != len(body) {
		return 0, 0, fmt.Errorf("%w: %d trailing bytes in chunk", ErrCorrupt, len(body)-p)
	}
	if present&1 == 0 {
		return 0, 0, fmt.Errorf("%w: chunk without time column", ErrCorrupt)
	}
	return n, present, nil
}

func decodeDoD(src []byte, out []float64) error {
	var prev, prevDelta uint64
	p := 0
	for i := range out {
		var u uint64
		// Inline uvarint: the common one-byte case takes no call.
		if p < len(src) && src[p] < 0x80 {
			u = uint64(src[p])
			p++
		} else {
			v, k := binary.Uvarint(src[p:])
			if k <= 0 {
				return fmt.Errorf("bad varint at sample %d", i)
			}
			u = v
			p += k
		}
		dd := int64(u>>1) ^ -int64(u&1)
		delta := prevDelta + uint64(dd)
		b := prev + delta
		out[i] = math.Float64frombits(b)
		prev, prevDelta = b, delta
	}
	if p != len(src) {
		return fmt.Errorf("%d stray bytes", len(src)-p)
	}
	return nil
}

func fill(v []float64, x float64) {
	for i := range v {
		v[i] = x
	}
}

// decodeChunkCurve decodes one chunk into a fresh curve (tests, Check).
func decodeChunkCurve(src []byte) (reduce.Curve, error) {
	n, err := chunkCount(src)
	if err != nil {
		return reduce.Curve{}, err
	}
	var dst [numColumns][]float64
	for k := range dst {
		dst[k] = make([]float64, n)
	}
	_, present, err := decodeChunk(src, dst, 0)
	if err != nil {
		return reduce.Curve{}, err
	}
	for k := range dst {
		if present&(1<<k) == 0 {
			dst[k] = nil
		}
	}
	return reduce.Curve{TimeS: dst[0], ForceN: dst[1], ExtensionMM: dst[2], CrossheadMM: dst[3]}, nil
}
