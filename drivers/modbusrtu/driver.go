package modbusrtu

import (
	"context"
	"fmt"
	"sync"
	"time"

	"framed/drivers"
)

// DriverName is the driver kind in configs and Info.
const DriverName = "modbusrtu"

// Version of the driver; bump it when polling or decoding changes.
const Version = "1.0.0"

// Driver polls one Modbus RTU slave. Create it with New.
type Driver struct {
	dial Dialer

	mu        sync.Mutex
	cfg       *Config
	streaming bool
	connected bool
	failing   bool // the last polls all failed
	message   string
	lastNS    int64
	counters  counters
}

var _ drivers.Driver = (*Driver)(nil)

// New returns a driver that opens real serial ports.
func New() *Driver { return NewWithDialer(dialRTU) }

// NewWithDialer returns a driver using dial, for tests with a fake client.
func NewWithDialer(dial Dialer) *Driver {
	return &Driver{dial: dial, message: "not configured"}
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
		return drivers.Info{}, fmt.Errorf("%w: modbusrtu: stop the stream before reconfiguring", drivers.ErrStreaming)
	}
	d.cfg = &c
	d.message = fmt.Sprintf("configured for slave %d on %s", c.SlaveID, c.Port)
	return c.Info(), nil
}

// Health reports the link state and the counters. It is not OK while the
// port is gone or while every poll fails (slave off, wrong id, cable).
func (d *Driver) Health(ctx context.Context) (drivers.Health, error) {
	d.mu.Lock()
	h := drivers.Health{
		OK:      d.cfg != nil && (!d.streaming || d.connected && !d.failing),
		Message: d.message,
	}
	d.mu.Unlock()
	h.Counters = d.counters.snapshot()
	return h, nil
}

func (d *Driver) setState(connected, failing bool, msg string) {
	d.mu.Lock()
	d.connected, d.failing, d.message = connected, failing, msg
	d.mu.Unlock()
}

// Stream opens the port and polls until ctx ends. A port that cannot be
// opened at the start is an error wrapping drivers.ErrDeviceGone; a port
// lost later is reopened here with backoff.
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
	client, err := d.dial(c)
	if err != nil {
		d.counters.openFailures.Add(1)
		return nil, fmt.Errorf("%w: modbusrtu: open %q: %w", drivers.ErrDeviceGone, c.Port, err)
	}
	d.streaming, d.connected, d.failing = true, true, false
	d.message = fmt.Sprintf("polling slave %d on %s", c.SlaveID, c.Port)
	out := make(chan drivers.Batch, 8)
	go d.run(ctx, c, client, out, d.lastNS)
	return out, nil
}

func (d *Driver) run(ctx context.Context, c Config, client Client, out chan<- drivers.Batch, floorNS int64) {
	p := newPoller(c, &d.counters, out, floorNS)
	p.onHealth = func(failing bool, msg string) { d.setState(true, failing, msg) }
	defer func() {
		d.mu.Lock()
		d.streaming, d.connected, d.failing = false, false, false
		d.lastNS = p.floorNS
		d.message = "stopped"
		d.mu.Unlock()
		close(out)
	}()
	for {
		linkErr := p.pollUntilGone(ctx, client)
		client.Close()
		if ctx.Err() != nil {
			return
		}
		d.setState(false, true, fmt.Sprintf("port failed (%v), reopening %s", linkErr, c.Port))
		client = d.reopen(ctx, c)
		if client == nil {
			return
		}
		d.counters.reopens.Add(1)
		d.setState(true, false, fmt.Sprintf("polling slave %d on %s (reopened)", c.SlaveID, c.Port))
		p.pendingGap = true
	}
}

func (d *Driver) reopen(ctx context.Context, c Config) Client {
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
		client, err := d.dial(c)
		if err == nil {
			return client
		}
		d.counters.openFailures.Add(1)
		wait = min(2*wait, maxWait)
	}
}
