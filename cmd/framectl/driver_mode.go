package main

import (
	"os"

	"framed/daemon/bench"
	"framed/drivers/builtin"
	_ "framed/drivers/sim" // registers the sim, which `framectl bench` runs
)

// framectl doubles as the sim driver and as the daemon under measurement
// for `framectl bench`, exactly as framed launches itself for its built-in
// drivers, so the bench needs no other binary. Imported packages' init
// runs first, so the sim is registered by the time this runs.
func init() {
	if builtin.ServeArgs(os.Args[1:]) {
		os.Exit(0)
	}
	if bench.ServeArgs(os.Args[1:]) {
		os.Exit(0)
	}
}
