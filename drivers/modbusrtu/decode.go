package modbusrtu

import (
	"fmt"
	"math"
)

// ValueType is how a value is laid out in 16-bit registers.
type ValueType string

const (
	Uint16  ValueType = "uint16"
	Int16   ValueType = "int16"
	Uint32  ValueType = "uint32"
	Int32   ValueType = "int32"
	Float32 ValueType = "float32"
)

// Words is the number of registers the type occupies (0 if unknown).
func (t ValueType) Words() int {
	switch t {
	case Uint16, Int16:
		return 1
	case Uint32, Int32, Float32:
		return 2
	}
	return 0
}

// WordOrder says which register of a 32-bit value comes first. Within a
// register the bytes are always big-endian, as the Modbus application
// protocol specifies; the order of the two registers is not specified
// and indicators differ, hence the setting.
type WordOrder string

const (
	// HighWordFirst: register n holds the high 16 bits ("ABCD").
	HighWordFirst WordOrder = "big"
	// LowWordFirst: register n holds the low 16 bits ("CDAB").
	LowWordFirst WordOrder = "little"
)

// DecodeValue decodes one value from the start of regs. A float32 NaN or
// infinity is returned as is; the caller decides what it means.
func DecodeValue(regs []uint16, t ValueType, order WordOrder) (float64, error) {
	n := t.Words()
	if n == 0 || (order != HighWordFirst && order != LowWordFirst) {
		return 0, fmt.Errorf("%w: %q, %q", ErrValueType, t, order)
	}
	if len(regs) < n {
		return 0, fmt.Errorf("%w: %s needs %d, have %d", ErrShortRegisters, t, n, len(regs))
	}
	switch t {
	case Uint16:
		return float64(regs[0]), nil
	case Int16:
		return float64(int16(regs[0])), nil
	}
	hi, lo := regs[0], regs[1]
	if order == LowWordFirst {
		hi, lo = lo, hi
	}
	u := uint32(hi)<<16 | uint32(lo)
	switch t {
	case Uint32:
		return float64(u), nil
	case Int32:
		return float64(int32(u)), nil
	default:
		return float64(math.Float32frombits(u)), nil
	}
}

// EncodeValue is the inverse of DecodeValue for simulators and tests:
// it writes v (converted to the type) into regs.
func EncodeValue(regs []uint16, v float64, t ValueType, order WordOrder) error {
	n := t.Words()
	if n == 0 || (order != HighWordFirst && order != LowWordFirst) {
		return fmt.Errorf("%w: %q, %q", ErrValueType, t, order)
	}
	if len(regs) < n {
		return fmt.Errorf("%w: %s needs %d, have %d", ErrShortRegisters, t, n, len(regs))
	}
	var u uint32
	switch t {
	case Uint16:
		regs[0] = uint16(v)
		return nil
	case Int16:
		regs[0] = uint16(int16(v))
		return nil
	case Uint32:
		u = uint32(v)
	case Int32:
		u = uint32(int32(v))
	case Float32:
		u = math.Float32bits(float32(v))
	}
	hi, lo := uint16(u>>16), uint16(u)
	if order == LowWordFirst {
		hi, lo = lo, hi
	}
	regs[0], regs[1] = hi, lo
	return nil
}
