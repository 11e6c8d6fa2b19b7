package detect

import (
	"math"

	"framed/reduce"
)

// settleBlocks is how many sub-blocks the settle window is cut into: the
// window slides by a quarter of SettleMinS, and two windows in a row must
// be settled, so a settled reading is found at most 1.5 SettleMinS after
// it settled, with O(1) work per sample.
const settleBlocks = 4

// block holds the line sums of one sub-block of the settle window.
type block struct {
	f, ext, xh linsum
	startS     float64
}

// runState is what the detector tracks while a test runs.
type runState struct {
	startS       float64
	baseN        float64
	sigmaN       float64
	unloadLevelN float64
	holdBandN    float64
	setThrMM     float64
	extRef       float64
	xhRef        float64
	peakN        float64

	phase phase

	// settle window
	blockLenS  float64
	ring       [settleBlocks]block
	ringN      int
	ringAt     int
	cur        block
	bandRefN   float64
	bandStartS float64
	prevS      float64 // the last filtered sample's time
	// prevSettled: the previous window was settled.
	prevSettled bool
	// lastMoveS is how long the force took for its last move across the
	// hold band: short for a load step or a swing, long for a slow drift.
	lastMoveS float64
	// stepExtMMPerS is the fastest the extension went in a move across
	// the hold band since the load began to change (NaN unknown),
	// bandExtMM the extension when the last move began.
	stepExtMMPerS float64
	bandExtMM     float64

	// following a hold or an unloaded rest
	refN        float64
	outN        int
	lastInS     float64
	holdIdx     int
	follF       linsum
	follExt     linsum
	restStartS  float64
	cyclePeakN  float64
	cycleHoldN  float64
	cycleHasHld bool
}

// restartSettle empties the settle window: the load has just moved.
func (d *Detector) restartSettle(fs sample) {
	r := &d.run
	r.phase = seeking
	r.ringN, r.ringAt = 0, 0
	r.cur = block{startS: fs.t}
	r.bandRefN, r.bandStartS = fs.f, fs.t
	r.prevS = fs.t
	r.lastMoveS = 0
	r.prevSettled = false
	r.stepExtMMPerS, r.bandExtMM = math.NaN(), fs.ext
}

// follow runs the hold and unload logic on one filtered sample.
func (d *Detector) follow(fs sample, rawT float64) {
	r := &d.run
	if fs.f > r.cyclePeakN {
		r.cyclePeakN = fs.f
	}
	gapS := 10 * d.dtS
	if gapS < d.cfg.SettleMinS {
		gapS = d.cfg.SettleMinS
	}
	gap := fs.t-r.prevS > gapS
	r.prevS = fs.t
	if r.phase == seeking {
		if gap {
			// A hole in the record: what came before says nothing about
			// whether the reading after it has settled.
			d.restartSettle(fs)
		}
		d.seek(fs, rawT)
		return
	}
	if math.Abs(fs.f-r.refN) > d.bandN(r.refN) {
		// Two readings in a row outside the band: the load moved.
		r.outN++
		if r.outN >= 2 {
			if r.phase == holding {
				d.closeHold(r.lastInS)
			}
			d.restartSettle(fs)
		}
		return
	}
	r.outN = 0
	a := d.dtS / followTauS
	if a > 1 {
		a = 1
	}
	r.refN += a * (fs.f - r.refN)
	r.lastInS = fs.t
	r.follF.add(fs.t, fs.rawF)
	if finite(fs.ext) {
		r.follExt.add(fs.t, fs.ext)
	}
	// Only a deliberate unload ends a test this way: a hanger hung alone
	// at the start is not one.
	if r.phase == resting && len(d.unloads) > 0 && fs.t-r.restStartS >= d.cfg.EndHoldS {
		d.emit(reduce.Event{Kind: reduce.EventEnd, TimeS: fs.t}, rawT)
		d.state = Ended
	}
}

// holdLevelFraction: a hold's band is at most this fraction of the load
// it holds (above the idle baseline), so small dead weights on a large
// load cell still tell one step from the next: 2 % is less than any step
// a hanger is loaded in (common practice), far more than a settled
// reading wanders.
const holdLevelFraction = 0.02

// bandN is the hold band at a force level: HoldBandFraction of the range,
// narrowed to holdLevelFraction of the level for small loads, never below
// 8 noise floors (or resolution steps).
func (d *Detector) bandN(levelN float64) float64 {
	r := &d.run
	b := math.Min(r.holdBandN, holdLevelFraction*math.Abs(levelN-r.baseN))
	return math.Max(b, 8*math.Max(r.sigmaN, d.noiseFloorN()))
}

// followTauS is how fast a hold's reference follows a slow relaxation.
const followTauS = 2

// seek feeds the settle window and reports a hold or an unload once the
// reading has settled.
func (d *Detector) seek(fs sample, rawT float64) {
	r := &d.run
	if math.Abs(fs.f-r.bandRefN) > d.bandN(r.bandRefN) {
		r.lastMoveS = fs.t - r.bandStartS
		if r.lastMoveS > 0 && finite(fs.ext) && finite(r.bandExtMM) {
			// Less the extension noise (the set threshold), so that a
			// quick move of the force does not turn noise into pace.
			if v := (math.Abs(fs.ext-r.bandExtMM) - r.setThrMM) / r.lastMoveS; v > 0 && !(v <= r.stepExtMMPerS) {
				r.stepExtMMPerS = v
			}
		}
		r.bandRefN, r.bandStartS, r.bandExtMM = fs.f, fs.t, fs.ext
	}
	r.cur.f.add(fs.t, fs.rawF)
	if finite(fs.ext) {
		r.cur.ext.add(fs.t, fs.ext)
	}
	if finite(fs.xh) {
		r.cur.xh.add(fs.t, fs.xh)
	}
	if fs.t-r.cur.startS < r.blockLenS {
		return
	}
	r.ring[r.ringAt] = r.cur
	r.ringAt = (r.ringAt + 1) % settleBlocks
	if r.ringN < settleBlocks {
		r.ringN++
	}
	r.cur = block{startS: fs.t}
	if r.ringN < settleBlocks {
		return
	}
	var w block
	for i := 0; i < settleBlocks; i++ {
		b := &r.ring[(r.ringAt+i)%settleBlocks]
		w.f.merge(&b.f)
		w.ext.merge(&b.ext)
		w.xh.merge(&b.xh)
	}
	// Two windows in a row, a quarter apart, must be settled: the swing
	// stays down, and the reading reported is from the later one.
	ok := d.settled(&w)
	confirmed := ok && r.prevSettled
	r.prevSettled = ok
	if !confirmed {
		return
	}
	d.onSettled(&w, fs, rawT)
}

// settled tells whether the window's force scatters about a line by no
// more than the noise and has stopped drifting. A drift up to the hold
// band is allowed only when the crosshead is read and stands still: that
// is relaxation at a fixed position. Without a crosshead (dead weights)
// the force of a hold is constant, and a drift is a swing not yet died
// out, possibly aliased by a slow sample rate into a slow wave.
func (d *Detector) settled(w *block) bool {
	r := &d.run
	if w.f.n < 8 {
		return false
	}
	noise := d.cfg.SettleNoiseK * math.Max(r.sigmaN, d.noiseFloorN()) * scatterAllowance(w.f.n-1)
	if w.f.residStd() > noise {
		return false
	}
	drift := math.Abs(w.f.slope()) * d.cfg.SettleMinS
	if w.xh.n >= w.f.n/2 {
		return drift <= d.bandN(w.f.mean()) && math.Abs(w.xh.slope()) <= d.cfg.HoldCrossheadMaxMMPerS
	}
	// Without a crosshead the force of a hold is constant: its scatter
	// about the mean (not about a line, which could take up part of a
	// slow swing) must be within the noise. A hold must follow a load
	// step: the force crossed the hold band quickly before it settled; a
	// continuous test creeping slowly over its flat top does not. And the
	// extension, if read, must have slowed down well below its pace
	// during the step: creep under dead weights is slow next to the
	// stretch a step gives, while a continuous test keeps its pace.
	if drift > 2*noise || w.f.std() > noise || r.lastMoveS > stepMaxS {
		return false
	}
	if w.ext.n >= w.f.n/2 && finite(r.stepExtMMPerS) {
		return math.Abs(w.ext.slope()) <= holdExtSlowdown*r.stepExtMMPerS
	}
	return true
}

// holdExtSlowdown: the extension rate of a hold is below this fraction of
// its fastest during the step before it.
const holdExtSlowdown = 0.25

// stepMaxS is the longest a load step may take to cross the hold band:
// weights put on by hand in well under a second (common practice).
const stepMaxS = 2

// onSettled classes a settled reading as a hold or an unloaded rest.
func (d *Detector) onSettled(w *block, fs sample, rawT float64) {
	r := &d.run
	level := w.f.mean()
	extMM, xhMM := math.NaN(), math.NaN()
	if w.ext.n >= w.f.n/2 {
		extMM = w.ext.mean()
	}
	if w.xh.n >= w.f.n/2 {
		xhMM = w.xh.mean()
	}
	r.refN, r.outN, r.lastInS = level, 0, fs.t
	r.follF, r.follExt = w.f, w.ext
	if level-r.unloadLevelN <= d.bandN(level) {
		r.phase = resting
		r.restStartS = r.bandStartS
		if r.cyclePeakN-r.unloadLevelN > d.bandN(r.cyclePeakN) {
			d.unload(level, extMM, xhMM, fs.t, rawT)
		}
		r.cyclePeakN, r.cycleHasHld = level, false
		return
	}
	r.phase = holding
	h := reduce.Hold{StartS: r.bandStartS, SettledS: fs.t, EndS: fs.t, ForceN: level, ExtensionMM: extMM}
	if !finite(extMM) {
		h.ExtensionMM = 0
		d.flag(FlagHoldExtensionUnknown)
	}
	d.holds = append(d.holds, h)
	r.holdIdx = len(d.holds) - 1
	if !r.cycleHasHld || level > r.cycleHoldN {
		r.cycleHoldN, r.cycleHasHld = level, true
	}
	e := d.emit(reduce.Event{Kind: reduce.EventHold, TimeS: fs.t, ForceN: fptr(level)}, rawT)
	hc := h
	e.Hold = &hc
}

// closeHold ends the open hold at endS with its creep and relaxation rates.
func (d *Detector) closeHold(endS float64) {
	r := &d.run
	if r.holdIdx < 0 {
		return
	}
	d.finishHold(&d.holds[r.holdIdx], endS)
	r.holdIdx = -1
}

func (d *Detector) finishHold(h *reduce.Hold, endS float64) {
	r := &d.run
	h.EndS = endS
	h.RelaxationNPerS = r.follF.slope()
	if r.follExt.n >= 3 {
		h.CreepMMPerS = r.follExt.slope()
	}
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// scatterAllowance is how far the standard deviation of k+1 readings of
// pure noise may exceed the noise's own by chance, once in a hundred: the
// square root of the 99th percentile of χ²(k)/k, by the Wilson–Hilferty
// approximation (textbook statistics). About 1.53 for k = 10, 1.24 for
// 50, 1.02 for 5000: a slow board's few readings get the room they need,
// a fast board's many do not hide a swing.
func scatterAllowance(k float64) float64 {
	if k < 1 {
		k = 1
	}
	const z99 = 2.326
	c := 1 - 2/(9*k) + z99*math.Sqrt(2/(9*k))
	return math.Sqrt(c * c * c)
}
