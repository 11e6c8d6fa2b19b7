package conformance

import (
	"context"
	"os"
	"os/exec"
	"testing"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"

	"framed/drivers"
)

// opener gives a check a fresh driver; proc is set in the out-of-process
// run only.
type opener func(t *testing.T, s Suite) (d drivers.Driver, proc *drivers.Process)

func openDirect(_ *testing.T, s Suite) (drivers.Driver, *drivers.Process) {
	return s.New(), nil
}

func openGRPC(t *testing.T, s Suite) (drivers.Driver, *drivers.Process) {
	t.Helper()
	client, _ := plugin.TestPluginGRPCConn(t, false, drivers.PluginMap(s.New()))
	// Close also stops the server, through go-plugin's controller; a
	// second Stop here would race with that one.
	t.Cleanup(func() { client.Close() })
	raw, err := client.Dispense(drivers.PluginName)
	if err != nil {
		t.Fatalf("dispense: %v", err)
	}
	d, ok := raw.(drivers.Driver)
	if !ok {
		t.Fatalf("dispensed %T, not a drivers.Driver", raw)
	}
	return d, nil
}

func openProcess(t *testing.T, s Suite) (drivers.Driver, *drivers.Process) {
	t.Helper()
	p, err := launchSelf(t, s.Name)
	if err != nil {
		t.Fatalf("launch %q: %v", s.Name, err)
	}
	return p, p
}

// launchSelf starts the test binary as the driver process of name.
func launchSelf(t testing.TB, name string) (*drivers.Process, error) {
	t.Helper()
	exe, err := os.Executable()
	if err != nil {
		return nil, err
	}
	// -test.run=^$ keeps the child from running tests should EnvServe be
	// lost on the way.
	cmd := exec.Command(exe, "-test.run=^$")
	cmd.Env = append(os.Environ(), EnvServe+"="+name)
	p, err := drivers.Launch(context.Background(), drivers.LaunchConfig{
		Cmd:    cmd,
		Logger: hclog.New(&hclog.LoggerOptions{Name: "conformance." + name, Level: hclog.Warn, Output: os.Stderr}),
	})
	if err != nil {
		return nil, err
	}
	t.Cleanup(p.Kill)
	return p, nil
}

// LaunchSelf starts the test binary as a driver process serving the
// factory that Main was given under name; the process is killed when the
// test ends. Tests of the shims and benchmarks use it; drivers rarely need
// it since Run does the same.
func LaunchSelf(t testing.TB, name string) *drivers.Process {
	t.Helper()
	if factories[name] == nil {
		t.Fatalf("conformance: no factory %q: call conformance.Main with it in TestMain", name)
	}
	p, err := launchSelf(t, name)
	if err != nil {
		t.Fatalf("launch %q: %v", name, err)
	}
	return p
}
