// Package store keeps everything framed must not lose in one bbolt file:
// every raw sample of every test, each test's state, the result documents
// (every revision) and the outbox that drives their delivery over MQTT.
//
// Layout (top-level buckets):
//
//	tests      test id -> JSON TestMeta
//	samples    test id -> bucket: big-endian chunk seq -> encoded chunk
//	results    test id -> bucket: big-endian revision -> result document
//	outbox     big-endian seq -> (test id, revision); the truth of delivery
//	delivered  test id -> highest revision the broker acknowledged
//
// Other packages may keep their own buckets in the same file through Bolt.
//
// Samples are written by an Appender, which buffers in memory and commits
// many batches per bbolt transaction, because the fsync of each transaction
// is the cost. Data at risk on a power cut: whatever was appended since the
// last commit, at most Options.CommitInterval (default 100 ms) plus the time
// one commit takes. Everything committed survives: bbolt is copy-on-write
// and fsyncs before a commit returns.
//
// Chunks store float64 columns losslessly (24-bit ADC readings and
// micrometre extensions keep every bit; NaN, meaning no reading, survives).
// The time column is delta-of-delta coded on its bit pattern, which is exact
// and takes one or two bytes per sample at a steady rate. Each chunk carries
// a CRC-32C so Check can tell a damaged chunk from a valid one.
//
// Caveats: one process at a time (a second Open fails with ErrLocked after
// Options.LockTimeout); retention's byte budget counts stored chunk bytes,
// not the file size (bbolt reuses freed pages but never shrinks the file).
//
// Tests: the power-cut test kills a child writer process with SIGKILL 5
// times by default; set FRAMED_LONG=1 for the long campaign (50 kills). A
// killed process is not a real power loss (the kernel's page cache
// survives it); what covers that is bbolt's fdatasync before each commit
// returns, which holds as far as the disk honours cache flushes.
package store
