package lineserial

import _ "embed"

// SampleConfig is a working configuration for a bridge board printing
// "t=<micros> f=<counts> x=<encoder counts>*HH" at 1 kHz; a technician
// copies it and changes the port.
//
//go:embed sample.json
var SampleConfig []byte
