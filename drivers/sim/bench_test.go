package sim_test

import (
	"context"
	"testing"
	"time"
)

// BenchmarkGenerate measures sample generation through the driver in
// pace "none" (the demo series, noise on, 10 kHz). It must be far above
// a million samples a second so the daemon's ingest benchmark measures
// the daemon, not the sim.
func BenchmarkGenerate(b *testing.B) {
	d := configured(b, `{"script": "demo", "pace": "none", "rate_hz": 10000, "speed": 10, "loop": true}`)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		b.Fatal(err)
	}
	samples := 0
	start := time.Now()
	for b.Loop() {
		bt := <-ch
		if bt.Err != nil {
			b.Fatal(bt.Err)
		}
		samples += len(bt.TimeNS)
	}
	b.ReportMetric(float64(samples)/time.Since(start).Seconds(), "samples/s")
	cancel()
	for range ch {
	}
}
