package publish

import (
	"encoding/json"
	"math"
	"testing"
	"time"

	"framed/daemon/publish/brokertest"
)

func statusState(t *testing.T, m received) string {
	t.Helper()
	var s struct {
		State string `json:"state"`
		Frame string `json:"frame"`
	}
	if err := json.Unmarshal([]byte(m.payload), &s); err != nil {
		t.Fatalf("status payload %q: %v", m.payload, err)
	}
	if s.Frame != "frame-a" {
		t.Fatalf("status of frame %q", s.Frame)
	}
	return s.State
}

// Status is retained "online" while connected; when the connection dies
// without a DISCONNECT the broker publishes the retained will "offline";
// a clean Close says "offline" itself.
func TestStatusAndWillIntegration(t *testing.T) {
	broker, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	g := &gate{}
	p := startPublisher(t, broker, nil, g)
	waitFor(t, "publisher to connect", p.connected)

	// A subscriber arriving later gets the retained status.
	late := subscribe(t, broker, "framed/frame-a/status")
	m := late.next(t, 10*time.Second)
	if !m.retained || statusState(t, m) != "online" {
		t.Fatalf("late subscriber got %+v, want retained online", m)
	}

	// Cut the TCP connection and keep the publisher from reconnecting.
	g.set(true)
	g.cut()
	m = late.next(t, 20*time.Second)
	if statusState(t, m) != "offline" {
		t.Fatalf("after cut: %+v, want the offline will", m)
	}
	// The will is retained: a new subscriber sees offline.
	later := subscribe(t, broker, "framed/frame-a/status")
	m = later.next(t, 10*time.Second)
	if !m.retained || statusState(t, m) != "offline" {
		t.Fatalf("subscriber after the will got %+v, want retained offline", m)
	}

	// Back online, then a clean close.
	g.set(false)
	m = later.next(t, 20*time.Second)
	if statusState(t, m) != "online" {
		t.Fatalf("after reconnect: %+v", m)
	}
	p.Close()
	m = later.next(t, 10*time.Second)
	if statusState(t, m) != "offline" {
		t.Fatalf("after Close: %+v, want offline", m)
	}
	// And it is retained.
	last := subscribe(t, broker, "framed/frame-a/status")
	if m := last.next(t, 10*time.Second); !m.retained || statusState(t, m) != "offline" {
		t.Fatalf("after Close a new subscriber got %+v, want retained offline", m)
	}
}

// Events go out as one-line JSON with QoS 1 while connected and are
// dropped (counted) while not.
func TestEventsIntegration(t *testing.T) {
	broker, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	sub := subscribe(t, broker, "framed/frame-a/events")
	p, err := New(Config{Broker: broker, Frame: "frame-a"}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	p.Event(EventMsg{TestID: "T-1", Kind: "start"})
	if p.Stats().EventsDropped != 1 {
		t.Fatalf("event before Start not dropped: %+v", p.Stats())
	}
	if err := p.Start(t.Context()); err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	waitFor(t, "publisher to connect", p.connected)
	peak := 41230.5
	p.Event(EventMsg{TestID: "T-1", Kind: "break", TimeS: 93.25, ForceN: &peak})
	m := sub.next(t, 10*time.Second)
	if m.payload != `{"test_id":"T-1","kind":"break","time_s":93.25,"force_N":41230.5}` {
		t.Fatalf("event payload %s", m.payload)
	}
}

// Live readings: the first goes out as one line of JSON with NaN left
// out; the rest within the throttle period are dropped.
func TestLiveIntegration(t *testing.T) {
	e := startEmbedded(t)
	sub := subscribe(t, e.URL(), "framed/frame-a/live")
	p := startPublisher(t, e.URL(), nil, nil)
	waitFor(t, "publisher to connect", p.connected)
	began := time.Now()
	for i := 0; i < 100; i++ {
		p.Live(Reading{TimeS: 12.5 + float64(i)*1e-3, ForceN: 1520.25, ExtensionMM: math.NaN(), CrossheadMM: 0.75})
	}
	took := time.Since(began)
	m := sub.next(t, 10*time.Second)
	if m.payload != `{"time_s":12.5,"force_N":1520.25,"crosshead_mm":0.75}` {
		t.Fatalf("live payload %s", m.payload)
	}
	// At 5 Hz at most one reading per started 200 ms goes out.
	allowed := int64(took/(200*time.Millisecond)) + 1
	if s := p.Stats(); s.LiveSent+s.LiveDropped != 100 || s.LiveSent > allowed {
		t.Fatalf("stats %+v in %v, at most %d may pass", s, took, allowed)
	}
}
