package conformance

import (
	"fmt"
	"os"
	"testing"

	"framed/drivers"
)

// EnvServe names the environment variable that turns a test binary into a
// driver process: FRAMED_CONFORMANCE_SERVE=<name> makes Main serve the
// factory of that name instead of running tests.
const EnvServe = "FRAMED_CONFORMANCE_SERVE"

// factories are the drivers Main was given, for the out-of-process runs.
var factories map[string]func() drivers.Driver

// Main is for a driver test package's TestMain. Run normally, it runs the
// tests and remembers factories so Run can start the test binary again as
// a driver process. Started by Run with EnvServe set, it serves that
// driver through drivers.Serve and exits when the harness kills it.
func Main(m *testing.M, f map[string]func() drivers.Driver) {
	if name := os.Getenv(EnvServe); name != "" {
		newDriver, ok := f[name]
		if !ok {
			fmt.Fprintf(os.Stderr, "conformance: %s=%q names no driver given to Main\n", EnvServe, name)
			os.Exit(2)
		}
		drivers.Serve(newDriver())
		os.Exit(0)
	}
	factories = f
	os.Exit(m.Run())
}
