package fakedriver

import (
	"context"
	"fmt"
	"sync"

	"framed/drivers"
)

// Scripted is a driver that streams exactly the given batches, in order,
// then the final error if End is set (or keeps the stream open until
// cancelled if it is not). Configure accepts any JSON object and refuses
// anything else. It lets a test compare what left a driver with what
// arrived through the shims, value for value.
type Scripted struct {
	Info    drivers.Info
	Batches []drivers.Batch
	End     error

	mu         sync.Mutex
	configured bool
	streaming  bool
}

var _ drivers.Driver = (*Scripted)(nil)

// Describe implements drivers.Driver.
func (s *Scripted) Describe(context.Context) (drivers.Info, error) { return s.Info, nil }

// Configure implements drivers.Driver.
func (s *Scripted) Configure(_ context.Context, raw []byte) (drivers.Info, error) {
	if len(raw) == 0 || raw[0] != '{' {
		return drivers.Info{}, fmt.Errorf("%w: scripted: want a JSON object, got %q", drivers.ErrBadConfig, raw)
	}
	s.mu.Lock()
	s.configured = true
	s.mu.Unlock()
	return s.Info, nil
}

// Health implements drivers.Driver.
func (s *Scripted) Health(context.Context) (drivers.Health, error) {
	return drivers.Health{OK: true, Message: "scripted", Counters: map[string]uint64{"batches": uint64(len(s.Batches))}}, nil
}

// Stream implements drivers.Driver.
func (s *Scripted) Stream(ctx context.Context) (<-chan drivers.Batch, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if !s.configured {
		return nil, drivers.ErrNotConfigured
	}
	if s.streaming {
		return nil, drivers.ErrStreaming
	}
	s.streaming = true
	out := make(chan drivers.Batch)
	go func() {
		defer close(out)
		defer func() {
			s.mu.Lock()
			s.streaming = false
			s.mu.Unlock()
		}()
		for _, b := range s.Batches {
			if !send(ctx, out, b) {
				return
			}
		}
		if s.End != nil {
			send(ctx, out, drivers.Batch{Seq: uint64(len(s.Batches)), Err: s.End})
			return
		}
		<-ctx.Done()
	}()
	return out, nil
}
