package bench

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"sync"
	"syscall"
	"time"

	"framed/daemon"
	"framed/daemon/store"
)

// child is a daemon under measurement in a process of its own.
type child struct {
	cmd    *exec.Cmd
	socket string
	done   chan struct{}
	err    error // Wait's result, set before done closes
	logs   *tailBuffer
}

// startChild writes cfg into dir, starts self in daemon mode on it and
// waits until its control socket answers.
func startChild(ctx context.Context, self, dir string, cfg daemon.Config, maxLife time.Duration) (*child, error) {
	cfg.StateDir = filepath.Join(dir, "state")
	raw, err := json.Marshal(cfg)
	if err != nil {
		return nil, err
	}
	cfgPath := filepath.Join(dir, "framed.json")
	if err := os.WriteFile(cfgPath, raw, 0o600); err != nil {
		return nil, err
	}
	c := &child{socket: filepath.Join(cfg.StateDir, daemon.ControlSocketName), done: make(chan struct{}), logs: &tailBuffer{max: 16 << 10}}
	c.cmd = exec.Command(self, DaemonArg, cfgPath, strconv.FormatFloat(maxLife.Seconds(), 'f', 0, 64))
	c.cmd.Stdout, c.cmd.Stderr = c.logs, c.logs
	dieWithParent(c.cmd)
	if err := c.cmd.Start(); err != nil {
		return nil, fmt.Errorf("%w: start %s: %w", ErrDaemon, self, err)
	}
	go func() { c.err = c.cmd.Wait(); close(c.done) }()
	deadline := time.Now().Add(30 * time.Second)
	for {
		var st map[string]any
		cctx, cancel := context.WithTimeout(ctx, time.Second)
		err := daemon.Call(cctx, c.socket, daemon.Request{Op: "status"}, &st)
		cancel()
		if err == nil {
			return c, nil
		}
		select {
		case <-c.done:
			return nil, fmt.Errorf("%w: exited before it was ready (%v): %q", ErrDaemon, c.err, c.logs.String())
		case <-ctx.Done():
			c.stop()
			return nil, ctx.Err()
		case <-time.After(50 * time.Millisecond):
		}
		if time.Now().After(deadline) {
			c.stop()
			return nil, fmt.Errorf("%w: not ready within 30 s: %q", ErrDaemon, c.logs.String())
		}
	}
}

func (c *child) pid() int { return c.cmd.Process.Pid }

// alive reports an early death as an error.
func (c *child) alive() error {
	select {
	case <-c.done:
		return fmt.Errorf("%w: exited during the measurement (%v): %q", ErrDaemon, c.err, c.logs.String())
	default:
		return nil
	}
}

// stop asks the daemon to stop (it closes and reduces a running test),
// waits up to a minute, then kills it and its drivers.
func (c *child) stop() {
	drivers := childPIDs(c.pid())
	c.cmd.Process.Signal(syscall.SIGTERM)
	select {
	case <-c.done:
		return
	case <-time.After(60 * time.Second):
	}
	c.cmd.Process.Kill()
	<-c.done
	for _, p := range drivers {
		if pr, err := os.FindProcess(p); err == nil {
			pr.Kill()
		}
	}
}

// committed is the number of samples committed to the store, over all
// tests, as the daemon reports them.
func (c *child) committed(ctx context.Context) (int, error) {
	var tests []store.TestMeta
	cctx, cancel := context.WithTimeout(ctx, 5*time.Second)
	defer cancel()
	if err := daemon.Call(cctx, c.socket, daemon.Request{Op: "tests"}, &tests); err != nil {
		return 0, fmt.Errorf("%w: list tests: %w", ErrDaemon, err)
	}
	n := 0
	for _, t := range tests {
		n += t.Samples
	}
	return n, nil
}

// waitCommitted polls until at least n samples are committed.
func (c *child) waitCommitted(ctx context.Context, n int, within time.Duration) (int, error) {
	deadline := time.Now().Add(within)
	for {
		got, err := c.committed(ctx)
		if err != nil {
			return 0, err
		}
		if got >= n {
			return got, nil
		}
		if err := c.alive(); err != nil {
			return 0, err
		}
		if time.Now().After(deadline) {
			return 0, fmt.Errorf("%w: %d of %d samples committed within %v", ErrTimeout, got, n, within)
		}
		if !sleepCtx(ctx, 20*time.Millisecond) {
			return 0, ctx.Err()
		}
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

// freeAddr returns a loopback address that was free a moment ago.
func freeAddr() (string, error) {
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		return "", err
	}
	defer l.Close()
	return l.Addr().String(), nil
}

// tailBuffer keeps the last max bytes written: the child's log, quoted
// in errors.
type tailBuffer struct {
	mu  sync.Mutex
	max int
	b   []byte
}

func (t *tailBuffer) Write(p []byte) (int, error) {
	t.mu.Lock()
	defer t.mu.Unlock()
	t.b = append(t.b, p...)
	if len(t.b) > t.max {
		t.b = append(t.b[:0], t.b[len(t.b)-t.max:]...)
	}
	return len(p), nil
}

func (t *tailBuffer) String() string {
	t.mu.Lock()
	defer t.mu.Unlock()
	return string(t.b)
}

var errSkipped = errors.New("skipped")

// kill ends the daemon and its drivers at once, for phases whose store is
// thrown away (a graceful stop would reduce the interrupted test first).
func (c *child) kill() {
	drivers := childPIDs(c.pid())
	c.cmd.Process.Kill()
	<-c.done
	for _, p := range drivers {
		if pr, err := os.FindProcess(p); err == nil {
			pr.Kill()
		}
	}
}
