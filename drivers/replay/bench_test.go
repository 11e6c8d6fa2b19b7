package replay_test

import (
	"context"
	"fmt"
	"path/filepath"
	"testing"
	"time"
)

// BenchmarkReplay measures playback in pace "none", resampled at 10 kHz
// from the S355 excerpt, looping.
func BenchmarkReplay(b *testing.B) {
	path, err := filepath.Abs("testdata/curves/s355-zd2-every10th.csv")
	if err != nil {
		b.Fatal(err)
	}
	d := configured(b, fmt.Sprintf(`{"path": %q, "pace": "none", "rate_hz": 10000, "speed": 10, "loop": true}`, path))
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
