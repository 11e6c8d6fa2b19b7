package builtin

import (
	"context"
	"fmt"
	"os"
	"os/exec"

	"framed/drivers"
)

// DriverModeArg is the first argument that puts the framed binary into
// driver mode. Its leading underscores keep it apart from any flag or
// subcommand an operator would type.
const DriverModeArg = "__driver"

// ServeArgs serves a built-in driver when args (the program's arguments
// without the program name, i.e. os.Args[1:]) are [DriverModeArg, name],
// and then reports true: main should return at once. For any other args it
// does nothing and reports false. An unknown name is reported on stderr and
// the process exits with status 2, which the launching daemon sees as a
// failed start.
func ServeArgs(args []string) (served bool) {
	if len(args) != 2 || args[0] != DriverModeArg {
		return false
	}
	factory, ok := Lookup(args[1])
	if !ok {
		fmt.Fprintf(os.Stderr, "%v: %q (registered: %q)\n", ErrUnknownDriver, args[1], Names())
		os.Exit(2)
	}
	drivers.Serve(factory())
	return true
}

// Command builds the command that runs the built-in driver name in a child
// of the executable self (normally from os.Executable).
func Command(self, name string) *exec.Cmd {
	return exec.Command(self, DriverModeArg, name)
}

// Launch starts the built-in driver name in a child of the running
// executable. cfg.Cmd is set here; the other fields of cfg are passed on.
func Launch(ctx context.Context, name string, cfg drivers.LaunchConfig) (*drivers.Process, error) {
	if _, ok := Lookup(name); !ok {
		return nil, fmt.Errorf("%w: %q", ErrUnknownDriver, name)
	}
	self, err := os.Executable()
	if err != nil {
		return nil, fmt.Errorf("builtin: own executable: %w", err)
	}
	cfg.Cmd = Command(self, name)
	return drivers.Launch(ctx, cfg)
}
