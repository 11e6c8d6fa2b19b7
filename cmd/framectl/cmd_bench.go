package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"

	"framed/daemon/bench"
)

func init() {
	register(&command{name: "bench", summary: "measure what this computer sustains: ingest, reduction, latency, memory, CPU, disk writes", run: runBench})
}

func runBench(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("bench", flag.ContinueOnError)
	fs.SetOutput(stderr)
	quick := fs.Bool("quick", false, "a smoke run of well under a minute (CI); figures are rougher")
	long := fs.Bool("long", false, "acquire 10 kHz for 30 minutes to show memory stays flat (about 40 minutes in all)")
	asJSON := fs.Bool("json", false, `print {"figures": [{"name", "value", "unit", "limit", "ratio", ...}]}`)
	dir := fs.String("dir", "", "scratch `DIR` on the disk to measure (default: the system's temporary directory)")
	mosq := fs.String("mosquitto", "", "mosquitto `BINARY` for the second latency figure (default: found on PATH; off: skip)")
	quiet := fs.Bool("quiet", false, "no progress lines on stderr")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("%w: unexpected arguments %q", errUsage, fs.Args())
	}
	if *quick && *long {
		return fmt.Errorf("%w: --quick and --long exclude each other", errUsage)
	}
	o := bench.Options{Mode: bench.ModeDefault, Dir: *dir, Mosquitto: *mosq}
	switch {
	case *quick:
		o.Mode = bench.ModeQuick
	case *long:
		o.Mode = bench.ModeLong
	}
	if !*quiet {
		o.Progress = stderr
	}
	rep, runErr := bench.Run(ctx, o)
	if len(rep.Figures) > 0 || runErr == nil {
		if *asJSON {
			enc := json.NewEncoder(stdout)
			enc.SetIndent("", "  ")
			if err := enc.Encode(rep); err != nil {
				return err
			}
		} else if err := rep.WriteTable(stdout); err != nil {
			return err
		}
	}
	return runErr
}
