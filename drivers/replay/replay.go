package replay

import (
	"context"
	"fmt"
	"math"
	"sync"
	"time"

	"framed/drivers"
	"framed/drivers/builtin"
)

// Version is the replay driver's version, reported by Describe.
const Version = "0.1.0"

// unpacedBatch is the batch size when pace is "none"; realtime batches
// are also capped at it.
const unpacedBatch = 1024

func init() {
	builtin.Register("replay", func() drivers.Driver { return New() })
}

// Replay plays a curve file as a driver.
type Replay struct {
	mu        sync.Mutex
	cfg       *settings
	streaming bool
	lastNS    int64
	samples   uint64
	batches   uint64
	faults    uint64
}

var _ drivers.Driver = (*Replay)(nil)

// New returns an unconfigured replay driver.
func New() *Replay { return &Replay{} }

var allChannels = []drivers.Channel{
	{Name: "force", Quantity: drivers.QuantityForce, Unit: "N"},
	{Name: "ext", Quantity: drivers.QuantityExtension, Unit: "mm"},
	{Name: "crosshead", Quantity: drivers.QuantityCrosshead, Unit: "mm"},
}

// Describe reports the driver; before a file is configured it lists
// every channel a curve file can hold.
func (d *Replay) Describe(ctx context.Context) (drivers.Info, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.cfg != nil {
		return info(d.cfg), nil
	}
	return drivers.Info{Driver: "replay", Version: Version, Channels: append([]drivers.Channel(nil), allChannels...)}, nil
}

func info(s *settings) drivers.Info {
	c := s.curve
	var ch []drivers.Channel
	for k, col := range [][]float64{c.ForceN, c.ExtensionMM, c.CrossheadMM} {
		if col != nil {
			x := allChannels[k]
			for _, v := range col {
				if !math.IsNaN(v) {
					x.RangeMax = max(x.RangeMax, math.Abs(v))
				}
			}
			ch = append(ch, x)
		}
	}
	rate := s.RateHz
	if rate == 0 {
		rate = s.idleHz
	}
	return drivers.Info{Driver: "replay", Version: Version, Channels: ch, SampleRateHz: rate}
}

// Configure checks the config, then reads the file. Any failure wraps
// drivers.ErrBadConfig and leaves the driver as it was.
func (d *Replay) Configure(ctx context.Context, config []byte) (drivers.Info, error) {
	s, err := parseSettings(config)
	if err != nil {
		return drivers.Info{}, err
	}
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.streaming {
		return drivers.Info{}, fmt.Errorf("replay: configure while streaming: %w", drivers.ErrStreaming)
	}
	d.cfg = &s
	return info(&s), nil
}

// Stream plays the recording from its beginning.
func (d *Replay) Stream(ctx context.Context) (<-chan drivers.Batch, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.cfg == nil {
		return nil, fmt.Errorf("replay: %w", drivers.ErrNotConfigured)
	}
	if d.streaming {
		return nil, fmt.Errorf("replay: %w", drivers.ErrStreaming)
	}
	d.streaming = true
	p := newPlayer(d.cfg)
	startNS := max(time.Now().UnixNano(), d.lastNS+1)
	out := make(chan drivers.Batch, 1)
	go d.pump(ctx, d.cfg, p, startNS, out)
	return out, nil
}

// Health reports the counters; a file is always OK once read.
func (d *Replay) Health(ctx context.Context) (drivers.Health, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	msg := "not configured"
	switch {
	case d.streaming:
		msg = "playing " + d.cfg.Path
	case d.cfg != nil:
		msg = "configured: " + d.cfg.Path
	}
	return drivers.Health{OK: true, Message: msg, Counters: map[string]uint64{
		"samples":         d.samples,
		"batches":         d.batches,
		"injected_faults": d.faults,
	}}, nil
}
