package drivers_test

import (
	"context"
	"fmt"
	"testing"

	"framed/drivers"
	"framed/drivers/conformance"
	"framed/drivers/internal/fakedriver"
)

// BenchmarkStream measures samples per second (three channels each) from an
// unthrottled fake driver: on the driver directly (the fake's own cost),
// through the shims over an in-process connection, and through a real
// driver process. The target for the whole path is well above 1e6
// samples/s.
func BenchmarkStream(b *testing.B) {
	for _, perBatch := range []int{100, 1000, 10000} {
		config := fmt.Appendf(nil, `{"channels": 3, "samples_per_batch": %d}`, perBatch)
		b.Run(fmt.Sprintf("direct/batch=%d", perBatch), func(b *testing.B) {
			benchStream(b, fakedriver.New(), config)
		})
		b.Run(fmt.Sprintf("grpc/batch=%d", perBatch), func(b *testing.B) {
			benchStream(b, grpcConn(b, fakedriver.New()), config)
		})
		b.Run(fmt.Sprintf("process/batch=%d", perBatch), func(b *testing.B) {
			benchStream(b, conformance.LaunchSelf(b, "fake"), config)
		})
	}
}

func benchStream(b *testing.B, d drivers.Driver, config []byte) {
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	if _, err := d.Configure(ctx, config); err != nil {
		b.Fatal(err)
	}
	ch, err := d.Stream(ctx)
	if err != nil {
		b.Fatal(err)
	}
	samples := 0
	for b.Loop() {
		batch, ok := <-ch
		if !ok || batch.Err != nil {
			b.Fatalf("stream ended: %v", batch.Err)
		}
		samples += len(batch.TimeNS)
	}
	b.ReportMetric(float64(samples)/b.Elapsed().Seconds(), "samples/s")
	cancel()
	for range ch {
	}
}
