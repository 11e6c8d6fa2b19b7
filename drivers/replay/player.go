package replay

import (
	"math"

	"framed/reduce"
)

// player walks the recording pass after pass and yields samples with
// their stream times (ns from the stream's start). It knows nothing of
// the wall clock: pacing is the pump's job.
type player struct {
	c      reduce.Curve
	cols   [][]float64 // the present columns, in channel order
	speed  float64
	rateHz float64 // resample rate; 0 plays the recorded samples
	idleNS float64 // spacing of pause and idle samples
	pauseN int
	loop   bool
	atEnd  string

	passNS int64 // stream time of this pass's first sample
	i      int   // next file index (recorded) or resample count
	j      int   // interpolation cell (resampled)
	pauseK int   // pause samples given in this gap; -1 while playing
	ended  bool  // past the last pass
	lastNS int64 // last time given; times only rise
	idle   []float64
}

func newPlayer(s *settings) *player {
	c := s.curve
	p := &player{
		c: c, speed: s.Speed, rateHz: s.RateHz, loop: s.Loop, atEnd: s.AtEnd,
		idleNS: 1e9 / s.idleHz,
		pauseN: int(math.Round(s.pauseS * s.idleHz)),
		pauseK: -1,
		lastNS: -1,
	}
	for _, col := range [][]float64{c.ForceN, c.ExtensionMM, c.CrossheadMM} {
		if col != nil {
			p.cols = append(p.cols, col)
		}
	}
	// Idle: specimen out, so no force, and no other reading.
	p.idle = make([]float64, len(p.cols))
	for k := 1; k < len(p.idle); k++ {
		p.idle[k] = math.NaN()
	}
	return p
}

// next writes the next sample's values into v and returns its stream
// time; ok is false when the stream is to end (at_end "close").
func (p *player) next(v []float64) (ns int64, ok bool) {
	switch {
	case p.pauseK >= 0:
		if p.pauseK < p.pauseN {
			p.pauseK++
			copy(v, p.idle)
			return p.stamp(float64(p.lastNS) + p.idleNS), true
		}
		p.pauseK = -1
		p.i, p.j = 0, 0
		p.passNS = p.lastNS + int64(p.idleNS)
	case p.ended:
		if p.atEnd == AtEndClose {
			return 0, false
		}
		copy(v, p.idle)
		return p.stamp(float64(p.lastNS) + p.idleNS), true
	}
	var tS float64
	var done bool
	if p.rateHz == 0 {
		tS, done = p.recorded(v)
	} else {
		tS, done = p.resampled(v)
	}
	if done {
		if p.loop {
			p.pauseK = 0
		} else {
			p.ended = true
		}
		return p.next(v)
	}
	return p.stamp(float64(p.passNS) + tS/p.speed*1e9), true
}

// stamp keeps times strictly rising: a repeated recorded time is nudged
// by a nanosecond.
func (p *player) stamp(ns float64) int64 {
	t := int64(math.Round(ns))
	if t <= p.lastNS {
		t = p.lastNS + 1
	}
	p.lastNS = t
	return t
}

// recorded gives file sample i; tS is its time from the file's start.
func (p *player) recorded(v []float64) (tS float64, done bool) {
	if p.i >= p.c.Len() {
		return 0, true
	}
	for k, col := range p.cols {
		v[k] = col[p.i]
	}
	tS = p.c.TimeS[p.i] - p.c.TimeS[0]
	p.i++
	return tS, false
}

// resampled gives the recording at t0 + i speed/rate by linear
// interpolation; a neighbour without a reading gives no reading.
func (p *player) resampled(v []float64) (tS float64, done bool) {
	t := p.c.TimeS
	tS = float64(p.i) * p.speed / p.rateHz
	tf := t[0] + tS
	n := p.c.Len()
	if tf > t[n-1] {
		return 0, true
	}
	for p.j+2 < n && t[p.j+1] <= tf {
		p.j++
	}
	j := p.j
	f := 0.0
	if dt := t[j+1] - t[j]; dt > 0 {
		f = min(max((tf-t[j])/dt, 0), 1)
	}
	for k, col := range p.cols {
		a, b := col[j], col[j+1]
		switch {
		case f == 0:
			v[k] = a
		case f == 1:
			v[k] = b
		default:
			v[k] = a + f*(b-a) // NaN in, NaN out
		}
	}
	p.i++
	return tS, false
}
