package modbusrtu

import (
	"context"
	"testing"
	"time"

	"framed/drivers"
)

// TestDeviceSilentThenBack: a device that stops answering (power off, A/B
// swapped) costs samples, not the stream; Health says so, and the first
// batch after it answers again carries the gap.
func TestDeviceSilentThenBack(t *testing.T) {
	fake := &fakeClient{regs: map[string]map[uint16]uint16{"holding": {0: 7}, "input": {}}, faults: map[string][]error{}}
	d := NewWithDialer(func(Config) (Client, error) { return fake, nil })
	config := `{"port":"/dev/fake","slave_id":1,"poll_hz":200,"retries":1,"batch_ms":5,
	 "channels":[{"name":"f","quantity":"force","unit":"counts","type":"int16"}]}`
	if _, err := d.Configure(context.Background(), []byte(config)); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	readUntil(t, ch, 3*time.Second, "a first sample", func(bs []drivers.Batch) bool { return len(rows(bs)) > 0 })
	fake.setDown(true)
	h := waitHealth(t, d, "three failed polls", func(c map[string]uint64) bool { return c["failed_polls"] >= 3 })
	if h.OK {
		t.Errorf("Health OK after %d failed polls: %q", h.Counters["failed_polls"], h.Message)
	}
	// 1 + retries attempts per failed poll, each a timeout.
	if h.Counters["timeouts"] < 2*h.Counters["failed_polls"] {
		t.Errorf("timeouts %d for %d failed polls with 1 retry", h.Counters["timeouts"], h.Counters["failed_polls"])
	}
	go func() {
		time.Sleep(20 * time.Millisecond)
		fake.setDown(false)
	}()
	bs := readUntil(t, ch, 3*time.Second, "a batch with GapBefore", func(bs []drivers.Batch) bool {
		return len(bs) > 0 && bs[len(bs)-1].GapBefore > 0
	})
	if v := bs[len(bs)-1].Values[0][0]; v != 7 {
		t.Errorf("value after the gap %v, want 7", v)
	}
	waitHealth(t, d, "Health OK again", func(map[string]uint64) bool {
		h, _ := d.Health(ctx)
		return h.OK
	})
}
