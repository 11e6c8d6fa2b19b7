package modbusrtu

import "errors"

// Named errors of the register decoder, checked with errors.Is.
var (
	// ErrShortRegisters: fewer registers than the value type needs.
	ErrShortRegisters = errors.New("modbusrtu: too few registers for the value type")
	// ErrValueType: a value type or word order the decoder does not know.
	ErrValueType = errors.New("modbusrtu: unknown value type or word order")
)
