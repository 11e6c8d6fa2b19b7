package lineserial

import "math"

// boardClock maps a board's free-running counter (micros() or millis(),
// wrapping at 2^bits) to host Unix time. It is anchored to the host clock
// at the first sample after each open, then follows the board counter, so
// sample spacing is the board's (free of USB jitter) across wraparounds.
type boardClock struct {
	mask     uint64
	unitNS   int64
	anchored bool
	last     uint64 // last raw counter value
	ticks    uint64 // unwrapped ticks since the anchor
	hostNS   int64  // host time at the anchor
}

func newBoardClock(bits int, unit string) boardClock {
	c := boardClock{mask: math.MaxUint64 >> (64 - bits), unitNS: 1000}
	if unit == "ms" {
		c.unitNS = 1_000_000
	}
	return c
}

// reset forgets the anchor (after a reopen: the board may have rebooted).
func (c *boardClock) reset() { c.anchored = false }

// toHost returns the host time of a counter value. A step backwards of
// more than half the counter range means the board restarted (or sent a
// stale line); the clock re-anchors and reports it.
func (c *boardClock) toHost(raw uint64, hostNowNS int64) (ns int64, reanchored bool) {
	if c.anchored {
		delta := (raw - c.last) & c.mask
		if delta <= c.mask/2 {
			c.last = raw
			c.ticks += delta
			return c.hostNS + int64(c.ticks)*c.unitNS, false
		}
		reanchored = true
	}
	c.anchored = true
	c.last, c.ticks, c.hostNS = raw, 0, hostNowNS
	return hostNowNS, reanchored
}
