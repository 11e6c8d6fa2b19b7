package detect

import "math"

// quantum learns the force channel's resolution as the smallest non-zero
// step between consecutive readings. A channel whose readings come in
// counts (a weighing indicator with a 1 N digit) cannot scatter less than
// about half a count however still the load, so the noise floor is never
// taken below that; a channel with fine readings makes the quantum tiny
// and the floor irrelevant. Only steps below a quarter of the hold band
// count: a resolution that coarse would make holds meaningless anyway.
type quantum struct {
	lastN, stepN float64
	seen         bool
}

// see takes a reading. Steps above maxStepN are moves of the load, not
// the resolution, and are ignored.
func (q *quantum) see(fN, maxStepN float64) {
	if q.seen {
		if d := math.Abs(fN - q.lastN); d > 0 && d <= maxStepN && (q.stepN == 0 || d < q.stepN) {
			q.stepN = d
		}
	}
	q.lastN, q.seen = fN, true
}

// noiseFloorN is the least noise floor the settle test will assume: the
// fixed fraction of the range, or half the resolution seen, if more.
func (d *Detector) noiseFloorN() float64 {
	return math.Max(minNoiseFraction*d.cfg.ForceRangeN, d.quantum.stepN/2)
}
