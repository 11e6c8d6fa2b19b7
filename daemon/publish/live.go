package publish

import (
	"encoding/json"
	"math"
	"sync"
	"time"
)

// Reading is one live sample for the live topic. NaN means no reading and
// is left out of the message.
type Reading struct {
	TimeS       float64
	ForceN      float64
	ExtensionMM float64
	CrossheadMM float64
}

type liveMsg struct {
	TimeS       float64  `json:"time_s"`
	ForceN      *float64 `json:"force_N,omitempty"`
	ExtensionMM *float64 `json:"extension_mm,omitempty"`
	CrossheadMM *float64 `json:"crosshead_mm,omitempty"`
}

func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// liveThrottle lets one reading through per minGap of wall-clock time.
type liveThrottle struct {
	mu     sync.Mutex
	minGap time.Duration
	last   time.Time
}

func (l *liveThrottle) allow(now time.Time) bool {
	l.mu.Lock()
	defer l.mu.Unlock()
	if !l.last.IsZero() && now.Sub(l.last) < l.minGap {
		return false
	}
	l.last = now
	return true
}

// Live offers a reading for the live topic. It is cheap to call for every
// batch: readings beyond Config.LiveRateHz, and all readings while not
// connected, are dropped (QoS 0, nothing is queued).
func (p *Publisher) Live(r Reading) {
	if p.client == nil || !p.connected() || math.IsNaN(r.TimeS) || math.IsInf(r.TimeS, 0) {
		p.stats.liveDropped.Add(1)
		return
	}
	if !p.live.allow(time.Now()) {
		p.stats.liveDropped.Add(1)
		return
	}
	b, err := json.Marshal(liveMsg{TimeS: r.TimeS, ForceN: finite(r.ForceN), ExtensionMM: finite(r.ExtensionMM), CrossheadMM: finite(r.CrossheadMM)})
	if err != nil {
		p.stats.liveDropped.Add(1)
		return
	}
	p.client.Publish(p.topics.live, 0, false, b)
	p.stats.liveSent.Add(1)
}

// EventMsg is one line on the events topic. Kind is one of the result
// document's event kinds (start, hold, unload, break, end).
type EventMsg struct {
	TestID string  `json:"test_id"`
	Kind   string  `json:"kind"`
	TimeS  float64 `json:"time_s"`
	// ForceN is the force at the event, when it means something.
	ForceN *float64 `json:"force_N,omitempty"`
	// At is the wall-clock time, RFC 3339, when known.
	At string `json:"at,omitempty"`
	// Detail carries what the event found: a hold's settled force and
	// extension, an unload's permanent set. Values must be finite or nil.
	Detail map[string]any `json:"detail,omitempty"`
}

// Event publishes an event with QoS 1, best effort: it is not persisted,
// and while not connected it is dropped (the result document carries every
// event anyway).
func (p *Publisher) Event(ev EventMsg) {
	if p.client == nil || !p.connected() {
		p.stats.eventsDropped.Add(1)
		return
	}
	if ev.ForceN != nil && finite(*ev.ForceN) == nil {
		ev.ForceN = nil
	}
	if finite(ev.TimeS) == nil {
		ev.TimeS = 0
	}
	b, err := json.Marshal(ev)
	if err != nil {
		p.stats.eventsDropped.Add(1)
		p.log.Warn("event not encodable", "err", err)
		return
	}
	p.client.Publish(p.topics.events, 1, false, b)
	p.stats.eventsSent.Add(1)
}
