package detect

import (
	"math"

	"framed/reduce"
)

// LookaheadSamples is how many samples after a sample the detector needs
// before it decides about it: one, for the three-point median.
const LookaheadSamples = 1

// Emission is one thing that happened, in the order it happened.
type Emission struct {
	Event reduce.Event
	// Hold carries the settled values of a hold event (its EndS and
	// creep and relaxation rates are final only in Detected).
	Hold *reduce.Hold
	// Unload carries the set of an unload event.
	Unload *reduce.Unload
	// ProvedAtS is the time of the sample that proved the event; latency
	// is measured from it.
	ProvedAtS float64
}

// phase is the sub-state of a running test.
type phase int

const (
	seeking phase = iota // the load is changing or swinging
	holding              // a hold has settled and is being followed
	resting              // unloaded, settled near zero (or the hanger's load)
)

// Detector is the event state machine. It is not safe for concurrent use;
// the daemon feeds it from one goroutine.
type Detector struct {
	cfg   Config
	state State
	med   median3
	out   []Emission

	lastT   float64
	dtS     float64 // running estimate of the sample interval
	samples int

	idle idleStats
	run  runState
	brk  breakWatch

	quantum     quantum
	maxQuantumN float64
	idleSigmaN  float64 // cached sigmaN
	startThrN   float64 // cached startThresholdN

	events  []reduce.Event
	holds   []reduce.Hold
	unloads []unloadRec
	flags   []string
}

// New checks cfg, fills its defaults and returns an armed detector. All
// buffers are allocated here so that Step allocates only on events.
func New(cfg Config) (*Detector, error) {
	c, err := cfg.withDefaults()
	if err != nil {
		return nil, err
	}
	d := &Detector{cfg: c, out: make([]Emission, 0, 8)}
	d.maxQuantumN = c.HoldBandFraction * c.ForceRangeN / 4
	d.brk.init(breakRingCap)
	d.Reset()
	return d, nil
}

// Config is the detector's configuration with defaults filled in.
func (d *Detector) Config() Config { return d.cfg }

// Reset arms the detector for the next test, forgetting the last one
// (including its learnt noise floor).
func (d *Detector) Reset() {
	d.state = Idle
	d.med = median3{}
	d.lastT = math.NaN()
	d.dtS = 0
	d.samples = 0
	d.quantum = quantum{}
	d.idle.reset()
	d.updateSigma()
	d.run = runState{}
	d.brk.reset()
	d.events = d.events[:0]
	d.holds = d.holds[:0]
	d.unloads = d.unloads[:0]
	d.flags = d.flags[:0]
}

// State is where the detector is in the test's life.
func (d *Detector) State() State { return d.state }

// StartTimeS is when the current test really began (where the force left
// the idle baseline), or NaN before a start. It is never earlier than
// PreTriggerS before the newest sample of the Step that emitted the start
// (Emission.ProvedAtS), so a daemon keeping PreTriggerS of history behind
// its newest sample can always store the test from its start.
func (d *Detector) StartTimeS() float64 {
	if d.state == Idle {
		return math.NaN()
	}
	return d.run.startS
}

// PreTriggerS is the longest look-back StartTimeS may take.
func (d *Detector) PreTriggerS() float64 { return d.cfg.PreTriggerS }

// Lookahead is the number of samples after a sample the detector needs
// before it decides about it (LookaheadSamples).
func (d *Detector) Lookahead() int { return LookaheadSamples }

// Step feeds one batch of samples (columns of equal length; ExtensionMM
// and CrossheadMM may be nil) and returns what happened in it, in order.
// The returned slice is reused by the next Step call: copy what must be
// kept. Samples with a NaN force are skipped. After the test has ended the
// remaining samples are ignored until Reset.
func (d *Detector) Step(b reduce.Curve) []Emission {
	d.out = d.out[:0]
	n := len(b.TimeS)
	if len(b.ForceN) < n {
		n = len(b.ForceN)
	}
	for i := 0; i < n && d.state != Ended; i++ {
		s := sample{t: b.TimeS[i], f: b.ForceN[i], ext: math.NaN(), xh: math.NaN()}
		if i < len(b.ExtensionMM) {
			s.ext = b.ExtensionMM[i]
		}
		if i < len(b.CrossheadMM) {
			s.xh = b.CrossheadMM[i]
		}
		if math.IsNaN(s.f) || math.IsInf(s.f, 0) || math.IsNaN(s.t) || math.IsInf(s.t, 0) {
			continue
		}
		d.sample(s)
	}
	return d.out
}

func (d *Detector) sample(s sample) {
	if d.samples > 0 && s.t > d.lastT {
		gap := s.t - d.lastT
		if d.dtS == 0 {
			d.dtS = gap
		} else {
			d.dtS += (gap - d.dtS) / 16
		}
	}
	d.lastT = s.t
	d.samples++
	d.quantum.see(s.f, d.maxQuantumN)
	if d.state == Idle {
		d.learn(s)
	}
	var fs sample
	if !d.med.push(&s, &fs) {
		return
	}
	switch d.state {
	case Idle:
		d.watchStart(fs, s.t)
	case Running:
		if d.watchBreak(fs, s.t) {
			return
		}
		d.follow(fs, s.t)
	}
}

func (d *Detector) emit(e reduce.Event, provedS float64) *Emission {
	d.events = append(d.events, e)
	d.out = append(d.out, Emission{Event: e, ProvedAtS: provedS})
	return &d.out[len(d.out)-1]
}

func (d *Detector) flag(code string) {
	for _, f := range d.flags {
		if f == code {
			return
		}
	}
	d.flags = append(d.flags, code)
}

func fptr(v float64) *float64 { return &v }
