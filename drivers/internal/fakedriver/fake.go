package fakedriver

import (
	"context"
	"errors"
	"fmt"
	"os"
	"sync"
	"time"

	"framed/drivers"
)

// samplePeriodNS is the spacing of the fake samples (1 kHz nominal).
const samplePeriodNS = int64(time.Millisecond)

// reopenGap is the gap the fake reports after a fault with on_fault "reopen".
const reopenGap = 50 * time.Millisecond

// Driver is the fake driver. The zero value is not ready: use New.
type Driver struct {
	mu         sync.Mutex
	cfg        *Config
	streaming  bool
	lastTimeNS int64
	failed     bool
	counters   map[string]uint64
}

var _ drivers.Driver = (*Driver)(nil)

// New returns an unconfigured fake driver.
func New() drivers.Driver { return &Driver{counters: map[string]uint64{}} }

// Describe implements drivers.Driver.
func (d *Driver) Describe(context.Context) (drivers.Info, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	info := drivers.Info{Driver: "fake", Version: "1", SampleRateHz: 1000}
	if d.cfg != nil {
		info.Channels = d.cfg.channels()
	}
	return info, nil
}

// Configure implements drivers.Driver.
func (d *Driver) Configure(_ context.Context, raw []byte) (drivers.Info, error) {
	c, err := parseConfig(raw)
	if err != nil {
		return drivers.Info{}, err
	}
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.streaming {
		return drivers.Info{}, fmt.Errorf("fake: configure: %w", drivers.ErrStreaming)
	}
	d.cfg = &c
	d.failed = false
	return drivers.Info{Driver: "fake", Version: "1", SampleRateHz: 1000, Channels: c.channels()}, nil
}

// Health implements drivers.Driver.
func (d *Driver) Health(context.Context) (drivers.Health, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	h := drivers.Health{OK: !d.failed, Message: "scripted", Counters: map[string]uint64{}}
	if d.failed {
		h.Message = "fault file appeared"
	}
	for k, v := range d.counters {
		h.Counters[k] = v
	}
	return h, nil
}

// Stream implements drivers.Driver.
func (d *Driver) Stream(ctx context.Context) (<-chan drivers.Batch, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.cfg == nil {
		return nil, fmt.Errorf("fake: stream: %w", drivers.ErrNotConfigured)
	}
	if d.streaming {
		return nil, fmt.Errorf("fake: stream: %w", drivers.ErrStreaming)
	}
	d.streaming = true
	out := make(chan drivers.Batch)
	go d.run(ctx, *d.cfg, out)
	return out, nil
}

func (d *Driver) run(ctx context.Context, c Config, out chan<- drivers.Batch) {
	defer close(out)
	defer func() {
		d.mu.Lock()
		d.streaming = false
		d.mu.Unlock()
	}()
	d.mu.Lock()
	t := max(time.Now().UnixNano(), d.lastTimeNS+samplePeriodNS)
	d.mu.Unlock()
	var gap time.Duration
	var sample int64
	for seq := uint64(0); ; seq++ {
		if c.Batches > 0 && seq == uint64(c.Batches) {
			switch c.Error {
			case "device_gone":
				send(ctx, out, drivers.Batch{Seq: seq, Err: fmt.Errorf("fake: after %d batches: %w", seq, drivers.ErrDeviceGone)})
			case "other":
				send(ctx, out, drivers.Batch{Seq: seq, Err: errors.New("fake: scripted failure")})
			}
			return
		}
		if c.FaultFile != "" {
			if _, err := os.Stat(c.FaultFile); err == nil {
				d.count("faults")
				if c.OnFault == "end" {
					d.mu.Lock()
					d.failed = true
					d.mu.Unlock()
					send(ctx, out, drivers.Batch{Seq: seq, Err: fmt.Errorf("fake: fault file %q: %w", c.FaultFile, drivers.ErrDeviceGone)})
					return
				}
				if err := os.Remove(c.FaultFile); err != nil {
					send(ctx, out, drivers.Batch{Seq: seq, Err: fmt.Errorf("fake: reopen: %w", err)})
					return
				}
				d.count("reopens")
				gap = reopenGap
				t += int64(reopenGap)
			}
		}
		b := drivers.Batch{Seq: seq, GapBefore: gap, TimeNS: make([]int64, c.SamplesPerBatch), Values: make([][]float64, c.Channels)}
		gap = 0
		for i := range b.TimeNS {
			b.TimeNS[i] = t
			t += samplePeriodNS
		}
		for ch := range b.Values {
			col := make([]float64, c.SamplesPerBatch)
			for i := range col {
				col[i] = float64(sample+int64(i)) * float64(ch+1)
			}
			b.Values[ch] = col
		}
		sample += int64(c.SamplesPerBatch)
		d.mu.Lock()
		d.lastTimeNS = t - samplePeriodNS
		d.mu.Unlock()
		if !send(ctx, out, b) {
			return
		}
		d.count("batches")
		if c.BatchIntervalUS > 0 {
			tm := time.NewTimer(time.Duration(c.BatchIntervalUS) * time.Microsecond)
			select {
			case <-ctx.Done():
				tm.Stop()
				return
			case <-tm.C:
			}
		}
	}
}

func (d *Driver) count(name string) {
	d.mu.Lock()
	d.counters[name]++
	d.mu.Unlock()
}

// send delivers b unless ctx ends first.
func send(ctx context.Context, out chan<- drivers.Batch, b drivers.Batch) bool {
	select {
	case out <- b:
		return true
	case <-ctx.Done():
		return false
	}
}
