package conformance

import (
	"fmt"
	"testing"
	"time"

	"framed/drivers"
)

// closeBound is how long a stream may take to close after its context is
// cancelled. It is a liveness bound, not a speed target.
const closeBound = 2 * time.Second

// streamCheck checks the invariants of one stream's batches.
type streamCheck struct {
	channels int
	nextSeq  uint64
	lastNS   int64 // last sample time seen, also across streams
	samples  int
	gaps     int
}

// add checks b (which must not carry Err) against what came before.
func (c *streamCheck) add(b drivers.Batch) error {
	if b.Seq != c.nextSeq {
		return fmt.Errorf("batch Seq %d, want %d", b.Seq, c.nextSeq)
	}
	c.nextSeq++
	if len(b.Values) != c.channels {
		return fmt.Errorf("batch %d has %d columns, Info has %d channels", b.Seq, len(b.Values), c.channels)
	}
	for ch, col := range b.Values {
		if len(col) != len(b.TimeNS) {
			return fmt.Errorf("batch %d column %d has %d values for %d times", b.Seq, ch, len(col), len(b.TimeNS))
		}
	}
	if b.GapBefore < 0 {
		return fmt.Errorf("batch %d has negative GapBefore %v", b.Seq, b.GapBefore)
	}
	if b.GapBefore > 0 {
		c.gaps++
	}
	for i, ns := range b.TimeNS {
		if ns <= c.lastNS {
			return fmt.Errorf("batch %d sample %d: time %d does not rise after %d", b.Seq, i, ns, c.lastNS)
		}
		c.lastNS = ns
	}
	c.samples += len(b.TimeNS)
	return nil
}

// collect reads batches until at least n more samples have arrived.
func (c *streamCheck) collect(t *testing.T, ch <-chan drivers.Batch, n int, timeout time.Duration) {
	t.Helper()
	want := c.samples + n
	deadline := time.NewTimer(timeout)
	defer deadline.Stop()
	for c.samples < want {
		select {
		case b, ok := <-ch:
			if !ok {
				t.Fatalf("stream closed after %d samples, want %d", c.samples, want)
			}
			if b.Err != nil {
				t.Fatalf("stream failed after %d samples: %v", c.samples, b.Err)
			}
			if err := c.add(b); err != nil {
				t.Fatal(err)
			}
		case <-deadline.C:
			t.Fatalf("only %d of %d samples within %v", c.samples, want, timeout)
		}
	}
}

// waitClosed drains ch until it closes, failing if that takes longer than
// bound. It returns the Err of the last batch, if any.
func waitClosed(t *testing.T, ch <-chan drivers.Batch, bound time.Duration) error {
	t.Helper()
	deadline := time.NewTimer(bound)
	defer deadline.Stop()
	var last error
	for {
		select {
		case b, ok := <-ch:
			if !ok {
				return last
			}
			if b.Err != nil {
				last = b.Err
			}
		case <-deadline.C:
			t.Fatalf("stream still open %v after its end", bound)
			return nil
		}
	}
}
