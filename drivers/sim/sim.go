package sim

import (
	"context"
	"fmt"
	"math"
	"sync"
	"time"

	"framed/drivers"
)

// Version is the sim driver's version, reported by Describe.
const Version = "0.1.0"

// pacedNoneBatch is the batch size when pace is "none".
const pacedNoneBatch = 1024

// Sim is the simulated frame driver.
type Sim struct {
	mu        sync.Mutex
	cfg       *settings
	streaming bool
	samples   uint64
	batches   uint64
	tests     uint64
	faults    uint64
	// lastNS is the last sample time sent, so a restarted stream's times
	// go on rising even after an unpaced stream ran ahead of the clock.
	lastNS int64
}

var _ drivers.Driver = (*Sim)(nil)

// New returns an unconfigured sim driver.
func New() *Sim { return &Sim{} }

// channels lists the channels for sensors s.
func channels(s Sensors) []drivers.Channel {
	ch := []drivers.Channel{
		{Name: "force", Quantity: drivers.QuantityForce, Unit: "N", RangeMax: s.ForceRangeN, Resolution: s.ForceStepN()},
		{Name: "ext", Quantity: drivers.QuantityExtension, Unit: "mm", RangeMax: s.ExtRangeMM, Resolution: s.ExtResolutionMM},
		{Name: "crosshead", Quantity: drivers.QuantityCrosshead, Unit: "mm", RangeMax: s.CrossheadRangeMM, Resolution: s.CrossheadResolutionMM},
	}
	if s.RawCounts {
		ch[0].RangeMax = math.Exp2(adcBits-1) - 1
		ch[1].RangeMax = math.Round(s.ExtRangeMM / s.ExtResolutionMM)
		ch[2].RangeMax = math.Round(s.CrossheadRangeMM / s.CrossheadResolutionMM)
		for i := range ch {
			ch[i].Unit, ch[i].Resolution = "counts", 1
		}
	}
	return ch
}

// Describe reports the driver with its default channels.
func (d *Sim) Describe(ctx context.Context) (drivers.Info, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.cfg != nil {
		return d.info(d.cfg), nil
	}
	return drivers.Info{Driver: "sim", Version: Version, Channels: channels(DefaultSensors)}, nil
}

func (d *Sim) info(s *settings) drivers.Info {
	return drivers.Info{Driver: "sim", Version: Version, Channels: channels(s.Sensors), SampleRateHz: s.RateHz}
}

// Configure validates config and keeps it for the next stream. A bad
// config wraps drivers.ErrBadConfig and leaves the driver as it was.
func (d *Sim) Configure(ctx context.Context, config []byte) (drivers.Info, error) {
	s, err := parseSettings(config)
	if err != nil {
		return drivers.Info{}, err
	}
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.streaming {
		return drivers.Info{}, fmt.Errorf("sim: configure while streaming: %w", drivers.ErrStreaming)
	}
	d.cfg = &s
	return d.info(&s), nil
}

// Stream starts the simulated frame. The script restarts from its
// beginning with every stream.
func (d *Sim) Stream(ctx context.Context) (<-chan drivers.Batch, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.cfg == nil {
		return nil, fmt.Errorf("sim: %w", drivers.ErrNotConfigured)
	}
	if d.streaming {
		return nil, fmt.Errorf("sim: %w", drivers.ErrStreaming)
	}
	d.streaming = true
	g := newGenerator(d.cfg)
	startNS := max(time.Now().UnixNano(), d.lastNS+int64(g.periodNS))
	out := make(chan drivers.Batch, 1)
	go d.pump(ctx, g, startNS, out)
	return out, nil
}

// Health reports the stream's counters; a simulated device is always OK.
func (d *Sim) Health(ctx context.Context) (drivers.Health, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	msg := "not configured"
	switch {
	case d.streaming:
		msg = "streaming"
	case d.cfg != nil:
		msg = "configured"
	}
	return drivers.Health{OK: true, Message: msg, Counters: map[string]uint64{
		"samples":         d.samples,
		"batches":         d.batches,
		"tests_done":      d.tests,
		"injected_faults": d.faults,
	}}, nil
}

// pump runs one stream until ctx ends or the injected fault fires.
func (d *Sim) pump(ctx context.Context, g *generator, startNS int64, out chan<- drivers.Batch) {
	defer func() {
		d.mu.Lock()
		d.streaming = false
		d.mu.Unlock()
		close(out)
	}()
	send := func(b drivers.Batch) bool {
		select {
		case out <- b:
		case <-ctx.Done():
			return false
		}
		d.mu.Lock()
		d.samples += uint64(len(b.TimeNS))
		d.batches++
		d.tests = g.sc.tests
		if n := len(b.TimeNS); n > 0 {
			d.lastNS = b.TimeNS[n-1]
		}
		if b.Err != nil {
			d.faults++
		}
		d.mu.Unlock()
		return b.Err == nil
	}
	start := time.Now()
	if g.cfg.Pace == PaceNone {
		for ctx.Err() == nil {
			if !send(g.batch(startNS, pacedNoneBatch)) {
				return
			}
		}
		return
	}
	tick := time.NewTicker(time.Duration(g.cfg.BatchMS * float64(time.Millisecond)))
	defer tick.Stop()
	for {
		select {
		case <-ctx.Done():
			return
		case now := <-tick.C:
			// Samples whose instants have passed, at most a second's
			// worth at once when the consumer was slow.
			due := int64(now.Sub(start).Seconds()*g.cfg.RateHz) + 1 - g.emitted
			due = min(due, int64(math.Ceil(g.cfg.RateHz)))
			if due <= 0 {
				continue
			}
			if !send(g.batch(startNS, int(due))) {
				return
			}
		}
	}
}
