package bench

import (
	"context"
	"fmt"
	"log/slog"
	"os"
	"os/signal"
	"strconv"
	"syscall"
	"time"

	"framed/daemon"
)

// DaemonArg, as the first argument, makes a binary that calls ServeArgs run
// the daemon under measurement: DaemonArg CONFIG.json MAX_SECONDS. It is
// not for people: Run starts it.
const DaemonArg = "__framed-bench-daemon"

// ServeArgs runs the daemon under measurement when args (os.Args[1:]) ask
// for it, and reports whether they did; a binary that runs Run calls it at
// the start of main. The daemon stops on SIGTERM or SIGINT, and by itself
// after MAX_SECONDS so a lost parent never leaves it running. A failure is
// printed on stderr and the process exits with status 1.
func ServeArgs(args []string) (served bool) {
	if len(args) == 0 || args[0] != DaemonArg {
		return false
	}
	if err := serve(args[1:]); err != nil {
		fmt.Fprintf(os.Stderr, "bench daemon: %v\n", err)
		os.Exit(1)
	}
	return true
}

func serve(args []string) error {
	if len(args) != 2 {
		return fmt.Errorf("%w: want CONFIG.json MAX_SECONDS, got %q", ErrBadOptions, args)
	}
	raw, err := os.ReadFile(args[0])
	if err != nil {
		return err
	}
	cfg, err := daemon.ParseConfig(raw)
	if err != nil {
		return err
	}
	maxS, err := strconv.ParseFloat(args[1], 64)
	if err != nil || !(maxS > 0) {
		return fmt.Errorf("%w: MAX_SECONDS %q", ErrBadOptions, args[1])
	}
	ctx, stop := signal.NotifyContext(context.Background(), syscall.SIGTERM, os.Interrupt)
	defer stop()
	ctx, cancel := context.WithTimeout(ctx, time.Duration(maxS*float64(time.Second)))
	defer cancel()
	log := slog.New(slog.NewTextHandler(os.Stderr, &slog.HandlerOptions{Level: slog.LevelWarn}))
	return daemon.Run(ctx, cfg, daemon.Options{Logger: log})
}
