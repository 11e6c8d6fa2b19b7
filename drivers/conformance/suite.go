package conformance

import (
	"testing"
	"time"

	"framed/drivers"
)

// FaultMode is how a driver reacts to a device failure mid-stream.
type FaultMode int

const (
	// FaultEnds: the stream's last batch carries Err, then the channel
	// closes.
	FaultEnds FaultMode = iota
	// FaultReopens: the driver recovers by itself; a later batch has
	// GapBefore > 0 and the stream goes on.
	FaultReopens
)

// Suite describes one driver to the harness.
type Suite struct {
	// Name is the driver's name; it is also the key under which the
	// driver's factory was given to Main, for the out-of-process run.
	Name string
	// New returns a fresh, unconfigured driver.
	New func() drivers.Driver
	// GoodConfig is a configuration the driver accepts and streams with
	// (unless Setup returns one).
	GoodConfig []byte
	// BadConfigs, by a name saying what is wrong, must each be refused
	// with an error wrapping drivers.ErrBadConfig, before any I/O (the
	// harness gives them to drivers that have no device set up). An
	// unparsable JSON document is always checked as well.
	BadConfigs map[string][]byte
	// Setup, if set, prepares a fresh device (a pty simulator, a file)
	// for one check and returns the config to use with it (nil: use
	// GoodConfig). It runs in the test process; clean up with t.Cleanup.
	Setup func(t *testing.T) []byte
	// MinSamples is how many samples the stream checks wait for
	// (default 10).
	MinSamples int
	// InjectFault, if set, makes the device of the latest Setup fail while
	// a stream runs (close the pty, create a fault file, ...).
	InjectFault func(t *testing.T)
	// FaultConfig, if set, is a config with which the driver fails by
	// itself mid-stream (used instead of InjectFault, with Setup's device).
	FaultConfig []byte
	// Fault is the declared reaction to the fault.
	Fault FaultMode
	// FaultErr, if set, is what the fault's Batch.Err must wrap
	// (errors.Is), e.g. drivers.ErrDeviceGone. Only with FaultEnds.
	FaultErr error
	// Timeout bounds each wait for samples (default 10 s).
	Timeout time.Duration
	// NoSubprocess, if set, is the reason the out-of-process run is
	// skipped. Without it Run fails when Main was not used in TestMain.
	NoSubprocess string
}

func (s Suite) minSamples() int {
	if s.MinSamples > 0 {
		return s.MinSamples
	}
	return 10
}

func (s Suite) timeout() time.Duration {
	if s.Timeout > 0 {
		return s.Timeout
	}
	return 10 * time.Second
}

// config sets up a device when the suite needs one and returns the config
// to stream with.
func (s Suite) config(t *testing.T) []byte {
	t.Helper()
	if s.Setup != nil {
		if c := s.Setup(t); c != nil {
			return c
		}
	}
	return s.GoodConfig
}
