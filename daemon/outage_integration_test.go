package daemon_test

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"sync"
	"testing"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/daemon"
	"framed/daemon/publish/brokertest"
	"framed/daemon/store"
)

// The lab's broker goes away for a while during several tests and comes
// back: framed keeps testing, results wait in its outbox, and once the
// broker is back every result reaches the lab's (persistent) subscriber,
// in the order the tests ended, none lost. Outage of 25 s by default,
// 90 s with FRAMED_LONG=1.
func TestBrokerOutageDuringTestsIntegration(t *testing.T) {
	outage := 25 * time.Second
	if os.Getenv(longEnv) == "1" {
		outage = 90 * time.Second
	}
	url, stop, restart := brokertest.StartMosquittoWith(t, brokertest.Options{Template: "persist.conf", Graceful: true})
	specs := e2eSpecimens(t)
	cfg := daemon.Config{
		Frame: "e2e", StateDir: t.TempDir(), Broker: url,
		Drivers: []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: simConfig(t, specs, true)}},
	}

	var mu sync.Mutex
	var arrived []string
	seen := map[string]bool{}
	opts := mqtt.NewClientOptions().AddBroker(url).SetClientID("lab-lims-outage").
		SetCleanSession(false).SetAutoReconnect(true).SetConnectRetry(true).
		SetMaxReconnectInterval(500 * time.Millisecond).SetConnectRetryInterval(200 * time.Millisecond)
	handle := func(_ mqtt.Client, m mqtt.Message) {
		var doc struct {
			TestID   string `json:"test_id"`
			Revision int    `json:"revision"`
		}
		if json.Unmarshal(m.Payload(), &doc) != nil {
			t.Errorf("result is not JSON")
			return
		}
		key := fmt.Sprintf("%s/%d", doc.TestID, doc.Revision)
		mu.Lock()
		defer mu.Unlock()
		if !seen[key] { // a re-delivery after the outage is allowed
			seen[key] = true
			arrived = append(arrived, key)
		}
	}
	// Messages the broker kept for this session arrive as soon as it
	// reconnects, before the subscription is renewed: the default handler
	// takes them.
	opts.SetDefaultPublishHandler(handle)
	opts.SetOnConnectHandler(func(c mqtt.Client) {
		c.Subscribe("framed/e2e/results/+", 1, handle)
	})
	sub := mqtt.NewClient(opts)
	if tok := sub.Connect(); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		t.Fatalf("subscriber: %v", tok.Error())
	}
	defer sub.Disconnect(100)

	next, restartOrder := specimenOrder(specs, true)
	stopDaemon, socket := runDaemon(t, cfg, daemon.Options{SpecimenFallback: next, OnDriverRestart: restartOrder})
	count := func() int { mu.Lock(); defer mu.Unlock(); return len(arrived) }
	waitFor(t, 60*time.Second, "a first result", func() bool { return count() >= 1 })

	stop()
	t.Logf("broker down for %v", outage)
	time.Sleep(outage)
	var during []store.TestMeta
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	daemon.Call(ctx, socket, daemon.Request{Op: "tests"}, &during)
	cancel()
	waiting := 0
	for _, ts := range during {
		if ts.ResultRevision > 0 {
			waiting++
		}
	}
	restart()

	// Everything stored by now must arrive.
	waitFor(t, 90*time.Second, "the outbox to empty", func() bool {
		st := statusMaybe(socket)
		return st != nil && st["outbox"] == float64(0)
	})
	var tests []store.TestMeta
	ctx, cancel = context.WithTimeout(context.Background(), 5*time.Second)
	err := daemon.Call(ctx, socket, daemon.Request{Op: "tests"}, &tests)
	cancel()
	if err != nil {
		t.Fatal(err)
	}
	var want []string
	for _, ts := range tests {
		for rev := 1; rev <= ts.ResultRevision; rev++ {
			want = append(want, fmt.Sprintf("%s/%d", ts.ID, rev))
		}
	}
	deadline := time.Now().Add(30 * time.Second)
	for count() < len(want) && time.Now().Before(deadline) {
		time.Sleep(50 * time.Millisecond)
	}
	mu.Lock()
	defer mu.Unlock()
	if len(arrived) != len(want) {
		t.Fatalf("arrived %v, stored %v", arrived, want)
	}
	for i := range want {
		if arrived[i] != want[i] {
			t.Fatalf("out of order: arrived %v, stored %v", arrived, want)
		}
	}
	stopDaemon()
	if waiting < 2 {
		t.Errorf("only %d results were stored while the broker was down; the outage should span several tests", waiting)
	}
	t.Logf("outage of %v survived: %d results, all delivered in order once the broker was back", outage, len(want))
}
