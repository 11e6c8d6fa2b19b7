package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"

	"framed/daemon"
)

func init() {
	register(&command{name: "status", summary: "show the running daemon's state, drivers and outbox", run: runStatus})
	register(&command{name: "specimen", summary: "queue the next specimen's metadata (JSON, as on the specimens topic)", run: runSpecimen})
}

func runStatus(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("status", flag.ContinueOnError)
	fs.SetOutput(stderr)
	state := stateFlag(fs)
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	dir, err := stateDir(*state)
	if err != nil {
		return err
	}
	var st map[string]any
	if err := callDaemon(ctx, dir, daemon.Request{Op: "status"}, &st); err != nil {
		return err
	}
	enc := json.NewEncoder(stdout)
	enc.SetIndent("", "  ")
	return enc.Encode(st)
}

func runSpecimen(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("specimen", flag.ContinueOnError)
	fs.SetOutput(stderr)
	state := stateFlag(fs)
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	if fs.NArg() != 1 {
		return fmt.Errorf(`%w: give the specimen as one JSON argument, e.g. '{"id":"S1","shape":"round","d0_mm":10,"L0_mm":50}'`, errUsage)
	}
	if !json.Valid([]byte(fs.Arg(0))) {
		return fmt.Errorf("%w: the specimen is not valid JSON: %.80q", errUsage, fs.Arg(0))
	}
	dir, err := stateDir(*state)
	if err != nil {
		return err
	}
	var out map[string]int
	if err := callDaemon(ctx, dir, daemon.Request{Op: "specimen", Specimen: json.RawMessage(fs.Arg(0))}, &out); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "queued; %d specimen(s) waiting\n", out["queued"])
	return nil
}
