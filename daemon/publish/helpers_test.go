package publish

import (
	"crypto/tls"
	"encoding/json"
	"errors"
	"fmt"
	"net"
	"net/url"
	"path/filepath"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/daemon/store"
)

var testStart = time.Date(2026, 3, 4, 8, 30, 0, 0, time.UTC)

// openStore opens a store in dir; t.Cleanup checks its consistency
// (bbolt's page check and the store's invariants) and closes it.
func openStore(t *testing.T, dir string) *store.DB {
	db, _ := openStoreCloser(t, dir)
	return db
}

// openStoreCloser also returns the checked close, for tests that reopen.
func openStoreCloser(t *testing.T, dir string) (*store.DB, func()) {
	t.Helper()
	db, err := store.Open(filepath.Join(dir, "framed.db"), store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var once sync.Once
	closeFn := func() { once.Do(func() { closeStore(t, db) }) }
	t.Cleanup(closeFn)
	return db, closeFn
}

func closeStore(t *testing.T, db *store.DB) {
	t.Helper()
	if err := db.Check(); err != nil {
		t.Errorf("store check: %v", err)
	}
	if err := db.Close(); err != nil {
		t.Errorf("store close: %v", err)
	}
}

// putResult stores a test and a result document whose test_id and
// revision let the subscriber check what arrived. The document is stored
// indented (several lines) so the test sees the publisher compact it.
func putResult(t *testing.T, db *store.DB, id string) {
	t.Helper()
	if _, err := db.Test(id); errors.Is(err, store.ErrNotFound) {
		if err := db.CreateTest(store.TestMeta{ID: id, StartedAt: testStart, State: store.StateEnded}); err != nil {
			t.Fatal(err)
		}
	}
	rev, err := db.NextRevision(id)
	if err != nil {
		t.Fatal(err)
	}
	doc, _ := json.MarshalIndent(map[string]any{"schema": "framed.result/1", "test_id": id, "revision": rev}, "", "  ")
	if _, err := db.PutResult(id, doc); err != nil {
		t.Fatal(err)
	}
}

type received struct {
	topic    string
	payload  string
	retained bool
}

// subscriber is an independent paho client that records what arrives.
type subscriber struct {
	client mqtt.Client
	msgs   chan received
	ready  chan struct{} // gets a value after each (re)subscription
}

func subscribe(t *testing.T, broker, topic string, tlsCfg ...*tls.Config) *subscriber {
	t.Helper()
	s := &subscriber{msgs: make(chan received, 1000), ready: make(chan struct{}, 10)}
	o := mqtt.NewClientOptions().AddBroker(broker).
		SetClientID(fmt.Sprintf("sub-%d", time.Now().UnixNano())).
		SetAutoReconnect(true).SetConnectRetry(true).
		SetConnectRetryInterval(50 * time.Millisecond).SetMaxReconnectInterval(100 * time.Millisecond).
		SetOrderMatters(true)
	if len(tlsCfg) > 0 {
		o.SetTLSConfig(tlsCfg[0])
	}
	o.SetOnConnectHandler(func(c mqtt.Client) {
		tok := c.Subscribe(topic, 1, func(_ mqtt.Client, m mqtt.Message) {
			s.msgs <- received{m.Topic(), string(m.Payload()), m.Retained()}
		})
		tok.Wait()
		s.ready <- struct{}{}
	})
	s.client = mqtt.NewClient(o)
	s.client.Connect()
	t.Cleanup(func() { s.client.Disconnect(50) })
	select {
	case <-s.ready:
	case <-time.After(10 * time.Second):
		t.Fatalf("subscriber could not subscribe to %s on %s", topic, broker)
	}
	return s
}

func (s *subscriber) next(t *testing.T, within time.Duration) received {
	t.Helper()
	select {
	case m := <-s.msgs:
		return m
	case <-time.After(within):
		t.Fatalf("no message within %v", within)
		return received{}
	}
}

// gate is a dial hook: while shut, connection attempts fail; cut closes
// every open connection abruptly (no DISCONNECT), as a pulled cable or a
// crashed process would.
type gate struct {
	mu     sync.Mutex
	shut   bool
	conns  []net.Conn
	dialed atomic.Int64
}

func (g *gate) dial(uri *url.URL, _ mqtt.ClientOptions) (net.Conn, error) {
	g.dialed.Add(1)
	g.mu.Lock()
	defer g.mu.Unlock()
	if g.shut {
		return nil, errors.New("gate shut by test")
	}
	c, err := net.DialTimeout("tcp", uri.Host, 2*time.Second)
	if err == nil {
		g.conns = append(g.conns, c)
	}
	return c, err
}

func (g *gate) set(shut bool) {
	g.mu.Lock()
	defer g.mu.Unlock()
	g.shut = shut
}

func (g *gate) cut() {
	g.mu.Lock()
	defer g.mu.Unlock()
	for _, c := range g.conns {
		c.Close()
	}
	g.conns = nil
}

// startPublisher starts a publisher with short timeouts for tests.
func startPublisher(t *testing.T, broker string, db *store.DB, g *gate) *Publisher {
	t.Helper()
	p, err := New(Config{
		Broker: broker, Frame: "frame-a", KeepAlive: 2 * time.Second,
		ConnectTimeout: 2 * time.Second, MaxRetryInterval: 200 * time.Millisecond,
		AckTimeout: 3 * time.Second,
	}, db, nil)
	if err != nil {
		t.Fatal(err)
	}
	if g != nil {
		p.dial = g.dial
	}
	if err := p.Start(t.Context()); err != nil {
		t.Fatal(err)
	}
	var once sync.Once
	t.Cleanup(func() { once.Do(p.Close) })
	return p
}

// waitFor polls cond (no timing assertion, only a generous bound).
func waitFor(t *testing.T, what string, cond func() bool) {
	t.Helper()
	deadline := time.Now().Add(20 * time.Second)
	for !cond() {
		if time.Now().After(deadline) {
			t.Fatalf("timed out waiting for %s", what)
		}
		time.Sleep(10 * time.Millisecond)
	}
}

// resultIDs collects result messages until want distinct (test_id,
// revision) pairs have arrived, checking each payload is one line of JSON
// on the right topic, and returns the pairs in order of first arrival.
func collectResults(t *testing.T, s *subscriber, want int) []string {
	t.Helper()
	seen := map[string]bool{}
	var order []string
	for len(order) < want {
		m := s.next(t, 20*time.Second)
		var doc struct {
			TestID   string `json:"test_id"`
			Revision int    `json:"revision"`
		}
		if err := json.Unmarshal([]byte(m.payload), &doc); err != nil {
			t.Fatalf("payload %q on %s: %v", m.payload, m.topic, err)
		}
		for _, c := range m.payload {
			if c == '\n' {
				t.Fatalf("payload is not one line: %q", m.payload)
			}
		}
		if m.topic != "framed/frame-a/results/"+doc.TestID {
			t.Fatalf("result of %s on topic %s", doc.TestID, m.topic)
		}
		key := fmt.Sprintf("%s/%d", doc.TestID, doc.Revision)
		if !seen[key] {
			seen[key] = true
			order = append(order, key)
		}
	}
	return order
}

func storeMeta(id string) store.TestMeta {
	return store.TestMeta{ID: id, StartedAt: testStart, State: store.StateReduced}
}

func openStoreB(b *testing.B) *store.DB {
	b.Helper()
	db, err := store.Open(filepath.Join(b.TempDir(), "framed.db"), store.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() {
		if err := db.Check(); err != nil {
			b.Errorf("store check: %v", err)
		}
		db.Close()
	})
	return db
}

// subscribeB returns a channel of payloads arriving on topic.
func subscribeB(b *testing.B, broker, topic string) <-chan string {
	b.Helper()
	out := make(chan string, 100)
	c := mqtt.NewClient(mqtt.NewClientOptions().AddBroker(broker).SetClientID("bench-sub"))
	if tok := c.Connect(); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		b.Fatalf("subscriber: %v", tok.Error())
	}
	b.Cleanup(func() { c.Disconnect(50) })
	tok := c.Subscribe(topic, 1, func(_ mqtt.Client, m mqtt.Message) { out <- string(m.Payload()) })
	if !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		b.Fatalf("subscribe: %v", tok.Error())
	}
	return out
}
