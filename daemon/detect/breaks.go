package detect

import (
	"math"

	"framed/reduce"
)

// breakRingCap bounds the break window's memory: 4096 samples cover the
// default 50 ms window up to 80 kHz. If it fills, the oldest entries go
// and the window only gets shorter (a break must then fall faster).
const breakRingCap = 4096

// breakWatch keeps the running maximum of the force over the last
// BreakWindowS as a monotonic queue: amortised O(1) per sample, no
// allocation after init.
type breakWatch struct {
	ring    []sample
	head, n int
}

func (w *breakWatch) init(capacity int) { w.ring = make([]sample, capacity) }
func (w *breakWatch) reset()            { w.head, w.n = 0, 0 }

func (w *breakWatch) at(i int) *sample { return &w.ring[(w.head+i)%len(w.ring)] }

func (w *breakWatch) push(s sample) {
	for w.n > 0 && w.at(w.n-1).f <= s.f {
		w.n--
	}
	if w.n == len(w.ring) {
		w.head = (w.head + 1) % len(w.ring)
		w.n--
	}
	*w.at(w.n) = s
	w.n++
}

func (w *breakWatch) dropBefore(tS float64) {
	for w.n > 0 && w.at(0).t < tS {
		w.head = (w.head + 1) % len(w.ring)
		w.n--
	}
}

// watchBreak looks for a fall, within the break window, of at least
// BreakDropFraction of the running peak force (above the baseline). A
// fall during which the displacement recovers elastically is an unloading
// by the operator, not a break. The filtered force already ignores single
// spikes, so the break is proved by the sample after the first fallen
// one. It reports whether the test ended.
func (d *Detector) watchBreak(fs sample, rawT float64) bool {
	r := &d.run
	w := &d.brk
	windowS := math.Max(d.cfg.BreakWindowS, 2.5*d.dtS)
	w.dropBefore(fs.t - windowS)
	if w.n > 0 {
		top := *w.at(0)
		need := d.cfg.BreakDropFraction * (r.peakN - r.baseN)
		if top.f-fs.f >= need && !d.recovered(top, fs) {
			// Date the break at the last reading still near the top of
			// the window: the last one before the force fell.
			atS := top.t
			for i := 1; i < w.n && w.at(i).f >= top.f-need/8; i++ {
				atS = w.at(i).t
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
	w.push(fs)
	if fs.f > r.peakN {
		r.peakN = fs.f
	}
	return false
}

// recovered tells whether the displacement (extension, else crosshead)
// went back by more than the set threshold between two readings.
func (d *Detector) recovered(before, after sample) bool {
	thr := d.run.setThrMM
	if finite(before.ext) && finite(after.ext) {
		return after.ext-before.ext <= -thr
	}
	if finite(before.xh) && finite(after.xh) {
		return after.xh-before.xh <= -thr
	}
	return false
}
