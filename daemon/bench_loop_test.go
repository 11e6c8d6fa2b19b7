package daemon

import (
	"context"
	"encoding/json"
	"io"
	"log/slog"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"framed/daemon/calib"
	"framed/daemon/detect"
	"framed/daemon/store"
	"framed/drivers"
	"framed/drivers/sim"
	"framed/reduce"
)

type discardEvents struct{}

func (discardEvents) publishEvent(string, reduce.Event, map[string]any) {}

// loopBatches takes n driver batches of the 1018-like bar, as a 5 mm bar
// at 0.2 mm/min on a 10 kN load cell, from the sim at 10 kHz, unpaced:
// one long test after a second of idle, as the whole-path ingest figure
// of `framectl bench` records it.
func loopBatches(b *testing.B, n int) []drivers.Batch {
	b.Helper()
	var sp sim.Specimen
	for _, s := range sim.DemoScript() {
		if strings.HasSuffix(s.ID, "ST03") {
			sp = s
		}
	}
	sp.D0MM, sp.Loading.CrossheadMMPerMin = 5, 0.2
	d := sim.New()
	cfg := []byte(`{"seed": 7, "rate_hz": 10000, "pace": "none", "pause_s": 1, "sensors": {"force_range_N": 10000}, "specimens": [` + mustJSON(b, sp) + `]}`)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	if _, err := d.Configure(ctx, cfg); err != nil {
		b.Fatal(err)
	}
	ch, err := d.Stream(ctx)
	if err != nil {
		b.Fatal(err)
	}
	out := make([]drivers.Batch, 0, n)
	for len(out) < n {
		bt := <-ch
		if bt.Err != nil {
			b.Fatal(bt.Err)
		}
		out = append(out, bt)
	}
	return out
}

func mustJSON(b *testing.B, v any) string {
	raw, err := json.Marshal(v)
	if err != nil {
		b.Fatal(err)
	}
	return string(raw)
}

// BenchmarkAcquisitionCore is the acquisition loop's work per driver batch
// of 1024 samples, without the process boundary: merge onto the frame's
// time base, calibrate, detect, and append to the store (committing in the
// background at the default 100 ms). The whole-path ingest of `framectl
// bench` adds the driver process and the gRPC stream to this.
func BenchmarkAcquisitionCore(b *testing.B) {
	batches := loopBatches(b, b.N+10) // +10: the idle second before the test
	db, err := store.Open(filepath.Join(b.TempDir(), "framed.db"), store.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() {
		if err := db.Check(); err != nil {
			b.Error(err)
		}
		db.Close()
	})
	det, err := detect.New(detect.Config{ForceRangeN: 10000})
	if err != nil {
		b.Fatal(err)
	}
	epoch := time.Unix(0, batches[0].TimeNS[0])
	life := &lifecycle{
		log: slog.New(slog.NewTextHandler(io.Discard, nil)), frame: "bench", db: db, det: det,
		hist: newHistory(3), epoch: epoch, preS: 2, sink: discardEvents{}, handOff: func(finishedTest) {},
	}
	src := [nSignals]source{{0, 0}, {0, 1}, {0, 2}}
	m := newMerger(epoch.UnixNano(), src, []float64{10000}, []float64{0}, int64(time.Second))
	var cal calSet
	cal.models[sigForce], cal.has[sigForce] = calib.Model{Offset: -1.5, Gain: 1.0002}, true
	samples := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := range b.N + 10 {
		out := m.push(0, &batches[i])
		cal.apply(&out)
		if err := life.step(out); err != nil {
			b.Fatal(err)
		}
		samples += out.Len()
	}
	if life.test != nil {
		if err := life.test.app.Flush(); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(samples)/b.Elapsed().Seconds(), "samples/s")
	if life.test != nil {
		if err := life.end(false); err != nil {
			b.Error(err)
		}
	}
}
