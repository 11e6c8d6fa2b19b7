package bench

import (
	"context"
	"os"
	"path/filepath"
	"testing"
	"time"

	"framed/daemon"
	"framed/daemon/store"
)

// checkStore opens a daemon's store after the daemon is gone and checks it:
// the bench kills daemons whose store it throws away, and that must never
// damage committed data.
func checkStore(t *testing.T, dir string) {
	t.Helper()
	db, err := store.Open(daemon.StorePath(filepath.Join(dir, "state")), store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		// Check runs bbolt's own tx.Check as well as the store's.
		if err := db.Check(); err != nil {
			t.Errorf("store after the daemon was killed: %v", err)
		}
		db.Close()
	})
}

func TestWholePathIntegration(t *testing.T) {
	dir := t.TempDir()
	wp, err := measureWholePath(context.Background(), os.Args[0], dir, time.Second)
	if err != nil {
		t.Fatal(err)
	}
	// The sim is unpaced: anything under 10 kHz, the real-time rate of
	// its channels, would mean the daemon is not being pushed.
	if wp.samplesPerS < 10_000 {
		t.Errorf("whole path %.0f samples/s", wp.samplesPerS)
	}
	if !(wp.daemonCPU > 0) {
		t.Errorf("daemon CPU %v", wp.daemonCPU)
	}
	t.Logf("whole path %.3g samples/s, daemon %.0f %% driver %.0f %%", wp.samplesPerS, 100*wp.daemonCPU, 100*wp.driverCPU)
	checkStore(t, dir)
}

// At 1 kHz real time, the samples committed over the window are about
// the configured rate times the window: give or take a commit at each
// end, and on a loaded machine commits bunch up, so within a factor of 3.
func TestAcquisitionIntegration(t *testing.T) {
	dir := t.TempDir()
	window := 3 * time.Second
	a, err := measureAcquisitionIdle(context.Background(), os.Args[0], dir, 1000, window, 1)
	if err != nil {
		t.Fatal(err)
	}
	want := 1000 * window.Seconds()
	if r := float64(a.samples) / want; r < 1.0/3 || r > 3 {
		t.Errorf("%d samples committed in %v at 1 kHz, want about %.0f", a.samples, window, want)
	}
	if a.rssIdleMB <= 0 || a.rssMaxMB() <= 0 || len(a.rss) == 0 {
		t.Errorf("resident memory idle %v MB, readings %v", a.rssIdleMB, a.rss)
	}
	// CPU time is sampled at clock ticks, so a light load may read 0.
	if !(a.cpu >= 0 && a.cpu < 1) {
		t.Errorf("CPU share %v of one core at 1 kHz", a.cpu)
	}
	if a.writeBytes <= 0 {
		t.Errorf("no disk writes while committing %d samples", a.samples)
	}
	t.Logf("%+v", a)
	checkStore(t, dir)
}

func TestLatencyIntegration(t *testing.T) {
	addr, err := freeAddr()
	if err != nil {
		t.Fatal(err)
	}
	l, err := measureLatency(context.Background(), os.Args[0], t.TempDir(), "embedded:"+addr, "tcp://"+addr, 7*time.Second)
	if err != nil {
		t.Fatal(err)
	}
	// A result cannot arrive before its break sample was taken, and on
	// loopback it takes far less than the 5 s a test of this specimen
	// lasts with its pauses.
	for _, ms := range l.ms {
		if ms <= 0 || ms > 5000 {
			t.Errorf("break to subscriber %v ms", ms)
		}
	}
	for i, ms := range l.eventMS {
		if ms <= 0 || ms > l.ms[len(l.ms)-1] {
			t.Errorf("event %d: %v ms", i, ms)
		}
	}
	t.Logf("latencies %v ms, events %v ms", l.ms, l.eventMS)
}

func TestServeArgsIgnoresOtherArgs(t *testing.T) {
	for _, args := range [][]string{nil, {"status"}, {"__framed-driver", "sim"}} {
		if ServeArgs(args) {
			t.Errorf("ServeArgs(%q) served", args)
		}
	}
	if err := serve([]string{"only-one"}); err == nil {
		t.Error("serve with one argument accepted")
	}
	cfg := filepath.Join(t.TempDir(), "c.json")
	os.WriteFile(cfg, []byte(`{"frame": "x", "drivers": []`), 0o600)
	if err := serve([]string{cfg, "5"}); err == nil {
		t.Error("serve with a broken config accepted")
	}
}
