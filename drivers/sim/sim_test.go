package sim_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"testing"
	"time"

	"framed/drivers"
	"framed/drivers/sim"
)

func configured(t testing.TB, cfg string) *sim.Sim {
	t.Helper()
	d := sim.New()
	if _, err := d.Configure(context.Background(), []byte(cfg)); err != nil {
		t.Fatalf("Configure(%s): %v", cfg, err)
	}
	return d
}

// The same seed gives the same samples, a different seed other noise.
func TestDeterministicForSeed(t *testing.T) {
	const n = 5000
	cfg := `{"script": "demo", "pace": "none", "pause_s": 0, "rate_hz": 1000, "speed": 20, "seed": %d}`
	a := readSamples(t, configured(t, fmt.Sprintf(cfg, 7)), n)
	b := readSamples(t, configured(t, fmt.Sprintf(cfg, 7)), n)
	c := readSamples(t, configured(t, fmt.Sprintf(cfg, 8)), n)
	same, differ := true, false
	for ch := range a {
		for i := range n {
			x, y, z := a[ch][i], b[ch][i], c[ch][i]
			if x != y && !(math.IsNaN(x) && math.IsNaN(y)) {
				same = false
			}
			if x != z && !(math.IsNaN(x) && math.IsNaN(z)) {
				differ = true
			}
		}
	}
	if !same {
		t.Error("two streams with seed 7 differ")
	}
	if !differ {
		t.Error("seeds 7 and 8 give identical samples")
	}
}

// At no load the force reading is the noise alone: its RMS is the
// configured RMS times the noise factor (the sample RMS of N normal draws
// has a relative standard error of about 1/sqrt(2N), common statistics;
// 5 % is over four of them at N = 4000).
func TestNoiseRMSAsConfigured(t *testing.T) {
	for _, c := range []struct{ noiseN, factor float64 }{{2, 1}, {2, 2.5}, {40, 0.5}} {
		cfg := fmt.Sprintf(`{"script": "demo", "pace": "none", "pause_s": 10, "rate_hz": 400, "noise": %v, "sensors": {"force_noise_N": %v}}`, c.factor, c.noiseN)
		cols := readSamples(t, configured(t, cfg), 4000)
		sum := 0.0
		for _, f := range cols[0][:4000] {
			sum += f * f
		}
		rms := math.Sqrt(sum / 4000)
		if want := c.noiseN * c.factor; math.Abs(rms-want) > 0.05*want {
			t.Errorf("noise %v N x %v: RMS %.4f N, want %.4f within 5 %%", c.noiseN, c.factor, rms, want)
		}
	}
}

// Readings are whole counts: force in steps of range/2^23 (a 24-bit
// bipolar ADC), extension and crosshead in steps of their resolution.
func TestQuantisationStep(t *testing.T) {
	cfg := `{"script": "demo", "pace": "none", "pause_s": 0, "rate_hz": 1000, "speed": 50, "sensors": {"force_range_N": 50000, "ext_resolution_mm": 0.0005}}`
	d := configured(t, cfg)
	info, _ := d.Describe(context.Background())
	step := 50000 / math.Exp2(23)
	if r := info.Channels[0].Resolution; math.Abs(r-step) > 1e-15 {
		t.Errorf("force resolution %v, want 50000/2^23 = %v", r, step)
	}
	cols := readSamples(t, d, 20000)
	steps := []float64{step, 0.0005, 0.001}
	moving := 0
	for ch, col := range cols {
		for _, v := range col {
			if math.IsNaN(v) {
				continue
			}
			c := v / steps[ch]
			if math.Abs(c-math.Round(c)) > 1e-6 {
				t.Fatalf("channel %d value %v is not a whole number of %v steps", ch, v, steps[ch])
			}
			if ch == 0 && v > 1000 {
				moving++
			}
		}
	}
	if moving == 0 {
		t.Fatal("no loaded samples in the window")
	}
	// Raw mode: the same readings as integer counts.
	raw := readSamples(t, configured(t, cfg[:len(cfg)-2]+`, "raw_counts": true}}`), 20000)
	for i := range 20000 {
		if f := raw[0][i]; f != math.Trunc(f) || math.Abs(f*step-cols[0][i]) > 1e-9 {
			t.Fatalf("sample %d: raw %v counts, engineering %v N", i, f, cols[0][i])
		}
	}
}

// The injected fault ends the stream after fail_after_s of stream time
// with an error wrapping ErrDeviceGone, and the channel closes.
func TestFailAfter(t *testing.T) {
	d := configured(t, `{"script": "demo", "pace": "none", "rate_hz": 500, "fail_after_s": 3}`)
	ch, err := d.Stream(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	var last error
	for b := range ch {
		n += len(b.TimeNS)
		if b.Err != nil {
			last = b.Err
		}
	}
	if !errors.Is(last, drivers.ErrDeviceGone) {
		t.Fatalf("stream ended with %v, want ErrDeviceGone", last)
	}
	if n != 1500 {
		t.Errorf("%d samples before the fault, want 3 s x 500 Hz = 1500", n)
	}
	h, _ := d.Health(context.Background())
	if h.Counters["injected_faults"] != 1 || h.Counters["samples"] != 1500 {
		t.Errorf("health counters %v", h.Counters)
	}
}

// In realtime pace sample times are wall-clock instants one period apart,
// none in the future, and a batch carries what was due.
func TestRealtimeTimestamps(t *testing.T) {
	d := configured(t, `{"script": "demo", "rate_hz": 1000, "batch_ms": 10}`)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	begin := time.Now().UnixNano()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	var prev int64
	for range 10 {
		b := <-ch
		recv := time.Now().UnixNano()
		for _, ns := range b.TimeNS {
			if ns < begin || ns > recv {
				t.Fatalf("sample time %d outside [stream start %d, receipt %d]", ns, begin, recv)
			}
			if prev != 0 && ns-prev != int64(time.Millisecond) {
				t.Fatalf("sample spacing %d ns, want 1 ms", ns-prev)
			}
			prev = ns
		}
	}
	cancel()
	for range ch {
	}
}

// The demo series reaches every specimen's Fm in order (a dead weight's
// peak only comes near it: the wire runs away once past it); at speed 10
// and no pace it runs through in a fraction of a second.
func TestDemoSeriesRunsThrough(t *testing.T) {
	const rate, speed = 1000.0, 10.0
	d := configured(t, fmt.Sprintf(`{"script": "demo", "pace": "none", "noise": 0, "pause_s": 1, "rate_hz": %v, "speed": %v}`, rate, speed))
	cols := readSamples(t, d, 120000)
	force := cols[0]
	// Split at the no-load stretches between tests and take each peak.
	var peaks []float64
	peak := 0.0
	for _, f := range force {
		if f > peak {
			peak = f
		}
		if f == 0 && peak > 0 {
			peaks = append(peaks, peak)
			peak = 0
		}
	}
	// A dead-weight wire goes slack when unloaded, so its test shows more
	// than one stretch; keep the stretches that reach an Fm.
	specs := sim.DemoScript()
	i := 0
	for _, p := range peaks {
		tol := 1e-3 * specs[i%len(specs)].FmN()
		if specs[i%len(specs)].Loading.Mode == sim.ModeDeadWeight {
			tol *= 20
		}
		if i < len(specs) && math.Abs(p-specs[i].FmN()) <= tol {
			i++
		}
	}
	if i != len(specs) {
		t.Errorf("found the Fm of %d of %d demo specimens in order; peaks %v", i, len(specs), peaks)
	}
}
