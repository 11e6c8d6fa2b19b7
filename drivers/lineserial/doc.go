// Package lineserial is the driver for microcontroller bridge boards that
// stream one text line per sample over a serial port: typically a 24-bit
// load-cell amplifier and an encoder or potentiometer on a small board
// with a USB serial bridge.
//
// The line layout is configured, not hard-wired: delimited fields
// ("123456,-8388,10234") or named key=value pairs
// ("t=123456 f=-8388 x=10234"), an optional XOR checksum after '*',
// raw counts or engineering units, and board timestamps (a wrapping
// microsecond or millisecond counter) or host receipt times.
//
// Bad input never stops acquisition: partial, garbled, over-long lines
// and wrong checksums are counted in Health and dropped, NaN readings and
// counts outside the converter's range become NaN for that channel. When
// the port disappears (cable pulled) the driver closes it, retries with
// backoff, and marks the first batch after the reopen with GapBefore.
//
// Caveats: board timestamps are mapped to host time at the first sample
// after each open, so a board clock that drifts against the host drifts
// the batch times by the same amount; host receipt times carry the USB
// and scheduling jitter of the host (a few ms). The software only
// watches: it is no safety interlock.
package lineserial
