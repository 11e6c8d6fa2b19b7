package detect

import (
	"math"

	"framed/reduce"
)

// OfflineBatchS is the batch length Offline feeds the detector with, the
// same order as the daemon's acquisition batches.
const OfflineBatchS = 0.1

// Offline runs the detector over a recorded curve in OfflineBatchS
// batches, as the daemon would have live, and returns what it found. A
// zero cfg.ForceRangeN is sized from the curve's largest force. A config
// New refuses, or a curve without any positive force, gives an empty
// result flagged detect-bad-config (the reduction still runs).
func Offline(c reduce.Curve, cfg Config) reduce.Detected {
	if cfg.ForceRangeN == 0 {
		for _, f := range c.ForceN {
			if finite(f) && math.Abs(f) > cfg.ForceRangeN {
				cfg.ForceRangeN = math.Abs(f)
			}
		}
	}
	d, err := New(cfg)
	if err != nil {
		return reduce.Detected{Flags: []string{FlagDetectBadConfig}}
	}
	n := c.Len()
	for _, col := range [][]float64{c.ForceN, c.ExtensionMM, c.CrossheadMM} {
		if col != nil && len(col) < n {
			n = len(col) // a ragged curve: use the part every column covers
		}
	}
	for i := 0; i < n && d.State() != Ended; {
		j := i + 1
		for j < n && !(c.TimeS[j]-c.TimeS[i] >= OfflineBatchS) {
			j++
		}
		d.Step(c.Slice(i, j))
		i = j
	}
	return d.Detected()
}
