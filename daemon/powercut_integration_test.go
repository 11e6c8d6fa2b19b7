package daemon_test

import (
	"context"
	"crypto/sha256"
	"encoding/json"
	"fmt"
	"log/slog"
	"math/rand/v2"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/daemon"
	"framed/daemon/publish/brokertest"
	"framed/daemon/store"
	"framed/drivers/sim"
)

// childDaemonEnv makes the test binary run as a framed daemon with the
// configuration in the named file (the power-cut campaign's victim).
const childDaemonEnv = "FRAMED_TEST_CHILD_DAEMON"

// longEnv selects the long versions of fault campaigns.
const longEnv = "FRAMED_LONG"

func childDaemon(path string) int {
	data, err := os.ReadFile(path)
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	cfg, err := daemon.ParseConfig(data)
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	var specs []sim.Specimen
	for _, sp := range sim.DemoScript() {
		if sp.Loading.Mode == sim.ModeRate {
			specs = append(specs, sp)
		}
	}
	next, restart := specimenOrder(specs, true)
	ctx, stop := signal.NotifyContext(context.Background(), syscall.SIGTERM)
	defer stop()
	err = daemon.Run(ctx, cfg, daemon.Options{
		Self: os.Args[0], SpecimenFallback: next, OnDriverRestart: restart,
		Logger: slog.New(slog.NewTextHandler(os.Stderr, nil)),
	})
	if err != nil {
		fmt.Fprintln(os.Stderr, "child daemon:", err)
		return 1
	}
	return 0
}

// delivery is one received result: its payload's hash by (test, revision).
type deliveries struct {
	mu   sync.Mutex
	seen map[string]map[int][32]byte
	dups int
	diff []string
}

func (d *deliveries) add(id string, rev int, payload []byte) {
	d.mu.Lock()
	defer d.mu.Unlock()
	h := sha256.Sum256(payload)
	if d.seen[id] == nil {
		d.seen[id] = map[int][32]byte{}
	}
	if old, ok := d.seen[id][rev]; ok {
		d.dups++
		if old != h {
			d.diff = append(d.diff, fmt.Sprintf("%s rev %d", id, rev))
		}
		return
	}
	d.seen[id][rev] = h
}

// The power-cut campaign: framed and its driver are killed together with
// SIGKILL at random moments during acquisition, and started again on the
// same state directory. After every cut the store opens and passes its
// consistency check, no committed sample is missing, the test that was cut
// is closed as interrupted and reduced, and every stored result revision
// reaches the subscriber, never two different documents under one revision.
// Short in CI (3 cuts); FRAMED_LONG=1 runs 30.
func TestPowerCutCampaignIntegration(t *testing.T) {
	cuts := 3
	if os.Getenv(longEnv) == "1" {
		cuts = 30
	}
	url, _, _ := brokertest.StartMosquitto(t, "plain.conf")
	state := t.TempDir()
	var specs []sim.Specimen
	for _, sp := range sim.DemoScript() {
		if sp.Loading.Mode == sim.ModeRate {
			specs = append(specs, sp)
		}
	}
	cfgJSON, _ := json.Marshal(map[string]any{
		"frame": "cut", "state_dir": state, "broker": url,
		"drivers": []any{map[string]any{"name": "sim", "kind": "sim", "config": json.RawMessage(simConfig(t, specs, true))}},
	})
	cfgPath := filepath.Join(t.TempDir(), "framed.json")
	if err := os.WriteFile(cfgPath, cfgJSON, 0o600); err != nil {
		t.Fatal(err)
	}

	got := &deliveries{seen: map[string]map[int][32]byte{}}
	opts := mqtt.NewClientOptions().AddBroker(url).SetClientID("cut-lab").SetCleanSession(false).SetAutoReconnect(true)
	sub := mqtt.NewClient(opts)
	if tok := sub.Connect(); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		t.Fatalf("subscriber: %v", tok.Error())
	}
	defer sub.Disconnect(100)
	sub.Subscribe("framed/cut/results/+", 1, func(_ mqtt.Client, m mqtt.Message) {
		var doc struct {
			TestID   string `json:"test_id"`
			Revision int    `json:"revision"`
		}
		if err := json.Unmarshal(m.Payload(), &doc); err != nil {
			t.Errorf("result is not JSON: %v", err)
			return
		}
		got.add(doc.TestID, doc.Revision, m.Payload())
	}).Wait()

	seed := uint64(time.Now().UnixNano())
	rng := rand.New(rand.NewPCG(seed, 1))
	t.Logf("campaign seed %d, %d cuts", seed, cuts)
	socket := filepath.Join(state, daemon.ControlSocketName)
	committed := map[string]int{}
	for i := 0; i <= cuts; i++ {
		cmd := startChild(t, cfgPath)
		waitFor(t, 60*time.Second, "the daemon to answer", func() bool { return callOK(socket) })
		if i == cuts {
			// Last round: let it finish delivering, then stop it cleanly.
			waitFor(t, 60*time.Second, "a result after the last cut", func() bool {
				got.mu.Lock()
				defer got.mu.Unlock()
				return len(got.seen) >= len(committed)
			})
			waitFor(t, 30*time.Second, "an empty outbox", func() bool {
				st := statusMaybe(socket)
				return st != nil && st["outbox"] == float64(0) && st["state"] != "running"
			})
			cmd.Process.Signal(syscall.SIGTERM)
			cmd.Wait()
			break
		}
		waitFor(t, 60*time.Second, "a running test", func() bool {
			st := statusMaybe(socket)
			return st != nil && st["state"] == "running"
		})
		time.Sleep(time.Duration(rng.Int64N(int64(3 * time.Second))))
		var tests []store.TestMeta
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		err := daemon.Call(ctx, socket, daemon.Request{Op: "tests"}, &tests)
		cancel()
		if err == nil {
			for _, ts := range tests {
				committed[ts.ID] = ts.Samples
			}
		}
		// The cut: the daemon and its driver die together.
		syscall.Kill(-cmd.Process.Pid, syscall.SIGKILL)
		cmd.Wait()
	}

	db, err := store.Open(daemon.StorePath(state), store.Options{})
	if err != nil {
		t.Fatalf("store after %d cuts: %v", cuts, err)
	}
	defer db.Close()
	if err := db.Check(); err != nil {
		t.Fatalf("store check after %d cuts: %v", cuts, err)
	}
	tests, err := db.Tests()
	if err != nil {
		t.Fatal(err)
	}
	interrupted := 0
	for _, ts := range tests {
		if ts.Samples < committed[ts.ID] {
			t.Errorf("test %s: %d samples after the cut, %d were committed before it", ts.ID, ts.Samples, committed[ts.ID])
		}
		if ts.State != store.StateReduced || ts.ResultRevision < 1 {
			t.Errorf("test %s left %s with revision %d", ts.ID, ts.State, ts.ResultRevision)
		}
		if slices.Contains(ts.Flags, "interrupted") {
			interrupted++
		}
		got.mu.Lock()
		for rev := 1; rev <= ts.ResultRevision; rev++ {
			if _, ok := got.seen[ts.ID][rev]; !ok {
				t.Errorf("test %s revision %d stored but never delivered", ts.ID, rev)
			}
		}
		got.mu.Unlock()
	}
	if interrupted < cuts {
		t.Errorf("%d tests flagged interrupted after %d cuts during running tests", interrupted, cuts)
	}
	if len(got.diff) > 0 {
		t.Errorf("different documents under one revision: %v", got.diff)
	}
	t.Logf("%d cuts survived: %d tests, %d interrupted, nothing lost; %d duplicate deliveries (same revision, de-duplicated)", cuts, len(tests), interrupted, got.dups)
}

func startChild(t *testing.T, cfgPath string) *exec.Cmd {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), childDaemonEnv+"="+cfgPath)
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	logf, err := os.OpenFile(filepath.Join(t.TempDir(), "child-"+strconv.Itoa(int(time.Now().UnixNano()))+".log"), os.O_CREATE|os.O_WRONLY, 0o600)
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stdout, cmd.Stderr = logf, logf
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		syscall.Kill(-cmd.Process.Pid, syscall.SIGKILL)
		logf.Close()
		if t.Failed() {
			b, _ := os.ReadFile(logf.Name())
			t.Logf("child log %s:\n%s", logf.Name(), tail(b, 4000))
		}
	})
	return cmd
}

func tail(b []byte, n int) []byte {
	if len(b) > n {
		return b[len(b)-n:]
	}
	return b
}

func callOK(socket string) bool { return statusMaybe(socket) != nil }

func statusMaybe(socket string) map[string]any {
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Second)
	defer cancel()
	var st map[string]any
	if daemon.Call(ctx, socket, daemon.Request{Op: "status"}, &st) != nil {
		return nil
	}
	return st
}

// processGone reports whether pid has exited (a zombie waiting for its new
// parent to reap it counts as gone).
func processGone(pid int) bool {
	b, err := os.ReadFile(fmt.Sprintf("/proc/%d/stat", pid))
	if err != nil {
		return true
	}
	// the state follows the command name in parentheses
	i := strings.LastIndexByte(string(b), ')')
	return i < 0 || i+2 >= len(b) || b[i+2] == 'Z'
}

// When only the daemon dies (kill -9 of framed alone), its driver process
// must not linger holding the serial port: it notices its host is gone and
// exits within a few seconds, so a restarted daemon can open the port.
func TestOrphanedDriverExitsIntegration(t *testing.T) {
	state := t.TempDir()
	specs := e2eSpecimens(t)
	cfgJSON, _ := json.Marshal(map[string]any{
		"frame": "orphan", "state_dir": state, "broker": fmt.Sprintf("embedded:127.0.0.1:%d", brokertest.FreePort(t)),
		"drivers": []any{map[string]any{"name": "sim", "kind": "sim", "config": json.RawMessage(simConfig(t, specs, true))}},
	})
	cfgPath := filepath.Join(t.TempDir(), "framed.json")
	if err := os.WriteFile(cfgPath, cfgJSON, 0o600); err != nil {
		t.Fatal(err)
	}
	cmd := startChild(t, cfgPath)
	socket := filepath.Join(state, daemon.ControlSocketName)
	waitFor(t, 60*time.Second, "the daemon to answer", func() bool { return callOK(socket) })
	pid := int(driverField(status(t, socket), "pid"))
	if pid <= 0 {
		t.Fatal("no driver pid")
	}
	cmd.Process.Kill() // the daemon alone
	cmd.Wait()
	waitFor(t, 10*time.Second, fmt.Sprintf("driver %d to exit after its host died", pid), func() bool { return processGone(pid) })
}
