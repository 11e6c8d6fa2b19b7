package modbusrtu

import (
	"context"
	"fmt"
	"math"
	"testing"
	"time"

	"framed/drivers"
)

func simConfig(path string, slave int) []byte {
	return fmt.Appendf(nil, `{
  "port": %q, "baud": 115200, "slave_id": %d, "poll_hz": 100, "timeout_ms": 60, "retries": 2, "batch_ms": 20,
  "reopen_max_ms": 100,
  "channels": [
    {"name": "force", "quantity": "force", "unit": "N", "address": 0, "type": "int32", "scale": 0.1},
    {"name": "temp", "quantity": "other", "unit": "counts", "address": 5, "type": "int16"},
    {"name": "disp", "quantity": "crosshead", "unit": "mm", "register": "input", "address": 10,
     "type": "float32", "word_order": "little"}
  ]}`, path, slave)
}

// loadSim fills the registers: 123456 as int32 is 0x0001E240 (force
// 12345.6 N at 0.1 N/count), -12 as int16 is 0xFFF4, and 2.5 as an IEEE
// 754 single is 0x40200000 (sign 0, exponent 128, mantissa 0.25),
// low word first.
func loadSim(s *rtuSim) {
	s.set(false, 0, 0x0001, 0xE240)
	s.set(false, 5, 0xFFF4)
	s.set(true, 10, 0x0000, 0x4020)
}

type sampleRow struct {
	ns     int64
	values []float64
}

func rows(bs []drivers.Batch) []sampleRow {
	var out []sampleRow
	for _, b := range bs {
		for i, ns := range b.TimeNS {
			r := sampleRow{ns: ns}
			for c := range b.Values {
				r.values = append(r.values, b.Values[c][i])
			}
			out = append(out, r)
		}
	}
	return out
}

// readUntil reads batches until cond holds for the samples so far.
func readUntil(t *testing.T, ch <-chan drivers.Batch, timeout time.Duration, what string, cond func([]drivers.Batch) bool) []drivers.Batch {
	t.Helper()
	var got []drivers.Batch
	deadline := time.After(timeout)
	for !cond(got) {
		select {
		case b, ok := <-ch:
			if !ok || b.Err != nil {
				t.Fatalf("stream ended (err %v) waiting for %s", b.Err, what)
			}
			got = append(got, b)
		case <-deadline:
			t.Fatalf("no %s within %v", what, timeout)
		}
	}
	return got
}

// waitHealth polls Health until cond holds for the counters.
func waitHealth(t *testing.T, d *Driver, what string, cond func(map[string]uint64) bool) drivers.Health {
	t.Helper()
	deadline := time.Now().Add(5 * time.Second)
	for {
		h, _ := d.Health(context.Background())
		if cond(h.Counters) {
			return h
		}
		if time.Now().After(deadline) {
			t.Fatalf("no %s within 5 s: %v", what, h.Counters)
		}
		time.Sleep(10 * time.Millisecond)
	}
}

func TestPollOverPtyIntegration(t *testing.T) {
	sim := startSim(t, 7)
	loadSim(sim)
	d := New()
	if _, err := d.Configure(context.Background(), simConfig(sim.pty.Path(), 7)); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatalf("Stream over pty %s: %v", sim.pty.SlaveName(), err)
	}
	count := func(n int) func([]drivers.Batch) bool {
		return func(bs []drivers.Batch) bool { return len(rows(bs)) >= n }
	}
	first := rows(readUntil(t, ch, 3*time.Second, "5 samples", count(5)))
	for _, r := range first {
		if math.Abs(r.values[0]-12345.6) > 1e-9 || r.values[1] != -12 || r.values[2] != 2.5 {
			t.Fatalf("sample %v, want [12345.6 -12 2.5]", r.values)
		}
	}

	// A CRC error then a silence on the next request: both retried, the
	// poll still yields a full sample.
	sim.setFaults(3, simBadCRC, simSilent)
	h := waitHealth(t, d, "a CRC error, a timeout and their retries", func(c map[string]uint64) bool {
		return c["crc_errors"] >= 1 && c["timeouts"] >= 1 && c["retries"] >= 2
	})
	if h.Counters["failed_polls"] != 0 {
		t.Errorf("a poll failed though the third attempt answered: %v", h.Counters)
	}

	// Three silences in a row exhaust the retries of the holding block:
	// force and temp are NaN in that sample, the input block still answers.
	sim.setFaults(3, simSilent, simSilent, simSilent)
	readUntil(t, ch, 3*time.Second, "a sample with NaN force and a displacement", func(bs []drivers.Batch) bool {
		for _, r := range rows(bs) {
			if math.IsNaN(r.values[0]) && math.IsNaN(r.values[1]) && r.values[2] == 2.5 {
				return true
			}
		}
		return false
	})

	// An exception answer is counted and retried.
	sim.setFaults(3, simException)
	// New values: -50 as int32 is 0xFFFFFFCE (-5.0 N).
	sim.set(false, 0, 0xFFFF, 0xFFCE)
	readUntil(t, ch, 3*time.Second, "force -5 N", func(bs []drivers.Batch) bool {
		rs := rows(bs)
		return len(rs) > 0 && math.Abs(rs[len(rs)-1].values[0]+5) < 1e-9
	})
	waitHealth(t, d, "one exception", func(c map[string]uint64) bool { return c["exceptions"] == 1 })

	// Unplug the adapter for 150 ms: the driver reopens and marks the gap.
	sim.pty.Unplug()
	time.Sleep(150 * time.Millisecond)
	sim.pty.Replug()
	after := readUntil(t, ch, 5*time.Second, "a batch with GapBefore", func(bs []drivers.Batch) bool {
		return len(bs) > 0 && bs[len(bs)-1].GapBefore > 0
	})
	if gap := after[len(after)-1].GapBefore; gap < 150*time.Millisecond {
		t.Errorf("gap %v after 150 ms unplugged", gap)
	}
	h, _ = d.Health(ctx)
	if h.Counters["reopens"] != 1 || !h.OK {
		t.Errorf("after replug: reopens %d OK %v %q", h.Counters["reopens"], h.OK, h.Message)
	}
	if _, bad := sim.stats(); bad != 0 {
		t.Errorf("simulator saw %d malformed requests", bad)
	}
	cancel()
	for range ch {
	}
}
