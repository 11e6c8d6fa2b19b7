package reduce

// A record with load-unload cycles before the maximum force (weights hung
// and taken off in turn, or an operator unloading to read a set) is not a
// continuous tension test: its elastic line is a chain of loadings and
// unloadings, swings and creep, and a fall of force is an unload, not a
// yield drop. Such a record keeps its holds, unloads and elastic limit from
// the detector, and its forces and elongations; E and what rests on it
// (Rp, Rt, ReH, ReL, Ae, n, K) are withheld and flagged.

// cycleDropFraction: the force must fall below this fraction of its
// running maximum, and later rise back above cycleReturnFraction of it,
// for a load-unload cycle. A yield drop or serrations fall by a few %.
const (
	cycleDropFraction   = 0.5
	cycleReturnFraction = 0.9
	// cycleMinFraction of Fm: a running maximum below this is seating.
	cycleMinFraction = 0.02
)

// hasLoadCycles reports whether the force was taken off and put back on
// before the maximum force.
func (w *work) hasLoadCycles() bool {
	f := w.c.ForceN
	peak, dropped := 0.0, false
	for i := 0; i < w.iFm && i < len(f); i++ {
		v := f[i]
		if !finite(v) {
			continue
		}
		if v > peak {
			peak = v
		}
		if peak < cycleMinFraction*w.fmN {
			continue
		}
		if v < cycleDropFraction*peak {
			dropped = true
		} else if dropped && v > cycleReturnFraction*peak {
			return true
		}
	}
	return false
}
