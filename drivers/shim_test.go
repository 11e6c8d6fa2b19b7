package drivers_test

import (
	"context"
	"errors"
	"math"
	"os"
	"os/exec"
	"reflect"
	"runtime"
	"syscall"
	"testing"
	"time"

	"github.com/hashicorp/go-plugin"

	"framed/drivers"
	"framed/drivers/conformance"
	"framed/drivers/internal/fakedriver"
)

// grpcConn serves d through the real shims over an in-process connection.
func grpcConn(t testing.TB, d drivers.Driver) drivers.Driver {
	t.Helper()
	client, _ := plugin.TestPluginGRPCConn(t, false, drivers.PluginMap(d))
	// Close also stops the server, through go-plugin's controller; a
	// second Stop here would race with that one.
	t.Cleanup(func() { client.Close() })
	raw, err := client.Dispense(drivers.PluginName)
	if err != nil {
		t.Fatal(err)
	}
	return raw.(drivers.Driver)
}

var scriptInfo = drivers.Info{
	Driver: "scripted", Version: "0.1", SampleRateHz: 200,
	Channels: []drivers.Channel{
		{Name: "force", Quantity: drivers.QuantityForce, Unit: "counts", RangeMax: 8388607, Resolution: 1},
		{Name: "ext", Quantity: drivers.QuantityExtension, Unit: "mm", RangeMax: 2.5, Resolution: 0.0005},
	},
}

// scriptBatches holds values that a lossy conversion would change: NaN,
// infinities, negative zero, the smallest subnormal, extreme times.
func scriptBatches() []drivers.Batch {
	return []drivers.Batch{
		{Seq: 0, TimeNS: []int64{1, 2, 3}, Values: [][]float64{{0, -1.5, 8388607}, {math.NaN(), math.Inf(1), math.Copysign(0, -1)}}},
		{Seq: 1, TimeNS: []int64{math.MaxInt64 - 1, math.MaxInt64}, Values: [][]float64{{math.SmallestNonzeroFloat64, -math.MaxFloat64}, {math.Inf(-1), 1e-300}}, GapBefore: 1500 * time.Millisecond},
		{Seq: 2, TimeNS: []int64{}, Values: [][]float64{{}, {}}, GapBefore: time.Nanosecond},
	}
}

// sameBits compares batches bit for bit, so NaN equals NaN and -0 differs
// from 0.
func sameBits(a, b drivers.Batch) bool {
	if a.Seq != b.Seq || a.GapBefore != b.GapBefore || len(a.TimeNS) != len(b.TimeNS) || len(a.Values) != len(b.Values) {
		return false
	}
	for i := range a.TimeNS {
		if a.TimeNS[i] != b.TimeNS[i] {
			return false
		}
	}
	for ch := range a.Values {
		if len(a.Values[ch]) != len(b.Values[ch]) {
			return false
		}
		for i := range a.Values[ch] {
			if math.Float64bits(a.Values[ch][i]) != math.Float64bits(b.Values[ch][i]) {
				return false
			}
		}
	}
	return true
}

// What a driver sends arrives unchanged, and its mid-stream error arrives
// as the last batch's Err with its name and message.
func TestStreamRoundTripAndMidStreamErrorGRPC(t *testing.T) {
	end := errors.New("scripted: board stopped answering")
	for _, tc := range []struct {
		name  string
		end   error
		named error
	}{
		{"device gone", drivers.ErrDeviceGone, drivers.ErrDeviceGone},
		{"plain error", end, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			d := grpcConn(t, &fakedriver.Scripted{Info: scriptInfo, Batches: scriptBatches(), End: tc.end})
			ctx := context.Background()
			info, err := d.Configure(ctx, []byte(`{}`))
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(info, scriptInfo) {
				t.Errorf("Info\n got %+v\nwant %+v", info, scriptInfo)
			}
			h, err := d.Health(ctx)
			if err != nil || !h.OK || h.Counters["batches"] != 3 {
				t.Errorf("Health = %+v, %v", h, err)
			}
			ch, err := d.Stream(ctx)
			if err != nil {
				t.Fatal(err)
			}
			var got []drivers.Batch
			for b := range ch {
				got = append(got, b)
			}
			want := scriptBatches()
			if len(got) != len(want)+1 {
				t.Fatalf("%d batches, want %d and one carrying Err", len(got), len(want))
			}
			for i := range want {
				if !sameBits(got[i], want[i]) {
					t.Errorf("batch %d\n got %+v\nwant %+v", i, got[i], want[i])
				}
			}
			if seq := got[len(got)-1].Seq; seq != uint64(len(want)) {
				t.Errorf("error batch has Seq %d, want %d", seq, len(want))
			}
			last := got[len(got)-1].Err
			if last == nil || last.Error() != tc.end.Error() {
				t.Errorf("final Err %v, want %v", last, tc.end)
			}
			if tc.named != nil && !errors.Is(last, tc.named) {
				t.Errorf("final Err %v does not wrap %v", last, tc.named)
			}
			if errors.Is(last, drivers.ErrPluginDead) {
				t.Errorf("final Err %v claims a dead plugin", last)
			}
		})
	}
}

// A consumer that cancels and stops reading must not leave the stream
// running: the channel closes without further reads being needed beyond
// draining, and the driver can stream again.
func TestStreamCancelWithoutReadingGRPC(t *testing.T) {
	fake := fakedriver.New()
	d := grpcConn(t, fake)
	ctx := context.Background()
	if _, err := d.Configure(ctx, []byte(`{"samples_per_batch": 100}`)); err != nil {
		t.Fatal(err)
	}
	// go-plugin starts its own helper streams lazily after connecting;
	// the baseline is taken after a first round, once they run.
	before := 0
	for round := range 4 {
		if round == 1 {
			before = runtime.NumGoroutine()
		}
		sctx, cancel := context.WithCancel(ctx)
		ch, err := d.Stream(sctx)
		if err != nil {
			t.Fatalf("round %d: %v", round, err)
		}
		// Let the unthrottled driver fill every buffer on the way.
		time.Sleep(50 * time.Millisecond)
		cancel()
		deadline := time.After(2 * time.Second)
		for open := true; open; {
			select {
			case _, open = <-ch:
			case <-deadline:
				t.Fatalf("round %d: stream still open 2 s after cancel", round)
			}
		}
	}
	// Both ends' stream goroutines (client reader, server handler, the
	// driver's producer) must be gone soon after.
	deadline := time.Now().Add(2 * time.Second)
	for runtime.NumGoroutine() > before && time.Now().Before(deadline) {
		time.Sleep(10 * time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > before {
		buf := make([]byte, 1<<16)
		t.Errorf("%d goroutines before streaming, %d after:\n%s", before, n, buf[:runtime.Stack(buf, true)])
	}
}

func TestStreamErrorsGRPC(t *testing.T) {
	d := grpcConn(t, fakedriver.New())
	ctx := context.Background()
	if _, err := d.Stream(ctx); !errors.Is(err, drivers.ErrNotConfigured) {
		t.Errorf("Stream before Configure: %v, want ErrNotConfigured", err)
	}
	if _, err := d.Configure(ctx, []byte(`{"channels": 99}`)); !errors.Is(err, drivers.ErrBadConfig) {
		t.Errorf("bad Configure: %v, want ErrBadConfig", err)
	}
}

// An orderly Kill of the driver process mid-stream ends the stream with
// ErrPluginDead, and later calls fail with it at once.
func TestKillMidStreamIntegration(t *testing.T) {
	p := conformance.LaunchSelf(t, "fake")
	ctx := context.Background()
	if _, err := p.Configure(ctx, []byte(`{"batch_interval_us": 1000}`)); err != nil {
		t.Fatal(err)
	}
	ch, err := p.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if b := <-ch; b.Err != nil {
		t.Fatal(b.Err)
	}
	p.Kill()
	var last error
	for b := range ch {
		if b.Err != nil {
			last = b.Err
		}
	}
	if !errors.Is(last, drivers.ErrPluginDead) {
		t.Errorf("stream ended with %v, want ErrPluginDead", last)
	}
	if !p.Exited() {
		t.Error("Exited() false after Kill")
	}
	if _, err := p.Configure(ctx, []byte(`{}`)); !errors.Is(err, drivers.ErrPluginDead) {
		t.Errorf("Configure after Kill: %v, want ErrPluginDead", err)
	}
	if err := p.Wait(ctx); err != nil {
		t.Errorf("Wait after Kill: %v", err)
	}
}

func TestLaunchCancelledContext(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	p, err := drivers.Launch(ctx, drivers.LaunchConfig{Path: "/bin/sleep", Args: []string{"5"}, SHA256: mustSHA(t, "/bin/sleep")})
	if err == nil {
		p.Kill()
		t.Fatal("Launch with a cancelled context succeeded")
	}
}

func TestLaunchNeedsCommand(t *testing.T) {
	if _, err := drivers.Launch(context.Background(), drivers.LaunchConfig{}); err == nil {
		t.Fatal("Launch without Cmd or Path succeeded")
	}
}

func mustSHA(t *testing.T, path string) string {
	t.Helper()
	sum, err := drivers.FileSHA256(path)
	if err != nil {
		t.Fatal(err)
	}
	return sum
}

// A binary that never answers the handshake fails the launch once
// StartTimeout has passed, and is not left running.
func TestLaunchStartTimeout(t *testing.T) {
	start := time.Now()
	p, err := drivers.Launch(context.Background(), drivers.LaunchConfig{
		Path: "/bin/sleep", Args: []string{"30"}, SHA256: mustSHA(t, "/bin/sleep"),
		StartTimeout: 200 * time.Millisecond,
	})
	if err == nil {
		p.Kill()
		t.Fatal("Launch of a binary that never shakes hands succeeded")
	}
	if waited := time.Since(start); waited > 10*time.Second {
		t.Errorf("Launch gave up only after %v", waited)
	}
}

// A driver process that sends a misshapen batch ends its stream with
// ErrBadBatch instead of handing the daemon columns it could misindex.
func TestMalformedBatchGRPC(t *testing.T) {
	for name, bad := range map[string]drivers.Batch{
		"short column":   {Seq: 1, TimeNS: []int64{10, 11}, Values: [][]float64{{1, 2}, {3}}},
		"extra column":   {Seq: 1, TimeNS: []int64{10}, Values: [][]float64{{1}, {2}, {3}}},
		"missing column": {Seq: 1, TimeNS: []int64{10}, Values: [][]float64{{1}}},
	} {
		t.Run(name, func(t *testing.T) {
			good := drivers.Batch{Seq: 0, TimeNS: []int64{5}, Values: [][]float64{{1}, {2}}}
			d := grpcConn(t, &fakedriver.Scripted{Info: scriptInfo, Batches: []drivers.Batch{good, bad}})
			ctx, cancel := context.WithCancel(context.Background())
			defer cancel()
			if _, err := d.Configure(ctx, []byte(`{}`)); err != nil {
				t.Fatal(err)
			}
			ch, err := d.Stream(ctx)
			if err != nil {
				t.Fatal(err)
			}
			if b := <-ch; b.Err != nil || !sameBits(b, good) {
				t.Fatalf("first batch %+v", b)
			}
			b, ok := <-ch
			if !ok || !errors.Is(b.Err, drivers.ErrBadBatch) {
				t.Fatalf("malformed batch arrived as %+v (open %v), want Err wrapping ErrBadBatch", b, ok)
			}
			if _, ok := <-ch; ok {
				t.Error("stream still open after ErrBadBatch")
			}
		})
	}
}

// A driver process that hangs (stopped, not crashed) under an open stream
// is found dead by the liveness ping: the stream ends with ErrPluginDead.
// It takes the ping interval, about 10 s.
func TestHungDriverIsDeadIntegration(t *testing.T) {
	if testing.Short() {
		t.Skip("waits for the 10 s liveness ping")
	}
	exe, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(exe, "-test.run=^$")
	cmd.Env = append(os.Environ(), conformance.EnvServe+"=fake")
	p, err := drivers.Launch(context.Background(), drivers.LaunchConfig{Cmd: cmd, PingTimeout: time.Second})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		_ = syscall.Kill(p.Pid(), syscall.SIGCONT)
		p.Kill()
	})
	ctx, cancel := context.WithTimeout(context.Background(), 40*time.Second)
	defer cancel()
	if _, err := p.Configure(ctx, []byte(`{"batch_interval_us": 20000}`)); err != nil {
		t.Fatal(err)
	}
	ch, err := p.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if b := <-ch; b.Err != nil {
		t.Fatal(b.Err)
	}
	if err := syscall.Kill(p.Pid(), syscall.SIGSTOP); err != nil {
		t.Fatal(err)
	}
	var last error
	for b := range ch {
		if b.Err != nil {
			last = b.Err
		}
	}
	if !errors.Is(last, drivers.ErrPluginDead) {
		t.Errorf("stream of a hung driver ended with %v, want ErrPluginDead", last)
	}
}
