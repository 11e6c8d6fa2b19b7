package fakedriver

import (
	"context"
	"errors"
	"testing"

	"framed/drivers"
)

func TestParseConfigDefaults(t *testing.T) {
	c, err := parseConfig([]byte(`{}`))
	if err != nil {
		t.Fatal(err)
	}
	if c.Channels != 2 || c.SamplesPerBatch != 10 || c.OnFault != "end" || c.Batches != 0 {
		t.Errorf("defaults %+v", c)
	}
	if got := c.channels(); got[0].Quantity != drivers.QuantityForce || got[1].Quantity != drivers.QuantityExtension {
		t.Errorf("channels %+v", got)
	}
}

func TestParseConfigRefusals(t *testing.T) {
	for _, raw := range []string{
		``, `[]`, `{"channels": 65}`, `{"samples_per_batch": 0}`, `{"samples_per_batch": 100001}`,
		`{"batches": -1}`, `{"on_fault": "explode"}`, `{"fault_file": 3}`,
	} {
		if _, err := parseConfig([]byte(raw)); !errors.Is(err, drivers.ErrBadConfig) {
			t.Errorf("%q: %v, want ErrBadConfig", raw, err)
		}
	}
}

// A scripted end after N batches: exactly N batches, then the error.
func TestScriptedEnd(t *testing.T) {
	d := New()
	ctx := context.Background()
	if _, err := d.Configure(ctx, []byte(`{"channels": 1, "samples_per_batch": 3, "batches": 4, "error": "device_gone"}`)); err != nil {
		t.Fatal(err)
	}
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	var last error
	for b := range ch {
		if b.Err != nil {
			last = b.Err
			continue
		}
		for i, v := range b.Values[0] {
			if want := float64(n*3 + i); v != want {
				t.Fatalf("batch %d sample %d = %v, want the ramp value %v", n, i, v, want)
			}
		}
		n++
	}
	if n != 4 || !errors.Is(last, drivers.ErrDeviceGone) {
		t.Errorf("%d batches then %v, want 4 then ErrDeviceGone", n, last)
	}
}
