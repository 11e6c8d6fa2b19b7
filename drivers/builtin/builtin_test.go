package builtin_test

import (
	"context"
	"errors"
	"os"
	"slices"
	"testing"

	"framed/drivers"
	"framed/drivers/builtin"
	"framed/drivers/internal/fakedriver"
)

// The test binary doubles as the framed binary: registered drivers and a
// ServeArgs switch before anything else, exactly as framed's main does.
func TestMain(m *testing.M) {
	builtin.Register("fake", fakedriver.New)
	if builtin.ServeArgs(os.Args[1:]) {
		return
	}
	os.Exit(m.Run())
}

func TestRegistry(t *testing.T) {
	if got := builtin.Names(); !slices.Contains(got, "fake") {
		t.Fatalf("Names() = %q, want it to list fake", got)
	}
	if _, ok := builtin.Lookup("no-such-driver"); ok {
		t.Error("Lookup found an unregistered driver")
	}
	f, ok := builtin.Lookup("fake")
	if !ok {
		t.Fatal("Lookup(fake) failed")
	}
	info, err := f().Describe(context.Background())
	if err != nil || info.Driver != "fake" {
		t.Errorf("fake factory Describe = %+v, %v", info, err)
	}
}

func TestRegisterTwicePanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("second Register of the same name did not panic")
		}
	}()
	builtin.Register("fake", fakedriver.New)
}

func TestServeArgsIgnoresOtherArgs(t *testing.T) {
	for _, args := range [][]string{nil, {"--demo"}, {builtin.DriverModeArg}, {builtin.DriverModeArg, "fake", "x"}, {"fake", builtin.DriverModeArg}} {
		if builtin.ServeArgs(args) {
			t.Errorf("ServeArgs(%q) served", args)
		}
	}
}

func TestCommand(t *testing.T) {
	cmd := builtin.Command("/usr/bin/framed", "sim")
	if want := []string{"/usr/bin/framed", builtin.DriverModeArg, "sim"}; !slices.Equal(cmd.Args, want) {
		t.Errorf("Command args %q, want %q", cmd.Args, want)
	}
}

// The daemon's path end to end: its own binary in driver mode, without a
// checksum, streaming through a real child process.
func TestLaunchBuiltinIntegration(t *testing.T) {
	ctx := context.Background()
	p, err := builtin.Launch(ctx, "fake", drivers.LaunchConfig{})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(p.Kill)
	info, err := p.Configure(ctx, []byte(`{"channels": 2, "samples_per_batch": 4}`))
	if err != nil {
		t.Fatal(err)
	}
	if len(info.Channels) != 2 {
		t.Fatalf("%d channels, want 2", len(info.Channels))
	}
	sctx, cancel := context.WithCancel(ctx)
	defer cancel()
	ch, err := p.Stream(sctx)
	if err != nil {
		t.Fatal(err)
	}
	b := <-ch
	if b.Err != nil || len(b.TimeNS) != 4 || len(b.Values) != 2 {
		t.Fatalf("first batch %+v", b)
	}
	cancel()
	for range ch {
	}
	p.Kill()
	if !p.Exited() {
		t.Error("process still running after Kill")
	}
	if _, err := p.Health(ctx); !errors.Is(err, drivers.ErrPluginDead) {
		t.Errorf("Health after Kill: %v, want ErrPluginDead", err)
	}
}

func TestLaunchUnknownBuiltin(t *testing.T) {
	_, err := builtin.Launch(context.Background(), "no-such-driver", drivers.LaunchConfig{})
	if !errors.Is(err, builtin.ErrUnknownDriver) {
		t.Fatalf("got %v, want ErrUnknownDriver", err)
	}
}

// A child asked for a driver it does not have exits at once; the launch
// fails instead of hanging until the start timeout.
func TestLaunchChildWithoutDriverIntegration(t *testing.T) {
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	_, err = drivers.Launch(context.Background(), drivers.LaunchConfig{Cmd: builtin.Command(self, "no-such-driver")})
	if err == nil {
		t.Fatal("launching an unknown driver succeeded")
	}
}
