package reduce

// Fracture: the last sample before the force falls away. ASTM E8 takes the
// elongation at fracture just before the force falls below 10 % of Fm
// (secondary source); records that stop at the break (common practice for
// data exported by frames) end at the fracture sample instead.

// steepDropFrac is the per-sample force drop, as a fraction of Fm, that
// counts as the specimen separating rather than necking (common practice:
// necking sheds well under 1 % of Fm per sample at usual rates).
const steepDropFrac = 0.02

// findBreak sets w.iBreak from the detector's break event when there is one,
// else from the force record, and reports whether the force fell at all.
func (w *work) findBreak(det Detected) {
	f := w.c.ForceN
	end := w.n - 1
	fromDet := false
	for _, e := range det.Events {
		if e.Kind == EventBreak && finite(e.TimeS) {
			end = w.indexAtTime(e.TimeS)
			fromDet = true
			break
		}
	}
	if end < w.iFm {
		end = w.iFm
	}
	if !fromDet {
		w.flag(FlagBreakFromCurve)
		for i := w.iFm; i <= end; i++ {
			if finite(f[i]) && f[i] < 0.1*w.fmN {
				end = i
				break
			}
		}
	}
	// Walk back to the last finite sample, then over the steep drop.
	for end > w.iFm && !finite(f[end]) {
		end--
	}
	thr := steepDropFrac * w.fmN
	for end > w.iFm {
		p := end - 1
		for p > w.iFm && !finite(f[p]) {
			p--
		}
		if !(f[p]-f[end] > thr) {
			break
		}
		end = p
	}
	w.iBreak = end
	if f[end] >= 0.98*w.fmN && end == w.n-1 {
		w.flag(FlagNoBreak)
	}
}

// breakEvent is the break the result document needs when the detector
// gave none: at the fracture sample, with the force there.
func (w *work) breakEvent() Event {
	fN := w.c.ForceN[w.iBreak]
	t := w.c.TimeS[w.iBreak]
	if !finite(t) {
		t = 0
	}
	e := Event{Kind: EventBreak, TimeS: t}
	if finite(fN) {
		e.ForceN = &fN
	}
	return e
}
