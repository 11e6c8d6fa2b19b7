package daemon

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"os/exec"
	"sync"
	"time"

	"framed/drivers"
	"framed/drivers/builtin"

	"github.com/hashicorp/go-hclog"
)

// driverBatch is one batch of one driver on its way to the merger.
type driverBatch struct {
	driver int
	b      drivers.Batch
}

// driverNote tells the core loop that a driver's stream broke or came back,
// so the running test records the gap.
type driverNote struct {
	driver  int
	err     error // nil: (re)started
	restart bool
}

// supervisor keeps one driver process alive: it launches it (the daemon's
// own binary in driver mode for built-in drivers, a checksummed binary for
// external ones), configures it, forwards its batches, and after any
// failure restarts it with exponential backoff. A crashing driver never
// takes the daemon down; only a configuration the driver refuses is fatal,
// and only at start-up.
type supervisor struct {
	idx  int
	cfg  DriverConfig
	self string
	log  *slog.Logger

	mu   sync.Mutex
	proc *drivers.Process
	info drivers.Info
	// health is the last Health answer, for status.
	health drivers.Health
	// starts counts successful starts, for status and tests.
	starts int
	// lagMS follows how late a batch's last sample arrives (receipt time
	// minus sample time, smoothed): the driver's transport and batching
	// delay as this host sees it. Comparing two drivers' lags gives the
	// delay_ms to configure when their boards stamp their own times.
	lagMS float64
	lagN  int
}

const (
	backoffMin = 200 * time.Millisecond
	backoffMax = 10 * time.Second
)

// start launches and configures the driver once. Errors are fatal at
// start-up: a driver that cannot start means the configuration is wrong.
func (s *supervisor) start(ctx context.Context) (drivers.Info, error) {
	var cmd *exec.Cmd
	if s.cfg.Path != "" {
		cmd = exec.Command(s.cfg.Path)
	} else {
		cmd = builtin.Command(s.self, s.cfg.Kind)
	}
	lctx, cancel := context.WithTimeout(ctx, 30*time.Second)
	defer cancel()
	p, err := drivers.Launch(lctx, drivers.LaunchConfig{Cmd: cmd, SHA256: s.cfg.SHA256, Logger: hclogAdapter(s.log, s.cfg.Name)})
	if err != nil {
		return drivers.Info{}, firstLine{fmt.Errorf("%w: driver %q: %w", ErrDriverStart, s.cfg.Name, err)}
	}
	cfg := s.cfg.Config
	if len(cfg) == 0 {
		cfg = []byte("{}")
	}
	info, err := p.Configure(lctx, cfg)
	if err != nil {
		p.Kill()
		return drivers.Info{}, fmt.Errorf("%w: driver %q refused its configuration: %w", ErrDriverStart, s.cfg.Name, err)
	}
	s.mu.Lock()
	s.proc, s.info = p, info
	s.starts++
	s.mu.Unlock()
	return info, nil
}

// run streams until ctx ends, restarting the driver after failures.
func (s *supervisor) run(ctx context.Context, out chan<- driverBatch, notes chan<- driverNote) {
	backoff := backoffMin
	first := true
	for ctx.Err() == nil {
		if !first {
			if _, err := s.start(ctx); err != nil {
				s.log.Warn("driver restart failed", "driver", s.cfg.Name, "err", err, "retry_in", backoff)
				if !sleepCtx(ctx, backoff) {
					return
				}
				backoff = min(2*backoff, backoffMax)
				continue
			}
			s.log.Info("driver restarted", "driver", s.cfg.Name)
			notes <- driverNote{driver: s.idx, restart: true}
		}
		first = false
		began := time.Now()
		err := s.stream(ctx, out)
		s.kill()
		if ctx.Err() != nil {
			return
		}
		if time.Since(began) > 30*time.Second {
			backoff = backoffMin // it ran well for a while: start over
		}
		s.log.Warn("driver stream ended", "driver", s.cfg.Name, "err", err, "restart_in", backoff)
		notes <- driverNote{driver: s.idx, err: err}
		if !sleepCtx(ctx, backoff) {
			return
		}
		backoff = min(2*backoff, backoffMax)
	}
}

func (s *supervisor) stream(ctx context.Context, out chan<- driverBatch) error {
	s.mu.Lock()
	p := s.proc
	s.mu.Unlock()
	if p == nil {
		return drivers.ErrPluginDead
	}
	ch, err := p.Stream(ctx)
	if err != nil {
		return err
	}
	for b := range ch {
		if b.Err != nil {
			// drain so the shim's goroutine can finish
			for range ch {
			}
			return b.Err
		}
		select {
		case out <- driverBatch{driver: s.idx, b: b}:
		case <-ctx.Done():
			return ctx.Err()
		}
	}
	if ctx.Err() != nil {
		return ctx.Err()
	}
	return errors.New("stream closed by the driver")
}

func (s *supervisor) kill() {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.proc != nil {
		s.proc.Kill()
		s.proc = nil
	}
}

// pollHealth asks the driver for its health, for status; errors are
// recorded, never fatal.
func (s *supervisor) pollHealth(ctx context.Context) {
	s.mu.Lock()
	p := s.proc
	s.mu.Unlock()
	if p == nil {
		s.mu.Lock()
		s.health = drivers.Health{OK: false, Message: "not running"}
		s.mu.Unlock()
		return
	}
	hctx, cancel := context.WithTimeout(ctx, 2*time.Second)
	defer cancel()
	h, err := p.Health(hctx)
	if err != nil {
		h = drivers.Health{OK: false, Message: err.Error()}
	}
	s.mu.Lock()
	s.health = h
	s.mu.Unlock()
}

// observeLag records one batch's lag in ns.
func (s *supervisor) observeLag(ns int64) {
	ms := float64(ns) / 1e6
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.lagN == 0 {
		s.lagMS = ms
	} else {
		s.lagMS += (ms - s.lagMS) / 32 // about the last 32 batches
	}
	s.lagN++
}

func (s *supervisor) status() map[string]any {
	s.mu.Lock()
	defer s.mu.Unlock()
	pid := 0
	if s.proc != nil {
		pid = s.proc.Pid()
	}
	return map[string]any{
		"pid":    pid,
		"lag_ms": s.lagMS,
		"name":   s.cfg.Name, "kind": s.cfg.Kind, "path": s.cfg.Path,
		"running": s.proc != nil, "starts": s.starts,
		"ok": s.health.OK, "message": s.health.Message, "counters": s.health.Counters,
	}
}

func sleepCtx(ctx context.Context, d time.Duration) bool {
	t := time.NewTimer(d)
	defer t.Stop()
	select {
	case <-t.C:
		return true
	case <-ctx.Done():
		return false
	}
}

// hclogAdapter sends go-plugin's log to slog at warning level and above,
// so a driver's own complaints reach the daemon's log with its name.
func hclogAdapter(l *slog.Logger, name string) hclog.Logger {
	return hclog.New(&hclog.LoggerOptions{
		Name:   "driver." + name,
		Level:  hclog.Warn,
		Output: slogWriter{l: l, driver: name},
	})
}

type slogWriter struct {
	l      *slog.Logger
	driver string
}

func (w slogWriter) Write(p []byte) (int, error) {
	w.l.Warn("driver log", "driver", w.driver, "line", string(trimNL(p)))
	return len(p), nil
}

func trimNL(p []byte) []byte {
	for len(p) > 0 && (p[len(p)-1] == '\n' || p[len(p)-1] == '\r') {
		p = p[:len(p)-1]
	}
	return p
}
