package replay_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"testing"
	"time"

	"framed/drivers"
	"framed/drivers/replay"
	"framed/reduce/curvefile"
)

func configured(t testing.TB, cfg string) *replay.Replay {
	t.Helper()
	d := replay.New()
	if _, err := d.Configure(context.Background(), []byte(cfg)); err != nil {
		t.Fatalf("Configure(%s): %v", cfg, err)
	}
	return d
}

// Played unpaced, the stream is the file: every value, and times that are
// the recorded times over the speed (the excerpt of a published S355
// tension test, see README).
func TestReplayIsTheRecording(t *testing.T) {
	path := curvePath(t, "s355-zd2-every10th.csv")
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := curvefile.Read(f)
	if err != nil {
		t.Fatal(err)
	}
	const speed = 2.5
	d := configured(t, fmt.Sprintf(`{"path": %q, "pace": "none", "speed": %v, "at_end": "close"}`, path, speed))
	times, cols, end := read(t, d, math.MaxInt)
	if !errors.Is(end, replay.ErrEnd) {
		t.Fatalf("stream ended with %v, want ErrEnd", end)
	}
	if len(times) != c.Len() {
		t.Fatalf("%d samples, file has %d", len(times), c.Len())
	}
	want := [][]float64{c.ForceN, c.ExtensionMM, c.CrossheadMM}
	for i := range times {
		off := float64(times[i]-times[0]) / 1e9
		if w := (c.TimeS[i] - c.TimeS[0]) / speed; math.Abs(off-w) > 1e-9 {
			t.Fatalf("sample %d at %v s, want %v", i, off, w)
		}
		for k := range want {
			g, w := cols[k][i], want[k][i]
			if g != w && !(math.IsNaN(g) && math.IsNaN(w)) {
				t.Fatalf("sample %d channel %d: %v, want %v", i, k, g, w)
			}
		}
	}
}

// Looping: the recording, a pause with the specimen out (force 0, no other
// reading), the recording again; times rise throughout.
func TestLoopWithPause(t *testing.T) {
	path := curvePath(t, "repeated-stamps-no-crosshead.csv") // 5 rows over 2 s
	d := configured(t, fmt.Sprintf(`{"path": %q, "pace": "none", "loop": true, "pause_s": 1, "rate_hz": 10}`, path))
	// Resampled at 10 Hz: 21 samples over 0..2 s, then 10 pause samples.
	times, cols, _ := read(t, d, 21+10+21)
	for i := 1; i < len(times); i++ {
		if times[i] <= times[i-1] {
			t.Fatalf("time %d does not rise", i)
		}
	}
	for i := 21; i < 31; i++ {
		if cols[0][i] != 0 || !math.IsNaN(cols[1][i]) {
			t.Fatalf("pause sample %d: force %v ext %v, want 0 and none", i, cols[0][i], cols[1][i])
		}
	}
	for i := range 21 {
		a, b := cols[0][i], cols[0][i+31]
		if a != b {
			t.Fatalf("pass 2 sample %d force %v, pass 1 %v", i, b, a)
		}
	}
	if got := float64(times[31]-times[0]) / 1e9; math.Abs(got-3.1) > 1e-6 {
		t.Errorf("second pass starts %v s after the first, want 2 s + 1 s pause + 0.1 s", got)
	}
}

// At realtime pace the times are wall-clock instants, never in the future.
func TestRealtimePace(t *testing.T) {
	path := curvePath(t, "repeated-stamps-no-crosshead.csv")
	d := configured(t, fmt.Sprintf(`{"path": %q, "speed": 10, "at_end": "close", "batch_ms": 10}`, path))
	begin := time.Now().UnixNano()
	ch, err := d.Stream(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	var end error
	for b := range ch {
		recv := time.Now().UnixNano()
		for _, ns := range b.TimeNS {
			if ns < begin || ns > recv {
				t.Errorf("sample time %d outside [start %d, receipt %d]", ns, begin, recv)
			}
		}
		n += len(b.TimeNS)
		if b.Err != nil {
			end = b.Err
		}
	}
	if n != 5 || !errors.Is(end, replay.ErrEnd) {
		t.Errorf("%d samples, end %v; want 5 and ErrEnd", n, end)
	}
}

// The injected fault ends the stream with ErrDeviceGone after
// fail_after_s of stream time.
func TestFailAfter(t *testing.T) {
	path := curvePath(t, "s355-zd2-every10th.csv")
	d := configured(t, fmt.Sprintf(`{"path": %q, "pace": "none", "fail_after_s": 100}`, path))
	times, _, end := read(t, d, math.MaxInt)
	if !errors.Is(end, drivers.ErrDeviceGone) {
		t.Fatalf("ended with %v, want ErrDeviceGone", end)
	}
	if last := float64(times[len(times)-1]-times[0]) / 1e9; last >= 100 || last < 98 {
		t.Errorf("last sample %v s into the stream, want just under 100", last)
	}
}
