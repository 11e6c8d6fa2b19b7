package modbusrtu

import "sync/atomic"

// counters are the Health counters, written by the poll goroutine.
type counters struct {
	polls, samples, batches, failedPolls atomic.Uint64
	crc, timeouts, exceptions, protocol  atomic.Uint64
	retries, nanValues                   atomic.Uint64
	reopens, openFailures                atomic.Uint64
}

func (c *counters) count(f failure) {
	switch f {
	case failCRC:
		c.crc.Add(1)
	case failTimeout:
		c.timeouts.Add(1)
	case failException:
		c.exceptions.Add(1)
	case failProtocol:
		c.protocol.Add(1)
	}
}

func (c *counters) snapshot() map[string]uint64 {
	return map[string]uint64{
		"polls":           c.polls.Load(),
		"samples":         c.samples.Load(),
		"batches":         c.batches.Load(),
		"failed_polls":    c.failedPolls.Load(),
		"crc_errors":      c.crc.Load(),
		"timeouts":        c.timeouts.Load(),
		"exceptions":      c.exceptions.Load(),
		"protocol_errors": c.protocol.Load(),
		"retries":         c.retries.Load(),
		"nan_values":      c.nanValues.Load(),
		"reopens":         c.reopens.Load(),
		"open_failures":   c.openFailures.Load(),
	}
}
