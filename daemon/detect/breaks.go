package detect

import (
	"framed/reduce"
)

// breakRingCap bounds the break window's memory: 4096 samples (a power of
// two) cover the default 50 ms window up to 80 kHz.
const breakRingCap = 4096

// breakWatch keeps the running maximum of the force over the break
// window, and the recent displacements, which are only searched when the
// force has fallen fast (rarely), so they cost a store per sample.
type breakWatch struct {
	f      maxQueue
	recent recentRing
}

func (w *breakWatch) init(capacity int) {
	w.f.init(capacity)
	w.recent.init(capacity)
}

func (w *breakWatch) reset() {
	w.f.reset()
	w.recent.reset()
}

// watchBreak looks for a fall, within the break window, of at least
// BreakDropFraction of the running peak force (above the baseline), that
// is final (fallen). A fall during which the displacement recovers
// elastically is an unloading by the operator (or the swing of a hanging
// weight), not a break. The
// filtered force already ignores single spikes, so the break is proved by
// the sample after the first fallen one. It reports whether the test
// ended.
func (d *Detector) watchBreak(fs sample, rawT float64) bool {
	r := &d.run
	w := &d.brk
	windowS := 2.5 * d.dtS // at least two and a half sample intervals
	if windowS < d.cfg.BreakWindowS {
		windowS = d.cfg.BreakWindowS
	}
	from := fs.t - windowS
	w.f.dropBefore(from)
	if w.f.n > 0 {
		topS, topN := w.f.at(0)
		need := d.cfg.BreakDropFraction * (r.peakN - r.baseN)
		if topN-fs.f >= need && d.fallen(fs) && !d.recovered(fs, from) {
			// Date the break at the last reading still near the top of
			// the window: the last one before the force fell.
			atS := topS
			for i := 1; i < w.f.n; i++ {
				tS, v := w.f.at(i)
				if v < topN-need/8 {
					break
				}
				atS = tS
			}
			if r.phase == holding {
				d.closeHold(r.lastInS)
			}
			d.emit(reduce.Event{Kind: reduce.EventBreak, TimeS: atS, ForceN: fptr(r.peakN)}, rawT)
			d.emit(reduce.Event{Kind: reduce.EventEnd, TimeS: fs.t}, rawT)
			d.state = Ended
			return true
		}
	}
	w.f.push(fs.t, fs.f)
	w.recent.push(fs)
	if fs.f > r.peakN {
		r.peakN = fs.f
	}
	return false
}

// breakResidualFraction of the peak force (above the baseline) is where a
// fast fall counts as having reached nothing. A swinging weight's trough
// stays above it unless the weight was dropped, which is not a load step.
const breakResidualFraction = 0.05

// fallen tells whether a fast fall is final: the force is down to nothing,
// or the extensometer is off and the crosshead, still read, did not spring
// back (a machine pulling on a broken specimen, before the force is fully
// gone). Without that, a fall that stops short of nothing is a swing.
func (d *Detector) fallen(fs sample) bool {
	r := &d.run
	if fs.f-r.baseN <= breakResidualFraction*(r.peakN-r.baseN) {
		return true
	}
	return !finite(fs.ext) && finite(fs.xh)
}

// recovered tells whether the displacement (extension, else crosshead)
// now stands more than the set threshold below its highest reading in the
// window since fromS, and not beyond where the fall began: the specimen
// sprang back, so it is still in one piece. A displacement that ran on
// past its start (a dead-weight hanger dropping onto its stop, bouncing a
// little) is the load let go, not a spring-back.
func (d *Detector) recovered(fs sample, fromS float64) bool {
	thr := d.run.setThrMM
	useExt := finite(fs.ext)
	if !useExt && !finite(fs.xh) {
		return false
	}
	top := d.brk.recent.maxDispSince(fromS, useExt)
	now := fs.xh
	if useExt {
		now = fs.ext
	}
	if start := d.brk.recent.firstDispSince(fromS, useExt); finite(start) && now-start >= thr {
		return false
	}
	return top-now >= thr
}
