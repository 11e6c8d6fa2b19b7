package store

import (
	"bytes"
	"encoding/binary"
	"errors"
	"math"
	"testing"

	"pgregory.net/rapid"

	"framed/reduce"
)

// Bit patterns that must survive storage exactly: quiet and signalling NaN
// with payloads, infinities, signed zero, the smallest subnormal, the
// largest finite value (IEEE 754 binary64 special values).
var specialBits = []uint64{
	0x7ff8000000000000, // quiet NaN (math.NaN)
	0x7ff0000000000001, // signalling NaN with payload
	0xfff8000000000123, // negative NaN with payload
	0x7ff0000000000000, // +Inf
	0xfff0000000000000, // -Inf
	0x8000000000000000, // -0
	0x0000000000000001, // smallest subnormal
	0x7fefffffffffffff, // largest finite
}

func TestChunkRoundTripIsBitExact(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(0, 300).Draw(t, "n")
		col := func(name string, allowNil bool) []float64 {
			if allowNil && rapid.Bool().Draw(t, name+"-nil") {
				return nil
			}
			v := make([]float64, n)
			kind := rapid.IntRange(0, 2).Draw(t, name+"-kind")
			for i := range v {
				switch kind {
				case 0: // arbitrary bit patterns
					v[i] = math.Float64frombits(rapid.Uint64().Draw(t, name))
				case 1: // specials
					v[i] = math.Float64frombits(specialBits[rapid.IntRange(0, len(specialBits)-1).Draw(t, name)])
				default: // constant (e.g. all NaN: extensometer removed)
					v[i] = math.NaN()
				}
			}
			return v
		}
		c := reduce.Curve{TimeS: col("time", false), ForceN: col("force", true), ExtensionMM: col("ext", true), CrossheadMM: col("xhead", true)}
		enc := encodeChunk(nil, &c, 0, n)
		got, err := decodeChunkCurve(enc)
		if err != nil {
			t.Fatal(err)
		}
		if n == 0 {
			return
		}
		requireSameCurve(t, got, c)
	})
}

func TestChunkSteadyClockIsCompact(t *testing.T) {
	// A steady 10 kHz clock: delta-of-delta of the bit pattern is zero or
	// tiny within one binade, so time costs about one byte a sample
	// instead of eight.
	c := genCurve(100000, 4096)
	c.ForceN, c.ExtensionMM, c.CrossheadMM = nil, nil, nil
	enc := encodeChunk(nil, &c, 0, 4096)
	if len(enc) > 3*4096 {
		t.Errorf("time column of 4096 samples took %d bytes, want at most %d", len(enc), 3*4096)
	}
}

func TestChunkCorruptionIsDetected(t *testing.T) {
	c := genCurve(0, 500)
	enc := encodeChunk(nil, &c, 0, 500)
	for _, pos := range []int{0, 1, 3, len(enc) / 2, len(enc) - 5, len(enc) - 1} {
		bad := append([]byte(nil), enc...)
		bad[pos] ^= 0x10
		if _, err := decodeChunkCurve(bad); !errors.Is(err, ErrCorrupt) {
			t.Errorf("flip at %d: err = %v, want ErrCorrupt", pos, err)
		}
	}
	for _, cut := range []int{0, 1, 5, len(enc) - 1} {
		if _, err := decodeChunkCurve(enc[:cut]); !errors.Is(err, ErrCorrupt) {
			t.Errorf("cut at %d: err = %v, want ErrCorrupt", cut, err)
		}
	}
}

func FuzzDecodeChunk(f *testing.F) {
	c := genCurve(7, 40)
	f.Add(encodeChunk(nil, &c, 0, 40))
	c.ForceN = nil
	f.Add(encodeChunk(nil, &c, 0, 40))
	f.Add([]byte{chunkVersion, 0xff, 0xff, 0xff, 0xff, 0x0f, 0, 0, 0, 0})
	f.Fuzz(func(t *testing.T, b []byte) {
		got, err := decodeChunkCurve(b)
		if err != nil {
			if !errors.Is(err, ErrCorrupt) {
				t.Fatalf("error %v does not wrap ErrCorrupt", err)
			}
			return
		}
		// Whatever decodes must re-encode to something that decodes the
		// same.
		again, err := decodeChunkCurve(encodeChunk(nil, &got, 0, got.Len()))
		if err != nil {
			t.Fatal(err)
		}
		if got.Len() > 0 {
			requireSameCurve(t, again, got)
		}
	})
}

// The memmove fast path and the portable loop agree byte for byte with
// encoding/binary's little-endian layout.
func TestRawCopyMatchesLittleEndian(t *testing.T) {
	c := genCurve(12345, 257)
	v := c.ForceN
	want := make([]byte, 8*len(v))
	for i, x := range v {
		binary.LittleEndian.PutUint64(want[8*i:], math.Float64bits(x))
	}
	got := make([]byte, len(want))
	putRaw(got, v)
	if !bytes.Equal(got, want) {
		t.Fatal("putRaw differs from little-endian encoding")
	}
	back := make([]float64, len(v))
	getRaw(back, want)
	if i, ok := sameBits(back, v); !ok {
		t.Fatalf("getRaw differs at %d", i)
	}
}
