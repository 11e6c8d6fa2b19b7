package daemon_test

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"syscall"
	"testing"
	"time"

	"framed/daemon"
	"framed/daemon/publish/brokertest"
	"framed/daemon/store"
)

// fillUntilFull writes a filler file until the filesystem refuses, then
// gives back keepBytes of it, so the daemon has only that much room.
func fillUntilFull(t *testing.T, dir string, keepBytes int64) string {
	t.Helper()
	path := filepath.Join(dir, "filler")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	buf := make([]byte, 64<<10)
	var n int64
	for {
		w, err := f.Write(buf)
		n += int64(w)
		if err != nil {
			if !errors.Is(err, syscall.ENOSPC) {
				t.Fatalf("filling: %v", err)
			}
			break
		}
	}
	if err := f.Truncate(max(0, n-keepBytes)); err != nil {
		t.Fatal(err)
	}
	return path
}

// A full disk: the state directory sits on a small tmpfs the test mounts.
// When the store can no longer write, acquisition of the test stops with a
// clear error and an event, nothing stored is corrupted, the daemon keeps
// running, and once space returns the cut test is closed and reduced and
// new tests are stored and published as usual.
func TestFullDiskIntegration(t *testing.T) {
	state := t.TempDir()
	if err := syscall.Mount("tmpfs", state, "tmpfs", 0, "size=8m"); err != nil {
		t.Skipf("SKIPPING full-disk test: cannot mount a tmpfs here (%v); it needs root, as in CI", err)
	}
	t.Cleanup(func() { syscall.Unmount(state, syscall.MNT_DETACH) })
	filler := fillUntilFull(t, state, 700<<10)

	url, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	specs := e2eSpecimens(t)
	cfg := daemon.Config{
		Frame: "e2e", StateDir: state, Broker: url,
		Drivers: []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: simConfigRate(t, specs, 5000)}},
	}
	next, restart := specimenOrder(specs, true)
	results := subscribe(t, url)
	stop, socket := runDaemon(t, cfg, daemon.Options{SpecimenFallback: next, OnDriverRestart: restart})

	waitFor(t, 60*time.Second, "the store to run out of space", func() bool {
		st := statusMaybe(socket)
		return st != nil && st["state"] == "storage-error"
	})
	st := status(t, socket)
	t.Logf("daemon reports: %v", st["last_error"])
	if msg, _ := st["last_error"].(string); msg == "" {
		t.Errorf("no error message in status while the disk is full")
	}
	// Space returns.
	if err := os.Remove(filler); err != nil {
		t.Fatal(err)
	}
	cut, clean := false, false
	deadline := time.After(90 * time.Second)
	for !(cut && clean) {
		select {
		case r := <-results:
			t.Logf("result %s flags %v", r.TestID, r.Flags)
			if slices.Contains(r.Flags, "storage-error") || slices.Contains(r.Flags, "interrupted") {
				cut = true
			} else if cut {
				clean = true
			}
		case <-deadline:
			t.Fatalf("after space returned: result of the cut test %v, a clean result after it %v", cut, clean)
		}
	}
	stop()
	db, err := store.Open(daemon.StorePath(state), store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	if err := db.Check(); err != nil {
		t.Errorf("store check after the full disk: %v", err)
	}
}

func simConfigRate(t *testing.T, specs any, rateHz int) []byte {
	t.Helper()
	return []byte(fmt.Sprintf(`{"seed":3,"rate_hz":%d,"speed":10,"pace":"realtime","pause_s":1,"loop":true,"specimens":%s}`, rateHz, mustJSON(t, specs)))
}
