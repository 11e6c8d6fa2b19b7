package replay

import (
	"context"
	"errors"
	"fmt"
	"math"
	"time"

	"framed/drivers"
)

// pump runs one stream until ctx ends, the recording ends with at_end
// "close", or the injected fault fires.
func (d *Replay) pump(ctx context.Context, s *settings, p *player, startNS int64, out chan<- drivers.Batch) {
	defer func() {
		d.mu.Lock()
		d.streaming = false
		d.mu.Unlock()
		close(out)
	}()
	var seq uint64
	send := func(b drivers.Batch) bool {
		b.Seq = seq
		seq++
		select {
		case out <- b:
		case <-ctx.Done():
			return false
		}
		d.mu.Lock()
		d.samples += uint64(len(b.TimeNS))
		d.batches++
		if n := len(b.TimeNS); n > 0 {
			d.lastNS = b.TimeNS[n-1]
		}
		if b.Err != nil && !isEnd(b.Err) {
			d.faults++
		}
		d.mu.Unlock()
		return b.Err == nil
	}
	failNS := int64(math.MaxInt64)
	if s.FailAfterS > 0 {
		failNS = int64(s.FailAfterS * 1e9)
	}
	nch := len(p.cols)
	v := make([]float64, nch)
	// One sample of lookahead: held until its time has come.
	var heldNS int64
	held, more := false, true
	fill := func(limitNS int64, n int) (b drivers.Batch, stop error) {
		b.Values = make([][]float64, nch)
		for len(b.TimeNS) < n {
			if !held {
				if !more {
					return b, fmt.Errorf("replay: %q played to its end: %w", s.Path, ErrEnd)
				}
				heldNS, more = p.next(v)
				held = more
				if !more {
					continue
				}
			}
			if heldNS >= failNS {
				return b, fmt.Errorf("replay: injected fault after %v s of stream: %w", s.FailAfterS, drivers.ErrDeviceGone)
			}
			if heldNS > limitNS {
				break
			}
			b.TimeNS = append(b.TimeNS, startNS+heldNS)
			for k := range nch {
				b.Values[k] = append(b.Values[k], v[k])
			}
			held = false
		}
		return b, nil
	}
	finish := func(b drivers.Batch, stop error) bool {
		if len(b.TimeNS) > 0 && !send(b) {
			return false
		}
		if stop != nil {
			send(drivers.Batch{Values: make([][]float64, nch), Err: stop})
			return false
		}
		return true
	}
	if s.Pace == PaceNone {
		for ctx.Err() == nil {
			if !finish(fill(math.MaxInt64, unpacedBatch)) {
				return
			}
		}
		return
	}
	begin := time.Now()
	tick := time.NewTicker(time.Duration(s.BatchMS * float64(time.Millisecond)))
	defer tick.Stop()
	for {
		select {
		case <-ctx.Done():
			return
		case now := <-tick.C:
			// Everything due by now (stream time since the start), in
			// batches of at most unpacedBatch.
			limit := int64(now.Sub(begin))
			for {
				b, stop := fill(limit, unpacedBatch)
				if !finish(b, stop) {
					return
				}
				if len(b.TimeNS) < unpacedBatch {
					break
				}
			}
		}
	}
}

func isEnd(err error) bool { return err != nil && errors.Is(err, ErrEnd) }
