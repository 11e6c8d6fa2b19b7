package lineserial

import (
	"context"
	"time"

	"framed/drivers"
)

// streamer turns port reads into batches. It lives in the stream
// goroutine only.
type streamer struct {
	c        Config
	parser   *Parser
	asm      assembler
	clock    boardClock
	counters *counters
	out      chan<- drivers.Batch

	sample  Sample
	batch   drivers.Batch
	started time.Time // when the current batch got its first sample
	seq     uint64

	lastNS     int64 // time of the last emitted sample, 0 before the first
	pendingGap bool  // samples were lost since lastNS
	floorNS    int64 // times must rise above this, across streams too
	readNow    time.Time
	ctx        context.Context
}

func newStreamer(c Config, cnt *counters, out chan<- drivers.Batch, floorNS int64) *streamer {
	s := &streamer{
		c: c, parser: NewParser(c), asm: newAssembler(c.MaxLineBytes),
		clock: newBoardClock(c.TimeBits, c.TimeUnit), counters: cnt, out: out,
		floorNS: floorNS,
	}
	s.newBatch()
	return s
}

func (s *streamer) newBatch() {
	n := s.c.BatchSamples
	s.batch = drivers.Batch{TimeNS: make([]int64, 0, n), Values: make([][]float64, len(s.c.Channels))}
	for i := range s.batch.Values {
		s.batch.Values[i] = make([]float64, 0, n)
	}
}

// readTimeout keeps batches flowing on time on a quiet line.
func (s *streamer) readTimeout() time.Duration {
	d := time.Duration(s.c.BatchMS) * time.Millisecond / 4
	return min(max(d, 2*time.Millisecond), 20*time.Millisecond)
}

// readUntilGone reads until ctx ends (nil) or the port fails (its error).
func (s *streamer) readUntilGone(ctx context.Context, port Port) error {
	s.ctx = ctx
	if err := port.SetReadTimeout(s.readTimeout()); err != nil {
		return err
	}
	buf := make([]byte, 4096)
	for {
		if ctx.Err() != nil {
			return nil
		}
		n, err := port.Read(buf)
		s.readNow = time.Now()
		if n > 0 {
			s.asm.feed(buf[:n], s.line, s.overlong)
		}
		if err != nil {
			s.flush()
			return err
		}
		if len(s.batch.TimeNS) > 0 && s.readNow.Sub(s.started) >= time.Duration(s.c.BatchMS)*time.Millisecond {
			s.flush()
		}
	}
}

func (s *streamer) overlong() {
	s.counters.overlong.Add(1)
	s.pendingGap = true
}

// line handles one complete line.
func (s *streamer) line(b []byte) {
	if len(b) == 0 || len(b) == 1 && b[0] == '\r' {
		return // blank lines carry nothing
	}
	if b[0] == '#' {
		return // board comments: banners, calibration notes
	}
	s.counters.lines.Add(1)
	if err := s.parser.Parse(b, &s.sample); err != nil {
		if err == ErrChecksum {
			s.counters.checksum.Add(1)
		} else {
			s.counters.garbled.Add(1)
		}
		s.pendingGap = true
		return
	}
	if s.sample.NaNs > 0 {
		s.counters.nanValues.Add(uint64(s.sample.NaNs))
	}
	if s.sample.OutOfRange > 0 {
		s.counters.outOfRange.Add(uint64(s.sample.OutOfRange))
	}
	// Times rise strictly, within a stream and across streams of one
	// driver: lines of one read share a receipt time, so host times are
	// spread by 1 us; a board stamp that does not advance is dropped.
	hostNS := max(s.readNow.UnixNano(), s.floorNS+1000)
	t := hostNS
	if s.sample.HasBoardTime {
		var re bool
		t, re = s.clock.toHost(s.sample.BoardTime, hostNS)
		if re {
			s.counters.clockReanchored.Add(1)
		}
		if t <= s.floorNS {
			s.counters.timeNotRising.Add(1)
			s.pendingGap = true
			return
		}
	}
	if s.pendingGap && s.lastNS != 0 {
		if len(s.batch.TimeNS) > 0 {
			s.flush()
		}
		s.batch.GapBefore = time.Duration(max(t-s.lastNS, 0))
	}
	s.pendingGap = false
	if len(s.batch.TimeNS) == 0 {
		s.started = s.readNow
	}
	s.batch.TimeNS = append(s.batch.TimeNS, t)
	for i, v := range s.sample.Values {
		s.batch.Values[i] = append(s.batch.Values[i], v)
	}
	s.lastNS, s.floorNS = t, t
	s.counters.samples.Add(1)
	if len(s.batch.TimeNS) >= s.c.BatchSamples {
		s.flush()
	}
}

// flush sends the current batch (if it has samples) and starts a new one.
func (s *streamer) flush() {
	if len(s.batch.TimeNS) == 0 {
		return
	}
	s.batch.Seq = s.seq
	select {
	case s.out <- s.batch:
		s.seq++
		s.counters.batches.Add(1)
	case <-s.ctx.Done():
	}
	s.newBatch()
}

// afterReopen drops the partial line of the old port and re-anchors the
// board clock: the board may have rebooted while it was away.
func (s *streamer) afterReopen() {
	if s.asm.reset() {
		s.counters.garbled.Add(1)
	}
	s.clock.reset()
	s.pendingGap = true
}
