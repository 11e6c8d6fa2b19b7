package lineserial

import "sync/atomic"

// counters are the Health counters, written by the stream goroutine and
// read by Health at any time.
type counters struct {
	lines, samples, batches                atomic.Uint64
	garbled, checksum, overlong            atomic.Uint64
	outOfRange, nanValues, timeNotRising   atomic.Uint64
	reopens, openFailures, clockReanchored atomic.Uint64
}

func (c *counters) snapshot() map[string]uint64 {
	return map[string]uint64{
		"lines":           c.lines.Load(),
		"samples":         c.samples.Load(),
		"batches":         c.batches.Load(),
		"garbled_lines":   c.garbled.Load(),
		"checksum_errors": c.checksum.Load(),
		"overlong_lines":  c.overlong.Load(),
		"out_of_range":    c.outOfRange.Load(),
		"nan_values":      c.nanValues.Load(),
		"reopens":         c.reopens.Load(),
		"open_failures":   c.openFailures.Load(),
		"clock_resets":    c.clockReanchored.Load(),
		"time_not_rising": c.timeNotRising.Load(),
	}
}
