package serialtest

import (
	"bytes"
	"fmt"
	"sync"
	"time"
)

// Op is one step of a playback script. Exactly one of its fields is used:
// R (bytes the device sends), W (bytes the driver must write), Err (an
// error Read returns once, e.g. a disconnect) or Silence (the line stays
// quiet for one read timeout).
type Op struct {
	R       []byte
	W       []byte
	Err     error
	Silence bool
}

// Playback is a fake serial port that plays a script. It implements
// Read, Write, Close and SetReadTimeout, the small port interface serial
// drivers use. Reads hand out scripted device bytes in order; a Read may
// return fewer bytes than one Op holds, like a real UART. When the script
// is used up the line stays silent: Read waits the read timeout (at most
// 5 ms) and returns 0, nil.
//
// Close fails with ErrUnread when device bytes were left unread or
// expected writes never came, so a test notices a driver that stopped
// consuming early.
type Playback struct {
	mu          sync.Mutex
	ops         []Op
	pos         int // index of the current op
	off         int // bytes consumed within ops[pos]
	closed      bool
	readTimeout time.Duration
	drained     chan struct{}
	drainOnce   sync.Once
	writeErr    error
}

// NewPlayback returns a port that plays ops.
func NewPlayback(ops ...Op) *Playback {
	p := &Playback{ops: ops, readTimeout: time.Millisecond, drained: make(chan struct{})}
	p.checkDrained()
	return p
}

// Drained is closed once every op of the script has been consumed.
func (p *Playback) Drained() <-chan struct{} { return p.drained }

// SetReadTimeout sets how long a Read on a silent line waits.
func (p *Playback) SetReadTimeout(d time.Duration) error {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.readTimeout = d
	return nil
}

func (p *Playback) idle() time.Duration {
	d := p.readTimeout
	if d <= 0 || d > 5*time.Millisecond {
		d = 5 * time.Millisecond
	}
	return d
}

// checkDrained closes the drained channel when the script is used up.
// Callers hold p.mu (or own p exclusively).
func (p *Playback) checkDrained() {
	if p.pos >= len(p.ops) {
		p.drainOnce.Do(func() { close(p.drained) })
	}
}

// Read returns the next scripted device bytes.
func (p *Playback) Read(b []byte) (int, error) {
	p.mu.Lock()
	if p.closed {
		p.mu.Unlock()
		return 0, ErrClosed
	}
	if p.pos >= len(p.ops) || p.ops[p.pos].W != nil {
		// Nothing to send (or the device waits for a request): a quiet line.
		d := p.idle()
		p.mu.Unlock()
		time.Sleep(d)
		return 0, nil
	}
	op := p.ops[p.pos]
	switch {
	case op.Err != nil:
		p.pos++
		p.off = 0
		p.checkDrained()
		p.mu.Unlock()
		return 0, op.Err
	case op.Silence:
		p.pos++
		p.off = 0
		p.checkDrained()
		d := p.idle()
		p.mu.Unlock()
		time.Sleep(d)
		return 0, nil
	}
	n := copy(b, op.R[p.off:])
	p.off += n
	if p.off >= len(op.R) {
		p.pos++
		p.off = 0
		p.checkDrained()
	}
	p.mu.Unlock()
	return n, nil
}

// Write checks b against the scripted W bytes.
func (p *Playback) Write(b []byte) (int, error) {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.closed {
		return 0, ErrClosed
	}
	if p.pos >= len(p.ops) || p.ops[p.pos].W == nil {
		p.writeErr = fmt.Errorf("%w: %q with no write scripted", ErrUnexpectedWrite, b)
		return 0, p.writeErr
	}
	want := p.ops[p.pos].W[p.off:]
	if len(b) > len(want) || !bytes.Equal(b, want[:len(b)]) {
		p.writeErr = fmt.Errorf("%w: got %q, want %q", ErrUnexpectedWrite, b, want)
		return 0, p.writeErr
	}
	p.off += len(b)
	if p.off >= len(p.ops[p.pos].W) {
		p.pos++
		p.off = 0
		p.checkDrained()
	}
	return len(b), nil
}

// Close fails with ErrUnread if the script was not fully consumed, and
// with the first write mismatch if there was one.
func (p *Playback) Close() error {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.closed {
		return ErrClosed
	}
	p.closed = true
	if p.writeErr != nil {
		return p.writeErr
	}
	left := 0
	for i := p.pos; i < len(p.ops); i++ {
		left += len(p.ops[i].R) + len(p.ops[i].W)
		if i == p.pos {
			left -= p.off
		}
		if p.ops[i].Err != nil {
			left++
		}
	}
	if left > 0 {
		return fmt.Errorf("%w: %d scripted bytes or errors left at op %d of %d", ErrUnread, left, p.pos, len(p.ops))
	}
	return nil
}
