// Package drivers holds the contract between framed and its sensor drivers:
// the plain Driver interface, its named errors, and the go-plugin shims that
// run every driver, built in or external, in a process of its own so that a
// crashing driver never takes the daemon down.
//
// Subpackages: conformance (the harness every driver passes), builtin (the
// registry of drivers shipped in the framed binary), and one folder per
// driver (sim, lineserial, modbusrtu, replay).
//
// # Process model
//
// The daemon calls Launch, which starts the driver binary, shakes hands
// (Handshake, ProtocolVersion) and returns a *Process: a Driver whose calls
// travel over gRPC (proto/driver.proto) to the driver process, where Serve
// answers them with the real driver. Built-in drivers run as children of
// the framed binary itself in driver mode (see builtin); external driver
// binaries run only with a configured SHA-256 (LaunchConfig.SHA256,
// FileSHA256). Launched processes are managed: plugin.CleanupClients kills
// any still running, e.g. at daemon shutdown.
//
// Across the boundary the named errors keep their identity: a driver's
// ErrBadConfig, ErrNotConfigured, ErrDeviceGone and ErrStreaming travel as
// gRPC codes and unwrap to the same variables in the daemon, with the
// driver's message. A driver process that exits, or hangs under an open
// stream (it misses a liveness ping after 10 s of silence), makes every
// call, and the open stream's last batch, fail with ErrPluginDead;
// the supervisor then calls Kill and launches a new process.
//
// Streams are channels of Batch values. A failure mid-stream arrives as a
// last batch carrying Err; cancelling the context closes the channel in
// the daemon at once and ends the driver's stream in its process shortly
// after (a new Stream call waits for that). Batches are columnar and cross
// the boundary without per-sample conversion: the shims carry several
// million samples per second (BenchmarkStream).
//
// # Caveats
//
// A batch must fit one gRPC message (64 MiB here; keep batches to some
// thousands of samples, which also keeps latency low). The shims share the
// slices of a batch with the message being sent, so a driver must not
// change a batch after sending it. Seq and times are the driver's: the
// shims neither renumber nor re-time.
package drivers
