package lineserial

import (
	"context"
	"fmt"
	"sync"
	"time"

	"framed/drivers"
)

// DriverName is the driver kind in configs and Info.
const DriverName = "lineserial"

// Version of the driver; bump it when the line handling changes.
const Version = "1.0.0"

// Driver reads a line-protocol board. The zero value is not usable; call New.
type Driver struct {
	open Opener

	mu        sync.Mutex
	cfg       *Config
	streaming bool
	connected bool
	message   string
	lastNS    int64 // last sample time of the previous stream
	counters  counters
}

var _ drivers.Driver = (*Driver)(nil)

// New returns a driver that opens real serial ports.
func New() *Driver { return NewWithOpener(openSerial) }

// NewWithOpener returns a driver that opens ports with open, for tests
// with a playback port.
func NewWithOpener(open Opener) *Driver {
	return &Driver{open: open, message: "not configured"}
}

// Describe reports the driver kind, and the channels once configured.
func (d *Driver) Describe(ctx context.Context) (drivers.Info, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.cfg != nil {
		return d.cfg.Info(), nil
	}
	return drivers.Info{Driver: DriverName, Version: Version}, nil
}

// Configure validates config before any I/O; a bad config changes nothing.
func (d *Driver) Configure(ctx context.Context, config []byte) (drivers.Info, error) {
	c, err := ParseConfig(config)
	if err != nil {
		return drivers.Info{}, err
	}
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.streaming {
		return drivers.Info{}, fmt.Errorf("%w: lineserial: stop the stream before reconfiguring", drivers.ErrStreaming)
	}
	d.cfg = &c
	d.message = "configured for " + c.Port
	return c.Info(), nil
}

// Health reports the port state and the counters.
func (d *Driver) Health(ctx context.Context) (drivers.Health, error) {
	d.mu.Lock()
	h := drivers.Health{OK: d.cfg != nil && (!d.streaming || d.connected), Message: d.message}
	d.mu.Unlock()
	h.Counters = d.counters.snapshot()
	return h, nil
}

func (d *Driver) setState(connected bool, msg string) {
	d.mu.Lock()
	d.connected, d.message = connected, msg
	d.mu.Unlock()
}

// Stream opens the port and streams until ctx ends. A port that cannot be
// opened at the start is an error wrapping drivers.ErrDeviceGone (the
// supervisor retries); a port lost later is reopened here with backoff.
func (d *Driver) Stream(ctx context.Context) (<-chan drivers.Batch, error) {
	d.mu.Lock()
	defer d.mu.Unlock()
	if d.cfg == nil {
		return nil, drivers.ErrNotConfigured
	}
	if d.streaming {
		return nil, drivers.ErrStreaming
	}
	c := *d.cfg
	port, err := d.open(c)
	if err != nil {
		d.counters.openFailures.Add(1)
		return nil, fmt.Errorf("%w: lineserial: open %q: %w", drivers.ErrDeviceGone, c.Port, err)
	}
	d.streaming, d.connected, d.message = true, true, "streaming from "+c.Port
	out := make(chan drivers.Batch, 8)
	go d.run(ctx, c, port, out)
	return out, nil
}

// run owns the port until ctx ends, reopening it when the device goes.
func (d *Driver) run(ctx context.Context, c Config, port Port, out chan<- drivers.Batch) {
	d.mu.Lock()
	floor := d.lastNS
	d.mu.Unlock()
	s := newStreamer(c, &d.counters, out, floor)
	defer func() {
		d.mu.Lock()
		d.lastNS = s.floorNS
		d.streaming, d.connected = false, false
		d.message = "stopped"
		d.mu.Unlock()
		close(out)
	}()
	for {
		readErr := s.readUntilGone(ctx, port)
		port.Close()
		if ctx.Err() != nil {
			return
		}
		d.setState(false, fmt.Sprintf("device gone (%v), reopening %s", readErr, c.Port))
		port = d.reopen(ctx, c)
		if port == nil {
			return
		}
		d.counters.reopens.Add(1)
		d.setState(true, "streaming from "+c.Port+" (reopened)")
		s.afterReopen()
	}
}

// reopen retries opening with doubling backoff up to ReopenMaxMS; nil
// when ctx ends first.
func (d *Driver) reopen(ctx context.Context, c Config) Port {
	wait := 20 * time.Millisecond
	maxWait := time.Duration(c.ReopenMaxMS) * time.Millisecond
	for {
		t := time.NewTimer(wait)
		select {
		case <-ctx.Done():
			t.Stop()
			return nil
		case <-t.C:
		}
		port, err := d.open(c)
		if err == nil {
			return port
		}
		d.counters.openFailures.Add(1)
		wait = min(2*wait, maxWait)
	}
}
