package bench

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/drivers/sim"
	"framed/reduce"
)

// latencySettings: many short tests of the aluminium bar at 1 kHz on the
// wall clock. Sample times are wall-clock instants, so a result's
// started_at plus its break event's time_s is when the break sample was
// taken.
func latencySettings() (simSettings, error) {
	sp, err := shortSpecimen()
	return simSettings{rateHz: 1000, speed: 2, pauseS: 0.3, pace: sim.PaceRealtime, loop: true, specs: []sim.Specimen{sp}}, err
}

// latencies are break-to-subscriber delays of the results that arrived.
type latencies struct {
	ms []float64 // sorted
	// eventMS are the delays of the break events (framed/<frame>/events)
	// of the same tests: detection and transport without the reduction.
	eventMS []float64 // sorted
	// missing counts results without a break event (not measurable).
	missing int
}

func (l latencies) quantile(q float64) float64 { return quantile(l.ms, q) }

// quantile of sorted values by nearest rank: the smallest value with at
// least a fraction q of them at or below it.
func quantile(sorted []float64, q float64) float64 {
	if len(sorted) == 0 {
		return nan
	}
	i := int(math.Ceil(float64(len(sorted))*q)) - 1
	return sorted[max(0, min(i, len(sorted)-1))]
}

// measureLatency runs the daemon against broker (for the embedded broker,
// "embedded:ADDR", subscribing to tcp://ADDR) and times each result from
// its break sample to its arrival at a subscriber on this process.
func measureLatency(ctx context.Context, self, dir, broker, subscribeURL string, window time.Duration) (latencies, error) {
	s, err := latencySettings()
	if err != nil {
		return latencies{}, err
	}
	return measureLatencyWith(ctx, self, dir, broker, subscribeURL, window, s)
}

func measureLatencyWith(ctx context.Context, self, dir, broker, subscribeURL string, window time.Duration, s simSettings) (latencies, error) {
	var out latencies
	c, err := startChild(ctx, self, dir, daemonConfig(s, broker), window+3*time.Minute)
	if err != nil {
		return out, err
	}
	defer c.kill()
	var mu sync.Mutex
	var got, gotEvents []float64
	seen := map[string]bool{}
	breakSeen := map[string]time.Time{}
	onEvent := func(_ mqtt.Client, m mqtt.Message) {
		arrived := time.Now()
		var ev struct {
			TestID string `json:"test_id"`
			Kind   string `json:"kind"`
		}
		if json.Unmarshal(m.Payload(), &ev) != nil || ev.Kind != reduce.EventBreak {
			return
		}
		mu.Lock()
		defer mu.Unlock()
		if _, dup := breakSeen[ev.TestID]; !dup {
			breakSeen[ev.TestID] = arrived
		}
	}
	onResult := func(_ mqtt.Client, m mqtt.Message) {
		arrived := time.Now()
		var r reduce.Result
		if err := json.Unmarshal(m.Payload(), &r); err != nil {
			return
		}
		mu.Lock()
		defer mu.Unlock()
		if seen[r.TestID] {
			return
		}
		seen[r.TestID] = true
		at, ok := breakInstant(r)
		if !ok {
			out.missing++
			return
		}
		got = append(got, float64(arrived.Sub(at))/float64(time.Millisecond))
		if evAt, ok := breakSeen[r.TestID]; ok {
			gotEvents = append(gotEvents, float64(evAt.Sub(at))/float64(time.Millisecond))
		}
	}
	opts := mqtt.NewClientOptions().AddBroker(subscribeURL).
		SetClientID(fmt.Sprintf("framed-bench-%d", time.Now().UnixNano())).
		SetConnectTimeout(5 * time.Second).SetAutoReconnect(false)
	cl := mqtt.NewClient(opts)
	if tok := cl.Connect(); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		return out, fmt.Errorf("%w: subscriber connect to %s: %v", ErrDaemon, subscribeURL, tok.Error())
	}
	defer cl.Disconnect(100)
	topic := "framed/" + benchFrame + "/results/+"
	if tok := cl.Subscribe(topic, 1, onResult); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		return out, fmt.Errorf("%w: subscribe %s: %v", ErrDaemon, topic, tok.Error())
	}
	evTopic := "framed/" + benchFrame + "/events"
	if tok := cl.Subscribe(evTopic, 1, onEvent); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		return out, fmt.Errorf("%w: subscribe %s: %v", ErrDaemon, evTopic, tok.Error())
	}
	if !sleepCtx(ctx, window) {
		return out, ctx.Err()
	}
	if err := c.alive(); err != nil {
		return out, err
	}
	mu.Lock()
	out.ms, out.eventMS = slices.Clone(got), slices.Clone(gotEvents)
	mu.Unlock()
	slices.Sort(out.ms)
	slices.Sort(out.eventMS)
	if len(out.ms) == 0 {
		return out, fmt.Errorf("%w: no result with a break arrived in %v (%d without one)", ErrDaemon, window, out.missing)
	}
	return out, nil
}

// breakInstant is the wall-clock instant of a result's break sample.
func breakInstant(r reduce.Result) (time.Time, bool) {
	t0, err := time.Parse(time.RFC3339Nano, r.StartedAt)
	if err != nil {
		return time.Time{}, false
	}
	for _, e := range r.Events {
		if e.Kind == reduce.EventBreak {
			return t0.Add(time.Duration(e.TimeS * float64(time.Second))), true
		}
	}
	return time.Time{}, false
}

// mosquittoBinary finds mosquitto: the given path, else PATH, else
// /usr/sbin where Debian puts it. "" and no error means none is present.
func mosquittoBinary(given string) (string, error) {
	if given == "off" {
		return "", nil
	}
	if given != "" {
		if _, err := os.Stat(given); err != nil {
			return "", fmt.Errorf("%w: mosquitto %q: %w", ErrBadOptions, given, err)
		}
		return given, nil
	}
	if p, err := exec.LookPath("mosquitto"); err == nil {
		return p, nil
	}
	for _, p := range []string{"/usr/sbin/mosquitto", "/usr/local/sbin/mosquitto"} {
		if _, err := os.Stat(p); err == nil {
			return p, nil
		}
	}
	return "", nil
}

// startMosquitto runs a loopback-only, anonymous, non-persistent broker
// and waits until it accepts connections.
func startMosquitto(ctx context.Context, bin, dir string) (url string, stop func(), err error) {
	addr, err := freeAddr()
	if err != nil {
		return "", nil, err
	}
	_, port, _ := net.SplitHostPort(addr)
	conf := filepath.Join(dir, "mosquitto.conf")
	text := strings.Join([]string{"listener " + port + " 127.0.0.1", "allow_anonymous true", "persistence false", "log_dest stderr", "log_type error", ""}, "\n")
	if err := os.WriteFile(conf, []byte(text), 0o600); err != nil {
		return "", nil, err
	}
	logs := &tailBuffer{max: 8 << 10}
	cmd := exec.Command(bin, "-c", conf)
	cmd.Stdout, cmd.Stderr = logs, logs
	dieWithParent(cmd)
	if err := cmd.Start(); err != nil {
		return "", nil, fmt.Errorf("start mosquitto: %w", err)
	}
	done := make(chan struct{})
	go func() { cmd.Wait(); close(done) }()
	stop = func() { cmd.Process.Kill(); <-done }
	deadline := time.Now().Add(10 * time.Second)
	for {
		if cn, err := net.DialTimeout("tcp", addr, 200*time.Millisecond); err == nil {
			cn.Close()
			return "tcp://" + addr, stop, nil
		}
		select {
		case <-done:
			return "", nil, fmt.Errorf("mosquitto exited: %q", logs.String())
		case <-ctx.Done():
			stop()
			return "", nil, ctx.Err()
		case <-time.After(50 * time.Millisecond):
		}
		if time.Now().After(deadline) {
			stop()
			return "", nil, fmt.Errorf("mosquitto not accepting on %s within 10 s: %q", addr, logs.String())
		}
	}
}
