package modbusrtu

import (
	"math"
	"testing"
)

var fuzzTypes = []ValueType{Uint16, Int16, Uint32, Int32, Float32}

// FuzzDecodeRegisters decodes arbitrary register bytes with every type and
// word order: never a panic, a value only when enough registers came, and
// encoding the value gives the registers back (bit for bit, NaNs aside).
func FuzzDecodeRegisters(f *testing.F) {
	f.Add([]byte{0x02, 0x2B, 0x00, 0x00, 0x00, 0x64}, uint8(0), false)
	f.Add([]byte{0x00, 0x01, 0xE2, 0x40}, uint8(3), false)
	f.Add([]byte{0x00, 0x00, 0x40, 0x20}, uint8(4), true)
	f.Add([]byte{0x7F, 0xC0, 0x00, 0x00}, uint8(4), false)
	f.Add([]byte{0xFF}, uint8(2), true)
	f.Fuzz(func(t *testing.T, data []byte, typeIndex uint8, lowFirst bool) {
		regs := make([]uint16, len(data)/2)
		for i := range regs {
			regs[i] = uint16(data[2*i])<<8 | uint16(data[2*i+1])
		}
		typ := fuzzTypes[int(typeIndex)%len(fuzzTypes)]
		order := HighWordFirst
		if lowFirst {
			order = LowWordFirst
		}
		v, err := DecodeValue(regs, typ, order)
		if len(regs) < typ.Words() {
			if err == nil {
				t.Fatalf("%s from %d registers decoded to %v", typ, len(regs), v)
			}
			return
		}
		if err != nil {
			t.Fatalf("%s from % X: %v", typ, regs, err)
		}
		if math.IsNaN(v) {
			return
		}
		back := make([]uint16, typ.Words())
		if err := EncodeValue(back, v, typ, order); err != nil {
			t.Fatal(err)
		}
		for i := range back {
			if back[i] != regs[i] {
				t.Fatalf("%s %s: % X -> %v -> % X", typ, order, regs[:len(back)], v, back)
			}
		}
	})
}
