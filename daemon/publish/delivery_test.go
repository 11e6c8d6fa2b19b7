package publish

import (
	"encoding/json"
	"fmt"
	"os"
	"slices"
	"testing"
	"time"

	"framed/daemon/publish/brokertest"
)

func TestResultsDeliveredIntegration(t *testing.T) {
	broker, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	db := openStore(t, t.TempDir())
	sub := subscribe(t, broker, "framed/frame-a/results/#")
	putResult(t, db, "T-0001")
	putResult(t, db, "T-0002")
	p := startPublisher(t, broker, db, nil)
	putResult(t, db, "T-0001") // revision 2, stored while running
	p.Notify()
	got := collectResults(t, sub, 3)
	if want := []string{"T-0001/1", "T-0002/1", "T-0001/2"}; !slices.Equal(got, want) {
		t.Fatalf("arrived %v, want %v", got, want)
	}
	waitFor(t, "outbox to empty", func() bool { n, _ := db.OutboxLen(); return n == 0 })
	if d := db.Delivered("T-0001"); d != 2 {
		t.Fatalf("Delivered(T-0001) = %d, want 2", d)
	}
}

// The broker dies while results are being stored and comes back on the
// same port: every result arrives, in order of storing (first arrivals;
// duplicates are allowed), and the outbox empties. One outage by default,
// 10 with FRAMED_LONG=1.
func TestBrokerOutageIntegration(t *testing.T) {
	cycles := 1
	if os.Getenv("FRAMED_LONG") == "1" {
		cycles = 10
	}
	broker, stop, restart := brokertest.StartMosquitto(t, "plain.conf")
	db := openStore(t, t.TempDir())
	sub := subscribe(t, broker, "framed/frame-a/results/#")
	g := &gate{}
	p := startPublisher(t, broker, db, g)
	seen := map[string]bool{}
	for c := 0; c < cycles; c++ {
		var want []string
		put := func(i int) {
			id := fmt.Sprintf("C%d-T%d", c, i)
			putResult(t, db, id)
			p.Notify()
			want = append(want, id+"/1")
		}
		put(1)
		stop()
		for i := 2; i <= 5; i++ {
			put(i)
		}
		// Keep the publisher away until the subscriber is back, so what
		// the subscriber sees is the whole story.
		g.set(true)
		restart()
		select {
		case <-sub.ready:
		case <-time.After(20 * time.Second):
			t.Fatal("subscriber did not come back")
		}
		g.set(false)
		var got []string
		for len(got) < len(want) {
			m := sub.next(t, 20*time.Second)
			var doc struct {
				TestID   string `json:"test_id"`
				Revision int    `json:"revision"`
			}
			if err := json.Unmarshal([]byte(m.payload), &doc); err != nil {
				t.Fatal(err)
			}
			key := fmt.Sprintf("%s/%d", doc.TestID, doc.Revision)
			if seen[key] {
				continue // a duplicate: allowed
			}
			seen[key] = true
			got = append(got, key)
		}
		// The first result may have arrived before the outage; it is
		// first either way.
		if !slices.Equal(got, want) {
			t.Fatalf("cycle %d: arrived %v, want %v", c, got, want)
		}
		waitFor(t, "outbox to empty", func() bool { n, _ := db.OutboxLen(); return n == 0 })
	}
}

func TestBrokerDownAtStartIntegration(t *testing.T) {
	broker, stop, restart := brokertest.StartMosquitto(t, "plain.conf")
	stop()
	db := openStore(t, t.TempDir())
	putResult(t, db, "T-1")
	g := &gate{}
	p := startPublisher(t, broker, db, g) // must not fail
	waitFor(t, "two failed connection attempts", func() bool { return g.dialed.Load() >= 2 })
	if p.connected() {
		t.Fatal("connected to a broker that is down")
	}
	g.set(true)
	restart()
	sub := subscribe(t, broker, "framed/frame-a/results/#")
	g.set(false)
	if got := collectResults(t, sub, 1); got[0] != "T-1/1" {
		t.Fatalf("arrived %v", got)
	}
}

// Results wait in the outbox across a restart of framed: the first
// publisher never reaches the broker, the store is closed and reopened,
// and the second publisher delivers them.
func TestPublisherRestartIntegration(t *testing.T) {
	broker, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	dir := t.TempDir()
	db, closeDB := openStoreCloser(t, dir)
	g := &gate{shut: true}
	p1 := startPublisher(t, broker, db, g)
	putResult(t, db, "T-1")
	putResult(t, db, "T-2")
	p1.Notify()
	waitFor(t, "connection attempts", func() bool { return g.dialed.Load() >= 2 })
	p1.Close()
	closeDB()

	db2 := openStore(t, dir)
	if n, _ := db2.OutboxLen(); n != 2 {
		t.Fatalf("outbox after restart holds %d, want 2", n)
	}
	sub := subscribe(t, broker, "framed/frame-a/results/#")
	startPublisher(t, broker, db2, nil)
	if got := collectResults(t, sub, 2); !slices.Equal(got, []string{"T-1/1", "T-2/1"}) {
		t.Fatalf("arrived %v", got)
	}
	waitFor(t, "outbox to empty", func() bool { n, _ := db2.OutboxLen(); return n == 0 })
}
