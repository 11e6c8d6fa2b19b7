package builtin_test

import (
	"context"
	"os"

	"framed/drivers"
	"framed/drivers/builtin"
)

// The start of framed's main: in driver mode the binary serves one
// registered driver and returns; otherwise it goes on as the daemon, which
// starts its drivers as children of itself.
func Example_main() {
	if builtin.ServeArgs(os.Args[1:]) {
		return
	}
	// ... daemon start-up ...
	p, err := builtin.Launch(context.Background(), "sim", drivers.LaunchConfig{})
	if err != nil {
		return // wraps builtin.ErrUnknownDriver or a start failure
	}
	defer p.Kill()
}
