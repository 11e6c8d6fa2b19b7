package modbusrtu

import (
	"context"
	"fmt"
	"math"
	"time"

	"framed/drivers"
)

// poller runs the poll loop of one stream.
type poller struct {
	c        Config
	blocks   []block
	counters *counters
	out      chan<- drivers.Batch
	onHealth func(failing bool, msg string)

	values     []float64
	batch      drivers.Batch
	started    time.Time
	seq        uint64
	lastNS     int64 // last sample of this stream, 0 before the first
	floorNS    int64 // times rise above this, across streams too
	pendingGap bool
	failStreak int
	ctx        context.Context
}

func newPoller(c Config, cnt *counters, out chan<- drivers.Batch, floorNS int64) *poller {
	p := &poller{c: c, blocks: c.blocks(), counters: cnt, out: out, floorNS: floorNS,
		values: make([]float64, len(c.Channels)), onHealth: func(bool, string) {}}
	p.newBatch()
	return p
}

func (p *poller) newBatch() {
	p.batch = drivers.Batch{Values: make([][]float64, len(p.c.Channels))}
}

// pollUntilGone polls at PollHz until ctx ends (nil) or the link fails.
func (p *poller) pollUntilGone(ctx context.Context, client Client) error {
	p.ctx = ctx
	period := time.Duration(float64(time.Second) / p.c.PollHz)
	tick := time.NewTicker(period)
	defer tick.Stop()
	batchAge := time.Duration(p.c.BatchMS) * time.Millisecond
	for {
		t0 := time.Now()
		if err := p.pollOnce(client, t0); err != nil {
			p.flush()
			return err
		}
		if len(p.batch.TimeNS) > 0 && time.Since(p.started) >= batchAge {
			p.flush()
		}
		select {
		case <-ctx.Done():
			p.flush()
			return nil
		case <-tick.C:
		}
	}
}

// pollOnce reads every block (with retries) and appends one sample if
// any block answered. It returns an error only when the link failed.
func (p *poller) pollOnce(client Client, t0 time.Time) error {
	p.counters.polls.Add(1)
	answered := 0
	var lastErr error
	for _, b := range p.blocks {
		regs, err := p.readBlock(client, b)
		if err != nil {
			if classify(err) == failLink {
				return err
			}
			lastErr = err
			p.fill(b, nil)
			continue
		}
		answered++
		p.fill(b, regs)
	}
	if answered == 0 {
		p.counters.failedPolls.Add(1)
		p.pendingGap = true
		p.failStreak++
		if p.failStreak == 3 {
			p.onHealth(true, fmt.Sprintf("slave %d not answering: %v", p.c.SlaveID, lastErr))
		}
		return nil
	}
	if p.failStreak >= 3 {
		p.onHealth(false, fmt.Sprintf("polling slave %d on %s", p.c.SlaveID, p.c.Port))
	}
	p.failStreak = 0
	// The sample instant is the middle of the exchange.
	t := t0.UnixNano() + time.Since(t0).Nanoseconds()/2
	t = max(t, p.floorNS+1000)
	if p.pendingGap && p.lastNS != 0 {
		p.flush()
		p.batch.GapBefore = time.Duration(t - p.lastNS)
	}
	p.pendingGap = false
	if len(p.batch.TimeNS) == 0 {
		p.started = time.Now()
	}
	p.batch.TimeNS = append(p.batch.TimeNS, t)
	for i, v := range p.values {
		p.batch.Values[i] = append(p.batch.Values[i], v)
	}
	p.lastNS, p.floorNS = t, t
	p.counters.samples.Add(1)
	return nil
}

// readBlock reads one block, retrying CRC errors, timeouts, exceptions
// and malformed answers up to Retries times.
func (p *poller) readBlock(client Client, b block) ([]uint16, error) {
	var err error
	for attempt := 0; attempt <= *p.c.Retries; attempt++ {
		if attempt > 0 {
			if p.ctx.Err() != nil {
				return nil, p.ctx.Err() // a link-class error: the stream ends
			}
			p.counters.retries.Add(1)
		}
		var regs []uint16
		regs, err = client.ReadRegisters(uint16(b.start), uint16(b.count), b.kind == "input")
		if err == nil {
			if len(regs) != b.count {
				err = fmt.Errorf("%d registers for %d asked", len(regs), b.count)
				p.counters.protocol.Add(1)
				continue
			}
			return regs, nil
		}
		f := classify(err)
		if f == failLink {
			return nil, err
		}
		p.counters.count(f)
	}
	return nil, err
}

// fill decodes the channels of block b from regs (nil: the block failed,
// its channels are NaN).
func (p *poller) fill(b block, regs []uint16) {
	for i, ch := range p.c.Channels {
		if ch.Register != b.kind {
			continue
		}
		if regs == nil {
			p.values[i] = math.NaN()
			continue
		}
		v, err := DecodeValue(regs[ch.Address-b.start:], ch.Type, ch.WordOrder)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			// A float register holding NaN or infinity: the indicator's
			// way of saying overload or no reading.
			p.counters.nanValues.Add(1)
			p.values[i] = math.NaN()
			continue
		}
		p.values[i] = v**ch.Scale + ch.Offset
	}
}

func (p *poller) flush() {
	if len(p.batch.TimeNS) == 0 {
		return
	}
	p.batch.Seq = p.seq
	select {
	case p.out <- p.batch:
		p.seq++
		p.counters.batches.Add(1)
	case <-p.ctx.Done():
	}
	p.newBatch()
}
