package modbusrtu

import (
	"errors"
	"fmt"
	"math"
	"testing"
)

func TestDecodeValueKnownEncodings(t *testing.T) {
	cases := []struct {
		name  string
		regs  []uint16
		typ   ValueType
		order WordOrder
		want  float64
	}{
		// Modbus Application Protocol Specification V1.1b3, function 03
		// example: registers 108..110 answer 02 2B, 00 00, 00 64, i.e.
		// 555, 0 and 100 (from memory).
		{"spec example reg 108", []uint16{0x022B}, Uint16, HighWordFirst, 555},
		{"spec example reg 110", []uint16{0x0064}, Uint16, HighWordFirst, 100},
		// Two's complement, common practice.
		{"int16 -1", []uint16{0xFFFF}, Int16, HighWordFirst, -1},
		{"int16 min", []uint16{0x8000}, Int16, HighWordFirst, -32768},
		{"uint32 high word first", []uint16{0x1234, 0x5678}, Uint32, HighWordFirst, 0x12345678},
		{"uint32 low word first", []uint16{0x5678, 0x1234}, Uint32, LowWordFirst, 0x12345678},
		{"int32 -2", []uint16{0xFFFF, 0xFFFE}, Int32, HighWordFirst, -2},
		{"int32 -2 low first", []uint16{0xFFFE, 0xFFFF}, Int32, LowWordFirst, -2},
		{"int32 min", []uint16{0x8000, 0x0000}, Int32, HighWordFirst, -2147483648},
		// IEEE 754 binary32 encodings (standard values, common practice).
		{"float 1.0", []uint16{0x3F80, 0x0000}, Float32, HighWordFirst, 1},
		{"float -2.0", []uint16{0xC000, 0x0000}, Float32, HighWordFirst, -2},
		{"float 2.5 low first", []uint16{0x0000, 0x4020}, Float32, LowWordFirst, 2.5},
		{"float 0.1", []uint16{0x3DCC, 0xCCCD}, Float32, HighWordFirst, float64(float32(0.1))},
		{"float +inf", []uint16{0x7F80, 0x0000}, Float32, HighWordFirst, math.Inf(1)},
	}
	for _, c := range cases {
		got, err := DecodeValue(c.regs, c.typ, c.order)
		if err != nil || got != c.want {
			t.Errorf("%s: got %v, %v; want %v", c.name, got, err, c.want)
		}
		back := make([]uint16, len(c.regs))
		if err := EncodeValue(back, c.want, c.typ, c.order); err != nil || back[0] != c.regs[0] || back[len(back)-1] != c.regs[len(back)-1] {
			t.Errorf("%s: EncodeValue gives %04X, want %04X", c.name, back, c.regs)
		}
	}
	if v, err := DecodeValue([]uint16{0x7FC0, 0x0000}, Float32, HighWordFirst); err != nil || !math.IsNaN(v) {
		t.Errorf("quiet NaN 0x7FC00000: %v %v", v, err)
	}
	if _, err := DecodeValue([]uint16{1}, Int32, HighWordFirst); !errors.Is(err, ErrShortRegisters) {
		t.Errorf("one register for int32: %v", err)
	}
	if _, err := DecodeValue([]uint16{1, 2}, "int64", HighWordFirst); !errors.Is(err, ErrValueType) {
		t.Errorf("int64: %v", err)
	}
	if _, err := DecodeValue([]uint16{1, 2}, Int32, "middle"); !errors.Is(err, ErrValueType) {
		t.Errorf("middle-endian: %v", err)
	}
}

func ExampleDecodeValue() {
	// An indicator sends 123456 (0.1 N steps) as int32, high word first.
	raw, _ := DecodeValue([]uint16{0x0001, 0xE240}, Int32, HighWordFirst)
	fmt.Printf("%.1f N\n", raw*0.1)
	// Output: 12345.6 N
}
