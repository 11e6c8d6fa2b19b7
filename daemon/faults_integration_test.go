package daemon_test

import (
	"context"
	"slices"
	"syscall"
	"testing"
	"time"

	"framed/daemon"
	"framed/daemon/publish/brokertest"
)

// status asks the daemon behind socket for its status.
func status(t *testing.T, socket string) map[string]any {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	var st map[string]any
	if err := daemon.Call(ctx, socket, daemon.Request{Op: "status"}, &st); err != nil {
		t.Fatalf("status: %v", err)
	}
	return st
}

func driverField(st map[string]any, key string) float64 {
	drv, _ := st["drivers"].([]any)
	if len(drv) == 0 {
		return 0
	}
	m, _ := drv[0].(map[string]any)
	v, _ := m[key].(float64)
	return v
}

// waitFor polls cond every 50 ms until it holds or d passes.
func waitFor(t *testing.T, d time.Duration, what string, cond func() bool) {
	t.Helper()
	deadline := time.Now().Add(d)
	for !cond() {
		if time.Now().After(deadline) {
			t.Fatalf("timed out after %v waiting for %s", d, what)
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// Killing the driver process mid-test: the daemon restarts it with
// backoff and never exits; the interrupted test's result is flagged, and
// the tests after it come out clean.
func TestDriverCrashIntegration(t *testing.T) {
	url, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	specs := e2eSpecimens(t)
	cfg := daemon.Config{
		Frame: "e2e", StateDir: t.TempDir(), Broker: url,
		Drivers: []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: simConfig(t, specs, true)}},
	}
	next, restart := specimenOrder(specs, true)
	results := subscribe(t, url)
	_, socket := runDaemon(t, cfg, daemon.Options{SpecimenFallback: next, OnDriverRestart: restart})

	waitFor(t, 30*time.Second, "a running test", func() bool { return status(t, socket)["state"] == "running" })
	time.Sleep(time.Second)
	pid := int(driverField(status(t, socket), "pid"))
	if pid <= 0 {
		t.Fatalf("no driver pid in status")
	}
	if err := syscall.Kill(pid, syscall.SIGKILL); err != nil {
		t.Fatalf("kill driver %d: %v", pid, err)
	}
	waitFor(t, 30*time.Second, "the driver restarted", func() bool {
		st := status(t, socket)
		return driverField(st, "starts") >= 2 && driverField(st, "pid") > 0 && int(driverField(st, "pid")) != pid
	})

	flagged, clean := false, false
	deadline := time.After(90 * time.Second)
	for !(flagged && clean) {
		select {
		case r := <-results:
			hit := slices.Contains(r.Flags, "driver-restarted") || slices.Contains(r.Flags, "data-gap")
			t.Logf("result %s specimen %s flags %v", r.TestID, r.Specimen.ID, r.Flags)
			if hit {
				flagged = true
			} else if flagged {
				clean = true
			}
		case <-deadline:
			t.Fatalf("after the crash: flagged result %v, clean result after it %v", flagged, clean)
		}
	}
}
