package daemon

import (
	"encoding/json"
	"errors"
	"fmt"
	"log/slog"
	"slices"
	"time"

	"framed/daemon/store"
	"framed/reduce"
)

// reducer turns ended tests into result documents, off the acquisition
// goroutine: it reads the committed samples back (what a power cut would
// have left), reduces them with the same code as `framectl reduce`, stores
// the document as the test's next revision and queues it for delivery.
type reducer struct {
	log    *slog.Logger
	frame  string
	db     *store.DB
	opts   func() reduce.Options
	calibs func() ([]reduce.CalibrationRef, []string)
	// delivered is poked after a result is queued.
	delivered func()
	// done is told when a test is finished with, and how.
	done func(id string, err error)
}

func (r *reducer) run(in <-chan finishedTest, done chan<- struct{}) {
	defer close(done)
	for ft := range in {
		err := r.reduceOne(ft)
		if err != nil {
			r.log.Error("reduction failed", "test", ft.id, "err", err)
		}
		if r.done != nil {
			r.done(ft.id, err)
		}
	}
}

func (r *reducer) reduceOne(ft finishedTest) error {
	c, err := r.db.ReadSamples(ft.id)
	if err != nil {
		return fmt.Errorf("read samples of %s: %w", ft.id, err)
	}
	res := buildResult(c, ft, r.opts())
	res.TestID, res.Frame = ft.id, r.frame
	if !ft.started.IsZero() {
		res.StartedAt = ft.started.UTC().Format(time.RFC3339Nano)
	}
	refs, flags := r.calibs()
	res.Calibration = refs
	for _, f := range flags {
		addFlag(&res.Flags, f)
	}
	rev, err := r.db.NextRevision(ft.id)
	if err != nil {
		return err
	}
	res.Revision = rev
	res.Finite()
	doc, err := json.Marshal(res)
	if err != nil {
		return fmt.Errorf("encode result of %s: %w", ft.id, err)
	}
	if _, err := r.db.PutResult(ft.id, doc); err != nil && !errors.Is(err, store.ErrOutboxFull) {
		return fmt.Errorf("store result of %s: %w", ft.id, err)
	} else if err != nil {
		r.log.Error("outbox full: result stored but not queued; it is sent when the broker takes the backlog", "test", ft.id, "err", err)
	}
	if err := r.db.SetTestState(ft.id, store.StateReduced); err != nil {
		return err
	}
	r.log.Info("result stored", "test", ft.id, "revision", rev, "quantities", len(res.Quantities), "flags", res.Flags)
	if r.delivered != nil {
		r.delivered()
	}
	return nil
}

// buildResult reduces a test; when the data cannot support a reduction
// (no specimen geometry, no force) the document still goes out with the
// events and a flag saying why, so the lab sees the test happened.
func buildResult(c reduce.Curve, ft finishedTest, opt reduce.Options) reduce.Result {
	res, err := reduce.Reduce(c, ft.specimen, ft.detected, opt)
	if err != nil {
		res = reduce.Result{
			Schema:   reduce.SchemaVersion,
			Specimen: reduce.SpecimenInfo{Specimen: ft.specimen},
			Events:   ft.detected.Events,
			Holds:    ft.detected.Holds,
			Unloads:  ft.detected.Unloads,
			Flags:    slices.Clone(ft.detected.Flags),
		}
		res.ElasticLimit = ft.detected.ElasticLimit
		addFlag(&res.Flags, "not-reduced")
		res.Quantities = forceOnly(c)
	}
	for _, f := range ft.flags {
		addFlag(&res.Flags, f)
	}
	if res.Events == nil {
		res.Events = []reduce.Event{}
	}
	if res.Holds == nil {
		res.Holds = []reduce.Hold{}
	}
	if res.Unloads == nil {
		res.Unloads = []reduce.Unload{}
	}
	if res.Quantities == nil {
		res.Quantities = []reduce.Quantity{}
	}
	if res.Flags == nil {
		res.Flags = []string{}
	}
	return res
}

// forceOnly reports Fm when nothing else can be reduced.
func forceOnly(c reduce.Curve) []reduce.Quantity {
	fm, ok := 0.0, false
	for _, f := range c.ForceN {
		if f == f && (!ok || f > fm) {
			fm, ok = f, true
		}
	}
	if !ok {
		return []reduce.Quantity{}
	}
	return []reduce.Quantity{{Symbol: "Fm", Value: fm, Unit: "N", Method: "largest force recorded"}}
}

func addFlag(flags *[]string, f string) {
	if !slices.Contains(*flags, f) {
		*flags = append(*flags, f)
	}
}
