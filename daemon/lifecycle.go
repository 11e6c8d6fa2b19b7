package daemon

import (
	"encoding/json"
	"errors"
	"fmt"
	"log/slog"
	"math"
	"slices"
	"time"

	"framed/daemon/detect"
	"framed/daemon/store"
	"framed/reduce"
)

// lifecycle turns the merged sample stream into tests: idle (watching, with
// a pre-trigger history), running (every sample stored, events published as
// they happen), ended (handed to the reducer). It runs on one goroutine and
// owns the detector, the history and the current test's appender.
type lifecycle struct {
	log   *slog.Logger
	frame string
	db    *store.DB
	det   *detect.Detector
	hist  *history
	// epoch is the wall-clock instant of merged time 0.
	epoch time.Time
	// preS: stored history before the detected start.
	preS float64
	sink eventSink
	// nextSpecimen pops the specimen for a starting test (nil: none known).
	nextSpecimen func() (reduce.Specimen, bool)
	// handOff passes each ended test to the reducer, off this goroutine.
	handOff func(finishedTest)

	test *runningTest
	rel  reduce.Curve // scratch: the batch on the test's time axis
}

// runningTest is the test being recorded.
type runningTest struct {
	id       string
	t0S      float64 // merged time of the test's first stored sample
	app      *store.Appender
	specimen reduce.Specimen
	hasSpec  bool
	flags    []string
	samples  int
}

// finishedTest is what the reducer needs of an ended test.
type finishedTest struct {
	id       string
	specimen reduce.Specimen
	hasSpec  bool
	detected reduce.Detected
	flags    []string
	started  time.Time
}

// eventSink publishes events as they happen.
type eventSink interface {
	publishEvent(testID string, ev reduce.Event, extra map[string]any)
}

// step feeds one merged batch. Errors are storage failures: the caller
// stops acquisition and reports them.
func (l *lifecycle) step(c reduce.Curve) error {
	if c.Len() == 0 {
		return nil
	}
	if l.test == nil {
		l.hist.add(c)
	} else if err := l.store(c); err != nil {
		return err
	}
	for _, em := range l.det.Step(c) {
		if err := l.handle(em); err != nil {
			return err
		}
	}
	return nil
}

func (l *lifecycle) handle(em detect.Emission) error {
	ev := em.Event
	switch ev.Kind {
	case reduce.EventStart:
		if l.test != nil {
			return nil
		}
		if err := l.begin(); err != nil {
			// Watch for a start again rather than follow a test that
			// has nowhere to go.
			l.det.Reset()
			l.hist.reset()
			return err
		}
	}
	if l.test == nil {
		if ev.Kind == reduce.EventEnd {
			l.det.Reset() // a test that could not be stored ended
		}
		return nil // events outside a stored test are not published
	}
	rel := ev
	rel.TimeS = roundUS(ev.TimeS - l.test.t0S)
	extra := map[string]any{}
	if em.Hold != nil {
		extra["force_N"] = finiteOrNil(em.Hold.ForceN)
		extra["extension_mm"] = finiteOrNil(em.Hold.ExtensionMM)
	}
	if em.Unload != nil {
		extra["set_mm"] = finiteOrNil(em.Unload.SetMM)
		extra["after_force_N"] = finiteOrNil(em.Unload.AfterForceN)
	}
	l.sink.publishEvent(l.test.id, rel, extra)
	if ev.Kind == reduce.EventEnd {
		return l.end(false)
	}
	return nil
}

func finiteOrNil(v float64) any {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return v
}

// begin opens a new test and stores the pre-trigger history.
func (l *lifecycle) begin() error {
	from := l.det.StartTimeS() - l.preS
	pre := l.hist.since(from)
	t0 := from
	if pre.Len() > 0 {
		t0 = pre.TimeS[0]
	}
	started := l.epoch.Add(time.Duration(t0 * float64(time.Second)))
	id := newTestID(started, l.db)
	sp, ok := reduce.Specimen{}, false
	if l.nextSpecimen != nil {
		sp, ok = l.nextSpecimen()
	}
	spec, _ := json.Marshal(sp)
	meta := store.TestMeta{ID: id, Frame: l.frame, StartedAt: started.UTC(), State: store.StateRunning, Specimen: spec}
	if err := l.db.CreateTest(meta); err != nil {
		return fmt.Errorf("start test %s: %w", id, err)
	}
	l.test = &runningTest{id: id, t0S: t0, app: l.db.Appender(id), specimen: sp, hasSpec: ok}
	if !ok {
		l.test.flags = append(l.test.flags, "specimen-unknown")
	}
	l.log.Info("test started", "test", id, "specimen", sp.ID)
	err := l.store(pre)
	l.hist.reset()
	return err
}

// store appends a batch to the running test on the test's own time axis.
func (l *lifecycle) store(c reduce.Curve) error {
	if c.Len() == 0 {
		return nil
	}
	l.rel.TimeS = l.rel.TimeS[:0]
	for _, t := range c.TimeS {
		l.rel.TimeS = append(l.rel.TimeS, t-l.test.t0S)
	}
	l.rel.ForceN, l.rel.ExtensionMM, l.rel.CrossheadMM = c.ForceN, c.ExtensionMM, c.CrossheadMM
	l.test.samples += c.Len()
	if err := l.test.app.Append(l.rel); err != nil {
		return fmt.Errorf("store samples of %s: %w", l.test.id, err)
	}
	return nil
}

// flag marks the running test (no-op when idle).
func (l *lifecycle) flag(f string) {
	if l.test != nil && !slices.Contains(l.test.flags, f) {
		l.test.flags = append(l.test.flags, f)
	}
}

// end closes the running test: everything is committed before the test is
// handed on, so the reducer reads exactly what a power cut would leave.
func (l *lifecycle) end(interrupted bool) error {
	t := l.test
	if t == nil {
		return nil
	}
	l.test = nil
	det := l.det.Detected()
	l.det.Reset()
	// What could not be committed is lost to the failure; what was
	// committed is closed and reduced all the same.
	closeErr := t.app.Close()
	state := store.StateEnded
	if interrupted || closeErr != nil {
		state = store.StateInterrupted
		t.flags = append(t.flags, "interrupted")
	}
	if err := l.db.SetTestState(t.id, state, t.flags...); err != nil {
		// The test stays "running" in the store; the daemon's periodic
		// recovery closes and reduces it once the store takes writes.
		return fmt.Errorf("close test %s: %w", t.id, errors.Join(closeErr, err))
	}
	// Move event times onto the test's axis.
	shift := func(v float64) float64 { return roundUS(v - t.t0S) }
	for i := range det.Events {
		det.Events[i].TimeS = shift(det.Events[i].TimeS)
	}
	for i := range det.Holds {
		h := &det.Holds[i]
		h.StartS, h.SettledS, h.EndS = shift(h.StartS), shift(h.SettledS), shift(h.EndS)
	}
	for i := range det.Unloads {
		det.Unloads[i].TimeS = shift(det.Unloads[i].TimeS)
	}
	l.log.Info("test ended", "test", t.id, "samples", t.samples, "interrupted", interrupted)
	meta, _ := l.db.Test(t.id)
	l.handOff(finishedTest{id: t.id, specimen: t.specimen, hasSpec: t.hasSpec, detected: det, flags: t.flags, started: meta.StartedAt})
	if closeErr != nil {
		return fmt.Errorf("commit samples of %s: %w", t.id, closeErr)
	}
	return nil
}

// newTestID names a test by its start time (UTC, to the second), with a
// counter when two start within one second. It is a valid MQTT topic level.
func newTestID(started time.Time, db *store.DB) string {
	base := started.UTC().Format("20060102T150405Z")
	id := base
	for n := 2; ; n++ {
		if _, err := db.Test(id); err != nil {
			return id
		}
		id = fmt.Sprintf("%s-%d", base, n)
	}
}

// roundUS rounds a time on the test's axis to the microsecond, so the
// subtraction of two large epoch-relative times leaves no binary noise in
// published documents (no sensor here resolves a microsecond).
func roundUS(s float64) float64 { return math.Round(s*1e6) / 1e6 }
