package daemon

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"math"
	"os"
	"path/filepath"
	"sync"
	"time"

	"framed/daemon/calib"
	"framed/daemon/detect"
	"framed/daemon/publish"
	"framed/daemon/store"
	"framed/drivers"
	"framed/reduce"
)

// Options are the parts of a run that do not belong in a config file.
type Options struct {
	Logger *slog.Logger
	// Self is the path of the framed binary, launched in driver mode for
	// built-in drivers (default: os.Executable).
	Self string
	// SpecimenFallback gives the specimen of a test when nobody queued one
	// (the demo hands out its script's specimens in order).
	SpecimenFallback func() (reduce.Specimen, bool)
	// OnDriverRestart is called when a driver process is restarted.
	OnDriverRestart func(driver string)
	// Ready, when set, is called once the daemon acquires and publishes.
	Ready func(d *Daemon)
}

// Daemon is a running framed.
type Daemon struct {
	cfg  Config
	opt  Options
	log  *slog.Logger
	db   *store.DB
	pub  *publish.Publisher
	emb  *publish.Embedded
	cal  *calib.History
	sups []*supervisor
	spec *specimenQueue
	ctl  *controlServer

	brokerURL string
	started   time.Time
	// calChanged wakes the acquisition loop to reload calibrations at once
	// after a tare or span, so no batch is converted with the old model.
	calChanged chan struct{}

	mu      sync.Mutex
	state   string // idle | running | storage-error
	testID  string
	recent  recentReadings
	srcs    [nSignals]source
	infos   []drivers.Info
	lastErr string
	// reducing holds tests handed to the reducer and not yet done, so
	// recovery never queues a test twice.
	reducing map[string]bool
	// recover is set after a storage failure: tests it left open are
	// closed and reduced once the store takes writes again.
	recover  bool
	finished chan finishedTest
}

// StorePath is the bbolt file inside a state directory.
func StorePath(stateDir string) string { return filepath.Join(stateDir, "framed.db") }

// Run starts framed with a validated configuration and blocks until ctx
// ends or a fatal error (bad configuration, unusable state directory, a
// driver that cannot start) occurs. On ctx's end a running test is closed
// as interrupted and reduced, so nothing recorded is lost.
func Run(ctx context.Context, cfg Config, opt Options) error {
	if err := cfg.Validate(); err != nil {
		return err
	}
	if opt.Logger == nil {
		opt.Logger = slog.New(slog.NewTextHandler(os.Stderr, nil))
	}
	if opt.Self == "" {
		self, err := os.Executable()
		if err != nil {
			return fmt.Errorf("find own binary for built-in drivers: %w", err)
		}
		opt.Self = self
	}
	d := &Daemon{cfg: cfg, opt: opt, log: opt.Logger, state: "idle", started: time.Now(), calChanged: make(chan struct{}, 1)}
	d.spec = &specimenQueue{fallback: opt.SpecimenFallback}
	if d.cfg.Specimen != nil && opt.SpecimenFallback == nil {
		def := *d.cfg.Specimen
		d.spec.fallback = func() (reduce.Specimen, bool) { return def, true }
	}
	return d.run(ctx)
}

func (d *Daemon) run(ctx context.Context) (err error) {
	if err := os.MkdirAll(d.cfg.StateDir, 0o750); err != nil {
		return fmt.Errorf("state directory: %w", err)
	}
	d.db, err = store.Open(StorePath(d.cfg.StateDir), store.Options{CommitInterval: d.cfg.CommitInterval(), OutboxMax: d.cfg.Store.OutboxMax})
	if err != nil {
		return fmt.Errorf("open store in %s: %w", d.cfg.StateDir, err)
	}
	defer d.db.Close()
	if d.cal, err = calib.NewHistory(d.db.Bolt()); err != nil {
		return fmt.Errorf("calibration history: %w", err)
	}
	if err := d.startBroker(); err != nil {
		return err
	}
	if d.emb != nil {
		defer d.emb.Close()
	}
	if err := d.startPublisher(ctx); err != nil {
		return err
	}
	defer d.pub.Close()

	// Drivers: the first start is synchronous so a bad driver stops us now.
	runCtx, cancel := context.WithCancel(ctx)
	defer cancel()
	for i, dc := range d.cfg.Drivers {
		s := &supervisor{idx: i, cfg: dc, self: d.opt.Self, log: d.log}
		info, err := s.start(runCtx)
		if err != nil {
			for _, o := range d.sups {
				o.kill()
			}
			return err
		}
		d.sups = append(d.sups, s)
		d.infos = append(d.infos, info)
		s.pollHealth(runCtx)
	}
	defer func() {
		for _, s := range d.sups {
			s.kill()
		}
	}()
	if d.srcs, err = mapChannels(d.cfg.Channels, d.cfg.Drivers, d.infos); err != nil {
		return err
	}

	ctl, err := startControl(d, filepath.Join(d.cfg.StateDir, ControlSocketName))
	if err != nil {
		return err
	}
	d.ctl = ctl
	defer ctl.close()

	finished := make(chan finishedTest, 64)
	d.finished, d.reducing = finished, map[string]bool{}
	reducerDone := make(chan struct{})
	red := &reducer{log: d.log, frame: d.cfg.Frame, db: d.db, opts: d.reduceOptions, calibs: d.calibrationRefs, delivered: d.pub.Notify, done: d.reduced}
	go red.run(finished, reducerDone)
	d.recoverTests("")

	batches := make(chan driverBatch, 64)
	notes := make(chan driverNote, 16)
	var wg sync.WaitGroup
	for _, s := range d.sups {
		wg.Add(1)
		go func() { defer wg.Done(); s.run(runCtx, batches, notes) }()
	}
	if d.opt.Ready != nil {
		d.opt.Ready(d)
	}
	d.log.Info("framed running", "frame", d.cfg.Frame, "broker", d.brokerURL, "state", d.cfg.StateDir, "drivers", len(d.sups))
	loopErr := d.loop(runCtx, batches, notes)
	cancel()
	wg.Wait()
	close(finished)
	<-reducerDone
	if loopErr != nil && !errors.Is(loopErr, context.Canceled) {
		return loopErr
	}
	return nil
}

func (d *Daemon) startBroker() error {
	kind, addr, err := ParseBroker(d.cfg.Broker)
	if err != nil {
		return err
	}
	if kind != "embedded" {
		d.brokerURL = addr
		return nil
	}
	emb, err := publish.StartEmbedded(addr)
	if err != nil {
		return err
	}
	d.emb = emb
	d.brokerURL = "tcp://" + emb.Addr()
	d.log.Info("embedded MQTT broker listening", "addr", emb.Addr())
	return nil
}

func (d *Daemon) startPublisher(ctx context.Context) error {
	pc := publish.Config{
		Broker: d.brokerURL, Root: d.cfg.MQTT.Root, Frame: d.cfg.Frame,
		ClientID: d.cfg.MQTT.ClientID, Username: d.cfg.MQTT.Username,
		CAFile: d.cfg.MQTT.CAFile, CertFile: d.cfg.MQTT.CertFile, KeyFile: d.cfg.MQTT.KeyFile,
	}
	if d.cfg.MQTT.PasswordFile != "" {
		pw, err := os.ReadFile(d.cfg.MQTT.PasswordFile)
		if err != nil {
			return fmt.Errorf("mqtt.password_file: %w", err)
		}
		pc.Password = string(trimNL(pw))
	}
	if d.cfg.MQTT.LiveHz > 0 {
		pc.LiveRateHz = d.cfg.MQTT.LiveHz
	}
	pc.Commands = d.cfg.MQTT.RemoteCommands
	if pc.Username != "" && pc.Username != d.cfg.Frame {
		d.log.Warn("the broker user name differs from the frame id: with per-frame topic rules (deploy/mosquitto) the broker acknowledges and drops this frame's results", "frame", d.cfg.Frame, "username", pc.Username)
	}
	p, err := publish.New(pc, d.db, d.log)
	if err != nil {
		return err
	}
	if err := p.Start(ctx); err != nil {
		return err
	}
	d.pub = p
	go func() {
		for sp := range p.Specimens() {
			if err := d.spec.push(sp); err != nil {
				d.log.Warn("specimen not queued", "specimen", sp.ID, "err", err)
			}
		}
	}()
	go func() {
		for c := range p.Commands() {
			d.remoteCommand(c)
		}
	}()
	return nil
}

// loop is the acquisition core: merge, calibrate, detect, store.
func (d *Daemon) loop(ctx context.Context, batches <-chan driverBatch, notes <-chan driverNote) error {
	rates := make([]float64, len(d.infos))
	delays := make([]float64, len(d.infos))
	for i, in := range d.infos {
		rates[i] = in.SampleRateHz
		delays[i] = d.cfg.Drivers[i].DelayMS
	}
	epoch := time.Now()
	m := newMerger(epoch.UnixNano(), d.srcs, rates, delays, int64(time.Second))
	dcfg := detect.Config{
		ForceRangeN: d.forceRangeN(), PreTriggerS: d.cfg.Detect.PreTriggerS,
		StartFraction: d.cfg.Detect.StartFraction, HangerN: d.cfg.Detect.HangerN, EndHoldS: d.cfg.Detect.EndHoldS,
	}
	det, err := detect.New(dcfg)
	if err != nil {
		return fmt.Errorf("%w: detect: %w", ErrBadConfig, err)
	}
	life := &lifecycle{
		log: d.log, frame: d.cfg.Frame, db: d.db, det: det, hist: newHistory(d.cfg.Detect.PreTriggerS + 1),
		epoch: epoch, preS: d.cfg.Detect.PreTriggerS, sink: d, nextSpecimen: d.spec.pop, handOff: d.handOff,
	}
	health := time.NewTicker(5 * time.Second)
	defer health.Stop()
	liveEvery := time.Duration(0)
	if d.cfg.MQTT.LiveHz > 0 {
		liveEvery = time.Duration(float64(time.Second) / d.cfg.MQTT.LiveHz)
	}
	var lastLive time.Time
	cal := d.loadCalibrations()
	prune := time.NewTicker(retentionEvery)
	defer prune.Stop()
	d.applyRetention()
	for {
		select {
		case <-ctx.Done():
			if life.test != nil {
				if err := life.end(true); err != nil {
					d.log.Error("closing the interrupted test", "err", err)
				}
			}
			return ctx.Err()
		case n := <-notes:
			if n.restart {
				life.flag("driver-restarted")
				if d.opt.OnDriverRestart != nil {
					d.opt.OnDriverRestart(d.cfg.Drivers[n.driver].Name)
				}
			} else {
				life.flag("data-gap")
				d.log.Warn("driver stream broke", "driver", d.cfg.Drivers[n.driver].Name, "err", errString(n.err))
			}
		case <-prune.C:
			d.applyRetention()
		case <-d.calChanged:
			cal = d.loadCalibrations()
		case <-health.C:
			for _, s := range d.sups {
				s.pollHealth(ctx)
			}
			cal = d.loadCalibrations()
			d.mu.Lock()
			again := d.recover
			d.recover = false
			d.mu.Unlock()
			if again && !d.recoverTests(d.currentTest(life)) {
				d.mu.Lock()
				d.recover = true
				d.mu.Unlock()
			}
		case db := <-batches:
			if n := len(db.b.TimeNS); n > 0 {
				d.sups[db.driver].observeLag(time.Now().UnixNano() - db.b.TimeNS[n-1])
			}
			if db.b.GapBefore > 0 {
				life.flag("data-gap")
			}
			out := m.push(db.driver, &db.b)
			if out.Len() == 0 {
				continue
			}
			if len(m.stalledDrivers()) > 0 {
				for _, sd := range m.stalledDrivers() {
					for s := range nSignals {
						if d.srcs[s].driver == sd {
							life.flag(signalNames[s] + "-stalled")
						}
					}
				}
			}
			d.recent.add(out.ForceN)
			cal.apply(&out)
			if err := life.step(out); err != nil {
				d.storageFailed(life, err)
				continue
			}
			d.setState(life)
			if liveEvery > 0 && time.Since(lastLive) >= liveEvery {
				lastLive = time.Now()
				d.publishLive(life, out)
			}
		}
	}
}

func errString(err error) string {
	if err == nil {
		return ""
	}
	return err.Error()
}

func (d *Daemon) currentTest(l *lifecycle) string {
	if l.test == nil {
		return ""
	}
	return l.test.id
}

func (d *Daemon) setState(l *lifecycle) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if l.test != nil {
		d.state, d.testID = "running", l.test.id
	} else {
		d.state, d.testID = "idle", ""
	}
}

// storageFailed handles a failed write (full disk, I/O error): the running
// test is closed as interrupted with what was committed, an event says why,
// and acquisition carries on watching so it recovers when space returns.
func (d *Daemon) storageFailed(l *lifecycle, err error) {
	d.mu.Lock()
	first := d.lastErr != err.Error()
	d.lastErr = err.Error()
	d.state = "storage-error"
	d.recover = true
	d.mu.Unlock()
	id := d.currentTest(l)
	if first {
		d.log.Error("storage failed: acquisition of this test stopped; framed keeps watching and resumes when the store takes writes", "err", err)
		d.pub.Event(publish.EventMsg{TestID: id, Kind: "storage-error"})
	}
	if l.test != nil {
		l.flag("storage-error")
		if e := l.end(true); e != nil {
			d.log.Error("closing the test after a storage failure", "test", id, "err", e)
		}
	}
}

func (d *Daemon) publishLive(l *lifecycle, c reduce.Curve) {
	i := c.Len() - 1
	at := func(col []float64) float64 {
		if col == nil {
			return math.NaN()
		}
		return col[i]
	}
	d.pub.Live(publish.Reading{TimeS: c.TimeS[i], ForceN: at(c.ForceN), ExtensionMM: at(c.ExtensionMM), CrossheadMM: at(c.CrossheadMM)})
}

func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// publishEvent implements eventSink.
func (d *Daemon) publishEvent(testID string, ev reduce.Event, extra map[string]any) {
	d.pub.Event(publish.EventMsg{TestID: testID, Kind: ev.Kind, TimeS: ev.TimeS, ForceN: ev.ForceN, Detail: extra})
}

func (d *Daemon) forceRangeN() float64 {
	if d.cfg.Detect.ForceRangeN > 0 {
		return d.cfg.Detect.ForceRangeN
	}
	s := d.srcs[sigForce]
	if s.driver < 0 {
		return 0
	}
	return d.infos[s.driver].Channels[s.channel].RangeMax
}

// handOff queues an ended test for the reducer.
func (d *Daemon) handOff(ft finishedTest) {
	d.mu.Lock()
	d.reducing[ft.id] = true
	d.mu.Unlock()
	d.finished <- ft
}

// reduced is called by the reducer when a test is done (or failed).
func (d *Daemon) reduced(id string, err error) {
	d.mu.Lock()
	delete(d.reducing, id)
	if err != nil {
		d.recover = true // try again on the next round
	}
	d.mu.Unlock()
}

// recoverTests closes tests a crash, power cut or storage failure left
// open and reduces tests that ended without a result, so every recorded
// test gets one. skip is the test being recorded now. It reports whether
// every test was handled.
func (d *Daemon) recoverTests(skip string) bool {
	tests, err := d.db.Tests()
	if err != nil {
		d.log.Error("list stored tests", "err", err)
		return false
	}
	ok := true
	for _, t := range tests {
		d.mu.Lock()
		busy := d.reducing[t.ID]
		d.mu.Unlock()
		if t.ID == skip || busy {
			continue
		}
		if t.State != store.StateRunning && t.State != store.StateEnded && t.State != store.StateInterrupted {
			continue
		}
		if t.ResultRevision > 0 && t.State != store.StateRunning {
			continue
		}
		flags := []string{}
		if t.State == store.StateRunning {
			flags = append(flags, "interrupted")
			if err := d.db.SetTestState(t.ID, store.StateInterrupted, flags...); err != nil {
				d.log.Error("mark interrupted", "test", t.ID, "err", err)
				ok = false
				continue
			}
		}
		var sp reduce.Specimen
		hasSpec := len(t.Specimen) > 0 && unmarshalSpecimen(t.Specimen, &sp) == nil && sp != (reduce.Specimen{})
		c, err := d.db.ReadSamples(t.ID)
		if err != nil {
			d.log.Error("read samples of an interrupted test", "test", t.ID, "err", err)
			ok = false
			continue
		}
		det := detect.Offline(c, detect.Config{})
		d.log.Info("recovering a test left open", "test", t.ID, "samples", t.Samples)
		d.handOff(finishedTest{id: t.ID, specimen: sp, hasSpec: hasSpec, detected: det, flags: append(flags, t.Flags...), started: t.StartedAt})
	}
	return ok
}

// retentionEvery is how often the retention policy is applied.
const retentionEvery = 10 * time.Minute

// applyRetention deletes raw data the configured policy no longer keeps;
// the store never deletes a test whose result is not yet delivered.
func (d *Daemon) applyRetention() {
	p := store.RetentionPolicy{
		MaxAge:   time.Duration(d.cfg.Store.RetentionDays * 24 * float64(time.Hour)),
		MaxBytes: int64(d.cfg.Store.RetentionMB * 1e6),
	}
	if p.MaxAge == 0 && p.MaxBytes == 0 {
		return
	}
	deleted, err := d.db.Prune(p, time.Now())
	if err != nil {
		d.log.Error("retention", "err", err)
		return
	}
	if len(deleted) > 0 {
		d.log.Info("retention deleted old tests", "count", len(deleted), "oldest", deleted[0])
	}
}

// remoteCommand carries out an allowed remote command.
func (d *Daemon) remoteCommand(c publish.Command) {
	switch c.Cmd {
	case publish.CommandResend:
		if err := d.db.Requeue(c.TestID); err != nil {
			d.log.Warn("remote resend refused", "test", c.TestID, "err", err)
			return
		}
		d.pub.Notify()
	}
}
