// Command framed is the service beside the test frame: it runs the sensor
// drivers, stores every sample, recognises tests and their events, reduces
// each finished test and publishes the result over MQTT.
//
// The same binary is also every built-in driver: the daemon launches itself
// in driver mode, so one file deploys and a crashing driver is only a
// crashed child process.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"log/slog"
	"os"
	"os/signal"
	"path/filepath"
	"syscall"

	"framed/daemon"
	"framed/drivers/builtin"

	// Built-in drivers register themselves with the builtin registry.
	_ "framed/drivers/lineserial"
	_ "framed/drivers/modbusrtu"
	_ "framed/drivers/replay"
	_ "framed/drivers/sim"
)

func main() {
	if builtin.ServeArgs(os.Args[1:]) {
		return // ran as a driver process
	}
	os.Exit(run(os.Args[1:], os.Stderr))
}

func run(args []string, stderr io.Writer) int {
	fs := flag.NewFlagSet("framed", flag.ContinueOnError)
	fs.SetOutput(stderr)
	configPath := fs.String("config", "", "configuration `FILE` (JSON); see deploy/framed.example.json")
	stateDir := fs.String("state", "", "`DIR` for all persistent state (default /var/lib/framed; with --demo ~/.local/state/framed-demo)")
	broker := fs.String("broker", "", "MQTT broker: tcp://host:port, ssl://host:port or embedded[:ADDR] (default embedded:127.0.0.1:1883)")
	frame := fs.String("frame", "", "frame `ID`, a level of every MQTT topic")
	demo := fs.Bool("demo", false, "run a simulated frame with a scripted series of specimens (no hardware needed)")
	verbose := fs.Bool("v", false, "log debug detail")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: framed [--demo] [--config FILE] [--state DIR] [--broker URL] [--frame ID]")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return 0
		}
		return 2
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "framed: unexpected argument %q (flags start with --)\n", fs.Arg(0))
		return 2
	}
	if *configPath == "" && !*demo {
		fmt.Fprintln(stderr, "framed: give --config FILE, or --demo to run the simulated frame")
		return 2
	}

	var cfg daemon.Config
	var opt daemon.Options
	var err error
	if *configPath != "" {
		data, rerr := os.ReadFile(*configPath)
		if rerr != nil {
			fmt.Fprintf(stderr, "framed: %v\n", rerr)
			return 1
		}
		cfg, err = daemon.ParseConfig(data)
		if err != nil {
			fmt.Fprintf(stderr, "framed: %s: %v\n", *configPath, err)
			return 1
		}
	}
	if *demo {
		cfg, opt, err = demoSetup(cfg, *configPath != "")
		if err != nil {
			fmt.Fprintf(stderr, "framed: %v\n", err)
			return 1
		}
	}
	if *stateDir != "" {
		cfg.StateDir = *stateDir
	}
	if cfg.StateDir == "" {
		cfg.StateDir = "/var/lib/framed"
		if *demo {
			home, _ := os.UserHomeDir()
			cfg.StateDir = filepath.Join(home, ".local", "state", "framed-demo")
		}
	}
	if *broker != "" {
		cfg.Broker = *broker
	}
	if *frame != "" {
		cfg.Frame = *frame
	}
	if err := cfg.Validate(); err != nil {
		fmt.Fprintf(stderr, "framed: %v\n", err)
		return 1
	}

	level := slog.LevelInfo
	if *verbose {
		level = slog.LevelDebug
	}
	opt.Logger = slog.New(slog.NewTextHandler(stderr, &slog.HandlerOptions{Level: level}))
	if *demo {
		opt.Ready = func(d *daemon.Daemon) { demoBanner(stderr, cfg, d) }
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	if err := daemon.Run(ctx, cfg, opt); err != nil {
		fmt.Fprintf(stderr, "framed: %v\n", err)
		return 1
	}
	return 0
}
