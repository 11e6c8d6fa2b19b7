// Package bench measures what framed sustains on the machine it runs on,
// each figure side by side with the limit it is judged against, measured
// in the same run: the whole ingest path against appending the same
// batches straight to the store and to a plain file; reducing a stored
// test against one sequential read of it; and the daemon's latency,
// memory, CPU share and disk writes against the project's targets.
//
// Ratio is always value / limit. Where the limit is a measured baseline
// (ingest: the direct store rate; reduce: the read time) the ratio says
// how close framed comes to what the machine can physically do; where the
// limit is a target (latency, memory, CPU, write amplification) a ratio
// at most 1 meets it. Each Figure says which (LimitKind) and what passes.
//
// The daemon under measurement runs in a child process, started from the
// calling binary with DaemonArg, so its resident memory, CPU time and disk
// writes can be read from /proc without the measuring code's own. The
// child launches the sim driver from the same binary in driver mode, as
// framed does. A binary that runs Run must therefore call ServeArgs (and
// the built-in driver registry's builtin.ServeArgs) at the start of main.
//
// Caveats: /proc figures (memory, CPU, write bytes) need Linux; elsewhere
// they are reported as not measured. Write bytes are what the process
// hands to the block layer (write_bytes of /proc/PID/io): the file
// system's own journal writes are not in them. On a shared or busy
// machine every figure is noisy; the ratios, measured in one run, drift
// less than the absolute values. Everything is bounded in time, uses
// loopback addresses only and cleans up its temporary directory.
package bench
