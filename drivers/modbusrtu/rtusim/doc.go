// Package rtusim is a Modbus RTU slave for tests and for the bench
// simulator a technician runs without hardware: it answers read-holding
// (function 3) and read-input (function 4) register requests from its own
// register maps, on any byte stream (usually the master end of a pty).
//
// The framing (8-byte requests, CRC-16 low byte first, exception answers)
// is written here independently of the Modbus library the driver uses, so
// a test against this slave checks the driver's framing rather than
// repeating it.
//
// Caveats: only functions 3 and 4 are answered (a weighing indicator's
// read path); writes and broadcasts are counted as bad requests and
// ignored. The inter-frame silence of real RTU is not timed: the slave
// finds frames by their CRC, dropping one byte at a time when out of step.
package rtusim
