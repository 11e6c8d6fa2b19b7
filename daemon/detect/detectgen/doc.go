// Package detectgen generates tension-test curves with known truth, for
// the event detector's tests and for anyone who needs realistic input
// (daemon, benchmarks, demos): continuous crosshead-driven tests with or
// without an upper yield point, with serrated flow, and dead-weight tests
// of a wire with weights added and removed by hand, swinging after each
// change, taking set past its elastic limit, creeping under load and
// breaking on the final weight. Sensors add Gaussian noise and
// quantisation like a cheap 24-bit bridge board.
//
// Everything is deterministic for a given seed. The models are simple on
// purpose: they reproduce the shapes the detector must tell apart, not a
// material's constitutive law.
package detectgen
