package publish

import (
	"fmt"
	"sort"
	"testing"
	"time"
)

// BenchmarkResultLatency measures from storing a result (PutResult +
// Notify) to a subscriber receiving it, through the embedded broker on
// loopback; it reports the median and the 99th percentile.
func BenchmarkResultLatency(b *testing.B) {
	e, err := StartEmbedded("127.0.0.1:0")
	if err != nil {
		b.Fatal(err)
	}
	defer e.Close()
	db := openStoreB(b)
	sub := subscribeB(b, e.URL(), "framed/frame-a/results/#")
	p, err := New(Config{Broker: e.URL(), Frame: "frame-a"}, db, nil)
	if err != nil {
		b.Fatal(err)
	}
	if err := p.Start(b.Context()); err != nil {
		b.Fatal(err)
	}
	defer p.Close()
	var lat []time.Duration
	i := 0
	for b.Loop() {
		id := fmt.Sprintf("T-%d", i)
		i++
		if err := db.CreateTest(storeMeta(id)); err != nil {
			b.Fatal(err)
		}
		start := time.Now()
		if _, err := db.PutResult(id, []byte(`{"test_id":"`+id+`","revision":1}`)); err != nil {
			b.Fatal(err)
		}
		p.Notify()
		select {
		case <-sub:
		case <-time.After(10 * time.Second):
			b.Fatal("result not received")
		}
		lat = append(lat, time.Since(start))
	}
	sort.Slice(lat, func(i, j int) bool { return lat[i] < lat[j] })
	b.ReportMetric(float64(lat[len(lat)/2].Microseconds())/1000, "ms-p50")
	b.ReportMetric(float64(lat[len(lat)*99/100].Microseconds())/1000, "ms-p99")
}
