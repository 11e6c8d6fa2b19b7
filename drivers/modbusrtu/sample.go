package modbusrtu

import _ "embed"

// SampleConfig is a working configuration for a weighing indicator at
// slave 1 (force as a 32-bit integer in 0.1 N steps in holding registers
// 0-1) and a displacement transmitter's float in input registers 10-11; a
// technician copies it and adapts port, id and register map.
//
//go:embed sample.json
var SampleConfig []byte
