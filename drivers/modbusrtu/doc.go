// Package modbusrtu is the driver for industrial weighing indicators and
// displacement transmitters that answer Modbus RTU polls on an RS-485 (or
// RS-232) line. It polls holding or input registers of one slave at a
// fixed rate, decodes 16- and 32-bit integers (with scale and offset) or
// IEEE 754 floats in either word order, and streams one sample per
// successful poll.
//
// The framing, CRC and timeouts are github.com/simonvetter/modbus's; this
// package adds the register map, the decoding, the retry policy and the
// counters: CRC errors, timeouts, exceptions and retries are counted in
// Health and never end the stream. An I/O error on the port itself (the
// USB adapter unplugged) closes it and reopens it with backoff, and the
// first batch afterwards carries GapBefore.
//
// Caveats: sample times are host times (the midpoint of the poll's
// request and answer), so they carry the line's and the indicator's
// latency jitter, typically a few ms; a poll rate above what the baud
// rate and the indicator allow just produces timeouts. The software only
// watches: it is no safety interlock.
package modbusrtu
