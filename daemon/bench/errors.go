package bench

import "errors"

var (
	// ErrDaemon means the daemon under measurement failed to start, died,
	// or did not do what the measurement needs (no test, no result).
	ErrDaemon = errors.New("bench: daemon under measurement failed")
	// ErrTimeout means a phase did not finish within its bound.
	ErrTimeout = errors.New("bench: phase timed out")
	// ErrNoProc means /proc figures cannot be read on this system.
	ErrNoProc = errors.New("bench: /proc not readable")
	// ErrBadOptions means Options are inconsistent.
	ErrBadOptions = errors.New("bench: bad options")
)
