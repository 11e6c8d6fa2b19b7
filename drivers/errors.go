package drivers

import "errors"

// Named errors of the driver contract. Check them with errors.Is; the gRPC
// shims carry them across the process boundary.
var (
	// ErrBadConfig: the configuration was refused before any I/O.
	ErrBadConfig = errors.New("driver: bad configuration")
	// ErrNotConfigured: Stream was called before a successful Configure.
	ErrNotConfigured = errors.New("driver: not configured")
	// ErrDeviceGone: the device disappeared (cable pulled, port closed).
	ErrDeviceGone = errors.New("driver: device gone")
	// ErrPluginDead: the driver process exited or stopped answering; a
	// dead plugin's gRPC Unavailable becomes this one error.
	ErrPluginDead = errors.New("driver: plugin process dead")
	// ErrStreaming: Stream was called while a stream is already running.
	ErrStreaming = errors.New("driver: already streaming")
)

// Named errors of launching driver processes.
var (
	// ErrNoChecksum: an external driver binary was to be run without a
	// configured SHA-256. Only the daemon's own binary runs unchecked.
	ErrNoChecksum = errors.New("driver: external driver binary has no configured sha256")
	// ErrChecksumMismatch: the binary on disk is not the one configured.
	ErrChecksumMismatch = errors.New("driver: driver binary sha256 does not match")
)

// ErrBadBatch: a driver process sent a batch whose shape is wrong (a
// column whose length differs from the times', or a column count that
// differs from the configured channels). The shims end the stream with it
// rather than pass on data the daemon could misread.
var ErrBadBatch = errors.New("driver: malformed sample batch")
