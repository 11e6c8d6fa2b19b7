package drivers

import (
	"context"
	"fmt"
	"time"

	"github.com/hashicorp/go-plugin"
)

// Process is a running driver process, used as a Driver. Once the process
// has gone every call, and every open stream, ends with an error wrapping
// ErrPluginDead; the supervisor then kills it for good and launches anew.
type Process struct {
	client *plugin.Client
	d      *grpcClient
	pid    int
}

var _ Driver = (*Process)(nil)

func (p *Process) deadErr() error {
	if p.client.Exited() {
		return fmt.Errorf("%w: pid %d exited", ErrPluginDead, p.pid)
	}
	return nil
}

// Describe implements Driver.
func (p *Process) Describe(ctx context.Context) (Info, error) {
	if err := p.deadErr(); err != nil {
		return Info{}, err
	}
	return p.d.Describe(ctx)
}

// Configure implements Driver.
func (p *Process) Configure(ctx context.Context, config []byte) (Info, error) {
	if err := p.deadErr(); err != nil {
		return Info{}, err
	}
	return p.d.Configure(ctx, config)
}

// Stream implements Driver.
func (p *Process) Stream(ctx context.Context) (<-chan Batch, error) {
	if err := p.deadErr(); err != nil {
		return nil, err
	}
	return p.d.Stream(ctx)
}

// Health implements Driver.
func (p *Process) Health(ctx context.Context) (Health, error) {
	if err := p.deadErr(); err != nil {
		return Health{}, err
	}
	return p.d.Health(ctx)
}

// Kill asks the process to exit, forces it after two seconds, and returns
// once it is gone. It is safe to call more than once.
func (p *Process) Kill() { p.client.Kill() }

// Exited tells whether the process has exited.
func (p *Process) Exited() bool { return p.client.Exited() }

// Pid is the process id of the driver process.
func (p *Process) Pid() int { return p.pid }

// Wait returns nil once the process has exited, or ctx's error.
func (p *Process) Wait(ctx context.Context) error {
	t := time.NewTicker(10 * time.Millisecond)
	defer t.Stop()
	for !p.client.Exited() {
		select {
		case <-ctx.Done():
			return ctx.Err()
		case <-t.C:
		}
	}
	return nil
}
