package detect

import (
	"math"

	"framed/reduce"
)

// idleStats learns, while no test runs, the force baseline and noise floor
// and the extension and crosshead at rest, and watches for the start.
type idleStats struct {
	n               int
	lastF, base     float64
	noise           noiseEst
	extN            int
	lastExt, extRef float64
	varExt          float64
	xhN             int
	xhRef           float64
	// hangerExtN and hangerExtRef: the extension at rest with the empty
	// hanger on (force near base + HangerN), the reference a dead-weight
	// test's set is measured from, since every unload returns there.
	hangerExtN   int
	hangerExtRef float64
	lastQuietS   float64
	aboveSinceS  float64
	aboveN       int
	haveQuiet    bool
	lastNear     bool
	lastNear2    bool
	lastBaseNear bool
	lastF2       float64
}

func (s *idleStats) reset() {
	*s = idleStats{extRef: math.NaN(), xhRef: math.NaN(), hangerExtRef: math.NaN()}
}

// idleTauS is the memory of the idle averages: long enough to average the
// noise, short enough to follow a slow thermal drift of the zero.
const idleTauS = 2

// learn updates the idle averages with a raw sample. Only readings near
// the baseline count, so neither a slow loading ramp nor the first rise
// of a test drags the baseline, the noise or the rest readings along.
func (d *Detector) learn(x sample) {
	s := &d.idle
	s.n++
	a := 1 / float64(s.n)
	if w := d.dtS / idleTauS; a < w {
		a = w
	}
	// The noise is learnt from every reading below a quarter of the start
	// threshold (see noiseEst): no gate drawn from the estimate itself
	// can trap it too small.
	quiet := s.n <= 3 || math.Abs(x.f-s.base) <= d.startThresholdN()/4
	prevQuiet, prevQuiet2 := s.lastNear, s.lastNear2
	s.lastNear, s.lastNear2 = quiet, prevQuiet
	if quiet && prevQuiet && prevQuiet2 && s.n > 2 {
		if s.noise.add(x.f-s.lastF, x.f-2*s.lastF+s.lastF2) {
			d.updateSigma()
		}
	}
	s.lastF, s.lastF2 = x.f, s.lastF
	// The baseline and the rest readings only from readings within six
	// noise floors of it, so a slow ramp cannot drag them along.
	gate := d.idleSigmaN
	if q := d.quantum.stepN; q > gate {
		gate = q
	}
	near := s.n <= 3 || math.Abs(x.f-s.base) <= 6*gate
	prevNear := s.lastBaseNear
	s.lastBaseNear = near
	if s.n == 1 {
		s.base = x.f
	} else if near {
		s.base += a * (x.f - s.base)
	}
	if d.cfg.HangerN > 0 && finite(x.ext) && s.n > 3 && math.Abs(x.f-(s.base+d.cfg.HangerN)) <= 6*gate {
		s.hangerExtN++
		ah := 1 / float64(s.hangerExtN)
		if w := d.dtS / idleTauS; ah < w {
			ah = w
		}
		if s.hangerExtN == 1 {
			s.hangerExtRef = x.ext
		} else {
			s.hangerExtRef += ah * (x.ext - s.hangerExtRef)
		}
	}
	if !near {
		return
	}
	if finite(x.ext) {
		s.extN++
		ae := 1 / float64(s.extN)
		if w := d.dtS / idleTauS; ae < w {
			ae = w
		}
		if s.extN == 1 {
			s.extRef = x.ext
		} else {
			if prevNear && finite(s.lastExt) {
				de := x.ext - s.lastExt
				s.varExt += ae * (de*de/2 - s.varExt)
			}
			s.extRef += ae * (x.ext - s.extRef)
		}
	}
	s.lastExt = x.ext
	if finite(x.xh) {
		s.xhN++
		ax := 1 / float64(s.xhN)
		if w := d.dtS / idleTauS; ax < w {
			ax = w
		}
		if s.xhN == 1 {
			s.xhRef = x.xh
		} else {
			s.xhRef += ax * (x.xh - s.xhRef)
		}
	}
}

// sigmaN is the force noise floor: configured, or learnt with a floor.
// It is cached (updateSigma) as it is needed at every idle reading.
func (d *Detector) sigmaN() float64 { return d.idleSigmaN }

// updateSigma recomputes the cached noise floor and start threshold after
// the noise estimate changed.
func (d *Detector) updateSigma() {
	c := &d.cfg
	sig := c.NoiseFloorN
	if sig == 0 {
		e := &d.idle.noise
		sig = e.sigmaN
		if n := e.count(); n > 0 {
			// Widen an estimate from few readings by its own
			// uncertainty (about 1/sqrt(n) relative): a short idle
			// period must not make the settle test too strict.
			sig *= 1 + 2/math.Sqrt(float64(n))
		}
		sig = math.Max(sig, minNoiseFraction*c.ForceRangeN)
	}
	d.idleSigmaN = sig
	d.startThrN = math.Max(c.StartFraction*c.ForceRangeN, c.StartNoiseK*sig)
}

// startThresholdN is how far above the baseline the force must rise.
func (d *Detector) startThresholdN() float64 { return d.startThrN }

// quietNoiseK noise floors above the baseline is still "at rest" when
// dating the start back: wide enough that noise on a short, poorly learnt
// idle period rarely cuts the look-back short.
const quietNoiseK = 5

// watchStart looks for the force standing above the threshold for
// StartSustainS (and two filtered samples), and dates the start back to
// the last reading that was still within the noise of the baseline.
func (d *Detector) watchStart(fs sample, rawT float64) {
	s := &d.idle
	sig := d.sigmaN()
	excess := fs.f - s.base
	if excess <= quietNoiseK*sig || !s.haveQuiet {
		s.lastQuietS = fs.t
		s.haveQuiet = true
	}
	if excess <= d.startThresholdN() {
		s.aboveN = 0
		return
	}
	if s.aboveN == 0 {
		s.aboveSinceS = fs.t
	}
	s.aboveN++
	if s.aboveN >= 2 && fs.t-s.aboveSinceS >= d.cfg.StartSustainS {
		d.begin(fs, rawT)
	}
}

// begin freezes what was learnt at idle and starts following the test.
func (d *Detector) begin(fs sample, rawT float64) {
	c := &d.cfg
	s := &d.idle
	s.noise.recompute() // with every idle reading up to now
	d.updateSigma()
	sig := d.sigmaN()
	r := &d.run
	// (r.sigmaN is frozen here; the settle test still floors it by the
	// resolution seen, see noiseFloorN.)
	*r = runState{
		baseN:        s.base,
		sigmaN:       sig,
		unloadLevelN: s.base + c.HangerN,
		holdBandN:    math.Max(c.HoldBandFraction*c.ForceRangeN, 8*sig),
		extRef:       s.setRef(c.HangerN),
		xhRef:        s.xhRef,
		setThrMM:     c.SetThresholdMM,
		peakN:        fs.f,
		cyclePeakN:   fs.f,
		holdIdx:      -1,
		blockLenS:    c.SettleMinS / settleBlocks,
	}
	if r.setThrMM == 0 {
		r.setThrMM = math.Max(6*math.Sqrt(s.varExt), minSetThresholdMM)
	}
	r.startS = math.Max(s.lastQuietS, rawT-c.PreTriggerS)
	if math.Abs(s.base) > c.TareToleranceFraction*c.ForceRangeN+4*sig {
		d.flag(FlagForceNotTared)
	}
	d.state = Running
	d.brk.reset()
	d.restartSettle(fs)
	d.emit(reduce.Event{Kind: reduce.EventStart, TimeS: r.startS}, rawT)
}

// setRef is the extension sets are measured from: at rest with the empty
// hanger on when there is one and it was seen, else at rest unloaded.
func (s *idleStats) setRef(hangerN float64) float64 {
	if hangerN > 0 && s.hangerExtN > 0 {
		return s.hangerExtRef
	}
	return s.extRef
}
