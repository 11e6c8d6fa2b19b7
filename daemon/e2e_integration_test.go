package daemon_test

import (
	"context"
	"encoding/json"
	"fmt"
	"log/slog"
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/daemon"
	"framed/daemon/publish/brokertest"
	"framed/daemon/store"
	"framed/drivers/builtin"
	"framed/drivers/sim"
	"framed/reduce"
)

// TestMain lets this test binary double as the driver binary: the daemon
// under test launches os.Args[0] in driver mode, exactly as framed
// launches itself, so the sim runs in a real plugin subprocess.
func TestMain(m *testing.M) {
	if builtin.ServeArgs(os.Args[1:]) {
		return
	}
	if path := os.Getenv(childDaemonEnv); path != "" {
		os.Exit(childDaemon(path))
	}
	os.Exit(m.Run())
}

// e2eSpecimens are the specimens the end-to-end tests run: the demo's
// aluminium bar and yield-point mild steel, at a speed that keeps a test
// to a few seconds.
func e2eSpecimens(t *testing.T) []sim.Specimen {
	var out []sim.Specimen
	for _, sp := range sim.DemoScript() {
		if strings.HasSuffix(sp.ID, "AL01") || strings.HasSuffix(sp.ID, "ST03") {
			out = append(out, sp)
		}
	}
	if len(out) != 2 {
		t.Fatalf("demo script changed: found %d of the two specimens", len(out))
	}
	return out
}

// simConfig is the sim driver's configuration for specs: realtime at ten
// times speed, so a test lasts a few seconds.
func simConfig(t *testing.T, specs []sim.Specimen, loop bool) json.RawMessage {
	t.Helper()
	b, err := json.Marshal(map[string]any{
		"seed": 11, "rate_hz": 500, "speed": 10, "pace": "realtime", "pause_s": 1,
		"loop": loop, "specimens": specs,
	})
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// specimenOrder hands out the specimens in the sim's order and starts over
// when the sim restarts, as the demo does.
func specimenOrder(specs []sim.Specimen, loop bool) (next func() (reduce.Specimen, bool), restart func(string)) {
	var mu sync.Mutex
	i := 0
	next = func() (reduce.Specimen, bool) {
		mu.Lock()
		defer mu.Unlock()
		if i >= len(specs) && !loop {
			return reduce.Specimen{}, false
		}
		sp := specs[i%len(specs)].Geometry()
		i++
		return sp, true
	}
	restart = func(string) {
		mu.Lock()
		i = 0
		mu.Unlock()
	}
	return next, restart
}

// startDaemon runs framed with the sim driver against broker and returns
// a function that stops it and waits.
func startDaemon(t *testing.T, broker, stateDir string, specs []sim.Specimen) (stop func()) {
	t.Helper()
	cfg := daemon.Config{
		Frame: "e2e", StateDir: stateDir, Broker: broker,
		Drivers: []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: simConfig(t, specs, false)}},
	}
	next, restart := specimenOrder(specs, false)
	stop, _ = runDaemon(t, cfg, daemon.Options{SpecimenFallback: next, OnDriverRestart: restart})
	return stop
}

// runDaemon starts daemon.Run in the background, waits until it is ready,
// and returns a stop function and the running daemon's control socket.
func runDaemon(t *testing.T, cfg daemon.Config, opt daemon.Options) (stop func(), socket string) {
	t.Helper()
	opt.Self = os.Args[0]
	opt.Logger = slog.New(slog.NewTextHandler(testWriter{t}, &slog.HandlerOptions{Level: slog.LevelInfo}))
	ready := make(chan struct{})
	opt.Ready = func(*daemon.Daemon) { close(ready) }
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- daemon.Run(ctx, cfg, opt) }()
	select {
	case <-ready:
	case err := <-done:
		cancel()
		t.Fatalf("daemon stopped before it was ready: %v", err)
	case <-time.After(60 * time.Second):
		cancel()
		t.Fatalf("daemon not ready within 60 s")
	}
	var once sync.Once
	stop = func() {
		once.Do(func() {
			cancel()
			select {
			case err := <-done:
				if err != nil {
					t.Errorf("daemon: %v", err)
				}
			case <-time.After(30 * time.Second):
				t.Errorf("daemon did not stop within 30 s")
			}
		})
	}
	t.Cleanup(stop)
	return stop, filepath.Join(cfg.StateDir, daemon.ControlSocketName)
}

type testWriter struct{ t *testing.T }

func (w testWriter) Write(p []byte) (int, error) {
	w.t.Log(strings.TrimRight(string(p), "\n"))
	return len(p), nil
}

// subscribe collects result documents from framed/e2e/results/+.
func subscribe(t *testing.T, broker string) <-chan reduce.Result {
	t.Helper()
	out := make(chan reduce.Result, 16)
	opts := mqtt.NewClientOptions().AddBroker(broker).SetClientID(fmt.Sprintf("e2e-sub-%d", time.Now().UnixNano())).
		SetConnectRetry(true).SetAutoReconnect(true)
	c := mqtt.NewClient(opts)
	if tok := c.Connect(); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		t.Fatalf("subscriber connect: %v", tok.Error())
	}
	tok := c.Subscribe("framed/e2e/results/+", 1, func(_ mqtt.Client, m mqtt.Message) {
		var r reduce.Result
		if err := json.Unmarshal(m.Payload(), &r); err != nil {
			t.Errorf("result payload is not a result document: %v", err)
			return
		}
		if got := m.Topic()[strings.LastIndex(m.Topic(), "/")+1:]; got != r.TestID {
			t.Errorf("topic id %q != test_id %q", got, r.TestID)
		}
		if strings.Contains(string(m.Payload()), "\n") {
			t.Errorf("published payload is not one line")
		}
		out <- r
	})
	if !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		t.Fatalf("subscribe: %v", tok.Error())
	}
	t.Cleanup(func() { c.Disconnect(100) })
	return out
}

func quantity(r reduce.Result, sym string) (reduce.Quantity, bool) {
	for _, q := range r.Quantities {
		if q.Symbol == sym {
			return q, true
		}
	}
	return reduce.Quantity{}, false
}

// checkAgainstTruth compares a published result with the simulated
// material's own values: Rm within 0.5 % and Rp0.2 within 1 % (the
// acceptance limits of the end-to-end path; the truth is the simulator's
// closed-form model, Rp0.2 exact by construction of the Ramberg-Osgood
// proof-strength form).
func checkAgainstTruth(t *testing.T, r reduce.Result, specs []sim.Specimen) {
	t.Helper()
	var sp *sim.Specimen
	for i := range specs {
		if specs[i].ID == r.Specimen.ID {
			sp = &specs[i]
		}
	}
	if sp == nil {
		t.Fatalf("result %s names specimen %q, not one we ran", r.TestID, r.Specimen.ID)
	}
	truth := sp.Material.Truth()
	rm, ok := quantity(r, "Rm")
	if !ok {
		t.Fatalf("result %s has no Rm: %+v", r.TestID, r.Quantities)
	}
	if d := math.Abs(rm.Value-truth.RmMPa) / truth.RmMPa; d > 0.005 {
		t.Errorf("%s Rm %.2f MPa, simulated %.2f MPa: off by %.2f %% > 0.5 %%", sp.ID, rm.Value, truth.RmMPa, 100*d)
	}
	rp, ok := quantity(r, "Rp0.2")
	if !ok {
		t.Fatalf("result %s has no Rp0.2: %+v", r.TestID, r.Quantities)
	}
	if d := math.Abs(rp.Value-truth.Rp02MPa) / truth.Rp02MPa; d > 0.01 {
		t.Errorf("%s Rp0.2 %.2f MPa, simulated %.2f MPa: off by %.2f %% > 1 %%", sp.ID, rp.Value, truth.Rp02MPa, 100*d)
	}
	var kinds []string
	for _, e := range r.Events {
		kinds = append(kinds, e.Kind)
	}
	if !strings.Contains(strings.Join(kinds, ","), "start") || !strings.Contains(strings.Join(kinds, ","), "break") {
		t.Errorf("%s events %v: want a start and a break", sp.ID, kinds)
	}
	t.Logf("%s: Rm %.2f (sim %.2f) Rp0.2 %.2f (sim %.2f) flags %v", sp.ID, rm.Value, truth.RmMPa, rp.Value, truth.Rp02MPa, r.Flags)
}

func runEndToEnd(t *testing.T, broker, subscribeURL string) {
	specs := e2eSpecimens(t)
	state := t.TempDir()
	stop := startDaemon(t, broker, state, specs)
	results := subscribe(t, subscribeURL)
	seen := map[string]bool{}
	deadline := time.After(120 * time.Second)
	for len(seen) < len(specs) {
		select {
		case r := <-results:
			if seen[r.Specimen.ID] {
				continue // a re-delivery after a reconnect: de-duplicated by id
			}
			seen[r.Specimen.ID] = true
			checkAgainstTruth(t, r, specs)
		case <-deadline:
			t.Fatalf("only %d of %d results arrived within 120 s", len(seen), len(specs))
		}
	}
	stop()
	// The store holds both tests, reduced, with every sample committed.
	db, err := store.Open(filepath.Join(state, "framed.db"), store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	if err := db.Check(); err != nil {
		t.Errorf("store check after the run: %v", err)
	}
	tests, err := db.Tests()
	if err != nil {
		t.Fatal(err)
	}
	if len(tests) != len(specs) {
		t.Errorf("%d tests stored, want %d", len(tests), len(specs))
	}
	for _, ts := range tests {
		if ts.State != store.StateReduced || ts.ResultRevision != 1 || ts.Samples == 0 {
			t.Errorf("test %s: state %s, revision %d, %d samples", ts.ID, ts.State, ts.ResultRevision, ts.Samples)
		}
	}
}

// The whole path on real parts: the sim in a plugin subprocess, the
// daemon, a real Mosquitto started by the test, a subscriber.
func TestEndToEndMosquittoIntegration(t *testing.T) {
	url, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	runEndToEnd(t, url, url)
}

// The same through the embedded broker, the single-box default.
func TestEndToEndEmbeddedIntegration(t *testing.T) {
	port := brokertest.FreePort(t)
	addr := fmt.Sprintf("127.0.0.1:%d", port)
	runEndToEnd(t, "embedded:"+addr, "tcp://"+addr)
}

func mustJSON(t *testing.T, v any) []byte {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return b
}
