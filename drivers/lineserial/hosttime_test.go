package lineserial

import (
	"context"
	"fmt"
	"testing"
	"time"

	"framed/drivers/serialtest"
)

// TestHostReceiptTimesIntegration: a board without a clock field gets
// host receipt times, strictly rising even for lines that arrive in one
// read, and close to the wall clock.
func TestHostReceiptTimesIntegration(t *testing.T) {
	p := serialtest.OpenPty(t)
	config := fmt.Sprintf(`{"port":%q,"format":"delimited","fields":["f","x"],"batch_ms":5,
	 "channels":[{"name":"force","field":"f","quantity":"force","unit":"counts"},
	             {"name":"pot","field":"x","quantity":"extension","unit":"counts","raw_bits":12}]}`, p.Path())
	d := New()
	if _, err := d.Configure(context.Background(), []byte(config)); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	before := time.Now().UnixNano()
	// raw_bits is a signed width: 12 bits span -2048..2047 in two's
	// complement (common practice), so 2048 is out of range.
	if _, err := p.Write([]byte("-5,100\n-4,2047\n-3,2048\n-2,-2048\n")); err != nil {
		t.Fatal(err)
	}
	bs := collect(t, ch, 4, 3*time.Second)
	after := time.Now().UnixNano()
	var times []int64
	var pots []float64
	for _, b := range bs {
		times = append(times, b.TimeNS...)
		pots = append(pots, b.Values[1]...)
	}
	for i, ns := range times {
		if ns < before || ns > after+int64(len(times))*1000 {
			t.Errorf("sample %d at %d, outside the wall-clock window %d..%d", i, ns, before, after)
		}
		if i > 0 && ns <= times[i-1] {
			t.Errorf("sample %d time %d does not rise after %d", i, ns, times[i-1])
		}
	}
	if pots[0] != 100 || pots[1] != 2047 || pots[2] == pots[2] || pots[3] != -2048 {
		t.Errorf("pot values %v, want [100 2047 NaN -2048]", pots)
	}
	cancel()
	for range ch {
	}
}
