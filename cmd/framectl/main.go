// Command framectl is the operator's tool for framed: reduce and plot curve
// files offline, list stored tests, watch results arrive, calibrate and
// verify the force channel, and measure what the machine can sustain.
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
	"syscall"
)

// command is one framectl subcommand. Each lives in a cmd_<name>.go file of
// its own and registers itself in init, so subcommands never edit this file.
type command struct {
	name    string
	summary string
	// run parses its own flags from args. It returns an error wrapping
	// errUsage for bad arguments (exit 2); any other error exits 1.
	run func(ctx context.Context, args []string, stdout, stderr io.Writer) error
}

var commands = map[string]*command{}

func register(c *command) {
	if _, dup := commands[c.name]; dup {
		panic("framectl: command registered twice: " + c.name)
	}
	commands[c.name] = c
}

// errUsage marks a mistake in the command line.
var errUsage = errors.New("usage")

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		usage(stderr)
		if len(args) == 0 {
			return 2
		}
		return 0
	}
	c, ok := commands[args[0]]
	if !ok {
		fmt.Fprintf(stderr, "framectl: unknown command %q (framectl help lists them)\n", args[0])
		return 2
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	if err := c.run(ctx, args[1:], stdout, stderr); err != nil {
		fmt.Fprintf(stderr, "framectl %s: %v\n", c.name, err)
		if errors.Is(err, errUsage) {
			return 2
		}
		return 1
	}
	return 0
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "usage: framectl COMMAND [flags]   (framectl COMMAND -h for its flags)")
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-13s %s\n", n, commands[n].summary)
	}
}
