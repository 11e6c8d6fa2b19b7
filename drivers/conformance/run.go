package conformance

import (
	"context"
	"errors"
	"runtime"
	"slices"
	"syscall"
	"testing"
	"time"

	"framed/drivers"
)

// Run runs every check on the driver of s directly, through the gRPC shims
// in process, and in a driver process of its own.
func Run(t *testing.T, s Suite) {
	t.Helper()
	if s.New == nil || s.Name == "" {
		t.Fatal("conformance: Suite needs Name and New")
	}
	t.Run("direct", func(t *testing.T) { runChecks(t, s, openDirect, "direct") })
	t.Run("grpc", func(t *testing.T) { runChecks(t, s, openGRPC, "grpc") })
	t.Run("process", func(t *testing.T) {
		if s.NoSubprocess != "" {
			t.Skip(s.NoSubprocess)
		}
		if factories[s.Name] == nil {
			t.Fatalf("conformance: no factory %q for the out-of-process run: call "+
				"conformance.Main(m, map[string]func() drivers.Driver{%q: ...}) in TestMain, "+
				"or set Suite.NoSubprocess to a reason", s.Name, s.Name)
		}
		runChecks(t, s, openProcess, "process")
	})
}

// check is one conformance check on a fresh driver.
type check struct {
	name string
	run  func(t *testing.T, e env)
	// process marks checks that need a driver process.
	process bool
}

var checks = []check{
	{name: "describe", run: checkDescribe},
	{name: "stream_before_configure", run: checkStreamBeforeConfigure},
	{name: "bad_config", run: checkBadConfig},
	{name: "configure", run: checkConfigure},
	{name: "stream", run: checkStream},
	{name: "health", run: checkHealth},
	{name: "cancel", run: checkCancel},
	{name: "restart", run: checkRestart},
	{name: "fault", run: checkFault},
	{name: "plugin_dead", run: checkPluginDead, process: true},
}

// env is what a check works on.
type env struct {
	s Suite
	d drivers.Driver
	// proc is the driver process in the out-of-process run, else nil.
	proc *drivers.Process
	// direct is set when d is the driver itself, not a shim.
	direct bool
}

func runChecks(t *testing.T, s Suite, open opener, mode string) {
	for _, c := range checks {
		if c.process && mode != "process" {
			continue
		}
		t.Run(c.name, func(t *testing.T) {
			d, proc := open(t, s)
			c.run(t, env{s: s, d: d, proc: proc, direct: mode == "direct"})
		})
	}
}

func testContext(t *testing.T, s Suite) context.Context {
	ctx, cancel := context.WithTimeout(context.Background(), 3*s.timeout())
	t.Cleanup(cancel)
	return ctx
}

var knownQuantities = []drivers.Quantity{
	drivers.QuantityForce, drivers.QuantityExtension, drivers.QuantityCrosshead, drivers.QuantityOther,
}

// checkInfo checks what every Info must satisfy; configured Infos must
// also have channels.
func checkInfo(t *testing.T, info drivers.Info, configured bool) {
	t.Helper()
	if info.Driver == "" {
		t.Error("Info.Driver is empty")
	}
	if configured && len(info.Channels) == 0 {
		t.Error("configured Info has no channels")
	}
	seen := map[string]bool{}
	for i, c := range info.Channels {
		if c.Name == "" {
			t.Errorf("channel %d has no name", i)
		}
		if seen[c.Name] {
			t.Errorf("channel name %q repeats", c.Name)
		}
		seen[c.Name] = true
		if !slices.Contains(knownQuantities, c.Quantity) {
			t.Errorf("channel %q has unknown quantity %q", c.Name, c.Quantity)
		}
		if c.Unit == "" {
			t.Errorf("channel %q has no unit", c.Name)
		}
		if c.RangeMax < 0 || c.Resolution < 0 {
			t.Errorf("channel %q has negative range %v or resolution %v", c.Name, c.RangeMax, c.Resolution)
		}
	}
}

func checkDescribe(t *testing.T, e env) {
	s, d := e.s, e.d
	info, err := d.Describe(testContext(t, s))
	if err != nil {
		t.Fatalf("Describe: %v", err)
	}
	checkInfo(t, info, false)
}

func checkStreamBeforeConfigure(t *testing.T, e env) {
	s, d := e.s, e.d
	ctx, cancel := context.WithCancel(testContext(t, s))
	defer cancel()
	ch, err := d.Stream(ctx)
	if err == nil {
		cancel()
		waitClosed(t, ch, closeBound)
		t.Fatal("Stream before Configure succeeded")
	}
	if !errors.Is(err, drivers.ErrNotConfigured) {
		t.Fatalf("Stream before Configure: %v, want an error wrapping ErrNotConfigured", err)
	}
}

func checkBadConfig(t *testing.T, e env) {
	s, d := e.s, e.d
	ctx := testContext(t, s)
	bad := map[string][]byte{"unparsable JSON": []byte(`{"`)}
	for name, c := range s.BadConfigs {
		bad[name] = c
	}
	names := make([]string, 0, len(bad))
	for name := range bad {
		names = append(names, name)
	}
	slices.Sort(names)
	refuseAll := func(when string) {
		for _, name := range names {
			if _, err := d.Configure(ctx, bad[name]); !errors.Is(err, drivers.ErrBadConfig) {
				t.Errorf("%s: bad config %q (%q): got %v, want an error wrapping ErrBadConfig", when, name, bad[name], err)
			}
		}
	}
	// Before any device exists: a driver that did I/O first would fail
	// otherwise than with ErrBadConfig.
	refuseAll("unconfigured")

	// A refused config must leave the good one in force.
	good := s.config(t)
	info, err := d.Configure(ctx, good)
	if err != nil {
		t.Fatalf("Configure good config: %v", err)
	}
	refuseAll("after a good config")
	sctx, cancel := context.WithCancel(ctx)
	defer cancel()
	ch, err := d.Stream(sctx)
	if err != nil {
		t.Fatalf("Stream after refused configs: %v", err)
	}
	sc := streamCheck{channels: len(info.Channels)}
	sc.collect(t, ch, 1, s.timeout())
	cancel()
	waitClosed(t, ch, closeBound)
}

func checkConfigure(t *testing.T, e env) {
	s, d := e.s, e.d
	info, err := d.Configure(testContext(t, s), s.config(t))
	if err != nil {
		t.Fatalf("Configure: %v", err)
	}
	checkInfo(t, info, true)
}

// startStream configures d and starts a stream.
func startStream(t *testing.T, s Suite, d drivers.Driver, config []byte) (context.Context, context.CancelFunc, <-chan drivers.Batch, *streamCheck) {
	t.Helper()
	ctx := testContext(t, s)
	info, err := d.Configure(ctx, config)
	if err != nil {
		t.Fatalf("Configure: %v", err)
	}
	sctx, cancel := context.WithCancel(ctx)
	t.Cleanup(cancel)
	ch, err := d.Stream(sctx)
	if err != nil {
		t.Fatalf("Stream: %v", err)
	}
	return ctx, cancel, ch, &streamCheck{channels: len(info.Channels)}
}

func checkStream(t *testing.T, e env) {
	s, d := e.s, e.d
	ctx, cancel, ch, sc := startStream(t, s, d, s.config(t))
	sc.collect(t, ch, s.minSamples(), s.timeout())

	second, err := d.Stream(ctx)
	if err == nil {
		t.Error("a second Stream while streaming succeeded")
		waitClosed(t, second, closeBound) // ends with ctx at test end
	} else if !errors.Is(err, drivers.ErrStreaming) {
		t.Errorf("second Stream: %v, want an error wrapping ErrStreaming", err)
	}
	if _, err := d.Health(ctx); err != nil {
		t.Errorf("Health while streaming: %v", err)
	}
	sc.collect(t, ch, 1, s.timeout())
	cancel()
	if err := waitClosed(t, ch, closeBound); err != nil && !errors.Is(err, context.Canceled) {
		t.Errorf("stream ended with %v after cancel, want no error or context.Canceled", err)
	}

	// The refused second call must not have disturbed the driver: a new
	// stream starts at once.
	sctx, cancel2 := context.WithCancel(ctx)
	defer cancel2()
	ch2, err := d.Stream(sctx)
	if err != nil {
		t.Fatalf("Stream after the first stream closed: %v", err)
	}
	sc2 := streamCheck{channels: sc.channels, lastNS: sc.lastNS}
	sc2.collect(t, ch2, 1, s.timeout())
	cancel2()
	waitClosed(t, ch2, closeBound)
}

func checkHealth(t *testing.T, e env) {
	s, d := e.s, e.d
	ctx := testContext(t, s)
	if _, err := d.Health(ctx); err != nil {
		t.Errorf("Health before Configure: %v", err)
	}
	if _, err := d.Configure(ctx, s.config(t)); err != nil {
		t.Fatalf("Configure: %v", err)
	}
	h, err := d.Health(ctx)
	if err != nil {
		t.Fatalf("Health after Configure: %v", err)
	}
	if !h.OK && h.Message == "" {
		t.Error("Health is not OK and gives no message")
	}
}

func checkCancel(t *testing.T, e env) {
	s, d := e.s, e.d
	ctx := testContext(t, s)
	if _, err := d.Configure(ctx, s.config(t)); err != nil {
		t.Fatalf("Configure: %v", err)
	}
	before := runtime.NumGoroutine()
	sctx, cancel := context.WithCancel(ctx)
	ch, err := d.Stream(sctx)
	if err != nil {
		cancel()
		t.Fatalf("Stream: %v", err)
	}
	select {
	case b, ok := <-ch:
		if !ok || b.Err != nil {
			cancel()
			t.Fatalf("stream ended before its first batch (err %v)", b.Err)
		}
	case <-time.After(s.timeout()):
		cancel()
		t.Fatalf("no batch within %v", s.timeout())
	}
	cancel()
	if err := waitClosed(t, ch, closeBound); err != nil && !errors.Is(err, context.Canceled) {
		t.Errorf("stream ended with %v after cancel", err)
	}
	if !e.direct {
		return
	}
	// Goroutines of the driver's stream must end soon after the channel
	// closed; only the in-process runs can see them.
	deadline := time.Now().Add(closeBound)
	for runtime.NumGoroutine() > before && time.Now().Before(deadline) {
		time.Sleep(10 * time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > before {
		buf := make([]byte, 1<<16)
		buf = buf[:runtime.Stack(buf, true)]
		t.Errorf("%d goroutines before the stream, %d after it closed:\n%s", before, n, buf)
	}
}

func checkRestart(t *testing.T, e env) {
	s, d := e.s, e.d
	ctx, cancel, ch, sc := startStream(t, s, d, s.config(t))
	sc.collect(t, ch, s.minSamples(), s.timeout())
	cancel()
	waitClosed(t, ch, closeBound)

	// At once again, without a new Configure: Seq starts over and times go
	// on rising from where the first stream stopped.
	sctx, cancel2 := context.WithCancel(ctx)
	defer cancel2()
	ch2, err := d.Stream(sctx)
	if err != nil {
		t.Fatalf("second Stream after the first closed: %v", err)
	}
	sc2 := streamCheck{channels: sc.channels, lastNS: sc.lastNS}
	sc2.collect(t, ch2, s.minSamples(), s.timeout())
	cancel2()
	waitClosed(t, ch2, closeBound)
}

func checkFault(t *testing.T, e env) {
	s, d := e.s, e.d
	if s.InjectFault == nil && s.FaultConfig == nil {
		t.Skip("suite declares no way to inject a fault (InjectFault or FaultConfig)")
	}
	config := s.config(t)
	if s.FaultConfig != nil {
		config = s.FaultConfig
	}
	_, cancel, ch, sc := startStream(t, s, d, config)
	defer cancel()
	if s.InjectFault != nil {
		sc.collect(t, ch, 1, s.timeout())
		s.InjectFault(t)
	}
	deadline := time.NewTimer(s.timeout())
	defer deadline.Stop()
	switch s.Fault {
	case FaultEnds:
		for {
			select {
			case b, ok := <-ch:
				if !ok {
					t.Fatal("stream closed after the fault without a batch carrying Err")
				}
				if b.Err != nil {
					if s.FaultErr != nil && !errors.Is(b.Err, s.FaultErr) {
						t.Errorf("fault ended the stream with %v, want an error wrapping %v", b.Err, s.FaultErr)
					}
					if errors.Is(b.Err, drivers.ErrPluginDead) {
						t.Errorf("fault ended the stream with %v: the driver process died", b.Err)
					}
					if err := waitClosed(t, ch, closeBound); err != nil {
						t.Errorf("a batch after the one carrying Err: %v", err)
					}
					return
				}
				if err := sc.add(b); err != nil {
					t.Fatal(err)
				}
			case <-deadline.C:
				t.Fatalf("no batch carrying Err within %v of the fault", s.timeout())
			}
		}
	case FaultReopens:
		gaps := sc.gaps
		for sc.gaps == gaps {
			select {
			case b, ok := <-ch:
				if !ok || b.Err != nil {
					t.Fatalf("stream ended after the fault (err %v), want a reopen and a gap", b.Err)
				}
				if err := sc.add(b); err != nil {
					t.Fatal(err)
				}
			case <-deadline.C:
				t.Fatalf("no batch with GapBefore > 0 within %v of the fault", s.timeout())
			}
		}
		// The stream must go on after the gap.
		sc.collect(t, ch, 1, s.timeout())
		cancel()
		waitClosed(t, ch, closeBound)
	default:
		t.Fatalf("unknown FaultMode %d", s.Fault)
	}
}

// checkPluginDead kills the driver process hard, as a crash would, while it
// streams.
func checkPluginDead(t *testing.T, e env) {
	s, d := e.s, e.d
	ctx, _, ch, sc := startStream(t, s, d, s.config(t))
	sc.collect(t, ch, 1, s.timeout())
	if err := syscall.Kill(e.proc.Pid(), syscall.SIGKILL); err != nil {
		t.Fatalf("kill driver process %d: %v", e.proc.Pid(), err)
	}
	deadline := time.NewTimer(s.timeout())
	defer deadline.Stop()
	var last error
wait:
	for {
		select {
		case b, ok := <-ch:
			if !ok {
				break wait
			}
			if b.Err != nil {
				last = b.Err
			}
		case <-deadline.C:
			t.Fatalf("stream still open %v after the driver process was killed", s.timeout())
		}
	}
	if !errors.Is(last, drivers.ErrPluginDead) {
		t.Errorf("stream of a killed driver ended with %v, want an error wrapping ErrPluginDead", last)
	}
	if err := e.proc.Wait(ctx); err != nil {
		t.Fatalf("waiting for the killed process: %v", err)
	}
	if _, err := d.Describe(ctx); !errors.Is(err, drivers.ErrPluginDead) {
		t.Errorf("Describe on a killed driver: %v, want an error wrapping ErrPluginDead", err)
	}
}
